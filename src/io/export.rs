//! The export file for numerical solvers (schema `sheafwright-export`, version 1): one serialisable value that
//! holds everything exact a numerical pipeline needs — the configuration, the polynomials actually used, the
//! geometry, the certificates, the spectrum and, for every multiplet, a basis of representatives with the
//! Dolbeault form of each Bott term (docs/representatives.md, docs/export-schema.md).
//!
//! Invariant: nothing is computed here except the fixed Čech-to-Dolbeault dictionary, which only rewrites each
//! exported Bott monomial as form data; every number comes from the library modules ([`crate::analysis`],
//! [`crate::cohomology`]). Coefficients are exact strings (`"p/q"` or integers) and are never rounded.
//!
//! The dictionary (one factor `P^n`, homogeneous coordinates `x_0..x_n`, `κ = Σ_l |x_l|^2`): a Bott monomial
//! with exponents `e ≥ 0` is the holomorphic polynomial `x^e`; a Laurent monomial `x^{-1-a}` (`a ≥ 0`, `|a| = k`)
//! of `H^n(P^n, O(−n−1−k))` is the `(0,n)`-form `c_a · x̄^a · ω̄ / κ^{n+1+k}` with
//! `ω̄ = Σ_l (−1)^l x̄_l dx̄_0 ∧ … ∧ \widehat{dx̄_l} ∧ … ∧ dx̄_n` and `c_a = (n+k)! / (n! · a_0! ⋯ a_n!)`. On a product the
//! form is the wedge product of the factor forms in factor order.

use super::dolbeault::{PARTITION_FORMULA, partition_exponents};
use super::face_forms::{ExportFaceForm, face_form_table};
use super::npz::NpyArray;
use crate::analysis::{Favourability, ModelAnalysis};
use crate::bundle::spectrum::Spectrum;
use crate::cohomology::{
    BottTerm, ClassRepresentative, CohomologyEngine, CohomologyError, PolynomialChoice,
};
use crate::geometry::GeometrySummary;
use crate::poly::VariableLayout;
use crate::slope::SlopeZero;
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::One;
use serde::{Deserialize, Serialize};
use std::collections::HashMap;

/// The `schema` value of every export file.
pub const EXPORT_SCHEMA: &str = "sheafwright-export";
/// The export format version (bumped only on a breaking change; keys are added, never renamed).
pub const EXPORT_VERSION: u32 = 1;

/// One polynomial as exponent arrays and exact coefficients.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ExportPolynomial {
    /// The equation's multidegree.
    pub multidegree: Vec<u32>,
    /// One exponent array per term, over all variables in `configuration.variables` order.
    pub exponents: Vec<Vec<u32>>,
    /// Exact coefficients, same order as `exponents`.
    pub coefficients: Vec<String>,
}

/// The polynomials the engine used.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ExportPolynomials {
    /// `"generic"` (integer coefficients drawn from `seed`) or `"given"` (the model file's).
    pub mode: String,
    pub seed: Option<u64>,
    pub equations: Vec<ExportPolynomial>,
    /// For a model with a symbolic parameter: the whole family, of which `equations` is the member at
    /// `family.value`. Absent otherwise.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub family: Option<ExportFamilyPolynomials>,
}

/// A one-parameter family of polynomials: every coefficient a polynomial in the parameter.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ExportFamilyPolynomials {
    /// The parameter's name (e.g. `psi`).
    pub parameter: String,
    /// The member held in [`ExportPolynomials::equations`] (exact rational as a string).
    pub value: String,
    pub equations: Vec<ExportFamilyPolynomial>,
}

/// One polynomial of a family: per term the exponent array and the coefficient as a polynomial in the
/// parameter (exact rationals as strings, ascending powers, `[c_0, c_1, …]`).
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ExportFamilyPolynomial {
    pub multidegree: Vec<u32>,
    pub exponents: Vec<Vec<u32>>,
    pub coefficients: Vec<Vec<String>>,
}

/// The configuration and its variables.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ExportConfiguration {
    pub label: String,
    /// Projective dimensions `n_i`.
    pub ambient: Vec<usize>,
    /// Equation multidegrees (columns of the configuration matrix).
    pub equations: Vec<Vec<u32>>,
    /// Variable names in the global order (`x1_0, x1_1, …`: factor, then coordinate).
    pub variables: Vec<String>,
}

