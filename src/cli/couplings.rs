//! The `couplings` command: operators, textures with a status for every entry, ranks and relations, as text
//! (matrices with a legend) or JSON; also the compact couplings section of `report`.
//!
//! Invariant: this file only renders [`sheafwright::couplings::CouplingReport`]; every figure comes from the
//! library.

use super::UserError;
use super::args::{ConfigArgs, Inputs, PolyArgs};
use sheafwright::bundle::BundleSum;
use sheafwright::cohomology::CohomologyEngine;
use sheafwright::couplings::parametric::{ParametricOptions, SpecialKind};
use sheafwright::couplings::texture::{FamilySummary, ParameterFamily, TextureError};
use sheafwright::couplings::{
    CouplingClass, CouplingOptions, CouplingReport, CouplingValue, EntryStatus, couplings,
    couplings_in_family,
};
use sheafwright::io::model::PolynomialMode;
use std::fmt::Write;

/// Parsed flags of `couplings`.
pub struct CouplingsArgs {
    pub config: ConfigArgs,
    pub poly: PolyArgs,
    pub bundles: Option<String>,
    pub singlets: usize,
    pub max_terms: usize,
    pub timing: bool,
    pub json: bool,
}

/// Run the command and return its output.
pub fn run(a: CouplingsArgs) -> Result<String, UserError> {
    let inputs = Inputs::from_args(&a.config)?;
    let engine = a.poly.engine(&inputs)?;
    let sum = super::args::bundle_sum(&inputs, a.bundles.as_deref())?;
    if a.max_terms == 0 {
        return Err(UserError(
            "--max-terms 0: the limit on Čech–Koszul terms must be at least 1".into(),
        ));
    }
    let options = CouplingOptions {
        singlets: a.singlets,
        values: true,
        max_cochain_terms: a.max_terms,
    };
    let started = std::time::Instant::now();
    let report = model_couplings(&inputs, &a.poly, &engine, &sum, &options)?;
    if a.timing {
        for t in &report.timings {
            eprintln!(
                "timing: {:<16} {:>9.1} ms  ({} Yukawa tensors)",
                t.operator,
                t.seconds * 1e3,
                t.tensors
            );
        }
        eprintln!(
            "timing: total            {:>9.1} ms",
            started.elapsed().as_secs_f64() * 1e3
        );
    }
    for w in &report.warnings {
        eprintln!("warning: {w}");
    }
    if a.json {
        let mut v = serde_json::to_value(&report)?;
        v["schema"] = "sheafwright.couplings/1".into();
        v["model"] = inputs.name().into();
        v["configuration"] = inputs.config().label().into();
        if a.timing {
            v["timings"] = serde_json::to_value(&report.timings)?;
        }
        Ok(super::render::json_line(&v)?)
    } else {
        Ok(text(&report, false))
    }
}

/// The model's one-parameter family, when it names a symbolic parameter and its given polynomials are used
/// (the engine then holds the member at `parameter_value`); `None` otherwise.
pub fn model_family<'a>(inputs: &'a Inputs, poly: &PolyArgs) -> Option<ParameterFamily<'a>> {
    let p = inputs.model().and_then(|m| m.parameter())?;
    matches!(poly.effective_mode(inputs), Ok(PolynomialMode::Given)).then(|| ParameterFamily {
        config: inputs.config(),
        parameter: &p.name,
        polynomials: &p.polynomials,
        member: p.value.clone(),
        options: ParametricOptions::default(),
    })
}

