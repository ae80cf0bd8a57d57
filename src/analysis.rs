//! Whole-model analysis: geometry, favourability, line-bundle cohomology, consistency, spectrum and the
//! slope-zero certificate, assembled into one serialisable value for the `spectrum` and `report` commands.
//!
//! Invariant: every figure here is computed by the specialised modules; this module only wires them together
//! (the cohomology engine is the single source of `h^q` values, shared through its cache).

use crate::bundle::{BundleError, BundleSum, Exact, spectrum::Spectrum};
use crate::cohomology::{CohomologyEngine, CohomologyError, LineBundleCohomology};
use crate::geometry::{Geometry, GeometrySummary};
use crate::slope::{SlopeOptions, SlopeZero, certify_slope_zero};
use serde::Serialize;
use std::sync::Arc;
use thiserror::Error;

/// Why an analysis failed (bad input or a cohomology refusal).
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum AnalysisError {
    #[error("{0}")]
    Bundle(#[from] BundleError),
    #[error("{0}")]
    Cohomology(#[from] CohomologyError),
    #[error("{0}")]
    Geometry(#[from] crate::geometry::GeometryError),
    #[error("the spectrum needs a Calabi-Yau threefold; this configuration has dimension {0}")]
    NotThreefold(usize),
    #[error("slope-zero certification: {0}")]
    Slope(String),
}

/// Whether `h^{1,1}(X)` equals the number of ambient factors.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Favourability {
    /// `"favourable"` (certified) or `"not_certified"`.
    pub status: String,
    /// How it was decided.
    pub reason: String,
}

/// Certify favourability from line-bundle cohomology. Sufficient condition (from the Euler sequences of the
/// factors and the normal-bundle sequence `0 → TX → TA|_X → N → 0`, with `h^{1,1} = h^2(TX)` on a Calabi-Yau
/// threefold): `H^{q>0}(X, O_X(J_i)) = 0` for every factor and `H^1 = H^2 = 0` for every `O_X(q_j)`; then
/// `h^2(TA|_X) = m` and `H^2(TX) ≅ H^2(TA|_X)`. When the condition fails favourability is not decided.
pub fn favourability(engine: &CohomologyEngine) -> Result<Favourability, CohomologyError> {
    let config = engine.config();
    let m = config.num_factors();
    if config.dimension() != 3 {
        return Ok(Favourability {
            status: "not_certified".into(),
            reason: "the test is implemented for threefolds only".into(),
        });
    }
    for i in 0..m {
        let mut e = vec![0i64; m];
        e[i] = 1;
        let r = engine.cohomology(&e)?;
        if r.h[1..].iter().any(|&x| x != 0) {
            return Ok(Favourability {
                status: "not_certified".into(),
                reason: format!(
                    "H^q(X, O_X(J_{})) is non-zero for some q > 0: h = {:?}",
                    i + 1,
                    r.h
                ),
            });
        }
    }
    for (j, q) in config.equations().iter().enumerate() {
        let k: Vec<i64> = q.iter().map(|&d| d as i64).collect();
        let r = engine.cohomology(&k)?;
        if r.h[1] != 0 || r.h[2] != 0 {
            return Ok(Favourability {
                status: "not_certified".into(),
                reason: format!(
                    "H^1 or H^2 of the normal summand O_X({k:?}) of equation {} is non-zero: h = {:?}",
                    j + 1,
                    r.h
                ),
            });
        }
    }
    Ok(Favourability {
        status: "favourable".into(),
        reason: format!(
            "certified: H^(q>0)(O_X(J_i)) = 0 and H^1 = H^2 = 0 for every normal summand, so h^(1,1)(X) = h^2(TA|X) = {m}"
        ),
    })
}

/// Everything about a model with a bundle sum.
#[derive(Clone, Debug, Serialize)]
pub struct ModelAnalysis {
    pub geometry: GeometrySummary,
    pub favourability: Favourability,
    /// The line bundles `L_a` with their cohomology.
    pub line_bundles: Vec<Arc<LineBundleCohomology>>,
    /// Consistency checks, the spectrum and the builder flags (keys `rank`, `c1_zero`, `c2_bundle`, `anomaly_ok`,
    /// `index`, `families`, `multiplets`, …).
    pub spectrum: Spectrum,
    /// What the slope-zero answer covers: the image of the ambient Kähler cone (`t_i > 0`), with the
    /// favourability caveat ([`slope_zero_scope`]).
    pub slope_zero_scope: String,
    /// The slope-zero certificate (`status` in `exists`, `none`, `undecided`).
    pub slope_zero: SlopeZero,
}

/// Run every analysis for `bundles` on the engine's configuration.
pub fn analyse(
    engine: &CohomologyEngine,
    bundles: &BundleSum,
) -> Result<ModelAnalysis, AnalysisError> {
    let config = engine.config();
    if config.dimension() != 3 {
        return Err(AnalysisError::NotThreefold(config.dimension()));
    }
    let geometry = Geometry::new(config);
    let summary = geometry.summary()?;
    let triple = summary.triple.clone().expect("threefold");
    let c2 = summary.c2.clone().expect("threefold");
    let callback = |k: &[i64]| -> Result<Vec<u64>, String> {
        engine
            .cohomology(k)
            .map(|r| r.h.clone())
            .map_err(|e| e.to_string())
    };
    let spectrum = crate::bundle::spectrum::spectrum(&triple, &c2, bundles, &callback)?;
    let line_bundles = bundles
        .bundles()
        .iter()
        .map(|k| engine.cohomology(k))
        .collect::<Result<Vec<_>, _>>()?;
    let slope_zero = certify_slope_zero(&triple, bundles.bundles(), &SlopeOptions::default())
        .map_err(|e| AnalysisError::Slope(format!("{e:?}")))?;
    let favourability = favourability(engine)?;
    Ok(ModelAnalysis {
        geometry: summary,
        slope_zero_scope: slope_zero_scope(&slope_zero, &favourability),
        favourability,
        line_bundles,
        spectrum,
        slope_zero,
    })
}

/// The slopes `μ(L_a)(t)` at a user-supplied Kähler point, exactly.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct KahlerPointCheck {
    /// The point `t` (each entry a JSON integer when integral, else a string `"p/q"`).
    pub point: Vec<Exact>,
    /// `μ(L_a)(t) = d_{rst} k_a^r t^s t^t` per line bundle (integer or `"p/q"` string, as `point`).
    pub slopes: Vec<Exact>,
    /// Every slope vanishes at `t`.
    pub all_slopes_zero: bool,
}

/// Evaluate every slope exactly at `t` (precondition: a threefold, `t.len() = m`).
pub fn kahler_point_check(
    triple: &[Vec<Vec<i64>>],
    bundles: &BundleSum,
    t: &[num_rational::BigRational],
) -> Result<KahlerPointCheck, AnalysisError> {
    let mut slopes = Vec::with_capacity(bundles.rank());
    for k in bundles.bundles() {
        slopes.push(
            crate::slope::try_slope_exact(triple, k, t)
                .map_err(|e| AnalysisError::Slope(format!("{e:?}")))?,
        );
    }
    Ok(KahlerPointCheck {
        point: t.iter().map(Exact::from_rational).collect(),
        all_slopes_zero: slopes.iter().all(num_traits::Zero::is_zero),
        slopes: slopes.iter().map(Exact::from_rational).collect(),
    })
}

/// The Hodge numbers `h^{1,1}` and `h^{2,1}` of a Calabi-Yau threefold, where they follow from what was
/// certified, with how they were obtained.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct HodgeNumbers {
    /// `h^{1,1}(X)`, or null when not computable here.
    pub h11: Option<u64>,
    /// `h^{2,1}(X)`, or null when not computable here.
    pub h21: Option<u64>,
    /// How the numbers were obtained, or why they were not.
    pub provenance: String,
}

