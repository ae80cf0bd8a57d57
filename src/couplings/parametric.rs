//! Holomorphic Yukawa couplings as exact rational functions of one symbolic coefficient of the defining
//! polynomials (e.g. `psi`), by exact evaluation at rational sample points and rational interpolation.
//!
//! At each sample value `t` the polynomials are specialised exactly, the couplings are computed exactly over Q
//! by [`yukawa_tensor`], and every entry is reconstructed as `r(t)/s(t)` by [`rational_interpolate`] from the
//! first `N` usable points, then verified at `extra_checks` further points. The degree bound used is
//! `deg r + deg s ≤ N − 1`; it grows until every entry verifies or `max_points` is reached (then an error, never
//! a guess).
//!
//! Consistency of the basis: the exported `H^1` basis is an echelon basis of the `E_1` cocycles; its entries
//! are rational functions of the parameter as long as the elimination pivots do not move. Each point therefore
//! gets a signature (`h^1` of each bundle, and for each basis class its type and the support of its `E_1`
//! cocycle). Points whose signature differs from the generic one are skipped and reported: a different `h^1`
//! is a jump of the spectrum, an equal `h^1` with another support a change of pivots (or an accidental zero).
//! The generic signature is the one with the smallest `h^1` (cohomology is upper semi-continuous) and, among
//! those, the one met most often. A value where the specialised polynomials are not a valid equation or do not
//! cut out a complete intersection is reported as degenerate.
//!
//! Determinant-type loci: the denominators of the reconstructed entries are products of minors of the Koszul
//! differentials (the echelon basis divides by them). Their rational roots are located (rational root theorem,
//! small coefficients) and each is examined exactly: degenerate equations, a jump of `h^1`, or a change of basis
//! only. Denominators whose roots were not searched are reported as polynomials.
//!
//! Invariant of a [`ParametricYukawa`]: at every interpolation and check point, every entry evaluates to the
//! exact value computed there, and `values.len() = dims[0]·dims[1]·dims[2]` (row-major like [`YukawaTensor`]).

use super::value::{CouplingEngine, CouplingError, YukawaTensor};
use crate::arith::{RationalFunction, UniPoly, rational_interpolate, rational_roots};
use crate::cohomology::{CohomologyEngine, CohomologyError, PolynomialChoice};
use crate::geometry::Configuration;
use crate::poly::parametric::ParametricPolynomial;
use crate::poly::{Polynomial, VariableLayout};
use num_bigint::BigInt;
use num_integer::Integer;
use num_rational::BigRational;
use num_traits::Zero;
use serde::Serialize;
use std::collections::HashMap;
use std::sync::{Arc, Mutex};
use thiserror::Error;

/// Largest integer coefficient (after clearing denominators) at both ends of a denominator for which rational
/// roots are searched.
pub const ROOT_SEARCH_BOUND: u64 = 1_000_000;

/// Why a parametric computation was refused or failed.
#[derive(Debug, Error)]
#[non_exhaustive]
pub enum ParametricError {
    #[error("{count} parametric polynomials given for {expected} equations")]
    PolynomialCount { count: usize, expected: usize },
    #[error(transparent)]
    Coupling(#[from] CouplingError),
    #[error(transparent)]
    Cohomology(#[from] CohomologyError),
    #[error(
        "no consistent rational function of {parameter} with total degree below {points} points was found for every coupling (raise the point limit)"
    )]
    DegreeBoundExceeded { parameter: String, points: usize },
    #[error(
        "every one of the {tried} sample values of {parameter} was degenerate or special; no generic member found"
    )]
    NoGenericPoint { parameter: String, tried: usize },
}

/// Limits of the reconstruction.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ParametricOptions {
    /// Most sample values examined (usable or not).
    pub max_points: usize,
    /// Points beyond the interpolation points at which every entry must verify.
    pub extra_checks: usize,
}

impl Default for ParametricOptions {
    fn default() -> Self {
        ParametricOptions {
            max_points: 40,
            extra_checks: 3,
        }
    }
}

/// Why a sample value was not used.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum SpecialKind {
    /// The specialised polynomials are not valid equations or not a complete intersection.
    Degenerate { message: String },
    /// `h^1` of some bundle differs from its generic value (`h1` and `generic_h1` per slot).
    SpectrumJump {
        h1: [usize; 3],
        generic_h1: [usize; 3],
    },
    /// Same `h^1`, but the echelon basis has other pivots or support (the basis is not the generic one here).
    BasisChange,
    /// A root of a denominator where nothing above happens: the generic basis has a pole here only.
    PoleOnly,
}

