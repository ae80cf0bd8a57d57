//! Exact cohomology `h^q(X, O_X(k))` of line bundles on complete intersections, with provenance and lifted
//! Čech–Koszul representatives (MATH.md §2–§3).
//!
//! A [`CohomologyEngine`] is bound to one configuration and one choice of defining polynomials
//! ([`PolynomialChoice`]): *generic* (integer coefficients drawn from a reported seed; ranks over two or more
//! large primes that must agree) or *given* (the user's polynomials; ranks exactly over Q). It memoises results by
//! line bundle, so its cache key is (configuration, polynomial choice, line bundle).
//!
//! Invariants of every [`LineBundleCohomology`]: `h.len() = dim X + 1`; `Σ (−1)^q h^q` equals the HRR index
//! (the Euler characteristic of the `E_1` page, independent of the maps); hypercohomology outside degrees
//! `0..=dim X` is zero (otherwise the polynomials do not cut out a complete intersection and an error is returned).

pub mod bott;
pub mod complex;
pub mod method;

use crate::arith::{self, Field, LARGE_PRIMES, PrimeField, RationalField, SparseVec};
use crate::geometry::Configuration;
use crate::poly::{Polynomial, VariableLayout};
use complex::{Cochain, Complex, E1Page, FieldPolys, koszul_degree};
pub use method::{DegreeProvenance, MapRank, Method, Polynomials, RankProof};
use num_rational::BigRational;
use num_traits::One;
use serde::Serialize;
use std::collections::HashMap;
use std::sync::{Arc, Mutex};
use thiserror::Error;

/// Largest total `E_1` dimension (sum over all groups) computed for one line bundle.
pub const MAX_E1_DIMENSION: u128 = 400_000;
/// Default seed of generic coefficients.
pub const DEFAULT_SEED: u64 = 20_261_202;
/// Generic coefficients are drawn uniformly from `[-GENERIC_COEFFICIENT_BOUND, GENERIC_COEFFICIENT_BOUND] ∖ {0}`.
pub const GENERIC_COEFFICIENT_BOUND: i64 = 1 << 20;
/// Largest number of Čech–Koszul terms exported per lifted representative.
pub const MAX_LIFT_TERMS: usize = 20_000;

/// Why a cohomology computation was refused.
#[derive(Debug, Error, Clone, PartialEq, Eq)]
#[non_exhaustive]
pub enum CohomologyError {
    #[error(
        "line bundle {bundle:?} has {got} entries but the ambient space has {expected} factors"
    )]
    BundleLength {
        bundle: Vec<i64>,
        got: usize,
        expected: usize,
    },
    #[error(
        "line bundle {bundle:?} is too large to compute: its E_1 page has dimension {size} (limit {MAX_E1_DIMENSION})"
    )]
    TooLarge { bundle: Vec<i64>, size: u128 },
    #[error("{count} polynomials given for {expected} equations")]
    PolynomialCount { count: usize, expected: usize },
    #[error(
        "the given polynomials do not cut out a complete intersection: hypercohomology in degree {degree} for bundle {bundle:?} (a degenerate or repeated equation)"
    )]
    NotCompleteIntersection { bundle: Vec<i64>, degree: i64 },
    #[error(
        "equation {equation}: the given polynomial is in {got} variables, the ambient space has {expected}"
    )]
    PolynomialVariables {
        equation: usize,
        got: usize,
        expected: usize,
    },
    #[error("equation {equation}: {source}")]
    BadPolynomial {
        equation: usize,
        source: crate::poly::PolyError,
    },
    #[error("the given polynomial coefficients are not defined modulo {0}")]
    BadPrime(u64),
    #[error(
        "internal error: ranks give h^{degree} = {value} < 0 for bundle {bundle:?} (the differential does not square to zero)"
    )]
    NegativeDimension {
        bundle: Vec<i64>,
        degree: i64,
        value: i64,
    },
}

