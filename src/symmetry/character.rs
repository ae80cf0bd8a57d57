//! Equivariant structures on line bundles and the characters of `Γ` on their cohomology.
//!
//! `Γ̃` acts on every `E_1` group `H^q(A, O_A(k − q_S)) e_S` of the Koszul spectral sequence: on a Bott monomial
//! by the substitution `x^e ↦ ζ^{a·e} x^{σ_* e}`, times a sign on the top Čech classes of the factors with
//! negative exponents (the sign of each coordinate bijection between those factors, i.e. the reordering of the
//! Čech face `(0…n)`, and the Koszul sign `(−1)^{n_i n_j}` for every pair of such factors whose order is
//! reversed), and on `e_S` by `g·e_j = ζ^{c_g(j)} e_{τ_g(j)}` with the sign of the reordering of the wedge. Only
//! basis vectors mapped to multiples of themselves contribute to a trace.
//!
//! The per-factor scalars `K` act on all of `H^•(X, O_X(k))` by `κ ↦ ζ^{Σ_i c_i k_i}`. An equivariant
//! structure (a lift of the action of `Γ = Γ̃/K`) is a one-dimensional character `ψ` of `Γ̃` with
//! `ψ(κ) = ζ^{−Σ c_i k_i}` on `K`; lifts differ by the characters of `Γ`. The twisted traces `ψ(g) tr(g)` are then
//! constant on the cosets of `K` and define the character of `Γ`.
//!
//! Per-degree characters: the virtual character `Σ_q (−1)^q tr(g | H^q)` is the alternating trace on `E_1`
//! (no maps needed). A degree whose `E_1` dimension equals `h^q` is untouched by every differential, so its
//! character is the `E_1` trace; when exactly one degree with `h^q > 0` remains, it follows from the virtual
//! character. Otherwise that degree's character is reported as unavailable (it needs the action on the
//! differentials, not implemented).
//!
//! Invariant: characters are exact elements of `Q(ζ_M)` stored per element of `Γ` (class order).

use super::SymmetryError;
use super::action::{factor_of, permutation_sign};
use super::cyclotomic::{Cyc, Cyclotomic};
use super::group::Group;
use super::invariance::EquationAction;
use crate::cohomology::bott::FactorKind;
use crate::cohomology::complex::{E1Group, E1Page};
use crate::poly::VariableLayout;
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::Zero;
use std::collections::BTreeMap;

/// A class function on `Γ`: one value in `Q(ζ_M)` per element of `Γ` (class order of [`Group::classes`]).
pub type ClassFunction = Vec<Cyc>;

/// `ζ^{exp}` with the sign: the trace of `Γ̃` element `e` on one `E_1` group.
fn group_trace(
    ring: &Cyclotomic,
    group: &Group,
    actions: &[EquationAction],
    layout: &VariableLayout,
    g: &E1Group,
    e: usize,
) -> Cyc {
    let mut tr = ring.zero();
    let act = &actions[e];
    let s: Vec<usize> = (0..act.tau.len())
        .filter(|j| g.koszul & (1 << j) != 0)
        .collect();
    let images: Vec<usize> = s.iter().map(|&j| act.tau[j]).collect();
    if images.iter().any(|t| !s.contains(t)) {
        return tr;
    }
    let order: Vec<usize> = images
        .iter()
        .map(|t| s.iter().position(|x| x == t).expect("stable"))
        .collect();
    let koszul_sign = permutation_sign(&order);
    let koszul_phase: i64 = s.iter().map(|&j| act.chi[j]).sum();
    let map = &group.elements()[e].map;
    let pi = map.factor_map(layout);
    let dims = layout.dims();
    // Sign on the top Čech classes (depends only on which factors are Top; Top factors go to Top factors for a
    // fixed monomial since the multidegree is then preserved).
    let top: Vec<usize> = (0..dims.len())
        .filter(|&i| g.bott.kinds[i] == FactorKind::Top)
        .collect();
    if top.iter().any(|&i| g.bott.kinds[pi[i]] != FactorKind::Top) {
        return tr;
    }
    let mut top_sign = 1i64;
    for &i in &top {
        let local: Vec<usize> = layout
            .range(i)
            .map(|v| map.image[v] - layout.offset(factor_of(layout, map.image[v])))
            .collect();
        top_sign *= permutation_sign(&local);
    }
    for (a, &i) in top.iter().enumerate() {
        for &j in &top[a + 1..] {
            if pi[i] > pi[j] && (dims[i] * dims[j]) % 2 == 1 {
                top_sign = -top_sign;
            }
        }
    }
    let sign = koszul_sign * top_sign;
    let unit = BigRational::from_integer(BigInt::from(sign));
    for b in &g.bott.basis {
        let (img, ph) = map.apply_exponents(b);
        if &img == b {
            ring.add_term(&mut tr, ph + koszul_phase, &unit);
        }
    }
    tr
}

