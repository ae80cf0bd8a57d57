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
