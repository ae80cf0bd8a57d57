//! Gauge-invariant operators of a line-bundle model, derived from the E8 branching (MATH.md §5).
//!
//! Nothing here is a hand-typed list of operators: the matter kinds, their structure-group weights and their
//! centre charges all come from [`crate::bundle::branching`]. An operator is a multiset of matter kinds
//! (GUT representations) such that
//!
//! 1. **the GUT representations contain a singlet.** Criterion: the total centre charge vanishes. The centre
//!    charge of a GUT representation `R` is derived from its structure-group partner `ρ` in the branching:
//!    E8 has trivial centre, and under `G × SU(r) ⊂ E8` the centre `Z_r` of `SU(r)` is identified with the
//!    centre of `G` (`Z_5`, `Z_4`, `Z_3` for SU(5), SO(10), E6) so that `(z, z)` acts trivially on the `248`.
//!    Hence `class(R) = −(r-ality of ρ) mod r`, with r-ality `k` for `∧^k`, `−k` for its dual and `0` for the
//!    trivial and adjoint representations. Vanishing centre charge is necessary for a singlet in any tensor
//!    product. It is also sufficient here: for SU(5) every matter representation is some `∧^k` of the
//!    fundamental, and a product `∧^{k_1} ⊗ … ⊗ ∧^{k_n}` with `Σ k_i = 5m` contains `det^m` (Pieri's rule fills
//!    the `m × 5` rectangle column by column; Fulton–Harris, Representation Theory, §6.1); for SO(10)
//!    (`1, 10, 16, 16bar`) and E6 (`1, 27, 27bar`) with at most four factors it is checked against the standard
//!    decompositions `10⊗10 ∋ 1`, `16⊗16 ∋ 10`, `16⊗16bar ∋ 1`, `27⊗27 ∋ 27bar`, `27⊗27bar ∋ 1` (Slansky,
//!    "Group theory for unified model building", Phys. Rep. 79 (1981), tables, from memory) in the tests;
//! 2. **the `S(U(1)^r)` charges can cancel:** some choice of one weight per factor sums to a multiple of
//!    `(1,…,1)` (the charge rule of [`crate::bundle::charge_is_singlet`]).
//!
//! Operators of two, three and four factors are enumerated; four-factor operators containing a singlet are
//! left out (they are three-factor operators with a singlet insertion, see [`singlet_insertions`]). Only the
//! three-factor operators have a holomorphic value (a Yukawa coupling); the others get the charge rule only.
//!
//! Invariant: [`enumerate_operators`] is a pure function of the group; each operator is listed once, with its
//! slots in the fixed order described at [`Operator::slots`].

use crate::bundle::branching::{GaugeGroup, MultipletType, Role, StructureRep, branching_rule};
use crate::bundle::{BundleError, charge_is_singlet};
use itertools::Itertools;
use serde::Serialize;

/// Centre charge (congruence class) of a GUT representation `kind` of `group`, in `Z_r`, derived from its
/// structure-group partner in the branching (see the module documentation). `None` for an unknown kind.
pub fn centre_charge(group: GaugeGroup, kind: &str) -> Option<usize> {
    let r = group.structure_rank() as i64;
    let term = branching_rule(group)
        .into_iter()
        .find(|t| t.gut.name == kind)?;
    let rality = match term.structure {
        StructureRep::Trivial | StructureRep::Adjoint => 0,
        StructureRep::Wedge(k) => k as i64,
        StructureRep::DualWedge(k) => -(k as i64),
    };
    Some((-rality).rem_euclid(r) as usize)
}

/// Whether the product of the GUT representations `kinds` contains a singlet (total centre charge zero;
/// sufficient for the representations and sizes used here, see the module documentation).
pub fn contains_gut_singlet(group: GaugeGroup, kinds: &[&str]) -> bool {
    let r = group.structure_rank();
    let mut total = 0;
    for k in kinds {
        match centre_charge(group, k) {
            Some(c) => total += c,
            None => return false,
        }
    }
    total % r == 0
}

/// Slot-order priority of a role (lower first): Higgs-like partners, then families, then their conjugates.
fn slot_priority(role: Role) -> usize {
    match role {
        Role::AntiFamilyPartner => 0,
        Role::FamilyPartner => 1,
        Role::Family => 2,
        Role::AntiFamily => 3,
        Role::SelfConjugateMatter => 4,
        Role::Singlet => 5,
        Role::Gauge => 6,
    }
}

