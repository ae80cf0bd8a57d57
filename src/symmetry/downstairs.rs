//! Wilson lines, the downstairs spectrum on `X/Γ`, and discrete selection rules.
//!
//! A Wilson line is a homomorphism `W: Γ → U(1)_Y` into the hypercharge direction of SU(5), given by its values
//! `ζ_N^{w_g}` on the generators; it acts on a Standard-Model component of hypercharge `y` (normalised so that
//! `Q = (3,2)` has `y = 1`) by `ζ^{w·y}`. The downstairs multiplicity of a component of an SU(5) multiplet from
//! `H^1(X, L)` is the dimension of the invariant part of `H^1 ⊗ W^y`:
//! `n_y = (1/|Γ|) Σ_γ tr(γ | H^1(X, L)) · W(γ)^y`, computed exactly in `Q(ζ_M)`.
//!
//! Invariant: every downstairs count is a non-negative integer computed exactly; a fractional or negative value
//! is reported as an error (it would mean an inconsistent lift), never rounded.

use super::SymmetryError;
use super::character::{ClassFunction, average, class_function_of, product};
use super::cyclotomic::Cyclotomic;
use super::group::Group;
use num_rational::BigRational;
use num_traits::ToPrimitive;
use serde::Serialize;

/// The Wilson line as a one-dimensional character of `Γ̃` trivial on `K` (exponents of `ζ_M` per element).
pub fn wilson_line(group: &Group, values: &[i64]) -> Result<Vec<i64>, SymmetryError> {
    if values.len() != group.num_generators() {
        return Err(SymmetryError::Invalid(format!(
            "wilson_line has {} values for {} generators",
            values.len(),
            group.num_generators()
        )));
    }
    let scale = (group.root_order() / group.phase_order()) as i64;
    let v: Vec<i64> = values.iter().map(|x| x * scale).collect();
    let w =
        group
            .character_from_generators(&v)
            .map_err(|element| SymmetryError::NotHomomorphism {
                what: "the Wilson line".into(),
                element,
            })?;
    let m = group.root_order() as i64;
    if let Some(&e) = group.classes()[0]
        .iter()
        .find(|&&e| w[e].rem_euclid(m) != 0)
    {
        return Err(SymmetryError::NotOnQuotient {
            what: "the Wilson line".into(),
            element: group.element_name(e),
        });
    }
    Ok(w)
}

/// Standard-Model pieces of an SU(5) representation: `(name, SU(3)×SU(2) label, hypercharge y)`.
pub fn sm_components(kind: &str) -> Option<&'static [(&'static str, &'static str, i64)]> {
    Some(match kind {
        "10" => &[("Q", "(3,2)", 1), ("u", "(3bar,1)", -4), ("e", "(1,1)", 6)],
        "10bar" => &[
            ("Qbar", "(3bar,2)", -1),
            ("ubar", "(3,1)", 4),
            ("ebar", "(1,1)", -6),
        ],
        "5bar" => &[("d", "(3bar,1)", 2), ("L", "(1,2)", -3)],
        "5" => &[("T", "(3,1)", -2), ("H", "(1,2)", 3)],
        "1" => &[("S", "(1,1)", 0)],
        _ => return None,
    })
}

/// One Standard-Model component downstairs.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct DownstairsComponent {
    pub name: String,
    pub rep: String,
    pub hypercharge: i64,
    pub count: u64,
}

/// The invariant count `(1/|Γ|) Σ_γ f(γ) W(γ)^y` as a non-negative integer.
pub fn invariant_count(
    group: &Group,
    ring: &Cyclotomic,
    character: &ClassFunction,
    wilson: Option<&[i64]>,
    y: i64,
) -> Result<u64, SymmetryError> {
    let twisted = match wilson {
        Some(w) => {
            let wy: Vec<i64> = w.iter().map(|x| x * y).collect();
            product(ring, character, &class_function_of(group, ring, &wy))
        }
        None => character.clone(),
    };
    let avg: BigRational = average(ring, &twisted);
    if !avg.is_integer() || avg < BigRational::from_integer(0.into()) {
        return Err(SymmetryError::Invalid(format!(
            "invariant count {avg} is not a non-negative integer (inconsistent lift)"
        )));
    }
    Ok(avg.to_integer().to_u64().unwrap_or(u64::MAX))
}

/// Discrete selection rule: a trilinear coupling `H^1(L_1) ⊗ H^1(L_2) ⊗ H^1(L_3) → H^3(X, O_X)` between fields
/// transforming with characters `f1, f2, f3` can be non-zero only if `f1 f2 f3 · conj(ω)` contains the trivial
/// representation, `ω` being the character of `Γ` on `H^3(X, O_X)` (the coupling map is equivariant). Returns
/// the number of invariant couplings allowed (0 = forbidden by the group).
pub fn coupling_allowed_by_group(
    ring: &Cyclotomic,
    fields: [&ClassFunction; 3],
    omega: &ClassFunction,
) -> u64 {
    let conj_omega: ClassFunction = omega.iter().map(|x| ring.conj(x)).collect();
    let p = product(
        ring,
        &product(ring, &product(ring, fields[0], fields[1]), fields[2]),
        &conj_omega,
    );
    average(ring, &p).to_integer().to_u64().unwrap_or(0)
}

