//! `scan` and `merge`: screen an enumerated box of line-bundle sums (a scan file) or a catalog of model files,
//! with shards, checkpoints, progress and the funnel table; merge shard outputs.
//!
//! Invariant: the output file is written once, atomically, when the shard is finished; checkpoints are written
//! atomically after every batch; progress goes to stderr only.

use super::UserError;
use clap::Args;
use indicatif::{ProgressBar, ProgressStyle};
use sheafwright::cohomology::{CohomologyEngine, DEFAULT_SEED, PolynomialChoice};
use sheafwright::io::model::PolynomialMode;
use sheafwright::io::write_atomic;
use sheafwright::scan::{
    self, CatalogJob, Checkpoint, FilterSettings, Job, RunOptions, ScanJob, ScanSpec, Shard, driver,
};
use std::fmt::Write as _;
use std::io::IsTerminal;
use std::path::{Path, PathBuf};
use std::time::Instant;

/// Flags of `sheafwright scan`.
#[derive(Args, Debug)]
pub struct ScanArgs {
    /// The scan file (TOML: configuration plus a [scan] section); not with --catalog.
    pub scan: Option<PathBuf>,
    /// Screen the model files of a directory (*.toml) or of a list file (one path per line) instead.
    #[arg(long, value_name = "DIR_OR_FILE")]
    pub catalog: Option<PathBuf>,
    /// Catalog mode: target number of families (default 3).
    #[arg(long, allow_hyphen_values = true)]
    pub families: Option<i64>,
    /// Catalog mode: order of the freely acting symmetry (default 1).
    #[arg(long)]
    pub symmetry_order: Option<u64>,
    /// Catalog mode: filters, comma separated (default all).
    #[arg(long)]
    pub filters: Option<String>,
    /// Write survivors and the funnel (JSON Lines) atomically to this file when the shard is finished.
    #[arg(short = 'o', long, value_name = "FILE")]
    pub output: Option<PathBuf>,
    /// Checkpoint file (default: FILE.checkpoint next to -o FILE).
    #[arg(long, value_name = "FILE")]
    pub checkpoint: Option<PathBuf>,
    /// Continue from the checkpoint instead of starting over.
    #[arg(long)]
    pub resume: bool,
    /// Only this shard of the enumeration, I/N (1-based), e.g. 3/8.
    #[arg(long, value_name = "I/N")]
    pub shard: Option<String>,
    /// Worker threads (default: all cores); the output never depends on it.
    #[arg(long)]
    pub threads: Option<usize>,
    /// Chunks per batch: a checkpoint is written after every batch.
    #[arg(long, default_value_t = 256)]
    pub checkpoint_every: usize,
    /// Print survivors (and the funnel as the last line) as JSON Lines on stdout.
    #[arg(long)]
    pub json: bool,
    /// Test hook: stop after the batch that reaches this many chunks, leaving only the checkpoint.
    #[arg(long, hide = true)]
    pub stop_after_chunks: Option<usize>,
}

