//! Topological and cohomological consistency checks of a line bundle sum
//! `V = ⊕_a O_X(k_a)`.
//!
//! Computed, each with the numbers behind it:
//!
//! * `c1(V) = Σ_a k_a`; a nonzero `c1` is a failed check, not an error;
//! * `c2(V)_r = −(1/2) Σ_a d_{rst} k_a^s k_a^t`, which is `−ch2(V)·J_r` and
//!   equals `c2(V)·J_r` when `c1(V) = 0`; it is then an integer because
//!   `Σ_a k_a k_a = −2 Σ_{a<b} k_a k_b`. If not integral it is reported as a
//!   rational string;
//! * the anomaly bound `c2(TX)_r − c2(V)_r ≥ 0` for every `r`. This test is
//!   valid in the favourable case, where the effective curve classes are the
//!   non-negative combinations of the duals of the `J_r`; the difference is
//!   the class of the five-branes that make up the Bianchi identity;
//! * the index `χ(V) = Σ_a χ(L_a)` by exact HRR and the number of families
//!   `−χ(V)/|Γ|` for a freely acting symmetry of order `|Γ|`
//!   (an error if `|Γ|` does not divide it);
//! * `h^0(V) = h^0(V^*) = 0` from the cohomology callback, a necessary
//!   condition for a stable bundle with `c1(V) = 0`.
//!
//! Invariant: every number is exact; no check silently passes on bad input.

use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{Signed, Zero};
use serde::Serialize;

use super::branching::GaugeGroup;
use super::{
    BundleError, BundleSum, CohomologyCache, CohomologyFn, Exact, contract2, hrr_index_unchecked,
    validate_geometry,
};

/// Options of [`check_consistency`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ConsistencyOptions {
    /// Order of a freely acting symmetry dividing the index (default 1).
    pub symmetry_order: u64,
    /// If set, the index check passes only when `families` equals this number.
    pub target_families: Option<i64>,
}

impl Default for ConsistencyOptions {
    fn default() -> Self {
        Self {
            symmetry_order: 1,
            target_families: None,
        }
    }
}

/// The `c1(V) = 0` check.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct C1Check {
    /// Whether `c1(V) = 0`.
    pub passed: bool,
    /// `c1(V) = Σ_a k_a`.
    pub c1: Vec<i64>,
}

/// The integrality of `c2(V)`.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct C2Check {
    /// Whether every component is an integer.
    pub passed: bool,
    /// `c2(V)_r = −(1/2) Σ_a d_{rst} k_a^s k_a^t`.
    pub c2_bundle: Vec<Exact>,
}

/// The anomaly bound `c2(TX) − c2(V) ≥ 0`.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct AnomalyCheck {
    /// Whether every component of `five_brane` is non-negative.
    pub passed: bool,
    /// `c2(TX)·J_r`.
    pub c2_tx: Vec<i64>,
    /// `c2(V)_r`.
    pub c2_bundle: Vec<Exact>,
    /// `c2(TX)_r − c2(V)_r`: the five-brane class in the favourable basis.
    pub five_brane: Vec<Exact>,
    /// 1-based indices `r` where the bound fails.
    pub violated: Vec<usize>,
}

/// The index and family number.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct IndexCheck {
    /// Whether `families` equals the target (always true without a target).
    pub passed: bool,
    /// `χ(L_a)` for each line bundle.
    pub line_bundle_indices: Vec<i64>,
    /// `χ(V)`.
    pub index: i64,
    /// Order of the freely acting symmetry.
    pub symmetry_order: u64,
    /// `−χ(V) / symmetry_order`.
    pub families: i64,
    /// The requested family number, if any.
    pub target_families: Option<i64>,
}

/// `h^0` of one summand and of its dual.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct SectionEntry {
    /// 1-based index `a`.
    pub bundle: usize,
    /// `h^0(L_a)`.
    pub h0: u64,
    /// `h^0(L_a^*)`.
    pub h0_dual: u64,
}

