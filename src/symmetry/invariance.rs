//! Invariance of the defining equations, and generic invariant members of the family.
//!
//! A group element `g` must map every equation to a root-of-unity multiple of an equation:
//! `φ_g(p_j) = ζ_M^{c_g(j)} p_{τ_g(j)}` (covariance with a stated character; plain invariance is `τ = id`,
//! `c = 0`). This is checked exactly in `Q(ζ_M)` for the generators; the action on all of `Γ̃` follows from
//! `τ_{gh} = τ_g τ_h`, `c_{gh}(j) = c_h(j) + c_g(τ_h(j))`. The Koszul generators then transform as
//! `g·e_j = ζ^{c_g(j)} e_{τ_g(j)}`, which makes the Koszul differential equivariant.
//!
//! Generic mode draws each equation as a random integer combination of the *rational* invariant orbit sums
//! `Σ_{g ∈ Γ̃} φ_g(x^e)` of its multidegree (orbit sums whose coefficients are not rational are skipped, so the
//! generic member lies in the rational part of the invariant family), reproducibly from the seed.
//!
//! Invariant: an [`EquationAction`] is a permutation `tau` of the equations with exponents `chi` of `ζ_M`.

use super::SymmetryError;
use super::cyclotomic::{Cyc, Cyclotomic};
use super::group::Group;
use crate::poly::{Polynomial, VariableLayout, monomials_of_multidegree};
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::Signed;
use rand::{Rng, SeedableRng};
use rand_chacha::ChaCha8Rng;
use std::collections::{BTreeMap, BTreeSet};

/// How one element acts on the equations: `φ_g(p_j) = ζ^{chi[j]} p_{tau[j]}`.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct EquationAction {
    pub tau: Vec<usize>,
    pub chi: Vec<i64>,
}

/// `φ(p)` with coefficients in `Q(ζ_M)` (phases of `map` in units of `ζ_M`).
pub fn act_on_polynomial(
    ring: &Cyclotomic,
    map: &super::action::MonomialMap,
    p: &Polynomial,
) -> BTreeMap<Vec<u32>, Cyc> {
    let mut out: BTreeMap<Vec<u32>, Cyc> = BTreeMap::new();
    for (e, c) in p.terms() {
        let (img, ph) = map.apply_exponents(e);
        let entry = out.entry(img).or_insert_with(|| ring.zero());
        ring.add_term(entry, ph, c);
    }
    out
}

/// Find `(τ(j), c)` with `φ(p_j) = ζ^c p_{τ(j)}`, exactly; `None` when there is none.
fn covariance(
    ring: &Cyclotomic,
    map: &super::action::MonomialMap,
    polys: &[Polynomial],
    j: usize,
) -> Option<(usize, i64)> {
    let image = act_on_polynomial(ring, map, &polys[j]);
    let (lead_e, lead_c) = image.iter().next()?;
    let m = ring.order() as i64;
    for (t, q) in polys.iter().enumerate() {
        let Some(r) = q
            .terms()
            .find(|(e, _)| *e == lead_e)
            .map(|(_, c)| c.clone())
        else {
            continue;
        };
        if q.num_terms() != image.len() {
            continue;
        }
        for c in 0..m {
            // Compare φ(p_j) with ζ^c q on the leading term first, then everywhere.
            let diff = ring.add(lead_c, &ring.monomial(c, -r.clone()));
            if !ring.is_zero(&diff) {
                continue;
            }
            let ok = q.terms().all(|(e, qc)| match image.get(e) {
                Some(v) => ring.is_zero(&ring.add(v, &ring.monomial(c, -qc.clone()))),
                None => false,
            });
            if ok {
                return Some((t, c));
            }
        }
    }
    None
}

/// The action of every element of `Γ̃` on the given equations, or the first generator and equation that are
/// not covariant.
pub fn equation_actions(
    group: &Group,
    polys: &[Polynomial],
) -> Result<Vec<EquationAction>, SymmetryError> {
    let ring = Cyclotomic::new(group.root_order());
    let k = polys.len();
    let mut gen_actions = Vec::new();
    for g in 0..group.num_generators() {
        let map = &group.elements()[group.generator_element(g)].map;
        let mut tau = Vec::with_capacity(k);
        let mut chi = Vec::with_capacity(k);
        for j in 0..k {
            let (t, c) =
                covariance(&ring, map, polys, j).ok_or_else(|| SymmetryError::NotInvariant {
                    generator: group.names()[g].clone(),
                    equation: j + 1,
                })?;
            tau.push(t);
            chi.push(c);
        }
        let distinct: BTreeSet<usize> = tau.iter().copied().collect();
        if distinct.len() != k {
            return Err(SymmetryError::NotInvariant {
                generator: group.names()[g].clone(),
                equation: 1,
            });
        }
        gen_actions.push(EquationAction { tau, chi });
    }
    Ok(compose_actions(group, &gen_actions))
}

