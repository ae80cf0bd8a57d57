//! End-to-end tests of `sheafwright export` (issue 8): exact round trip, schema validation, atomic writes, the
//! Python reader's d-bar check on every exported form, numpy loading of the npz form, and the Serre-duality
//! pairing H^1(X, L) × H^2(X, L^*) → H^3(X, O_X) computed from the file alone.

// Tensor sign formulas read best as index loops.
#![allow(clippy::needless_range_loop)]

mod common;

use common::{assert_refused, coupling_entries, sheafwright};
use num_rational::BigRational;
use num_traits::{One, Zero};
use serde_json::Value;
use sheafwright::cohomology::{CohomologyEngine, PolynomialChoice};
use sheafwright::io::model::Model;
use std::collections::HashMap;
use std::path::{Path, PathBuf};
use std::process::Command;

fn out_dir(tag: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("sheafwright-export-{}-{tag}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    d
}

fn export_json(model: &str, extra: &[&str], tag: &str) -> (PathBuf, Value) {
    let path = out_dir(tag).join("out.json");
    let p = path.to_str().unwrap();
    let mut args = vec!["export", model, "-o", p];
    args.extend_from_slice(extra);
    let (code, _, err) = sheafwright(&args);
    assert_eq!(code, 0, "{err}");
    let v: Value = serde_json::from_str(&std::fs::read_to_string(&path).unwrap()).unwrap();
    (path, v)
}

/// Run a Python check `script` on `file`; it must exit 0. Returns stdout and stderr.
fn run_python_script(script: &str, file: &Path) -> String {
    let out = Command::new("python3")
        .args(["-c", script, file.to_str().unwrap()])
        .output()
        .unwrap();
    let text =
        String::from_utf8_lossy(&out.stdout).into_owned() + &String::from_utf8_lossy(&out.stderr);
    assert!(out.status.success(), "{text}");
    text
}

/// Export `model` as npz into a fresh directory named by `tag`; returns the file's path.
fn export_npz(model: &str, tag: &str) -> PathBuf {
    let path = out_dir(tag).join("out.npz");
    let (code, _, err) = sheafwright(&[
        "export",
        model,
        "-o",
        path.to_str().unwrap(),
        "--format",
        "npz",
    ]);
    assert_eq!(code, 0, "{err}");
    path
}

fn rat(v: &Value) -> BigRational {
    v.as_str().unwrap().parse().unwrap()
}

/// The terms of an exported polynomial (`exponents` beside exact `coefficients`) by exponent.
fn polynomial_terms(p: &Value) -> HashMap<Vec<u32>, BigRational> {
    p["exponents"]
        .as_array()
        .unwrap()
        .iter()
        .zip(p["coefficients"].as_array().unwrap())
        .map(|(x, c)| (serde_json::from_value(x.clone()).unwrap(), rat(c)))
        .collect()
}

#[test]
fn exact_coefficients_round_trip() {
    let model = "catalogs-demo/tetraquadric-a.toml";
    let (_, v) = export_json(model, &[], "roundtrip");
    assert_eq!(v["schema"], "sheafwright-export");
    assert_eq!(v["version"], 1);
    let m = Model::load(Path::new(model)).unwrap();
    let engine =
        CohomologyEngine::new(m.config(), PolynomialChoice::Generic { seed: 20261202 }).unwrap();
    // polynomials: every (exponent, coefficient) pair equals the engine's exactly
    let eqs = v["polynomials"]["equations"].as_array().unwrap();
    assert_eq!(eqs.len(), engine.polynomials().len());
    for (e, p) in eqs.iter().zip(engine.polynomials()) {
        let from_file = polynomial_terms(e);
        let from_engine: HashMap<Vec<u32>, BigRational> =
            p.terms().map(|(x, c)| (x.clone(), c.clone())).collect();
        assert_eq!(from_file, from_engine);
    }
    // representatives: Bott and lift coefficients equal the engine's exactly
    let mut seen = 0;
    for mult in v["multiplets"].as_array().unwrap() {
        let k: Vec<i64> = serde_json::from_value(mult["line_bundle"].clone()).unwrap();
        let reps: Vec<_> = engine
            .representatives(&k)
            .unwrap()
            .into_iter()
            .filter(|c| c.degree == 1)
            .collect();
        let classes = mult["classes"].as_array().unwrap();
        assert_eq!(classes.len() as u64, mult["count"].as_u64().unwrap());
        assert_eq!(classes.len(), reps.len());
        for (c, r) in classes.iter().zip(&reps) {
            assert_eq!(c["type"].as_u64().unwrap() as usize, r.class_type);
            assert_eq!(
                c["bott_terms"],
                serde_json::to_value(&r.bott_terms).unwrap()
            );
            assert_eq!(c["lift"], serde_json::to_value(&r.lift).unwrap());
            assert_eq!(
                c["ambient_forms"].as_array().unwrap().len(),
                r.bott_terms.len()
            );
            seen += 1;
        }
    }
    assert!(seen > 10);
    // couplings: every entry field "<label>#<n>" names an exported class (the same basis)
    let counts: HashMap<String, usize> = v["multiplets"]
        .as_array()
        .unwrap()
        .iter()
        .map(|m| {
            (
                m["label"].as_str().unwrap().to_string(),
                m["classes"].as_array().unwrap().len(),
            )
        })
        .collect();
    let textures = v["couplings"]["classes"].as_array().expect("couplings");
    assert!(!textures.is_empty());
    for t in textures {
        for e in t["entries"].as_array().unwrap() {
            for f in e["fields"].as_array().unwrap() {
                let (label, n) = f.as_str().unwrap().rsplit_once('#').unwrap();
                let n: usize = n.parse().unwrap();
                assert!(n >= 1 && n <= counts[label], "{f}");
            }
        }
    }
}

/// A validator for the subset of JSON Schema used by docs/export-schema.json: `type`, `const`, `enum`,
/// `required`, `properties`, `items`, `$ref` to `#/$defs/…`, and the one `pattern` of exact numbers. An
/// unsupported `pattern` fails the test, so a schema change is noticed here.
fn validate(schema: &Value, root: &Value, v: &Value, at: &str, errors: &mut Vec<String>) {
    if let Some(r) = schema.get("$ref").and_then(Value::as_str) {
        let name = r.strip_prefix("#/$defs/").expect("local $ref");
        return validate(&root["$defs"][name], root, v, at, errors);
    }
    if let Some(c) = schema.get("const")
        && c != v
    {
        errors.push(format!("{at}: expected {c}, got {v}"));
    }
    if let Some(e) = schema.get("enum").and_then(Value::as_array)
        && !e.contains(v)
    {
        errors.push(format!("{at}: {v} not in {e:?}"));
    }
    if let Some(t) = schema.get("type") {
        let types: Vec<&str> = match t {
            Value::String(s) => vec![s.as_str()],
            Value::Array(a) => a.iter().filter_map(Value::as_str).collect(),
            _ => panic!("bad type"),
        };
        let ok = types.iter().any(|&t| match t {
            "object" => v.is_object(),
            "array" => v.is_array(),
            "string" => v.is_string(),
            "integer" => v.is_i64() || v.is_u64(),
            "number" => v.is_number(),
            "boolean" => v.is_boolean(),
            "null" => v.is_null(),
            _ => panic!("unknown type {t}"),
        });
        if !ok {
            errors.push(format!("{at}: {v:.40} is not {types:?}"));
            return;
        }
    }
    // As in JSON Schema, `pattern` constrains strings only.
    if let (Some(p), Some(s)) = (schema.get("pattern").and_then(Value::as_str), v.as_str()) {
        assert_eq!(p, "^-?[0-9]+(/[0-9]+)?$", "unsupported pattern");
        let (num, den) = s.split_once('/').unwrap_or((s, "1"));
        let digits = |t: &str| !t.is_empty() && t.bytes().all(|b| b.is_ascii_digit());
        if !(digits(num.strip_prefix('-').unwrap_or(num)) && digits(den)) {
            errors.push(format!("{at}: {s:?} is not an exact number"));
        }
    }
    if let Some(obj) = v.as_object() {
        for r in schema
            .get("required")
            .and_then(Value::as_array)
            .into_iter()
            .flatten()
        {
            if !obj.contains_key(r.as_str().unwrap()) {
                errors.push(format!("{at}: missing key {r}"));
            }
        }
        if let Some(props) = schema.get("properties").and_then(Value::as_object) {
            for (k, s) in props {
                if let Some(x) = obj.get(k) {
                    validate(s, root, x, &format!("{at}.{k}"), errors);
                }
            }
        }
    }
    if let (Some(items), Some(arr)) = (schema.get("items"), v.as_array()) {
        for (i, x) in arr.iter().enumerate() {
            validate(items, root, x, &format!("{at}[{i}]"), errors);
        }
    }
}

fn load_schema() -> Value {
    let text = std::fs::read_to_string(
        Path::new(env!("CARGO_MANIFEST_DIR")).join("docs/export-schema.json"),
    )
    .unwrap();
    serde_json::from_str(&text).unwrap()
}

/// A model with a symbolic parameter: the export carries the whole family of polynomials (substituting
/// `family.value` gives `equations` exactly) and the couplings as rational functions of the parameter, the same
/// report as `couplings --json`; on the benchmark family some of them are not constant.
#[test]
fn family_models_export_polynomials_and_couplings_as_functions_of_the_parameter() {
    let model = "benches/models/tetraquadric-psi-family.toml";
    let (path, v) = export_json(model, &[], "family");
    let fam = &v["polynomials"]["family"];
    assert_eq!(fam["parameter"], "psi");
    let t = rat(&fam["value"]);
    assert_eq!(t, BigRational::new(1.into(), 2.into()));
    let members = v["polynomials"]["equations"].as_array().unwrap();
    let family = fam["equations"].as_array().unwrap();
    assert_eq!(members.len(), family.len());
    let mut parametric_terms = 0;
    for (m, f) in members.iter().zip(family) {
        assert_eq!(m["multidegree"], f["multidegree"]);
        let want = polynomial_terms(m);
        let mut got = HashMap::new();
        for (x, cs) in f["exponents"]
            .as_array()
            .unwrap()
            .iter()
            .zip(f["coefficients"].as_array().unwrap())
        {
            let cs = cs.as_array().unwrap();
            parametric_terms += usize::from(cs.len() > 1);
            let at = cs
                .iter()
                .rev()
                .fold(BigRational::zero(), |acc, c| acc * &t + rat(c));
            if !at.is_zero() {
                got.insert(serde_json::from_value::<Vec<u32>>(x.clone()).unwrap(), at);
            }
        }
        assert_eq!(got, want);
    }
    assert!(parametric_terms > 0, "the family has psi-dependent terms");
    let couplings = &v["couplings"];
    assert_eq!(couplings["family"]["parameter"], "psi");
    let tensors = couplings["family"]["tensors"].as_array().unwrap();
    assert!(!tensors.is_empty());
    for tensor in tensors {
        assert_eq!(tensor["values"], "rational_functions", "{tensor}");
        assert!(tensor["total_degree_bound"].as_u64().is_some());
        assert_eq!(tensor["member_check"], "agrees");
    }
    let values: Vec<&Value> = coupling_entries(couplings)
        .into_iter()
        .filter(|e| e["status"] == "value")
        .collect();
    assert!(!values.is_empty());
    assert!(
        values
            .iter()
            .all(|e| e["rational_function"]["parameter"] == "psi")
    );
    assert!(
        values.iter().any(|e| e["rational_function"]["numerator"]
            .as_array()
            .unwrap()
            .len()
            > 1),
        "some coupling depends on psi"
    );
    // the same textures as the couplings command
    let (code, out, err) = sheafwright(&["couplings", model, "--json"]);
    assert_eq!(code, 0, "{err}");
    let direct: Value = serde_json::from_str(&out).unwrap();
    assert_eq!(couplings["classes"], direct["classes"]);
    assert_eq!(couplings["family"], direct["family"]);
    // the Python reader checks the family exactly, and fails on a changed family coefficient
    if python3().is_none() {
        return;
    }
    let (code, out) = run_reader(&path, &[]);
    assert_eq!(code, 0, "{out}");
    assert!(out.contains("reproduce the member exactly"), "{out}");
    let mut bad = v.clone();
    let first = &mut bad["polynomials"]["family"]["equations"][0]["coefficients"][0][0];
    *first = (rat(first) + BigRational::one()).to_string().into();
    let bad_path = out_dir("family-bad").join("bad.json");
    std::fs::write(&bad_path, bad.to_string()).unwrap();
    let (code, out) = run_reader(&bad_path, &[]);
    assert_eq!(code, 1, "{out}");
    assert!(out.contains("FAIL equation 1"), "{out}");
}

#[test]
fn exports_validate_against_the_schema() {
    let schema = load_schema();
    for (model, tag) in [
        ("catalogs-demo/tetraquadric-a.toml", "schema-a"),
        ("catalogs-demo/split-c.toml", "schema-c"),
        ("catalogs-demo/tetraquadric-psi.toml", "schema-psi"),
        ("catalogs-demo/tetraquadric-special.toml", "schema-s"),
    ] {
        let extra: &[&str] = if model.contains("special") {
            &["--with-duals"]
        } else {
            &[]
        };
        if model.contains("special") {
            // no [bundle] section: refused, and nothing written
            let path = out_dir(tag).join("out.json");
            assert_refused(
                &["export", model, "-o", path.to_str().unwrap()],
                "no [bundle] section",
            );
            assert!(!path.exists());
            continue;
        }
        let (_, v) = export_json(model, extra, tag);
        let mut errors = Vec::new();
        validate(&schema, &schema, &v, "$", &mut errors);
        assert!(
            errors.is_empty(),
            "{model}: {:?}",
            &errors[..errors.len().min(5)]
        );
        // the validator can fail: a renamed key and a float coefficient are caught
        let mut bad = v.clone();
        bad["version"] = 2.into();
        bad["polynomials"]["equations"][0]["coefficients"][0] = "1.5".into();
        let mut errors = Vec::new();
        validate(&schema, &schema, &bad, "$", &mut errors);
        assert_eq!(errors.len(), 2, "{errors:?}");
    }
}

#[test]
fn failing_writes_leave_no_file() {
    let dir = out_dir("atomic");
    // an output folder that does not exist
    let missing = dir.join("no-such-dir").join("out.json");
    assert_refused(
        &[
            "export",
            "catalogs-demo/tetraquadric-a.toml",
            "-o",
            missing.to_str().unwrap(),
        ],
        "cannot write",
    );
    assert!(!missing.exists());
    // bad format: refused before any computation
    let target = dir.join("out.json");
    assert_refused(
        &[
            "export",
            "catalogs-demo/tetraquadric-a.toml",
            "-o",
            target.to_str().unwrap(),
            "--format",
            "xml",
        ],
        "unknown format",
    );
    assert!(!target.exists());
    // killed mid-run, repeatedly at different moments: the target is absent or complete, never partial
    for delay_ms in [5u64, 40, 120, 250] {
        let _ = std::fs::remove_file(&target);
        let mut child = Command::new(env!("CARGO_BIN_EXE_sheafwright"))
            .args([
                "export",
                "catalogs-demo/tetraquadric-so10.toml",
                "-o",
                target.to_str().unwrap(),
            ])
            .current_dir(env!("CARGO_MANIFEST_DIR"))
            .stdout(std::process::Stdio::null())
            .spawn()
            .unwrap();
        std::thread::sleep(std::time::Duration::from_millis(delay_ms));
        let _ = child.kill();
        let _ = child.wait();
        if target.exists() {
            let text = std::fs::read_to_string(&target).unwrap();
            let v: Value = serde_json::from_str(&text).expect("complete JSON, never partial");
            assert_eq!(v["schema"], "sheafwright-export");
        }
    }
}

fn python3() -> Option<&'static str> {
    let ok = Command::new("python3")
        .arg("--version")
        .output()
        .map(|o| o.status.success())
        .unwrap_or(false);
    if ok {
        Some("python3")
    } else {
        eprintln!("SKIPPED: python3 is not installed; the Python reader was not run");
        None
    }
}

