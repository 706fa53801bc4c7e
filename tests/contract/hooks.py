"""Schemathesis hooks for the liftaudit contract run (tests/contract.sh).

Schemathesis knows how to put JSON and text/* bodies on the wire, not
`application/toml`; a TOML sheet is text, so it goes as UTF-8 bytes.
"""

import schemathesis


@schemathesis.serializer("application/toml")
def toml_sheet(ctx, value):
    if value is None:
        return None
    if isinstance(value, bytes):
        return value
    return str(value).encode("utf-8")
