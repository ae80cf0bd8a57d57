//! Identities every line-bundle cohomology result must satisfy (MATH.md §3), over several configurations,
//! plus published Bott-formula values and internal consistency of the differential (D∘D = 0, fast d_1 equals
//! the perturbative d_1, lifted classes are cocycles).

#![allow(clippy::needless_range_loop)]

use proptest::prelude::*;
use sheafwright::arith::{self, LARGE_PRIMES, PrimeField, RationalField};
use sheafwright::cohomology::complex::{Complex, E1Page};
use sheafwright::cohomology::{
    CohomologyEngine, PolynomialChoice, bott::bott_dimension, to_field_polys,
};
use sheafwright::geometry::{Configuration, Geometry};
use sheafwright::poly::VariableLayout;

fn configs() -> Vec<Configuration> {
    let raw: Vec<(Vec<i64>, Vec<Vec<i64>>)> = vec![
        (vec![4], vec![vec![5]]),
        (vec![1, 1, 1, 1], vec![vec![2, 2, 2, 2]]),
        (vec![2, 2], vec![vec![3, 3]]),
        (vec![5], vec![vec![3], vec![3]]),
        (vec![2, 3], vec![vec![2, 1], vec![1, 3]]),
        (
            vec![1, 1, 1, 1, 1],
            vec![vec![1, 1, 1, 1, 2], vec![1, 1, 1, 1, 0]],
        ),
    ];
    raw.into_iter()
        .map(|(a, e)| Configuration::new(&a, &e).unwrap())
        .collect()
}

fn engine(c: &Configuration) -> CohomologyEngine {
    CohomologyEngine::new(c, PolynomialChoice::Generic { seed: 7 }).unwrap()
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(96))]

    #[test]
    fn serre_duality_index_and_kodaira(which in 0usize..6, raw in prop::collection::vec(-3i64..=3, 5)) {
        let c = &configs()[which];
        let k = &raw[..c.num_factors()];
        let e = engine(c);
        let r = e.cohomology(k).unwrap();
        let minus: Vec<i64> = k.iter().map(|x| -x).collect();
        let d = e.cohomology(&minus).unwrap();
        // Serre duality on a Calabi-Yau threefold: h^q(L) = h^{3-q}(L^*).
        for q in 0..=3 { prop_assert_eq!(r.h[q], d.h[3 - q], "k = {:?} on {}", k, c.label()); }
        // Alternating sum = HRR index from the geometry module.
        let hrr = Geometry::new(c).index(k).unwrap();
        prop_assert_eq!(num_bigint::BigInt::from(r.index), hrr);
        // Kodaira vanishing for ample bundles (all entries > 0 on a favourable CICY).
        if k.iter().all(|&x| x > 0) { prop_assert_eq!(&r.h[1..], &[0, 0, 0][..]); }
        if k.iter().all(|&x| x < 0) { prop_assert_eq!(&r.h[..3], &[0, 0, 0][..]); }
    }

    #[test]
    fn bott_dimension_formula_matches_enumerated_basis(
        dims in prop::collection::vec(1usize..=3, 1..=3), d in prop::collection::vec(-7i64..=5, 3)
    ) {
        // The closed Bott/Künneth count (fast) against the enumerated monomial basis (slow twin).
        let d = &d[..dims.len()];
        let layout = VariableLayout::new(&dims);
        let counted = bott_dimension(&dims, d);
        let listed = sheafwright::cohomology::bott::bott_group(&layout, d);
        prop_assert_eq!(counted.map(|(q, n)| (q, n as usize)), listed.map(|g| (g.q, g.dim())));
    }

    #[test]
    fn permuting_identical_factors(raw in prop::collection::vec(-3i64..=3, 4), seed in 0u64..24) {
        // P1^4 with (2,2,2,2) is symmetric under permuting the four factors (common practice).
        let c = &configs()[1];
        let e = engine(c);
        let mut p = raw.clone();
        let mut s = seed as usize;
        for i in (1..4).rev() { p.swap(i, s % (i + 1)); s /= i + 1; }
        prop_assert_eq!(&e.cohomology(&raw).unwrap().h, &e.cohomology(&p).unwrap().h);
    }
}

