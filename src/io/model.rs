//! The model file: a TOML document in sheafwright's own schema (documented in `docs/model-file.md`).
//!
//! Loading goes through a shadow struct ([`RawModel`], plain serde data) and a validating conversion into
//! [`Model`], so a `Model` always holds a valid Calabi-Yau [`Configuration`], polynomials of the declared
//! multidegrees (all equations or none), line bundles of the right length and rank, and a Kähler point with
//! positive entries. Errors name the offending field.
//!
//! A model may name one symbolic coefficient (`[cohomology] parameter = "psi"`): the polynomials are then kept as
//! [`ParametricPolynomial`]s ([`Model::parameter`]) and [`Model::polynomials`] holds their specialisation at
//! `parameter_value` (default 0), which must itself be a valid equation.

use crate::geometry::{ConfigError, Configuration};
use crate::poly::parametric::{ParametricPolynomial, is_valid_parameter_name};
use crate::poly::{PolyError, Polynomial, VariableLayout};
use crate::symmetry::action::{MonomialMap, parse_coordinate};
use crate::symmetry::{GeneratorSpec, SymmetrySpec};
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{Signed, Zero};
use serde::Deserialize;
use std::path::Path;
use thiserror::Error;

/// Largest model file read (bytes); larger files are refused before parsing.
pub const MAX_MODEL_FILE_BYTES: u64 = 4 << 20;
/// Largest absolute value of a line-bundle entry.
pub const MAX_BUNDLE_ENTRY: i64 = 1000;

/// Why a model file was refused.
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum ModelError {
    #[error("cannot read {path}: {source}")]
    Read {
        path: String,
        source: std::io::Error,
    },
    #[error("{path} is {size} bytes; model files are limited to {MAX_MODEL_FILE_BYTES} bytes")]
    TooBig { path: String, size: u64 },
    #[error("malformed TOML: {0}")]
    Toml(String),
    #[error("field `{field}`: {source}")]
    Config {
        field: &'static str,
        source: ConfigError,
    },
    #[error("field `equations[{index}].polynomial`: {source}")]
    Polynomial { index: usize, source: PolyError },
    #[error("field `{field}`: {message}")]
    Invalid { field: String, message: String },
}

/// The TOML shadow of a model file: plain data, no invariants. Unknown keys are refused so typos are caught.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawModel {
    pub name: Option<String>,
    pub notes: Option<String>,
    pub ambient: RawAmbient,
    pub equations: Vec<RawEquation>,
    pub bundle: Option<RawBundle>,
    pub kahler: Option<RawKahler>,
    pub cohomology: Option<RawCohomology>,
    /// A finite group acting on the coordinates (see `docs/model-file.md`).
    pub symmetry: Option<RawSymmetry>,
}

/// `[symmetry]`: generators acting on the homogeneous coordinates, optional lifts and Wilson line.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawSymmetry {
    /// `N`: phases (and lift / Wilson-line values) are exponents `k` of `ζ_N = exp(2πi/N)`; default 1.
    pub phase_order: Option<i64>,
    pub generators: Vec<RawGenerator>,
    /// Per line bundle of `[bundle]`: the lift's value on each generator (exponents of `ζ_N`).
    pub lifts: Option<Vec<Vec<i64>>>,
    /// The Wilson line's value on each generator (exponents of `ζ_N`).
    pub wilson_line: Option<Vec<i64>>,
}

/// One `[[symmetry.generators]]` entry.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawGenerator {
    pub name: Option<String>,
    /// The image coordinate of every coordinate, in order (`x1_0, x1_1, …`); default: identity.
    pub images: Option<Vec<String>>,
    /// The phase exponent `k` of every coordinate (`x ↦ ζ_N^k x'`); default: zeros.
    pub phases: Option<Vec<i64>>,
}

/// Largest `phase_order` accepted.
pub const MAX_PHASE_ORDER: i64 = 1000;
/// Largest number of generators accepted.
pub const MAX_GENERATORS: usize = 8;

