//! Dolbeault forms of lifted Čech–Koszul cocycles through a partition of unity (docs/representatives.md,
//! "Every type: the partition-of-unity form").
//!
//! Per projective factor `P^n` (coordinates `x_0..x_n`) and an integer `m ≥ 1`, the partition of unity
//! `ρ_l = |x_l|^{2m} / κ_m`, `κ_m = Σ_l |x_l|^{2m}`, is subordinate to the standard cover and invariant under
//! `x ↦ λx`. A Čech `q`-cochain `c` of the factor goes to
//! `Φ(c) = Σ_{(i_0,…,i_q) ordered} c_{i_0…i_q} ρ_{i_0} ∂̄ρ_{i_1} ∧ … ∧ ∂̄ρ_{i_q}`; a basis cochain on a sorted face
//! `J` (value 1 on the sorted tuple, alternating) gives the face form
//! `F_J = Σ_{π ∈ S_{q+1}} sgn(π) ρ_{j_π(0)} ∂̄ρ_{j_π(1)} ∧ … ∧ ∂̄ρ_{j_π(q)}`. On the product ambient space a term
//! `x^e [I_1] ⊗ … ⊗ [I_m] e_S` goes to `x^e F_{I_1} ∧ … ∧ F_{I_m}` (factor order) as the coefficient of `e_S`.
//! Then `∂̄ Φ = Φ δ` for the engine's Čech differential `δ = Σ_i (−1)^{q_1+…+q_{i−1}} δ_i` and `Φ` commutes with
//! multiplication by polynomials, so `Φ` of the Koszul-degree-0 part of a lifted cocycle restricts to a
//! `∂̄`-closed representative on X, for every type.
//!
//! Invariant: the exponents returned by [`partition_exponents`] are `≥ 1` and `≥` every pole order of the
//! cochain in that factor, so every `ρ_{i_0} ∂̄ρ_{i_1} ∧ … · x^e` of the cochain is a smooth form (each `ρ_l`
//! and `∂̄ρ_l` carries the holomorphic factor `x_l^m`). Nothing here is numerical except [`FaceForms`], an
//! `f64` evaluation of the face forms meant for numerical users and the quadrature tests.

use crate::cohomology::CechTerm;
use std::ops::{Add, Mul, Sub};

/// The formula, as stated in the export file's `dictionary.partition_of_unity`.
pub const PARTITION_FORMULA: &str = "for a class with partition_exponents m: on factor i, rho_l = |x_l|^(2 m_i) / kappa_m, kappa_m = sum_l |x_l|^(2 m_i); a face J = (j_0 < ... < j_q) is the (0,q)-form F_J = sum over permutations pi of J of sgn(pi) rho_pi(0) dbar(rho_pi(1)) ^ ... ^ dbar(rho_pi(q)); a lift term (koszul S, faces I_1..I_m, monomial x^e, coefficient c) is c x^e F_I1 ^ ... ^ F_Im (factor order) times e_S; Phi(lift with koszul = []) restricted to X is a d-bar closed representative of the class, and dbar Phi(lift_0) = (-1)^degree sum_j p_j Phi(lift_{j}) on the ambient space";

/// The partition exponents `m_i` of a cochain: per factor, the largest pole order `max(−e_l)` over its terms,
/// at least 1.
pub fn partition_exponents(terms: &[CechTerm], num_factors: usize) -> Vec<u32> {
    let mut m = vec![1u32; num_factors];
    for t in terms {
        for (mi, block) in m.iter_mut().zip(&t.monomial) {
            for &e in block {
                if e < 0 {
                    *mi = (*mi).max((-e) as u32);
                }
            }
        }
    }
    m
}

impl Add for Complex64 {
    type Output = Self;
    fn add(self, o: Self) -> Self {
        Complex64::new(self.re + o.re, self.im + o.im)
    }
}

impl Sub for Complex64 {
    type Output = Self;
    fn sub(self, o: Self) -> Self {
        Complex64::new(self.re - o.re, self.im - o.im)
    }
}

