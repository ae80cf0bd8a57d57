//! The row-stored sparse matrix: constructors (triplets, dense rows), transpose, dense
//! conversion, entrywise maps into another field, and the products `m v` and `a b`.
//!
//! Invariant (see [`SparseMatrix::is_valid`]): `rows.len() == nrows` and each row is a
//! valid [`SparseVec`] with indices `< ncols`; every constructor and product here returns a
//! matrix with this property.

use super::SparseVec;
use super::vector::{is_valid_vec, normalize_vec};
use crate::arith::field::Field;

/// A sparse matrix stored by rows.
///
/// Invariant (see [`SparseMatrix::is_valid`]): `rows.len() == nrows` and each row is a valid
/// [`SparseVec`] with indices `< ncols`.
#[derive(Clone, Debug, PartialEq)]
pub struct SparseMatrix<E> {
    /// Number of rows.
    pub nrows: usize,
    /// Number of columns.
    pub ncols: usize,
    /// The rows; `rows[i]` holds the nonzero entries of row `i`.
    pub rows: Vec<SparseVec<E>>,
}

impl<E: Clone> SparseMatrix<E> {
    /// The `nrows x ncols` zero matrix. Cost O(nrows).
    pub fn new(nrows: usize, ncols: usize) -> Self {
        SparseMatrix {
            nrows,
            ncols,
            rows: vec![Vec::new(); nrows],
        }
    }

    /// Build a matrix from `(row, column, value)` triplets; duplicate positions are summed and
    /// entries that are (or sum to) zero are dropped. Cost O(t log t) for t triplets.
    ///
    /// # Panics
    /// Precondition: every `row < nrows` and `column < ncols`; panics otherwise.
    pub fn from_triplets<F, I>(field: &F, nrows: usize, ncols: usize, triplets: I) -> Self
    where
        F: Field<Elem = E>,
        I: IntoIterator<Item = (usize, usize, E)>,
    {
        let mut rows: Vec<SparseVec<E>> = vec![Vec::new(); nrows];
        for (r, c, x) in triplets {
            assert!(
                r < nrows && c < ncols,
                "from_triplets: position ({r}, {c}) outside {nrows} x {ncols}"
            );
            rows[r].push((c, x));
        }
        for row in &mut rows {
            *row = normalize_vec(field, std::mem::take(row));
        }
        SparseMatrix { nrows, ncols, rows }
    }

    /// Build a matrix from dense rows, each of length `ncols`, dropping zeros.
    /// Cost O(nrows * ncols).
    ///
    /// # Panics
    /// Precondition: every row has length `ncols`.
    pub fn from_dense<F: Field<Elem = E>>(field: &F, ncols: usize, dense: &[Vec<E>]) -> Self {
        let rows = dense
            .iter()
            .map(|row| {
                assert_eq!(row.len(), ncols, "from_dense: ragged row");
                row.iter()
                    .enumerate()
                    .filter(|(_, x)| !field.is_zero(x))
                    .map(|(j, x)| (j, x.clone()))
                    .collect()
            })
            .collect();
        SparseMatrix {
            nrows: dense.len(),
            ncols,
            rows,
        }
    }

    /// The transpose. Cost O(nrows + ncols + nnz); rows of the result come out sorted.
    pub fn transpose(&self) -> Self {
        let mut counts = vec![0usize; self.ncols];
        for row in &self.rows {
            for (j, _) in row {
                counts[*j] += 1;
            }
        }
        let mut rows: Vec<SparseVec<E>> = counts.iter().map(|&c| Vec::with_capacity(c)).collect();
        for (i, row) in self.rows.iter().enumerate() {
            for (j, x) in row {
                rows[*j].push((i, x.clone()));
            }
        }
        SparseMatrix {
            nrows: self.ncols,
            ncols: self.nrows,
            rows,
        }
    }

    /// The dense `nrows x ncols` array of entries. Cost O(nrows * ncols).
    pub fn to_dense<F: Field<Elem = E>>(&self, field: &F) -> Vec<Vec<E>> {
        self.rows
            .iter()
            .map(|row| {
                let mut d = vec![field.zero(); self.ncols];
                for (j, x) in row {
                    d[*j] = x.clone();
                }
                d
            })
            .collect()
    }

    /// Whether the representation invariant holds: `rows.len() == nrows`, each row sorted by
    /// strictly increasing column `< ncols`, and no stored zeros. Cost O(nnz).
    pub fn is_valid<F: Field<Elem = E>>(&self, field: &F) -> bool {
        self.rows.len() == self.nrows
            && self
                .rows
                .iter()
                .all(|row| is_valid_vec(field, self.ncols, row))
    }

    /// Number of stored (nonzero) entries. Cost O(nrows).
    pub fn nnz(&self) -> usize {
        self.rows.iter().map(Vec::len).sum()
    }

    /// Apply `f` to every entry, landing in `field` and dropping entries that become zero
    /// (e.g. reduce an integer matrix modulo p). Cost O(nnz) calls of `f`.
    pub fn map_into<F: Field>(
        &self,
        field: &F,
        mut f: impl FnMut(&E) -> F::Elem,
    ) -> SparseMatrix<F::Elem> {
        let rows = self
            .rows
            .iter()
            .map(|row| {
                row.iter()
                    .filter_map(|(j, x)| {
                        let y = f(x);
                        (!field.is_zero(&y)).then_some((*j, y))
                    })
                    .collect()
            })
            .collect();
        SparseMatrix {
            nrows: self.nrows,
            ncols: self.ncols,
            rows,
        }
    }
}

