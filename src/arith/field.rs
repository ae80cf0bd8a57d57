//! Exact scalar fields: the prime fields F_p (for primes p < 2^63) and the rationals Q.
//!
//! Invariant kept: every element handed out by a [`PrimeField`] is a `u64` in the canonical
//! range `[0, p)`, and every element handed out by a [`RationalField`] is a `BigRational` in
//! lowest terms with positive denominator (as `num-rational` maintains). Consequently equality
//! of elements (`==`) is equality in the field, and no operation ever rounds.

use num_bigint::BigInt;
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, ToPrimitive, Zero};

/// A field whose elements are values of type `Elem`; operations take `&self` so the modulus
/// can be a runtime value.
///
/// All operations are exact. Implementations must return canonical representatives so that
/// `PartialEq` on `Elem` coincides with equality in the field.
// The `from_*` conversions need `&self` because the target field (its modulus) is a runtime
// value, which is what this lint warns about for ordinary constructors.
#[allow(clippy::wrong_self_convention)]
pub trait Field: Clone + Send + Sync + std::fmt::Debug {
    /// The type of field elements.
    type Elem: Clone + PartialEq + std::fmt::Debug + Send + Sync;
    /// A multiplier prepared once by [`Field::prepare`] for repeated multiplication by the
    /// same scalar (for F_p: the scalar together with a precomputed quotient estimate).
    type Prepared: Clone + std::fmt::Debug + Send + Sync;

    /// The additive identity. Cost O(1).
    fn zero(&self) -> Self::Elem;
    /// The multiplicative identity. Cost O(1).
    fn one(&self) -> Self::Elem;
    /// Whether `a == 0` in the field. Cost O(1).
    fn is_zero(&self, a: &Self::Elem) -> bool;
    /// `a + b`.
    fn add(&self, a: &Self::Elem, b: &Self::Elem) -> Self::Elem;
    /// `a - b`.
    fn sub(&self, a: &Self::Elem, b: &Self::Elem) -> Self::Elem;
    /// `a * b`.
    fn mul(&self, a: &Self::Elem, b: &Self::Elem) -> Self::Elem;
    /// `-a`.
    fn neg(&self, a: &Self::Elem) -> Self::Elem;
    /// `a^{-1}`.
    ///
    /// # Panics
    /// Precondition: `a != 0`; panics when `a` is zero.
    fn inv(&self, a: &Self::Elem) -> Self::Elem;
    /// The image of the integer `v` in the field.
    fn from_i64(&self, v: i64) -> Self::Elem;
    /// The image of the integer `v` in the field.
    fn from_bigint(&self, v: &BigInt) -> Self::Elem;
    /// The image of the rational `v = n/d` in the field, i.e. `n * d^{-1}`; `None` when the
    /// denominator `d` is zero in the field (only possible for F_p with `p | d`).
    fn from_rational(&self, v: &BigRational) -> Option<Self::Elem>;
    /// A human-readable name, e.g. `"F_p, p = 4611686018427387847"` or `"Q (exact)"`.
    fn describe(&self) -> String;

    /// Prepare the scalar `c` for repeated use in [`Field::mul_prepared`]. Cost O(1) for F_p
    /// (one 128-bit division), a clone for Q.
    fn prepare(&self, c: &Self::Elem) -> Self::Prepared;
    /// `c * x` for a prepared scalar `c`. For F_p this avoids any division.
    fn mul_prepared(&self, c: &Self::Prepared, x: &Self::Elem) -> Self::Elem;
    /// `a - c * x` for a prepared scalar `c` (the inner step of row elimination).
    fn sub_mul_prepared(&self, a: &Self::Elem, c: &Self::Prepared, x: &Self::Elem) -> Self::Elem {
        self.sub(a, &self.mul_prepared(c, x))
    }
}

/// The prime field F_p for a prime `p < 2^63`. Elements are `u64` in `[0, p)`.
///
/// Multiplication uses a 128-bit product reduced modulo `p`; repeated multiplication by a
/// fixed scalar (row operations) uses Shoup's precomputed-quotient method, which needs
/// `2p < 2^64`, hence the bound `p < 2^63`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub struct PrimeField {
    p: u64,
}

