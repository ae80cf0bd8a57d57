//! End-to-end tests of `sheafwright report`: the text of every demo model against golden files in
//! `tests/golden/`, and the points a model builder reads first (certificate in words, field-pair counts,
//! anomaly wording, Hodge numbers, configuration matrix, no multiplet table when c1(V) != 0), plus the JSON types.
//!
//! Golden files: run `UPDATE_GOLDEN=1 cargo test --release --test cli_report` to rewrite them after an intended
//! change of the report text, then read the diff (`git diff tests/golden`) before committing.

mod common;
use common::{json, sheafwright};

const MODELS: &[&str] = &[
    "bicubic-b",
    "quintic-plain",
    "split-c",
    "tetraquadric-a",
    "tetraquadric-anomaly",
    "tetraquadric-e6",
    "tetraquadric-psi",
    "tetraquadric-so10",
    "tetraquadric-special",
];

fn report(model: &str) -> String {
    let (code, out, err) = sheafwright(&["report", &format!("catalogs-demo/{model}.toml")]);
    assert_eq!(code, 0, "{model}: {err}");
    out
}

#[test]
fn report_text_matches_golden_files() {
    let update = std::env::var_os("UPDATE_GOLDEN").is_some();
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/golden");
    let mut stale = Vec::new();
    for model in MODELS {
        let text = report(model);
        let path = dir.join(format!("report-{model}.txt"));
        if update {
            std::fs::write(&path, &text).unwrap();
            continue;
        }
        let golden = std::fs::read_to_string(&path)
            .unwrap_or_else(|_| panic!("missing {}: run with UPDATE_GOLDEN=1", path.display()));
        if golden != text {
            stale.push(format!(
                "{}:\n--- golden\n{golden}\n--- now\n{text}",
                path.display()
            ));
        }
    }
    assert!(
        stale.is_empty(),
        "report text differs from the golden file (UPDATE_GOLDEN=1 to accept):\n{}",
        stale.join("\n")
    );
}

#[test]
fn slope_certificate_is_in_words_with_decimals_kind_and_box_width() {
    let text = report("tetraquadric-so10");
    assert!(text.contains("certificate: Krawczyk box"), "{text}");
    assert!(text.contains("t ≈ (1, 1, 0.12867, 0.44300)"), "{text}");
    assert!(text.contains("box width 1.2e-7"), "{text}");
    // No raw JSON, no cut-off rationals (the couplings section's normalisation writes e_1∧…∧e_K on purpose).
    let before_couplings = text.split("== Couplings").next().unwrap_or_default();
    assert!(!before_couplings.contains('…'), "{text}");
    assert!(!text.contains("\"kind\""), "{text}");
    let text = report("tetraquadric-a");
    assert!(text.contains("certificate: rational point"), "{text}");
    assert!(text.contains("t = (1, 1, 1, 1) exactly"), "{text}");
    let text = report("split-c");
    assert!(
        text.contains("sign obstruction — μ3 (the slope of L_3) is < 0 on the whole Kähler cone"),
        "{text}"
    );
}

#[test]
fn vector_like_pairs_count_fields_per_representation() {
    let text = report("tetraquadric-a");
    assert!(
        text.contains("vector-like pairs: 3 of 5–5bar (5bar_{3,5}/5_{3,5})"),
        "{text}"
    );
    let text = report("tetraquadric-anomaly");
    assert!(text.contains("vector-like pairs: 30 of 16–16bar"), "{text}");
    let v = json(&[
        "spectrum",
        "catalogs-demo/tetraquadric-anomaly.toml",
        "--json",
    ]);
    let reps = v["flags"]["vector_like_field_pairs"].as_array().unwrap();
    assert_eq!(reps.len(), 1, "{reps:?}");
    assert_eq!(reps[0]["representation"], "16");
    assert_eq!(reps[0]["conjugate"], "16bar");
    assert_eq!(reps[0]["field_pairs"], 30);
}