/// Which defining polynomials the engine uses.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum PolynomialChoice {
    /// Random non-zero integer coefficients for every monomial, from this seed (reproducible).
    Generic { seed: u64 },
    /// The user's polynomials, one per equation, exactly.
    Given(Vec<Polynomial>),
}

/// One non-zero `E_1` group in a result (`H^q(A, ∧^p N^* ⊗ O(k))` summand).
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct E1Summary {
    /// Equations in the Koszul index set (1-based).
    pub koszul: Vec<usize>,
    pub p: usize,
    pub q: usize,
    /// The ambient line bundle `k − Σ_{j∈S} q_j`.
    pub ambient_bundle: Vec<i64>,
    pub dim: usize,
}

/// `h^•(X, O_X(k))` with provenance.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct LineBundleCohomology {
    pub bundle: Vec<i64>,
    /// `[h^0, …, h^{dim X}]`.
    pub h: Vec<u64>,
    /// `Σ (−1)^q h^q` (equals the HRR index).
    pub index: i64,
    pub method: Method,
    pub e1: Vec<E1Summary>,
}

/// One monomial term of a representative: an `E_1` coordinate.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct BottTerm {
    /// Koszul index set (1-based equations): the term lives in `H^q(A, O(k − Σ_{j∈S} q_j)) e_S`.
    pub koszul: Vec<usize>,
    pub q: usize,
    /// Laurent exponents, one array per ambient factor.
    pub monomial: Vec<Vec<i32>>,
    /// Exact coefficient, `"p/q"` or an integer string.
    pub coefficient: String,
}

/// One Čech–Koszul term of a lifted cocycle.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct CechTerm {
    pub koszul: Vec<usize>,
    /// One face per factor: the sorted vertices `I_i` of the Čech cochain.
    pub faces: Vec<Vec<usize>>,
    pub monomial: Vec<Vec<i32>>,
    pub coefficient: String,
}

/// A basis class of `H^q(X, O_X(k))` with its representatives.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct ClassRepresentative {
    pub degree: usize,
    /// The type τ: the smallest `p` such that the class has an `E_1` representative supported on Koszul degrees
    /// `≤ p` (it descends from `H^{degree+τ}(A, ∧^τ N^* ⊗ L)`).
    #[serde(rename = "type")]
    pub class_type: usize,
    /// The `E_1` cocycle (its leading terms have Koszul degree = type).
    pub bott_terms: Vec<BottTerm>,
    /// The full lifted Čech–Koszul cocycle `ι'(v) = ι(v) − h A ι(v)` (including the correction terms).
    pub lift: Vec<CechTerm>,
    /// True when `lift` was cut at [`MAX_LIFT_TERMS`] terms.
    pub lift_truncated: bool,
}

/// Estimate `Σ_S dim H^•(A, O(k − q_S))` without enumerating.
pub fn estimate_e1_size(config: &Configuration, k: &[i64]) -> u128 {
    let kk = config.codimension();
    (0u32..(1 << kk))
        .filter_map(|s| {
            bott::bott_dimension(config.dims(), &koszul_degree(k, config.equations(), s))
        })
        .map(|(_, d)| d)
        .fold(0u128, |a, b| a.saturating_add(b))
}

/// `h^q = dim E_1^q − rank D_q − rank D_{q−1}` for `q = 0..=dim X`; an error when a value is negative (an
/// impossible state: the ranks are wrong) or when hypercohomology outside `0..=dim X` is non-zero (the
/// polynomials do not cut out a complete intersection).
fn cohomology_from_ranks(
    k: &[i64],
    page: &E1Page,
    degrees: &[i64],
    dim_x: i64,
    rank: impl Fn(i64) -> i64,
) -> Result<Vec<u64>, CohomologyError> {
    let mut h = vec![0u64; dim_x as usize + 1];
    for &m in degrees {
        let v = page.dim(m) as i64 - rank(m) - rank(m - 1);
        if v < 0 {
            return Err(CohomologyError::NegativeDimension {
                bundle: k.to_vec(),
                degree: m,
                value: v,
            });
        }
        if (0..=dim_x).contains(&m) {
            h[m as usize] = v as u64;
        } else if v != 0 {
            return Err(CohomologyError::NotCompleteIntersection {
                bundle: k.to_vec(),
                degree: m,
            });
        }
    }
    Ok(h)
}

