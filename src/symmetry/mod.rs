//! Discrete symmetries: a finite group acting on the homogeneous coordinates by permutations (within and
//! between identical ambient factors) and phases (roots of unity), the checks that it descends to a free action
//! on the Calabi-Yau `X`, equivariant structures and characters on line-bundle cohomology, Wilson lines and the
//! downstairs spectrum on `X/Γ` (MATH.md §6).
//!
//! Files by idea: [`cyclotomic`] (exact `Q(ζ_M)`), [`action`] (monomial maps), [`group`] (closure, `Γ̃` and
//! `Γ = Γ̃/K`, one-dimensional characters), [`invariance`] (covariant equations, generic invariant members),
//! [`fixed`] (fixed loci and the freeness certificate), [`character`] (lifts and characters on cohomology),
//! [`downstairs`] (Wilson line, quotient spectrum, discrete selection rules).
//!
//! Invariant: a [`SymmetrySpec`] holds generators that preserve the ambient structure (checked when the model
//! file is read); a [`Quotient`] holds equations checked covariant under every element and a freeness
//! certificate for exactly those equations.

pub mod action;
pub mod character;
pub mod cyclotomic;
pub mod downstairs;
pub mod fixed;
pub mod group;
pub mod invariance;

use crate::geometry::{Configuration, Geometry};
use crate::poly::{Polynomial, VariableLayout};
use action::MonomialMap;
use fixed::Freeness;
use group::Group;
use invariance::EquationAction;
use num_bigint::BigInt;
use num_traits::{ToPrimitive, Zero};
use serde::Serialize;
use thiserror::Error;

/// Why a symmetry was refused.
#[derive(Debug, Error, Clone, PartialEq, Eq)]
#[non_exhaustive]
pub enum SymmetryError {
    #[error("symmetry: {0}")]
    Invalid(String),
    #[error("the group generated has more than {limit} elements")]
    TooLarge { limit: usize },
    #[error(
        "equation {equation} is not invariant (nor covariant) under generator `{generator}`: its image is not a root-of-unity multiple of an equation"
    )]
    NotInvariant { generator: String, equation: usize },
    #[error(
        "generic invariant equations need every multidegree fixed, but generator `{generator}` moves the multidegree of equation {equation}; give polynomials"
    )]
    GenericNeedsFixedDegrees { generator: String, equation: usize },
    #[error("no rational invariant polynomial exists for equation {equation}")]
    NoInvariantPolynomial { equation: usize },
    #[error("{what} is not a homomorphism: it fails at element {element}")]
    NotHomomorphism { what: String, element: String },
    #[error(
        "{what} does not factor through the group acting on the ambient space: non-trivial on the scalar element {element}"
    )]
    NotOnQuotient { what: String, element: String },
    #[error(
        "line bundle {bundle} has no equivariant structure of the given kind: the scalar element {element} acts non-trivially"
    )]
    NoEquivariantStructure { bundle: String, element: String },
    #[error("the action is not free: {0}")]
    NotFree(String),
    #[error("|Γ| = {order} does not divide χ(X) = {euler}, so the action cannot be free")]
    EulerNotDivisible { order: usize, euler: String },
}

/// One generator as written in the model file, validated against the ambient structure.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct GeneratorSpec {
    pub name: String,
    /// The substitution, phases in units of `ζ_N`.
    pub map: MonomialMap,
}

/// The validated `[symmetry]` section.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SymmetrySpec {
    /// `N`: phases, lifts and Wilson-line values are exponents `k` of `ζ_N`.
    pub phase_order: u32,
    pub generators: Vec<GeneratorSpec>,
    /// Per line bundle of the bundle sum: the lift's value on each generator (exponents of `ζ_N`).
    pub lifts: Option<Vec<Vec<i64>>>,
    /// The Wilson line's value on each generator, as exponents of `ζ_N` (acting by `ζ^{w·y}` on a component of
    /// hypercharge `y`, normalised so that `Q` has `y = 1`).
    pub wilson_line: Option<Vec<i64>>,
}

impl SymmetrySpec {
    /// Close the generators into the group.
    pub fn group(&self, layout: &VariableLayout) -> Result<Group, SymmetryError> {
        let names: Vec<String> = self.generators.iter().map(|g| g.name.clone()).collect();
        let maps: Vec<MonomialMap> = self.generators.iter().map(|g| g.map.clone()).collect();
        Group::generate(layout, self.phase_order, &names, &maps)
    }
}

/// The quotient data: the group, its action on the equations, and the checks.
#[derive(Clone, Debug)]
pub struct Quotient {
    pub group: Group,
    pub actions: Vec<EquationAction>,
    pub polynomials: Vec<Polynomial>,
    pub freeness: Freeness,
    pub euler: BigInt,
}

