//! Tests of the texture layer: structural rank against a brute-force twin, exact rank and relations on
//! matrices of known structure, and the statuses of the invented demo models.

use super::build::finish;
use super::*;
use crate::cohomology::PolynomialChoice;
use crate::io::model::Model;
use num_traits::Zero;
use proptest::prelude::*;
use std::path::Path;

/// Slow, obviously correct twin of [`structural_rank`]: the largest number of rows that can be matched to
/// distinct columns through `true` entries (equivalently, the largest `k` with a `k × k` submatrix whose
/// pattern has a non-zero permanent), by exhaustive search.
fn structural_rank_brute(p: &[Vec<bool>]) -> usize {
    fn go(p: &[Vec<bool>], r: usize, used: &mut Vec<bool>) -> usize {
        if r == p.len() {
            return 0;
        }
        let mut best = go(p, r + 1, used);
        for c in 0..used.len() {
            if p[r][c] && !used[c] {
                used[c] = true;
                best = best.max(1 + go(p, r + 1, used));
                used[c] = false;
            }
        }
        best
    }
    let nc = p.first().map_or(0, Vec::len);
    go(p, 0, &mut vec![false; nc])
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]
    /// Maximum matching (petgraph) equals exhaustive search on random 0/1 patterns (König/Hall; Lovász–Plummer,
    /// Matching Theory, ch. 1).
    #[test]
    fn structural_rank_matches_brute_force(
        (nr, nc, bits) in (0usize..7, 0usize..7).prop_flat_map(|(r, c)| {
            (Just(r), Just(c), proptest::collection::vec(proptest::bool::weighted(0.35), r * c))
        })
    ) {
        let p: Vec<Vec<bool>> = (0..nr).map(|r| bits[r * nc..(r + 1) * nc].to_vec()).collect();
        prop_assert_eq!(structural_rank(&p), structural_rank_brute(&p));
    }
}

#[test]
fn structural_rank_known_patterns() {
    // A permutation pattern has full structural rank; a pattern with two rows supported on one column has 1.
    let id: Vec<Vec<bool>> = (0..4)
        .map(|r| (0..4).map(|c| (r + 1) % 4 == c).collect())
        .collect();
    assert_eq!(structural_rank(&id), 4);
    let col = vec![vec![true, false], vec![true, false]];
    assert_eq!(structural_rank(&col), 1);
}

fn q(n: i64, d: i64) -> BigRational {
    BigRational::new(n.into(), d.into())
}

fn entry(r: usize, c: usize, v: Option<BigRational>) -> Entry {
    Entry {
        fields: vec![format!("r{r}"), format!("c{c}")],
        row: r,
        column: c,
        status: match &v {
            Some(x) if !x.is_zero() => EntryStatus::Value,
            Some(_) => EntryStatus::ZeroComputed,
            None => EntryStatus::ForbiddenByCharge,
        },
        value: v.filter(|x| !x.is_zero()).map(CouplingValue::Rational),
        rational_function: None,
        types: None,
        singlet_insertions: vec![],
    }
}

