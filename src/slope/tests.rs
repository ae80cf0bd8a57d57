//! Tests of the slope-zero certifier: hand-made cases with known answers,
//! tampered certificates, JSON shapes, SVG well-formedness and property tests.
//!
//! Invariant checked throughout: every certificate returned passes
//! `verify_certificate`, and a perturbed one fails it.

use super::*;
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Zero};
use proptest::prelude::*;

/// P1×P1×P1×P1 with one (2,2,2,2) equation: d_rst = 2 for pairwise distinct r,s,t.
fn p1_4() -> Vec<Vec<Vec<i64>>> {
    (0..4)
        .map(|r| {
            (0..4)
                .map(|s| {
                    (0..4)
                        .map(|t| if r != s && s != t && r != t { 2 } else { 0 })
                        .collect()
                })
                .collect()
        })
        .collect()
}

/// P2×P2 bicubic: d_112 = d_122 = 3 and permutations.
fn bicubic() -> Vec<Vec<Vec<i64>>> {
    let mut d = vec![vec![vec![0; 2]; 2]; 2];
    for (r, s, t) in [
        (0, 0, 1),
        (0, 1, 0),
        (1, 0, 0),
        (0, 1, 1),
        (1, 0, 1),
        (1, 1, 0),
    ] {
        d[r][s][t] = 3;
    }
    d
}

fn quintic() -> Vec<Vec<Vec<i64>>> {
    vec![vec![vec![5]]]
}

/// Symmetric toy form with m = 3 (test data only): d_123 = 1 and permutations.
fn toy_d123() -> Vec<Vec<Vec<i64>>> {
    let mut d = vec![vec![vec![0; 3]; 3]; 3];
    for (r, s, t) in [
        (0, 1, 2),
        (0, 2, 1),
        (1, 0, 2),
        (1, 2, 0),
        (2, 0, 1),
        (2, 1, 0),
    ] {
        d[r][s][t] = 1;
    }
    d
}

/// A second symmetric toy form with m = 3 (test data only).
fn toy_m3() -> Vec<Vec<Vec<i64>>> {
    let v = [
        [[2, 1, 0], [1, 0, 1], [0, 1, 1]],
        [[1, 0, 1], [0, 1, 0], [1, 0, 0]],
        [[0, 1, 1], [1, 0, 0], [1, 0, 1]],
    ];
    v.iter()
        .map(|a| a.iter().map(|b| b.to_vec()).collect())
        .collect()
}

fn q(n: i64, d: i64) -> BigRational {
    BigRational::new(BigInt::from(n), BigInt::from(d))
}

fn run(d: &[Vec<Vec<i64>>], b: &[Vec<i64>]) -> SlopeZero {
    let res = certify_slope_zero(d, b, &SlopeOptions::default()).expect("well-formed input");
    if res.status() != "undecided" {
        assert!(
            verify_certificate(d, b, &res),
            "certificate must verify: {res:?}"
        );
    }
    res
}

fn kind(res: &SlopeZero) -> String {
    let v = serde_json::to_value(res).unwrap();
    v["certificate"]["kind"].as_str().unwrap_or("").to_string()
}

#[test]
fn quintic_cases() {
    let d = quintic();
    let res = run(&d, &[vec![0]]);
    assert_eq!(res.status(), "exists");
    let res = run(&d, &[vec![1], vec![-1]]);
    assert_eq!(
        res,
        SlopeZero::None(NoneCertificate::SignObstruction {
            bundle: 0,
            sign: Sign::Positive
        })
    );
    assert_eq!(slope_exact(&d, &[2], &[q(1, 2)]).unwrap(), q(5, 2));
}

#[test]
fn p1_4_opposite_pair_exists_at_barycentre() {
    let d = p1_4();
    let res = run(&d, &[vec![1, -1, 0, 0], vec![-1, 1, 0, 0]]);
    match &res {
        SlopeZero::Exists(ExistsCertificate::RationalPoint { point }) => {
            assert_eq!(point, &vec![BigRational::one(); 4]);
        }
        other => panic!("expected a rational point, got {other:?}"),
    }
}

