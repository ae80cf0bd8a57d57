#!/usr/bin/env bash
# Coupling benchmarks: per model and per operator time of `sheafwright couplings` (one thread) for every demo
# model with a bundle, the benchmark models in benches/models (a family with psi-dependent textures) and invented
# rank-5 sums on two codimension-2 configurations.
# Usage: benches/couplings_report.sh   (builds the release binary first). Goal: each demo model under 1 s.
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
BIN=target/release/sheafwright
export RAYON_NUM_THREADS=1
echo "# sheafwright coupling benchmarks, one thread ($(date -u +%F))"
run() {
  local label=$1; shift
  local t0 t1
  t0=$(date +%s.%N)
  "$BIN" couplings "$@" --timing 2>/tmp/sw-couplings-timing >/dev/null || true
  t1=$(date +%s.%N)
  awk -v l="$label" -v a="$t0" -v b="$t1" 'BEGIN { printf "%-44s wall %7.3f s\n", l, b - a }'
  grep -v ' 0.0 ms' /tmp/sw-couplings-timing | grep '^timing' | sed 's/^/    /'
}
for f in catalogs-demo/*.toml benches/models/*.toml; do
  grep -q '^\[bundle\]' "$f" || continue
  run "$(basename "$f" .toml)" "$f"
done
run "rank 5 on P2xP3[(2,1);(1,3)] (invented)" --ambient 2,3 --equations "2,1;1,3" \
  --bundles "2,-1;-1,1;0,-1;-1,1;0,0"
# allowed entries with non-zero values (1 5 5bar at type sum 2); fails the consistency checks (invented)
run "rank 5 on P1^5[(1,1,1,1,2);(1,1,1,1,0)] (invented)" --ambient 1,1,1,1,1 --equations "1,1,1,1,2;1,1,1,1,0" \
  --bundles "0,-1,1,0,1;0,1,0,0,-1;-1,0,1,1,0;0,1,-1,0,1;1,-1,-1,-1,-1"
# non-zero cubic matter couplings in codimension 2 (found by benches/search_codim2_couplings.py; invented)
run "rank 5, 10 10 5 non-zero, P1^5[(1,1,1,1,2);(1,1,1,1,0)]" --ambient 1,1,1,1,1 --equations "1,1,1,1,2;1,1,1,1,0" \
  --bundles "2,-1,2,-1,2;-1,2,-2,-1,-2;-1,-1,1,2,1;0,0,-2,0,0;0,0,1,0,-1"
run "rank 5, 5bar 10 5bar non-zero, same configuration" --ambient 1,1,1,1,1 --equations "1,1,1,1,2;1,1,1,1,0" \
  --bundles "0,0,0,2,-2;2,-1,0,2,1;2,-1,0,-2,0;-2,-1,0,-1,-1;-2,3,0,-1,2"
