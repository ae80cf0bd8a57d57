//! The scan driver: chunks of this shard processed batch by batch (rayon across the chunks of a batch, results
//! gathered in chunk order), a checkpoint after every batch, the funnel summary, catalogs, and the merge of
//! shard outputs.
//!
//! Invariant: the survivors are emitted in chunk order and, inside a chunk, in enumeration order, so the output
//! is the same for any thread count, batch size or interruption point.

use super::ScanError;
use super::checkpoint::{Checkpoint, Shard, fingerprint};
use super::enumerate::{EnumerationCounts, Enumerator, box_bundles, factor_symmetries};
use super::filters::{Screen, StageTally, Tally};
use super::spec::{Filter, FilterSettings, ScanSpec};
use crate::cohomology::{CohomologyEngine, PolynomialChoice};
use crate::io::model::{Model, PolynomialMode};
use rayon::prelude::*;
use serde::Serialize;
use serde_json::Value;
use std::collections::HashMap;
use std::path::{Path, PathBuf};
use std::sync::{Arc, Mutex};
use std::time::Instant;

/// What one chunk produced.
#[derive(Default)]
pub struct ChunkResult {
    /// Survivors in enumeration order.
    pub survivors: Vec<Value>,
    /// Enumeration counters.
    pub counts: EnumerationCounts,
    /// Filter tallies.
    pub tally: Tally,
}

/// A unit of work split into chunks.
pub trait Job: Sync {
    /// Number of chunks of the whole job.
    fn num_chunks(&self) -> usize;
    /// Process chunk `c`.
    fn chunk(&self, c: usize) -> Result<ChunkResult, ScanError>;
    /// Text that identifies the job (for checkpoint fingerprints).
    fn identity(&self) -> String;
    /// Line bundles removed from the alphabet per filter (scan jobs).
    fn alphabet_removed(&self) -> Vec<(Filter, u64)> {
        Vec::new()
    }
    /// Alphabet size and box size (scan jobs).
    fn alphabet_sizes(&self) -> Option<(usize, usize)> {
        None
    }
}

/// The enumeration job of a scan file on one shared engine.
pub struct ScanJob<'a> {
    spec: &'a ScanSpec,
    screen: Screen<'a>,
    enumerator: Enumerator,
    box_size: usize,
    removed: Vec<(Filter, u64)>,
}

impl<'a> ScanJob<'a> {
    /// Build the alphabet (box minus line bundles excluded by line-bundle-local filters, closed under the
    /// factor symmetries), the index table and the chunk list. Cohomology of the alphabet runs in parallel on
    /// the shared engine.
    pub fn new(spec: &'a ScanSpec, engine: &'a CohomologyEngine) -> Result<Self, ScanError> {
        let config = engine.config();
        let m = config.num_factors();
        let width = (spec.hi - spec.lo + 1) as u128;
        let size = (0..m)
            .try_fold(1u128, |a, _| a.checked_mul(width))
            .unwrap_or(u128::MAX);
        if size > 1_000_000 {
            return Err(ScanError::Spec(format!(
                "the box [{}, {}]^{m} has {size} line bundles (limit 1000000)",
                spec.lo, spec.hi
            )));
        }
        let screen = Screen::new(engine, spec.settings.clone(), spec.rank)?;
        let rows: Vec<Vec<u32>> = (0..m)
            .map(|i| config.equations().iter().map(|q| q[i]).collect())
            .collect();
        // Given polynomials need not be symmetric: only the identity is a symmetry we can trust.
        let perms = match engine.choice() {
            PolynomialChoice::Generic { .. } => factor_symmetries(config.dims(), &rows),
            PolynomialChoice::Given(_) => vec![(0..m).collect()],
        };
        let all = box_bundles(m, spec.lo, spec.hi);
        let verdicts: Vec<Option<Filter>> = all
            .par_iter()
            .map(|k| screen.excluded_bundle(k))
            .collect::<Result<_, _>>()?;
        let excluded: std::collections::HashSet<&Vec<i64>> = all
            .iter()
            .zip(&verdicts)
            .filter(|(_, v)| v.is_some())
            .map(|(k, _)| k)
            .collect();
        let mut removed: Vec<(Filter, u64)> = Vec::new();
        let mut alphabet = Vec::new();
        for (k, v) in all.iter().zip(&verdicts) {
            // Keep the alphabet closed under the group: drop a whole orbit if any member is excluded.
            let orbit_bad = perms
                .iter()
                .any(|p| excluded.contains(&super::enumerate::permute_bundle(p, k)));
            if orbit_bad {
                let f = v.unwrap_or(Filter::SlopeSign);
                match removed.iter_mut().find(|(g, _)| *g == f) {
                    Some(e) => e.1 += 1,
                    None => removed.push((f, 1)),
                }
            } else {
                alphabet.push(k.clone());
            }
        }
        let chi = alphabet
            .iter()
            .map(|k| screen.index(k))
            .collect::<Result<Vec<_>, _>>()?;
        let target = spec
            .settings
            .has(Filter::Index)
            .then(|| spec.settings.target_index());
        let enumerator = Enumerator::new(
            m,
            spec.rank,
            (spec.lo, spec.hi),
            alphabet,
            chi,
            &perms,
            target,
        );
        Ok(ScanJob {
            spec,
            screen,
            enumerator,
            box_size: all.len(),
            removed,
        })
    }
}

