//! Tests of the bundle module: derived branching tables, HRR identities,
//! consistency checks, spectrum flags and charge rules.
//!
//! Geometry data used (from memory; standard CICY data, Candelas, Dale,
//! Lütken and Schimmrigk 1988):
//! * quintic in P^4: `d_{111} = 5`, `c2(TX)·J = 50`;
//! * tetra-quadric, P^1×P^1×P^1×P^1 with one equation of degree (2,2,2,2):
//!   `d_{rst} = 2` for pairwise distinct `r,s,t`, else 0; `c2(TX)·J_r = 24`.

use std::cell::Cell;
use std::collections::{BTreeSet, HashMap};

use proptest::prelude::*;

use super::branching::{
    GaugeGroup, Role, StructureRep, branching_rule, derive_table, dimension_count,
};
use super::consistency::{ConsistencyOptions, check_consistency, families_from_index};
use super::spectrum::{spectrum, spectrum_with_options};
use super::*;

fn quintic() -> (Vec<Vec<Vec<i64>>>, Vec<i64>) {
    (vec![vec![vec![5]]], vec![50])
}

fn tetraquadric() -> (Vec<Vec<Vec<i64>>>, Vec<i64>) {
    let mut d = vec![vec![vec![0; 4]; 4]; 4];
    for (r, slice) in d.iter_mut().enumerate() {
        for (s, row) in slice.iter_mut().enumerate() {
            for (t, v) in row.iter_mut().enumerate() {
                if r != s && s != t && r != t {
                    *v = 2;
                }
            }
        }
    }
    (d, vec![24; 4])
}

fn su5_example() -> BundleSum {
    BundleSum::parse_inline("-1,0,0,1; 0,-1,1,0; 0,1,-1,0; 1,0,0,-1; 0,0,0,0").unwrap()
}

/// Callback consistent with HRR: `h = (0, max(−χ,0), max(χ,0), 0)`.
fn index_callback(
    triple: Vec<Vec<Vec<i64>>>,
    c2: Vec<i64>,
) -> impl Fn(&[i64]) -> Result<Vec<u64>, String> {
    move |k: &[i64]| {
        let chi = line_bundle_index(&triple, &c2, k).map_err(|e| e.to_string())?;
        Ok(vec![0, (-chi).max(0) as u64, chi.max(0) as u64, 0])
    }
}

fn unit(r: usize, a: usize) -> Vec<i64> {
    let mut v = vec![0; r];
    v[a] = 1;
    v
}

fn add(a: &[i64], b: &[i64]) -> Vec<i64> {
    a.iter().zip(b).map(|(x, y)| x + y).collect()
}

// ---------- branching ----------

#[test]
fn branchings_have_dimension_248() {
    for g in GaugeGroup::ALL {
        assert_eq!(dimension_count(g), 248, "{g:?}");
        assert_eq!(derive_table(g).derived_dimension(), 248, "{g:?}");
    }
}

#[test]
fn weight_counts_match_dimension_formulas() {
    for r in 3..=5 {
        let mut reps = vec![StructureRep::Trivial, StructureRep::Adjoint];
        for k in 1..r {
            reps.push(StructureRep::Wedge(k));
            reps.push(StructureRep::DualWedge(k));
        }
        for rep in reps {
            let w = rep.weights(r);
            assert_eq!(w.len(), rep.dimension(r), "{rep:?} r={r}");
            // Every weight of an SU(r) representation built from S(U(1)^r) is
            // traceless up to a multiple of (1,…,1); here entries lie in {−1,0,1}.
            assert!(w.iter().flatten().all(|x| (-1..=1).contains(x)));
        }
    }
    assert_eq!(StructureRep::Wedge(2).dimension(4), 6);
    assert_eq!(StructureRep::Adjoint.dimension(5), 24);
}

#[test]
fn conjugates_in_branching_are_consistent() {
    for g in GaugeGroup::ALL {
        let rule = branching_rule(g);
        for t in &rule {
            let c = rule
                .iter()
                .find(|u| u.gut.name == t.gut.conjugate)
                .unwrap_or_else(|| panic!("{} has no conjugate in {g:?}", t.gut.name));
            assert_eq!(c.gut.conjugate, t.gut.name);
            assert_eq!(c.gut.dim, t.gut.dim);
        }
    }
}

