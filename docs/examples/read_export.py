#!/usr/bin/env python3
"""Read a sheafwright export file (schema "sheafwright-export", version 1) with the Python standard library only.

What it does (docs/export-schema.md, docs/representatives.md):
  1. loads the JSON file and rebuilds the defining polynomials from their exponent arrays and exact coefficients;
  2. finds a point of X by Newton's method in the affine chart x_{i,0} = 1 of every factor (complex arithmetic,
     Gaussian elimination with partial pivoting), starting from a seeded random point of the ambient space A;
  3. evaluates the coefficient functions of one class's ambient Dolbeault forms at that point;
  4. checks, by central finite differences of those coefficient functions, the property that holds exactly:
     every exported ambient form is d-bar closed on the product of punctured cones (C^{n_i+1} minus 0), in
     homogeneous coordinates with all the dxbar_{i,l}, and horizontal (its contraction with each
     Ebar_i = sum_l xbar_{i,l} d/dxbar_{i,l} vanishes), so it descends to a d-bar closed form on A and its pullback
     to X is d-bar closed. In an affine chart a top-degree form on P^n is trivially closed; the homogeneous check
     is the one with content.

  5. for a model with a symbolic parameter (`polynomials.family`): checks exactly (Fractions) that substituting
     `family.value` into the family's coefficients gives `polynomials.equations`, and evaluates the couplings'
     rational functions of the parameter exactly at the member.

Tolerance: step h = 1e-5 (relative to the point), and a residual at most TOL = 1e-6 times the largest single
derivative term (the central-difference error is O(h^2) ~ 1e-10 relative, rounding ~ 1e-11).

Usage:
  read_export.py FILE.json                 # one class (the first), report and check
  read_export.py FILE.json --all --points 3  # every ambient form of every class, at 3 random points of X
Exit status 0 when every check passes, 1 when one fails, 2 on unusable input.
"""

import cmath
import json
import random
import sys
from fractions import Fraction

TOL = 1e-6
STEP = 1e-5


def exact(text):
    """An exact coefficient string ("p/q" or an integer) as a Fraction."""
    return Fraction(text)