impl Job for ScanJob<'_> {
    fn num_chunks(&self) -> usize {
        self.enumerator.num_chunks()
    }
    fn chunk(&self, c: usize) -> Result<ChunkResult, ScanError> {
        let mut r = ChunkResult::default();
        let (survivors, tally) = (&mut r.survivors, &mut r.tally);
        self.enumerator.chunk(c, &mut r.counts, &mut |b| {
            if let Some(s) = self.screen.screen(b, tally)? {
                survivors.push(s);
            }
            Ok::<(), ScanError>(())
        })?;
        Ok(r)
    }
    fn identity(&self) -> String {
        self.spec.text.clone()
    }
    fn alphabet_removed(&self) -> Vec<(Filter, u64)> {
        self.removed.clone()
    }
    fn alphabet_sizes(&self) -> Option<(usize, usize)> {
        Some((self.enumerator.alphabet().len(), self.box_size))
    }
}

/// Largest number of model files in one catalog.
pub const MAX_CATALOG: usize = 1_000_000;

/// A catalog of model files, one chunk per model, screened with fixed settings.
pub struct CatalogJob {
    paths: Vec<PathBuf>,
    settings: FilterSettings,
    engines: Mutex<HashMap<String, Arc<CohomologyEngine>>>,
}

impl CatalogJob {
    /// A directory (every `*.toml` inside, sorted by name), a single model file (`*.toml`), or a list file (one
    /// path per line, relative to the list's folder; blank lines and `#` comments skipped).
    pub fn new(source: &Path, settings: FilterSettings) -> Result<Self, ScanError> {
        let io = |e: std::io::Error| ScanError::Io(format!("{}: {e}", source.display()));
        let paths: Vec<PathBuf> = if source.is_dir() {
            let mut v: Vec<PathBuf> = std::fs::read_dir(source)
                .map_err(io)?
                .filter_map(|e| e.ok().map(|e| e.path()))
                .filter(|p| p.extension().is_some_and(|x| x == "toml"))
                .collect();
            v.sort();
            v
        } else if source.extension().is_some_and(|x| x == "toml") {
            vec![source.to_path_buf()]
        } else {
            let text = std::fs::read_to_string(source).map_err(io)?;
            let base = source.parent().unwrap_or(Path::new("."));
            text.lines()
                .map(str::trim)
                .filter(|l| !l.is_empty() && !l.starts_with('#'))
                .map(|l| base.join(l))
                .collect()
        };
        if paths.is_empty() {
            return Err(ScanError::Spec(format!(
                "{}: no model files in the catalog",
                source.display()
            )));
        }
        if paths.len() > MAX_CATALOG {
            return Err(ScanError::Spec(format!(
                "catalog larger than {MAX_CATALOG} models"
            )));
        }
        Ok(CatalogJob {
            paths,
            settings,
            engines: Mutex::new(HashMap::new()),
        })
    }