/// Line-bundle cohomology for one configuration and polynomial choice, memoised by bundle.
pub struct CohomologyEngine {
    config: Configuration,
    layout: VariableLayout,
    choice: PolynomialChoice,
    polys: Vec<Polynomial>,
    /// The polynomials reduced modulo each of [`LARGE_PRIMES`] (`None` where a denominator vanishes mod p),
    /// converted once so that each bundle costs only its own linear algebra.
    modular_polys: Vec<(PrimeField, Option<FieldPolys<u64>>)>,
    cache: Mutex<HashMap<Vec<i64>, Arc<LineBundleCohomology>>>,
}

pub fn to_field_polys<F: Field>(field: &F, polys: &[Polynomial]) -> Option<FieldPolys<F::Elem>> {
    let mut terms = Vec::with_capacity(polys.len());
    for p in polys {
        let mut t = Vec::with_capacity(p.num_terms());
        for (e, c) in p.terms() {
            let v = field.from_rational(c)?;
            if !field.is_zero(&v) {
                t.push((e.iter().map(|&x| x as i32).collect(), v));
            }
        }
        terms.push(t);
    }
    Some(FieldPolys { terms })
}

fn rational_text(c: &BigRational) -> String {
    c.to_string()
}

/// One basis class of `H^q(X, O_X(k))` on the `E_1` page: a `D`-cocycle of degree `q` and its type.
#[derive(Clone, Debug, PartialEq)]
pub struct BasisClass {
    /// `E_1^q` coordinates (sorted, non-zero); its smallest index is its pivot.
    pub vector: SparseVec<BigRational>,
    /// The type τ: the Koszul degree `p` of the group holding the pivot.
    pub class_type: usize,
}

/// The basis of `H^q` chosen from the `E_1` page, shared by [`CohomologyEngine::representatives`] and the
/// couplings: the rows of the reduced row echelon form of `ker D` (pivot = smallest index, so the largest
/// Koszul degree, by the [`E1Page`] order) whose pivot is not a pivot of `im D`. The reduced form makes the
/// choice canonical for the span (it does not depend on how the kernel was found).
pub fn class_basis(cx: &Complex<'_, RationalField>, q: i64) -> Vec<BasisClass> {
    let page = cx.page;
    let field = RationalField;
    let n = page.dim(q);
    if n == 0 {
        return Vec::new();
    }
    let kernel: Vec<SparseVec<BigRational>> = if page.dim(q + 1) > 0 {
        arith::kernel_basis(&field, &cx.differential_matrix(q))
    } else {
        (0..n).map(|i| vec![(i, BigRational::one())]).collect()
    };
    let image: Vec<SparseVec<BigRational>> = if page.dim(q - 1) > 0 {
        cx.differential_matrix(q - 1).transpose().rows
    } else {
        vec![]
    };
    let z = arith::fully_reduce(&field, n, arith::echelon(&field, n, kernel));
    let b = arith::echelon(&field, n, image);
    z.pivots
        .iter()
        .zip(z.rows)
        .filter(|(pivot, _)| !b.pivots.contains(pivot))
        .map(|(pivot, row)| BasisClass {
            class_type: page.locate(q, *pivot).0.p,
            vector: row,
        })
        .collect()
}

