//! `sheafwright report` and the text of `spectrum`: what a model builder reads, one function per section.
//!
//! Invariant: only formatting lives here. Every figure comes from the library; decimals are for display only (the
//! exact values stay in `--json`), and a sentence never claims more than the check it describes has shown. To add a
//! section, write one `fn xxx_section(…, out: &mut String)` and call it from [`report_text`] (or from
//! [`spectrum_sections`] for sections that also belong to `spectrum`).

use super::UserError;
use super::args::{self, Inputs};
use super::render::{self, join};
use num_rational::BigRational;
use num_traits::{Signed, ToPrimitive};
use sheafwright::analysis::{self, Favourability, HodgeNumbers, KahlerPointCheck, ModelAnalysis};
use sheafwright::bundle::Exact;
use sheafwright::bundle::branching::GaugeGroup;
use sheafwright::couplings::CouplingReport;
use sheafwright::geometry::{Geometry, GeometrySummary};
use sheafwright::slope::{ExistsCertificate, NoneCertificate, Sign, SlopeZero};
use std::fmt::Write;
use std::path::Path;

/// Everything the report shows, computed once.
pub struct ReportData<'a> {
    pub inputs: &'a Inputs,
    pub geometry: GeometrySummary,
    pub favourability: Favourability,
    pub hodge: HodgeNumbers,
    pub kahler: Option<KahlerPointCheck>,
    pub analysis: Option<ModelAnalysis>,
    /// The couplings of the model's bundle; a refusal (e.g. a lift too large) is shown, not fatal.
    pub couplings: Option<Result<CouplingReport, String>>,
    /// The quotient by the model's symmetry (JSON keys and text), when it has a `[symmetry]` section.
    pub quotient: Option<(serde_json::Value, String)>,
    /// The model file, when the report was asked for by path (named in the export section).
    pub model_path: Option<std::path::PathBuf>,
}