fn run_reader(file: &Path, extra: &[&str]) -> (i32, String) {
    let out = Command::new("python3")
        .arg(Path::new(env!("CARGO_MANIFEST_DIR")).join("docs/examples/read_export.py"))
        .arg(file)
        .args(extra)
        .output()
        .unwrap();
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned() + &String::from_utf8_lossy(&out.stderr),
    )
}

#[test]
fn python_reader_checks_every_form_is_dbar_closed() {
    if python3().is_none() {
        return;
    }
    // every exported ambient form of one demo model (and of the codimension-2 demo), at random points of X
    for (model, points, tag) in [
        ("catalogs-demo/tetraquadric-a.toml", "2", "py-a"),
        ("catalogs-demo/split-c.toml", "1", "py-c"),
    ] {
        let (path, v) = export_json(model, &[], tag);
        let forms: usize = v["multiplets"]
            .as_array()
            .unwrap()
            .iter()
            .flat_map(|m| m["classes"].as_array().unwrap())
            .map(|c| c["ambient_forms"].as_array().unwrap().len())
            .sum();
        // type >= 1 classes carry the partition-of-unity form (docs/representatives.md)
        let partition: usize = v["multiplets"]
            .as_array()
            .unwrap()
            .iter()
            .flat_map(|m| m["classes"].as_array().unwrap())
            .filter(|c| c["on_x"] == "partition_of_unity")
            .count();
        assert!(partition > 0, "{model}: no partition-of-unity class");
        assert!(!v["face_forms"].as_array().unwrap().is_empty());
        let (code, out) = run_reader(&path, &["--all", "--points", points]);
        assert_eq!(code, 0, "{out}");
        let p: usize = points.parse().unwrap();
        assert!(
            out.contains(&format!("checked {} ambient forms", forms * p)),
            "{out}"
        );
        assert!(
            out.contains(&format!(
                "checked {} partition-of-unity forms on X",
                partition * p
            )),
            "{out}"
        );
        // the partition-of-unity check can fail: a changed lift term breaks dbar-closedness on X, and a changed
        // face form breaks the identity with the Koszul term off X
        let mut bad_lift = v.clone();
        let mut bad_face = v.clone();
        for m in bad_lift["multiplets"].as_array_mut().unwrap() {
            for c in m["classes"].as_array_mut().unwrap() {
                if c["on_x"] == "partition_of_unity" {
                    let t = c["lift"]
                        .as_array_mut()
                        .unwrap()
                        .iter_mut()
                        .find(|t| t["koszul"].as_array().unwrap().is_empty())
                        .unwrap();
                    let doubled = rat(&t["coefficient"]) * BigRational::from_integer(2.into());
                    t["coefficient"] = doubled.to_string().into();
                }
            }
        }
        for f in bad_face["face_forms"].as_array_mut().unwrap() {
            if f["face"].as_array().unwrap().len() > 1 {
                let t = &mut f["terms"][0];
                t["coefficient"] = (rat(&t["coefficient"]) + BigRational::one())
                    .to_string()
                    .into();
            }
        }
        for (bad, name) in [(bad_lift, "bad-lift.json"), (bad_face, "bad-face.json")] {
            let bad_path = path.with_file_name(name);
            std::fs::write(&bad_path, serde_json::to_string(&bad).unwrap()).unwrap();
            let (code, out) = run_reader(&bad_path, &[]);
            assert_eq!(code, 1, "{name}: {out}");
            assert!(
                out.contains("FAIL") && out.contains("partition of unity"),
                "{out}"
            );
        }
        // the one-class mode prints coefficient values
        let (code, out) = run_reader(&path, &[]);
        assert_eq!(code, 0, "{out}");
        assert!(out.contains("dxbar("), "{out}");
        // the check can fail: a wrong power of kappa breaks d-bar closedness (and homogeneity)
        let mut bad = v.clone();
        for m in bad["multiplets"].as_array_mut().unwrap() {
            for c in m["classes"].as_array_mut().unwrap() {
                for f in c["ambient_forms"].as_array_mut().unwrap() {
                    for fac in f["factors"].as_array_mut().unwrap() {
                        if fac["kind"] == "top" {
                            for t in fac["terms"].as_array_mut().unwrap() {
                                t["kappa_power"] = (t["kappa_power"].as_i64().unwrap() + 1).into();
                            }
                        }
                    }
                }
            }
        }
        let bad_path = path.with_file_name("bad.json");
        std::fs::write(&bad_path, serde_json::to_string(&bad).unwrap()).unwrap();
        let (code, out) = run_reader(&bad_path, &["--all"]);
        assert_eq!(code, 1, "{out}");
        assert!(out.contains("FAIL"), "{out}");
    }
}

