//! Fixed loci of group elements in the ambient space, and the freeness certificate.
//!
//! For `g(P)_v = ζ^{a_v} P_{σ(v)}`, a point is fixed iff `P_{σ(v)} = ζ^{−a_v} λ_{f(v)} P_v` for scalars `λ_i`
//! (one per factor). Up to rescaling the factors, only `Λ = ∏_{i ∈ C} λ_i` matters on each cycle `C` of the
//! factor permutation, and we normalise `λ = Λ` on the first factor of `C` and `1` elsewhere. Going once around
//! a coordinate cycle of length `rℓ` (it meets the first factor `ℓ` times) gives the eigenvalue condition
//! `Λ^ℓ = ζ^{Σ a}` for that cycle to carry a non-zero coordinate, so `Λ` is a root of unity of order dividing
//! `Mℓ`. For each cycle `C` and each admissible `Λ`, the fixed points form a linear `P^{k−1}` (one parameter per
//! coordinate cycle satisfying the condition; the other coordinates of `C` vanish); the fixed locus of `g` is
//! the disjoint union of the products of these over the cycles of factors. (Products of eigenspaces, with the
//! eigenspaces of the composite map around each cycle of identical factors.)
//!
//! On each component the equations restrict to multihomogeneous polynomials in the parameters, with coefficients
//! in `Q(ζ_{M'})`. The component misses `X` when:
//! * a restricted equation is a non-zero constant (exact, in `Q(ζ_{M'})`), or
//! * the restricted equations span every polynomial of some multidegree `D` (a Macaulay matrix of full column
//!   rank). This is certified modulo a prime `p ≡ 1 (mod M')` with `ζ ↦ ω`: the rank modulo a prime of `Z[ζ]`
//!   never exceeds the rank over `Q(ζ)`, so full rank mod p proves full rank over `C`, hence no common zero
//!   (every point has a non-vanishing monomial of each multidegree).
//!
//! A component meets `X` (rigorously) when every restricted equation vanishes identically on it, or when the
//! non-zero ones are ample on it (positive degree in every positive-dimensional block) and no more numerous than
//! its dimension (ample divisors on a projective variety of dimension `≥ s` meet). Otherwise it is `undecided`.
//!
//! Invariant: the action is reported free only when every component of every non-identity element of `Γ`
//! is certified to miss `X`.

use super::cyclotomic::{Cyc, Cyclotomic, prime_with_roots, to_mod_p};
use super::group::Group;
use crate::arith::{self, SparseMatrix};
use crate::poly::{Polynomial, VariableLayout, monomials_of_multidegree};
use num_integer::Integer;
use serde::Serialize;
use std::collections::BTreeMap;

/// Largest Macaulay matrix (columns) built for one component.
pub const MAX_MACAULAY_COLUMNS: usize = 6_000;

/// What is known about one fixed component.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum ComponentStatus {
    /// Certified disjoint from X.
    MissesX,
    /// Certified to meet X.
    MeetsX,
    /// Neither could be certified.
    Undecided,
}

/// One component of the fixed locus of an element of `Γ`.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct FixedComponent {
    /// The element of `Γ` (a word in the generators).
    pub element: String,
    /// Dimension of the component in the ambient space.
    pub dimension: usize,
    /// Its points: each coordinate as a multiple of a parameter `u_k`, with `ζ = ζ_{M'}` (`M'` in `root_order`).
    pub points: String,
    pub root_order: u32,
    pub status: ComponentStatus,
    /// Why the status holds.
    pub reason: String,
}

/// The freeness certificate.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Freeness {
    pub free: bool,
    /// One line saying how freeness was decided.
    pub certificate: String,
    /// Non-identity elements of `Γ` examined.
    pub elements_checked: usize,
    /// Fixed components examined in the ambient space.
    pub components_checked: usize,
    /// Components meeting X or undecided (empty when free).
    pub offending: Vec<FixedComponent>,
}

/// One coordinate on a component: zero, or `ζ^{exp} u_param`.
#[derive(Clone, Copy, Debug)]
enum Coord {
    Zero,
    Param { param: usize, exp: i64 },
}

/// Per coordinate of a factor cycle: `(coordinate, (parameter, exponent of ζ))` or zero.
type Assignment = Vec<(usize, Option<(usize, i64)>)>;
/// A restricted equation mod p: block degrees and terms.
type ModularEquation = (Vec<u32>, Vec<(Vec<u32>, u64)>);

