#!/usr/bin/env bash
# Cohomology benchmarks: prints wall time, throughput and peak memory for the box scans named in
# docs/performance.md. Usage: benches/cohomology.sh   (builds the release binary first)
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
BIN=target/release/sheafwright
have_time=0; [ -x /usr/bin/time ] && have_time=1
run() {
  local label=$1; shift
  local t0 t1 lines mem=""
  t0=$(date +%s.%N)
  if [ $have_time = 1 ]; then
    lines=$( { /usr/bin/time -f "%M" "$BIN" "$@" --json 2>/tmp/sw-bench-mem | wc -l; } )
    mem=$(tail -1 /tmp/sw-bench-mem)
  else
    lines=$("$BIN" "$@" --json | wc -l)
  fi
  t1=$(date +%s.%N)
  awk -v l="$label" -v n="$lines" -v a="$t0" -v b="$t1" -v m="$mem" 'BEGIN {
    s = b - a; printf "%-46s %6d bundles  %7.3f s  %9.0f bundles/s  peak RSS %s KiB\n", l, n, s, n / s, (m == "" ? "n/a" : m) }'
}
echo "# sheafwright cohomology benchmarks on $(nproc) cores ($(date -u +%F))"
run "(a) P1^4 [2,2,2,2], box -4..4, generic" cohomology --ambient 1,1,1,1 --equations 2,2,2,2 --box -4..4
run "(a') same, one thread" cohomology --ambient 1,1,1,1 --equations 2,2,2,2 --box -4..4 --threads 1
run "(b) P5 [3;3], box -6..6, generic" cohomology --ambient 5 --equations "3;3" --box -6..6
run "(b) P2xP3 [2,1;1,3], box -4..4, generic" cohomology --ambient 2,3 --equations "2,1;1,3" --box -4..4
run "(b) P1^5 [1,1,1,1,2;1,1,1,1,0], box -2..2" cohomology --ambient 1,1,1,1,1 --equations "1,1,1,1,2;1,1,1,1,0" --box -2..2
run "(b) P2xP2 [3,3], box -5..5, generic" cohomology --ambient 2,2 --equations 3,3 --box -5..5
# Growth of a box scan with its radius (docs/performance.md, "Growth of a box scan"): benches/cohomology.sh growth
if [ "${1:-}" = growth ]; then
  for n in 2 3 4 5 6; do
    run "(g) P1^4 [2,2,2,2], box -$n..$n" cohomology --ambient 1,1,1,1 --equations 2,2,2,2 --box "-$n..$n"
  done
fi