/// A parameter value where something special happens.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct SpecialValue {
    /// The value, `"p/q"` or an integer.
    pub value: String,
    #[serde(flatten)]
    pub kind: SpecialKind,
    /// `"sample"` (met while sampling) or `"denominator_root"` (a rational root of a denominator).
    pub found_as: String,
}

/// The couplings of one bundle triple as rational functions of the parameter (see the module invariant).
#[derive(Clone, Debug, PartialEq)]
pub struct ParametricYukawa {
    pub parameter: String,
    pub bundles: [Vec<i64>; 3],
    /// Generic `h^1` of each slot.
    pub dims: [usize; 3],
    /// Generic types of the basis classes of each slot.
    pub types: [Vec<usize>; 3],
    /// Row-major `values[(i·dims[1] + j)·dims[2] + l]`.
    pub values: Vec<RationalFunction>,
    /// The degree bound used: every entry was sought with `deg num + deg den ≤ total_degree_bound`.
    pub total_degree_bound: usize,
    /// The largest numerator and denominator degrees found.
    pub max_degrees: (usize, usize),
    /// Values used for interpolation.
    pub interpolation_points: Vec<BigRational>,
    /// Further values at which every entry was verified.
    pub check_points: Vec<BigRational>,
    /// Special values met while sampling, and the rational roots of the denominators.
    pub special_values: Vec<SpecialValue>,
    /// Non-constant denominator factors whose roots were not searched (coefficients above
    /// [`ROOT_SEARCH_BOUND`]) or that have no rational root: their zeros are candidate special values.
    pub unlocated_denominators: Vec<UniPoly>,
}

impl ParametricYukawa {
    /// The tensor of the permuted triple, as [`YukawaTensor::permuted`] (slot `s` of the result is slot
    /// `perm[s]`; the sign of the permutation multiplies every function). The reconstruction data are kept.
    pub fn permuted(&self, perm: [usize; 3]) -> ParametricYukawa {
        let (dims, values) =
            super::value::permute_tensor(self.dims, &self.values, perm, RationalFunction::neg);
        ParametricYukawa {
            bundles: perm.map(|p| self.bundles[p].clone()),
            dims,
            types: perm.map(|p| self.types[p].clone()),
            values,
            parameter: self.parameter.clone(),
            total_degree_bound: self.total_degree_bound,
            max_degrees: self.max_degrees,
            interpolation_points: self.interpolation_points.clone(),
            check_points: self.check_points.clone(),
            special_values: self.special_values.clone(),
            unlocated_denominators: self.unlocated_denominators.clone(),
        }
    }

    /// The entry `λ(i, j, l)`. **Panics** when an index is out of range.
    pub fn get(&self, i: usize, j: usize, l: usize) -> &RationalFunction {
        assert!(i < self.dims[0] && j < self.dims[1] && l < self.dims[2]);
        &self.values[(i * self.dims[1] + j) * self.dims[2] + l]
    }
}

/// The `n`-th sample value: rationals by increasing height `max(|p|, q)`, `0, 1, −1, 2, −2, 1/2, −1/2, …`.
pub fn sample_value(n: usize) -> BigRational {
    let mut count = 0;
    if n == 0 {
        return BigRational::zero();
    }
    count += 1;
    for h in 1i64.. {
        let mut level = Vec::new();
        for q in 1..=h {
            for p in 0..=h {
                if p.max(q) == h && p.gcd(&q) == 1 && p != 0 {
                    level.push(BigRational::new(BigInt::from(p), BigInt::from(q)));
                }
            }
        }
        level.sort_by(|a, b| b.cmp(a)); // integers first
        for v in level {
            for s in [v.clone(), -v] {
                if count == n {
                    return s;
                }
                count += 1;
            }
        }
    }
    unreachable!()
}

/// The per-point signature used to detect basis changes.
#[derive(Clone, Debug, PartialEq, Eq)]
struct Signature {
    h1: [usize; 3],
    /// Per class: its type and the support (E_1 coordinates) of its echelon vector.
    classes: [Vec<(usize, Vec<usize>)>; 3],
}

enum PointResult {
    Degenerate(String),
    Computed(Signature, Box<YukawaTensor>),
}