impl CohomologyEngine {
    /// An engine for `config` with the given polynomial choice. Given polynomials must be one per equation, in
    /// the configuration's variables, each a non-zero polynomial whose every term has its equation's
    /// multidegree (and not divisible by a variable); otherwise a [`CohomologyError`] names the equation and
    /// the offending monomial.
    pub fn new(config: &Configuration, choice: PolynomialChoice) -> Result<Self, CohomologyError> {
        let layout = VariableLayout::new(config.dims());
        let polys = match &choice {
            PolynomialChoice::Generic { seed } => config
                .equations()
                .iter()
                .enumerate()
                .map(|(j, q)| {
                    Polynomial::random(
                        &layout,
                        q,
                        seed.wrapping_add(j as u64),
                        GENERIC_COEFFICIENT_BOUND,
                    )
                })
                .collect(),
            PolynomialChoice::Given(p) => {
                if p.len() != config.codimension() {
                    return Err(CohomologyError::PolynomialCount {
                        count: p.len(),
                        expected: config.codimension(),
                    });
                }
                // A term of the wrong multidegree would silently fall outside every Bott basis.
                for (j, (poly, q)) in p.iter().zip(config.equations()).enumerate() {
                    if poly.nvars() != layout.nvars() {
                        return Err(CohomologyError::PolynomialVariables {
                            equation: j + 1,
                            got: poly.nvars(),
                            expected: layout.nvars(),
                        });
                    }
                    poly.check_equation(&layout, q).map_err(|source| {
                        CohomologyError::BadPolynomial {
                            equation: j + 1,
                            source,
                        }
                    })?;
                }
                p.clone()
            }
        };
        let modular_polys = LARGE_PRIMES
            .iter()
            .map(|&p| {
                let field = PrimeField::new(p).expect("LARGE_PRIMES are prime");
                let reduced = to_field_polys(&field, &polys);
                (field, reduced)
            })
            .collect();
        Ok(CohomologyEngine {
            config: config.clone(),
            layout,
            choice,
            polys,
            modular_polys,
            cache: Mutex::new(HashMap::new()),
        })
    }

    /// The configuration.
    pub fn config(&self) -> &Configuration {
        &self.config
    }

    /// The polynomials in use (generated ones in generic mode).
    pub fn polynomials(&self) -> &[Polynomial] {
        &self.polys
    }

    /// The polynomial choice.
    pub fn choice(&self) -> &PolynomialChoice {
        &self.choice
    }

    /// Number of cached bundles.
    pub fn cache_len(&self) -> usize {
        self.cache.lock().map(|c| c.len()).unwrap_or(0)
    }

    fn check_bundle(&self, k: &[i64]) -> Result<(), CohomologyError> {
        let m = self.config.num_factors();
        if k.len() != m {
            return Err(CohomologyError::BundleLength {
                bundle: k.to_vec(),
                got: k.len(),
                expected: m,
            });
        }
        let size = estimate_e1_size(&self.config, k);
        if size > MAX_E1_DIMENSION {
            return Err(CohomologyError::TooLarge {
                bundle: k.to_vec(),
                size,
            });
        }
        Ok(())
    }

    /// `h^•(X, O_X(k))`, memoised.
    ///
    /// ```
    /// use sheafwright::cohomology::{CohomologyEngine, PolynomialChoice};
    /// use sheafwright::geometry::Configuration;
    /// let tetra = Configuration::new(&[1, 1, 1, 1], &[vec![2, 2, 2, 2]]).unwrap();
    /// let engine = CohomologyEngine::new(&tetra, PolynomialChoice::Generic { seed: 1 }).unwrap();
    /// let r = engine.cohomology(&[-2, 2, 2, 2]).unwrap();
    /// assert_eq!(r.h, vec![0, 24, 0, 0]);
    /// assert_eq!(r.index, -24);
    /// assert_eq!(r.method.kind(), "ranks");
    /// ```
    pub fn cohomology(&self, k: &[i64]) -> Result<Arc<LineBundleCohomology>, CohomologyError> {
        if let Some(hit) = self.cache.lock().ok().and_then(|c| c.get(k).cloned()) {
            return Ok(hit);
        }
        self.check_bundle(k)?;
        let result = Arc::new(self.compute(k)?);
        if let Ok(mut c) = self.cache.lock() {
            c.insert(k.to_vec(), result.clone());
        }
        Ok(result)
    }

