//! Input and output formats: the model file (TOML, validated on load), the export file for numerical solvers
//! (JSON or NumPy `.npz`) and atomic file writing.
//!
//! Invariant: nothing here computes mathematics; it converts between text and validated library values.

pub mod dolbeault;
pub mod export;
pub mod face_forms;
pub mod model;
pub mod npz;

use std::io::Write;
use std::path::Path;

/// Write `contents` to `path` atomically: a temporary file in the same folder, flushed, then renamed over the
/// target, so a reader never sees a half-written file and a failure leaves no partial output.
pub fn write_atomic(path: &Path, contents: &[u8]) -> std::io::Result<()> {
    let dir = match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => std::path::PathBuf::from("."),
    };
    let file_name = path
        .file_name()
        .ok_or_else(|| std::io::Error::new(std::io::ErrorKind::InvalidInput, "no file name"))?;
    let tmp = dir.join(format!(
        ".{}.tmp-{}",
        file_name.to_string_lossy(),
        std::process::id()
    ));
    let result = (|| {
        let mut f = std::fs::File::create(&tmp)?;
        f.write_all(contents)?;
        f.sync_all()?;
        std::fs::rename(&tmp, path)
    })();
    if result.is_err() {
        let _ = std::fs::remove_file(&tmp);
    }
    result
}