impl<'a> ReportData<'a> {
    /// Run every analysis the model file asks for.
    pub fn compute(inputs: &'a Inputs) -> Result<ReportData<'a>, UserError> {
        let engine = args::PolyArgs::default().engine(inputs)?;
        let geometry = Geometry::new(inputs.config()).summary()?;
        let favourability = analysis::favourability(&engine)?;
        let hodge = analysis::hodge_numbers(&geometry, &favourability);
        let analysis = match inputs.model().and_then(|m| m.line_bundles()) {
            Some(_) => Some(analysis::analyse(
                &engine,
                &args::bundle_sum(inputs, None)?,
            )?),
            None => None,
        };
        let kahler = match (
            inputs.model().and_then(|m| m.kahler_point()),
            &geometry.triple,
            &analysis,
        ) {
            (Some(t), Some(triple), Some(_)) => Some(analysis::kahler_point_check(
                triple,
                &args::bundle_sum(inputs, None)?,
                t,
            )?),
            _ => None,
        };
        let couplings = match &analysis {
            Some(_) => Some(
                super::couplings::model_couplings(
                    inputs,
                    &args::PolyArgs::default(),
                    &engine,
                    &args::bundle_sum(inputs, None)?,
                    &sheafwright::couplings::CouplingOptions::default(),
                )
                .map_err(|e| e.to_string()),
            ),
            None => None,
        };
        let quotient = match &analysis {
            Some(a) => super::symmetry::quotient_section(
                inputs,
                args::bundle_sum(inputs, None)?.bundles(),
                &a.spectrum,
            )?,
            None => None,
        };
        Ok(ReportData {
            inputs,
            geometry,
            favourability,
            hodge,
            kahler,
            analysis,
            couplings,
            quotient,
            model_path: None,
        })
    }
}

/// `sheafwright report MODEL [--json]`.
pub fn run(model: &Path, json: bool) -> Result<String, UserError> {
    let inputs = Inputs::from_model_path(model)?;
    let mut data = ReportData::compute(&inputs)?;
    data.model_path = Some(model.to_path_buf());
    if json {
        Ok(render::json_line(&report_json(&data)?)?)
    } else {
        Ok(report_text(&data))
    }
}

/// The report as one JSON object (schema in docs/json.md).
pub fn report_json(d: &ReportData<'_>) -> Result<serde_json::Value, serde_json::Error> {
    let mut report = serde_json::json!({
        "schema": "sheafwright.report/1",
        "model": d.inputs.name(),
        "geometry": d.geometry,
        "favourability": d.favourability,
        "hodge": d.hodge,
    });
    if let Some(a) = &d.analysis {
        report["spectrum"] = render::spectrum_json(d.inputs, a)?;
    }
    if let Some((q, _)) = &d.quotient {
        for key in ["group_order", "free", "free_certificate", "downstairs"] {
            report[key] = q[key].clone();
        }
    }
    if let Some(check) = &d.kahler {
        report["kahler_point"] = serde_json::to_value(check)?;
    }
    match &d.couplings {
        Some(Ok(c)) => report["couplings"] = serde_json::to_value(c)?,
        Some(Err(e)) => report["couplings"] = serde_json::json!({ "error": e }),
        None => {}
    }
    Ok(report)
}

/// The report as text, section by section.
pub fn report_text(d: &ReportData<'_>) -> String {
    let mut out = String::new();
    header_section(d, &mut out);
    geometry_section(d, &mut out);
    kahler_point_section(d, &mut out);
    match &d.analysis {
        Some(a) => spectrum_sections(a, &mut out),
        None => {
            out.push_str("\n(no [bundle] section: consistency checks and spectrum skipped)\n");
        }
    }
    if let Some((_, text)) = &d.quotient {
        out.push_str(text);
    }
    couplings_section(d, &mut out);
    export_section(d, &mut out);
    out
}

/// The coupling textures in compact form (full matrices: `sheafwright couplings`).
fn couplings_section(d: &ReportData<'_>, out: &mut String) {
    match &d.couplings {
        Some(Ok(c)) => out.push_str(&super::couplings::text(c, true)),
        Some(Err(e)) => {
            let _ = writeln!(out, "\n== Couplings ==\n  not computed: {e}");
        }
        None => {}
    }
}

/// Where the export for numerical solvers is and what it holds.
fn export_section(d: &ReportData<'_>, out: &mut String) {
    if let (Some(a), Some(path)) = (&d.analysis, &d.model_path) {
        out.push_str(&super::export::report_section(path, a));
    }
}

/// The sections shared by `report` and `spectrum`: bundle, consistency, slope, multiplets, flags.
pub fn spectrum_sections(a: &ModelAnalysis, out: &mut String) {
    bundle_section(a, out);
    consistency_section(a, out);
    slope_section(a, out);
    multiplet_section(a, out);
    flags_section(a, out);
}

/// The text of `sheafwright spectrum`.
pub fn spectrum_text(a: &ModelAnalysis) -> String {
    let mut out = String::new();
    spectrum_sections(a, &mut out);
    out
}

fn header_section(d: &ReportData<'_>, out: &mut String) {
    let _ = writeln!(out, "Model: {}", d.inputs.name());
    if let Some(notes) = d.inputs.model().and_then(|m| m.notes.as_deref()) {
        let _ = writeln!(out, "Notes: {}", notes.trim());
    }
}

fn geometry_section(d: &ReportData<'_>, out: &mut String) {
    out.push_str("\n== Geometry ==\n");
    out.push_str(&render::geometry_table(&d.geometry));
    let _ = writeln!(
        out,
        "  favourability      {} ({})",
        d.favourability.status, d.favourability.reason
    );
    hodge_lines(&d.hodge, out);
}

/// `h^{1,1}` and `h^{2,1}` with their provenance.
pub fn hodge_lines(h: &HodgeNumbers, out: &mut String) {
    match (h.h11, h.h21) {
        (Some(h11), Some(h21)) => {
            let _ = writeln!(out, "  h^(1,1)            {h11}");
            let _ = writeln!(out, "  h^(2,1)            {h21}");
            let _ = writeln!(out, "    ({})", h.provenance);
        }
        _ => {
            let _ = writeln!(out, "  h^(1,1), h^(2,1)   {}", h.provenance);
        }
    }
}

fn kahler_point_section(d: &ReportData<'_>, out: &mut String) {
    let Some(k) = &d.kahler else { return };
    let point: Vec<String> = k.point.iter().map(exact_text).collect();
    let slopes: Vec<String> = k.slopes.iter().map(exact_text).collect();
    let _ = writeln!(
        out,
        "  Kähler point t = ({}) from the model file: slopes ({}) {}",
        point.join(", "),
        slopes.join(", "),
        if k.all_slopes_zero {
            "all vanish"
        } else {
            "do NOT all vanish"
        }
    );
}

fn bundle_section(a: &ModelAnalysis, out: &mut String) {
    let s = &a.spectrum;
    let _ = writeln!(
        out,
        "\n== Bundle: rank {} ({}) ==",
        s.rank,
        group_name(s.gauge_group)
    );
    for (i, lb) in a.line_bundles.iter().enumerate() {
        let _ = writeln!(
            out,
            "  L_{} = {:<18} h = {:<14} ({})",
            i + 1,
            format!("O_X({})", join(&lb.bundle, ",")),
            join(&lb.h, " "),
            lb.method.kind()
        );
    }
}

fn pass(b: bool) -> &'static str {
    if b { "pass" } else { "FAIL" }
}

