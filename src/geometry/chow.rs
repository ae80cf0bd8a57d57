//! The truncated Chow ring of a product of projective spaces.
//!
//! For `A = P^{n_1} × … × P^{n_m}` the Chow ring is `Q[J_1..J_m] / (J_i^{n_i+1})` (we work over Q so that Todd
//! classes fit; Chern classes stay integral). A class is stored densely: one rational coefficient per monomial
//! `J^a` with `0 ≤ a_i ≤ n_i`, indexed in mixed radix.
//!
//! Invariant: every [`ChowClass`] belongs to exactly one [`ChowRing`] (same `dims`), and its coefficient vector has
//! length `∏ (n_i + 1)`. Integration `∫_A` reads the coefficient of the top monomial `∏ J_i^{n_i}`
//! (normalisation `∫_A ∏ J_i^{n_i} = 1`).

use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Zero};

/// The ring `Q[J_1..J_m]/(J_i^{n_i+1})`; cheap to clone.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ChowRing {
    dims: Vec<usize>,
    strides: Vec<usize>,
    size: usize,
}

/// An element of a [`ChowRing`] (see the module invariant).
#[derive(Clone, Debug, PartialEq)]
pub struct ChowClass {
    coeffs: Vec<BigRational>,
}

impl ChowRing {
    /// The ring for ambient projective dimensions `dims`. Precondition: `∏ (n_i+1)` fits in memory; callers
    /// bound it (see `Configuration`).
    pub fn new(dims: &[usize]) -> Self {
        let mut strides = Vec::with_capacity(dims.len());
        let mut size = 1usize;
        for &n in dims {
            strides.push(size);
            size *= n + 1;
        }
        ChowRing {
            dims: dims.to_vec(),
            strides,
            size,
        }
    }

    /// Number of monomials `∏ (n_i+1)` (the dimension of the ring as a vector space).
    pub fn size(&self) -> usize {
        self.size
    }

    /// Ambient projective dimensions.
    pub fn dims(&self) -> &[usize] {
        &self.dims
    }

    /// The exponent vector of the monomial with dense index `index`.
    pub fn exponents(&self, mut index: usize) -> Vec<usize> {
        self.dims
            .iter()
            .map(|&n| {
                let e = index % (n + 1);
                index /= n + 1;
                e
            })
            .collect()
    }

    /// Dense index of the monomial `J^a`, or `None` when some `a_i > n_i` (the monomial is zero in the ring).
    pub fn index(&self, a: &[usize]) -> Option<usize> {
        let mut idx = 0;
        for ((&e, &n), &s) in a.iter().zip(&self.dims).zip(&self.strides) {
            if e > n {
                return None;
            }
            idx += e * s;
        }
        Some(idx)
    }

    /// The zero class.
    pub fn zero(&self) -> ChowClass {
        ChowClass {
            coeffs: vec![BigRational::zero(); self.size],
        }
    }

    /// The unit class `1`.
    pub fn one(&self) -> ChowClass {
        let mut c = self.zero();
        c.coeffs[0] = BigRational::one();
        c
    }

    /// The degree-one class `Σ_i k_i J_i`.
    pub fn divisor(&self, k: &[i64]) -> ChowClass {
        let mut c = self.zero();
        for (i, &ki) in k.iter().enumerate() {
            if self.dims[i] >= 1 {
                c.coeffs[self.strides[i]] = BigRational::from_integer(BigInt::from(ki));
            }
        }
        c
    }

    /// The monomial `J^a` (zero when it vanishes in the ring).
    pub fn monomial(&self, a: &[usize]) -> ChowClass {
        let mut c = self.zero();
        if let Some(i) = self.index(a) {
            c.coeffs[i] = BigRational::one();
        }
        c
    }

    /// Product in the ring. Cost `O(size²)` in the worst case; zero coefficients are skipped.
    pub fn mul(&self, x: &ChowClass, y: &ChowClass) -> ChowClass {
        let mut out = self.zero();
        for (i, xi) in x.coeffs.iter().enumerate() {
            if xi.is_zero() {
                continue;
            }
            let ei = self.exponents(i);
            for (j, yj) in y.coeffs.iter().enumerate() {
                if yj.is_zero() {
                    continue;
                }
                let ej = self.exponents(j);
                let sum: Vec<usize> = ei.iter().zip(&ej).map(|(a, b)| a + b).collect();
                if let Some(k) = self.index(&sum) {
                    out.coeffs[k] += xi * yj;
                }
            }
        }
        out
    }

    /// Evaluate the power series `Σ_k series[k] x^k` at a nilpotent class `x` with no constant term.
    /// Terms beyond `series.len()` are dropped, so pass at least `Σ n_i + 1` coefficients for an exact result.
    pub fn eval_series(&self, series: &[BigRational], x: &ChowClass) -> ChowClass {
        let mut out = self.zero();
        let mut power = self.one();
        for (k, c) in series.iter().enumerate() {
            if k > 0 {
                power = self.mul(&power, x);
            }
            if power.is_zero() {
                break;
            }
            if !c.is_zero() {
                out = out.add(&power.scale(c));
            }
        }
        out
    }

