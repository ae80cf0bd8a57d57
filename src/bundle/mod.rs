//! Sums of line bundles `V = ⊕_{a=1}^r L_a` on a Calabi-Yau threefold `X`
//! that is a complete intersection in a product of projective spaces, with
//! `L_a = O_X(k_a)`, `k_a ∈ Z^m`.
//!
//! This module holds the input type [`BundleSum`], its inline text form, the
//! exact Hirzebruch-Riemann-Roch index of a line bundle, the charge algebra of
//! the structure group `S(U(1)^r)` and the error type shared by the
//! submodules:
//!
//! * [`branching`] derives the multiplet tables from the E8 branching rules;
//! * [`consistency`] checks `c1(V) = 0`, integrality of `c2(V)`, the anomaly
//!   bound, the index and the vanishing of `h^0(V)` and `h^0(V^*)`;
//! * [`spectrum`] evaluates the derived tables on a geometry and returns the
//!   4d spectrum with charges and model-building flags.
//!
//! Invariant: a [`BundleSum`] always has rank 3, 4 or 5, `m ≥ 1`, and every
//! `k_a` has exactly `m` entries. All arithmetic is exact (integers or
//! arbitrary-precision rationals); overflow of the `i64` results is reported
//! as [`BundleError::Overflow`], never wrapped.

pub mod branching;
pub mod consistency;
pub mod spectrum;

use std::collections::HashMap;
use std::fmt;
use std::str::FromStr;

use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{ToPrimitive, Zero};
use serde::Serialize;

/// Callback returning `(h^0, h^1, h^2, h^3)` of `O_X(k)` for a degree vector `k`.
///
/// The error string is wrapped into [`BundleError::Cohomology`].
pub type CohomologyFn<'a> = dyn Fn(&[i64]) -> Result<Vec<u64>, String> + 'a;

/// Errors of the bundle module. Bad input never panics; it lands here.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum BundleError {
    /// The number of line bundles is not 3, 4 or 5.
    #[error(
        "a line bundle sum of rank {rank} is not supported: the rank must be 3 (E6), 4 (SO(10)) or 5 (SU(5))"
    )]
    InvalidRank {
        /// Number of line bundles supplied.
        rank: usize,
    },
    /// The ambient space has no factors (`m = 0`).
    #[error("the number of ambient projective factors m must be at least 1")]
    ZeroFactors,
    /// A line bundle has the wrong number of entries.
    #[error("line bundle {bundle} has {found} entries, expected m = {expected}")]
    LengthMismatch {
        /// 1-based index of the offending line bundle.
        bundle: usize,
        /// Expected number of entries (`m`).
        expected: usize,
        /// Number found.
        found: usize,
    },
    /// The inline form could not be parsed.
    #[error("cannot parse line bundle {bundle}, entry {entry}: {message}")]
    Parse {
        /// 1-based index of the line bundle (segment between `;`).
        bundle: usize,
        /// 1-based index of the entry within the line bundle (0 if the whole segment).
        entry: usize,
        /// What went wrong.
        message: String,
    },
    /// The inline form was empty.
    #[error("empty line bundle list: expected e.g. \"-1,0,1;1,0,-1;0,0,0\"")]
    EmptyInput,
    /// The intersection numbers or `c2(TX)` do not fit the bundle (shape or symmetry).
    #[error("invalid geometry data: {0}")]
    Geometry(String),
    /// The HRR index of a line bundle is not an integer (inconsistent geometry data).
    #[error(
        "the index of O_X({line_bundle:?}) is {value}, not an integer: the intersection numbers and c2(TX) are inconsistent"
    )]
    NonIntegralIndex {
        /// Degree vector of the line bundle.
        line_bundle: Vec<i64>,
        /// The rational value found.
        value: String,
    },
    /// A result does not fit in `i64`.
    #[error("arithmetic overflow while computing {0}")]
    Overflow(String),
    /// The symmetry order is zero or does not divide the index.
    #[error("the index {index} is not divisible by the symmetry order {order}")]
    SymmetryOrder {
        /// Order of the freely acting symmetry.
        order: u64,
        /// Index `χ(V)` on the covering space.
        index: i64,
    },
    /// The cohomology callback failed.
    #[error("cohomology of O_X({line_bundle:?}) failed: {message}")]
    Cohomology {
        /// Degree vector passed to the callback.
        line_bundle: Vec<i64>,
        /// The callback's message.
        message: String,
    },
    /// The cohomology callback returned a vector whose length is not 4.
    #[error("cohomology of O_X({line_bundle:?}) has {found} entries, expected 4 (h^0..h^3)")]
    CohomologyShape {
        /// Degree vector passed to the callback.
        line_bundle: Vec<i64>,
        /// Number of entries returned.
        found: usize,
    },
    /// Charge vectors of different lengths were combined.
    #[error("charge vectors of lengths {0} and {1} cannot be combined")]
    ChargeLength(usize, usize),
}

