//! Tests of the texture layer: structural rank against a brute-force twin, exact rank and relations on
//! matrices of known structure, and the statuses of the invented demo models.

use super::*;
use crate::cohomology::PolynomialChoice;
use crate::io::model::Model;
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
    assert_eq!(v.to_string(), "(1 + (-2/3)*psi^2)/((1)*psi)");
    assert_eq!(
        serde_json::to_value(&v).unwrap(),
        "(1 + (-2/3)*psi^2)/((1)*psi)"
    );
    assert!(v.as_rational().is_none());
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
            values: true,
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
            values: true,
        },
    )
    .unwrap_err();
    assert!(err.to_string().contains("--singlets 9"));
}
