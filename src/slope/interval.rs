//! Closed intervals `[lo, hi]` with exact `BigRational` end points.
//!
//! Invariant: every `Interval` value satisfies `lo <= hi`; all operations
//! return enclosures that contain every value the operation can take on its
//! arguments (inclusion isotonicity), with no rounding at all, because the
//! end points are exact rationals. These intervals are used to decide
//! yes/no questions (Krawczyk containment, sign exclusion), so no floating
//! point value ever enters them.

use num_rational::BigRational;
use num_traits::{Signed, Zero};
use serde::{Serialize, Serializer};
use std::fmt;

/// A closed rational interval `[lo, hi]` with `lo <= hi`.
///
/// Cost: every operation is a constant number of `BigRational` operations.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Interval {
    lo: BigRational,
    hi: BigRational,
}

impl Interval {
    /// Builds `[lo, hi]`; returns `None` when `lo > hi`.
    pub fn new(lo: BigRational, hi: BigRational) -> Option<Interval> {
        if lo <= hi {
            Some(Interval { lo, hi })
        } else {
            None
        }
    }

    /// The degenerate interval `[x, x]`.
    pub fn point(x: BigRational) -> Interval {
        Interval {
            lo: x.clone(),
            hi: x,
        }
    }

    /// Lower end point.
    pub fn lo(&self) -> &BigRational {
        &self.lo
    }

    /// Upper end point.
    pub fn hi(&self) -> &BigRational {
        &self.hi
    }

    /// Width `hi - lo` (exact, non-negative).
    pub fn width(&self) -> BigRational {
        &self.hi - &self.lo
    }

    /// Midpoint `(lo + hi) / 2` (exact).
    pub fn mid(&self) -> BigRational {
        (&self.lo + &self.hi) / BigRational::from_integer(2.into())
    }

    /// `[lo+o.lo, hi+o.hi]`.
    pub fn add(&self, o: &Interval) -> Interval {
        Interval {
            lo: &self.lo + &o.lo,
            hi: &self.hi + &o.hi,
        }
    }

    /// `[lo-o.hi, hi-o.lo]`.
    pub fn sub(&self, o: &Interval) -> Interval {
        Interval {
            lo: &self.lo - &o.hi,
            hi: &self.hi - &o.lo,
        }
    }

    /// Product: min and max of the four end-point products.
    pub fn mul(&self, o: &Interval) -> Interval {
        let p = [
            &self.lo * &o.lo,
            &self.lo * &o.hi,
            &self.hi * &o.lo,
            &self.hi * &o.hi,
        ];
        let mut lo = p[0].clone();
        let mut hi = p[0].clone();
        for v in &p[1..] {
            if *v < lo {
                lo = v.clone();
            }
            if *v > hi {
                hi = v.clone();
            }
        }
        Interval { lo, hi }
    }

    /// Multiplication by an exact scalar `c` (end points swap when `c < 0`).
    pub fn scale(&self, c: &BigRational) -> Interval {
        let a = &self.lo * c;
        let b = &self.hi * c;
        if c.is_negative() {
            Interval { lo: b, hi: a }
        } else {
            Interval { lo: a, hi: b }
        }
    }

    /// True when `self` lies in the open interior of `o`: `o.lo < lo` and `hi < o.hi`.
    pub fn strictly_inside(&self, o: &Interval) -> bool {
        o.lo < self.lo && self.hi < o.hi
    }

    /// True when `o` is a subset of `self`.
    pub fn contains_interval(&self, o: &Interval) -> bool {
        self.lo <= o.lo && o.hi <= self.hi
    }

    /// True when `0` is in `[lo, hi]`.
    pub fn contains_zero(&self) -> bool {
        !self.lo.is_positive() && !self.hi.is_negative()
    }

    /// Zero interval `[0, 0]`.
    pub fn zero() -> Interval {
        Interval::point(BigRational::zero())
    }
}

impl fmt::Display for Interval {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "[{}, {}]", self.lo, self.hi)
    }
}

/// Serialised as a two-element array of rational strings: `["lo","hi"]`.
impl Serialize for Interval {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        [self.lo.to_string(), self.hi.to_string()].serialize(s)
    }
}
