//! The "none" side of the certifier: slope combinations of constant sign (vertex search over the cone
//! of admissible weights) and exclusion of the charts by bisection, each box excluded by a combination
//! found by a float perceptron or a vertex search and then tested exactly (`positive_on_box`).
//!
//! Invariant: a returned combination or list of boxes has passed the exact test of its claim.
#![allow(clippy::needless_range_loop)]

use super::search::primitive_integers;
use super::*;

/// A non-zero vector of the right null space of `rows` (exact), if any.
fn null_vector(rows: &[Vec<BigRational>], n: usize) -> Option<Vec<BigRational>> {
    let mut a: Vec<Vec<BigRational>> = rows.to_vec();
    let mut pivots: Vec<usize> = Vec::new();
    let mut rk = 0;
    for col in 0..n {
        let Some(p) = (rk..a.len()).find(|&i| !a[i][col].is_zero()) else {
            continue;
        };
        a.swap(rk, p);
        let piv = a[rk][col].clone();
        for c in 0..n {
            let v = &a[rk][c] / &piv;
            a[rk][c] = v;
        }
        for i in 0..a.len() {
            if i != rk && !a[i][col].is_zero() {
                let f = a[i][col].clone();
                for c in 0..n {
                    let v = &a[rk][c] * &f;
                    a[i][c] -= v;
                }
            }
        }
        pivots.push(col);
        rk += 1;
    }
    let free_col = (0..n).find(|c| !pivots.contains(c))?;
    let mut v = vec![BigRational::zero(); n];
    v[free_col] = BigRational::one();
    for (row, &pc) in pivots.iter().enumerate() {
        v[pc] = -a[row][free_col].clone();
    }
    Some(v)
}

/// Candidate weight vectors (over `q` basis bundles) that vanish on `q - 1`
/// of the given columns: vertices of the cone of admissible combinations.
/// Enumerates at most `cap` column subsets.
fn vertex_combinations(cols: &[Vec<BigRational>], q: usize, cap: usize) -> Vec<Vec<BigInt>> {
    let nz: Vec<&Vec<BigRational>> = cols
        .iter()
        .filter(|c| c.iter().any(|v| !v.is_zero()))
        .collect();
    let mut out = Vec::new();
    if q == 0 {
        return out;
    }
    let k = q - 1;
    if nz.len() < k {
        return out;
    }
    let mut idx: Vec<usize> = (0..k).collect();
    let mut count = 0;
    loop {
        let rows: Vec<Vec<BigRational>> = idx.iter().map(|&i| nz[i].clone()).collect();
        if let Some(ints) = null_vector(&rows, q).and_then(|v| primitive_integers(&v)) {
            out.push(ints.iter().map(|x| -x).collect());
            out.push(ints);
        }
        count += 1;
        if count >= cap {
            break;
        }
        // next combination
        let mut i = k;
        loop {
            if i == 0 {
                return out;
            }
            i -= 1;
            if idx[i] < nz.len() - k + i {
                idx[i] += 1;
                for j in i + 1..k {
                    idx[j] = idx[j - 1] + 1;
                }
                break;
            }
        }
        if k == 0 {
            break;
        }
    }
    out
}
impl System {
    /// Exclusion by bisection of the charts; `Err(reason)` when the budget runs out.
    /// On failure also returns a float point of the box where it got stuck.
    pub(super) fn subdivide(
        &self,
        max_boxes: usize,
    ) -> Result<Vec<ExcludedBox>, (String, Option<Vec<f64>>)> {
        let mut leaves = Vec::new();
        let mut work = 0usize;
        for chart in 0..self.m {
            let mut stack = vec![DBox::root(self.m, chart)];
            while let Some(b) = stack.pop() {
                work += 1;
                if let Some(terms) = self.exclude(&b) {
                    leaves.push(ExcludedBox {
                        chart,
                        bx: b.intervals(),
                        combination: terms
                            .into_iter()
                            .map(|(bundle, c)| Term {
                                bundle,
                                coeff: big_to_rat(&c),
                            })
                            .collect(),
                    });
                    continue;
                }
                let centre: Vec<f64> = b
                    .intervals()
                    .iter()
                    .map(|iv| iv.mid().to_f64().unwrap_or(0.0))
                    .collect();
                if leaves.len() + stack.len() + 2 > max_boxes || work > 4 * max_boxes.max(1) {
                    return Err((
                        format!(
                            "exclusion subdivision budget of {max_boxes} boxes exhausted (chart t{} = 1)",
                            chart + 1
                        ),
                        Some(centre),
                    ));
                }
                if b.k >= 48 {
                    let near: Vec<String> = b
                        .intervals()
                        .iter()
                        .map(|iv| format!("{:.6}", iv.lo().to_f64().unwrap_or(f64::NAN)))
                        .collect();
                    return Err((
                        format!(
                            "exclusion subdivision reached the minimal box width 2^-48 near t ≈ [{}] (a zero of the slopes in or at the boundary of the cone)",
                            near.join(", ")
                        ),
                        Some(centre),
                    ));
                }
                let Some((lo, hi)) = b.split() else {
                    return Err(("a point of a chart could not be excluded".into(), None));
                };
                stack.push(hi);
                stack.push(lo);
            }
        }
        Ok(leaves)
    }