/// One term of a factor form: `coefficient · x^x · x̄^xbar · κ_i^{kappa_power} · dx̄_{dxbar…}`.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct FormTerm {
    /// Exponents of the factor's holomorphic coordinates `x_{i,0..n_i}`.
    pub x: Vec<u32>,
    /// Exponents of `x̄_{i,0..n_i}`.
    pub xbar: Vec<u32>,
    /// Power of `κ_i = Σ_l |x_{i,l}|^2` (zero or negative).
    pub kappa_power: i64,
    /// Indices `l` (increasing) of the `dx̄_{i,l}` wedged in this order.
    pub dxbar: Vec<usize>,
    /// Exact coefficient.
    pub coefficient: String,
}

/// One ambient factor of a form: `"sections"` (a holomorphic monomial, a function) or `"top"` (a `(0,n_i)`-form).
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct FactorForm {
    pub kind: String,
    /// The sum of these terms is the factor form.
    pub terms: Vec<FormTerm>,
}

/// The Dolbeault form of one Bott term on the ambient space:
/// `coefficient · factor_1 ∧ factor_2 ∧ … ∧ factor_m`, valued in `∧^p N^* ⊗ O_A(bundle)` (the `e_S` of `koszul`).
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct AmbientForm {
    /// Koszul index set `S` (1-based equations); the form is the coefficient of `e_S`.
    pub koszul: Vec<usize>,
    /// The ambient line bundle `O_A(k − Σ_{j∈S} q_j)` the form is valued in.
    pub bundle: Vec<i64>,
    /// Form degree `(0, q)`.
    pub q: usize,
    /// The Bott term's exact coefficient (the factor forms carry their own dictionary constants).
    pub coefficient: String,
    pub factors: Vec<FactorForm>,
}

/// One basis class of `H^1(X, L)` with everything exported about it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ExportClass {
    pub degree: usize,
    /// The type τ (the class descends from `H^{degree+τ}(A, ∧^τ N^* ⊗ L)`).
    #[serde(rename = "type")]
    pub class_type: usize,
    /// The `E_1` cocycle (Bott terms with exact coefficients).
    pub bott_terms: Vec<BottTerm>,
    /// The Dolbeault form of each Bott term, same order as `bott_terms`.
    pub ambient_forms: Vec<AmbientForm>,
    /// How the class is represented on X (docs/representatives.md, "Types"): `"restriction"` (type 0: the sum
    /// of `ambient_forms` restricted to X is a representative), `"partition_of_unity"` (type ≥ 1: the form
    /// `Φ(lift with koszul = [])` built from `face_forms` with this class's `partition_exponents`, restricted to
    /// X, is a representative) or `"lift_truncated"` (type ≥ 1 with `lift_truncated`: that form is incomplete).
    pub on_x: String,
    /// The exponents `m_i` (one per factor) of the partition of unity `ρ_l = |x_l|^{2m_i}/κ_{m_i}` that makes
    /// `Φ(lift)` smooth: per factor the largest pole order of the lift, at least 1.
    pub partition_exponents: Vec<u32>,
    /// The lifted Čech–Koszul cocycle.
    pub lift: Vec<crate::cohomology::CechTerm>,
    pub lift_truncated: bool,
}

/// A multiplet with its basis of representatives.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ExportMultiplet {
    pub label: String,
    pub kind: String,
    pub charge: Vec<i64>,
    pub count: u64,
    pub line_bundle: Vec<i64>,
    /// `count` classes of `H^1(X, line_bundle)`.
    pub classes: Vec<ExportClass>,
    /// With `--with-duals`: a basis of the Serre-dual space `H^2(X, line_bundle^*)`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub dual_classes: Option<Vec<ExportClass>>,
}