#[test]
fn p1_4_sign_obstruction() {
    let d = p1_4();
    let b = vec![vec![1, 0, 0, 0], vec![-1, 0, 0, 0]];
    let res = run(&d, &b);
    assert_eq!(kind(&res), "sign_obstruction");
    let json = serde_json::to_string(&res).unwrap();
    assert_eq!(
        json,
        r#"{"status":"none","certificate":{"kind":"sign_obstruction","bundle":1,"sign":"positive"}}"#
    );
    let wrong = SlopeZero::None(NoneCertificate::SignObstruction {
        bundle: 0,
        sign: Sign::Negative,
    });
    assert!(!verify_certificate(&d, &b, &wrong));
}

#[test]
fn p1_4_hand_solved_locus() {
    // μ ∝ 2t2t3 + t2t4 + t3t4 − t1t3 − 2t1t4 − t1t2, so
    // t1 = (2t2t3 + t2t4 + t3t4) / (t2 + t3 + 2t4); e.g. (7/5, 2, 1, 1).
    let d = p1_4();
    let b = vec![vec![2, -1, -1, 0], vec![-2, 1, 1, 0]];
    let on = [q(7, 5), q(2, 1), q(1, 1), q(1, 1)];
    let off = [q(1, 1), q(2, 1), q(1, 1), q(1, 1)];
    assert!(slope_exact(&d, &b[0], &on).unwrap().is_zero());
    assert!(!slope_exact(&d, &b[0], &off).unwrap().is_zero());
    let res = run(&d, &b);
    assert_eq!(res.status(), "exists");
    let hand = SlopeZero::Exists(ExistsCertificate::RationalPoint { point: on.to_vec() });
    assert!(verify_certificate(&d, &b, &hand));
    let moved = SlopeZero::Exists(ExistsCertificate::RationalPoint {
        point: off.to_vec(),
    });
    assert!(!verify_certificate(&d, &b, &moved));
}

#[test]
fn p1_4_rank5_sum_zero_exists() {
    let d = p1_4();
    let b = vec![
        vec![1, -1, 0, 0],
        vec![0, 1, -1, 0],
        vec![2, 0, -1, -1],
        vec![-1, 1, 1, -1],
        vec![-2, -1, 1, 2],
    ];
    let res = run(&d, &b);
    assert_eq!(kind(&res), "rational_point");
    if let SlopeZero::Exists(ExistsCertificate::RationalPoint { point }) = &res {
        let mut bad = point.clone();
        bad[0] += q(1, 1000);
        let t = SlopeZero::Exists(ExistsCertificate::RationalPoint { point: bad });
        assert!(!verify_certificate(&d, &b, &t));
    }
}

#[test]
fn p1_4_rank5_krawczyk() {
    let d = p1_4();
    let b = vec![
        vec![3, -1, -1, 2],
        vec![-3, -3, 3, 1],
        vec![3, 0, -3, 3],
        vec![-1, 2, -3, 1],
        vec![-2, 2, 4, -7],
    ];
    let res = run(&d, &b);
    assert_eq!(kind(&res), "krawczyk_box");
    check_box_tampering(&d, &b, &res);
}

#[test]
fn p1_4_rank5_none() {
    let d = p1_4();
    let b = vec![
        vec![3, 2, 0, -1],
        vec![3, -1, 3, 0],
        vec![2, -3, 2, 0],
        vec![3, 0, 2, -3],
        vec![-11, 2, -7, 4],
    ];
    let res = run(&d, &b);
    assert_eq!(res.status(), "none");
}

