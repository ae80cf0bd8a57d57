//! Stage two of argument handling: raw flags → checked inputs (a validated configuration, optionally a model).

use super::UserError;
use clap::Args;
use sheafwright::cohomology::{CohomologyEngine, DEFAULT_SEED, PolynomialChoice};
use sheafwright::geometry::Configuration;
use sheafwright::io::model::Model;
use sheafwright::io::model::PolynomialMode;
use std::path::{Path, PathBuf};

/// Where the configuration comes from: a model file, or inline `--ambient` and `--equations`.
#[derive(Args, Debug, Clone)]
pub struct ConfigArgs {
    /// A model file (TOML); alternatively give --ambient and --equations.
    pub model: Option<PathBuf>,
    /// Ambient projective dimensions, comma separated, e.g. 1,1,1,1 or 4.
    #[arg(long, allow_hyphen_values = true)]
    pub ambient: Option<String>,
    /// Equation multidegrees: entries comma separated, equations separated by ';', e.g. "2,2,2,2" or "3;3".
    #[arg(long, allow_hyphen_values = true)]
    pub equations: Option<String>,
}

/// Checked inputs shared by every subcommand.
#[derive(Debug, Clone)]
pub struct Inputs {
    config: Configuration,
    model: Option<Model>,
    name: String,
}

impl Inputs {
    /// Resolve [`ConfigArgs`]: exactly one of a model file or the inline pair.
    pub fn from_args(a: &ConfigArgs) -> Result<Inputs, UserError> {
        match (&a.model, &a.ambient, &a.equations) {
            (Some(path), None, None) => Inputs::from_model_path(path),
            (None, Some(amb), Some(eqs)) => {
                let dims = parse_int_list(amb, "--ambient")?;
                let equations = parse_equations(eqs)?;
                let config = Configuration::new(&dims, &equations)
                    .map_err(|e| UserError(format!("--ambient/--equations: {e}")))?;
                let name = config.label();
                Ok(Inputs {
                    config,
                    model: None,
                    name,
                })
            }
            (Some(_), _, _) => Err(UserError(
                "give either a model file or --ambient/--equations, not both".into(),
            )),
            (None, Some(_), None) => Err(UserError("--ambient needs --equations".into())),
            (None, None, Some(_)) => Err(UserError("--equations needs --ambient".into())),
            (None, None, None) => Err(UserError(
                "no configuration: give a model file or --ambient and --equations".into(),
            )),
        }
    }

    /// Load a model file.
    pub fn from_model_path(path: &Path) -> Result<Inputs, UserError> {
        let model = Model::load(path).map_err(|e| UserError(format!("{}: {e}", path.display())))?;
        Ok(Inputs {
            config: model.config().clone(),
            name: model.name.clone(),
            model: Some(model),
        })
    }

    pub fn config(&self) -> &Configuration {
        &self.config
    }
    pub fn model(&self) -> Option<&Model> {
        self.model.as_ref()
    }
    pub fn name(&self) -> &str {
        &self.name
    }
}

/// Largest number of entries accepted in one inline list (guards against absurd input).
const MAX_LIST: usize = 64;

/// Parse `"1,-2,3"` into integers, naming `flag` in errors.
pub fn parse_int_list(text: &str, flag: &str) -> Result<Vec<i64>, UserError> {
    let parts: Vec<&str> = text.split(',').map(str::trim).collect();
    if parts.len() > MAX_LIST {
        return Err(UserError(format!(
            "{flag}: {} entries is too many (limit {MAX_LIST})",
            parts.len()
        )));
    }
    parts
        .iter()
        .map(|p| {
            p.parse::<i64>().map_err(|_| {
                UserError(format!(
                    "{flag}: {p:?} is not an integer (expected a comma-separated list like 1,-2,3)"
                ))
            })
        })
        .collect()
}

/// Parse `"2,2;1,3"` into equation multidegrees.
pub fn parse_equations(text: &str) -> Result<Vec<Vec<i64>>, UserError> {
    text.split(';')
        .map(|e| parse_int_list(e, "--equations"))
        .collect()
}