/// The whole export (see docs/export-schema.md for every key).
#[derive(Clone, Debug, Serialize)]
pub struct Export {
    pub schema: String,
    pub version: u32,
    pub model: String,
    pub configuration: ExportConfiguration,
    pub polynomials: ExportPolynomials,
    pub geometry: GeometrySummary,
    pub favourability: Favourability,
    pub slope_zero: SlopeZero,
    /// The exact Kähler point of the slope certificate (a rational point), with the slopes there.
    pub kahler_point: Option<crate::analysis::KahlerPointCheck>,
    pub line_bundles: Vec<Vec<i64>>,
    pub spectrum: Spectrum,
    pub multiplets: Vec<ExportMultiplet>,
    /// The dictionary conventions in words (normalisation, sign conventions, what is and is not fixed).
    pub dictionary: Dictionary,
    /// The face forms `F_J^{(m)}` (exact terms) of every face used by a `"partition_of_unity"` class's lift
    /// ([`super::face_forms`]): one row per distinct `(n, m, face)`.
    pub face_forms: Vec<ExportFaceForm>,
    /// The coupling textures ([`crate::couplings::couplings`]): statuses, exact values, ranks, relations. Entry
    /// fields `"<label>#<n>"` name `multiplets[label].classes[n−1]` (the same basis). With a family
    /// ([`build_export`]'s `family`), every computed value is a rational function of the parameter
    /// ([`crate::couplings::couplings_in_family`]) and `couplings.family` holds the reconstruction data.
    /// Absent when refused.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub couplings: Option<crate::couplings::CouplingReport>,
    /// Why `couplings` is absent (e.g. a lift too large).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub couplings_error: Option<String>,
}

/// The conventions of the Čech-to-Dolbeault dictionary, stated in the file itself.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Dictionary {
    pub top_factor: String,
    pub product: String,
    pub normalisation: String,
    pub higher_types: String,
    /// The partition-of-unity form `Φ` of a lifted cocycle (every type).
    pub partition_of_unity: String,
}

impl Dictionary {
    fn standard() -> Self {
        Dictionary {
            top_factor: "x^(-1-a) on P^n (|a| = k) -> c_a xbar^a omegabar / kappa^(n+1+k), omegabar = sum_l (-1)^l xbar_l dxbar_0..^l..dxbar_n, c_a = (n+k)!/(n! a!)".into(),
            product: "wedge product of the factor forms in factor order; the Bott coefficient multiplies the product".into(),
            normalisation: "c_a fixes the ratios within one factor (compatible with the residue pairing against H^0(O(k))); the Cech-Dolbeault comparison multiplies every class of a Bott group by one further non-zero constant depending only on the group's factor kinds, set to 1 here".into(),
            higher_types: "type 0: the sum of ambient_forms restricted to X represents the class; type >= 1: the ambient forms of the leading Koszul degree are d-bar closed on A, and the representative on X is Phi(lift with koszul = []) restricted to X (on_x = partition_of_unity; dictionary.partition_of_unity, face_forms)".into(),
            partition_of_unity: PARTITION_FORMULA.into(),
        }
    }
}

/// Factorial as an exact integer.
fn factorial(n: u64) -> BigInt {
    (1..=n).fold(BigInt::one(), |a, b| a * BigInt::from(b))
}

/// The dictionary constant `c_a = (n+k)! / (n! a!)` of a top factor.
pub fn top_constant(n: usize, a: &[u32]) -> BigRational {
    let k: u64 = a.iter().map(|&x| x as u64).sum();
    let mut den = factorial(n as u64);
    for &ai in a {
        den *= factorial(ai as u64);
    }
    BigRational::new(factorial(n as u64 + k), den)
}

/// The factor form of one factor's Laurent exponents `e` (all `≥ 0`: sections; all `≤ −1`: top).
/// Precondition: `e` is a Bott monomial block (one sign pattern).
pub fn factor_form(e: &[i32]) -> FactorForm {
    let n = e.len() - 1;
    if e.iter().all(|&x| x >= 0) {
        return FactorForm {
            kind: "sections".into(),
            terms: vec![FormTerm {
                x: e.iter().map(|&x| x as u32).collect(),
                xbar: vec![0; n + 1],
                kappa_power: 0,
                dxbar: vec![],
                coefficient: "1".into(),
            }],
        };
    }
    assert!(
        e.iter().all(|&x| x <= -1),
        "factor_form: a Bott block is all >= 0 or all <= -1"
    );
    let a: Vec<u32> = e.iter().map(|&x| (-1 - x) as u32).collect();
    let k: i64 = a.iter().map(|&x| x as i64).sum();
    let c = top_constant(n, &a);
    let terms = (0..=n)
        .map(|l| {
            let mut xbar = a.clone();
            xbar[l] += 1;
            let coeff = if l % 2 == 1 { -c.clone() } else { c.clone() };
            FormTerm {
                x: vec![0; n + 1],
                xbar,
                kappa_power: -(n as i64 + 1 + k),
                dxbar: (0..=n).filter(|&j| j != l).collect(),
                coefficient: coeff.to_string(),
            }
        })
        .collect();
    FactorForm {
        kind: "top".into(),
        terms,
    }
}

