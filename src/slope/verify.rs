//! The independent re-check behind [`super::verify_certificate`].
//!
//! This module is written separately from the certifier (`certify/`) and shares none of its helpers: it
//! validates the input itself, builds the slope forms `μ_a(t) = Σ_{r,s,u} d_{rsu} k_a^r t^s t^u` itself (as
//! rational coefficient matrices, and evaluates a proposed zero straight from the triple sum), and has its own
//! rational interval arithmetic ([`Span`]), its own Gaussian elimination, its own replay of the bisection and
//! its own positivity test on a box. So one bug in a shared helper cannot both produce a wrong certificate
//! and accept it. The only common items are the certificate data types of `super` (read through their public
//! fields and the end-point accessors of [`super::Interval`]).
//!
//! Invariant: every `true` rests on exact `BigRational` arithmetic only; malformed input and malformed
//! certificates give `false`, never a panic.

use super::{ExcludedBox, ExistsCertificate, NoneCertificate, Sign, SlopeZero, Term};
use num_bigint::BigInt;
use num_rational::BigRational;
use num_traits::{One, Signed, Zero};

/// Deepest bisection level the replay accepts (the certifier never goes deeper).
const MAX_DEPTH: usize = 200;

/// The slope problem as the verifier sees it.
struct Forms<'a> {
    m: usize,
    triple: &'a [Vec<Vec<i64>>],
    bundles: &'a [Vec<i64>],
    /// `coeff[a][s][u] = Σ_r k_a^r d_{rsu}`.
    coeff: Vec<Vec<Vec<BigRational>>>,
}

/// A closed rational interval `[lo, hi]`, `lo <= hi` (the verifier's own interval arithmetic).
#[derive(Clone, Debug)]
struct Span {
    lo: BigRational,
    hi: BigRational,
}

impl Span {
    fn at(x: BigRational) -> Span {
        Span {
            lo: x.clone(),
            hi: x,
        }
    }

    fn plus(&self, o: &Span) -> Span {
        Span {
            lo: &self.lo + &o.lo,
            hi: &self.hi + &o.hi,
        }
    }

    fn minus(&self, o: &Span) -> Span {
        Span {
            lo: &self.lo - &o.hi,
            hi: &self.hi - &o.lo,
        }
    }

    fn times(&self, o: &Span) -> Span {
        let products = [
            &self.lo * &o.lo,
            &self.lo * &o.hi,
            &self.hi * &o.lo,
            &self.hi * &o.hi,
        ];
        let lo = products
            .iter()
            .min()
            .cloned()
            .unwrap_or_else(BigRational::zero);
        let hi = products
            .iter()
            .max()
            .cloned()
            .unwrap_or_else(BigRational::zero);
        Span { lo, hi }
    }

    fn times_scalar(&self, c: &BigRational) -> Span {
        self.times(&Span::at(c.clone()))
    }

    /// `self ⊂ interior(o)`.
    fn strictly_within(&self, o: &Span) -> bool {
        o.lo < self.lo && self.hi < o.hi
    }
}

fn q(n: i64) -> BigRational {
    BigRational::from_integer(BigInt::from(n))
}

/// Rank of a list of rational rows (elimination to row echelon form).
fn row_rank(mut rows: Vec<Vec<BigRational>>) -> usize {
    let width = rows.iter().map(|r| r.len()).max().unwrap_or(0);
    let mut rank = 0usize;
    for col in 0..width {
        let Some(pivot) =
            (rank..rows.len()).find(|&i| rows[i].get(col).is_some_and(|v| !v.is_zero()))
        else {
            continue;
        };
        rows.swap(rank, pivot);
        let head = rows[rank][col].clone();
        for i in rank + 1..rows.len() {
            let factor = match rows[i].get(col) {
                Some(v) if !v.is_zero() => v / &head,
                _ => continue,
            };
            for c in col..width {
                let sub = rows[rank].get(c).map(|v| v * &factor);
                if let (Some(s), Some(x)) = (sub, rows[i].get_mut(c)) {
                    *x -= s;
                }
            }
        }
        rank += 1;
    }
    rank
}