/// Naming priority for operators without a choice slot (`"5 5bar"`, `"10 10 10 5bar"`).
fn name_priority(role: Role) -> usize {
    match role {
        Role::Family => 0,
        Role::AntiFamily => 1,
        Role::AntiFamilyPartner => 2,
        Role::FamilyPartner => 3,
        Role::SelfConjugateMatter => 4,
        Role::Singlet => 5,
        Role::Gauge => 6,
    }
}

/// A gauge-invariant operator: a multiset of matter kinds passing both rules of the module documentation.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Operator {
    /// Name, e.g. `"10 10 5"`, `"5bar 10 5bar"`, `"1 5 5bar"`, `"5 5bar"`, `"10 10 10 5bar"`.
    pub name: String,
    /// Number of factors (2, 3 or 4).
    pub arity: usize,
    /// The kinds in slot order. For three factors: `[row, column, choice]` — the choice slot is a singlet
    /// if there is one, else a Higgs-like kind (`5`, `5bar`, SO(10) `10`), else the last factor; rows and
    /// columns follow the order `5, 5bar, family, anti-family, 10`. For two factors `[row, column]`.
    pub slots: Vec<&'static str>,
    /// Whether the operator has a holomorphic value computed here (three factors).
    pub holomorphic_value: bool,
}

fn role_of(group: GaugeGroup, kind: &str) -> Role {
    branching_rule(group)
        .into_iter()
        .find(|t| t.gut.name == kind)
        .map_or(Role::Gauge, |t| t.gut.role)
}

/// Slot order and name of a multiset of kinds (see [`Operator::slots`]).
fn arrange(group: GaugeGroup, kinds: &[&'static str]) -> (Vec<&'static str>, String) {
    let mut ks = kinds.to_vec();
    if ks.len() != 3 {
        ks.sort_by_key(|k| name_priority(role_of(group, k)));
        let name = ks.join(" ");
        ks.sort_by_key(|k| slot_priority(role_of(group, k)));
        return (ks, name);
    }
    let role = |k: &str| role_of(group, k);
    let choice_pos = ks
        .iter()
        .position(|k| role(k) == Role::Singlet)
        .or_else(|| {
            ks.iter()
                .enumerate()
                .filter(|(_, k)| {
                    matches!(
                        role(k),
                        Role::FamilyPartner | Role::AntiFamilyPartner | Role::SelfConjugateMatter
                    )
                })
                .max_by_key(|(_, k)| slot_priority(role(k)))
                .map(|(i, _)| i)
        })
        .unwrap_or(2);
    let choice = ks.remove(choice_pos);
    ks.sort_by_key(|k| slot_priority(role(k)));
    let name = if role(choice) == Role::Singlet {
        format!("{choice} {} {}", ks[0], ks[1])
    } else {
        format!("{} {} {choice}", ks[0], ks[1])
    };
    ks.push(choice);
    (ks, name)
}

/// Every operator of `group` with two, three or four factors (see the module documentation).
pub fn enumerate_operators(group: GaugeGroup) -> Vec<Operator> {
    let table = crate::bundle::branching::derive_table(group);
    let kinds: Vec<&'static str> = table.entries.iter().map(|e| e.kind).unique().collect();
    let weights_of = |kind: &str| -> Vec<&MultipletType> {
        table.entries.iter().filter(|e| e.kind == kind).collect()
    };
    let mut out = Vec::new();
    for arity in 2..=4 {
        for combo in kinds.iter().copied().combinations_with_replacement(arity) {
            if arity == 4 && combo.iter().any(|k| role_of(group, k) == Role::Singlet) {
                continue;
            }
            if !contains_gut_singlet(group, &combo) {
                continue;
            }
            let choices: Vec<Vec<&MultipletType>> = combo.iter().map(|k| weights_of(k)).collect();
            let can_cancel = choices.iter().multi_cartesian_product().any(|pick| {
                let charges: Vec<&[i64]> = pick.iter().map(|m| m.charge.as_slice()).collect();
                charge_is_singlet(&charges).unwrap_or(false)
            });
            if !can_cancel {
                continue;
            }
            let (slots, name) = arrange(group, &combo);
            out.push(Operator {
                name,
                arity,
                slots,
                holomorphic_value: arity == 3,
            });
        }
    }
    out
}

/// Whether the charges of the given multiplets sum to a multiple of `(1,…,1)`.
pub fn charge_allowed(charges: &[&[i64]]) -> Result<bool, BundleError> {
    charge_is_singlet(charges)
}

/// A present singlet: its label and charge.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SingletField {
    /// Label, e.g. `"1_{1,2}"`.
    pub label: String,
    /// Its `S(U(1)^r)` charge.
    pub charge: Vec<i64>,
}

