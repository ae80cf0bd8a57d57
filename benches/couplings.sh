#!/usr/bin/env bash
# Yukawa-value benchmarks: per-tensor and per-model times of the exact couplings (one core) for every demo
# model's multiplet triples, two codimension-2 configurations and one all-type-1 codimension-2 triple.
# Usage: benches/couplings.sh [MODEL.toml ...]   (default: catalogs-demo/*.toml)
set -euo pipefail
cd "$(dirname "$0")/.."
echo "# sheafwright coupling benchmarks ($(date -u +%F), $(nproc) cores available, single-threaded)"
cargo run --release --quiet --example couplings_bench -- "$@"