impl<'a> Forms<'a> {
    /// `None` on any malformed input (not cubic, asymmetric, no bundles, wrong bundle length).
    fn new(triple: &'a [Vec<Vec<i64>>], bundles: &'a [Vec<i64>]) -> Option<Forms<'a>> {
        let m = triple.len();
        if m == 0 || bundles.is_empty() {
            return None;
        }
        for plane in triple {
            if plane.len() != m || plane.iter().any(|row| row.len() != m) {
                return None;
            }
        }
        for r in 0..m {
            for s in 0..m {
                for u in 0..m {
                    let v = triple[r][s][u];
                    let perms = [
                        triple[r][u][s],
                        triple[s][r][u],
                        triple[s][u][r],
                        triple[u][r][s],
                        triple[u][s][r],
                    ];
                    if perms.iter().any(|&w| w != v) {
                        return None;
                    }
                }
            }
        }
        if bundles.iter().any(|k| k.len() != m) {
            return None;
        }
        let coeff = bundles
            .iter()
            .map(|k| {
                (0..m)
                    .map(|s| {
                        (0..m)
                            .map(|u| {
                                k.iter()
                                    .enumerate()
                                    .map(|(r, &kr)| q(kr) * q(triple[r][s][u]))
                                    .sum()
                            })
                            .collect()
                    })
                    .collect()
            })
            .collect();
        Some(Forms {
            m,
            triple,
            bundles,
            coeff,
        })
    }

    /// `μ_a(t)` straight from the triple sum (not from the coefficient matrices).
    fn slope_at(&self, a: usize, t: &[BigRational]) -> BigRational {
        let mut total = BigRational::zero();
        for (r, &kr) in self.bundles[a].iter().enumerate() {
            if kr == 0 {
                continue;
            }
            for s in 0..self.m {
                for u in 0..self.m {
                    let d = self.triple[r][s][u];
                    if d != 0 {
                        total += q(kr) * q(d) * &t[s] * &t[u];
                    }
                }
            }
        }
        total
    }

    /// `Σ coeff · coeff_matrix(bundle)`, `None` for an empty list or a bundle out of range.
    fn combined(&self, terms: &[Term]) -> Option<Vec<Vec<BigRational>>> {
        if terms.is_empty() || terms.iter().any(|t| t.bundle >= self.bundles.len()) {
            return None;
        }
        let mut out = vec![vec![BigRational::zero(); self.m]; self.m];
        for t in terms {
            for s in 0..self.m {
                for u in 0..self.m {
                    out[s][u] += &t.coeff * &self.coeff[t.bundle][s][u];
                }
            }
        }
        Some(out)
    }

    fn flattened(&self, a: usize) -> Vec<BigRational> {
        self.coeff[a].iter().flatten().cloned().collect()
    }

    fn check(&self, result: &SlopeZero) -> bool {
        match result {
            SlopeZero::Exists(ExistsCertificate::RationalPoint { point }) => {
                point.len() == self.m
                    && point.iter().all(|x| x.is_positive())
                    && (0..self.bundles.len()).all(|a| self.slope_at(a, point).is_zero())
            }
            SlopeZero::Exists(ExistsCertificate::KrawczykBox {
                bx,
                free,
                fixed,
                equations,
                preconditioner,
            }) => {
                let spans: Vec<Span> = bx
                    .iter()
                    .map(|iv| Span {
                        lo: iv.lo().clone(),
                        hi: iv.hi().clone(),
                    })
                    .collect();
                self.check_krawczyk(&spans, free, fixed, equations, preconditioner)
            }
            SlopeZero::None(NoneCertificate::SignObstruction { bundle, sign }) => {
                *bundle < self.bundles.len() && constant_sign(&self.coeff[*bundle]) == Some(*sign)
            }
            SlopeZero::None(NoneCertificate::CombinationObstruction { combination }) => self
                .combined(combination)
                .is_some_and(|c| constant_sign(&c) == Some(Sign::Positive)),
            SlopeZero::None(NoneCertificate::Subdivision { boxes }) => {
                self.check_subdivision(boxes)
            }
            SlopeZero::Undecided { .. } => false,
        }
    }

    fn check_krawczyk(
        &self,
        bx: &[Span],
        free: &[usize],
        fixed: &[(usize, BigRational)],
        equations: &[usize],
        y: &[Vec<BigRational>],
    ) -> bool {
        let m = self.m;
        let n = free.len();
        if n == 0
            || bx.len() != n
            || equations.len() != n
            || y.len() != n
            || y.iter().any(|row| row.len() != n)
            || fixed.is_empty()
            || n + fixed.len() != m
        {
            return false;
        }
        // free and fixed partition the coordinates
        let mut used = vec![false; m];
        for &i in free.iter().chain(fixed.iter().map(|(i, _)| i)) {
            if i >= m || used[i] {
                return false;
            }
            used[i] = true;
        }
        if fixed.iter().any(|(_, v)| !v.is_positive())
            || bx.iter().any(|s| !s.lo.is_positive() || s.lo > s.hi)
            || equations.iter().any(|&e| e >= self.bundles.len())
        {
            return false;
        }
        // every slope form lies in the span of the chosen equations, which are independent
        let chosen: Vec<Vec<BigRational>> = equations.iter().map(|&e| self.flattened(e)).collect();
        if row_rank(chosen.clone()) != n {
            return false;
        }
        for a in 0..self.bundles.len() {
            let mut with_a = chosen.clone();
            with_a.push(self.flattened(a));
            if row_rank(with_a) != n {
                return false;
            }
        }
        // t as intervals (box) and as the box centre
        let two = q(2);
        let mut t_box: Vec<Span> = vec![Span::at(BigRational::zero()); m];
        let mut t_mid: Vec<BigRational> = vec![BigRational::zero(); m];
        for (i, v) in fixed {
            t_box[*i] = Span::at(v.clone());
            t_mid[*i] = v.clone();
        }
        let centre: Vec<BigRational> = bx.iter().map(|s| (&s.lo + &s.hi) / &two).collect();
        for (k, &i) in free.iter().enumerate() {
            t_box[i] = bx[k].clone();
            t_mid[i] = centre[k].clone();
        }
        let f_mid: Vec<BigRational> = equations
            .iter()
            .map(|&e| self.slope_at(e, &t_mid))
            .collect();
        // ∂μ_e/∂t^i = 2 Σ_j coeff_e[i][j] t^j, enclosed over the box
        let jac: Vec<Vec<Span>> = equations
            .iter()
            .map(|&e| {
                free.iter()
                    .map(|&i| {
                        let mut acc = Span::at(BigRational::zero());
                        for j in 0..m {
                            let c = &self.coeff[e][i][j];
                            if !c.is_zero() {
                                acc = acc.plus(&t_box[j].times_scalar(&(c * &two)));
                            }
                        }
                        acc
                    })
                    .collect()
            })
            .collect();
        // K(X) = c − Y F(c) + (I − Y J(X)) (X − c) must lie in the interior of X
        for p in 0..n {
            let mut yf = BigRational::zero();
            for e in 0..n {
                yf += &y[p][e] * &f_mid[e];
            }
            let mut image = Span::at(&centre[p] - yf);
            for col in 0..n {
                let mut entry = Span::at(if p == col {
                    BigRational::one()
                } else {
                    BigRational::zero()
                });
                for e in 0..n {
                    entry = entry.minus(&jac[e][col].times_scalar(&y[p][e]));
                }
                let offset = Span {
                    lo: &bx[col].lo - &centre[col],
                    hi: &bx[col].hi - &centre[col],
                };
                image = image.plus(&entry.times(&offset));
            }
            if !image.strictly_within(&bx[p]) {
                return false;
            }
        }
        true
    }

    /// Replays the bisection chart by chart and checks every leaf.
    fn check_subdivision(&self, leaves: &[ExcludedBox]) -> bool {
        let m = self.m;
        let mut next = 0usize;
        for chart in 0..m {
            let root: Vec<(BigRational, BigRational)> = (0..m)
                .map(|i| {
                    if i == chart {
                        (q(1), q(1))
                    } else {
                        (q(0), q(1))
                    }
                })
                .collect();
            let mut pending = vec![(root, 0usize)];
            while let Some((cell, depth)) = pending.pop() {
                let Some(leaf) = leaves.get(next) else {
                    return false;
                };
                if leaf.chart != chart || leaf.bx.len() != m {
                    return false;
                }
                let equal = cell
                    .iter()
                    .zip(&leaf.bx)
                    .all(|((lo, hi), iv)| lo == iv.lo() && hi == iv.hi());
                if equal {
                    let Some(c) = self.combined(&leaf.combination) else {
                        return false;
                    };
                    if !positive_on_cell(&c, &cell) {
                        return false;
                    }
                    next += 1;
                    continue;
                }
                let inside = cell
                    .iter()
                    .zip(&leaf.bx)
                    .all(|((lo, hi), iv)| lo <= iv.lo() && iv.hi() <= hi);
                if depth >= MAX_DEPTH || !inside {
                    return false;
                }
                // widest coordinate, lowest index on ties, halved; the lower half is examined first
                let mut axis: Option<usize> = None;
                for i in 0..m {
                    let w = &cell[i].1 - &cell[i].0;
                    if w.is_positive() && axis.is_none_or(|b| w > &cell[b].1 - &cell[b].0) {
                        axis = Some(i);
                    }
                }
                let Some(ax) = axis else {
                    return false;
                };
                let middle = (&cell[ax].0 + &cell[ax].1) / q(2);
                let mut lower = cell.clone();
                lower[ax].1 = middle.clone();
                let mut upper = cell;
                upper[ax].0 = middle;
                pending.push((upper, depth + 1));
                pending.push((lower, depth + 1));
            }
        }
        next == leaves.len()
    }
}

