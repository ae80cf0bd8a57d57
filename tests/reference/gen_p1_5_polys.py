#!/usr/bin/env python3
"""Prints the two explicit polynomials used in m2_tate.tsv (P1^5, multidegrees (1,1,1,1,2) and (1,1,1,1,0))."""
import itertools, random
# fixed explicit integer polynomials for P1^5 with multidegrees (1,1,1,1,2);(1,1,1,1,0)
rng = random.Random(20261202)
def poly(deg):
    terms = []
    ranges = [[(e, d - e) for e in range(d + 1)] for d in deg]
    for exps in itertools.product(*ranges):
        c = rng.randint(-9, 9)
        if c == 0: c = 1
        mon = []
        for i, (a, b) in enumerate(exps):
            for j, e in ((0, a), (1, b)):
                if e == 1: mon.append("x%d_%d" % (i + 1, j))
                elif e > 1: mon.append("x%d_%d^%d" % (i + 1, j, e))
        terms.append((c, "*".join(mon)))
    s = ""
    for c, m in terms:
        s += (" - " if c < 0 else (" + " if s else "")) + ("%d*" % abs(c) if abs(c) != 1 else "") + m
    return s
print(poly((1,1,1,1,2)))
print(poly((1,1,1,1,0)))