/// A rank 3, 4 or 5 sum of line bundles `⊕_a O_X(k_a)`.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct BundleSum {
    m: usize,
    bundles: Vec<Vec<i64>>,
}

impl BundleSum {
    /// Checked constructor: `bundles.len()` must be 3, 4 or 5, `m ≥ 1`, and
    /// every `k_a` must have `m` entries.
    pub fn new(m: usize, bundles: Vec<Vec<i64>>) -> Result<Self, BundleError> {
        if !(3..=5).contains(&bundles.len()) {
            return Err(BundleError::InvalidRank {
                rank: bundles.len(),
            });
        }
        if m == 0 {
            return Err(BundleError::ZeroFactors);
        }
        for (i, k) in bundles.iter().enumerate() {
            if k.len() != m {
                return Err(BundleError::LengthMismatch {
                    bundle: i + 1,
                    expected: m,
                    found: k.len(),
                });
            }
        }
        Ok(Self { m, bundles })
    }

    /// Parses the inline form `"-1,0,0,1;0,1,-1,0;…"`: line bundles separated
    /// by `;`, entries by `,`, whitespace anywhere tolerated, one trailing `;`
    /// allowed. `m` is taken from the first line bundle.
    pub fn parse_inline(text: &str) -> Result<Self, BundleError> {
        let bundles = parse_rows(text)?;
        let m = bundles[0].len();
        Self::new(m, bundles)
    }

    /// As [`BundleSum::parse_inline`], but every line bundle must have `m` entries.
    pub fn parse_inline_with_m(text: &str, m: usize) -> Result<Self, BundleError> {
        Self::new(m, parse_rows(text)?)
    }

    /// Number of ambient projective factors.
    pub fn m(&self) -> usize {
        self.m
    }

    /// Rank `r` of the sum (number of line bundles).
    pub fn rank(&self) -> usize {
        self.bundles.len()
    }

    /// The degree vectors `k_a`, in input order.
    pub fn bundles(&self) -> &[Vec<i64>] {
        &self.bundles
    }

    /// The four-dimensional gauge group commuting with `S(U(1)^r)` in E8.
    pub fn gauge_group(&self) -> branching::GaugeGroup {
        match self.rank() {
            3 => branching::GaugeGroup::E6,
            4 => branching::GaugeGroup::So10,
            _ => branching::GaugeGroup::Su5,
        }
    }

    /// `c1(V) = Σ_a k_a`, or [`BundleError::Overflow`].
    pub fn c1(&self) -> Result<Vec<i64>, BundleError> {
        self.product(&vec![1; self.rank()])
    }

    /// Degree vector of `⊗_a L_a^{w_a}` = `Σ_a w_a k_a` for a weight `w ∈ Z^r`.
    pub fn product(&self, weight: &[i64]) -> Result<Vec<i64>, BundleError> {
        if weight.len() != self.rank() {
            return Err(BundleError::ChargeLength(weight.len(), self.rank()));
        }
        let mut out = vec![0i64; self.m];
        for (w, k) in weight.iter().zip(&self.bundles) {
            for (o, x) in out.iter_mut().zip(k) {
                *o = w
                    .checked_mul(*x)
                    .and_then(|p| o.checked_add(p))
                    .ok_or_else(|| BundleError::Overflow("a line bundle product".into()))?;
            }
        }
        Ok(out)
    }
}

impl FromStr for BundleSum {
    type Err = BundleError;
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        Self::parse_inline(s)
    }
}

impl fmt::Display for BundleSum {
    /// Writes the inline form accepted by [`BundleSum::parse_inline`].
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let rows: Vec<String> = self
            .bundles
            .iter()
            .map(|k| {
                k.iter()
                    .map(ToString::to_string)
                    .collect::<Vec<_>>()
                    .join(",")
            })
            .collect();
        write!(f, "{}", rows.join(";"))
    }
}