class Export:
    def __init__(self, data):
        if data.get("schema") != "sheafwright-export" or data.get("version") != 1:
            raise ValueError("not a sheafwright-export version 1 file")
        self.data = data
        cfg = data["configuration"]
        self.dims = cfg["ambient"]
        self.offsets = []
        off = 0
        for n in self.dims:
            self.offsets.append(off)
            off += n + 1
        self.nvars = off
        self.face_forms = {(f["n"], f["m"], tuple(f["face"])): f["terms"] for f in data.get("face_forms", [])}
        self.polys = [
            [(e, complex(exact(c))) for e, c in zip(p["exponents"], p["coefficients"])]
            for p in data["polynomials"]["equations"]
        ]

    # ---- polynomials ------------------------------------------------------------------------------------
    def eval_poly(self, j, x):
        total = 0j
        for e, c in self.polys[j]:
            t = c
            for v, k in enumerate(e):
                if k:
                    t *= x[v] ** k
            total += t
        return total

    def grad_poly(self, j, x):
        g = [0j] * self.nvars
        for e, c in self.polys[j]:
            for v, k in enumerate(e):
                if k == 0:
                    continue
                t = c * k
                for w, kw in enumerate(e):
                    p = kw - 1 if w == v else kw
                    if p:
                        t *= x[w] ** p
                g[v] += t
        return g

    # ---- a point of X -----------------------------------------------------------------------------------
    def point_on_x(self, rng, tries=50):
        """Newton's method in the chart x_{i,0} = 1; the unknowns are K affine coordinates (the last coordinate
        of the first factors, then further ones), the others stay at a random value."""
        K = len(self.polys)
        free = [self.offsets[i] + l for i, n in enumerate(self.dims) for l in range(1, n + 1)]
        for _ in range(tries):
            x = [complex(rng.gauss(0, 1), rng.gauss(0, 1)) for _ in range(self.nvars)]
            for o in self.offsets:
                x[o] = 1 + 0j
            unknowns = rng.sample(free, K)
            for _ in range(100):
                f = [self.eval_poly(j, x) for j in range(K)]
                if max(abs(v) for v in f) < 1e-12 * max(1.0, max(abs(c) for _, c in self.polys[0])):
                    return x
                jac = [[self.grad_poly(j, x)[u] for u in unknowns] for j in range(K)]
                step = solve(jac, [-v for v in f])
                if step is None:
                    break
                for u, s in zip(unknowns, step):
                    x[u] += s
                if max(abs(v) for v in x) > 1e6:
                    break
        raise RuntimeError("Newton's method found no point of X")

    # ---- forms ------------------------------------------------------------------------------------------
    def form_coefficients(self, form, x, xbar):
        """The ambient form as {tuple of global dxbar indices: complex coefficient} at (x, xbar)."""
        parts = [((), complex(exact(form["coefficient"])))]
        for i, factor in enumerate(form["factors"]):
            o, n = self.offsets[i], self.dims[i]
            kappa = sum(x[o + l] * xbar[o + l] for l in range(n + 1))
            new = []
            for key, val in parts:
                for t in factor["terms"]:
                    v = complex(exact(t["coefficient"]))
                    for l in range(n + 1):
                        if t["x"][l]:
                            v *= x[o + l] ** t["x"][l]
                        if t["xbar"][l]:
                            v *= xbar[o + l] ** t["xbar"][l]
                    if t["kappa_power"]:
                        v *= kappa ** t["kappa_power"]
                    # factors are wedged in order and their indices increase: concatenation is sorted
                    new.append((key + tuple(o + l for l in t["dxbar"]), val * v))
            parts = new
        out = {}
        for key, val in parts:
            out[key] = out.get(key, 0j) + val
        return out

    def face_form_values(self, x, xbar, i, face, m):
        """The face form F_face^(m) of factor i at (x, xbar) from the file's face_forms table, as
        {tuple of global dxbar indices: complex coefficient}."""
        o, n = self.offsets[i], self.dims[i]
        terms = self.face_forms[(n, m, tuple(face))]
        kappa = sum((x[o + l] * xbar[o + l]) ** m for l in range(n + 1))
        out = {}
        for t in terms:
            v = complex(exact(t["coefficient"])) * kappa ** t["kappa_power"]
            for l in range(n + 1):
                if t["x"][l]:
                    v *= x[o + l] ** t["x"][l]
                if t["xbar"][l]:
                    v *= xbar[o + l] ** t["xbar"][l]
            key = tuple(o + l for l in t["dxbar"])
            out[key] = out.get(key, 0j) + v
        return out

    def partition_form(self, cls, koszul, x, xbar):
        """Phi of the lift terms of one Koszul set: sum of c x^e F_I1 ^ ... ^ F_Im (factor order), with this
        class's partition exponents (dictionary.partition_of_unity)."""
        ms = cls["partition_exponents"]
        cache = {}
        out = {}
        for t in cls["lift"]:
            if t["koszul"] != koszul:
                continue
            v = complex(exact(t["coefficient"]))
            for i, e in enumerate(t["monomial"]):
                for l, k in enumerate(e):
                    if k:
                        v *= x[self.offsets[i] + l] ** k
            parts = [((), v)]
            for i, face in enumerate(t["faces"]):
                key = (i, tuple(face))
                if key not in cache:
                    cache[key] = self.face_form_values(x, xbar, i, face, ms[i])
                # factors are wedged in order and their indices increase: concatenation is sorted
                parts = [(k1 + k2, v1 * v2) for k1, v1 in parts for k2, v2 in cache[key].items()]
            for k, val in parts:
                out[k] = out.get(k, 0j) + val
        return out

    def check_form(self, form, x):
        """Return (d-bar residual, scale, horizontality residual) of one ambient form at the point x."""
        return self.check_function(lambda y, ybar: self.form_coefficients(form, y, ybar), x)[:4]

    def check_function(self, coefficients, x):
        """d-bar by central finite differences and horizontality of the form given by coefficients(x, xbar) at
        x: returns (residual, scale, horizontality residual, size of the form, the d-bar form)."""
        xbar = [v.conjugate() for v in x]
        base = coefficients(x, xbar)
        h = STEP * max(1.0, max(abs(v) for v in x))
        dbar = {}
        scale = 0.0
        for v in range(self.nvars):
            # Wirtinger derivative d/dxbar_v = (d/du + i d/dw) / 2 with x_v = u + i w, by central differences
            def at(delta):
                y = list(x)
                y[v] += delta
                return coefficients(y, [c.conjugate() for c in y])

            pu, mu, pw, mw = at(h), at(-h), at(1j * h), at(-1j * h)
            for key in base:
                du = (pu.get(key, 0j) - mu.get(key, 0j)) / (2 * h)
                dw = (pw.get(key, 0j) - mw.get(key, 0j)) / (2 * h)
                d = (du + 1j * dw) / 2
                if v in key:
                    continue
                sign = -1 if sum(1 for k in key if k < v) % 2 else 1
                new = tuple(sorted(key + (v,)))
                dbar[new] = dbar.get(new, 0j) + sign * d
                scale = max(scale, abs(d))
        residual = max((abs(c) for c in dbar.values()), default=0.0)
        # horizontality: contraction with Ebar_i removes one dxbar of factor i, weighted by xbar
        contraction = {}
        for key, val in base.items():
            for pos, k in enumerate(key):
                rest = key[:pos] + key[pos + 1:]
                i = max(j for j, o in enumerate(self.offsets) if o <= k)
                c = contraction.setdefault((i, rest), 0j)
                contraction[(i, rest)] = c + (-1) ** pos * xbar[k] * val
        bscale = max((abs(v) for v in base.values()), default=0.0)
        horiz = max((abs(c) for c in contraction.values()), default=0.0)
        return residual, scale, horiz, bscale, dbar

    def check_partition_class(self, cls, x, rng):
        """The partition-of-unity form Phi(lift_0) of a type >= 1 class: at the point x of X its d-bar vanishes
        (relative to the size of its derivative terms) and it is horizontal; as a control, at a random point of
        the ambient space off X, d-bar Phi(lift_0) = (-1)^degree sum_j p_j Phi(lift_{[j]}). Returns
        (relative residual on X, relative mismatch off X, horizontality ok)."""
        form = lambda y, ybar: self.partition_form(cls, [], y, ybar)
        residual, scale, horiz, bscale, _ = self.check_function(form, x)
        on_x = residual / scale if scale > 0 else residual
        horizontal = horiz <= 1e-9 * max(bscale, 1e-300) * max(abs(v) for v in x)
        y = [complex(rng.gauss(0, 1), rng.gauss(0, 1)) for _ in range(self.nvars)]
        for o in self.offsets:
            y[o] = 1 + 0j
        _, yscale, _, _, dbar = self.check_function(form, y)
        ybar = [v.conjugate() for v in y]
        sign = -1 if cls["degree"] % 2 else 1
        rhs = {}
        for j in range(len(self.polys)):
            pj = self.eval_poly(j, y)
            for key, val in self.partition_form(cls, [j + 1], y, ybar).items():
                rhs[key] = rhs.get(key, 0j) + sign * pj * val
        keys = set(dbar) | set(rhs)
        mismatch = max((abs(dbar.get(k, 0j) - rhs.get(k, 0j)) for k in keys), default=0.0)
        size = max([abs(v) for v in rhs.values()] + [yscale, 1e-300])
        return on_x, mismatch / size, horizontal


