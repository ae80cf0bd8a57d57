//! Screening at scale: enumerate line-bundle sums with `c1(V) = 0` on one configuration (or read a catalog of
//! model files), apply the filters cheap to expensive, and keep the survivors with the figures that made them
//! pass — in parallel, deterministically, in shards, resumable from checkpoints.
//!
//! * [`spec`]: the scan file and the filter settings;
//! * [`enumerate`]: the alphabet, the factor symmetry group, canonical forms and the chunked enumeration with
//!   prefix pruning;
//! * [`filters`]: the filters and their tallies;
//! * [`checkpoint`]: shards and checkpoint state;
//! * [`driver`]: the batch loop (rayon inside a batch, chunk order across batches), catalogs, the funnel and
//!   the merge of shard outputs.
//!
//! Invariant: the survivors and every counter are functions of the scan (and shard) alone — never of the
//! thread count, the batch size or where a run was interrupted; only the `seconds` figures vary.

pub mod checkpoint;
pub mod driver;
pub mod enumerate;
pub mod filters;
pub mod spec;

pub use checkpoint::{Checkpoint, Shard};
pub use driver::{CatalogJob, Funnel, Job, Progress, RunOptions, ScanJob, merge_outputs, run};
pub use filters::{Screen, StageTally, Tally};
pub use spec::{Filter, FilterSettings, ScanSpec};

use thiserror::Error;

/// Why a scan could not run.
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum ScanError {
    /// Bad scan file, catalog or option.
    #[error("{0}")]
    Spec(String),
    /// Bad or foreign checkpoint.
    #[error("checkpoint: {0}")]
    Checkpoint(String),
    /// A bundle computation refused.
    #[error("{0}")]
    Bundle(#[from] crate::bundle::BundleError),
    /// A cohomology computation refused.
    #[error("{0}")]
    Cohomology(#[from] crate::cohomology::CohomologyError),
    /// JSON encoding.
    #[error("{0}")]
    Json(#[from] serde_json::Error),
    /// Reading a catalog or writing output.
    #[error("{0}")]
    Io(String),
}
