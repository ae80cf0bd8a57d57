//! The decision procedure behind [`super::certify_slope_zero`] (the certifier). Its certificates are
//! re-checked by `super::verify`, which is written separately and shares no helper with this module.
//! Parts: this file holds the exact data, the dyadic boxes with their positivity test and the driver;
//! `search` the "exists" strategies, `exclude` the "none" strategies.
//!
//! Invariant: a `System` holds the exact integer matrices `M_a` of the slope
//! forms `μ_a(t) = tᵀ M_a t` (with `(M_a)_{su} = Σ_r k_a^r d_{rsu}`), a float
//! copy used only for candidate search, and a basis (list of bundle indices)
//! of the rational span of the `M_a`. Every function returning a verdict
//! decides it from the exact data; floats only steer which exact test runs.
#![allow(clippy::needless_range_loop)]

mod exclude;
mod search;

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