impl Mul for Complex64 {
    type Output = Self;
    fn mul(self, o: Self) -> Self {
        Complex64::new(
            self.re * o.re - self.im * o.im,
            self.re * o.im + self.im * o.re,
        )
    }
}

/// A complex number for the `f64` evaluation (kept local: numerical evaluation only).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Complex64 {
    pub re: f64,
    pub im: f64,
}

impl Complex64 {
    pub const ZERO: Complex64 = Complex64 { re: 0.0, im: 0.0 };
    pub const ONE: Complex64 = Complex64 { re: 1.0, im: 0.0 };

    pub fn new(re: f64, im: f64) -> Self {
        Complex64 { re, im }
    }
    pub fn conj(self) -> Self {
        Complex64::new(self.re, -self.im)
    }
    pub fn norm_sqr(self) -> f64 {
        self.re * self.re + self.im * self.im
    }
    pub fn scale(self, s: f64) -> Self {
        Complex64::new(self.re * s, self.im * s)
    }
    /// Integer power (negative exponents divide). Precondition: `self ≠ 0` when `k < 0`.
    pub fn powi(self, k: i32) -> Self {
        let mut base = if k < 0 { self.inv() } else { self };
        let mut e = k.unsigned_abs();
        let mut out = Complex64::ONE;
        while e > 0 {
            if e & 1 == 1 {
                out = out.mul(base);
            }
            base = base.mul(base);
            e >>= 1;
        }
        out
    }
    pub fn inv(self) -> Self {
        let d = self.norm_sqr();
        Complex64::new(self.re / d, -self.im / d)
    }
}

/// The partition of unity of one factor `P^n` at one point of `C^{n+1} ∖ 0`: the values `ρ_l` and the
/// components `∂ρ_l/∂x̄_v` of `∂̄ρ_l`, from which every face form `F_J` is evaluated.
#[derive(Clone, Debug)]
pub struct FaceForms {
    rho: Vec<Complex64>,
    /// `drho[l][v] = ∂ρ_l / ∂x̄_v`.
    drho: Vec<Vec<Complex64>>,
}

impl FaceForms {
    /// The partition of unity with exponent `m ≥ 1` at the point `x` (not all zero).
    pub fn new(x: &[Complex64], m: u32) -> Self {
        let m = m as i32;
        let w: Vec<f64> = x.iter().map(|z| z.norm_sqr().powi(m)).collect();
        let kappa: f64 = w.iter().sum();
        let rho: Vec<Complex64> = w
            .iter()
            .map(|&wl| Complex64::new(wl / kappa, 0.0))
            .collect();
        // ∂/∂x̄_v |x_l|^{2m} = m x_l^m x̄_l^{m−1} δ_lv; ∂ρ_l/∂x̄_v = (δ_lv g_l − ρ_l g_v) / κ_m, g_v = m x_v^m x̄_v^{m−1}.
        let g: Vec<Complex64> = x
            .iter()
            .map(|&z| z.powi(m).mul(z.conj().powi(m - 1)).scale(m as f64))
            .collect();
        let drho = (0..x.len())
            .map(|l| {
                (0..x.len())
                    .map(|v| {
                        let mut d = rho[l].mul(g[v]).scale(-1.0);
                        if l == v {
                            d = d.add(g[v]);
                        }
                        d.scale(1.0 / kappa)
                    })
                    .collect()
            })
            .collect();
        FaceForms { rho, drho }
    }

    /// The value `ρ_l`.
    pub fn rho(&self, l: usize) -> Complex64 {
        self.rho[l]
    }

