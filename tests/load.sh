#!/usr/bin/env bash
# Load floors for the service: the server's CPU time per request on the JSON API and on the HTML
# verdict page against the trivial route, on the same server in the same run; p99 latency,
# errors and peak RSS.
#
# Usage: tests/load.sh [--report-only]
#   --report-only (or LOAD_REPORT_ONLY=1): print the figures and the PASS/FAIL lines, exit 0.
# Tunables (defaults are the bounded run): LOAD_THREADS=2 LOAD_CONNECTIONS=32
#   LOAD_DURATION=10s LOAD_ROUNDS=5 LOAD_WARMUP=2s LOAD_DEMO=hover-lamp
# Each route gets LOAD_DURATION in all, in LOAD_ROUNDS slices taken in turn (trivial, api, page,
# demo, trivial, ...), so that a machine that speeds up or slows down during the run (other
# tenants, frequency) weighs on every route alike rather than on whichever ran then.
# Floors (exit 1 if one is missed): server CPU per /healthz request over server CPU per request
# of the route at least 0.30 for POST /api/v1/check and 0.20 for POST /check (the verdict page),
# over all rounds; p99 under 10 ms at 32 connections on every route; no errors; peak RSS under
# 64 MiB. CPU per request, unlike throughput, does not depend on how much of the machine wrk and
# other work take. These are floors, not targets.
#
# Loopback only: the server listens on 127.0.0.1 on a port the kernel picks (port 0; the port is
# read from the server's "listening on" line, so there is no race for a free port).
# Needs wrk (Debian's package, installed here if missing: we run as root in CI), curl, and
# python3 (tomllib) to turn the demo sheet into the JSON body.
set -euo pipefail
cd "$(dirname "$0")/.."

report_only="${LOAD_REPORT_ONLY:-0}"
for arg in "$@"; do
    case "$arg" in
        --report-only) report_only=1 ;;
        -h | --help) sed -n '2,22p' "$0"; exit 0 ;;
        *) echo "load.sh: unknown argument '$arg'" >&2; exit 2 ;;
    esac
done
threads="${LOAD_THREADS:-2}"
connections="${LOAD_CONNECTIONS:-32}"
duration="${LOAD_DURATION:-10s}"
rounds="${LOAD_ROUNDS:-5}"
# wrk takes whole seconds; each slice is the duration over the rounds.
seconds=${duration%s}
case "$seconds" in '' | *[!0-9]*) echo "load.sh: LOAD_DURATION must be whole seconds, like 10s" >&2; exit 2 ;; esac
slice=$((seconds / rounds))
[ "$slice" -ge 1 ] || { echo "load.sh: LOAD_DURATION must give each of the $rounds rounds a second" >&2; exit 2; }
warmup="${LOAD_WARMUP:-2s}"
demo="${LOAD_DEMO:-hover-lamp}"
sheet="demo-claims/$demo.toml"
[ -f "$sheet" ] || { echo "load.sh: no demo sheet $sheet" >&2; exit 2; }

if ! command -v wrk >/dev/null 2>&1; then
    export DEBIAN_FRONTEND=noninteractive
    apt-get update -qq
    apt-get install -y -qq wrk >/dev/null
fi

cargo build --release --locked --quiet
bin=target/release/liftaudit

work=$(mktemp -d)
server_pid=""
cleanup() {
    if [ -n "$server_pid" ] && kill -0 "$server_pid" 2>/dev/null; then
        kill -TERM "$server_pid" 2>/dev/null || true
        for _ in $(seq 50); do
            kill -0 "$server_pid" 2>/dev/null || break
            sleep 0.1
        done
        kill -KILL "$server_pid" 2>/dev/null || true
        wait "$server_pid" 2>/dev/null || true
    fi
    rm -rf "$work"
}
trap cleanup EXIT
trap 'exit 130' INT
trap 'exit 143' TERM

# The request bodies: the demo sheet as JSON for the API, and as the form posts it for the page.
python3 -c 'import json, sys, tomllib; print(json.dumps(tomllib.load(open(sys.argv[1], "rb"))))' \
    "$sheet" >"$work/sheet.json"
cp "$sheet" "$work/sheet.toml"

# One wrk script per route. done() prints one machine-readable line and the latency histogram
# (each distinct latency in microseconds with its count), so that the rounds of a route merge
# into one distribution; wrk counts a status >= 400 in errors.status (the preflight below
# checks each route answers 200 first).
done_lua='
done = function(summary, latency, requests)
  local e = summary.errors
  io.write(string.format("LOADRESULT %d %d %d %d %d %d %d\n",
    summary.requests, summary.duration, e.connect, e.read, e.write, e.status, e.timeout))
  for i = 1, #latency do
    local v, c = latency(i)
    io.write(string.format("LOADHIST %d %d\n", v, c))
  end
end
'
read_body_lua='
local function read_file(path)
  local f = assert(io.open(path, "rb"))
  local s = f:read("*a")
  f:close()
  return s
