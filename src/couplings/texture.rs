//! Coupling textures: for every operator of [`super::operators`] and every choice of its third field, the
//! matrix of couplings between the basis classes of two multiplet kinds, each entry with one status and the
//! reason behind it (MATH.md §5).
//!
//! Statuses, in the order they are decided:
//!
//! * `forbidden_by_charge` — the `S(U(1)^r)` charges do not sum to a multiple of `(1,…,1)`;
//! * `vanishes_by_type` — allowed by charge, but the types add up to less than the codimension:
//!   `τ_1 + τ_2 + τ_3 < K`. Theorem (from memory: Blesneag, Buchbinder, Lukas, "Holomorphic Yukawa couplings for
//!   complete intersection Calabi-Yau manifolds", JHEP 2017): for `ν_i ∈ H^1(X, L_i)` descending from
//!   `H^{1+τ_i}(A, ∧^{τ_i} N^* ⊗ L_i)` with `L_1 ⊗ L_2 ⊗ L_3 = O_X`, the holomorphic Yukawa coupling
//!   `∫ Ω ∧ ν_1 ∧ ν_2 ∧ ν_3` vanishes whenever `τ_1 + τ_2 + τ_3 < K`, because the product lands in
//!   `∧^{τ_1+τ_2+τ_3} N^*` while `H^3(X, O_X)` descends from the top power `∧^K N^*`. No value is computed for
//!   such an entry. Sources checked: the existence of a vanishing theorem of this kind for line bundles that
//!   descend from the ambient space is stated in the abstracts of S. Blesneag, "Holomorphic Yukawa couplings in
//!   heterotic string theory", DPhil thesis, Oxford 2021 (arXiv:2204.01165), and of L. B. Anderson, J. Gray,
//!   M. Larfors, M. Magill, R. Schneider, "Generalized vanishing theorems for Yukawa couplings in heterotic
//!   compactifications" (arXiv:2103.10454, an algebro-geometric re-derivation and generalisation); the exact
//!   inequality `τ_1 + τ_2 + τ_3 < K` and its hypotheses are from memory (not checked against the paper's text)
//!   and are tested against computed values in `tests/couplings_invariants.rs`;
//! * `zero_computed` — the exact value was computed and is 0;
//! * `value` — the exact value ([`CouplingValue`]): a rational number, or over a one-parameter family
//!   ([`couplings_in_family`], [`family`]) an exact rational function of the parameter;
//! * `allowed_by_charge` — a two-factor operator (mass term): allowed by charge, no holomorphic value here;
//! * `not_computed` — allowed, but no value could be computed (the product bundle is not trivial because
//!   `c1(V) ≠ 0`, or a lift was refused as too large); the reason is in the class's `warnings`.
//!
//! Textures are built for the two-factor and three-factor operators with at least one non-singlet factor;
//! operators made of singlets only (`1 1`, `1 1 1`: the bundle-moduli potential) are listed with their
//! allowed tuples but get no texture.
//!
//! Per texture: the **structural rank** (maximum bipartite matching of the not-forbidden pattern, with
//! petgraph), the structural rank after the type theorem, the **rank** over Q (over `Q(parameter)` for
//! rational-function values, `function_field`) when every entry is known exactly, and the exact **relations**
//! (equal/opposite entries; equal, opposite, proportional or zero rows and columns; over a family also entries
//! proportional by a constant and rows/columns proportional by a rational function). Values are in slot order `λ(row, column, choice)`; λ is graded antisymmetric in its slots,
//! so transposed entries of a square texture differ by sign; the E8 structure constant (one overall sign per
//! operator) is not included. All values share one normalisation of Ω ([`super::value::NORMALISATION`]).
//!
//! Invariant: a texture's `entries` are row-major over `rows × columns`, one per pair; `structural_rank ≥
//! structural_rank_after_type ≥ rank` whenever `rank` is present.

use super::operators::{Operator, SingletField, enumerate_operators};
use super::parametric::FamilyMembers;
use super::value::{CouplingEngine, CouplingError, NORMALISATION};
use crate::arith::{RationalFunction, UniPoly};
use crate::bundle::spectrum::{Multiplet, Spectrum};
use crate::bundle::{BundleError, BundleSum, charge_is_singlet};
use crate::cohomology::CohomologyEngine;
use crate::geometry::Geometry;
use num_rational::BigRational;
use serde::{Serialize, Serializer};
use std::time::Instant;
use thiserror::Error;

