//! Exact certification of whether the slope-zero locus of a sum of line
//! bundles meets the Kähler cone, plus an SVG picture of the answer.
//!
//! Set-up. `X` is a Calabi-Yau threefold with `h^{1,1} = m` whose Kähler
//! classes are all pulled back from the ambient product of projective spaces
//! (the *favourable* assumption), so the Kähler cone is the open positive
//! orthant `t^i > 0`, `i = 1..m`. The triple intersection numbers `d_{rst}`
//! (symmetric) define, for a line bundle `L = O(k)` with `k ∈ Z^m`, the slope
//!
//! ```text
//! μ_k(t) = Σ_{r,s,u} d_{rsu} k^r t^s t^u = tᵀ M_k t,   (M_k)_{su} = Σ_r k^r d_{rsu}.
//! ```
//!
//! `μ_k` is a homogeneous quadratic form, so only rays matter. For bundles
//! `k_1..k_r` the question answered here is: *is there `t > 0` with
//! `μ_{k_a}(t) = 0` for every `a`?* Every answer carries a certificate that
//! [`verify_certificate`] re-checks in exact rational arithmetic.
//!
//! Invariant kept by the whole module: floating point numbers are only used
//! to *propose* candidates (Newton iterations, preconditioners, drawing);
//! every `Exists` / `None` verdict rests on exact `BigRational` / `BigInt`
//! computations. When the exact test cannot settle the question the answer
//! is [`SlopeZero::Undecided`], never a guess. No function panics on user data.
//!
//! # JSON shape
//!
//! [`SlopeZero`] serialises (serde) as follows; rationals are strings
//! `"p/q"` (or `"p"`), bundle and coordinate indices are **1-based**:
//!
//! ```text
//! {"status":"exists","certificate":{"kind":"rational_point","point":["1","1","1","1"]}}
//! {"status":"exists","certificate":{"kind":"krawczyk_box",
//!     "box":[["lo","hi"],...],            // one interval per free coordinate, in `free` order
//!     "free":[1,3],                        // coordinates solved for
//!     "fixed":[{"coordinate":2,"value":"1/3"},...],  // coordinates pinned to rationals
//!     "equations":[1,2],                   // bundles whose slopes form the square system
//!     "preconditioner":[["p/q",...],...]}} // the matrix Y of the Krawczyk operator
//! {"status":"none","certificate":{"kind":"sign_obstruction","bundle":2,"sign":"positive"}}
//! {"status":"none","certificate":{"kind":"combination_obstruction",
//!     "combination":[{"bundle":1,"coeff":"1"},{"bundle":2,"coeff":"-3"}]}}
//! {"status":"none","certificate":{"kind":"subdivision","boxes":[
//!     {"chart":1,"box":[["1","1"],["0","1/2"],...],"combination":[{"bundle":1,"coeff":"1"}]},...]}}
//! {"status":"undecided","reason":"..."}
//! ```
//!
//! For `krawczyk_box`, the bundles not listed in `equations` have slope
//! forms that are exact rational linear combinations of the listed ones
//! (checked exactly by the verifier), so they vanish wherever the listed
//! ones do. For `subdivision`, chart `j` is the face `t^j = 1`,
//! `0 <= t^i <= 1` of the cube; every ray of the open cone meets the chart of
//! its largest coordinate, and each listed box carries a combination
//! `Σ c_a μ_a` proven strictly positive on the box ∩ open cone.

mod certify;
mod interval;
mod plot;
#[cfg(test)]
mod tests;
mod verify;

pub use interval::Interval;
pub use plot::plot_kahler_cone_svg;

use num_bigint::BigInt;
use num_rational::BigRational;
use serde::ser::SerializeMap;
use serde::{Serialize, Serializer};
use std::fmt;