/// The `h^0(V) = h^0(V^*) = 0` check.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct SectionsCheck {
    /// Whether both vanish.
    pub passed: bool,
    /// `h^0(V) = Σ_a h^0(L_a)`.
    pub h0_v: u64,
    /// `h^0(V^*) = Σ_a h^0(L_a^*)`.
    pub h0_v_dual: u64,
    /// Per summand.
    pub per_bundle: Vec<SectionEntry>,
}

/// All consistency checks of a line bundle sum.
///
/// The first fields (`rank`, `gauge_group`, `c1_zero`, `c2_bundle`,
/// `anomaly_ok`, `index`, `families`) are the summary; they are not
/// serialised, because the spectrum object that embeds this one carries the
/// same figures at its top level. The remaining keys hold each check in full.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Consistency {
    /// Rank `r`.
    #[serde(skip_serializing)]
    pub rank: usize,
    /// GUT group.
    #[serde(skip_serializing)]
    pub gauge_group: GaugeGroup,
    /// `c1(V) = 0`.
    #[serde(skip_serializing)]
    pub c1_zero: bool,
    /// `c2(V)_r`.
    #[serde(skip_serializing)]
    pub c2_bundle: Vec<Exact>,
    /// The anomaly bound holds.
    #[serde(skip_serializing)]
    pub anomaly_ok: bool,
    /// `χ(V)`.
    #[serde(skip_serializing)]
    pub index: i64,
    /// `−χ(V)/symmetry_order`.
    #[serde(skip_serializing)]
    pub families: i64,
    /// Every check that was run passed.
    pub all_passed: bool,
    /// `c1` details.
    pub c1: C1Check,
    /// `c2` integrality details.
    pub c2: C2Check,
    /// Anomaly details.
    pub anomaly: AnomalyCheck,
    /// Index details.
    pub index_check: IndexCheck,
    /// Section details; `None` when no cohomology callback was given.
    pub sections: Option<SectionsCheck>,
}

/// Runs every check. Without a cohomology callback the `h^0` check is skipped
/// (`sections` is `None`).
pub fn check_consistency(
    bundles: &BundleSum,
    triple: &[Vec<Vec<i64>>],
    c2_tx: &[i64],
    cohomology: Option<&CohomologyFn<'_>>,
    options: &ConsistencyOptions,
) -> Result<Consistency, BundleError> {
    match cohomology {
        Some(f) => {
            let mut cache = CohomologyCache::new(f);
            check_with_cache(bundles, triple, c2_tx, Some(&mut cache), options)
        }
        None => check_with_cache(bundles, triple, c2_tx, None, options),
    }
}

/// `c2(V)_r = −(1/2) Σ_a d_{rst} k_a^s k_a^t`, exactly.
pub fn c2_bundle(
    bundles: &BundleSum,
    triple: &[Vec<Vec<i64>>],
) -> Result<Vec<BigRational>, BundleError> {
    let m = bundles.m();
    validate_geometry(m, triple, &vec![0; m])?;
    Ok(c2_unchecked(bundles, triple))
}

fn c2_unchecked(bundles: &BundleSum, triple: &[Vec<Vec<i64>>]) -> Vec<BigRational> {
    let mut acc = vec![BigInt::zero(); bundles.m()];
    for k in bundles.bundles() {
        for (a, v) in acc.iter_mut().zip(contract2(triple, k, k)) {
            *a += v;
        }
    }
    acc.into_iter()
        .map(|v| BigRational::new(-v, BigInt::from(2)))
        .collect()
}

