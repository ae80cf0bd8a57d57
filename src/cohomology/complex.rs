//! The Koszul–Čech double complex of `O_X(k)` and its full spectral-sequence differential (MATH.md §3).
//!
//! The Koszul resolution `K_p = ⊕_{|S|=p} O_A(k − Σ_{j∈S} q_j)` has `E_1^{−p,q} = H^q(A, K_p)`, given by Bott
//! monomial bases ([`super::bott`]). The Čech complex of the standard cover splits monomial by monomial; on each
//! factor the little complex of faces `I ⊇ N(e)` has an explicit contraction (cone on the smallest vertex outside
//! `N(e)`). The tensor trick gives a deformation retract `(ι, π, h)` of the ambient Čech complex onto the Bott
//! bases, and the homological perturbation lemma with perturbation `t = (−1)^q d_K` gives
//! `D = π Σ_{r≥0} (−t h)^r t ι = d_1 + d_2 + …` on `E_1`, whose cohomology is `H^•(X, O_X(k))`, and the lift
//! `ι' = ι − h Σ_r (−t h)^r t ι` of a class to a genuine Čech–Koszul cocycle. Sign conventions are those of
//! MATH.md §3 and are verified by the tests (D∘D = 0, lifted classes are cocycles, Serre duality, HRR,
//! Macaulay2 reference values).
//!
//! Invariant: [`E1Page`] lists the non-zero groups of each total degree `m = q − p` ordered by `p` descending,
//! so in a degree-`m` coordinate vector a smaller index never has a smaller `p` (used for types).

use super::bott::{BottGroup, FactorKind, bott_group};
use crate::arith::{Field, SparseMatrix};
use crate::poly::VariableLayout;
use rustc_hash::FxHashMap as HashMap;

/// One non-zero `E_1` group: `H^q(A, O_A(k − q_S))` for the Koszul index set `S` (a bitmask over equations).
#[derive(Clone, Debug)]
pub struct E1Group {
    /// Equations in `S` as a bitmask (bit `j` = equation `j`, 0-based).
    pub koszul: u32,
    /// `p = |S|`.
    pub p: usize,
    /// The ambient cohomology group with its Bott basis (its `q` is the Čech degree).
    pub bott: BottGroup,
    /// Total degree `m = q − p`.
    pub total_degree: i64,
    /// Offset of this group's basis inside the degree-`m` coordinates.
    pub offset: usize,
}

/// The `E_1` page of one line bundle (see the module invariant).
#[derive(Clone, Debug)]
pub struct E1Page {
    pub bundle: Vec<i64>,
    pub groups: Vec<E1Group>,
    by_koszul: HashMap<u32, usize>,
    /// `dim E_1^m` for every total degree that occurs.
    pub degree_dims: HashMap<i64, usize>,
}

/// The multidegree of `O_A(k − Σ_{j∈S} q_j)`.
pub fn koszul_degree(k: &[i64], equations: &[Vec<u32>], s: u32) -> Vec<i64> {
    let mut d = k.to_vec();
    for (j, q) in equations.iter().enumerate() {
        if s & (1 << j) != 0 {
            for (di, &qi) in d.iter_mut().zip(q) {
                *di -= qi as i64;
            }
        }
    }
    d
}

impl E1Page {
    /// Build the page: enumerate all `2^K` Koszul index sets and the non-zero Bott groups.
    /// Precondition: sizes were checked by the caller (see `super::estimate_e1_size`).
    pub fn new(layout: &VariableLayout, equations: &[Vec<u32>], k: &[i64]) -> Self {
        let kk = equations.len();
        let mut groups = Vec::new();
        for s in 0u32..(1u32 << kk) {
            let d = koszul_degree(k, equations, s);
            if let Some(bott) = bott_group(layout, &d) {
                let p = s.count_ones() as usize;
                groups.push(E1Group {
                    koszul: s,
                    p,
                    total_degree: bott.q as i64 - p as i64,
                    bott,
                    offset: 0,
                });
            }
        }
        // Order: by total degree, then p descending, then S.
        groups.sort_by_key(|g| (g.total_degree, std::cmp::Reverse(g.p), g.koszul));
        let mut degree_dims: HashMap<i64, usize> = HashMap::default();
        for g in &mut groups {
            let entry = degree_dims.entry(g.total_degree).or_insert(0);
            g.offset = *entry;
            *entry += g.bott.dim();
        }
        let by_koszul = groups
            .iter()
            .enumerate()
            .map(|(i, g)| (g.koszul, i))
            .collect();
        E1Page {
            bundle: k.to_vec(),
            groups,
            by_koszul,
            degree_dims,
        }
    }