    fn engine(&self, model: &Model) -> Result<Arc<CohomologyEngine>, ScanError> {
        let choice = match model.mode() {
            PolynomialMode::Given => PolynomialChoice::Given(
                model
                    .polynomials()
                    .ok_or_else(|| ScanError::Spec("mode given without polynomials".into()))?
                    .to_vec(),
            ),
            PolynomialMode::Generic => PolynomialChoice::Generic {
                seed: model.seed().unwrap_or(crate::cohomology::DEFAULT_SEED),
            },
        };
        let key = format!("{} {:?}", model.config().label(), choice);
        if let Some(e) = self.engines.lock().ok().and_then(|m| m.get(&key).cloned()) {
            return Ok(e);
        }
        let engine = Arc::new(CohomologyEngine::new(model.config(), choice)?);
        if let Ok(mut m) = self.engines.lock() {
            return Ok(m.entry(key).or_insert(engine).clone());
        }
        Ok(engine)
    }
}

impl Job for CatalogJob {
    fn num_chunks(&self) -> usize {
        self.paths.len()
    }
    fn chunk(&self, c: usize) -> Result<ChunkResult, ScanError> {
        let path = &self.paths[c];
        let model =
            Model::load(path).map_err(|e| ScanError::Spec(format!("{}: {e}", path.display())))?;
        let bundles = model.line_bundles().ok_or_else(|| {
            ScanError::Spec(format!(
                "{}: the model has no [bundle] section",
                path.display()
            ))
        })?;
        let engine = self.engine(&model)?;
        let screen = Screen::new(&engine, self.settings.clone(), bundles.len())
            .map_err(|e| ScanError::Spec(format!("{}: {e}", path.display())))?;
        let mut r = ChunkResult::default();
        r.counts.candidates = 1;
        if let Some(mut s) = screen
            .screen(bundles, &mut r.tally)
            .map_err(|e| ScanError::Spec(format!("{}: {e}", path.display())))?
        {
            s["model"] = model.name.clone().into();
            s["path"] = path.display().to_string().into();
            s["configuration"] = model.config().label().into();
            r.survivors.push(s);
        }
        Ok(r)
    }
    fn identity(&self) -> String {
        let mut s = format!("catalog {:?}", self.settings);
        for p in &self.paths {
            s.push('\n');
            s.push_str(&p.display().to_string());
        }
        s
    }
}

/// How to run.
#[derive(Clone, Debug)]
pub struct RunOptions {
    /// The shard.
    pub shard: Shard,
    /// Chunks per batch (a checkpoint after each batch).
    pub batch_chunks: usize,
    /// Test hook: stop (without finishing) after the first batch that reaches this many chunks.
    pub stop_after_chunks: Option<usize>,
}

/// Progress after a batch.
#[derive(Clone, Debug)]
pub struct Progress {
    /// Chunks of the shard finished.
    pub done: usize,
    /// Chunks of the shard.
    pub total: usize,
    /// Candidates handed to the filters so far.
    pub candidates: u64,
    /// Survivors so far.
    pub survivors: usize,
    /// Seconds so far (all sessions).
    pub seconds: f64,
}

/// The checkpoint fingerprint of a job and its shard.
pub fn job_fingerprint(job: &dyn Job, shard: Shard) -> String {
    fingerprint(&[&job.identity(), &format!("{}/{}", shard.index, shard.count)])
}