    /// The coefficient of `dx̄_{v_1} ∧ … ∧ dx̄_{v_q}` (`v` increasing, `|v| = |J| − 1`) in the face form `F_J`
    /// (`J` increasing): `Σ_π sgn(π) ρ_{j_π(0)} det[∂ρ_{j_π(a)}/∂x̄_{v_b}]_{a,b ≥ 1}`.
    pub fn face_coefficient(&self, face: &[usize], v: &[usize]) -> Complex64 {
        assert_eq!(face.len(), v.len() + 1, "face_coefficient: degrees");
        let mut total = Complex64::ZERO;
        for (perm, sign) in permutations(face.len()) {
            let rows: Vec<usize> = perm[1..].iter().map(|&p| face[p]).collect();
            let det = determinant(
                &rows
                    .iter()
                    .map(|&l| v.iter().map(|&c| self.drho[l][c]).collect())
                    .collect::<Vec<Vec<Complex64>>>(),
            );
            let term = self.rho[face[perm[0]]].mul(det);
            total = if sign {
                total.sub(term)
            } else {
                total.add(term)
            };
        }
        total
    }
}

/// All permutations of `0..n` with their parity (`true` = odd).
fn permutations(n: usize) -> Vec<(Vec<usize>, bool)> {
    let mut out = vec![(Vec::new(), false)];
    for k in 0..n {
        let mut next = Vec::new();
        for (p, s) in out {
            // insert k at every position; moving it past `pos_from_end` elements changes parity that many times
            for pos in 0..=p.len() {
                let mut q = p.clone();
                q.insert(pos, k);
                next.push((q, s ^ ((k - pos) % 2 == 1)));
            }
        }
        out = next;
    }
    out
}