/// A scalar `c` of F_p together with `floor(c * 2^64 / p)`, used for division-free
/// multiplication by `c` (Shoup's method).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct ShoupScalar {
    c: u64,
    c_quot: u64,
}

/// Four distinct primes just below 2^62, the largest four primes below 2^62
/// (`2^62 - 57`, `2^62 - 87`, `2^62 - 117`, `2^62 - 143`), used for multi-modular rank.
pub const LARGE_PRIMES: [u64; 4] = [
    4_611_686_018_427_387_847,
    4_611_686_018_427_387_817,
    4_611_686_018_427_387_787,
    4_611_686_018_427_387_761,
];

#[inline]
fn mul_mod(a: u64, b: u64, m: u64) -> u64 {
    ((a as u128 * b as u128) % m as u128) as u64
}

fn pow_mod(mut base: u64, mut exp: u64, m: u64) -> u64 {
    let mut acc = 1 % m;
    base %= m;
    while exp > 0 {
        if exp & 1 == 1 {
            acc = mul_mod(acc, base, m);
        }
        base = mul_mod(base, base, m);
        exp >>= 1;
    }
    acc
}

/// Deterministic primality test for every `u64`.
///
/// Miller-Rabin with the twelve prime bases 2, 3, ..., 37, which has no strong pseudoprime
/// below 3.3 * 10^24 > 2^64, so the answer is exact. Cost O(12 * 64) modular multiplications.
pub fn is_prime_u64(n: u64) -> bool {
    const BASES: [u64; 12] = [2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37];
    if n < 2 {
        return false;
    }
    for &b in &BASES {
        if n.is_multiple_of(b) {
            return n == b;
        }
    }
    let s = (n - 1).trailing_zeros();
    let d = (n - 1) >> s;
    'bases: for &a in &BASES {
        let mut x = pow_mod(a, d, n);
        if x == 1 || x == n - 1 {
            continue;
        }
        for _ in 1..s {
            x = mul_mod(x, x, n);
            if x == n - 1 {
                continue 'bases;
            }
        }
        return false;
    }
    true
}

impl PrimeField {
    /// The field F_p, or `None` unless `p` is a prime with `p < 2^63`.
    /// Cost: one deterministic Miller-Rabin test.
    pub fn new(p: u64) -> Option<Self> {
        if p < (1u64 << 63) && is_prime_u64(p) {
            Some(PrimeField { p })
        } else {
            None
        }
    }

    /// The modulus `p`.
    pub fn modulus(&self) -> u64 {
        self.p
    }

    /// Reduce an arbitrary `u64` to its canonical representative in `[0, p)`.
    #[inline]
    pub fn reduce_u64(&self, v: u64) -> u64 {
        v % self.p
    }
}

impl Field for PrimeField {
    type Elem = u64;
    type Prepared = ShoupScalar;