fn parse_rows(text: &str) -> Result<Vec<Vec<i64>>, BundleError> {
    let trimmed = text.trim();
    if trimmed.is_empty() {
        return Err(BundleError::EmptyInput);
    }
    let body = trimmed.strip_suffix(';').unwrap_or(trimmed);
    let mut rows = Vec::new();
    for (i, segment) in body.split(';').enumerate() {
        if segment.trim().is_empty() {
            return Err(BundleError::Parse {
                bundle: i + 1,
                entry: 0,
                message: "empty line bundle (two ';' in a row?)".into(),
            });
        }
        let mut row = Vec::new();
        for (j, token) in segment.split(',').enumerate() {
            let token = token.trim();
            if token.is_empty() {
                return Err(BundleError::Parse {
                    bundle: i + 1,
                    entry: j + 1,
                    message: "empty entry (stray ',')".into(),
                });
            }
            let compact: String = token.chars().filter(|c| !c.is_whitespace()).collect();
            let value = compact.parse::<i64>().map_err(|e| BundleError::Parse {
                bundle: i + 1,
                entry: j + 1,
                message: format!("{token:?} is not an integer ({e})"),
            })?;
            row.push(value);
        }
        rows.push(row);
    }
    Ok(rows)
}

/// An exact number for serialization: a JSON integer when it is an integer
/// fitting `i64`, otherwise a string `"p/q"` (or a decimal string for a huge integer).
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
#[serde(untagged)]
pub enum Exact {
    /// An integer value.
    Integer(i64),
    /// A non-integral rational `"p/q"`, or an integer beyond `i64`.
    Rational(String),
}

impl Exact {
    /// Converts an exact rational.
    pub fn from_rational(q: &BigRational) -> Self {
        if q.is_integer() {
            match q.to_integer().to_i64() {
                Some(v) => Exact::Integer(v),
                None => Exact::Rational(q.to_integer().to_string()),
            }
        } else {
            Exact::Rational(format!("{}/{}", q.numer(), q.denom()))
        }
    }

    /// The integer value, if any.
    pub fn as_integer(&self) -> Option<i64> {
        match self {
            Exact::Integer(v) => Some(*v),
            Exact::Rational(_) => None,
        }
    }
}

/// Checks that `triple` is a symmetric `m×m×m` array and `c2_tx` has length `m`.
pub fn validate_geometry(
    m: usize,
    triple: &[Vec<Vec<i64>>],
    c2_tx: &[i64],
) -> Result<(), BundleError> {
    if triple.len() != m {
        return Err(BundleError::Geometry(format!(
            "triple intersection numbers have {} slices, expected m = {m}",
            triple.len()
        )));
    }
    for (r, slice) in triple.iter().enumerate() {
        if slice.len() != m || slice.iter().any(|row| row.len() != m) {
            return Err(BundleError::Geometry(format!(
                "triple intersection slice {r} is not {m}×{m}"
            )));
        }
    }
    for (r, s, t) in itertools::iproduct!(0..m, 0..m, 0..m) {
        let v = triple[r][s][t];
        if v != triple[s][r][t] || v != triple[r][t][s] || v != triple[t][s][r] {
            return Err(BundleError::Geometry(format!(
                "triple intersection numbers are not symmetric at ({r},{s},{t})"
            )));
        }
    }
    if c2_tx.len() != m {
        return Err(BundleError::Geometry(format!(
            "c2(TX) has {} entries, expected m = {m}",
            c2_tx.len()
        )));
    }
    Ok(())
}

/// `Σ_{s,t} d_{rst} a^s b^t` for every `r`, exactly.
pub(crate) fn contract2(triple: &[Vec<Vec<i64>>], a: &[i64], b: &[i64]) -> Vec<BigInt> {
    triple
        .iter()
        .map(|slice| {
            let mut acc = BigInt::zero();
            for (s, row) in slice.iter().enumerate() {
                for (t, d) in row.iter().enumerate() {
                    acc += BigInt::from(*d) * a[s] * b[t];
                }
            }
            acc
        })
        .collect()
}

/// Exact HRR value `χ(O_X(k)) = (1/6) d_{rst} k^r k^s k^t + (1/12) c2_r k^r`
/// without shape checks (callers validate first).
pub(crate) fn hrr_rational(triple: &[Vec<Vec<i64>>], c2_tx: &[i64], k: &[i64]) -> BigRational {
    let cubic: BigInt = contract2(triple, k, k)
        .into_iter()
        .zip(k)
        .map(|(v, x)| v * x)
        .sum();
    let linear: BigInt = c2_tx.iter().zip(k).map(|(c, x)| BigInt::from(*c) * x).sum();
    BigRational::new(cubic * 2 + linear, BigInt::from(12))
}

pub(crate) fn hrr_index_unchecked(
    triple: &[Vec<Vec<i64>>],
    c2_tx: &[i64],
    k: &[i64],
) -> Result<i64, BundleError> {
    let q = hrr_rational(triple, c2_tx, k);
    if !q.is_integer() {
        return Err(BundleError::NonIntegralIndex {
            line_bundle: k.to_vec(),
            value: format!("{}/{}", q.numer(), q.denom()),
        });
    }
    q.to_integer()
        .to_i64()
        .ok_or_else(|| BundleError::Overflow(format!("the index of O_X({k:?})")))
}

