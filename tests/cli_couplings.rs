//! End-to-end tests of `sheafwright couplings` and the couplings section of `report`: text with legend and
//! ranks, the JSON contract keys, warnings for failing models, and bad input (exit code 2).

mod common;
use common::{assert_refused, coupling_entries, json, sheafwright, temp_file};

#[test]
fn text_has_legend_ranks_and_normalisation() {
    let (code, out, err) = sheafwright(&["couplings", "catalogs-demo/tetraquadric-so10.toml"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("legend:"), "{out}");
    assert!(out.contains("forbidden_by_charge"), "{out}");
    assert!(out.contains("normalisation:"), "{out}");
    assert!(out.contains("[16 16 10] with 10_{1,2}#1"), "{out}");
    assert!(out.contains("structural rank"), "{out}");
    assert!(out.contains("relation (entries)"), "{out}");
}

#[test]
fn json_contract_keys() {
    let v = json(&[
        "couplings",
        "catalogs-demo/tetraquadric-so10.toml",
        "--json",
    ]);
    assert_eq!(v["schema"], "sheafwright.couplings/1");
    let classes = v["classes"].as_array().expect("classes");
    assert!(!classes.is_empty());
    let c = classes
        .iter()
        .find(|c| c["operator"] == "16 16 10")
        .expect("a 16 16 10 texture");
    assert!(c["structural_rank"].is_u64());
    assert!(
        c["rank"].is_u64(),
        "values are exact here, so the rank is known"
    );
    let entries = c["entries"].as_array().unwrap();
    assert!(
        entries
            .iter()
            .all(|e| e["fields"].as_array().unwrap().len() == 3)
    );
    assert!(entries.iter().any(|e| e["status"] == "forbidden_by_charge"));
    // Rationals are strings, integers numbers.
    let valued: Vec<_> = entries.iter().filter(|e| e["status"] == "value").collect();
    assert!(!valued.is_empty());
    assert!(valued.iter().all(|e| e["value"].is_string()));
    assert!(
        v["operators"]
            .as_array()
            .unwrap()
            .iter()
            .any(|o| o["operator"] == "16 16 10")
    );
    assert!(v["codimension"].is_u64());
}

#[test]
fn down_type_operator_name_and_type_vanishing_in_json() {
    let v = json(&[
        "couplings",
        "catalogs-demo/tetraquadric-typezero.toml",
        "--json",
    ]);
    let ops: Vec<&str> = v["operators"]
        .as_array()
        .unwrap()
        .iter()
        .map(|o| o["operator"].as_str().unwrap())
        .collect();
    assert!(
        ops.contains(&"5bar 10 5bar") && ops.contains(&"10 10 5"),
        "{ops:?}"
    );
    let up = v["classes"]
        .as_array()
        .unwrap()
        .iter()
        .find(|c| c["operator"] == "10 10 5")
        .expect("up-type texture");
    assert!(
        up["entries"]
            .as_array()
            .unwrap()
            .iter()
            .any(|e| e["status"] == "vanishes_by_type")
    );
    assert_eq!(up["rank"], 0);
}

#[test]
fn failing_model_gets_couplings_with_a_warning() {
    let (code, out, err) = sheafwright(&["couplings", "catalogs-demo/split-c.toml"]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("warning:"), "{err}");
    assert!(out.contains("== Couplings (E6"), "{out}");
}

#[test]
fn inline_bundles_singlets_and_timing() {
    let (code, out, err) = sheafwright(&[
        "couplings",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
        "--bundles",
        "-2,1,1,0;1,-2,1,0;0,0,-1,1;1,1,-1,0;0,0,0,-1",
        "--singlets",
        "1",
        "--timing",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("timing: 10 10 5"), "{err}");
    assert!(out.contains("switched on by singlets"), "{out}");
}

/// `couplings --json` of a sum on P1^5[(1,1,1,1,2);(1,1,1,1,0)] (the generic member of the default seed).
fn codimension_two_couplings(bundles: &str) -> (i32, String, String) {
    sheafwright(&[
        "couplings",
        "--ambient",
        "1,1,1,1,1",
        "--equations",
        "1,1,1,1,2;1,1,1,1,0",
        "--bundles",
        bundles,
        "--json",
    ])
}

/// A rank-5 sum on the codimension-2 configuration P1^5[(1,1,1,1,2);(1,1,1,1,0)] (invented; found by a random
/// search over c1 = 0 sums, it fails the consistency checks and is computed with a warning): the singlet couplings
/// `1 5 5bar` have exact non-zero values at type sum = K = 2, next to entries forbidden by charge and computed zeros.
#[test]
fn rank_five_codimension_two_sum_has_non_zero_allowed_entries() {
    let (code, out, err) =
        codimension_two_couplings("0,-1,1,0,1;0,1,0,0,-1;-1,0,1,1,0;0,1,-1,0,1;1,-1,-1,-1,-1");
    assert_eq!(code, 0, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["codimension"], 2);
    let mut non_zero = 0;
    for class in v["classes"].as_array().unwrap() {
        for e in class["entries"].as_array().unwrap() {
            if e["status"] == "value" && e["value"] != "0" {
                let types: usize = e["types"]
                    .as_array()
                    .unwrap()
                    .iter()
                    .map(|t| t.as_u64().unwrap() as usize)
                    .sum();
                assert!(types >= 2, "{e}");
                non_zero += 1;
            }
        }
    }
    assert!(non_zero > 0, "{out}");
}

/// A tensor whose lift is above the term limit is refused with the size named (as the texture's warning), its
/// entries become `not_computed`, and everything else is unchanged; the default limit computes the same
/// entries as values or computed zeros.
#[test]
fn lift_above_the_term_limit_is_refused_naming_its_size() {
    let model = "catalogs-demo/tetraquadric-a.toml";
    let full = json(&["couplings", model, "--json"]);
    let limited = json(&["couplings", model, "--json", "--max-terms", "100"]);
    let statuses = |v: &serde_json::Value| -> Vec<(String, String)> {
        coupling_entries(v)
            .into_iter()
            .map(|e| {
                (
                    e["fields"].to_string(),
                    e["status"].as_str().unwrap().to_string(),
                )
            })
            .collect()
    };
    let (a, b) = (statuses(&full), statuses(&limited));
    assert_eq!(a.len(), b.len());
    let mut refused = 0;
    for ((fa, sa), (fb, sb)) in a.iter().zip(&b) {
        assert_eq!(fa, fb);
        if sa != sb {
            assert!(sa == "value" || sa == "zero_computed", "{fa}: {sa} -> {sb}");
            assert_eq!(sb, "not_computed", "{fa}");
            refused += 1;
        }
    }
    assert!(refused > 0, "the limit 100 refuses some tensor of {model}");
    let warnings: Vec<String> = limited["classes"]
        .as_array()
        .unwrap()
        .iter()
        .flat_map(|c| c["warnings"].as_array().into_iter().flatten())
        .map(|w| w.as_str().unwrap().to_string())
        .collect();
    assert!(
        warnings
            .iter()
            .any(|w| w.contains("Čech–Koszul terms, above the limit 100")
                && w.contains("has at least")),
        "{warnings:?}"
    );
    assert_refused(&["couplings", model, "--max-terms", "0"], "--max-terms 0");
}

/// Rank-5 sums on the same codimension-2 configuration (invented; found by a seeded random search over c1 = 0
/// sums, both fail the consistency checks and are computed with a warning) whose *cubic matter* couplings are
/// non-zero: up-type `10 10 5` for the first, down-type `5bar 10 5bar` for the second. Every non-zero entry has
/// type sum ≥ K = 2 (the vanishing theorem, from memory: Blesneag, Buchbinder, Lukas, JHEP 2017), and the
/// entry with two slots exchanged has the opposite value (graded antisymmetry of the cup product of three
/// degree-1 classes, common practice; the textures derive the exchanged tensor with `YukawaTensor::permuted`,
/// which `tests/couplings_invariants.rs` checks against direct computations — here the labels of the derived
/// entries are checked).
#[test]
fn codimension_two_sums_have_non_zero_cubic_matter_couplings() {
    for (bundles, operator, swap) in [
        (
            "2,-1,2,-1,2;-1,2,-2,-1,-2;-1,-1,1,2,1;0,0,-2,0,0;0,0,1,0,-1",
            "10 10 5",
            (0, 1),
        ),
        (
            "0,0,0,2,-2;2,-1,0,2,1;2,-1,0,-2,0;-2,-1,0,-1,-1;-2,3,0,-1,2",
            "5bar 10 5bar",
            (0, 2),
        ),
    ] {
        let (code, out, err) = codimension_two_couplings(bundles);
        assert_eq!(code, 0, "{err}");
        assert!(err.contains("fails some consistency check"), "{err}");
        let v: serde_json::Value = serde_json::from_str(&out).unwrap();
        let mut values = std::collections::HashMap::new();
        for class in v["classes"].as_array().unwrap() {
            if class["operator"] != operator {
                continue;
            }
            for e in class["entries"].as_array().unwrap() {
                let fields: Vec<String> = serde_json::from_value(e["fields"].clone()).unwrap();
                let value: Option<num_rational::BigRational> = match e["status"].as_str().unwrap() {
                    "value" => Some(e["value"].as_str().unwrap().parse().unwrap()),
                    "zero_computed" => Some(num_traits::Zero::zero()),
                    _ => None,
                };
                if let Some(x) = value {
                    let types: u64 = e["types"]
                        .as_array()
                        .unwrap()
                        .iter()
                        .map(|t| t.as_u64().unwrap())
                        .sum();
                    if !num_traits::Zero::is_zero(&x) {
                        assert!(types >= 2, "{operator}: {e}");
                    }
                    values.insert(fields, x);
                }
            }
        }
        let non_zero = values
            .values()
            .filter(|x| !num_traits::Zero::is_zero(*x))
            .count();
        assert!(non_zero > 0, "{operator} has no non-zero entry: {out}");
        let mut pairs = 0;
        for (fields, x) in &values {
            let mut swapped = fields.clone();
            swapped.swap(swap.0, swap.1);
            if let Some(y) = values.get(&swapped).filter(|_| swapped != *fields) {
                assert_eq!(*x, -y.clone(), "{operator}: {fields:?} against {swapped:?}");
                pairs += usize::from(!num_traits::Zero::is_zero(x));
            }
        }
        assert!(
            pairs > 0,
            "{operator}: no exchanged pair of non-zero entries to compare"
        );
    }
}

/// A model with a symbolic parameter: the values are rational functions of it (text and JSON with the
/// coefficients), the reconstruction data and the special-value list are reported, and no warning says the
/// functions are missing. The values themselves are checked against direct computations in
/// `tests/couplings_parametric.rs`.
#[test]
fn parameter_model_gets_rational_function_values() {
    let (code, out, err) = sheafwright(&["couplings", "catalogs-demo/tetraquadric-psi.toml"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("exact rational functions of psi"), "{out}");
    assert!(out.contains("degree bound"), "{out}");
    assert!(out.contains("special values of psi"), "{out}");
    assert!(!err.contains("not yet shown") && !out.contains("not yet shown"));
    let v = json(&["couplings", "catalogs-demo/tetraquadric-psi.toml", "--json"]);
    let f = &v["family"];
    assert_eq!(f["parameter"], "psi");
    assert_eq!(f["member"], "1/2");
    let tensors = f["tensors"].as_array().expect("tensors");
    assert!(!tensors.is_empty());
    for t in tensors {
        assert_eq!(t["values"], "rational_functions");
        assert!(t["total_degree_bound"].is_u64());
        assert_eq!(t["check_points"].as_array().unwrap().len(), 3);
        assert!(t["special_values"].is_array());
    }
    assert!(f["special_values"].is_array());
    let valued: Vec<&serde_json::Value> = coupling_entries(&v)
        .into_iter()
        .filter(|e| e["status"] == "value")
        .collect();
    assert!(!valued.is_empty());
    for e in valued {
        assert!(e["value"].is_string());
        let rf = &e["rational_function"];
        assert_eq!(rf["parameter"], "psi");
        assert!(
            rf["numerator"]
                .as_array()
                .unwrap()
                .iter()
                .all(|c| c.is_string())
        );
        assert!(!rf["denominator"].as_array().unwrap().is_empty());
    }
    // --mode generic: a generic member, the parameter plays no role, and the output says so.
    let (code, out, err) = sheafwright(&[
        "couplings",
        "catalogs-demo/tetraquadric-psi.toml",
        "--mode",
        "generic",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("generic member (--mode generic)"), "{out}");
    assert!(!out.contains("rational functions of psi"));
}

#[test]
fn report_has_couplings_section() {
    let (code, out, err) = sheafwright(&["report", "catalogs-demo/tetraquadric-so10.toml"]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("== Couplings (SO(10)"), "{out}");
    let v = json(&["report", "catalogs-demo/tetraquadric-so10.toml", "--json"]);
    assert!(v["couplings"]["classes"].is_array());
}

#[test]
fn bad_input_is_refused() {
    assert_refused(
        &["couplings", "catalogs-demo/quintic-plain.toml"],
        "no line bundles",
    );
    assert_refused(
        &[
            "couplings",
            "catalogs-demo/tetraquadric-e6.toml",
            "--singlets",
            "99",
        ],
        "--singlets 99",
    );
    // Argument-parser errors: exit code 2 with clap's message naming the flag.
    let (code, _, err) = sheafwright(&[
        "couplings",
        "catalogs-demo/tetraquadric-e6.toml",
        "--singlets",
        "x",
    ]);
    assert_eq!(code, 2);
    assert!(
        err.starts_with("error:") && err.contains("--singlets"),
        "{err}"
    );
    assert_refused(
        &[
            "couplings",
            "catalogs-demo/tetraquadric-e6.toml",
            "--bundles",
            "1,2;3",
        ],
        "--bundles",
    );
    let bad = temp_file(
        "bad-couplings.toml",
        "name = \"x\"\n[ambient]\ndims = [1,\n",
    );
    assert_refused(&["couplings", &bad], "bad-couplings.toml");
    assert_refused(&["couplings"], "no configuration");
}