fn symmetry_spec(
    raw: RawSymmetry,
    layout: &VariableLayout,
    bundles: Option<usize>,
) -> Result<SymmetrySpec, ModelError> {
    let invalid = |field: String, message: String| ModelError::Invalid { field, message };
    let n = raw.phase_order.unwrap_or(1);
    if !(1..=MAX_PHASE_ORDER).contains(&n) {
        return Err(invalid(
            "symmetry.phase_order".into(),
            format!("{n} is out of range (1..={MAX_PHASE_ORDER})"),
        ));
    }
    let n = n as u32;
    if raw.generators.is_empty() || raw.generators.len() > MAX_GENERATORS {
        return Err(invalid(
            "symmetry.generators".into(),
            format!(
                "give between 1 and {MAX_GENERATORS} generators, not {}",
                raw.generators.len()
            ),
        ));
    }
    let nv = layout.nvars();
    let mut generators = Vec::new();
    for (g, rg) in raw.generators.into_iter().enumerate() {
        let name = rg.name.unwrap_or_else(|| format!("g{}", g + 1));
        let field = format!("symmetry.generators[{g}] ({name})");
        let image = match rg.images {
            None => (0..nv).collect(),
            Some(list) => {
                if list.len() != nv {
                    return Err(invalid(
                        field,
                        format!("images has {} entries for {nv} coordinates", list.len()),
                    ));
                }
                let mut out = Vec::with_capacity(nv);
                for s in &list {
                    out.push(parse_coordinate(s, layout).map_err(|m| invalid(field.clone(), m))?);
                }
                out
            }
        };
        let phase = match rg.phases {
            None => vec![0; nv],
            Some(p) => p,
        };
        let map = MonomialMap::new(layout, image, phase, n).map_err(|m| invalid(field, m))?;
        generators.push(GeneratorSpec { name, map });
    }
    let ng = generators.len();
    if let Some(lifts) = &raw.lifts {
        match bundles {
            None => {
                return Err(invalid(
                    "symmetry.lifts".into(),
                    "lifts need a [bundle] section".into(),
                ));
            }
            Some(r) if r != lifts.len() => {
                return Err(invalid(
                    "symmetry.lifts".into(),
                    format!("has {} entries for {r} line bundles", lifts.len()),
                ));
            }
            _ => {}
        }
        for (a, l) in lifts.iter().enumerate() {
            if l.len() != ng {
                return Err(invalid(
                    format!("symmetry.lifts[{a}]"),
                    format!("has {} values for {ng} generators", l.len()),
                ));
            }
        }
    }
    if let Some(w) = &raw.wilson_line
        && w.len() != ng
    {
        {
            return Err(invalid(
                "symmetry.wilson_line".into(),
                format!("has {} values for {ng} generators", w.len()),
            ));
        }
    }
    Ok(SymmetrySpec {
        phase_order: n,
        generators,
        lifts: raw.lifts,
        wilson_line: raw.wilson_line,
    })
}

/// `[ambient]`.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawAmbient {
    pub dims: Vec<i64>,
}

/// One `[[equations]]` entry.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawEquation {
    pub multidegree: Vec<i64>,
    pub polynomial: Option<String>,
}

/// `[bundle]`.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawBundle {
    pub line_bundles: Vec<Vec<i64>>,
}

/// `[kahler]`: a point `t` of the Kähler cone, entries as integers or strings such as `"3/2"`.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawKahler {
    pub point: Vec<toml::Value>,
}

/// `[cohomology]`: how line-bundle cohomology is computed for this model.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawCohomology {
    /// `"generic"` or `"given"`.
    pub mode: Option<String>,
    pub seed: Option<u64>,
    /// Name of the one symbolic coefficient allowed in the polynomials, e.g. `"psi"`.
    pub parameter: Option<String>,
    /// The value used where one member is needed (integer or string like `"3/2"`; default 0).
    pub parameter_value: Option<toml::Value>,
}

/// The symbolic parameter of a model: its name, the parametric polynomials and the value of the member held by
/// [`Model::polynomials`].
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ModelParameter {
    pub name: String,
    pub polynomials: Vec<ParametricPolynomial>,
    pub value: BigRational,
}

/// How the defining polynomials are chosen for cohomology computations.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum PolynomialMode {
    /// Random integer coefficients from a seed: the answer for a generic member of the family.
    Generic,
    /// The polynomials written in the model file, exactly.
    Given,
}