#[test]
fn structure_sheaf_has_h0_and_h3_one() {
    for c in configs() {
        let r = engine(&c).cohomology(&vec![0; c.num_factors()]).unwrap();
        assert_eq!(r.h, vec![1, 0, 0, 1], "{}", c.label());
    }
}

#[test]
fn bott_formula_published_values() {
    // Hartshorne, Algebraic Geometry, Thm III.5.1: h^0(P^n,O(d)) = C(n+d,n), h^n(P^n,O(d)) = C(-d-1,n).
    assert_eq!(bott_dimension(&[3], &[2]), Some((0, 10)));
    assert_eq!(bott_dimension(&[3], &[-6]), Some((3, 10)));
    assert_eq!(bott_dimension(&[3], &[-4]), Some((3, 1)));
    assert_eq!(bott_dimension(&[3], &[-2]), None);
    assert_eq!(bott_dimension(&[2], &[-3]), Some((2, 1)));
    assert_eq!(bott_dimension(&[5], &[6]), Some((0, 462)));
    // Künneth: h^1(P1 x P2, O(-3, 1)) = 2 * 3.
    assert_eq!(bott_dimension(&[1, 2], &[-3, 1]), Some((1, 6)));
}

#[test]
fn quintic_line_bundles_textbook_values() {
    // On the quintic, h^0(O_X(k)) = C(k+4,4) - C(k-1,4) for k >= 0 (Koszul sequence; Hübsch, Calabi-Yau
    // Manifolds: A Bestiary for Physicists), e.g. 5, 15, 35, 70, 125 = 126 - 1, 205 = 210 - 5.
    let c = &configs()[0];
    let e = engine(c);
    for (k, h0) in [(1, 5), (2, 15), (3, 35), (4, 70), (5, 125), (6, 205)] {
        assert_eq!(e.cohomology(&[k]).unwrap().h, vec![h0, 0, 0, 0], "k = {k}");
    }
}

/// Bundles on P1^5 with two equations where a higher differential d_2 is needed (found by search).
const HIGHER: &[[i64; 5]] = &[
    [0, -2, -2, -2, -2],
    [2, 0, -2, -2, -2],
    [-2, 0, -2, -2, -2],
    [0, 2, 2, 2, 2],
];

#[test]
fn higher_differentials_are_computed_and_consistent() {
    let c = &configs()[5];
    let e = engine(c);
    let g = Geometry::new(c);
    for k in HIGHER {
        let r = e.cohomology(k).unwrap();
        let minus: Vec<i64> = k.iter().map(|x| -x).collect();
        if r.method.higher_differentials() {
            assert_eq!(r.method.kind(), "ranks");
        }
        let d = e.cohomology(&minus).unwrap();
        let rev: Vec<u64> = d.h.iter().rev().copied().collect();
        assert_eq!(r.h, rev, "Serre duality at {k:?}");
        assert_eq!(num_bigint::BigInt::from(r.index), g.index(k).unwrap());
    }
    assert!(
        e.cohomology(&HIGHER[0])
            .unwrap()
            .method
            .higher_differentials()
    );
    // Without d_2 the answer for O(0,-2,-2,-2,-2) would be h^3 = 81 and h^4 = 1 (outside 0..=3): the
    // d_2 of rank 1 is what makes it (0,0,0,80).
    assert_eq!(e.cohomology(&HIGHER[0]).unwrap().h, vec![0, 0, 0, 80]);
}

