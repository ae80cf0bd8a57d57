//! The "exists" side of the certifier: exact evaluation on a grid, float Newton searches (plain and in
//! logarithmic coordinates) whose approximate zeros are rounded, moved along rational lines or enclosed
//! by a Krawczyk box, each candidate then checked exactly.
//!
//! Invariant: floats only propose; every returned point or certificate has been confirmed with exact
//! rational arithmetic on the `System` data.
#![allow(clippy::needless_range_loop)]

use super::*;

fn fmatvec(mat: &[Vec<f64>], t: &[f64]) -> Vec<f64> {
    mat.iter()
        .map(|row| row.iter().zip(t).map(|(a, b)| a * b).sum())
        .collect()
}

/// Solves `A x = b` by partial pivoting; `None` if (numerically) singular.
fn fsolve(mut a: Vec<Vec<f64>>, mut b: Vec<f64>) -> Option<Vec<f64>> {
    let n = b.len();
    for col in 0..n {
        let p = (col..n).max_by(|&i, &j| a[i][col].abs().total_cmp(&a[j][col].abs()))?;
        if a[p][col].abs().is_nan() || a[p][col].abs() <= 1e-300 {
            return None;
        }
        a.swap(col, p);
        b.swap(col, p);
        for i in col + 1..n {
            let f = a[i][col] / a[col][col];
            for c in col..n {
                a[i][c] -= f * a[col][c];
            }
            b[i] -= f * b[col];
        }
    }
    let mut x = vec![0.0; n];
    for i in (0..n).rev() {
        let mut s = b[i];
        for c in i + 1..n {
            s -= a[i][c] * x[c];
        }
        x[i] = s / a[i][i];
    }
    if x.iter().all(|v| v.is_finite()) {
        Some(x)
    } else {
        None
    }
}

fn finverse(a: &[Vec<f64>]) -> Option<Vec<Vec<f64>>> {
    let n = a.len();
    let mut cols = Vec::with_capacity(n);
    for j in 0..n {
        let mut e = vec![0.0; n];
        e[j] = 1.0;
        cols.push(fsolve(a.to_vec(), e)?);
    }
    Some(
        (0..n)
            .map(|i| (0..n).map(|j| cols[j][i]).collect())
            .collect(),
    )
}

/// Best rational approximation `p/q` of `x` with `q <= max_den` (continued fractions).
fn best_rational(x: f64, max_den: i64) -> Option<(i64, i64)> {
    if !x.is_finite() || x.abs() > 1e12 {
        return None;
    }
    let (mut h0, mut h1, mut k0, mut k1) = (0i64, 1i64, 1i64, 0i64);
    let mut y = x;
    for _ in 0..64 {
        let a = y.floor();
        let ai = a as i64;
        let next = ai
            .checked_mul(h1)
            .and_then(|v| v.checked_add(h0))
            .zip(ai.checked_mul(k1).and_then(|v| v.checked_add(k0)));
        let Some((h2, k2)) = next else {
            break;
        };
        if k2 > max_den {
            break;
        }
        (h0, h1, k0, k1) = (h1, h2, k1, k2);
        let frac = y - a;
        if frac.abs() < 1e-15 {
            break;
        }
        y = 1.0 / frac;
    }
    if k1 == 0 { None } else { Some((h1, k1)) }
}

/// Exact value of a finite f64 as a rational.
fn f2q(x: f64) -> Option<BigRational> {
    BigRational::from_float(x)
}

/// The primitive integer vector on the ray of `v` (clear denominators, divide by the gcd), or `None` for the
/// zero vector.
pub(super) fn primitive_integers(v: &[BigRational]) -> Option<Vec<BigInt>> {
    let mut l = BigInt::one();
    for q in v {
        l = l.lcm(q.denom());
    }
    let ints: Vec<BigInt> = v
        .iter()
        .map(|q| (q * big_to_rat(&l)).to_integer())
        .collect();
    let mut g = BigInt::zero();
    for x in &ints {
        g = g.gcd(x);
    }
    (!g.is_zero()).then(|| ints.iter().map(|x| x / &g).collect())
}

