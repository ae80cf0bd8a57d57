//! The screening filters, cheap to expensive, applied to one candidate sum; each survivor keeps the figures
//! that made it pass.
//!
//! Filters ([`Filter::ALL`] order): `c1`, `index` (`Σ_a χ(L_a) = −families·|Γ|`, exact HRR), `anomaly`
//! (`c2(TX)_r − c2(V)_r ≥ 0`), `slope_sign` (no slope or slope combination of constant sign:
//! [`crate::slope::slope_obstruction`]), `slope_zero` (a certified common zero: [`crate::slope::certify_slope_zero`]
//! must answer `exists`), `cohomology` (the spectrum from the shared engine: no anti-families, no chiral
//! exotics, net families equal to `−index`, no index mismatch), `higgs` (a Higgs candidate present).
//!
//! Line-bundle-local parts (a slope of constant sign; an anti-family from one line bundle) are also offered as
//! alphabet restrictions ([`Screen::excluded_bundle`]): a sum containing such a line bundle fails that filter,
//! so leaving the bundle out of the alphabet loses no survivor.
//!
//! Invariant: every verdict is exact; an undecided slope certificate removes the candidate and is counted.

use super::ScanError;
use super::spec::{Filter, FilterSettings};
use crate::bundle::branching::{Role, derive_table};
use crate::bundle::consistency::ConsistencyOptions;
use crate::bundle::{BundleSum, Exact};
use crate::cohomology::CohomologyEngine;
use crate::geometry::Geometry;
use crate::slope::{SlopeOptions, SlopeZero, certify_slope_zero, slope_obstruction};
use num_bigint::BigInt;
use num_rational::BigRational;
use serde::{Deserialize, Serialize};
use serde_json::{Value, json};
use std::time::Instant;

/// What one filter did: candidates in, removed, undecided (slope certificates), time, and line bundles removed
/// from the alphabet up front.
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
pub struct StageTally {
    /// Filter name.
    pub filter: String,
    /// Candidates that reached the filter.
    pub entered: u64,
    /// Candidates it removed.
    pub removed: u64,
    /// Of the removed, those with an undecided slope certificate (slope_zero only).
    pub undecided: u64,
    /// Line bundles left out of the alphabet by the filter's line-bundle-local part.
    pub alphabet_removed: u64,
    /// Time spent in the filter, summed over threads (seconds; varies between runs).
    pub seconds: f64,
}

/// Per-filter tallies, one per entry of [`Filter::ALL`].
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Tally {
    /// Stages in application order (filters not applied keep zeros).
    pub stages: Vec<StageTally>,
}

impl Default for Tally {
    fn default() -> Self {
        Tally {
            stages: Filter::ALL
                .iter()
                .map(|f| StageTally {
                    filter: f.name().into(),
                    ..StageTally::default()
                })
                .collect(),
        }
    }
}

impl Tally {
    /// Add another tally.
    pub fn add(&mut self, o: &Tally) {
        for (a, b) in self.stages.iter_mut().zip(&o.stages) {
            a.entered += b.entered;
            a.removed += b.removed;
            a.undecided += b.undecided;
            a.seconds += b.seconds;
            a.alphabet_removed = a.alphabet_removed.max(b.alphabet_removed);
        }
    }
}

/// The filter context of one configuration, shared by all threads.
pub struct Screen<'a> {
    engine: &'a CohomologyEngine,
    triple: Vec<Vec<Vec<i64>>>,
    c2_tx: Vec<i64>,
    settings: FilterSettings,
    /// Coefficients `c` such that an anti-family multiplet sits in `H^1(L_a^c)` for each `a`.
    anti_family_powers: Vec<i64>,
}

impl<'a> Screen<'a> {
    /// Context for the engine's configuration. Errors unless the configuration is a threefold.
    pub fn new(
        engine: &'a CohomologyEngine,
        settings: FilterSettings,
        rank: usize,
    ) -> Result<Self, ScanError> {
        let geometry = Geometry::new(engine.config());
        let (Some(triple), Some(c2_tx)) = (geometry.triple_intersections(), geometry.c2_dot_j())
        else {
            return Err(ScanError::Spec(format!(
                "scans need a Calabi-Yau threefold; {} has dimension {}",
                engine.config().label(),
                engine.config().dimension()
            )));
        };
        let mut anti_family_powers = Vec::new();
        if let Some(group) = crate::bundle::branching::GaugeGroup::from_rank(rank) {
            for e in derive_table(group).entries {
                let nz: Vec<i64> = e.charge.iter().copied().filter(|&c| c != 0).collect();
                if e.role == Role::AntiFamily
                    && nz.len() == 1
                    && !anti_family_powers.contains(&nz[0])
                {
                    anti_family_powers.push(nz[0]);
                }
            }
        }
        Ok(Screen {
            engine,
            triple,
            c2_tx,
            settings,
            anti_family_powers,
        })
    }

    /// The settings.
    pub fn settings(&self) -> &FilterSettings {
        &self.settings
    }

    /// `χ(O_X(k))` by exact HRR.
    pub fn index(&self, k: &[i64]) -> Result<i64, ScanError> {
        Ok(crate::bundle::line_bundle_index(
            &self.triple,
            &self.c2_tx,
            k,
        )?)
    }

