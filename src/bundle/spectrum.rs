//! The four-dimensional spectrum of a line bundle sum, with `S(U(1)^r)` charges.
//!
//! For the GUT group fixed by the rank, every entry of the table derived in
//! [`super::branching`] becomes a [`Multiplet`]: its line bundle
//! `⊗_a L_a^{w_a}` is evaluated on the geometry, the cohomology callback gives
//! the full `h` vector, and the multiplicity is `count = h^1`. Multiplets
//! with `count = 0` are kept (with `present = false`) so that the table has
//! the same shape for every bundle; callers filter on `present`.
//!
//! Model-building flags ([`SpectrumFlags`]) are derived from the counts:
//!
//! * families and anti-families: multiplets whose GUT representation has role
//!   [`Role::Family`] (`10`, `16`, `27`) or [`Role::AntiFamily`] (`10bar`,
//!   `16bar`, `27bar`); the net number from the spectrum is compared with
//!   `−χ(V)` on the covering space;
//! * vector-like pairs: a present multiplet and a present multiplet of the
//!   conjugate representation whose charges add up to a multiple of
//!   `(1,…,1)`, so that a mass term for them is allowed by the `U(1)`s
//!   (`vector_like_pairs` lists such multiplet pairs, singlets included);
//!   `vector_like_field_pairs` counts *fields*: for each non-singlet GUT
//!   representation and its conjugate, `Σ min(count, count')` over those
//!   pairs (e.g. 3 pairs of `5`–`5bar`);
//! * Higgs candidates: SU(5) has them when some `5bar` and some `5` are
//!   present; the listed pairs are the vector-like `5bar_{ab}`/`5_{ab}` pairs
//!   (same `a,b`). SO(10) has them when some `10` is present; the listed
//!   pairs are vector-like `10_{ab}`/`10_{cd}` pairs (complementary indices).
//!   E6 keeps its Higgs fields inside `27`/`27bar`, so none are flagged
//!   separately: see the vector-like `27`/`27bar` pairs;
//! * exotics: chiral matter not accounted for by complete families. With
//!   `N_fam` the net number of families, it is
//!   `(Σ count(5bar) − Σ count(5)) − N_fam` for SU(5) (nonzero means an
//!   excess of `5bar` or `5` with no family or Higgs partner); SO(10) and E6
//!   put a whole family into one representation, so the excess is 0 by
//!   definition there.
//!
//! The callback is called once per distinct line bundle. Invariant: the
//! multiplet list follows the derived table order and has the same length for
//! every bundle of a given rank; `h` alternating sums that disagree with the
//! HRR index are reported in [`SpectrumFlags::index_mismatches`], never hidden.

use serde::Serialize;

use super::branching::{GaugeGroup, Role, derive_table};
use super::consistency::{Consistency, ConsistencyOptions, check_with_cache};
use super::{
    BundleError, BundleSum, CohomologyCache, CohomologyFn, Exact, charge_is_singlet,
    euler_characteristic, hrr_index_unchecked, validate_geometry,
};

/// One GUT multiplet type with its multiplicity.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Multiplet {
    /// GUT representation, e.g. `"5bar"`.
    pub kind: String,
    /// Label such as `"5bar_{1,2}"`.
    pub label: String,
    /// Role of the representation.
    pub role: Role,
    /// 1-based indices of the factors `L_a` of the product, non-dual first.
    pub bundles: Vec<usize>,
    /// Whether each factor in `bundles` is dualised.
    pub duals: Vec<bool>,
    /// Degree vector of the product line bundle on `X`.
    pub line_bundle: Vec<i64>,
    /// Multiplicity `h^1` of the product line bundle.
    pub count: u64,
    /// `S(U(1)^r)` charge (modulo `(1,…,1)`).
    pub charge: Vec<i64>,
    /// `(h^0, h^1, h^2, h^3)` of the product line bundle.
    pub h: Vec<u64>,
    /// HRR index of the product line bundle.
    pub line_bundle_index: i64,
    /// `count > 0`.
    pub present: bool,
}

/// Two multiplets (indices into [`Spectrum::multiplets`]) forming a pair.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct MultipletPair {
    /// Index of the first multiplet.
    pub first: usize,
    /// Index of the second multiplet.
    pub second: usize,
    /// Label of the first.
    pub first_label: String,
    /// Label of the second.
    pub second_label: String,
    /// `min` of the two counts: the number of pairs that can become massive.
    pub pairs: u64,
}

/// The number of vector-like field pairs of one GUT representation and its conjugate.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct RepresentationPairs {
    /// The representation, e.g. `"5"` (the one without `bar`; for a real representation such as the `10` of
    /// SO(10) both names are the same).
    pub representation: String,
    /// Its conjugate, e.g. `"5bar"`.
    pub conjugate: String,
    /// `Σ min(count, count')` over the charge-compatible multiplet pairs of these representations.
    pub field_pairs: u64,
    /// The multiplet pairs counted, as `"first/second"` labels.
    pub multiplet_pairs: Vec<String>,
}

