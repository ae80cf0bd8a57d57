//! Univariate polynomials and rational functions over Q, polynomial and rational interpolation.
//!
//! [`UniPoly`] stores coefficients from the constant term up; [`RationalFunction`] is a quotient of two of them.
//! The fast reconstruction [`rational_interpolate`] interpolates the values by a polynomial (Newton's divided
//! differences) and then runs the extended Euclidean algorithm on `(∏ (x − x_i), interpolant)`, stopping at the
//! first remainder of degree `≤ n` (rational reconstruction / Padé approximation; von zur Gathen and Gerhard,
//! *Modern Computer Algebra*, §5.7–5.9). The slow twin [`rational_interpolate_linear`] solves the linear system
//! `num(x_i) − y_i·den(x_i) = 0` directly; the tests compare both with known rational functions.
//!
//! Invariants: a [`UniPoly`] has no trailing zero coefficient (the zero polynomial is the empty vector); a
//! [`RationalFunction`] is in lowest terms with a monic denominator, so equal functions have equal
//! representations. Everything is exact.

use super::field::RationalField;
use super::sparse::{SparseMatrix, kernel_basis};
use num_bigint::BigInt;
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, Zero};
use std::fmt;

/// A polynomial in one variable over Q (see the module invariant).
#[derive(Clone, Debug, PartialEq, Eq, Hash, Default)]
pub struct UniPoly {
    coeffs: Vec<BigRational>,
}