/// Largest `--singlets` accepted (insertions of more singlets are not enumerated).
pub const MAX_SINGLET_INSERTIONS: usize = 4;
/// Largest number of rows or columns of one texture.
pub const MAX_TEXTURE_SIDE: usize = 200;

/// Why a texture computation failed.
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum TextureError {
    #[error(transparent)]
    Coupling(#[from] CouplingError),
    #[error(transparent)]
    Bundle(#[from] BundleError),
    #[error("couplings need a Calabi-Yau threefold; this configuration has dimension {0}")]
    NotThreefold(usize),
    #[error(transparent)]
    Geometry(#[from] crate::geometry::GeometryError),
    #[error("--singlets {0} is too large (limit {MAX_SINGLET_INSERTIONS})")]
    TooManySinglets(usize),
    #[error(
        "the {what} side of the {operator} texture has {size} classes (limit {MAX_TEXTURE_SIDE})"
    )]
    TooLarge {
        operator: String,
        what: &'static str,
        size: usize,
    },
}

/// An exact coupling value. Designed to grow: a value depending on one symbolic complex-structure parameter
/// is a rational function `numerator/denominator` (coefficients of ascending powers of `parameter`).
#[derive(Debug, Clone, PartialEq)]
pub enum CouplingValue {
    /// An exact rational number.
    Rational(BigRational),
    /// `Σ n_i p^i / Σ d_i p^i` in the parameter `p`.
    RationalFunction {
        parameter: String,
        numerator: Vec<BigRational>,
        denominator: Vec<BigRational>,
    },
}

impl CouplingValue {
    /// The rational number, when the value is one.
    pub fn as_rational(&self) -> Option<&BigRational> {
        match self {
            CouplingValue::Rational(q) => Some(q),
            CouplingValue::RationalFunction { .. } => None,
        }
    }
}

impl CouplingValue {
    /// The value as a rational function of `parameter`.
    pub fn from_function(parameter: &str, f: &RationalFunction) -> Self {
        CouplingValue::RationalFunction {
            parameter: parameter.to_string(),
            numerator: f.numerator().coeffs().to_vec(),
            denominator: f.denominator().coeffs().to_vec(),
        }
    }

    /// The value as a rational function (a rational number is a constant one); `None` for a zero denominator.
    pub fn to_function(&self) -> Option<RationalFunction> {
        match self {
            CouplingValue::Rational(q) => Some(RationalFunction::constant(q.clone())),
            CouplingValue::RationalFunction {
                numerator,
                denominator,
                ..
            } => RationalFunction::new(
                UniPoly::new(numerator.clone()),
                UniPoly::new(denominator.clone()),
            ),
        }
    }
}

/// A rational number as `p/q`; a rational function in lowest terms with a monic denominator, highest powers
/// first, `num` alone when the denominator is 1, else `(num)/(den)`, e.g. `(-2/3*psi^2 + 1)/(psi)`.
impl std::fmt::Display for CouplingValue {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            CouplingValue::Rational(q) => write!(f, "{q}"),
            CouplingValue::RationalFunction { parameter, .. } => match self.to_function() {
                Some(r) => f.write_str(&r.to_text(parameter)),
                None => f.write_str("undefined (zero denominator)"),
            },
        }
    }
}

/// The coefficients of a rational-function value, ascending powers of `parameter`, each an exact rational as a
/// string (the JSON form beside the `value` text).
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct FunctionCoefficients {
    pub parameter: String,
    pub numerator: Vec<String>,
    pub denominator: Vec<String>,
}

/// Serialised as a string (`"3/2"`, or the rational-function text).
impl Serialize for CouplingValue {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(&self.to_string())
    }
}

/// The status of one texture entry (see the module documentation).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum EntryStatus {
    ForbiddenByCharge,
    VanishesByType,
    ZeroComputed,
    Value,
    AllowedByCharge,
    NotComputed,
}