/// The products of between 1 and `max` singlets from `singlets` (a multiset; repetition allowed) whose
/// charges, added to `charges`, sum to a multiple of `(1,…,1)`: the insertions that switch a forbidden
/// operator on. Each product is a list of labels in the order of `singlets`; products are listed by size,
/// then lexicographically. Cost: `Σ_{n ≤ max} C(s+n−1, n)` charge sums for `s` singlets.
pub fn singlet_insertions(
    charges: &[&[i64]],
    singlets: &[SingletField],
    max: usize,
) -> Result<Vec<Vec<String>>, BundleError> {
    let mut out = Vec::new();
    for n in 1..=max {
        for combo in (0..singlets.len()).combinations_with_replacement(n) {
            let mut all: Vec<&[i64]> = charges.to_vec();
            all.extend(combo.iter().map(|&i| singlets[i].charge.as_slice()));
            if charge_is_singlet(&all)? {
                out.push(combo.iter().map(|&i| singlets[i].label.clone()).collect());
            }
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::bundle::branching::derive_table;

    fn names(group: GaugeGroup, arity: usize) -> Vec<String> {
        enumerate_operators(group)
            .into_iter()
            .filter(|o| o.arity == arity)
            .map(|o| o.name)
            .collect()
    }

    /// The operator lists used in S(U(1)^n) line-bundle model building (common practice): SU(5) up-type
    /// `10 10 5`, down/lepton `5bar 10 5bar`, singlet couplings `1 5 5bar`, `1 10 10bar`; SO(10) `16 16 10`,
    /// `1 16 16bar`; E6 `27 27 27`, `27bar 27bar 27bar`, `1 27 27bar`.
    #[test]
    fn cubic_operators_match_common_practice() {
        let su5 = names(GaugeGroup::Su5, 3);
        for want in ["10 10 5", "5bar 10 5bar", "1 5 5bar", "1 10 10bar"] {
            assert!(
                su5.contains(&want.to_string()),
                "{want} missing from {su5:?}"
            );
        }
        for absent in ["10 10 10", "5 5 5", "10 10 5bar", "5bar 5bar 5bar"] {
            assert!(
                !su5.iter().any(|n| {
                    let mut a: Vec<&str> = n.split(' ').collect();
                    let mut b: Vec<&str> = absent.split(' ').collect();
                    a.sort();
                    b.sort();
                    a == b
                }),
                "{absent} wrongly allowed"
            );
        }
        let so10 = names(GaugeGroup::So10, 3);
        for want in ["16 16 10", "1 16 16bar", "16bar 16bar 10", "1 10 10"] {
            assert!(
                so10.contains(&want.to_string()),
                "{want} missing from {so10:?}"
            );
        }
        assert!(!so10.iter().any(|n| n == "10 10 10" || n == "16 16bar 10"));
        let e6 = names(GaugeGroup::E6, 3);
        for want in ["27 27 27", "27bar 27bar 27bar", "1 27 27bar"] {
            assert!(e6.contains(&want.to_string()), "{want} missing from {e6:?}");
        }
        assert!(
            !e6.iter()
                .any(|n| n == "27 27 27bar" || n == "27 27bar 27bar")
        );
    }

    /// Dimension-5 `10 10 10 5bar` and the Higgs bilinear `5 5bar` (common practice).
    #[test]
    fn non_cubic_operators_present() {
        assert!(names(GaugeGroup::Su5, 4).contains(&"10 10 10 5bar".to_string()));
        assert!(names(GaugeGroup::Su5, 2).contains(&"5 5bar".to_string()));
        assert!(names(GaugeGroup::So10, 2).contains(&"10 10".to_string()));
        assert!(!names(GaugeGroup::Su5, 2).contains(&"10 10".to_string()));
    }

    /// Centre charges: 16 and 16bar conjugate, SO(10) 10 real (class 2 of Z_4), E6 27 of class ±1.
    #[test]
    fn centre_charges_from_branching() {
        let c = |g, k| centre_charge(g, k).unwrap();
        assert_eq!(
            (c(GaugeGroup::So10, "16") + c(GaugeGroup::So10, "16bar")) % 4,
            0
        );
        assert_eq!(c(GaugeGroup::So10, "10"), 2);
        assert_eq!(c(GaugeGroup::So10, "1"), 0);
        assert_ne!(c(GaugeGroup::E6, "27"), 0);
        for g in GaugeGroup::ALL {
            for t in branching_rule(g) {
                let r = g.structure_rank();
                let a = centre_charge(g, t.gut.name).unwrap();
                let b = centre_charge(g, t.gut.conjugate).unwrap();
                assert_eq!((a + b) % r, 0, "{} and its conjugate", t.gut.name);
            }
        }
    }

    fn su5_entry<'a>(
        t: &'a crate::bundle::branching::MultipletTable,
        kind: &str,
        idx: &[usize],
    ) -> &'a [i64] {
        &t.entries
            .iter()
            .find(|e| e.kind == kind && e.bundles == idx)
            .unwrap()
            .charge
    }

    /// Exhaustive: down-type `5bar_{ab} 10_c 5bar_{de}` allowed iff {a,b,c,d,e} all distinct; up-type
    /// `10_a 10_b 5_{cd}` allowed iff {c,d} = {a,b} (so `10_a 10_a` never); common practice in S(U(1)^5)
    /// line-bundle model building.
    #[test]
    fn su5_charge_rules_exhaustive() {
        let t = derive_table(GaugeGroup::Su5);
        let pairs: Vec<Vec<usize>> = (1..=5).combinations(2).collect();
        for ab in &pairs {
            for c in 1..=5 {
                for de in &pairs {
                    let allowed = charge_allowed(&[
                        su5_entry(&t, "5bar", ab),
                        su5_entry(&t, "10", &[c]),
                        su5_entry(&t, "5bar", de),
                    ])
                    .unwrap();
                    let mut all = vec![ab[0], ab[1], c, de[0], de[1]];
                    all.sort();
                    all.dedup();
                    assert_eq!(allowed, all.len() == 5, "5bar{ab:?} 10_{c} 5bar{de:?}");
                }
            }
        }
        for a in 1..=5 {
            for b in 1..=5 {
                for cd in &pairs {
                    let allowed = charge_allowed(&[
                        su5_entry(&t, "10", &[a]),
                        su5_entry(&t, "10", &[b]),
                        su5_entry(&t, "5", cd),
                    ])
                    .unwrap();
                    let mut ab = vec![a, b];
                    ab.sort();
                    assert_eq!(allowed, &ab == cd, "10_{a} 10_{b} 5{cd:?}");
                    if a == b {
                        assert!(!allowed);
                    }
                }
            }
        }
    }

    #[test]
    fn singlet_insertion_switches_on_a_diagonal_entry() {
        let t = derive_table(GaugeGroup::Su5);
        let s12 = SingletField {
            label: "1_{1,2}".into(),
            charge: su5_entry(&t, "1", &[1, 2]).to_vec(),
        };
        // 10_1 10_1 5_{1,2}: charge e_1 + e_1 − e_1 − e_2 = e_1 − e_2; 1_{2,1} = e_2 − e_1 cancels it.
        let s21 = SingletField {
            label: "1_{2,1}".into(),
            charge: su5_entry(&t, "1", &[2, 1]).to_vec(),
        };
        let charges = [
            su5_entry(&t, "10", &[1]),
            su5_entry(&t, "10", &[1]),
            su5_entry(&t, "5", &[1, 2]),
        ];
        let found = singlet_insertions(&charges, &[s12.clone(), s21.clone()], 1).unwrap();
        assert_eq!(found, vec![vec!["1_{2,1}".to_string()]]);
        assert!(singlet_insertions(&charges, &[s12], 2).unwrap().is_empty());
    }
}
