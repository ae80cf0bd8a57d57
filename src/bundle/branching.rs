//! Multiplet tables derived from the E8 branching rules.
//!
//! The only data here are the three branchings of the adjoint `248` of E8
//! under `G × H`, with `H = SU(r)` the structure group of a rank-`r` line
//! bundle sum and `G` its commutant:
//!
//! * `SU(5)×SU(5)`: `248 = (24,1)+(1,24)+(10,5)+(10bar,5bar)+(5bar,10)+(5,10bar)`;
//! * `SO(10)×SU(4)`: `248 = (45,1)+(1,15)+(16,4)+(16bar,4bar)+(10,6)`;
//! * `E6×SU(3)`: `248 = (78,1)+(1,8)+(27,3)+(27bar,3bar)`.
//!
//! Each `H` representation is described structurally (trivial, `∧^k` of the
//! fundamental, its dual, or the adjoint). Everything else is computed: the
//! weights of the `H` representation in the Cartan `S(U(1)^r)` give, for each
//! `G` multiplet, the line bundle `⊗_a L_a^{w_a}` whose `H^1` counts it and
//! the `U(1)` charge vector `w` (defined modulo `(1,…,1)`).
//!
//! Invariant: for every group, `Σ dim(G-rep)·dim(H-rep) = 248`, and the
//! number of weights produced for an `H` representation equals its dimension
//! (zero weights included). States that carry no chiral matter on a
//! Calabi-Yau threefold are recorded in [`MultipletTable::dropped`], not lost:
//! the `(G-adjoint, 1)` term is `H^0(O_X)`-valued (the gauge fields), and the
//! `r − 1` zero weights of the `H` adjoint would be counted by `H^1(O_X)`,
//! which vanishes on a Calabi-Yau threefold with full SU(3) holonomy.

use itertools::Itertools;
use serde::Serialize;

/// The four-dimensional GUT group left unbroken by a rank-`r` line bundle sum.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
pub enum GaugeGroup {
    /// `SU(5)`, from rank 5.
    #[serde(rename = "SU(5)")]
    Su5,
    /// `SO(10)`, from rank 4.
    #[serde(rename = "SO(10)")]
    So10,
    /// `E6`, from rank 3.
    #[serde(rename = "E6")]
    E6,
}

impl GaugeGroup {
    /// All three groups.
    pub const ALL: [GaugeGroup; 3] = [GaugeGroup::Su5, GaugeGroup::So10, GaugeGroup::E6];

    /// The group for a bundle rank, if supported.
    pub fn from_rank(rank: usize) -> Option<Self> {
        match rank {
            5 => Some(Self::Su5),
            4 => Some(Self::So10),
            3 => Some(Self::E6),
            _ => None,
        }
    }

    /// Rank `r` of the structure group `SU(r)`.
    pub fn structure_rank(self) -> usize {
        match self {
            Self::Su5 => 5,
            Self::So10 => 4,
            Self::E6 => 3,
        }
    }

    /// Display name, e.g. `"SU(5)"`.
    pub fn name(self) -> &'static str {
        match self {
            Self::Su5 => "SU(5)",
            Self::So10 => "SO(10)",
            Self::E6 => "E6",
        }
    }
}

/// A representation of the structure group `SU(r)`, described structurally.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum StructureRep {
    /// The trivial representation `1`.
    Trivial,
    /// `∧^k` of the fundamental, `1 ≤ k < r`.
    Wedge(usize),
    /// The dual of `∧^k` of the fundamental.
    DualWedge(usize),
    /// The adjoint, of dimension `r² − 1`.
    Adjoint,
}

impl StructureRep {
    /// Dimension for `SU(r)`, from the closed formula (not from the weights).
    pub fn dimension(self, r: usize) -> usize {
        match self {
            Self::Trivial => 1,
            Self::Wedge(k) | Self::DualWedge(k) => binomial(r, k),
            Self::Adjoint => r * r - 1,
        }
    }

    /// All weights in `Z^r` (coefficients of `e_1..e_r`), with multiplicity.
    ///
    /// `∧^k`: `e_{a1}+…+e_{ak}` for `a1<…<ak`; dual: their negatives;
    /// adjoint: `e_a − e_b` for `a ≠ b` (ordered with `a` outer) followed by
    /// `r − 1` zero weights; trivial: one zero weight.
    pub fn weights(self, r: usize) -> Vec<Vec<i64>> {
        match self {
            Self::Trivial => vec![vec![0; r]],
            Self::Wedge(k) => wedge_weights(r, k, 1),
            Self::DualWedge(k) => wedge_weights(r, k, -1),
            Self::Adjoint => {
                let mut out = Vec::new();
                for a in 0..r {
                    for b in 0..r {
                        if a != b {
                            let mut w = vec![0; r];
                            w[a] = 1;
                            w[b] = -1;
                            out.push(w);
                        }
                    }
                }
                out.extend(std::iter::repeat_n(vec![0; r], r.saturating_sub(1)));
                out
            }
        }
    }
}