/// Hodge numbers from the favourability certificate and the exact Euler number: a favourable Calabi-Yau
/// threefold has `h^{1,1} = m`, and `χ = 2 (h^{1,1} − h^{2,1})` gives `h^{2,1} = h^{1,1} − χ/2` (textbook, e.g.
/// Hübsch, "Calabi-Yau manifolds"). Otherwise both are `None` with the reason.
pub fn hodge_numbers(geometry: &GeometrySummary, favourability: &Favourability) -> HodgeNumbers {
    let none = |why: &str| HodgeNumbers {
        h11: None,
        h21: None,
        provenance: why.to_string(),
    };
    if geometry.dimension != 3 || !geometry.calabi_yau {
        return none("not computed: only for Calabi-Yau threefolds");
    }
    if favourability.status != "favourable" {
        return none(
            "not computed: favourability is not certified, so h^(1,1) may exceed the number of ambient factors",
        );
    }
    let m = geometry.ambient.len() as i64;
    let chi = geometry.euler;
    if chi % 2 != 0 {
        return none("not computed: the Euler number is odd (inconsistent input)");
    }
    let h21 = m - chi / 2;
    match u64::try_from(h21) {
        Ok(h21) => HodgeNumbers {
            h11: Some(m as u64),
            h21: Some(h21),
            provenance: format!(
                "h^(1,1) = m = {m} by the favourability certificate; h^(2,1) = h^(1,1) - chi/2 = {m} - ({chi})/2 = {h21} from the exact Euler number"
            ),
        },
        Err(_) => none("not computed: h^(1,1) - chi/2 is negative (inconsistent input)"),
    }
}

