//! `cohomology --box`: every bundle of a box, in parallel, printed in a fixed order.
//!
//! Invariant: output order and content never depend on the number of threads (chunks are computed in parallel
//! and emitted in index order).

use super::{UserError, render};
use indicatif::{ProgressBar, ProgressStyle};
use rayon::prelude::*;
use sheafwright::cohomology::{CohomologyEngine, MAX_E1_DIMENSION, estimate_e1_size};
use sheafwright::geometry::Configuration;
use std::io::{IsTerminal, Write};

/// Largest number of bundles in one box.
pub const MAX_BOX_BUNDLES: u128 = 5_000_000;
const CHUNK: usize = 2048;

fn bundle_at(mut idx: usize, m: usize, lo: i64, width: usize) -> Vec<i64> {
    (0..m)
        .map(|_| {
            let v = lo + (idx % width) as i64;
            idx /= width;
            v
        })
        .collect()
}

/// Run the box and return the rendered text (streamed to stdout chunk by chunk; the return value is empty).
pub fn run(
    engine: &CohomologyEngine,
    config: &Configuration,
    lo: i64,
    hi: i64,
    threads: Option<usize>,
    json: bool,
) -> Result<String, UserError> {
    let m = config.num_factors();
    let limit = sheafwright::io::model::MAX_BUNDLE_ENTRY;
    if lo < -limit || hi > limit {
        return Err(UserError(format!(
            "--box {lo}..{hi}: entries must lie in -{limit}..{limit}"
        )));
    }
    let width = (hi - lo + 1) as u128;
    let count = (0..m)
        .try_fold(1u128, |a, _| a.checked_mul(width))
        .unwrap_or(u128::MAX);
    if count > MAX_BOX_BUNDLES {
        return Err(UserError(format!(
            "--box {lo}..{hi} is too large: {count} bundles on {m} factors (limit {MAX_BOX_BUNDLES})"
        )));
    }
    let count = count as usize;
    let width = width as usize;
    // The E_1 page is largest at the corners; check them all before starting.
    for corner in 0..(1usize << m) {
        let k: Vec<i64> = (0..m)
            .map(|i| if corner & (1 << i) != 0 { hi } else { lo })
            .collect();
        let size = estimate_e1_size(config, &k);
        if size > MAX_E1_DIMENSION {
            return Err(UserError(format!(
                "--box {lo}..{hi} is too large: bundle {k:?} has an E_1 page of dimension {size} (limit {MAX_E1_DIMENSION})"
            )));
        }
    }
    let pool = rayon::ThreadPoolBuilder::new()
        .num_threads(threads.unwrap_or(0))
        .build()
        .map_err(|e| UserError(format!("cannot start worker threads: {e}")))?;
    let bar = if std::io::stderr().is_terminal() {
        let b = ProgressBar::new(count as u64);
        if let Ok(style) =
            ProgressStyle::with_template("{bar:40} {pos}/{len} bundles, {per_sec}, eta {eta}")
        {
            b.set_style(style);
        }
        Some(b)
    } else {
        None
    };
    let mut stdout = std::io::stdout().lock();
    if !json {
        let _ = writeln!(stdout, "{}", render::cohomology_box_header(config));
    }
    for start in (0..count).step_by(CHUNK) {
        let end = (start + CHUNK).min(count);
        let results: Result<Vec<_>, _> = pool.install(|| {
            (start..end)
                .into_par_iter()
                .map(|i| engine.cohomology(&bundle_at(i, m, lo, width)))
                .collect()
        });
        let results = results?;
        let mut text = String::new();
        for r in &results {
            if json {
                text.push_str(&render::json_line(&**r)?);
            } else {
                text.push_str(&render::cohomology_row(r));
            }
        }
        stdout
            .write_all(text.as_bytes())
            .map_err(|e| UserError(format!("cannot write output: {e}")))?;
        if let Some(b) = &bar {
            b.inc((end - start) as u64);
        }
    }
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    Ok(String::new())
}
