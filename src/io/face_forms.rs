//! Exact expansion of the partition-of-unity face forms `F_J^{(m)}` of one factor `P^n` into monomial form
//! data (the export's `face_forms` table; docs/representatives.md, "Every type: the partition-of-unity form").
//!
//! With `κ_m = Σ_l |x_l|^{2m}`, `ρ_l = x_l^m x̄_l^m κ_m^{−1}` and
//! `∂̄ρ_l = m x_l^m x̄_l^{m−1} κ_m^{−1} dx̄_l − m x_l^m x̄_l^m κ_m^{−2} Σ_k x_k^m x̄_k^{m−1} dx̄_k`, the face form of a
//! sorted face `J = (j_0 < … < j_q)` is
//! `F_J = Σ_{π ∈ S_{q+1}} sgn(π) ρ_{j_π(0)} ∂̄ρ_{j_π(1)} ∧ … ∧ ∂̄ρ_{j_π(q)}
//!      = q! Σ_a (−1)^a ρ_{j_a} ∂̄ρ_{j_0} ∧ … ∧ \widehat{∂̄ρ_{j_a}} ∧ … ∧ ∂̄ρ_{j_q}`
//! (group the permutations by `π(0) = a`; the remaining ones reorder a wedge of 1-forms, which costs their sign).
//!
//! Invariant: the returned terms are collected (one term per `(x, x̄, κ_m power, dx̄ set)`, no zero
//! coefficient), every `dx̄` list is increasing, and their sum equals `F_J` as a function on `C^{n+1} ∖ 0` exactly
//! (no use of `Σ ρ_l = 1` or other relations, so the expansion is one valid choice among equal ones). Coefficients
//! are exact integers.

use super::export::FormTerm;
use num_bigint::BigInt;
use num_traits::{One, Zero};
use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;

/// One row of the export's `face_forms` table: the face form `F_J^{(m)}` of a factor `P^n`. In its terms
/// `kappa_power` is the power of `κ_m = Σ_l |x_l|^{2m}` (not of `κ = κ_1` as in the Bott dictionary forms).
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ExportFaceForm {
    /// The factor's projective dimension.
    pub n: usize,
    /// The partition exponent.
    pub m: u32,
    /// The sorted face `J` (coordinate indices `0..=n`).
    pub face: Vec<usize>,
    /// The terms; their sum is `F_J^{(m)}`.
    pub terms: Vec<FormTerm>,
}

/// A form term key: `(x exponents, x̄ exponents, κ_m power, increasing dx̄ indices)`.
type Key = (Vec<u32>, Vec<u32>, i64, Vec<usize>);
/// A form as a map from keys to non-zero integer coefficients.
type Form = BTreeMap<Key, BigInt>;

fn add_term(form: &mut Form, key: Key, c: BigInt) {
    if c.is_zero() {
        return;
    }
    let entry = form.entry(key.clone()).or_insert_with(BigInt::zero);
    *entry += c;
    if entry.is_zero() {
        form.remove(&key);
    }
}

/// The sign of merging two increasing index lists into one increasing list (`None` if they share an index).
fn merge_sign(a: &[usize], b: &[usize]) -> Option<(Vec<usize>, bool)> {
    let mut inversions = 0usize;
    for &x in a {
        if b.contains(&x) {
            return None;
        }
        inversions += b.iter().filter(|&&y| y < x).count();
    }
    let mut merged: Vec<usize> = a.iter().chain(b).copied().collect();
    merged.sort_unstable();
    Some((merged, inversions % 2 == 1))
}

/// The wedge product `a ∧ b`.
fn wedge(a: &Form, b: &Form) -> Form {
    let mut out = Form::new();
    for ((ax, axb, ak, ad), ac) in a {
        for ((bx, bxb, bk, bd), bc) in b {
            let Some((dxbar, odd)) = merge_sign(ad, bd) else {
                continue;
            };
            let x = ax.iter().zip(bx).map(|(p, q)| p + q).collect();
            let xbar = axb.iter().zip(bxb).map(|(p, q)| p + q).collect();
            let c = ac * bc;
            add_term(
                &mut out,
                (x, xbar, ak + bk, dxbar),
                if odd { -c } else { c },
            );
        }
    }
    out
}