type Row = (String, Vec<usize>, Vec<bool>, Vec<i64>);

fn rows(g: GaugeGroup) -> BTreeSet<Row> {
    derive_table(g)
        .entries
        .into_iter()
        .map(|e| (e.kind.to_string(), e.bundles, e.duals, e.charge))
        .collect()
}

#[test]
fn derived_su5_table_matches_expected() {
    let r = 5;
    let e = |a: usize| unit(r, a - 1);
    let neg = |v: Vec<i64>| v.into_iter().map(|x| -x).collect::<Vec<_>>();
    let mut expected = BTreeSet::new();
    for a in 1..=5 {
        expected.insert(("10".to_string(), vec![a], vec![false], e(a)));
        expected.insert(("10bar".to_string(), vec![a], vec![true], neg(e(a))));
        for b in 1..=5 {
            if a < b {
                expected.insert((
                    "5bar".to_string(),
                    vec![a, b],
                    vec![false, false],
                    add(&e(a), &e(b)),
                ));
                expected.insert((
                    "5".to_string(),
                    vec![a, b],
                    vec![true, true],
                    neg(add(&e(a), &e(b))),
                ));
            }
            if a != b {
                expected.insert((
                    "1".to_string(),
                    vec![a, b],
                    vec![false, true],
                    add(&e(a), &neg(e(b))),
                ));
            }
        }
    }
    let derived = derive_table(GaugeGroup::Su5);
    assert_eq!(derived.entries.len(), 5 + 5 + 10 + 10 + 20);
    assert_eq!(rows(GaugeGroup::Su5), expected);
    let labels: Vec<String> = derived.entries.iter().map(|e| e.label()).collect();
    assert!(labels.contains(&"5bar_{1,2}".to_string()));
    let one = derived
        .entries
        .iter()
        .find(|e| e.kind == "1" && e.bundles == vec![2, 1])
        .unwrap();
    assert_eq!(one.product_name(), "L_2⊗L_1^*");
}

#[test]
fn derived_so10_table_has_each_ten_once() {
    let t = derive_table(GaugeGroup::So10);
    let count = |k: &str| t.entries.iter().filter(|e| e.kind == k).count();
    assert_eq!(count("16"), 4);
    assert_eq!(count("16bar"), 4);
    assert_eq!(count("10"), 6);
    assert_eq!(count("1"), 12);
    let tens: BTreeSet<Vec<usize>> = t
        .entries
        .iter()
        .filter(|e| e.kind == "10")
        .map(|e| e.bundles.clone())
        .collect();
    let expected: BTreeSet<Vec<usize>> = (1..=4)
        .flat_map(|a| ((a + 1)..=4).map(move |b| vec![a, b]))
        .collect();
    assert_eq!(tens, expected);
    assert!(
        t.entries
            .iter()
            .all(|e| e.kind != "10" || e.role == Role::SelfConjugateMatter)
    );
}

#[test]
fn derived_e6_table() {
    let t = derive_table(GaugeGroup::E6);
    let mut expected = BTreeSet::new();
    for a in 1..=3 {
        let e = unit(3, a - 1);
        let n: Vec<i64> = e.iter().map(|x| -x).collect();
        expected.insert(("27".to_string(), vec![a], vec![false], e));
        expected.insert(("27bar".to_string(), vec![a], vec![true], n));
        for b in 1..=3 {
            if a != b {
                expected.insert((
                    "1".to_string(),
                    vec![a, b],
                    vec![false, true],
                    add(
                        &unit(3, a - 1),
                        &unit(3, b - 1).iter().map(|x| -x).collect::<Vec<_>>(),
                    ),
                ));
            }
        }
    }
    assert_eq!(rows(GaugeGroup::E6), expected);
    assert_eq!(t.dropped.len(), 2);
}

#[test]
fn dropped_states_are_the_zero_weights() {
    let t = derive_table(GaugeGroup::Su5);
    let adj = t.dropped.iter().find(|d| d.kind == "1").unwrap();
    assert_eq!(adj.zero_weights, 4);
    assert!(adj.reason.contains("H^1(O_X)"));
    let gauge = t.dropped.iter().find(|d| d.kind == "24").unwrap();
    assert_eq!(gauge.zero_weights, 1);
}