/// Run (or continue, from `resume`) the shard's chunks. After every batch `on_batch` receives the checkpoint
/// and the progress (the CLI saves the checkpoint and draws progress). Returns the final state and whether the
/// shard is complete (`false` only for `stop_after_chunks`).
pub fn run(
    job: &dyn Job,
    opts: &RunOptions,
    resume: Option<Checkpoint>,
    on_batch: &mut dyn FnMut(&Checkpoint, &Progress) -> Result<(), ScanError>,
) -> Result<(Checkpoint, bool), ScanError> {
    let chunks = opts.shard.chunks(job.num_chunks());
    let mut state = match resume {
        Some(c) => c,
        None => Checkpoint::start(job_fingerprint(job, opts.shard), opts.shard, chunks.len()),
    };
    if state.chunks != chunks.len() {
        return Err(ScanError::Checkpoint(
            "chunk count differs from this scan".into(),
        ));
    }
    let batch = opts.batch_chunks.max(1);
    let session = Instant::now();
    let base_seconds = state.seconds;
    while state.next < chunks.len() {
        let end = (state.next + batch).min(chunks.len());
        let results: Vec<ChunkResult> = chunks[state.next..end]
            .par_iter()
            .map(|&c| job.chunk(c))
            .collect::<Result<_, _>>()?;
        for r in results {
            state.survivors.extend(r.survivors);
            state.counts.add(&r.counts);
            state.tally.add(&r.tally);
        }
        state.next = end;
        state.seconds = base_seconds + session.elapsed().as_secs_f64();
        let progress = Progress {
            done: state.next,
            total: chunks.len(),
            candidates: state.counts.candidates,
            survivors: state.survivors.len(),
            seconds: state.seconds,
        };
        on_batch(&state, &progress)?;
        if opts.stop_after_chunks.is_some_and(|k| state.next >= k) && state.next < chunks.len() {
            return Ok((state, false));
        }
    }
    Ok((state, true))
}

/// The funnel summary of a finished shard (the last line of the output, `"type": "funnel"`).
#[derive(Clone, Debug, Serialize)]
pub struct Funnel {
    /// Always `"funnel"`.
    #[serde(rename = "type")]
    pub kind: String,
    /// `"sheafwright.scan/1"`.
    pub schema: String,
    /// Scan or catalog name.
    pub scan: String,
    /// Checkpoint fingerprint without the shard (identical for every shard of one scan).
    pub scan_fingerprint: String,
    /// Shards combined in this funnel (`[I, N]` per shard).
    pub shards: Vec<[usize; 2]>,
    /// Chunks processed.
    pub chunks: usize,
    /// Line bundles in the box (scans).
    pub box_bundles: Option<usize>,
    /// Line bundles in the alphabet after the line-bundle-local exclusions (scans).
    pub alphabet: Option<usize>,
    /// Prefixes pruned because `c1 = 0` became unreachable.
    pub pruned_c1: u64,
    /// Prefixes pruned because the index target became unreachable.
    pub pruned_index: u64,
    /// Sums rejected as non-canonical images under the factor symmetries.
    pub non_canonical: u64,
    /// Candidates handed to the filters.
    pub candidates: u64,
    /// One entry per filter, application order.
    pub stages: Vec<StageTally>,
    /// Survivors.
    pub survivors: u64,
    /// Wall-clock seconds (varies).
    pub seconds: f64,
    /// `candidates / seconds` (varies).
    pub candidates_per_second: f64,
}

/// Build the funnel of a finished run.
pub fn funnel(job: &dyn Job, name: &str, state: &Checkpoint, settings: &FilterSettings) -> Funnel {
    let mut stages: Vec<StageTally> = state
        .tally
        .stages
        .iter()
        .filter(|s| Filter::from_name(&s.filter).is_some_and(|f| settings.has(f)))
        .cloned()
        .collect();
    for (f, n) in job.alphabet_removed() {
        if let Some(s) = stages.iter_mut().find(|s| s.filter == f.name()) {
            s.alphabet_removed = n;
        }
    }
    let sizes = job.alphabet_sizes();
    Funnel {
        kind: "funnel".into(),
        schema: "sheafwright.scan/1".into(),
        scan: name.into(),
        scan_fingerprint: fingerprint(&[&job.identity()]),
        shards: vec![[state.shard.index, state.shard.count]],
        chunks: state.chunks,
        box_bundles: sizes.map(|s| s.1),
        alphabet: sizes.map(|s| s.0),
        pruned_c1: state.counts.pruned_c1,
        pruned_index: state.counts.pruned_index,
        non_canonical: state.counts.non_canonical,
        candidates: state.counts.candidates,
        stages,
        survivors: state.survivors.len() as u64,
        seconds: state.seconds,
        candidates_per_second: if state.seconds > 0.0 {
            state.counts.candidates as f64 / state.seconds
        } else {
            0.0
        },
    }
}