/// The ambient Dolbeault form of one Bott term of a class of `H^•(X, O_X(k))`.
pub fn ambient_form(term: &BottTerm, k: &[i64], equations: &[Vec<u32>]) -> AmbientForm {
    let mut bundle = k.to_vec();
    for &j in &term.koszul {
        for (b, &qj) in bundle.iter_mut().zip(&equations[j - 1]) {
            *b -= qj as i64;
        }
    }
    AmbientForm {
        koszul: term.koszul.clone(),
        bundle,
        q: term.q,
        coefficient: term.coefficient.clone(),
        factors: term.monomial.iter().map(|e| factor_form(e)).collect(),
    }
}

fn export_class(c: ClassRepresentative, k: &[i64], equations: &[Vec<u32>]) -> ExportClass {
    let ambient_forms = c
        .bott_terms
        .iter()
        .map(|t| ambient_form(t, k, equations))
        .collect();
    let on_x = match (c.class_type, c.lift_truncated) {
        (0, _) => "restriction",
        (_, false) => "partition_of_unity",
        (_, true) => "lift_truncated",
    };
    ExportClass {
        degree: c.degree,
        class_type: c.class_type,
        on_x: on_x.into(),
        partition_exponents: partition_exponents(&c.lift, k.len()),
        ambient_forms,
        bott_terms: c.bott_terms,
        lift: c.lift,
        lift_truncated: c.lift_truncated,
    }
}

/// Assemble the export of an analysed model. `model` is the model's name. Representatives are computed for
/// every present multiplet (once per distinct line bundle); with `with_duals` also a basis of `H^2(X, L^*)` for
/// each multiplet's `L`. With `family` (whose member at `family.member` is the engine's), the polynomials of the
/// whole family are exported and the couplings are rational functions of its parameter.
pub fn build_export(
    model: &str,
    engine: &CohomologyEngine,
    analysis: &ModelAnalysis,
    line_bundles: &[Vec<i64>],
    with_duals: bool,
    family: Option<&crate::couplings::texture::ParameterFamily>,
) -> Result<Export, CohomologyError> {
    let config = engine.config();
    let layout = VariableLayout::new(config.dims());
    let polynomials = ExportPolynomials {
        mode: match engine.choice() {
            PolynomialChoice::Generic { .. } => "generic".into(),
            PolynomialChoice::Given(_) => "given".into(),
        },
        seed: match engine.choice() {
            PolynomialChoice::Generic { seed } => Some(*seed),
            PolynomialChoice::Given(_) => None,
        },
        equations: engine
            .polynomials()
            .iter()
            .zip(config.equations())
            .map(|(p, q)| {
                let (exponents, coefficients) =
                    p.terms().map(|(e, c)| (e.clone(), c.to_string())).unzip();
                ExportPolynomial {
                    multidegree: q.clone(),
                    exponents,
                    coefficients,
                }
            })
            .collect(),
        family: family.map(|f| ExportFamilyPolynomials {
            parameter: f.parameter.to_string(),
            value: f.member.to_string(),
            equations: f
                .polynomials
                .iter()
                .zip(config.equations())
                .map(|(p, q)| {
                    let (exponents, coefficients) = p
                        .terms()
                        .map(|(e, c)| {
                            (
                                e.clone(),
                                c.coeffs().iter().map(|x| x.to_string()).collect(),
                            )
                        })
                        .unzip();
                    ExportFamilyPolynomial {
                        multidegree: q.clone(),
                        exponents,
                        coefficients,
                    }
                })
                .collect(),
        }),
    };
    let mut reps: HashMap<Vec<i64>, Vec<ClassRepresentative>> = HashMap::new();
    let mut classes_of = |k: &[i64], degree: usize| -> Result<Vec<ExportClass>, CohomologyError> {
        if !reps.contains_key(k) {
            reps.insert(k.to_vec(), engine.representatives(k)?);
        }
        Ok(reps[k]
            .iter()
            .filter(|c| c.degree == degree)
            .cloned()
            .map(|c| export_class(c, k, config.equations()))
            .collect())
    };
    let mut multiplets = Vec::new();
    for m in analysis.spectrum.present() {
        let classes = classes_of(&m.line_bundle, 1)?;
        let dual_classes = if with_duals {
            let dual: Vec<i64> = m.line_bundle.iter().map(|&x| -x).collect();
            Some(classes_of(&dual, 2)?)
        } else {
            None
        };
        multiplets.push(ExportMultiplet {
            label: m.label.clone(),
            kind: m.kind.clone(),
            charge: m.charge.clone(),
            count: m.count,
            line_bundle: m.line_bundle.clone(),
            classes,
            dual_classes,
        });
    }
    let dims = config.dims();
    let face_forms = face_form_table(
        dims,
        multiplets
            .iter()
            .flat_map(|m| m.classes.iter().chain(m.dual_classes.iter().flatten()))
            .filter(|c| c.on_x == "partition_of_unity")
            .flat_map(|c| {
                c.lift
                    .iter()
                    .map(|t| (t.faces.as_slice(), c.partition_exponents.as_slice()))
            }),
    );
    let kahler_point = match (&analysis.slope_zero, &analysis.geometry.triple) {
        (
            SlopeZero::Exists(crate::slope::ExistsCertificate::RationalPoint { point }),
            Some(triple),
        ) => {
            let sum =
                crate::bundle::BundleSum::new(config.num_factors(), line_bundles.to_vec()).ok();
            sum.and_then(|s| crate::analysis::kahler_point_check(triple, &s, point).ok())
        }
        _ => None,
    };
    let (couplings, couplings_error) =
        match crate::bundle::BundleSum::new(config.num_factors(), line_bundles.to_vec()) {
            Ok(sum) => {
                let options = crate::couplings::CouplingOptions::default();
                let report = match family {
                    Some(f) => crate::couplings::couplings_in_family(engine, &sum, &options, f),
                    None => crate::couplings::couplings(engine, &sum, &options),
                };
                match report {
                    Ok(r) => (Some(r), None),
                    Err(e) => (None, Some(e.to_string())),
                }
            }
            Err(e) => (None, Some(e.to_string())),
        };
    Ok(Export {
        schema: EXPORT_SCHEMA.into(),
        version: EXPORT_VERSION,
        model: model.into(),
        configuration: ExportConfiguration {
            label: config.label(),
            ambient: config.dims().to_vec(),
            equations: config.equations().to_vec(),
            variables: (0..layout.nvars()).map(|v| layout.var_name(v)).collect(),
        },
        polynomials,
        geometry: analysis.geometry.clone(),
        favourability: analysis.favourability.clone(),
        slope_zero: analysis.slope_zero.clone(),
        kahler_point,
        line_bundles: line_bundles.to_vec(),
        spectrum: analysis.spectrum.clone(),
        multiplets,
        dictionary: Dictionary::standard(),
        face_forms,
        couplings,
        couplings_error,
    })
}