// ---------- HRR ----------

#[test]
fn quintic_indices() {
    let (d, c2) = quintic();
    // h^0(O(1)) = 5 and h^0(O(2)) = 15 on the quintic (common knowledge).
    assert_eq!(line_bundle_index(&d, &c2, &[0]).unwrap(), 0);
    assert_eq!(line_bundle_index(&d, &c2, &[1]).unwrap(), 5);
    assert_eq!(line_bundle_index(&d, &c2, &[2]).unwrap(), 15);
    assert_eq!(line_bundle_index(&d, &c2, &[-1]).unwrap(), -5);
}

#[test]
fn tetraquadric_index_of_ample_generator() {
    let (d, c2) = tetraquadric();
    // O(1,1,1,1): 16 sections from the ambient space, no degree-2 relation.
    assert_eq!(line_bundle_index(&d, &c2, &[1, 1, 1, 1]).unwrap(), 16);
}

#[test]
fn non_integral_index_is_an_error() {
    let err = line_bundle_index(&[vec![vec![5]]], &[49], &[1]).unwrap_err();
    assert!(matches!(err, BundleError::NonIntegralIndex { .. }), "{err}");
}

#[test]
fn geometry_shape_and_symmetry_checked() {
    let (mut d, c2) = tetraquadric();
    assert!(matches!(
        line_bundle_index(&d, &c2[..3], &[1, 0, 0, 0]),
        Err(BundleError::Geometry(_))
    ));
    d[0][1][2] = 3;
    let err = line_bundle_index(&d, &c2, &[1, 0, 0, 0]).unwrap_err();
    assert!(err.to_string().contains("symmetric"), "{err}");
    let b = su5_example();
    let (q, qc2) = quintic();
    assert!(matches!(
        check_consistency(&b, &q, &qc2, None, &ConsistencyOptions::default()),
        Err(BundleError::Geometry(_))
    ));
}

// ---------- construction and parsing ----------

#[test]
fn rank_two_and_six_rejected() {
    for r in [2usize, 6] {
        let err = BundleSum::new(1, vec![vec![0]; r]).unwrap_err();
        assert_eq!(err, BundleError::InvalidRank { rank: r });
        let msg = err.to_string();
        assert!(msg.contains(&format!("rank {r}")), "{msg}");
        assert!(msg.contains("3 (E6), 4 (SO(10)) or 5 (SU(5))"), "{msg}");
    }
    assert!(BundleSum::parse_inline("1;2").is_err());
}

#[test]
fn mismatched_lengths_rejected() {
    let err = BundleSum::new(2, vec![vec![1, 0], vec![0, 1, 0], vec![-1, -1]]).unwrap_err();
    assert_eq!(
        err,
        BundleError::LengthMismatch {
            bundle: 2,
            expected: 2,
            found: 3
        }
    );
    assert_eq!(
        BundleSum::new(0, vec![vec![]; 3]).unwrap_err(),
        BundleError::ZeroFactors
    );
    assert!(matches!(
        BundleSum::parse_inline("1,0;0,1;-1"),
        Err(BundleError::LengthMismatch { bundle: 3, .. })
    ));
    assert!(matches!(
        BundleSum::parse_inline_with_m("1;0;-1", 2),
        Err(BundleError::LengthMismatch { bundle: 1, .. })
    ));
}

#[test]
fn inline_parser_accepts_whitespace_and_round_trips() {
    let b: BundleSum = " -1, 0 ,0,1 ;0,1,-1,0;\n 1,-1,1,-1 ; ".parse().unwrap();
    assert_eq!(b.m(), 4);
    assert_eq!(b.rank(), 3);
    assert_eq!(b.bundles()[2], vec![1, -1, 1, -1]);
    assert_eq!(b.to_string(), "-1,0,0,1;0,1,-1,0;1,-1,1,-1");
    assert_eq!(BundleSum::parse_inline(&b.to_string()).unwrap(), b);
    assert_eq!(b.gauge_group(), GaugeGroup::E6);
}