end
local function urlencode(s)
  return (s:gsub("[^%w%-_%.~]", function(c) return string.format("%%%02X", string.byte(c)) end))
end
'
printf '%s\n' "$done_lua" >"$work/get.lua"
{
    printf '%s\n' "$read_body_lua"
    printf 'wrk.method = "POST"\nwrk.body = read_file("%s")\n' "$work/sheet.json"
    printf 'wrk.headers["Content-Type"] = "application/json"\n'
    printf '%s\n' "$done_lua"
} >"$work/api.lua"
{
    printf '%s\n' "$read_body_lua"
    printf 'wrk.method = "POST"\n'
    printf 'wrk.body = "from=sheet&sheet=" .. urlencode(read_file("%s"))\n' "$work/sheet.toml"
    printf 'wrk.headers["Content-Type"] = "application/x-www-form-urlencoded"\n'
    printf '%s\n' "$done_lua"
} >"$work/page.lua"

# Start the server as `liftaudit serve` runs in production (default log level, one line per
# request, to a file here), and read its address from its log.
NO_COLOR=1 "$bin" serve --addr 127.0.0.1:0 >"$work/server.log" 2>&1 &
server_pid=$!
addr=""
for _ in $(seq 100); do
    addr=$(sed -n 's|.*listening on http://\([0-9.:]*\)/.*|\1|p' "$work/server.log" | head -n1)
    [ -n "$addr" ] && break
    kill -0 "$server_pid" 2>/dev/null || { cat "$work/server.log" >&2; echo "load.sh: the server ended" >&2; exit 1; }
    sleep 0.1
done
[ -n "$addr" ] || { echo "load.sh: the server did not listen within 10 s" >&2; exit 1; }
base="http://$addr"
for _ in $(seq 50); do
    curl -fsS -o /dev/null "$base/healthz" && break
    sleep 0.1
done

# Preflight: each route answers 200 with what it should, so the load measures real answers.
preflight() { # name expected-type curl-args...
    local name=$1 want=$2
    shift 2
    local got
    got=$(curl -sS -o "$work/preflight.body" -w '%{http_code} %{content_type}' "$@")
    case "$got" in
        "200 $want"*) ;;
        *) echo "load.sh: preflight of $name answered '$got'" >&2; head -c 600 "$work/preflight.body" >&2; exit 1 ;;
    esac
}
preflight healthz application/json "$base/healthz"
preflight api application/json -H 'Content-Type: application/json' --data-binary "@$work/sheet.json" "$base/api/v1/check"
preflight page text/html --data-urlencode "sheet@$work/sheet.toml" --data 'from=sheet' "$base/check"
preflight demo-page text/html "$base/demo/$demo"

# name|method path|wrk script
routes=(
    "trivial|GET /healthz|$work/get.lua|$base/healthz"
    "api|POST /api/v1/check ($demo as JSON)|$work/api.lua|$base/api/v1/check"
    "page|POST /check ($demo sheet, verdict page)|$work/page.lua|$base/check"
    "demo|GET /demo/$demo (verdict page of a demo)|$work/get.lua|$base/demo/$demo"
)

cores=$(nproc)
echo "liftaudit load run: $(git rev-parse --short HEAD 2>/dev/null || echo '?') on $(hostname), $cores cores"
echo "wrk and the server share these $cores cores on loopback, so the floors are judged on the"
echo "server's own CPU time per request, route against the trivial route in the same run."
echo "wrk: $threads threads, $connections connections, $((slice * rounds))s per route in $rounds rounds of ${slice}s"
echo "taken in turn, after a $warmup warm-up of each; p50 and p99 are over all of a route's rounds"
echo "load average before: $(cut -d' ' -f1-3 /proc/loadavg)"
echo

# The server's own CPU time (user + system, in clock ticks), to give its cost per request: unlike
# throughput, that does not depend on how much of the machine wrk and other work take.
ticks=$(getconf CLK_TCK)
server_cpu() { awk '{ print $14 + $15 }' "/proc/$server_pid/stat"; }

# The latency below which p percent of a route's requests fell, in ms, from its merged histogram.
percentile() { # p histogram-file
    sort -k2,2n "$2" | awk -v p="$1" '
        { value[NR] = $2; count[NR] = $3; total += $3 }
        END {
            if (total == 0) { print "0.00"; exit }
            want = total * p / 100
            for (i = 1; i <= NR; i++) { seen += count[i]; if (seen >= want) { printf "%.2f", value[i] / 1000; exit } }
        }'
}

declare -A rps p50 p99 errs cpu_us requests micros ticks_used round_n round_ticks
for entry in "${routes[@]}"; do
    IFS='|' read -r name _ script url <<<"$entry"
    wrk -t"$threads" -c"$connections" -d"$warmup" -s "$script" "$url" >/dev/null
    requests[$name]=0 micros[$name]=0 ticks_used[$name]=0 errs[$name]=0
    : >"$work/hist-$name.txt"