fn wedge_weights(r: usize, k: usize, sign: i64) -> Vec<Vec<i64>> {
    (0..r)
        .combinations(k)
        .map(|idx| {
            let mut w = vec![0; r];
            for a in idx {
                w[a] = sign;
            }
            w
        })
        .collect()
}

fn binomial(n: usize, k: usize) -> usize {
    if k > n {
        return 0;
    }
    (0..k).fold(1, |acc, i| acc * (n - i) / (i + 1))
}

/// The role a GUT representation plays for a model builder.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Role {
    /// The GUT adjoint: gauge fields, no chiral matter.
    Gauge,
    /// Carries a family: `10` of SU(5), `16` of SO(10), `27` of E6.
    Family,
    /// Conjugate of a family: `10bar`, `16bar`, `27bar`.
    AntiFamily,
    /// Completes a family and can host a down-type Higgs: `5bar` of SU(5).
    FamilyPartner,
    /// Conjugate of a family partner, can host an up-type Higgs: `5` of SU(5).
    AntiFamilyPartner,
    /// Real matter representation hosting Higgs doublets: `10` of SO(10).
    SelfConjugateMatter,
    /// GUT singlet (bundle moduli).
    Singlet,
}

/// A representation of the GUT group as it appears in a branching.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct GutRep {
    /// Name, e.g. `"10bar"`.
    pub name: &'static str,
    /// Dimension.
    pub dim: usize,
    /// Name of the conjugate representation (itself when real).
    pub conjugate: &'static str,
    /// Role for a model builder.
    pub role: Role,
}

/// One term `(G-rep, H-rep)` of the branching of the `248`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct BranchingTerm {
    /// The GUT representation.
    pub gut: GutRep,
    /// The structure-group representation.
    pub structure: StructureRep,
}

const fn rep(name: &'static str, dim: usize, conjugate: &'static str, role: Role) -> GutRep {
    GutRep {
        name,
        dim,
        conjugate,
        role,
    }
}

const fn term(gut: GutRep, structure: StructureRep) -> BranchingTerm {
    BranchingTerm { gut, structure }
}

/// The branching rule of the E8 adjoint for `group × SU(r)`: the only data of this module.
pub fn branching_rule(group: GaugeGroup) -> Vec<BranchingTerm> {
    use Role::*;
    use StructureRep::*;
    match group {
        GaugeGroup::Su5 => vec![
            term(rep("24", 24, "24", Gauge), Trivial),
            term(rep("1", 1, "1", Singlet), Adjoint),
            term(rep("10", 10, "10bar", Family), Wedge(1)),
            term(rep("10bar", 10, "10", AntiFamily), DualWedge(1)),
            term(rep("5bar", 5, "5", FamilyPartner), Wedge(2)),
            term(rep("5", 5, "5bar", AntiFamilyPartner), DualWedge(2)),
        ],
        GaugeGroup::So10 => vec![
            term(rep("45", 45, "45", Gauge), Trivial),
            term(rep("1", 1, "1", Singlet), Adjoint),
            term(rep("16", 16, "16bar", Family), Wedge(1)),
            term(rep("16bar", 16, "16", AntiFamily), DualWedge(1)),
            // ∧²4 = 6 is real: the term appears once.
            term(rep("10", 10, "10", SelfConjugateMatter), Wedge(2)),
        ],
        GaugeGroup::E6 => vec![
            term(rep("78", 78, "78", Gauge), Trivial),
            term(rep("1", 1, "1", Singlet), Adjoint),
            term(rep("27", 27, "27bar", Family), Wedge(1)),
            term(rep("27bar", 27, "27", AntiFamily), DualWedge(1)),
        ],
    }
}

/// `Σ dim(G-rep)·dim(H-rep)` over the branching (must be 248).
pub fn dimension_count(group: GaugeGroup) -> usize {
    let r = group.structure_rank();
    branching_rule(group)
        .iter()
        .map(|t| t.gut.dim * t.structure.dimension(r))
        .sum()
}

