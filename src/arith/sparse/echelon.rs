//! Echelon form of the span of sparse vectors by smallest nonzero index, its full reduction
//! (the unique reduced row echelon form) and reduction of a vector modulo it.
//!
//! Invariant: the pivot set of an [`Echelon`] is `{min index of v : v in span, v != 0}`, an
//! invariant of the span; each row has its pivot as smallest index and is normalised to 1
//! there; [`reduce`] returns a remainder that is zero at every pivot and empty exactly for
//! members of the span.

use super::SparseVec;
use super::kernel::back_substitute;
use super::vector::{is_valid_vec, sub_scaled_into};
use crate::arith::field::Field;

/// Row echelon form of the span of `vectors` (length `ncols` each) where the pivot of a vector
/// is its SMALLEST nonzero index.
///
/// `pivots` is sorted ascending and `rows[k]` is a basis vector whose smallest nonzero index
/// is `pivots[k]`, normalised to 1 there (rows need not be fully reduced). The pivot set is an
/// invariant of the span: `{min index of v : v in span, v != 0}`.
#[derive(Clone, Debug, PartialEq)]
pub struct Echelon<E> {
    /// Pivot positions, strictly increasing.
    pub pivots: Vec<usize>,
    /// One basis row per pivot, in the same order.
    pub rows: Vec<SparseVec<E>>,
}

impl<E> Echelon<E> {
    /// Dimension of the span. Cost O(1).
    pub fn dim(&self) -> usize {
        self.pivots.len()
    }
}

/// Compute the [`Echelon`] form of the span of `vectors`.
///
/// Each incoming vector is reduced at its leading index by the row already owning that pivot
/// (the leading index strictly increases each time) until it vanishes or lands on a new pivot.
/// Cost O(ncols) set-up plus the merges performed; allocation of the scratch buffer is reused.
///
/// # Panics
/// Precondition: every vector is a valid sparse vector with indices `< ncols`
/// (checked only in debug builds; an index `>= ncols` panics).
pub fn echelon<F: Field>(
    field: &F,
    ncols: usize,
    vectors: Vec<SparseVec<F::Elem>>,
) -> Echelon<F::Elem> {
    let mut owner = vec![usize::MAX; ncols];
    let mut basis: Vec<(usize, SparseVec<F::Elem>)> = Vec::new();
    let mut out: SparseVec<F::Elem> = Vec::new();
    for mut v in vectors {
        debug_assert!(is_valid_vec(field, ncols, &v));
        while let Some((lead, x)) = v.first() {
            let k = owner[*lead];
            if k == usize::MAX {
                break;
            }
            let factor = field.prepare(x);
            sub_scaled_into(field, &v, &factor, &basis[k].1, *lead, &mut out);
            std::mem::swap(&mut v, &mut out);
        }
        if let Some((lead, x)) = v.first() {
            let lead = *lead;
            if *x != field.one() {
                let s = field.prepare(&field.inv(x));
                for e in v.iter_mut() {
                    e.1 = field.mul_prepared(&s, &e.1);
                }
            }
            owner[lead] = basis.len();
            basis.push((lead, v));
        }
    }
    basis.sort_unstable_by_key(|e| e.0);
    let (pivots, rows) = basis.into_iter().unzip();
    Echelon { pivots, rows }
}

/// Fully reduce an echelon basis: same pivots, each row now zero at every other pivot.
/// The result is the reduced row echelon form, which is unique for the span.
/// Cost: O(sum of merges), at most dim * nnz.
pub fn fully_reduce<F: Field>(field: &F, ncols: usize, e: Echelon<F::Elem>) -> Echelon<F::Elem> {
    let pairs = e.pivots.into_iter().zip(e.rows).collect();
    let (pivots, rows) = back_substitute(field, ncols, pairs).into_iter().unzip();
    Echelon { pivots, rows }
}

