//! `sheafwright export MODEL.toml -o FILE`: write the export file for numerical solvers (JSON or `.npz`)
//! atomically and print a one-screen summary (or one JSON line with `--json`).
//!
//! Invariant: the output file is written only with `sheafwright::io::write_atomic` after everything has been
//! computed, so a failing run never leaves a partial file.

use super::UserError;
use super::args::{Inputs, PolyArgs};
use serde::Serialize;
use sheafwright::analysis;
use sheafwright::io::export::{Export, build_export};
use std::path::Path;

/// What `export --json` prints.
#[derive(Serialize)]
struct Summary<'a> {
    schema: &'a str,
    version: u32,
    model: &'a str,
    output: String,
    format: &'a str,
    bytes: usize,
    multiplets: usize,
    classes: usize,
    classes_by_type: Vec<usize>,
    bott_terms: usize,
    lift_terms: usize,
    seconds: f64,
}

/// Run the command: load, analyse, export, write, summarise.
pub fn run(
    model: &Path,
    output: &Path,
    format: &str,
    poly: &PolyArgs,
    with_duals: bool,
    json: bool,
) -> Result<String, UserError> {
    let started = std::time::Instant::now();
    if format != "json" && format != "npz" {
        return Err(UserError(format!(
            "--format: unknown format {format:?}; use json or npz"
        )));
    }
    let inputs = Inputs::from_model_path(model)?;
    let engine = poly.engine(&inputs)?;
    let line_bundles = inputs
        .model()
        .and_then(|m| m.line_bundles())
        .ok_or_else(|| {
            UserError(format!(
                "{}: no [bundle] section; the export needs a line-bundle sum",
                model.display()
            ))
        })?
        .to_vec();
    let sum = super::args::bundle_sum(&inputs, None)?;
    let analysis = analysis::analyse(&engine, &sum)?;
    let family = super::couplings::model_family(&inputs, poly);
    let export: Export = build_export(
        inputs.name(),
        &engine,
        &analysis,
        &line_bundles,
        with_duals,
        family.as_ref(),
    )?;
    let bytes = match format {
        "json" => {
            let mut s = serde_json::to_string(&export)?;
            s.push('\n');
            s.into_bytes()
        }
        _ => sheafwright::io::npz::npz_bytes(&export.npz_arrays()),
    };
    sheafwright::io::write_atomic(output, &bytes)
        .map_err(|e| UserError(format!("cannot write {}: {e}", output.display())))?;
    let classes: Vec<_> = export.multiplets.iter().flat_map(|m| &m.classes).collect();
    let max_type = classes.iter().map(|c| c.class_type).max().unwrap_or(0);
    let mut by_type = vec![0usize; max_type + 1];
    for c in &classes {
        by_type[c.class_type] += 1;
    }
    let summary = Summary {
        schema: &export.schema,
        version: export.version,
        model: &export.model,
        output: output.display().to_string(),
        format,
        bytes: bytes.len(),
        multiplets: export.multiplets.len(),
        classes: classes.len(),
        bott_terms: classes.iter().map(|c| c.bott_terms.len()).sum(),
        lift_terms: classes.iter().map(|c| c.lift.len()).sum(),
        classes_by_type: by_type,
        seconds: started.elapsed().as_secs_f64(),
    };
    if json {
        Ok(super::render::json_line(&summary)?)
    } else {
        Ok(format!(
            "wrote {} ({} {}, {} bytes): {} multiplets, {} classes (by type: {}), {} Bott terms, {} Čech–Koszul lift terms, {:.2} s\n",
            summary.output,
            summary.schema,
            summary.version,
            summary.bytes,
            summary.multiplets,
            summary.classes,
            summary
                .classes_by_type
                .iter()
                .enumerate()
                .map(|(t, n)| format!("{t}: {n}"))
                .collect::<Vec<_>>()
                .join(", "),
            summary.bott_terms,
            summary.lift_terms,
            summary.seconds
        ))
    }
}

/// The `report` section about the export: where it goes (the command to write it) and what it holds.
pub fn report_section(model: &Path, a: &analysis::ModelAnalysis) -> String {
    let present: Vec<_> = a.spectrum.present().collect();
    let classes: u64 = present.iter().map(|m| m.count).sum();
    format!(
        "\n== Export for numerical solvers ==\n  sheafwright export {} -o FILE.json   (or --format npz; schema {} version {})\n  holds: configuration, polynomials used (exact), geometry, certificates, spectrum, and for {} multiplets\n  a basis of {} classes of H^1 with Bott terms, ambient Dolbeault forms and lifted Čech–Koszul cocycles,\n  the partition-of-unity form of every type >= 1 class (face_forms), and the coupling textures\n  (docs/export-schema.md, docs/representatives.md)\n",
        model.display(),
        sheafwright::io::export::EXPORT_SCHEMA,
        sheafwright::io::export::EXPORT_VERSION,
        present.len(),
        classes
    )
}
