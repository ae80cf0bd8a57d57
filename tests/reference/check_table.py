#!/usr/bin/env python3
"""Sanity checks for m2_cohomology.tsv (no Macaulay2 needed).

For every row: h0-h1+h2-h3 equals the Hirzebruch-Riemann-Roch index
    chi = (1/6) d_rst k^r k^s k^t + (1/12) c2_r k^r
computed from the Chow ring Z[J]/(J_i^{n_i+1}), mu = prod_j (q_j.J),
c(TX) = prod_i (1+J_i)^{n_i+1} / prod_j (1+q_j.J);  all entries >= 0;
the Calabi-Yau condition and dim X = 3 hold; h(0) = (1,0,0,1); and
Serre duality h^q(k) = h^{3-q}(-k) whenever both k and -k are in the table
for the same configuration and polynomials.
usage: python3 check_table.py [TABLE]     exit status 1 on any failure
"""
import sys, os
from fractions import Fraction
from itertools import product

def pmul(a, b, n):
    out = {}
    for ea, ca in a.items():
        for eb, cb in b.items():
            e = tuple(x + y for x, y in zip(ea, eb))
            if any(x > ni for x, ni in zip(e, n)) or sum(e) > sum(n):
                continue
            out[e] = out.get(e, 0) + ca * cb
    return {e: c for e, c in out.items() if c != 0}

def linear(coeffs, m, const=0):
    p = {}
    if const:
        p[(0,) * m] = Fraction(const)
    for i, c in enumerate(coeffs):
        if c:
            e = [0] * m; e[i] = 1
            p[tuple(e)] = Fraction(c)
    return p

def degree_part(p, d):
    return {e: c for e, c in p.items() if sum(e) == d}

def chern2(n, qs):
    m = len(n)
    tot = {(0,) * m: Fraction(1)}
    for i, ni in enumerate(n):
        f = linear([1 if l == i else 0 for l in range(m)], m, 1)
        for _ in range(ni + 1):
            tot = pmul(tot, f, n)
    for q in qs:
        # 1/(1+x) = 1 - x + x^2 - ... (truncated at degree 2 suffices)
        x = linear(q, m)
        inv = {(0,) * m: Fraction(1)}
        x2 = pmul(x, x, n)
        for e, c in x.items():
            inv[e] = inv.get(e, 0) - c
        for e, c in x2.items():
            inv[e] = inv.get(e, 0) + c
        tot = pmul(tot, inv, n)
    return degree_part(tot, 2), degree_part(tot, 1)

def index(n, qs, k):
    m = len(n)
    mu = {(0,) * m: Fraction(1)}
    for q in qs:
        mu = pmul(mu, linear(q, m), n)
    D = linear(k, m)
    c2, c1 = chern2(n, qs)
    assert not c1, "c1(TX) != 0"
    D3 = pmul(pmul(D, D, n), D, n)
    integrand = {e: c / 6 for e, c in D3.items()}
    for e, c in pmul(c2, D, n).items():
        integrand[e] = integrand.get(e, 0) + c / 12
    top = pmul(integrand, mu, n)
    return top.get(tuple(n), Fraction(0))

def main():
    path = sys.argv[1] if len(sys.argv) > 1 else os.path.join(os.path.dirname(os.path.abspath(__file__)), "m2_cohomology.tsv")
    rows, header = [], None
    for line in open(path):
        line = line.rstrip("\n")
        if not line or line.startswith("#"):
            continue
        f = line.split("\t")
        if header is None:
            header = f
            assert header == ["ambient", "equations", "polynomials", "bundle", "h", "m2_seconds"], header
            continue
        rows.append(dict(zip(header, f)))
    fails, table = [], {}
    for r in rows:
        n = [int(x) for x in r["ambient"].split(",")]
        qs = [[int(x) for x in e.split(",")] for e in r["equations"].split(";")]
        k = tuple(int(x) for x in r["bundle"].split(","))
        h = [int(x) for x in r["h"].split(",")]
        tag = "%s | %s | %s | %s" % (r["ambient"], r["equations"], "generic" if r["polynomials"] == "generic" else "special", r["bundle"])
        if sum(n) - len(qs) != 3 or any(sum(q[i] for q in qs) != n[i] + 1 for i in range(len(n))):
            fails.append(tag + ": not a CY threefold configuration")
        if len(h) != 4 or min(h) < 0:
            fails.append(tag + ": bad h %s" % h)
        chi = index(n, qs, k)
        alt = h[0] - h[1] + h[2] - h[3]
        if chi != alt:
            fails.append(tag + ": index %s != alternating sum %s (h=%s)" % (chi, alt, h))
        if all(x == 0 for x in k) and h != [1, 0, 0, 1]:
            fails.append(tag + ": h(0) = %s" % h)
        table[(r["ambient"], r["equations"], r["polynomials"], k)] = (h, tag)
    nserre = 0
    for (a, e, p, k), (h, tag) in table.items():
        dual = table.get((a, e, p, tuple(-x for x in k)))
        if dual:
            nserre += 1
            if dual[0] != h[::-1]:
                fails.append(tag + ": Serre duality fails, h(k)=%s h(-k)=%s" % (h, dual[0]))
    print("rows checked: %d, Serre pairs checked: %d" % (len(rows), nserre))
    for f in fails:
        print("FAIL", f)
    print("%d passed, %d failed" % (len(rows) - len({f.split(':')[0] for f in fails}), len({f.split(':')[0] for f in fails})))
    sys.exit(1 if fails else 0)

if __name__ == "__main__":
    main()