/// Flags for a model builder; see the module documentation for definitions.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct SpectrumFlags {
    /// `Σ count` over family multiplets.
    pub family_count: u64,
    /// `Σ count` over anti-family multiplets.
    pub anti_family_count: u64,
    /// Some anti-family multiplet is present.
    pub anti_families_present: bool,
    /// `family_count − anti_family_count`.
    pub net_families: i64,
    /// `−χ(V)` on the covering space.
    pub net_families_expected: i64,
    /// `net_families == net_families_expected`.
    pub net_families_match: bool,
    /// Vector-like pairs among present multiplets (singlets included).
    pub vector_like_pairs: Vec<MultipletPair>,
    /// Vector-like field pairs per non-singlet GUT representation (see module docs), in table order.
    pub vector_like_field_pairs: Vec<RepresentationPairs>,
    /// Higgs candidates exist (see module docs).
    pub higgs_candidates_present: bool,
    /// Vector-like Higgs pairs.
    pub higgs_pairs: Vec<MultipletPair>,
    /// Chiral excess not accounted for by families (0 for SO(10) and E6).
    pub exotic_chiral_excess: i64,
    /// `exotic_chiral_excess != 0`.
    pub exotics_present: bool,
    /// Degree vectors whose `h` alternating sum differs from the HRR index.
    pub index_mismatches: Vec<Vec<i64>>,
}

/// The spectrum of a line bundle sum.
///
/// Keys `rank`, `c1_zero`, `c2_bundle`, `anomaly_ok`, `index`, `families`
/// and `multiplets` are the stable summary; `flags` and `consistency` hold
/// the details.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Spectrum {
    /// Rank `r`.
    pub rank: usize,
    /// GUT group.
    pub gauge_group: GaugeGroup,
    /// `c1(V) = 0`.
    pub c1_zero: bool,
    /// `c2(V)_r`.
    pub c2_bundle: Vec<Exact>,
    /// The anomaly bound holds.
    pub anomaly_ok: bool,
    /// `χ(V)`.
    pub index: i64,
    /// `−χ(V)/symmetry_order`.
    pub families: i64,
    /// All multiplets of the derived table, `count = 0` included.
    pub multiplets: Vec<Multiplet>,
    /// Model-building flags.
    pub flags: SpectrumFlags,
    /// Full consistency report.
    pub consistency: Consistency,
}

impl Spectrum {
    /// The multiplets with `count > 0`.
    pub fn present(&self) -> impl Iterator<Item = &Multiplet> {
        self.multiplets.iter().filter(|m| m.present)
    }

    /// `Σ count` over multiplets of one kind (e.g. `"10"`).
    pub fn total(&self, kind: &str) -> u64 {
        self.multiplets
            .iter()
            .filter(|m| m.kind == kind)
            .map(|m| m.count)
            .sum()
    }
}

/// Spectrum with default options (symmetry order 1).
pub fn spectrum(
    triple: &[Vec<Vec<i64>>],
    c2_tx: &[i64],
    bundles: &BundleSum,
    cohomology: &CohomologyFn<'_>,
) -> Result<Spectrum, BundleError> {
    spectrum_with_options(
        triple,
        c2_tx,
        bundles,
        cohomology,
        &ConsistencyOptions::default(),
    )
}

/// Spectrum with explicit [`ConsistencyOptions`].
pub fn spectrum_with_options(
    triple: &[Vec<Vec<i64>>],
    c2_tx: &[i64],
    bundles: &BundleSum,
    cohomology: &CohomologyFn<'_>,
    options: &ConsistencyOptions,
) -> Result<Spectrum, BundleError> {
    validate_geometry(bundles.m(), triple, c2_tx)?;
    let mut cache = CohomologyCache::new(cohomology);
    let consistency = check_with_cache(bundles, triple, c2_tx, Some(&mut cache), options)?;
    let table = derive_table(bundles.gauge_group());

    let mut multiplets = Vec::with_capacity(table.entries.len());
    let mut index_mismatches: Vec<Vec<i64>> = Vec::new();
    for entry in &table.entries {
        let line_bundle = bundles.product(&entry.charge)?;
        let h = cache.get(&line_bundle)?;
        let line_bundle_index = hrr_index_unchecked(triple, c2_tx, &line_bundle)?;
        if euler_characteristic(&h) != Some(line_bundle_index)
            && !index_mismatches.contains(&line_bundle)
        {
            index_mismatches.push(line_bundle.clone());
        }
        multiplets.push(Multiplet {
            kind: entry.kind.to_string(),
            label: entry.label(),
            role: entry.role,
            bundles: entry.bundles.clone(),
            duals: entry.duals.clone(),
            line_bundle,
            count: h[1],
            charge: entry.charge.clone(),
            h,
            line_bundle_index,
            present: false,
        });
    }
    for m in &mut multiplets {
        m.present = m.count > 0;
    }

    let flags = flags(&multiplets, consistency.index, index_mismatches)?;
    Ok(Spectrum {
        rank: consistency.rank,
        gauge_group: consistency.gauge_group,
        c1_zero: consistency.c1_zero,
        c2_bundle: consistency.c2_bundle.clone(),
        anomaly_ok: consistency.anomaly_ok,
        index: consistency.index,
        families: consistency.families,
        multiplets,
        flags,
        consistency,
    })
}

