//! Exact geometry of complete intersections in products of projective spaces.
//!
//! A [`Configuration`] is an ambient product `A = P^{n_1} × … × P^{n_m}` together with the multidegrees
//! `q_1..q_K` of `K` equations. It can only be built through [`Configuration::new`], which checks the
//! Calabi-Yau condition `Σ_j q_j^i = n_i + 1`, positive dimensions, non-zero equations and size limits, so an
//! invalid configuration never exists in memory.
//!
//! [`Geometry`] holds the derived exact data (MATH.md §1): the class `μ = ∏_j (Σ_i q_j^i J_i)` used for
//! `∫_X α = ∫_A α μ`, the total Chern class `c(TX) = ∏ (1+J_i)^{n_i+1} / ∏_j (1 + q_j·J)`, the Euler number
//! `∫_X c_{dim X}`, top intersection numbers, `c2(TX)·J_r` and the index `χ(X, O_X(k)) = ∫_X ch(O(k)) td(TX)`
//! (Hirzebruch–Riemann–Roch). All arithmetic is exact (integers and rationals).

pub mod chow;

use chow::{ChowClass, ChowRing, series_exp, series_inverse_one_plus, series_todd};
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, ToPrimitive, Zero};
use serde::Serialize;
use thiserror::Error;

/// Largest number of ambient factors accepted.
pub const MAX_FACTORS: usize = 16;
/// Largest projective dimension of one factor.
pub const MAX_FACTOR_DIM: usize = 32;
/// Largest number of equations. The `E_1` page enumerates all `2^K` Koszul index sets (held as `u32` bitmasks),
/// so `K` is bounded well below 32: `2^16` subsets are enumerated in milliseconds.
pub const MAX_EQUATIONS: usize = 16;
const _: () = assert!(MAX_EQUATIONS < 32, "Koszul index sets are u32 bitmasks");
/// Largest Chow-ring size `∏ (n_i + 1)` accepted (the dense representation must fit comfortably).
pub const MAX_CHOW_SIZE: usize = 1 << 14;

/// Why a configuration was refused.
#[derive(Debug, Error, Clone, PartialEq, Eq)]
#[non_exhaustive]
pub enum ConfigError {
    #[error("the ambient space needs at least one projective factor")]
    NoFactors,
    #[error("ambient factor {factor} has dimension {dim}: every factor must be P^n with n >= 1")]
    NonPositiveDimension { factor: usize, dim: i64 },
    #[error("at least one equation is needed (a product of projective spaces is never Calabi-Yau)")]
    NoEquations,
    #[error(
        "equation {equation} has {got} degree entries but the ambient space has {expected} factors"
    )]
    LengthMismatch {
        equation: usize,
        got: usize,
        expected: usize,
    },
    #[error("equation {equation} has negative degree {degree} in factor {factor}")]
    NegativeDegree {
        equation: usize,
        factor: usize,
        degree: i64,
    },
    #[error("equation {equation} has multidegree zero (a constant is not an equation)")]
    ZeroEquation { equation: usize },
    #[error(
        "dimension of X is {dim} (= sum of ambient dimensions {ambient} - {equations} equations); it must be at least 1"
    )]
    NonPositiveVariety {
        dim: i64,
        ambient: usize,
        equations: usize,
    },
    #[error(
        "not Calabi-Yau: in factor {factor} (P^{n}) the equation degrees sum to {sum}, but c1 = 0 needs {needed}"
    )]
    NotCalabiYau {
        factor: usize,
        n: usize,
        sum: DegreeSum,
        needed: usize,
    },
    #[error("configuration too large: {what} is {value}, the limit is {limit}")]
    TooLarge {
        what: &'static str,
        value: usize,
        limit: usize,
    },
}

/// The degree sum reported by [`ConfigError::NotCalabiYau`]: exact, or a lower bound when one degree alone is
/// already too large (the sum is then not formed, so it cannot overflow).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum DegreeSum {
    Exactly(i64),
    AtLeast(i64),
}

impl std::fmt::Display for DegreeSum {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            DegreeSum::Exactly(s) => write!(f, "{s}"),
            DegreeSum::AtLeast(s) => write!(f, "at least {s}"),
        }
    }
}

