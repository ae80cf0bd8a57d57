#!/usr/bin/env bash
# Export size and time per demo model (JSON and npz), plus the Python reader's full check where it applies.
# Usage: benches/export.sh            (builds the release binary first; one run per model)
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
bin=target/release/sheafwright
out=$(mktemp -d)
trap 'rm -rf "$out"' EXIT
printf '%-24s %12s %12s %8s %8s %10s %10s\n' model json_bytes npz_bytes json_s npz_s pou_forms reader_s
for model in catalogs-demo/*.toml; do
  name=$(basename "$model" .toml)
  start=$(date +%s.%N)
  if ! err=$("$bin" export "$model" -o "$out/$name.json" 2>&1 >/dev/null); then
    printf '%-24s refused: %s\n' "$name" "${err##*: }"   # scan files and geometry-only models
    continue
  fi
  mid=$(date +%s.%N)
  "$bin" export "$model" -o "$out/$name.npz" --format npz >/dev/null
  end=$(date +%s.%N)
  pou=$(python3 -c "import json,sys; d=json.load(open(sys.argv[1])); print(sum(c['on_x']=='partition_of_unity' for m in d['multiplets'] for c in m['classes']))" "$out/$name.json")
  rstart=$(date +%s.%N)
  python3 docs/examples/read_export.py "$out/$name.json" --all >/dev/null || echo "reader FAILED on $name"
  rend=$(date +%s.%N)
  printf '%-24s %12d %12d %8.2f %8.2f %10d %10.1f\n' "$name" "$(stat -c %s "$out/$name.json")" \
    "$(stat -c %s "$out/$name.npz")" "$(awk "BEGIN{print $mid - $start}")" "$(awk "BEGIN{print $end - $mid}")" "$pou" \
    "$(awk "BEGIN{print $rend - $rstart}")"
done