impl EntryStatus {
    /// One-character symbol for the text rendering.
    pub fn symbol(self) -> &'static str {
        match self {
            EntryStatus::ForbiddenByCharge => "·",
            EntryStatus::VanishesByType => "τ",
            EntryStatus::ZeroComputed => "0",
            EntryStatus::Value => "*",
            EntryStatus::AllowedByCharge => "+",
            EntryStatus::NotComputed => "?",
        }
    }

    /// Whether the exact value of the entry is known (zero included).
    pub fn is_known(self) -> bool {
        !matches!(
            self,
            EntryStatus::AllowedByCharge | EntryStatus::NotComputed
        )
    }
}

/// One entry of a texture.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Entry {
    /// Field labels in slot order: row class, column class and (for three factors) the choice class, each as
    /// `"<multiplet>#<n>"` (1-based basis class of that multiplet's `H^1`).
    pub fields: Vec<String>,
    /// Row index.
    pub row: usize,
    /// Column index.
    pub column: usize,
    pub status: EntryStatus,
    /// The exact value when known and non-zero.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub value: Option<CouplingValue>,
    /// For a rational-function `value`: its coefficients (set together with `value` by [`Entry::set_value`]).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub rational_function: Option<FunctionCoefficients>,
    /// Types τ of the fields (three-factor operators, when charge-allowed).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub types: Option<Vec<usize>>,
    /// For a forbidden entry: the products of present singlets that would allow it (`--singlets N`).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub singlet_insertions: Vec<Vec<String>>,
}

impl Entry {
    /// Set the value (and, for a rational function, its coefficients).
    pub fn set_value(&mut self, v: CouplingValue) {
        self.rational_function = match &v {
            CouplingValue::Rational(_) => None,
            CouplingValue::RationalFunction {
                parameter,
                numerator,
                denominator,
            } => {
                let text = |c: &[BigRational]| c.iter().map(|x| x.to_string()).collect();
                Some(FunctionCoefficients {
                    parameter: parameter.clone(),
                    numerator: text(numerator),
                    denominator: text(denominator),
                })
            }
        };
        self.value = Some(v);
    }
}

/// An exact relation inside a texture.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Relation {
    /// `"entries"`, `"rows"` or `"columns"`.
    pub between: &'static str,
    /// `"equal"`, `"opposite"`, `"proportional"` or `"zero"` (a row or column of exact zeros).
    pub kind: &'static str,
    /// First member (entry fields joined by spaces, or a row/column label).
    pub first: String,
    /// Second member (empty for `"zero"`).
    pub second: String,
    /// `second = factor · first` (a rational, or a rational function of the parameter, as a string).
    pub factor: String,
    /// True when `factor` is a non-constant rational function of the parameter.
    #[serde(skip_serializing_if = "std::ops::Not::not")]
    pub factor_depends_on_parameter: bool,
}

/// One coupling matrix.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CouplingClass {
    /// Operator name, e.g. `"10 10 5"`.
    pub operator: String,
    /// The kinds in slot order (row, column, choice).
    pub slots: Vec<&'static str>,
    /// The choice field (Higgs or singlet class), `None` for a two-factor operator.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub choice: Option<String>,
    /// Row labels (`"<multiplet>#<n>"`).
    pub rows: Vec<String>,
    /// Column labels.
    pub columns: Vec<String>,
    /// Row-major entries.
    pub entries: Vec<Entry>,
    /// Maximum bipartite matching of the not-forbidden pattern.
    pub structural_rank: usize,
    /// Maximum bipartite matching after removing the entries that vanish by type.
    pub structural_rank_after_type: usize,
    /// Exact rank over Q (over `Q(parameter)` for rational-function values) when every entry is known.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub rank: Option<usize>,
    /// Exact relations between entries, rows and columns.
    pub relations: Vec<Relation>,
    /// Why some entries are `not_computed`.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub warnings: Vec<String>,
}

/// Time spent per operator (not serialised with the classes: results never depend on it).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct OperatorTiming {
    pub operator: String,
    pub seconds: f64,
    /// Number of Yukawa tensors (multiplet triples) whose values were computed.
    pub tensors: usize,
}

/// An operator of the model with the present multiplet tuples allowed by charge.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct OperatorSummary {
    pub operator: String,
    pub arity: usize,
    pub slots: Vec<&'static str>,
    pub holomorphic_value: bool,
    /// Tuples of present multiplet labels (slot order, each multiset once) allowed by charge.
    pub allowed: Vec<Vec<String>>,
}

