#!/usr/bin/env bash
# Scan benchmark: rank 5 on P1^4[2,2,2,2], entries -2..2, 3 families x |G| = 4, all filters.
# Prints the human summary (funnel, candidates/s) and wall time / peak RSS from /usr/bin/time -v.
# Then estimates the -3..3 box from SAMPLE shards (default 1 of 400): full time ≈ sample time × N.
set -euo pipefail
cd "$(dirname "$0")/.."
THREADS=${THREADS:-2}
N=${N:-400}
cargo build --release --quiet
bin=target/release/sheafwright
echo "== full scan, entries -2..2, $THREADS threads =="
/usr/bin/time -v "$bin" scan benches/scan/tetraquadric-rank5.toml --threads "$THREADS" -o /tmp/sheafwright-bench-scan.jsonl 2> /tmp/sheafwright-bench-scan.time
grep -E "Elapsed|Maximum resident|User time|Percent of CPU" /tmp/sheafwright-bench-scan.time
echo "== sample shard 1/$N of entries -3..3 (estimate: multiply the time by $N) =="
/usr/bin/time -v "$bin" scan benches/scan/tetraquadric-rank5-wide.toml --threads "$THREADS" --shard "1/$N" 2> /tmp/sheafwright-bench-scan-wide.time
grep -E "Elapsed|Maximum resident|User time|Percent of CPU" /tmp/sheafwright-bench-scan-wide.time