/// Scales a positive rational vector to a primitive integer vector (same ray).
fn primitive(t: &[BigRational]) -> Vec<BigRational> {
    match primitive_integers(t) {
        Some(ints) => ints.iter().map(big_to_rat).collect(),
        None => t.to_vec(),
    }
}
impl System {
    /// Exact evaluation at primitive positive integer points, by increasing max entry.
    pub(super) fn grid_search(&self, budget: usize) -> Option<Vec<BigRational>> {
        let m = self.m;
        let mut tried = 0usize;
        for n in 2i64..=64 {
            let mut cur = vec![1i64; m];
            loop {
                if cur.contains(&n) && cur.iter().fold(0i64, |g, &v| g.gcd(&v)) == 1 {
                    tried += 1;
                    let t: Vec<BigRational> = cur.iter().map(|&v| rat(v)).collect();
                    if self.all_zero_at(&t) {
                        return Some(t);
                    }
                    if tried >= budget {
                        return None;
                    }
                }
                let mut i = 0;
                while i < m && cur[i] == n {
                    cur[i] = 1;
                    i += 1;
                }
                if i == m {
                    break;
                }
                cur[i] += 1;
            }
        }
        None
    }

    /// Damped Gauss–Newton (Levenberg–Marquardt) on `μ_e(t) = 0 (e ∈ basis)`,
    /// `Σ t = 1`, keeping `t > 0`. Returns the converged point, if any.
    fn newton_full(&self, start: &[f64]) -> Option<Vec<f64>> {
        let m = self.m;
        let mut t = start.to_vec();
        for _ in 0..200 {
            let mut f = Vec::new();
            let mut jac = Vec::new();
            for &e in &self.basis {
                f.push(fquad(&self.fmats[e], &t));
                jac.push(
                    fmatvec(&self.fmats[e], &t)
                        .iter()
                        .map(|v| 2.0 * v)
                        .collect::<Vec<f64>>(),
                );
            }
            f.push(t.iter().sum::<f64>() - 1.0);
            jac.push(vec![1.0; m]);
            let res = f.iter().fold(0.0f64, |a, b| a.max(b.abs()));
            if res < 1e-14 {
                return Some(t);
            }
            let mut a = vec![vec![0.0; m]; m];
            let mut g = vec![0.0; m];
            let mut tr = 0.0;
            for (row, fv) in jac.iter().zip(&f) {
                for i in 0..m {
                    g[i] += row[i] * fv;
                    for j in 0..m {
                        a[i][j] += row[i] * row[j];
                    }
                }
            }
            for i in 0..m {
                tr += a[i][i];
            }
            for i in 0..m {
                a[i][i] += 1e-12 * (1.0 + tr);
            }
            let step = fsolve(a, g)?;
            let mut alpha = 1.0;
            let mut moved = false;
            for _ in 0..40 {
                let nt: Vec<f64> = t.iter().zip(&step).map(|(x, d)| x - alpha * d).collect();
                if nt.iter().all(|&v| v > 0.0) {
                    t = nt;
                    moved = true;
                    break;
                }
                alpha *= 0.5;
            }
            if !moved {
                return None;
            }
        }
        None
    }

    /// Newton from each start; every approximate zero is handed to the exact
    /// certifiers (rounding, rational line, Krawczyk).
    /// Gauss–Newton in logarithmic coordinates `t = exp(y)` on the
    /// scale-free residuals `μ_e(t) / (Σ t)^2`: positivity is automatic and
    /// small coordinates move proportionally (zeros close to the boundary).
    fn newton_log(&self, start: &[f64]) -> Option<Vec<f64>> {
        let m = self.m;
        let mut y: Vec<f64> = start.iter().map(|v| v.max(1e-300).ln()).collect();
        for _ in 0..300 {
            let t: Vec<f64> = y.iter().map(|v| v.exp()).collect();
            let sum: f64 = t.iter().sum();
            if !sum.is_finite() || sum <= 0.0 {
                return None;
            }
            let mut f = Vec::new();
            let mut jac = Vec::new();
            for &e in &self.basis {
                let mu = fquad(&self.fmats[e], &t);
                let g = fmatvec(&self.fmats[e], &t);
                f.push(mu / (sum * sum));
                jac.push(
                    (0..m)
                        .map(|i| t[i] * (2.0 * g[i] / (sum * sum) - 2.0 * mu / (sum * sum * sum)))
                        .collect::<Vec<f64>>(),
                );
            }
            let res = f.iter().fold(0.0f64, |a, b| a.max(b.abs()));
            if res < 1e-15 {
                return Some(t.iter().map(|v| v / sum).collect());
            }
            let mut a = vec![vec![0.0; m]; m];
            let mut g = vec![0.0; m];
            for (row, fv) in jac.iter().zip(&f) {
                for i in 0..m {
                    g[i] += row[i] * fv;
                    for j in 0..m {
                        a[i][j] += row[i] * row[j];
                    }
                }
            }
            let tr: f64 = (0..m).map(|i| a[i][i]).sum();
            for i in 0..m {
                a[i][i] += 1e-12 * tr + 1e-300;
            }
            let step = fsolve(a, g)?;
            let big = step.iter().fold(0.0f64, |a, b| a.max(b.abs()));
            let damp = if big > 2.0 { 2.0 / big } else { 1.0 };
            for i in 0..m {
                y[i] -= damp * step[i];
            }
            let mean = y.iter().sum::<f64>() / m as f64;
            y.iter_mut().for_each(|v| *v -= mean);
            if y.iter().any(|v| !v.is_finite() || v.abs() > 600.0) {
                return None;
            }
        }
        None
    }