    fn compute(&self, k: &[i64]) -> Result<LineBundleCohomology, CohomologyError> {
        let page = E1Page::new(&self.layout, self.config.equations(), k);
        let dim_x = self.config.dimension() as i64;
        let kk = self.config.codimension() as i64;
        let e1 = page
            .groups
            .iter()
            .map(|g| E1Summary {
                koszul: (0..self.config.codimension())
                    .filter(|j| g.koszul & (1 << j) != 0)
                    .map(|j| j + 1)
                    .collect(),
                p: g.p,
                q: g.bott.q,
                ambient_bundle: g.bott.degree.clone(),
                dim: g.bott.dim(),
            })
            .collect();
        let degrees: Vec<i64> = (-kk..=self.config.ambient_dimension() as i64).collect();
        let needs_map: Vec<i64> = degrees
            .iter()
            .copied()
            .filter(|&m| page.map_can_act(m))
            .collect();
        let polynomials = match self.choice {
            PolynomialChoice::Generic { seed } => Polynomials::Generic { seed },
            PolynomialChoice::Given(_) => Polynomials::Given,
        };
        let higher = page.groups.iter().any(|g| page.needs_higher(g));
        let maps = if needs_map.is_empty() {
            Vec::new()
        } else {
            match &self.choice {
                PolynomialChoice::Given(_) => {
                    let field = RationalField;
                    let polys = to_field_polys(&field, &self.polys).expect("rationals");
                    let cx = Complex {
                        field: &field,
                        layout: &self.layout,
                        page: &page,
                        polys: &polys,
                    };
                    needs_map
                        .iter()
                        .map(|&m| {
                            let (rank, proof) =
                                arith::rank_exact_with_proof(&cx.differential_matrix(m));
                            MapRank {
                                degree: m,
                                rows: page.dim(m + 1),
                                cols: page.dim(m),
                                rank,
                                proof: RankProof::Exact(proof),
                            }
                        })
                        .collect()
                }
                PolynomialChoice::Generic { .. } => self.generic_ranks(k, &page, &needs_map)?,
            }
        };
        let rank = |m: i64| {
            maps.iter()
                .find(|r| r.degree == m)
                .map_or(0, |r| r.rank as i64)
        };
        let h = cohomology_from_ranks(k, &page, &degrees, dim_x, rank)?;
        let needs = |m: i64| needs_map.contains(&m);
        let degree_prov = method::degree_provenance(polynomials, &h, needs);
        let method = if maps.is_empty() {
            Method::Dimensions {
                polynomials,
                degrees: degree_prov,
            }
        } else {
            Method::Ranks {
                polynomials,
                maps,
                higher_differentials: higher,
                degrees: degree_prov,
            }
        };
        let index = h
            .iter()
            .enumerate()
            .map(|(q, &x)| if q % 2 == 0 { x as i64 } else { -(x as i64) })
            .sum();
        Ok(LineBundleCohomology {
            bundle: k.to_vec(),
            h,
            index,
            method,
            e1,
        })
    }