/// What a slope-zero answer covers. The certifier searches `t_i > 0`, the image of the ambient Kähler cone,
/// which lies in the Kähler cone of X (restrictions of ample classes are ample) but need not be all of it:
/// when favourability is not certified, `H^{1,1}(X)` may have directions outside the span of the `J_i`, and
/// even for a favourable X the Kähler cone can be larger than the image. So "exists" is a genuine Kähler
/// class, while "none" and "undecided" speak only of the image.
pub fn slope_zero_scope(slope: &SlopeZero, fav: &Favourability) -> String {
    let caveat = if fav.status == "favourable" {
        "X is favourable (the J_i span H^{1,1}(X)), but its Kähler cone may still be larger than this image"
    } else {
        "favourability is not certified: H^{1,1}(X) may have directions outside the span of the J_i, which were not searched"
    };
    match slope {
        SlopeZero::Exists(_) => {
            "a common zero in the image of the ambient Kähler cone (t_i > 0), hence a Kähler class of X".into()
        }
        SlopeZero::None(_) => format!(
            "none in the image of the ambient Kähler cone (t_i > 0) only; {caveat}"
        ),
        SlopeZero::Undecided { .. } => format!("undecided in the image of the ambient Kähler cone (t_i > 0); {caveat}"),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::cohomology::{DEFAULT_SEED, PolynomialChoice};
    use crate::geometry::Configuration;

    fn hodge_of(dims: &[i64], eqs: &[Vec<i64>]) -> HodgeNumbers {
        let config = Configuration::new(dims, eqs).unwrap();
        let engine =
            CohomologyEngine::new(&config, PolynomialChoice::Generic { seed: DEFAULT_SEED })
                .unwrap();
        let fav = favourability(&engine).unwrap();
        hodge_numbers(&Geometry::new(&config).summary().unwrap(), &fav)
    }

    #[test]
    fn hodge_numbers_of_favourable_cicys_match_published_values() {
        // (h^{1,1}, h^{2,1}) from memory; these configurations are in the CICY list of Candelas, Dale, Lütken and
        // Schimmrigk, Nucl. Phys. B298 (1988) 493.
        type Case<'a> = (&'a [i64], Vec<Vec<i64>>, u64, u64);
        let cases: [Case; 5] = [
            (&[4], vec![vec![5]], 1, 101),                  // quintic
            (&[5], vec![vec![3], vec![3]], 1, 73),          // two cubics in P5
            (&[1, 1, 1, 1], vec![vec![2, 2, 2, 2]], 4, 68), // tetra-quadric
            (&[2, 2], vec![vec![3, 3]], 2, 83),             // bicubic
            (&[1, 3], vec![vec![2, 4]], 2, 86),             // P1xP3[2,4]
        ];
        for (dims, eqs, h11, h21) in cases {
            let h = hodge_of(dims, &eqs);
            assert_eq!((h.h11, h.h21), (Some(h11), Some(h21)), "{dims:?} {eqs:?}");
            assert!(h.provenance.contains("favourability certificate"));
        }
    }

    #[test]
    fn hodge_numbers_need_certified_favourability() {
        let config = Configuration::new(&[1, 1, 1, 1], &[vec![2, 2, 2, 2]]).unwrap();
        let fav = Favourability {
            status: "not_certified".into(),
            reason: "test".into(),
        };
        let h = hodge_numbers(&Geometry::new(&config).summary().unwrap(), &fav);
        assert_eq!((h.h11, h.h21), (None, None));
        assert!(h.provenance.contains("not certified"));
    }

    /// Issue 11 item 6: "none" states its scope, and the caveat depends on favourability.
    #[test]
    fn regression_issue_11_slope_none_states_its_scope() {
        let none = SlopeZero::None(crate::slope::NoneCertificate::SignObstruction {
            bundle: 0,
            sign: crate::slope::Sign::Positive,
        });
        let not = Favourability {
            status: "not_certified".into(),
            reason: String::new(),
        };
        let fav = Favourability {
            status: "favourable".into(),
            reason: String::new(),
        };
        let a = slope_zero_scope(&none, &not);
        assert!(a.contains("image of the ambient Kähler cone"), "{a}");
        assert!(a.contains("favourability is not certified"), "{a}");
        let b = slope_zero_scope(&none, &fav);
        assert!(b.contains("may still be larger"), "{b}");
    }
}
