//! SVG drawing of the projectivised Kähler cone, the zero loci `μ_a = 0` of
//! the bundles' slopes, and the certified point or box.
//!
//! Pictures: `m = 1` a note (the cone is a single ray); `m = 2` the segment
//! `t = (1-x, x)`, `0 <= x <= 1`, with one row per bundle above it showing
//! the sign of its slope (solid `> 0`, dashed `< 0`, a tick at each zero
//! inside the open segment); `m = 3` the simplex `Σ t = 1` drawn as a
//! triangle in barycentric coordinates; `m >= 4` the 2-d slice through a point
//! `p` (the certified point, else the barycentre), normalised so `Σ p = 1`,
//! in which `t^4..t^m` are frozen at `p` and `(t^1,t^2,t^3)` range over the
//! triangle `t^1+t^2+t^3 = p^1+p^2+p^3`; the slice is stated in the picture.
//!
//! Every picture explains itself: a `none` verdict names the obstructing
//! bundle (or combination), legend markers are drawn with the width used for
//! that bundle's locus, corners of a slice are labelled by their full point.
//!
//! Invariant: drawing uses floats only and never influences a verdict; the
//! output is a self-contained SVG document (root element with `xmlns`,
//! `viewBox`, balanced tags, escaped text) and the function never panics.

use super::certify::{float_quad, float_slopes};
use super::{ExistsCertificate, NoneCertificate, SlopeZero};
use num_traits::ToPrimitive;
use std::fmt::Write;

const W: f64 = 720.0;
const H: f64 = 600.0;
const COLOURS: [&str; 8] = [
    "#d62728", "#1f77b4", "#2ca02c", "#9467bd", "#ff7f0e", "#8c564b", "#e377c2", "#17becf",
];

fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

fn text(out: &mut String, x: f64, y: f64, size: u32, anchor: &str, s: &str) {
    let _ = writeln!(
        out,
        r#"<text x="{x:.1}" y="{y:.1}" font-family="sans-serif" font-size="{size}" text-anchor="{anchor}">{}</text>"#,
        esc(s)
    );
}

