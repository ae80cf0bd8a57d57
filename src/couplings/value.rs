//! Exact holomorphic Yukawa couplings `λ(ν_1, ν_2, ν_3) = ∫ Ω ∧ ν_1 ∧ ν_2 ∧ ν_3` for `ν_i ∈ H^1(X, O_X(k_i))`,
//! `k_1 + k_2 + k_3 = 0`, computed over Q with the engine's polynomials (MATH.md §3, §5).
//!
//! Route: each basis class (the shared basis of [`crate::cohomology::class_basis`]) is lifted to a genuine
//! Čech–Koszul cocycle `ι'(v)` of `δ + t`; the three lifts are multiplied with the cup product of the tensor
//! product of DGAs (Alexander–Whitney on each factor's Čech complex, the exterior algebra on the Koszul side,
//! Koszul signs between them — see [`cup_product`]); the product is a `δ + t` cocycle of the complex of
//! `O_X`, and the chain map `π' = π − π A h` takes it to a `D`-cocycle of `E_1^3(O_X)`. `H^3(X, O_X)` is
//! one-dimensional, spanned by the generator `g` = the Laurent monomial with every exponent −1 in
//! `H^{dim A}(A, O_A(−Σ_j q_j)) e_1 ∧ … ∧ e_K`; λ is the number with `π'(z) − λ g ∈ im(D: E_1^2 → E_1^3)`.
//!
//! Invariants: all values of one [`CouplingEngine`] share the normalisation [`NORMALISATION`] (one common
//! normalisation of Ω); λ depends only on the classes (not on the cocycle representatives: adding a
//! `δ + t` coboundary to a lift leaves it unchanged, as the tests check); lifted bases are computed once per
//! bundle and cached; every lift and product is refused beyond [`MAX_COCHAIN_TERMS`] terms.
//!
//! Observed laws (tested in `tests/couplings_invariants.rs`): swapping two slots changes the sign,
//! `λ(ν_2, ν_1, ν_3) = −λ(ν_1, ν_2, ν_3)` (degree-1 classes anticommute under the graded-commutative cup
//! product); rescaling every defining polynomial `p_j → c p_j` multiplies λ by `c^{τ_1+τ_2+τ_3−K}` for the
//! canonical basis; λ = 0 when `τ_1+τ_2+τ_3 < K` (the vanishing theorem, from memory: Blesneag, Buchbinder,
//! Lukas, "Holomorphic Yukawa couplings for complete intersection Calabi-Yau manifolds", JHEP 2017).

use crate::arith::{self, Echelon, RationalField, SparseVec};
use crate::cohomology::complex::{CechKey, Cochain, Complex, E1Page, FieldPolys};
use crate::cohomology::{BasisClass, CohomologyEngine, CohomologyError, class_basis};
use num_rational::BigRational;
use num_traits::{One, Zero};
use rustc_hash::FxHashMap as HashMap;
use std::sync::{Arc, Mutex, OnceLock};
use thiserror::Error;

/// Largest number of Čech–Koszul terms of one lifted cocycle or one cup product.
pub const MAX_COCHAIN_TERMS: usize = 2_000_000;

/// The normalisation statement shared by every value (for the output).
pub const NORMALISATION: &str = "λ(ν1,ν2,ν3) is the coefficient of the generator of H^3(X,O_X) ≅ H^dimA(A,O_A(−Σ_j q_j))·e_1∧…∧e_K given by the Laurent monomial with every exponent −1, in the projection π' of the cup product of the lifted Čech–Koszul cocycles (modulo the image of D); one common normalisation of Ω for all couplings of the model, with the model's polynomials";

static Q: RationalField = RationalField;