/// One multiplet downstairs.
#[derive(Clone, Debug, Serialize)]
pub struct DownstairsMultiplet {
    pub label: String,
    pub kind: String,
    /// `h^1` upstairs.
    pub upstairs: u64,
    /// Standard-Model components (SU(5) with a Wilson line) or one `invariant` entry.
    pub components: Vec<DownstairsComponent>,
    /// Set when the character of `H^1` could not be determined (then `components` is empty).
    pub note: Option<String>,
}

/// The downstairs spectrum.
#[derive(Clone, Debug, Serialize)]
pub struct Downstairs {
    pub group_order: usize,
    /// `−χ(V)/|Γ|` (`None` when not divisible).
    pub families: Option<i64>,
    pub multiplets: Vec<DownstairsMultiplet>,
    /// Higgs doublets kept: `H` components of the `5` multiplets.
    pub higgs_doublets: u64,
    /// Colour triplets left in the `5` multiplets (0 = all triplets removed).
    pub colour_triplets: u64,
}

/// The downstairs spectrum of a line-bundle sum on `X/Γ` (precondition: `engine` uses `quotient.polynomials`).
pub fn downstairs_spectrum(
    quotient: &super::Quotient,
    spec: &super::SymmetrySpec,
    engine: &crate::cohomology::CohomologyEngine,
    spectrum: &crate::bundle::spectrum::Spectrum,
    bundles: &[Vec<i64>],
) -> Result<Downstairs, SymmetryError> {
    use super::character::{bundle_characters, equivariant_structure};
    let group = &quotient.group;
    let ring = Cyclotomic::new(group.root_order());
    let m = group.root_order() as i64;
    let mut lifts = Vec::new();
    for (a, k) in bundles.iter().enumerate() {
        let user = spec.lifts.as_ref().map(|l| l[a].as_slice());
        let (psi, _) = equivariant_structure(group, k, user, &format!("L_{}", a + 1))?;
        lifts.push(psi);
    }
    let wilson = match &spec.wilson_line {
        Some(w) => Some(wilson_line(group, w)?),
        None => None,
    };
    let wilson_classes: Option<Vec<i64>> = wilson.clone();
    let su5 = bundles.len() == 5;
    let mut out = Vec::new();
    let (mut doublets, mut triplets) = (0u64, 0u64);
    for mult in &spectrum.multiplets {
        let mut psi = vec![0i64; group.linear_order()];
        for (&b, &dual) in mult.bundles.iter().zip(&mult.duals) {
            for (p, l) in psi.iter_mut().zip(&lifts[b - 1]) {
                *p = (*p + if dual { -l } else { *l }).rem_euclid(m);
            }
        }
        let k = &mult.line_bundle;
        let h = engine
            .cohomology(k)
            .map_err(|e| SymmetryError::Invalid(e.to_string()))?
            .h
            .clone();
        let page =
            crate::cohomology::complex::E1Page::new(group.layout(), engine.config().equations(), k);
        let chars = bundle_characters(group, &quotient.actions, &page, &h, &psi);
        let Some(h1) = chars.degrees.get(1).cloned().flatten() else {
            out.push(DownstairsMultiplet {
                label: mult.label.clone(),
                kind: mult.kind.clone(),
                upstairs: mult.count,
                components: vec![],
                note: Some(
                    "the character of H^1 needs the action on the differentials (not implemented)"
                        .into(),
                ),
            });
            continue;
        };
        let pieces: Vec<(String, String, i64)> =
            match (su5, sm_components(&mult.kind), &wilson_classes) {
                (true, Some(list), Some(_)) => list
                    .iter()
                    .map(|(n, r, y)| (n.to_string(), r.to_string(), *y))
                    .collect(),
                _ => vec![("invariant".into(), mult.kind.clone(), 0)],
            };
        let mut comps = Vec::new();
        for (name, rep, y) in pieces {
            let count = invariant_count(group, &ring, &h1, wilson_classes.as_deref(), y)?;
            if mult.kind == "5" {
                if name == "H" {
                    doublets += count;
                } else if name == "T" {
                    triplets += count;
                }
            }
            comps.push(DownstairsComponent {
                name,
                rep,
                hypercharge: y,
                count,
            });
        }
        out.push(DownstairsMultiplet {
            label: mult.label.clone(),
            kind: mult.kind.clone(),
            upstairs: mult.count,
            components: comps,
            note: None,
        });
    }
    let order = group.order() as i64;
    Ok(Downstairs {
        group_order: group.order(),
        families: (spectrum.families % order == 0).then_some(spectrum.families / order),
        multiplets: out,
        higgs_doublets: doublets,
        colour_triplets: triplets,
    })
}