/// The couplings of the model: with a symbolic parameter and the given polynomials, every value as an exact
/// rational function of the parameter ([`couplings_in_family`] over [`model_family`]); with `--mode generic`
/// the parameter plays no role and a warning says so.
pub fn model_couplings(
    inputs: &Inputs,
    poly: &PolyArgs,
    engine: &CohomologyEngine,
    sum: &BundleSum,
    options: &CouplingOptions,
) -> Result<CouplingReport, TextureError> {
    if let Some(family) = model_family(inputs, poly) {
        return couplings_in_family(engine, sum, options, &family);
    }
    let mut report = couplings(engine, sum, options)?;
    if let Some(p) = inputs.model().and_then(|m| m.parameter()) {
        report.warnings.push(format!(
            "the model names the parameter {}, but these values are for a generic member (--mode generic), not the model's family",
            p.name
        ));
    }
    Ok(report)
}

const LEGEND: &str = "legend: · forbidden_by_charge   * value (non-zero, shown in full by `couplings`)   τ vanishes_by_type (τ1+τ2+τ3 < K)   0 zero_computed   + allowed_by_charge (no holomorphic value)   ? not_computed   numbers: exact values";

/// Longest rational-function text shown inside a matrix cell; longer ones are named `f1`, `f2`, … and listed.
const MAX_CELL_FUNCTION: usize = 12;

/// The cell texts of a texture and the rational functions named in them (`(name, text)`).
fn cells(c: &CouplingClass) -> (Vec<Vec<String>>, Vec<(String, String)>) {
    let mut named: Vec<(String, String)> = Vec::new();
    let cells = (0..c.rows.len())
        .map(|r| {
            (0..c.columns.len())
                .map(|col| {
                    let e = &c.entries[r * c.columns.len() + col];
                    match (&e.status, &e.value) {
                        (EntryStatus::Value, Some(v @ CouplingValue::RationalFunction { .. })) => {
                            let text = v.to_string();
                            if text.chars().count() <= MAX_CELL_FUNCTION {
                                return text;
                            }
                            match named.iter().find(|(_, t)| *t == text) {
                                Some((n, _)) => n.clone(),
                                None => {
                                    let n = format!("f{}", named.len() + 1);
                                    named.push((n.clone(), text));
                                    n
                                }
                            }
                        }
                        (EntryStatus::Value, Some(v)) => v.to_string(),
                        (s, _) => s.symbol().to_string(),
                    }
                })
                .collect()
        })
        .collect();
    (cells, named)
}

fn matrix(out: &mut String, c: &CouplingClass, indent: &str) {
    let (cells, named) = cells(c);
    let row_w = c.rows.iter().map(|l| l.chars().count()).max().unwrap_or(0);
    let widths: Vec<usize> = (0..c.columns.len())
        .map(|col| {
            cells
                .iter()
                .map(|row| row[col].chars().count())
                .chain(std::iter::once(c.columns[col].chars().count()))
                .max()
                .unwrap_or(1)
        })
        .collect();
    let pad = |s: &str, w: usize| format!("{s}{}", " ".repeat(w.saturating_sub(s.chars().count())));
    let _ = write!(out, "{indent}{} ", pad("", row_w));
    for (col, w) in widths.iter().enumerate() {
        let _ = write!(out, " {}", pad(&c.columns[col], *w));
    }
    out.push('\n');
    for (r, row) in cells.iter().enumerate() {
        let _ = write!(out, "{indent}{} ", pad(&c.rows[r], row_w));
        for (col, w) in widths.iter().enumerate() {
            let _ = write!(out, " {}", pad(&row[col], *w));
        }
        out.push('\n');
    }
    for (n, text) in named {
        let _ = writeln!(out, "{indent}{n} = {text}");
    }
}

