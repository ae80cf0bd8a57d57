//! Helpers shared by the end-to-end tests: run the built binary and read its output.
#![allow(dead_code)]

use std::process::Command;

/// Run `sheafwright` with `args` from the crate root; returns (exit code, stdout, stderr).
pub fn sheafwright(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_sheafwright"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .expect("binary runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// Run and parse the single JSON object printed on stdout (exit code must be 0).
pub fn json(args: &[&str]) -> serde_json::Value {
    let (code, out, err) = sheafwright(args);
    assert_eq!(code, 0, "args {args:?}: stderr {err}");
    serde_json::from_str(&out).expect("one JSON object")
}

/// Every texture entry of a couplings JSON object (`couplings --json`, or an export's `couplings`), in order.
pub fn coupling_entries(v: &serde_json::Value) -> Vec<&serde_json::Value> {
    v["classes"]
        .as_array()
        .expect("classes")
        .iter()
        .flat_map(|c| c["entries"].as_array().expect("entries"))
        .collect()
}

/// Assert a clean refusal: exit 2, one `error:` line on stderr containing `needle`, no panic.
pub fn assert_refused(args: &[&str], needle: &str) {
    let (code, out, err) = sheafwright(args);
    assert_eq!(code, 2, "args {args:?}: stdout {out} stderr {err}");
    assert!(err.starts_with("error:"), "{err}");
    assert!(
        err.to_lowercase().contains(&needle.to_lowercase()),
        "expected {needle:?} in {err:?}"
    );
    assert!(!err.contains("panicked"), "{err}");
    assert_eq!(
        err.trim().lines().count(),
        1,
        "one-line message expected: {err}"
    );
}

/// Write `text` to a fresh temporary file named `name` and return its path.
pub fn temp_file(name: &str, text: &str) -> String {
    let dir = std::env::temp_dir().join(format!("sheafwright-tests-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join(name);
    std::fs::write(&path, text).unwrap();
    path.to_str().unwrap().to_string()
}