    /// `dim E_1^m`.
    pub fn dim(&self, m: i64) -> usize {
        self.degree_dims.get(&m).copied().unwrap_or(0)
    }

    /// The group with Koszul set `s`, if non-zero.
    pub fn group(&self, s: u32) -> Option<&E1Group> {
        self.by_koszul.get(&s).map(|&i| &self.groups[i])
    }

    /// True when some group reachable from `g` by a higher differential `d_r` (`r ≥ 2`) is non-zero:
    /// `d_r: E^{−p,q} → E^{−p+r, q−r+1}`.
    pub fn needs_higher(&self, g: &E1Group) -> bool {
        self.groups.iter().any(|h| {
            h.koszul & !g.koszul == 0
                && h.p + 2 <= g.p
                && h.bott.q as i64 == g.bott.q as i64 - (g.p - h.p) as i64 + 1
        })
    }

    /// True when some differential `d_r` (`r ≥ 1`) can map a degree-`m` group to a degree-`m+1` group: the
    /// target's Koszul set must be a proper subset of the source's (`t` removes one equation, the contraction
    /// keeps it). Otherwise the matrix of `D_m` is structurally zero, for every choice of polynomials.
    pub fn map_can_act(&self, m: i64) -> bool {
        self.groups_of_degree(m).any(|g| {
            self.groups_of_degree(m + 1)
                .any(|h| h.p < g.p && h.koszul & !g.koszul == 0)
        })
    }

    /// The group holding coordinate `idx` of degree `m`, and the local index inside it.
    /// Precondition: `idx < dim E_1^m` (panics otherwise).
    pub fn locate(&self, m: i64, idx: usize) -> (&E1Group, usize) {
        let g = self
            .groups_of_degree(m)
            .find(|g| idx >= g.offset && idx < g.offset + g.bott.dim())
            .expect("E1Page::locate: index inside degree m");
        (g, idx - g.offset)
    }

    /// Groups of total degree `m`, in coordinate order.
    pub fn groups_of_degree(&self, m: i64) -> impl Iterator<Item = &E1Group> {
        self.groups.iter().filter(move |g| g.total_degree == m)
    }
}

/// The defining polynomials with coefficients in a field: per equation, its terms (exponents, coefficient).
#[derive(Clone, Debug)]
pub struct FieldPolys<E> {
    pub terms: Vec<Vec<(Vec<i32>, E)>>,
}

/// A Čech–Koszul cochain basis element: a Laurent monomial, one face (bitmask of vertices) per factor, and the
/// Koszul index set `S`.
#[derive(Clone, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct CechKey {
    pub exps: Vec<i32>,
    pub faces: Vec<u64>,
    pub koszul: u32,
}

/// A Čech–Koszul cochain: finitely many basis elements with non-zero coefficients.
pub type Cochain<E> = HashMap<CechKey, E>;

/// The double complex for one line bundle over a field, with the machinery of the module docs.
pub struct Complex<'a, F: Field> {
    pub field: &'a F,
    pub layout: &'a VariableLayout,
    pub page: &'a E1Page,
    pub polys: &'a FieldPolys<F::Elem>,
}

fn add_into<F: Field>(field: &F, c: &mut Cochain<F::Elem>, key: CechKey, v: F::Elem) {
    if field.is_zero(&v) {
        return;
    }
    use std::collections::hash_map::Entry;
    match c.entry(key) {
        Entry::Vacant(e) => {
            e.insert(v);
        }
        Entry::Occupied(mut e) => {
            let s = field.add(e.get(), &v);
            if field.is_zero(&s) {
                e.remove();
            } else {
                *e.get_mut() = s;
            }
        }
    }
}

/// `σ(l, I) = (−1)^{#{i ∈ I : i < l}}`.
fn sigma(l: usize, face: u64) -> bool {
    (face & ((1u64 << l) - 1)).count_ones() % 2 == 1
}

