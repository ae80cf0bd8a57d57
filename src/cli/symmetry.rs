//! CLI rendering of the quotient by a model's `[symmetry]`: the freeness certificate and the downstairs
//! spectrum, as JSON keys (`group_order`, `free`, `downstairs`) and a text section.

use super::UserError;
use super::args::Inputs;
use sheafwright::bundle::spectrum::Spectrum;
use sheafwright::cohomology::{CohomologyEngine, DEFAULT_SEED, PolynomialChoice};
use sheafwright::io::model::PolynomialMode;
use sheafwright::symmetry::{Quotient, downstairs};

/// When the model has a symmetry: `(json keys, text section)`.
pub fn quotient_section(
    inputs: &Inputs,
    bundles: &[Vec<i64>],
    spectrum: &Spectrum,
) -> Result<Option<(serde_json::Value, String)>, UserError> {
    let Some(model) = inputs.model() else {
        return Ok(None);
    };
    let Some(spec) = model.symmetry() else {
        return Ok(None);
    };
    let config = model.config();
    let polys = match (model.mode(), model.polynomials()) {
        (PolynomialMode::Given, Some(p)) => p.to_vec(),
        _ => Quotient::generic_equations(spec, config, model.seed().unwrap_or(DEFAULT_SEED))?,
    };
    let quotient = Quotient::new(spec, config, &polys)?;
    quotient.require_free()?;
    let engine = CohomologyEngine::new(config, PolynomialChoice::Given(polys))?;
    let down = downstairs::downstairs_spectrum(&quotient, spec, &engine, spectrum, bundles)?;
    let summary = quotient.summary(None);
    let json = serde_json::json!({
        "group_order": summary.group_order,
        "free": summary.free,
        "free_certificate": summary.freeness.certificate,
        "euler_quotient": summary.euler_quotient,
        "downstairs": down,
    });
    let mut text = format!(
        "\n== Quotient by Γ (|Γ| = {}) ==\n  {}\n  families downstairs  {}\n",
        summary.group_order,
        summary.freeness.certificate,
        down.families
            .map(|f| f.to_string())
            .unwrap_or_else(|| "not an integer".into())
    );
    for m in &down.multiplets {
        if m.upstairs == 0 {
            continue;
        }
        let parts: Vec<String> = m
            .components
            .iter()
            .map(|c| {
                format!(
                    "{} {}{} ×{}",
                    c.name,
                    c.rep,
                    if c.hypercharge != 0 {
                        format!("_{}", c.hypercharge)
                    } else {
                        String::new()
                    },
                    c.count
                )
            })
            .collect();
        text.push_str(&format!(
            "  {:<14} upstairs {:>3}  downstairs: {}\n",
            m.label,
            m.upstairs,
            if parts.is_empty() {
                m.note.clone().unwrap_or_default()
            } else {
                parts.join(", ")
            }
        ));
    }
    text.push_str(&format!(
        "  Higgs doublets kept {}, colour triplets in 5s {}\n",
        down.higgs_doublets, down.colour_triplets
    ));
    Ok(Some((json, text)))
}
