//! End-to-end tests of the quotient by a model's `[symmetry]`: the demo's downstairs spectrum and every
//! bad-input refusal (non-free action, non-homomorphic Wilson line, non-invariant equation, broken ambient
//! structure).

mod common;
use common::{assert_refused, json, temp_file};

#[test]
fn demo_quotient_has_a_consistent_downstairs_spectrum() {
    let v = json(&["spectrum", "catalogs-demo/tetraquadric-z2.toml", "--json"]);
    assert_eq!(v["group_order"], 2);
    assert_eq!(v["free"], true);
    let d = &v["downstairs"];
    // −χ(V)/|Γ| = 4/2.
    assert_eq!(d["families"], 2);
    let count = |kind: &str, name: &str| -> u64 {
        d["multiplets"]
            .as_array()
            .unwrap()
            .iter()
            .filter(|m| m["kind"] == kind)
            .flat_map(|m| m["components"].as_array().unwrap().clone())
            .filter(|c| c["name"] == name)
            .map(|c| c["count"].as_u64().unwrap())
            .sum()
    };
    // Chirality downstairs: net Q, d and L counts all equal the number of families; components of each
    // multiplet add up to its upstairs dimension divided by |Γ| on average (free action).
    assert_eq!(count("10", "Q") as i64 - count("10bar", "Qbar") as i64, 2);
    assert_eq!(count("5bar", "d") as i64 - count("5", "T") as i64, 2);
    assert_eq!(count("5bar", "L") as i64 - count("5", "H") as i64, 2);
    for m in d["multiplets"].as_array().unwrap() {
        let up = m["upstairs"].as_u64().unwrap();
        for c in m["components"].as_array().unwrap() {
            assert!(c["count"].as_u64().unwrap() <= up);
        }
    }
    let report = json(&["report", "catalogs-demo/tetraquadric-z2.toml", "--json"]);
    assert_eq!(report["free"], true);
    assert!(report["downstairs"]["multiplets"].is_array());
}

fn demo_with(symmetry: &str) -> String {
    let base = std::fs::read_to_string("catalogs-demo/tetraquadric-a.toml").unwrap();
    format!("{base}\n{symmetry}")
}

#[test]
fn bad_symmetries_are_refused_naming_the_element() {
    let non_free = temp_file(
        "nonfree.toml",
        &demo_with(
            "[symmetry]\nphase_order = 2\n[[symmetry.generators]]\nname = \"f\"\nphases = [0,1,0,0,0,0,0,0]\n",
        ),
    );
    assert_refused(&["spectrum", &non_free], "not free");
    let wilson = temp_file(
        "wilson.toml",
        &demo_with(
            "[symmetry]\nphase_order = 4\nwilson_line = [1]\n[[symmetry.generators]]\nname = \"a\"\nphases = [0,2,0,2,0,2,0,2]\n",
        ),
    );
    assert_refused(&["spectrum", &wilson], "not a homomorphism");
    let structure = temp_file(
        "structure.toml",
        &demo_with(
            "[symmetry]\n[[symmetry.generators]]\nname = \"s\"\nimages = [\"x1_0\", \"x2_0\", \"x1_1\", \"x2_1\", \"x3_0\", \"x3_1\", \"x4_0\", \"x4_1\"]\n",
        ),
    );
    assert_refused(&["spectrum", &structure], "ambient structure");
    let given = std::fs::read_to_string("catalogs-demo/tetraquadric-a.toml")
        .unwrap()
        .replace(
            "multidegree = [2, 2, 2, 2]",
            "multidegree = [2, 2, 2, 2]\npolynomial = \"x1_0^2*x2_0^2*x3_0^2*x4_0^2 + x1_1^2*x2_1^2*x3_1^2*x4_1^2 + x1_0*x1_1*x2_0^2*x3_0^2*x4_0^2\"",
        )
        .replace("mode = \"generic\"", "mode = \"given\"");
    let invariant = temp_file(
        "invariant.toml",
        &format!(
            "{given}\n[symmetry]\nphase_order = 2\n[[symmetry.generators]]\nname = \"a\"\nphases = [0,1,0,1,0,1,0,1]\n"
        ),
    );
    assert_refused(&["spectrum", &invariant], "not invariant");
}
