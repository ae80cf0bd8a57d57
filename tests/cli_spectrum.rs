//! End-to-end tests of `sheafwright spectrum` and the report on every demo model: the JSON contract, the
//! verdict of each consistency check, the SVG picture, and bad input.

mod common;
use common::{assert_refused, json, sheafwright};

struct Expect {
    file: &'static str,
    rank: u64,
    c1_zero: bool,
    anomaly_ok: bool,
    slope: &'static str,
    families: i64,
}

/// Verdicts of the invented demo models (each designed to pass or to fail a named check).
const DEMOS: &[Expect] = &[
    Expect {
        file: "tetraquadric-a",
        rank: 5,
        c1_zero: true,
        anomaly_ok: true,
        slope: "exists",
        families: 4,
    },
    Expect {
        file: "tetraquadric-so10",
        rank: 4,
        c1_zero: true,
        anomaly_ok: true,
        slope: "exists",
        families: 10,
    },
    Expect {
        file: "tetraquadric-e6",
        rank: 3,
        c1_zero: true,
        anomaly_ok: true,
        slope: "exists",
        families: 12,
    },
    Expect {
        file: "tetraquadric-anomaly",
        rank: 4,
        c1_zero: true,
        anomaly_ok: false,
        slope: "exists",
        families: 0,
    },
    Expect {
        file: "bicubic-b",
        rank: 4,
        c1_zero: false,
        anomaly_ok: true,
        slope: "none",
        families: -3,
    },
    Expect {
        file: "split-c",
        rank: 3,
        c1_zero: true,
        anomaly_ok: true,
        slope: "none",
        families: 1,
    },
];

#[test]
fn demo_models_have_the_designed_verdicts() {
    for e in DEMOS {
        let path = format!("catalogs-demo/{}.toml", e.file);
        let v = json(&["spectrum", &path, "--json"]);
        assert_eq!(v["rank"], e.rank, "{}", e.file);
        assert_eq!(v["c1_zero"], e.c1_zero, "{}", e.file);
        assert_eq!(v["anomaly_ok"], e.anomaly_ok, "{}", e.file);
        assert_eq!(v["slope_zero"]["status"], e.slope, "{}", e.file);
        assert_eq!(v["families"], e.families, "{}", e.file);
        assert_eq!(v["index"].as_i64().unwrap(), -e.families, "{}", e.file);
        assert_eq!(
            v["c2_bundle"].as_array().unwrap().len(),
            4.min(v["c2_bundle"].as_array().unwrap().len())
        );
        for m in v["multiplets"].as_array().unwrap() {
            for key in ["kind", "bundles", "line_bundle", "count", "charge"] {
                assert!(m.get(key).is_some(), "multiplet key {key} in {}", e.file);
            }
        }
    }
}

#[test]
fn passing_models_count_families_from_cohomology() {
    // For a model passing every check, net families from the multiplet counts equal -χ(V) (MATH.md §4).
    for e in DEMOS
        .iter()
        .filter(|e| e.c1_zero && e.anomaly_ok && e.slope == "exists")
    {
        let v = json(&[
            "spectrum",
            &format!("catalogs-demo/{}.toml", e.file),
            "--json",
        ]);
        let family = match e.rank {
            5 => ("10", "10bar"),
            4 => ("16", "16bar"),
            _ => ("27", "27bar"),
        };
        let count = |kind: &str| -> i64 {
            v["multiplets"]
                .as_array()
                .unwrap()
                .iter()
                .filter(|m| m["kind"] == kind)
                .map(|m| m["count"].as_i64().unwrap())
                .sum()
        };
        assert_eq!(count(family.0) - count(family.1), e.families, "{}", e.file);
        assert_eq!(v["flags"]["net_families_match"], true);
    }
}

#[test]
fn inline_bundles_and_plot() {
    let dir = std::env::temp_dir().join(format!("sheafwright-plot-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let svg = dir.join("cone.svg");
    let v = json(&[
        "spectrum",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
        "--bundles",
        "2,1,-1,-2;1,-2,2,-1;-2,0,1,1;-1,1,-1,1;0,0,-1,1",
        "--plot",
        svg.to_str().unwrap(),
        "--json",
    ]);
    assert_eq!(v["families"], 4);
    let text = std::fs::read_to_string(&svg).unwrap();
    assert!(
        text.starts_with("<svg") || text.starts_with("<?xml"),
        "{}",
        &text[..40]
    );
    assert!(
        text.contains("xmlns=\"http://www.w3.org/2000/svg\"")
            && text.trim_end().ends_with("</svg>")
    );
    let (code, out, _) = sheafwright(&["spectrum", "catalogs-demo/tetraquadric-a.toml"]);
    assert_eq!(code, 0);
    for needle in [
        "Consistency",
        "anomaly",
        "slope-zero locus     exists",
        "Spectrum",
        "10_{",
    ] {
        assert!(out.contains(needle), "missing {needle:?} in\n{out}");
    }
}

#[test]
fn report_json_has_every_section() {
    let v = json(&["report", "catalogs-demo/tetraquadric-a.toml", "--json"]);
    assert_eq!(v["schema"], "sheafwright.report/1");
    assert_eq!(v["geometry"]["euler"], -128);
    assert_eq!(v["favourability"]["status"], "favourable");
    assert_eq!(v["spectrum"]["slope_zero"]["status"], "exists");
    assert_eq!(v["kahler_point"]["all_slopes_zero"], true);
}

#[test]
fn bad_input_is_refused_cleanly() {
    let base = [
        "spectrum",
        "--ambient",
        "1,1,1,1",
        "--equations",
        "2,2,2,2",
        "--bundles",
    ];
    assert_refused(&[&base[..], &["1,0,0,-1;-1,0,0,1"]].concat(), "rank");
    assert_refused(
        &[
            &base[..],
            &["1,0,0,-1;-1,0,0,1;0,0,0,0;0,0,0,0;0,0,0,0;0,0,0,0"],
        ]
        .concat(),
        "rank",
    );
    assert_refused(
        &[&base[..], &["1,0,0;-1,0,0,1;0,0,0,0"]].concat(),
        "has 3 entries",
    );
    assert_refused(
        &[&base[..], &["1,0,x,0;-1,0,0,1;0,0,0,0"]].concat(),
        "not an integer",
    );
    assert_refused(
        &["spectrum", "catalogs-demo/tetraquadric-special.toml"],
        "no line bundles",
    );
    // c1 != 0 is a failed check, not an error.
    let v = json(&[&base[..], &["1,0,0,0;0,0,0,0;0,0,0,0", "--json"]].concat());
    assert_eq!(v["c1_zero"], false);
}