    #[inline]
    fn zero(&self) -> u64 {
        0
    }
    #[inline]
    fn one(&self) -> u64 {
        1
    }
    #[inline]
    fn is_zero(&self, a: &u64) -> bool {
        *a == 0
    }
    #[inline]
    fn add(&self, a: &u64, b: &u64) -> u64 {
        // a, b < p < 2^63, so the sum does not overflow; `min` selects s or s - p without
        // a branch (when s < p, s - p wraps to a value above s).
        let s = a + b;
        s.min(s.wrapping_sub(self.p))
    }
    #[inline]
    fn sub(&self, a: &u64, b: &u64) -> u64 {
        // When a < b the difference wraps above 2^64 - p and adding p brings it below.
        let d = a.wrapping_sub(*b);
        d.min(d.wrapping_add(self.p))
    }
    #[inline]
    fn mul(&self, a: &u64, b: &u64) -> u64 {
        mul_mod(*a, *b, self.p)
    }
    #[inline]
    fn neg(&self, a: &u64) -> u64 {
        if *a == 0 { 0 } else { self.p - a }
    }
    /// Extended Euclid on `(p, a)`. Cost O(log p).
    ///
    /// # Panics
    /// When `a == 0`.
    fn inv(&self, a: &u64) -> u64 {
        assert!(*a != 0, "PrimeField::inv: zero has no inverse");
        let p = self.p as i128;
        let (mut t, mut new_t) = (0i128, 1i128);
        let (mut r, mut new_r) = (p, *a as i128);
        while new_r != 0 {
            let q = r / new_r;
            (t, new_t) = (new_t, t - q * new_t);
            (r, new_r) = (new_r, r - q * new_r);
        }
        debug_assert_eq!(r, 1);
        if t < 0 {
            t += p;
        }
        t as u64
    }
    fn from_i64(&self, v: i64) -> u64 {
        (v as i128).rem_euclid(self.p as i128) as u64
    }
    fn from_bigint(&self, v: &BigInt) -> u64 {
        let r = v.mod_floor(&BigInt::from(self.p));
        r.to_u64().expect("residue lies in [0, p)")
    }
    fn from_rational(&self, v: &BigRational) -> Option<u64> {
        let d = self.from_bigint(v.denom());
        if d == 0 {
            return None;
        }
        let n = self.from_bigint(v.numer());
        Some(self.mul(&n, &self.inv(&d)))
    }
    fn describe(&self) -> String {
        format!("F_p, p = {}", self.p)
    }
    #[inline]
    fn prepare(&self, c: &u64) -> ShoupScalar {
        ShoupScalar {
            c: *c,
            c_quot: (((*c as u128) << 64) / self.p as u128) as u64,
        }
    }
    /// Shoup multiplication: `q = floor(c_quot * x / 2^64)` underestimates `c x / p` by at
    /// most one, so `c x - q p` lies in `[0, 2p)` and one conditional subtraction finishes.
    #[inline]
    fn mul_prepared(&self, c: &ShoupScalar, x: &u64) -> u64 {
        let q = ((c.c_quot as u128 * *x as u128) >> 64) as u64;
        let r = c.c.wrapping_mul(*x).wrapping_sub(q.wrapping_mul(self.p));
        r.min(r.wrapping_sub(self.p))
    }
    #[inline]
    fn sub_mul_prepared(&self, a: &u64, c: &ShoupScalar, x: &u64) -> u64 {
        let m = self.mul_prepared(c, x);
        self.sub(a, &m)
    }
}

/// The field Q of rational numbers, with exact `BigRational` elements.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Hash)]
pub struct RationalField;

impl Field for RationalField {
    type Elem = BigRational;
    type Prepared = BigRational;

