//! Exact linear algebra over the prime fields F_p and over the rationals Q.
//!
//! Computes ranks, kernels, echelon forms and products of sparse matrices ([`sparse`]), with
//! dense textbook twins for cross-checking ([`dense`]) and multi-modular / certified exact
//! rank over Q ([`certify`]), univariate polynomials, rational functions and rational interpolation
//! ([`interpolate`]); the scalar fields live in [`field`].
//! Invariant kept throughout: sparse vectors are sorted by strictly increasing index and hold
//! no explicit zeros, and all field elements are canonical, so every answer is exact (no
//! floating point is used anywhere).

pub mod certify;
pub mod dense;
pub mod field;
pub mod interpolate;
pub mod sparse;

pub use certify::{
    ExactRankProof, ModularRank, certified_rank, clear_denominators, rank_exact,
    rank_exact_with_proof, rank_multi_modular, rational_reconstruction,
};
pub use dense::{kernel_dense_naive, rank_dense_naive, rref_dense};
pub use field::{Field, LARGE_PRIMES, PrimeField, RationalField, ShoupScalar, is_prime_u64};
pub use interpolate::{
    RationalFunction, UniPoly, interpolate_polynomial, rational_interpolate,
    rational_interpolate_linear, rational_roots,
};
pub use sparse::{
    Echelon, PivotRows, SparseMatrix, SparseVec, back_substitute, echelon, fully_reduce,
    is_valid_vec, kernel_basis, kernel_from_reduced, mat_mul, mat_vec, normalize_vec, rank, reduce,
    sub_scaled_into,
};