    /// The filter whose line-bundle-local part excludes `k` from every survivor, if any: a slope of constant
    /// strict sign on the Kähler cone (`slope_sign`), or `h^1(L^c) > 0` for an anti-family power `c`
    /// (`cohomology`). Only applied filters are consulted.
    pub fn excluded_bundle(&self, k: &[i64]) -> Result<Option<Filter>, ScanError> {
        if self.settings.has(Filter::SlopeSign)
            && matches!(
                slope_obstruction(&self.triple, &[k.to_vec()]),
                Ok(Some(crate::slope::NoneCertificate::SignObstruction { .. }))
            )
        {
            return Ok(Some(Filter::SlopeSign));
        }
        if self.settings.has(Filter::Cohomology) {
            for &c in &self.anti_family_powers {
                let kc: Vec<i64> = k.iter().map(|x| x * c).collect();
                if self.engine.cohomology(&kc)?.h[1] > 0 {
                    return Ok(Some(Filter::Cohomology));
                }
            }
        }
        Ok(None)
    }

    /// Run the applied filters on one sum; `Ok(Some(figures))` for a survivor (a JSON object with
    /// `line_bundles` and the figures of each applied filter).
    pub fn screen(
        &self,
        bundles: &[Vec<i64>],
        tally: &mut Tally,
    ) -> Result<Option<Value>, ScanError> {
        let sum = BundleSum::new(self.c2_tx.len(), bundles.to_vec())?;
        let mut out = json!({
            "line_bundles": bundles,
            "bundles": sum.to_string(),
            "rank": bundles.len(),
        });
        for f in Filter::ALL {
            if !self.settings.has(f) {
                continue;
            }
            let stage = &mut tally.stages[f.position()];
            stage.entered += 1;
            let started = Instant::now();
            let verdict = self.apply(f, &sum, &mut out);
            stage.seconds += started.elapsed().as_secs_f64();
            match verdict? {
                Verdict::Pass => {}
                Verdict::Fail => {
                    stage.removed += 1;
                    return Ok(None);
                }
                Verdict::Undecided => {
                    stage.removed += 1;
                    stage.undecided += 1;
                    return Ok(None);
                }
            }
        }
        Ok(Some(out))
    }

    fn apply(&self, f: Filter, sum: &BundleSum, out: &mut Value) -> Result<Verdict, ScanError> {
        let pass = |b: bool| if b { Verdict::Pass } else { Verdict::Fail };
        match f {
            Filter::C1 => Ok(pass(sum.c1()?.iter().all(|&x| x == 0))),
            Filter::Index => {
                let mut index = 0i64;
                for k in sum.bundles() {
                    index += self.index(k)?;
                }
                out["index"] = json!(index);
                out["symmetry_order"] = json!(self.settings.symmetry_order);
                let ok = index == self.settings.target_index();
                if ok {
                    out["families"] = json!(self.settings.families);
                }
                Ok(pass(ok))
            }
            Filter::Anomaly => {
                let c2v = crate::bundle::consistency::c2_bundle(sum, &self.triple)?;
                let five: Vec<BigRational> = self
                    .c2_tx
                    .iter()
                    .zip(&c2v)
                    .map(|(c, v)| BigRational::from_integer(BigInt::from(*c)) - v)
                    .collect();
                let ok = five
                    .iter()
                    .all(|v| *v >= BigRational::from_integer(0.into()));
                out["c2_bundle"] = json!(c2v.iter().map(Exact::from_rational).collect::<Vec<_>>());
                out["five_brane"] =
                    json!(five.iter().map(Exact::from_rational).collect::<Vec<_>>());
                Ok(pass(ok))
            }
            Filter::SlopeSign => {
                let obstruction = slope_obstruction(&self.triple, sum.bundles())
                    .map_err(|e| ScanError::Spec(format!("slope: {e}")))?;
                Ok(pass(obstruction.is_none()))
            }
            Filter::SlopeZero => {
                let z = certify_slope_zero(&self.triple, sum.bundles(), &SlopeOptions::default())
                    .map_err(|e| ScanError::Spec(format!("slope: {e}")))?;
                match z {
                    SlopeZero::Exists(_) => {
                        out["slope_zero"] = serde_json::to_value(&z)?;
                        Ok(Verdict::Pass)
                    }
                    SlopeZero::None(_) => Ok(Verdict::Fail),
                    SlopeZero::Undecided { .. } => Ok(Verdict::Undecided),
                }
            }
            Filter::Cohomology => {
                let spectrum = self.spectrum(sum)?;
                let fl = &spectrum.flags;
                out["family_count"] = json!(fl.family_count);
                out["anti_family_count"] = json!(fl.anti_family_count);
                out["exotic_chiral_excess"] = json!(fl.exotic_chiral_excess);
                out["higgs_candidates_present"] = json!(fl.higgs_candidates_present);
                out["higgs_pairs"] = json!(
                    fl.higgs_pairs
                        .iter()
                        .map(|p| format!("{}/{}", p.first_label, p.second_label))
                        .collect::<Vec<_>>()
                );
                Ok(pass(
                    !fl.anti_families_present
                        && !fl.exotics_present
                        && fl.net_families_match
                        && fl.index_mismatches.is_empty(),
                ))
            }
            Filter::Higgs => {
                let present = match out.get("higgs_candidates_present").and_then(Value::as_bool) {
                    Some(p) => p,
                    None => {
                        let s = self.spectrum(sum)?;
                        out["higgs_candidates_present"] = json!(s.flags.higgs_candidates_present);
                        s.flags.higgs_candidates_present
                    }
                };
                Ok(pass(present))
            }
        }
    }

    fn spectrum(&self, sum: &BundleSum) -> Result<crate::bundle::spectrum::Spectrum, ScanError> {
        let callback = |k: &[i64]| -> Result<Vec<u64>, String> {
            self.engine
                .cohomology(k)
                .map(|r| r.h.clone())
                .map_err(|e| e.to_string())
        };
        Ok(crate::bundle::spectrum::spectrum_with_options(
            &self.triple,
            &self.c2_tx,
            sum,
            &callback,
            &ConsistencyOptions::default(),
        )?)
    }
}

enum Verdict {
    Pass,
    Fail,
    Undecided,
}