fn check_complex(c: &Configuration, k: &[i64]) {
    let e = engine(c);
    let layout = VariableLayout::new(c.dims());
    let page = E1Page::new(&layout, c.equations(), k);
    let field = PrimeField::new(LARGE_PRIMES[2]).unwrap();
    let polys = to_field_polys(&field, e.polynomials()).unwrap();
    let cx = Complex {
        field: &field,
        layout: &layout,
        page: &page,
        polys: &polys,
    };
    let lo = -(c.codimension() as i64);
    for m in lo..=c.ambient_dimension() as i64 {
        // D∘D = 0.
        let d0 = cx.differential_matrix(m);
        let d1 = cx.differential_matrix(m + 1);
        if d0.nrows > 0 && d1.nrows > 0 && d0.ncols > 0 {
            let prod = arith::mat_mul(&field, &d1, &d0);
            assert_eq!(
                prod.nnz(),
                0,
                "D∘D != 0 at m = {m}, k = {k:?} on {}",
                c.label()
            );
        }
        // The fast d_1 equals the d_1 part of the perturbation series (slow twin).
        for g in page.groups_of_degree(m) {
            for local in 0..g.bott.dim().min(40) {
                let mut fast = cx.d1_fast(g, local);
                let full = cx.differential_perturbative(g, local, false);
                let higher = cx.differential_perturbative(g, local, true);
                // full = fast + higher, compare as sparse sums.
                fast.extend(higher);
                let a = arith::SparseMatrix::from_triplets(
                    &field,
                    page.dim(m + 1).max(1),
                    1,
                    fast.into_iter().map(|(r, v)| (r, 0, v)),
                );
                let b = arith::SparseMatrix::from_triplets(
                    &field,
                    page.dim(m + 1).max(1),
                    1,
                    full.into_iter().map(|(r, v)| (r, 0, v)),
                );
                assert_eq!(a.rows, b.rows, "d1 twin mismatch at k = {k:?}");
            }
        }
    }
}

#[test]
fn differential_squares_to_zero_and_fast_d1_matches_perturbation() {
    let cs = configs();
    check_complex(&cs[1], &[-2, 2, 2, 2]);
    check_complex(&cs[1], &[1, -1, 2, -2]);
    check_complex(&cs[3], &[3]);
    check_complex(&cs[4], &[-3, 2]);
    for k in HIGHER {
        check_complex(&cs[5], k);
    }
    check_complex(&cs[5], &[1, -1, 0, 2, -2]);
}

#[test]
fn lifted_representatives_are_cocycles() {
    let cs = configs();
    let cases: Vec<(&Configuration, Vec<i64>)> = vec![
        (&cs[1], vec![-2, 2, 2, 2]),
        (&cs[1], vec![2, -2, 0, 1]),
        (&cs[4], vec![-3, 2]),
        (&cs[5], vec![2, 0, -2, -2, -2]),
        (&cs[5], vec![0, -2, -2, -2, -2]),
    ];
    for (c, k) in cases {
        let e = engine(c);
        let layout = VariableLayout::new(c.dims());
        let page = E1Page::new(&layout, c.equations(), &k);
        let field = RationalField;
        let polys = to_field_polys(&field, e.polynomials()).unwrap();
        let cx = Complex {
            field: &field,
            layout: &layout,
            page: &page,
            polys: &polys,
        };
        let reps = e.representatives(&k).unwrap();
        let h = e.cohomology(&k).unwrap().h.clone();
        let total: u64 = h.iter().sum();
        assert_eq!(
            reps.len() as u64,
            total,
            "one representative per basis class at {k:?}"
        );
        for q in 0..=3usize {
            assert_eq!(reps.iter().filter(|r| r.degree == q).count() as u64, h[q]);
        }
        // Re-lift each class from its E_1 coordinates and check (δ + t) ι'(v) = 0.
        for q in 0..=3i64 {
            let n = page.dim(q);
            if n == 0 {
                continue;
            }
            let dq = cx.differential_matrix(q);
            let kernel = if page.dim(q + 1) > 0 {
                arith::kernel_basis(&field, &dq)
            } else {
                (0..n)
                    .map(|i| vec![(i, num_rational::BigRational::from_integer(1.into()))])
                    .collect()
            };
            for v in kernel.iter().take(6) {
                let lifted = cx.lift(q, v);
                assert!(
                    cx.total_differential(&lifted).is_empty(),
                    "lift of a cocycle is not closed at {k:?}, q = {q}"
                );
            }
        }
    }
}