/// Reduce `v` modulo the echelon basis `e`: at each pivot position, in increasing order,
/// subtract the multiple of that pivot's row that clears it. The remainder is zero at every
/// pivot, and it is empty exactly when `v` lies in the span. Cost: one binary search in
/// `e.pivots` per entry visited plus one merge with an echelon row per pivot hit; no O(ncols)
/// set-up.
///
/// Precondition: `e` is an echelon form as returned by [`echelon`] (each row's smallest index
/// is its pivot), which is what makes one left-to-right sweep sufficient.
pub fn reduce<F: Field>(
    field: &F,
    e: &Echelon<F::Elem>,
    mut v: SparseVec<F::Elem>,
) -> SparseVec<F::Elem> {
    let mut out: SparseVec<F::Elem> = Vec::new();
    let mut idx = 0;
    while idx < v.len() {
        let j = v[idx].0;
        match e.pivots.binary_search(&j) {
            Ok(k) => {
                let factor = field.prepare(&v[idx].1);
                sub_scaled_into(field, &v, &factor, &e.rows[k], j, &mut out);
                std::mem::swap(&mut v, &mut out);
                // Entries before index j are untouched and position j is now gone.
            }
            Err(_) => idx += 1,
        }
    }
    v
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::arith::field::PrimeField;
    use crate::arith::sparse::tests::{SplitMix, arb_vectors, clean};
    use proptest::prelude::*;

    #[test]
    fn echelon_and_reduce_examples() {
        let f = PrimeField::new(5).unwrap();
        let e = echelon(
            &f,
            4,
            vec![
                vec![(1, 2), (3, 1)],
                vec![(1, 4), (2, 1)],
                vec![(2, 3), (3, 3)],
            ],
        );
        // Mod 5: e1 + 3e3, then e2 + 3e3, then 3e2 + 3e3 leaves 4e3, so the span is
        // <e1, e2, e3> and e0 is outside it.
        assert_eq!(e.pivots, vec![1, 2, 3]);
        for (p, row) in e.pivots.iter().zip(&e.rows) {
            assert_eq!(row[0], (*p, 1));
        }
        assert!(reduce(&f, &e, vec![(2, 1)]).is_empty());
        assert_eq!(reduce(&f, &e, vec![(0, 1), (3, 2)]), vec![(0, 1)]);
    }

    proptest! {
        #[test]
        fn prop_echelon_pivots_invariant_under_shuffle(
            (n, vs) in arb_vectors(7), seed in any::<u64>()
        ) {
            let f = PrimeField::new(7).unwrap();
            let vs: Vec<_> = vs.into_iter().map(|v| clean(7, v)).collect();
            let e1 = echelon(&f, n, vs.clone());
            let mut shuffled = vs.clone();
            let mut rng = SplitMix(seed);
            for i in (1..shuffled.len()).rev() {
                let j = rng.below(i as u64 + 1) as usize;
                shuffled.swap(i, j);
            }
            // Also rescale and add earlier vectors, which preserves the span.
            for i in 1..shuffled.len() {
                let prev = shuffled[i - 1].clone();
                let mut w = shuffled[i].clone();
                w.extend(prev.into_iter().map(|(j, x)| (j, 2 * x % 7)));
                shuffled[i] = clean(7, w);
            }
            let e2 = echelon(&f, n, shuffled);
            prop_assert_eq!(&e1.pivots, &e2.pivots);
            for (p, row) in e1.pivots.iter().zip(&e1.rows) {
                prop_assert_eq!(row[0], (*p, 1u64));
            }
            // Fully reduced forms are unique for the span.
            prop_assert_eq!(fully_reduce(&f, n, e1), fully_reduce(&f, n, e2));
        }

        #[test]
        fn prop_reduce_is_zero_iff_in_span(
            (n, vs) in arb_vectors(5), coeffs in proptest::collection::vec(0u64..5, 8),
            other in proptest::collection::vec((0usize..10, 1u64..5), 0..5)
        ) {
            let f = PrimeField::new(5).unwrap();
            let vs: Vec<_> = vs.into_iter().map(|v| clean(5, v)).collect();
            let e = echelon(&f, n, vs.clone());
            // A combination of the inputs lies in the span.
            let mut comb = Vec::new();
            for (v, c) in vs.iter().zip(&coeffs) {
                comb.extend(v.iter().map(|(j, x)| (*j, x * c % 5)));
            }
            prop_assert!(reduce(&f, &e, clean(5, comb.clone())).is_empty());
            // An arbitrary vector lies in the span iff appending it keeps the dimension.
            let w = clean(5, other.into_iter().filter(|e| e.0 < n).collect());
            let rem = reduce(&f, &e, w.clone());
            let mut more = vs.clone();
            more.push(w);
            let in_span = echelon(&f, n, more).dim() == e.dim();
            prop_assert_eq!(rem.is_empty(), in_span);
            for (j, _) in &rem {
                prop_assert!(e.pivots.binary_search(j).is_err());
            }
        }
    }
}
