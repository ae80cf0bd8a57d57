//! Linear actions on the homogeneous coordinates by *monomial maps*: a substitution
//! `φ(x_v) = ζ^{a_v} x_{σ(v)}` with a permutation `σ` of all coordinates that maps every ambient factor onto a
//! factor of the same dimension (within a factor, or between identical factors) and phases `a_v` (exponents of a
//! fixed root of unity `ζ = ζ_N`).
//!
//! Convention: a map acts on polynomials by substitution, and the product `g ∘ h` is the substitution
//! `φ_g ∘ φ_h` (first `φ_h`, then `φ_g` on the result), so `g ↦ φ_g` is a homomorphism. On points the map
//! is `g(P)_v = ζ^{a_v} P_{σ(v)}`, so that `(φ_g f)(P) = f(g(P))`.
//!
//! Invariant: a [`MonomialMap`] built by [`MonomialMap::new`] has a bijective `image` respecting the factor
//! structure of its [`VariableLayout`], and phases reduced modulo its order.

use crate::poly::VariableLayout;

/// A monomial substitution (see the module doc). Phases are exponents of `ζ_order`.
#[derive(Clone, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct MonomialMap {
    /// `σ(v)` for every coordinate `v` (layout order).
    pub image: Vec<usize>,
    /// `a_v` modulo `order`.
    pub phase: Vec<u32>,
}

impl MonomialMap {
    /// The identity on `nvars` coordinates.
    pub fn identity(nvars: usize) -> Self {
        MonomialMap {
            image: (0..nvars).collect(),
            phase: vec![0; nvars],
        }
    }

    /// Checked constructor: `image` must be a bijection of the coordinates that maps each factor onto one
    /// factor of the same dimension; phases are reduced modulo `order`. The error says what is wrong.
    pub fn new(
        layout: &VariableLayout,
        image: Vec<usize>,
        phase: Vec<i64>,
        order: u32,
    ) -> Result<Self, String> {
        let n = layout.nvars();
        if image.len() != n || phase.len() != n {
            return Err(format!(
                "needs one image and one phase per coordinate ({n}), got {} images and {} phases",
                image.len(),
                phase.len()
            ));
        }
        let mut seen = vec![false; n];
        for &w in &image {
            if w >= n || seen[w] {
                return Err(
                    "the coordinate images are not a permutation of the coordinates".into(),
                );
            }
            seen[w] = true;
        }
        let m = layout.dims().len();
        for i in 0..m {
            let targets: Vec<usize> = layout
                .range(i)
                .map(|v| factor_of(layout, image[v]))
                .collect();
            let j = targets[0];
            if targets.iter().any(|&t| t != j) {
                return Err(format!(
                    "does not preserve the ambient structure: the coordinates of factor {} go to different factors",
                    i + 1
                ));
            }
            if layout.dims()[j] != layout.dims()[i] {
                return Err(format!(
                    "does not preserve the ambient structure: maps factor {} (P^{}) to factor {} (P^{})",
                    i + 1,
                    layout.dims()[i],
                    j + 1,
                    layout.dims()[j]
                ));
            }
        }
        Ok(MonomialMap {
            image,
            phase: phase
                .iter()
                .map(|&a| a.rem_euclid(order as i64) as u32)
                .collect(),
        })
    }

    /// `self ∘ other` as substitutions: `x_v ↦ ζ^{b_v + a_{τ(v)}} x_{σ(τ(v))}`.
    pub fn compose(&self, other: &MonomialMap, order: u32) -> MonomialMap {
        let image = other.image.iter().map(|&t| self.image[t]).collect();
        let phase = other
            .phase
            .iter()
            .zip(&other.image)
            .map(|(&b, &t)| (b + self.phase[t]) % order)
            .collect();
        MonomialMap { image, phase }
    }

    /// Whether this is the identity substitution.
    pub fn is_identity(&self) -> bool {
        self.image.iter().enumerate().all(|(v, &w)| v == w) && self.phase.iter().all(|&a| a == 0)
    }

    /// The factor map `π`: factor `i` goes to factor `π(i)`.
    pub fn factor_map(&self, layout: &VariableLayout) -> Vec<usize> {
        (0..layout.dims().len())
            .map(|i| factor_of(layout, self.image[layout.offset(i)]))
            .collect()
    }

    /// For a per-factor scalar (identity permutation, phase constant on each factor), the phase of each factor.
    pub fn scalar_phases(&self, layout: &VariableLayout) -> Option<Vec<u32>> {
        if self.image.iter().enumerate().any(|(v, &w)| v != w) {
            return None;
        }
        let mut out = Vec::new();
        for i in 0..layout.dims().len() {
            let a = self.phase[layout.offset(i)];
            if layout.range(i).any(|v| self.phase[v] != a) {
                return None;
            }
            out.push(a);
        }
        Some(out)
    }