#[test]
fn inline_parser_errors() {
    assert_eq!(
        BundleSum::parse_inline("  ").unwrap_err(),
        BundleError::EmptyInput
    );
    assert!(matches!(
        BundleSum::parse_inline("1,2;;3,4;5,6"),
        Err(BundleError::Parse {
            bundle: 2,
            entry: 0,
            ..
        })
    ));
    assert!(matches!(
        BundleSum::parse_inline("1,,2;0,0,0;0,0,0"),
        Err(BundleError::Parse {
            bundle: 1,
            entry: 2,
            ..
        })
    ));
    let err = BundleSum::parse_inline("1,0;0,x;0,0").unwrap_err();
    assert!(matches!(
        err,
        BundleError::Parse {
            bundle: 2,
            entry: 2,
            ..
        }
    ));
    assert!(err.to_string().contains("\"x\""), "{err}");
    assert!(matches!(
        BundleSum::parse_inline("1,0;0,1;99999999999999999999,0"),
        Err(BundleError::Parse { bundle: 3, .. })
    ));
}

// ---------- consistency ----------

#[test]
fn c2_and_anomaly_hand_example() {
    let (d, c2) = tetraquadric();
    // By hand: each of (±1,∓1,0,0) gives Σ_st d_rst k^s k^t = −4 for r = 3,4;
    // each of (0,0,±1,∓1) gives −4 for r = 1,2. Total −8, so c2(V) = 4.
    let b = BundleSum::parse_inline("1,-1,0,0;-1,1,0,0;0,0,1,-1;0,0,-1,1;0,0,0,0").unwrap();
    let c = check_consistency(&b, &d, &c2, None, &ConsistencyOptions::default()).unwrap();
    assert!(c.c1_zero);
    assert_eq!(c.c2_bundle, vec![Exact::Integer(4); 4]);
    assert!(c.anomaly_ok);
    assert_eq!(c.anomaly.five_brane, vec![Exact::Integer(20); 4]);
    assert!(c.sections.is_none());
}

#[test]
fn anomaly_violation_reported() {
    let (d, c2) = tetraquadric();
    // (3,−3,0,0) gives Σ d k k = 4·(−9) = −36 for r = 3,4; twice → c2 = 36 > 24.
    let b = BundleSum::parse_inline("3,-3,0,0;-3,3,0,0;0,0,0,0").unwrap();
    let c = check_consistency(&b, &d, &c2, None, &ConsistencyOptions::default()).unwrap();
    assert!(!c.anomaly_ok);
    assert_eq!(c.anomaly.violated, vec![3, 4]);
    assert_eq!(c.anomaly.five_brane[2], Exact::Integer(-12));
    assert!(!c.all_passed);
}

#[test]
fn nonzero_c1_is_a_failed_check_and_c2_may_be_rational() {
    let (d, c2) = quintic();
    let b = BundleSum::parse_inline("1;0;0").unwrap();
    let c = check_consistency(&b, &d, &c2, None, &ConsistencyOptions::default()).unwrap();
    assert!(!c.c1_zero);
    assert_eq!(c.c1.c1, vec![1]);
    assert!(!c.c2.passed);
    assert_eq!(c.c2_bundle, vec![Exact::Rational("-5/2".into())]);
    assert!(!c.all_passed);
    let json = serde_json::to_value(&c).unwrap();
    // The summary copies are not serialised here (the spectrum object carries them); the checks are.
    assert_eq!(json["c2"]["c2_bundle"][0], "-5/2");
    assert_eq!(json["c1"]["passed"], false);
    assert!(json.get("c1_zero").is_none());
}

#[test]
fn symmetry_order_divides_index() {
    assert_eq!(families_from_index(-48, 16).unwrap(), 3);
    assert_eq!(families_from_index(-48, 1).unwrap(), 48);
    assert!(matches!(
        families_from_index(-48, 5),
        Err(BundleError::SymmetryOrder {
            order: 5,
            index: -48
        })
    ));
    assert!(families_from_index(0, 0).is_err());
    let (d, c2) = quintic();
    let b = BundleSum::parse_inline("1;1;-2").unwrap();
    // χ(O(1)) = 5, χ(O(−2)) = −15, so χ(V) = −5.
    let opts = ConsistencyOptions {
        symmetry_order: 5,
        target_families: Some(1),
    };
    let c = check_consistency(&b, &d, &c2, None, &opts).unwrap();
    assert_eq!(c.index, -5);
    assert_eq!(c.families, 1);
    assert!(c.index_check.passed);
    let opts = ConsistencyOptions {
        symmetry_order: 2,
        target_families: None,
    };
    assert!(check_consistency(&b, &d, &c2, None, &opts).is_err());
}

