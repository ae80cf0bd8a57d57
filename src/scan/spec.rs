//! The scan file: a configuration (the model-file sections `[ambient]`, `[[equations]]`, `[cohomology]`) plus a
//! `[scan]` section with the rank, the box of line-bundle entries, the family target and the filters.
//!
//! Invariant: a [`ScanSpec`] only exists validated (rank 3..5, a non-empty box within the entry limit, a
//! positive symmetry order, known filter names); the configuration went through the model loader.

use super::ScanError;
use crate::io::model::{MAX_BUNDLE_ENTRY, Model, RawModel};
use serde::{Deserialize, Serialize};
use std::path::Path;

/// Largest scan file read (bytes).
pub const MAX_SCAN_FILE_BYTES: u64 = 1 << 20;

/// One screening filter. [`Filter::ALL`] is the order in which they are applied (cheap to expensive).
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Filter {
    /// `c1(V) = 0` (always on; automatic for enumerated sums, checked for catalog models).
    C1,
    /// `index(V) = −families · |Γ|`.
    Index,
    /// The anomaly bound `c2(TX) − c2(V) ≥ 0` (favourable basis).
    Anomaly,
    /// No slope (or slope combination) of constant sign on the Kähler cone.
    SlopeSign,
    /// A certified common zero of all slopes in the Kähler cone.
    SlopeZero,
    /// From cohomology: no anti-families, no chiral exotics, net families equal to −index.
    Cohomology,
    /// A Higgs candidate is present.
    Higgs,
}

impl Filter {
    /// Every filter, in application order.
    pub const ALL: [Filter; 7] = [
        Filter::C1,
        Filter::Index,
        Filter::Anomaly,
        Filter::SlopeSign,
        Filter::SlopeZero,
        Filter::Cohomology,
        Filter::Higgs,
    ];

    /// The name used in scan files and JSON.
    pub fn name(self) -> &'static str {
        match self {
            Filter::C1 => "c1",
            Filter::Index => "index",
            Filter::Anomaly => "anomaly",
            Filter::SlopeSign => "slope_sign",
            Filter::SlopeZero => "slope_zero",
            Filter::Cohomology => "cohomology",
            Filter::Higgs => "higgs",
        }
    }

    /// Parse a filter name (`"all"` is handled by [`parse_filter_list`]).
    pub fn from_name(s: &str) -> Option<Filter> {
        Filter::ALL.into_iter().find(|f| f.name() == s)
    }

    /// Position in [`Filter::ALL`].
    pub fn position(self) -> usize {
        Filter::ALL.iter().position(|f| *f == self).expect("listed")
    }
}

/// Parse filter names; `"all"` selects every filter. `c1` is always included. The result is in application order.
pub fn parse_filter_list(names: &[String]) -> Result<Vec<Filter>, ScanError> {
    let mut out = vec![Filter::C1];
    for n in names {
        if n == "all" {
            out.extend(Filter::ALL);
            continue;
        }
        out.push(Filter::from_name(n).ok_or_else(|| {
            ScanError::Spec(format!(
                "unknown filter {n:?}; known: all, {}",
                Filter::ALL.map(Filter::name).join(", ")
            ))
        })?);
    }
    out.sort();
    out.dedup();
    Ok(out)
}

/// What every candidate is screened against.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct FilterSettings {
    /// Order `|Γ|` of the freely acting symmetry.
    pub symmetry_order: u64,
    /// Target number of families downstairs: the index filter asks `index(V) = −families · |Γ|`.
    pub families: i64,
    /// The filters, in application order.
    pub filters: Vec<Filter>,
}

impl FilterSettings {
    /// Checked constructor.
    pub fn new(
        symmetry_order: u64,
        families: i64,
        filters: Vec<Filter>,
    ) -> Result<Self, ScanError> {
        if symmetry_order == 0 || symmetry_order > 1_000_000 {
            return Err(ScanError::Spec(format!(
                "symmetry_order {symmetry_order} must lie in 1..=1000000"
            )));
        }
        if families.abs() > 1_000_000 {
            return Err(ScanError::Spec(format!("families {families} is absurd")));
        }
        Ok(FilterSettings {
            symmetry_order,
            families,
            filters,
        })
    }

    /// Whether `f` is applied.
    pub fn has(&self, f: Filter) -> bool {
        self.filters.contains(&f)
    }