#[test]
fn npz_loads_with_numpy() {
    if python3().is_none() {
        return;
    }
    let path = export_npz("catalogs-demo/split-c.toml", "npz");
    // the archive itself is checked with the standard library (zipfile), numpy when it is installed
    let script = r#"
import sys, zipfile, json
from fractions import Fraction
z = zipfile.ZipFile(sys.argv[1])
assert z.testzip() is None
names = z.namelist()
assert "schema.npy" in names and "bott_exponents.npy" in names, names
try:
    import numpy as np
except ImportError:
    print("NOTICE: numpy not installed; numpy.load check skipped")
    sys.exit(0)
d = np.load(sys.argv[1])
assert str(d["schema"][0]) == "sheafwright-export"
assert int(d["version"][0]) == 1
ex, fl, st = d["polynomial_1_exponents"], d["polynomial_1_coefficients"], d["polynomial_1_coefficients_exact"]
assert ex.shape[0] == fl.shape[0] == st.shape[0] > 0 and ex.shape[1] == len(d["variables"])
for f, s in zip(fl, st):
    assert abs(f - float(Fraction(str(s)))) <= 1e-12 * abs(f)
assert d["bott_exponents"].shape[0] == d["bott_coefficients"].shape[0] == d["bott_terms"].shape[0]
lt, le, lc, ls = d["lift_terms"], d["lift_exponents"], d["lift_coefficients"], d["lift_coefficients_exact"]
assert lt.shape[0] == le.shape[0] == lc.shape[0] == ls.shape[0] > 0 and lt.shape[1] == 3 + len(d["ambient"])
for f, s in zip(lc, ls):
    assert abs(f - float(Fraction(str(s)))) <= 1e-12 * abs(f)
assert d["class_on_x"].shape[0] == d["classes"].shape[0] == d["class_partition_exponents"].shape[0]
assert (d["class_partition_exponents"] >= 1).all()
ft = d["face_form_terms"]
assert ft.shape[0] == d["face_form_x"].shape[0] == d["face_form_coefficients_exact"].shape[0] > 0
print("numpy ok", ex.shape, d["bott_exponents"].shape, lt.shape, ft.shape)
"#;
    let text = run_python_script(script, &path);
    println!("{text}");
}

