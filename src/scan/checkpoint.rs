//! Shards and checkpoints: which chunks a job owns, and the state saved after every batch of chunks.
//!
//! Shard `I/N` (1-based) owns the chunks `c` with `c mod N = I − 1`, so N shards cover every chunk exactly once.
//! A checkpoint records how many of the shard's chunks (in chunk order) are finished together with the
//! survivors and counters of exactly those chunks; resuming continues with the next chunk, so no model is lost
//! or repeated. The fingerprint ties a checkpoint to the scan text, the filters and the shard.
//!
//! Invariant: `next ≤` number of the shard's chunks; survivors are in chunk order.

use super::ScanError;
use super::enumerate::EnumerationCounts;
use super::filters::Tally;
use serde::{Deserialize, Serialize};
use serde_json::Value;

/// Schema tag of checkpoint files.
pub const CHECKPOINT_SCHEMA: &str = "sheafwright.scan-checkpoint/1";

/// One shard `index/count` (1-based index).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct Shard {
    /// 1-based shard number.
    pub index: usize,
    /// Number of shards.
    pub count: usize,
}

impl Shard {
    /// The whole enumeration.
    pub const ALL: Shard = Shard { index: 1, count: 1 };

    /// Parse `I/N` with `1 ≤ I ≤ N`.
    pub fn parse(text: &str) -> Result<Shard, ScanError> {
        let bad = || {
            ScanError::Spec(format!(
                "--shard {text:?}: expected I/N with 1 <= I <= N, e.g. 2/8"
            ))
        };
        let (a, b) = text.split_once('/').ok_or_else(bad)?;
        let index: usize = a.trim().parse().map_err(|_| bad())?;
        let count: usize = b.trim().parse().map_err(|_| bad())?;
        if index == 0 || count == 0 || index > count || count > 1_000_000 {
            return Err(bad());
        }
        Ok(Shard { index, count })
    }

    /// The chunks of this shard among `total`, in order.
    pub fn chunks(self, total: usize) -> Vec<usize> {
        (self.index - 1..total).step_by(self.count).collect()
    }
}

/// The saved state of a scan after a whole number of batches.
#[derive(Clone, Debug, Serialize, Deserialize)]
pub struct Checkpoint {
    /// [`CHECKPOINT_SCHEMA`].
    pub schema: String,
    /// Ties the checkpoint to one scan (text, filters) and shard.
    pub fingerprint: String,
    /// The shard.
    pub shard: Shard,
    /// Number of the shard's chunks finished (in chunk order).
    pub next: usize,
    /// Number of the shard's chunks.
    pub chunks: usize,
    /// Survivors of the finished chunks, in order.
    pub survivors: Vec<Value>,
    /// Enumeration counters of the finished chunks.
    pub counts: EnumerationCounts,
    /// Filter tallies of the finished chunks.
    pub tally: Tally,
    /// Wall-clock seconds spent so far (all sessions).
    pub seconds: f64,
}

impl Checkpoint {
    /// A fresh checkpoint (nothing done).
    pub fn start(fingerprint: String, shard: Shard, chunks: usize) -> Checkpoint {
        Checkpoint {
            schema: CHECKPOINT_SCHEMA.into(),
            fingerprint,
            shard,
            next: 0,
            chunks,
            survivors: Vec::new(),
            counts: EnumerationCounts::default(),
            tally: Tally::default(),
            seconds: 0.0,
        }
    }

    /// Parse a checkpoint and check that it belongs to this scan and shard.
    pub fn parse_for(text: &str, fingerprint: &str, shard: Shard) -> Result<Checkpoint, ScanError> {
        let c: Checkpoint = serde_json::from_str(text)
            .map_err(|e| ScanError::Checkpoint(format!("unreadable checkpoint ({e})")))?;
        if c.schema != CHECKPOINT_SCHEMA {
            return Err(ScanError::Checkpoint(format!(
                "unknown schema {:?}",
                c.schema
            )));
        }
        if c.fingerprint != fingerprint || c.shard != shard {
            return Err(ScanError::Checkpoint(
                "the checkpoint belongs to a different scan, filter set or shard".into(),
            ));
        }
        if c.next > c.chunks {
            return Err(ScanError::Checkpoint(
                "corrupt checkpoint (next > chunks)".into(),
            ));
        }
        Ok(c)
    }
}

/// FNV-1a 64-bit hash (stable across Rust versions and platforms), as 16 hex digits.
pub fn fingerprint(parts: &[&str]) -> String {
    let mut h: u64 = 0xcbf2_9ce4_8422_2325;
    for p in parts {
        for b in p.bytes().chain(std::iter::once(0u8)) {
            h ^= u64::from(b);
            h = h.wrapping_mul(0x0100_0000_01b3);
        }
    }
    format!("{h:016x}")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn shards_partition_the_chunks() {
        for n in [1, 3, 7] {
            let mut all: Vec<usize> = (1..=n)
                .flat_map(|i| Shard { index: i, count: n }.chunks(20))
                .collect();
            all.sort();
            assert_eq!(all, (0..20).collect::<Vec<_>>());
        }
        assert!(Shard::parse("0/3").is_err());
        assert!(Shard::parse("4/3").is_err());
        assert_eq!(Shard::parse("2/3").unwrap(), Shard { index: 2, count: 3 });
    }

    #[test]
    fn fingerprint_is_stable_and_separates_parts() {
        assert_ne!(fingerprint(&["ab", "c"]), fingerprint(&["a", "bc"]));
        assert_eq!(fingerprint(&[""]), fingerprint(&[""]));
    }
}
