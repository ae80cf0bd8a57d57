//! sheafwright: exact geometry, line-bundle cohomology and spectra for heterotic line-bundle models on
//! Calabi-Yau complete intersections in products of projective spaces.
//!
//! Data flows one way: model file ([`io`]) → [`geometry::Configuration`] → [`geometry::Geometry`] →
//! cohomology → spectrum. The library never prints; the `sheafwright` binary parses, calls and renders.

// Tensor formulas such as d_{rst} k^r t^s t^t read best as index loops.
#![allow(clippy::needless_range_loop)]

pub mod analysis;
pub mod arith;
pub mod bundle;
pub mod cohomology;
pub mod couplings;
pub mod geometry;
pub mod io;
pub mod poly;
pub mod scan;
pub mod slope;
pub mod symmetry;