/// Why a coupling computation was refused.
#[derive(Debug, Error, Clone, PartialEq, Eq)]
#[non_exhaustive]
pub enum CouplingError {
    #[error(transparent)]
    Cohomology(#[from] CohomologyError),
    #[error(
        "the line bundles {bundles:?} do not multiply to the trivial bundle (their sum is {sum:?}); a Yukawa coupling needs k1+k2+k3 = 0"
    )]
    NotTrivialProduct {
        bundles: Vec<Vec<i64>>,
        sum: Vec<i64>,
    },
    #[error(
        "the {what} for bundles {bundles:?} has at least {size} Čech–Koszul terms, above the limit {limit}; too large to compute"
    )]
    TooLarge {
        what: String,
        bundles: Vec<Vec<i64>>,
        size: usize,
        limit: usize,
    },
    #[error("cannot normalise H^{degree}(X, O_X): {reason}")]
    Normalisation { degree: usize, reason: String },
    #[error("the given E_1 vector of bundle {bundle:?} in degree {degree} is not a D-cocycle")]
    NotCocycle { bundle: Vec<i64>, degree: i64 },
    #[error(
        "the degrees {degrees:?} do not add up to dim X = {dim} (a pairing needs total degree dim X)"
    )]
    Degrees { degrees: Vec<usize>, dim: usize },
    #[error(
        "internal inconsistency: the projected product is not a multiple of the H^3 generator modulo im D"
    )]
    NotProportional,
}

/// All couplings `λ(ν_i, ν_j, ν_l)` of three line bundles, `ν_i` running over the canonical `H^1` bases.
#[derive(Clone, Debug, PartialEq)]
pub struct YukawaTensor {
    /// The three bundles `k_1, k_2, k_3` (summing to zero).
    pub bundles: [Vec<i64>; 3],
    /// `h^1` of each bundle.
    pub dims: [usize; 3],
    /// The type τ of every basis class, per slot.
    pub types: [Vec<usize>; 3],
    /// Row-major `values[(i·dims[1] + j)·dims[2] + l]`.
    pub values: Vec<BigRational>,
    /// The normalisation statement ([`NORMALISATION`]).
    pub normalisation: String,
}

impl YukawaTensor {
    /// `λ(ν_i, ν_j, ν_l)`. Panics when an index is out of range (a broken precondition).
    pub fn get(&self, i: usize, j: usize, l: usize) -> &BigRational {
        assert!(
            i < self.dims[0] && j < self.dims[1] && l < self.dims[2],
            "YukawaTensor::get: index out of range"
        );
        &self.values[(i * self.dims[1] + j) * self.dims[2] + l]
    }

    /// True when every entry is zero.
    pub fn is_zero(&self) -> bool {
        self.values.iter().all(|v| v.is_zero())
    }

    /// The tensor of the permuted triple: slot `s` of the result is slot `perm[s]` of `self`, and every value
    /// is multiplied by the sign of the permutation — the graded antisymmetry of the cup product of three
    /// degree-1 classes, `λ(ν_σ(1), ν_σ(2), ν_σ(3)) = sgn(σ) λ(ν_1, ν_2, ν_3)` (checked against direct
    /// computations in `tests/couplings_invariants.rs`). **Panics** unless `perm` is a permutation of 0..3.
    pub fn permuted(&self, perm: [usize; 3]) -> YukawaTensor {
        let (dims, values) = permute_tensor(self.dims, &self.values, perm, |x| -x);
        YukawaTensor {
            bundles: perm.map(|p| self.bundles[p].clone()),
            dims,
            types: perm.map(|p| self.types[p].clone()),
            values,
            normalisation: self.normalisation.clone(),
        }
    }
}

/// Whether `perm` (a permutation of 0..3) is odd: a transposition fixes exactly one slot.
pub(crate) fn is_odd_permutation(perm: [usize; 3]) -> bool {
    let mut seen = [false; 3];
    for &p in &perm {
        assert!(p < 3 && !seen[p], "not a permutation of 0..3: {perm:?}");
        seen[p] = true;
    }
    (0..3).filter(|&s| perm[s] == s).count() == 1
}

/// A row-major three-slot tensor with its slots permuted (slot `s` of the result is slot `perm[s]` of the
/// input), each value passed through `negate` when the permutation is odd.
pub(crate) fn permute_tensor<T: Clone>(
    dims: [usize; 3],
    values: &[T],
    perm: [usize; 3],
    negate: impl Fn(&T) -> T,
) -> ([usize; 3], Vec<T>) {
    let odd = is_odd_permutation(perm);
    let out_dims = perm.map(|p| dims[p]);
    let mut out = Vec::with_capacity(values.len());
    let mut index = [0usize; 3];
    for a in 0..out_dims[0] {
        for b in 0..out_dims[1] {
            for c in 0..out_dims[2] {
                for (s, x) in [a, b, c].into_iter().enumerate() {
                    index[perm[s]] = x;
                }
                let v = &values[(index[0] * dims[1] + index[1]) * dims[2] + index[2]];
                out.push(if odd { negate(v) } else { v.clone() });
            }
        }
    }
    (out_dims, out)
}

