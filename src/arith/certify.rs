//! Rank of integer and rational matrices via several primes, exact rank over Q with a
//! certificate, and rational reconstruction.
//!
//! Fact used throughout: for an integer matrix `A` and a prime `p`, `rank(A mod p) <= rank_Q(A)`
//! (a minor that vanishes over Z vanishes mod p), with equality for all but finitely many
//! `p` (those dividing every maximal nonzero minor). Hence a rank mod any prime is a proven
//! lower bound, and an upper bound needs a separate argument: here, `ncols - r` linearly
//! independent vectors verified *exactly over Q* to lie in the kernel.
//!
//! Invariant kept: [`rank_exact`] never returns a value that has not been proven, either by
//! the lower-bound/kernel certificate or by plain exact elimination over Q as a fallback.

use super::field::{Field, LARGE_PRIMES, PrimeField, RationalField};
use super::sparse::{
    SparseMatrix, SparseVec, echelon, fully_reduce, kernel_from_reduced, mat_vec, rank,
};
use num_bigint::BigInt;
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::{One, Signed, Zero};

/// Ranks of an integer matrix modulo several primes.
///
/// Because `rank mod p <= rank over Q` for every prime `p`, with equality for all but finitely
/// many `p`, `rank` (the maximum over the primes) is a proven lower bound for the rank over Q
/// and equals it unless every prime used is unlucky.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ModularRank {
    /// The maximum of the per-prime ranks.
    pub rank: usize,
    /// `(p, rank of the matrix mod p)` for every prime, in the order given.
    pub per_prime: Vec<(u64, usize)>,
    /// Whether all primes gave the same rank.
    pub agreed: bool,
}

/// Rank of the integer matrix `m` modulo each prime in `primes`; see [`ModularRank`].
/// Cost: one reduction of the entries plus one sparse [`rank`] per prime.
///
/// # Panics
/// Preconditions: `primes` is nonempty and each entry is a prime below 2^63.
pub fn rank_multi_modular(m: &SparseMatrix<BigInt>, primes: &[u64]) -> ModularRank {
    assert!(!primes.is_empty(), "rank_multi_modular: no primes given");
    let per_prime: Vec<(u64, usize)> = primes
        .iter()
        .map(|&p| {
            let f = PrimeField::new(p)
                .unwrap_or_else(|| panic!("rank_multi_modular: {p} is not a prime below 2^63"));
            let mp = m.map_into(&f, |x| f.from_bigint(x));
            (p, rank(&f, &mp))
        })
        .collect();
    let rank = per_prime.iter().map(|e| e.1).max().unwrap_or(0);
    let agreed = per_prime.iter().all(|e| e.1 == per_prime[0].1);
    ModularRank {
        rank,
        per_prime,
        agreed,
    }
}

/// Rational reconstruction: the fraction `r/s` with `|r|, |s| <= sqrt(m/2)`, `gcd(r, s) = 1`
/// and `r ≡ a s (mod m)`, found by the half-extended Euclidean algorithm on `(m, a mod m)`
/// (Wang's method). Such a fraction is unique when it exists; `None` when it does not.
/// Cost O(log(m)^2) bit operations.
///
/// # Panics
/// Precondition: `m > 0`.
pub fn rational_reconstruction(a: &BigInt, m: &BigInt) -> Option<BigRational> {
    assert!(
        m.is_positive(),
        "rational_reconstruction: modulus must be positive"
    );
    let bound = (m / 2u32).sqrt();
    let (mut r0, mut r1) = (m.clone(), a.mod_floor(m));
    let (mut s0, mut s1) = (BigInt::zero(), BigInt::one());
    while r1 > bound {
        let q = &r0 / &r1;
        let r2 = &r0 - &q * &r1;
        let s2 = &s0 - &q * &s1;
        r0 = std::mem::replace(&mut r1, r2);
        s0 = std::mem::replace(&mut s1, s2);
    }
    if s1.abs() > bound || !r1.gcd(&s1).is_one() {
        return None;
    }
    Some(BigRational::new(r1, s1))
}

