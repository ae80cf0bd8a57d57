//! Enumeration of line-bundle sums with `c1(V) = 0`, each exactly once modulo permutations of the line bundles
//! and of identical ambient factors, split into deterministic chunks.
//!
//! The alphabet is the box `[lo, hi]^m` (minus line bundles excluded up front by a line-bundle-local filter),
//! sorted lexicographically. A sum is a non-decreasing index sequence `i_1 ≤ … ≤ i_r` (the sorted multiset);
//! it is emitted iff it is canonical: no factor permutation `σ` of the symmetry group maps it to a sorted
//! sequence that is lexicographically smaller. Chunk `c` is the `c`-th pair `(i_1, i_2)`, `i_1 ≤ i_2`, in
//! lexicographic order, so the concatenation of the chunks in order lists every sum in lexicographic order.
//!
//! Pruning (never builds a sum that cannot pass): after each prefix, `c1` must stay reachable with the
//! remaining entries (each remaining bundle lies in the box and is lexicographically ≥ the last chosen, so its
//! first entry is ≥ the last chosen's), and with an index target the remaining index must lie between
//! `n·min` and `n·max` of the index over the remaining alphabet. The last bundle is `−Σ` of the others.
//!
//! Invariant: the group is a group of symmetries of the configuration (identical dimensions and identical rows
//! of the configuration matrix) and the alphabet is closed under it, so canonical forms are well defined.

use rustc_hash::FxHashMap;

/// The permutations of ambient factors that preserve the configuration: factors with equal dimension and equal
/// row `(q_1^i, …, q_K^i)` of the configuration matrix may be exchanged. `perm[i]` is the image of factor `i`.
pub fn factor_symmetries(dims: &[usize], rows: &[Vec<u32>]) -> Vec<Vec<usize>> {
    let m = dims.len();
    let mut perms = vec![(0..m).collect::<Vec<usize>>()];
    // Extend one factor at a time: position i may take any unused factor of the same class.
    let mut out = Vec::new();
    fn rec(
        i: usize,
        cur: &mut Vec<usize>,
        used: &mut Vec<bool>,
        dims: &[usize],
        rows: &[Vec<u32>],
        out: &mut Vec<Vec<usize>>,
    ) {
        let m = dims.len();
        if i == m {
            out.push(cur.clone());
            return;
        }
        for j in 0..m {
            if !used[j] && dims[j] == dims[i] && rows[j] == rows[i] {
                used[j] = true;
                cur.push(j);
                rec(i + 1, cur, used, dims, rows, out);
                cur.pop();
                used[j] = false;
            }
        }
    }
    rec(
        0,
        &mut Vec::new(),
        &mut vec![false; m],
        dims,
        rows,
        &mut out,
    );
    if !out.is_empty() {
        perms = out;
    }
    perms
}

/// Apply a factor permutation to a line bundle: `(σk)_{σ(i)} = k_i`.
pub fn permute_bundle(perm: &[usize], k: &[i64]) -> Vec<i64> {
    let mut out = vec![0; k.len()];
    for (i, &j) in perm.iter().enumerate() {
        out[j] = k[i];
    }
    out
}

/// The canonical form of a sum (slow, obviously correct twin of the enumerator's test): the lexicographically
/// smallest sorted list among the images of the sum under the factor permutations.
pub fn canonical_form(perms: &[Vec<usize>], bundles: &[Vec<i64>]) -> Vec<Vec<i64>> {
    let mut best: Option<Vec<Vec<i64>>> = None;
    for p in perms {
        let mut img: Vec<Vec<i64>> = bundles.iter().map(|k| permute_bundle(p, k)).collect();
        img.sort();
        if best.as_ref().is_none_or(|b| img < *b) {
            best = Some(img);
        }
    }
    best.unwrap_or_else(|| {
        let mut v = bundles.to_vec();
        v.sort();
        v
    })
}

/// The callback receiving each canonical sum.
pub type Visit<'a, E> = dyn FnMut(&[Vec<i64>]) -> Result<(), E> + 'a;