/// One derived multiplet type: a GUT representation paired with one nonzero
/// weight of the structure-group representation.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct MultipletType {
    /// GUT representation name, e.g. `"5bar"`.
    pub kind: &'static str,
    /// Role of that representation.
    pub role: Role,
    /// Structure-group representation it came from.
    pub structure: StructureRep,
    /// 1-based indices `a` of the factors `L_a` (or `L_a^*`) in the product:
    /// the factors with positive weight first, then the dual ones, each ascending.
    pub bundles: Vec<usize>,
    /// For each entry of `bundles`, whether the factor is dualised (`L_a^*`).
    pub duals: Vec<bool>,
    /// The weight `w ∈ Z^r`; the line bundle is `⊗_a L_a^{w_a}` and `w` is the
    /// `S(U(1)^r)` charge (defined modulo `(1,…,1)`).
    pub charge: Vec<i64>,
}

impl MultipletType {
    /// Label such as `"5bar_{1,2}"`.
    pub fn label(&self) -> String {
        let idx: Vec<String> = self.bundles.iter().map(ToString::to_string).collect();
        format!("{}_{{{}}}", self.kind, idx.join(","))
    }

    /// Human form of the line bundle, e.g. `"L_1⊗L_2^*"`.
    pub fn product_name(&self) -> String {
        self.bundles
            .iter()
            .zip(&self.duals)
            .map(|(a, d)| {
                if *d {
                    format!("L_{a}^*")
                } else {
                    format!("L_{a}")
                }
            })
            .collect::<Vec<_>>()
            .join("⊗")
    }
}

/// States of the branching that are not turned into multiplet types, and why.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct DroppedStates {
    /// GUT representation name.
    pub kind: &'static str,
    /// Structure-group representation.
    pub structure: StructureRep,
    /// Number of zero weights dropped.
    pub zero_weights: usize,
    /// Why they carry no matter.
    pub reason: &'static str,
}

/// The derived multiplet table of one GUT group.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct MultipletTable {
    /// The GUT group.
    pub group: GaugeGroup,
    /// Rank `r` of the structure group.
    pub rank: usize,
    /// Matter multiplet types in branching order, then weight order.
    pub entries: Vec<MultipletType>,
    /// Zero-weight states left out, with reasons.
    pub dropped: Vec<DroppedStates>,
}

impl MultipletTable {
    /// Name of the conjugate of a GUT representation of this group.
    pub fn conjugate_kind(&self, kind: &str) -> Option<&'static str> {
        branching_rule(self.group)
            .into_iter()
            .find(|t| t.gut.name == kind)
            .map(|t| t.gut.conjugate)
    }

    /// `Σ dim(G-rep) · (#entries + #dropped zero weights)` recomputed from the
    /// derived weights; equals 248 when the derivation is complete.
    pub fn derived_dimension(&self) -> usize {
        let rule = branching_rule(self.group);
        let dim_of = |kind: &str| {
            rule.iter()
                .find(|t| t.gut.name == kind)
                .map_or(0, |t| t.gut.dim)
        };
        let matter: usize = self.entries.iter().map(|e| dim_of(e.kind)).sum();
        let dropped: usize = self
            .dropped
            .iter()
            .map(|d| dim_of(d.kind) * d.zero_weights)
            .sum();
        matter + dropped
    }
}

const REASON_TRIVIAL: &str = "(G-adjoint, 1) is valued in H^*(O_X): H^0 gives the gauge fields, H^1(O_X) = 0 on a Calabi-Yau threefold, so no matter";
const REASON_ZERO: &str = "zero weights of the structure-group adjoint are counted by H^1(O_X), which vanishes on a Calabi-Yau threefold";

/// Derives the multiplet table of `group` from [`branching_rule`].
pub fn derive_table(group: GaugeGroup) -> MultipletTable {
    let r = group.structure_rank();
    let mut entries = Vec::new();
    let mut dropped = Vec::new();
    for t in branching_rule(group) {
        let mut zeros = 0;
        for w in t.structure.weights(r) {
            if w.iter().all(|x| *x == 0) {
                zeros += 1;
                continue;
            }
            let mut bundles = Vec::new();
            let mut duals = Vec::new();
            for (a, x) in w.iter().enumerate() {
                if *x > 0 {
                    bundles.push(a + 1);
                    duals.push(false);
                }
            }
            for (a, x) in w.iter().enumerate() {
                if *x < 0 {
                    bundles.push(a + 1);
                    duals.push(true);
                }
            }
            entries.push(MultipletType {
                kind: t.gut.name,
                role: t.gut.role,
                structure: t.structure,
                bundles,
                duals,
                charge: w,
            });
        }
        if zeros > 0 {
            dropped.push(DroppedStates {
                kind: t.gut.name,
                structure: t.structure,
                zero_weights: zeros,
                reason: if t.structure == StructureRep::Trivial {
                    REASON_TRIVIAL
                } else {
                    REASON_ZERO
                },
            });
        }
    }
    MultipletTable {
        group,
        rank: r,
        entries,
        dropped,
    }
}
