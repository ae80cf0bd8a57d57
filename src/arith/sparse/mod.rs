//! Sparse matrices over an exact [`Field`]: rank, right kernel, echelon form of a span,
//! reduction modulo an echelon basis, and sparse products.
//!
//! Invariant kept: every [`SparseVec`] (a matrix row, a kernel vector, an echelon row) is
//! sorted by strictly increasing index, every index is below the ambient length, and no
//! stored entry is zero. All functions assume this of their inputs (checkable with
//! [`SparseMatrix::is_valid`] / [`is_valid_vec`]) and guarantee it of their outputs.
//!
//! Layout, one idea per file (every item is re-exported here, so `arith::sparse::X` is the
//! path to use):
//! - [`vector`]: the sparse vector operations everything else is built from (validity check,
//!   normalisation, the scaled subtraction `a - c b`);
//! - [`matrix`]: the row-stored [`SparseMatrix`], its constructors and conversions, and the
//!   products [`mat_vec`] and [`mat_mul`];
//! - [`elimination`]: the Markowitz-pivoted Gaussian elimination with its dense finish, and
//!   [`rank`];
//! - [`kernel`]: back-substitution to reduced rows and the right kernel [`kernel_basis`];
//! - [`echelon`](mod@echelon): the [`Echelon`] form of a span by smallest index, its full
//!   reduction and reduction of a vector modulo it.

#[cfg(doc)]
use super::field::Field;

pub mod echelon;
pub mod elimination;
pub mod kernel;
pub mod matrix;
pub mod vector;

#[cfg(test)]
pub(crate) mod tests;

pub use echelon::{Echelon, echelon, fully_reduce, reduce};
pub use elimination::rank;
pub use kernel::{back_substitute, kernel_basis, kernel_from_reduced};
pub use matrix::{SparseMatrix, mat_mul, mat_vec};
pub use vector::{is_valid_vec, normalize_vec, sub_scaled_into};

/// Pivot rows: `(pivot column, row)` pairs, as produced by elimination and consumed by
/// [`back_substitute`] and [`kernel_from_reduced`].
pub type PivotRows<E> = Vec<(usize, SparseVec<E>)>;

/// Sparse vector: `(index, value)` pairs sorted by strictly increasing index, no explicit zeros.
pub type SparseVec<E> = Vec<(usize, E)>;