    /// The class of this map modulo per-factor scalars (its action on the ambient space): phases shifted so that
    /// the first coordinate of every factor has phase 0.
    pub fn projective_key(&self, layout: &VariableLayout, order: u32) -> MonomialMap {
        let mut phase = self.phase.clone();
        for i in 0..layout.dims().len() {
            let a = self.phase[layout.offset(i)];
            for v in layout.range(i) {
                phase[v] = (self.phase[v] + order - a) % order;
            }
        }
        MonomialMap {
            image: self.image.clone(),
            phase,
        }
    }

    /// `φ(x^e) = ζ^{Σ a_v e_v} x^{σ_* e}` for a Laurent monomial: the image exponents and the phase exponent
    /// (not reduced).
    pub fn apply_exponents<T: Copy + Default + Into<i64>>(&self, e: &[T]) -> (Vec<T>, i64) {
        let mut out = vec![T::default(); e.len()];
        let mut ph = 0i64;
        for (v, &x) in e.iter().enumerate() {
            out[self.image[v]] = x;
            ph += self.phase[v] as i64 * x.into();
        }
        (out, ph)
    }

    /// Multiply every phase by `factor` (change of root of unity `ζ_N = ζ_M^{M/N}`).
    pub fn rescale(&self, factor: u32) -> MonomialMap {
        MonomialMap {
            image: self.image.clone(),
            phase: self.phase.iter().map(|&a| a * factor).collect(),
        }
    }
}

/// The factor (0-based) owning coordinate `v`.
pub fn factor_of(layout: &VariableLayout, v: usize) -> usize {
    (0..layout.dims().len())
        .find(|&i| layout.range(i).contains(&v))
        .expect("factor_of: coordinate inside the layout")
}

/// Sign of a permutation of `0..n` given as images.
pub fn permutation_sign(images: &[usize]) -> i64 {
    let mut seen = vec![false; images.len()];
    let mut sign = 1;
    for s in 0..images.len() {
        if seen[s] {
            continue;
        }
        let mut len = 0;
        let mut v = s;
        while !seen[v] {
            seen[v] = true;
            v = images[v];
            len += 1;
        }
        if len % 2 == 0 {
            sign = -sign;
        }
    }
    sign
}

/// Parse a coordinate name `x{I}_{J}` of the polynomial syntax into its layout index.
pub fn parse_coordinate(name: &str, layout: &VariableLayout) -> Result<usize, String> {
    let bad = || format!("{name:?} is not a coordinate name like x1_0");
    let rest = name.trim().strip_prefix('x').ok_or_else(bad)?;
    let (i, j) = rest.split_once('_').ok_or_else(bad)?;
    let i: usize = i.parse().map_err(|_| bad())?;
    let j: usize = j.parse().map_err(|_| bad())?;
    let m = layout.dims().len();
    if i == 0 || i > m {
        return Err(format!(
            "{name:?}: there is no ambient factor {i} (factors are 1..={m})"
        ));
    }
    if j > layout.dims()[i - 1] {
        return Err(format!(
            "{name:?}: factor {i} is P^{} (coordinates 0..={})",
            layout.dims()[i - 1],
            layout.dims()[i - 1]
        ));
    }
    Ok(layout.offset(i - 1) + j)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn composition_is_substitution_order() {
        let layout = VariableLayout::new(&[2]);
        let shift = MonomialMap::new(&layout, vec![1, 2, 0], vec![0, 0, 0], 3).unwrap();
        let clock = MonomialMap::new(&layout, vec![0, 1, 2], vec![0, 1, 2], 3).unwrap();
        // φ_shift(φ_clock(x_1)) = φ_shift(ζ x_1) = ζ x_2.
        let sc = shift.compose(&clock, 3);
        assert_eq!(sc.image[1], 2);
        assert_eq!(sc.phase[1], 1);
        // clock∘shift: x_1 ↦ x_2 ↦ ζ^2 x_2.
        let cs = clock.compose(&shift, 3);
        assert_eq!(cs.phase[1], 2);
        // They commute up to a scalar: same projective class after a global phase.
        assert_ne!(sc, cs);
        assert_eq!(
            sc.projective_key(&layout, 3).image,
            cs.projective_key(&layout, 3).image
        );
        let mut p = shift.clone();
        for _ in 0..2 {
            p = p.compose(&shift, 3);
        }
        assert!(p.is_identity());
    }

    #[test]
    fn refuses_maps_breaking_the_ambient_structure() {
        let layout = VariableLayout::new(&[1, 2]);
        let e = MonomialMap::new(&layout, vec![2, 3, 0, 1, 4], vec![0; 5], 2).unwrap_err();
        assert!(e.contains("ambient structure"), "{e}");
        let e = MonomialMap::new(&layout, vec![0, 0, 2, 3, 4], vec![0; 5], 2).unwrap_err();
        assert!(e.contains("permutation"), "{e}");
        assert_eq!(permutation_sign(&[1, 0, 2]), -1);
        assert_eq!(permutation_sign(&[1, 2, 0]), 1);
        assert_eq!(parse_coordinate("x2_1", &layout), Ok(3));
        assert!(parse_coordinate("x3_0", &layout).is_err());
    }
}