#[test]
fn sections_check_uses_callback_on_duals() {
    let (d, c2) = tetraquadric();
    let seen = Cell::new(0usize);
    let cb = |k: &[i64]| -> Result<Vec<u64>, String> {
        seen.set(seen.get() + 1);
        // Fake data: only the trivial bundle has a section.
        Ok(vec![u64::from(k.iter().all(|x| *x == 0)), 0, 0, 0])
    };
    let b = su5_example();
    let c = check_consistency(&b, &d, &c2, Some(&cb), &ConsistencyOptions::default()).unwrap();
    let s = c.sections.unwrap();
    assert!(!s.passed);
    assert_eq!((s.h0_v, s.h0_v_dual), (1, 1));
    assert_eq!(s.per_bundle[4].h0, 1);
    // k_1 = −k_4 and k_2 = −k_3: distinct vectors are ±k_1, ±k_2, 0.
    assert_eq!(seen.get(), 5);
}

#[test]
fn callback_errors_are_typed() {
    let (d, c2) = tetraquadric();
    let b = su5_example();
    let failing = |_: &[i64]| -> Result<Vec<u64>, String> { Err("no".into()) };
    assert!(matches!(
        spectrum(&d, &c2, &b, &failing),
        Err(BundleError::Cohomology { .. })
    ));
    let short = |_: &[i64]| -> Result<Vec<u64>, String> { Ok(vec![0, 0]) };
    assert!(matches!(
        spectrum(&d, &c2, &b, &short),
        Err(BundleError::CohomologyShape { found: 2, .. })
    ));
}

// ---------- spectrum ----------

#[test]
fn spectrum_json_shape() {
    let (d, c2) = tetraquadric();
    let cb = index_callback(d.clone(), c2.clone());
    let s = spectrum(&d, &c2, &su5_example(), &cb).unwrap();
    let json = serde_json::to_value(&s).unwrap();
    for key in [
        "rank",
        "c1_zero",
        "c2_bundle",
        "anomaly_ok",
        "index",
        "families",
        "multiplets",
        "flags",
        "consistency",
    ] {
        assert!(json.get(key).is_some(), "missing {key}");
    }
    assert_eq!(json["rank"], 5);
    assert_eq!(json["gauge_group"], "SU(5)");
    // The summary figures appear once, at the top level, not again inside `consistency`.
    for key in [
        "rank",
        "gauge_group",
        "c1_zero",
        "c2_bundle",
        "anomaly_ok",
        "index",
        "families",
    ] {
        assert!(
            json["consistency"].get(key).is_none(),
            "consistency repeats {key}"
        );
    }
    assert!(json["consistency"].get("anomaly").is_some());
    // Branching order: the (1,24) singlets come first, then 10, 10bar, 5bar, 5.
    assert_eq!(json["multiplets"][0]["kind"], "1");
    let m = &json["multiplets"][20];
    for key in [
        "kind",
        "bundles",
        "line_bundle",
        "count",
        "charge",
        "h",
        "present",
    ] {
        assert!(m.get(key).is_some(), "multiplet missing {key}");
    }
    assert_eq!(m["kind"], "10");
    assert_eq!(m["bundles"], serde_json::json!([1]));
    assert_eq!(m["role"], "family");
    assert_eq!(s.multiplets.len(), 50);
}

#[test]
fn spectrum_counts_from_callback() {
    let (d, c2) = tetraquadric();
    let cb = index_callback(d.clone(), c2.clone());
    let b = su5_example();
    let s = spectrum(&d, &c2, &b, &cb).unwrap();
    // 5bar_{1,2} lives on L_1⊗L_2 = O(−1,−1,1,1).
    let m = s
        .multiplets
        .iter()
        .find(|m| m.label == "5bar_{1,2}")
        .unwrap();
    assert_eq!(m.line_bundle, vec![-1, -1, 1, 1]);
    let chi = line_bundle_index(&d, &c2, &m.line_bundle).unwrap();
    assert_eq!(m.line_bundle_index, chi);
    assert_eq!(m.count, (-chi).max(0) as u64);
    assert_eq!(m.present, m.count > 0);
    assert!(s.flags.index_mismatches.is_empty());
}