/// Extend generator actions on the equations to all of `Γ̃` along the BFS parents.
pub fn compose_actions(group: &Group, gens: &[EquationAction]) -> Vec<EquationAction> {
    let m = group.root_order() as i64;
    let k = gens.first().map(|a| a.tau.len()).unwrap_or(0);
    let mut out: Vec<EquationAction> = Vec::with_capacity(group.linear_order());
    for e in group.elements() {
        let act = match e.parent {
            None => EquationAction {
                tau: (0..k).collect(),
                chi: vec![0; k],
            },
            Some((parent, g)) => {
                let h = &out[parent];
                let gg = &gens[g];
                EquationAction {
                    tau: h.tau.iter().map(|&t| gg.tau[t]).collect(),
                    chi: (0..k)
                        .map(|j| (h.chi[j] + gg.chi[h.tau[j]]).rem_euclid(m))
                        .collect(),
                }
            }
        };
        out.push(act);
    }
    out
}

/// The rational invariant orbit sums of multidegree `degree` (one per orbit, sorted), each a polynomial with
/// rational coefficients; orbits whose sum vanishes or has non-rational coefficients are skipped.
pub fn invariant_orbit_sums(group: &Group, degree: &[u32]) -> Vec<Polynomial> {
    let layout = group.layout();
    let ring = Cyclotomic::new(group.root_order());
    let mut done: BTreeSet<Vec<u32>> = BTreeSet::new();
    let mut out = Vec::new();
    for e in monomials_of_multidegree(layout, degree) {
        if done.contains(&e) {
            continue;
        }
        let mut sum: BTreeMap<Vec<u32>, Cyc> = BTreeMap::new();
        for g in group.elements() {
            let (img, ph) = g.map.apply_exponents(&e);
            done.insert(img.clone());
            let entry = sum.entry(img).or_insert_with(|| ring.zero());
            ring.add_term(entry, ph, &BigRational::from_integer(BigInt::from(1)));
        }
        let mut p = Polynomial::zero(layout.nvars());
        let mut rational = true;
        for (img, c) in sum {
            match ring.to_rational(&c) {
                Some(q) => p.add_term(img, q),
                None => {
                    rational = false;
                    break;
                }
            }
        }
        if rational && !p.is_zero() {
            out.push(p);
        }
    }
    out
}

/// Random invariant equations: equation `j` is `Σ_o r_o · S_o` over the rational invariant orbit sums `S_o` of
/// its multidegree with random non-zero integers `r_o ∈ [−bound, bound]` from a ChaCha8 stream (`seed + j`).
/// Refused when a factor permutation moves an equation's multidegree or no invariant polynomial exists.
pub fn random_invariant_equations(
    group: &Group,
    degrees: &[Vec<u32>],
    seed: u64,
    bound: i64,
) -> Result<Vec<Polynomial>, SymmetryError> {
    let layout: &VariableLayout = group.layout();
    for g in 0..group.num_generators() {
        let pi = group.elements()[group.generator_element(g)]
            .map
            .factor_map(layout);
        for (j, q) in degrees.iter().enumerate() {
            if (0..q.len()).any(|i| q[pi[i]] != q[i]) {
                return Err(SymmetryError::GenericNeedsFixedDegrees {
                    generator: group.names()[g].clone(),
                    equation: j + 1,
                });
            }
        }
    }
    let mut out = Vec::new();
    for (j, q) in degrees.iter().enumerate() {
        let sums = invariant_orbit_sums(group, q);
        if sums.is_empty() {
            return Err(SymmetryError::NoInvariantPolynomial { equation: j + 1 });
        }
        let mut rng = ChaCha8Rng::seed_from_u64(seed.wrapping_add(j as u64));
        let mut p = Polynomial::zero(layout.nvars());
        for s in &sums {
            let mut r = 0i64;
            while r == 0 {
                r = rng.gen_range(-bound..=bound);
            }
            let r = BigRational::from_integer(BigInt::from(r));
            for (e, c) in s.terms() {
                p.add_term(e.clone(), c * &r);
            }
        }
        // Normalise: a positive leading coefficient keeps the text readable; the zero set is unchanged.
        if p.terms().next().is_some_and(|(_, c)| c.is_negative()) {
            let mut neg = Polynomial::zero(layout.nvars());
            for (e, c) in p.terms() {
                neg.add_term(e.clone(), -c.clone());
            }
            p = neg;
        }
        if p.is_zero() {
            return Err(SymmetryError::NoInvariantPolynomial { equation: j + 1 });
        }
        out.push(p);
    }
    Ok(out)
}