/// Float value of an exact coefficient string (`"p/q"` or an integer); NaN if it does not parse.
fn to_f64(text: &str) -> f64 {
    use num_traits::ToPrimitive;
    text.parse::<BigRational>()
        .ok()
        .and_then(|r| r.to_f64())
        .unwrap_or(f64::NAN)
}

/// Push the arrays `name` (nearest `f64`) and `name_exact` (the exact strings) of a list of coefficients.
fn push_coefficients(out: &mut Vec<(String, NpyArray)>, name: &str, exact: Vec<String>) {
    out.push((
        name.into(),
        NpyArray::F64 {
            shape: vec![exact.len()],
            data: exact.iter().map(|c| to_f64(c)).collect(),
        },
    ));
    out.push((format!("{name}_exact"), NpyArray::Str(exact)));
}

/// One row of `width` exponents per polynomial term.
fn exponent_table(exponents: &[Vec<u32>], width: usize) -> NpyArray {
    let rows: Vec<Vec<i64>> = exponents
        .iter()
        .map(|e| e.iter().map(|&x| x as i64).collect())
        .collect();
    i64_table(&rows, width)
}

fn i64_table(rows: &[Vec<i64>], width: usize) -> NpyArray {
    NpyArray::I64 {
        shape: vec![rows.len(), width],
        data: rows.iter().flat_map(|r| r.iter().copied()).collect(),
    }
}