done
for round in $(seq "$rounds"); do
    for entry in "${routes[@]}"; do
        IFS='|' read -r name _ script url <<<"$entry"
        cpu0=$(server_cpu)
        out=$(wrk -t"$threads" -c"$connections" -d"${slice}s" --latency -s "$script" "$url")
        cpu1=$(server_cpu)
        echo "$out" >"$work/wrk-$name-$round.txt"
        read -r _ n dur ec er ew es et <<<"$(grep '^LOADRESULT' <<<"$out")"
        grep '^LOADHIST' <<<"$out" >>"$work/hist-$name.txt" || true
        round_n[$name.$round]=$n
        round_ticks[$name.$round]=$((cpu1 - cpu0))
        requests[$name]=$((requests[$name] + n))
        micros[$name]=$((micros[$name] + dur))
        ticks_used[$name]=$((ticks_used[$name] + cpu1 - cpu0))
        errs[$name]=$((errs[$name] + ec + er + ew + es + et))
    done
done
for entry in "${routes[@]}"; do
    IFS='|' read -r name label _ _ <<<"$entry"
    n=${requests[$name]}
    rps[$name]=$(awk -v n="$n" -v d="${micros[$name]}" 'BEGIN { printf "%.0f", n / (d / 1e6) }')
    p50[$name]=$(percentile 50 "$work/hist-$name.txt")
    p99[$name]=$(percentile 99 "$work/hist-$name.txt")
    cpu_us[$name]=$(awk -v c="${ticks_used[$name]}" -v t="$ticks" -v n="$n" 'BEGIN { printf "%.0f", c / t * 1e6 / n }')
    printf '%-7s %-48s %8s req/s  p50 %6s ms  p99 %6s ms  server CPU %4s us/req  errors %d\n' \
        "$name" "$label" "${rps[$name]}" "${p50[$name]}" "${p99[$name]}" "${cpu_us[$name]}" "${errs[$name]}"
done

hwm_kib=$(awk '/^VmHWM:/ { print $2 }' "/proc/$server_pid/status")
rss_mib=$(awk -v k="$hwm_kib" 'BEGIN { printf "%.1f", k / 1024 }')
# CPU per trivial request over CPU per route request: a route as cheap as /healthz gives 1.
cpu_ratio() { # route
    awk -v tt="${ticks_used[trivial]}" -v tn="${requests[trivial]}" \
        -v rt="${ticks_used[$1]}" -v rn="${requests[$1]}" \
        'BEGIN { if (tn > 0 && rt > 0 && rn > 0) printf "%.3f", (tt / tn) / (rt / rn); else printf "0" }'
}
api_ratio=$(cpu_ratio api)
page_ratio=$(cpu_ratio page)
demo_ratio=$(cpu_ratio demo)
# The same ratios round by round: their spread is how far one run's figure can be trusted (the
# machine's drift between the slices of a round, which the totals above average out).
spread() { # route
    for round in $(seq "$rounds"); do
        echo "${round_ticks[trivial.$round]} ${round_n[trivial.$round]} ${round_ticks[$1.$round]} ${round_n[$1.$round]}"
    done | awk '$1 > 0 && $2 > 0 && $3 > 0 && $4 > 0 {
            r = ($1 / $2) / ($3 / $4); if (n == 0 || r < lo) lo = r; if (n == 0 || r > hi) hi = r; n++ }
        END { if (n) printf "%.3f to %.3f", lo, hi; else printf "none" }'
}
echo
echo "CPU per trivial request over CPU per request: api $api_ratio, page $page_ratio (demo page $demo_ratio)"
echo "round by round: api $(spread api), page $(spread page) over $rounds rounds"
echo "server peak RSS (VmHWM): $rss_mib MiB; log lines written: $(wc -l <"$work/server.log")"
echo "load average after: $(cut -d' ' -f1-3 /proc/loadavg)"
echo

failed=0
verdict() { # description, awk condition
    if awk "BEGIN { exit !($2) }"; then
        echo "PASS  $1"
    else
        echo "FAIL  $1"
        failed=1
    fi
}
verdict "API: CPU per trivial request / CPU per API request >= 0.30 ($api_ratio)" "$api_ratio >= 0.30"
verdict "page: CPU per trivial request / CPU per page request >= 0.20 ($page_ratio)" "$page_ratio >= 0.20"
worst_p99=0
for name in trivial api page demo; do
    worst_p99=$(awk -v a="$worst_p99" -v b="${p99[$name]}" 'BEGIN { print (b > a) ? b : a }')
done
verdict "p99 < 10 ms at $connections connections on every route (worst $worst_p99 ms)" "$worst_p99 < 10"
total_errs=$((errs[trivial] + errs[api] + errs[page] + errs[demo]))
verdict "zero errors ($total_errs)" "$total_errs == 0"
verdict "peak RSS < 64 MiB ($rss_mib MiB)" "$rss_mib < 64"

if [ "$failed" -ne 0 ] && [ "$report_only" != 1 ]; then
    exit 1
fi
