//! Provenance of a line-bundle cohomology result: how each rank was proven and what each `h^q` means for the
//! chosen member and for a generic member (the `method` JSON object).
//!
//! The facts used (MATH.md §2): the matrices of `D = d_1 + d_2 + …` have entries that are integer polynomials in
//! the coefficients of the equations (the contraction, `ι`, `π` only carry signs). Hence
//! 1. for an integer member and a prime `p`, `rank_{F_p} D_m ≤ rank_Q D_m` (a minor vanishing over Z vanishes
//!    mod p), and
//! 2. for a generic member, `rank D_m ≥` its rank at any one member (a non-zero minor stays non-zero on a dense
//!    open set of coefficients: lower semicontinuity of the rank, so `h^q` is upper semicontinuous).
//!
//! Write `h^m = dim E_1^m − r_m − r_{m−1}` for two rank vectors `r ≤ r'` (pointwise), both with `h ≥ 0` and the
//! same alternating sum of dimensions. Then `ε_m = r'_m − r_m ≥ 0` and `h^m − h'^m = ε_m + ε_{m−1} ≤ h^m`, so
//! **`ε_m = 0` whenever `h^m = 0` or `h^{m+1} = 0`** for the smaller rank vector `r`. The engine uses this twice:
//! with `(r, r') = (ranks mod p, ranks over Q)` it proves ranks over Q from one prime without any work over Q,
//! and with `(r, r') = (ranks of the member, ranks of a generic member)` it proves which `h^q` are the generic
//! values. A rank not forced this way is computed exactly over Q ([`ExactRankProof`]).
//!
//! Invariant: [`Method::degrees`] has one entry per `q = 0..=dim X`, and a degree is
//! [`DegreeProvenance::E1Dimensions`] exactly when no differential `d_r` joins two non-zero `E_1` groups at that
//! degree (so `h^q = dim E_1^q` for every member).

use crate::arith::{ExactRankProof, LARGE_PRIMES};
use serde::ser::{Serialize, SerializeStruct, Serializer};

/// Which defining polynomials a result is about.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Polynomials {
    /// The integer member with coefficients drawn from this seed.
    Generic { seed: u64 },
    /// The user's polynomials.
    Given,
}

/// How the rank of one map `D_m: E_1^m → E_1^{m+1}` was proven.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum RankProof {
    /// The rank modulo `prime` (a lower bound over Q) equals the rank over Q because `h^m` or `h^{m+1}`
    /// computed mod `prime` vanishes (see the module notes).
    ForcedByVanishing { prime: u64 },
    /// Computed exactly over Q.
    Exact(ExactRankProof),
}

impl RankProof {
    /// The JSON spelling.
    pub fn as_str(&self) -> &'static str {
        match self {
            RankProof::ForcedByVanishing { .. } => "modular_forced_by_vanishing",
            RankProof::Exact(ExactRankProof::ModularWithKernel) => "exact_modular_with_kernel",
            RankProof::Exact(ExactRankProof::Elimination) => "exact_elimination",
        }
    }
}

/// The rank of one map `D_m` with its proof.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct MapRank {
    /// The source degree `m`.
    pub degree: i64,
    /// `dim E_1^{m+1}`.
    pub rows: usize,
    /// `dim E_1^m`.
    pub cols: usize,
    pub rank: usize,
    pub proof: RankProof,
}

/// What one `h^q` of a result means.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum DegreeProvenance {
    /// No differential can act on degree `q` (no pair of non-zero `E_1` groups in degrees `q−1, q` or `q, q+1`
    /// is joined by some `d_r`): `h^q = dim E_1^q` for every choice of polynomials cutting out a complete
    /// intersection.
    E1Dimensions,
    /// Exact over Q for the given polynomials.
    Exact,
    /// Exact for the integer member drawn from the seed, and equal to the value of a generic member (the ranks
    /// next to degree `q` are forced, see the module notes).
    Generic,
    /// Exact for the integer member drawn from the seed; a generic member has at most this value (upper
    /// semicontinuity), and may have less.
    MemberUpperBound,
}