    /// The index the index filter asks for, `−families · |Γ|`.
    pub fn target_index(&self) -> i64 {
        -self.families * self.symmetry_order as i64
    }
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawScan {
    rank: usize,
    entries: Vec<i64>,
    symmetry_order: Option<u64>,
    families: Option<i64>,
    filters: Option<Vec<String>>,
}

/// A validated scan file.
#[derive(Clone, Debug)]
pub struct ScanSpec {
    /// The configuration and polynomial choice (a model without line bundles).
    pub model: Model,
    /// Number of line bundles (3, 4 or 5).
    pub rank: usize,
    /// Smallest entry of the box.
    pub lo: i64,
    /// Largest entry of the box.
    pub hi: i64,
    /// Filters and the family target.
    pub settings: FilterSettings,
    /// The scan file text (part of the checkpoint fingerprint).
    pub text: String,
}

impl ScanSpec {
    /// Read and validate a scan file.
    pub fn load(path: &Path) -> Result<ScanSpec, ScanError> {
        let shown = path.display().to_string();
        let meta = std::fs::metadata(path).map_err(|e| ScanError::Spec(format!("{shown}: {e}")))?;
        if meta.len() > MAX_SCAN_FILE_BYTES {
            return Err(ScanError::Spec(format!(
                "{shown}: {} bytes is too large for a scan file",
                meta.len()
            )));
        }
        let text =
            std::fs::read_to_string(path).map_err(|e| ScanError::Spec(format!("{shown}: {e}")))?;
        let stem = path
            .file_stem()
            .map(|s| s.to_string_lossy().into_owned())
            .unwrap_or_default();
        ScanSpec::from_toml_str(&text, &stem).map_err(|e| ScanError::Spec(format!("{shown}: {e}")))
    }

    /// Parse and validate scan-file text.
    pub fn from_toml_str(text: &str, default_name: &str) -> Result<ScanSpec, ScanError> {
        let mut value: toml::Table = toml::from_str(text)
            .map_err(|e| ScanError::Spec(e.to_string().lines().collect::<Vec<_>>().join(" ")))?;
        let scan = value
            .remove("scan")
            .ok_or_else(|| ScanError::Spec("missing [scan] section".into()))?;
        let raw_scan: RawScan = scan
            .try_into()
            .map_err(|e: toml::de::Error| ScanError::Spec(format!("[scan]: {}", e.message())))?;
        if value.contains_key("bundle") {
            return Err(ScanError::Spec(
                "a scan file has no [bundle] section (the scan enumerates the bundles)".into(),
            ));
        }
        let raw_model: RawModel = toml::Value::Table(value)
            .try_into()
            .map_err(|e: toml::de::Error| ScanError::Spec(e.message().to_string()))?;
        let model = Model::try_from_raw(raw_model, default_name)
            .map_err(|e| ScanError::Spec(e.to_string()))?;
        if !(3..=5).contains(&raw_scan.rank) {
            return Err(ScanError::Spec(format!(
                "[scan] rank = {} is not supported: use 3, 4 or 5",
                raw_scan.rank
            )));
        }
        let [lo, hi] = raw_scan.entries[..] else {
            return Err(ScanError::Spec(
                "[scan] entries must be [lo, hi], e.g. [-2, 2]".into(),
            ));
        };
        if lo > hi || lo < -MAX_BUNDLE_ENTRY || hi > MAX_BUNDLE_ENTRY {
            return Err(ScanError::Spec(format!(
                "[scan] entries [{lo}, {hi}] must be a non-empty range within ±{MAX_BUNDLE_ENTRY}"
            )));
        }
        let filters = match &raw_scan.filters {
            Some(list) => parse_filter_list(list)?,
            None => Filter::ALL.to_vec(),
        };
        let settings = FilterSettings::new(
            raw_scan.symmetry_order.unwrap_or(1),
            raw_scan.families.unwrap_or(3),
            filters,
        )?;
        Ok(ScanSpec {
            model,
            rank: raw_scan.rank,
            lo,
            hi,
            settings,
            text: text.to_string(),
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const BASE: &str = "[ambient]\ndims = [1,1,1,1]\n[[equations]]\nmultidegree = [2,2,2,2]\n";

    #[test]
    fn parses_and_refuses() {
        let ok = format!("{BASE}[scan]\nrank = 4\nentries = [-1, 1]\nfilters = [\"index\"]\n");
        let s = ScanSpec::from_toml_str(&ok, "x").unwrap();
        assert_eq!(s.rank, 4);
        assert_eq!(s.settings.filters, vec![Filter::C1, Filter::Index]);
        assert_eq!(s.settings.target_index(), -3);
        for (bad, needle) in [
            (BASE.to_string(), "missing [scan]"),
            (
                format!("{BASE}[scan]\nrank = 6\nentries = [-1,1]\n"),
                "rank",
            ),
            (
                format!("{BASE}[scan]\nrank = 5\nentries = [1,-1]\n"),
                "entries",
            ),
            (
                format!("{BASE}[scan]\nrank = 5\nentries = [-1,1]\nfilters=[\"x\"]\n"),
                "unknown filter",
            ),
            (
                format!("{BASE}[scan]\nrank = 5\nentries = [-1,1]\nsymmetry_order = 0\n"),
                "symmetry",
            ),
        ] {
            let e = ScanSpec::from_toml_str(&bad, "x").unwrap_err().to_string();
            assert!(e.contains(needle), "{e}");
        }
    }
}