/// Counters of the enumeration (deterministic).
#[derive(Clone, Debug, Default, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
pub struct EnumerationCounts {
    /// Prefixes pruned because `c1 = 0` was no longer reachable.
    pub pruned_c1: u64,
    /// Prefixes pruned because the index target was no longer reachable.
    pub pruned_index: u64,
    /// Sums with `c1 = 0` rejected as non-canonical images of another.
    pub non_canonical: u64,
    /// Canonical sums with `c1 = 0` handed to the filters.
    pub candidates: u64,
}

impl EnumerationCounts {
    /// Add another counter set.
    pub fn add(&mut self, o: &EnumerationCounts) {
        self.pruned_c1 += o.pruned_c1;
        self.pruned_index += o.pruned_index;
        self.non_canonical += o.non_canonical;
        self.candidates += o.candidates;
    }
}

/// The enumerator of one scan: alphabet, symmetry tables and chunk list.
pub struct Enumerator {
    m: usize,
    rank: usize,
    lo: i64,
    hi: i64,
    alphabet: Vec<Vec<i64>>,
    /// Box coordinates → alphabet position (`u32::MAX` when excluded).
    lookup: Lookup,
    /// Index `χ(L)` per alphabet entry.
    chi: Vec<i64>,
    suffix_min: Vec<i64>,
    suffix_max: Vec<i64>,
    target_index: Option<i64>,
    /// For each non-identity symmetry, the image position of every alphabet entry.
    images: Vec<Vec<u32>>,
    chunks: Vec<(u32, u32)>,
}

enum Lookup {
    Dense(Vec<u32>),
    Map(FxHashMap<Vec<i64>, u32>),
}

/// Largest dense lookup table (entries).
const DENSE_LIMIT: u128 = 1 << 24;

impl Enumerator {
    /// Build the enumerator. `alphabet` must be sorted, inside `[lo, hi]^m` and closed under `perms`
    /// (the identity may be included; it is skipped); `chi[i]` is the index of `alphabet[i]`.
    ///
    /// **Panics** if the alphabet is not sorted or not closed under `perms` (a broken precondition).
    pub fn new(
        m: usize,
        rank: usize,
        (lo, hi): (i64, i64),
        alphabet: Vec<Vec<i64>>,
        chi: Vec<i64>,
        perms: &[Vec<usize>],
        target_index: Option<i64>,
    ) -> Enumerator {
        assert!(alphabet.windows(2).all(|w| w[0] < w[1]), "alphabet sorted");
        let width = (hi - lo + 1) as u128;
        let size = (0..m).try_fold(1u128, |a, _| a.checked_mul(width));
        let lookup = match size {
            Some(s) if s <= DENSE_LIMIT => {
                let mut t = vec![u32::MAX; s as usize];
                for (i, k) in alphabet.iter().enumerate() {
                    t[dense_index(k, lo, width as usize)] = i as u32;
                }
                Lookup::Dense(t)
            }
            _ => Lookup::Map(
                alphabet
                    .iter()
                    .enumerate()
                    .map(|(i, k)| (k.clone(), i as u32))
                    .collect(),
            ),
        };
        let n = alphabet.len();
        let mut suffix_min = vec![i64::MAX; n + 1];
        let mut suffix_max = vec![i64::MIN; n + 1];
        for i in (0..n).rev() {
            suffix_min[i] = suffix_min[i + 1].min(chi[i]);
            suffix_max[i] = suffix_max[i + 1].max(chi[i]);
        }
        let mut e = Enumerator {
            m,
            rank,
            lo,
            hi,
            alphabet,
            lookup,
            chi,
            suffix_min,
            suffix_max,
            target_index,
            images: Vec::new(),
            chunks: Vec::new(),
        };
        let identity: Vec<usize> = (0..m).collect();
        for p in perms.iter().filter(|p| **p != identity) {
            let img: Vec<u32> = e
                .alphabet
                .iter()
                .map(|k| {
                    e.position(&permute_bundle(p, k))
                        .expect("alphabet closed under the symmetry group")
                })
                .collect();
            e.images.push(img);
        }
        for a in 0..n as u32 {
            for b in a..n as u32 {
                e.chunks.push((a, b));
            }
        }
        e
    }