    /// `∫_A x`: the coefficient of `∏ J_i^{n_i}`.
    pub fn integrate(&self, x: &ChowClass) -> BigRational {
        x.coeffs[self.size - 1].clone()
    }

    /// The homogeneous part of `x` of total degree `d`.
    pub fn degree_part(&self, x: &ChowClass, d: usize) -> ChowClass {
        let mut out = self.zero();
        for (i, c) in x.coeffs.iter().enumerate() {
            if !c.is_zero() && self.exponents(i).iter().sum::<usize>() == d {
                out.coeffs[i] = c.clone();
            }
        }
        out
    }
}

impl ChowClass {
    /// Sum of two classes of the same ring.
    pub fn add(&self, other: &ChowClass) -> ChowClass {
        ChowClass {
            coeffs: self
                .coeffs
                .iter()
                .zip(&other.coeffs)
                .map(|(a, b)| a + b)
                .collect(),
        }
    }

    /// Multiply every coefficient by `c`.
    pub fn scale(&self, c: &BigRational) -> ChowClass {
        ChowClass {
            coeffs: self.coeffs.iter().map(|a| a * c).collect(),
        }
    }

    /// True when every coefficient vanishes.
    pub fn is_zero(&self) -> bool {
        self.coeffs.iter().all(Zero::is_zero)
    }

    /// Coefficient at dense index `i`.
    pub fn coeff(&self, i: usize) -> &BigRational {
        &self.coeffs[i]
    }

    /// All coefficients, dense, in the ring's mixed-radix order.
    pub fn coeffs(&self) -> &[BigRational] {
        &self.coeffs
    }
}

/// Coefficients of the power series `1/(1+x) = Σ (−x)^k` up to degree `n`.
pub fn series_inverse_one_plus(n: usize) -> Vec<BigRational> {
    (0..=n)
        .map(|k| {
            BigRational::from_integer(if k % 2 == 0 {
                BigInt::one()
            } else {
                -BigInt::one()
            })
        })
        .collect()
}

/// Coefficients of `exp(x) = Σ x^k / k!` up to degree `n`.
pub fn series_exp(n: usize) -> Vec<BigRational> {
    let mut out = Vec::with_capacity(n + 1);
    let mut fact = BigInt::one();
    for k in 0..=n {
        if k > 0 {
            fact *= BigInt::from(k);
        }
        out.push(BigRational::new(BigInt::one(), fact.clone()));
    }
    out
}

/// Coefficients of the Todd series `x / (1 − e^{−x}) = 1 + x/2 + x²/12 − x⁴/720 + …` up to degree `n`,
/// obtained by inverting `(1 − e^{−x})/x = Σ_k (−1)^k x^k / (k+1)!` exactly.
pub fn series_todd(n: usize) -> Vec<BigRational> {
    let mut fact = BigInt::one();
    let mut g = Vec::with_capacity(n + 1);
    for k in 0..=n {
        fact *= BigInt::from(k + 1);
        let sign = if k % 2 == 0 {
            BigInt::one()
        } else {
            -BigInt::one()
        };
        g.push(BigRational::new(sign, fact.clone()));
    }
    // Invert g (g[0] = 1): f_0 = 1, f_k = −Σ_{j=1..k} g_j f_{k−j}.
    let mut f: Vec<BigRational> = Vec::with_capacity(n + 1);
    f.push(BigRational::one());
    for k in 1..=n {
        let mut s = BigRational::zero();
        for j in 1..=k {
            s += &g[j] * &f[k - j];
        }
        f.push(-s);
    }
    f
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(n: i64, d: i64) -> BigRational {
        BigRational::new(n.into(), d.into())
    }

    #[test]
    fn todd_series_matches_bernoulli_numbers() {
        // x/(1-e^{-x}) = 1 + x/2 + x^2/12 - x^4/720 + x^6/30240 (standard Bernoulli expansion, common practice).
        let t = series_todd(6);
        assert_eq!(t[0], q(1, 1));
        assert_eq!(t[1], q(1, 2));
        assert_eq!(t[2], q(1, 12));
        assert_eq!(t[3], q(0, 1));
        assert_eq!(t[4], q(-1, 720));
        assert_eq!(t[5], q(0, 1));
        assert_eq!(t[6], q(1, 30240));
    }

    #[test]
    fn truncation_relations_hold() {
        let ring = ChowRing::new(&[1, 2]);
        let j1 = ring.monomial(&[1, 0]);
        let j2 = ring.monomial(&[0, 1]);
        assert!(ring.mul(&j1, &j1).is_zero());
        let j2sq = ring.mul(&j2, &j2);
        assert!(!j2sq.is_zero());
        assert!(ring.mul(&j2sq, &j2).is_zero());
        let top = ring.mul(&j1, &j2sq);
        assert_eq!(ring.integrate(&top), q(1, 1));
    }

    #[test]
    fn series_inverse_times_one_plus_is_one() {
        let ring = ChowRing::new(&[3]);
        let x = ring.divisor(&[2]);
        let inv = ring.eval_series(&series_inverse_one_plus(3), &x);
        let one_plus = ring.one().add(&x);
        assert_eq!(ring.mul(&inv, &one_plus), ring.one());
    }
}