fn check_box_tampering(d: &[Vec<Vec<i64>>], b: &[Vec<i64>], res: &SlopeZero) {
    let SlopeZero::Exists(ExistsCertificate::KrawczykBox {
        bx,
        free,
        fixed,
        equations,
        preconditioner,
    }) = res
    else {
        panic!("expected a Krawczyk box");
    };
    let make = |bx: Vec<Interval>, fixed: Vec<(usize, BigRational)>| {
        SlopeZero::Exists(ExistsCertificate::KrawczykBox {
            bx,
            free: free.clone(),
            fixed,
            equations: equations.clone(),
            preconditioner: preconditioner.clone(),
        })
    };
    assert!(verify_certificate(d, b, &make(bx.clone(), fixed.clone())));
    // Shift the first interval by three widths.
    let mut shifted = bx.clone();
    let w = shifted[0].width() * q(3, 1);
    shifted[0] = Interval::new(shifted[0].lo() + &w, shifted[0].hi() + &w).unwrap();
    assert!(!verify_certificate(d, b, &make(shifted, fixed.clone())));
    // Move a pinned coordinate.
    let mut moved = fixed.clone();
    moved[0].1 = &moved[0].1 * q(11, 10);
    assert!(!verify_certificate(d, b, &make(bx.clone(), moved)));
    // Shrink the box to its midpoint's neighbourhood of zero width: not certified.
    let pts: Vec<Interval> = bx.iter().map(|iv| Interval::point(iv.mid())).collect();
    assert!(!verify_certificate(d, b, &make(pts, fixed.clone())));
}

#[test]
fn bicubic_irrational_needs_krawczyk() {
    let d = bicubic();
    let b = vec![vec![1, -2], vec![-1, 2]];
    // Zero at x = t1/t2 root of 2x² + 2x − 1: discriminant/4 = k1² + k1k2 + k2² = 3, not a square.
    let disc: i64 = 1 - 2 + 4;
    assert!((0..=disc).all(|s| s * s != disc));
    let res = run(&d, &b);
    assert_eq!(kind(&res), "krawczyk_box");
    if let SlopeZero::Exists(ExistsCertificate::KrawczykBox {
        bx, free, fixed, ..
    }) = &res
    {
        let root = (3f64.sqrt() - 1.0) / 2.0;
        let fv: f64 = fixed[0].1.to_string().parse::<f64>().unwrap_or_else(|_| {
            let s = fixed[0].1.to_string();
            let (n, dd) = s.split_once('/').unwrap();
            n.parse::<f64>().unwrap() / dd.parse::<f64>().unwrap()
        });
        let to_f = |x: &BigRational| {
            use num_traits::ToPrimitive;
            x.to_f64().unwrap()
        };
        let (lo, hi) = (to_f(bx[0].lo()), to_f(bx[0].hi()));
        let (rlo, rhi) = if free[0] == 0 {
            (lo / fv, hi / fv)
        } else {
            (fv / hi, fv / lo)
        };
        assert!(
            rlo - 1e-12 <= root && root <= rhi + 1e-12,
            "{rlo} {root} {rhi}"
        );
    }
    check_box_tampering(&d, &b, &res);
    let json = serde_json::to_value(&res).unwrap();
    let c = &json["certificate"];
    assert_eq!(json["status"], "exists");
    assert!(c["box"][0][0].is_string() && c["box"][0][1].is_string());
    assert!(c["fixed"][0]["coordinate"].is_u64() && c["fixed"][0]["value"].is_string());
    assert_eq!(c["equations"], serde_json::json!([1]));
    assert!(c["preconditioner"][0][0].is_string());
}

#[test]
fn p1_4_curve_krawczyk_two_equations() {
    let d = p1_4();
    let b = vec![vec![3, -3, -1, 1], vec![1, -2, 1, 2], vec![-4, 5, 0, -3]];
    let res = run(&d, &b);
    if let SlopeZero::Exists(ExistsCertificate::KrawczykBox {
        equations, fixed, ..
    }) = &res
    {
        assert_eq!(equations.len(), 2);
        assert_eq!(fixed.len(), 2);
        check_box_tampering(&d, &b, &res);
    } else {
        assert_eq!(res.status(), "exists");
    }
}