def solve(a, b):
    """Solve a x = b (complex, small, square) by Gaussian elimination with partial pivoting; None if singular."""
    n = len(b)
    m = [row[:] + [b[i]] for i, row in enumerate(a)]
    for c in range(n):
        p = max(range(c, n), key=lambda r: abs(m[r][c]))
        if abs(m[p][c]) < 1e-14:
            return None
        m[c], m[p] = m[p], m[c]
        for r in range(n):
            if r != c:
                f = m[r][c] / m[c][c]
                for k in range(c, n + 1):
                    m[r][k] -= f * m[c][k]
    return [m[i][n] / m[i][i] for i in range(n)]


def eval_ascending(coefficients, t):
    """An exact polynomial in one variable (ascending exact coefficient strings) at the Fraction t."""
    acc = Fraction(0)
    for c in reversed(coefficients):
        acc = acc * t + exact(c)
    return acc


def coupling_at(entry, t):
    """The exact value of a coupling entry at parameter value t (None for a pole or no rational function)."""
    f = entry.get("rational_function")
    if f is None:
        return None
    den = eval_ascending(f["denominator"], t)
    return None if den == 0 else eval_ascending(f["numerator"], t) / den


def check_family(data):
    """Exact family checks; returns the number of failures (0 without a family)."""
    fam = data["polynomials"].get("family")
    if fam is None:
        return 0
    t = exact(fam["value"])
    failures = 0
    for j, (member, poly) in enumerate(zip(data["polynomials"]["equations"], fam["equations"])):
        want = {tuple(e): exact(c) for e, c in zip(member["exponents"], member["coefficients"])}
        got = {}
        for e, cs in zip(poly["exponents"], poly["coefficients"]):
            v = eval_ascending(cs, t)
            if v != 0:
                got[tuple(e)] = v
        if got != want:
            failures += 1
            print(f"FAIL equation {j + 1}: the family at {fam['parameter']} = {fam['value']} is not the member")
    entries = [e for c in data.get("couplings", {}).get("classes", []) for e in c["entries"]
               if e.get("rational_function") is not None]
    varying = sum(1 for e in entries if len(e["rational_function"]["numerator"]) > 1
                  or len(e["rational_function"]["denominator"]) > 1)
    at_member = sum(1 for e in entries if coupling_at(e, t) is not None)
    print(f"family {fam['parameter']}: {len(fam['equations'])} polynomial(s) at {fam['parameter']} = {fam['value']} "
          f"{'reproduce' if failures == 0 else 'do NOT reproduce'} the member exactly; {len(entries)} coupling "
          f"entries are rational functions of {fam['parameter']} ({varying} not constant, {at_member} finite at "
          f"the member)")
    return failures