/// Run `scan`.
pub fn run(a: ScanArgs) -> Result<String, UserError> {
    let shard = match &a.shard {
        Some(s) => Shard::parse(s)?,
        None => Shard::ALL,
    };
    let pool = match a.threads {
        Some(0) => return Err(UserError("--threads must be at least 1".into())),
        Some(n) if n > 1024 => return Err(UserError(format!("--threads {n} is absurd"))),
        Some(n) => rayon::ThreadPoolBuilder::new().num_threads(n).build()?,
        None => rayon::ThreadPoolBuilder::new().build()?,
    };
    let checkpoint_path = a
        .checkpoint
        .clone()
        .or_else(|| a.output.as_ref().map(|o| with_suffix(o, ".checkpoint")));
    if a.resume && checkpoint_path.is_none() {
        return Err(UserError(
            "--resume needs --checkpoint FILE or -o FILE".into(),
        ));
    }
    let opts = RunOptions {
        shard,
        batch_chunks: a.checkpoint_every.max(1),
        stop_after_chunks: a.stop_after_chunks,
    };
    match (&a.scan, &a.catalog) {
        (Some(path), None) => {
            if a.families.is_some() || a.symmetry_order.is_some() || a.filters.is_some() {
                return Err(UserError(
                    "--families/--symmetry-order/--filters are for --catalog; a scan file sets them in [scan]"
                        .into(),
                ));
            }
            let spec = ScanSpec::load(path)?;
            let engine = engine_for(&spec)?;
            let started = Instant::now();
            let job = pool.install(|| ScanJob::new(&spec, &engine))?;
            let setup = started.elapsed().as_secs_f64();
            let name = spec.model.name.clone();
            let header = format!(
                "Scan {name}: {} rank {}, entries {}..{}, {} families x |G| = {} (index {}), setup {setup:.1} s",
                engine.config().label(),
                spec.rank,
                spec.lo,
                spec.hi,
                spec.settings.families,
                spec.settings.symmetry_order,
                spec.settings.target_index()
            );
            finish(
                &a,
                &pool,
                &job,
                &name,
                &header,
                &spec.settings,
                opts,
                checkpoint_path,
            )
        }
        (None, Some(source)) => {
            let filters = match &a.filters {
                Some(t) => scan::spec::parse_filter_list(
                    &t.split(',')
                        .map(|s| s.trim().to_string())
                        .collect::<Vec<_>>(),
                )?,
                None => scan::Filter::ALL.to_vec(),
            };
            let settings = FilterSettings::new(
                a.symmetry_order.unwrap_or(1),
                a.families.unwrap_or(3),
                filters,
            )?;
            let job = CatalogJob::new(source, settings.clone())?;
            let name = source.display().to_string();
            let header = format!(
                "Catalog {name}: {} models, {} families x |G| = {} (index {})",
                job.num_chunks(),
                settings.families,
                settings.symmetry_order,
                settings.target_index()
            );
            finish(
                &a,
                &pool,
                &job,
                &name,
                &header,
                &settings,
                opts,
                checkpoint_path,
            )
        }
        (Some(_), Some(_)) => Err(UserError("give a scan file or --catalog, not both".into())),
        (None, None) => Err(UserError(
            "give a scan file or --catalog DIR_OR_FILE".into(),
        )),
    }
}

fn engine_for(spec: &ScanSpec) -> Result<CohomologyEngine, UserError> {
    let m = &spec.model;
    let choice = match m.mode() {
        PolynomialMode::Given => PolynomialChoice::Given(
            m.polynomials()
                .ok_or_else(|| UserError("mode given needs every equation's polynomial".into()))?
                .to_vec(),
        ),
        PolynomialMode::Generic => PolynomialChoice::Generic {
            seed: m.seed().unwrap_or(DEFAULT_SEED),
        },
    };
    Ok(CohomologyEngine::new(m.config(), choice)?)
}

fn with_suffix(p: &Path, suffix: &str) -> PathBuf {
    let mut s = p.as_os_str().to_owned();
    s.push(suffix);
    PathBuf::from(s)
}

#[allow(clippy::too_many_arguments)]
fn finish(
    a: &ScanArgs,
    pool: &rayon::ThreadPool,
    job: &dyn Job,
    name: &str,
    header: &str,
    settings: &FilterSettings,
    opts: RunOptions,
    checkpoint_path: Option<PathBuf>,
) -> Result<String, UserError> {
    let resume = match (&checkpoint_path, a.resume) {
        (Some(p), true) => {
            let text = std::fs::read_to_string(p)
                .map_err(|e| UserError(format!("--resume: cannot read {}: {e}", p.display())))?;
            Some(Checkpoint::parse_for(
                &text,
                &driver::job_fingerprint(job, opts.shard),
                opts.shard,
            )?)
        }
        _ => None,
    };
    let total = opts.shard.chunks(job.num_chunks()).len();
    let bar = if std::io::stderr().is_terminal() {
        let b = ProgressBar::new(total as u64);
        b.set_style(
            ProgressStyle::with_template(
                "{bar:30} {pos}/{len} chunks  {msg}  [{elapsed_precise} elapsed, ETA {eta_precise}]",
            )
            .unwrap_or_else(|_| ProgressStyle::default_bar()),
        );
        Some(b)
    } else {
        None
    };
    let mut last_line = Instant::now();
    let mut on_batch = |state: &Checkpoint, p: &scan::Progress| -> Result<(), scan::ScanError> {
        if let Some(path) = &checkpoint_path {
            let text = serde_json::to_string(state)?;
            write_atomic(path, text.as_bytes()).map_err(|e| {
                scan::ScanError::Io(format!("cannot write {}: {e}", path.display()))
            })?;
        }
        let rate = if p.seconds > 0.0 {
            p.candidates as f64 / p.seconds
        } else {
            0.0
        };
        match &bar {
            Some(b) => {
                b.set_position(p.done as u64);
                b.set_message(format!(
                    "{} candidates ({rate:.0}/s), {} survivors",
                    p.candidates, p.survivors
                ));
            }
            None if last_line.elapsed().as_secs_f64() >= 5.0 => {
                last_line = Instant::now();
                let eta = if p.done > 0 {
                    p.seconds / p.done as f64 * (p.total - p.done) as f64
                } else {
                    0.0
                };
                eprintln!(
                    "scan: {}/{} chunks ({:.1}%), {} candidates ({rate:.0}/s), {} survivors, ETA {:.0} s",
                    p.done,
                    p.total,
                    100.0 * p.done as f64 / p.total.max(1) as f64,
                    p.candidates,
                    p.survivors,
                    eta
                );
            }
            None => {}
        }
        Ok(())
    };
    let (state, complete) = pool.install(|| scan::run(job, &opts, resume, &mut on_batch))?;
    if let Some(b) = &bar {
        b.finish_and_clear();
    }
    if !complete {
        eprintln!(
            "scan: stopped after {} of {} chunks (--stop-after-chunks); continue with --resume",
            state.next, state.chunks
        );
        return Ok(String::new());
    }
    let funnel = driver::funnel(job, name, &state, settings);
    let text = driver::output_text(&state, &funnel)?;
    if let Some(path) = &a.output {
        write_atomic(path, text.as_bytes())
            .map_err(|e| UserError(format!("cannot write {}: {e}", path.display())))?;
    }
    if let Some(path) = &checkpoint_path {
        let _ = std::fs::remove_file(path);
    }
    if a.json {
        return Ok(text);
    }
    Ok(summary(header, &state, &funnel, a.output.as_deref()))
}