fn consistency_section(a: &ModelAnalysis, out: &mut String) {
    let s = &a.spectrum;
    let c = &s.consistency;
    let _ = writeln!(out, "\n== Consistency ==");
    let _ = writeln!(
        out,
        "  c1(V) = 0            {}   c1 = ({})",
        pass(c.c1.passed),
        join(&c.c1.c1, ",")
    );
    let c2b: Vec<String> = s.c2_bundle.iter().map(exact_text).collect();
    let _ = writeln!(out, "  c2(V).J_r            ({})", c2b.join(", "));
    anomaly_lines(a, out);
    let _ = writeln!(
        out,
        "  index chi(V)         {}   families -chi(V) = {}",
        s.index, s.families
    );
    if let Some(sec) = &c.sections {
        let _ = writeln!(
            out,
            "  h^0(V) = h^0(V*) = 0 {}   h^0(V) = {}, h^0(V*) = {}",
            pass(sec.passed),
            sec.h0_v,
            sec.h0_v_dual
        );
    }
}

/// The anomaly bound, worded by what was shown: a negative component disproves effectiveness in every case (each
/// `J_r` is nef), non-negative components prove it only when the Kähler cone of X is the ambient one.
fn anomaly_lines(a: &ModelAnalysis, out: &mut String) {
    let an = &a.spectrum.consistency.anomaly;
    let five: Vec<String> = an.five_brane.iter().map(exact_text).collect();
    let favourable = a.favourability.status == "favourable";
    let verdict = if !an.passed {
        "FAIL"
    } else if favourable {
        "pass"
    } else {
        "open"
    };
    let _ = writeln!(
        out,
        "  anomaly c2(TX)-c2(V) {verdict}   (c2(TX)-c2(V)).J_r = ({})",
        five.join(", ")
    );
    let why = if !an.passed {
        format!(
            "negative against J_{}: each J_r is nef on X, so c2(TX)-c2(V) is not effective (no five-brane can balance it)",
            join(&an.violated, ", J_")
        )
    } else if favourable {
        "all >= 0: effective, taking the Kähler cone of X to be the ambient one (favourable case, common practice)"
            .to_string()
    } else {
        "all >= 0 against the ambient J_r only; favourability is not certified, so the J_r need not span H^(1,1)(X) and effectiveness of c2(TX)-c2(V) is NOT shown".to_string()
    };
    let _ = writeln!(out, "    {why}");
}

fn slope_section(a: &ModelAnalysis, out: &mut String) {
    let z = &a.slope_zero;
    let _ = writeln!(out, "  slope-zero locus     {}", z.status());
    for line in slope_certificate_lines(z, a.line_bundles.len()) {
        let _ = writeln!(out, "    {line}");
    }
    let _ = writeln!(out, "  scope                {}", a.slope_zero_scope);
}

