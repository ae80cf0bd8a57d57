//! Line-bundle cohomology of the ambient product `A = P^{n_1} × … × P^{n_m}`: Bott's formula on each `P^n`
//! and the Künneth formula, with explicit bases of Laurent monomials (MATH.md §2).
//!
//! On `P^n`, `H^0(O(d))` (`d ≥ 0`) has the monomials with all exponents `≥ 0` summing to `d`, and
//! `H^n(O(d))` (`d ≤ −n−1`) the Laurent monomials with all exponents `≤ −1` summing to `d` (Čech top classes);
//! everything else vanishes (Hartshorne, Algebraic Geometry, III.5.1). On the product, `O_A(d)` has cohomology in
//! at most one degree `q = Σ_{i: d_i ≤ −n_i−1} n_i`, with basis the products of one such monomial per factor.
//!
//! Invariant: a [`BottGroup`] exists only for a non-zero group; its `basis` lists full exponent vectors (all
//! factors, in [`VariableLayout`] order) and `index` maps each back to its position.

use crate::poly::{VariableLayout, compositions};
use rustc_hash::FxHashMap as HashMap;

/// Which cohomology a factor contributes: global sections (`H^0`, exponents `≥ 0`) or the top group
/// (`H^{n_i}`, exponents `≤ −1`).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum FactorKind {
    Sections,
    Top,
}

/// `H^q(A, O_A(d))` with its Bott monomial basis (non-zero by construction).
#[derive(Clone, Debug)]
pub struct BottGroup {
    /// The multidegree `d`.
    pub degree: Vec<i64>,
    /// Per factor: sections or top cohomology.
    pub kinds: Vec<FactorKind>,
    /// The cohomological degree `q = Σ_{Top factors} n_i`.
    pub q: usize,
    /// Basis: full Laurent exponent vectors.
    pub basis: Vec<Vec<i32>>,
    index: HashMap<Vec<i32>, usize>,
}

impl BottGroup {
    /// Position of a Laurent monomial in the basis, if it is a basis element.
    pub fn position(&self, e: &[i32]) -> Option<usize> {
        self.index.get(e).copied()
    }
    /// `dim H^q(A, O_A(d))`.
    pub fn dim(&self) -> usize {
        self.basis.len()
    }
}

/// Binomial coefficient `C(n, k)` saturating at `u128::MAX`-scale values (used for size estimates only).
fn binomial(n: u64, k: u64) -> u128 {
    let k = k.min(n - k.min(n));
    let mut r: u128 = 1;
    for i in 0..k {
        r = r.saturating_mul((n - i) as u128) / (i as u128 + 1);
    }
    r
}

/// `(q, dim H^q(A, O_A(d)))` without enumerating the basis, or `None` when all cohomology vanishes.
/// Dimensions: `C(d+n, n)` for `d ≥ 0`, `C(−d−1, n)` for `d ≤ −n−1` (Bott's formula).
pub fn bott_dimension(dims: &[usize], d: &[i64]) -> Option<(usize, u128)> {
    let mut q = 0;
    let mut dim: u128 = 1;
    for (&n, &di) in dims.iter().zip(d) {
        let n64 = n as i64;
        if di >= 0 {
            dim = dim.saturating_mul(binomial((di + n64) as u64, n as u64));
        } else if di < -n64 {
            q += n;
            dim = dim.saturating_mul(binomial((-di - 1) as u64, n as u64));
        } else {
            return None;
        }
    }
    Some((q, dim))
}

/// Enumerate the Bott basis of `O_A(d)`, or `None` when all its cohomology vanishes.
/// Precondition: the dimension (see [`bott_dimension`]) fits in memory; callers check it first.
pub fn bott_group(layout: &VariableLayout, d: &[i64]) -> Option<BottGroup> {
    let dims = layout.dims();
    let (q, _) = bott_dimension(dims, d)?;
    let mut kinds = Vec::with_capacity(dims.len());
    let mut basis: Vec<Vec<i32>> = vec![vec![0; layout.nvars()]];
    for (i, (&n, &di)) in dims.iter().zip(d).enumerate() {
        let block: Vec<Vec<i32>> = if di >= 0 {
            kinds.push(FactorKind::Sections);
            compositions(di as u32, n + 1)
                .into_iter()
                .map(|c| c.into_iter().map(|x| x as i32).collect())
                .collect()
        } else {
            kinds.push(FactorKind::Top);
            // e_l = −1 − f_l with f ≥ 0 and Σ f = −d − (n+1).
            compositions((-di - n as i64 - 1) as u32, n + 1)
                .into_iter()
                .map(|c| c.into_iter().map(|x| -1 - x as i32).collect())
                .collect()
        };
        let mut next = Vec::with_capacity(basis.len() * block.len());
        for base in &basis {
            for b in &block {
                let mut e = base.clone();
                e[layout.range(i)].copy_from_slice(b);
                next.push(e);
            }
        }
        basis = next;
    }
    let index = basis
        .iter()
        .enumerate()
        .map(|(k, e)| (e.clone(), k))
        .collect();
    Some(BottGroup {
        degree: d.to_vec(),
        kinds,
        q,
        basis,
        index,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bott_formula_on_projective_space() {
        // Hartshorne III.5.1: h^0(P^n, O(d)) = C(n+d, n); h^n(P^n, O(d)) = C(−d−1, n); others 0.
        assert_eq!(bott_dimension(&[4], &[5]), Some((0, 126)));
        assert_eq!(bott_dimension(&[4], &[-5]), Some((4, 1)));
        assert_eq!(bott_dimension(&[4], &[-10]), Some((4, 126)));
        assert_eq!(bott_dimension(&[4], &[-3]), None);
        assert_eq!(bott_dimension(&[1, 2], &[-2, 1]), Some((1, 3)));
        let layout = VariableLayout::new(&[1, 2]);
        let g = bott_group(&layout, &[-3, 1]).unwrap();
        assert_eq!(g.dim(), 2 * 3);
        assert_eq!(g.q, 1);
        assert!(g.basis.iter().all(|e| e[0] < 0 && e[1] < 0 && e[2] >= 0));
        assert_eq!(g.position(&g.basis[4]), Some(4));
    }
}
