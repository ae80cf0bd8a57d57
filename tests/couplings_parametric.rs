//! Couplings as exact rational functions of a symbolic coefficient (`couplings::parametric`): checked against
//! direct exact computations at values that were not sampled, against the rescaling law, and on degenerate
//! values of the parameter.

#![allow(clippy::needless_range_loop)] // index-heavy tensor algebra reads best with explicit indices

use num_rational::BigRational;
use num_traits::{One, Zero};
use sheafwright::arith::RationalFunction;
use sheafwright::cohomology::{CohomologyEngine, PolynomialChoice};
use sheafwright::couplings::parametric::{
    ParametricOptions, SpecialKind, parametric_yukawa_tensor, sample_value,
};
use sheafwright::couplings::value::yukawa_tensor;
use sheafwright::geometry::Configuration;
use sheafwright::io::model::Model;
use sheafwright::poly::parametric::ParametricPolynomial;
use sheafwright::poly::{Polynomial, VariableLayout};
use std::path::Path;

fn q(n: i64, d: i64) -> BigRational {
    BigRational::new(n.into(), d.into())
}

fn demo() -> Model {
    Model::load(&Path::new(env!("CARGO_MANIFEST_DIR")).join("catalogs-demo/tetraquadric-psi.toml"))
        .unwrap()
}

/// A bundle triple of the tetra-quadric whose couplings depend on the polynomial: types `(0, 0|1, 0|1)`, with
/// entries of type sum 2 > K (their values involve the polynomial through the lifted cocycles).
const TRIPLES: [[[i64; 4]; 3]; 2] = [
    [[-4, 0, 0, 0], [2, 0, 2, -2], [2, 0, -2, 2]],
    [[-4, 0, 0, 0], [2, 0, 2, -2], [2, 0, -2, 2]],
];

#[test]
fn demo_family_values_match_direct_computations_at_unsampled_values() {
    let model = demo();
    let par = model.parameter().unwrap();
    let mut non_constant = 0;
    for ks in &TRIPLES[..1] {
        let t = parametric_yukawa_tensor(
            model.config(),
            &par.name,
            &par.polynomials,
            [&ks[0], &ks[1], &ks[2]],
            &ParametricOptions::default(),
        )
        .unwrap();
        eprintln!(
            "{ks:?}: dims {:?}, degree bound {}, max degrees {:?}, {} points, special {:?}, unlocated {:?}, e.g. {}",
            t.dims,
            t.total_degree_bound,
            t.max_degrees,
            t.interpolation_points.len() + t.check_points.len(),
            t.special_values,
            t.unlocated_denominators,
            t.values
                .iter()
                .find(|f| f.as_constant().is_none())
                .map(|f| f.to_text("psi"))
                .unwrap_or_default()
        );
        assert_eq!(t.values.len(), t.dims.iter().product::<usize>());
        assert!(t.total_degree_bound + 1 == t.interpolation_points.len());
        assert_eq!(t.check_points.len(), 3);
        non_constant += t
            .values
            .iter()
            .filter(|f| f.as_constant().is_none())
            .count();
        // Values never sampled: exact direct computation with the specialised polynomials.
        for v in [q(7, 5)] {
            assert!(!t.interpolation_points.contains(&v) && !t.check_points.contains(&v));
            let polys = par.polynomials.iter().map(|p| p.eval(&v)).collect();
            let engine =
                CohomologyEngine::new(model.config(), PolynomialChoice::Given(polys)).unwrap();
            let direct = yukawa_tensor(&engine, [&ks[0], &ks[1], &ks[2]]).unwrap();
            assert_eq!(direct.dims, t.dims, "{ks:?} at {v}");
            for (f, d) in t.values.iter().zip(&direct.values) {
                assert_eq!(
                    f.eval(&v).as_ref(),
                    Some(d),
                    "{ks:?} at {v}: {}",
                    f.to_text("psi")
                );
            }
        }
    }
    assert!(
        non_constant > 0,
        "the demo family should give psi-dependent couplings"
    );
}