struct ComponentData {
    coords: Vec<Coord>,
    /// Parameter blocks (one per factor cycle): number of parameters.
    blocks: Vec<usize>,
    /// Block of each parameter.
    block_of: Vec<usize>,
    /// Factors of each block.
    block_factors: Vec<Vec<usize>>,
}

/// All fixed components of the `Γ̃` element `e`, with coordinates in powers of `ζ_{M'}`; returns `M'`.
fn fixed_components(group: &Group, e: usize) -> (u32, Vec<ComponentData>) {
    let layout = group.layout();
    let map = &group.elements()[e].map;
    let m = group.root_order() as i64;
    let pi = map.factor_map(layout);
    let nf = layout.dims().len();
    // Cycles of factors.
    let mut seen = vec![false; nf];
    let mut fcycles: Vec<Vec<usize>> = Vec::new();
    for i in 0..nf {
        if seen[i] {
            continue;
        }
        let mut c = vec![];
        let mut j = i;
        while !seen[j] {
            seen[j] = true;
            c.push(j);
            j = pi[j];
        }
        fcycles.push(c);
    }
    // Coordinate cycles, grouped by factor cycle, each started in the first factor of its cycle.
    let mut vseen = vec![false; layout.nvars()];
    let mut vcycles: Vec<Vec<Vec<usize>>> = Vec::new();
    let mut lcm_l: i64 = 1;
    for c in &fcycles {
        let mut list = Vec::new();
        for v0 in layout.range(c[0]) {
            if vseen[v0] {
                continue;
            }
            let mut cyc = vec![];
            let mut v = v0;
            while !vseen[v] {
                vseen[v] = true;
                cyc.push(v);
                v = map.image[v];
            }
            lcm_l = lcm_l.lcm(&((cyc.len() / c.len()) as i64));
            list.push(cyc);
        }
        vcycles.push(list);
    }
    let mp = m * lcm_l;
    let scale = mp / m;
    // Options per factor cycle: (coordinates of its variables, number of parameters).
    let mut options: Vec<Vec<Assignment>> = Vec::new();
    for (ci, c) in fcycles.iter().enumerate() {
        let r = c.len();
        let mut opts = Vec::new();
        for s in 0..mp {
            let mut assign: Vec<(usize, Option<(usize, i64)>)> = Vec::new();
            let mut k = 0usize;
            for cyc in &vcycles[ci] {
                let ell = (cyc.len() / r) as i64;
                let a_sum: i64 = cyc.iter().map(|&v| map.phase[v] as i64 * scale).sum();
                if (s * ell - a_sum).rem_euclid(mp) == 0 {
                    let mut exp = 0i64;
                    for &v in cyc {
                        assign.push((v, Some((k, exp.rem_euclid(mp)))));
                        let lambda = if super::action::factor_of(layout, v) == c[0] {
                            s
                        } else {
                            0
                        };
                        exp += -(map.phase[v] as i64) * scale + lambda;
                    }
                    k += 1;
                } else {
                    for &v in cyc {
                        assign.push((v, None));
                    }
                }
            }
            if k > 0 {
                opts.push(assign);
            }
        }
        options.push(opts);
    }
    // Cartesian product over factor cycles.
    let mut comps = Vec::new();
    let mut choice = vec![0usize; fcycles.len()];
    if options.iter().any(|o| o.is_empty()) {
        return (mp as u32, comps);
    }
    loop {
        let mut coords = vec![Coord::Zero; layout.nvars()];
        let mut blocks = Vec::new();
        let mut block_of = Vec::new();
        let mut offset = 0;
        for (ci, &o) in choice.iter().enumerate() {
            let assign = &options[ci][o];
            let mut k = 0;
            for &(v, a) in assign {
                if let Some((p, exp)) = a {
                    coords[v] = Coord::Param {
                        param: offset + p,
                        exp,
                    };
                    k = k.max(p + 1);
                }
            }
            blocks.push(k);
            block_of.extend(std::iter::repeat_n(ci, k));
            offset += k;
        }
        comps.push(ComponentData {
            coords,
            blocks,
            block_of,
            block_factors: fcycles.clone(),
        });
        // Next choice.
        let mut i = 0;
        loop {
            if i == choice.len() {
                return (mp as u32, comps);
            }
            choice[i] += 1;
            if choice[i] < options[i].len() {
                break;
            }
            choice[i] = 0;
            i += 1;
        }
    }
}