/// How the defining polynomials are chosen (`--mode`, `--seed`).
#[derive(Args, Debug, Clone, Default)]
pub struct PolyArgs {
    /// "generic" (random integer coefficients from --seed) or "given" (the model file's polynomials).
    /// Default: the model file's choice, else generic.
    #[arg(long)]
    pub mode: Option<String>,
    /// Seed of the generic coefficients (default: the model file's, else 20261202).
    #[arg(long)]
    pub seed: Option<u64>,
}

impl PolyArgs {
    /// The polynomial mode in effect: `--mode`, else the model file's, else generic.
    pub fn effective_mode(&self, inputs: &Inputs) -> Result<PolynomialMode, UserError> {
        let model_mode = inputs
            .model()
            .map(|m| m.mode())
            .unwrap_or(PolynomialMode::Generic);
        match self.mode.as_deref() {
            None => Ok(model_mode),
            Some("generic") => Ok(PolynomialMode::Generic),
            Some("given") => Ok(PolynomialMode::Given),
            Some(other) => Err(UserError(format!(
                "--mode: unknown mode {other:?}; use generic or given"
            ))),
        }
    }

    /// Build the cohomology engine for these inputs.
    pub fn engine(&self, inputs: &Inputs) -> Result<CohomologyEngine, UserError> {
        let mode = self.effective_mode(inputs)?;
        let choice = match mode {
            PolynomialMode::Generic => PolynomialChoice::Generic {
                seed: self
                    .seed
                    .or_else(|| inputs.model().and_then(|m| m.seed()))
                    .unwrap_or(DEFAULT_SEED),
            },
            PolynomialMode::Given => {
                let polys = inputs
                    .model()
                    .and_then(|m| m.polynomials())
                    .ok_or_else(|| {
                        UserError(
                            "--mode given needs a model file whose equations all give a polynomial"
                                .into(),
                        )
                    })?;
                PolynomialChoice::Given(polys.to_vec())
            }
        };
        Ok(CohomologyEngine::new(inputs.config(), choice)?)
    }
}

/// Parse one line bundle and check its length against the number of ambient factors.
pub fn parse_bundle(text: &str, m: usize, flag: &str) -> Result<Vec<i64>, UserError> {
    let k = parse_int_list(text, flag)?;
    sheafwright::io::model::check_bundle(&k, m)
        .map_err(|e| UserError(format!("{flag} {text}: {e}")))?;
    Ok(k)
}

/// Parse a box `LO..HI` (inclusive), e.g. `-3..3`.
pub fn parse_box(text: &str) -> Result<(i64, i64), UserError> {
    let bad = || UserError(format!("--box: {text:?} is not a range like -3..3"));
    let (a, b) = text.split_once("..").ok_or_else(bad)?;
    let lo: i64 = a.trim().parse().map_err(|_| bad())?;
    let hi: i64 = b
        .trim()
        .trim_start_matches('=')
        .parse()
        .map_err(|_| bad())?;
    if lo > hi {
        return Err(UserError(format!("--box: empty range {lo}..{hi}")));
    }
    Ok((lo, hi))
}

/// The bundle sum: `--bundles` if given, else the model file's `[bundle]` section.
pub fn bundle_sum(
    inputs: &Inputs,
    inline: Option<&str>,
) -> Result<sheafwright::bundle::BundleSum, UserError> {
    let m = inputs.config().num_factors();
    match inline {
        Some(text) => sheafwright::bundle::BundleSum::parse_inline_with_m(text, m)
            .map_err(|e| UserError(format!("--bundles: {e}"))),
        None => {
            let lbs = inputs
                .model()
                .and_then(|md| md.line_bundles())
                .ok_or_else(|| {
                    UserError(
                        "no line bundles: give --bundles or a model file with a [bundle] section"
                            .into(),
                    )
                })?;
            Ok(sheafwright::bundle::BundleSum::new(m, lbs.to_vec())?)
        }
    }
}
