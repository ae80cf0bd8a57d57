//! Human-readable tables and JSON rendering. Only formatting lives here.

use serde::Serialize;
use sheafwright::geometry::GeometrySummary;
use std::fmt::Write;

/// One JSON value on one line, newline-terminated.
pub fn json_line<T: Serialize>(value: &T) -> Result<String, serde_json::Error> {
    let mut s = serde_json::to_string(value)?;
    s.push('\n');
    Ok(s)
}

fn join<T: ToString>(v: &[T], sep: &str) -> String {
    v.iter()
        .map(ToString::to_string)
        .collect::<Vec<_>>()
        .join(sep)
}

/// The geometry figures as an aligned text table.
pub fn geometry_table(g: &GeometrySummary) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "  configuration      {}", g.configuration);
    let _ = writeln!(out, "  ambient dims       {}", join(&g.ambient, ","));
    let eqs: Vec<String> = g.equations.iter().map(|q| join(q, ",")).collect();
    let _ = writeln!(out, "  equations          {}", eqs.join(" ; "));
    let _ = writeln!(out, "  dim X              {}", g.dimension);
    let _ = writeln!(
        out,
        "  Calabi-Yau         {}",
        if g.calabi_yau {
            "yes (c1(TX) = 0)"
        } else {
            "NO"
        }
    );
    let _ = writeln!(out, "  Euler number       {}", g.euler);
    let _ = writeln!(out, "  chi(O_X)           {}", g.structure_sheaf_index);
    if let Some(c2) = &g.c2 {
        let _ = writeln!(out, "  c2(TX).J_r         {}", join(c2, " "));
    }
    if let Some(d) = &g.triple {
        let _ = writeln!(
            out,
            "  triple intersections d_rst (r <= s <= t, non-zero; factors 1-based):"
        );
        let m = d.len();
        let mut line = String::new();
        let mut count = 0;
        for r in 0..m {
            for s in r..m {
                for t in s..m {
                    if d[r][s][t] != 0 {
                        let _ = write!(
                            line,
                            "    d_{},{},{} = {:<6}",
                            r + 1,
                            s + 1,
                            t + 1,
                            d[r][s][t]
                        );
                        count += 1;
                        if count % 4 == 0 {
                            let _ = writeln!(out, "{}", line.trim_end());
                            line.clear();
                        }
                    }
                }
            }
        }
        if !line.is_empty() {
            let _ = writeln!(out, "{}", line.trim_end());
        }
    } else {
        let _ = writeln!(
            out,
            "  top intersection numbers (exponents of J_1..J_m: value):"
        );
        for n in &g.intersections {
            let _ = writeln!(out, "    ({}) : {}", join(&n.exponents, ","), n.value);
        }
    }
    out
}

/// One bundle's cohomology as text.
pub fn cohomology_single(
    r: &sheafwright::cohomology::LineBundleCohomology,
    reps: Option<&[sheafwright::cohomology::ClassRepresentative]>,
) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "  bundle      O_X({})", join(&r.bundle, ","));
    let _ = writeln!(out, "  h^q         {}", join(&r.h, " "));
    let _ = writeln!(out, "  index       {}", r.index);
    let _ = writeln!(
        out,
        "  method      {} ({} polynomials{})",
        r.method.kind(),
        r.method.polynomials_str(),
        r.method
            .seed()
            .map(|s| format!(", seed {s}"))
            .unwrap_or_default()
    );
    if let Some(f) = r.method.field() {
        let primes = r.method.primes();
        let primes = if primes.is_empty() {
            String::new()
        } else {
            format!(", p = {}", join(&primes, ", "))
        };
        let _ = writeln!(out, "  field       {f}{primes}");
    }
    let _ = writeln!(out, "  proven      {}", r.method.certification());
    let per_degree: Vec<String> = r
        .method
        .degrees()
        .iter()
        .enumerate()
        .map(|(q, d)| format!("h^{q}: {}", d.describe()))
        .collect();
    let _ = writeln!(out, "  provenance  {}", per_degree.join("; "));
    if r.method.higher_differentials() {
        let _ = writeln!(
            out,
            "  note        higher differentials d_r (r >= 2) were computed"
        );
    }
    let _ = writeln!(
        out,
        "  E_1 page (Koszul set S, p = |S|, q, ambient bundle, dim):"
    );
    for g in &r.e1 {
        let _ = writeln!(
            out,
            "    S={{{}}} p={} q={} O_A({}) dim {}",
            join(&g.koszul, ","),
            g.p,
            g.q,
            join(&g.ambient_bundle, ","),
            g.dim
        );
    }
    if let Some(reps) = reps {
        let _ = writeln!(out, "  representatives (one per basis class):");
        for (i, c) in reps.iter().enumerate() {
            let lead: Vec<String> = c
                .bott_terms
                .iter()
                .take(4)
                .map(|t| {
                    let mono: Vec<String> = t
                        .monomial
                        .iter()
                        .map(|f| format!("({})", join(f, ",")))
                        .collect();
                    format!(
                        "{}*x^{} e{{{}}}",
                        t.coefficient,
                        mono.join(""),
                        join(&t.koszul, ",")
                    )
                })
                .collect();
            let more = if c.bott_terms.len() > 4 {
                format!(" + {} more", c.bott_terms.len() - 4)
            } else {
                String::new()
            };
            let _ = writeln!(
                out,
                "    #{} H^{} type {}: {}{}  (lift: {} Čech–Koszul terms{})",
                i + 1,
                c.degree,
                c.class_type,
                lead.join(" + "),
                more,
                c.lift.len(),
                if c.lift_truncated { ", truncated" } else { "" }
            );
        }
    }
    out
}