    /// Ranks of the maps `needs_map` for the integer member drawn from the seed, each proven over Q (see
    /// [`method`]): all maps are ranked modulo one large prime (lower bounds over Q); a map next to a group that
    /// vanishes mod p has its rank forced, and every other map is ranked exactly over Q. No comparison between
    /// primes is involved, so no disagreement can be hidden.
    fn generic_ranks(
        &self,
        k: &[i64],
        page: &E1Page,
        needs_map: &[i64],
    ) -> Result<Vec<MapRank>, CohomologyError> {
        let (field, polys) = self
            .modular_polys
            .iter()
            .find_map(|(f, r)| r.as_ref().map(|r| (f, r)))
            .ok_or(CohomologyError::BadPrime(LARGE_PRIMES[0]))?;
        let prime = field.modulus();
        let cx = Complex {
            field,
            layout: &self.layout,
            page,
            polys,
        };
        let modular: Vec<(i64, usize)> = needs_map
            .iter()
            .map(|&m| (m, arith::rank(field, &cx.differential_matrix(m))))
            .collect();
        let rank_p = |m: i64| modular.iter().find(|e| e.0 == m).map_or(0, |e| e.1 as i64);
        // h mod p in every degree (the reduction of D also squares to zero, so these are dimensions).
        let h_p = |m: i64| page.dim(m) as i64 - rank_p(m) - rank_p(m - 1);
        let mut exact_cx: Option<(RationalField, FieldPolys<BigRational>)> = None;
        let mut out = Vec::with_capacity(needs_map.len());
        for &(m, r) in &modular {
            let (hm, hm1) = (h_p(m), h_p(m + 1));
            if hm < 0 || hm1 < 0 {
                return Err(CohomologyError::NegativeDimension {
                    bundle: k.to_vec(),
                    degree: if hm < 0 { m } else { m + 1 },
                    value: hm.min(hm1),
                });
            }
            let (rank, proof) = if hm == 0 || hm1 == 0 {
                (r, RankProof::ForcedByVanishing { prime })
            } else {
                let (qf, qpolys) = exact_cx.get_or_insert_with(|| {
                    let f = RationalField;
                    let p = to_field_polys(&f, &self.polys).expect("rationals");
                    (f, p)
                });
                let qcx = Complex {
                    field: &*qf,
                    layout: &self.layout,
                    page,
                    polys: &*qpolys,
                };
                let (rank, proof) = arith::rank_exact_with_proof(&qcx.differential_matrix(m));
                (rank, RankProof::Exact(proof))
            };
            out.push(MapRank {
                degree: m,
                rows: page.dim(m + 1),
                cols: page.dim(m),
                rank,
                proof,
            });
        }
        Ok(out)
    }

    /// A basis of `H^q(X, O_X(k))` for every `q`, each class with its type, its `E_1` cocycle and its lifted
    /// Čech–Koszul cocycle, computed exactly over Q with the engine's polynomials (in generic mode, the integer
    /// member drawn from the seed).
    pub fn representatives(&self, k: &[i64]) -> Result<Vec<ClassRepresentative>, CohomologyError> {
        self.check_bundle(k)?;
        let page = E1Page::new(&self.layout, self.config.equations(), k);
        let field = RationalField;
        let polys = to_field_polys(&field, &self.polys).expect("rationals");
        let cx = Complex {
            field: &field,
            layout: &self.layout,
            page: &page,
            polys: &polys,
        };
        let mut out = Vec::new();
        for q in 0..=self.config.dimension() as i64 {
            for class in class_basis(&cx, q) {
                let bott_terms = class
                    .vector
                    .iter()
                    .map(|(idx, c)| {
                        let (g, local) = page.locate(q, *idx);
                        BottTerm {
                            koszul: self.koszul_list(g.koszul),
                            q: g.bott.q,
                            monomial: self.split_monomial(&g.bott.basis[local]),
                            coefficient: rational_text(c),
                        }
                    })
                    .collect();
                let lifted = cx.lift(q, &class.vector);
                let (lift, lift_truncated) = self.render_cochain(&lifted);
                out.push(ClassRepresentative {
                    degree: q as usize,
                    class_type: class.class_type,
                    bott_terms,
                    lift,
                    lift_truncated,
                });
            }
        }
        Ok(out)
    }

    /// The variable layout of the ambient coordinates.
    pub fn layout(&self) -> &VariableLayout {
        &self.layout
    }