fn sum_role(multiplets: &[Multiplet], role: Role) -> Result<u64, BundleError> {
    multiplets
        .iter()
        .filter(|m| m.role == role)
        .try_fold(0u64, |acc, m| acc.checked_add(m.count))
        .ok_or_else(|| BundleError::Overflow("a multiplet count".into()))
}

fn signed(x: u64) -> Result<i64, BundleError> {
    i64::try_from(x).map_err(|_| BundleError::Overflow("a multiplet count".into()))
}

fn conjugate_role(role: Role) -> Role {
    match role {
        Role::Family => Role::AntiFamily,
        Role::AntiFamily => Role::Family,
        Role::FamilyPartner => Role::AntiFamilyPartner,
        Role::AntiFamilyPartner => Role::FamilyPartner,
        other => other,
    }
}

/// Vector-like pairs among present multiplets, each unordered pair once.
fn vector_like(multiplets: &[Multiplet]) -> Result<Vec<MultipletPair>, BundleError> {
    let mut out = Vec::new();
    for (i, a) in multiplets.iter().enumerate() {
        if !a.present {
            continue;
        }
        for (j, b) in multiplets.iter().enumerate().skip(i + 1) {
            if !b.present || b.role != conjugate_role(a.role) {
                continue;
            }
            if charge_is_singlet(&[&a.charge, &b.charge])? {
                out.push(MultipletPair {
                    first: i,
                    second: j,
                    first_label: a.label.clone(),
                    second_label: b.label.clone(),
                    pairs: a.count.min(b.count),
                });
            }
        }
    }
    Ok(out)
}

/// Group the non-singlet vector-like multiplet pairs by representation and count fields.
fn field_pairs(multiplets: &[Multiplet], pairs: &[MultipletPair]) -> Vec<RepresentationPairs> {
    let mut out: Vec<RepresentationPairs> = Vec::new();
    for p in pairs {
        let (a, b) = (&multiplets[p.first], &multiplets[p.second]);
        if a.role == Role::Singlet || b.role == Role::Singlet {
            continue;
        }
        let (rep, conj) = if a.kind.ends_with("bar") {
            (&b.kind, &a.kind)
        } else {
            (&a.kind, &b.kind)
        };
        let label = format!("{}/{}", p.first_label, p.second_label);
        match out.iter_mut().find(|r| &r.representation == rep) {
            Some(r) => {
                r.field_pairs = r.field_pairs.saturating_add(p.pairs);
                r.multiplet_pairs.push(label);
            }
            None => out.push(RepresentationPairs {
                representation: rep.clone(),
                conjugate: conj.clone(),
                field_pairs: p.pairs,
                multiplet_pairs: vec![label],
            }),
        }
    }
    out
}

fn flags(
    multiplets: &[Multiplet],
    index: i64,
    index_mismatches: Vec<Vec<i64>>,
) -> Result<SpectrumFlags, BundleError> {
    let family_count = sum_role(multiplets, Role::Family)?;
    let anti_family_count = sum_role(multiplets, Role::AntiFamily)?;
    let net_families = signed(family_count)? - signed(anti_family_count)?;
    let net_families_expected = index
        .checked_neg()
        .ok_or_else(|| BundleError::Overflow("−χ(V)".into()))?;

    let vector_like_pairs = vector_like(multiplets)?;
    let vector_like_field_pairs = field_pairs(multiplets, &vector_like_pairs);
    let higgs_pairs: Vec<MultipletPair> = vector_like_pairs
        .iter()
        .filter(|p| {
            matches!(
                multiplets[p.first].role,
                Role::FamilyPartner | Role::AntiFamilyPartner | Role::SelfConjugateMatter
            )
        })
        .cloned()
        .collect();
    let partner = sum_role(multiplets, Role::FamilyPartner)?;
    let anti_partner = sum_role(multiplets, Role::AntiFamilyPartner)?;
    let self_conj = sum_role(multiplets, Role::SelfConjugateMatter)?;
    let higgs_candidates_present = (partner > 0 && anti_partner > 0) || self_conj > 0;

    let has_partners = multiplets.iter().any(|m| m.role == Role::FamilyPartner);
    let exotic_chiral_excess = if has_partners {
        signed(partner)? - signed(anti_partner)? - net_families
    } else {
        0
    };

    Ok(SpectrumFlags {
        family_count,
        anti_family_count,
        anti_families_present: anti_family_count > 0,
        net_families,
        net_families_expected,
        net_families_match: net_families == net_families_expected,
        vector_like_pairs,
        vector_like_field_pairs,
        higgs_candidates_present,
        higgs_pairs,
        exotic_chiral_excess,
        exotics_present: exotic_chiral_excess != 0,
        index_mismatches,
    })
}