pub(crate) fn check_with_cache(
    bundles: &BundleSum,
    triple: &[Vec<Vec<i64>>],
    c2_tx: &[i64],
    cache: Option<&mut CohomologyCache<'_>>,
    options: &ConsistencyOptions,
) -> Result<Consistency, BundleError> {
    validate_geometry(bundles.m(), triple, c2_tx)?;

    let c1 = bundles.c1()?;
    let c1_check = C1Check {
        passed: c1.iter().all(|x| *x == 0),
        c1,
    };

    let c2q = c2_unchecked(bundles, triple);
    let c2_exact: Vec<Exact> = c2q.iter().map(Exact::from_rational).collect();
    let c2_check = C2Check {
        passed: c2q.iter().all(BigRational::is_integer),
        c2_bundle: c2_exact.clone(),
    };

    let five: Vec<BigRational> = c2_tx
        .iter()
        .zip(&c2q)
        .map(|(c, v)| BigRational::from_integer(BigInt::from(*c)) - v)
        .collect();
    let violated: Vec<usize> = five
        .iter()
        .enumerate()
        .filter(|(_, v)| v.is_negative())
        .map(|(i, _)| i + 1)
        .collect();
    let anomaly = AnomalyCheck {
        passed: violated.is_empty(),
        c2_tx: c2_tx.to_vec(),
        c2_bundle: c2_exact.clone(),
        five_brane: five.iter().map(Exact::from_rational).collect(),
        violated,
    };

    let line_bundle_indices = bundles
        .bundles()
        .iter()
        .map(|k| hrr_index_unchecked(triple, c2_tx, k))
        .collect::<Result<Vec<_>, _>>()?;
    let index = line_bundle_indices
        .iter()
        .try_fold(0i64, |acc, x| acc.checked_add(*x))
        .ok_or_else(|| BundleError::Overflow("the index of V".into()))?;
    let families = families_from_index(index, options.symmetry_order)?;
    let index_check = IndexCheck {
        passed: options.target_families.is_none_or(|t| t == families),
        line_bundle_indices,
        index,
        symmetry_order: options.symmetry_order,
        families,
        target_families: options.target_families,
    };

    let sections = match cache {
        Some(cache) => Some(sections_check(bundles, cache)?),
        None => None,
    };

    let all_passed = c1_check.passed
        && c2_check.passed
        && anomaly.passed
        && index_check.passed
        && sections.as_ref().is_none_or(|s| s.passed);

    Ok(Consistency {
        rank: bundles.rank(),
        gauge_group: bundles.gauge_group(),
        c1_zero: c1_check.passed,
        c2_bundle: c2_exact,
        anomaly_ok: anomaly.passed,
        index,
        families,
        all_passed,
        c1: c1_check,
        c2: c2_check,
        anomaly,
        index_check,
        sections,
    })
}

/// `−index / symmetry_order`, or an error when the order is zero or does not divide.
pub fn families_from_index(index: i64, symmetry_order: u64) -> Result<i64, BundleError> {
    let err = BundleError::SymmetryOrder {
        order: symmetry_order,
        index,
    };
    let order = i64::try_from(symmetry_order).map_err(|_| err.clone())?;
    if order == 0 || index % order != 0 {
        return Err(err);
    }
    (index / order)
        .checked_neg()
        .ok_or_else(|| BundleError::Overflow("the number of families".into()))
}

fn sections_check(
    bundles: &BundleSum,
    cache: &mut CohomologyCache<'_>,
) -> Result<SectionsCheck, BundleError> {
    let mut per_bundle = Vec::new();
    let (mut h0_v, mut h0_v_dual) = (0u64, 0u64);
    for (i, k) in bundles.bundles().iter().enumerate() {
        let dual = k
            .iter()
            .map(|x| x.checked_neg())
            .collect::<Option<Vec<i64>>>()
            .ok_or_else(|| BundleError::Overflow("a dual line bundle".into()))?;
        let h0 = cache.get(k)?[0];
        let h0_dual = cache.get(&dual)?[0];
        let overflow = || BundleError::Overflow("h^0 of the bundle sum".into());
        h0_v = h0_v.checked_add(h0).ok_or_else(overflow)?;
        h0_v_dual = h0_v_dual.checked_add(h0_dual).ok_or_else(overflow)?;
        per_bundle.push(SectionEntry {
            bundle: i + 1,
            h0,
            h0_dual,
        });
    }
    Ok(SectionsCheck {
        passed: h0_v == 0 && h0_v_dual == 0,
        h0_v,
        h0_v_dual,
        per_bundle,
    })
}