/// `p(t) = (1 + t)·p_0` for a fixed tetra-quadric `p_0`: rescaling every polynomial by c multiplies λ by
/// `c^{τ_1+τ_2+τ_3−K}` in the canonical basis (the law stated and tested for the general route), so each entry
/// must come out as `(1 + t)^{τ-sum − 1}·λ_0`, and `t = −1` (p = 0) must be reported as degenerate.
#[test]
fn rescaled_family_reconstructs_the_rescaling_law_and_reports_the_degenerate_value() {
    let config = Configuration::new(&[1, 1, 1, 1], &[vec![2, 2, 2, 2]]).unwrap();
    let layout = VariableLayout::new(&[1, 1, 1, 1]);
    // p_0: every monomial, our own invented small coefficients.
    let mut p0 = Polynomial::zero(layout.nvars());
    for (n, e) in sheafwright::poly::monomials_of_multidegree(&layout, &[2, 2, 2, 2])
        .into_iter()
        .enumerate()
    {
        let c = (5 * n as i64 + 3) % 11 - 5;
        p0.add_term(
            e,
            BigRational::from_integer(if c == 0 { 4 } else { c }.into()),
        );
    }
    let base = CohomologyEngine::new(&config, PolynomialChoice::Given(vec![p0])).unwrap();
    // (1 + t)·p_0 term by term in the parametric syntax: "(c)*(1 + t)*monomial".
    let distributed: Vec<String> = base.polynomials()[0]
        .terms()
        .map(|(e, c)| {
            let mut one = Polynomial::zero(layout.nvars());
            one.add_term(e.clone(), BigRational::one());
            format!("({c})*(1 + t)*{}", one.to_text(&layout))
        })
        .collect();
    let distributed = distributed.join(" + ");
    let family = ParametricPolynomial::parse(&distributed, &layout, "t").unwrap();
    assert_eq!(family.eval(&BigRational::zero()), base.polynomials()[0]);
    let ks = TRIPLES[1];
    let t = parametric_yukawa_tensor(
        &config,
        "t",
        &[family],
        [&ks[0], &ks[1], &ks[2]],
        &ParametricOptions::default(),
    )
    .unwrap();
    let direct = yukawa_tensor(&base, [&ks[0], &ks[1], &ks[2]]).unwrap();
    let one_plus_t = sheafwright::arith::UniPoly::from_ints(&[1, 1]);
    let mut checked = 0;
    for i in 0..t.dims[0] {
        for j in 0..t.dims[1] {
            for l in 0..t.dims[2] {
                let s = t.types[0][i] + t.types[1][j] + t.types[2][l];
                let lambda0 = direct.get(i, j, l).clone();
                let mut num = sheafwright::arith::UniPoly::constant(lambda0.clone());
                for _ in 1..s {
                    num = num.mul(&one_plus_t);
                }
                let expected = if s == 0 {
                    RationalFunction::constant(lambda0)
                } else {
                    RationalFunction::new(num, sheafwright::arith::UniPoly::from_ints(&[1]))
                        .unwrap()
                };
                assert_eq!(t.get(i, j, l), &expected, "({i},{j},{l}) types sum {s}");
                if !direct.get(i, j, l).is_zero() && s >= 2 {
                    checked += 1;
                }
            }
        }
    }
    assert!(checked > 0);
    assert!(
        t.special_values
            .iter()
            .any(|s| s.value == "-1" && matches!(s.kind, SpecialKind::Degenerate { .. })),
        "{:?}",
        t.special_values
    );
}

#[test]
fn sample_values_start_with_small_integers() {
    assert_eq!(sample_value(0), BigRational::zero());
    assert_eq!(sample_value(3), q(2, 1));
    assert_eq!(sample_value(5), q(1, 2));
}

/// An invented SU(5) sum on the demo family with `L_1 = (2,0,2,−2)`, `L_2 = (2,0,−2,2)`: the up-type texture
/// `10_1 10_2 5_{1,2}` is the ψ-dependent triple above, so the textures hold non-constant rational functions.
const FAMILY_SUM: [[i64; 4]; 5] = [
    [2, 0, 2, -2],
    [2, 0, -2, 2],
    [-2, 1, 0, 0],
    [-1, -1, 1, 0],
    [-1, 0, -1, 0],
];

