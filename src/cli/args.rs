//! Stage two of argument handling: raw flags → checked inputs (a validated configuration, optionally a model).

use super::UserError;
use clap::Args;
use sheafwright::geometry::Configuration;
use sheafwright::io::model::Model;
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