    /// The `E_1` page of `O_X(k)` and the engine's polynomials over Q, after the size checks of
    /// [`CohomologyEngine::cohomology`]: the ingredients of an exact [`Complex`] (used by the couplings).
    pub fn rational_page(
        &self,
        k: &[i64],
    ) -> Result<(E1Page, FieldPolys<BigRational>), CohomologyError> {
        self.check_bundle(k)?;
        let page = E1Page::new(&self.layout, self.config.equations(), k);
        let polys = to_field_polys(&RationalField, &self.polys).expect("rationals");
        Ok((page, polys))
    }

    fn koszul_list(&self, s: u32) -> Vec<usize> {
        (0..self.config.codimension())
            .filter(|j| s & (1 << j) != 0)
            .map(|j| j + 1)
            .collect()
    }

    fn split_monomial(&self, e: &[i32]) -> Vec<Vec<i32>> {
        (0..self.config.num_factors())
            .map(|i| e[self.layout.range(i)].to_vec())
            .collect()
    }

    fn render_cochain(&self, c: &Cochain<BigRational>) -> (Vec<CechTerm>, bool) {
        let mut keys: Vec<_> = c.keys().collect();
        keys.sort();
        let truncated = keys.len() > MAX_LIFT_TERMS;
        let terms = keys
            .into_iter()
            .take(MAX_LIFT_TERMS)
            .map(|key| CechTerm {
                koszul: self.koszul_list(key.koszul),
                faces: key
                    .faces
                    .iter()
                    .map(|f| (0..64).filter(|l| f & (1u64 << l) != 0).collect())
                    .collect(),
                monomial: self.split_monomial(&key.exps),
                coefficient: rational_text(&c[key]),
            })
            .collect();
        (terms, truncated)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Issue 11: a given polynomial with a term of the wrong multidegree is refused, naming the equation and
    /// the monomial (it used to drop the term silently).
    #[test]
    fn regression_issue_11_given_polynomial_degree_is_checked() {
        let c = Configuration::new(&[1, 4], &[vec![1, 1], vec![1, 4]]).unwrap();
        let layout = VariableLayout::new(c.dims());
        let good0 = Polynomial::parse("x1_0*x2_0 + x1_1*x2_1", &layout).unwrap();
        let bad1 = Polynomial::parse("x1_0*x2_0^4 + x1_1*x2_1^3", &layout).unwrap();
        let e = CohomologyEngine::new(&c, PolynomialChoice::Given(vec![good0, bad1])).err();
        let Some(err) = e else {
            panic!("a wrong multidegree must be refused")
        };
        let text = err.to_string();
        assert!(
            matches!(err, CohomologyError::BadPolynomial { equation: 2, .. }),
            "{text}"
        );
        assert!(text.starts_with("equation 2"), "{text}");
        assert!(text.contains("x1_1*x2_1^3"), "{text}");
    }

    /// Issue 11: ranks that would give a negative dimension are an error, not a clamp to 0.
    #[test]
    fn regression_issue_11_negative_dimension_is_an_error() {
        let tetra = Configuration::new(&[1, 1, 1, 1], &[vec![2, 2, 2, 2]]).unwrap();
        let layout = VariableLayout::new(tetra.dims());
        let k = [-2, 2, 2, 2];
        let page = E1Page::new(&layout, tetra.equations(), &k);
        let degrees: Vec<i64> = (-1..=4).collect();
        // dim E_1^0 = 3 (S = {1}, q = 1 gives degree 0), dim E_1^1 = 27; a claimed rank of 5 for D_0 is
        // impossible and used to be clamped.
        assert_eq!(page.dim(0), 3);
        let r = cohomology_from_ranks(&k, &page, &degrees, 3, |m| if m == 0 { 5 } else { 0 });
        assert!(
            matches!(r, Err(CohomologyError::NegativeDimension { .. })),
            "{r:?}"
        );
        let ok = cohomology_from_ranks(&k, &page, &degrees, 3, |m| if m == 0 { 3 } else { 0 });
        assert_eq!(ok.unwrap(), vec![0, 24, 0, 0]);
    }
}
