//! Couplings of line-bundle models (MATH.md §5): exact holomorphic Yukawa values from the cup product of
//! lifted Čech–Koszul cocycles projected to the one-dimensional `H^3(X, O_X)` ([`value`]), and the same values
//! as exact rational functions of one symbolic coefficient of the polynomials ([`parametric`]).
//!
//! Invariant: every value of one [`value::CouplingEngine`] is computed with the same polynomials and the same
//! normalisation of `H^3(X, O_X)` (one common normalisation of Ω), stated by [`value::NORMALISATION`].

pub mod parametric;
pub mod value;

pub use value::{
    CouplingEngine, CouplingError, LiftedBasis, MAX_COCHAIN_TERMS, NORMALISATION, YukawaTensor,
    cup_product, h1_types, pairing_matrix, yukawa_tensor,
};
