#!/usr/bin/env bash
# Side-by-side comparison of sheafwright and Macaulay2 on identical cases.
#
#   benches/m2_compare.sh            (run from the repository root)
#
# For every case: run Macaulay2 (tests/reference/m2_one.m2) and
# `target/release/sheafwright cohomology ... --json`, each under /usr/bin/time -v,
# check that the h vectors agree, print per-case wall times, the median speed ratio
# (M2 time / sheafwright time, whole-process wall time for both, measured with
# date +%s.%N around each command; includes M2's ~0.5 s start-up), the median
# compute-only ratio (the seconds Macaulay2 reports for its own computation versus
# the time sheafwright reports with --timing, both excluding start-up and output),
# and the peak RSS of each tool.  Exit status 1 if any answer disagrees or a tool fails.
# Skips (exit 0) with a message if Macaulay2 or the release binary is missing.
set -u
cd "$(dirname "$0")/.."
ROOT=$(pwd)
BIN="${SHEAFWRIGHT_BIN:-$ROOT/target/release/sheafwright}"
M2SCRIPT="$ROOT/tests/reference/m2_one.m2"

if ! command -v M2 >/dev/null 2>&1; then
  echo "SKIP: Macaulay2 (M2) is not installed (apt-get install -y macaulay2)"; exit 0
fi
if [ ! -x "$BIN" ]; then
  echo "SKIP: $BIN not found (cargo build --release first)"; exit 0
fi
if [ ! -x /usr/bin/time ]; then
  echo "SKIP: /usr/bin/time not found (apt-get install -y time)"; exit 0
fi

# ambient | equations | bundle [| M2 method: auto (default), proj or les]   (generic equations)
# "proj" is Macaulay2's general sheaf cohomology (HH^i on Proj); "les" is the elementary long-exact-sequence
# rank computation written in M2 for hypersurfaces in products (see tests/reference/README.md).
CASES=(
  "4|5|2"      "4|5|-3"     "5|3;3|2"    "5|3;3|-1"   "6|2;2;3|1"  "7|2;2;2;2|-1"
  "1,1,1,1|2,2,2,2|-2,2,2,2"  "1,1,1,1|2,2,2,2|2,-2,-2,-2" "1,1,1,1|2,2,2,2|-2,2,0,0"
  "1,1,1,1|2,2,2,2|-3,2,2,2"  "1,1,1,1|2,2,2,2|-2,-2,2,2"  "1,1,1,1|2,2,2,2|-2,3,1,0"
  "1,1,1,1|2,2,2,2|-3,3,3,3"  "1,1,1,1|2,2,2,2|1,1,1,1"    "1,1,1,1|2,2,2,2|-1,2,0,1"
  "2,2|3,3|3,-1"  "2,2|3,3|-3,2"  "2,2|3,3|3,-3"  "2,2|3,3|-1,3"  "2,2|3,3|2,1"
  "2,2|3,3|1,-1"  "2,2|3,3|0,0"
  "1,4|1,1;1,4|0,0"
  "2,2|3,3|0,0|proj" "2,2|3,3|1,-1|proj" "2,2|3,3|-1,1|proj" "2,2|3,3|1,0|proj"
)

TMP=$(mktemp -d); trap 'rm -rf "$TMP"' EXIT
now() { date +%s.%N; }
rss()  { grep "Maximum resident set size" "$1" | awk '{print $NF}'; }