#[test]
fn higgs_pairs_and_exotics_from_fake_data() {
    let (d, c2) = tetraquadric();
    // No trivial summand, so L_1^*⊗L_2^* is not another pair product; the only
    // multiplets on (∓1,∓1,±1,±1) are 5bar_{1,2}, 5_{1,2}, 1_{1,3} and 1_{3,1}.
    let b = BundleSum::parse_inline("-1,0,0,1;0,-1,1,0;0,1,-1,0;2,0,0,-1;-1,0,0,0").unwrap();
    let mut table: HashMap<Vec<i64>, Vec<u64>> = HashMap::new();
    table.insert(vec![-1, -1, 1, 1], vec![0, 2, 0, 0]);
    table.insert(vec![1, 1, -1, -1], vec![0, 1, 0, 0]);
    let cb = move |k: &[i64]| -> Result<Vec<u64>, String> {
        Ok(table.get(k).cloned().unwrap_or(vec![0, 0, 0, 0]))
    };
    let s = spectrum(&d, &c2, &b, &cb).unwrap();
    let present: BTreeSet<&str> = s.present().map(|m| m.label.as_str()).collect();
    let expected: BTreeSet<&str> = ["5bar_{1,2}", "5_{1,2}", "1_{1,3}", "1_{3,1}"].into();
    assert_eq!(present, expected);
    assert!(s.flags.higgs_candidates_present);
    assert_eq!(s.flags.higgs_pairs.len(), 1);
    let p = &s.flags.higgs_pairs[0];
    assert_eq!(
        (p.first_label.as_str(), p.second_label.as_str(), p.pairs),
        ("5bar_{1,2}", "5_{1,2}", 1)
    );
    assert_eq!(s.flags.vector_like_pairs.len(), 2);
    assert_eq!((s.total("5bar"), s.total("5")), (2, 1));
    assert_eq!(s.flags.net_families, 0);
    assert_eq!(s.flags.exotic_chiral_excess, 1);
    assert!(s.flags.exotics_present);
    assert!(!s.flags.index_mismatches.is_empty());
}

#[test]
fn so10_higgs_pairs_are_complementary() {
    let (d, c2) = tetraquadric();
    let b = BundleSum::parse_inline("1,-1,0,0;0,1,-1,0;0,0,1,-1;-1,0,0,1").unwrap();
    let all_one = |_: &[i64]| -> Result<Vec<u64>, String> { Ok(vec![0, 1, 0, 0]) };
    let s = spectrum(&d, &c2, &b, &all_one).unwrap();
    assert_eq!(s.gauge_group, GaugeGroup::So10);
    assert!(s.flags.higgs_candidates_present);
    let pairs: BTreeSet<(String, String)> = s
        .flags
        .higgs_pairs
        .iter()
        .map(|p| (p.first_label.clone(), p.second_label.clone()))
        .collect();
    let expected: BTreeSet<(String, String)> = [
        ("10_{1,2}", "10_{3,4}"),
        ("10_{1,3}", "10_{2,4}"),
        ("10_{1,4}", "10_{2,3}"),
    ]
    .iter()
    .map(|(a, b)| (a.to_string(), b.to_string()))
    .collect();
    assert_eq!(pairs, expected);
    assert!(s.flags.anti_families_present);
    assert_eq!(s.flags.net_families, 0);
    assert_eq!(s.flags.exotic_chiral_excess, 0);
    // 4 (16,16bar) + 3 (10,10) + 6 singlet pairs.
    assert_eq!(s.flags.vector_like_pairs.len(), 4 + 3 + 6);
}

// ---------- charge rules ----------

