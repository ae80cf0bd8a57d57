//! Textures over a one-parameter family of given polynomials: the values of every Yukawa tensor as exact
//! rational functions of the parameter ([`super::super::parametric::parametric_yukawa_tensor`]), checked against
//! the member whose spectrum labels the textures, with the reconstruction data (degree bound, interpolation and
//! check points) and the special parameter values collected per model.
//!
//! Member check: the textures are indexed by the basis classes of the member held by the cohomology engine
//! (`parameter_value`). For every tensor the exact values at that member are computed directly as well; the
//! rational functions are used when the generic dimensions and types equal the member's, and the check records
//! whether each function specialises at the member to the direct value (`"agrees"`), or not (the member is a
//! pole or lies where the echelon basis changes: `"differs"`). When the dimensions or types differ (the member is
//! on a jump locus) or no rational function is found within the point limit, the member's exact values are
//! used and the tensor says why.
//!
//! Invariant: every [`FamilyTensor`] describes one computed tensor; its `values` are `"rational_functions"` only
//! when every entry of that tensor in the textures is a [`super::CouplingValue::RationalFunction`].

use super::super::parametric::{
    FamilyMembers, ParametricError, ParametricOptions, ParametricYukawa, SpecialKind, SpecialValue,
    parametric_yukawa_tensor_with,
};
use super::super::value::{CouplingEngine, CouplingError, YukawaTensor};
use crate::geometry::Configuration;
use crate::poly::parametric::ParametricPolynomial;
use num_rational::BigRational;
use serde::Serialize;

/// A one-parameter family of given polynomials, one per equation, whose member at `member` is the one held by
/// the cohomology engine passed to [`super::couplings_in_family`].
#[derive(Clone, Debug)]
pub struct ParameterFamily<'a> {
    pub config: &'a Configuration,
    /// The parameter's name (e.g. `psi`).
    pub parameter: &'a str,
    pub polynomials: &'a [ParametricPolynomial],
    /// The parameter value of the engine's member.
    pub member: BigRational,
    /// Limits of the reconstruction.
    pub options: ParametricOptions,
}

/// The statement of how ranks over `Q(parameter)` are computed (for the output).
pub const FUNCTION_RANK_METHOD: &str = "Gaussian elimination over the field Q(parameter), every entry kept as an exact rational function in lowest terms";

/// One Yukawa tensor of a family (see the module documentation).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FamilyTensor {
    /// The three multiplet labels in slot order.
    pub fields: Vec<String>,
    pub bundles: Vec<Vec<i64>>,
    /// Generic `h^1` per slot (the member's when the values are the member's).
    pub dims: Vec<usize>,
    /// `"rational_functions"` or `"member"` (the exact values at the member only; `note` says why).
    pub values: &'static str,
    /// Every entry was sought with `deg numerator + deg denominator ≤ total_degree_bound`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub total_degree_bound: Option<usize>,
    /// Largest numerator and denominator degrees found.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub max_degrees: Option<(usize, usize)>,
    /// Parameter values used for the interpolation.
    pub interpolation_points: Vec<String>,
    /// Further values at which every entry was verified.
    pub check_points: Vec<String>,
    /// `"agrees"`, `"differs"` or `"not_compared"` (see the module documentation).
    pub member_check: &'static str,
    /// Special values met for this tensor.
    pub special_values: Vec<SpecialValue>,
    /// Denominator factors with no located rational root, as text in the parameter.
    pub unlocated_denominators: Vec<String>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub note: Option<String>,
}

/// A special parameter value of the model: where the spectrum of some tensor's bundles jumps, the equations
/// degenerate, the basis changes, or a denominator vanishes.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct FamilySpecialValue {
    pub value: String,
    #[serde(flatten)]
    pub kind: SpecialKind,
    pub found_as: String,
    /// The tensors (multiplet labels joined by spaces) for which it was found.
    pub tensors: Vec<String>,
}

/// The family data of a [`super::CouplingReport`].
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct FamilySummary {
    pub parameter: String,
    /// The member whose spectrum and basis classes label the textures.
    pub member: String,
    /// How `rank` is computed when the entries are rational functions ([`FUNCTION_RANK_METHOD`]).
    pub rank_method: &'static str,
    pub tensors: Vec<FamilyTensor>,
    /// Every special value of every tensor, once per (value, kind, found_as).
    pub special_values: Vec<FamilySpecialValue>,
    /// Every unlocated denominator factor, once.
    pub unlocated_denominators: Vec<String>,
}

impl FamilySummary {
    pub(super) fn new(family: &ParameterFamily) -> Self {
        FamilySummary {
            parameter: family.parameter.to_string(),
            member: family.member.to_string(),
            rank_method: FUNCTION_RANK_METHOD,
            tensors: Vec::new(),
            special_values: Vec::new(),
            unlocated_denominators: Vec::new(),
        }
    }