impl UniPoly {
    /// The polynomial `Σ coeffs[i] x^i` (trailing zeros are removed).
    pub fn new(mut coeffs: Vec<BigRational>) -> Self {
        while coeffs.last().is_some_and(Zero::is_zero) {
            coeffs.pop();
        }
        UniPoly { coeffs }
    }
    /// From integer coefficients, constant term first.
    pub fn from_ints(c: &[i64]) -> Self {
        UniPoly::new(
            c.iter()
                .map(|&v| BigRational::from_integer(v.into()))
                .collect(),
        )
    }
    /// The constant polynomial `c`.
    pub fn constant(c: BigRational) -> Self {
        UniPoly::new(vec![c])
    }
    /// The polynomial `x`.
    pub fn x() -> Self {
        UniPoly::from_ints(&[0, 1])
    }
    /// Coefficients, constant term first, no trailing zero.
    pub fn coeffs(&self) -> &[BigRational] {
        &self.coeffs
    }
    /// True for the zero polynomial.
    pub fn is_zero(&self) -> bool {
        self.coeffs.is_empty()
    }
    /// The degree, `None` for the zero polynomial.
    pub fn degree(&self) -> Option<usize> {
        self.coeffs.len().checked_sub(1)
    }
    /// The leading coefficient (zero for the zero polynomial).
    pub fn leading(&self) -> BigRational {
        self.coeffs
            .last()
            .cloned()
            .unwrap_or_else(BigRational::zero)
    }
    /// Value at `t` (Horner).
    pub fn eval(&self, t: &BigRational) -> BigRational {
        let mut acc = BigRational::zero();
        for c in self.coeffs.iter().rev() {
            acc = acc * t + c;
        }
        acc
    }
    /// `self + other`.
    pub fn add(&self, other: &UniPoly) -> UniPoly {
        let n = self.coeffs.len().max(other.coeffs.len());
        let z = BigRational::zero();
        UniPoly::new(
            (0..n)
                .map(|i| self.coeffs.get(i).unwrap_or(&z) + other.coeffs.get(i).unwrap_or(&z))
                .collect(),
        )
    }
    /// `self − other`.
    pub fn sub(&self, other: &UniPoly) -> UniPoly {
        self.add(&other.scale(&-BigRational::one()))
    }
    /// `c · self`.
    pub fn scale(&self, c: &BigRational) -> UniPoly {
        UniPoly::new(self.coeffs.iter().map(|a| a * c).collect())
    }
    /// `self · other` (schoolbook).
    pub fn mul(&self, other: &UniPoly) -> UniPoly {
        if self.is_zero() || other.is_zero() {
            return UniPoly::default();
        }
        let mut out = vec![BigRational::zero(); self.coeffs.len() + other.coeffs.len() - 1];
        for (i, a) in self.coeffs.iter().enumerate() {
            for (j, b) in other.coeffs.iter().enumerate() {
                out[i + j] += a * b;
            }
        }
        UniPoly::new(out)
    }
    /// Quotient and remainder of division by a non-zero `d`.
    ///
    /// # Panics
    /// **Panics** when `d` is zero (a broken precondition).
    pub fn div_rem(&self, d: &UniPoly) -> (UniPoly, UniPoly) {
        let dd = d
            .degree()
            .expect("div_rem: division by the zero polynomial");
        let lead = d.leading();
        let mut r = self.coeffs.clone();
        if r.len() <= dd {
            return (UniPoly::default(), self.clone());
        }
        let mut q = vec![BigRational::zero(); r.len() - dd];
        for k in (0..q.len()).rev() {
            let c = &r[k + dd] / &lead;
            if !c.is_zero() {
                for (i, di) in d.coeffs.iter().enumerate() {
                    let t = &c * di;
                    r[k + i] -= t;
                }
            }
            q[k] = c;
        }
        r.truncate(dd);
        (UniPoly::new(q), UniPoly::new(r))
    }
    /// `self / leading` (the zero polynomial stays zero).
    pub fn monic(&self) -> UniPoly {
        if self.is_zero() {
            return self.clone();
        }
        self.scale(&(BigRational::one() / self.leading()))
    }
    /// Monic greatest common divisor (Euclid); `gcd(0, 0) = 0`.
    pub fn gcd(&self, other: &UniPoly) -> UniPoly {
        let (mut a, mut b) = (self.clone(), other.clone());
        while !b.is_zero() {
            let (_, r) = a.div_rem(&b);
            a = b;
            b = r;
        }
        a.monic()
    }
    /// Render with the variable name `var`, highest degree first, e.g. `3*psi^2 - 1/2*psi + 4`.
    pub fn to_text(&self, var: &str) -> String {
        if self.is_zero() {
            return "0".into();
        }
        let mut out = String::new();
        for (i, c) in self.coeffs.iter().enumerate().rev() {
            if c.is_zero() {
                continue;
            }
            let neg = c.is_negative();
            let abs = c.abs();
            if out.is_empty() {
                if neg {
                    out.push('-');
                }
            } else {
                out.push_str(if neg { " - " } else { " + " });
            }
            let mono = match i {
                0 => String::new(),
                1 => var.to_string(),
                _ => format!("{var}^{i}"),
            };
            if mono.is_empty() {
                out.push_str(&abs.to_string());
            } else if abs.is_one() {
                out.push_str(&mono);
            } else {
                out.push_str(&format!("{abs}*{mono}"));
            }
        }
        out
    }
}

/// A rational function `numerator / denominator` over Q (lowest terms, monic denominator).
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct RationalFunction {
    numerator: UniPoly,
    denominator: UniPoly,
}