#[test]
fn up_type_coupling_singlet_iff_same_indices() {
    // 10_a 10_b 5_{cd} is U(1)-allowed iff {a,b} = {c,d} (common practice in
    // line bundle model building; here checked against the derived table).
    let t = derive_table(GaugeGroup::Su5);
    let tens: Vec<_> = t.entries.iter().filter(|e| e.kind == "10").collect();
    let fives: Vec<_> = t.entries.iter().filter(|e| e.kind == "5").collect();
    let mut allowed = 0;
    for x in &tens {
        for y in &tens {
            for h in &fives {
                let singlet = charge_is_singlet(&[&x.charge, &y.charge, &h.charge]).unwrap();
                let mut xy = vec![x.bundles[0], y.bundles[0]];
                xy.sort_unstable();
                assert_eq!(
                    singlet,
                    xy == h.bundles,
                    "{} {} {}",
                    x.label(),
                    y.label(),
                    h.label()
                );
                allowed += usize::from(singlet);
            }
        }
    }
    // Ordered (a,b) with a ≠ b: 20.
    assert_eq!(allowed, 20);
}

#[test]
fn down_type_coupling_needs_all_five_indices() {
    // 5bar_{ab} 5bar_{cd} 10_e carries e_a+e_b+e_c+e_d+e_e ≡ 0 iff {a,b,c,d,e} = {1,…,5}.
    let t = derive_table(GaugeGroup::Su5);
    for x in t.entries.iter().filter(|e| e.kind == "5bar") {
        for y in t.entries.iter().filter(|e| e.kind == "5bar") {
            for z in t.entries.iter().filter(|e| e.kind == "10") {
                let mut idx: Vec<usize> = x
                    .bundles
                    .iter()
                    .chain(&y.bundles)
                    .chain(&z.bundles)
                    .copied()
                    .collect();
                idx.sort_unstable();
                let singlet = charge_is_singlet(&[&x.charge, &y.charge, &z.charge]).unwrap();
                assert_eq!(singlet, idx == vec![1, 2, 3, 4, 5]);
            }
        }
    }
}

#[test]
fn charge_helpers() {
    assert!(is_neutral(&[2, 2, 2]));
    assert!(!is_neutral(&[1, 0, 0]));
    assert_eq!(canonical_charge(&[-1, 0, 2]), vec![0, 1, 3]);
    assert!(charges_equivalent(&[1, 1, 0, 0], &[0, 0, -1, -1]).unwrap());
    assert!(!charges_equivalent(&[1, 1, 0, 0], &[0, 0, 1, 1]).unwrap());
    assert_eq!(
        charge_is_singlet(&[&[1, 0], &[1, 0, 0]]),
        Err(BundleError::ChargeLength(2, 3))
    );
    assert!(charge_is_singlet(&[]).unwrap());
    assert_eq!(conjugate_charge(&[1, -2]), vec![-1, 2]);
}

#[test]
fn su5_wedge2_index_equals_index() {
    // For r = 5 and c1(V) = 0: χ(∧²V) = χ(V), read off the 5bar multiplets.
    let (d, c2) = tetraquadric();
    let b = BundleSum::parse_inline("1,1,-1,0;0,-1,1,1;-1,0,0,-1;1,0,1,0;-1,0,-1,0").unwrap();
    let cb = index_callback(d.clone(), c2.clone());
    let s = spectrum(&d, &c2, &b, &cb).unwrap();
    let chi_w2: i64 = s
        .multiplets
        .iter()
        .filter(|m| m.kind == "5bar")
        .map(|m| m.line_bundle_index)
        .sum();
    assert_eq!(chi_w2, s.index);
    // By hand with χ = 2 e3 + 2 e1 on the tetra-quadric: χ(V) = −4.
    assert_eq!(s.index, -4);
    assert_eq!(s.families, 4);
}

// ---------- property tests ----------

/// Rank-r bundles with Σ k_a = 0 on a geometry with m factors.
fn c1_zero_bundles(r: usize, m: usize) -> impl Strategy<Value = BundleSum> {
    proptest::collection::vec(proptest::collection::vec(-3i64..=3, m), r - 1).prop_map(
        move |mut ks| {
            let last: Vec<i64> = (0..m)
                .map(|i| -ks.iter().map(|k| k[i]).sum::<i64>())
                .collect();
            ks.push(last);
            BundleSum::new(m, ks).unwrap()
        },
    )
}

fn any_geometry_bundle() -> impl Strategy<Value = (bool, BundleSum)> {
    (3usize..=5, any::<bool>()).prop_flat_map(|(r, tq)| {
        let m = if tq { 4 } else { 1 };
        c1_zero_bundles(r, m).prop_map(move |b| (tq, b))
    })
}