impl Export {
    /// The numeric parts as named arrays for an `.npz` archive (docs/export-schema.md, "npz"): polynomial
    /// exponents and coefficients (float64 and exact strings), the multiplets and the Bott terms of every
    /// class. Forms follow from the Bott exponents by the dictionary and are not repeated.
    pub fn npz_arrays(&self) -> Vec<(String, NpyArray)> {
        let nvars = self.configuration.variables.len();
        let m = self.configuration.ambient.len();
        let mut out: Vec<(String, NpyArray)> = vec![
            ("schema".into(), NpyArray::Str(vec![self.schema.clone()])),
            (
                "version".into(),
                NpyArray::I64 {
                    shape: vec![1],
                    data: vec![self.version as i64],
                },
            ),
            (
                "variables".into(),
                NpyArray::Str(self.configuration.variables.clone()),
            ),
            (
                "ambient".into(),
                NpyArray::I64 {
                    shape: vec![m],
                    data: self
                        .configuration
                        .ambient
                        .iter()
                        .map(|&n| n as i64)
                        .collect(),
                },
            ),
            (
                "configuration_matrix".into(),
                i64_table(
                    &self
                        .configuration
                        .equations
                        .iter()
                        .map(|q| q.iter().map(|&d| d as i64).collect())
                        .collect::<Vec<_>>(),
                    m,
                ),
            ),
        ];
        for (j, p) in self.polynomials.equations.iter().enumerate() {
            out.push((
                format!("polynomial_{}_exponents", j + 1),
                exponent_table(&p.exponents, nvars),
            ));
            push_coefficients(
                &mut out,
                &format!("polynomial_{}_coefficients", j + 1),
                p.coefficients.clone(),
            );
        }
        if let Some(f) = &self.polynomials.family {
            out.push((
                "family_parameter".into(),
                NpyArray::Str(vec![f.parameter.clone(), f.value.clone()]),
            ));
            for (j, p) in f.equations.iter().enumerate() {
                out.push((
                    format!("family_polynomial_{}_exponents", j + 1),
                    exponent_table(&p.exponents, nvars),
                ));
                let (mut terms, mut exact) = (Vec::new(), Vec::new());
                for (t, cs) in p.coefficients.iter().enumerate() {
                    for (power, c) in cs.iter().enumerate().filter(|(_, c)| c.as_str() != "0") {
                        terms.push(vec![t as i64, power as i64]);
                        exact.push(c.clone());
                    }
                }
                out.push((
                    format!("family_polynomial_{}_terms", j + 1),
                    i64_table(&terms, 2),
                ));
                push_coefficients(
                    &mut out,
                    &format!("family_polynomial_{}_coefficients", j + 1),
                    exact,
                );
            }
        }
        let labels = self.multiplets.iter().map(|x| x.label.clone()).collect();
        out.push(("multiplet_labels".into(), NpyArray::Str(labels)));
        let lbs: Vec<Vec<i64>> = self
            .multiplets
            .iter()
            .map(|x| x.line_bundle.clone())
            .collect();
        out.push(("multiplet_line_bundles".into(), i64_table(&lbs, m)));
        let r = self.multiplets.first().map_or(0, |x| x.charge.len());
        let charges: Vec<Vec<i64>> = self.multiplets.iter().map(|x| x.charge.clone()).collect();
        out.push(("multiplet_charges".into(), i64_table(&charges, r)));
        out.push((
            "multiplet_counts".into(),
            NpyArray::I64 {
                shape: vec![self.multiplets.len()],
                data: self.multiplets.iter().map(|x| x.count as i64).collect(),
            },
        ));
        let (mut class_rows, mut term_rows, mut term_exps) = (Vec::new(), Vec::new(), Vec::new());
        let mut exact = Vec::new();
        for (mi, mult) in self.multiplets.iter().enumerate() {
            for (ci, class) in mult.classes.iter().enumerate() {
                class_rows.push(vec![mi as i64, ci as i64, class.class_type as i64]);
                for t in &class.bott_terms {
                    let mask: i64 = t.koszul.iter().map(|&j| 1i64 << (j - 1)).sum();
                    term_rows.push(vec![mi as i64, ci as i64, mask, t.q as i64]);
                    term_exps.push(t.monomial.iter().flatten().map(|&x| x as i64).collect());
                    exact.push(t.coefficient.clone());
                }
            }
        }
        out.push(("classes".into(), i64_table(&class_rows, 3)));
        out.push(("bott_terms".into(), i64_table(&term_rows, 4)));
        out.push(("bott_exponents".into(), i64_table(&term_exps, nvars)));
        push_coefficients(&mut out, "bott_coefficients", exact);
        self.push_partition_arrays(&mut out);
        out
    }

