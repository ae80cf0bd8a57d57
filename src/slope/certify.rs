//! The decision procedure behind [`super::certify_slope_zero`] and the exact
//! re-checks behind [`super::verify_certificate`].
//!
//! Invariant: a `System` holds the exact integer matrices `M_a` of the slope
//! forms `μ_a(t) = tᵀ M_a t` (with `(M_a)_{su} = Σ_r k_a^r d_{rsu}`), a float
//! copy used only for candidate search, and a basis (list of bundle indices)
//! of the rational span of the `M_a`. Every function returning a verdict
//! decides it from the exact data; floats only steer which exact test runs.
#![allow(clippy::needless_range_loop)]

use super::interval::Interval;
use super::{
    ExcludedBox, ExistsCertificate, NoneCertificate, Sign, SlopeError, SlopeOptions, SlopeZero,
    Term,
};
use num_bigint::BigInt;
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, ToPrimitive, Zero};

/// Exact and float data of one slope problem.
pub(super) struct System {
    pub(super) m: usize,
    pub(super) r: usize,
    pub(super) mats: Vec<Vec<Vec<BigInt>>>,
    /// Float copies, each scaled by `1 / max |entry|` (zero matrices stay zero).
    fmats: Vec<Vec<Vec<f64>>>,
    /// Unscaled float copies (for preconditioners of the exact system).
    umats: Vec<Vec<Vec<f64>>>,
    pub(super) basis: Vec<usize>,
}

fn rat(n: i64) -> BigRational {
    BigRational::from_integer(BigInt::from(n))
}

fn big_to_rat(n: &BigInt) -> BigRational {
    BigRational::from_integer(n.clone())
}

/// Deterministic pseudo-random generator (splitmix64).
pub(super) struct Rng(u64);

impl Rng {
    pub(super) fn new(seed: u64) -> Rng {
        Rng(seed)
    }
    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    /// Uniform in `[0, 1)`.
    fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }
}

/// Rank of a list of rational vectors (exact Gaussian elimination).
fn rank(vectors: &[Vec<BigRational>]) -> usize {
    let mut rows: Vec<Vec<BigRational>> = vectors.to_vec();
    let ncols = rows.first().map_or(0, |v| v.len());
    let mut rk = 0;
    for col in 0..ncols {
        let Some(p) = (rk..rows.len()).find(|&i| !rows[i][col].is_zero()) else {
            continue;
        };
        rows.swap(rk, p);
        let piv = rows[rk][col].clone();
        for i in 0..rows.len() {
            if i != rk && !rows[i][col].is_zero() {
                let f = &rows[i][col] / &piv;
                for c in col..ncols {
                    let v = &rows[rk][c] * &f;
                    rows[i][c] -= v;
                }
            }
        }
        rk += 1;
        if rk == rows.len() {
            break;
        }
    }
    rk
}

/// Exact `tᵀ M t`.
pub(super) fn quad(mat: &[Vec<BigInt>], t: &[BigRational]) -> BigRational {
    let mut acc = BigRational::zero();
    for s in 0..t.len() {
        let mut row = BigRational::zero();
        for u in 0..t.len() {
            if !mat[s][u].is_zero() {
                row += big_to_rat(&mat[s][u]) * &t[u];
            }
        }
        acc += row * &t[s];
    }
    acc
}