/// Tuning knobs for [`certify_slope_zero`]. All searches are deterministic
/// functions of these options.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SlopeOptions {
    /// Maximal number of boxes (leaves plus pending) in the exclusion
    /// subdivision; when exceeded the answer is `Undecided`.
    pub max_boxes: usize,
    /// Seed of the internal pseudo-random generator (start points, rational
    /// directions). Same seed, same input ⇒ same answer.
    pub seed: u64,
    /// Number of random start points for the floating Newton search.
    pub newton_starts: usize,
    /// Number of small positive integer points tried exactly before Newton.
    pub grid_points: usize,
}

impl Default for SlopeOptions {
    fn default() -> Self {
        SlopeOptions {
            max_boxes: 20_000,
            seed: 0x5eed_51de,
            newton_starts: 48,
            grid_points: 2_000,
        }
    }
}

/// Which side of zero a slope (combination) is proven to be on.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Sign {
    /// `μ > 0` on the whole open cone.
    Positive,
    /// `μ < 0` on the whole open cone.
    Negative,
}

/// Certificate that a common zero exists in the open Kähler cone.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum ExistsCertificate {
    /// An exact point `t` with all `t^i > 0` and `μ_a(t) = 0` for every `a`.
    RationalPoint {
        /// The point (length `m`).
        #[serde(serialize_with = "ser_rats")]
        point: Vec<BigRational>,
    },
    /// A box proven by the Krawczyk test to contain a zero of the square
    /// system `μ_e(t) = 0, e ∈ equations`, where `t^i` is pinned to a positive
    /// rational for `i` in `fixed` and ranges over `bx` for `i` in `free`.
    /// Indices are 0-based in Rust, 1-based in JSON.
    KrawczykBox {
        /// One interval per free coordinate, strictly positive.
        #[serde(rename = "box")]
        bx: Vec<Interval>,
        /// Free coordinates (0-based), same order as `bx`.
        #[serde(serialize_with = "ser_idx")]
        free: Vec<usize>,
        /// Pinned coordinates (0-based index, positive value).
        #[serde(serialize_with = "ser_fixed")]
        fixed: Vec<(usize, BigRational)>,
        /// Bundles (0-based) whose slopes form the square system.
        #[serde(serialize_with = "ser_idx")]
        equations: Vec<usize>,
        /// Rational preconditioner `Y ≈ J(mid)^{-1}` (`q × q`).
        #[serde(serialize_with = "ser_mat")]
        preconditioner: Vec<Vec<BigRational>>,
    },
}

/// One term `coeff · μ_bundle` of a slope combination (0-based bundle in Rust,
/// 1-based in JSON).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Term {
    /// Bundle index.
    #[serde(serialize_with = "ser_one")]
    pub bundle: usize,
    /// Rational coefficient.
    #[serde(serialize_with = "ser_rat")]
    pub coeff: BigRational,
}

/// A box of a chart on which a slope combination is proven `> 0` at every
/// point with all coordinates positive.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ExcludedBox {
    /// Chart `j` (0-based in Rust, 1-based in JSON): the face `t^j = 1`.
    #[serde(serialize_with = "ser_one")]
    pub chart: usize,
    /// One interval per coordinate; coordinate `chart` is `[1, 1]`.
    #[serde(rename = "box")]
    pub bx: Vec<Interval>,
    /// The combination `Σ coeff · μ_bundle` that is positive on the box.
    pub combination: Vec<Term>,
}

/// Certificate that no common zero exists in the open Kähler cone.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum NoneCertificate {
    /// `M_bundle` (or `-M_bundle` for `Negative`) is entrywise `>= 0` and
    /// non-zero, hence `μ_bundle` has constant strict sign on `t > 0`.
    SignObstruction {
        /// Bundle index (0-based in Rust, 1-based in JSON).
        #[serde(serialize_with = "ser_one")]
        bundle: usize,
        /// The sign of `μ_bundle` on the open cone.
        sign: Sign,
    },
    /// `Σ_a coeff_a M_a` is entrywise `>= 0` and non-zero, so the combination
    /// `Σ_a coeff_a μ_a` is strictly positive on `t > 0`; a common zero would
    /// make it vanish.
    CombinationObstruction {
        /// The terms of the combination.
        combination: Vec<Term>,
    },
    /// The charts are covered by boxes, produced by the deterministic
    /// bisection described on [`verify_certificate`], each excluded by a
    /// combination of slopes. Boxes are listed in depth-first order.
    Subdivision {
        /// Leaves of the bisection tree, depth-first, chart by chart.
        boxes: Vec<ExcludedBox>,
    },
}