/// Header of the --box table.
pub fn cohomology_box_header(config: &sheafwright::geometry::Configuration) -> String {
    format!(
        "# {}: bundle | h^0 .. h^{} | index | method",
        config.label(),
        config.dimension()
    )
}

/// One --box table row.
pub fn cohomology_row(r: &sheafwright::cohomology::LineBundleCohomology) -> String {
    format!(
        "{:<20} {:<24} {:>8}  {}\n",
        join(&r.bundle, ","),
        join(&r.h, " "),
        r.index,
        r.method.kind()
    )
}

/// The `spectrum` JSON object: the spectrum's keys at top level plus `slope_zero`, `favourability`,
/// `line_bundles`, `configuration` and `model`.
pub fn spectrum_json(
    inputs: &super::args::Inputs,
    a: &sheafwright::analysis::ModelAnalysis,
) -> Result<serde_json::Value, serde_json::Error> {
    let mut v = serde_json::to_value(&a.spectrum)?;
    v["model"] = inputs.name().into();
    v["configuration"] = a.geometry.configuration.clone().into();
    v["slope_zero"] = serde_json::to_value(&a.slope_zero)?;
    v["slope_zero_scope"] = a.slope_zero_scope.clone().into();
    v["favourability"] = serde_json::to_value(&a.favourability)?;
    v["line_bundles"] = serde_json::to_value(&a.line_bundles)?;
    Ok(v)
}

fn pass(b: bool) -> &'static str {
    if b { "pass" } else { "FAIL" }
}

/// An exact integer or rational as plain text (`12`, `-5/2`).
fn exact_text(x: &sheafwright::bundle::Exact) -> String {
    serde_json::to_value(x)
        .map(|v| v.to_string().trim_matches('"').to_string())
        .unwrap_or_default()
}

/// Consistency, slope certificate and spectrum as text.
pub fn spectrum_text(a: &sheafwright::analysis::ModelAnalysis) -> String {
    let s = &a.spectrum;
    let c = &s.consistency;
    let mut out = String::new();
    let _ = writeln!(
        out,
        "\n== Bundle: rank {} ({}) ==",
        s.rank,
        serde_json::to_value(s.gauge_group)
            .ok()
            .and_then(|v| v.as_str().map(String::from))
            .unwrap_or_default()
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
    let _ = writeln!(out, "\n== Consistency ==");
    let _ = writeln!(
        out,
        "  c1(V) = 0            {}   c1 = ({})",
        pass(c.c1.passed),
        join(&c.c1.c1, ",")
    );
    let c2b: Vec<String> = s.c2_bundle.iter().map(exact_text).collect();
    let _ = writeln!(out, "  c2(V).J_r            ({})", c2b.join(", "));
    let five: Vec<String> = c.anomaly.five_brane.iter().map(exact_text).collect();
    let _ = writeln!(
        out,
        "  anomaly c2(TX)-c2(V) {}   ({}) >= 0 componentwise (favourable case)",
        pass(s.anomaly_ok),
        five.join(", ")
    );
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
    let _ = writeln!(out, "  slope-zero locus     {}", a.slope_zero.status());
    let _ = writeln!(out, "  scope                {}", a.slope_zero_scope);
    if let Ok(v) = serde_json::to_value(&a.slope_zero) {
        let detail = v
            .get("certificate")
            .or_else(|| v.get("reason"))
            .map(|d| d.to_string())
            .unwrap_or_default();
        let short: String = detail.chars().take(300).collect();
        let _ = writeln!(
            out,
            "    {}{}",
            short,
            if detail.len() > 300 { " …" } else { "" }
        );
    }
    let _ = writeln!(out, "\n== Spectrum (multiplets with count > 0) ==");
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
    let f = &s.flags;
    let _ = writeln!(out, "\n== Flags ==");
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
    let _ = writeln!(
        out,
        "  anti-families: {} ({} multiplets)",
        if f.anti_families_present {
            "present"
        } else {
            "none"
        },
        f.anti_family_count
    );
    let _ = writeln!(out, "  vector-like pairs: {}", f.vector_like_pairs.len());
    let _ = writeln!(
        out,
        "  Higgs pair candidates: {}{}",
        if f.higgs_candidates_present {
            "yes"
        } else {
            "no"
        },
        if f.higgs_pairs.is_empty() {
            String::new()
        } else {
            format!(
                " ({})",
                f.higgs_pairs
                    .iter()
                    .map(|p| format!("{}/{}", p.first_label, p.second_label))
                    .collect::<Vec<_>>()
                    .join(", ")
            )
        }
    );
    let _ = writeln!(
        out,
        "  exotics: {} (chiral excess {})",
        if f.exotics_present { "present" } else { "none" },
        f.exotic_chiral_excess
    );
    out
}
