//! Exact linear algebra over the prime fields F_p and over the rationals Q.
//!
//! Computes ranks, kernels, echelon forms and products of sparse matrices, with dense
//! textbook twins for cross-checking and multi-modular / exact rank certification.
//! Invariant kept throughout: sparse vectors are sorted by strictly increasing index and
//! hold no explicit zeros, and all field elements are canonical, so every answer is exact
//! (no floating point is used anywhere).

pub mod certify;
pub mod dense;
pub mod field;
pub mod sparse;

pub use certify::{ModularRank, rank_exact, rank_multi_modular, rational_reconstruction};
pub use dense::{kernel_dense_naive, rank_dense_naive};
pub use field::{Field, LARGE_PRIMES, PrimeField, RationalField, ShoupScalar, is_prime_u64};
pub use sparse::{
    Echelon, SparseMatrix, SparseVec, echelon, kernel_basis, mat_mul, mat_vec, rank, reduce,
};
