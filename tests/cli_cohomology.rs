//! End-to-end tests of `sheafwright cohomology`: JSON contract, boxes, modes, representatives, bad input.

mod common;
use common::{assert_refused, json, sheafwright, temp_file};

#[test]
fn single_bundle_json_contract() {
    // Quintic: h^0(O_X(1)) = 5 (the five coordinates; textbook value, Hübsch, Calabi-Yau Manifolds).
    let v = json(&[
        "cohomology",
        "--ambient",
        "4",
        "--equations",
        "5",
        "--bundle",
        "1",
        "--json",
    ]);
    assert_eq!(v["bundle"], serde_json::json!([1]));
    assert_eq!(v["h"], serde_json::json!([5, 0, 0, 0]));
    assert_eq!(v["index"], 5);
    assert_eq!(v["method"]["kind"], "dimensions");
    let v = json(&[
        "cohomology",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
        "--bundle",
        "-2,2,2,2",
        "--json",
    ]);
    assert_eq!(v["h"], serde_json::json!([0, 24, 0, 0]));
    assert_eq!(v["method"]["kind"], "ranks");
    assert_eq!(v["method"]["polynomials"], "generic");
    assert!(!v["method"]["primes"].as_array().unwrap().is_empty());
    assert!(v["method"]["seed"].is_u64());
    // h^1 = 24 is the only non-zero group, so the one rank (D_0) is forced from one prime and the value is
    // the generic one; no d_r reaches degrees 2 and 3.
    assert_eq!(
        v["method"]["degrees"],
        serde_json::json!(["generic", "generic", "e1_dimensions", "e1_dimensions"])
    );
    assert_eq!(
        v["method"]["ranks"][0]["proof"],
        "modular_forced_by_vanishing"
    );
    assert!(
        !v["method"]["certification"]
            .as_str()
            .unwrap()
            .contains("probability")
    );
}