/// The canonical basis of `H^q(X, O_X(k))` with its lifted cocycles.
#[derive(Debug)]
pub struct LiftedBasis {
    pub bundle: Vec<i64>,
    pub degree: i64,
    /// The `E_1` page of the bundle.
    pub page: E1Page,
    /// The basis classes (same order as [`CohomologyEngine::representatives`] in this degree).
    pub classes: Vec<BasisClass>,
    /// `ι'(v)` for every class, cocycles of `δ + t`.
    pub lifts: Vec<Cochain<BigRational>>,
}

impl LiftedBasis {
    /// The types τ of the classes.
    pub fn types(&self) -> Vec<usize> {
        self.classes.iter().map(|c| c.class_type).collect()
    }
}

/// The data fixing the projection to `H^{dim X}(X, O_X)`.
struct Normalisation {
    page: E1Page,
    /// Echelon form of `im(D: E_1^{n−1} → E_1^n)`.
    image: Echelon<BigRational>,
    /// The generator reduced modulo the image (non-zero).
    generator: SparseVec<BigRational>,
}

/// Lifted bases by (bundle, degree).
type BasisCache = HashMap<(Vec<i64>, i64), Arc<LiftedBasis>>;
/// Terms of a cochain by their minimal vertices: key, coefficient, Čech degree per factor.
type MinVertexIndex<'c> = HashMap<Vec<u8>, Vec<(&'c CechKey, &'c BigRational, Vec<u32>)>>;

/// The cohomology engine of a [`CouplingEngine`]: borrowed, or owned when the coupling engine outlives the
/// scope that built it (the per-sample members of a family, [`super::parametric::FamilyMembers`]).
enum EngineRef<'a> {
    Borrowed(&'a CohomologyEngine),
    Owned(Box<CohomologyEngine>),
}

impl std::ops::Deref for EngineRef<'_> {
    type Target = CohomologyEngine;
    fn deref(&self) -> &CohomologyEngine {
        match self {
            EngineRef::Borrowed(e) => e,
            EngineRef::Owned(e) => e,
        }
    }
}

/// Computes couplings for one cohomology engine, caching lifted bases per (bundle, degree) and the
/// normalisation of `H^3(X, O_X)`.
pub struct CouplingEngine<'a> {
    engine: EngineRef<'a>,
    polys: FieldPolys<BigRational>,
    bases: Mutex<BasisCache>,
    norm: OnceLock<Result<Arc<Normalisation>, CouplingError>>,
    /// Memo of the linear functional `φ(key) = f(π'(key))` on single Čech–Koszul terms of `O_X`.
    functional: Mutex<HashMap<CechKey, BigRational>>,
    /// Largest lift or product computed ([`MAX_COCHAIN_TERMS`] unless set by [`CouplingEngine::with_term_limit`]).
    term_limit: usize,
}

/// Parity of `#{(s, t) : s ∈ S, t ∈ T, s > t}`: the sign of `e_S ∧ e_T` against `e_{S∪T}`.
fn wedge_odd(s: u32, t: u32) -> bool {
    let mut n = 0u32;
    let mut rest = t;
    while rest != 0 {
        let j = rest.trailing_zeros();
        rest &= rest - 1;
        n += (s >> (j + 1)).count_ones();
    }
    n % 2 == 1
}

/// The cup product of two Čech–Koszul cochains (the tensor product of DGAs, MATH.md §3):
/// per factor `[I] ∪ [J] = [I ∪ J]` when `max I = min J` (else 0), monomials multiply; across factors the sign
/// `(−1)^{Σ_{i>j} q_i(x) q_j(y)}` (`q_i = |I_i| − 1`); across the Koszul part `(−1)^{p(x)·q(y)}` times the sign of
/// `e_S ∧ e_T` (0 when `S ∩ T ≠ ∅`). With `δ + t` this satisfies the Leibniz rule
/// `D(xy) = D(x) y + (−1)^{|x|} x D(y)`, `|x| = q − p`. Returns `None` beyond `limit` terms.
/// Cost: `O(|x| · (matching terms of y))`, terms of `y` indexed by their minimal vertices.
pub fn cup_product(
    x: &Cochain<BigRational>,
    y: &Cochain<BigRational>,
    limit: usize,
) -> Option<Cochain<BigRational>> {
    let mut out: Cochain<BigRational> = Cochain::default();
    let complete = for_each_product_term(x, y, |key, odd, cx, cy| {
        let v = cx * cy;
        let v = if odd { -v } else { v };
        use std::collections::hash_map::Entry;
        match out.entry(key) {
            Entry::Vacant(e) => {
                e.insert(v);
            }
            Entry::Occupied(mut e) => {
                let s = e.get() + &v;
                if s.is_zero() {
                    e.remove();
                } else {
                    *e.get_mut() = s;
                }
            }
        }
        out.len() <= limit
    });
    complete.then_some(out)
}