impl RationalFunction {
    /// `num / den` reduced to lowest terms with a monic denominator; `None` when `den` is zero.
    pub fn new(num: UniPoly, den: UniPoly) -> Option<Self> {
        if den.is_zero() {
            return None;
        }
        if num.is_zero() {
            return Some(RationalFunction {
                numerator: num,
                denominator: UniPoly::from_ints(&[1]),
            });
        }
        let g = num.gcd(&den);
        let (n, _) = num.div_rem(&g);
        let (d, _) = den.div_rem(&g);
        let l = d.leading();
        Some(RationalFunction {
            numerator: n.scale(&(BigRational::one() / &l)),
            denominator: d.monic(),
        })
    }
    /// The constant function `c`.
    pub fn constant(c: BigRational) -> Self {
        RationalFunction {
            numerator: UniPoly::constant(c),
            denominator: UniPoly::from_ints(&[1]),
        }
    }
    pub fn numerator(&self) -> &UniPoly {
        &self.numerator
    }
    /// Monic.
    pub fn denominator(&self) -> &UniPoly {
        &self.denominator
    }
    /// True when the denominator is 1.
    pub fn is_polynomial(&self) -> bool {
        self.denominator.degree() == Some(0)
    }
    /// The constant value, when the function is constant.
    pub fn as_constant(&self) -> Option<BigRational> {
        match (self.numerator.degree(), self.denominator.degree()) {
            (None, _) => Some(BigRational::zero()),
            (Some(0), Some(0)) => Some(self.numerator.leading()),
            _ => None,
        }
    }
    /// `(deg numerator, deg denominator)`, the zero function counting as degree 0.
    pub fn degrees(&self) -> (usize, usize) {
        (
            self.numerator.degree().unwrap_or(0),
            self.denominator.degree().unwrap_or(0),
        )
    }
    /// Value at `t`, `None` at a pole.
    pub fn eval(&self, t: &BigRational) -> Option<BigRational> {
        let d = self.denominator.eval(t);
        if d.is_zero() {
            None
        } else {
            Some(self.numerator.eval(t) / d)
        }
    }
    /// True for the zero function.
    pub fn is_zero(&self) -> bool {
        self.numerator.is_zero()
    }
    /// `−self`.
    pub fn neg(&self) -> Self {
        RationalFunction {
            numerator: self.numerator.scale(&-BigRational::one()),
            denominator: self.denominator.clone(),
        }
    }
    /// `self + other`, in lowest terms.
    pub fn add(&self, other: &RationalFunction) -> Self {
        let num = self
            .numerator
            .mul(&other.denominator)
            .add(&other.numerator.mul(&self.denominator));
        RationalFunction::new(num, self.denominator.mul(&other.denominator))
            .expect("a product of monic denominators is non-zero")
    }
    /// `self − other`, in lowest terms.
    pub fn sub(&self, other: &RationalFunction) -> Self {
        self.add(&other.neg())
    }
    /// `self · other`, in lowest terms.
    pub fn mul(&self, other: &RationalFunction) -> Self {
        RationalFunction::new(
            self.numerator.mul(&other.numerator),
            self.denominator.mul(&other.denominator),
        )
        .expect("a product of monic denominators is non-zero")
    }
    /// `self / other`, in lowest terms; `None` when `other` is the zero function.
    pub fn div(&self, other: &RationalFunction) -> Option<Self> {
        RationalFunction::new(
            self.numerator.mul(&other.denominator),
            self.denominator.mul(&other.numerator),
        )
    }
    /// Render as `(num)/(den)` or just `num` with the variable `var`.
    pub fn to_text(&self, var: &str) -> String {
        if self.is_polynomial() {
            self.numerator.to_text(var)
        } else {
            format!(
                "({})/({})",
                self.numerator.to_text(var),
                self.denominator.to_text(var)
            )
        }
    }
}

impl fmt::Display for RationalFunction {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.to_text("t"))
    }
}

fn distinct(points: &[(BigRational, BigRational)]) -> bool {
    points
        .iter()
        .enumerate()
        .all(|(i, (x, _))| points[..i].iter().all(|(y, _)| y != x))
}

/// The polynomial of degree `< N` through `N` points with distinct abscissae (Newton's divided differences);
/// `None` when two abscissae coincide. Cost O(N²) rational operations.
pub fn interpolate_polynomial(points: &[(BigRational, BigRational)]) -> Option<UniPoly> {
    if !distinct(points) {
        return None;
    }
    let n = points.len();
    let mut dd: Vec<BigRational> = points.iter().map(|(_, y)| y.clone()).collect();
    for level in 1..n {
        for i in (level..n).rev() {
            dd[i] = (&dd[i] - &dd[i - 1]) / (&points[i].0 - &points[i - level].0);
        }
    }
    // Horner on the Newton form: p = dd0 + (x−x0)(dd1 + (x−x1)(dd2 + …)).
    let mut p = UniPoly::default();
    for i in (0..n).rev() {
        let lin = UniPoly::new(vec![-points[i].0.clone(), BigRational::one()]);
        p = p.mul(&lin).add(&UniPoly::constant(dd[i].clone()));
    }
    Some(p)
}

