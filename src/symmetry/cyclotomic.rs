//! Exact arithmetic in the cyclotomic field `Q(ζ_M)`, `ζ_M = exp(2πi/M)`.
//!
//! An element is stored as a coefficient vector over `ζ^0 … ζ^{M−1}` (an element of `Q[x]/(x^M − 1)`), which
//! is not unique; [`Cyclotomic::reduce`] gives the canonical form modulo the cyclotomic polynomial `Φ_M`, so two
//! elements are equal iff their reductions agree. `Φ_M` is computed from `x^M − 1 = ∏_{d | M} Φ_d` (exact integer
//! division). Reduction to F_p (for `p ≡ 1 mod M`) sends `ζ` to a primitive M-th root of unity `ω` mod p.
//!
//! Invariant: every vector handed out by a [`Cyclotomic`] has length `M`.

use crate::arith::{Field, PrimeField, is_prime_u64};
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Zero};

/// An element of `Q[x]/(x^M − 1)` (see the module doc).
pub type Cyc = Vec<BigRational>;

/// The field `Q(ζ_M)` with its cyclotomic polynomial.
#[derive(Clone, Debug)]
pub struct Cyclotomic {
    m: u32,
    /// `Φ_M`, coefficients from the constant term up (monic).
    phi: Vec<i64>,
}

/// `Φ_M` by repeated exact division of `x^M − 1`.
pub fn cyclotomic_polynomial(m: u32) -> Vec<i64> {
    let mut num: Vec<i64> = vec![0; m as usize + 1];
    num[0] = -1;
    num[m as usize] = 1;
    for d in 1..m {
        if m.is_multiple_of(d) {
            num = divide_exact(&num, &cyclotomic_polynomial(d));
        }
    }
    num
}

/// Exact quotient of integer polynomials with a monic divisor (precondition: the division is exact).
fn divide_exact(a: &[i64], b: &[i64]) -> Vec<i64> {
    let mut r = a.to_vec();
    let db = b.len() - 1;
    let da = a.len() - 1;
    let mut q = vec![0i64; da - db + 1];
    for i in (0..=da - db).rev() {
        let c = r[i + db];
        q[i] = c;
        for (j, &bj) in b.iter().enumerate() {
            r[i + j] -= c * bj;
        }
    }
    debug_assert!(r.iter().all(|&x| x == 0), "divide_exact: remainder");
    q
}

impl Cyclotomic {
    /// `Q(ζ_M)`; precondition `1 ≤ M ≤ 10_000`.
    pub fn new(m: u32) -> Self {
        assert!((1..=10_000).contains(&m), "Cyclotomic::new: order {m}");
        Cyclotomic {
            m,
            phi: cyclotomic_polynomial(m),
        }
    }
    /// The order `M`.
    pub fn order(&self) -> u32 {
        self.m
    }
    /// The zero element.
    pub fn zero(&self) -> Cyc {
        vec![BigRational::zero(); self.m as usize]
    }
    /// `c · ζ^k` (k taken mod M).
    pub fn monomial(&self, k: i64, c: BigRational) -> Cyc {
        let mut v = self.zero();
        v[k.rem_euclid(self.m as i64) as usize] = c;
        v
    }
    /// `a += c · ζ^k`.
    pub fn add_term(&self, a: &mut Cyc, k: i64, c: &BigRational) {
        a[k.rem_euclid(self.m as i64) as usize] += c;
    }
    /// `a + b`.
    pub fn add(&self, a: &Cyc, b: &Cyc) -> Cyc {
        a.iter().zip(b).map(|(x, y)| x + y).collect()
    }
    /// `a · ζ^k`.
    pub fn shift(&self, a: &Cyc, k: i64) -> Cyc {
        let mut v = self.zero();
        for (i, c) in a.iter().enumerate() {
            if !c.is_zero() {
                self.add_term(&mut v, i as i64 + k, c);
            }
        }
        v
    }
    /// `a · b`.
    pub fn mul(&self, a: &Cyc, b: &Cyc) -> Cyc {
        let mut v = self.zero();
        for (i, x) in a.iter().enumerate() {
            if x.is_zero() {
                continue;
            }
            for (j, y) in b.iter().enumerate() {
                if !y.is_zero() {
                    self.add_term(&mut v, (i + j) as i64, &(x * y));
                }
            }
        }
        v
    }
    /// Complex conjugation `ζ ↦ ζ^{−1}`.
    pub fn conj(&self, a: &Cyc) -> Cyc {
        let mut v = self.zero();
        for (i, c) in a.iter().enumerate() {
            self.add_term(&mut v, -(i as i64), c);
        }
        v
    }
    /// Canonical form: the remainder modulo `Φ_M` (degree `< φ(M)`).
    pub fn reduce(&self, a: &Cyc) -> Vec<BigRational> {
        let mut r = a.clone();
        let d = self.phi.len() - 1;
        for i in (d..r.len()).rev() {
            let c = r[i].clone();
            if c.is_zero() {
                continue;
            }
            for (j, &pj) in self.phi.iter().enumerate() {
                r[i - d + j] -= &c * BigRational::from_integer(BigInt::from(pj));
            }
        }
        r.truncate(d);
        r
    }
    /// Whether `a = 0` in `Q(ζ_M)`.
    pub fn is_zero(&self, a: &Cyc) -> bool {
        self.reduce(a).iter().all(Zero::is_zero)
    }
    /// `a` as a rational number, when it is one.
    pub fn to_rational(&self, a: &Cyc) -> Option<BigRational> {
        let r = self.reduce(a);
        if r.iter().skip(1).all(Zero::is_zero) {
            Some(r.first().cloned().unwrap_or_else(BigRational::zero))
        } else {
            None
        }
    }
    /// Human-readable canonical form, e.g. `"2 + ζ - 3ζ^2"` (`ζ = ζ_M`).
    pub fn to_text(&self, a: &Cyc) -> String {
        let r = self.reduce(a);
        let mut parts = Vec::new();
        for (i, c) in r.iter().enumerate() {
            if c.is_zero() {
                continue;
            }
            let z = match i {
                0 => String::new(),
                1 => "ζ".to_string(),
                _ => format!("ζ^{i}"),
            };
            parts.push(if z.is_empty() {
                c.to_string()
            } else if c.is_one() {
                z
            } else if *c == -BigRational::one() {
                format!("-{z}")
            } else {
                format!("{c}{z}")
            });
        }
        if parts.is_empty() {
            "0".into()
        } else {
            parts.join(" + ").replace("+ -", "- ")
        }
    }
}