    /// The alphabet (sorted).
    pub fn alphabet(&self) -> &[Vec<i64>] {
        &self.alphabet
    }

    /// Number of chunks.
    pub fn num_chunks(&self) -> usize {
        self.chunks.len()
    }

    fn position(&self, k: &[i64]) -> Option<u32> {
        if k.iter().any(|&x| x < self.lo || x > self.hi) {
            return None;
        }
        let p = match &self.lookup {
            Lookup::Dense(t) => t[dense_index(k, self.lo, (self.hi - self.lo + 1) as usize)],
            Lookup::Map(mp) => *mp.get(k)?,
        };
        (p != u32::MAX).then_some(p)
    }

    /// Whether `seq` (sorted positions) is the smallest among its symmetry images.
    fn is_canonical(&self, seq: &[u32], scratch: &mut Vec<u32>) -> bool {
        for img in &self.images {
            scratch.clear();
            scratch.extend(seq.iter().map(|&i| img[i as usize]));
            scratch.sort_unstable();
            if scratch.as_slice() < seq {
                return false;
            }
        }
        true
    }

    /// Visit every canonical sum of chunk `c` in lexicographic order; `visit` gets the line bundles.
    pub fn chunk<E>(
        &self,
        c: usize,
        counts: &mut EnumerationCounts,
        visit: &mut Visit<'_, E>,
    ) -> Result<(), E> {
        let (a, b) = self.chunks[c];
        let mut seq = vec![a, b];
        let mut sum = vec![0i64; self.m];
        let mut chi = 0i64;
        for &i in &seq {
            add(&mut sum, &self.alphabet[i as usize], 1);
            chi += self.chi[i as usize];
        }
        // Prune the pair prefix itself (after the first element, then after the second).
        let mut first = vec![0i64; self.m];
        add(&mut first, &self.alphabet[a as usize], 1);
        if !self.reachable(&first, self.chi[a as usize], a, self.rank - 1, counts) {
            return Ok(());
        }
        let mut scratch = Vec::with_capacity(self.rank);
        self.extend(&mut seq, &mut sum, chi, counts, &mut scratch, visit)
    }

    fn reachable(
        &self,
        sum: &[i64],
        chi: i64,
        last: u32,
        remaining: usize,
        counts: &mut EnumerationCounts,
    ) -> bool {
        let n = remaining as i64;
        let first = self.alphabet[last as usize][0];
        for (j, &s) in sum.iter().enumerate() {
            let need = -s;
            let low = if j == 0 { first.max(self.lo) } else { self.lo };
            if need < n * low || need > n * self.hi {
                counts.pruned_c1 += 1;
                return false;
            }
        }
        if let Some(t) = self.target_index {
            let need = t - chi;
            let i = last as usize;
            if need < n * self.suffix_min[i] || need > n * self.suffix_max[i] {
                counts.pruned_index += 1;
                return false;
            }
        }
        true
    }

    fn extend<E>(
        &self,
        seq: &mut Vec<u32>,
        sum: &mut Vec<i64>,
        chi: i64,
        counts: &mut EnumerationCounts,
        scratch: &mut Vec<u32>,
        visit: &mut Visit<'_, E>,
    ) -> Result<(), E> {
        let last = *seq.last().expect("non-empty prefix");
        let remaining = self.rank - seq.len();
        if !self.reachable(sum, chi, last, remaining, counts) {
            return Ok(());
        }
        if remaining == 1 {
            let need: Vec<i64> = sum.iter().map(|s| -s).collect();
            let Some(p) = self.position(&need) else {
                return Ok(());
            };
            if p < last {
                return Ok(());
            }
            seq.push(p);
            let canonical = self.is_canonical(seq, scratch);
            let bundles: Vec<Vec<i64>> = if canonical {
                seq.iter()
                    .map(|&i| self.alphabet[i as usize].clone())
                    .collect()
            } else {
                Vec::new()
            };
            seq.pop();
            if canonical {
                counts.candidates += 1;
                return visit(&bundles);
            }
            counts.non_canonical += 1;
            return Ok(());
        }
        for i in last..self.alphabet.len() as u32 {
            let k = &self.alphabet[i as usize];
            add(sum, k, 1);
            seq.push(i);
            let r = self.extend(seq, sum, chi + self.chi[i as usize], counts, scratch, visit);
            seq.pop();
            add(sum, k, -1);
            r?;
        }
        Ok(())
    }
}