/// Options of [`couplings`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct CouplingOptions {
    /// Largest number of singlet insertions listed for a forbidden entry (0: none).
    pub singlets: usize,
    /// Compute exact values (otherwise allowed entries not vanishing by type are `not_computed`).
    pub values: bool,
    /// Largest lifted cocycle or cup product (Čech–Koszul terms) computed; a tensor needing more is refused
    /// with its size in the texture's `warnings` and its entries are `not_computed`.
    pub max_cochain_terms: usize,
}

impl Default for CouplingOptions {
    fn default() -> Self {
        CouplingOptions {
            singlets: 0,
            values: true,
            max_cochain_terms: super::value::MAX_COCHAIN_TERMS,
        }
    }
}

/// All couplings of a model.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct CouplingReport {
    /// GUT group name.
    pub gauge_group: &'static str,
    /// Codimension K of X in the ambient space (the type threshold).
    pub codimension: usize,
    /// The normalisation shared by every value.
    pub normalisation: &'static str,
    /// Model-level warnings (failed consistency checks and the like).
    pub warnings: Vec<String>,
    /// Every operator of the group with its allowed present tuples.
    pub operators: Vec<OperatorSummary>,
    /// The textures (a texture whose entries are all `forbidden_by_charge` is kept only when singlet
    /// insertions were asked for).
    pub classes: Vec<CouplingClass>,
    /// Number of textures left out because every entry is `forbidden_by_charge`.
    pub all_forbidden_textures: usize,
    /// Per-operator timings.
    #[serde(skip)]
    pub timings: Vec<OperatorTiming>,
    /// For a one-parameter family ([`couplings_in_family`]): the reconstruction of every tensor and the special
    /// parameter values.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub family: Option<FamilySummary>,
}

/// The spectrum of `bundles` on the engine's configuration (the cohomology engine supplies every `h`).
pub fn model_spectrum(
    engine: &CohomologyEngine,
    bundles: &BundleSum,
) -> Result<Spectrum, TextureError> {
    let config = engine.config();
    if config.dimension() != 3 {
        return Err(TextureError::NotThreefold(config.dimension()));
    }
    let summary = Geometry::new(config).summary()?;
    let (Some(triple), Some(c2)) = (summary.triple, summary.c2) else {
        return Err(TextureError::NotThreefold(config.dimension()));
    };
    let callback = |k: &[i64]| -> Result<Vec<u64>, String> {
        engine
            .cohomology(k)
            .map(|r| r.h.clone())
            .map_err(|e| e.to_string())
    };
    Ok(crate::bundle::spectrum::spectrum(
        &triple, &c2, bundles, &callback,
    )?)
}

/// The couplings of `bundles`: every operator, every texture (see the module documentation).
pub fn couplings(
    engine: &CohomologyEngine,
    bundles: &BundleSum,
    options: &CouplingOptions,
) -> Result<CouplingReport, TextureError> {
    couplings_with(engine, bundles, options, None)
}

/// The couplings of `bundles` over a one-parameter family whose member at `family.member` is the engine's:
/// textures labelled by the member's spectrum, every computed value an exact rational function of the
/// parameter (see [`family`] for the member check and the fall-backs), ranks over `Q(parameter)`, relations
/// with rational-function factors, and [`CouplingReport::family`] with the degree bounds, check points and
/// special values.
pub fn couplings_in_family(
    engine: &CohomologyEngine,
    bundles: &BundleSum,
    options: &CouplingOptions,
    family: &ParameterFamily,
) -> Result<CouplingReport, TextureError> {
    couplings_with(engine, bundles, options, Some(family))
}