/// The rational function `r/t` with `deg r ≤ n` and `deg t ≤ N − 1 − n` taking the given values at the `N`
/// points, found by the extended Euclidean algorithm on `(∏(x − x_i), interpolant)`; `None` when no such
/// function exists (the EEA solution has a denominator vanishing at a sample point), when `n ≥ N` or when two
/// abscissae coincide. When a solution exists it is unique (as a function), so the answer does not depend on the
/// algorithm. Cost O(N²) rational operations.
pub fn rational_interpolate(
    points: &[(BigRational, BigRational)],
    n: usize,
) -> Option<RationalFunction> {
    let big_n = points.len();
    if n >= big_n {
        return None;
    }
    let interp = interpolate_polynomial(points)?;
    let mut modulus = UniPoly::from_ints(&[1]);
    for (x, _) in points {
        modulus = modulus.mul(&UniPoly::new(vec![-x.clone(), BigRational::one()]));
    }
    // Invariant: r_i = s_i·modulus + t_i·interp.
    let (mut r0, mut r1) = (modulus, interp);
    let (mut t0, mut t1) = (UniPoly::default(), UniPoly::from_ints(&[1]));
    while r1.degree().is_some_and(|d| d > n) {
        let (q, r) = r0.div_rem(&r1);
        let t = t0.sub(&q.mul(&t1));
        r0 = std::mem::replace(&mut r1, r);
        t0 = std::mem::replace(&mut t1, t);
    }
    if t1.degree().is_none_or(|d| d > big_n - 1 - n) {
        return None;
    }
    if points.iter().any(|(x, _)| t1.eval(x).is_zero()) {
        return None;
    }
    let f = RationalFunction::new(r1, t1)?;
    points
        .iter()
        .all(|(x, y)| f.eval(x).as_ref() == Some(y))
        .then_some(f)
}

/// Slow, obviously correct twin of [`rational_interpolate`]: solve `Σ a_i x_k^i − y_k Σ b_j x_k^j = 0` for the
/// `n + 1 + d + 1` unknowns by exact Gaussian elimination and return the first kernel vector whose denominator
/// is non-zero at every point; `None` when there is none.
pub fn rational_interpolate_linear(
    points: &[(BigRational, BigRational)],
    n: usize,
    d: usize,
) -> Option<RationalFunction> {
    let ncols = n + 1 + d + 1;
    let rows: Vec<Vec<(usize, BigRational)>> = points
        .iter()
        .map(|(x, y)| {
            let mut row = Vec::new();
            let mut pw = BigRational::one();
            for i in 0..=n.max(d) {
                if i <= n && !pw.is_zero() {
                    row.push((i, pw.clone()));
                }
                if i <= d {
                    let v = -(y * &pw);
                    if !v.is_zero() {
                        row.push((n + 1 + i, v));
                    }
                }
                pw *= x;
            }
            row.sort_by_key(|e| e.0);
            row
        })
        .collect();
    let m = SparseMatrix {
        nrows: rows.len(),
        ncols,
        rows,
    };
    for v in kernel_basis(&RationalField, &m) {
        let mut num = vec![BigRational::zero(); n + 1];
        let mut den = vec![BigRational::zero(); d + 1];
        for (i, c) in v {
            if i <= n {
                num[i] = c;
            } else {
                den[i - n - 1] = c;
            }
        }
        let den = UniPoly::new(den);
        if den.is_zero() || points.iter().any(|(x, _)| den.eval(x).is_zero()) {
            continue;
        }
        return RationalFunction::new(UniPoly::new(num), den);
    }
    None
}