/// The slope-zero certificate in words, with decimals for display (exact data: `slope_zero` in `--json`).
/// `bundles` is the number of line bundles (to say when the square system leaves some slopes out).
pub fn slope_certificate_lines(z: &SlopeZero, bundles: usize) -> Vec<String> {
    let exact_note = "exact certificate: slope_zero.certificate in --json".to_string();
    match z {
        SlopeZero::Exists(ExistsCertificate::RationalPoint { point }) => {
            let short = point.iter().all(|q| q.to_string().len() <= 12);
            let shown = if short {
                format!("t = ({}) exactly", rats(point, ", "))
            } else {
                format!("t ≈ ({})", decimals(point))
            };
            vec![
                "certificate: rational point (every slope vanishes there, exactly)".into(),
                shown,
                exact_note,
            ]
        }
        SlopeZero::Exists(ExistsCertificate::KrawczykBox {
            bx,
            free,
            fixed,
            equations,
            ..
        }) => {
            let m = free.len() + fixed.len();
            let mut t = vec![BigRational::default(); m];
            for (iv, &i) in bx.iter().zip(free) {
                if i < m {
                    t[i] = iv.mid();
                }
            }
            for (i, v) in fixed {
                if *i < m {
                    t[*i] = v.clone();
                }
            }
            let width = bx
                .iter()
                .map(|iv| iv.width().to_f64().unwrap_or(f64::NAN))
                .fold(0.0f64, f64::max);
            let fixed_text: Vec<String> = fixed
                .iter()
                .map(|(i, v)| format!("t{} = {v}", i + 1))
                .collect();
            let eqs: Vec<String> = equations.iter().map(|e| format!("μ{}", e + 1)).collect();
            vec![
                "certificate: Krawczyk box (an exact interval Newton test proves a common zero inside)".into(),
                format!("t ≈ ({})  (centre of the box)", decimals(&t)),
                format!(
                    "box width {width:.1e} (widest side) in t{}; fixed {}; square system {} = 0{}",
                    free.iter()
                        .map(|i| (i + 1).to_string())
                        .collect::<Vec<_>>()
                        .join(", t"),
                    if fixed_text.is_empty() {
                        "none".to_string()
                    } else {
                        fixed_text.join(", ")
                    },
                    eqs.join(", "),
                    if equations.len() < bundles {
                        " (the other slopes are exact combinations of these)"
                    } else {
                        ""
                    }
                ),
                exact_note,
            ]
        }
        SlopeZero::None(NoneCertificate::SignObstruction { bundle, sign }) => vec![
            format!(
                "certificate: sign obstruction — μ{} (the slope of L_{}) is {} on the whole Kähler cone,",
                bundle + 1,
                bundle + 1,
                match sign {
                    Sign::Positive => "> 0",
                    Sign::Negative => "< 0",
                }
            ),
            "so the slopes never vanish together".into(),
        ],
        SlopeZero::None(NoneCertificate::CombinationObstruction { combination }) => {
            let terms: Vec<String> = combination
                .iter()
                .map(|t| format!("{}·μ{}", t.coeff, t.bundle + 1))
                .collect();
            vec![
                format!(
                    "certificate: combination obstruction — {} > 0 on the whole Kähler cone,",
                    terms.join(" + ").replace("+ -", "- ")
                ),
                "so the slopes never vanish together".into(),
            ]
        }
        SlopeZero::None(NoneCertificate::Subdivision { boxes }) => vec![
            format!(
                "certificate: subdivision — the cone is covered by {} boxes, each excluded by a slope combination proven > 0 on it",
                boxes.len()
            ),
            exact_note,
        ],
        SlopeZero::Undecided { reason } => vec![format!("no certificate: {reason}")],
    }
}

/// The multiplet table is only meaningful for an `S(U(n))` bundle (`c1(V) = 0`).
fn multiplet_table_meaningful(a: &ModelAnalysis) -> bool {
    a.spectrum.c1_zero
}