/// A validated model (see the module invariant).
#[derive(Clone, Debug)]
pub struct Model {
    pub name: String,
    pub notes: Option<String>,
    config: Configuration,
    polynomials: Option<Vec<Polynomial>>,
    line_bundles: Option<Vec<Vec<i64>>>,
    kahler_point: Option<Vec<BigRational>>,
    mode: Option<PolynomialMode>,
    seed: Option<u64>,
    parameter: Option<ModelParameter>,
    symmetry: Option<SymmetrySpec>,
}

impl Model {
    /// Read and validate a model file.
    pub fn load(path: &Path) -> Result<Model, ModelError> {
        let shown = path.display().to_string();
        let meta = std::fs::metadata(path).map_err(|source| ModelError::Read {
            path: shown.clone(),
            source,
        })?;
        if meta.len() > MAX_MODEL_FILE_BYTES {
            return Err(ModelError::TooBig {
                path: shown,
                size: meta.len(),
            });
        }
        let text = std::fs::read_to_string(path).map_err(|source| ModelError::Read {
            path: shown.clone(),
            source,
        })?;
        let default_name = path
            .file_stem()
            .map(|s| s.to_string_lossy().into_owned())
            .unwrap_or_default();
        Model::from_toml_str(&text, &default_name)
    }

    /// Parse and validate model text; `default_name` is used when the file has no `name`.
    pub fn from_toml_str(text: &str, default_name: &str) -> Result<Model, ModelError> {
        let raw: RawModel = toml::from_str(text)
            .map_err(|e| ModelError::Toml(e.to_string().lines().collect::<Vec<_>>().join(" ")))?;
        Model::try_from_raw(raw, default_name)
    }