    /// Record the tensor of a permuted triple derived from the recorded tensor `source` (slot `s` is slot
    /// `perm[s]` of the source): the same reconstruction data, permuted slots and a note saying so.
    pub(super) fn push_permuted(&mut self, source: &[String; 3], perm: [usize; 3]) {
        let Some(t) = self.tensors.iter().find(|t| t.fields == source.as_slice()) else {
            return;
        };
        let mut derived = t.clone();
        derived.fields = perm.iter().map(|&p| t.fields[p].clone()).collect();
        derived.bundles = perm.iter().map(|&p| t.bundles[p].clone()).collect();
        derived.dims = perm.iter().map(|&p| t.dims[p]).collect();
        let how = format!(
            "derived from the tensor {} by graded antisymmetry (permuting the slots multiplies every value by the permutation's sign)",
            source.join(" ")
        );
        derived.note = Some(match derived.note {
            Some(n) => format!("{how}; {n}"),
            None => how,
        });
        self.push(derived);
    }

    /// Record a tensor and merge its special values and unlocated denominators into the model's lists.
    pub(super) fn push(&mut self, t: FamilyTensor) {
        let name = t.fields.join(" ");
        for s in &t.special_values {
            match self
                .special_values
                .iter_mut()
                .find(|m| m.value == s.value && m.kind == s.kind && m.found_as == s.found_as)
            {
                Some(m) => {
                    if !m.tensors.contains(&name) {
                        m.tensors.push(name.clone());
                    }
                }
                None => self.special_values.push(FamilySpecialValue {
                    value: s.value.clone(),
                    kind: s.kind.clone(),
                    found_as: s.found_as.clone(),
                    tensors: vec![name.clone()],
                }),
            }
        }
        self.special_values
            .sort_by_key(|s| s.value.parse::<BigRational>().ok());
        for d in &t.unlocated_denominators {
            if !self.unlocated_denominators.contains(d) {
                self.unlocated_denominators.push(d.clone());
            }
        }
        self.tensors.push(t);
    }
}

/// The values of one tensor of a family.
pub(super) enum FamilyValues {
    /// Rational functions in the member's basis order.
    Functions(Box<ParametricYukawa>),
    /// The member's exact values.
    Member(Box<YukawaTensor>),
}

impl FamilyValues {
    /// The values of the permuted triple (slot `s` is slot `perm[s]` of `self`), by graded antisymmetry.
    pub(super) fn permuted(&self, perm: [usize; 3]) -> FamilyValues {
        match self {
            FamilyValues::Functions(t) => FamilyValues::Functions(Box::new(t.permuted(perm))),
            FamilyValues::Member(t) => FamilyValues::Member(Box::new(t.permuted(perm))),
        }
    }
}

/// Compute the tensor of `bundles` over the family and compare it with the member (module documentation).
/// Errors are the member computation's own (sizes, triviality); a failed reconstruction falls back to the
/// member's values with a note. The sample members come from `members` (shared by every tensor of the family).
pub(super) fn family_tensor(
    family: &ParameterFamily,
    members: &FamilyMembers,
    engine: &CouplingEngine,
    fields: [&str; 3],
    bundles: [&[i64]; 3],
) -> Result<(FamilyValues, FamilyTensor), CouplingError> {
    let member = engine.yukawa_tensor(bundles)?;
    let mut record = FamilyTensor {
        fields: fields.iter().map(|s| s.to_string()).collect(),
        bundles: bundles.iter().map(|b| b.to_vec()).collect(),
        dims: member.dims.to_vec(),
        values: "member",
        total_degree_bound: None,
        max_degrees: None,
        interpolation_points: vec![],
        check_points: vec![],
        member_check: "not_compared",
        special_values: vec![],
        unlocated_denominators: vec![],
        note: None,
    };
    let param =
        match parametric_yukawa_tensor_with(members, family.parameter, bundles, &family.options) {
            Ok(p) => p,
            Err(ParametricError::Coupling(e)) => return Err(e),
            Err(e) => {
                record.note = Some(format!(
                    "{e}; the values are those of the member {} = {}",
                    family.parameter, family.member
                ));
                return Ok((FamilyValues::Member(Box::new(member)), record));
            }
        };
    let pts = |v: &[BigRational]| v.iter().map(|x| x.to_string()).collect::<Vec<_>>();
    record.total_degree_bound = Some(param.total_degree_bound);
    record.max_degrees = Some(param.max_degrees);
    record.interpolation_points = pts(&param.interpolation_points);
    record.check_points = pts(&param.check_points);
    record.special_values = param.special_values.clone();
    record.unlocated_denominators = param
        .unlocated_denominators
        .iter()
        .map(|d| d.to_text(family.parameter))
        .collect();
    if param.dims != member.dims || param.types != member.types {
        record.note = Some(format!(
            "the member {} = {} has h^1 {:?} and types other than the generic h^1 {:?}: the values are the member's",
            family.parameter, family.member, member.dims, param.dims
        ));
        return Ok((FamilyValues::Member(Box::new(member)), record));
    }
    let agrees = param
        .values
        .iter()
        .zip(&member.values)
        .all(|(f, v)| f.eval(&family.member).as_ref() == Some(v));
    record.member_check = if agrees { "agrees" } else { "differs" };
    if !agrees {
        record.note = Some(format!(
            "at the member {} = {} the rational functions do not all specialise to the member's values (a pole, or the canonical basis there is not the generic one); the textures show the generic functions",
            family.parameter, family.member
        ));
    }
    record.values = "rational_functions";
    Ok((FamilyValues::Functions(Box::new(param)), record))
}
