//! Couplings of line-bundle models (MATH.md §5): the gauge-invariant operators derived from the E8 branching
//! ([`operators`]), exact holomorphic Yukawa values from the cup product of lifted Čech–Koszul cocycles
//! projected to the one-dimensional `H^3(X, O_X)` ([`value`]), and the textures with a reason for every entry
//! ([`texture`]), and the same values as exact rational functions of one symbolic coefficient of the
//! polynomials ([`parametric`]).
//!
//! Invariant: every value of one [`value::CouplingEngine`] is computed with the same polynomials and the same
//! normalisation of `H^3(X, O_X)` (one common normalisation of Ω), stated by [`value::NORMALISATION`].

pub mod operators;
pub mod parametric;
pub mod texture;
pub mod value;

pub use operators::{Operator, enumerate_operators};
pub use texture::{
    CouplingClass, CouplingOptions, CouplingReport, CouplingValue, EntryStatus, ParameterFamily,
    TextureError, couplings, couplings_in_family, structural_rank,
};
pub use value::{
    CouplingEngine, CouplingError, LiftedBasis, MAX_COCHAIN_TERMS, NORMALISATION, YukawaTensor,
    cup_product, h1_types, pairing_matrix, yukawa_tensor,
};