impl DegreeProvenance {
    /// The JSON spelling.
    pub fn as_str(&self) -> &'static str {
        match self {
            DegreeProvenance::E1Dimensions => "e1_dimensions",
            DegreeProvenance::Exact => "exact",
            DegreeProvenance::Generic => "generic",
            DegreeProvenance::MemberUpperBound => "member_exact_generic_at_most",
        }
    }

    /// A short phrase for text reports.
    pub fn describe(&self) -> &'static str {
        match self {
            DegreeProvenance::E1Dimensions => "fixed by E_1 dimensions",
            DegreeProvenance::Exact => "exact over Q",
            DegreeProvenance::Generic => "exact, generic value",
            DegreeProvenance::MemberUpperBound => "exact for this member, generic <= this",
        }
    }
}

/// How a result was obtained.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Method {
    /// No differential can act between the non-zero `E_1` groups: the answer is the `E_1` page.
    Dimensions {
        polynomials: Polynomials,
        /// One entry per degree, all [`DegreeProvenance::E1Dimensions`].
        degrees: Vec<DegreeProvenance>,
    },
    /// Some map had to be ranked.
    Ranks {
        polynomials: Polynomials,
        /// The maps on which some `d_r` can act, by increasing degree.
        maps: Vec<MapRank>,
        /// Whether a higher differential `d_r`, `r ≥ 2`, had a non-zero source and target (so it was computed).
        higher_differentials: bool,
        degrees: Vec<DegreeProvenance>,
    },
}

