//! Ranks and exact relations of a texture: structural rank (maximum bipartite matching with petgraph), exact
//! rank over Q, and equal/opposite/proportional/zero relations between entries, rows and columns.
//!
//! Invariant: every relation is exact (`second = factor · first` over Q); nothing here approximates.

use super::{Entry, Relation};
use crate::arith::{RationalField, SparseMatrix, rank_exact};
use num_rational::BigRational;
use num_traits::{Signed, Zero};

/// Exact rank over Q of a dense rational matrix (via [`crate::arith::rank_exact`]).
pub fn exact_rank(m: &[Vec<BigRational>]) -> usize {
    let nc = m.first().map_or(0, Vec::len);
    let triplets = m.iter().enumerate().flat_map(|(r, row)| {
        row.iter()
            .enumerate()
            .filter(|(_, x)| !x.is_zero())
            .map(move |(c, x)| (r, c, x.clone()))
    });
    rank_exact(&SparseMatrix::from_triplets(
        &RationalField,
        m.len(),
        nc,
        triplets,
    ))
}

/// Structural rank of a 0/1 pattern: the size of a maximum matching of the bipartite graph with an edge
/// `row r — column c` for every `true` entry (petgraph's `maximum_matching`, Gabow's version of Edmonds'
/// blossom algorithm, which is exact on bipartite graphs too). Equals the largest `k` such that some `k × k`
/// submatrix has a non-zero permanent of its pattern, i.e. the rank of a generic matrix with this pattern.
pub fn structural_rank(pattern: &[Vec<bool>]) -> usize {
    use petgraph::graph::UnGraph;
    let nr = pattern.len();
    let nc = pattern.first().map_or(0, Vec::len);
    let mut g = UnGraph::<(), ()>::with_capacity(nr + nc, 0);
    let nodes: Vec<_> = (0..nr + nc).map(|_| g.add_node(())).collect();
    for (r, row) in pattern.iter().enumerate() {
        for (c, &on) in row.iter().enumerate() {
            if on {
                g.add_edge(nodes[r], nodes[nr + c], ());
            }
        }
    }
    petgraph::algo::maximum_matching(&g).len()
}

/// `b = f · a` for two equally long rational vectors, when such an `f` exists and `a ≠ 0`.
fn proportional(a: &[BigRational], b: &[BigRational]) -> Option<BigRational> {
    let pivot = a.iter().position(|x| !x.is_zero())?;
    let f = &b[pivot] / &a[pivot];
    a.iter().zip(b).all(|(x, y)| &(x * &f) == y).then_some(f)
}

fn relation_kind(f: &BigRational) -> &'static str {
    if f == &BigRational::from_integer(1.into()) {
        "equal"
    } else if f == &BigRational::from_integer((-1).into()) {
        "opposite"
    } else {
        "proportional"
    }
}

/// Largest number of relations listed per texture (each relation links a member to its first partner).
const MAX_RELATIONS: usize = 200;

fn known_value(e: &Entry) -> Option<BigRational> {
    if !e.status.is_known() {
        return None;
    }
    match &e.value {
        None => Some(BigRational::zero()),
        Some(v) => v.as_rational().cloned(),
    }
}

/// Exact rank of a texture when every entry is known: over Q, or over `Q(parameter)` when some value is a
/// rational function ([`super::function_field`]).
pub(super) fn texture_rank(nr: usize, nc: usize, entries: &[Entry]) -> Option<usize> {
    if super::function_field::parameter_of(entries).is_some() {
        return super::function_field::rank(nr, nc, entries);
    }
    let m: Option<Vec<Vec<BigRational>>> = (0..nr)
        .map(|r| (0..nc).map(|c| known_value(&entries[r * nc + c])).collect())
        .collect();
    m.map(|m| exact_rank(&m))
}

/// Exact relations of a texture (over `Q(parameter)` when some value is a rational function).
pub(super) fn relations(rows: &[String], columns: &[String], entries: &[Entry]) -> Vec<Relation> {
    if let Some(p) = super::function_field::parameter_of(entries) {
        return super::function_field::relations(p, rows, columns, entries);
    }
    let nc = columns.len();
    let val = known_value;
    let mut out = Vec::new();
    // Entries: each non-zero value linked to the first entry of the same absolute value.
    let mut firsts: Vec<(BigRational, usize)> = Vec::new();
    for (i, e) in entries.iter().enumerate() {
        let Some(v) = val(e).filter(|v| !v.is_zero()) else {
            continue;
        };
        let abs = v.abs();
        match firsts.iter().find(|(a, _)| a == &abs) {
            Some((_, j)) => {
                let f = v / val(&entries[*j]).expect("known");
                out.push(Relation {
                    between: "entries",
                    kind: relation_kind(&f),
                    first: entries[*j].fields.join(" "),
                    second: e.fields.join(" "),
                    factor: f.to_string(),
                    factor_depends_on_parameter: false,
                });
            }
            None => firsts.push((abs, i)),
        }
    }
    // Rows and columns with every entry known.
    let row_vals: Vec<Option<Vec<BigRational>>> = (0..rows.len())
        .map(|r| (0..nc).map(|c| val(&entries[r * nc + c])).collect())
        .collect();
    let col_vals: Vec<Option<Vec<BigRational>>> = (0..nc)
        .map(|c| (0..rows.len()).map(|r| val(&entries[r * nc + c])).collect())
        .collect();
    for (between, labels, vals) in [("rows", rows, row_vals), ("columns", columns, col_vals)] {
        for i in 0..vals.len() {
            let Some(b) = &vals[i] else { continue };
            if b.iter().all(|x| x.is_zero()) {
                out.push(Relation {
                    between,
                    kind: "zero",
                    first: labels[i].clone(),
                    second: String::new(),
                    factor: "0".into(),
                    factor_depends_on_parameter: false,
                });
                continue;
            }
            for j in 0..i {
                let Some(a) = &vals[j] else { continue };
                if let Some(f) = proportional(a, b) {
                    out.push(Relation {
                        between,
                        kind: relation_kind(&f),
                        first: labels[j].clone(),
                        second: labels[i].clone(),
                        factor: f.to_string(),
                        factor_depends_on_parameter: false,
                    });
                    break;
                }
            }
        }
    }
    out.truncate(MAX_RELATIONS);
    out
}