    /// The validating conversion from the shadow struct.
    pub fn try_from_raw(raw: RawModel, default_name: &str) -> Result<Model, ModelError> {
        let degrees: Vec<Vec<i64>> = raw
            .equations
            .iter()
            .map(|e| e.multidegree.clone())
            .collect();
        let config = Configuration::new(&raw.ambient.dims, &degrees).map_err(|source| {
            ModelError::Config {
                field: if matches!(
                    source,
                    ConfigError::NoFactors
                        | ConfigError::NonPositiveDimension { .. }
                        | ConfigError::TooLarge { .. }
                ) {
                    "ambient.dims"
                } else {
                    "equations"
                },
                source,
            }
        })?;
        let layout = VariableLayout::new(config.dims());
        let given: Vec<Option<&String>> = raw
            .equations
            .iter()
            .map(|e| e.polynomial.as_ref())
            .collect();
        let parameter_name = raw.cohomology.as_ref().and_then(|c| c.parameter.clone());
        if let Some(name) = &parameter_name {
            if !is_valid_parameter_name(name) {
                return Err(ModelError::Invalid {
                    field: "cohomology.parameter".into(),
                    message: format!(
                        "{name:?} is not a parameter name: use a letter followed by letters, digits or '_' (at most 32), not a coordinate name like x1_0"
                    ),
                });
            }
            if given.iter().any(Option::is_none) {
                return Err(ModelError::Invalid {
                    field: "cohomology.parameter".into(),
                    message: "a parameter needs a polynomial in every equation".into(),
                });
            }
        }
        let mut parameter = None;
        let polynomials = if given.iter().all(Option::is_none) {
            None
        } else if let Some(missing) = given.iter().position(Option::is_none) {
            return Err(ModelError::Invalid {
                field: format!("equations[{missing}].polynomial"),
                message: "either every equation gives a polynomial or none does".into(),
            });
        } else if let Some(name) = parameter_name {
            let value = match raw
                .cohomology
                .as_ref()
                .and_then(|c| c.parameter_value.as_ref())
            {
                None => BigRational::zero(),
                Some(v) => parse_rational_value(v).map_err(|message| ModelError::Invalid {
                    field: "cohomology.parameter_value".into(),
                    message,
                })?,
            };
            let mut family = Vec::new();
            let mut out = Vec::new();
            for (index, (text, q)) in given.iter().zip(config.equations()).enumerate() {
                let p = ParametricPolynomial::parse(text.expect("checked above"), &layout, &name)
                    .and_then(|p| p.check_multidegree(&layout, q).map(|_| p))
                    .map_err(|source| ModelError::Polynomial { index, source })?;
                let at = p.eval(&value);
                at.check_equation(&layout, q)
                    .map_err(|source| ModelError::Invalid {
                        field: format!("equations[{index}].polynomial"),
                        message: format!(
                            "at {name} = {value} (cohomology.parameter_value): {source}"
                        ),
                    })?;
                family.push(p);
                out.push(at);
            }
            parameter = Some(ModelParameter {
                name,
                polynomials: family,
                value,
            });
            Some(out)
        } else {
            if let Some(c) = &raw.cohomology
                && c.parameter_value.is_some()
            {
                return Err(ModelError::Invalid {
                    field: "cohomology.parameter_value".into(),
                    message: "needs cohomology.parameter".into(),
                });
            }
            let mut out = Vec::new();
            for (index, (text, q)) in given.iter().zip(config.equations()).enumerate() {
                let p = Polynomial::parse(text.expect("checked above"), &layout)
                    .and_then(|p| p.check_equation(&layout, q).map(|_| p))
                    .map_err(|source| ModelError::Polynomial { index, source })?;
                out.push(p);
            }
            Some(out)
        };
        let m = config.num_factors();
        let line_bundles = match raw.bundle {
            None => None,
            Some(b) => {
                if !(3..=5).contains(&b.line_bundles.len()) {
                    return Err(ModelError::Invalid {
                        field: "bundle.line_bundles".into(),
                        message: format!(
                            "rank {} is not supported: a line-bundle sum needs rank 5 (SU(5)), 4 (SO(10)) or 3 (E6)",
                            b.line_bundles.len()
                        ),
                    });
                }
                for (a, k) in b.line_bundles.iter().enumerate() {
                    check_bundle(k, m).map_err(|message| ModelError::Invalid {
                        field: format!("bundle.line_bundles[{a}]"),
                        message,
                    })?;
                }
                Some(b.line_bundles)
            }
        };
        let kahler_point = match raw.kahler {
            None => None,
            Some(k) => {
                if k.point.len() != m {
                    return Err(ModelError::Invalid {
                        field: "kahler.point".into(),
                        message: format!(
                            "has {} entries but the ambient space has {m} factors",
                            k.point.len()
                        ),
                    });
                }
                let mut out = Vec::with_capacity(m);
                for (i, v) in k.point.iter().enumerate() {
                    let q = parse_rational_value(v).map_err(|message| ModelError::Invalid {
                        field: format!("kahler.point[{i}]"),
                        message,
                    })?;
                    if !q.is_positive() {
                        return Err(ModelError::Invalid {
                            field: format!("kahler.point[{i}]"),
                            message: format!("{q} is not positive: Kähler parameters must be > 0"),
                        });
                    }
                    out.push(q);
                }
                Some(out)
            }
        };
        let (mode, seed) = match raw.cohomology {
            None => (None, None),
            Some(c) => {
                let mode = match c.mode.as_deref() {
                    None => None,
                    Some("generic") => Some(PolynomialMode::Generic),
                    Some("given") => {
                        if polynomials.is_none() {
                            return Err(ModelError::Invalid {
                                field: "cohomology.mode".into(),
                                message: "mode \"given\" needs a polynomial in every equation"
                                    .into(),
                            });
                        }
                        Some(PolynomialMode::Given)
                    }
                    Some(other) => {
                        return Err(ModelError::Invalid {
                            field: "cohomology.mode".into(),
                            message: format!(
                                "unknown mode {other:?}; use \"generic\" or \"given\""
                            ),
                        });
                    }
                };
                (mode, c.seed)
            }
        };
        let symmetry = match raw.symmetry {
            None => None,
            Some(rs) => Some(symmetry_spec(
                rs,
                &layout,
                line_bundles.as_ref().map(Vec::len),
            )?),
        };
        Ok(Model {
            name: raw.name.unwrap_or_else(|| default_name.to_string()),
            notes: raw.notes,
            config,
            polynomials,
            line_bundles,
            kahler_point,
            mode,
            seed,
            parameter,
            symmetry,
        })
    }

