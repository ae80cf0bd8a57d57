//! Test helpers shared by the sparse submodules: a reproducible generator, random matrices
//! (of a chosen rank), proptest strategies, and the kernel check run on every test matrix.
//!
//! Invariant: every matrix and vector produced here satisfies the sparse invariant of the
//! parent module (sorted, in range, no stored zeros), and every helper is deterministic in its
//! seed.

use super::{
    SparseMatrix, SparseVec, is_valid_vec, kernel_basis, mat_mul, mat_vec, normalize_vec, rank,
};
use crate::arith::dense::rank_dense_naive;
use crate::arith::field::{Field, LARGE_PRIMES, PrimeField};
use proptest::prelude::*;

/// Deterministic splitmix64 generator for reproducible test matrices.
pub(crate) struct SplitMix(pub u64);
impl SplitMix {
    pub(crate) fn next(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    pub(crate) fn below(&mut self, n: u64) -> u64 {
        self.next() % n
    }
}

/// Random sparse matrix with about `per_row` entries per row, values in `[-vmax, vmax]`.
pub(crate) fn random_matrix<F: Field>(
    field: &F,
    rng: &mut SplitMix,
    nrows: usize,
    ncols: usize,
    per_row: usize,
    vmax: i64,
) -> SparseMatrix<F::Elem> {
    let mut t = Vec::new();
    if ncols > 0 {
        for r in 0..nrows {
            for _ in 0..per_row {
                let c = rng.below(ncols as u64) as usize;
                let v = rng.below(2 * vmax as u64 + 1) as i64 - vmax;
                t.push((r, c, field.from_i64(v)));
            }
        }
    }
    SparseMatrix::from_triplets(field, nrows, ncols, t)
}

/// `A (n x r) * B (r x m)` with dense random small entries: rank at most r, and equal
/// to r with high probability over a large field.
pub(crate) fn product_of_rank<F: Field>(
    field: &F,
    rng: &mut SplitMix,
    n: usize,
    r: usize,
    m: usize,
) -> SparseMatrix<F::Elem> {
    let a = random_matrix(field, rng, n, r, r, 5);
    let b = random_matrix(field, rng, r, m, 3, 5);
    mat_mul(field, &a, &b)
}

pub(crate) fn big_field() -> PrimeField {
    PrimeField::new(LARGE_PRIMES[0]).unwrap()
}

pub(crate) fn check_kernel<F: Field>(field: &F, m: &SparseMatrix<F::Elem>) {
    let k = kernel_basis(field, m);
    let r = rank(field, m);
    assert_eq!(k.len() + r, m.ncols);
    for v in &k {
        assert!(is_valid_vec(field, m.ncols, v));
        assert!(mat_vec(field, m, v).is_empty());
    }
    let km = SparseMatrix {
        nrows: k.len(),
        ncols: m.ncols,
        rows: k,
    };
    assert_eq!(
        rank_dense_naive(field, &km),
        km.nrows,
        "kernel basis dependent"
    );
}

pub(crate) fn arb_matrix(p: u64) -> impl Strategy<Value = SparseMatrix<u64>> {
    (1usize..12, 1usize..12).prop_flat_map(move |(nr, nc)| {
        proptest::collection::vec((0..nr, 0..nc, 0..p), 0..40).prop_map(move |t| {
            let f = PrimeField::new(p).unwrap();
            SparseMatrix::from_triplets(&f, nr, nc, t)
        })
    })
}

pub(crate) fn arb_vectors(p: u64) -> impl Strategy<Value = (usize, Vec<SparseVec<u64>>)> {
    (1usize..10).prop_flat_map(move |n| {
        let v = proptest::collection::vec((0..n, 1..p), 0..5);
        (Just(n), proptest::collection::vec(v, 0..8))
    })
}

pub(crate) fn clean(p: u64, v: Vec<(usize, u64)>) -> SparseVec<u64> {
    normalize_vec(&PrimeField::new(p).unwrap(), v)
}