    pub(super) fn search_candidates(&self, starts: Vec<Vec<f64>>) -> Verdict {
        let mut found: Vec<Vec<f64>> = Vec::new();
        let mut zeros_cache: Option<Vec<Vec<BigRational>>> = None;
        for mut start in starts {
            let sum: f64 = start.iter().sum();
            start.iter_mut().for_each(|v| *v /= sum);
            let Some(t) = self.newton_full(&start).or_else(|| self.newton_log(&start)) else {
                continue;
            };
            let mx = t.iter().fold(0.0f64, |a, &b| a.max(b));
            let mn = t.iter().fold(f64::INFINITY, |a, &b| a.min(b));
            if mn.is_nan() || mn <= 1e-7 * mx {
                continue;
            }
            if found
                .iter()
                .any(|o| o.iter().zip(&t).all(|(a, b)| (a - b).abs() < 1e-7))
            {
                continue;
            }
            found.push(t.clone());
            if let Some(p) = self.rationalise(&t) {
                return Verdict::Done(SlopeZero::Exists(ExistsCertificate::RationalPoint {
                    point: p,
                }));
            }
            if self.basis.len() == 1 {
                let zs = zeros_cache.get_or_insert_with(|| self.rational_zeros_single());
                if let Some(p) = self.line_trick(zs, &t) {
                    return Verdict::Done(SlopeZero::Exists(ExistsCertificate::RationalPoint {
                        point: p,
                    }));
                }
            }
            if let Some(c) = self.krawczyk_build(&t) {
                return Verdict::Done(SlopeZero::Exists(c));
            }
            if found.len() >= 8 {
                break;
            }
        }
        Verdict::Candidates(found)
    }

    /// Small-denominator roundings of an approximate zero, checked exactly.
    fn rationalise(&self, t: &[f64]) -> Option<Vec<BigRational>> {
        let mx = t.iter().fold(0.0f64, |a, &b| a.max(b));
        for den in [12i64, 60, 360, 2520, 27720, 720720] {
            let mut p = Vec::with_capacity(t.len());
            for &v in t {
                let (a, b) = best_rational(v / mx, den)?;
                if a <= 0 {
                    return None;
                }
                p.push(BigRational::new(BigInt::from(a), BigInt::from(b)));
            }
            if self.all_zero_at(&p) {
                return Some(primitive(&p));
            }
        }
        None
    }

    /// Rational zeros (any signs) of the single basis quadric: coordinate
    /// vertices, roots on coordinate lines with square discriminant, small
    /// integer vectors.
    fn rational_zeros_single(&self) -> Vec<Vec<BigRational>> {
        let m = self.m;
        let mat = &self.mats[self.basis[0]];
        let mut out: Vec<Vec<BigRational>> = Vec::new();
        let unit = |i: usize| -> Vec<BigRational> {
            (0..m)
                .map(|j| {
                    if i == j {
                        BigRational::one()
                    } else {
                        BigRational::zero()
                    }
                })
                .collect()
        };
        for i in 0..m {
            if mat[i][i].is_zero() {
                out.push(unit(i));
            }
        }
        for i in 0..m {
            for j in i + 1..m {
                let (a, b, c) = (&mat[i][i], &mat[i][j], &mat[j][j]);
                if a.is_zero() {
                    continue;
                }
                let disc: BigInt = b * b - a * c;
                if disc.is_negative() {
                    continue;
                }
                let sq = disc.sqrt();
                if &sq * &sq != disc {
                    continue;
                }
                for sgn in [1, -1] {
                    let x = BigRational::new(-b + &sq * sgn, a.clone());
                    let mut v = unit(j);
                    v[i] = x;
                    out.push(v);
                }
            }
        }
        if m <= 5 {
            let mut cur = vec![-2i64; m];
            loop {
                if cur.iter().any(|&v| v != 0) {
                    let t: Vec<BigRational> = cur.iter().map(|&v| rat(v)).collect();
                    if quad(mat, &t).is_zero() {
                        out.push(t);
                    }
                }
                let mut i = 0;
                while i < m && cur[i] == 2 {
                    cur[i] = -2;
                    i += 1;
                }
                if i == m {
                    break;
                }
                cur[i] += 1;
            }
        }
        out.truncate(64);
        out
    }