impl Method {
    /// `"dimensions"` or `"ranks"`.
    pub fn kind(&self) -> &'static str {
        match self {
            Method::Dimensions { .. } => "dimensions",
            Method::Ranks { .. } => "ranks",
        }
    }

    /// The polynomial choice.
    pub fn polynomials(&self) -> Polynomials {
        match self {
            Method::Dimensions { polynomials, .. } | Method::Ranks { polynomials, .. } => {
                *polynomials
            }
        }
    }

    /// `"generic"` or `"given"`.
    pub fn polynomials_str(&self) -> &'static str {
        match self.polynomials() {
            Polynomials::Generic { .. } => "generic",
            Polynomials::Given => "given",
        }
    }

    /// The seed (generic mode).
    pub fn seed(&self) -> Option<u64> {
        match self.polynomials() {
            Polynomials::Generic { seed } => Some(seed),
            Polynomials::Given => None,
        }
    }

    /// Per-degree provenance, `q = 0..=dim X`.
    pub fn degrees(&self) -> &[DegreeProvenance] {
        match self {
            Method::Dimensions { degrees, .. } | Method::Ranks { degrees, .. } => degrees,
        }
    }

    /// The ranked maps (empty for [`Method::Dimensions`]).
    pub fn maps(&self) -> &[MapRank] {
        match self {
            Method::Dimensions { .. } => &[],
            Method::Ranks { maps, .. } => maps,
        }
    }

    /// Whether a higher differential was computed.
    pub fn higher_differentials(&self) -> bool {
        matches!(
            self,
            Method::Ranks {
                higher_differentials: true,
                ..
            }
        )
    }

    /// The fields ranks were computed over: `None`, `"F_p"`, `"Q (exact)"` or `"F_p and Q (exact)"`.
    pub fn field(&self) -> Option<&'static str> {
        let maps = self.maps();
        if maps.is_empty() {
            return None;
        }
        let modular = maps
            .iter()
            .any(|r| matches!(r.proof, RankProof::ForcedByVanishing { .. }));
        let exact = maps.iter().any(|r| matches!(r.proof, RankProof::Exact(_)));
        Some(match (modular, exact) {
            (true, false) => "F_p",
            (false, _) => "Q (exact)",
            (true, true) => "F_p and Q (exact)",
        })
    }

    /// Primes used: the prime of the modular lower bounds, and [`LARGE_PRIMES`] where a modular certificate with
    /// an exact kernel proved a rank over Q. Sorted, without repetition.
    pub fn primes(&self) -> Vec<u64> {
        let mut out = Vec::new();
        for r in self.maps() {
            match r.proof {
                RankProof::ForcedByVanishing { prime } => out.push(prime),
                RankProof::Exact(ExactRankProof::ModularWithKernel) => {
                    out.extend_from_slice(&LARGE_PRIMES)
                }
                RankProof::Exact(ExactRankProof::Elimination) => {}
            }
        }
        out.sort_unstable();
        out.dedup();
        out
    }

    /// Degrees whose provenance is `which`.
    fn degrees_with(&self, which: DegreeProvenance) -> Vec<String> {
        self.degrees()
            .iter()
            .enumerate()
            .filter(|(_, d)| **d == which)
            .map(|(q, _)| format!("h^{q}"))
            .collect()
    }

    /// One sentence saying what is proven.
    pub fn certification(&self) -> String {
        let fixed = self.degrees_with(DegreeProvenance::E1Dimensions);
        let fixed_note = if fixed.is_empty() || matches!(self, Method::Dimensions { .. }) {
            String::new()
        } else {
            format!(
                "; {} fixed by the E_1 dimensions (no differential acts there)",
                fixed.join(", ")
            )
        };
        match self {
            Method::Dimensions { .. } => "determined by the dimensions of the E_1 page: no differential d_r joins two non-zero groups, so this holds for every member".into(),
            Method::Ranks { polynomials: Polynomials::Given, .. } => {
                format!("exact: ranks computed over Q with the given polynomials{fixed_note}")
            }
            Method::Ranks { polynomials: Polynomials::Generic { .. }, .. } => {
                let bounded = self.degrees_with(DegreeProvenance::MemberUpperBound);
                let how = "ranks mod p are lower bounds over Q, forced where a neighbouring group vanishes, otherwise computed exactly over Q";
                if bounded.is_empty() {
                    format!("exact for the integer member drawn from the seed ({how}), and the same for a generic member by upper semicontinuity{fixed_note}")
                } else {
                    format!("exact for the integer member drawn from the seed ({how}); a generic member has at most these values in {} (upper semicontinuity) and the same values elsewhere{fixed_note}", bounded.join(", "))
                }
            }
        }
    }
}

/// The `method` JSON object: the keys `kind`, `polynomials`, `seed`, `field`, `primes`, `certification`,
/// `higher_differentials` (kept from the first format), plus `degrees` (per-degree provenance strings) and
/// `ranks` (one object per ranked map).
impl Serialize for Method {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        #[derive(serde::Serialize)]
        struct RankJson {
            degree: i64,
            rows: usize,
            cols: usize,
            rank: usize,
            proof: &'static str,
        }
        let ranks: Vec<RankJson> = self
            .maps()
            .iter()
            .map(|r| RankJson {
                degree: r.degree,
                rows: r.rows,
                cols: r.cols,
                rank: r.rank,
                proof: r.proof.as_str(),
            })
            .collect();
        let degrees: Vec<&str> = self.degrees().iter().map(|d| d.as_str()).collect();
        let mut st = s.serialize_struct("Method", 9)?;
        st.serialize_field("kind", self.kind())?;
        st.serialize_field("polynomials", self.polynomials_str())?;
        st.serialize_field("seed", &self.seed())?;
        st.serialize_field("field", &self.field())?;
        st.serialize_field("primes", &self.primes())?;
        st.serialize_field("certification", &self.certification())?;
        st.serialize_field("higher_differentials", &self.higher_differentials())?;
        st.serialize_field("degrees", &degrees)?;
        st.serialize_field("ranks", &ranks)?;
        st.end()
    }
}

