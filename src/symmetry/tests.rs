//! Tests of the symmetry module against published free actions (marked from memory), the holomorphic
//! Lefschetz theorem and exact character identities.

use super::character::{average, bundle_characters, equivariant_structure};
use super::cyclotomic::Cyclotomic;
use super::fixed::ComponentStatus;
use super::*;
use crate::cohomology::complex::E1Page;
use crate::cohomology::{CohomologyEngine, PolynomialChoice};
use num_rational::BigRational;

fn generator(
    layout: &VariableLayout,
    name: &str,
    image: Vec<usize>,
    phase: Vec<i64>,
    n: u32,
) -> GeneratorSpec {
    GeneratorSpec {
        name: name.into(),
        map: MonomialMap::new(layout, image, phase, n).unwrap(),
    }
}

fn spec(n: u32, generators: Vec<GeneratorSpec>) -> SymmetrySpec {
    SymmetrySpec {
        phase_order: n,
        generators,
        lifts: None,
        wilson_line: None,
    }
}

fn quintic() -> (Configuration, SymmetrySpec) {
    let config = Configuration::new(&[4], &[vec![5]]).unwrap();
    let l = VariableLayout::new(&[4]);
    let s = spec(
        5,
        vec![
            generator(&l, "s", vec![1, 2, 3, 4, 0], vec![0; 5], 5),
            generator(&l, "c", (0..5).collect(), vec![0, 1, 2, 3, 4], 5),
        ],
    );
    (config, s)
}

/// Z2 × Z2 on the tetra-quadric: `a` flips the sign of x_{i,1}, `b` swaps x_{i,0} ↔ x_{i,1}, on every P^1.
fn tetra_z2z2() -> (Configuration, SymmetrySpec) {
    let config = Configuration::new(&[1, 1, 1, 1], &[vec![2, 2, 2, 2]]).unwrap();
    let l = VariableLayout::new(&[1, 1, 1, 1]);
    let s = spec(
        2,
        vec![
            generator(&l, "a", (0..8).collect(), vec![0, 1, 0, 1, 0, 1, 0, 1], 2),
            generator(&l, "b", vec![1, 0, 3, 2, 5, 4, 7, 6], vec![0; 8], 2),
        ],
    );
    (config, s)
}

#[test]
fn quintic_z5xz5_is_free() {
    // From memory: the Heisenberg Z5 × Z5 (cyclic shift and x_i ↦ ζ^i x_i) acts freely on the generic invariant
    // quintic; χ = −200 gives χ(X/Γ) = −8.
    let (config, s) = quintic();
    let polys = Quotient::generic_equations(&s, &config, 7).unwrap();
    let q = Quotient::new(&s, &config, &polys).unwrap();
    assert_eq!(q.group.order(), 25);
    assert!(q.freeness.free, "{:?}", q.freeness);
    assert_eq!(q.summary(Some(1)).euler_quotient, Some(-8));
    assert_eq!(q.summary(Some(1)).hodge_quotient, Some([1, 5]));
}

#[test]
fn tetraquadric_z2xz2_is_free() {
    // From memory: this Z2 × Z2 acts freely on the generic invariant tetra-quadric (χ = −128, quotient −32).
    let (config, s) = tetra_z2z2();
    let polys = Quotient::generic_equations(&s, &config, 3).unwrap();
    let q = Quotient::new(&s, &config, &polys).unwrap();
    assert_eq!(q.group.order(), 4);
    assert_eq!(q.group.linear_order(), 8);
    assert!(q.freeness.free, "{:?}", q.freeness);
    assert_eq!(q.summary(Some(4)).euler_quotient, Some(-32));
}

#[test]
fn non_free_action_is_refused_with_its_fixed_points() {
    // x ↦ (x0 : x1 : x2 : ζ x3 : ζ^4 x4) fixes the plane x3 = x4 = 0, which meets every quintic in a curve.
    let config = Configuration::new(&[4], &[vec![5]]).unwrap();
    let l = VariableLayout::new(&[4]);
    let s = spec(
        5,
        vec![generator(&l, "g", (0..5).collect(), vec![0, 0, 0, 1, 4], 5)],
    );
    let polys = Quotient::generic_equations(&s, &config, 1).unwrap();
    let q = Quotient::new(&s, &config, &polys).unwrap();
    assert!(!q.freeness.free);
    let bad = q
        .freeness
        .offending
        .iter()
        .find(|f| f.status == ComponentStatus::MeetsX)
        .expect("a fixed component on X");
    assert_eq!(bad.dimension, 2);
    assert!(
        bad.points.contains("(u0 : u1 : u2 : 0 : 0)"),
        "{}",
        bad.points
    );
    let e = q.require_free().unwrap_err().to_string();
    assert!(e.contains("not free") && e.contains('g'), "{e}");
}