    /// A line through a rational zero `P` of a quadric meets it again at the
    /// rational parameter `s = -2 B(P, v) / Q(v)`; aim `v` at the approximate zero.
    fn line_trick(&self, zeros: &[Vec<BigRational>], t: &[f64]) -> Option<Vec<BigRational>> {
        let mat = &self.mats[self.basis[0]];
        let mx = t.iter().fold(0.0f64, |a, &b| a.max(b));
        let target: Vec<BigRational> = t
            .iter()
            .map(|&v| {
                let (a, b) = best_rational(v / mx, 1 << 20).unwrap_or((1, 1));
                BigRational::new(BigInt::from(a), BigInt::from(b))
            })
            .collect();
        for p in zeros {
            let v: Vec<BigRational> = target.iter().zip(p).map(|(a, b)| a - b).collect();
            let qv = quad(mat, &v);
            if qv.is_zero() {
                continue;
            }
            let mut bpv = BigRational::zero();
            for s in 0..self.m {
                for u in 0..self.m {
                    bpv += big_to_rat(&mat[s][u]) * &p[s] * &v[u];
                }
            }
            let s = -(bpv * rat(2)) / qv;
            let mut pt: Vec<BigRational> = p.iter().zip(&v).map(|(a, b)| a + &s * b).collect();
            if pt.iter().all(|x| x.is_negative()) {
                pt = pt.iter().map(|x| -x).collect();
            }
            if pt.iter().all(|x| x.is_positive()) && self.all_zero_at(&pt) {
                return Some(primitive(&pt));
            }
        }
        None
    }

    /// Builds a Krawczyk certificate around the approximate zero `t`.
    fn krawczyk_build(&self, t: &[f64]) -> Option<ExistsCertificate> {
        let m = self.m;
        let q = self.basis.len();
        if q == 0 || q >= m {
            return None;
        }
        // Choose free coordinates by complete pivoting on the Jacobian at t.
        let mut jac: Vec<Vec<f64>> = self
            .basis
            .iter()
            .map(|&e| fmatvec(&self.fmats[e], t).iter().map(|v| 2.0 * v).collect())
            .collect();
        let mut free = Vec::new();
        let mut rows: Vec<usize> = (0..q).collect();
        let scale = jac.iter().flatten().fold(0.0f64, |a, b| a.max(b.abs()));
        for _ in 0..q {
            let mut best = (0usize, 0usize, 0.0f64);
            for &i in &rows {
                for j in 0..m {
                    if !free.contains(&j) && jac[i][j].abs() > best.2 {
                        best = (i, j, jac[i][j].abs());
                    }
                }
            }
            if best.2 <= 1e-9 * scale {
                return None;
            }
            let (pi, pj, _) = best;
            rows.retain(|&i| i != pi);
            for &i in &rows {
                let f = jac[i][pj] / jac[pi][pj];
                for j in 0..m {
                    jac[i][j] -= f * jac[pi][j];
                }
            }
            free.push(pj);
        }
        free.sort_unstable();
        let mx = t.iter().fold(0.0f64, |a, &b| a.max(b));
        let mut fixed = Vec::new();
        let mut tf: Vec<f64> = t.iter().map(|v| v / mx).collect();
        for i in 0..m {
            if !free.contains(&i) {
                let (a, b) = best_rational(tf[i], 1 << 16)?;
                if a <= 0 {
                    return None;
                }
                tf[i] = a as f64 / b as f64;
                fixed.push((i, BigRational::new(BigInt::from(a), BigInt::from(b))));
            }
        }
        // Float Newton on the square system in the free coordinates.
        for _ in 0..60 {
            let f: Vec<f64> = self
                .basis
                .iter()
                .map(|&e| fquad(&self.umats[e], &tf))
                .collect();
            let jf = self.square_jac(&tf, &free);
            let d = fsolve(jf, f)?;
            for (k, &i) in free.iter().enumerate() {
                tf[i] -= d[k];
            }
            if d.iter().all(|v| v.abs() < 1e-17) {
                break;
            }
        }
        if free.iter().any(|&i| tf[i].is_nan() || tf[i] <= 0.0) {
            return None;
        }
        let y = finverse(&self.square_jac(&tf, &free))?;
        let yq: Vec<Vec<BigRational>> = y
            .iter()
            .map(|row| row.iter().map(|&v| f2q(v)).collect::<Option<Vec<_>>>())
            .collect::<Option<Vec<_>>>()?;
        let centre: Vec<BigRational> = free
            .iter()
            .map(|&i| f2q(tf[i]))
            .collect::<Option<Vec<_>>>()?;
        let fmax = free.iter().fold(0.0f64, |a, &i| a.max(tf[i]));
        for p in [24, 34, 44] {
            let rho = f2q(fmax * 2f64.powi(-p))?;
            let bx: Vec<Interval> = centre
                .iter()
                .map(|c| Interval::new(c - &rho, c + &rho))
                .collect::<Option<Vec<_>>>()?;
            if self.krawczyk_contracts(&bx, &free, &fixed, &self.basis, &yq) {
                return Some(ExistsCertificate::KrawczykBox {
                    bx,
                    free: free.clone(),
                    fixed: fixed.clone(),
                    equations: self.basis.clone(),
                    preconditioner: yq.clone(),
                });
            }
        }
        None
    }