#[test]
fn boundary_only_zero_is_never_exists() {
    // μ_k ∝ k1 t2t3 + k2 t1t3 + k3 t1t2; common zeros of (1,-1,1), (-1,1,1)
    // need t1t2 = 0, then t2t3 = t1t3 = 0: only the vertices of the closed cone.
    let d = toy_d123();
    let b = vec![vec![1, -1, 1], vec![-1, 1, 1]];
    assert!(
        slope_exact(&d, &b[0], &[q(0, 1), q(0, 1), q(1, 1)])
            .unwrap()
            .is_zero()
    );
    assert!(
        slope_exact(&d, &b[1], &[q(0, 1), q(0, 1), q(1, 1)])
            .unwrap()
            .is_zero()
    );
    let res = run(&d, &b);
    assert_ne!(res.status(), "exists");
    // A boundary point is rejected as a certificate.
    let fake = SlopeZero::Exists(ExistsCertificate::RationalPoint {
        point: vec![q(0, 1), q(0, 1), q(1, 1)],
    });
    assert!(!verify_certificate(&d, &b, &fake));
    // P1^4: every vertex is a common zero of all slopes; this set has no other.
    let d4 = p1_4();
    let b4 = vec![vec![-1, 0, 3, -3], vec![2, 0, 1, -1], vec![-1, 0, -4, 4]];
    let res4 = run(&d4, &b4);
    assert_ne!(res4.status(), "exists");
}

#[test]
fn zero_branch_leaving_a_boundary_vertex_is_found() {
    // All slopes vanish at the vertex e4; the tangent directions of the two
    // quadrics there meet in (5, 1, 3, *) > 0, so a branch of common zeros
    // enters the open cone.
    let d = p1_4();
    let b = vec![vec![2, -1, 0, 3], vec![-3, 0, 2, 2], vec![1, 1, -2, -5]];
    let res = run(&d, &b);
    assert_eq!(res.status(), "exists");
}

/// P1^6 with three equations of degree (1,…,1): d_rst = 6 for distinct r,s,t.
fn p1_6() -> Vec<Vec<Vec<i64>>> {
    (0..6)
        .map(|r| {
            (0..6)
                .map(|s| {
                    (0..6)
                        .map(|t| if r != s && s != t && r != t { 6 } else { 0 })
                        .collect()
                })
                .collect()
        })
        .collect()
}

#[test]
fn m6_krawczyk() {
    let d = p1_6();
    let b = vec![
        vec![0, 3, 1, 3, -1, -1],
        vec![0, -1, -2, 2, -1, 2],
        vec![0, -2, 1, -5, 2, -1],
    ];
    let res = run(&d, &b);
    assert_eq!(res.status(), "exists");
    let s = plot_kahler_cone_svg(&d, &b, &res);
    check_svg(&s);
}

#[test]
fn combination_obstruction_json_and_tamper() {
    let d = toy_d123();
    let b = vec![vec![1, -1, 1], vec![-1, 1, 1]];
    let res = run(&d, &b);
    assert_eq!(kind(&res), "combination_obstruction");
    let json = serde_json::to_value(&res).unwrap();
    assert!(json["certificate"]["combination"][0]["bundle"].is_u64());
    let bad = SlopeZero::None(NoneCertificate::CombinationObstruction {
        combination: vec![
            Term {
                bundle: 0,
                coeff: q(1, 1),
            },
            Term {
                bundle: 1,
                coeff: q(-1, 1),
            },
        ],
    });
    assert!(!verify_certificate(&d, &b, &bad));
}