/// Why a geometry figure could not be reported exactly.
#[derive(Debug, Error, Clone, PartialEq, Eq)]
#[non_exhaustive]
pub enum GeometryError {
    #[error("{what} is {value}, which does not fit a 64-bit integer")]
    Overflow { what: &'static str, value: BigInt },
    #[error("internal error: the HRR index of O_X is {0}, not an integer")]
    NonIntegralIndex(BigRational),
}

fn to_i64_checked(what: &'static str, v: BigInt) -> Result<i64, GeometryError> {
    v.to_i64().ok_or(GeometryError::Overflow { what, value: v })
}

/// A validated Calabi-Yau complete intersection configuration (see the module docs for the invariant).
#[derive(Clone, Debug, PartialEq, Eq, Hash, Serialize)]
pub struct Configuration {
    dims: Vec<usize>,
    equations: Vec<Vec<u32>>,
}

impl Configuration {
    /// Check and build a configuration: `dims[i] = n_i ≥ 1`, each equation a length-`m` vector of non-negative,
    /// not all zero degrees, `dim X ≥ 1`, the Calabi-Yau condition, and the size limits above.
    /// Factors are 1-based in error messages, equations too.
    ///
    /// ```
    /// use sheafwright::geometry::{Configuration, Geometry};
    /// // The quintic threefold: d = 5, c2·J = 50, Euler number −200.
    /// let quintic = Configuration::new(&[4], &[vec![5]]).unwrap();
    /// let g = Geometry::new(&quintic);
    /// assert_eq!(g.triple_intersections().unwrap(), vec![vec![vec![5]]]);
    /// assert_eq!(g.c2_dot_j().unwrap(), vec![50]);
    /// assert_eq!(g.euler(), (-200).into());
    /// assert!(Configuration::new(&[4], &[vec![4]]).is_err()); // not Calabi-Yau
    /// ```
    pub fn new(dims: &[i64], equations: &[Vec<i64>]) -> Result<Self, ConfigError> {
        if dims.is_empty() {
            return Err(ConfigError::NoFactors);
        }
        if dims.len() > MAX_FACTORS {
            return Err(ConfigError::TooLarge {
                what: "the number of ambient factors",
                value: dims.len(),
                limit: MAX_FACTORS,
            });
        }
        for (i, &n) in dims.iter().enumerate() {
            if n < 1 {
                return Err(ConfigError::NonPositiveDimension {
                    factor: i + 1,
                    dim: n,
                });
            }
            if n as u64 > MAX_FACTOR_DIM as u64 {
                return Err(ConfigError::TooLarge {
                    what: "a factor's projective dimension",
                    value: n as usize,
                    limit: MAX_FACTOR_DIM,
                });
            }
        }
        let dims: Vec<usize> = dims.iter().map(|&n| n as usize).collect();
        let chow_size = dims
            .iter()
            .try_fold(1usize, |acc, &n| acc.checked_mul(n + 1))
            .unwrap_or(usize::MAX);
        if chow_size > MAX_CHOW_SIZE {
            return Err(ConfigError::TooLarge {
                what: "the ambient Chow ring size (product of (n_i + 1))",
                value: chow_size,
                limit: MAX_CHOW_SIZE,
            });
        }
        if equations.is_empty() {
            return Err(ConfigError::NoEquations);
        }
        if equations.len() > MAX_EQUATIONS {
            return Err(ConfigError::TooLarge {
                what: "the number of equations",
                value: equations.len(),
                limit: MAX_EQUATIONS,
            });
        }
        let m = dims.len();
        let mut eqs: Vec<Vec<u32>> = Vec::with_capacity(equations.len());
        for (j, q) in equations.iter().enumerate() {
            if q.len() != m {
                return Err(ConfigError::LengthMismatch {
                    equation: j + 1,
                    got: q.len(),
                    expected: m,
                });
            }
            for (i, &d) in q.iter().enumerate() {
                if d < 0 {
                    return Err(ConfigError::NegativeDegree {
                        equation: j + 1,
                        factor: i + 1,
                        degree: d,
                    });
                }
            }
            if q.iter().all(|&d| d == 0) {
                return Err(ConfigError::ZeroEquation { equation: j + 1 });
            }
            // The Calabi-Yau condition (degrees ≥ 0 summing to n_i + 1 in each factor) bounds every degree by
            // n_i + 1 ≤ MAX_FACTOR_DIM + 1; refusing larger ones first keeps every later sum small and exact.
            for (i, (&d, &n)) in q.iter().zip(&dims).enumerate() {
                if d > n as i64 + 1 {
                    return Err(ConfigError::NotCalabiYau {
                        factor: i + 1,
                        n,
                        sum: DegreeSum::AtLeast(d),
                        needed: n + 1,
                    });
                }
            }
            eqs.push(q.iter().map(|&d| d as u32).collect());
        }
        let ambient: usize = dims.iter().sum();
        let dim = ambient as i64 - equations.len() as i64;
        if dim < 1 {
            return Err(ConfigError::NonPositiveVariety {
                dim,
                ambient,
                equations: equations.len(),
            });
        }
        for (i, &n) in dims.iter().enumerate() {
            // Each term is in 0..=n+1 (checked above) and there are at most MAX_EQUATIONS: no overflow.
            let sum: i64 = eqs.iter().map(|q| q[i] as i64).sum();
            if sum != n as i64 + 1 {
                return Err(ConfigError::NotCalabiYau {
                    factor: i + 1,
                    n,
                    sum: DegreeSum::Exactly(sum),
                    needed: n + 1,
                });
            }
        }
        Ok(Configuration {
            dims,
            equations: eqs,
        })
    }

