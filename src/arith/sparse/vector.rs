//! Operations on one sparse vector: the validity check, normalisation of unsorted entries,
//! and the scaled subtraction `a - c b` that every elimination step is made of.
//!
//! Invariant: a [`SparseVec`] is sorted by strictly increasing index, every index is below
//! the ambient length and no stored entry is zero; [`normalize_vec`] and
//! [`sub_scaled_into`] return vectors with this property when given vectors with it.

use super::SparseVec;
use crate::arith::field::Field;

/// Whether `v` is a valid sparse vector of length `len` over `field`: strictly increasing
/// indices `< len` and no stored zeros. Cost O(nnz).
pub fn is_valid_vec<F: Field>(field: &F, len: usize, v: &[(usize, F::Elem)]) -> bool {
    v.iter().all(|(i, x)| *i < len && !field.is_zero(x)) && v.windows(2).all(|w| w[0].0 < w[1].0)
}

/// Sort `v` by index, sum entries with equal index and drop zeros. Cost O(n log n).
pub fn normalize_vec<F: Field>(field: &F, mut v: SparseVec<F::Elem>) -> SparseVec<F::Elem> {
    v.sort_by_key(|e| e.0);
    let mut out: SparseVec<F::Elem> = Vec::with_capacity(v.len());
    for (j, x) in v {
        match out.last_mut() {
            Some((k, y)) if *k == j => *y = field.add(y, &x),
            _ => {
                if let Some((_, y)) = out.last()
                    && field.is_zero(y)
                {
                    out.pop();
                }
                out.push((j, x));
            }
        }
    }
    if let Some((_, y)) = out.last()
        && field.is_zero(y)
    {
        out.pop();
    }
    out
}

/// `out := a - c * b` for sparse vectors `a`, `b` and a prepared scalar `c`, skipping index
/// `skip` (pass `usize::MAX` to skip nothing) and dropping zeros. `out` is cleared first so
/// its allocation can be reused. Cost O(nnz(a) + nnz(b)).
pub fn sub_scaled_into<F: Field>(
    field: &F,
    a: &[(usize, F::Elem)],
    c: &F::Prepared,
    b: &[(usize, F::Elem)],
    skip: usize,
    out: &mut SparseVec<F::Elem>,
) {
    out.clear();
    out.reserve(a.len() + b.len());
    let (mut i, mut k) = (0, 0);
    while i < a.len() && k < b.len() {
        let (ja, jb) = (a[i].0, b[k].0);
        if ja < jb {
            out.push(a[i].clone());
            i += 1;
        } else if jb < ja {
            if jb != skip {
                let y = field.sub_mul_prepared(&field.zero(), c, &b[k].1);
                if !field.is_zero(&y) {
                    out.push((jb, y));
                }
            }
            k += 1;
        } else {
            if ja != skip {
                let y = field.sub_mul_prepared(&a[i].1, c, &b[k].1);
                if !field.is_zero(&y) {
                    out.push((ja, y));
                }
            }
            i += 1;
            k += 1;
        }
    }
    out.extend(a[i..].iter().cloned());
    for (jb, x) in &b[k..] {
        if *jb != skip {
            let y = field.sub_mul_prepared(&field.zero(), c, x);
            if !field.is_zero(&y) {
                out.push((*jb, y));
            }
        }
    }
}

/// Position of index `j` in the sorted sparse vector `v`, if stored. Cost O(log nnz).
pub(super) fn find<E>(v: &[(usize, E)], j: usize) -> Option<usize> {
    v.binary_search_by_key(&j, |e| e.0).ok()
}