#[test]
fn subdivision_certificate_and_tamper() {
    let d = toy_m3();
    let b = vec![vec![1, -2, 1], vec![2, -2, 0], vec![-3, 4, -1]];
    let res = run(&d, &b);
    let SlopeZero::None(NoneCertificate::Subdivision { boxes }) = &res else {
        panic!("expected a subdivision, got {res:?}");
    };
    assert!(boxes.len() >= 3);
    let mut dropped = boxes.clone();
    dropped.pop();
    let t = SlopeZero::None(NoneCertificate::Subdivision { boxes: dropped });
    assert!(!verify_certificate(&d, &b, &t));
    let mut moved = boxes.clone();
    let last = moved.len() - 1;
    let ax = (0..3)
        .find(|&i| !moved[last].bx[i].width().is_zero())
        .expect("a leaf box has a free side");
    let iv = moved[last].bx[ax].clone();
    moved[last].bx[ax] = Interval::new(iv.mid(), iv.hi().clone()).unwrap();
    let t = SlopeZero::None(NoneCertificate::Subdivision { boxes: moved });
    assert!(!verify_certificate(&d, &b, &t));
    // Claiming a single root box per chart with bundle 1 alone must fail.
    let roots: Vec<ExcludedBox> = (0..3)
        .map(|c| ExcludedBox {
            chart: c,
            bx: (0..3)
                .map(|i| {
                    if i == c {
                        Interval::point(BigRational::one())
                    } else {
                        Interval::new(BigRational::zero(), BigRational::one()).unwrap()
                    }
                })
                .collect(),
            combination: vec![Term {
                bundle: 0,
                coeff: q(1, 1),
            }],
        })
        .collect();
    let t = SlopeZero::None(NoneCertificate::Subdivision { boxes: roots });
    assert!(!verify_certificate(&d, &b, &t));
    let json = serde_json::to_value(&res).unwrap();
    assert_eq!(json["certificate"]["boxes"][0]["chart"], 1);
}

#[test]
fn undecided_never_verifies_and_reports_reason() {
    let d = p1_4();
    let b = vec![
        vec![1, -2, 1, 2],
        vec![-2, 0, 0, 3],
        vec![0, -2, 3, 0],
        vec![1, 4, -4, -5],
    ];
    let opts = SlopeOptions {
        max_boxes: 4,
        newton_starts: 0,
        grid_points: 1,
        ..SlopeOptions::default()
    };
    let res = certify_slope_zero(&d, &b, &opts).unwrap();
    if res.status() != "undecided" {
        assert!(verify_certificate(&d, &b, &res));
    }
    let u = SlopeZero::Undecided { reason: "x".into() };
    assert!(!verify_certificate(&d, &b, &u));
    assert_eq!(
        serde_json::to_string(&u).unwrap(),
        r#"{"status":"undecided","reason":"x"}"#
    );
}

#[test]
fn malformed_input_is_an_error() {
    let d = p1_4();
    assert_eq!(
        certify_slope_zero(&d, &[vec![1, 0, 0]], &SlopeOptions::default()),
        Err(SlopeError::BundleLength {
            bundle: 0,
            expected: 4,
            found: 3
        })
    );
    assert_eq!(
        certify_slope_zero(&d, &[], &SlopeOptions::default()),
        Err(SlopeError::NoBundles)
    );
    let mut asym = bicubic();
    asym[0][0][1] = 4;
    assert!(matches!(
        certify_slope_zero(&asym, &[vec![1, -1]], &SlopeOptions::default()),
        Err(SlopeError::Asymmetric { .. })
    ));
    let ragged = vec![vec![vec![1, 0], vec![0]], vec![vec![0, 0], vec![0, 0]]];
    assert!(matches!(
        certify_slope_zero(&ragged, &[vec![1, -1]], &SlopeOptions::default()),
        Err(SlopeError::NotCubic { .. })
    ));
    assert_eq!(
        certify_slope_zero(&[], &[vec![]], &SlopeOptions::default()),
        Err(SlopeError::EmptyIntersection)
    );
    assert!(!verify_certificate(
        &asym,
        &[vec![1, -1]],
        &SlopeZero::Undecided {
            reason: String::new()
        }
    ));
    assert!(try_slope_exact(&d, &[1, 0, 0, 0], &[q(1, 1)]).is_err());
    // Issue 11: a malformed point is an error, never a slope of 0 ("vanishes").
    assert!(slope_exact(&d, &[1, 0, 0, 0], &[q(1, 1)]).is_err());
}