/// Visit every non-zero term `(key, sign is odd, coefficient of x, coefficient of y)` of the product
/// `x ∪ y` (see [`cup_product`] for the rule), stopping early (and returning false) when `visit` does.
fn for_each_product_term<'c>(
    x: &'c Cochain<BigRational>,
    y: &'c Cochain<BigRational>,
    mut visit: impl FnMut(CechKey, bool, &'c BigRational, &'c BigRational) -> bool,
) -> bool {
    let mut index: MinVertexIndex<'c> = HashMap::default();
    for (k, c) in y {
        let mins: Vec<u8> = k.faces.iter().map(|f| f.trailing_zeros() as u8).collect();
        let qs: Vec<u32> = k.faces.iter().map(|f| f.count_ones() - 1).collect();
        index.entry(mins).or_default().push((k, c, qs));
    }
    let mut want: Vec<u8> = Vec::new();
    for (kx, cx) in x {
        want.clear();
        want.extend(kx.faces.iter().map(|f| (63 - f.leading_zeros()) as u8));
        let Some(list) = index.get(want.as_slice()) else {
            continue;
        };
        let qx: Vec<u32> = kx.faces.iter().map(|f| f.count_ones() - 1).collect();
        let px = kx.koszul.count_ones();
        for (ky, cy, qy) in list {
            if kx.koszul & ky.koszul != 0 {
                continue;
            }
            // Σ_{i>j} q_i(x) q_j(y), and q(y).
            let mut cross = 0u32;
            let mut prefix_y = 0u32;
            for (i, q) in qx.iter().enumerate() {
                cross += q * prefix_y;
                prefix_y += qy[i];
            }
            let odd = ((cross + px * prefix_y) % 2 == 1) ^ wedge_odd(kx.koszul, ky.koszul);
            let key = CechKey {
                exps: kx.exps.iter().zip(&ky.exps).map(|(a, b)| a + b).collect(),
                faces: kx.faces.iter().zip(&ky.faces).map(|(a, b)| a | b).collect(),
                koszul: kx.koszul | ky.koszul,
            };
            if !visit(key, odd, cx, cy) {
                return false;
            }
        }
    }
    true
}

impl CouplingEngine<'static> {
    /// A coupling engine that owns `engine` (same caches and results as [`CouplingEngine::new`]).
    pub fn owning(engine: CohomologyEngine) -> Self {
        Self::over(EngineRef::Owned(Box::new(engine)))
    }
}

impl<'a> CouplingEngine<'a> {
    /// A coupling engine over `engine` (its configuration, polynomials and size limits).
    pub fn new(engine: &'a CohomologyEngine) -> Self {
        Self::over(EngineRef::Borrowed(engine))
    }

    fn over(engine: EngineRef<'a>) -> Self {
        let polys = crate::cohomology::to_field_polys(&Q, engine.polynomials()).expect("rationals");
        CouplingEngine {
            engine,
            polys,
            bases: Mutex::new(HashMap::default()),
            norm: OnceLock::new(),
            functional: Mutex::new(HashMap::default()),
            term_limit: MAX_COCHAIN_TERMS,
        }
    }

    /// The same engine refusing every lift and cup product above `limit` Čech–Koszul terms.
    pub fn with_term_limit(mut self, limit: usize) -> Self {
        self.term_limit = limit;
        self
    }

    /// The refusal of a cochain of (at least) `size` terms.
    fn too_large(&self, what: &str, bundles: &[&[i64]], size: usize) -> CouplingError {
        CouplingError::TooLarge {
            what: what.to_string(),
            bundles: bundles.iter().map(|b| b.to_vec()).collect(),
            size,
            limit: self.term_limit,
        }
    }