/// The family lines: what the rational functions are, how they were reconstructed, where they are special.
fn family_text(out: &mut String, f: &FamilySummary, compact: bool) {
    let functions = f
        .tensors
        .iter()
        .filter(|t| t.values == "rational_functions")
        .count();
    let _ = writeln!(
        out,
        "  parameter {p}: the textures are labelled by the member {p} = {m}; {functions} of {} Yukawa tensor(s) are exact rational functions of {p}, rank over Q({p}) by {}",
        f.tensors.len(),
        f.rank_method
            .replace("Q(parameter)", &format!("Q({})", f.parameter)),
        p = f.parameter,
        m = f.member,
    );
    for t in &f.tensors {
        let degrees = match (t.total_degree_bound, t.max_degrees) {
            (Some(b), Some((n, d))) => format!(
                "degree bound deg num + deg den ≤ {b} (found ≤ {n} / ≤ {d}), {} interpolation point(s), checked at {}",
                t.interpolation_points.len(),
                t.check_points.join(", ")
            ),
            _ => "no reconstruction".to_string(),
        };
        let _ = writeln!(
            out,
            "    {} ({}x{}x{}): {}; {}; member check: {}",
            t.fields.join(" "),
            t.dims[0],
            t.dims[1],
            t.dims[2],
            t.values.replace('_', " "),
            degrees,
            t.member_check.replace('_', " ")
        );
        if let Some(n) = &t.note {
            let _ = writeln!(out, "      note: {n}");
        }
        if !compact && !t.interpolation_points.is_empty() {
            let _ = writeln!(
                out,
                "      interpolation points: {}",
                t.interpolation_points.join(", ")
            );
        }
    }
    if f.special_values.is_empty() {
        let _ = writeln!(
            out,
            "  special values of {}: none found among the sample points and the rational roots of the denominators",
            f.parameter
        );
    } else {
        let _ = writeln!(out, "  special values of {}:", f.parameter);
        for s in &f.special_values {
            let what = match &s.kind {
                SpecialKind::Degenerate { message } => format!("degenerate equations ({message})"),
                SpecialKind::SpectrumJump { h1, generic_h1 } => {
                    format!("h^1 jumps to {h1:?} (generic {generic_h1:?})")
                }
                SpecialKind::BasisChange => "the canonical basis changes (same h^1)".into(),
                SpecialKind::PoleOnly => "a pole of the generic basis only".into(),
            };
            let _ = writeln!(
                out,
                "    {} = {}: {what}; found as {} for {}",
                f.parameter,
                s.value,
                s.found_as.replace('_', " "),
                s.tensors.join("; ")
            );
        }
    }
    if !f.unlocated_denominators.is_empty() {
        let _ = writeln!(
            out,
            "  denominator factors with no located rational root (their zeros may be special): {}",
            f.unlocated_denominators.join(", ")
        );
    }
}

/// One symbol per entry (`*` for a non-zero value), rows and columns named once.
/// Most textures listed by the report's compact summary; the `couplings` command shows every one.
const REPORT_TEXTURE_LINES: usize = 24;

/// The report's couplings section: one line per texture with its ranks and the count of each entry status.
fn compact_summary(out: &mut String, report: &CouplingReport) {
    let statuses = [
        EntryStatus::Value,
        EntryStatus::ZeroComputed,
        EntryStatus::VanishesByType,
        EntryStatus::AllowedByCharge,
        EntryStatus::NotComputed,
        EntryStatus::ForbiddenByCharge,
    ];
    if !report.classes.is_empty() {
        let _ = writeln!(
            out,
            "\n  texture                               ranks; rows x columns: entries per status (count×symbol)"
        );
    }
    for c in report.classes.iter().take(REPORT_TEXTURE_LINES) {
        let counts: Vec<String> = statuses
            .iter()
            .map(|s| (s, c.entries.iter().filter(|e| e.status == *s).count()))
            .filter(|(_, n)| *n > 0)
            .map(|(s, n)| format!("{n}×{}", s.symbol()))
            .collect();
        let name = format!(
            "[{}]{}",
            c.operator,
            c.choice
                .as_ref()
                .map(|h| format!(" with {h}"))
                .unwrap_or_default()
        );
        let _ = writeln!(
            out,
            "  {name:<37} {}; {}x{}: {}",
            ranks(c),
            c.rows.len(),
            c.columns.len(),
            counts.join(" ")
        );
    }
    if report.classes.len() > REPORT_TEXTURE_LINES {
        let _ = writeln!(
            out,
            "  … and {} more texture(s)",
            report.classes.len() - REPORT_TEXTURE_LINES
        );
    }
    let _ = writeln!(
        out,
        "  matrices, exact values and relations: sheafwright couplings MODEL.toml (--json for all entries)"
    );
}