#[test]
fn huge_entries_do_not_panic() {
    let d = vec![vec![vec![i64::MAX]]];
    let res = certify_slope_zero(
        &d,
        &[vec![i64::MAX], vec![i64::MIN]],
        &SlopeOptions::default(),
    )
    .unwrap();
    assert_eq!(res.status(), "none");
    assert!(verify_certificate(
        &d,
        &[vec![i64::MAX], vec![i64::MIN]],
        &res
    ));
    let d = p1_4();
    let b = vec![vec![i64::MAX, -1, 0, 0], vec![i64::MIN + 1, 1, 0, 0]];
    let res = certify_slope_zero(&d, &b, &SlopeOptions::default()).unwrap();
    if res.status() != "undecided" {
        assert!(verify_certificate(&d, &b, &res));
    }
}

#[test]
fn json_rational_point_shape() {
    let d = p1_4();
    let res = run(&d, &[vec![1, -1, 0, 0], vec![-1, 1, 0, 0]]);
    assert_eq!(
        serde_json::to_string(&res).unwrap(),
        r#"{"status":"exists","certificate":{"kind":"rational_point","point":["1","1","1","1"]}}"#
    );
}

/// Checks that start and end tags balance (a minimal XML well-formedness test).
fn balanced(svg: &str) -> bool {
    let mut stack: Vec<String> = Vec::new();
    let mut rest = svg;
    while let Some(i) = rest.find('<') {
        let Some(j) = rest[i..].find('>') else {
            return false;
        };
        let tag = &rest[i + 1..i + j];
        rest = &rest[i + j + 1..];
        if tag.starts_with('?') || tag.starts_with('!') {
            continue;
        }
        if let Some(name) = tag.strip_prefix('/') {
            if stack.pop().as_deref() != Some(name.trim()) {
                return false;
            }
        } else if !tag.ends_with('/') {
            let name = tag.split_whitespace().next().unwrap_or("");
            stack.push(name.to_string());
        }
    }
    stack.is_empty()
}

fn check_svg(svg: &str) {
    assert!(svg.starts_with("<svg"));
    assert!(svg.contains(r#"xmlns="http://www.w3.org/2000/svg""#));
    assert!(svg.contains("viewBox"));
    assert!(svg.trim_end().ends_with("</svg>"));
    assert!(svg.contains("<text"));
    assert!(balanced(svg), "unbalanced tags");
}

#[test]
fn svg_m2_m3_m4_render() {
    let d2 = bicubic();
    let b2 = vec![vec![1, -2], vec![-1, 2]];
    let r2 = run(&d2, &b2);
    let s2 = plot_kahler_cone_svg(&d2, &b2, &r2);
    check_svg(&s2);
    assert!(s2.contains("bundle 1: O(1,-2)"));
    assert!(s2.contains("Krawczyk"));

    let d3 = toy_m3();
    let b3 = vec![vec![1, -2, 1], vec![2, -2, 0], vec![-3, 4, -1]];
    let r3 = run(&d3, &b3);
    let s3 = plot_kahler_cone_svg(&d3, &b3, &r3);
    check_svg(&s3);
    assert!(s3.contains("<path"));

    let d4 = p1_4();
    let b4 = vec![vec![2, -1, -1, 0], vec![-2, 1, 1, 0], vec![1, 1, -1, -1]];
    let r4 = run(&d4, &b4);
    let s4 = plot_kahler_cone_svg(&d4, &b4, &r4);
    check_svg(&s4);
    assert!(s4.contains("2-d slice through"));
    assert!(s4.contains("<circle"));

    let s1 = plot_kahler_cone_svg(
        &quintic(),
        &[vec![1]],
        &SlopeZero::Undecided {
            reason: "a<b & c".into(),
        },
    );
    check_svg(&s1);
    assert!(s1.contains("a&lt;b &amp; c"));
    let bad = plot_kahler_cone_svg(&d4, &[vec![1]], &r4);
    check_svg(&bad);
}

fn permuted_status(d: &[Vec<Vec<i64>>], b: &[Vec<i64>], rot: usize) -> (SlopeZero, SlopeZero) {
    let opts = SlopeOptions {
        newton_starts: 24,
        ..SlopeOptions::default()
    };
    let r1 = certify_slope_zero(d, b, &opts).unwrap();
    let mut pb = b.to_vec();
    pb.rotate_left(rot % b.len());
    pb.reverse();
    let r2 = certify_slope_zero(d, &pb, &opts).unwrap();
    (r1, r2)
}

fn bundle_set(m: usize) -> impl Strategy<Value = Vec<Vec<i64>>> {
    (2usize..=4).prop_flat_map(move |r| {
        prop::collection::vec(prop::collection::vec(-3i64..=3, m), r - 1).prop_map(move |mut v| {
            let last: Vec<i64> = (0..m)
                .map(|i| -v.iter().map(|k| k[i]).sum::<i64>())
                .collect();
            v.push(last);
            v
        })
    })
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, .. ProptestConfig::default() })]

    #[test]
    fn prop_p1_4(b in bundle_set(4), rot in 0usize..5) {
        let d = p1_4();
        let (r1, r2) = permuted_status(&d, &b, rot);
        if r1.status() != "undecided" {
            prop_assert!(verify_certificate(&d, &b, &r1));
        }
        let mut pb = b.clone();
        pb.rotate_left(rot % b.len());
        pb.reverse();
        if r2.status() != "undecided" {
            prop_assert!(verify_certificate(&d, &pb, &r2));
        }
        prop_assert_eq!(r1.status(), r2.status());
    }

    #[test]
    fn prop_bicubic(b in bundle_set(2), rot in 0usize..5) {
        let d = bicubic();
        let (r1, r2) = permuted_status(&d, &b, rot);
        if r1.status() != "undecided" {
            prop_assert!(verify_certificate(&d, &b, &r1));
        }
        prop_assert_eq!(r1.status(), r2.status());
    }
}