/// A prime `p ≡ 1 (mod M)` below `2^62` together with a primitive M-th root of unity `ω` mod p; `skip` selects
/// the next such prime downwards (0 = the largest).
pub fn prime_with_roots(m: u32, skip: usize) -> (PrimeField, u64) {
    let m64 = m as u64;
    let mut t = ((1u64 << 62) - 1) / m64;
    let mut found = 0;
    loop {
        let p = t * m64 + 1;
        if is_prime_u64(p) {
            if found == skip {
                let field = PrimeField::new(p).expect("prime");
                return (field, primitive_root_of_unity(&field, m));
            }
            found += 1;
        }
        t -= 1;
    }
}

fn pow(field: &PrimeField, mut b: u64, mut e: u64) -> u64 {
    let mut r = field.one();
    while e > 0 {
        if e & 1 == 1 {
            r = field.mul(&r, &b);
        }
        b = field.mul(&b, &b);
        e >>= 1;
    }
    r
}

/// A primitive M-th root of unity modulo p (precondition: `M | p − 1`).
pub fn primitive_root_of_unity(field: &PrimeField, m: u32) -> u64 {
    let p = field.modulus();
    let m64 = m as u64;
    let primes: Vec<u64> = (2..=m64)
        .filter(|q| m64.is_multiple_of(*q) && (2..*q).all(|d| q % d != 0))
        .collect();
    for x in 2u64.. {
        let y = pow(field, x, (p - 1) / m64);
        if primes.iter().all(|q| pow(field, y, m64 / q) != 1) {
            return y;
        }
    }
    unreachable!("a primitive root exists")
}

/// Reduce `a ∈ Q[ζ_M]` modulo p with `ζ ↦ ω`; `None` when a denominator vanishes mod p.
pub fn to_mod_p(field: &PrimeField, omega: u64, a: &Cyc) -> Option<u64> {
    let mut acc = field.zero();
    let mut w = field.one();
    for c in a {
        if !c.is_zero() {
            let v = field.from_rational(c)?;
            acc = field.add(&acc, &field.mul(&v, &w));
        }
        w = field.mul(&w, &omega);
    }
    Some(acc)
}

/// `ω^k` mod p.
pub fn omega_pow(field: &PrimeField, omega: u64, m: u32, k: i64) -> u64 {
    pow(field, omega, k.rem_euclid(m as i64) as u64)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q(v: i64) -> BigRational {
        BigRational::from_integer(BigInt::from(v))
    }

    #[test]
    fn cyclotomic_polynomials() {
        // Common practice: Φ_1 = x − 1, Φ_4 = x^2 + 1, Φ_6 = x^2 − x + 1, Φ_12 = x^4 − x^2 + 1.
        assert_eq!(cyclotomic_polynomial(1), vec![-1, 1]);
        assert_eq!(cyclotomic_polynomial(4), vec![1, 0, 1]);
        assert_eq!(cyclotomic_polynomial(6), vec![1, -1, 1]);
        assert_eq!(cyclotomic_polynomial(12), vec![1, 0, -1, 0, 1]);
        assert_eq!(cyclotomic_polynomial(5), vec![1, 1, 1, 1, 1]);
    }

    #[test]
    fn sums_of_roots_of_unity() {
        let k = Cyclotomic::new(5);
        let mut s = k.zero();
        for i in 0..5 {
            k.add_term(&mut s, i, &q(1));
        }
        assert!(k.is_zero(&s));
        let z = k.monomial(1, q(1));
        assert_eq!(k.to_rational(&k.mul(&z, &k.conj(&z))), Some(q(1)));
        assert_eq!(k.to_rational(&z), None);
        // ζ_4^2 = −1.
        let k4 = Cyclotomic::new(4);
        assert_eq!(k4.to_rational(&k4.monomial(2, q(3))), Some(q(-3)));
    }

    #[test]
    fn reduction_mod_p_respects_relations() {
        let (f, w) = prime_with_roots(12, 0);
        assert_eq!(f.modulus() % 12, 1);
        assert_eq!(omega_pow(&f, w, 12, 12), 1);
        assert_ne!(omega_pow(&f, w, 12, 6), 1);
        assert_ne!(omega_pow(&f, w, 12, 4), 1);
        let k = Cyclotomic::new(12);
        let phi: Cyc = {
            let mut v = k.zero();
            for (i, &c) in cyclotomic_polynomial(12).iter().enumerate() {
                v[i] = q(c);
            }
            v
        };
        assert_eq!(to_mod_p(&f, w, &phi), Some(0));
    }
}
