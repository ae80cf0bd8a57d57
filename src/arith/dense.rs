//! Slow, obviously correct dense twins of the sparse routines, used to cross-check them.
//!
//! Computes rank and right kernel by textbook Gauss-Jordan elimination on a dense copy of the
//! matrix. Invariant kept: after processing column `j`, the rows above the current pivot row
//! are in reduced row echelon form on columns `0..=j` (pivot 1, zeros elsewhere in pivot
//! columns); no pivoting heuristics, so correctness is evident from the code.

use super::field::Field;
use super::sparse::SparseMatrix;

/// Reduced row echelon form of a dense matrix; returns the pivot column of each nonzero row,
/// in order. Cost O(nrows * ncols * min(nrows, ncols)) field operations.
pub fn rref_dense<F: Field>(field: &F, a: &mut [Vec<F::Elem>], ncols: usize) -> Vec<usize> {
    let nrows = a.len();
    let mut pivots = Vec::new();
    let mut r = 0;
    for c in 0..ncols {
        if r == nrows {
            break;
        }
        let Some(p) = (r..nrows).find(|&i| !field.is_zero(&a[i][c])) else {
            continue;
        };
        a.swap(r, p);
        let inv = field.inv(&a[r][c]);
        for x in a[r].iter_mut() {
            *x = field.mul(x, &inv);
        }
        let pivot_row = a[r].clone();
        for (i, row) in a.iter_mut().enumerate() {
            if i != r && !field.is_zero(&row[c]) {
                let f = row[c].clone();
                for (x, y) in row.iter_mut().zip(&pivot_row) {
                    let t = field.mul(&f, y);
                    *x = field.sub(x, &t);
                }
            }
        }
        pivots.push(c);
        r += 1;
    }
    pivots
}

/// Rank of `m` by dense Gauss-Jordan elimination. Cost O(nrows * ncols * min(nrows, ncols)).
pub fn rank_dense_naive<F: Field>(field: &F, m: &SparseMatrix<F::Elem>) -> usize {
    let mut a = m.to_dense(field);
    rref_dense(field, &mut a, m.ncols).len()
}

/// Dense basis of the right kernel `{v : m v = 0}`: one vector per free column `f` of the
/// reduced row echelon form, with 1 at `f`, 0 at the other free columns, and `-rref[k][f]`
/// at pivot column `k`. Cost O(nrows * ncols * min(nrows, ncols) + ncols^2).
pub fn kernel_dense_naive<F: Field>(field: &F, m: &SparseMatrix<F::Elem>) -> Vec<Vec<F::Elem>> {
    let mut a = m.to_dense(field);
    let pivots = rref_dense(field, &mut a, m.ncols);
    let mut is_pivot = vec![false; m.ncols];
    for &c in &pivots {
        is_pivot[c] = true;
    }
    (0..m.ncols)
        .filter(|&f| !is_pivot[f])
        .map(|f| {
            let mut v = vec![field.zero(); m.ncols];
            v[f] = field.one();
            for (k, &c) in pivots.iter().enumerate() {
                v[c] = field.neg(&a[k][f]);
            }
            v
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::arith::field::{PrimeField, RationalField};
    use num_bigint::BigInt;
    use num_rational::BigRational;

    #[test]
    fn naive_rank_on_hand_examples() {
        let f = PrimeField::new(7).unwrap();
        let m = SparseMatrix::from_dense(&f, 3, &[vec![1, 2, 3], vec![2, 4, 6], vec![0, 0, 1]]);
        assert_eq!(rank_dense_naive(&f, &m), 2);
        let k = kernel_dense_naive(&f, &m);
        assert_eq!(k, vec![vec![5, 1, 0]]); // -2 = 5 mod 7
        let z = SparseMatrix::<u64>::new(2, 3);
        assert_eq!(rank_dense_naive(&f, &z), 0);
        assert_eq!(kernel_dense_naive(&f, &z).len(), 3);
    }

    #[test]
    fn naive_kernel_vectors_are_annihilated_over_q() {
        let q = RationalField;
        let r = |v: i64| BigRational::from_integer(BigInt::from(v));
        let rows = vec![vec![r(1), r(2), r(3), r(4)], vec![r(2), r(4), r(7), r(9)]];
        let m = SparseMatrix::from_dense(&q, 4, &rows);
        let k = kernel_dense_naive(&q, &m);
        assert_eq!(k.len(), 2);
        for v in &k {
            for row in &rows {
                let s = row
                    .iter()
                    .zip(v)
                    .fold(q.zero(), |s, (a, b)| q.add(&s, &q.mul(a, b)));
                assert_eq!(s, q.zero());
            }
        }
    }
}