fn unit_vector(n: usize, l: usize, value: u32) -> Vec<u32> {
    let mut v = vec![0; n + 1];
    v[l] = value;
    v
}

fn plus(a: &[u32], b: &[u32]) -> Vec<u32> {
    a.iter().zip(b).map(|(p, q)| p + q).collect()
}

/// `ρ_l = x_l^m x̄_l^m κ_m^{−1}`.
fn rho(n: usize, m: u32, l: usize) -> Form {
    let e = unit_vector(n, l, m);
    Form::from([((e.clone(), e, -1, vec![]), BigInt::one())])
}

/// `∂̄ρ_l`, expanded by the quotient rule (module doc).
fn dbar_rho(n: usize, m: u32, l: usize) -> Form {
    let mut out = Form::new();
    let ml = BigInt::from(m);
    let xl = unit_vector(n, l, m);
    add_term(
        &mut out,
        (xl.clone(), unit_vector(n, l, m - 1), -1, vec![l]),
        ml.clone(),
    );
    for k in 0..=n {
        let x = plus(&xl, &unit_vector(n, k, m));
        let xbar = plus(&xl, &unit_vector(n, k, m - 1));
        add_term(&mut out, (x, xbar, -2, vec![k]), -ml.clone());
    }
    out
}

/// The exact terms of the face form `F_J^{(m)}` on `P^n`. Preconditions: `m ≥ 1`, `face` non-empty, increasing,
/// with entries `≤ n`.
pub fn face_form_terms(n: usize, m: u32, face: &[usize]) -> Vec<FormTerm> {
    assert!(
        m >= 1
            && !face.is_empty()
            && face.windows(2).all(|w| w[0] < w[1])
            && face[face.len() - 1] <= n,
        "face_form_terms: m >= 1 and an increasing non-empty face within 0..=n"
    );
    let q = face.len() - 1;
    let q_factorial: BigInt = (1..=q as u64).map(BigInt::from).product();
    let mut total = Form::new();
    for a in 0..=q {
        let mut product = rho(n, m, face[a]);
        for (b, &j) in face.iter().enumerate() {
            if b != a {
                product = wedge(&product, &dbar_rho(n, m, j));
            }
        }
        for (key, c) in product {
            let c = &c * &q_factorial;
            add_term(&mut total, key, if a % 2 == 1 { -c } else { c });
        }
    }
    total
        .into_iter()
        .map(|((x, xbar, kappa_power, dxbar), c)| FormTerm {
            x,
            xbar,
            kappa_power,
            dxbar,
            coefficient: c.to_string(),
        })
        .collect()
}