    /// Projective dimensions `n_1..n_m` of the ambient factors.
    pub fn dims(&self) -> &[usize] {
        &self.dims
    }

    /// Multidegrees of the equations (one vector of length `m` each).
    pub fn equations(&self) -> &[Vec<u32>] {
        &self.equations
    }

    /// Number of ambient factors `m`.
    pub fn num_factors(&self) -> usize {
        self.dims.len()
    }

    /// Number of equations `K` (the codimension of X in A).
    pub fn codimension(&self) -> usize {
        self.equations.len()
    }

    /// `dim A = Σ n_i`.
    pub fn ambient_dimension(&self) -> usize {
        self.dims.iter().sum()
    }

    /// `dim X = Σ n_i − K` (at least 1 by construction).
    pub fn dimension(&self) -> usize {
        self.ambient_dimension() - self.codimension()
    }

    /// The same configuration with factors permuted: new factor `i` is old factor `perm[i]`
    /// (equation entries move along). Precondition: `perm` is a permutation of `0..m` (panics otherwise).
    pub fn permute_factors(&self, perm: &[usize]) -> Configuration {
        assert_eq!(perm.len(), self.dims.len(), "permute_factors: wrong length");
        let mut seen = vec![false; perm.len()];
        for &p in perm {
            assert!(!seen[p], "permute_factors: not a permutation");
            seen[p] = true;
        }
        Configuration {
            dims: perm.iter().map(|&p| self.dims[p]).collect(),
            equations: self
                .equations
                .iter()
                .map(|q| perm.iter().map(|&p| q[p]).collect())
                .collect(),
        }
    }

    /// A one-line label in the configuration-matrix convention, one row per ambient factor, each row led by its
    /// factor so that it cannot be read transposed: `[P1|2, P1|2, P1|2, P1|2]` (one equation of multidegree
    /// (2,2,2,2)), `[P5|3 3]` (two cubics in P5), `[P2|2 1, P3|1 3]` (row `Pn|` lists that factor's degree in
    /// each equation, equations in order).
    pub fn label(&self) -> String {
        let rows: Vec<String> = self
            .matrix_rows()
            .iter()
            .zip(&self.dims)
            .map(|(row, n)| {
                let degs: Vec<String> = row.iter().map(u32::to_string).collect();
                format!("P{n}|{}", degs.join(" "))
            })
            .collect();
        format!("[{}]", rows.join(", "))
    }