/// Two equal rows give rank 1 and an `equal` row relation; a third row `−3/2` times the first is
/// `proportional`; a column of forbidden entries is `zero` (a matrix built with its answer known).
#[test]
fn relations_and_rank_on_a_known_matrix() {
    let vals = [
        [Some(q(2, 1)), Some(q(1, 3)), None],
        [Some(q(2, 1)), Some(q(1, 3)), None],
        [Some(q(-3, 1)), Some(q(-1, 2)), None],
    ];
    let entries: Vec<Entry> = vals
        .iter()
        .enumerate()
        .flat_map(|(r, row)| {
            row.iter()
                .enumerate()
                .map(move |(c, v)| entry(r, c, v.clone()))
        })
        .collect();
    let op = Operator {
        name: "test".into(),
        arity: 2,
        slots: vec!["a", "b"],
        holomorphic_value: true,
    };
    let rows = vec!["r0".to_string(), "r1".into(), "r2".into()];
    let cols = vec!["c0".to_string(), "c1".into(), "c2".into()];
    let c = finish(&op, None, rows, cols, entries, vec![]);
    assert_eq!(c.rank, Some(1));
    assert_eq!(c.structural_rank, 2);
    let has = |between: &str, kind: &str, first: &str, second: &str, factor: &str| {
        c.relations.iter().any(|r| {
            r.between == between
                && r.kind == kind
                && r.first == first
                && r.second == second
                && r.factor == factor
        })
    };
    assert!(has("rows", "equal", "r0", "r1", "1"), "{:?}", c.relations);
    assert!(
        has("rows", "proportional", "r0", "r2", "-3/2"),
        "{:?}",
        c.relations
    );
    assert!(has("columns", "zero", "c2", "", "0"), "{:?}", c.relations);
    assert!(
        has("columns", "proportional", "c0", "c1", "1/6"),
        "{:?}",
        c.relations
    );
    assert!(
        has("entries", "equal", "r0 c0", "r1 c0", "1"),
        "{:?}",
        c.relations
    );
    // A perturbation of the second row breaks the equality and raises the rank.
    let mut vals2 = vals.clone();
    vals2[1][1] = Some(q(1, 2));
    let entries: Vec<Entry> = vals2
        .iter()
        .enumerate()
        .flat_map(|(r, row)| {
            row.iter()
                .enumerate()
                .map(move |(c, v)| entry(r, c, v.clone()))
        })
        .collect();
    let c2 = finish(
        &op,
        None,
        vec!["r0".into(), "r1".into(), "r2".into()],
        vec!["c0".into(), "c1".into(), "c2".into()],
        entries,
        vec![],
    );
    assert_eq!(c2.rank, Some(2));
    assert!(
        !c2.relations
            .iter()
            .any(|r| r.between == "rows" && r.second == "r1")
    );
}

#[test]
fn rational_function_value_text() {
    let v = CouplingValue::RationalFunction {
        parameter: "psi".into(),
        numerator: vec![q(1, 1), q(0, 1), q(-2, 3)],
        denominator: vec![q(0, 1), q(1, 1)],
    };
    assert_eq!(v.to_string(), "(-2/3*psi^2 + 1)/(psi)");
    assert_eq!(serde_json::to_value(&v).unwrap(), "(-2/3*psi^2 + 1)/(psi)");
    assert!(v.as_rational().is_none());
    // The entry's JSON carries the text and the coefficients (ascending powers, exact strings).
    let mut e = entry(0, 0, None);
    e.status = EntryStatus::Value;
    e.set_value(v);
    let j = serde_json::to_value(&e).unwrap();
    assert_eq!(j["value"], "(-2/3*psi^2 + 1)/(psi)");
    assert_eq!(j["rational_function"]["parameter"], "psi");
    assert_eq!(
        j["rational_function"]["numerator"],
        serde_json::json!(["1", "0", "-2/3"])
    );
    assert_eq!(
        j["rational_function"]["denominator"],
        serde_json::json!(["0", "1"])
    );
}

fn function_entry(r: usize, c: usize, f: &RationalFunction) -> Entry {
    let mut e = entry(r, c, Some(q(0, 1)));
    if !f.is_zero() {
        e.status = EntryStatus::Value;
        e.set_value(CouplingValue::from_function("t", f));
    }
    e
}