fn specialise(
    config: &Configuration,
    polys: &[ParametricPolynomial],
    t: &BigRational,
) -> Result<Vec<Polynomial>, String> {
    let layout = VariableLayout::new(config.dims());
    let mut out = Vec::with_capacity(polys.len());
    for (j, (p, q)) in polys.iter().zip(config.equations()).enumerate() {
        let at = p.eval(t);
        at.check_equation(&layout, q)
            .map_err(|e| format!("equation {}: {e}", j + 1))?;
        out.push(at);
    }
    Ok(out)
}

/// The members of a family at its sample values, each built once (cohomology engine, coupling engine with its
/// lifted bases and normalisation) and shared by every tensor computed through the same [`FamilyMembers`].
///
/// Invariant: the member stored for `t` is the one of the polynomials specialised at `t` (or the reason that
/// specialisation is degenerate); failures other than degeneracy are returned and not stored.
pub struct FamilyMembers<'p> {
    config: &'p Configuration,
    polys: &'p [ParametricPolynomial],
    members: Mutex<HashMap<BigRational, Arc<Member>>>,
    /// The coupling engines' term limit ([`CouplingEngine::with_term_limit`]).
    term_limit: usize,
}

enum Member {
    Degenerate(String),
    Computed(CouplingEngine<'static>),
}

impl<'p> FamilyMembers<'p> {
    /// An empty cache for the family `polys` (one per equation of `config`).
    pub fn new(config: &'p Configuration, polys: &'p [ParametricPolynomial]) -> Self {
        FamilyMembers {
            config,
            polys,
            members: Mutex::new(HashMap::new()),
            term_limit: super::value::MAX_COCHAIN_TERMS,
        }
    }

    /// The same cache with every member's coupling engine limited to `limit` Čech–Koszul terms.
    pub fn with_term_limit(mut self, limit: usize) -> Self {
        self.term_limit = limit;
        self
    }

    /// Number of members built so far.
    pub fn len(&self) -> usize {
        self.members.lock().map_or(0, |m| m.len())
    }