fn describe(layout: &VariableLayout, comp: &ComponentData) -> String {
    let mut parts = Vec::new();
    for i in 0..layout.dims().len() {
        let coords: Vec<String> = layout
            .range(i)
            .map(|v| match comp.coords[v] {
                Coord::Zero => "0".into(),
                Coord::Param { param, exp } => match exp {
                    0 => format!("u{param}"),
                    1 => format!("ζ u{param}"),
                    _ => format!("ζ^{exp} u{param}"),
                },
            })
            .collect();
        parts.push(format!("({})", coords.join(" : ")));
    }
    parts.join(" × ")
}

/// Decide whether the component misses X.
fn decide(
    ring: &Cyclotomic,
    polys: &[Polynomial],
    layout: &VariableLayout,
    comp: &ComponentData,
) -> (ComponentStatus, String) {
    let nparams = comp.block_of.len();
    // Restrict every equation.
    let mut restricted: Vec<BTreeMap<Vec<u32>, Cyc>> = Vec::new();
    let mut degrees: Vec<Vec<u32>> = Vec::new();
    for p in polys {
        let mut r: BTreeMap<Vec<u32>, Cyc> = BTreeMap::new();
        for (e, c) in p.terms() {
            let mut u = vec![0u32; nparams];
            let mut exp = 0i64;
            let mut zero = false;
            for (v, &ev) in e.iter().enumerate() {
                if ev == 0 {
                    continue;
                }
                match comp.coords[v] {
                    Coord::Zero => {
                        zero = true;
                        break;
                    }
                    Coord::Param { param, exp: x } => {
                        u[param] += ev;
                        exp += x * ev as i64;
                    }
                }
            }
            if zero {
                continue;
            }
            let entry = r.entry(u).or_insert_with(|| ring.zero());
            ring.add_term(entry, exp, c);
        }
        r.retain(|_, c| !ring.is_zero(c));
        let d = layout.multidegree(p.terms().next().map(|(e, _)| e).expect("non-zero"));
        degrees.push(
            comp.block_factors
                .iter()
                .map(|fs| fs.iter().map(|&f| d[f]).sum())
                .collect(),
        );
        restricted.push(r);
    }
    let positive: Vec<usize> = (0..comp.blocks.len())
        .filter(|&b| comp.blocks[b] >= 2)
        .collect();
    let dim: usize = positive.iter().map(|&b| comp.blocks[b] - 1).sum();
    let live: Vec<usize> = (0..polys.len())
        .filter(|&j| !restricted[j].is_empty())
        .collect();
    for &j in &live {
        if positive.iter().all(|&b| degrees[j][b] == 0) {
            return (
                ComponentStatus::MissesX,
                format!(
                    "equation {} restricts to a non-zero constant (exact in Q(ζ))",
                    j + 1
                ),
            );
        }
    }
    if live.is_empty() {
        return (
            ComponentStatus::MeetsX,
            if dim == 0 {
                "every equation vanishes at this fixed point (exact in Q(ζ))".into()
            } else {
                "every equation vanishes identically on this component (exact in Q(ζ))".into()
            },
        );
    }
    let ample = live
        .iter()
        .all(|&j| positive.iter().all(|&b| degrees[j][b] > 0));
    if ample && live.len() <= dim {
        return (
            ComponentStatus::MeetsX,
            format!(
                "{} non-zero restricted equation(s), each ample on this {dim}-dimensional component, must have common zeros",
                live.len()
            ),
        );
    }
    // Macaulay test over F_p. Parameters of P^0 blocks are set to 1.
    let mp = ring.order();
    let sub_dims: Vec<usize> = positive.iter().map(|&b| comp.blocks[b] - 1).collect();
    let sub = VariableLayout::new(&sub_dims);
    let mut param_pos = vec![None; nparams];
    {
        let mut next = 0;
        let mut per_block = vec![0usize; comp.blocks.len()];
        let mut starts = vec![0usize; comp.blocks.len()];
        for (bi, &b) in positive.iter().enumerate() {
            starts[b] = sub.offset(bi);
        }
        for p in 0..nparams {
            let b = comp.block_of[p];
            if comp.blocks[b] >= 2 {
                param_pos[p] = Some(starts[b] + per_block[b]);
                per_block[b] += 1;
                next += 1;
            }
        }
        debug_assert_eq!(next, sub.nvars());
    }
    for prime_index in 0..2 {
        let (field, omega) = prime_with_roots(mp, prime_index);
        let mut eqs: Vec<ModularEquation> = Vec::new();
        let mut bad_prime = false;
        for &j in &live {
            let mut terms = Vec::new();
            for (u, c) in &restricted[j] {
                let mut e = vec![0u32; sub.nvars()];
                for (p, &x) in u.iter().enumerate() {
                    if let Some(pos) = param_pos[p] {
                        e[pos] = x;
                    }
                }
                match to_mod_p(&field, omega, c) {
                    Some(v) => terms.push((e, v)),
                    None => bad_prime = true,
                }
            }
            eqs.push((positive.iter().map(|&b| degrees[j][b]).collect(), terms));
        }
        if bad_prime {
            continue;
        }
        let base: Vec<u32> = (0..positive.len())
            .map(|b| eqs.iter().map(|(d, _)| d[b]).max().unwrap_or(0))
            .collect();
        for t in 0u32.. {
            let target: Vec<u32> = base.iter().map(|&d| d + t).collect();
            let cols = monomials_of_multidegree(&sub, &target);
            if cols.len() > MAX_MACAULAY_COLUMNS {
                break;
            }
            let col_index: BTreeMap<&Vec<u32>, usize> =
                cols.iter().enumerate().map(|(i, e)| (e, i)).collect();
            let mut triplets = Vec::new();
            let mut row = 0;
            for (d, terms) in &eqs {
                let shift: Vec<u32> = target.iter().zip(d).map(|(a, b)| a - b).collect();
                for mult in monomials_of_multidegree(&sub, &shift) {
                    for (e, v) in terms {
                        let prod: Vec<u32> = e.iter().zip(&mult).map(|(a, b)| a + b).collect();
                        triplets.push((row, col_index[&prod], *v));
                    }
                    row += 1;
                }
            }
            let mat = SparseMatrix::from_triplets(&field, row, cols.len(), triplets);
            if row >= cols.len() && arith::rank(&field, &mat) == cols.len() {
                return (
                    ComponentStatus::MissesX,
                    format!(
                        "the restricted equations span all {} polynomials of multidegree {:?} (Macaulay matrix of full rank mod p = {}, ζ ↦ a primitive {}-th root of unity)",
                        cols.len(),
                        target,
                        field.modulus(),
                        mp
                    ),
                );
            }
        }
        break;
    }
    (
        ComponentStatus::Undecided,
        "neither a Macaulay certificate of emptiness nor a witness of a common zero was found"
            .into(),
    )
}