/// Scale each row of a rational matrix by the lcm of its denominators, giving an integer
/// matrix with the same row space over Q (hence the same rank and kernel). Cost O(nnz) big
/// number operations.
pub fn clear_denominators(m: &SparseMatrix<BigRational>) -> SparseMatrix<BigInt> {
    let rows = m
        .rows
        .iter()
        .map(|row| {
            let l = row.iter().fold(BigInt::one(), |l, (_, x)| l.lcm(x.denom()));
            row.iter()
                .map(|(j, x)| (*j, x.numer() * (&l / x.denom())))
                .collect()
        })
        .collect();
    SparseMatrix {
        nrows: m.nrows,
        ncols: m.ncols,
        rows,
    }
}

/// Chinese remaindering of sparse residue vectors: given `a mod modulus` and `b mod p`, the
/// unique vector `mod modulus * p` (entries in `[0, modulus * p)`) agreeing with both; missing
/// entries count as 0. `m_inv` must be `modulus^{-1} mod p`.
fn crt_vec(
    f: &PrimeField,
    a: &SparseVec<BigInt>,
    modulus: &BigInt,
    m_inv: u64,
    b: &SparseVec<u64>,
) -> SparseVec<BigInt> {
    let lift = |x: Option<&BigInt>, y: u64| -> BigInt {
        let x0 = x.cloned().unwrap_or_default();
        let t = f.sub(&y, &f.from_bigint(&x0));
        x0 + modulus * BigInt::from(f.mul(&t, &m_inv))
    };
    let mut out = Vec::with_capacity(a.len().max(b.len()));
    let (mut i, mut k) = (0, 0);
    while i < a.len() || k < b.len() {
        let ja = a.get(i).map_or(usize::MAX, |e| e.0);
        let jb = b.get(k).map_or(usize::MAX, |e| e.0);
        let (j, v) = if ja < jb {
            i += 1;
            (ja, lift(Some(&a[i - 1].1), 0))
        } else if jb < ja {
            k += 1;
            (jb, lift(None, b[k - 1].1))
        } else {
            i += 1;
            k += 1;
            (ja, lift(Some(&a[i - 1].1), b[k - 1].1))
        };
        if !v.is_zero() {
            out.push((j, v));
        }
    }
    out
}

/// Try to prove the rank of `m` over Q using the given primes.
///
/// For each prime the reduced row echelon form of `m mod p` is computed; forms of maximal rank
/// with equal pivot columns are combined by Chinese remaindering and lifted to Q by
/// [`rational_reconstruction`]. The lifted form yields `ncols - r` kernel vectors (independent,
/// since each has a 1 at its own free column and 0 at the others); when all of them satisfy
/// `m v = 0` exactly over Q, `rank_Q(m) <= r`, while `rank_Q(m) >= r` holds because `r` is a
/// rank modulo a prime. Returns `Some(r)` only in that proven case, `None` when the primes
/// given did not suffice. Cost per prime: an echelon form mod p; per attempt: reconstruction
/// of the form's entries and `ncols - r` exact matrix-vector products over Q.
///
/// # Panics
/// Precondition: every entry of `primes` is a prime below 2^63.
pub fn certified_rank(m: &SparseMatrix<BigRational>, primes: &[u64]) -> Option<usize> {
    let n = m.ncols;
    let mi = clear_denominators(m);
    // Accumulated (pivot columns, modulus, rows of residues) of the best rank seen.
    let mut acc: Option<(Vec<usize>, BigInt, Vec<SparseVec<BigInt>>)> = None;
    for &p in primes {
        let f = PrimeField::new(p)
            .unwrap_or_else(|| panic!("certified_rank: {p} is not a prime below 2^63"));
        let mp = mi.map_into(&f, |x| f.from_bigint(x));
        let e = fully_reduce(&f, n, echelon(&f, n, mp.rows));
        let better = acc.as_ref().is_none_or(|(piv, _, _)| e.dim() > piv.len());
        if better {
            let rows = e
                .rows
                .iter()
                .map(|r| r.iter().map(|(j, x)| (*j, BigInt::from(*x))).collect())
                .collect();
            acc = Some((e.pivots, BigInt::from(p), rows));
        } else {
            let (piv, modulus, rows) = acc.as_mut().expect("set above");
            let m_mod = f.from_bigint(modulus);
            if *piv != e.pivots || m_mod == 0 {
                continue;
            }
            let m_inv = f.inv(&m_mod);
            for (a, b) in rows.iter_mut().zip(&e.rows) {
                *a = crt_vec(&f, a, modulus, m_inv, b);
            }
            *modulus *= p;
        }
        let (piv, modulus, rows) = acc.as_ref().expect("set above");
        let lifted: Option<Vec<(usize, SparseVec<BigRational>)>> = piv
            .iter()
            .zip(rows)
            .map(|(c, row)| {
                let r: Option<SparseVec<BigRational>> = row
                    .iter()
                    .map(|(j, x)| rational_reconstruction(x, modulus).map(|q| (*j, q)))
                    .collect();
                r.map(|r| (*c, r))
            })
            .collect();
        let Some(lifted) = lifted else { continue };
        let q = RationalField;
        let kernel = kernel_from_reduced(&q, n, &lifted);
        if kernel.iter().all(|v| mat_vec(&q, m, v).is_empty()) {
            return Some(piv.len());
        }
    }
    None
}