/// The npz of a model with a symbolic parameter carries the family's polynomials; substituting the member value
/// (exactly, with Fractions) into `family_polynomial_J_*` gives `polynomial_J_*`.
#[test]
fn npz_family_polynomials_specialise_to_the_member() {
    if python3().is_none() {
        return;
    }
    let path = export_npz("catalogs-demo/tetraquadric-psi.toml", "npz-family");
    let script = r#"
import sys
from fractions import Fraction
try:
    import numpy as np
except ImportError:
    print("NOTICE: numpy not installed; family npz check skipped")
    sys.exit(0)
d = np.load(sys.argv[1])
name, value = [str(x) for x in d["family_parameter"]]
assert name == "psi", name
t = Fraction(value)
j = 1
while f"polynomial_{j}_exponents" in d:
    member = {tuple(int(x) for x in e): Fraction(str(c)) for e, c in
              zip(d[f"polynomial_{j}_exponents"], d[f"polynomial_{j}_coefficients_exact"])}
    ex = d[f"family_polynomial_{j}_exponents"]
    got = {}
    varying = 0
    for (term, power), c in zip(d[f"family_polynomial_{j}_terms"], d[f"family_polynomial_{j}_coefficients_exact"]):
        key = tuple(int(x) for x in ex[int(term)])
        got[key] = got.get(key, Fraction(0)) + Fraction(str(c)) * t ** int(power)
        varying += int(power) > 0
    got = {k: v for k, v in got.items() if v != 0}
    assert got == member, (j, len(got), len(member))
    assert varying > 0
    j += 1
assert j > 1
print("family npz ok", j - 1)
"#;
    let text = run_python_script(script, &path);
    assert!(
        text.contains("family npz ok") || text.contains("NOTICE"),
        "{text}"
    );
}