    /// The cohomology engine.
    pub fn engine(&self) -> &CohomologyEngine {
        &self.engine
    }

    /// The exact complex of a lifted basis' bundle (for checks such as `total_differential`).
    pub fn complex<'s>(&'s self, page: &'s E1Page) -> Complex<'s, RationalField> {
        Complex {
            field: &Q,
            layout: self.engine.layout(),
            page,
            polys: &self.polys,
        }
    }

    /// The canonical basis of `H^q(X, O_X(k))` with lifted cocycles, cached.
    pub fn lifted_basis(&self, k: &[i64], q: i64) -> Result<Arc<LiftedBasis>, CouplingError> {
        let key = (k.to_vec(), q);
        if let Some(hit) = self.bases.lock().ok().and_then(|c| c.get(&key).cloned()) {
            return Ok(hit);
        }
        let (page, _) = self.engine.rational_page(k)?;
        let (classes, lifts) = {
            let cx = self.complex(&page);
            let classes = class_basis(&cx, q);
            let mut lifts = Vec::with_capacity(classes.len());
            for c in &classes {
                let l = cx.lift(q, &c.vector);
                if l.len() > self.term_limit {
                    return Err(self.too_large("lifted cocycle", &[k], l.len()));
                }
                lifts.push(l);
            }
            (classes, lifts)
        };
        let basis = Arc::new(LiftedBasis {
            bundle: k.to_vec(),
            degree: q,
            page,
            classes,
            lifts,
        });
        if let Ok(mut c) = self.bases.lock() {
            c.insert(key, basis.clone());
        }
        Ok(basis)
    }

    /// Lift an arbitrary `E_1^q` vector of `O_X(k)` (checked to be a `D`-cocycle) to a `δ + t` cocycle.
    pub fn lift_vector(
        &self,
        k: &[i64],
        q: i64,
        v: &[(usize, BigRational)],
    ) -> Result<Cochain<BigRational>, CouplingError> {
        let (page, _) = self.engine.rational_page(k)?;
        let cx = self.complex(&page);
        if page.dim(q + 1) > 0 {
            let d = cx.differential_matrix(q);
            if !arith::mat_vec(&Q, &d, &v.to_vec()).is_empty() {
                return Err(CouplingError::NotCocycle {
                    bundle: k.to_vec(),
                    degree: q,
                });
            }
        }
        let l = cx.lift(q, v);
        if l.len() > self.term_limit {
            return Err(self.too_large("lifted cocycle", &[k], l.len()));
        }
        Ok(l)
    }

    fn normalisation(&self) -> Result<Arc<Normalisation>, CouplingError> {
        self.norm
            .get_or_init(|| self.build_normalisation().map(Arc::new))
            .clone()
    }

    fn build_normalisation(&self) -> Result<Normalisation, CouplingError> {
        let config = self.engine.config();
        let n = config.dimension();
        let kk = config.codimension();
        let fail = |reason: String| CouplingError::Normalisation { degree: n, reason };
        let zero = vec![0i64; config.num_factors()];
        let (page, _) = self.engine.rational_page(&zero)?;
        let top = n as i64;
        let full = (1u32 << kk) - 1;
        let group = page
            .group(full)
            .filter(|g| g.total_degree == top)
            .ok_or_else(|| fail("E_1 has no top Koszul group H^dimA(A, O_A(−Σ q_j))".into()))?;
        let monomial = vec![-1i32; self.engine.layout().nvars()];
        let local = group.bott.position(&monomial).ok_or_else(|| {
            fail("the monomial with every exponent −1 is not a basis element".into())
        })?;
        let gen_index = group.offset + local;
        let dim = page.dim(top);
        let cx = self.complex(&page);
        if page.dim(top + 1) > 0 {
            let d = cx.differential_matrix(top);
            if !arith::mat_vec(&Q, &d, &vec![(gen_index, BigRational::one())]).is_empty() {
                return Err(fail("the generator is not a D-cocycle".into()));
            }
        }
        let image_rows = if page.dim(top - 1) > 0 {
            cx.differential_matrix(top - 1).transpose().rows
        } else {
            Vec::new()
        };
        let image = arith::echelon(&Q, dim, image_rows);
        let generator = arith::reduce(&Q, &image, vec![(gen_index, BigRational::one())]);
        if generator.is_empty() {
            return Err(fail(
                "the generator is a D-coboundary (the polynomials are degenerate)".into(),
            ));
        }
        Ok(Normalisation {
            page,
            image,
            generator,
        })
    }

