//! Sparse matrices over an exact [`Field`]: rank, right kernel, echelon form of a span,
//! reduction modulo an echelon basis, and sparse products.
//!
//! Invariant kept: every [`SparseVec`] (a matrix row, a kernel vector, an echelon row) is
//! sorted by strictly increasing index, every index is below the ambient length, and no
//! stored entry is zero. All functions assume this of their inputs (checkable with
//! [`SparseMatrix::is_valid`] / [`is_valid_vec`]) and guarantee it of their outputs.
//!
//! Elimination strategy for [`rank`] and [`kernel_basis`]: a right-looking sparse Gaussian
//! elimination with Markowitz-style pivoting. Column singletons are taken first (they cost
//! no fill-in at all); otherwise the active row with the fewest entries is chosen and, within
//! it, the column occurring in the fewest active rows. Exact column counts and lazily pruned
//! column-to-row lists are maintained, so a pivot step touches only rows that contain the
//! pivot column. Once fill-in has made the remaining active block at least half full (and it
//! has at least 32 rows), that block is copied out and finished by dense forward elimination,
//! whose branch-free inner loop beats sparse merging at such densities.

use super::field::Field;
use std::cmp::Reverse;
use std::collections::BinaryHeap;

/// Pivot rows: `(pivot column, row)` pairs, as produced by elimination and consumed by
/// [`back_substitute`] and [`kernel_from_reduced`].
pub type PivotRows<E> = Vec<(usize, SparseVec<E>)>;

/// Sparse vector: `(index, value)` pairs sorted by strictly increasing index, no explicit zeros.
pub type SparseVec<E> = Vec<(usize, E)>;

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