fn summary(header: &str, state: &Checkpoint, f: &driver::Funnel, out: Option<&Path>) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "{header}");
    if f.shards != [[1, 1]] {
        let _ = writeln!(s, "shard {}/{}", f.shards[0][0], f.shards[0][1]);
    }
    if let (Some(b), Some(al)) = (f.box_bundles, f.alphabet) {
        let _ = writeln!(s, "line bundles in the box {b}, in the alphabet {al}");
    }
    let _ = writeln!(
        s,
        "chunks {}, pruned prefixes: c1 {}, index {}; non-canonical images {}",
        f.chunks, f.pruned_c1, f.pruned_index, f.non_canonical
    );
    let _ = writeln!(
        s,
        "\n  {:<12} {:>12} {:>12} {:>10} {:>12} {:>10}",
        "filter", "entered", "removed", "undecided", "alphabet-", "seconds"
    );
    for st in &f.stages {
        let _ = writeln!(
            s,
            "  {:<12} {:>12} {:>12} {:>10} {:>12} {:>10.2}",
            st.filter, st.entered, st.removed, st.undecided, st.alphabet_removed, st.seconds
        );
    }
    let _ = writeln!(
        s,
        "\n{} candidates, {} survivors, {:.1} s ({:.0} candidates/s)",
        f.candidates, f.survivors, f.seconds, f.candidates_per_second
    );
    for m in state.survivors.iter().take(20) {
        let who = m
            .get("model")
            .and_then(|v| v.as_str())
            .map(|n| format!("{n}: "))
            .unwrap_or_default();
        let _ = writeln!(s, "  {who}{}", m["bundles"].as_str().unwrap_or(""));
    }
    if state.survivors.len() > 20 {
        let _ = writeln!(s, "  … {} more", state.survivors.len() - 20);
    }
    if let Some(p) = out {
        let _ = writeln!(s, "written to {}", p.display());
    }
    s
}

/// Run `merge`: combine shard outputs into the unsharded output.
pub fn merge(files: &[PathBuf], output: Option<&Path>) -> Result<String, UserError> {
    if files.is_empty() {
        return Err(UserError("merge: give the shard output files".into()));
    }
    let texts = files
        .iter()
        .map(|p| std::fs::read_to_string(p).map_err(|e| UserError(format!("{}: {e}", p.display()))))
        .collect::<Result<Vec<_>, _>>()?;
    let text = scan::merge_outputs(&texts)?;
    match output {
        Some(p) => {
            write_atomic(p, text.as_bytes())
                .map_err(|e| UserError(format!("cannot write {}: {e}", p.display())))?;
            Ok(String::new())
        }
        None => Ok(text),
    }
}