/// Determinant by cofactor expansion (small matrices only: `n ≤ 4` here). The empty matrix has determinant 1.
fn determinant(a: &[Vec<Complex64>]) -> Complex64 {
    let n = a.len();
    if n == 0 {
        return Complex64::ONE;
    }
    let mut total = Complex64::ZERO;
    for c in 0..n {
        let minor: Vec<Vec<Complex64>> = a[1..]
            .iter()
            .map(|row| {
                row.iter()
                    .enumerate()
                    .filter(|&(j, _)| j != c)
                    .map(|(_, &z)| z)
                    .collect()
            })
            .collect();
        let t = a[0][c].mul(determinant(&minor));
        total = if c % 2 == 1 {
            total.sub(t)
        } else {
            total.add(t)
        };
    }
    total
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::io::export::{FactorForm, factor_form};

    #[test]
    fn exponents_cover_every_pole() {
        let t = |monomial: Vec<Vec<i32>>| CechTerm {
            koszul: vec![],
            faces: vec![vec![0, 1], vec![0]],
            monomial,
            coefficient: "1".into(),
        };
        let terms = vec![
            t(vec![vec![-3, 1], vec![2, 0]]),
            t(vec![vec![0, -1], vec![1, 1]]),
        ];
        assert_eq!(partition_exponents(&terms, 2), vec![3, 1]);
        assert_eq!(partition_exponents(&[], 2), vec![1, 1]);
    }

    #[test]
    fn partition_sums_to_one_and_its_dbar_to_zero() {
        let x = [
            Complex64::new(0.3, -1.2),
            Complex64::new(2.0, 0.5),
            Complex64::new(-0.7, 0.1),
        ];
        for m in 1..=3 {
            let f = FaceForms::new(&x, m);
            let s = (0..3).fold(Complex64::ZERO, |a, l| a.add(f.rho(l)));
            assert!((s.re - 1.0).abs() < 1e-14 && s.im.abs() < 1e-14);
            for v in 0..3 {
                let d = (0..3).fold(Complex64::ZERO, |a, l| a.add(f.drho[l][v]));
                assert!(d.norm_sqr() < 1e-28, "{d:?}");
            }
            // F_{l} = ρ_l (a function) and F on an edge: ρ_0 ∂̄ρ_1 − ρ_1 ∂̄ρ_0
            assert_eq!(f.face_coefficient(&[1], &[]), f.rho(1));
            let e = f.face_coefficient(&[0, 1], &[2]);
            let want = f.rho[0].mul(f.drho[1][2]).sub(f.rho[1].mul(f.drho[0][2]));
            assert!(e.sub(want).norm_sqr() < 1e-28);
        }
        assert_eq!(permutations(3).iter().filter(|(_, s)| *s).count(), 3);
    }

    /// `∫_{C^n} g(z) Π r_l dr_l dθ_l` by the midpoint rule after `r = tan t` (radial) and a uniform angular grid
    /// (exact for trigonometric polynomials of degree below `n_theta`).
    fn integrate(
        n: usize,
        n_t: usize,
        n_theta: usize,
        g: &dyn Fn(&[Complex64]) -> Complex64,
    ) -> Complex64 {
        let h = std::f64::consts::FRAC_PI_2 / n_t as f64;
        let ht = 2.0 * std::f64::consts::PI / n_theta as f64;
        let nodes = n_t * n_theta;
        let mut total = Complex64::ZERO;
        let mut idx = vec![0usize; n];
        let count = nodes.pow(n as u32);
        let mut z = vec![Complex64::ZERO; n];
        for flat in 0..count {
            let mut f = flat;
            for i in idx.iter_mut() {
                *i = f % nodes;
                f /= nodes;
            }
            let mut weight = 1.0;
            for (l, &i) in idx.iter().enumerate() {
                let t = (i / n_theta) as f64 * h + h / 2.0;
                let th = (i % n_theta) as f64 * ht;
                let r = t.tan();
                z[l] = Complex64::new(r * th.cos(), r * th.sin());
                weight *= r / (t.cos() * t.cos()) * h * ht;
            }
            total = total.add(g(&z).scale(weight));
        }
        total
    }

    /// The coefficient of `dx̄_1 ∧ … ∧ dx̄_n` of a dictionary factor form at `x = (1, z)` (the chart pullback).
    fn harmonic_in_chart(form: &FactorForm, x: &[Complex64]) -> Complex64 {
        let n = x.len() - 1;
        let kappa: f64 = x.iter().map(|z| z.norm_sqr()).sum();
        let mut total = Complex64::ZERO;
        for t in &form.terms {
            if t.dxbar != (1..=n).collect::<Vec<_>>() {
                continue; // contains dx̄_0, which pulls back to zero
            }
            let c: f64 = t
                .coefficient
                .parse::<num_rational::BigRational>()
                .map(|r| num_traits::ToPrimitive::to_f64(&r).unwrap())
                .unwrap();
            let mut v = Complex64::new(c * kappa.powi(t.kappa_power as i32), 0.0);
            for l in 0..=n {
                v = v
                    .mul(x[l].powi(t.x[l] as i32))
                    .mul(x[l].conj().powi(t.xbar[l] as i32));
            }
            total = total.add(v);
        }
        total
    }

    /// All exponent vectors `a ≥ 0` with `n + 1` entries and `|a| = k`.
    fn exponent_vectors(n: usize, k: u32) -> Vec<Vec<u32>> {
        let mut out = vec![vec![]];
        for l in 0..=n {
            out = out
                .into_iter()
                .flat_map(|p: Vec<u32>| {
                    let used: u32 = p.iter().sum();
                    let lo = if l == n { k - used } else { 0 };
                    (lo..=k - used).map(move |a| {
                        let mut q = p.clone();
                        q.push(a);
                        q
                    })
                })
                .collect();
        }
        out
    }

    /// docs/representatives.md §"One factor", item 3: `Φ` is canonical, so `∫ Φ(x^{−1−a}) x^b Ω` is `δ_ab` times
    /// one constant for every `a`, `k` and `m`, and the dictionary forms `c_a x̄^a ω̄/κ^{n+1+k}` with
    /// `c_a = (n+k)!/(n! a!)` pair the same way up to one ratio independent of `a` and `k`. Integrals are in the
    /// chart `x_0 = 1` as coefficients of `dz̄_1…dz̄_n ∧ dz_1…dz_n` in the measure `Π r dr dθ`. Diagonal
    /// integrands are torus-invariant (one angle suffices); off-diagonal ones (`k ≤ offdiag_max`) use
    /// `2k + 3` angles and must vanish. Returns the ratios `∫Φ / ∫harmonic` on the diagonal. The harmonic side
    /// is read from [`factor_form`] (the exported data), so a wrong `c_a` makes the ratios differ.
    fn pairing_ratios(
        n: usize,
        degrees: &[u32],
        ms: &[u32],
        n_t: usize,
        offdiag_max: u32,
    ) -> Vec<f64> {
        let face: Vec<usize> = (0..=n).collect();
        let v: Vec<usize> = (1..=n).collect();
        let chart = |z: &[Complex64]| {
            let mut x = vec![Complex64::ONE];
            x.extend_from_slice(z);
            x
        };
        let monomial = |x: &[Complex64], e: &[i32]| {
            (0..=n).fold(Complex64::ONE, |p, l| p.mul(x[l].powi(e[l])))
        };
        let mut ratios = Vec::new();
        for &k in degrees {
            let all = exponent_vectors(n, k);
            for a in &all {
                let e: Vec<i32> = a.iter().map(|&ai| -1 - ai as i32).collect();
                let form = factor_form(&e);
                for b in &all {
                    if a != b && k > offdiag_max {
                        continue;
                    }
                    let n_theta = if a == b { 1 } else { 2 * k as usize + 3 };
                    let xb: Vec<i32> = b.iter().map(|&bl| bl as i32).collect();
                    let shifted: Vec<i32> = (0..=n).map(|l| xb[l] + e[l]).collect();
                    let n_t = if a == b { n_t } else { n_t.min(40) };
                    let ih = integrate(n, n_t, n_theta, &|z| {
                        let x = chart(z);
                        harmonic_in_chart(&form, &x).mul(monomial(&x, &xb))
                    });
                    for &m in ms {
                        let iphi = integrate(n, n_t, n_theta, &|z| {
                            let x = chart(z);
                            FaceForms::new(&x, m)
                                .face_coefficient(&face, &v)
                                .mul(monomial(&x, &shifted))
                        });
                        if a == b {
                            assert!(iphi.im.abs() < 1e-9 * iphi.re.abs(), "{iphi:?}");
                            assert!(ih.im.abs() < 1e-9 * ih.re.abs(), "{ih:?}");
                            ratios.push(iphi.re / ih.re);
                            if n == 1 {
                                let pi = std::f64::consts::PI;
                                assert!((iphi.re - pi).abs() < 1e-5, "P^1 Φ pairing {iphi:?}");
                                assert!(
                                    (ih.re - pi).abs() < 1e-5,
                                    "P^1 dictionary pairing {ih:?}, a = {a:?}"
                                );
                            }
                        } else {
                            assert!(
                                iphi.norm_sqr().sqrt() < 1e-8,
                                "a = {a:?}, b = {b:?}: {iphi:?}"
                            );
                            assert!(ih.norm_sqr().sqrt() < 1e-8, "a = {a:?}, b = {b:?}: {ih:?}");
                        }
                    }
                }
            }
        }
        ratios
    }

    /// On `P^1` both pairings are `π` (docs/representatives.md derives them), so the ratio is `1! = 1`.
    #[test]
    fn dictionary_constants_on_p1_match_the_partition_of_unity() {
        let ratios = pairing_ratios(1, &[0, 1, 2, 3], &[1, 2, 4], 4000, 3);
        for r in &ratios {
            assert!((r - 1.0).abs() < 1e-5, "{ratios:?}");
        }
    }

    /// On `P^2` the ratio is one constant for `k = 0, 1, 2` and `m = 1, 2`; measured `2 = 2!` (the `q!` of the
    /// ordered sum in `Φ`; the dictionary form carries `c_0 = 1`). A wrong `c_a` moves some ratio off `2`.
    #[test]
    fn dictionary_constants_on_p2_match_the_partition_of_unity() {
        let ratios = pairing_ratios(2, &[0, 1, 2], &[1, 2], 300, 1);
        for r in &ratios {
            assert!((r - 2.0).abs() < 1e-4, "{ratios:?}");
        }
    }
}