fn geometry(tq: bool) -> (Vec<Vec<Vec<i64>>>, Vec<i64>) {
    if tq { tetraquadric() } else { quintic() }
}

proptest! {
    #[test]
    fn wedge2_index_is_r_minus_4_times_index((tq, b) in any_geometry_bundle()) {
        let (d, c2) = geometry(tq);
        let chi_v: i64 = b.bundles().iter().map(|k| line_bundle_index(&d, &c2, k).unwrap()).sum();
        let r = b.rank();
        // ∧²V from the derived weights of ∧² of the fundamental.
        let wedge2 = StructureRep::Wedge(2).weights(r);
        prop_assert_eq!(wedge2.len(), r * (r - 1) / 2);
        let chi_w2: i64 = wedge2
            .iter()
            .map(|w| line_bundle_index(&d, &c2, &b.product(w).unwrap()).unwrap())
            .sum();
        prop_assert_eq!(chi_w2, (r as i64 - 4) * chi_v);
    }

    #[test]
    fn index_is_integral_on_both_geometries(k in proptest::collection::vec(-6i64..=6, 4), q in -20i64..=20) {
        let (d, c2) = tetraquadric();
        let chi = line_bundle_index(&d, &c2, &k).unwrap();
        // Closed form on the tetra-quadric: χ = 2 e3(k) + 2 e1(k).
        let mut e3 = 0;
        for a in 0..4 { for b in (a+1)..4 { for c in (b+1)..4 { e3 += k[a]*k[b]*k[c]; } } }
        prop_assert_eq!(chi, 2 * e3 + 2 * k.iter().sum::<i64>());
        let (d5, c5) = quintic();
        prop_assert_eq!(line_bundle_index(&d5, &c5, &[q]).unwrap(), (5 * q * q * q + 25 * q) / 6);
        prop_assert_eq!(line_bundle_index(&d5, &c5, &[-q]).unwrap(), -line_bundle_index(&d5, &c5, &[q]).unwrap());
    }

    #[test]
    fn c2_is_integral_and_equals_pair_form((tq, b) in any_geometry_bundle()) {
        let (d, _) = geometry(tq);
        let c2v = consistency::c2_bundle(&b, &d).unwrap();
        let ks = b.bundles();
        for (r, v) in c2v.iter().enumerate() {
            prop_assert!(v.is_integer());
            // c2(V) = Σ_{a<b} c1(L_a) c1(L_b) when c1 = 0.
            let mut pair = 0i64;
            for a in 0..ks.len() { for bb in (a+1)..ks.len() {
                for s in 0..b.m() { for t in 0..b.m() { pair += d[r][s][t] * ks[a][s] * ks[bb][t]; } }
            } }
            prop_assert_eq!(v.to_integer(), num_bigint::BigInt::from(pair));
        }
    }

    #[test]
    fn families_from_consistent_callback((tq, b) in any_geometry_bundle()) {
        let (d, c2) = geometry(tq);
        let inner = index_callback(d.clone(), c2.clone());
        let calls = Cell::new(0usize);
        let cb = |k: &[i64]| { calls.set(calls.get() + 1); inner(k) };
        let s = spectrum(&d, &c2, &b, &cb).unwrap();
        prop_assert_eq!(s.families, -s.index);
        prop_assert_eq!(s.flags.net_families, -s.index);
        prop_assert!(s.flags.net_families_match);
        prop_assert_eq!(s.flags.exotic_chiral_excess, 0);
        prop_assert!(s.flags.index_mismatches.is_empty());
        prop_assert!(s.c1_zero);
        // The callback saw each distinct line bundle once.
        let mut distinct: BTreeSet<Vec<i64>> = s.multiplets.iter().map(|m| m.line_bundle.clone()).collect();
        for k in b.bundles() {
            distinct.insert(k.clone());
            distinct.insert(k.iter().map(|x| -x).collect());
        }
        prop_assert_eq!(calls.get(), distinct.len());
        let with_order = spectrum_with_options(&d, &c2, &b, &cb, &ConsistencyOptions { symmetry_order: 1, target_families: None }).unwrap();
        prop_assert_eq!(with_order.index, s.index);
    }
}