fn multiplet_section(a: &ModelAnalysis, out: &mut String) {
    let s = &a.spectrum;
    let _ = writeln!(out, "\n== Spectrum (multiplets with count > 0) ==");
    if !multiplet_table_meaningful(a) {
        let _ = writeln!(
            out,
            "  not shown: c1(V) != 0, so V is not an S(U({})) bundle and the {} multiplet table does not apply",
            s.rank,
            group_name(s.gauge_group)
        );
        return;
    }
    let _ = writeln!(
        out,
        "  {:<16} {:>5}  {:<16} {:<18} h",
        "multiplet", "count", "line bundle", "charge"
    );
    for mlt in s.multiplets.iter().filter(|m| m.present) {
        let _ = writeln!(
            out,
            "  {:<16} {:>5}  {:<16} {:<18} {}",
            mlt.label,
            mlt.count,
            format!("({})", join(&mlt.line_bundle, ",")),
            format!("({})", join(&mlt.charge, ",")),
            join(&mlt.h, " ")
        );
    }
}

fn flags_section(a: &ModelAnalysis, out: &mut String) {
    let s = &a.spectrum;
    let f = &s.flags;
    let _ = writeln!(out, "\n== Flags ==");
    if !multiplet_table_meaningful(a) {
        let _ = writeln!(
            out,
            "  not evaluated: they are read off the multiplet table, which does not apply when c1(V) != 0"
        );
        return;
    }
    let _ = writeln!(
        out,
        "  net families {} (expected -chi(V) = {}): {}",
        f.net_families,
        f.net_families_expected,
        if f.net_families_match {
            "match"
        } else {
            "MISMATCH"
        }
    );
    let failed_sections = s.consistency.sections.as_ref().filter(|sec| !sec.passed);
    if let Some(sec) = failed_sections.filter(|_| !f.net_families_match) {
        let _ = writeln!(
            out,
            "    (follows from the failed section check, h^0(V) = {}, h^0(V*) = {}: sections enter chi(V) but are not multiplets)",
            sec.h0_v, sec.h0_v_dual
        );
    }
    let _ = writeln!(
        out,
        "  anti-families: {}",
        if f.anti_families_present {
            format!("{} fields", f.anti_family_count)
        } else {
            "none".to_string()
        }
    );
    if f.vector_like_field_pairs.is_empty() {
        let _ = writeln!(
            out,
            "  vector-like pairs: none (no charge-compatible pair of conjugate GUT multiplets; singlets not counted)"
        );
    } else {
        let parts: Vec<String> = f
            .vector_like_field_pairs
            .iter()
            .map(|r| {
                format!(
                    "{} of {}–{} ({})",
                    r.field_pairs,
                    r.representation,
                    r.conjugate,
                    r.multiplet_pairs.join(", ")
                )
            })
            .collect();
        let _ = writeln!(
            out,
            "  vector-like pairs: {} (field pairs; singlets not counted)",
            parts.join("; ")
        );
    }
    higgs_line(a, out);
    let _ = writeln!(
        out,
        "  exotics: {} (chiral excess {})",
        if f.exotics_present { "present" } else { "none" },
        f.exotic_chiral_excess
    );
}

/// Higgs pair candidates exactly as `flags.higgs_pairs`, then the Higgs-type multiplets behind
/// `flags.higgs_candidates_present`.
fn higgs_line(a: &ModelAnalysis, out: &mut String) {
    let s = &a.spectrum;
    let f = &s.flags;
    if f.higgs_pairs.is_empty() {
        let _ = writeln!(out, "  Higgs pair candidates: none");
    } else {
        let total: u64 = f.higgs_pairs.iter().map(|p| p.pairs).sum();
        let pairs: Vec<String> = f
            .higgs_pairs
            .iter()
            .map(|p| format!("{}/{}: {}", p.first_label, p.second_label, p.pairs))
            .collect();
        let _ = writeln!(
            out,
            "  Higgs pair candidates: {total} ({})",
            pairs.join(", ")
        );
    }
    match s.gauge_group {
        GaugeGroup::So10 if f.higgs_candidates_present => {
            let _ = writeln!(
                out,
                "  Higgs-type multiplets: {} fields in the 10 (each holds a Higgs doublet pair; no 10/10 mass term is allowed by the U(1)s)",
                s.total("10")
            );
        }
        GaugeGroup::Su5 if f.higgs_candidates_present && f.higgs_pairs.is_empty() => {
            let _ = writeln!(
                out,
                "  Higgs-type multiplets: {} in the 5, {} in the 5bar, but no charge-compatible 5/5bar pair",
                s.total("5"),
                s.total("5bar")
            );
        }
        GaugeGroup::E6 => {
            let _ = writeln!(
                out,
                "  (E6 keeps its Higgs fields inside the 27 and 27bar: see the vector-like 27–27bar pairs)"
            );
        }
        _ => {}
    }
}

