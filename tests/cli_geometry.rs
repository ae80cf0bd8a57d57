//! End-to-end tests of the `geometry` and `report` commands: they run the built binary.

mod common;
use common::{assert_refused, json, sheafwright, temp_file};

#[test]
fn geometry_json_has_the_documented_keys() {
    // Published values: tetra-quadric χ = -128, c2·J = 24, d_rst = 2 for distinct r,s,t ([CDLS88]; d, c2 from memory).
    let v = json(&[
        "geometry",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
        "--json",
    ]);
    assert_eq!(v["dimension"], 3);
    assert_eq!(v["calabi_yau"], true);
    assert_eq!(v["euler"], -128);
    assert_eq!(v["c2"], serde_json::json!([24, 24, 24, 24]));
    assert_eq!(v["triple"][0][1][2], 2);
    assert_eq!(v["triple"][0][0][1], 0);
    assert_eq!(v["triple"].as_array().unwrap().len(), 4);
}

#[test]
fn codimension_two_inline_equations() {
    // P5 with two cubics: χ = -144, d = 9, c2·J = 54 ([CDLS88], [Hub92]).
    let v = json(&["geometry", "--ambient", "5", "--equations", "3;3", "--json"]);
    assert_eq!(v["euler"], -144);
    assert_eq!(v["triple"], serde_json::json!([[[9]]]));
    assert_eq!(v["c2"], serde_json::json!([54]));
}

#[test]
fn model_file_and_inline_agree() {
    let a = json(&["geometry", "catalogs-demo/bicubic-b.toml", "--json"]);
    let b = json(&[
        "geometry",
        "--ambient",
        "2,2",
        "--equations",
        "3,3",
        "--json",
    ]);
    assert_eq!(a, b);
    assert_eq!(a["euler"], -162);
}

#[test]
fn report_runs_on_every_demo_model() {
    for entry in std::fs::read_dir(concat!(env!("CARGO_MANIFEST_DIR"), "/catalogs-demo")).unwrap() {
        let path = entry.unwrap().path();
        // Scan files (name contains "scan") are not model files; tests/cli_scan.rs covers them.
        let is_scan = path
            .file_name()
            .is_some_and(|n| n.to_string_lossy().contains("scan"));
        if path.extension().is_some_and(|e| e == "toml") && !is_scan {
            let (code, out, err) = sheafwright(&["report", path.to_str().unwrap()]);
            assert_eq!(code, 0, "{}: {err}", path.display());
            assert!(out.contains("Euler number"), "{out}");
            let v = json(&["report", path.to_str().unwrap(), "--json"]);
            assert_eq!(v["geometry"]["calabi_yau"], true);
        }
    }
}

#[test]
fn bad_input_is_refused_cleanly() {
    assert_refused(
        &["geometry", "--ambient", "4", "--equations", "4"],
        "not Calabi-Yau",
    );
    assert_refused(
        &["geometry", "--ambient", "1,1,1,1", "--equations", "2,2,2"],
        "3 degree entries",
    );
    assert_refused(
        &["geometry", "--ambient", "1,1", "--equations", "3,-1;-1,3"],
        "negative degree",
    );
    assert_refused(
        &["geometry", "--ambient", "0,4", "--equations", "1,5"],
        "dimension 0",
    );
    assert_refused(
        &["geometry", "--ambient", "-2", "--equations", "1"],
        "dimension -2",
    );
    assert_refused(
        &["geometry", "--ambient", "4", "--equations", "five"],
        "not an integer",
    );
    assert_refused(
        &["geometry", "--ambient", "1,x", "--equations", "2"],
        "not an integer",
    );
    assert_refused(
        &["geometry", "--ambient", "1000000", "--equations", "1000001"],
        "too large",
    );
    assert_refused(
        &[
            "geometry",
            "--ambient",
            "1,1,1,1,1,1,1,1,1,1,1,1,1,1,1,1,1,1,1,1",
            "--equations",
            "2,2,2,2,2,2,2,2,2,2,2,2,2,2,2,2,2,2,2,2",
        ],
        "too large",
    );
    assert_refused(
        &["geometry", "--ambient", "4"],
        "--ambient needs --equations",
    );
    assert_refused(&["geometry"], "no configuration");
    assert_refused(&["geometry", "no-such-file.toml"], "cannot read");
}

#[test]
fn bad_model_files_are_refused_cleanly() {
    let cases: &[(&str, &str, &str)] = &[
        ("malformed.toml", "[ambient\ndims = [1]", "malformed TOML"),
        (
            "unknown.toml",
            "[ambient]\ndims=[4]\nfoo=1\n[[equations]]\nmultidegree=[5]",
            "malformed TOML",
        ),
        (
            "notcy.toml",
            "[ambient]\ndims=[4]\n[[equations]]\nmultidegree=[6]",
            "not Calabi-Yau",
        ),
        (
            "lengths.toml",
            "[ambient]\ndims=[1,1,1,1]\n[[equations]]\nmultidegree=[2,2,2,2]\n[bundle]\nline_bundles=[[1,0],[0,1],[-1,-1]]",
            "bundle.line_bundles[0]",
        ),
        (
            "rank.toml",
            "[ambient]\ndims=[4]\n[[equations]]\nmultidegree=[5]\n[bundle]\nline_bundles=[[1],[-1]]",
            "rank 2",
        ),
        (
            "poly.toml",
            "[ambient]\ndims=[4]\n[[equations]]\nmultidegree=[5]\npolynomial=\"x1_0^5 + * x1_1\"",
            "cannot parse polynomial",
        ),
        (
            "degree.toml",
            "[ambient]\ndims=[4]\n[[equations]]\nmultidegree=[5]\npolynomial=\"x1_0^4*x1_1 + x1_2^4\"",
            "multidegree",
        ),
        (
            "zero.toml",
            "[ambient]\ndims=[4]\n[[equations]]\nmultidegree=[5]\npolynomial=\"x1_0^5 - x1_0^5\"",
            "zero",
        ),
        (
            "reducible.toml",
            "[ambient]\ndims=[4]\n[[equations]]\nmultidegree=[5]\npolynomial=\"x1_0^5 + x1_0*x1_1^4\"",
            "divisible by x1_0",
        ),
        (
            "negkahler.toml",
            "[ambient]\ndims=[4]\n[[equations]]\nmultidegree=[5]\n[kahler]\npoint=[\"-1\"]",
            "kahler.point[0]",
        ),
    ];
    for (name, text, needle) in cases {
        let path = temp_file(name, text);
        assert_refused(&["report", &path], needle);
    }
}