/// Decide whether `Γ` acts freely on the complete intersection cut out by `polys` (one per equation).
pub fn check_free(group: &Group, polys: &[Polynomial]) -> Freeness {
    let layout = group.layout();
    let mut offending = Vec::new();
    let mut components = 0;
    let mut meets = false;
    for c in 1..group.order() {
        let e = group.classes()[c][0];
        let (mp, comps) = fixed_components(group, e);
        let ring = Cyclotomic::new(mp);
        for comp in &comps {
            components += 1;
            let (status, reason) = decide(&ring, polys, layout, comp);
            if status != ComponentStatus::MissesX {
                meets |= status == ComponentStatus::MeetsX;
                offending.push(FixedComponent {
                    element: group.class_name(c),
                    dimension: comp.blocks.iter().map(|&k| k - 1).sum(),
                    points: describe(layout, comp),
                    root_order: mp,
                    status,
                    reason,
                });
            }
        }
    }
    let free = offending.is_empty();
    let certificate = if free {
        format!(
            "free: all {components} fixed components of the {} non-identity elements in the ambient space are certified to miss X",
            group.order() - 1
        )
    } else if meets {
        let f = offending
            .iter()
            .find(|f| f.status == ComponentStatus::MeetsX)
            .expect("meets");
        format!(
            "not free: {} fixes points of X on {} ({})",
            f.element, f.points, f.reason
        )
    } else {
        let f = &offending[0];
        format!(
            "not certified free: for {} the fixed component {} could not be decided",
            f.element, f.points
        )
    };
    Freeness {
        free,
        certificate,
        elements_checked: group.order().saturating_sub(1),
        components_checked: components,
        offending,
    }
}
