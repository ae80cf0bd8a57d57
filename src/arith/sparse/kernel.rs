//! The right kernel of a sparse matrix: back-substitution of pivot rows to reduced form and
//! the kernel basis indexed by the free columns.
//!
//! Invariant: the kernel basis of an `m` with `ncols` columns has `ncols - rank(m)` vectors,
//! each annihilated by `m`; the vector for free column `f` is 1 at `f` and zero at every other
//! free column, so the basis is linearly independent by construction.

use super::elimination::eliminate;
use super::vector::{find, sub_scaled_into};
use super::{PivotRows, SparseMatrix, SparseVec};
use crate::arith::field::Field;

/// Turn pivot rows in triangular order into reduced rows: input `(column, row)` pairs where
/// each row holds its own column and no column of an *earlier* pair; output the same columns
/// with rows normalised to 1 at their column and zero at every other pair's column, spanning
/// the same space. Cost O(sum over pairs of the merges performed).
///
/// # Panics
/// Preconditions: each row holds its own pivot column, no row holds the pivot column of an
/// earlier pair, and all indices are `< ncols`; a row missing its pivot panics.
pub fn back_substitute<F: Field>(
    field: &F,
    ncols: usize,
    mut pivots: PivotRows<F::Elem>,
) -> PivotRows<F::Elem> {
    let mut pos_of_col = vec![usize::MAX; ncols];
    for (k, (c, _)) in pivots.iter().enumerate() {
        pos_of_col[*c] = k;
    }
    let mut out: SparseVec<F::Elem> = Vec::new();
    for k in (0..pivots.len()).rev() {
        let c = pivots[k].0;
        let mut row = std::mem::take(&mut pivots[k].1);
        let lead = row[find(&row, c).expect("pivot row holds its column")]
            .1
            .clone();
        if lead != field.one() {
            let s = field.prepare(&field.inv(&lead));
            for e in row.iter_mut() {
                e.1 = field.mul_prepared(&s, &e.1);
            }
        }
        // Eliminate every other pivot column. Reduced later rows are zero at all pivot
        // columns but their own, so the coefficients to clear are fixed up front.
        let hits: Vec<(usize, F::Prepared)> = row
            .iter()
            .filter(|(j, _)| *j != c && pos_of_col[*j] != usize::MAX)
            .map(|(j, x)| (*j, field.prepare(x)))
            .collect();
        for (j, factor) in hits {
            sub_scaled_into(field, &row, &factor, &pivots[pos_of_col[j]].1, j, &mut out);
            std::mem::swap(&mut row, &mut out);
        }
        pivots[k].1 = row;
    }
    pivots
}

/// Kernel basis from reduced rows (each normalised to 1 at its pivot column and zero at the
/// other pivot columns): for every free column `f`, ascending, the vector
/// `e_f - sum_k row_k[f] e_{pivot_k}`. Cost O(ncols + nnz(rows) + output).
///
/// # Panics
/// Precondition: `reduced` is as produced by [`back_substitute`] (each row zero at every
/// other pivot column, indices `< ncols`); a row holding another pivot column panics.
pub fn kernel_from_reduced<F: Field>(
    field: &F,
    ncols: usize,
    reduced: &[(usize, SparseVec<F::Elem>)],
) -> Vec<SparseVec<F::Elem>> {
    let mut is_pivot = vec![false; ncols];
    for (c, _) in reduced {
        is_pivot[*c] = true;
    }
    let mut free_slot = vec![usize::MAX; ncols];
    let mut kernel: Vec<SparseVec<F::Elem>> = Vec::new();
    for f in 0..ncols {
        if !is_pivot[f] {
            free_slot[f] = kernel.len();
            kernel.push(vec![(f, field.one())]);
        }
    }
    for (c, row) in reduced {
        for (j, x) in row {
            if *j != *c {
                kernel[free_slot[*j]].push((*c, field.neg(x)));
            }
        }
    }
    for v in &mut kernel {
        v.sort_unstable_by_key(|e| e.0);
    }
    kernel
}

/// A basis of the right kernel `{v : m v = 0}`; each vector has length `m.ncols`.
///
/// The basis is indexed by the free (non-pivot) columns of the elimination: the vector for
/// free column `f` has a 1 at `f`, zeros at the other free columns, so the basis is linearly
/// independent by construction; its size is `ncols - rank(m)`. Cost: the elimination of
/// [`rank`](super::rank) plus back-substitution to reduced form plus O(output).
pub fn kernel_basis<F: Field>(field: &F, m: &SparseMatrix<F::Elem>) -> Vec<SparseVec<F::Elem>> {
    let (_, pivots) = eliminate(field, m, true);
    let reduced = back_substitute(field, m.ncols, pivots);
    kernel_from_reduced(field, m.ncols, &reduced)
}

#[cfg(test)]
mod tests {
    // Every matrix of the elimination tests also goes through `check_kernel` (kernel size,
    // annihilation, independence); here the kernel laws on arbitrary small matrices.
    use super::*;
    use crate::arith::field::PrimeField;
    use crate::arith::sparse::tests::arb_matrix;
    use crate::arith::sparse::{echelon, mat_vec, rank};
    use proptest::prelude::*;

    proptest! {
        #[test]
        fn prop_kernel_is_kernel_and_complements_rank(m in arb_matrix(5)) {
            let f = PrimeField::new(5).unwrap();
            let k = kernel_basis(&f, &m);
            prop_assert_eq!(k.len() + rank(&f, &m), m.ncols);
            for v in &k {
                prop_assert!(!v.is_empty());
                prop_assert!(mat_vec(&f, &m, v).is_empty());
            }
            let e = echelon(&f, m.ncols, k.clone());
            prop_assert_eq!(e.dim(), k.len());
        }
    }
}