/// A Čech–Koszul basis element: (Koszul set, faces, monomial).
type TermKey = (Vec<usize>, Vec<Vec<usize>>, Vec<Vec<i64>>);
/// A polynomial as (monomial per factor, coefficient) pairs.
type FilePoly = Vec<(Vec<Vec<i64>>, BigRational)>;

/// One Čech–Koszul term read from the file.
struct Term {
    koszul: Vec<usize>,
    faces: Vec<Vec<usize>>,
    monomial: Vec<Vec<i64>>,
    coefficient: BigRational,
}

fn terms(lift: &Value) -> Vec<Term> {
    lift.as_array()
        .unwrap()
        .iter()
        .map(|t| Term {
            koszul: serde_json::from_value(t["koszul"].clone()).unwrap(),
            faces: serde_json::from_value(t["faces"].clone()).unwrap(),
            monomial: serde_json::from_value(t["monomial"].clone()).unwrap(),
            coefficient: rat(&t["coefficient"]),
        })
        .collect()
}

/// The coordinate in H^3(X, O_X) of the cup product of two lifted cocycles, from the file alone.
///
/// Cup product (MATH.md §3): per factor `[I] ∪ [J] = [I ∪ J]` if `max I = min J`, else 0, monomials multiply;
/// across factors the sign `(−1)^{Σ_{i>j} q_i(u) q_j(w)}`; across the Koszul part `(−1)^{p(u)·q(w)}` times the
/// sign of `e_S ∧ e_T`. The functional: the coefficient of `x^{(−1,…,−1)}` on the full faces in Koszul degree
/// `K`. It vanishes on coboundaries of `δ + t` (no cochain of a smaller face carries `x_l^{−1}` for the missing
/// vertex `l`, and `t` lowers the Koszul degree from `K+1`, which does not exist) and is 1 on the generator, so
/// it is the coordinate of the class (`h^3(O_X) = 1`).
fn pairing(u: &[Term], w: &[Term], dims: &[usize], k: usize) -> BigRational {
    let mut index: HashMap<TermKey, &BigRational> = HashMap::new();
    for t in w {
        index.insert(
            (t.koszul.clone(), t.faces.clone(), t.monomial.clone()),
            &t.coefficient,
        );
    }
    let mut total = BigRational::zero();
    'terms: for a in u {
        // I_i must be an initial segment {0..v}; then J_i = {v..n_i}
        let mut faces = Vec::new();
        for (i, f) in a.faces.iter().enumerate() {
            let v = *f.last().unwrap();
            if f.iter().enumerate().any(|(pos, &x)| pos != x) {
                continue 'terms;
            }
            faces.push((v..=dims[i]).collect::<Vec<usize>>());
        }
        let koszul: Vec<usize> = (1..=k).filter(|j| !a.koszul.contains(j)).collect();
        let monomial: Vec<Vec<i64>> = a
            .monomial
            .iter()
            .map(|e| e.iter().map(|&x| -1 - x).collect())
            .collect();
        let Some(&b) = index.get(&(koszul.clone(), faces.clone(), monomial)) else {
            continue;
        };
        let qa: Vec<usize> = a.faces.iter().map(|f| f.len() - 1).collect();
        let qb: Vec<usize> = faces.iter().map(|f| f.len() - 1).collect();
        let mut sign = 0usize;
        for i in 0..dims.len() {
            for j in 0..i {
                sign += qa[i] * qb[j];
            }
        }
        sign += a.koszul.len() * qb.iter().sum::<usize>();
        sign += a
            .koszul
            .iter()
            .map(|s| koszul.iter().filter(|t| *t < s).count())
            .sum::<usize>();
        let term = &a.coefficient * b;
        if sign % 2 == 1 {
            total -= term;
        } else {
            total += term;
        }
    }
    total
}

