//! Property tests for the geometry module: laws that hold for every Calabi-Yau complete intersection.

#![allow(clippy::needless_range_loop)]

use num_bigint::BigInt;
use proptest::prelude::*;
use sheafwright::geometry::{Configuration, Geometry};

/// Random Calabi-Yau configurations: dims in 1..=3 (2 to 4 factors), each row n_i+1 split among K columns.
fn cy_config() -> impl Strategy<Value = Configuration> {
    (
        prop::collection::vec(1i64..=3, 1..=4),
        1usize..=4,
        any::<u64>(),
    )
        .prop_filter_map("valid CY configuration", |(dims, k, seed)| {
            let mut state = seed | 1;
            let mut next = move || {
                state ^= state << 13;
                state ^= state >> 7;
                state ^= state << 17;
                state
            };
            let mut eqs = vec![vec![0i64; dims.len()]; k];
            for (i, &n) in dims.iter().enumerate() {
                for _ in 0..=n {
                    let j = (next() % k as u64) as usize;
                    eqs[j][i] += 1;
                }
            }
            Configuration::new(&dims, &eqs).ok()
        })
}

fn threefold() -> impl Strategy<Value = Configuration> {
    cy_config().prop_filter("threefold", |c| c.dimension() == 3)
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]

    #[test]
    fn triple_intersections_are_symmetric_and_nonnegative(c in threefold()) {
        let d = Geometry::new(&c).triple_intersections().unwrap();
        let m = d.len();
        for r in 0..m { for s in 0..m { for t in 0..m {
            prop_assert!(d[r][s][t] >= 0);
            prop_assert_eq!(d[r][s][t], d[s][r][t]);
            prop_assert_eq!(d[r][s][t], d[r][t][s]);
        }}}
    }

    #[test]
    fn permuting_factors_permutes_the_data(c in threefold(), seed in any::<u64>()) {
        let m = c.num_factors();
        let mut perm: Vec<usize> = (0..m).collect();
        let mut s = seed;
        for i in (1..m).rev() { s = s.wrapping_mul(6364136223846793005).wrapping_add(1); perm.swap(i, (s >> 33) as usize % (i + 1)); }
        let g = Geometry::new(&c);
        let h = Geometry::new(&c.permute_factors(&perm));
        let (d, e) = (g.triple_intersections().unwrap(), h.triple_intersections().unwrap());
        let (c2g, c2h) = (g.c2_dot_j().unwrap(), h.c2_dot_j().unwrap());
        prop_assert_eq!(g.euler(), h.euler());
        for r in 0..m {
            prop_assert_eq!(c2h[r], c2g[perm[r]]);
            for s in 0..m { for t in 0..m {
                prop_assert_eq!(e[r][s][t], d[perm[r]][perm[s]][perm[t]]);
            }}
        }
    }

    #[test]
    fn index_is_an_integer_and_matches_the_threefold_formula(
        c in threefold(), k in prop::collection::vec(-6i64..=6, 4)
    ) {
        let g = Geometry::new(&c);
        let k = &k[..c.num_factors()];
        let hrr = g.index_hrr(k);
        prop_assert!(hrr.is_integer(), "chi = {} for k = {:?} on {}", hrr, k, c.label());
        prop_assert_eq!(hrr, g.index_threefold_formula(k).unwrap());
    }

    #[test]
    fn index_is_an_integer_in_every_dimension(c in cy_config(), k in prop::collection::vec(-4i64..=4, 4)) {
        let g = Geometry::new(&c);
        let k = &k[..c.num_factors()];
        prop_assert!(g.index_hrr(k).is_integer());
    }

    #[test]
    fn serre_duality_for_the_index(c in threefold(), k in prop::collection::vec(-5i64..=5, 4)) {
        // On a CY n-fold χ(L^*) = (−1)^n χ(L).
        let g = Geometry::new(&c);
        let k = &k[..c.num_factors()];
        let minus: Vec<i64> = k.iter().map(|x| -x).collect();
        prop_assert_eq!(g.index(&minus).unwrap(), -g.index(k).unwrap());
    }

    #[test]
    fn structure_sheaf_index_is_zero(c in threefold()) {
        let g = Geometry::new(&c);
        prop_assert_eq!(g.index(&vec![0; c.num_factors()]).unwrap(), BigInt::from(0));
    }
}