fn fquad(mat: &[Vec<f64>], t: &[f64]) -> f64 {
    let mut acc = 0.0;
    for s in 0..t.len() {
        let mut row = 0.0;
        for u in 0..t.len() {
            row += mat[s][u] * t[u];
        }
        acc += row * t[s];
    }
    acc
}

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
fn primitive_integers(v: &[BigRational]) -> Option<Vec<BigInt>> {
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

/// A dyadic box of a chart: coordinate `i` ranges over
/// `[lo_i / 2^k, (lo_i + w_i) / 2^k]`; the chart coordinate has `lo = 2^k, w = 0`.
#[derive(Clone, Debug)]
struct DBox {
    k: u32,
    lo: Vec<BigInt>,
    w: Vec<BigInt>,
}

impl DBox {
    fn root(m: usize, chart: usize) -> DBox {
        let lo = (0..m)
            .map(|i| {
                if i == chart {
                    BigInt::one()
                } else {
                    BigInt::zero()
                }
            })
            .collect();
        let w = (0..m)
            .map(|i| {
                if i == chart {
                    BigInt::zero()
                } else {
                    BigInt::one()
                }
            })
            .collect();
        DBox { k: 0, lo, w }
    }

    /// Widest coordinate (lowest index on ties), `None` if the box is a point.
    fn split_axis(&self) -> Option<usize> {
        let mut best: Option<usize> = None;
        for i in 0..self.w.len() {
            if self.w[i].is_positive() && best.is_none_or(|b| self.w[i] > self.w[b]) {
                best = Some(i);
            }
        }
        best
    }

    /// Lower and upper halves along the split axis.
    fn split(&self) -> Option<(DBox, DBox)> {
        let ax = self.split_axis()?;
        let lo: Vec<BigInt> = self.lo.iter().map(|v| v * BigInt::from(2)).collect();
        let mut w: Vec<BigInt> = self.w.iter().map(|v| v * BigInt::from(2)).collect();
        w[ax] = self.w[ax].clone();
        let mut up_lo = lo.clone();
        up_lo[ax] += &self.w[ax];
        let a = DBox {
            k: self.k + 1,
            lo,
            w: w.clone(),
        };
        let b = DBox {
            k: self.k + 1,
            lo: up_lo,
            w,
        };
        Some((a, b))
    }

    fn intervals(&self) -> Vec<Interval> {
        let den = BigInt::one() << self.k;
        (0..self.lo.len())
            .map(|i| {
                let lo = BigRational::new(self.lo[i].clone(), den.clone());
                let hi = BigRational::new(&self.lo[i] + &self.w[i], den.clone());
                Interval::new(lo.clone(), hi).unwrap_or_else(|| Interval::point(lo))
            })
            .collect()
    }
}

/// Exact test: `tᵀ C t > 0` for every `t` in the dyadic box with all `t^i > 0`.
///
/// With `t = lo + u`, `0 <= u <= w` (scaled by `2^k`): `μ = c0 + Σ_i u_i (g_i +
/// Σ_j C_ij u_j)`, `g = 2 C lo`; `h_i = g_i + Σ_j min(0, C_ij) w_j` bounds the
/// bracket from below, so `μ >= c0 + Σ_{h_i<0} h_i w_i + Σ_{h_i>0} h_i u_i`.
/// Positive if that constant is `> 0`, or `= 0` and some `h_i > 0` with
/// `lo_i = 0` (then `u_i = t^i > 0` on the open cone).
fn positive_on_box(c: &[Vec<BigInt>], b: &DBox) -> bool {
    let m = b.lo.len();
    let mut cl = vec![BigInt::zero(); m];
    for i in 0..m {
        for j in 0..m {
            if !c[i][j].is_zero() && !b.lo[j].is_zero() {
                cl[i] += &c[i][j] * &b.lo[j];
            }
        }
    }
    let mut total = BigInt::zero();
    for i in 0..m {
        total += &cl[i] * &b.lo[i];
    }
    let mut strict_boundary = false;
    for i in 0..m {
        if b.w[i].is_zero() {
            continue;
        }
        let mut h: BigInt = &cl[i] * BigInt::from(2);
        for j in 0..m {
            if c[i][j].is_negative() && !b.w[j].is_zero() {
                h += &c[i][j] * &b.w[j];
            }
        }
        if h.is_negative() {
            total += h * &b.w[i];
        } else if h.is_positive() && b.lo[i].is_zero() {
            strict_boundary = true;
        }
    }
    if total.is_positive() || (total.is_zero() && strict_boundary) {
        return true;
    }
    // Second-order rule: c0 >= 0, g >= 0 and C >= 0 on the free block give
    // μ >= c0 + Σ g_i u_i + Σ_{i,j} C_ij u_i u_j with all terms >= 0.
    let free: Vec<usize> = (0..m).filter(|&i| !b.w[i].is_zero()).collect();
    let c0 = &total_c0(&cl, &b.lo);
    if c0.is_negative()
        || free.iter().any(|&i| cl[i].is_negative())
        || free
            .iter()
            .any(|&i| free.iter().any(|&j| c[i][j].is_negative()))
    {
        return false;
    }
    c0.is_positive()
        || free
            .iter()
            .any(|&i| b.lo[i].is_zero() && cl[i].is_positive())
        || free.iter().any(|&i| {
            b.lo[i].is_zero()
                && free
                    .iter()
                    .any(|&j| b.lo[j].is_zero() && c[i][j].is_positive())
        })
}

fn total_c0(cl: &[BigInt], lo: &[BigInt]) -> BigInt {
    cl.iter().zip(lo).map(|(x, y)| x * y).sum()
}

/// A non-zero vector of the right null space of `rows` (exact), if any.
fn null_vector(rows: &[Vec<BigRational>], n: usize) -> Option<Vec<BigRational>> {
    let mut a: Vec<Vec<BigRational>> = rows.to_vec();
    let mut pivots: Vec<usize> = Vec::new();
    let mut rk = 0;
    for col in 0..n {
        let Some(p) = (rk..a.len()).find(|&i| !a[i][col].is_zero()) else {
            continue;
        };
        a.swap(rk, p);
        let piv = a[rk][col].clone();
        for c in 0..n {
            let v = &a[rk][c] / &piv;
            a[rk][c] = v;
        }
        for i in 0..a.len() {
            if i != rk && !a[i][col].is_zero() {
                let f = a[i][col].clone();
                for c in 0..n {
                    let v = &a[rk][c] * &f;
                    a[i][c] -= v;
                }
            }
        }
        pivots.push(col);
        rk += 1;
    }
    let free_col = (0..n).find(|c| !pivots.contains(c))?;
    let mut v = vec![BigRational::zero(); n];
    v[free_col] = BigRational::one();
    for (row, &pc) in pivots.iter().enumerate() {
        v[pc] = -a[row][free_col].clone();
    }
    Some(v)
}

/// Candidate weight vectors (over `q` basis bundles) that vanish on `q - 1`
/// of the given columns: vertices of the cone of admissible combinations.
/// Enumerates at most `cap` column subsets.
fn vertex_combinations(cols: &[Vec<BigRational>], q: usize, cap: usize) -> Vec<Vec<BigInt>> {
    let nz: Vec<&Vec<BigRational>> = cols
        .iter()
        .filter(|c| c.iter().any(|v| !v.is_zero()))
        .collect();
    let mut out = Vec::new();
    if q == 0 {
        return out;
    }
    let k = q - 1;
    if nz.len() < k {
        return out;
    }
    let mut idx: Vec<usize> = (0..k).collect();
    let mut count = 0;
    loop {
        let rows: Vec<Vec<BigRational>> = idx.iter().map(|&i| nz[i].clone()).collect();
        if let Some(ints) = null_vector(&rows, q).and_then(|v| primitive_integers(&v)) {
            out.push(ints.iter().map(|x| -x).collect());
            out.push(ints);
        }
        count += 1;
        if count >= cap {
            break;
        }
        // next combination
        let mut i = k;
        loop {
            if i == 0 {
                return out;
            }
            i -= 1;
            if idx[i] < nz.len() - k + i {
                idx[i] += 1;
                for j in i + 1..k {
                    idx[j] = idx[j - 1] + 1;
                }
                break;
            }
        }
        if k == 0 {
            break;
        }
    }
    out
}

enum Verdict {
    Done(SlopeZero),
    Candidates(Vec<Vec<f64>>),
}

impl System {
    /// Validates the input and builds the exact slope matrices.
    pub(super) fn new(
        triple: &[Vec<Vec<i64>>],
        bundles: &[Vec<i64>],
    ) -> Result<System, SlopeError> {
        let m = super::check_cubic(triple)?;
        for r in 0..m {
            for s in 0..m {
                for u in 0..m {
                    let v = triple[r][s][u];
                    if triple[s][r][u] != v || triple[r][u][s] != v || triple[u][s][r] != v {
                        return Err(SlopeError::Asymmetric { at: (r, s, u) });
                    }
                }
            }
        }
        if bundles.is_empty() {
            return Err(SlopeError::NoBundles);
        }
        for (a, k) in bundles.iter().enumerate() {
            if k.len() != m {
                return Err(SlopeError::BundleLength {
                    bundle: a,
                    expected: m,
                    found: k.len(),
                });
            }
        }
        let mats: Vec<Vec<Vec<BigInt>>> = bundles
            .iter()
            .map(|k| {
                (0..m)
                    .map(|s| {
                        (0..m)
                            .map(|u| {
                                let mut acc = BigInt::zero();
                                for r in 0..m {
                                    acc += BigInt::from(k[r]) * BigInt::from(triple[r][s][u]);
                                }
                                acc
                            })
                            .collect()
                    })
                    .collect()
            })
            .collect();
        let umats: Vec<Vec<Vec<f64>>> = mats
            .iter()
            .map(|mm| {
                mm.iter()
                    .map(|row| row.iter().map(|v| v.to_f64().unwrap_or(0.0)).collect())
                    .collect()
            })
            .collect();
        let fmats = umats
            .iter()
            .map(|mm: &Vec<Vec<f64>>| {
                let mx = mm.iter().flatten().fold(0.0f64, |a, b| a.max(b.abs()));
                let sc = if mx > 0.0 { 1.0 / mx } else { 0.0 };
                mm.iter()
                    .map(|row| row.iter().map(|v| v * sc).collect())
                    .collect()
            })
            .collect();
        let mut sys = System {
            m,
            r: bundles.len(),
            mats,
            fmats,
            umats,
            basis: Vec::new(),
        };
        let mut chosen: Vec<Vec<BigRational>> = Vec::new();
        for a in 0..sys.r {
            let mut trial = chosen.clone();
            trial.push(sys.flat(a));
            if rank(&trial) == trial.len() {
                chosen = trial;
                sys.basis.push(a);
            }
        }
        Ok(sys)
    }

    /// Upper-triangular entries of `M_a` as a rational vector.
    fn flat(&self, a: usize) -> Vec<BigRational> {
        let mut v = Vec::new();
        for s in 0..self.m {
            for u in s..self.m {
                v.push(big_to_rat(&self.mats[a][s][u]));
            }
        }
        v
    }

    fn all_zero_at(&self, t: &[BigRational]) -> bool {
        self.mats.iter().all(|mm| quad(mm, t).is_zero())
    }

    fn combo_matrix(&self, terms: &[(usize, BigInt)]) -> Vec<Vec<BigInt>> {
        let mut c = vec![vec![BigInt::zero(); self.m]; self.m];
        for (a, coef) in terms {
            for s in 0..self.m {
                for u in 0..self.m {
                    c[s][u] += &self.mats[*a][s][u] * coef;
                }
            }
        }
        c
    }

    fn sign_of_matrix(mat: &[Vec<BigInt>]) -> Option<Sign> {
        let flat = mat.iter().flatten();
        let nonzero = mat.iter().flatten().any(|v| !v.is_zero());
        if !nonzero {
            return None;
        }
        if flat.clone().all(|v| !v.is_negative()) {
            Some(Sign::Positive)
        } else if flat.clone().all(|v| !v.is_positive()) {
            Some(Sign::Negative)
        } else {
            None
        }
    }

    /// Only the cheap exact obstructions (one slope of constant sign, then a combination of constant sign),
    /// the first step of [`System::certify`].
    pub(super) fn obstruction(&self) -> Option<NoneCertificate> {
        for a in 0..self.r {
            if let Some(sign) = Self::sign_of_matrix(&self.mats[a]) {
                return Some(NoneCertificate::SignObstruction { bundle: a, sign });
            }
        }
        self.combination_obstruction()
            .map(|terms| NoneCertificate::CombinationObstruction {
                combination: terms
                    .into_iter()
                    .map(|(bundle, c)| Term {
                        bundle,
                        coeff: big_to_rat(&c),
                    })
                    .collect(),
            })
    }

    /// Runs the strategies in order; see [`super::certify_slope_zero`].
    pub(super) fn certify(&self, opts: &SlopeOptions) -> SlopeZero {
        for a in 0..self.r {
            if let Some(sign) = Self::sign_of_matrix(&self.mats[a]) {
                return SlopeZero::None(NoneCertificate::SignObstruction { bundle: a, sign });
            }
        }
        if let Some(terms) = self.combination_obstruction() {
            return SlopeZero::None(NoneCertificate::CombinationObstruction {
                combination: terms
                    .into_iter()
                    .map(|(bundle, c)| Term {
                        bundle,
                        coeff: big_to_rat(&c),
                    })
                    .collect(),
            });
        }
        let ones = vec![BigRational::one(); self.m];
        if self.all_zero_at(&ones) {
            return SlopeZero::Exists(ExistsCertificate::RationalPoint { point: ones });
        }
        if let Some(p) = self.grid_search(opts.grid_points) {
            return SlopeZero::Exists(ExistsCertificate::RationalPoint { point: p });
        }
        let mut rng = Rng::new(opts.seed);
        let mut note = String::new();
        let starts: Vec<Vec<f64>> = (0..opts.newton_starts)
            .map(|s| {
                if s == 0 {
                    vec![1.0; self.m]
                } else {
                    (0..self.m).map(|_| 0.02 + rng.unit()).collect()
                }
            })
            .collect();
        match self.search_candidates(starts) {
            Verdict::Done(z) => return z,
            Verdict::Candidates(c) if !c.is_empty() => {
                let show: Vec<String> = c[0].iter().map(|v| format!("{v:.6}")).collect();
                let q = self.basis.len();
                let why = if q >= self.m {
                    format!(
                        "{q} independent slope equations in {} projective dimensions (no square subsystem)",
                        self.m - 1
                    )
                } else {
                    "exact certification failed (singular or ill-conditioned Jacobian, or zero near the boundary)".to_string()
                };
                note = format!(
                    "approximate common zero near t ≈ [{}] found but not certified: {why}",
                    show.join(", ")
                );
            }
            Verdict::Candidates(_) => {}
        }
        match self.subdivide(opts.max_boxes) {
            Ok(boxes) => SlopeZero::None(NoneCertificate::Subdivision { boxes }),
            Err((why, stuck)) => {
                // A zero at (or near) the boundary may have an interior branch
                // leaving it: search again from points just inside.
                if let Some(p) = stuck {
                    let mut starts = Vec::new();
                    for scale in [0.3, 0.1, 0.03, 0.01, 1e-3, 1e-4] {
                        for _ in 0..6 {
                            starts
                                .push(p.iter().map(|&v| v + scale * (0.05 + rng.unit())).collect());
                        }
                    }
                    if let Verdict::Done(z) = self.search_candidates(starts) {
                        return z;
                    }
                }
                SlopeZero::Undecided {
                    reason: if note.is_empty() {
                        why
                    } else {
                        format!("{note}; {why}")
                    },
                }
            }
        }
    }

    /// Exact evaluation at primitive positive integer points, by increasing max entry.
    fn grid_search(&self, budget: usize) -> Option<Vec<BigRational>> {
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

    fn search_candidates(&self, starts: Vec<Vec<f64>>) -> Verdict {
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
            let cert = ExistsCertificate::KrawczykBox {
                bx,
                free: free.clone(),
                fixed: fixed.clone(),
                equations: self.basis.clone(),
                preconditioner: yq.clone(),
            };
            if self.verify_exists(&cert) {
                return Some(cert);
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

    /// Exclusion by bisection of the charts; `Err(reason)` when the budget runs out.
    /// On failure also returns a float point of the box where it got stuck.
    fn subdivide(&self, max_boxes: usize) -> Result<Vec<ExcludedBox>, (String, Option<Vec<f64>>)> {
        let mut leaves = Vec::new();
        let mut work = 0usize;
        for chart in 0..self.m {
            let mut stack = vec![DBox::root(self.m, chart)];
            while let Some(b) = stack.pop() {
                work += 1;
                if let Some(terms) = self.exclude(&b) {
                    leaves.push(ExcludedBox {
                        chart,
                        bx: b.intervals(),
                        combination: terms
                            .into_iter()
                            .map(|(bundle, c)| Term {
                                bundle,
                                coeff: big_to_rat(&c),
                            })
                            .collect(),
                    });
                    continue;
                }
                let centre: Vec<f64> = b
                    .intervals()
                    .iter()
                    .map(|iv| iv.mid().to_f64().unwrap_or(0.0))
                    .collect();
                if leaves.len() + stack.len() + 2 > max_boxes || work > 4 * max_boxes.max(1) {
                    return Err((
                        format!(
                            "exclusion subdivision budget of {max_boxes} boxes exhausted (chart t{} = 1)",
                            chart + 1
                        ),
                        Some(centre),
                    ));
                }
                if b.k >= 48 {
                    let near: Vec<String> = b
                        .intervals()
                        .iter()
                        .map(|iv| format!("{:.6}", iv.lo().to_f64().unwrap_or(f64::NAN)))
                        .collect();
                    return Err((
                        format!(
                            "exclusion subdivision reached the minimal box width 2^-48 near t ≈ [{}] (a zero of the slopes in or at the boundary of the cone)",
                            near.join(", ")
                        ),
                        Some(centre),
                    ));
                }
                let Some((lo, hi)) = b.split() else {
                    return Err(("a point of a chart could not be excluded".into(), None));
                };
                stack.push(hi);
                stack.push(lo);
            }
        }
        Ok(leaves)
    }

    /// Finds a slope combination positive on the box ∩ open cone.
    fn exclude(&self, b: &DBox) -> Option<Vec<(usize, BigInt)>> {
        for a in 0..self.r {
            for sgn in [1i64, -1] {
                let terms = vec![(a, BigInt::from(sgn))];
                if positive_on_box(&self.combo_matrix(&terms), b) {
                    return Some(terms);
                }
            }
        }
        let data: Vec<Vec<BigInt>> = (0..self.r).map(|a| self.box_data(a, b)).collect();
        if let Some(terms) = self.perceptron_combo(&data, b) {
            return Some(terms);
        }
        if let Some(terms) = self.vertex_combo(b) {
            return Some(terms);
        }
        // Pairs: cancel one coefficient of the lower-bound data.
        for a in 0..self.r {
            for c in a + 1..self.r {
                for k in 0..data[a].len() {
                    let (x, y) = (&data[a][k], &data[c][k]);
                    if x.is_zero() || y.is_zero() {
                        continue;
                    }
                    let g = x.gcd(y);
                    let (ca, cc) = (y / &g, -(x / &g));
                    for sgn in [1i64, -1] {
                        let terms = vec![(a, &ca * sgn), (c, &cc * sgn)];
                        if positive_on_box(&self.combo_matrix(&terms), b) {
                            return Some(terms);
                        }
                    }
                }
            }
        }
        None
    }

    /// Float perceptron for weights `λ` making every non-zero column of the
    /// lower-corner data `(c0, g_i)` positive; the rounded integer weights are
    /// then tested exactly by `positive_on_box`.
    fn perceptron_combo(&self, data: &[Vec<BigInt>], b: &DBox) -> Option<Vec<(usize, BigInt)>> {
        let r = self.r;
        let ncol = data.first()?.len();
        let mut cols: Vec<Vec<f64>> = Vec::new();
        for k in 0..ncol {
            let c: Vec<f64> = (0..r).map(|a| data[a][k].to_f64().unwrap_or(0.0)).collect();
            let n = c.iter().map(|v| v * v).sum::<f64>().sqrt();
            if n > 0.0 && n.is_finite() {
                cols.push(c.iter().map(|v| v / n).collect());
            }
        }
        if cols.is_empty() {
            return None;
        }
        let mut lam = vec![0.0f64; r];
        for it in 0..400 {
            let (worst, val) = cols
                .iter()
                .enumerate()
                .map(|(k, c)| (k, c.iter().zip(&lam).map(|(x, y)| x * y).sum::<f64>()))
                .min_by(|x, y| x.1.total_cmp(&y.1))?;
            if val > 0.0 || it % 50 == 49 {
                let mx = lam.iter().fold(0.0f64, |a, v| a.max(v.abs()));
                if mx > 0.0 {
                    let terms: Vec<(usize, BigInt)> = lam
                        .iter()
                        .enumerate()
                        .filter_map(|(a, v)| {
                            let q = (v / mx * 4096.0).round() as i64;
                            (q != 0).then(|| (a, BigInt::from(q)))
                        })
                        .collect();
                    if !terms.is_empty() && positive_on_box(&self.combo_matrix(&terms), b) {
                        let mut g = BigInt::zero();
                        for (_, c) in &terms {
                            g = g.gcd(c);
                        }
                        return Some(terms.into_iter().map(|(a, c)| (a, c / &g)).collect());
                    }
                }
                if val > 0.0 {
                    return None;
                }
            }
            for a in 0..r {
                lam[a] += cols[worst][a];
            }
        }
        None
    }

    /// Combinations of basis slopes that vanish on `q - 1` coefficients of
    /// the box data `(c0, g_i, C_ij)`; each is tested exactly.
    fn vertex_combo(&self, b: &DBox) -> Option<Vec<(usize, BigInt)>> {
        let m = self.m;
        let free: Vec<usize> = (0..m).filter(|&i| !b.w[i].is_zero()).collect();
        let mut cols: Vec<Vec<BigRational>> = Vec::new();
        let data: Vec<Vec<BigInt>> = self.basis.iter().map(|&a| self.box_data(a, b)).collect();
        for k in 0..data.first()?.len() {
            cols.push(data.iter().map(|d| big_to_rat(&d[k])).collect());
        }
        cols.extend(self.upper_triangle_columns(&free));
        for lam in vertex_combinations(&cols, self.basis.len(), 150) {
            let terms = self.basis_terms(lam);
            if !terms.is_empty() && positive_on_box(&self.combo_matrix(&terms), b) {
                return Some(terms);
            }
        }
        None
    }

    /// One column per entry `(i, j)`, `i <= j` taken from `coords`, holding `(M_a)_{ij}` for every basis bundle.
    fn upper_triangle_columns(&self, coords: &[usize]) -> Vec<Vec<BigRational>> {
        let mut cols = Vec::new();
        for (x, &i) in coords.iter().enumerate() {
            for &j in &coords[x..] {
                cols.push(
                    self.basis
                        .iter()
                        .map(|&a| big_to_rat(&self.mats[a][i][j]))
                        .collect(),
                );
            }
        }
        cols
    }

    /// Pair the coefficients `lam` with the basis bundles, dropping zero coefficients.
    fn basis_terms(&self, lam: Vec<BigInt>) -> Vec<(usize, BigInt)> {
        self.basis
            .iter()
            .zip(lam)
            .filter(|(_, c)| !c.is_zero())
            .map(|(&a, c)| (a, c))
            .collect()
    }

    /// A combination `Σ λ_a M_a` that is entrywise `>= 0` and non-zero.
    fn combination_obstruction(&self) -> Option<Vec<(usize, BigInt)>> {
        let all: Vec<usize> = (0..self.m).collect();
        let cols = self.upper_triangle_columns(&all);
        for lam in vertex_combinations(&cols, self.basis.len(), 3000) {
            let terms = self.basis_terms(lam);
            if !terms.is_empty()
                && Self::sign_of_matrix(&self.combo_matrix(&terms)) == Some(Sign::Positive)
            {
                return Some(terms);
            }
        }
        None
    }

    /// `(c0, g_i ...)` of `μ_a` at the lower corner of the box (scaled).
    fn box_data(&self, a: usize, b: &DBox) -> Vec<BigInt> {
        let mat = &self.mats[a];
        let m = self.m;
        let mut out = Vec::with_capacity(m + 1);
        let mut cl = vec![BigInt::zero(); m];
        for i in 0..m {
            for j in 0..m {
                cl[i] += &mat[i][j] * &b.lo[j];
            }
        }
        out.push(cl.iter().zip(&b.lo).map(|(x, y)| x * y).sum());
        for i in 0..m {
            if !b.w[i].is_zero() {
                out.push(&cl[i] * BigInt::from(2));
            }
        }
        out
    }

    /// Exact verification of any result.
    pub(super) fn verify(&self, result: &SlopeZero) -> bool {
        match result {
            SlopeZero::Exists(c) => self.verify_exists(c),
            SlopeZero::None(c) => self.verify_none(c),
            SlopeZero::Undecided { .. } => false,
        }
    }

    fn verify_exists(&self, c: &ExistsCertificate) -> bool {
        match c {
            ExistsCertificate::RationalPoint { point } => {
                point.len() == self.m
                    && point.iter().all(|x| x.is_positive())
                    && self.all_zero_at(point)
            }
            ExistsCertificate::KrawczykBox {
                bx,
                free,
                fixed,
                equations,
                preconditioner,
            } => self.verify_krawczyk(bx, free, fixed, equations, preconditioner),
        }
    }

    fn verify_krawczyk(
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

    fn verify_none(&self, c: &NoneCertificate) -> bool {
        match c {
            NoneCertificate::SignObstruction { bundle, sign } => {
                *bundle < self.r && Self::sign_of_matrix(&self.mats[*bundle]) == Some(*sign)
            }
            NoneCertificate::CombinationObstruction { combination } => {
                self.integer_terms(combination).is_some_and(|t| {
                    Self::sign_of_matrix(&self.combo_matrix(&t)) == Some(Sign::Positive)
                })
            }
            NoneCertificate::Subdivision { boxes } => self.verify_subdivision(boxes),
        }
    }

    fn verify_subdivision(&self, boxes: &[ExcludedBox]) -> bool {
        let mut idx = 0usize;
        for chart in 0..self.m {
            let mut stack = vec![DBox::root(self.m, chart)];
            while let Some(b) = stack.pop() {
                let Some(leaf) = boxes.get(idx) else {
                    return false;
                };
                if leaf.chart != chart || leaf.bx.len() != self.m {
                    return false;
                }
                let ivs = b.intervals();
                if ivs == leaf.bx {
                    let Some(terms) = self.integer_terms(&leaf.combination) else {
                        return false;
                    };
                    if !positive_on_box(&self.combo_matrix(&terms), &b) {
                        return false;
                    }
                    idx += 1;
                    continue;
                }
                if b.k >= 200
                    || !ivs
                        .iter()
                        .zip(&leaf.bx)
                        .all(|(n, l)| n.contains_interval(l))
                {
                    return false;
                }
                let Some((lo, hi)) = b.split() else {
                    return false;
                };
                stack.push(hi);
                stack.push(lo);
            }
        }
        idx == boxes.len()
    }

    /// Clears denominators of a combination (a positive rescaling keeps signs).
    fn integer_terms(&self, terms: &[Term]) -> Option<Vec<(usize, BigInt)>> {
        if terms.is_empty() || terms.iter().any(|t| t.bundle >= self.r) {
            return None;
        }
        let mut l = BigInt::one();
        for t in terms {
            l = l.lcm(t.coeff.denom());
        }
        Some(
            terms
                .iter()
                .map(|t| (t.bundle, (&t.coeff * big_to_rat(&l)).to_integer()))
                .collect(),
        )
    }
}

/// Float evaluation of the slope forms (for drawing only).
pub(super) fn float_slopes(triple: &[Vec<Vec<i64>>], bundles: &[Vec<i64>]) -> Vec<Vec<Vec<f64>>> {
    let m = triple.len();
    bundles
        .iter()
        .map(|k| {
            (0..m)
                .map(|s| {
                    (0..m)
                        .map(|u| {
                            (0..m.min(k.len()))
                                .map(|r| {
                                    k[r] as f64
                                        * triple[r]
                                            .get(s)
                                            .and_then(|x| x.get(u))
                                            .copied()
                                            .unwrap_or(0)
                                            as f64
                                })
                                .sum()
                        })
                        .collect()
                })
                .collect()
        })
        .collect()
}

/// `tᵀ M t` in floats (drawing only).
pub(super) fn float_quad(mat: &[Vec<f64>], t: &[f64]) -> f64 {
    fquad(mat, t)
}