/// The product `m v` (length `m.nrows`) for a sparse vector `v` of length `m.ncols`.
/// Cost O(ncols + nnz(m)) using a dense scatter of `v`.
///
/// # Panics
/// Precondition: indices of `v` are `< m.ncols`.
pub fn mat_vec<F: Field>(
    field: &F,
    m: &SparseMatrix<F::Elem>,
    v: &SparseVec<F::Elem>,
) -> SparseVec<F::Elem> {
    let mut dense: Vec<Option<&F::Elem>> = vec![None; m.ncols];
    for (j, x) in v {
        dense[*j] = Some(x);
    }
    let mut out = Vec::new();
    for (i, row) in m.rows.iter().enumerate() {
        let mut acc = field.zero();
        for (j, a) in row {
            if let Some(x) = dense[*j] {
                acc = field.add(&acc, &field.mul(a, x));
            }
        }
        if !field.is_zero(&acc) {
            out.push((i, acc));
        }
    }
    out
}

/// The product `a b` (Gustavson's row-by-row scheme with a dense accumulator).
/// Cost O(b.ncols + sum over nonzero `a[i][k]` of nnz(row k of b) + sorting of output rows).
///
/// # Panics
/// Precondition: `a.ncols == b.nrows`.
pub fn mat_mul<F: Field>(
    field: &F,
    a: &SparseMatrix<F::Elem>,
    b: &SparseMatrix<F::Elem>,
) -> SparseMatrix<F::Elem> {
    assert_eq!(a.ncols, b.nrows, "mat_mul: inner dimensions differ");
    let mut acc: Vec<F::Elem> = vec![field.zero(); b.ncols];
    let mut touched: Vec<bool> = vec![false; b.ncols];
    let mut list: Vec<usize> = Vec::new();
    let mut rows = Vec::with_capacity(a.nrows);
    for arow in &a.rows {
        for (k, x) in arow {
            let s = field.prepare(x);
            for (j, y) in &b.rows[*k] {
                if !touched[*j] {
                    touched[*j] = true;
                    list.push(*j);
                }
                let prod = field.mul_prepared(&s, y);
                acc[*j] = field.add(&acc[*j], &prod);
            }
        }
        list.sort_unstable();
        let mut row = Vec::with_capacity(list.len());
        for &j in &list {
            touched[j] = false;
            let x = std::mem::replace(&mut acc[j], field.zero());
            if !field.is_zero(&x) {
                row.push((j, x));
            }
        }
        list.clear();
        rows.push(row);
    }
    SparseMatrix {
        nrows: a.nrows,
        ncols: b.ncols,
        rows,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::arith::field::PrimeField;
    use crate::arith::sparse::tests::{SplitMix, random_matrix};

    #[test]
    fn mat_mul_and_transpose_agree_with_dense() {
        let mut rng = SplitMix(99);
        let f = PrimeField::new(101).unwrap();
        for _ in 0..40 {
            let (n, k, m) = (
                1 + rng.below(8) as usize,
                1 + rng.below(8) as usize,
                1 + rng.below(8) as usize,
            );
            let a = random_matrix(&f, &mut rng, n, k, 3, 50);
            let b = random_matrix(&f, &mut rng, k, m, 3, 50);
            let c = mat_mul(&f, &a, &b);
            assert!(c.is_valid(&f));
            let (da, db, dc) = (a.to_dense(&f), b.to_dense(&f), c.to_dense(&f));
            for i in 0..n {
                for j in 0..m {
                    let s = (0..k).fold(0, |s, t| f.add(&s, &f.mul(&da[i][t], &db[t][j])));
                    assert_eq!(dc[i][j], s);
                }
            }
            let at = a.transpose();
            assert!(at.is_valid(&f));
            assert_eq!(at.transpose(), a);
            let v: SparseVec<u64> = b.transpose().rows.first().cloned().unwrap_or_default();
            let mv = mat_vec(&f, &a, &v);
            let mut dv = vec![0u64; k];
            for (j, x) in &v {
                dv[*j] = *x;
            }
            for (i, arow) in da.iter().enumerate() {
                let s = (0..k).fold(0, |s, t| f.add(&s, &f.mul(&arow[t], &dv[t])));
                assert_eq!(mv.iter().find(|e| e.0 == i).map_or(0, |e| e.1), s);
            }
        }
    }

    #[test]
    #[should_panic(expected = "outside")]
    fn from_triplets_rejects_out_of_range() {
        let f = PrimeField::new(5).unwrap();
        let _ = SparseMatrix::from_triplets(&f, 2, 2, vec![(0, 2, 1u64)]);
    }

    #[test]
    fn is_valid_detects_broken_invariants() {
        let f = PrimeField::new(5).unwrap();
        let mut m = SparseMatrix::<u64>::new(1, 3);
        assert!(m.is_valid(&f));
        m.rows[0] = vec![(2, 1), (1, 1)];
        assert!(!m.is_valid(&f));
        m.rows[0] = vec![(1, 0)];
        assert!(!m.is_valid(&f));
        m.rows[0] = vec![(3, 1)];
        assert!(!m.is_valid(&f));
    }
}