impl<F: Field> Complex<'_, F> {
    fn negative_support(&self, e: &[i32], i: usize) -> u64 {
        let mut mask = 0u64;
        for (l, &x) in e[self.layout.range(i)].iter().enumerate() {
            if x < 0 {
                mask |= 1 << l;
            }
        }
        mask
    }

    fn full_mask(&self, i: usize) -> u64 {
        (1u64 << (self.layout.dims()[i] + 1)) - 1
    }

    fn cech_degree(faces: &[u64]) -> usize {
        faces.iter().map(|f| f.count_ones() as usize - 1).sum()
    }

    /// `ι`: a Bott basis element of group `g` as a Čech cochain (`Σ_l [l]` on section factors, the full face on
    /// top factors).
    pub fn iota(&self, g: &E1Group, local: usize, coeff: F::Elem) -> Cochain<F::Elem> {
        let e = &g.bott.basis[local];
        let mut faces_list: Vec<Vec<u64>> = vec![Vec::new()];
        for (i, kind) in g.bott.kinds.iter().enumerate() {
            let choices: Vec<u64> = match kind {
                FactorKind::Top => vec![self.full_mask(i)],
                FactorKind::Sections => (0..=self.layout.dims()[i]).map(|l| 1u64 << l).collect(),
            };
            faces_list = faces_list
                .into_iter()
                .flat_map(|f| {
                    choices.iter().map(move |&c| {
                        let mut f2 = f.clone();
                        f2.push(c);
                        f2
                    })
                })
                .collect();
        }
        let mut out = Cochain::with_capacity_and_hasher(faces_list.len(), Default::default());
        for faces in faces_list {
            out.insert(
                CechKey {
                    exps: e.clone(),
                    faces,
                    koszul: g.koszul,
                },
                coeff.clone(),
            );
        }
        out
    }

    /// The perturbation `t = (−1)^q d_K`, `d_K(e_S) = Σ_{pos} (−1)^{pos} p_j e_{S∖j}`.
    pub fn t(&self, x: &Cochain<F::Elem>) -> Cochain<F::Elem> {
        let f = self.field;
        let mut out = Cochain::default();
        for (key, c) in x {
            let q = Self::cech_degree(&key.faces);
            let mut pos = 0;
            for (j, terms) in self.polys.terms.iter().enumerate() {
                if key.koszul & (1 << j) == 0 {
                    continue;
                }
                let negate = (q + pos) % 2 == 1;
                pos += 1;
                let base = if negate { f.neg(c) } else { c.clone() };
                for (alpha, a) in terms {
                    let exps: Vec<i32> = key.exps.iter().zip(alpha).map(|(x, y)| x + y).collect();
                    add_into(
                        f,
                        &mut out,
                        CechKey {
                            exps,
                            faces: key.faces.clone(),
                            koszul: key.koszul & !(1 << j),
                        },
                        f.mul(&base, a),
                    );
                }
            }
        }
        out
    }

    /// The product contraction `h = Σ_i (−1)^{q_1+…+q_{i−1}} (ιπ)_1 ⊗ … ⊗ (ιπ)_{i−1} ⊗ h_i ⊗ 1 ⊗ … ⊗ 1`.
    pub fn h(&self, x: &Cochain<F::Elem>) -> Cochain<F::Elem> {
        let f = self.field;
        let m = self.layout.dims().len();
        let mut out = Cochain::default();
        for (key, c) in x {
            let neg: Vec<u64> = (0..m)
                .map(|i| self.negative_support(&key.exps, i))
                .collect();
            // prefixes: the possible images of factors 0..i under (ιπ), built incrementally.
            let mut prefixes: Vec<Vec<u64>> = vec![Vec::new()];
            let mut sign_degree = 0usize;
            for i in 0..m {
                let face = key.faces[i];
                let full = self.full_mask(i);
                // h_i on factor i.
                if neg[i] != full {
                    let v = (!neg[i] & full).trailing_zeros() as usize;
                    if face & (1 << v) != 0 && face.count_ones() >= 2 {
                        let rest = face & !(1 << v);
                        let negate = (sign_degree % 2 == 1) ^ sigma(v, rest);
                        let val = if negate { f.neg(c) } else { c.clone() };
                        for pre in &prefixes {
                            let mut faces = pre.clone();
                            faces.push(rest);
                            faces.extend_from_slice(&key.faces[i + 1..]);
                            add_into(
                                f,
                                &mut out,
                                CechKey {
                                    exps: key.exps.clone(),
                                    faces,
                                    koszul: key.koszul,
                                },
                                val.clone(),
                            );
                        }
                    }
                }
                sign_degree += face.count_ones() as usize - 1;
                // extend prefixes by (ιπ)_i.
                if neg[i] == full {
                    for pre in &mut prefixes {
                        pre.push(face);
                    }
                } else if neg[i] == 0 && face == 1 {
                    let n = self.layout.dims()[i];
                    prefixes = prefixes
                        .into_iter()
                        .flat_map(|pre| {
                            (0..=n).map(move |l| {
                                let mut p2 = pre.clone();
                                p2.push(1u64 << l);
                                p2
                            })
                        })
                        .collect();
                } else {
                    break; // (ιπ)_i = 0: no later factor can carry h.
                }
            }
        }
        out
    }

    /// The Čech differential `δ = Σ_i (−1)^{q_1+…+q_{i−1}} δ_i`, `δ_i[I] = Σ_{l∉I} σ(l, I)[I∪{l}]`.
    pub fn delta(&self, x: &Cochain<F::Elem>) -> Cochain<F::Elem> {
        let f = self.field;
        let mut out = Cochain::default();
        for (key, c) in x {
            let mut sign_degree = 0usize;
            for i in 0..key.faces.len() {
                let face = key.faces[i];
                for l in 0..=self.layout.dims()[i] {
                    if face & (1 << l) != 0 {
                        continue;
                    }
                    let negate = (sign_degree % 2 == 1) ^ sigma(l, face);
                    let mut faces = key.faces.clone();
                    faces[i] = face | (1 << l);
                    add_into(
                        f,
                        &mut out,
                        CechKey {
                            exps: key.exps.clone(),
                            faces,
                            koszul: key.koszul,
                        },
                        if negate { f.neg(c) } else { c.clone() },
                    );
                }
                sign_degree += face.count_ones() as usize - 1;
            }
        }
        out
    }

    /// `π`: project a cochain onto `E_1` coordinates, as (total degree, index, coefficient) triples.
    pub fn pi(&self, x: &Cochain<F::Elem>) -> Vec<(i64, usize, F::Elem)> {
        let m = self.layout.dims().len();
        let mut out = Vec::new();
        'terms: for (key, c) in x {
            let Some(g) = self.page.group(key.koszul) else {
                continue;
            };
            for i in 0..m {
                let neg = self.negative_support(&key.exps, i);
                let full = self.full_mask(i);
                let ok = if neg == full {
                    true
                } else if neg == 0 {
                    key.faces[i] == 1
                } else {
                    false
                };
                if !ok {
                    continue 'terms;
                }
            }
            if let Some(local) = g.bott.position(&key.exps) {
                out.push((g.total_degree, g.offset + local, c.clone()));
            }
        }
        out
    }

    /// `A ι(v) = Σ_{r≥0} (−t h)^r t ι(v)` as a list of cochains `[t ι v, (−th) t ι v, …]`, stopping at zero.
    fn perturbation_series(&self, start: Cochain<F::Elem>) -> Vec<Cochain<F::Elem>> {
        self.series(start, false)
    }

    /// The series of [`Complex::perturbation_series`]; with `only_projected`, terms that cannot survive `π`
    /// are dropped early: an `h`-output with `|S| = 1` is followed by a last `t` (which keeps faces), so it
    /// can only reach `E_1` when every face is `{0}` or the full simplex and `E_1` has a group at `S = ∅`.
    /// The projections `π` of the returned terms are unchanged; the cochains themselves are not (use the
    /// unpruned series for lifts).
    fn series(&self, start: Cochain<F::Elem>, only_projected: bool) -> Vec<Cochain<F::Elem>> {
        let f = self.field;
        let m = self.layout.dims().len();
        let has_empty_group = self.page.group(0).is_some();
        let mut terms = Vec::new();
        let mut cur = self.t(&start);
        while !cur.is_empty() {
            let mut hx = self.h(&cur);
            if only_projected {
                hx.retain(|key, _| {
                    key.koszul.count_ones() != 1
                        || (has_empty_group
                            && (0..m)
                                .all(|i| key.faces[i] == 1 || key.faces[i] == self.full_mask(i)))
                });
            }
            let next = self.t(&hx);
            terms.push(cur);
            cur = next.into_iter().map(|(k, v)| (k, f.neg(&v))).collect();
        }
        terms
    }

    /// The image `D(b)` of the basis element `local` of group `g`, through the full perturbation series
    /// (`d_1` included). This is the general, slower path; [`Complex::d1_fast`] computes the `d_1` part directly.
    /// With `skip_d1`, only `d_2 + d_3 + …` is returned.
    pub fn differential_perturbative(
        &self,
        g: &E1Group,
        local: usize,
        skip_d1: bool,
    ) -> Vec<(usize, F::Elem)> {
        let series = self.series(self.iota(g, local, self.field.one()), true);
        let mut out = Vec::new();
        for (r, term) in series.iter().enumerate() {
            if skip_d1 && r == 0 {
                continue;
            }
            for (m, idx, c) in self.pi(term) {
                debug_assert_eq!(m, g.total_degree + 1);
                out.push((idx, c));
            }
        }
        out
    }

    /// `d_1(b)`: multiplication by the equations between Bott bases, dropping products whose sign pattern
    /// changes, with the sign `(−1)^{q + pos}` of `t`.
    pub fn d1_fast(&self, g: &E1Group, local: usize) -> Vec<(usize, F::Elem)> {
        let f = self.field;
        let e = &g.bott.basis[local];
        let mut out = Vec::new();
        let mut pos = 0;
        for (j, terms) in self.polys.terms.iter().enumerate() {
            if g.koszul & (1 << j) == 0 {
                continue;
            }
            let negate = (g.bott.q + pos) % 2 == 1;
            pos += 1;
            let Some(target) = self.page.group(g.koszul & !(1 << j)) else {
                continue;
            };
            let mut prod = e.clone();
            'alpha: for (alpha, a) in terms {
                for (v, (x, y)) in prod.iter_mut().zip(e.iter().zip(alpha)) {
                    *v = x + y;
                }
                for (i, kind) in g.bott.kinds.iter().enumerate() {
                    if *kind == FactorKind::Top
                        && prod[self.layout.range(i)].iter().any(|&x| x >= 0)
                    {
                        continue 'alpha;
                    }
                }
                if let Some(row) = target.bott.position(&prod) {
                    out.push((
                        target.offset + row,
                        if negate { f.neg(a) } else { a.clone() },
                    ));
                }
            }
        }
        out
    }

    /// The matrix of `D: E_1^m → E_1^{m+1}` (rows: degree `m+1` coordinates, columns: degree `m`).
    pub fn differential_matrix(&self, m: i64) -> SparseMatrix<F::Elem> {
        let ncols = self.page.dim(m);
        let nrows = self.page.dim(m + 1);
        let mut triplets = Vec::new();
        if ncols > 0 && nrows > 0 {
            for g in self.page.groups_of_degree(m) {
                let higher = self.page.needs_higher(g);
                for local in 0..g.bott.dim() {
                    let col = g.offset + local;
                    for (row, c) in self.d1_fast(g, local) {
                        triplets.push((row, col, c));
                    }
                    if higher {
                        for (row, c) in self.differential_perturbative(g, local, true) {
                            triplets.push((row, col, c));
                        }
                    }
                }
            }
        }
        SparseMatrix::from_triplets(self.field, nrows, ncols, triplets)
    }

    /// The lift `ι'(v) = ι(v) − h A ι(v)` of an `E_1^m` vector to a Čech–Koszul cochain; when `D v = 0` it is a
    /// cocycle of the total differential `δ + t`.
    pub fn lift(&self, m: i64, v: &[(usize, F::Elem)]) -> Cochain<F::Elem> {
        let f = self.field;
        let mut start = Cochain::default();
        for (idx, c) in v {
            let (g, local) = self.page.locate(m, *idx);
            for (k, val) in self.iota(g, local, c.clone()) {
                add_into(f, &mut start, k, val);
            }
        }
        let mut out = start.clone();
        for term in self.perturbation_series(start) {
            for (k, val) in self.h(&term) {
                add_into(f, &mut out, k, f.neg(&val));
            }
        }
        out
    }

    /// The projection `π'(x) = π(x) − π A h(x)` of a cochain to `E_1` coordinates (total degree, index,
    /// coefficient; entries may repeat and must be summed). It is the chain map back to `(E_1, D)` of the
    /// perturbation lemma, so a cocycle of `δ + t` goes to a `D`-cocycle in the same class, and
    /// `π' ι' = id`. Only terms that can survive `π` are kept in the series.
    pub fn pi_prime(&self, x: &Cochain<F::Elem>) -> Vec<(i64, usize, F::Elem)> {
        let f = self.field;
        let mut out = self.pi(x);
        let hx = self.h(x);
        if !hx.is_empty() {
            for term in self.series(hx, true) {
                out.extend(
                    self.pi(&term)
                        .into_iter()
                        .map(|(m, i, c)| (m, i, f.neg(&c))),
                );
            }
        }
        out
    }

    /// The total differential `δ + t` of the Čech–Koszul complex (zero on lifted classes).
    pub fn total_differential(&self, x: &Cochain<F::Elem>) -> Cochain<F::Elem> {
        let mut out = self.delta(x);
        for (k, v) in self.t(x) {
            add_into(self.field, &mut out, k, v);
        }
        out
    }
}