#[test]
fn higgs_pair_candidates_agree_with_the_json() {
    for model in MODELS {
        let v = json(&["report", &format!("catalogs-demo/{model}.toml"), "--json"]);
        let Some(pairs) = v["spectrum"]["flags"]["higgs_pairs"].as_array() else {
            continue;
        };
        let text = report(model);
        let line = text
            .lines()
            .find(|l| l.contains("Higgs pair candidates"))
            .unwrap_or("");
        if v["spectrum"]["multiplet_table_meaningful"] == false {
            assert!(line.is_empty(), "{model}: {line}");
            continue;
        }
        if pairs.is_empty() {
            assert!(
                line.ends_with("Higgs pair candidates: none"),
                "{model}: {line}"
            );
        } else {
            let total: u64 = pairs.iter().map(|p| p["pairs"].as_u64().unwrap()).sum();
            assert!(
                line.contains(&format!("Higgs pair candidates: {total} (")),
                "{model}: {line}"
            );
        }
    }
    // The SO(10) demo has 10-plets but no charge-compatible 10/10 pair: no "yes" against an empty list.
    let text = report("tetraquadric-so10");
    assert!(text.contains("Higgs pair candidates: none"), "{text}");
    assert!(
        text.contains("Higgs-type multiplets: 12 fields in the 10"),
        "{text}"
    );
}

#[test]
fn no_multiplet_table_or_mismatch_when_c1_is_not_zero() {
    let text = report("bicubic-b");
    assert!(text.contains("c1(V) = 0            FAIL"), "{text}");
    assert!(text.contains("multiplet table does not apply"), "{text}");
    assert!(!text.contains("MISMATCH"), "{text}");
    let v = json(&["spectrum", "catalogs-demo/bicubic-b.toml", "--json"]);
    assert_eq!(v["multiplet_table_meaningful"], false);
    let v = json(&["spectrum", "catalogs-demo/tetraquadric-a.toml", "--json"]);
    assert_eq!(v["multiplet_table_meaningful"], true);
}

#[test]
fn anomaly_wording_names_the_case() {
    let text = report("tetraquadric-a");
    assert!(
        text.contains(
            "effective, taking the Kähler cone of X to be the ambient one (favourable case"
        ),
        "{text}"
    );
    let text = report("tetraquadric-anomaly");
    assert!(text.contains("anomaly c2(TX)-c2(V) FAIL"), "{text}");
    assert!(
        text.contains("negative against J_3, J_4: each J_r is nef"),
        "{text}"
    );
}

#[test]
fn geometry_shows_hodge_numbers_with_provenance_and_the_matrix() {
    let text = report("tetraquadric-a");
    assert!(
        text.contains("  h^(1,1)            4\n  h^(2,1)            68\n"),
        "{text}"
    );
    assert!(text.contains("by the favourability certificate"), "{text}");
    let v = json(&["report", "catalogs-demo/quintic-plain.toml", "--json"]);
    assert_eq!(v["hodge"]["h11"], 1);
    assert_eq!(v["hodge"]["h21"], 101); // quintic (1, 101): Candelas et al. 1988 CICY list, from memory
    let text = report("split-c");
    assert!(
        text.contains("(rows: ambient factors, columns: equations)\n         q1 q2\n    P2 |  2  1\n    P3 |  1  3\n"),
        "{text}"
    );
    assert!(
        text.contains("configuration      [P2|2 1, P3|1 3]"),
        "{text}"
    );
}

#[test]
fn json_numbers_are_numbers_and_summaries_are_not_repeated() {
    let v = json(&["report", "catalogs-demo/tetraquadric-a.toml", "--json"]);
    let k = &v["kahler_point"];
    assert_eq!(k["point"], serde_json::json!([1, 1, 1, 1]));
    assert_eq!(k["slopes"], serde_json::json!([0, 0, 0, 0, 0]));
    let s = &v["spectrum"];
    for key in [
        "rank",
        "c1_zero",
        "c2_bundle",
        "anomaly_ok",
        "index",
        "families",
    ] {
        assert!(s.get(key).is_some(), "{key}");
        assert!(
            s["consistency"].get(key).is_none(),
            "consistency repeats {key}"
        );
    }
    assert_eq!(v["geometry"]["configuration"], "[P1|2, P1|2, P1|2, P1|2]");
}