    /// The coefficient of the generator in the class of a `δ + t` cocycle `z` of `O_X` of total degree
    /// `dim X` (precondition: `z` is such a cocycle; otherwise the result is meaningless or
    /// [`CouplingError::NotProportional`]).
    pub fn top_coefficient(&self, z: &Cochain<BigRational>) -> Result<BigRational, CouplingError> {
        let norm = self.normalisation()?;
        let top = self.engine.config().dimension() as i64;
        let cx = self.complex(&norm.page);
        let mut acc: HashMap<usize, BigRational> = HashMap::default();
        for (m, i, c) in cx.pi_prime(z) {
            if m == top {
                *acc.entry(i).or_insert_with(BigRational::zero) += c;
            }
        }
        let mut w: SparseVec<BigRational> = acc.into_iter().filter(|(_, c)| !c.is_zero()).collect();
        w.sort_unstable_by_key(|e| e.0);
        let r = arith::reduce(&Q, &norm.image, w);
        if r.is_empty() {
            return Ok(BigRational::zero());
        }
        let (g0, c0) = &norm.generator[0];
        if r[0].0 != *g0 || r.len() != norm.generator.len() {
            return Err(CouplingError::NotProportional);
        }
        let lambda = &r[0].1 / c0;
        for ((i, a), (j, b)) in r.iter().zip(&norm.generator) {
            if i != j || *a != &lambda * b {
                return Err(CouplingError::NotProportional);
            }
        }
        Ok(lambda)
    }

    /// `φ(key) = f(π'(key))`: the linear functional `f` on `E_1^{dim X}(O_X)` — the coefficient at the
    /// generator's leading index of the remainder modulo `im D`, divided by the generator's — applied to the
    /// projection of one basis cochain. On `D`-cocycles `f` is the checked coefficient of
    /// [`CouplingEngine::top_coefficient`]; being linear, it can be applied term by term and memoised.
    fn functional_of(&self, norm: &Normalisation, key: &CechKey) -> BigRational {
        if let Some(v) = self
            .functional
            .lock()
            .ok()
            .and_then(|m| m.get(key).cloned())
        {
            return v;
        }
        let top = self.engine.config().dimension() as i64;
        let cx = self.complex(&norm.page);
        let mut single = Cochain::default();
        single.insert(key.clone(), BigRational::one());
        let mut acc: HashMap<usize, BigRational> = HashMap::default();
        for (m, i, c) in cx.pi_prime(&single) {
            if m == top {
                *acc.entry(i).or_insert_with(BigRational::zero) += c;
            }
        }
        let mut w: SparseVec<BigRational> = acc.into_iter().filter(|(_, c)| !c.is_zero()).collect();
        w.sort_unstable_by_key(|e| e.0);
        let (g0, c0) = &norm.generator[0];
        let r = arith::reduce(&Q, &norm.image, w);
        let v = r
            .iter()
            .find(|(i, _)| i == g0)
            .map(|(_, x)| x / c0)
            .unwrap_or_else(BigRational::zero);
        if let Ok(mut m) = self.functional.lock() {
            m.insert(key.clone(), v.clone());
        }
        v
    }

    /// `λ = f(π'(x ∪ y))` without forming the product: only the product terms on which the memoised
    /// functional is non-zero are multiplied out (the fast path of [`CouplingEngine::yukawa_tensor`]; it agrees
    /// with the checked [`CouplingEngine::top_coefficient`] of the product, as the tests verify).
    pub fn value_of_product(
        &self,
        x: &Cochain<BigRational>,
        y: &Cochain<BigRational>,
    ) -> Result<BigRational, CouplingError> {
        let norm = self.normalisation()?;
        let mut total = BigRational::zero();
        for_each_product_term(x, y, |key, odd, cx, cy| {
            let phi = self.functional_of(&norm, &key);
            if !phi.is_zero() {
                let v = cx * cy * phi;
                if odd {
                    total -= v;
                } else {
                    total += v;
                }
            }
            true
        });
        Ok(total)
    }

