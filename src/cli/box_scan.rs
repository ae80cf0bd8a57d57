//! `cohomology --box`: every bundle of a box, in parallel, printed in a fixed order, with an up-front cost
//! estimate and progress on stderr.
//!
//! Cost model (docs/performance.md): a bundle costs about `C_K · s(k)²` seconds on one thread, `s(k)` the
//! dimension of its `E_1` page ([`estimate_e1_size`]) and `C_K` a constant measured per codimension `K`; a box is
//! refused when the estimate exceeds [`MAX_ESTIMATED_SECONDS`] of wall time, unless `--force` is given.
//!
//! Invariant: output order and content never depend on the number of threads (chunks are computed in parallel
//! and emitted in index order); stdout carries only results, progress goes to stderr (a bar on a terminal,
//! plain lines at most every [`PLAIN_PROGRESS_EVERY`] otherwise).

use super::{UserError, render};
use indicatif::{ProgressBar, ProgressStyle};
use rayon::prelude::*;
use sheafwright::cohomology::{CohomologyEngine, MAX_E1_DIMENSION, estimate_e1_size};
use sheafwright::geometry::Configuration;
use std::io::{IsTerminal, Write};

/// Largest number of bundles in one box.
pub const MAX_BOX_BUNDLES: u128 = 5_000_000;
const CHUNK: usize = 512;
/// Boxes estimated to take longer than this (wall time, seconds) are refused without `--force`.
pub const MAX_ESTIMATED_SECONDS: f64 = 900.0;
/// Seconds per unit of `s(k)²` on one thread, hypersurfaces: measured on the tetra-quadric, boxes −5..5 and
/// −6..6 (7.7e-9 and 7.6e-9; docs/performance.md).
const SECONDS_PER_UNIT_HYPERSURFACE: f64 = 7.6e-9;
/// The same for codimension ≥ 2: measured on P1^5 [(1,1,1,1,2);(1,1,1,1,0)], box −3..3 (higher differentials).
const SECONDS_PER_UNIT_CODIM2: f64 = 7.3e-8;
/// Interval between plain progress lines when stderr is not a terminal.
pub const PLAIN_PROGRESS_EVERY: std::time::Duration = std::time::Duration::from_secs(10);
/// Estimated seconds below which nothing is said before the scan starts.
const QUIET_BELOW_SECONDS: f64 = 10.0;

/// Estimated work of every bundle of a box, in units of `s(k)²`, in index order.
fn box_work(
    pool: &rayon::ThreadPool,
    config: &Configuration,
    m: usize,
    lo: i64,
    width: usize,
    count: usize,
) -> Vec<f64> {
    pool.install(|| {
        (0..count)
            .into_par_iter()
            .map(|i| {
                let s = estimate_e1_size(config, &bundle_at(i, m, lo, width)) as f64;
                s * s
            })
            .collect()
    })
}

/// Estimated wall time in seconds for `work` units on `threads` threads.
fn estimated_seconds(config: &Configuration, work: f64, threads: usize) -> f64 {
    let per_unit = if config.codimension() == 1 {
        SECONDS_PER_UNIT_HYPERSURFACE
    } else {
        SECONDS_PER_UNIT_CODIM2
    };
    // Measured parallel efficiency on 2 cores: 1.9x.
    let speedup = 1.0 + 0.9 * (threads.max(1) - 1) as f64;
    per_unit * work / speedup
}

/// A duration for people: `40 s`, `7.5 min`, `3.2 h`, `12 days`.
pub fn human_seconds(s: f64) -> String {
    if s < 90.0 {
        format!("{s:.0} s")
    } else if s < 5400.0 {
        format!("{:.1} min", s / 60.0)
    } else if s < 172_800.0 {
        format!("{:.1} h", s / 3600.0)
    } else {
        format!("{:.0} days", s / 86_400.0)
    }
}

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
    force: bool,
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
    let work = box_work(&pool, config, m, lo, width, count);
    let total_work: f64 = work.iter().sum();
    let estimate = estimated_seconds(config, total_work, pool.current_num_threads());
    if estimate > MAX_ESTIMATED_SECONDS && !force {
        return Err(UserError(format!(
            "--box {lo}..{hi} would take about {} on {} threads ({count} bundles; estimate from the E_1 page sizes, see docs/performance.md; limit {}): give --force to run it anyway, or a smaller box",
            human_seconds(estimate),
            pool.current_num_threads(),
            human_seconds(MAX_ESTIMATED_SECONDS)
        )));
    }
    let terminal = std::io::stderr().is_terminal();
    if estimate >= QUIET_BELOW_SECONDS {
        eprintln!(
            "--box {lo}..{hi}: {count} bundles, estimated {} on {} threads",
            human_seconds(estimate),
            pool.current_num_threads()
        );
    }
    // Progress is counted in estimated work (the corners of a box cost far more than its middle), scaled to u64.
    let scale = if total_work > 0.0 {
        1e9 / total_work
    } else {
        0.0
    };
    let mut done_work = 0.0f64;
    let bar = if terminal {
        let b = ProgressBar::new(1_000_000_000);
        if let Ok(style) = ProgressStyle::with_template(
            "{bar:40} {percent:>3}% {msg}, elapsed {elapsed}, eta {eta}",
        ) {
            b.set_style(style);
        }
        b.set_message(format!("0/{count} bundles"));
        Some(b)
    } else {
        None
    };
    let started = std::time::Instant::now();
    let mut last_line = started;
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
        done_work += work[start..end].iter().sum::<f64>();
        let done_bundles = end;
        let fraction = (done_work * scale / 1e9).clamp(0.0, 1.0);
        if let Some(b) = &bar {
            b.set_position((done_work * scale) as u64);
            b.set_message(format!("{done_bundles}/{count} bundles"));
        } else if last_line.elapsed() >= PLAIN_PROGRESS_EVERY && done_bundles < count {
            last_line = std::time::Instant::now();
            let elapsed = started.elapsed().as_secs_f64();
            let left = if fraction > 0.0 {
                elapsed * (1.0 - fraction) / fraction
            } else {
                f64::NAN
            };
            eprintln!(
                "progress: {:.0}% of the estimated work, {done_bundles}/{count} bundles, elapsed {}, about {} left",
                100.0 * fraction,
                human_seconds(elapsed),
                human_seconds(left)
            );
        }
    }
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    Ok(String::new())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn durations_read_as_people_say_them() {
        assert_eq!(human_seconds(40.2), "40 s");
        assert_eq!(human_seconds(450.0), "7.5 min");
        assert_eq!(human_seconds(3.2 * 3600.0), "3.2 h");
        assert_eq!(human_seconds(12.0 * 86_400.0), "12 days");
    }

    #[test]
    fn cost_model_reproduces_the_measured_tetraquadric_boxes() {
        // Measured (docs/performance.md): −5..5 in 2.6 s and −6..6 in 18.3 s on 2 threads.
        let config = Configuration::new(&[1, 1, 1, 1], &[vec![2, 2, 2, 2]]).unwrap();
        let pool = rayon::ThreadPoolBuilder::new()
            .num_threads(2)
            .build()
            .unwrap();
        for (n, measured) in [(5i64, 2.6), (6, 18.3)] {
            let width = (2 * n + 1) as usize;
            let work: f64 = box_work(&pool, &config, 4, -n, width, width.pow(4))
                .iter()
                .sum();
            let est = estimated_seconds(&config, work, 2);
            assert!(
                est > 0.7 * measured && est < 1.4 * measured,
                "box −{n}..{n}: estimate {est} s, measured {measured} s"
            );
        }
    }
}