/// Exact rank of a rational matrix.
///
/// First tries [`certified_rank`] with [`LARGE_PRIMES`] on the matrix and its transpose (fast, and proven when
/// it answers);
/// otherwise falls back to sparse Gaussian elimination over Q with exact `BigRational`
/// arithmetic. Either way the answer is exact. Cost: typically a few eliminations mod p plus
/// `ncols - rank` exact products; the fallback can suffer coefficient growth.
pub fn rank_exact(m: &SparseMatrix<BigRational>) -> usize {
    rank_exact_with_proof(m).0
}

/// How [`rank_exact_with_proof`] proved its answer.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ExactRankProof {
    /// A rank modulo a prime (a lower bound over Q) together with `ncols − rank` kernel vectors verified
    /// exactly over Q (an upper bound): [`certified_rank`] with [`LARGE_PRIMES`].
    ModularWithKernel,
    /// Plain sparse Gaussian elimination over Q with exact `BigRational` arithmetic (used when the
    /// modular certificate did not close, e.g. when the reduced echelon form has entries too large to
    /// reconstruct from [`LARGE_PRIMES`]).
    Elimination,
}

/// [`rank_exact`] together with the way the rank was proven. Same cost as [`rank_exact`].
///
/// The modular certificate is tried on `m` and on its transpose (same rank), the one with fewer columns
/// first: fewer kernel vectors to verify, and the reduced echelon form of the other orientation often has
/// entries too large to reconstruct.
pub fn rank_exact_with_proof(m: &SparseMatrix<BigRational>) -> (usize, ExactRankProof) {
    let t = m.transpose();
    let (first, second) = if m.ncols <= m.nrows { (m, &t) } else { (&t, m) };
    match certified_rank(first, &LARGE_PRIMES).or_else(|| certified_rank(second, &LARGE_PRIMES)) {
        Some(r) => (r, ExactRankProof::ModularWithKernel),
        None => (rank(&RationalField, m), ExactRankProof::Elimination),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::arith::dense::rank_dense_naive;
    use crate::arith::sparse::tests::{SplitMix, product_of_rank, random_matrix};
    use proptest::prelude::*;

    fn q(n: i64, d: i64) -> BigRational {
        BigRational::new(BigInt::from(n), BigInt::from(d))
    }

    fn int_matrix(rows: &[&[i64]]) -> SparseMatrix<BigInt> {
        let ncols = rows.first().map_or(0, |r| r.len());
        let dense: Vec<Vec<BigRational>> = rows
            .iter()
            .map(|r| r.iter().map(|&v| q(v, 1)).collect())
            .collect();
        let mq = SparseMatrix::from_dense(&RationalField, ncols, &dense);
        clear_denominators(&mq)
    }

    fn to_rational(m: &SparseMatrix<BigInt>) -> SparseMatrix<BigRational> {
        m.map_into(&RationalField, |x| BigRational::from_integer(x.clone()))
    }

    #[test]
    fn rank_drops_mod_3_but_not_over_q() {
        // det = 1*(-2) - 1*1 = -3.
        let m = int_matrix(&[&[1, 1], &[1, -2]]);
        let mr = rank_multi_modular(&m, &[3, LARGE_PRIMES[0]]);
        assert_eq!(mr.per_prime, vec![(3, 1), (LARGE_PRIMES[0], 2)]);
        assert!(!mr.agreed);
        assert_eq!(mr.rank, 2);
        let mq = to_rational(&m);
        assert_eq!(rank_exact(&mq), 2);
        assert_eq!(rank(&RationalField, &mq), 2);
        // Certification with only the unlucky prime must not claim rank 1.
        assert_eq!(certified_rank(&mq, &[3]), None);
        assert_eq!(certified_rank(&mq, &[3, 5]), Some(2));
    }

    #[test]
    fn multi_modular_agrees_on_products_of_known_rank() {
        let mut rng = SplitMix(5);
        let f = PrimeField::new(LARGE_PRIMES[0]).unwrap();
        let qf = RationalField;
        for r in 0..8 {
            // Build over Q so the integer matrix is the true product.
            let mq = product_of_rank(&qf, &mut rng, 12, r, 15);
            let mi = clear_denominators(&mq);
            let mr = rank_multi_modular(&mi, &LARGE_PRIMES);
            assert!(mr.agreed, "{mr:?}");
            let exact = rank_dense_naive(&qf, &mq);
            assert!(exact <= r);
            assert_eq!(mr.rank, exact);
            assert_eq!(rank_exact(&mq), exact);
            assert_eq!(certified_rank(&mq, &LARGE_PRIMES[..1]), Some(exact));
            let mp = mi.map_into(&f, |x| f.from_bigint(x));
            assert_eq!(rank(&f, &mp), exact);
        }
    }

    #[test]
    fn rank_exact_on_rational_entries_and_large_coefficients() {
        let qf = RationalField;
        // Rows with fractional entries: row 3 = row 1 / 3 + row 2 * 5/7.
        let r1 = vec![q(1, 2), q(3, 1), q(0, 1), q(-5, 9)];
        let r2 = vec![q(2, 3), q(0, 1), q(7, 11), q(1, 1)];
        let r3: Vec<BigRational> = r1
            .iter()
            .zip(&r2)
            .map(|(a, b)| a / q(3, 1) + b * q(5, 7))
            .collect();
        let m = SparseMatrix::from_dense(&qf, 4, &[r1, r2, r3]);
        assert_eq!(rank_exact(&m), 2);
        assert_eq!(rank_dense_naive(&qf, &m), 2);
        // Entries far beyond one 62-bit prime: the certificate needs several primes or the
        // fallback, and must still be exact.
        let big = BigInt::from(3u8).pow(80u32);
        let b = BigRational::from_integer(big.clone());
        let b1 = BigRational::from_integer(big + 1);
        let m2 = SparseMatrix::from_dense(
            &qf,
            3,
            &[
                vec![b.clone(), b1.clone(), q(1, 1)],
                vec![b1.clone(), b.clone(), q(1, 1)],
                vec![&b + &b1, &b + &b1, q(2, 1)],
            ],
        );
        assert_eq!(rank_exact(&m2), 2);
        assert_eq!(rank_dense_naive(&qf, &m2), 2);
    }

    #[test]
    fn certificate_needs_chinese_remaindering_for_large_entries() {
        // Reduced form [[1, 0, 1/b, c/b], [0, 1, ...]] with b about 2^40: one 62-bit prime
        // cannot reconstruct 1/b (bound about 2^30.5), two primes can (bound about 2^61.5).
        let b: i64 = (1 << 40) + 15;
        let c: i64 = (1 << 35) - 3;
        let m = to_rational(&int_matrix(&[
            &[b, 0, 1, c],
            &[0, b, -c, 7],
            &[b, b, 1 - c, c + 7],
        ]));
        assert_eq!(certified_rank(&m, &LARGE_PRIMES[..1]), None);
        assert_eq!(certified_rank(&m, &LARGE_PRIMES[..2]), Some(2));
        assert_eq!(rank_exact(&m), 2);
        assert_eq!(rank_dense_naive(&RationalField, &m), 2);
    }

    #[test]
    #[should_panic(expected = "not a prime")]
    fn multi_modular_rejects_composite_modulus() {
        let _ = rank_multi_modular(&int_matrix(&[&[1]]), &[15]);
    }

    #[test]
    fn rank_exact_matches_naive_on_random_rationals() {
        let mut rng = SplitMix(11);
        let qf = RationalField;
        for _ in 0..50 {
            let nr = 1 + rng.below(8) as usize;
            let nc = 1 + rng.below(8) as usize;
            let m = random_matrix(&qf, &mut rng, nr, nc, 2, 3);
            let scaled = m.map_into(&qf, |x| x / q(1 + rng.below(5) as i64, 1));
            assert_eq!(rank_exact(&scaled), rank_dense_naive(&qf, &scaled));
        }
    }

    #[test]
    fn reconstruction_examples() {
        let m = BigInt::from(LARGE_PRIMES[0]);
        let f = PrimeField::new(LARGE_PRIMES[0]).unwrap();
        for (n, d) in [
            (0i64, 1i64),
            (1, 1),
            (-1, 1),
            (22, 7),
            (-355, 113),
            (1, 1_000_000),
        ] {
            let a = BigInt::from(f.from_rational(&q(n, d)).unwrap());
            assert_eq!(rational_reconstruction(&a, &m), Some(q(n, d)));
        }
        // Bound is sqrt(m/2): numerator and denominator both near 2^40 cannot be recovered.
        let big = q((1i64 << 40) + 1, (1i64 << 40) - 1);
        let a = BigInt::from(f.from_rational(&big).unwrap());
        assert_ne!(rational_reconstruction(&a, &m), Some(big));
        // Small modulus: 3 mod 7 with bound sqrt(3)=1 has candidates only in {0, +-1}.
        assert_eq!(
            rational_reconstruction(&BigInt::from(6), &BigInt::from(7)),
            Some(q(-1, 1))
        );
        assert_eq!(
            rational_reconstruction(&BigInt::from(3), &BigInt::from(7)),
            None
        );
    }

    proptest! {
        #[test]
        fn prop_reconstruction_round_trip(n in -1_000_000_000i64..1_000_000_000, d in 1i64..1_000_000_000) {
            let p = LARGE_PRIMES[2];
            let f = PrimeField::new(p).unwrap();
            let x = q(n, d);
            let a = BigInt::from(f.from_rational(&x).unwrap());
            prop_assert_eq!(rational_reconstruction(&a, &BigInt::from(p)), Some(x.clone()));
            // Also through a product of two primes.
            let m2 = BigInt::from(p) * BigInt::from(LARGE_PRIMES[3]);
            let inv = q(1, 1) / BigRational::from_integer(BigInt::from(d));
            let num = BigInt::from(n) * inv.numer();
            let den_inv = inv.denom().modinv(&m2).unwrap();
            let a2 = (num * den_inv).mod_floor(&m2);
            prop_assert_eq!(rational_reconstruction(&a2, &m2), Some(x));
        }

        #[test]
        fn prop_reconstruction_is_congruent_when_found(a in 0u64..1000, m in 2u64..1000) {
            let (ab, mb) = (BigInt::from(a), BigInt::from(m));
            if let Some(x) = rational_reconstruction(&ab, &mb) {
                let lhs = (x.numer() - &ab * x.denom()).mod_floor(&mb);
                prop_assert!(lhs.is_zero());
                let bound = (&mb / 2u32).sqrt();
                prop_assert!(x.numer().abs() <= bound && x.denom() <= &bound);
            }
        }
    }
}