    /// The partition-of-unity data as arrays: per class its `on_x` and `partition_exponents`, every lift term
    /// (Koszul and face bitmasks, Laurent exponents, coefficients) and the `face_forms` table flattened to terms.
    fn push_partition_arrays(&self, out: &mut Vec<(String, NpyArray)>) {
        let nvars = self.configuration.variables.len();
        let m = self.configuration.ambient.len();
        let mask =
            |set: &[usize], shift: usize| -> i64 { set.iter().map(|&j| 1i64 << (j - shift)).sum() };
        let (mut on_x, mut exps) = (Vec::new(), Vec::new());
        let (mut rows, mut monomials, mut exact) = (Vec::new(), Vec::new(), Vec::new());
        for (mi, mult) in self.multiplets.iter().enumerate() {
            for (ci, class) in mult.classes.iter().enumerate() {
                on_x.push(class.on_x.clone());
                exps.push(
                    class
                        .partition_exponents
                        .iter()
                        .map(|&e| e as i64)
                        .collect(),
                );
                for t in &class.lift {
                    let mut row = vec![mi as i64, ci as i64, mask(&t.koszul, 1)];
                    row.extend(t.faces.iter().map(|f| mask(f, 0)));
                    rows.push(row);
                    monomials.push(t.monomial.iter().flatten().map(|&x| x as i64).collect());
                    exact.push(t.coefficient.clone());
                }
            }
        }
        out.push(("class_on_x".into(), NpyArray::Str(on_x)));
        out.push(("class_partition_exponents".into(), i64_table(&exps, m)));
        out.push(("lift_terms".into(), i64_table(&rows, 3 + m)));
        out.push(("lift_exponents".into(), i64_table(&monomials, nvars)));
        push_coefficients(out, "lift_coefficients", exact);
        let width = self
            .configuration
            .ambient
            .iter()
            .max()
            .map_or(1, |&n| n + 1);
        let pad = |v: &[u32]| -> Vec<i64> {
            let mut r: Vec<i64> = v.iter().map(|&x| x as i64).collect();
            r.resize(width, 0);
            r
        };
        let (mut frows, mut fx, mut fxbar, mut fexact) =
            (Vec::new(), Vec::new(), Vec::new(), Vec::new());
        for f in &self.face_forms {
            for t in &f.terms {
                frows.push(vec![
                    f.n as i64,
                    f.m as i64,
                    mask(&f.face, 0),
                    t.kappa_power,
                    mask(&t.dxbar, 0),
                ]);
                fx.push(pad(&t.x));
                fxbar.push(pad(&t.xbar));
                fexact.push(t.coefficient.clone());
            }
        }
        out.push(("face_form_terms".into(), i64_table(&frows, 5)));
        out.push(("face_form_x".into(), i64_table(&fx, width)));
        out.push(("face_form_xbar".into(), i64_table(&fxbar, width)));
        push_coefficients(out, "face_form_coefficients", fexact);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn top_constants() {
        // c_a = (n+k)!/(n! a!): 1 for k = 0; on P^1 with a = (1,1): 3!/(1!·1!·1!) = 6.
        assert_eq!(top_constant(2, &[0, 0, 0]), BigRational::one());
        assert_eq!(
            top_constant(1, &[1, 1]),
            BigRational::from_integer(6.into())
        );
        assert_eq!(
            top_constant(1, &[2, 0]),
            BigRational::from_integer(3.into())
        );
    }

    #[test]
    fn factor_forms() {
        let s = factor_form(&[2, 0, 1]);
        assert_eq!(s.kind, "sections");
        assert_eq!(s.terms[0].x, vec![2, 0, 1]);
        let t = factor_form(&[-2, -1]);
        assert_eq!(t.kind, "top");
        // a = (1,0), k = 1, n = 1: c = 2!/(1!·1!) = 2; terms +2 x̄_0^2 dx̄_1/κ^3 and −2 x̄_0 x̄_1 dx̄_0/κ^3.
        assert_eq!(t.terms.len(), 2);
        assert_eq!(t.terms[0].xbar, vec![2, 0]);
        assert_eq!(t.terms[0].dxbar, vec![1]);
        assert_eq!(t.terms[0].coefficient, "2");
        assert_eq!(t.terms[1].xbar, vec![1, 1]);
        assert_eq!(t.terms[1].dxbar, vec![0]);
        assert_eq!(t.terms[1].coefficient, "-2");
        assert_eq!(t.terms[1].kappa_power, -3);
    }
}
