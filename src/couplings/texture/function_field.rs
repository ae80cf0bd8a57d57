//! Ranks and exact relations of a texture whose values are rational functions of one parameter, over the field
//! `Q(parameter)`.
//!
//! Rank: Gaussian elimination over the field `Q(t)` with every entry a [`RationalFunction`] in lowest terms
//! (exact: each step is a field operation, and a pivot is taken only when it is not the zero function). This is
//! the rank of the generic member; at finitely many values of `t` the rank of the specialised matrix is smaller.
//!
//! Relations: [`FunctionField`] is the field `Q(t)` for the generic search of [`super::relations`]: entries
//! proportional by a rational constant (equal, opposite or `proportional`, each linked to the first entry with
//! the same function up to a constant factor), and rows/columns that are zero, or proportional by a rational
//! function (`factor_depends_on_parameter`) or a rational constant.
//!
//! Invariant: every relation is exact (`second = factor · first` in `Q(t)`).

use super::Entry;
use super::relations::{RelationField, constant_kind};
use crate::arith::RationalFunction;
use num_rational::BigRational;
use num_traits::{One, Zero};

/// Exact rank over `Q(t)` of a dense matrix of rational functions (module documentation).
pub fn exact_rank_over_functions(m: &[Vec<RationalFunction>]) -> usize {
    let mut rows: Vec<Vec<RationalFunction>> = m.to_vec();
    let nc = rows.first().map_or(0, Vec::len);
    let mut rank = 0;
    for c in 0..nc {
        let Some(p) = (rank..rows.len()).find(|&r| !rows[r][c].is_zero()) else {
            continue;
        };
        rows.swap(rank, p);
        let pivot = rows[rank][c].clone();
        for r in rank + 1..rows.len() {
            if rows[r][c].is_zero() {
                continue;
            }
            let f = rows[r][c].div(&pivot).expect("the pivot is non-zero");
            for j in c..nc {
                if rows[rank][j].is_zero() {
                    continue;
                }
                let t = rows[rank][j].mul(&f);
                rows[r][j] = rows[r][j].sub(&t);
            }
        }
        rank += 1;
    }
    rank
}

/// The parameter name of the first rational-function value of `entries`.
pub(super) fn parameter_of(entries: &[Entry]) -> Option<&str> {
    entries.iter().find_map(|e| match &e.value {
        Some(super::CouplingValue::RationalFunction { parameter, .. }) => Some(parameter.as_str()),
        _ => None,
    })
}

/// The field `Q(parameter)` for the generic relation search of [`super::relations`]; the name is used to write
/// factors that depend on the parameter.
pub(super) struct FunctionField<'a> {
    parameter: &'a str,
}

impl<'a> FunctionField<'a> {
    /// The field of rational functions in the parameter called `parameter`.
    pub(super) fn new(parameter: &'a str) -> Self {
        FunctionField { parameter }
    }
}

impl RelationField for FunctionField<'_> {
    type Elem = RationalFunction;
    fn known(&self, e: &Entry) -> Option<RationalFunction> {
        if !e.status.is_known() {
            return None;
        }
        match &e.value {
            None => Some(RationalFunction::constant(BigRational::zero())),
            Some(v) => v.to_function(),
        }
    }
    fn is_zero(&self, x: &RationalFunction) -> bool {
        x.is_zero()
    }
    /// The function divided by its numerator's leading coefficient, and that coefficient.
    fn up_to_constant(&self, f: &RationalFunction) -> (RationalFunction, BigRational) {
        let lead = f.numerator().leading();
        let unit = RationalFunction::new(
            f.numerator().scale(&(BigRational::one() / &lead)),
            f.denominator().clone(),
        )
        .expect("a monic denominator is non-zero");
        (unit, lead)
    }
    fn mul(&self, a: &RationalFunction, b: &RationalFunction) -> RationalFunction {
        a.mul(b)
    }
    fn div(&self, a: &RationalFunction, b: &RationalFunction) -> Option<RationalFunction> {
        a.div(b)
    }
    /// A constant factor is written and classified as a rational; any other is `proportional`, written in the
    /// parameter.
    fn describe(&self, f: &RationalFunction) -> (&'static str, String, bool) {
        let constant = f.as_constant();
        (
            constant.as_ref().map_or("proportional", constant_kind),
            f.to_text(self.parameter),
            constant.is_none(),
        )
    }
    fn rank(&self, m: &[Vec<RationalFunction>]) -> usize {
        exact_rank_over_functions(m)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::arith::UniPoly;

    fn f(num: &[i64], den: &[i64]) -> RationalFunction {
        RationalFunction::new(UniPoly::from_ints(num), UniPoly::from_ints(den)).unwrap()
    }

    fn q(n: i64) -> BigRational {
        BigRational::from_integer(n.into())
    }

    /// Rank over Q(t) against specialisations: the generic rank is the largest rank of M(t0) over rational t0,
    /// attained outside finitely many values (the zeros of the non-zero minors), so at a few unrelated values the
    /// rank over Q of the specialised matrix must equal it, and at a root of the determinant it must drop.
    #[test]
    fn rank_over_functions_is_the_generic_rank_of_the_specialisations() {
        let zero = f(&[], &[1]);
        // [[t, 1], [1, 1/t]] has determinant 0 over Q(t): rank 1, although no entry is zero.
        let singular = vec![
            vec![f(&[0, 1], &[1]), f(&[1], &[1])],
            vec![f(&[1], &[1]), f(&[1], &[0, 1])],
        ];
        assert_eq!(exact_rank_over_functions(&singular), 1);
        // [[t, 1, 0], [1, t, 0], [0, 0, 1/(t+2)]]: determinant (t^2 − 1)/(t + 2), rank 3, rank 2 at t = ±1.
        let m = vec![
            vec![f(&[0, 1], &[1]), f(&[1], &[1]), zero.clone()],
            vec![f(&[1], &[1]), f(&[0, 1], &[1]), zero.clone()],
            vec![zero.clone(), zero.clone(), f(&[1], &[2, 1])],
        ];
        assert_eq!(exact_rank_over_functions(&m), 3);
        let specialise = |t: &BigRational| -> Vec<Vec<BigRational>> {
            m.iter()
                .map(|row| row.iter().map(|x| x.eval(t).unwrap()).collect())
                .collect()
        };
        for t in [q(3), q(-7), BigRational::new(5.into(), 3.into())] {
            assert_eq!(super::super::exact_rank(&specialise(&t)), 3);
        }
        assert_eq!(super::super::exact_rank(&specialise(&q(1))), 2);
        assert_eq!(super::super::exact_rank(&specialise(&q(-1))), 2);
    }
}
