#!/usr/bin/env bash
# Bounded fuzzing of every target, seeded with the demo claims in TOML and JSON.
# Usage: tests/fuzz/run.sh [seconds per target, default 60]
set -euo pipefail
cd "$(dirname "$0")"
seconds="${1:-60}"

if ! command -v cargo-fuzz >/dev/null 2>&1; then
    cargo install cargo-fuzz --locked
fi

# Seed corpus: each demo sheet as TOML, and the same sheet as JSON.
for target in parse_toml parse_json check extreme; do
    mkdir -p "corpus/$target"
done
for sheet in ../../demo-claims/*.toml; do
    name=$(basename "$sheet" .toml)
    cp "$sheet" "corpus/parse_toml/$name.toml"
    cp "$sheet" "corpus/check/$name.toml"
    python3 -c 'import json, sys, tomllib; print(json.dumps(tomllib.load(open(sys.argv[1], "rb")), indent=1))' \
        "$sheet" > "corpus/parse_json/$name.json"
    cp "corpus/parse_json/$name.json" "corpus/check/$name.json"
done
# The extreme target picks a demo and fields by its bytes: a few seeds.
printf '\000\004\000\000' > corpus/extreme/tiny-power
printf '\001\000\255\255\003\000\000' > corpus/extreme/huge-mass-tiny-thrust

# cargo fuzz passes unstable compiler flags; RUSTC_BOOTSTRAP lets the stable toolchain take them.
export RUSTC_BOOTSTRAP=1
for target in parse_toml parse_json check extreme; do
    echo "fuzzing $target for ${seconds}s"
    (cd ../.. && cargo fuzz run --fuzz-dir tests/fuzz --sanitizer none "$target" "tests/fuzz/corpus/$target" -- \
        -max_total_time="$seconds" -timeout=5 -rss_limit_mb=2048 -print_final_stats=1) 2>&1 | tail -n 12
done