fn rank(mut m: Vec<Vec<BigRational>>) -> usize {
    let (rows, cols) = (m.len(), m.first().map_or(0, Vec::len));
    let mut r = 0;
    for c in 0..cols {
        let Some(p) = (r..rows).find(|&i| !m[i][c].is_zero()) else {
            continue;
        };
        m.swap(r, p);
        for i in 0..rows {
            if i != r && !m[i][c].is_zero() {
                let f = &m[i][c] / &m[r][c];
                for j in c..cols {
                    let d = &f * &m[r][j];
                    m[i][j] -= d;
                }
            }
        }
        r += 1;
    }
    r
}

#[test]
fn serre_duality_pairing_from_the_file_alone() {
    // h^1(L) = h^2(L^*) by Serre duality (common practice), and the cup product pairing into the
    // one-dimensional H^3(X, O_X) is perfect: the matrix of the exported bases is square and invertible.
    let mut checked = 0;
    for (model, tag) in [
        ("catalogs-demo/tetraquadric-a.toml", "serre-a"),
        ("catalogs-demo/split-c.toml", "serre-c"),
    ] {
        let (_, v) = export_json(model, &["--with-duals"], tag);
        let dims: Vec<usize> =
            serde_json::from_value(v["configuration"]["ambient"].clone()).unwrap();
        let k = v["configuration"]["equations"].as_array().unwrap().len();
        for mult in v["multiplets"].as_array().unwrap() {
            let classes = mult["classes"].as_array().unwrap();
            let duals = mult["dual_classes"].as_array().unwrap();
            assert_eq!(classes.len(), duals.len(), "{}", mult["label"]);
            let us: Vec<Vec<Term>> = classes
                .iter()
                .map(|c| {
                    assert_eq!(c["lift_truncated"], false);
                    terms(&c["lift"])
                })
                .collect();
            let ws: Vec<Vec<Term>> = duals.iter().map(|c| terms(&c["lift"])).collect();
            let matrix: Vec<Vec<BigRational>> = us
                .iter()
                .map(|u| ws.iter().map(|w| pairing(u, w, &dims, k)).collect())
                .collect();
            assert_eq!(
                rank(matrix.clone()),
                classes.len(),
                "{}: degenerate pairing",
                mult["label"]
            );
            // the check can fail: pairing with a class scaled to zero lowers the rank
            if classes.len() >= 2 {
                let mut m2 = matrix.clone();
                for row in &mut m2 {
                    row[0] = BigRational::zero() * BigRational::one();
                }
                assert!(rank(m2) < classes.len());
            }
            checked += 1;
        }
    }
    assert!(checked >= 10, "{checked}");
}