    /// Finds a slope combination positive on the box ∩ open cone.
    fn exclude(&self, b: &DBox) -> Option<Vec<(usize, BigInt)>> {
        for a in 0..self.r {
            for sgn in [1i64, -1] {
                let terms = vec![(a, BigInt::from(sgn))];
                if positive_on_box(&self.combo_matrix(&terms), b) {
                    return Some(terms);
                }
            }
        }
        let data: Vec<Vec<BigInt>> = (0..self.r).map(|a| self.box_data(a, b)).collect();
        if let Some(terms) = self.perceptron_combo(&data, b) {
            return Some(terms);
        }
        if let Some(terms) = self.vertex_combo(b) {
            return Some(terms);
        }
        // Pairs: cancel one coefficient of the lower-bound data.
        for a in 0..self.r {
            for c in a + 1..self.r {
                for k in 0..data[a].len() {
                    let (x, y) = (&data[a][k], &data[c][k]);
                    if x.is_zero() || y.is_zero() {
                        continue;
                    }
                    let g = x.gcd(y);
                    let (ca, cc) = (y / &g, -(x / &g));
                    for sgn in [1i64, -1] {
                        let terms = vec![(a, &ca * sgn), (c, &cc * sgn)];
                        if positive_on_box(&self.combo_matrix(&terms), b) {
                            return Some(terms);
                        }
                    }
                }
            }
        }
        None
    }

    /// Float perceptron for weights `λ` making every non-zero column of the
    /// lower-corner data `(c0, g_i)` positive; the rounded integer weights are
    /// then tested exactly by `positive_on_box`.
    fn perceptron_combo(&self, data: &[Vec<BigInt>], b: &DBox) -> Option<Vec<(usize, BigInt)>> {
        let r = self.r;
        let ncol = data.first()?.len();
        let mut cols: Vec<Vec<f64>> = Vec::new();
        for k in 0..ncol {
            let c: Vec<f64> = (0..r).map(|a| data[a][k].to_f64().unwrap_or(0.0)).collect();
            let n = c.iter().map(|v| v * v).sum::<f64>().sqrt();
            if n > 0.0 && n.is_finite() {
                cols.push(c.iter().map(|v| v / n).collect());
            }
        }
        if cols.is_empty() {
            return None;
        }
        let mut lam = vec![0.0f64; r];
        for it in 0..400 {
            let (worst, val) = cols
                .iter()
                .enumerate()
                .map(|(k, c)| (k, c.iter().zip(&lam).map(|(x, y)| x * y).sum::<f64>()))
                .min_by(|x, y| x.1.total_cmp(&y.1))?;
            if val > 0.0 || it % 50 == 49 {
                let mx = lam.iter().fold(0.0f64, |a, v| a.max(v.abs()));
                if mx > 0.0 {
                    let terms: Vec<(usize, BigInt)> = lam
                        .iter()
                        .enumerate()
                        .filter_map(|(a, v)| {
                            let q = (v / mx * 4096.0).round() as i64;
                            (q != 0).then(|| (a, BigInt::from(q)))
                        })
                        .collect();
                    if !terms.is_empty() && positive_on_box(&self.combo_matrix(&terms), b) {
                        let mut g = BigInt::zero();
                        for (_, c) in &terms {
                            g = g.gcd(c);
                        }
                        return Some(terms.into_iter().map(|(a, c)| (a, c / &g)).collect());
                    }
                }
                if val > 0.0 {
                    return None;
                }
            }
            for a in 0..r {
                lam[a] += cols[worst][a];
            }
        }
        None
    }