/// Whether `v` is a valid sparse vector of length `len` over `field`: strictly increasing
/// indices `< len` and no stored zeros. Cost O(nnz).
pub fn is_valid_vec<F: Field>(field: &F, len: usize, v: &[(usize, F::Elem)]) -> bool {
    v.iter().all(|(i, x)| *i < len && !field.is_zero(x)) && v.windows(2).all(|w| w[0].0 < w[1].0)
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

fn find<E>(v: &[(usize, E)], j: usize) -> Option<usize> {
    v.binary_search_by_key(&j, |e| e.0).ok()
}

/// Number of shortest active rows examined for a Markowitz pivot.
const MARKOWITZ_ROWS: usize = 1;
/// Switch to dense elimination once at least this many rows are active ...
const DENSE_MIN_ROWS: usize = 32;
/// ... and the active block has density at least `1 / DENSE_DENSITY_INV`.
const DENSE_DENSITY_INV: usize = 2;

/// Finish an elimination densely: the active rows, restricted to the columns still holding
/// entries, are copied into a dense block and reduced by forward Gaussian elimination.
/// Returns the rank of the block; when `keep` is set, appends its pivot rows (in the
/// triangular order [`back_substitute`] expects) to `kept`. Cost O(h * w * rank) field
/// operations for an `h x w` block.
fn dense_finish<F: Field>(
    field: &F,
    rows: &mut [SparseVec<F::Elem>],
    active: &[bool],
    col_count: &[u32],
    keep: bool,
    kept: &mut PivotRows<F::Elem>,
) -> usize {
    let cols: Vec<usize> = (0..col_count.len()).filter(|&j| col_count[j] > 0).collect();
    let mut compact = vec![usize::MAX; col_count.len()];
    for (t, &j) in cols.iter().enumerate() {
        compact[j] = t;
    }
    let w = cols.len();
    let mut block: Vec<Vec<F::Elem>> = Vec::new();
    for (i, row) in rows.iter_mut().enumerate() {
        if active[i] {
            let mut d = vec![field.zero(); w];
            for (j, x) in std::mem::take(row) {
                d[compact[j]] = x;
            }
            block.push(d);
        }
    }
    let h = block.len();
    let mut r = 0;
    for j in 0..w {
        if r == h {
            break;
        }
        let Some(p) = (r..h).find(|&i| !field.is_zero(&block[i][j])) else {
            continue;
        };
        block.swap(r, p);
        let (top, below) = block.split_at_mut(r + 1);
        let prow = &top[r];
        let inv = field.inv(&prow[j]);
        for row in below.iter_mut() {
            if field.is_zero(&row[j]) {
                continue;
            }
            let factor = field.prepare(&field.mul(&row[j], &inv));
            row[j] = field.zero();
            // Branch-free inner loop: zero entries of the pivot row are processed too.
            for (x, y) in row[j + 1..].iter_mut().zip(&prow[j + 1..]) {
                *x = field.sub_mul_prepared(x, &factor, y);
            }
        }
        if keep {
            let sparse = prow
                .iter()
                .enumerate()
                .filter(|(_, x)| !field.is_zero(x))
                .map(|(t, x)| (cols[t], x.clone()))
                .collect();
            kept.push((cols[j], sparse));
        }
        r += 1;
    }
    r
}

/// Markowitz-pivoted elimination. Returns the pivots `(column, row-at-pivot-time)` in
/// elimination order when `keep` is set (otherwise an empty list) and the rank.
///
/// Guarantee used by [`kernel_basis`]: the k-th kept row contains its own pivot column and
/// no pivot column of an earlier pivot, and all kept rows span the row space of `m`.
fn eliminate<F: Field>(
    field: &F,
    m: &SparseMatrix<F::Elem>,
    keep: bool,
) -> (usize, PivotRows<F::Elem>) {
    assert!(
        u32::try_from(m.nrows).is_ok(),
        "sparse elimination supports fewer than 2^32 rows"
    );
    let ncols = m.ncols;
    let mut rows: Vec<SparseVec<F::Elem>> = m.rows.clone();
    let mut active: Vec<bool> = rows.iter().map(|r| !r.is_empty()).collect();
    let mut col_count = vec![0u32; ncols];
    let mut col_start = vec![0usize; ncols + 1];
    for row in &rows {
        for (j, _) in row {
            col_count[*j] += 1;
        }
    }
    // Column-to-row lists: an initial CSR block (one allocation) plus per-column overflow
    // lists for fill-in, created only for columns that actually receive fill.
    for j in 0..ncols {
        col_start[j + 1] = col_start[j] + col_count[j] as usize;
    }
    let mut col_csr = vec![0u32; col_start[ncols]];
    {
        let mut fill = col_start.clone();
        for (i, row) in rows.iter().enumerate() {
            for (j, _) in row {
                col_csr[fill[*j]] = i as u32;
                fill[*j] += 1;
            }
        }
    }
    let mut col_extra: Vec<Vec<u32>> = Vec::new();
    let mut col_extra_idx: Vec<u32> = vec![u32::MAX; ncols];
    let mut col_done = vec![false; ncols];

    let mut singles: Vec<usize> = (0..ncols).filter(|&j| col_count[j] == 1).collect();
    let mut heap: BinaryHeap<Reverse<(usize, usize)>> = rows
        .iter()
        .enumerate()
        .filter(|(_, r)| !r.is_empty())
        .map(|(i, r)| Reverse((r.len(), i)))
        .collect();

    let mut n_active = active.iter().filter(|&&a| a).count();
    let mut active_nnz: usize = rows.iter().map(Vec::len).sum();
    let mut live_cols = col_count.iter().filter(|&&c| c > 0).count();
    let mut rank = 0usize;
    let mut kept = Vec::new();
    let mut out: SparseVec<F::Elem> = Vec::new();
    let mut targets: Vec<u32> = Vec::new();
    let mut added: Vec<usize> = Vec::new();
    let mut removed: Vec<usize> = Vec::new();
    let mut cands: Vec<usize> = Vec::new();

    loop {
        // Choose a pivot (row r, column c).
        let mut pivot: Option<(usize, usize)> = None;
        while let Some(j) = singles.pop() {
            if col_done[j] || col_count[j] != 1 {
                continue;
            }
            let csr = col_csr[col_start[j]..col_start[j + 1]].iter();
            let extra = match col_extra_idx[j] {
                u32::MAX => [].iter(),
                e => col_extra[e as usize].iter(),
            };
            let r = csr
                .chain(extra)
                .map(|&s| s as usize)
                .find(|&s| active[s] && find(&rows[s], j).is_some())
                .expect("column count 1 implies an active row holds the column");
            pivot = Some((r, j));
            break;
        }
        if pivot.is_none()
            && n_active >= DENSE_MIN_ROWS
            && active_nnz * DENSE_DENSITY_INV >= n_active * live_cols
        {
            rank += dense_finish(field, &mut rows, &active, &col_count, keep, &mut kept);
            break;
        }
        if pivot.is_none() {
            // Markowitz search over the few shortest active rows: minimise
            // (row length - 1) * (column count - 1), the fill-in bound of the pivot.
            cands.clear();
            while cands.len() < MARKOWITZ_ROWS {
                let Some(Reverse((len, r))) = heap.pop() else {
                    break;
                };
                if active[r] && rows[r].len() == len && !cands.contains(&r) {
                    cands.push(r);
                }
            }
            let mut best = usize::MAX;
            for &r in &cands {
                let len = rows[r].len();
                for (j, _) in &rows[r] {
                    let cost = (len - 1) * (col_count[*j] as usize - 1);
                    if cost < best {
                        best = cost;
                        pivot = Some((r, *j));
                    }
                }
            }
            for &r in &cands {
                if Some(r) != pivot.map(|p| p.0) {
                    heap.push(Reverse((rows[r].len(), r)));
                }
            }
        }
        let Some((r, c)) = pivot else { break };

        rank += 1;
        active[r] = false;
        n_active -= 1;
        col_done[c] = true;
        let prow = std::mem::take(&mut rows[r]);
        active_nnz -= prow.len();
        for (j, _) in &prow {
            col_count[*j] -= 1;
            if col_count[*j] == 0 {
                live_cols -= 1;
            }
            if col_count[*j] == 1 && !col_done[*j] {
                singles.push(*j);
            }
        }
        if col_count[c] > 0 {
            let pos = find(&prow, c).expect("pivot row holds the pivot column");
            let inv = field.inv(&prow[pos].1);
            targets.clear();
            targets.extend_from_slice(&col_csr[col_start[c]..col_start[c + 1]]);
            if col_extra_idx[c] != u32::MAX {
                targets.append(&mut col_extra[col_extra_idx[c] as usize]);
            }
            for &s in &targets {
                let s = s as usize;
                if !active[s] {
                    continue;
                }
                let Some(ps) = find(&rows[s], c) else {
                    continue;
                };
                let factor = field.prepare(&field.mul(&rows[s][ps].1, &inv));
                // Merge, tracking new and cancelled columns for the counts.
                added.clear();
                removed.clear();
                {
                    let a = &rows[s];
                    out.clear();
                    out.reserve(a.len() + prow.len());
                    let b = &prow[..];
                    let (mut i, mut k) = (0, 0);
                    while i < a.len() && k < b.len() {
                        let (ja, jb) = (a[i].0, b[k].0);
                        if ja < jb {
                            out.push(a[i].clone());
                            i += 1;
                        } else if jb < ja {
                            out.push((jb, field.neg(&field.mul_prepared(&factor, &b[k].1))));
                            added.push(jb);
                            k += 1;
                        } else {
                            if ja == c {
                                removed.push(c);
                            } else {
                                let y = field.sub_mul_prepared(&a[i].1, &factor, &b[k].1);
                                if field.is_zero(&y) {
                                    removed.push(ja);
                                } else {
                                    out.push((ja, y));
                                }
                            }
                            i += 1;
                            k += 1;
                        }
                    }
                    out.extend_from_slice(&a[i..]);
                    for (jb, x) in &b[k..] {
                        out.push((*jb, field.neg(&field.mul_prepared(&factor, x))));
                        added.push(*jb);
                    }
                }
                std::mem::swap(&mut rows[s], &mut out);
                active_nnz = active_nnz + rows[s].len() - out.len();
                for &j in &added {
                    col_count[j] += 1;
                    if col_count[j] == 1 {
                        live_cols += 1;
                    }
                    if col_extra_idx[j] == u32::MAX {
                        col_extra_idx[j] = col_extra.len() as u32;
                        col_extra.push(Vec::new());
                    }
                    col_extra[col_extra_idx[j] as usize].push(s as u32);
                }
                for &j in &removed {
                    col_count[j] -= 1;
                    if col_count[j] == 0 {
                        live_cols -= 1;
                    }
                    if col_count[j] == 1 && !col_done[j] {
                        singles.push(j);
                    }
                }
                if rows[s].is_empty() {
                    active[s] = false;
                    n_active -= 1;
                } else {
                    heap.push(Reverse((rows[s].len(), s)));
                }
            }
        }
        if keep {
            kept.push((c, prow));
        }
    }
    (rank, kept)
}

/// Rank of `m` over `field`, by Markowitz-pivoted sparse Gaussian elimination (see the module
/// documentation). Exact for every field. Cost: O(nnz + ncols) set-up plus, per pivot, the
/// merges with the rows holding the pivot column; near-linear for very sparse matrices with
/// little fill-in, O(nrows * ncols * min(nrows, ncols)) in the dense worst case.
/// Allocation: one copy of the rows plus O(nnz + ncols) bookkeeping, reused across pivots.
///
/// # Panics
/// Precondition: `m` is valid ([`SparseMatrix::is_valid`]) and `m.nrows < 2^32`.
pub fn rank<F: Field>(field: &F, m: &SparseMatrix<F::Elem>) -> usize {
    eliminate(field, m, false).0
}

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
/// [`rank`] plus back-substitution to reduced form plus O(output).
pub fn kernel_basis<F: Field>(field: &F, m: &SparseMatrix<F::Elem>) -> Vec<SparseVec<F::Elem>> {
    let (_, pivots) = eliminate(field, m, true);
    let reduced = back_substitute(field, m.ncols, pivots);
    kernel_from_reduced(field, m.ncols, &reduced)
}

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
pub(crate) mod tests {
    use super::*;
    use crate::arith::dense::{kernel_dense_naive, rank_dense_naive};
    use crate::arith::field::{LARGE_PRIMES, PrimeField, RationalField};
    use num_bigint::BigInt;
    use num_rational::BigRational;
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

    fn big_field() -> PrimeField {
        PrimeField::new(LARGE_PRIMES[0]).unwrap()
    }

    fn check_kernel<F: Field>(field: &F, m: &SparseMatrix<F::Elem>) {
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

    #[test]
    fn fast_rank_matches_naive_on_random_matrices() {
        let mut rng = SplitMix(0xC0FFEE);
        let small = PrimeField::new(3).unwrap();
        let big = big_field();
        for trial in 0..300 {
            let nr = 1 + rng.below(25) as usize;
            let nc = 1 + rng.below(25) as usize;
            let per = 1 + rng.below(6) as usize;
            let m3 = random_matrix(&small, &mut rng, nr, nc, per, 1);
            assert!(m3.is_valid(&small));
            assert_eq!(
                rank(&small, &m3),
                rank_dense_naive(&small, &m3),
                "trial {trial}"
            );
            check_kernel(&small, &m3);
            let mb = random_matrix(&big, &mut rng, nr, nc, per, 3);
            assert_eq!(
                rank(&big, &mb),
                rank_dense_naive(&big, &mb),
                "trial {trial}"
            );
            check_kernel(&big, &mb);
            let naive = kernel_dense_naive(&big, &mb);
            assert_eq!(naive.len(), kernel_basis(&big, &mb).len());
        }
    }

    #[test]
    fn dense_finish_agrees_with_naive() {
        // Blocks large and dense enough to trigger the switch to dense elimination, including
        // rank-deficient products and a tiny field where pivots often vanish.
        let mut rng = SplitMix(31337);
        let big = big_field();
        let small = PrimeField::new(3).unwrap();
        for trial in 0..12 {
            let n = 40 + rng.below(30) as usize;
            let m = 40 + rng.below(30) as usize;
            let a = random_matrix(&big, &mut rng, n, m, m, 9);
            assert_eq!(rank(&big, &a), rank_dense_naive(&big, &a), "trial {trial}");
            check_kernel(&big, &a);
            let r = rng.below(40) as usize;
            let b = product_of_rank(&big, &mut rng, n, r, m);
            assert_eq!(rank(&big, &b), rank_dense_naive(&big, &b), "trial {trial}");
            check_kernel(&big, &b);
            let c = random_matrix(&small, &mut rng, n, m, m / 2, 1);
            assert_eq!(
                rank(&small, &c),
                rank_dense_naive(&small, &c),
                "trial {trial}"
            );
            check_kernel(&small, &c);
            let d = product_of_rank(&small, &mut rng, n, r, m);
            assert_eq!(
                rank(&small, &d),
                rank_dense_naive(&small, &d),
                "trial {trial}"
            );
            check_kernel(&small, &d);
        }
        let q = RationalField;
        let a = random_matrix(&q, &mut rng, 36, 34, 30, 2);
        assert_eq!(rank(&q, &a), rank_dense_naive(&q, &a));
        check_kernel(&q, &a);
    }

    #[test]
    fn rank_over_q_matches_naive() {
        let mut rng = SplitMix(42);
        let q = RationalField;
        for _ in 0..60 {
            let nr = 1 + rng.below(9) as usize;
            let nc = 1 + rng.below(9) as usize;
            let m = random_matrix(&q, &mut rng, nr, nc, 3, 4);
            assert_eq!(rank(&q, &m), rank_dense_naive(&q, &m));
            check_kernel(&q, &m);
        }
    }

    #[test]
    fn products_have_the_chosen_rank() {
        let mut rng = SplitMix(7);
        let f = big_field();
        for r in 0..12 {
            let m = product_of_rank(&f, &mut rng, 30, r, 40);
            let naive = rank_dense_naive(&f, &m);
            assert!(naive <= r);
            assert_eq!(rank(&f, &m), naive);
            assert_eq!(rank(&f, &m.transpose()), naive);
            check_kernel(&f, &m);
        }
        // A full-rank factorisation: A has an identity block, B has an identity block.
        let n = 20;
        let r = 7;
        let a = SparseMatrix::from_triplets(&f, n, r, (0..r).map(|i| (i, i, 1u64)));
        let b = SparseMatrix::from_triplets(&f, r, n, (0..r).map(|i| (i, 2 * i, 5u64)));
        assert_eq!(rank(&f, &mat_mul(&f, &a, &b)), r);
    }

    #[test]
    fn structured_examples() {
        let f = PrimeField::new(7).unwrap();
        let z = SparseMatrix::<u64>::new(4, 6);
        assert_eq!(rank(&f, &z), 0);
        assert_eq!(kernel_basis(&f, &z).len(), 6);
        let empty = SparseMatrix::<u64>::new(0, 0);
        assert_eq!(rank(&f, &empty), 0);
        assert!(kernel_basis(&f, &empty).is_empty());
        // Identity.
        let id = SparseMatrix::from_triplets(&f, 5, 5, (0..5).map(|i| (i, i, 1u64)));
        assert_eq!(rank(&f, &id), 5);
        assert!(kernel_basis(&f, &id).is_empty());
        // Duplicates summing to zero are dropped: 3 + 4 = 0 mod 7.
        let d = SparseMatrix::from_triplets(&f, 1, 2, vec![(0, 1, 3u64), (0, 1, 4), (0, 0, 2)]);
        assert_eq!(d.rows[0], vec![(0, 2)]);
        // Rank 1 in a non-obvious way: rows proportional.
        let m = SparseMatrix::from_dense(&f, 3, &[vec![1, 2, 3], vec![2, 4, 6], vec![3, 6, 2]]);
        assert_eq!(rank(&f, &m), 1);
        assert_eq!(m.to_dense(&f)[2], vec![3, 6, 2]);
    }

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

    #[test]
    #[ignore = "timing figure; run with --ignored --nocapture in release mode"]
    fn timing_rank_1000_sparse() {
        let f = big_field();
        let mut rng = SplitMix(2024);
        for &(n, per) in &[(1000usize, 5usize), (2000, 3), (1000, 3), (200, 5)] {
            let mats: Vec<_> = (0..5)
                .map(|_| random_matrix(&f, &mut rng, n, n, per, 1000))
                .collect();
            // Best of five runs per matrix, to damp noise from other load on the machine.
            let mut total = std::time::Duration::ZERO;
            let mut ranks = Vec::new();
            for m in &mats {
                let mut best = std::time::Duration::MAX;
                let mut last = 0;
                for _ in 0..5 {
                    let t = std::time::Instant::now();
                    let r = rank(&f, m);
                    best = best.min(t.elapsed());
                    last = r;
                }
                ranks.push(last);
                total += best;
            }
            let el = total / mats.len() as u32;
            println!(
                "rank {n}x{n}, {per} entries/row over F_p: {el:?} per matrix, ranks {ranks:?}"
            );
        }
        // Structured case: 5 entries per row within a band of width 40 (little fill-in).
        let n = 1000;
        let mut t = Vec::new();
        for r in 0..n {
            for _ in 0..5 {
                t.push((r, (r + rng.below(40) as usize) % n, 1 + rng.below(1000)));
            }
        }
        let band = SparseMatrix::from_triplets(&f, n, n, t);
        let mut best = std::time::Duration::MAX;
        let mut r = 0;
        for _ in 0..5 {
            let t = std::time::Instant::now();
            r = rank(&f, &band);
            best = best.min(t.elapsed());
        }
        println!("rank {n}x{n} banded (width 40, 5 entries/row) over F_p: {best:?}, rank {r}");
    }

    fn arb_matrix(p: u64) -> impl Strategy<Value = SparseMatrix<u64>> {
        (1usize..12, 1usize..12).prop_flat_map(move |(nr, nc)| {
            proptest::collection::vec((0..nr, 0..nc, 0..p), 0..40).prop_map(move |t| {
                let f = PrimeField::new(p).unwrap();
                SparseMatrix::from_triplets(&f, nr, nc, t)
            })
        })
    }

    fn arb_vectors(p: u64) -> impl Strategy<Value = (usize, Vec<SparseVec<u64>>)> {
        (1usize..10).prop_flat_map(move |n| {
            let v = proptest::collection::vec((0..n, 1..p), 0..5);
            (Just(n), proptest::collection::vec(v, 0..8))
        })
    }

    fn clean(p: u64, v: Vec<(usize, u64)>) -> SparseVec<u64> {
        normalize_vec(&PrimeField::new(p).unwrap(), v)
    }

    proptest! {
        #[test]
        fn prop_rank_of_transpose(m in arb_matrix(3)) {
            let f = PrimeField::new(3).unwrap();
            prop_assert_eq!(rank(&f, &m), rank(&f, &m.transpose()));
            prop_assert_eq!(rank(&f, &m), rank_dense_naive(&f, &m));
        }

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

        #[test]
        fn prop_rank_over_q_matches_prime(
            t in proptest::collection::vec((0usize..6, 0usize..6, -3i64..4), 0..20)
        ) {
            let q = RationalField;
            let f = PrimeField::new(LARGE_PRIMES[1]).unwrap();
            let mq = SparseMatrix::from_triplets(&q, 6, 6, t.iter().map(|&(r, c, v)| {
                (r, c, BigRational::from_integer(BigInt::from(v)))
            }));
            let mp = SparseMatrix::from_triplets(&f, 6, 6, t.iter().map(|&(r, c, v)| {
                (r, c, f.from_i64(v))
            }));
            // Entries bounded by 3 and size 6: every minor is far below p, so ranks agree.
            prop_assert_eq!(rank(&q, &mq), rank(&f, &mp));
        }
    }
}