/// The texture layer over the demo family (`couplings_in_family`) against an independent path: at values of ψ
/// that were never sampled, every rational-function entry of the `10 10 5` textures must equal the plain
/// `yukawa_tensor` of the specialised polynomials (`10_2 10_1` entries: minus the transposed value, graded
/// antisymmetry), and the rank over Q(ψ) must be the largest rank of the specialised matrices.
#[test]
fn family_textures_specialise_to_the_direct_values_of_fresh_members() {
    use sheafwright::bundle::BundleSum;
    use sheafwright::couplings::texture::ParameterFamily;
    use sheafwright::couplings::{CouplingOptions, EntryStatus, couplings_in_family};
    let model = demo();
    let par = model.parameter().unwrap();
    let member = CohomologyEngine::new(
        model.config(),
        PolynomialChoice::Given(model.polynomials().unwrap().to_vec()),
    )
    .unwrap();
    let sum = BundleSum::new(4, FAMILY_SUM.iter().map(|k| k.to_vec()).collect()).unwrap();
    let family = ParameterFamily {
        config: model.config(),
        parameter: &par.name,
        polynomials: &par.polynomials,
        member: par.value.clone(),
        options: ParametricOptions::default(),
    };
    let report = couplings_in_family(&member, &sum, &CouplingOptions::default(), &family).unwrap();
    let summary = report.family.as_ref().expect("family data");
    assert!(
        summary
            .tensors
            .iter()
            .all(|t| t.values == "rational_functions" && t.member_check == "agrees"),
        "{:?}",
        summary.tensors
    );
    let (l1, l2) = (&FAMILY_SUM[0], &FAMILY_SUM[1]);
    let l5: Vec<i64> = (0..4).map(|i| -l1[i] - l2[i]).collect();
    let fresh = [q(7, 5), q(-11, 3)];
    let direct: Vec<_> = fresh
        .iter()
        .map(|v| {
            let polys = par.polynomials.iter().map(|p| p.eval(v)).collect();
            let e = CohomologyEngine::new(model.config(), PolynomialChoice::Given(polys)).unwrap();
            yukawa_tensor(&e, [l1, l2, &l5]).unwrap()
        })
        .collect();
    let index = |label: &str| -> (String, usize) {
        let (m, n) = label.split_once('#').unwrap();
        (m.to_string(), n.parse::<usize>().unwrap() - 1)
    };
    let (mut checked, mut non_constant) = (0, 0);
    for c in report.classes.iter().filter(|c| c.operator == "10 10 5") {
        let (_, l) = index(c.choice.as_deref().unwrap());
        for e in &c.entries {
            let (rm, i) = index(&e.fields[0]);
            let (cm, j) = index(&e.fields[1]);
            let f = match e.status {
                EntryStatus::Value => e.value.as_ref().unwrap().to_function().unwrap(),
                EntryStatus::ZeroComputed => RationalFunction::constant(BigRational::zero()),
                _ => continue,
            };
            non_constant += usize::from(f.as_constant().is_none());
            for (v, d) in fresh.iter().zip(&direct) {
                let want = match (rm.as_str(), cm.as_str()) {
                    ("10_{1}", "10_{2}") => d.get(i, j, l).clone(),
                    ("10_{2}", "10_{1}") => -d.get(j, i, l),
                    other => panic!("unexpected allowed entry {other:?}"),
                };
                assert_eq!(f.eval(v), Some(want), "{:?} at {v}", e.fields);
                checked += 1;
            }
        }
        // Rank over Q(ψ) = the largest rank of the specialised matrices (equal outside finitely many ψ).
        let nc = c.columns.len();
        let specialised_rank = |v: &BigRational| {
            let m: Vec<Vec<BigRational>> = (0..c.rows.len())
                .map(|r| {
                    (0..nc)
                        .map(|k| match &c.entries[r * nc + k].value {
                            Some(x) => x.to_function().unwrap().eval(v).unwrap(),
                            None => BigRational::zero(),
                        })
                        .collect()
                })
                .collect();
            sheafwright::couplings::texture::exact_rank(&m)
        };
        let best = fresh.iter().map(specialised_rank).max().unwrap();
        assert_eq!(c.rank, Some(best), "[{}] {:?}", c.operator, c.choice);
    }
    assert!(checked > 0 && non_constant > 0, "{checked} {non_constant}");
}

/// Shared sample members (`FamilyMembers`) change nothing but the cost: two tensors of the demo family computed
/// through one cache equal the ones computed with fresh engines, and the cache holds one member per distinct
/// sample value met (fewer than the members built without it, one set per tensor).
#[test]
fn shared_family_members_give_the_same_tensors_with_one_member_per_sample_value() {
    use sheafwright::couplings::parametric::{FamilyMembers, parametric_yukawa_tensor_with};
    let model = demo();
    let par = model.parameter().unwrap();
    let (l1, l2) = (&FAMILY_SUM[0], &FAMILY_SUM[1]);
    let l5: Vec<i64> = (0..4).map(|i| -l1[i] - l2[i]).collect();
    let triples: [[&[i64]; 3]; 2] = [[l1, l2, &l5], [l2, l1, &l5]];
    let members = FamilyMembers::new(model.config(), &par.polynomials);
    let options = ParametricOptions::default();
    let mut points = std::collections::BTreeSet::new();
    let mut built_without_cache = 0;
    for ks in triples {
        let shared = parametric_yukawa_tensor_with(&members, &par.name, ks, &options).unwrap();
        let fresh =
            parametric_yukawa_tensor(model.config(), &par.name, &par.polynomials, ks, &options)
                .unwrap();
        assert_eq!(shared.values, fresh.values);
        assert_eq!(shared.interpolation_points, fresh.interpolation_points);
        assert_eq!(shared.special_values, fresh.special_values);
        let here: Vec<_> = fresh
            .interpolation_points
            .iter()
            .chain(&fresh.check_points)
            .cloned()
            .collect();
        built_without_cache += here.len();
        points.extend(here);
    }
    // The demo family has no degenerate or special sample value, so every member built is a used point.
    assert_eq!(members.len(), points.len());
    assert!(members.len() < built_without_cache);
}