#[test]
fn fixed_point_on_x_is_found_exactly() {
    // The Fermat quintic minus 5·(product) passes through (1:1:1:1:1), fixed by the cyclic shift.
    let config = Configuration::new(&[4], &[vec![5]]).unwrap();
    let l = VariableLayout::new(&[4]);
    let s = spec(
        5,
        vec![generator(&l, "s", vec![1, 2, 3, 4, 0], vec![0; 5], 5)],
    );
    let p = Polynomial::parse(
        "x1_0^5 + x1_1^5 + x1_2^5 + x1_3^5 + x1_4^5 - 5*x1_0*x1_1*x1_2*x1_3*x1_4",
        &l,
    )
    .unwrap();
    let q = Quotient::new(&s, &config, &[p]).unwrap();
    assert!(!q.freeness.free);
    assert!(
        q.freeness
            .offending
            .iter()
            .any(|f| f.status == ComponentStatus::MeetsX && f.points == "(u0 : u0 : u0 : u0 : u0)"),
        "{:?}",
        q.freeness.offending
    );
}

#[test]
fn non_invariant_equation_names_the_generator() {
    let (config, s) = quintic();
    let l = VariableLayout::new(&[4]);
    let p = Polynomial::parse("x1_0^5 + x1_1^5 + x1_2^5 + x1_3^5 + 2*x1_4^5", &l).unwrap();
    let e = Quotient::new(&s, &config, &[p]).unwrap_err().to_string();
    assert!(e.contains("`s`") && e.contains("equation 1"), "{e}");
}

#[test]
fn euler_divisibility_is_required() {
    // Z3 by phases on the quintic: χ = −200 is not divisible by 3.
    let config = Configuration::new(&[4], &[vec![5]]).unwrap();
    let l = VariableLayout::new(&[4]);
    let s = spec(
        3,
        vec![generator(&l, "g", (0..5).collect(), vec![0, 1, 2, 0, 0], 3)],
    );
    let polys = Quotient::generic_equations(&s, &config, 1).unwrap();
    assert!(matches!(
        Quotient::new(&s, &config, &polys),
        Err(SymmetryError::EulerNotDivisible { .. })
    ));
}

fn characters_of(
    q: &Quotient,
    engine: &CohomologyEngine,
    k: &[i64],
) -> Option<character::BundleCharacters> {
    let layout = q.group.layout();
    let (psi, _) = equivariant_structure(&q.group, k, None, "L").ok()?;
    let h = engine.cohomology(k).unwrap().h.clone();
    let page = E1Page::new(layout, engine.config().equations(), k);
    Some(bundle_characters(&q.group, &q.actions, &page, &h, &psi))
}

#[test]
fn holomorphic_lefschetz_vanishing_and_character_identities() {
    // Atiyah–Bott: for a free action the virtual character Σ_q (−1)^q tr(g | H^q(X, L)) vanishes for g ≠ 1.
    let (config, s) = tetra_z2z2();
    let polys = Quotient::generic_equations(&s, &config, 3).unwrap();
    let q = Quotient::new(&s, &config, &polys).unwrap();
    assert!(q.freeness.free);
    let engine = CohomologyEngine::new(&config, PolynomialChoice::Given(polys)).unwrap();
    let ring = Cyclotomic::new(q.group.root_order());
    let chars = q.group.one_dimensional_characters().unwrap();
    // The characters of Γ: those trivial on K.
    let gamma_chars: Vec<Vec<i64>> = chars
        .into_iter()
        .filter(|c| {
            q.group.classes()[0]
                .iter()
                .all(|&e| c[e] % q.group.root_order() as i64 == 0)
        })
        .collect();
    assert_eq!(gamma_chars.len(), 4);
    let mut tested = 0;
    let mut nontrivial = 0;
    for k in [
        vec![0, 0, 0, 0],
        vec![1, -1, 0, 0],
        vec![2, -1, 1, 0],
        vec![-2, 1, 1, 2],
        vec![1, 1, -1, -1],
        vec![-1, 2, 1, -2],
        vec![3, -1, -1, 1],
        vec![0, 2, -2, 2],
    ] {
        let Some(c) = characters_of(&q, &engine, &k) else {
            // Odd total degree: K acts by −1 and there is no one-dimensional lift.
            assert!(k.iter().sum::<i64>() % 2 != 0, "{k:?}");
            continue;
        };
        tested += 1;
        for (g, v) in c.virtual_character.iter().enumerate().skip(1) {
            assert!(
                ring.is_zero(v),
                "bundle {k:?}, element {}: {}",
                q.group.class_name(g),
                ring.to_text(v)
            );
        }
        let h = engine.cohomology(&k).unwrap().h.clone();
        let index: i64 = h
            .iter()
            .enumerate()
            .map(|(q, &x)| if q % 2 == 0 { x as i64 } else { -(x as i64) })
            .sum();
        assert_eq!(index % 4, 0, "index divisible by |Γ|");
        for (deg, d) in c.degrees.iter().enumerate() {
            let Some(d) = d else { continue };
            // The identity's trace is the dimension.
            assert_eq!(
                ring.to_rational(&d[0]),
                Some(BigRational::from_integer((h[deg] as i64).into()))
            );
            // Σ over the characters of Γ of the multiplicities reproduces h^q; each multiplicity is an average.
            let mut total = BigRational::from_integer(0.into());
            for chi in &gamma_chars {
                let conj: Vec<i64> = chi.iter().map(|x| -x).collect();
                let f = character::product(
                    &ring,
                    d,
                    &character::class_function_of(&q.group, &ring, &conj),
                );
                let mult = average(&ring, &f);
                assert!(mult.is_integer() && mult >= BigRational::from_integer(0.into()));
                total += mult;
            }
            assert_eq!(
                total,
                BigRational::from_integer((h[deg] as i64).into()),
                "{k:?} degree {deg}"
            );
            if h[deg] > 0 && (1..4).any(|g| !ring.is_zero(&d[g])) {
                nontrivial += 1;
            }
        }
        // H^3(X, O_X) carries the trivial character for a free action on a Calabi-Yau (holomorphic 3-form kept).
        if k == [0, 0, 0, 0] {
            let top = c.degrees[3].as_ref().unwrap();
            for v in top {
                assert_eq!(
                    ring.to_rational(v),
                    Some(BigRational::from_integer(1.into()))
                );
            }
        }
    }
    assert!(
        tested >= 5 && nontrivial >= 1,
        "tested {tested}, nontrivial {nontrivial}"
    );
}