printf "%-10s %-10s %-14s %-5s %-12s %-12s %9s %9s %8s %10s\n" ambient equations bundle m2 h_m2 h_sw t_m2[s] t_sw[s] ratio compute×
fail=0; ratios=(); cratios=(); pratios=(); lratios=(); peak_m2=0; peak_sw=0
for c in "${CASES[@]}"; do
  IFS='|' read -r amb eqs bun meth <<<"$c"
  meth=${meth:-auto}
  t0=$(now)
  /usr/bin/time -v -o "$TMP/m2.time" M2 --script "$M2SCRIPT" "$amb" "$eqs" generic "$bun" "$meth" >"$TMP/m2.out" 2>"$TMP/m2.err"
  t1=$(now)
  hm2=$(grep -o 'h=[0-9,]*' "$TMP/m2.out" | cut -d= -f2)
  t2=$(now)
  /usr/bin/time -v -o "$TMP/sw.time" "$BIN" cohomology --ambient "$amb" --equations "$eqs" --bundle "$bun" --json --timing >"$TMP/sw.out" 2>"$TMP/sw.err"
  t3=$(now)
  hsw=$(python3 -c 'import json,sys; print(",".join(map(str, json.load(open(sys.argv[1]))["h"])))' "$TMP/sw.out" 2>/dev/null)
  tm2=$(python3 -c "print('%.3f' % ($t1 - $t0))"); tsw=$(python3 -c "print('%.3f' % ($t3 - $t2))")
  rm2=$(rss "$TMP/m2.time"); rsw=$(rss "$TMP/sw.time")
  [ "${rm2:-0}" -gt "$peak_m2" ] && peak_m2=$rm2
  [ "${rsw:-0}" -gt "$peak_sw" ] && peak_sw=$rsw
  ratio=$(python3 -c "print('%.1f' % ($tm2 / max($tsw, 1e-4)))")
  ratios+=("$ratio")
  cm2=$(grep -o 'seconds=[0-9.]*' "$TMP/m2.out" | cut -d= -f2)
  csw=$(grep -o 'computed in [0-9.]*' "$TMP/sw.err" | awk '{print $3 / 1e6}')
  cratio=$(python3 -c "print('%.0f' % (float('${cm2:-0}') / max(float('${csw:-0}'), 1e-7)))")
  cratios+=("$cratio")
  used=$(grep -o 'method=[a-z]*' "$TMP/m2.out" | cut -d= -f2)
  if [ "$used" = "proj" ]; then pratios+=("$cratio"); else lratios+=("$cratio"); fi
  status=""
  if [ -z "$hm2" ] || [ -z "$hsw" ] || [ "$hm2" != "$hsw" ]; then status="  MISMATCH"; fail=1; fi
  printf "%-10s %-10s %-14s %-5s %-12s %-12s %9s %9s %8s %10s%s\n" "$amb" "$eqs" "$bun" "${used:-?}" "${hm2:-ERR}" "${hsw:-ERR}" "$tm2" "$tsw" "$ratio" "$cratio" "$status"
done
median=$(printf "%s\n" "${ratios[@]}" | sort -g | awk '{a[NR]=$1} END {if (NR%2) print a[(NR+1)/2]; else print (a[NR/2]+a[NR/2+1])/2}')
echo "cases: ${#CASES[@]}"
echo "median speed ratio (M2 wall / sheafwright wall, whole processes): ${median}x"
cmedian=$(printf "%s\n" "${cratios[@]}" | sort -g | awk '{a[NR]=$1} END {if (NR%2) print a[(NR+1)/2]; else print (a[NR/2]+a[NR/2+1])/2}')
echo "median compute-only ratio (M2 reported seconds / sheafwright --timing): ${cmedian}x"
med() { printf "%s\n" "$@" | sort -g | awk '{a[NR]=$1} END {if (NR==0) print "n/a"; else if (NR%2) print a[(NR+1)/2]; else print (a[NR/2]+a[NR/2+1])/2}'; }
echo "  against Macaulay2 sheaf cohomology (proj, ${#pratios[@]} cases): $(med "${pratios[@]}")x"
echo "  against the elementary M2 rank routine (les, ${#lratios[@]} cases): $(med "${lratios[@]}")x"
echo "peak RSS: Macaulay2 ${peak_m2} KiB, sheafwright ${peak_sw} KiB"
if [ "$fail" -ne 0 ]; then echo "RESULT: some answers DISAGREE"; exit 1; fi
echo "RESULT: all ${#CASES[@]} cases agree"