/// Outcome of [`certify_slope_zero`].
#[derive(Clone, Debug, PartialEq)]
pub enum SlopeZero {
    /// A common zero of all slopes exists in the open Kähler cone.
    Exists(ExistsCertificate),
    /// No common zero exists in the open Kähler cone.
    None(NoneCertificate),
    /// The exact tests could not settle the question.
    Undecided {
        /// Human-readable explanation (budget, degenerate system, …).
        reason: String,
    },
}

impl SlopeZero {
    /// `"exists"`, `"none"` or `"undecided"`.
    pub fn status(&self) -> &'static str {
        match self {
            SlopeZero::Exists(_) => "exists",
            SlopeZero::None(_) => "none",
            SlopeZero::Undecided { .. } => "undecided",
        }
    }
}

impl Serialize for SlopeZero {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        let mut map = s.serialize_map(Some(2))?;
        map.serialize_entry("status", self.status())?;
        match self {
            SlopeZero::Exists(c) => map.serialize_entry("certificate", c)?,
            SlopeZero::None(c) => map.serialize_entry("certificate", c)?,
            SlopeZero::Undecided { reason } => map.serialize_entry("reason", reason)?,
        }
        map.end()
    }
}

/// Malformed input to [`certify_slope_zero`] / [`slope_exact`].
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum SlopeError {
    /// `m = 0`: no Kähler parameters.
    EmptyIntersection,
    /// The triple intersection array is not `m × m × m`.
    NotCubic {
        /// Expected side length `m`.
        expected: usize,
    },
    /// `d_{rst}` differs from one of its permutations (0-based indices).
    Asymmetric {
        /// Index triple where symmetry fails.
        at: (usize, usize, usize),
    },
    /// No bundles were given.
    NoBundles,
    /// A bundle (0-based index) does not have `m` entries.
    BundleLength {
        /// Bundle index.
        bundle: usize,
        /// Expected length `m`.
        expected: usize,
        /// Actual length.
        found: usize,
    },
    /// A point given to [`slope_exact`] has the wrong length.
    PointLength {
        /// Expected length `m`.
        expected: usize,
        /// Actual length.
        found: usize,
    },
}

impl fmt::Display for SlopeError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            SlopeError::EmptyIntersection => write!(f, "intersection numbers are empty (m = 0)"),
            SlopeError::NotCubic { expected } => {
                write!(
                    f,
                    "intersection numbers must form a {expected}×{expected}×{expected} array"
                )
            }
            SlopeError::Asymmetric { at: (r, s, t) } => write!(
                f,
                "intersection numbers are not symmetric at ({}, {}, {})",
                r + 1,
                s + 1,
                t + 1
            ),
            SlopeError::NoBundles => write!(f, "no line bundles given"),
            SlopeError::BundleLength {
                bundle,
                expected,
                found,
            } => write!(
                f,
                "bundle {} has {found} entries, expected {expected}",
                bundle + 1
            ),
            SlopeError::PointLength { expected, found } => {
                write!(f, "point has {found} coordinates, expected {expected}")
            }
        }
    }
}

impl std::error::Error for SlopeError {}