#[test]
fn svg_segment_rows_name_the_obstruction_and_skip_end_points() {
    // bicubic-b's bundles: μ4 of O(1,0) is > 0 on the open cone and vanishes only at the end point t = (1, 0).
    let d = bicubic();
    let b = vec![vec![-1, 1], vec![-1, 1], vec![1, -1], vec![1, 0]];
    let r = run(&d, &b);
    assert_eq!(r.status(), "none");
    let s = plot_kahler_cone_svg(&d, &b, &r);
    check_svg(&s);
    assert!(
        s.contains("μ4 &gt; 0 on the whole open cone (bundle 4 obstructs)"),
        "{s}"
    );
    assert!(s.contains("zero locus μ4 = 0  ← obstructs"));
    assert!(s.contains("solid &gt; 0, dashed &lt; 0"));
    // No zero tick of bundle 4 (colour #9467bd, width 3): its only zero is an end point, outside the cone.
    assert!(
        !s.lines()
            .any(|l| l.contains(r##"stroke="#9467bd" stroke-width="3""##)),
        "{s}"
    );
    // Ticks of the other three bundles all sit at x = 1/2, each on its own row (distinct heights).
    let ticks: Vec<&str> = s
        .lines()
        .filter(|l| l.starts_with("<line") && l.contains(r#"stroke-width="3""#))
        .collect();
    assert_eq!(ticks.len(), 3, "{ticks:?}");
}

#[test]
fn svg_legend_marker_is_a_shape_and_widths_are_explained() {
    let d = p1_4();
    let b = vec![vec![2, -1, -1, 0], vec![-2, 1, 1, 0], vec![1, 1, -1, -1]];
    let r = run(&d, &b);
    let s = plot_kahler_cone_svg(&d, &b, &r);
    check_svg(&s);
    // The point marker is drawn (a circle beside its text), not a glyph inside the text.
    assert!(!s.contains('◯'));
    assert!(s.contains(r#"<circle cx="32""#));
    assert!(s.contains("line widths: earlier bundles are drawn wider and underneath"));
    // Corners are labelled by the full point t of the slice.
    assert!(s.contains(">t = (0."), "{s}");
}