/// Index `χ(O_X(k))` by Hirzebruch-Riemann-Roch on a Calabi-Yau threefold,
/// `(1/6) d_{rst} k^r k^s k^t + (1/12) c2(TX)_r k^r`, computed exactly.
/// A non-integral value is an error: it signals inconsistent geometry data.
pub fn line_bundle_index(
    triple: &[Vec<Vec<i64>>],
    c2_tx: &[i64],
    k: &[i64],
) -> Result<i64, BundleError> {
    validate_geometry(k.len(), triple, c2_tx)?;
    hrr_index_unchecked(triple, c2_tx, k)
}

/// Memoising wrapper around a [`CohomologyFn`]: each distinct degree vector
/// is passed to the callback at most once; the result is shape-checked.
pub struct CohomologyCache<'a> {
    callback: &'a CohomologyFn<'a>,
    cache: HashMap<Vec<i64>, Vec<u64>>,
    calls: usize,
}

impl<'a> CohomologyCache<'a> {
    /// Wraps a callback.
    pub fn new(callback: &'a CohomologyFn<'a>) -> Self {
        Self {
            callback,
            cache: HashMap::new(),
            calls: 0,
        }
    }

    /// `(h^0, h^1, h^2, h^3)` of `O_X(k)`.
    pub fn get(&mut self, k: &[i64]) -> Result<Vec<u64>, BundleError> {
        if let Some(h) = self.cache.get(k) {
            return Ok(h.clone());
        }
        self.calls += 1;
        let h = (self.callback)(k).map_err(|message| BundleError::Cohomology {
            line_bundle: k.to_vec(),
            message,
        })?;
        if h.len() != 4 {
            return Err(BundleError::CohomologyShape {
                line_bundle: k.to_vec(),
                found: h.len(),
            });
        }
        self.cache.insert(k.to_vec(), h.clone());
        Ok(h)
    }

    /// Number of times the underlying callback was invoked.
    pub fn calls(&self) -> usize {
        self.calls
    }
}

/// Alternating sum `h^0 − h^1 + h^2 − h^3`, or `None` on overflow.
pub(crate) fn euler_characteristic(h: &[u64]) -> Option<i64> {
    let mut acc: i128 = 0;
    for (i, v) in h.iter().enumerate() {
        let v = i128::from(*v);
        acc += if i % 2 == 0 { v } else { -v };
    }
    i64::try_from(acc).ok()
}

/// Component-wise sum of charge vectors (all of one length `r`).
pub fn charge_sum(charges: &[&[i64]]) -> Result<Vec<i64>, BundleError> {
    let Some(first) = charges.first() else {
        return Ok(Vec::new());
    };
    let mut out = vec![0i64; first.len()];
    for q in charges {
        if q.len() != out.len() {
            return Err(BundleError::ChargeLength(out.len(), q.len()));
        }
        for (o, x) in out.iter_mut().zip(q.iter()) {
            *o = o
                .checked_add(*x)
                .ok_or_else(|| BundleError::Overflow("a charge sum".into()))?;
        }
    }
    Ok(out)
}

/// The conjugate charge `−q` (entries saturate at the `i64` range; charges
/// from the derived tables lie in `{−1, 0, 1}`).
pub fn conjugate_charge(q: &[i64]) -> Vec<i64> {
    q.iter().map(|x| x.saturating_neg()).collect()
}

/// Canonical representative of a charge modulo `(1,…,1)`: the smallest
/// entry is shifted to zero. Two charges are equivalent iff their canonical
/// forms agree.
pub fn canonical_charge(q: &[i64]) -> Vec<i64> {
    let min = q.iter().copied().min().unwrap_or(0);
    q.iter().map(|x| x.saturating_sub(min)).collect()
}

/// Whether a charge vector is a multiple of `(1,…,1)`, i.e. neutral under `S(U(1)^r)`.
pub fn is_neutral(q: &[i64]) -> bool {
    q.windows(2).all(|w| w[0] == w[1])
}

/// Whether the sum of the given charges is a multiple of `(1,…,1)`: the
/// product of the corresponding fields is invariant under `S(U(1)^r)`.
/// Pass [`conjugate_charge`] for a conjugated field.
pub fn charge_is_singlet(charges: &[&[i64]]) -> Result<bool, BundleError> {
    Ok(is_neutral(&charge_sum(charges)?))
}

/// Whether two charges agree modulo `(1,…,1)`.
pub fn charges_equivalent(a: &[i64], b: &[i64]) -> Result<bool, BundleError> {
    let nb = conjugate_charge(b);
    charge_is_singlet(&[a, &nb])
}

#[cfg(test)]
mod tests;