fn couplings_with(
    engine: &CohomologyEngine,
    bundles: &BundleSum,
    options: &CouplingOptions,
    family: Option<&ParameterFamily>,
) -> Result<CouplingReport, TextureError> {
    if options.singlets > MAX_SINGLET_INSERTIONS {
        return Err(TextureError::TooManySinglets(options.singlets));
    }
    let spectrum = model_spectrum(engine, bundles)?;
    let group = spectrum.gauge_group;
    let k_codim = engine.config().codimension();
    let mut warnings = Vec::new();
    if !spectrum.consistency.all_passed {
        warnings.push(
            "the model fails some consistency check (see `spectrum`); couplings are computed anyway"
                .to_string(),
        );
    }
    if !spectrum.c1_zero {
        warnings.push(
            "c1(V) != 0: charge-allowed products are not the trivial bundle, so no values are computed"
                .to_string(),
        );
    }
    let singlets: Vec<SingletField> = spectrum
        .present()
        .filter(|m| m.role == crate::bundle::branching::Role::Singlet)
        .map(|m| SingletField {
            label: m.label.clone(),
            charge: m.charge.clone(),
        })
        .collect();
    let coupling_engine = CouplingEngine::new(engine).with_term_limit(options.max_cochain_terms);
    let mut types_cache: std::collections::HashMap<Vec<i64>, Vec<usize>> = Default::default();
    let mut operators = Vec::new();
    let mut classes = Vec::new();
    let mut timings = Vec::new();
    let mut all_forbidden_textures = 0;
    let mut summary = family.map(FamilySummary::new);
    let members = family.map(|f| {
        FamilyMembers::new(f.config, f.polynomials).with_term_limit(options.max_cochain_terms)
    });
    for op in enumerate_operators(group) {
        let started = Instant::now();
        operators.push(summarise(&op, &spectrum)?);
        let mut tensors = 0;
        let only_singlets = op
            .slots
            .iter()
            .all(|k| derive_kind_role(group, k) == crate::bundle::branching::Role::Singlet);
        match op.arity {
            _ if only_singlets => {}
            2 => classes.extend(bilinear(&op, &spectrum, &singlets, options)?),
            3 => {
                let ctx = Cubic {
                    op: &op,
                    spectrum: &spectrum,
                    singlets: &singlets,
                    options,
                    k_codim,
                    coupling_engine: &coupling_engine,
                    family: family.zip(members.as_ref()),
                };
                let (cls, n, skipped) = ctx.textures(&mut types_cache, summary.as_mut())?;
                tensors = n;
                all_forbidden_textures += skipped;
                classes.extend(cls);
            }
            _ => {}
        }
        let before = classes.len();
        classes.retain(|c: &CouplingClass| {
            options.singlets > 0
                || c.entries
                    .iter()
                    .any(|e| e.status != EntryStatus::ForbiddenByCharge)
        });
        all_forbidden_textures += before - classes.len();
        timings.push(OperatorTiming {
            operator: op.name.clone(),
            seconds: started.elapsed().as_secs_f64(),
            tensors,
        });
    }
    Ok(CouplingReport {
        gauge_group: group.name(),
        codimension: k_codim,
        normalisation: NORMALISATION,
        warnings,
        operators,
        classes,
        all_forbidden_textures,
        timings,
        family: summary,
    })
}

fn derive_kind_role(
    group: crate::bundle::branching::GaugeGroup,
    kind: &str,
) -> crate::bundle::branching::Role {
    crate::bundle::branching::branching_rule(group)
        .into_iter()
        .find(|t| t.gut.name == kind)
        .map_or(crate::bundle::branching::Role::Gauge, |t| t.gut.role)
}

fn summarise(op: &Operator, spectrum: &Spectrum) -> Result<OperatorSummary, TextureError> {
    use itertools::Itertools;
    let per_slot: Vec<Vec<&Multiplet>> = op
        .slots
        .iter()
        .map(|k| spectrum.present().filter(|m| m.kind == *k).collect())
        .collect();
    let mut allowed = Vec::new();
    let mut seen = std::collections::HashSet::new();
    for pick in per_slot.iter().multi_cartesian_product() {
        let charges: Vec<&[i64]> = pick.iter().map(|m| m.charge.as_slice()).collect();
        if !charge_is_singlet(&charges)? {
            continue;
        }
        let labels: Vec<String> = pick.iter().map(|m| m.label.clone()).collect();
        let mut key = labels.clone();
        key.sort();
        if seen.insert(key) {
            allowed.push(labels);
        }
    }
    Ok(OperatorSummary {
        operator: op.name.clone(),
        arity: op.arity,
        slots: op.slots.clone(),
        holomorphic_value: op.holomorphic_value,
        allowed,
    })
}

mod build;
pub mod family;
mod function_field;
mod relations;
use build::{Cubic, bilinear};
pub use family::{FamilySpecialValue, FamilySummary, FamilyTensor, ParameterFamily};
pub use function_field::exact_rank_over_functions;
pub use relations::{exact_rank, structural_rank};

#[cfg(test)]
mod tests;
