#!/usr/bin/env bash
# Contract run of the JSON API (issue 5): starts `liftaudit serve` on a free
# port of 127.0.0.1, points schemathesis at the service's own OpenAPI document
# and fails on any 5xx, any status, content type, header or body outside the
# document, and on any error the server logs. Loopback only, bounded in time;
# the server is stopped by its PID however the run ends.
#
#   tests/contract.sh                 50 examples per operation
#   CONTRACT_EXAMPLES=200 tests/contract.sh
#   CONTRACT_SEED=123 tests/contract.sh   replay a run (the seed is printed)
#
# Needs schemathesis 4 (`pip install schemathesis`).
set -euo pipefail
cd "$(dirname "$0")/.."
root="$(pwd)"

examples="${CONTRACT_EXAMPLES:-50}"
budget="${CONTRACT_TIMEOUT:-600}" # seconds for the whole schemathesis run

command -v schemathesis >/dev/null || {
    echo "contract: schemathesis is not installed (pip install schemathesis)" >&2
    exit 2
}

cargo build --locked --quiet --bin liftaudit
bin="$root/target/debug/liftaudit"

work="$(mktemp -d)"
log="$work/serve.log"
pid=""
stop() {
    if [[ -n "$pid" ]] && kill -0 "$pid" 2>/dev/null; then
        kill -TERM "$pid" 2>/dev/null || true
        for _ in $(seq 1 50); do kill -0 "$pid" 2>/dev/null || break; sleep 0.1; done
        kill -KILL "$pid" 2>/dev/null || true
        wait "$pid" 2>/dev/null || true
    fi
    rm -rf "$work"
}
trap stop EXIT
trap 'exit 130' INT TERM

# Port 0: the kernel picks a free port and the service logs the one it got.
RUST_LOG="${RUST_LOG:-info}" "$bin" serve --addr 127.0.0.1:0 >"$log" 2>&1 &
pid=$!

base=""
for _ in $(seq 1 100); do
    base="$(grep -o 'http://127\.0\.0\.1:[0-9]*' "$log" | head -n 1 || true)"
    [[ -n "$base" ]] && break
    kill -0 "$pid" 2>/dev/null || { echo "contract: the server exited" >&2; cat "$log" >&2; exit 1; }
    sleep 0.1
done
[[ -n "$base" ]] || { echo "contract: no listening address in 10 s" >&2; cat "$log" >&2; exit 1; }
for _ in $(seq 1 50); do
    curl -fsS --max-time 2 "$base/healthz" >/dev/null 2>&1 && break
    sleep 0.1
done
curl -fsS --max-time 2 "$base/healthz" >/dev/null || { echo "contract: $base/healthz does not answer" >&2; exit 1; }
echo "contract: service up at $base (pid $pid)"

seed=()
[[ -n "${CONTRACT_SEED:-}" ]] && seed=(--seed "$CONTRACT_SEED")

# From the scratch folder, so schemathesis's cache of past failures does not
# land in the work tree. `--include-path-regex '^/'` keeps the operation that
# serves the document itself, which schemathesis otherwise leaves out.
status=0
(cd "$work" && SCHEMATHESIS_HOOKS="$root/tests/contract/hooks.py" timeout --kill-after=10 "$budget" \
    schemathesis run "$base/api/v1/openapi.json" \
    --url "$base" \
    --include-path-regex '^/' \
    --phases examples,coverage,fuzzing \
    --checks not_a_server_error,status_code_conformance,content_type_conformance,response_headers_conformance,response_schema_conformance \
    --max-examples "$examples" \
    --request-timeout 10 \
    --workers 2 \
    --generation-database none \
    --no-color \
    "${seed[@]}") || status=$?

# A handler error the client never saw as a 5xx is still a defect.
if grep -E ' (ERROR|WARN) ' "$log" >/dev/null; then
    echo "contract: the server logged errors:" >&2
    grep -E ' (ERROR|WARN) ' "$log" | head -n 20 >&2
    [[ "$status" -ne 0 ]] || status=1
fi

if [[ "$status" -eq 0 ]]; then
    echo "contract: passed"
else
    echo "contract: FAILED (exit $status)" >&2
fi
exit "$status"