/// A texture of rational functions with its structure built in: row 1 is `(t + 1)` times row 0, row 2 is
/// `−2` times row 0, so the rank over Q(t) is 1 although no row is a constant multiple of row 1; entries equal
/// up to a constant are linked; changing one entry of row 1 raises the rank to 2.
#[test]
fn relations_and_rank_over_the_function_field() {
    let rf = |n: &[i64], d: &[i64]| {
        RationalFunction::new(UniPoly::from_ints(n), UniPoly::from_ints(d)).unwrap()
    };
    let a = rf(&[1], &[-1, 1]); // 1/(t − 1)
    let b = rf(&[0, 3], &[1]); // 3t
    let s = rf(&[1, 1], &[1]); // t + 1
    let m2 = RationalFunction::constant(q(-2, 1));
    let build = |rows: &[[RationalFunction; 2]]| -> CouplingClass {
        let entries: Vec<Entry> = rows
            .iter()
            .enumerate()
            .flat_map(|(r, row)| {
                row.iter()
                    .enumerate()
                    .map(move |(c, f)| function_entry(r, c, f))
            })
            .collect();
        let op = Operator {
            name: "test".into(),
            arity: 2,
            slots: vec!["a", "b"],
            holomorphic_value: true,
        };
        let labels = (0..rows.len()).map(|r| format!("r{r}")).collect();
        finish(
            &op,
            None,
            labels,
            vec!["c0".into(), "c1".into()],
            entries,
            vec![],
        )
    };
    let c = build(&[
        [a.clone(), b.clone()],
        [a.mul(&s), b.mul(&s)],
        [a.mul(&m2), b.mul(&m2)],
    ]);
    assert_eq!(c.rank, Some(1));
    let find = |between: &str, first: &str, second: &str| {
        c.relations
            .iter()
            .find(|r| r.between == between && r.first == first && r.second == second)
            .cloned()
    };
    let r1 = find("rows", "r0", "r1").expect("row 1 = (t + 1) row 0");
    assert_eq!((r1.kind, r1.factor.as_str()), ("proportional", "t + 1"));
    assert!(r1.factor_depends_on_parameter);
    let r2 = find("rows", "r0", "r2").expect("row 2 = −2 row 0");
    assert_eq!((r2.kind, r2.factor.as_str()), ("proportional", "-2"));
    assert!(!r2.factor_depends_on_parameter);
    let e = find("entries", "r0 c1", "r2 c1").expect("−6t = −2 · 3t");
    assert_eq!((e.kind, e.factor.as_str()), ("proportional", "-2"));
    assert!(find("entries", "r0 c0", "r0 c1").is_none());
    let changed = build(&[
        [a.clone(), b.clone()],
        [
            a.mul(&s),
            b.mul(&s).add(&RationalFunction::constant(q(1, 1))),
        ],
        [a.mul(&m2), b.mul(&m2)],
    ]);
    assert_eq!(changed.rank, Some(2));
}

fn demo(name: &str) -> (CohomologyEngine, BundleSum) {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("catalogs-demo")
        .join(name);
    let model = Model::load(&path).unwrap();
    let engine = CohomologyEngine::new(
        model.config(),
        PolynomialChoice::Generic { seed: 20_261_202 },
    )
    .unwrap();
    let sum = BundleSum::new(
        model.config().num_factors(),
        model.line_bundles().unwrap().to_vec(),
    )
    .unwrap();
    (engine, sum)
}

/// The invented type-zero demo: `10_1 10_2 5_{1,2}` is allowed by charge (common practice: {c,d} = {a,b}),
/// all three `H^1` come from the ambient space (type 0, hand computation with Bott's formula: the Koszul
/// term `H^•(A, L ⊗ N^*)` vanishes for each), so every allowed entry vanishes by type (K = 1); the diagonal
/// blocks `10_a 10_a` are forbidden.
#[test]
fn type_zero_demo_statuses() {
    let (engine, sum) = demo("tetraquadric-typezero.toml");
    let r = couplings(&engine, &sum, &CouplingOptions::default()).unwrap();
    assert!(!r.warnings.is_empty(), "the demo fails a consistency check");
    let up: Vec<&CouplingClass> = r
        .classes
        .iter()
        .filter(|c| c.operator == "10 10 5")
        .collect();
    assert_eq!(up.len(), 4, "one texture per 5_{{1,2}} class");
    for c in up {
        for e in &c.entries {
            let same = e.fields[0].split('#').next() == e.fields[1].split('#').next();
            if same {
                assert_eq!(e.status, EntryStatus::ForbiddenByCharge, "{:?}", e.fields);
            } else {
                assert_eq!(e.status, EntryStatus::VanishesByType, "{:?}", e.fields);
                assert_eq!(e.types.as_deref(), Some(&[0, 0, 0][..]));
            }
        }
        assert_eq!(c.structural_rank, 8);
        assert_eq!(c.structural_rank_after_type, 0);
        assert_eq!(c.rank, Some(0));
    }
}