/// The total differential `δ + t` of a single Čech–Koszul basis element, from the file's polynomials alone
/// (MATH.md §3: `δ = Σ_i (−1)^{q_1+…+q_{i−1}} δ_i`, `δ_i[I] = Σ_{l∉I} σ(l, I)[I ∪ {l}]`,
/// `σ(l, I) = (−1)^{#{i∈I : i<l}}`; `t = (−1)^q d_K`, `d_K(e_S) = Σ_pos (−1)^pos p_j e_{S∖j}`).
fn total_differential(y: &Term, dims: &[usize], polys: &[FilePoly]) -> Vec<Term> {
    let mut out = Vec::new();
    let mut before = 0usize;
    for i in 0..dims.len() {
        for l in 0..=dims[i] {
            if y.faces[i].contains(&l) {
                continue;
            }
            let below = y.faces[i].iter().filter(|&&v| v < l).count();
            let mut faces = y.faces.clone();
            faces[i].push(l);
            faces[i].sort();
            let c = if (before + below) % 2 == 1 {
                -y.coefficient.clone()
            } else {
                y.coefficient.clone()
            };
            out.push(Term {
                koszul: y.koszul.clone(),
                faces,
                monomial: y.monomial.clone(),
                coefficient: c,
            });
        }
        before += y.faces[i].len() - 1;
    }
    let q: usize = y.faces.iter().map(|f| f.len() - 1).sum();
    for (pos, &j) in y.koszul.iter().enumerate() {
        let koszul: Vec<usize> = y.koszul.iter().copied().filter(|&s| s != j).collect();
        for (alpha, a) in &polys[j - 1] {
            let monomial: Vec<Vec<i64>> = y
                .monomial
                .iter()
                .zip(alpha)
                .map(|(e, f)| e.iter().zip(f).map(|(x, z)| x + z).collect())
                .collect();
            let c = &y.coefficient * a;
            out.push(Term {
                koszul: koszul.clone(),
                faces: y.faces.clone(),
                monomial,
                coefficient: if (q + pos) % 2 == 1 { -c } else { c },
            });
        }
    }
    out
}

