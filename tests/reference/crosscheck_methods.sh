#!/usr/bin/env bash
# Cross-check the two Macaulay2 methods against each other on hypersurface cases:
# 'les' (lb_hypersurface.m2) versus 'proj' (lb_cohomology.m2, Proj/Segre sheaf cohomology).
# usage: tests/reference/crosscheck_methods.sh   (each proj run is capped at ${T:-120} s)
cd "$(dirname "$0")"
T=${T:-120}
fail=0
while IFS='|' read -r amb eqs bun; do
  a=$(M2 --script m2_one.m2 "$amb" "$eqs" generic "$bun" les | grep -o 'h=[0-9,]*')
  b=$(timeout "$T" M2 --script m2_one.m2 "$amb" "$eqs" generic "$bun" proj | grep -o 'h=[0-9,]*')
  if [ -z "$b" ]; then s="proj-timeout"; elif [ "$a" = "$b" ]; then s=agree; else s=DISAGREE; fail=1; fi
  echo "$amb | $eqs | $bun : les $a  proj ${b:-?}  $s"
done <<'CASES'
4|5|-3
4|5|-1
4|5|0
4|5|2
4|5|3
2,2|3,3|0,0
2,2|3,3|1,-1
2,2|3,3|-1,1
2,2|3,3|1,0
2,2|3,3|3,-1
2,2|3,3|-3,1
CASES
exit $fail