/// SO(10) demo: values are computed for `16 16 10` and `1 10 10`; in each texture the exact rank is at most
/// the structural rank after type, transposed entries are opposite (graded antisymmetry of λ), and the
/// statuses are consistent with the values.
#[test]
fn so10_demo_values_and_ranks() {
    let (engine, sum) = demo("tetraquadric-so10.toml");
    let r = couplings(
        &engine,
        &sum,
        &CouplingOptions {
            singlets: 1,
            ..CouplingOptions::default()
        },
    )
    .unwrap();
    let mut valued = 0;
    for c in &r.classes {
        if let Some(rank) = c.rank {
            assert!(rank <= c.structural_rank_after_type, "{}", c.operator);
        }
        assert!(c.structural_rank_after_type <= c.structural_rank);
        for e in &c.entries {
            match e.status {
                EntryStatus::Value => {
                    valued += 1;
                    assert!(!e.value.as_ref().unwrap().as_rational().unwrap().is_zero());
                }
                EntryStatus::ZeroComputed | EntryStatus::VanishesByType => {
                    assert!(e.value.is_none())
                }
                _ => {}
            }
        }
        if c.slots[0] == c.slots[1] && c.slots.len() == 3 {
            let n = c.columns.len();
            for e in c.entries.iter().filter(|e| e.status == EntryStatus::Value) {
                let t = &c.entries[e.column * n + e.row];
                let a = e.value.as_ref().unwrap().as_rational().unwrap();
                let b = t.value.as_ref().unwrap().as_rational().unwrap();
                assert_eq!(a, &-b, "transpose of {:?}", e.fields);
            }
        }
    }
    assert!(valued > 0, "some value computed");
    assert!(r.classes.iter().any(|c| c.operator == "16 16 10"));
}

#[test]
fn too_many_singlets_refused() {
    let (engine, sum) = demo("tetraquadric-e6.toml");
    let err = couplings(
        &engine,
        &sum,
        &CouplingOptions {
            singlets: 9,
            ..CouplingOptions::default()
        },
    )
    .unwrap_err();
    assert!(err.to_string().contains("--singlets 9"));
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    /// The fast path for textures without a non-zero value agrees with the general relation search and rank
    /// (its slow twin) on random patterns of known-zero and unknown entries.
    #[test]
    fn zero_texture_fast_path_matches_the_general_search(
        (nr, nc, codes) in (1usize..6, 1usize..6).prop_flat_map(|(r, c)| {
            (Just(r), Just(c), proptest::collection::vec(0u8..5, r * c))
        })
    ) {
        use super::relations::{Rationals, known_rank, search, zero_texture_relations};
        let statuses = [
            EntryStatus::ForbiddenByCharge,
            EntryStatus::VanishesByType,
            EntryStatus::ZeroComputed,
            EntryStatus::NotComputed,
            EntryStatus::AllowedByCharge,
        ];
        let entries: Vec<Entry> = codes
            .iter()
            .enumerate()
            .map(|(i, &k)| Entry { status: statuses[k as usize], ..entry(i / nc, i % nc, None) })
            .collect();
        let rows: Vec<String> = (0..nr).map(|r| format!("r{r}")).collect();
        let columns: Vec<String> = (0..nc).map(|c| format!("c{c}")).collect();
        prop_assert_eq!(
            zero_texture_relations(&rows, &columns, &entries),
            search(&Rationals, &rows, &columns, &entries)
        );
        prop_assert_eq!(
            super::relations::texture_rank(nr, nc, &entries),
            known_rank(&Rationals, nr, nc, &entries)
        );
    }
}