fn group_name(g: GaugeGroup) -> String {
    serde_json::to_value(g)
        .ok()
        .and_then(|v| v.as_str().map(String::from))
        .unwrap_or_default()
}

/// An exact integer or rational as plain text (`12`, `-5/2`).
pub fn exact_text(x: &Exact) -> String {
    match x {
        Exact::Integer(v) => v.to_string(),
        Exact::Rational(s) => s.clone(),
    }
}

fn rats(v: &[BigRational], sep: &str) -> String {
    v.iter()
        .map(ToString::to_string)
        .collect::<Vec<_>>()
        .join(sep)
}

/// A rational for display: integers exactly, others with 5 decimals (scientific when tiny or huge).
pub fn decimal(q: &BigRational) -> String {
    if q.is_integer() {
        return q.to_integer().to_string();
    }
    let x = q.to_f64().unwrap_or(f64::NAN);
    let a = x.abs();
    if !(1e-3..1e6).contains(&a) {
        format!("{x:.4e}")
    } else {
        let s = format!("{x:.5}");
        if q.is_negative() && !s.starts_with('-') {
            format!("-{s}")
        } else {
            s
        }
    }
}

fn decimals(v: &[BigRational]) -> String {
    v.iter().map(decimal).collect::<Vec<_>>().join(", ")
}

#[cfg(test)]
mod tests {
    use super::*;
    use num_bigint::BigInt;

    fn q(n: i64, d: i64) -> BigRational {
        BigRational::new(BigInt::from(n), BigInt::from(d))
    }

    #[test]
    fn decimals_are_short_and_integers_exact() {
        assert_eq!(decimal(&q(3, 1)), "3");
        assert_eq!(decimal(&q(36603, 100000)), "0.36603");
        assert_eq!(decimal(&q(-1, 3)), "-0.33333");
        assert_eq!(decimal(&q(1, 1_000_000)), "1.0000e-6");
    }

    fn demo(name: &str) -> Inputs {
        Inputs::from_model_path(Path::new(&format!(
            "{}/catalogs-demo/{name}.toml",
            env!("CARGO_MANIFEST_DIR")
        )))
        .unwrap()
    }

    #[test]
    fn anomaly_wording_follows_favourability() {
        let inputs = demo("tetraquadric-a");
        let mut d = ReportData::compute(&inputs).unwrap();
        let text = report_text(&d);
        assert!(text.contains("anomaly c2(TX)-c2(V) pass"), "{text}");
        assert!(text.contains("favourable case"), "{text}");
        // The same bundle when favourability is not certified: nothing is claimed about effectiveness.
        let a = d.analysis.as_mut().unwrap();
        a.favourability = Favourability {
            status: "not_certified".into(),
            reason: "pretend".into(),
        };
        let mut out = String::new();
        anomaly_lines(a, &mut out);
        assert!(out.contains("anomaly c2(TX)-c2(V) open"), "{out}");
        assert!(
            out.contains("effectiveness of c2(TX)-c2(V) is NOT shown"),
            "{out}"
        );
        assert!(!out.contains("favourable case"), "{out}");
    }

    #[test]
    fn anomaly_failure_is_a_failure_in_every_case() {
        let inputs = demo("tetraquadric-anomaly");
        let mut d = ReportData::compute(&inputs).unwrap();
        let a = d.analysis.as_mut().unwrap();
        a.favourability.status = "not_certified".into();
        let mut out = String::new();
        anomaly_lines(a, &mut out);
        assert!(out.contains("anomaly c2(TX)-c2(V) FAIL"), "{out}");
        assert!(out.contains("negative against J_3, J_4"), "{out}");
    }
}