/// Serialisable summary of the checks.
#[derive(Clone, Debug, Serialize)]
pub struct QuotientSummary {
    pub group_order: usize,
    /// Order of the linear group on the coordinates (`|Γ̃| = |Γ|·|K|`).
    pub linear_group_order: usize,
    pub root_order: u32,
    pub free: bool,
    pub freeness: Freeness,
    pub euler_upstairs: String,
    /// `χ(X/Γ) = χ(X)/|Γ|` (when the action is free).
    pub euler_quotient: Option<i64>,
    /// `h^{1,1}` and `h^{2,1}` of the quotient, when computable from invariant classes (see `hodge_reason`).
    pub hodge_quotient: Option<[i64; 2]>,
    pub hodge_reason: String,
}

impl Quotient {
    /// Build the group, check the equations (`polys`, one per equation) and decide freeness. `χ(X)` must be
    /// divisible by `|Γ|` (checked first: a free action multiplies Euler numbers).
    pub fn new(
        spec: &SymmetrySpec,
        config: &Configuration,
        polys: &[Polynomial],
    ) -> Result<Quotient, SymmetryError> {
        let layout = VariableLayout::new(config.dims());
        let group = spec.group(&layout)?;
        let actions = invariance::equation_actions(&group, polys)?;
        let euler = Geometry::new(config).euler();
        if !(&euler % BigInt::from(group.order())).is_zero() {
            return Err(SymmetryError::EulerNotDivisible {
                order: group.order(),
                euler: euler.to_string(),
            });
        }
        let freeness = fixed::check_free(&group, polys);
        Ok(Quotient {
            group,
            actions,
            polynomials: polys.to_vec(),
            freeness,
            euler,
        })
    }

    /// Random invariant equations for generic mode (see [`invariance::random_invariant_equations`]).
    pub fn generic_equations(
        spec: &SymmetrySpec,
        config: &Configuration,
        seed: u64,
    ) -> Result<Vec<Polynomial>, SymmetryError> {
        let layout = VariableLayout::new(config.dims());
        let group = spec.group(&layout)?;
        invariance::random_invariant_equations(&group, config.equations(), seed, 1 << 20)
    }

    /// Refuse unless free.
    pub fn require_free(&self) -> Result<(), SymmetryError> {
        if self.freeness.free {
            Ok(())
        } else {
            Err(SymmetryError::NotFree(self.freeness.certificate.clone()))
        }
    }

    /// The summary; `favourable_h11` is `h^{1,1}(X)` when favourable (every class from the ambient factors).
    pub fn summary(&self, favourable_h11: Option<usize>) -> QuotientSummary {
        let order = self.group.order();
        let euler_quotient = if self.freeness.free {
            (&self.euler / BigInt::from(order)).to_i64()
        } else {
            None
        };
        // With h^{1,1}(X) spanned by the J_i, the invariant classes are the orbits of factors under the factor
        // permutations; then h^{2,1}(X/Γ) = h^{1,1}(X/Γ) − χ(X/Γ)/2.
        let (hodge_quotient, hodge_reason) = match (favourable_h11, euler_quotient) {
            (Some(_), Some(chi)) => {
                let layout = self.group.layout();
                let m = layout.dims().len();
                let mut orbit = (0..m).collect::<Vec<usize>>();
                for e in self.group.elements() {
                    let pi = e.map.factor_map(layout);
                    for i in 0..m {
                        let (a, b) = (orbit[i], orbit[pi[i]]);
                        let lo = a.min(b);
                        for o in orbit.iter_mut() {
                            if *o == a || *o == b {
                                *o = lo;
                            }
                        }
                    }
                }
                let mut reps = orbit.clone();
                reps.sort();
                reps.dedup();
                let h11 = reps.len() as i64;
                (
                    Some([h11, h11 - chi / 2]),
                    "X is favourable, so H^{1,1}(X) is spanned by the J_i; the invariant classes are the factor orbits, and h^{2,1} = h^{1,1} − χ/2 on the quotient".into(),
                )
            }
            (None, _) => (
                None,
                "X is not certified favourable: h^{1,1} of the quotient not computed".into(),
            ),
            (_, None) => (None, "the action is not free".into()),
        };
        QuotientSummary {
            group_order: order,
            linear_group_order: self.group.linear_order(),
            root_order: self.group.root_order(),
            free: self.freeness.free,
            freeness: self.freeness.clone(),
            euler_upstairs: self.euler.to_string(),
            euler_quotient,
            hodge_quotient,
            hodge_reason,
        }
    }
}

#[cfg(test)]
mod tests;