/// The trace of `Γ̃` element `e` on `E_1` of every total degree.
pub fn e1_traces(
    ring: &Cyclotomic,
    group: &Group,
    actions: &[EquationAction],
    page: &E1Page,
    e: usize,
) -> BTreeMap<i64, Cyc> {
    let mut out: BTreeMap<i64, Cyc> = BTreeMap::new();
    for g in &page.groups {
        let t = group_trace(ring, group, actions, group.layout(), g, e);
        let entry = out.entry(g.total_degree).or_insert_with(|| ring.zero());
        *entry = ring.add(entry, &t);
    }
    out
}

/// The character `ψ` (exponents of `ζ_M` per `Γ̃` element) required on `K` for `O(k)`: `ψ(κ) = −Σ c_i k_i`.
fn k_condition(group: &Group, k: &[i64], psi: &[i64]) -> Result<(), String> {
    let m = group.root_order() as i64;
    for &e in &group.classes()[0] {
        let c = group.scalar_phases(e).expect("K holds scalars");
        let need = -c
            .iter()
            .zip(k)
            .map(|(&ci, &ki)| ci as i64 * ki)
            .sum::<i64>();
        if (psi[e] - need).rem_euclid(m) != 0 {
            return Err(group.element_name(e));
        }
    }
    Ok(())
}

/// An equivariant structure on `O(k)`: the user's lift (generator values in units of `ζ_N`) checked, or else
/// the first valid one-dimensional character (the trivial one when the natural action descends).
/// Returns `(ψ per Γ̃ element in units of ζ_M, number of equivariant structures when enumerable)`.
pub fn equivariant_structure(
    group: &Group,
    k: &[i64],
    lift: Option<&[i64]>,
    bundle_label: &str,
) -> Result<(Vec<i64>, Option<usize>), SymmetryError> {
    let scale = (group.root_order() / group.phase_order()) as i64;
    let all = group.one_dimensional_characters();
    let count = all.as_ref().map(|cs| {
        cs.iter()
            .filter(|psi| k_condition(group, k, psi).is_ok())
            .count()
    });
    if let Some(values) = lift {
        if values.len() != group.num_generators() {
            return Err(SymmetryError::Invalid(format!(
                "lift of {bundle_label} has {} values for {} generators",
                values.len(),
                group.num_generators()
            )));
        }
        let v: Vec<i64> = values.iter().map(|x| x * scale).collect();
        let psi = group.character_from_generators(&v).map_err(|element| {
            SymmetryError::NotHomomorphism {
                what: format!("the lift of {bundle_label}"),
                element,
            }
        })?;
        k_condition(group, k, &psi).map_err(|element| SymmetryError::NoEquivariantStructure {
            bundle: bundle_label.into(),
            element,
        })?;
        return Ok((psi, count));
    }
    let trivial = vec![0i64; group.linear_order()];
    if k_condition(group, k, &trivial).is_ok() {
        return Ok((trivial, count));
    }
    match all {
        Some(cs) => cs
            .into_iter()
            .find(|psi| k_condition(group, k, psi).is_ok())
            .map(|psi| (psi, count))
            .ok_or_else(|| SymmetryError::NoEquivariantStructure {
                bundle: bundle_label.into(),
                element: group.classes()[0]
                    .iter()
                    .map(|&e| group.element_name(e))
                    .find(|_| true)
                    .unwrap_or_default(),
            }),
        None => Err(SymmetryError::NoEquivariantStructure {
            bundle: bundle_label.into(),
            element: "(too many characters to search; give a lift)".into(),
        }),
    }
}