    /// The configuration matrix: row `i` holds the degrees of every equation in ambient factor `i`
    /// (`rows[i][j] = q_j^i`), i.e. the transpose of [`Configuration::equations`].
    pub fn matrix_rows(&self) -> Vec<Vec<u32>> {
        (0..self.dims.len())
            .map(|i| self.equations.iter().map(|q| q[i]).collect())
            .collect()
    }
}

/// Exact geometric data of a configuration (see the module docs).
#[derive(Clone, Debug)]
pub struct Geometry {
    config: Configuration,
    ring: ChowRing,
    mu: ChowClass,
    chern: Vec<ChowClass>,
    todd: ChowClass,
}

impl Geometry {
    /// Compute `μ`, the Chern classes and the Todd class of `X`. Cost: a few ring products, `O(size²)` each.
    pub fn new(config: &Configuration) -> Self {
        let ring = ChowRing::new(config.dims());
        let top = config.ambient_dimension();
        let mut mu = ring.one();
        let mut normal_inv = ring.one();
        let mut normal_todd_inv = ring.one();
        let todd = series_todd(top);
        let inv = series_inverse_one_plus(top);
        for q in config.equations() {
            let h = ring.divisor(&q.iter().map(|&d| d as i64).collect::<Vec<_>>());
            mu = ring.mul(&mu, &h);
            normal_inv = ring.mul(&normal_inv, &ring.eval_series(&inv, &h));
            // 1/td(h) as a series in h: invert the Todd series value class.
            let td_h = ring.eval_series(&todd, &h);
            normal_todd_inv = ring.mul(&normal_todd_inv, &invert_unipotent(&ring, &td_h));
        }
        let mut ambient_c = ring.one();
        let mut ambient_td = ring.one();
        for (i, &n) in config.dims().iter().enumerate() {
            let mut e = vec![0i64; config.num_factors()];
            e[i] = 1;
            let j = ring.divisor(&e);
            let one_plus_j = ring.one().add(&j);
            let td_j = ring.eval_series(&todd, &j);
            for _ in 0..=n {
                ambient_c = ring.mul(&ambient_c, &one_plus_j);
                ambient_td = ring.mul(&ambient_td, &td_j);
            }
        }
        let total = ring.mul(&ambient_c, &normal_inv);
        let chern = (0..=config.dimension())
            .map(|d| ring.degree_part(&total, d))
            .collect();
        let td = ring.mul(&ambient_td, &normal_todd_inv);
        Geometry {
            config: config.clone(),
            ring,
            mu,
            chern,
            todd: td,
        }
    }

    /// The configuration this data belongs to.
    pub fn config(&self) -> &Configuration {
        &self.config
    }

    /// The ambient Chow ring.
    pub fn ring(&self) -> &ChowRing {
        &self.ring
    }

    /// `∫_X α = ∫_A α ∧ μ`.
    pub fn integrate_on_x(&self, alpha: &ChowClass) -> BigRational {
        self.ring.integrate(&self.ring.mul(alpha, &self.mu))
    }

    /// `c_k(TX)` as an ambient class (restricted to X by `∫_X`). `k ≤ dim X`.
    pub fn chern_class(&self, k: usize) -> &ChowClass {
        &self.chern[k]
    }

    /// True when `c1(TX) = 0` (always, for a validated configuration; recomputed from the ring as a check).
    pub fn first_chern_class_vanishes(&self) -> bool {
        self.chern.len() < 2 || self.chern[1].is_zero()
    }

    /// The top intersection number `∫_X J^a` for an exponent vector `a` with `Σ a_i = dim X`:
    /// it equals the coefficient of `J^{n−a}` in `μ`.
    pub fn intersection(&self, a: &[usize]) -> BigInt {
        let n = self.config.dims();
        if a.iter().sum::<usize>() != self.config.dimension() || a.iter().zip(n).any(|(x, y)| x > y)
        {
            return BigInt::zero();
        }
        let comp: Vec<usize> = n.iter().zip(a).map(|(x, y)| x - y).collect();
        let idx = self.ring.index(&comp).expect("complement within bounds");
        self.mu.coeff(idx).to_integer()
    }

    /// `d_{r s t} = ∫_X J_r J_s J_t` for a threefold (dense `m×m×m`), `None` when `dim X ≠ 3`.
    ///
    /// Never overflows: `d_{rst}` is a coefficient of `∏_j (Σ_i q_{ji} J_i)`, hence at most `∏_j (Σ_i q_{ji})`,
    /// and the Calabi-Yau condition makes the row sums add up to `Σ_i (n_i + 1) = 3 + K + m ≤ 35`, so the
    /// product is below `e^{35/e} < 4·10^5`. The `expect` guards that invariant.
    pub fn triple_intersections(&self) -> Option<Vec<Vec<Vec<i64>>>> {
        if self.config.dimension() != 3 {
            return None;
        }
        let m = self.config.num_factors();
        let mut out = vec![vec![vec![0i64; m]; m]; m];
        for r in 0..m {
            for s in 0..m {
                for t in 0..m {
                    let mut a = vec![0usize; m];
                    a[r] += 1;
                    a[s] += 1;
                    a[t] += 1;
                    out[r][s][t] = self
                        .intersection(&a)
                        .to_i64()
                        .expect("threefold intersection numbers are small (see the doc)");
                }
            }
        }
        Some(out)
    }