fn add(sum: &mut [i64], k: &[i64], sign: i64) {
    for (s, x) in sum.iter_mut().zip(k) {
        *s += sign * x;
    }
}

fn dense_index(k: &[i64], lo: i64, width: usize) -> usize {
    k.iter()
        .rev()
        .fold(0usize, |acc, &x| acc * width + (x - lo) as usize)
}

/// Every line bundle of the box `[lo, hi]^m`, in lexicographic order.
pub fn box_bundles(m: usize, lo: i64, hi: i64) -> Vec<Vec<i64>> {
    let mut out = vec![Vec::new()];
    for _ in 0..m {
        out = out
            .into_iter()
            .flat_map(|p: Vec<i64>| {
                (lo..=hi).map(move |x| {
                    let mut q = p.clone();
                    q.push(x);
                    q
                })
            })
            .collect();
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::collections::BTreeSet;

    /// Brute force: every sorted r-multiset of the alphabet with zero sum, reduced to canonical forms.
    fn brute(
        m: usize,
        r: usize,
        lo: i64,
        hi: i64,
        perms: &[Vec<usize>],
    ) -> BTreeSet<Vec<Vec<i64>>> {
        let alpha = box_bundles(m, lo, hi);
        let mut out = BTreeSet::new();
        let n = alpha.len();
        let mut idx = vec![0usize; r];
        loop {
            let sum: Vec<i64> = (0..m)
                .map(|j| idx.iter().map(|&i| alpha[i][j]).sum())
                .collect();
            if sum.iter().all(|&s| s == 0) {
                let b: Vec<Vec<i64>> = idx.iter().map(|&i| alpha[i].clone()).collect();
                out.insert(canonical_form(perms, &b));
            }
            // next non-decreasing sequence
            let mut p = r;
            while p > 0 && idx[p - 1] == n - 1 {
                p -= 1;
            }
            if p == 0 {
                break;
            }
            idx[p - 1] += 1;
            for q in p..r {
                idx[q] = idx[p - 1];
            }
        }
        out
    }

    #[test]
    fn enumeration_matches_brute_force_canonical_forms() {
        for (dims, rows, r) in [
            (vec![1, 1, 1], vec![vec![2], vec![2], vec![2]], 3),
            (vec![1, 1, 2], vec![vec![2], vec![2], vec![3]], 4),
            (vec![1, 1], vec![vec![2], vec![1]], 3),
        ] {
            let m = dims.len();
            let perms = factor_symmetries(&dims, &rows);
            let alpha = box_bundles(m, -1, 1);
            let chi = vec![0; alpha.len()];
            let e = Enumerator::new(m, r, (-1, 1), alpha, chi, &perms, None);
            let mut got = Vec::new();
            let mut counts = EnumerationCounts::default();
            for c in 0..e.num_chunks() {
                e.chunk::<()>(c, &mut counts, &mut |b| {
                    got.push(b.to_vec());
                    Ok(())
                })
                .unwrap();
            }
            let set: BTreeSet<_> = got.iter().cloned().collect();
            assert_eq!(set.len(), got.len(), "no duplicates");
            assert!(got.windows(2).all(|w| w[0] < w[1]), "lexicographic order");
            assert_eq!(set, brute(m, r, -1, 1, &perms), "dims {dims:?}");
            assert_eq!(counts.candidates as usize, got.len());
        }
    }

    #[test]
    fn symmetry_group_respects_rows() {
        assert_eq!(
            factor_symmetries(&[1, 1, 1, 1], &vec![vec![2]; 4]).len(),
            24
        );
        assert_eq!(
            factor_symmetries(&[1, 1, 2], &[vec![2], vec![2], vec![3]]).len(),
            2
        );
        assert_eq!(factor_symmetries(&[1, 1], &[vec![2], vec![1]]).len(), 1);
    }
}