/// Every face form a set of cochain terms needs: one row per distinct `(n_i, m_i, face)`, over every term's face
/// in each factor `i`, sorted by `(n, m, face)`.
pub fn face_form_table<'a>(
    dims: &[usize],
    uses: impl IntoIterator<Item = (&'a [Vec<usize>], &'a [u32])>,
) -> Vec<ExportFaceForm> {
    let mut keys: std::collections::BTreeSet<(usize, u32, Vec<usize>)> = Default::default();
    for (faces, ms) in uses {
        for ((face, &m), &n) in faces.iter().zip(ms).zip(dims) {
            keys.insert((n, m, face.clone()));
        }
    }
    keys.into_iter()
        .map(|(n, m, face)| ExportFaceForm {
            terms: face_form_terms(n, m, &face),
            n,
            m,
            face,
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::io::dolbeault::{Complex64, FaceForms};

    /// The coefficient of `dx̄_v` (v increasing) of the exact terms at the point `x`, in `f64`.
    fn evaluate(terms: &[FormTerm], x: &[Complex64], m: u32, v: &[usize]) -> Complex64 {
        let kappa: f64 = x.iter().map(|z| z.norm_sqr().powi(m as i32)).sum();
        let mut total = Complex64::ZERO;
        for t in terms.iter().filter(|t| t.dxbar == v) {
            let c: f64 = t.coefficient.parse().unwrap();
            let mut val = Complex64::new(c * kappa.powi(t.kappa_power as i32), 0.0);
            for (l, z) in x.iter().enumerate() {
                val = val * z.powi(t.x[l] as i32) * z.conj().powi(t.xbar[l] as i32);
            }
            total = total + val;
        }
        total
    }

    fn subsets(n: usize, size: usize) -> Vec<Vec<usize>> {
        (0u32..1 << (n + 1))
            .filter(|s| s.count_ones() as usize == size)
            .map(|s| (0..=n).filter(|&l| s >> l & 1 == 1).collect())
            .collect()
    }

    /// The exact expansion against the independent `f64` evaluation of the permutation definition
    /// ([`FaceForms::face_coefficient`]), for every face and every `dx̄` set on `P^1`, `P^2`, `P^3`.
    #[test]
    fn exact_face_forms_agree_with_the_permutation_definition() {
        let point = [
            Complex64::new(0.7, -0.4),
            Complex64::new(-0.5, 0.9),
            Complex64::new(1.1, 0.3),
            Complex64::new(0.2, -0.8),
        ];
        for n in 1..=3 {
            let x = &point[..=n];
            for m in 1..=3 {
                let numeric = FaceForms::new(x, m);
                for size in 1..=n + 1 {
                    for face in subsets(n, size) {
                        let terms = face_form_terms(n, m, &face);
                        for t in &terms {
                            assert!(t.dxbar.windows(2).all(|w| w[0] < w[1]));
                            assert_eq!(t.dxbar.len(), size - 1);
                        }
                        for v in subsets(n, size - 1) {
                            let want = numeric.face_coefficient(&face, &v);
                            let got = evaluate(&terms, x, m, &v);
                            let err = (got - want).norm_sqr().sqrt();
                            assert!(
                                err < 1e-11 * (1.0 + want.norm_sqr().sqrt()),
                                "n={n} m={m} face={face:?} v={v:?}: {got:?} vs {want:?}"
                            );
                        }
                    }
                }
            }
        }
    }

    #[test]
    fn a_vertex_is_rho_and_an_edge_on_p1_is_small() {
        let t = face_form_terms(2, 2, &[1]);
        assert_eq!(t.len(), 1);
        assert_eq!(
            (t[0].x.clone(), t[0].xbar.clone()),
            (vec![0, 2, 0], vec![0, 2, 0])
        );
        assert_eq!((t[0].kappa_power, t[0].coefficient.as_str()), (-1, "1"));
        // On P^1, F_{01} = ρ_0 ∂̄ρ_1 − ρ_1 ∂̄ρ_0 = m x_0^m x_1^m (x̄_0^m x̄_1^{m−1} dx̄_1 − x̄_0^{m−1} x̄_1^m dx̄_0) / κ_m^2
        // once Σρ = 1 is used; the unsimplified expansion collects to the same function (checked numerically above).
        let e = face_form_terms(1, 1, &[0, 1]);
        assert!(e.iter().all(|t| t.kappa_power == -2 || t.kappa_power == -3));
    }

    #[test]
    fn the_table_has_one_row_per_distinct_face() {
        let faces_a = vec![vec![0, 1], vec![0]];
        let faces_b = vec![vec![0, 1], vec![1]];
        let table = face_form_table(
            &[1, 2],
            [
                (faces_a.as_slice(), [2u32, 1].as_slice()),
                (faces_b.as_slice(), [2u32, 1].as_slice()),
                (faces_a.as_slice(), [3u32, 1].as_slice()),
            ],
        );
        let keys: Vec<(usize, u32, Vec<usize>)> =
            table.iter().map(|f| (f.n, f.m, f.face.clone())).collect();
        assert_eq!(
            keys,
            vec![
                (1, 2, vec![0, 1]),
                (1, 3, vec![0, 1]),
                (2, 1, vec![0]),
                (2, 1, vec![1])
            ]
        );
    }
}