def main(argv):
    if len(argv) < 2:
        print(__doc__)
        return 2
    path = argv[1]
    check_all = "--all" in argv
    points = int(argv[argv.index("--points") + 1]) if "--points" in argv else 1
    try:
        with open(path, encoding="utf-8") as f:
            exp = Export(json.load(f))
    except (OSError, ValueError, KeyError) as e:
        print(f"error: {path}: {e}")
        return 2
    family_failures = check_family(exp.data)
    rng = random.Random(20261202)
    classes = [(m["label"], i, c) for m in exp.data["multiplets"] for i, c in enumerate(m["classes"])]
    if not classes:
        print("no classes in this export")
        return 1 if family_failures else 0
    if not check_all:
        classes = classes[:1]
    failures = 0
    forms_checked = 0
    worst = 0.0
    for p in range(points):
        x = exp.point_on_x(rng)
        eq = max(abs(exp.eval_poly(j, x)) for j in range(len(exp.polys)))
        if p == 0:
            print(f"point of X (chart x_i0 = 1): max |p_j(x)| = {eq:.2e}")
        for label, i, c in classes:
            for form in c["ambient_forms"]:
                residual, scale, horiz, bscale = exp.check_form(form, x)
                forms_checked += 1
                rel = residual / scale if scale > 0 else residual
                worst = max(worst, rel)
                ok = rel <= TOL and horiz <= 1e-9 * max(bscale, 1e-300) * max(abs(v) for v in x)
                if not ok:
                    failures += 1
                    print(f"FAIL {label} class {i}: dbar residual {residual:.3e} (scale {scale:.3e}), "
                          f"horizontality {horiz:.3e}")
                if p == 0 and not check_all:
                    coeffs = exp.form_coefficients(form, x, [v.conjugate() for v in x])
                    names = exp.data["configuration"]["variables"]
                    print(f"{label} class {i} (type {c['type']}, on X: {c['on_x']}), form in "
                          f"O_A({','.join(map(str, form['bundle']))}), koszul {form['koszul']}:")
                    for key, val in sorted(coeffs.items()):
                        wedge = "^".join("dxbar(" + names[k] + ")" for k in key) or "1"
                        print(f"  {wedge}: {val:.6g}")
    print(f"checked {forms_checked} ambient forms at {points} point(s): worst relative dbar residual "
          f"{worst:.2e} (tolerance {TOL:g}); {failures} failure(s)")
    # every partition-of-unity class with --all, else the first one (which need not be the first class)
    partition = [(m["label"], i, c) for m in exp.data["multiplets"] for i, c in enumerate(m["classes"])
                 if c["on_x"] == "partition_of_unity"]
    if not check_all:
        partition = partition[:1]
    checked, worst_on, worst_off = 0, 0.0, 0.0
    for p in range(points):
        x = exp.point_on_x(rng)
        for label, i, c in partition:
            on_x, off_x, horizontal = exp.check_partition_class(c, x, rng)
            checked += 1
            worst_on, worst_off = max(worst_on, on_x), max(worst_off, off_x)
            if on_x > TOL or off_x > TOL or not horizontal:
                failures += 1
                print(f"FAIL {label} class {i} (partition of unity): dbar on X {on_x:.3e}, "
                      f"off X mismatch with the Koszul term {off_x:.3e}, horizontal {horizontal}")
    print(f"checked {checked} partition-of-unity forms on X: worst relative dbar residual {worst_on:.2e}, "
          f"worst off-X mismatch {worst_off:.2e} (tolerance {TOL:g})")
    return 1 if failures or family_failures else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