    fn zero(&self) -> BigRational {
        BigRational::zero()
    }
    fn one(&self) -> BigRational {
        BigRational::one()
    }
    fn is_zero(&self, a: &BigRational) -> bool {
        a.is_zero()
    }
    fn add(&self, a: &BigRational, b: &BigRational) -> BigRational {
        a + b
    }
    fn sub(&self, a: &BigRational, b: &BigRational) -> BigRational {
        a - b
    }
    fn mul(&self, a: &BigRational, b: &BigRational) -> BigRational {
        a * b
    }
    fn neg(&self, a: &BigRational) -> BigRational {
        -a
    }
    /// # Panics
    /// When `a == 0`.
    fn inv(&self, a: &BigRational) -> BigRational {
        assert!(!a.is_zero(), "RationalField::inv: zero has no inverse");
        a.recip()
    }
    fn from_i64(&self, v: i64) -> BigRational {
        BigRational::from_integer(BigInt::from(v))
    }
    fn from_bigint(&self, v: &BigInt) -> BigRational {
        BigRational::from_integer(v.clone())
    }
    fn from_rational(&self, v: &BigRational) -> Option<BigRational> {
        Some(v.clone())
    }
    fn describe(&self) -> String {
        "Q (exact)".to_string()
    }
    fn prepare(&self, c: &BigRational) -> BigRational {
        c.clone()
    }
    fn mul_prepared(&self, c: &BigRational, x: &BigRational) -> BigRational {
        c * x
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn splitmix(state: &mut u64) -> u64 {
        *state = state.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = *state;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    #[test]
    fn large_primes_are_distinct_primes_below_2_62() {
        for (i, &p) in LARGE_PRIMES.iter().enumerate() {
            assert!(is_prime_u64(p), "{p} is not prime");
            assert!(p < (1u64 << 62));
            assert!(PrimeField::new(p).is_some());
            for &q in &LARGE_PRIMES[i + 1..] {
                assert_ne!(p, q);
            }
        }
        // They are the four largest primes below 2^62: nothing in between is prime.
        let top = 1u64 << 62;
        let count = (LARGE_PRIMES[3]..top).filter(|&n| is_prime_u64(n)).count();
        assert_eq!(count, 4);
    }

    #[test]
    fn primality_small_numbers_match_trial_division() {
        for n in 0u64..5000 {
            let trial = n >= 2 && (2..n).take_while(|d| d * d <= n).all(|d| n % d != 0);
            assert_eq!(is_prime_u64(n), trial, "n = {n}");
        }
        // Strong pseudoprimes to several small bases and Carmichael numbers.
        for n in [
            561u64,
            1_373_653,
            25_326_001,
            3_215_031_751,
            2_152_302_898_747,
        ] {
            assert!(!is_prime_u64(n), "{n}");
        }
        assert!(is_prime_u64((1u64 << 61) - 1));
        assert!(!is_prime_u64(u64::MAX));
        assert!(PrimeField::new(4).is_none());
        assert!(is_prime_u64(18_446_744_073_709_551_557)); // 2^64 - 59
        assert!(PrimeField::new(18_446_744_073_709_551_557).is_none());
    }

    #[test]
    fn prime_field_arithmetic_agrees_with_u128() {
        let mut s = 7u64;
        for &p in LARGE_PRIMES
            .iter()
            .chain([2u64, 3, 65_537, 9_223_372_036_854_775_783].iter())
        {
            let f = PrimeField::new(p).unwrap();
            for _ in 0..2000 {
                let a = splitmix(&mut s) % p;
                let b = splitmix(&mut s) % p;
                let m = ((a as u128 * b as u128) % p as u128) as u64;
                assert_eq!(f.mul(&a, &b), m);
                assert_eq!(f.mul_prepared(&f.prepare(&a), &b), m);
                assert_eq!(f.add(&a, &b) as u128, (a as u128 + b as u128) % p as u128);
                assert_eq!(f.add(&f.sub(&a, &b), &b), a);
                assert_eq!(f.add(&f.neg(&a), &a), 0);
                if a != 0 {
                    assert_eq!(f.mul(&a, &f.inv(&a)), 1);
                }
                assert_eq!(
                    f.sub_mul_prepared(&a, &f.prepare(&b), &b),
                    f.sub(&a, &f.mul(&b, &b))
                );
            }
        }
    }

    #[test]
    fn conversions_into_prime_field() {
        let f = PrimeField::new(7).unwrap();
        assert_eq!(f.from_i64(-1), 6);
        assert_eq!(f.from_i64(i64::MIN), f.from_bigint(&BigInt::from(i64::MIN)));
        assert_eq!(f.from_bigint(&BigInt::from(-15)), 6);
        let half = BigRational::new(BigInt::from(1), BigInt::from(2));
        assert_eq!(f.from_rational(&half), Some(4));
        let sevenths = BigRational::new(BigInt::from(3), BigInt::from(14));
        assert_eq!(f.from_rational(&sevenths), None);
        assert_eq!(
            RationalField.from_rational(&sevenths),
            Some(sevenths.clone())
        );
        assert!(f.describe().contains("p = 7"));
        assert_eq!(RationalField.describe(), "Q (exact)");
    }

    #[test]
    #[should_panic(expected = "zero has no inverse")]
    fn inverse_of_zero_panics() {
        PrimeField::new(5).unwrap().inv(&0);
    }
}