    /// All top intersection numbers `∫_X J^a` with `Σ a = dim X` that are non-zero, as (exponents, value).
    pub fn top_intersections(&self) -> Vec<(Vec<usize>, BigInt)> {
        let mut out = Vec::new();
        for idx in 0..self.ring.size() {
            let a = self.ring.exponents(idx);
            if a.iter().sum::<usize>() == self.config.dimension() {
                let v = self.intersection(&a);
                if !v.is_zero() {
                    out.push((a, v));
                }
            }
        }
        out
    }

    /// `c2(TX) · J_r = ∫_X c2 J_r` for each factor r, for a threefold; `None` otherwise.
    ///
    /// Never overflows: `c2(TX)` is a polynomial in the `J_i` whose coefficients are bounded by `(3 + K + m)^2`
    /// times binomials of at most 35, and its products with `μ` stay far below `2^63` for the accepted sizes
    /// (at most 16 equations and factors); the `expect` guards that invariant.
    pub fn c2_dot_j(&self) -> Option<Vec<i64>> {
        if self.config.dimension() != 3 {
            return None;
        }
        let m = self.config.num_factors();
        Some(
            (0..m)
                .map(|r| {
                    let mut e = vec![0i64; m];
                    e[r] = 1;
                    let c = self.ring.mul(&self.chern[2], &self.ring.divisor(&e));
                    self.integrate_on_x(&c)
                        .to_integer()
                        .to_i64()
                        .expect("c2·J on a threefold is small (see the doc)")
                })
                .collect(),
        )
    }

    /// The Euler number `χ(X) = ∫_X c_{dim X}(TX)`.
    pub fn euler(&self) -> BigInt {
        self.integrate_on_x(&self.chern[self.config.dimension()])
            .to_integer()
    }

    /// `χ(X, O_X(k)) = ∫_X ch(O(k)) td(TX)` (Hirzebruch–Riemann–Roch), exact. Precondition: `k.len() == m`.
    pub fn index_hrr(&self, k: &[i64]) -> BigRational {
        assert_eq!(
            k.len(),
            self.config.num_factors(),
            "index_hrr: bundle length"
        );
        let d = self.ring.divisor(k);
        let ch = self
            .ring
            .eval_series(&series_exp(self.config.ambient_dimension()), &d);
        self.integrate_on_x(&self.ring.mul(&ch, &self.todd))
    }

    /// `χ(X, O_X(k))` as an integer (HRR always gives an integer; a non-integer would be a bug, reported as
    /// `None`).
    pub fn index(&self, k: &[i64]) -> Option<BigInt> {
        let v = self.index_hrr(k);
        v.is_integer().then(|| v.to_integer())
    }