/// Decides whether `μ_a(t) = 0` for all `a` has a solution with all `t^i > 0`.
///
/// Preconditions: `triple` is a symmetric `m × m × m` array (`m >= 1`),
/// every bundle has `m` entries, at least one bundle. Favourable assumption:
/// the Kähler cone is the open positive orthant.
///
/// Strategy, cheapest first:
/// 1. sign obstruction: some `±M_a` entrywise `>= 0` and non-zero; then the
///    same for a combination `Σ λ_a M_a` (candidate `λ` vanish on `q - 1`
///    matrix entries, `q` = dimension of the span of the `M_a`);
/// 2. exact evaluation at `grid_points` small primitive positive integer points;
/// 3. damped Gauss–Newton in floats (in `t`, and in `log t` for zeros close
///    to the boundary) from `newton_starts` deterministic starts; for each
///    approximate zero: small-denominator rounding checked exactly; if
///    `q = 1`, the rational-line construction (a rational line through a
///    rational zero `P` of the quadric meets it again at the rational
///    parameter `s = -2B(P,v)/Q(v)`; aim `v` at the approximate zero); then a
///    Krawczyk test in exact rational interval arithmetic on the square
///    system formed by a basis of the span (`equations`), solving for the `q`
///    coordinates chosen by pivoting on the Jacobian (`free`) with the other
///    `m - q` pinned to positive rationals (`fixed`); needs `q <= m - 1`;
/// 4. exclusion by bisection of the charts `t^j = 1`, `0 <= t^i <= 1`, each
///    box excluded by a slope (or combination) positive on box ∩ open cone;
///    if a box cannot be excluded, Newton is re-run from points just inside
///    the cone near that box (a branch of zeros may leave a boundary zero).
///
/// Cost: `O(r m^2)` big-rational operations per evaluated point or box;
/// dominated by at most `grid_points + max_boxes` such evaluations plus
/// `newton_starts` small float solves (`O(m^3)` each iteration); typically
/// 1–60 ms for `m = 4`, `r = 5` (release build).
///
/// Errors: [`SlopeError`] for malformed input only; an unsettled question is
/// `Ok(SlopeZero::Undecided { .. })`.
pub fn certify_slope_zero(
    triple: &[Vec<Vec<i64>>],
    bundles: &[Vec<i64>],
    opts: &SlopeOptions,
) -> Result<SlopeZero, SlopeError> {
    let sys = certify::System::new(triple, bundles)?;
    Ok(sys.certify(opts))
}

/// The cheap exact obstructions alone: a slope `μ_a` of constant strict sign on the open cone, else a
/// combination `Σ λ_a μ_a` of constant strict sign (the first step of [`certify_slope_zero`]). `Some` is a
/// proof that no common zero exists; `None` decides nothing. Same preconditions and errors as
/// [`certify_slope_zero`]; cost `O(r m^2)` plus the bounded vertex search of the combination step.
pub fn slope_obstruction(
    triple: &[Vec<Vec<i64>>],
    bundles: &[Vec<i64>],
) -> Result<Option<NoneCertificate>, SlopeError> {
    let sys = certify::System::new(triple, bundles)?;
    Ok(sys.obstruction())
}

/// Independently re-checks a result in exact arithmetic.
///
/// * `rational_point`: all coordinates `> 0`, every `μ_a(t) == 0`.
/// * `krawczyk_box`: `free`/`fixed` partition the coordinates, pinned values
///   and box are strictly positive, the slope forms of all bundles lie in the
///   rational span of those in `equations` (exact rank), and the Krawczyk
///   image `K(X) = c − Y F(c) + (I − Y J(X))(X − c)` (with `c` the box
///   midpoint) lies in the interior of `X`.
/// * `sign_obstruction`: `±M_bundle` is entrywise `>= 0` and non-zero.
/// * `combination_obstruction`: `Σ coeff_a M_a` is entrywise `>= 0` and non-zero.
/// * `subdivision`: replays the bisection (per chart in order `1..m`, start
///   from `[0,1]` in every coordinate but the chart's, split the widest
///   coordinate — lowest index on ties — at its midpoint, lower half first)
///   and checks that the listed leaves are exactly the leaves of that tree
///   and that each leaf's combination is positive on the leaf ∩ open cone.
/// * `undecided`: always `false` (nothing is certified).
///
/// Returns `false` on malformed input. Cost: linear in the certificate size
/// times `O(r m^2)` big-rational operations.
pub fn verify_certificate(
    triple: &[Vec<Vec<i64>>],
    bundles: &[Vec<i64>],
    result: &SlopeZero,
) -> bool {
    verify::verify(triple, bundles, result)
}