    /// Whether no member was built yet.
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    fn member(&self, t: &BigRational) -> Result<Arc<Member>, ParametricError> {
        if let Some(hit) = self.members.lock().ok().and_then(|m| m.get(t).cloned()) {
            return Ok(hit);
        }
        let member = Arc::new(match specialise(self.config, self.polys, t) {
            Err(m) => Member::Degenerate(m),
            Ok(given) => Member::Computed(
                CouplingEngine::owning(CohomologyEngine::new(
                    self.config,
                    PolynomialChoice::Given(given),
                )?)
                .with_term_limit(self.term_limit),
            ),
        });
        if let Ok(mut m) = self.members.lock() {
            m.insert(t.clone(), member.clone());
        }
        Ok(member)
    }
}

fn evaluate(
    members: &FamilyMembers,
    bundles: [&[i64]; 3],
    t: &BigRational,
) -> Result<PointResult, ParametricError> {
    let member = members.member(t)?;
    let coupling = match member.as_ref() {
        Member::Degenerate(m) => return Ok(PointResult::Degenerate(m.clone())),
        Member::Computed(c) => c,
    };
    let degenerate = |e: &CohomologyError| {
        matches!(e, CohomologyError::NotCompleteIntersection { .. })
            .then(|| PointResult::Degenerate(e.to_string()))
    };
    let mut h1 = [0usize; 3];
    let mut classes: [Vec<_>; 3] = Default::default();
    for s in 0..3 {
        // A degenerate member shows up as hypercohomology outside degrees 0..=dim X.
        if let Err(e) = coupling.engine().cohomology(bundles[s]) {
            return degenerate(&e).ok_or_else(|| e.into());
        }
        let basis = match coupling.lifted_basis(bundles[s], 1) {
            Ok(b) => b,
            Err(CouplingError::Cohomology(e)) => {
                return degenerate(&e).ok_or_else(|| CouplingError::Cohomology(e).into());
            }
            Err(e) => return Err(e.into()),
        };
        h1[s] = basis.classes.len();
        classes[s] = basis
            .classes
            .iter()
            .map(|c| (c.class_type, c.vector.iter().map(|(i, _)| *i).collect()))
            .collect();
    }
    let tensor = match coupling.yukawa_tensor(bundles) {
        Ok(t) => t,
        Err(CouplingError::Cohomology(e)) => {
            return degenerate(&e).ok_or_else(|| CouplingError::Cohomology(e).into());
        }
        Err(e) => return Err(e.into()),
    };
    Ok(PointResult::Computed(
        Signature { h1, classes },
        Box::new(tensor),
    ))
}

/// Reconstruct one entry from `points` (interpolation on the first `n_interp`, verification on all).
fn reconstruct(points: &[(BigRational, BigRational)], n_interp: usize) -> Option<RationalFunction> {
    let first = &points[0].1;
    if points.iter().all(|(_, y)| y == first) {
        return Some(RationalFunction::constant(first.clone()));
    }
    let head = &points[..n_interp];
    (0..n_interp).find_map(|n| {
        rational_interpolate(head, n).filter(|f| {
            points[n_interp..]
                .iter()
                .all(|(x, y)| f.eval(x).as_ref() == Some(y))
        })
    })
}

struct Bucket {
    signature: Signature,
    points: Vec<(BigRational, YukawaTensor)>,
}

/// The couplings `λ(ν_1, ν_2, ν_3)` of the bundle triple (`k_1 + k_2 + k_3 = 0`) as exact rational functions
/// of the parameter of `polys` (one per equation, already checked against the declared multidegrees).
///
/// Cost: one exact coupling computation per sample value (at least `entries' degree + 1 + extra_checks`
/// values), plus one per rational denominator root. Errors: the coupling's own refusals (sizes, bundle sum),
/// [`ParametricError::DegreeBoundExceeded`] when `max_points` values do not suffice.
pub fn parametric_yukawa_tensor(
    config: &Configuration,
    parameter: &str,
    polys: &[ParametricPolynomial],
    bundles: [&[i64]; 3],
    options: &ParametricOptions,
) -> Result<ParametricYukawa, ParametricError> {
    parametric_yukawa_tensor_with(
        &FamilyMembers::new(config, polys),
        parameter,
        bundles,
        options,
    )
}

/// [`parametric_yukawa_tensor`] with the members taken from (and added to) `members`, so that several tensors
/// of one family share each sample value's engines, lifted bases and normalisation.
pub fn parametric_yukawa_tensor_with(
    members: &FamilyMembers,
    parameter: &str,
    bundles: [&[i64]; 3],
    options: &ParametricOptions,
) -> Result<ParametricYukawa, ParametricError> {
    let config = members.config;
    if members.polys.len() != config.codimension() {
        return Err(ParametricError::PolynomialCount {
            count: members.polys.len(),
            expected: config.codimension(),
        });
    }
    let mut buckets: Vec<Bucket> = Vec::new();
    let mut sampled: Vec<(BigRational, Option<Signature>, Option<String>)> = Vec::new();
    let extra = options.extra_checks.max(1);
    let mut next_try = 2 + extra;
    for n in 0..options.max_points {
        let t = sample_value(n);
        match evaluate(members, bundles, &t)? {
            PointResult::Degenerate(m) => sampled.push((t, None, Some(m))),
            PointResult::Computed(sig, tensor) => {
                sampled.push((t.clone(), Some(sig.clone()), None));
                match buckets.iter_mut().find(|b| b.signature == sig) {
                    Some(b) => b.points.push((t, *tensor)),
                    None => buckets.push(Bucket {
                        signature: sig,
                        points: vec![(t, *tensor)],
                    }),
                }
            }
        }
        let Some(generic) = generic_bucket(&buckets) else {
            continue;
        };
        let b = &buckets[generic];
        if b.points.len() < next_try {
            continue;
        }
        next_try = b.points.len() + 2;
        if let Some(result) = try_reconstruct(parameter, bundles, b, extra) {
            return Ok(finish(
                members,
                bundles,
                result,
                &buckets[generic],
                &sampled,
            ));
        }
    }
    if buckets.is_empty() {
        return Err(ParametricError::NoGenericPoint {
            parameter: parameter.to_string(),
            tried: options.max_points,
        });
    }
    Err(ParametricError::DegreeBoundExceeded {
        parameter: parameter.to_string(),
        points: options.max_points,
    })
}

/// Smallest `h^1` (sum), then most points.
fn generic_bucket(buckets: &[Bucket]) -> Option<usize> {
    (0..buckets.len()).min_by_key(|&i| {
        let b = &buckets[i];
        (
            b.signature.h1.iter().sum::<usize>(),
            std::cmp::Reverse(b.points.len()),
        )
    })
}

fn try_reconstruct(
    parameter: &str,
    bundles: [&[i64]; 3],
    b: &Bucket,
    extra: usize,
) -> Option<ParametricYukawa> {
    let m = b.points.len();
    let n_interp = m - extra;
    let first = &b.points[0].1;
    let count = first.values.len();
    let mut values = Vec::with_capacity(count);
    for e in 0..count {
        let pts: Vec<(BigRational, BigRational)> = b
            .points
            .iter()
            .map(|(t, tensor)| (t.clone(), tensor.values[e].clone()))
            .collect();
        values.push(reconstruct(&pts, n_interp)?);
    }
    let max_degrees = values.iter().fold((0, 0), |acc, f| {
        let (a, d) = f.degrees();
        (acc.0.max(a), acc.1.max(d))
    });
    Some(ParametricYukawa {
        parameter: parameter.to_string(),
        bundles: [
            bundles[0].to_vec(),
            bundles[1].to_vec(),
            bundles[2].to_vec(),
        ],
        dims: first.dims,
        types: first.types.clone(),
        values,
        total_degree_bound: n_interp - 1,
        max_degrees,
        interpolation_points: b.points[..n_interp].iter().map(|p| p.0.clone()).collect(),
        check_points: b.points[n_interp..].iter().map(|p| p.0.clone()).collect(),
        special_values: Vec::new(),
        unlocated_denominators: Vec::new(),
    })
}

fn classify(
    generic: &Signature,
    here: Option<&Signature>,
    degenerate: Option<&String>,
) -> Option<SpecialKind> {
    if let Some(m) = degenerate {
        return Some(SpecialKind::Degenerate { message: m.clone() });
    }
    let here = here?;
    if here.h1 != generic.h1 {
        Some(SpecialKind::SpectrumJump {
            h1: here.h1,
            generic_h1: generic.h1,
        })
    } else if here != generic {
        Some(SpecialKind::BasisChange)
    } else {
        None
    }
}

fn finish(
    members: &FamilyMembers,
    bundles: [&[i64]; 3],
    mut result: ParametricYukawa,
    generic: &Bucket,
    sampled: &[(BigRational, Option<Signature>, Option<String>)],
) -> ParametricYukawa {
    let g = &generic.signature;
    for (t, sig, deg) in sampled {
        if let Some(kind) = classify(g, sig.as_ref(), deg.as_ref()) {
            result.special_values.push(SpecialValue {
                value: t.to_string(),
                kind,
                found_as: "sample".into(),
            });
        }
    }
    // Denominator roots.
    let mut dens: Vec<UniPoly> = Vec::new();
    for f in &result.values {
        let d = f.denominator();
        if d.degree().unwrap_or(0) > 0 && !dens.contains(d) {
            dens.push(d.clone());
        }
    }
    let mut roots: Vec<BigRational> = Vec::new();
    for d in dens {
        match rational_roots(&d, ROOT_SEARCH_BOUND) {
            Some(rs) => {
                let mut rest = d.clone();
                for r in &rs {
                    let lin = UniPoly::new(vec![-r.clone(), num_traits::One::one()]);
                    loop {
                        let (q, rem) = rest.div_rem(&lin);
                        if !rem.is_zero() {
                            break;
                        }
                        rest = q;
                    }
                    if !roots.contains(r) {
                        roots.push(r.clone());
                    }
                }
                if rest.degree().unwrap_or(0) > 0 && !result.unlocated_denominators.contains(&rest)
                {
                    result.unlocated_denominators.push(rest.monic());
                }
            }
            None => {
                if !result.unlocated_denominators.contains(&d) {
                    result.unlocated_denominators.push(d);
                }
            }
        }
    }
    roots.sort();
    for r in roots {
        if sampled.iter().any(|(t, _, _)| t == &r) {
            continue; // already classified as a sample
        }
        let kind = match evaluate(members, bundles, &r) {
            Ok(PointResult::Degenerate(m)) => SpecialKind::Degenerate { message: m },
            Ok(PointResult::Computed(sig, _)) => {
                classify(g, Some(&sig), None).unwrap_or(SpecialKind::PoleOnly)
            }
            Err(e) => SpecialKind::Degenerate {
                message: e.to_string(),
            },
        };
        result.special_values.push(SpecialValue {
            value: r.to_string(),
            kind,
            found_as: "denominator_root".into(),
        });
    }
    result
        .special_values
        .sort_by_key(|s| s.value.parse::<BigRational>().ok());
    result
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sample_values_are_distinct_small_rationals() {
        let v: Vec<BigRational> = (0..30).map(sample_value).collect();
        assert_eq!(v[0], BigRational::zero());
        assert_eq!(v[1], BigRational::from_integer(1.into()));
        assert_eq!(v[2], BigRational::from_integer((-1).into()));
        for i in 0..v.len() {
            for j in 0..i {
                assert_ne!(v[i], v[j]);
            }
        }
    }
}