    /// The validated configuration.
    pub fn config(&self) -> &Configuration {
        &self.config
    }
    /// The explicit polynomials, when the file gives them (one per equation).
    pub fn polynomials(&self) -> Option<&[Polynomial]> {
        self.polynomials.as_deref()
    }
    /// The line bundles of the bundle sum, when given.
    pub fn line_bundles(&self) -> Option<&[Vec<i64>]> {
        self.line_bundles.as_deref()
    }
    /// The Kähler point, when given.
    pub fn kahler_point(&self) -> Option<&[BigRational]> {
        self.kahler_point.as_deref()
    }
    /// The polynomial mode: the file's choice, else `Given` when polynomials are present, else `Generic`.
    pub fn mode(&self) -> PolynomialMode {
        self.mode.unwrap_or(if self.polynomials.is_some() {
            PolynomialMode::Given
        } else {
            PolynomialMode::Generic
        })
    }
    /// The symbolic parameter, when the file names one (`cohomology.parameter`).
    pub fn parameter(&self) -> Option<&ModelParameter> {
        self.parameter.as_ref()
    }
    /// The seed for generic coefficients, when the file fixes one.
    pub fn seed(&self) -> Option<u64> {
        self.seed
    }
    /// The validated `[symmetry]` section.
    pub fn symmetry(&self) -> Option<&SymmetrySpec> {
        self.symmetry.as_ref()
    }
}

/// Check one line bundle's entries: length `m`, each of absolute value at most [`MAX_BUNDLE_ENTRY`].
pub fn check_bundle(k: &[i64], m: usize) -> Result<(), String> {
    if k.len() != m {
        return Err(format!(
            "has {} entries but the ambient space has {m} factors",
            k.len()
        ));
    }
    if let Some(bad) = k.iter().find(|v| v.abs() > MAX_BUNDLE_ENTRY) {
        return Err(format!(
            "entry {bad} is out of range (|entry| <= {MAX_BUNDLE_ENTRY})"
        ));
    }
    Ok(())
}

/// Parse a rational from a TOML integer or a string like `"3/2"`.
pub fn parse_rational_value(v: &toml::Value) -> Result<BigRational, String> {
    match v {
        toml::Value::Integer(i) => Ok(BigRational::from_integer(BigInt::from(*i))),
        toml::Value::String(s) => parse_rational(s),
        other => Err(format!(
            "expected an integer or a string like \"3/2\", found {}",
            other.type_str()
        )),
    }
}

/// Parse `"p"` or `"p/q"` (integers, optional sign) as an exact rational.
pub fn parse_rational(s: &str) -> Result<BigRational, String> {
    let s = s.trim();
    let (num, den) = match s.split_once('/') {
        Some((a, b)) => (a.trim(), b.trim()),
        None => (s, "1"),
    };
    let n: BigInt = num
        .parse()
        .map_err(|_| format!("{s:?} is not a rational number like 3/2"))?;
    let d: BigInt = den
        .parse()
        .map_err(|_| format!("{s:?} is not a rational number like 3/2"))?;
    if d.is_zero() {
        return Err(format!("{s:?} has a zero denominator"));
    }
    Ok(BigRational::new(n, d))
}

#[cfg(test)]
mod tests {
    use super::*;

    const GOOD: &str = r#"
name = "t"
[ambient]
dims = [1, 1, 1, 1]
[[equations]]
multidegree = [2, 2, 2, 2]
[bundle]
line_bundles = [[1,0,0,-1],[0,1,-1,0],[-1,-1,1,1]]
[kahler]
point = [1, "3/2", 2, 1]
"#;

    #[test]
    fn loads_a_good_model() {
        let m = Model::from_toml_str(GOOD, "x").unwrap();
        assert_eq!(m.config().dims(), &[1, 1, 1, 1]);
        assert_eq!(m.line_bundles().unwrap().len(), 3);
        assert_eq!(m.mode(), PolynomialMode::Generic);
    }

    #[test]
    fn names_the_bad_field() {
        let bad = GOOD.replace("[1,0,0,-1]", "[1,0,0]");
        let e = Model::from_toml_str(&bad, "x").unwrap_err().to_string();
        assert!(e.contains("bundle.line_bundles[0]"), "{e}");
        let bad = GOOD.replace("\"3/2\"", "\"-3/2\"");
        let e = Model::from_toml_str(&bad, "x").unwrap_err().to_string();
        assert!(e.contains("kahler.point[1]"), "{e}");
        let bad = GOOD.replace("dims = [1, 1, 1, 1]", "dimz = [1]");
        assert!(matches!(
            Model::from_toml_str(&bad, "x"),
            Err(ModelError::Toml(_))
        ));
        let bad = GOOD.replace("[2, 2, 2, 2]", "[2, 2, 2, 1]");
        let e = Model::from_toml_str(&bad, "x").unwrap_err().to_string();
        assert!(e.contains("not Calabi-Yau"), "{e}");
    }