/// The certified point (normalised to `Σ = 1`) and a label, if any.
fn marked_point(result: &SlopeZero, m: usize) -> Option<(Vec<f64>, String)> {
    let (t, label) = match result {
        SlopeZero::Exists(ExistsCertificate::RationalPoint { point }) => (
            point
                .iter()
                .map(|q| q.to_f64().unwrap_or(f64::NAN))
                .collect::<Vec<f64>>(),
            format!(
                "certified rational point ({})",
                point
                    .iter()
                    .map(|q| q.to_string())
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
        ),
        SlopeZero::Exists(ExistsCertificate::KrawczykBox {
            bx, free, fixed, ..
        }) => {
            let mut t = vec![f64::NAN; m];
            for (k, &i) in free.iter().enumerate() {
                if let (Some(iv), true) = (bx.get(k), i < m) {
                    t[i] = iv.mid().to_f64().unwrap_or(f64::NAN);
                }
            }
            for (i, v) in fixed {
                if *i < m {
                    t[*i] = v.to_f64().unwrap_or(f64::NAN);
                }
            }
            (
                t,
                "Krawczyk box (certified zero inside; drawn at its centre)".to_string(),
            )
        }
        _ => return None,
    };
    if t.len() != m || t.iter().any(|v| !v.is_finite() || *v <= 0.0) {
        return None;
    }
    let s: f64 = t.iter().sum();
    Some((t.iter().map(|v| v / s).collect(), label))
}

fn header(result: &SlopeZero, m: usize) -> String {
    let kind = match result {
        SlopeZero::Exists(ExistsCertificate::RationalPoint { .. }) => "rational point",
        SlopeZero::Exists(ExistsCertificate::KrawczykBox { .. }) => "Krawczyk box",
        SlopeZero::None(NoneCertificate::SignObstruction { .. }) => "sign obstruction",
        SlopeZero::None(NoneCertificate::CombinationObstruction { .. }) => {
            "combination sign obstruction"
        }
        SlopeZero::None(NoneCertificate::Subdivision { .. }) => "box subdivision",
        SlopeZero::Undecided { .. } => "no certificate",
    };
    format!(
        "Slope-zero locus in the Kähler cone (m = {m}): {} — {kind}",
        result.status()
    )
}

/// The bundles (0-based) named by a `none` certificate, and the sentence saying why there is no common zero.
fn obstruction(result: &SlopeZero) -> Option<(Vec<usize>, String)> {
    match result {
        SlopeZero::None(NoneCertificate::SignObstruction { bundle, sign }) => Some((
            vec![*bundle],
            format!(
                "no common zero: μ{} {} 0 on the whole open cone (bundle {} obstructs)",
                bundle + 1,
                match sign {
                    super::Sign::Positive => ">",
                    super::Sign::Negative => "<",
                },
                bundle + 1
            ),
        )),
        SlopeZero::None(NoneCertificate::CombinationObstruction { combination }) => {
            let terms: Vec<String> = combination
                .iter()
                .map(|t| format!("{}·μ{}", t.coeff, t.bundle + 1))
                .collect();
            Some((
                combination.iter().map(|t| t.bundle).collect(),
                format!(
                    "no common zero: {} > 0 on the whole open cone",
                    terms.join(" + ").replace("+ -", "- ")
                ),
            ))
        }
        SlopeZero::None(NoneCertificate::Subdivision { boxes }) => Some((
            Vec::new(),
            format!(
                "no common zero: each of {} boxes covering the cone is excluded by a positive slope combination",
                boxes.len()
            ),
        )),
        _ => None,
    }
}

/// Stroke width of bundle `a`'s zero locus among `r` bundles (earlier bundles wider, drawn underneath).
fn locus_width(a: usize, r: usize, m: usize) -> f64 {
    if m == 2 {
        2.5
    } else {
        1.8 + 2.2 * (r.saturating_sub(1 + a)) as f64
    }
}

/// Renders the projectivised Kähler cone with every bundle's zero locus
/// `μ_a = 0`, a legend (bundle index and entries) and the certified point or
/// box of `result`.
///
/// Preconditions: none (malformed input yields an SVG that says so). The
/// curves are sampled in floats (drawing only). Cost: `O(r m^2 N^2)` float
/// operations with `N = 120` grid steps per side. Returns the SVG text.
pub fn plot_kahler_cone_svg(
    triple: &[Vec<Vec<i64>>],
    bundles: &[Vec<i64>],
    result: &SlopeZero,
) -> String {
    let m = triple.len();
    let mut out = String::new();
    let _ = writeln!(
        out,
        r#"<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 {W} {H}" width="{W}" height="{H}">"#
    );
    let _ = writeln!(
        out,
        r#"<rect x="0" y="0" width="{W}" height="{H}" fill="white"/>"#
    );
    text(&mut out, W / 2.0, 26.0, 16, "middle", &header(result, m));
    let shapes_ok = m > 0
        && triple
            .iter()
            .all(|p| p.len() == m && p.iter().all(|r| r.len() == m))
        && bundles.iter().all(|k| k.len() == m);
    if !shapes_ok {
        text(
            &mut out,
            W / 2.0,
            H / 2.0,
            14,
            "middle",
            "malformed input: nothing to draw",
        );
        out.push_str("</svg>\n");
        return out;
    }
    let mats = float_slopes(triple, bundles);
    let mark = marked_point(result, m);
    let obstructs = obstruction(result);
    // Legend: one row per bundle, its marker drawn with the width used in the picture.
    let width_note = m >= 3 && bundles.len() > 1;
    let rows = bundles.len() + usize::from(mark.is_some()) + usize::from(width_note);
    let ly0 = H - 12.0 - 16.0 * (rows as f64 - 1.0);
    for (a, k) in bundles.iter().enumerate() {
        let y = ly0 + 16.0 * a as f64;
        let col = COLOURS[a % COLOURS.len()];
        let _ = writeln!(
            out,
            r#"<line x1="20" y1="{:.1}" x2="44" y2="{:.1}" stroke="{col}" stroke-width="{:.1}"/>"#,
            y - 4.0,
            y - 4.0,
            locus_width(a, bundles.len(), m)
        );
        let entries: Vec<String> = k.iter().map(|v| v.to_string()).collect();
        let blame = match &obstructs {
            Some((b, _)) if b.contains(&a) => "  ← obstructs",
            _ => "",
        };
        text(
            &mut out,
            54.0,
            y,
            12,
            "start",
            &format!(
                "bundle {}: O({})  — zero locus μ{} = 0{blame}",
                a + 1,
                entries.join(","),
                a + 1
            ),
        );
    }
    let mut next = ly0 + 16.0 * bundles.len() as f64;
    if let Some((_, label)) = &mark {
        let _ = writeln!(
            out,
            r#"<circle cx="32" cy="{:.1}" r="6" fill="none" stroke="black" stroke-width="2"/>"#,
            next - 4.0
        );
        text(&mut out, 54.0, next, 12, "start", label);
        next += 16.0;
    }
    if width_note {
        text(
            &mut out,
            54.0,
            next,
            11,
            "start",
            "line widths: earlier bundles are drawn wider and underneath, so coinciding loci stay visible",
        );
    }
    if let Some((_, why)) = &obstructs {
        text(&mut out, W / 2.0, 46.0, 12, "middle", why);
    }
    if let SlopeZero::Undecided { reason } = result {
        let short: String = reason.chars().take(110).collect();
        text(
            &mut out,
            W / 2.0,
            46.0,
            11,
            "middle",
            &format!("reason: {short}"),
        );
    }
    match m {
        1 => text(
            &mut out,
            W / 2.0,
            H / 2.0 - 40.0,
            14,
            "middle",
            "m = 1: the projectivised Kähler cone is a single point; μ = d k t² vanishes only if k = 0",
        ),
        2 => draw_segment(&mut out, &mats, &mark),
        _ => draw_triangle(&mut out, &mats, m, &mark, result),
    }
    out.push_str("</svg>\n");
    out
}

/// `m = 2`: one row per bundle above the segment `t = (1−x, x)`, showing the sign of its slope (solid where
/// `μ_a > 0`, dashed where `μ_a < 0`) and a tick where it vanishes inside the open segment.
fn draw_segment(out: &mut String, mats: &[Vec<Vec<f64>>], mark: &Option<(Vec<f64>, String)>) {
    let (x0, x1) = (90.0, W - 80.0);
    let r = mats.len().max(1);
    let step = (240.0 / r as f64).min(30.0);
    let row_y = |a: usize| 80.0 + step * a as f64;
    let y = row_y(r) + 10.0;
    let px = |x: f64| x0 + (x1 - x0) * x;
    let _ = writeln!(
        out,
        r#"<line x1="{x0}" y1="{y:.1}" x2="{x1}" y2="{y:.1}" stroke="black" stroke-width="2"/>"#
    );
    for xe in [x0, x1] {
        let _ = writeln!(
            out,
            r#"<circle cx="{xe}" cy="{y:.1}" r="4" fill="white" stroke="black"/>"#
        );
    }
    text(out, x0, y + 24.0, 13, "middle", "t = (1, 0)");
    text(out, x1, y + 24.0, 13, "middle", "t = (0, 1)");
    text(
        out,
        W / 2.0,
        y + 48.0,
        12,
        "middle",
        "open segment t = (1−x, x), 0 < x < 1 (end points are not in the cone)",
    );
    text(
        out,
        W / 2.0,
        y + 66.0,
        12,
        "middle",
        "row μa: sign of that slope along the segment — solid > 0, dashed < 0, tick: μa = 0",
    );
    let n = 4000;
    for (a, mat) in mats.iter().enumerate() {
        let col = COLOURS[a % COLOURS.len()];
        let ya = row_y(a);
        text(out, x0 - 14.0, ya + 4.0, 12, "end", &format!("μ{}", a + 1));
        let scale = mat.iter().flatten().fold(0.0f64, |s, v| s.max(v.abs()));
        if scale == 0.0 {
            let _ = writeln!(
                out,
                r#"<line x1="{x0}" y1="{ya:.1}" x2="{x1}" y2="{ya:.1}" stroke="{col}" stroke-width="6" opacity="0.6"/>"#
            );
            text(out, x1 + 8.0, ya + 4.0, 11, "start", "≡ 0");
            continue;
        }
        let f = |x: f64| float_quad(mat, &[1.0 - x, x]) / scale;
        // Runs of constant sign on the open segment, sampled at cell midpoints.
        let sign = |v: f64| {
            if v > 0.0 {
                1
            } else if v < 0.0 {
                -1
            } else {
                0
            }
        };
        let mut run_start = 0.0;
        let mut run_sign = sign(f(0.5 / n as f64));
        let mut path_pos = String::new();
        let mut path_neg = String::new();
        let mut zeros = Vec::new();
        for i in 1..=n {
            let x = (i as f64 + 0.5) / n as f64;
            let sg = if i == n { 2 } else { sign(f(x)) };
            if sg != run_sign {
                let end = i as f64 / n as f64;
                let seg = format!("M{:.1} {ya:.1}L{:.1} {ya:.1}", px(run_start), px(end));
                match run_sign {
                    1 => path_pos.push_str(&seg),
                    -1 => path_neg.push_str(&seg),
                    _ => {}
                }
                if i < n {
                    zeros.push(end);
                }
                run_start = end;
                run_sign = sg;
            }
        }
        if !path_pos.is_empty() {
            let _ = writeln!(
                out,
                r#"<path d="{path_pos}" stroke="{col}" stroke-width="2.5" fill="none"/>"#
            );
        }
        if !path_neg.is_empty() {
            let _ = writeln!(
                out,
                r#"<path d="{path_neg}" stroke="{col}" stroke-width="2.5" stroke-dasharray="6,4" fill="none"/>"#
            );
        }
        for z in zeros {
            let xx = px(z);
            let _ = writeln!(
                out,
                r#"<line x1="{xx:.1}" y1="{:.1}" x2="{xx:.1}" y2="{:.1}" stroke="{col}" stroke-width="3"/>"#,
                ya - 8.0,
                ya + 8.0
            );
            let _ = writeln!(
                out,
                r##"<line x1="{xx:.1}" y1="{:.1}" x2="{xx:.1}" y2="{y:.1}" stroke="#999999" stroke-width="0.8" stroke-dasharray="2,3"/>"##,
                ya + 8.0
            );
        }
    }
    if let Some((t, _)) = mark {
        let xx = px(t[1]);
        let _ = writeln!(
            out,
            r#"<circle cx="{xx:.1}" cy="{y:.1}" r="7" fill="none" stroke="black" stroke-width="2"/>"#
        );
    }
}

/// Outlines of the excluded boxes of a subdivision certificate (m = 3 only):
/// a chart box is a rectangle in `t^j = 1`, whose image in the simplex is a
/// quadrilateral (projective maps keep lines straight).
fn draw_boxes(out: &mut String, result: &SlopeZero, proj: &dyn Fn([f64; 3]) -> (f64, f64)) {
    let SlopeZero::None(NoneCertificate::Subdivision { boxes }) = result else {
        return;
    };
    let mut path = String::new();
    for b in boxes.iter().take(4000) {
        if b.bx.len() != 3 {
            return;
        }
        let lo: Vec<f64> =
            b.bx.iter()
                .map(|iv| iv.lo().to_f64().unwrap_or(0.0))
                .collect();
        let hi: Vec<f64> =
            b.bx.iter()
                .map(|iv| iv.hi().to_f64().unwrap_or(0.0))
                .collect();
        let free: Vec<usize> = (0..3).filter(|&i| i != b.chart).collect();
        if free.len() != 2 {
            return;
        }
        let corner = |x: bool, y: bool| {
            let mut t = lo.clone();
            if x {
                t[free[0]] = hi[free[0]];
            }
            if y {
                t[free[1]] = hi[free[1]];
            }
            let s: f64 = t.iter().sum();
            proj([t[0] / s, t[1] / s, t[2] / s])
        };
        let c = [
            corner(false, false),
            corner(true, false),
            corner(true, true),
            corner(false, true),
        ];
        let _ = write!(
            path,
            "M{:.1} {:.1}L{:.1} {:.1}L{:.1} {:.1}L{:.1} {:.1}Z",
            c[0].0, c[0].1, c[1].0, c[1].1, c[2].0, c[2].1, c[3].0, c[3].1
        );
    }
    let _ = writeln!(
        out,
        r##"<path d="{path}" fill="none" stroke="#b0b0b0" stroke-width="0.5"/>"##
    );
    text(
        out,
        W / 2.0,
        459.0,
        12,
        "middle",
        &format!(
            "grey: the {} excluded boxes of the certificate (chart boxes mapped to the simplex)",
            boxes.len()
        ),
    );
}

fn draw_triangle(
    out: &mut String,
    mats: &[Vec<Vec<f64>>],
    m: usize,
    mark: &Option<(Vec<f64>, String)>,
    result: &SlopeZero,
) {
    let base: Vec<f64> = match mark {
        Some((t, _)) => t.clone(),
        None => vec![1.0 / m as f64; m],
    };
    let s3: f64 = base[..3].iter().sum();
    let va = (W / 2.0, 70.0);
    let vb = (150.0, 405.0);
    let vc = (W - 150.0, 405.0);
    let proj = |b: [f64; 3]| {
        (
            b[0] * va.0 + b[1] * vb.0 + b[2] * vc.0,
            b[0] * va.1 + b[1] * vb.1 + b[2] * vc.1,
        )
    };
    let point = |b: [f64; 3]| {
        let mut t = base.clone();
        for i in 0..3 {
            t[i] = s3 * b[i];
        }
        t
    };
    let _ = writeln!(
        out,
        r##"<polygon points="{:.1},{:.1} {:.1},{:.1} {:.1},{:.1}" fill="#f4f4f4" stroke="black" stroke-width="1.5"/>"##,
        va.0, va.1, vb.0, vb.1, vc.0, vc.1
    );
    if m == 3 {
        text(out, va.0, va.1 - 10.0, 13, "middle", "t = (1,0,0)");
        text(out, vb.0 - 10.0, vb.1 + 18.0, 13, "middle", "t = (0,1,0)");
        text(out, vc.0 + 10.0, vc.1 + 18.0, 13, "middle", "t = (0,0,1)");
        text(
            out,
            W / 2.0,
            443.0,
            12,
            "middle",
            "open simplex t1+t2+t3 = 1, t > 0 (barycentric); edges are not in the cone",
        );
    } else {
        // Each corner is a boundary point of the slice: t_i = t1+t2+t3 for one i ≤ 3, the other two 0, the rest
        // frozen.
        let lab = |i: usize| {
            let coords: Vec<String> = (0..m)
                .map(|j| {
                    let v = if j < 3 {
                        if j == i { s3 } else { 0.0 }
                    } else {
                        base[j]
                    };
                    if v == 0.0 {
                        "0".to_string()
                    } else {
                        format!("{v:.3}")
                    }
                })
                .collect();
            format!("t = ({})", coords.join(", "))
        };
        text(out, va.0, va.1 - 10.0, 13, "middle", &lab(0));
        text(out, vb.0 - 10.0, vb.1 + 18.0, 13, "middle", &lab(1));
        text(out, vc.0 + 10.0, vc.1 + 18.0, 13, "middle", &lab(2));
        let frozen: Vec<String> = (3..m)
            .map(|i| format!("t{} = {:.4}", i + 1, base[i]))
            .collect();
        let through = if mark.is_some() {
            "the certified point"
        } else {
            "the barycentre"
        };
        text(
            out,
            W / 2.0,
            443.0,
            12,
            "middle",
            &format!(
                "2-d slice through {through} (Σt = 1): t1+t2+t3 = {s3:.4}, {}",
                frozen.join(", ")
            ),
        );
    }
    if m == 3 {
        draw_boxes(out, result, &proj);
    }
    let n = 120usize;
    let bary = |i: usize, j: usize| {
        let a = i as f64 / n as f64;
        let b = j as f64 / n as f64;
        [a, b, (1.0 - a - b).max(0.0)]
    };
    for (ai, mat) in mats.iter().enumerate() {
        let col = COLOURS[ai % COLOURS.len()];
        let scale = mat.iter().flatten().fold(0.0f64, |s, v| s.max(v.abs()));
        if scale == 0.0 {
            continue;
        }
        let val = |b: [f64; 3]| float_quad(mat, &point(b)) / scale;
        let mut path = String::new();
        for i in 0..n {
            for j in 0..n - i {
                let mut tris = vec![[bary(i, j), bary(i + 1, j), bary(i, j + 1)]];
                if i + j + 2 <= n {
                    tris.push([bary(i + 1, j), bary(i + 1, j + 1), bary(i, j + 1)]);
                }
                for tri in tris {
                    let v: Vec<f64> = tri.iter().map(|&b| val(b)).collect();
                    let mut pts = Vec::new();
                    for (p, q) in [(0, 1), (1, 2), (2, 0)] {
                        if (v[p] < 0.0) != (v[q] < 0.0) {
                            let s = v[p] / (v[p] - v[q]);
                            let b: [f64; 3] =
                                std::array::from_fn(|k| tri[p][k] + s * (tri[q][k] - tri[p][k]));
                            pts.push(proj(b));
                        }
                    }
                    if pts.len() == 2 {
                        let _ = write!(
                            path,
                            "M{:.1} {:.1}L{:.1} {:.1}",
                            pts[0].0, pts[0].1, pts[1].0, pts[1].1
                        );
                    }
                }
            }
        }
        if !path.is_empty() {
            // Earlier bundles are drawn wider so coinciding loci stay visible.
            let width = locus_width(ai, mats.len(), m);
            let _ = writeln!(
                out,
                r#"<path d="{path}" fill="none" stroke="{col}" stroke-width="{width:.1}" stroke-linecap="round"/>"#
            );
        }
    }
    if let Some((t, _)) = mark {
        let b = [t[0] / s3, t[1] / s3, t[2] / s3];
        let (x, y) = proj(b);
        let _ = writeln!(
            out,
            r#"<circle cx="{x:.1}" cy="{y:.1}" r="7" fill="none" stroke="black" stroke-width="2"/>"#
        );
        let _ = writeln!(
            out,
            r#"<circle cx="{x:.1}" cy="{y:.1}" r="2" fill="black"/>"#
        );
    }
}