/// `Positive` if every entry is `>= 0` and one is `> 0` (then `tᵀ C t > 0` for all `t > 0`), `Negative` for
/// the mirror case, else `None`.
fn constant_sign(c: &[Vec<BigRational>]) -> Option<Sign> {
    let entries = || c.iter().flatten();
    if entries().all(|v| v.is_zero()) {
        None
    } else if entries().all(|v| !v.is_negative()) {
        Some(Sign::Positive)
    } else if entries().all(|v| !v.is_positive()) {
        Some(Sign::Negative)
    } else {
        None
    }
}

/// Exact sufficient test that `tᵀ C t > 0` for every `t` in the cell `Π [lo_i, hi_i]` (all `lo_i >= 0`)
/// with every `t^i > 0`.
///
/// Write `t = lo + u` with `0 <= u_i <= w_i = hi_i − lo_i`, `g = C lo`, `c0 = loᵀ C lo`. Then
/// `tᵀ C t = c0 + Σ_i u_i (2 g_i + Σ_j C_ij u_j)`.
/// * First order: the bracket is at least `b_i = 2 g_i + Σ_j min(C_ij, 0) w_j`, so
///   `tᵀ C t >= c0 + Σ_{b_i < 0} b_i w_i + Σ_{b_i > 0} b_i u_i`. Positive when the constant part is `> 0`,
///   or `= 0` and some `b_i > 0` has `lo_i = 0` (there `u_i = t^i > 0`).
/// * Second order: if `c0 >= 0`, `g_i >= 0` and `C_ij >= 0` on the coordinates with `w > 0`, every term of
///   `c0 + 2 Σ g_i u_i + Σ C_ij u_i u_j` is `>= 0`; positive when `c0 > 0`, or some `g_i > 0` with
///   `lo_i = 0`, or some `C_ij > 0` with `lo_i = lo_j = 0`.
fn positive_on_cell(c: &[Vec<BigRational>], cell: &[(BigRational, BigRational)]) -> bool {
    let m = cell.len();
    if c.len() != m
        || c.iter().any(|row| row.len() != m)
        || cell.iter().any(|(lo, hi)| lo.is_negative() || lo > hi)
    {
        return false;
    }
    let lo: Vec<&BigRational> = cell.iter().map(|(l, _)| l).collect();
    let w: Vec<BigRational> = cell.iter().map(|(l, h)| h - l).collect();
    let moving: Vec<usize> = (0..m).filter(|&i| w[i].is_positive()).collect();
    let g: Vec<BigRational> = (0..m)
        .map(|i| (0..m).map(|j| &c[i][j] * lo[j]).sum())
        .collect();
    let c0: BigRational = (0..m).map(|i| &g[i] * lo[i]).sum();
    let mut constant = c0.clone();
    let mut strict_edge = false;
    for &i in &moving {
        let mut b = &g[i] * q(2);
        for &j in &moving {
            if c[i][j].is_negative() {
                b += &c[i][j] * &w[j];
            }
        }
        if b.is_negative() {
            constant += b * &w[i];
        } else if b.is_positive() && lo[i].is_zero() {
            strict_edge = true;
        }
    }
    if constant.is_positive() || (constant.is_zero() && strict_edge) {
        return true;
    }
    let all_terms_nonnegative = !c0.is_negative()
        && moving.iter().all(|&i| !g[i].is_negative())
        && moving
            .iter()
            .all(|&i| moving.iter().all(|&j| !c[i][j].is_negative()));
    if !all_terms_nonnegative {
        return false;
    }
    c0.is_positive()
        || moving
            .iter()
            .any(|&i| lo[i].is_zero() && g[i].is_positive())
        || moving.iter().any(|&i| {
            lo[i].is_zero()
                && moving
                    .iter()
                    .any(|&j| lo[j].is_zero() && c[i][j].is_positive())
        })
}

/// See [`super::verify_certificate`].
pub(super) fn verify(triple: &[Vec<Vec<i64>>], bundles: &[Vec<i64>], result: &SlopeZero) -> bool {
    Forms::new(triple, bundles).is_some_and(|f| f.check(result))
}