    fn square_jac(&self, t: &[f64], free: &[usize]) -> Vec<Vec<f64>> {
        self.basis
            .iter()
            .map(|&e| {
                let g = fmatvec(&self.umats[e], t);
                free.iter().map(|&i| 2.0 * g[i]).collect()
            })
            .collect()
    }

    /// The certifier's own acceptance test of a Krawczyk box (the independent re-check is `super::verify`):
    /// same conditions as documented on [`crate::slope::verify_certificate`].
    fn krawczyk_contracts(
        &self,
        bx: &[Interval],
        free: &[usize],
        fixed: &[(usize, BigRational)],
        equations: &[usize],
        y: &[Vec<BigRational>],
    ) -> bool {
        let m = self.m;
        let q = free.len();
        if bx.len() != q || equations.len() != q || y.len() != q || y.iter().any(|r| r.len() != q) {
            return false;
        }
        if q + fixed.len() != m || fixed.is_empty() {
            return false;
        }
        let mut seen = vec![false; m];
        for &i in free.iter().chain(fixed.iter().map(|(i, _)| i)) {
            if i >= m || seen[i] {
                return false;
            }
            seen[i] = true;
        }
        if fixed.iter().any(|(_, v)| !v.is_positive()) || bx.iter().any(|iv| !iv.lo().is_positive())
        {
            return false;
        }
        if equations.iter().any(|&e| e >= self.r) {
            return false;
        }
        let base: Vec<Vec<BigRational>> = equations.iter().map(|&e| self.flat(e)).collect();
        if rank(&base) != q {
            return false;
        }
        for a in 0..self.r {
            let mut trial = base.clone();
            trial.push(self.flat(a));
            if rank(&trial) != q {
                return false;
            }
        }
        // Interval coordinates and midpoint.
        let mut tiv: Vec<Interval> = vec![Interval::zero(); m];
        let mut tc: Vec<BigRational> = vec![BigRational::zero(); m];
        for (i, v) in fixed {
            tiv[*i] = Interval::point(v.clone());
            tc[*i] = v.clone();
        }
        let centre: Vec<BigRational> = bx.iter().map(|iv| iv.mid()).collect();
        for (k, &i) in free.iter().enumerate() {
            tiv[i] = bx[k].clone();
            tc[i] = centre[k].clone();
        }
        let fc: Vec<BigRational> = equations
            .iter()
            .map(|&e| quad(&self.mats[e], &tc))
            .collect();
        // Interval Jacobian J[e][k] = 2 Σ_j M_e[free_k][j] T_j.
        let jiv: Vec<Vec<Interval>> = equations
            .iter()
            .map(|&e| {
                free.iter()
                    .map(|&i| {
                        let mut acc = Interval::zero();
                        for j in 0..m {
                            let c = &self.mats[e][i][j];
                            if !c.is_zero() {
                                acc = acc.add(&tiv[j].scale(&big_to_rat(&(c * BigInt::from(2)))));
                            }
                        }
                        acc
                    })
                    .collect()
            })
            .collect();
        for p in 0..q {
            let mut yf = BigRational::zero();
            for e in 0..q {
                yf += &y[p][e] * &fc[e];
            }
            let mut kp = Interval::point(&centre[p] - yf);
            for col in 0..q {
                let mut a = Interval::point(if p == col {
                    BigRational::one()
                } else {
                    BigRational::zero()
                });
                for e in 0..q {
                    if !y[p][e].is_zero() {
                        a = a.sub(&jiv[e][col].scale(&y[p][e]));
                    }
                }
                let d = Interval::new(bx[col].lo() - &centre[col], bx[col].hi() - &centre[col])
                    .unwrap_or_else(Interval::zero);
                kp = kp.add(&a.mul(&d));
            }
            if !kp.strictly_inside(&bx[p]) {
                return false;
            }
        }
        true
    }
}