/// The characters of `Γ` on the cohomology of one line bundle with a chosen equivariant structure.
#[derive(Clone, Debug)]
pub struct BundleCharacters {
    /// `Σ_q (−1)^q tr(γ | H^q)`, per element of `Γ`.
    pub virtual_character: ClassFunction,
    /// `tr(γ | H^q)` per degree `q = 0..=dim X`, when determined (see the module doc).
    pub degrees: Vec<Option<ClassFunction>>,
}

/// Characters of `Γ` on `H^•(X, O_X(k))`, given `h` (from the cohomology engine) and the lift `psi`.
pub fn bundle_characters(
    group: &Group,
    actions: &[EquationAction],
    page: &E1Page,
    h: &[u64],
    psi: &[i64],
) -> BundleCharacters {
    let ring = Cyclotomic::new(group.root_order());
    let dim_x = h.len() as i64 - 1;
    let mut virt = Vec::new();
    let mut per_degree: Vec<Vec<Cyc>> = vec![Vec::new(); h.len()];
    for class in group.classes() {
        let e = class[0];
        let t = e1_traces(&ring, group, actions, page, e);
        let mut v = ring.zero();
        for (&m, tr) in &t {
            let tw = ring.shift(tr, psi[e]);
            v = if m % 2 == 0 {
                ring.add(&v, &tw)
            } else {
                ring.add(&v, &ring.shift(&tw.iter().map(|c| -c).collect(), 0))
            };
            if (0..=dim_x).contains(&m) {
                per_degree[m as usize].push(tw);
            }
        }
        for (q, list) in per_degree.iter_mut().enumerate() {
            if !t.contains_key(&(q as i64)) {
                list.push(ring.zero());
            }
        }
        virt.push(v);
    }
    let mut degrees: Vec<Option<ClassFunction>> = (0..h.len())
        .map(|q| {
            if h[q] == 0 {
                Some(vec![ring.zero(); group.order()])
            } else if page.dim(q as i64) as u64 == h[q] {
                Some(per_degree[q].clone())
            } else {
                None
            }
        })
        .collect();
    let unknown: Vec<usize> = (0..h.len()).filter(|&q| degrees[q].is_none()).collect();
    if unknown.len() == 1 {
        let u = unknown[0];
        let mut rest: ClassFunction = virt.clone();
        for (q, d) in degrees.iter().enumerate() {
            if let Some(d) = d {
                for (r, x) in rest.iter_mut().zip(d) {
                    let signed: Cyc = if q % 2 == 0 {
                        x.iter().map(|c| -c).collect()
                    } else {
                        x.clone()
                    };
                    *r = ring.add(r, &signed);
                }
            }
        }
        if u % 2 == 1 {
            rest = rest
                .into_iter()
                .map(|x| x.iter().map(|c| -c).collect())
                .collect();
        }
        degrees[u] = Some(rest);
    }
    BundleCharacters {
        virtual_character: virt,
        degrees,
    }
}

/// `(1/|Γ|) Σ_γ f(γ)` exactly, as a rational.
pub fn average(ring: &Cyclotomic, f: &ClassFunction) -> BigRational {
    let mut s = ring.zero();
    for x in f {
        s = ring.add(&s, x);
    }
    let q = ring
        .to_rational(&s)
        .expect("the sum of a character over the group is rational");
    q / BigRational::from_integer(BigInt::from(f.len()))
}

/// Pointwise product of class functions.
pub fn product(ring: &Cyclotomic, a: &ClassFunction, b: &ClassFunction) -> ClassFunction {
    a.iter().zip(b).map(|(x, y)| ring.mul(x, y)).collect()
}

/// The class function `γ ↦ ζ^{w(γ)}` of a one-dimensional character given per `Γ̃` element.
pub fn class_function_of(group: &Group, ring: &Cyclotomic, chi: &[i64]) -> ClassFunction {
    group
        .classes()
        .iter()
        .map(|c| ring.monomial(chi[c[0]], BigRational::from_integer(BigInt::from(1))))
        .collect()
}

/// Whether every value of a class function is zero.
pub fn is_zero_function(ring: &Cyclotomic, f: &ClassFunction) -> bool {
    f.iter()
        .all(|x| ring.is_zero(x) || x.iter().all(Zero::is_zero))
}