/// The rational roots of a non-zero polynomial whose cleared integer coefficients are at most `bound` in
/// absolute value at both ends (rational root theorem: `p/q` with `p | a_0`, `q | a_n`); `None` when the bound
/// is exceeded (the roots were not searched). Roots are listed once each, ascending. Zero is a root when
/// `a_0 = 0`.
pub fn rational_roots(p: &UniPoly, bound: u64) -> Option<Vec<BigRational>> {
    let deg = p.degree()?;
    let mut out = Vec::new();
    // Strip the factor x^k.
    let low = p.coeffs().iter().position(|c| !c.is_zero()).unwrap_or(0);
    if low > 0 {
        out.push(BigRational::zero());
    }
    if deg == low {
        return Some(out);
    }
    let lcm = p.coeffs()[low..]
        .iter()
        .fold(BigInt::one(), |a, c| a.lcm(c.denom()));
    let ints: Vec<BigInt> = p.coeffs()[low..]
        .iter()
        .map(|c| (c * BigRational::from_integer(lcm.clone())).to_integer())
        .collect();
    let a0 = ints[0].abs();
    let an = ints[ints.len() - 1].abs();
    let b = BigInt::from(bound);
    if a0 > b || an > b {
        return None;
    }
    let divisors = |v: &BigInt| -> Vec<BigInt> {
        let v = u64::try_from(v).expect("bounded");
        (1..=v)
            .take_while(|i| i * i <= v)
            .filter(|i| v % i == 0)
            .flat_map(|i| [i, v / i])
            .map(BigInt::from)
            .collect()
    };
    let reduced = UniPoly::new(p.coeffs()[low..].to_vec());
    for num in divisors(&a0) {
        for den in divisors(&an) {
            for sign in [1, -1] {
                let r = BigRational::new(&num * BigInt::from(sign), den.clone());
                if reduced.eval(&r).is_zero() && !out.contains(&r) {
                    out.push(r);
                }
            }
        }
    }
    out.sort();
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(n: i64, d: i64) -> BigRational {
        BigRational::new(n.into(), d.into())
    }

    fn sample(f: &RationalFunction, xs: &[BigRational]) -> Vec<(BigRational, BigRational)> {
        xs.iter()
            .filter_map(|x| f.eval(x).map(|y| (x.clone(), y)))
            .collect()
    }

    #[test]
    fn polynomial_arithmetic() {
        let a = UniPoly::from_ints(&[1, 2, 1]); // (x+1)^2
        let b = UniPoly::from_ints(&[1, 1]);
        let (qq, r) = a.div_rem(&b);
        assert_eq!(qq, b);
        assert!(r.is_zero());
        assert_eq!(a.gcd(&UniPoly::from_ints(&[-1, 0, 1])), b);
        assert_eq!(a.eval(&q(2, 1)), q(9, 1));
        assert_eq!(a.to_text("psi"), "psi^2 + 2*psi + 1");
        assert_eq!(UniPoly::from_ints(&[0, -3, 0, 0]).degree(), Some(1));
    }

    #[test]
    fn lowest_terms_and_monic_denominator() {
        // (2x+2)/(4x^2−4) = (1/2)/(x−1).
        let f = RationalFunction::new(UniPoly::from_ints(&[2, 2]), UniPoly::from_ints(&[-4, 0, 4]))
            .unwrap();
        assert_eq!(f.numerator(), &UniPoly::constant(q(1, 2)));
        assert_eq!(f.denominator(), &UniPoly::from_ints(&[-1, 1]));
        assert_eq!(f.eval(&q(1, 1)), None);
        assert_eq!(f.to_text("psi"), "(1/2)/(psi - 1)");
    }

    #[test]
    fn reconstructs_known_functions_fast_and_slow() {
        // (3x^2 − 1/2)/(x^3 + 2x − 7) and a polynomial, sampled at small rationals.
        let cases = [
            RationalFunction::new(
                UniPoly::new(vec![q(-1, 2), q(0, 1), q(3, 1)]),
                UniPoly::from_ints(&[-7, 2, 0, 1]),
            )
            .unwrap(),
            RationalFunction::new(UniPoly::from_ints(&[5, 0, 0, -2]), UniPoly::from_ints(&[1]))
                .unwrap(),
            RationalFunction::new(UniPoly::from_ints(&[1]), UniPoly::from_ints(&[3, 1])).unwrap(),
            RationalFunction::constant(q(-4, 9)),
        ];
        let xs: Vec<BigRational> = (1..=12)
            .map(|i| q(i * if i % 2 == 0 { -1 } else { 1 }, 3))
            .collect();
        for f in &cases {
            let (a, b) = f.degrees();
            let pts = sample(f, &xs[..a + b + 1]);
            assert_eq!(rational_interpolate(&pts, a).as_ref(), Some(f), "{f}");
            assert_eq!(
                rational_interpolate_linear(&pts, a, b).as_ref(),
                Some(f),
                "{f}"
            );
            // With more room than needed both still find it.
            let pts = sample(f, &xs[..a + b + 5]);
            assert_eq!(rational_interpolate(&pts, a + 2).as_ref(), Some(f), "{f}");
            assert_eq!(
                rational_interpolate_linear(&pts, a + 2, b + 2).as_ref(),
                Some(f)
            );
        }
    }

    #[test]
    fn too_few_points_is_no_answer_or_a_different_function() {
        let f = RationalFunction::new(
            UniPoly::from_ints(&[1, 0, 1]),
            UniPoly::from_ints(&[2, 0, 0, 1]),
        )
        .unwrap();
        let xs: Vec<BigRational> = (1..=4).map(|i| q(i, 1)).collect();
        let pts = sample(&f, &xs);
        if let Some(g) = rational_interpolate(&pts, 1) {
            assert_ne!(g, f);
        }
    }

    #[test]
    fn rational_roots_by_the_root_theorem() {
        // 6x^3 − 5x^2 − 2x + 1 = (x − 1)(3x − 1)(2x + 1).
        let p = UniPoly::from_ints(&[1, -2, -5, 6]);
        let r = rational_roots(&p, 1000).unwrap();
        assert_eq!(r, vec![q(-1, 2), q(1, 3), q(1, 1)]);
        assert_eq!(
            rational_roots(&UniPoly::from_ints(&[0, 0, 2, 0, 1]), 10).unwrap(),
            vec![q(0, 1)]
        );
        assert_eq!(
            rational_roots(&UniPoly::from_ints(&[1_000_001, 1]), 1000),
            None
        );
    }

    #[test]
    fn rational_function_field_operations_agree_with_evaluation() {
        // f = (x^2 − 1)/(x + 2), g = 3x/(2x − 1): every operation must commute with evaluation at points that
        // are not poles, and results stay in lowest terms (f·(1/f) = 1 exactly).
        let f = RationalFunction::new(UniPoly::from_ints(&[-1, 0, 1]), UniPoly::from_ints(&[2, 1]))
            .unwrap();
        let g = RationalFunction::new(UniPoly::from_ints(&[0, 3]), UniPoly::from_ints(&[-1, 2]))
            .unwrap();
        for t in [q(3, 1), q(-5, 7), q(11, 2)] {
            let (a, b) = (f.eval(&t).unwrap(), g.eval(&t).unwrap());
            assert_eq!(f.add(&g).eval(&t), Some(&a + &b));
            assert_eq!(f.sub(&g).eval(&t), Some(&a - &b));
            assert_eq!(f.mul(&g).eval(&t), Some(&a * &b));
            assert_eq!(f.div(&g).unwrap().eval(&t), Some(&a / &b));
            assert_eq!(f.neg().eval(&t), Some(-a));
        }
        let one = RationalFunction::constant(q(1, 1));
        assert_eq!(f.mul(&one.div(&f).unwrap()), one);
        assert!(f.sub(&f).is_zero());
        assert!(f.div(&f.sub(&f)).is_none());
        // (x − 1)(x + 1)/(x + 2) · (x + 2)/(x + 1) = x − 1.
        let h = RationalFunction::new(UniPoly::from_ints(&[2, 1]), UniPoly::from_ints(&[1, 1]))
            .unwrap();
        assert_eq!(f.mul(&h).to_text("t"), "t - 1");
    }
}