fn ranks(c: &CouplingClass) -> String {
    format!(
        "structural rank {}, after type {}, rank {}",
        c.structural_rank,
        c.structural_rank_after_type,
        c.rank.map_or("unknown".to_string(), |r| r.to_string())
    )
}

/// The human-readable rendering; `compact` (for `report`) leaves out relations, singlet insertions and the
/// operator list.
pub fn text(report: &CouplingReport, compact: bool) -> String {
    let mut out = String::new();
    let _ = writeln!(
        out,
        "\n== Couplings ({}, codimension K = {}) ==",
        report.gauge_group, report.codimension
    );
    for w in &report.warnings {
        let _ = writeln!(out, "  warning: {w}");
    }
    let _ = writeln!(out, "  normalisation: {}", report.normalisation);
    let _ = writeln!(
        out,
        "  values λ(row, column, choice) in slot order; λ is graded antisymmetric in its slots (no E8 structure constant)"
    );
    let _ = writeln!(out, "  {LEGEND}");
    if let Some(f) = &report.family {
        family_text(&mut out, f, compact);
    }
    if !compact {
        let _ = writeln!(out, "\n  operators (allowed tuples of present multiplets):");
        for o in &report.operators {
            let _ = writeln!(
                out,
                "    {:<16} {}{}",
                o.operator,
                if o.allowed.is_empty() {
                    "none present".to_string()
                } else {
                    o.allowed
                        .iter()
                        .map(|t| t.join(" "))
                        .collect::<Vec<_>>()
                        .join(", ")
                },
                if o.holomorphic_value {
                    ""
                } else {
                    "   (charge rule only)"
                }
            );
        }
    }
    if report.all_forbidden_textures > 0 {
        let _ = writeln!(
            out,
            "\n  {} texture(s) with every entry forbidden by charge not shown (use --singlets N to list them with the singlets that switch entries on)",
            report.all_forbidden_textures
        );
    }
    if report.classes.is_empty() {
        let _ = writeln!(out, "\n  no texture with an allowed entry");
    }
    if compact {
        compact_summary(&mut out, report);
        return out;
    }
    for c in &report.classes {
        let _ = writeln!(
            out,
            "\n  [{}]{}  {}",
            c.operator,
            c.choice
                .as_ref()
                .map(|h| format!(" with {h}"))
                .unwrap_or_default(),
            ranks(c)
        );
        {
            matrix(&mut out, c, "    ");
        }
        for w in &c.warnings {
            let _ = writeln!(out, "    warning: {w}");
        }
        for between in ["rows", "columns"] {
            let zero: Vec<&str> = c
                .relations
                .iter()
                .filter(|r| r.kind == "zero" && r.between == between)
                .map(|r| r.first.as_str())
                .collect();
            if !zero.is_empty() {
                let _ = writeln!(out, "    zero {between}: {}", zero.join(", "));
            }
        }
        for rel in &c.relations {
            if rel.kind != "zero" {
                let _ = writeln!(
                    out,
                    "    relation ({}): {} = {} × {}  [{}]",
                    rel.between, rel.second, rel.factor, rel.first, rel.kind
                );
            }
        }
        for e in c
            .entries
            .iter()
            .filter(|e| !e.singlet_insertions.is_empty())
        {
            let _ = writeln!(
                out,
                "    switched on by singlets: {}  ←  {}",
                e.fields.join(" "),
                e.singlet_insertions
                    .iter()
                    .map(|s| s.join("·"))
                    .collect::<Vec<_>>()
                    .join(", ")
            );
        }
    }
    out
}