/// Per-degree provenance from exact ranks (see the module notes): `needs_map(m)` says whether some `d_r` can act
/// in `D_m` ([`super::complex::E1Page::map_can_act`]), `h` is the exact `h^q` of the member for `q = 0..=dim X` (zero elsewhere).
pub fn degree_provenance(
    polynomials: Polynomials,
    h: &[u64],
    needs_map: impl Fn(i64) -> bool,
) -> Vec<DegreeProvenance> {
    let hq = |q: i64| {
        if q < 0 {
            0
        } else {
            h.get(q as usize).copied().unwrap_or(0)
        }
    };
    // The generic rank of D_m equals the member's when h^m or h^{m+1} of the member vanishes.
    let forced = |m: i64| !needs_map(m) || hq(m) == 0 || hq(m + 1) == 0;
    (0..h.len() as i64)
        .map(|q| {
            if !needs_map(q - 1) && !needs_map(q) {
                DegreeProvenance::E1Dimensions
            } else {
                match polynomials {
                    Polynomials::Given => DegreeProvenance::Exact,
                    Polynomials::Generic { .. } if forced(q - 1) && forced(q) => {
                        DegreeProvenance::Generic
                    }
                    Polynomials::Generic { .. } => DegreeProvenance::MemberUpperBound,
                }
            }
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn provenance_fixed_degrees_are_reported_even_when_other_maps_are_ranked() {
        // Maps only at m = 1 (E_1^1 → E_1^2): degrees 0 and 3 are fixed by the dimensions.
        let d = degree_provenance(Polynomials::Generic { seed: 1 }, &[5, 0, 3, 2], |m| m == 1);
        assert_eq!(
            d,
            vec![
                DegreeProvenance::E1Dimensions,
                DegreeProvenance::Generic,
                DegreeProvenance::Generic,
                DegreeProvenance::E1Dimensions
            ]
        );
    }

    #[test]
    fn provenance_adjacent_nonzero_groups_give_only_an_upper_bound() {
        // D_1 acts between two non-zero groups: a generic member could have a larger rank there.
        let d = degree_provenance(Polynomials::Generic { seed: 1 }, &[0, 2, 2, 0], |m| m == 1);
        assert_eq!(d[1], DegreeProvenance::MemberUpperBound);
        assert_eq!(d[2], DegreeProvenance::MemberUpperBound);
        assert_eq!(d[0], DegreeProvenance::E1Dimensions);
        let g = degree_provenance(Polynomials::Given, &[0, 2, 2, 0], |m| m == 1);
        assert_eq!(g[1], DegreeProvenance::Exact);
    }

    #[test]
    fn method_json_keeps_the_old_keys() {
        let m = Method::Ranks {
            polynomials: Polynomials::Generic { seed: 7 },
            maps: vec![MapRank {
                degree: 1,
                rows: 3,
                cols: 4,
                rank: 3,
                proof: RankProof::ForcedByVanishing { prime: 11 },
            }],
            higher_differentials: false,
            degrees: vec![DegreeProvenance::E1Dimensions, DegreeProvenance::Generic],
        };
        let v = serde_json::to_value(&m).unwrap();
        for key in [
            "kind",
            "polynomials",
            "seed",
            "field",
            "primes",
            "certification",
            "higher_differentials",
            "degrees",
            "ranks",
        ] {
            assert!(v.get(key).is_some(), "missing key {key}");
        }
        assert_eq!(v["kind"], "ranks");
        assert_eq!(v["field"], "F_p");
        assert_eq!(v["primes"], serde_json::json!([11]));
        assert_eq!(
            v["degrees"],
            serde_json::json!(["e1_dimensions", "generic"])
        );
        assert_eq!(v["ranks"][0]["proof"], "modular_forced_by_vanishing");
        let text = m.certification();
        assert!(!text.contains("probability"), "{text}");
        assert!(text.contains("h^0 fixed by the E_1 dimensions"), "{text}");
    }
}