    const FAMILY: &str = r#"
[ambient]
dims = [1, 1]
[[equations]]
multidegree = [2, 2]
polynomial = "x1_0^2*x2_0^2 + x1_1^2*x2_1^2 + (1 - psi)*x1_0*x1_1*x2_0*x2_1"
[cohomology]
mode = "given"
parameter = "psi"
parameter_value = "3/2"
"#;

    #[test]
    fn loads_a_parameter_and_its_member() {
        // P1×P1 with a (2,2) curve is not a threefold but is a valid Calabi-Yau configuration (an elliptic curve).
        let m = Model::from_toml_str(FAMILY, "x").unwrap();
        let par = m.parameter().unwrap();
        assert_eq!(par.name, "psi");
        assert_eq!(par.value, BigRational::new(3.into(), 2.into()));
        let layout = VariableLayout::new(&[1, 1]);
        let expected = Polynomial::parse(
            "x1_0^2*x2_0^2 + x1_1^2*x2_1^2 - 1/2*x1_0*x1_1*x2_0*x2_1",
            &layout,
        );
        assert_eq!(m.polynomials().unwrap()[0], expected.unwrap());
        // The default value 0 is used without parameter_value.
        let m =
            Model::from_toml_str(&FAMILY.replace("parameter_value = \"3/2\"\n", ""), "x").unwrap();
        assert!(m.parameter().unwrap().value.is_zero());
        // Bad names, a degenerate member and a stray value are refused with the field named.
        let e = Model::from_toml_str(&FAMILY.replace("\"psi\"", "\"x1_0\""), "x")
            .unwrap_err()
            .to_string();
        assert!(e.contains("cohomology.parameter"), "{e}");
        let degenerate = FAMILY
            .replace("x1_0^2*x2_0^2 + x1_1^2*x2_1^2 + ", "psi*x1_0^2*x2_0^2 + ")
            .replace("\"3/2\"", "0");
        let e = Model::from_toml_str(&degenerate, "x")
            .unwrap_err()
            .to_string();
        assert!(e.contains("at psi = 0"), "{e}");
        let stray = FAMILY
            .replace("parameter = \"psi\"\n", "")
            .replace("(1 - psi)", "2");
        let e = Model::from_toml_str(&stray, "x").unwrap_err().to_string();
        assert!(e.contains("cohomology.parameter_value"), "{e}");
        let e = Model::from_toml_str(&FAMILY.replace("psi)", "phi)"), "x")
            .unwrap_err()
            .to_string();
        assert!(e.contains("unknown name"), "{e}");
    }

    #[test]
    fn symmetry_section_is_typed_and_validated() {
        let sym = format!(
            "{GOOD}[symmetry]\nphase_order = 2\nwilson_line = [1]\n[[symmetry.generators]]\nname = \"a\"\nphases = [0,1,0,1,0,1,0,1]\n"
        );
        let m = Model::from_toml_str(&sym, "x").unwrap();
        let s = m.symmetry().unwrap();
        assert_eq!(s.phase_order, 2);
        assert_eq!(s.generators[0].name, "a");
        // A generator mapping P^1 coordinates into two different factors breaks the ambient structure.
        let bad = sym.replace(
            "phases = [0,1,0,1,0,1,0,1]",
            "images = [\"x1_0\", \"x2_0\", \"x1_1\", \"x2_1\", \"x3_0\", \"x3_1\", \"x4_0\", \"x4_1\"]",
        );
        let e = Model::from_toml_str(&bad, "x").unwrap_err().to_string();
        assert!(
            e.contains("symmetry.generators[0] (a)") && e.contains("ambient structure"),
            "{e}"
        );
        let bad = sym.replace("wilson_line = [1]", "wilson_line = [1, 2]");
        let e = Model::from_toml_str(&bad, "x").unwrap_err().to_string();
        assert!(e.contains("symmetry.wilson_line"), "{e}");
        let bad = sym.replace("phase_order = 2", "phase_order = 0");
        assert!(Model::from_toml_str(&bad, "x").is_err());
    }
}