    /// `λ` of three cocycles (any degrees adding up to `dim X`, bundles adding up to zero — preconditions).
    pub fn value_of_cocycles(
        &self,
        cocycles: [&Cochain<BigRational>; 3],
    ) -> Result<BigRational, CouplingError> {
        let ab = cup_product(cocycles[0], cocycles[1], self.term_limit)
            .ok_or_else(|| self.too_large("pairwise cup product", &[], self.term_limit + 1))?;
        let z = cup_product(&ab, cocycles[2], self.term_limit)
            .ok_or_else(|| self.too_large("triple cup product", &[], self.term_limit + 1))?;
        self.top_coefficient(&z)
    }

    /// The types of the `H^1` basis of `O_X(k)`.
    pub fn h1_types(&self, k: &[i64]) -> Result<Vec<usize>, CouplingError> {
        Ok(self.lifted_basis(k, 1)?.types())
    }

    /// All couplings of three bundles with `k_1 + k_2 + k_3 = 0`. Pairwise products `ν_i ∪ ν_j` are formed
    /// once and reused for every third slot.
    pub fn yukawa_tensor(&self, bundles: [&[i64]; 3]) -> Result<YukawaTensor, CouplingError> {
        let m = self.engine.config().num_factors();
        for b in bundles {
            if b.len() != m {
                return Err(CohomologyError::BundleLength {
                    bundle: b.to_vec(),
                    got: b.len(),
                    expected: m,
                }
                .into());
            }
        }
        let sum: Vec<i64> = (0..m).map(|i| bundles.iter().map(|b| b[i]).sum()).collect();
        if sum.iter().any(|&s| s != 0) {
            return Err(CouplingError::NotTrivialProduct {
                bundles: bundles.iter().map(|b| b.to_vec()).collect(),
                sum,
            });
        }
        let bases = [
            self.lifted_basis(bundles[0], 1)?,
            self.lifted_basis(bundles[1], 1)?,
            self.lifted_basis(bundles[2], 1)?,
        ];
        let dims = [
            bases[0].classes.len(),
            bases[1].classes.len(),
            bases[2].classes.len(),
        ];
        let mut values = Vec::with_capacity(dims[0] * dims[1] * dims[2]);
        if dims.iter().all(|&d| d > 0) {
            for a in &bases[0].lifts {
                for b in &bases[1].lifts {
                    let ab = cup_product(a, b, self.term_limit).ok_or_else(|| {
                        self.too_large("pairwise cup product", &bundles[..2], self.term_limit + 1)
                    })?;
                    for c in &bases[2].lifts {
                        values.push(self.value_of_product(&ab, c)?);
                    }
                }
            }
        }
        Ok(YukawaTensor {
            bundles: [
                bundles[0].to_vec(),
                bundles[1].to_vec(),
                bundles[2].to_vec(),
            ],
            dims,
            types: [bases[0].types(), bases[1].types(), bases[2].types()],
            values,
            normalisation: NORMALISATION.to_string(),
        })
    }

    /// The Serre pairing `H^q(X, L) × H^{dim X − q}(X, L^*) → H^{dim X}(X, O_X)`, `L = O_X(k)`, in the canonical
    /// bases: entry `[i][j] = λ(ν_i ∪ μ_j ∪ 1)`, with `1 ∈ H^0(O_X)` the unit. Non-degenerate by Serre duality
    /// (Hartshorne, Algebraic Geometry, III.7), which the tests check.
    pub fn pairing_matrix(
        &self,
        k: &[i64],
        q: usize,
    ) -> Result<Vec<Vec<BigRational>>, CouplingError> {
        let n = self.engine.config().dimension();
        if q > n {
            return Err(CouplingError::Degrees {
                degrees: vec![q],
                dim: n,
            });
        }
        let dual: Vec<i64> = k.iter().map(|x| -x).collect();
        let a = self.lifted_basis(k, q as i64)?;
        let b = self.lifted_basis(&dual, (n - q) as i64)?;
        let mut out = Vec::with_capacity(a.lifts.len());
        for x in &a.lifts {
            let mut row = Vec::with_capacity(b.lifts.len());
            for y in &b.lifts {
                let z = cup_product(x, y, self.term_limit).ok_or_else(|| {
                    self.too_large("cup product", &[k, &dual], self.term_limit + 1)
                })?;
                row.push(self.top_coefficient(&z)?);
            }
            out.push(row);
        }
        Ok(out)
    }
}