#[test]
fn types_respect_the_spectral_sequence() {
    // On the special tetra-quadric member the extra H^0 class of O(-2,2,2,2) comes from H^1(A, O(-4,0,0,0)):
    // Koszul degree 1, so its type is 1; the H^1 classes come from H^1(A, O(-2,2,2,2)), type 0.
    let model = sheafwright::io::model::Model::load(std::path::Path::new(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/catalogs-demo/tetraquadric-special.toml"
    )))
    .unwrap();
    let e = CohomologyEngine::new(
        model.config(),
        PolynomialChoice::Given(model.polynomials().unwrap().to_vec()),
    )
    .unwrap();
    let k = [-2, 2, 2, 2];
    assert_eq!(e.cohomology(&k).unwrap().h, vec![1, 25, 0, 0]);
    let reps = e.representatives(&k).unwrap();
    assert!(
        reps.iter()
            .filter(|r| r.degree == 0)
            .all(|r| r.class_type == 1)
    );
    assert!(
        reps.iter()
            .filter(|r| r.degree == 1)
            .all(|r| r.class_type == 0)
    );
    let generic =
        CohomologyEngine::new(model.config(), PolynomialChoice::Generic { seed: 3 }).unwrap();
    assert_eq!(generic.cohomology(&k).unwrap().h, vec![0, 24, 0, 0]);
}

#[test]
fn degenerate_given_polynomials_are_refused() {
    // Two identical cubics in P5 do not form a complete intersection: hypercohomology appears in degree -1.
    let c = &configs()[3];
    let layout = VariableLayout::new(c.dims());
    let p = sheafwright::poly::Polynomial::random(&layout, &[3], 5, 10);
    let e = CohomologyEngine::new(c, PolynomialChoice::Given(vec![p.clone(), p])).unwrap();
    let err = e.cohomology(&[3]).unwrap_err().to_string();
    assert!(err.contains("complete intersection"), "{err}");
}

#[test]
fn cache_returns_identical_results() {
    let c = &configs()[1];
    let e = engine(c);
    let a = e.cohomology(&[1, -2, 0, 3]).unwrap();
    let n = e.cache_len();
    let b = e.cohomology(&[1, -2, 0, 3]).unwrap();
    assert!(std::sync::Arc::ptr_eq(&a, &b));
    assert_eq!(e.cache_len(), n);
}

#[test]
fn favourability_certificate() {
    // The tetra-quadric is favourable (h^{1,1} = 4 = number of factors, [CDLS88]); the Schoen manifold
    // P2xP2xP1 with equations (3,0,1), (0,3,1) has h^{1,1} = 19 > 3 (from memory) and Euler number 0.
    let fav = sheafwright::analysis::favourability(&engine(&configs()[1])).unwrap();
    assert_eq!(fav.status, "favourable");
    let schoen = Configuration::new(&[2, 2, 1], &[vec![3, 0, 1], vec![0, 3, 1]]).unwrap();
    assert_eq!(Geometry::new(&schoen).euler(), num_bigint::BigInt::from(0));
    let fav = sheafwright::analysis::favourability(&engine(&schoen)).unwrap();
    assert_eq!(fav.status, "not_certified");
}

/// A non-zero d_2 decides the answer, checked without the engine's ranks. On P1^5 [(1,1,1,1,2);(1,1,1,1,0)]
/// the E_1 page of O(0,2,2,2,2) is H^0(A, O(0,2,2,2,2)) (dim 81, p = 0, degree 0) and
/// H^1(A, O(−2,0,0,0,0)) e_{12} (dim 1, p = 2, degree −1): no d_1 joins them (it would need a group at p = 1),
/// so without d_2 the answer would be h^0 = 81 with hypercohomology 1 in degree −1. HRR (the Chow ring, not
/// the engine) gives χ = 80, and the page has nothing in degrees 1..3, so h^0 = 80: d_2 must have rank 1.
#[test]
fn nonzero_d2_is_forced_by_hrr_and_the_e1_page() {
    let c = &configs()[5];
    let k = [0, 2, 2, 2, 2];
    let e = engine(c);
    let r = e.cohomology(&k).unwrap();
    let mut groups: Vec<(usize, usize, usize)> = r.e1.iter().map(|g| (g.p, g.q, g.dim)).collect();
    groups.sort();
    assert_eq!(groups, vec![(0, 0, 81), (2, 1, 1)]);
    let chi = Geometry::new(c).index(&k).unwrap();
    assert_eq!(chi, num_bigint::BigInt::from(80));
    assert_eq!(r.h, vec![80, 0, 0, 0]);
    assert!(r.method.higher_differentials());
    let d = r.method.maps();
    assert_eq!(d.len(), 1);
    assert_eq!((d[0].degree, d[0].rank), (-1, 1));
}