/// Exact slope `μ_k(t) = Σ_{r,s,u} d_{rsu} k^r t^s t^u`.
///
/// `triple` must be `m × m × m` and `k`, `t` of length `m`; malformed shapes are a [`SlopeError`] (never a
/// slope of 0, which would read as "vanishes"). Same as [`try_slope_exact`]. Cost: `O(m^3)` big-rational
/// operations.
pub fn slope_exact(
    triple: &[Vec<Vec<i64>>],
    k: &[i64],
    t: &[BigRational],
) -> Result<BigRational, SlopeError> {
    try_slope_exact(triple, k, t)
}

/// The exact slope, with malformed shapes reported as a [`SlopeError`].
/// Check that `triple` is a non-empty `m × m × m` array and return `m`.
pub(super) fn check_cubic(triple: &[Vec<Vec<i64>>]) -> Result<usize, SlopeError> {
    let m = triple.len();
    if m == 0 {
        return Err(SlopeError::EmptyIntersection);
    }
    if triple
        .iter()
        .any(|p| p.len() != m || p.iter().any(|row| row.len() != m))
    {
        return Err(SlopeError::NotCubic { expected: m });
    }
    Ok(m)
}

/// Does not require symmetry of `triple`. Cost: `O(m^3)`.
pub fn try_slope_exact(
    triple: &[Vec<Vec<i64>>],
    k: &[i64],
    t: &[BigRational],
) -> Result<BigRational, SlopeError> {
    let m = check_cubic(triple)?;
    if k.len() != m {
        return Err(SlopeError::BundleLength {
            bundle: 0,
            expected: m,
            found: k.len(),
        });
    }
    if t.len() != m {
        return Err(SlopeError::PointLength {
            expected: m,
            found: t.len(),
        });
    }
    let mut acc = BigRational::from_integer(BigInt::from(0));
    for r in 0..m {
        if k[r] == 0 {
            continue;
        }
        for s in 0..m {
            for u in 0..m {
                let c = triple[r][s][u];
                if c != 0 {
                    let coef = BigRational::from_integer(BigInt::from(c) * BigInt::from(k[r]));
                    acc += coef * &t[s] * &t[u];
                }
            }
        }
    }
    Ok(acc)
}

fn ser_rat<S: Serializer>(x: &BigRational, s: S) -> Result<S::Ok, S::Error> {
    s.serialize_str(&x.to_string())
}

fn ser_rats<S: Serializer>(x: &[BigRational], s: S) -> Result<S::Ok, S::Error> {
    let v: Vec<String> = x.iter().map(|q| q.to_string()).collect();
    v.serialize(s)
}

fn ser_mat<S: Serializer>(x: &[Vec<BigRational>], s: S) -> Result<S::Ok, S::Error> {
    let v: Vec<Vec<String>> = x
        .iter()
        .map(|row| row.iter().map(|q| q.to_string()).collect())
        .collect();
    v.serialize(s)
}

fn ser_one<S: Serializer>(x: &usize, s: S) -> Result<S::Ok, S::Error> {
    s.serialize_u64((*x as u64).saturating_add(1))
}

fn ser_idx<S: Serializer>(x: &[usize], s: S) -> Result<S::Ok, S::Error> {
    let v: Vec<usize> = x.iter().map(|i| i.saturating_add(1)).collect();
    v.serialize(s)
}

#[derive(Serialize)]
struct FixedOut {
    coordinate: usize,
    value: String,
}

fn ser_fixed<S: Serializer>(x: &[(usize, BigRational)], s: S) -> Result<S::Ok, S::Error> {
    let v: Vec<FixedOut> = x
        .iter()
        .map(|(i, q)| FixedOut {
            coordinate: i.saturating_add(1),
            value: q.to_string(),
        })
        .collect();
    v.serialize(s)
}
