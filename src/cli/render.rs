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

pub fn join<T: ToString>(v: &[T], sep: &str) -> String {
    v.iter()
        .map(ToString::to_string)
        .collect::<Vec<_>>()
        .join(sep)
}

/// The geometry figures as an aligned text table.
pub fn geometry_table(g: &GeometrySummary) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "  configuration      {}", g.configuration);
    configuration_matrix(g, &mut out);
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

/// The configuration matrix in the trade's convention: one row per ambient factor, one column per equation.
fn configuration_matrix(g: &GeometrySummary, out: &mut String) {
    let k = g.equations.len();
    let width = g
        .equations
        .iter()
        .flatten()
        .map(|d| d.to_string().len())
        .max()
        .unwrap_or(1)
        .max(k.to_string().len() + 1);
    let cols: Vec<String> = (1..=k)
        .map(|j| format!("{:>width$}", format!("q{j}")))
        .collect();
    let _ = writeln!(
        out,
        "  configuration matrix (rows: ambient factors, columns: equations)"
    );
    let lead = g
        .ambient
        .iter()
        .map(|n| format!("P{n}").len())
        .max()
        .unwrap_or(2);
    let _ = writeln!(out, "    {:<lead$}   {}", "", cols.join(" "));
    for (i, n) in g.ambient.iter().enumerate() {
        let row: Vec<String> = g
            .equations
            .iter()
            .map(|q| format!("{:>width$}", q[i]))
            .collect();
        let _ = writeln!(out, "    {:<lead$} | {}", format!("P{n}"), row.join(" "));
    }
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
/// `line_bundles`, `configuration`, `model` and `multiplet_table_meaningful`.
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
    // The GUT multiplet table assumes an S(U(n)) bundle; with c1(V) != 0 `multiplets` and `flags` do not apply.
    v["multiplet_table_meaningful"] = a.spectrum.c1_zero.into();
    Ok(v)
}