    /// Hodge-number–independent invariants for a threefold: `(1/6) d_{rst} k^r k^s k^t + (1/12) c2_r k^r`,
    /// the closed form of HRR on a Calabi-Yau threefold. `None` when `dim X ≠ 3`.
    pub fn index_threefold_formula(&self, k: &[i64]) -> Option<BigRational> {
        let d = self.triple_intersections()?;
        let c2 = self.c2_dot_j()?;
        let m = k.len();
        let mut cubic = BigInt::zero();
        for r in 0..m {
            for s in 0..m {
                for t in 0..m {
                    cubic += BigInt::from(d[r][s][t]) * k[r] * k[s] * k[t];
                }
            }
        }
        let lin: BigInt = (0..m).map(|r| BigInt::from(c2[r]) * k[r]).sum();
        Some(BigRational::new(cubic, BigInt::from(6)) + BigRational::new(lin, BigInt::from(12)))
    }
}

/// Inverse of a class `u = 1 + n` with `n` nilpotent: `Σ (−n)^k`.
fn invert_unipotent(ring: &ChowRing, u: &ChowClass) -> ChowClass {
    let nil = u.add(&ring.one().scale(&-BigRational::one()));
    let top = ring.dims().iter().sum::<usize>();
    ring.eval_series(&series_inverse_one_plus(top), &nil)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn label_has_one_row_per_ambient_factor() {
        // Rows are ambient factors, columns equations (the configuration-matrix convention, common practice).
        let split = Configuration::new(&[2, 3], &[vec![2, 1], vec![1, 3]]).unwrap();
        assert_eq!(split.label(), "[P2|2 1, P3|1 3]");
        let bicubic = Configuration::new(&[2, 2], &[vec![3, 3]]).unwrap();
        assert_eq!(bicubic.label(), "[P2|3, P2|3]");
        let two_cubics = Configuration::new(&[5], &[vec![3], vec![3]]).unwrap();
        assert_eq!(two_cubics.label(), "[P5|3 3]");
        // Degrees 2 and 1 of the first equation sit in different rows.
        let c = Configuration::new(&[1, 3], &[vec![2, 1], vec![0, 3]]).unwrap();
        assert_eq!(c.matrix_rows(), vec![vec![2, 0], vec![1, 3]]);
        assert_eq!(c.label(), "[P1|2 0, P3|1 3]");
    }

    #[test]
    fn quintic_basic_numbers() {
        // Quintic threefold: d = 5, c2·J = 50, χ = -200 (textbook values, Hübsch, "Calabi-Yau manifolds").
        let c = Configuration::new(&[4], &[vec![5]]).unwrap();
        let g = Geometry::new(&c);
        assert_eq!(g.triple_intersections().unwrap(), vec![vec![vec![5]]]);
        assert_eq!(g.c2_dot_j().unwrap(), vec![50]);
        assert_eq!(g.euler(), BigInt::from(-200));
        assert!(g.first_chern_class_vanishes());
    }

    #[test]
    fn refuses_bad_configurations() {
        assert!(matches!(
            Configuration::new(&[4], &[vec![4]]),
            Err(ConfigError::NotCalabiYau { .. })
        ));
        assert!(matches!(
            Configuration::new(&[4, 1], &[vec![5]]),
            Err(ConfigError::LengthMismatch { .. })
        ));
        assert!(matches!(
            Configuration::new(&[0], &[vec![1]]),
            Err(ConfigError::NonPositiveDimension { .. })
        ));
        assert!(matches!(
            Configuration::new(&[1, 1], &[vec![-1, 2], vec![3, 0]]),
            Err(ConfigError::NegativeDegree { .. })
        ));
        assert!(matches!(
            Configuration::new(&[1; 20], &[vec![2; 20]]),
            Err(ConfigError::TooLarge { .. })
        ));
    }

    /// Issue 11: degrees whose sum wraps around in i64 used to pass the Calabi-Yau check (and were then
    /// clamped to u32::MAX); i64::MAX + i64::MAX + 7 wraps to 5 = n + 1 on P^4.
    #[test]
    fn regression_issue_11_wrapping_degree_sum_is_refused() {
        let r = Configuration::new(&[4], &[vec![i64::MAX], vec![i64::MAX], vec![7]]);
        assert!(
            matches!(
                r,
                Err(ConfigError::NotCalabiYau {
                    sum: DegreeSum::AtLeast(i64::MAX),
                    ..
                })
            ),
            "{r:?}"
        );
    }

    /// Issue 11: the equation limit is what the u32 Koszul bitmasks and the 2^K enumeration can do; the limit
    /// itself is accepted and computes, one more is refused (the old limit, 32, wrapped `1u32 << 32`).
    #[test]
    fn regression_issue_11_equation_limit_is_computable() {
        // P^17 cut by 14 linear and 2 quadric equations: an elliptic curve (16 equations, the limit).
        let mut eqs = vec![vec![1i64]; MAX_EQUATIONS - 2];
        eqs.extend([vec![2], vec![2]]);
        let curve = Configuration::new(&[17], &eqs).unwrap();
        assert_eq!(curve.codimension(), MAX_EQUATIONS);
        let e = crate::cohomology::CohomologyEngine::new(
            &curve,
            crate::cohomology::PolynomialChoice::Generic { seed: 3 },
        )
        .unwrap();
        // O_E: h^0 = h^1 = 1 on an elliptic curve (common practice).
        assert_eq!(e.cohomology(&[0]).unwrap().h, vec![1, 1]);
        let mut more = vec![vec![1i64]; MAX_EQUATIONS - 1];
        more.extend([vec![2], vec![2]]);
        assert!(matches!(
            Configuration::new(&[18], &more),
            Err(ConfigError::TooLarge { .. })
        ));
    }

    /// Issue 11: figures beyond i64 are an error, not an `i64::MAX` sentinel. A degree-33 hypersurface in P^32
    /// has an Euler number of about 33^31.
    #[test]
    fn regression_issue_11_summary_overflow_is_an_error() {
        let c = Configuration::new(&[32], &[vec![33]]).unwrap();
        let g = Geometry::new(&c);
        assert!(g.euler().to_i64().is_none());
        assert!(matches!(g.summary(), Err(GeometryError::Overflow { .. })));
        // A small case still reports exactly.
        let q = Geometry::new(&Configuration::new(&[4], &[vec![5]]).unwrap());
        assert_eq!(q.summary().unwrap().euler, -200);
    }

    #[test]
    fn index_formulas_agree_on_tetraquadric() {
        let c = Configuration::new(&[1, 1, 1, 1], &[vec![2, 2, 2, 2]]).unwrap();
        let g = Geometry::new(&c);
        for k in [[0, 0, 0, 0], [1, -2, 3, 0], [-1, -1, 2, 4]] {
            assert_eq!(
                g.index_hrr(&k),
                g.index_threefold_formula(&k).unwrap(),
                "k = {k:?}"
            );
        }
        assert_eq!(g.index(&[0, 0, 0, 0]), Some(BigInt::zero()));
    }
}

/// One non-zero top intersection number `∫_X ∏ J_i^{a_i}`.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct IntersectionNumber {
    /// Exponent of each `J_i` (sums to `dim X`).
    pub exponents: Vec<usize>,
    pub value: i64,
}