#[test]
fn serre_pairing_is_blind_to_coboundaries() {
    // Adding D(y) to a class must not change its pairings: this needs the cup-product signs and the
    // differential's signs to agree (Leibniz rule), so unlike non-degeneracy it tests the sign conventions.
    let mut nontrivial = 0;
    for (model, tag) in [
        ("catalogs-demo/split-c.toml", "coboundary-c"),
        ("catalogs-demo/tetraquadric-a.toml", "coboundary-a"),
    ] {
        let (_, v) = export_json(model, &["--with-duals"], tag);
        let dims: Vec<usize> =
            serde_json::from_value(v["configuration"]["ambient"].clone()).unwrap();
        let k = v["configuration"]["equations"].as_array().unwrap().len();
        let offsets: Vec<usize> = dims
            .iter()
            .scan(0, |o, &n| {
                let r = *o;
                *o += n + 1;
                Some(r)
            })
            .collect();
        let polys: Vec<FilePoly> = v["polynomials"]["equations"]
            .as_array()
            .unwrap()
            .iter()
            .map(|e| {
                e["exponents"]
                    .as_array()
                    .unwrap()
                    .iter()
                    .zip(e["coefficients"].as_array().unwrap())
                    .map(|(x, c)| {
                        let flat: Vec<i64> = serde_json::from_value(x.clone()).unwrap();
                        let split = dims
                            .iter()
                            .zip(&offsets)
                            .map(|(&n, &o)| flat[o..=o + n].to_vec())
                            .collect();
                        (split, rat(c))
                    })
                    .collect()
            })
            .collect();
        for mult in v["multiplets"].as_array().unwrap() {
            let ws: Vec<Vec<Term>> = mult["dual_classes"]
                .as_array()
                .unwrap()
                .iter()
                .map(|c| terms(&c["lift"]))
                .collect();
            // y: the partner of a dual-lift term (complementary Koszul set, initial-segment faces, monomial
            // −1 − f) with one vertex removed where the monomial has no pole (a valid Čech cochain of degree |S|)
            let partners: Vec<Term> = ws[0]
                .iter()
                .filter(|t| {
                    t.faces
                        .iter()
                        .enumerate()
                        .all(|(i, f)| *f == (f[0]..=dims[i]).collect::<Vec<_>>())
                })
                .map(|t| Term {
                    koszul: (1..=k).filter(|j| !t.koszul.contains(j)).collect(),
                    faces: t.faces.iter().map(|f| (0..=f[0]).collect()).collect(),
                    monomial: t
                        .monomial
                        .iter()
                        .map(|e| e.iter().map(|&x| -1 - x).collect())
                        .collect(),
                    coefficient: BigRational::one(),
                })
                .collect();
            for a in partners.iter().take(40) {
                for i in 0..dims.len() {
                    for &vtx in &a.faces[i] {
                        if a.faces[i].len() < 2 || a.monomial[i][vtx] < 0 {
                            continue;
                        }
                        let mut faces = a.faces.clone();
                        faces[i].retain(|&x| x != vtx);
                        let y = Term {
                            koszul: a.koszul.clone(),
                            faces,
                            monomial: a.monomial.clone(),
                            coefficient: BigRational::one(),
                        };
                        let dy = total_differential(&y, &dims, &polys);
                        let (delta_part, t_part): (Vec<Term>, Vec<Term>) =
                            dy.into_iter().partition(|t| t.koszul == y.koszul);
                        for w in &ws {
                            let pd = pairing(&delta_part, w, &dims, k);
                            let pt = pairing(&t_part, w, &dims, k);
                            assert_eq!(&pd + &pt, BigRational::zero(), "{}", mult["label"]);
                            if !pd.is_zero() {
                                nontrivial += 1;
                            }
                        }
                    }
                }
            }
        }
    }
    // the check has content: the Čech and Koszul parts pair non-trivially and cancel
    assert!(
        nontrivial > 0,
        "no coboundary with a non-zero part was tried"
    );
    println!("{nontrivial} non-trivial cancellations");
}