/// The types τ of the `H^1` basis of `O_X(k)` (same order as [`CohomologyEngine::representatives`] in degree 1).
pub fn h1_types(engine: &CohomologyEngine, k: &[i64]) -> Result<Vec<usize>, CouplingError> {
    let (page, polys) = engine.rational_page(k)?;
    let cx = Complex {
        field: &Q,
        layout: engine.layout(),
        page: &page,
        polys: &polys,
    };
    Ok(class_basis(&cx, 1).iter().map(|c| c.class_type).collect())
}

/// All holomorphic couplings `λ(ν_i, ν_j, ν_l)` for `ν_i ∈ H^1(X, O_X(k_1))` etc. (see [`CouplingEngine`], which
/// caches lifts across many tensors). Error when `k_1 + k_2 + k_3 ≠ 0`.
pub fn yukawa_tensor(
    engine: &CohomologyEngine,
    bundles: [&[i64]; 3],
) -> Result<YukawaTensor, CouplingError> {
    CouplingEngine::new(engine).yukawa_tensor(bundles)
}

/// The Serre pairing matrix `H^q(L) × H^{dim X − q}(L^*) → H^{dim X}(O_X)` (see [`CouplingEngine::pairing_matrix`]).
pub fn pairing_matrix(
    engine: &CohomologyEngine,
    k: &[i64],
    q: usize,
) -> Result<Vec<Vec<BigRational>>, CouplingError> {
    CouplingEngine::new(engine).pairing_matrix(k, q)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::cohomology::PolynomialChoice;
    use crate::geometry::Configuration;

    fn term(exps: Vec<i32>, faces: Vec<u64>, koszul: u32, c: i64) -> Cochain<BigRational> {
        let mut x = Cochain::default();
        x.insert(
            CechKey {
                exps,
                faces,
                koszul,
            },
            BigRational::from_integer(c.into()),
        );
        x
    }

    #[test]
    fn wedge_sign_counts_inversions() {
        // e_1 ∧ e_0 = −e_0 ∧ e_1; e_0 ∧ e_1 keeps the order (common practice: exterior algebra).
        assert!(wedge_odd(0b10, 0b01));
        assert!(!wedge_odd(0b01, 0b10));
        assert!(wedge_odd(0b101, 0b010)); // e_0 e_2 ∧ e_1: one inversion
    }

    #[test]
    fn alexander_whitney_faces_and_signs() {
        // One P^1 factor: [0] ∪ [0,1] = [0,1]; [0,1] ∪ [0] = 0 (max I ≠ min J); [0,1] ∪ [1] = [0,1].
        let a = term(vec![1, 0], vec![0b01], 0, 2);
        let b = term(vec![-1, -1], vec![0b11], 0, 3);
        let ab = cup_product(&a, &b, 10).unwrap();
        assert_eq!(ab.len(), 1);
        let (k, v) = ab.iter().next().unwrap();
        assert_eq!(k.faces, vec![0b11]);
        assert_eq!(k.exps, vec![0, -1]);
        assert_eq!(*v, BigRational::from_integer(6.into()));
        assert!(cup_product(&b, &a, 10).unwrap().is_empty());
        // Koszul sign (−1)^{p(x) q(y)}: e_0 (p = 1) times a Čech 1-cochain.
        let x = term(vec![0, 0], vec![0b01], 1, 1);
        let y = term(vec![-1, -1], vec![0b11], 0, 1);
        let xy = cup_product(&x, &y, 10).unwrap();
        assert_eq!(
            xy.values().next().unwrap(),
            &BigRational::from_integer((-1).into())
        );
        assert!(cup_product(&x, &x, 10).unwrap().is_empty()); // e_0 ∧ e_0 = 0
    }

    #[test]
    fn generator_of_h3_is_found_and_normalised() {
        let c = Configuration::new(&[1, 1, 1, 1], &[vec![2, 2, 2, 2]]).unwrap();
        let e = CohomologyEngine::new(&c, PolynomialChoice::Generic { seed: 7 }).unwrap();
        let ce = CouplingEngine::new(&e);
        // 1 ∪ g-class: the pairing of H^0(O) and H^3(O) in the canonical bases is 1.
        assert_eq!(
            ce.pairing_matrix(&[0, 0, 0, 0], 0).unwrap(),
            vec![vec![BigRational::one()]]
        );
        assert!(NORMALISATION.contains("every exponent −1"));
    }
}