/// Issue 12 item 4: O(-4,4,0,0) on the tetra-quadric is fixed by the E_1 page (its two groups sit at p = 0
/// and p = 1 in adjacent degrees, and no d_r goes from p = 0 to p = 1); the old engine ranked a zero matrix and
/// printed "with high probability".
#[test]
fn regression_issue_12_result_fixed_by_e1_dimensions_says_so() {
    let v = json(&[
        "cohomology",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
        "--bundle=-4,4,0,0",
        "--json",
    ]);
    assert_eq!(v["h"], serde_json::json!([0, 15, 15, 0]));
    assert_eq!(v["method"]["kind"], "dimensions");
    assert_eq!(
        v["method"]["degrees"],
        serde_json::json!([
            "e1_dimensions",
            "e1_dimensions",
            "e1_dimensions",
            "e1_dimensions"
        ])
    );
    let (code, text, err) = common::sheafwright(&[
        "cohomology",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
        "--bundle=-4,4,0,0",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(text.contains("h^1: fixed by E_1 dimensions"), "{text}");
    assert!(!text.contains("probability"), "{text}");
}

#[test]
fn box_is_json_lines_and_independent_of_threads() {
    let args = [
        "cohomology",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
        "--box",
        "-2..2",
        "--json",
    ];
    let (code, one, err) = sheafwright(&[&args[..], &["--threads", "1"]].concat());
    assert_eq!(code, 0, "{err}");
    let (_, two, _) = sheafwright(&[&args[..], &["--threads", "2"]].concat());
    assert_eq!(one, two, "results must not depend on the thread count");
    let lines: Vec<serde_json::Value> = one
        .lines()
        .map(|l| serde_json::from_str(l).unwrap())
        .collect();
    assert_eq!(lines.len(), 625);
    for v in &lines {
        let h: Vec<i64> = v["h"]
            .as_array()
            .unwrap()
            .iter()
            .map(|x| x.as_i64().unwrap())
            .collect();
        assert_eq!(h[0] - h[1] + h[2] - h[3], v["index"].as_i64().unwrap());
    }
    let (code, text, _) = sheafwright(&[
        "cohomology",
        "--ambient",
        "4",
        "--equations",
        "5",
        "--box",
        "-1..1",
    ]);
    assert_eq!(code, 0);
    // The header names the configuration by its one-row-per-factor label.
    assert!(text.contains("# [P4|5]: bundle"), "{text}");
}

#[test]
fn given_polynomial_changes_the_answer() {
    // The invented special member of the tetra-quadric has an extra section of O(-2,2,2,2).
    let model = "catalogs-demo/tetraquadric-special.toml";
    let given = json(&["cohomology", model, "--bundle", "-2,2,2,2", "--json"]);
    assert_eq!(given["h"], serde_json::json!([1, 25, 0, 0]));
    assert_eq!(given["method"]["polynomials"], "given");
    assert_eq!(given["method"]["field"], "Q (exact)");
    let generic = json(&[
        "cohomology",
        model,
        "--bundle",
        "-2,2,2,2",
        "--mode",
        "generic",
        "--json",
    ]);
    assert_eq!(generic["h"], serde_json::json!([0, 24, 0, 0]));
}

#[test]
fn representatives_in_json() {
    let v = json(&[
        "cohomology",
        "catalogs-demo/tetraquadric-special.toml",
        "--bundle",
        "-2,2,2,2",
        "--representatives",
        "--json",
    ]);
    let reps = v["representatives"].as_array().unwrap();
    assert_eq!(reps.len(), 26);
    let h0: Vec<&serde_json::Value> = reps.iter().filter(|r| r["degree"] == 0).collect();
    assert_eq!(h0.len(), 1);
    assert_eq!(h0[0]["type"], 1);
    assert!(!h0[0]["bott_terms"].as_array().unwrap().is_empty());
    assert!(!h0[0]["lift"].as_array().unwrap().is_empty());
    let term = &h0[0]["bott_terms"][0];
    assert_eq!(term["koszul"], serde_json::json!([1]));
    assert_eq!(term["monomial"].as_array().unwrap().len(), 4);
}

#[test]
fn bad_input_is_refused_cleanly() {
    let base = [
        "cohomology",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
    ];
    let with = |extra: &[&'static str]| -> Vec<&'static str> { [&base[..], extra].concat() };
    assert_refused(&with(&["--bundle", "1,2,3"]), "has 3 entries");
    assert_refused(&with(&["--bundle", "1,a,3,4"]), "not an integer");
    assert_refused(&with(&["--bundle", "1,2,3,100000"]), "out of range");
    assert_refused(&with(&["--box", "-3..x"]), "not a range");
    assert_refused(&with(&["--box", "3..-3"]), "empty range");
    assert_refused(&with(&["--box", "-900..900"]), "too large");
    assert_refused(&with(&["--box", "-9223372036854775808..0"]), "must lie in");
    assert_refused(&with(&["--bundle", "300,300,300,300"]), "too large");
    assert_refused(&with(&[]), "--bundle");
    assert_refused(
        &with(&["--bundle", "0,0,0,0", "--mode", "given"]),
        "needs a model file",
    );
    assert_refused(
        &with(&["--bundle", "0,0,0,0", "--mode", "weird"]),
        "unknown mode",
    );
    // Two identical cubics in P5: not a complete intersection.
    let p = "x1_0^3 + x1_1^3 + x1_2^3 + x1_3^3 + x1_4^3 + x1_5^3 + x1_0*x1_1*x1_2";
    let path = temp_file(
        "repeated.toml",
        &format!(
            "[ambient]\ndims=[5]\n[[equations]]\nmultidegree=[3]\npolynomial=\"{p}\"\n[[equations]]\nmultidegree=[3]\npolynomial=\"{p}\"\n"
        ),
    );
    assert_refused(
        &["cohomology", &path, "--bundle", "3"],
        "complete intersection",
    );
}

#[test]
fn absurd_boxes_are_refused_with_their_estimate() {
    // −9..9 on the tetra-quadric did not finish in 28 minutes; the cost model (docs/performance.md) says so up front.
    let args = [
        "cohomology",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
        "--box",
        "-9..9",
        "--threads",
        "2",
    ];
    assert_refused(&args, "would take about 28.5 min on 2 threads");
    assert_refused(&args, "give --force to run it anyway");
    // --force only makes sense with a box.
    assert_refused(
        &[
            "cohomology",
            "--ambient",
            "1,1,1,1",
            "--equations",
            "2,2,2,2",
            "--bundle",
            "0,0,0,0",
            "--force",
        ],
        "--force applies only to --box",
    );
}

#[test]
fn quick_boxes_print_nothing_on_stderr() {
    let (code, out, err) = sheafwright(&[
        "cohomology",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
        "--box",
        "-2..2",
        "--json",
    ]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(out.lines().count(), 625);
    assert!(err.is_empty(), "{err}");
}