/// The geometry figures in plain, serialisable form (the `geometry` JSON object).
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct GeometrySummary {
    /// Configuration label, one row per ambient factor, e.g. `[P1|2, P1|2, P1|2, P1|2]` (see [`Configuration::label`]).
    pub configuration: String,
    /// Ambient projective dimensions.
    pub ambient: Vec<usize>,
    /// Equation multidegrees.
    pub equations: Vec<Vec<u32>>,
    pub dimension: usize,
    pub calabi_yau: bool,
    pub euler: i64,
    /// `c2(TX)·J_r`, one per factor (threefolds only).
    pub c2: Option<Vec<i64>>,
    /// `d_{rst}` dense (threefolds only).
    pub triple: Option<Vec<Vec<Vec<i64>>>>,
    /// Every non-zero top intersection number (any dimension).
    pub intersections: Vec<IntersectionNumber>,
    /// `χ(X, O_X)` by HRR.
    pub structure_sheaf_index: i64,
}

impl Geometry {
    /// Collect the figures into a [`GeometrySummary`]; an error when a figure (an Euler number or intersection
    /// number of a high-dimensional X) does not fit the summary's 64-bit integers.
    pub fn summary(&self) -> Result<GeometrySummary, GeometryError> {
        let m = self.config.num_factors();
        let intersections = self
            .top_intersections()
            .into_iter()
            .map(|(exponents, v)| {
                Ok(IntersectionNumber {
                    exponents,
                    value: to_i64_checked("an intersection number", v)?,
                })
            })
            .collect::<Result<Vec<_>, GeometryError>>()?;
        let chi = self.index_hrr(&vec![0; m]);
        if !chi.is_integer() {
            return Err(GeometryError::NonIntegralIndex(chi));
        }
        Ok(GeometrySummary {
            configuration: self.config.label(),
            ambient: self.config.dims().to_vec(),
            equations: self.config.equations().to_vec(),
            dimension: self.config.dimension(),
            calabi_yau: self.first_chern_class_vanishes(),
            euler: to_i64_checked("the Euler number", self.euler())?,
            c2: self.c2_dot_j(),
            triple: self.triple_intersections(),
            intersections,
            structure_sheaf_index: to_i64_checked("chi(O_X)", chi.to_integer())?,
        })
    }
}