#[test]
fn serre_duality_of_characters_with_a_factor_swap() {
    // tr(g | H^3(X, L)) = conj tr(g | H^0(X, L^*)) · tr(g | H^3(X, O_X)) for any (not necessarily free) action;
    // here a swap of two P^1 factors combined with coordinate swaps, which exercises the top-class signs.
    let config = Configuration::new(&[1, 1, 1, 1], &[vec![2, 2, 2, 2]]).unwrap();
    let l = VariableLayout::new(&[1, 1, 1, 1]);
    let s = spec(
        2,
        vec![
            generator(&l, "t", vec![2, 3, 0, 1, 4, 5, 6, 7], vec![0; 8], 2),
            generator(&l, "b", vec![1, 0, 3, 2, 5, 4, 7, 6], vec![0; 8], 2),
        ],
    );
    let polys = Quotient::generic_equations(&s, &config, 5).unwrap();
    let group = s.group(&l).unwrap();
    let actions = invariance::equation_actions(&group, &polys).unwrap();
    let q = Quotient {
        freeness: fixed::check_free(&group, &polys),
        group,
        actions,
        polynomials: polys.clone(),
        euler: BigInt::from(-128),
    };
    let engine = CohomologyEngine::new(&config, PolynomialChoice::Given(polys)).unwrap();
    let ring = Cyclotomic::new(q.group.root_order());
    let omega = characters_of(&q, &engine, &[0, 0, 0, 0]).unwrap().degrees[3]
        .clone()
        .unwrap();
    for k in [vec![1, 1, 1, 1], vec![2, 2, 1, 1], vec![1, 1, 2, 3]] {
        let dual: Vec<i64> = k.iter().map(|x| -x).collect();
        let h0 = characters_of(&q, &engine, &k).unwrap().degrees[0]
            .clone()
            .unwrap();
        let h3 = characters_of(&q, &engine, &dual).unwrap().degrees[3]
            .clone()
            .unwrap();
        for g in 0..q.group.order() {
            let rhs = ring.mul(&ring.conj(&h0[g]), &omega[g]);
            assert!(
                ring.is_zero(&ring.add(&h3[g], &rhs.iter().map(|c| -c).collect())),
                "{k:?} element {}",
                q.group.class_name(g)
            );
        }
    }
}

#[test]
fn wilson_line_must_be_a_homomorphism_on_the_quotient() {
    let (config, s) = tetra_z2z2();
    let l = VariableLayout::new(config.dims());
    let group = s.group(&l).unwrap();
    assert!(downstairs::wilson_line(&group, &[1, 0]).is_ok());
    // With N = 2 every value is ±1 and defines a homomorphism of Γ̃; value 1 on both generators is trivial on
    // the scalar −1 = (ab)^2 as well.
    assert!(downstairs::wilson_line(&group, &[1, 1]).is_ok());
    // A value of order 4 on `a` (with phases read in ζ_4) is not a homomorphism of Z2.
    let mut s4 = s.clone();
    s4.phase_order = 4;
    for g in &mut s4.generators {
        g.map = g.map.rescale(2);
    }
    let group4 = s4.group(&l).unwrap();
    let e = downstairs::wilson_line(&group4, &[1, 0])
        .unwrap_err()
        .to_string();
    assert!(e.contains("not a homomorphism") && e.contains("a"), "{e}");
}