/// The output text: one survivor per line (`"type": "model"`), then the funnel line.
pub fn output_text(state: &Checkpoint, funnel: &Funnel) -> Result<String, ScanError> {
    let mut out = String::new();
    for s in &state.survivors {
        let mut s = s.clone();
        s["type"] = "model".into();
        out.push_str(&serde_json::to_string(&s)?);
        out.push('\n');
    }
    out.push_str(&serde_json::to_string(funnel)?);
    out.push('\n');
    Ok(out)
}

fn sort_key(v: &Value) -> (String, Vec<Vec<i64>>) {
    (
        v.get("path").map(|p| p.to_string()).unwrap_or_default(),
        v.get("line_bundles")
            .and_then(|p| serde_json::from_value(p.clone()).ok())
            .unwrap_or_default(),
    )
}

/// Merge the outputs of the shards of one scan: survivors in the unsharded order (line bundles in
/// lexicographic order; catalogs by path), counters and times summed. Refuses outputs of different scans and
/// repeated or missing shards.
pub fn merge_outputs(texts: &[String]) -> Result<String, ScanError> {
    let mut models: Vec<Value> = Vec::new();
    let mut funnels: Vec<Value> = Vec::new();
    for t in texts {
        for line in t.lines().filter(|l| !l.trim().is_empty()) {
            let v: Value = serde_json::from_str(line)?;
            match v.get("type").and_then(Value::as_str) {
                Some("model") => models.push(v),
                Some("funnel") => funnels.push(v),
                _ => {
                    return Err(ScanError::Spec(
                        "a line is neither a model nor a funnel".into(),
                    ));
                }
            }
        }
    }
    let Some(first) = funnels.first().cloned() else {
        return Err(ScanError::Spec(
            "no funnel line: not a finished scan output".into(),
        ));
    };
    let mut shards: Vec<[usize; 2]> = Vec::new();
    for f in &funnels {
        if f["scan_fingerprint"] != first["scan_fingerprint"] {
            return Err(ScanError::Spec(
                "the outputs belong to different scans".into(),
            ));
        }
        let s: Vec<[usize; 2]> = serde_json::from_value(f["shards"].clone())?;
        shards.extend(s);
    }
    shards.sort();
    let n = shards[0][1];
    let expected: Vec<[usize; 2]> = (1..=n).map(|i| [i, n]).collect();
    if shards != expected {
        return Err(ScanError::Spec(format!(
            "shards {shards:?} do not cover 1..{n} exactly once"
        )));
    }
    models.sort_by_key(sort_key);
    let mut merged = first.clone();
    merged["shards"] = serde_json::to_value(&shards)?;
    for key in [
        "chunks",
        "pruned_c1",
        "pruned_index",
        "non_canonical",
        "candidates",
        "survivors",
    ] {
        let total: u64 = funnels.iter().map(|f| f[key].as_u64().unwrap_or(0)).sum();
        merged[key] = total.into();
    }
    let seconds: f64 = funnels
        .iter()
        .map(|f| f["seconds"].as_f64().unwrap_or(0.0))
        .sum();
    merged["seconds"] = seconds.into();
    let cand = merged["candidates"].as_f64().unwrap_or(0.0);
    merged["candidates_per_second"] = if seconds > 0.0 { cand / seconds } else { 0.0 }.into();
    if let Some(stages) = merged["stages"].as_array_mut() {
        for (i, st) in stages.iter_mut().enumerate() {
            for key in ["entered", "removed", "undecided"] {
                let total: u64 = funnels
                    .iter()
                    .map(|f| f["stages"][i][key].as_u64().unwrap_or(0))
                    .sum();
                st[key] = total.into();
            }
            let s: f64 = funnels
                .iter()
                .map(|f| f["stages"][i]["seconds"].as_f64().unwrap_or(0.0))
                .sum();
            st["seconds"] = s.into();
        }
    }
    let mut out = String::new();
    for m in &models {
        out.push_str(&serde_json::to_string(m)?);
        out.push('\n');
    }
    out.push_str(&serde_json::to_string(&merged)?);
    out.push('\n');
    Ok(out)
}