    /// Combinations of basis slopes that vanish on `q - 1` coefficients of
    /// the box data `(c0, g_i, C_ij)`; each is tested exactly.
    fn vertex_combo(&self, b: &DBox) -> Option<Vec<(usize, BigInt)>> {
        let m = self.m;
        let free: Vec<usize> = (0..m).filter(|&i| !b.w[i].is_zero()).collect();
        let mut cols: Vec<Vec<BigRational>> = Vec::new();
        let data: Vec<Vec<BigInt>> = self.basis.iter().map(|&a| self.box_data(a, b)).collect();
        for k in 0..data.first()?.len() {
            cols.push(data.iter().map(|d| big_to_rat(&d[k])).collect());
        }
        cols.extend(self.upper_triangle_columns(&free));
        for lam in vertex_combinations(&cols, self.basis.len(), 150) {
            let terms = self.basis_terms(lam);
            if !terms.is_empty() && positive_on_box(&self.combo_matrix(&terms), b) {
                return Some(terms);
            }
        }
        None
    }

    /// One column per entry `(i, j)`, `i <= j` taken from `coords`, holding `(M_a)_{ij}` for every basis bundle.
    fn upper_triangle_columns(&self, coords: &[usize]) -> Vec<Vec<BigRational>> {
        let mut cols = Vec::new();
        for (x, &i) in coords.iter().enumerate() {
            for &j in &coords[x..] {
                cols.push(
                    self.basis
                        .iter()
                        .map(|&a| big_to_rat(&self.mats[a][i][j]))
                        .collect(),
                );
            }
        }
        cols
    }

    /// Pair the coefficients `lam` with the basis bundles, dropping zero coefficients.
    fn basis_terms(&self, lam: Vec<BigInt>) -> Vec<(usize, BigInt)> {
        self.basis
            .iter()
            .zip(lam)
            .filter(|(_, c)| !c.is_zero())
            .map(|(&a, c)| (a, c))
            .collect()
    }

    /// A combination `Σ λ_a M_a` that is entrywise `>= 0` and non-zero.
    pub(super) fn combination_obstruction(&self) -> Option<Vec<(usize, BigInt)>> {
        let all: Vec<usize> = (0..self.m).collect();
        let cols = self.upper_triangle_columns(&all);
        for lam in vertex_combinations(&cols, self.basis.len(), 3000) {
            let terms = self.basis_terms(lam);
            if !terms.is_empty()
                && Self::sign_of_matrix(&self.combo_matrix(&terms)) == Some(Sign::Positive)
            {
                return Some(terms);
            }
        }
        None
    }

    /// `(c0, g_i ...)` of `μ_a` at the lower corner of the box (scaled).
    fn box_data(&self, a: usize, b: &DBox) -> Vec<BigInt> {
        let mat = &self.mats[a];
        let m = self.m;
        let mut out = Vec::with_capacity(m + 1);
        let mut cl = vec![BigInt::zero(); m];
        for i in 0..m {
            for j in 0..m {
                cl[i] += &mat[i][j] * &b.lo[j];
            }
        }
        out.push(cl.iter().zip(&b.lo).map(|(x, y)| x * y).sum());
        for i in 0..m {
            if !b.w[i].is_zero() {
                out.push(&cl[i] * BigInt::from(2));
            }
        }
        out
    }
}
