//! Ranks and exact relations of a texture: structural rank (maximum bipartite matching with petgraph), exact
//! rank, and equal/opposite/proportional/zero relations between entries, rows and columns.
//!
//! One search ([`search`]) finds the relations over any field of values given as a [`RelationField`]: the
//! rationals ([`Rationals`], here) or the rational functions of one parameter
//! ([`super::function_field::FunctionField`]). The texture is read over `Q(parameter)` as soon as one value is
//! a rational function, over Q otherwise.
//!
//! Invariant: every relation is exact (`second = factor · first` over the field); nothing here approximates.

use super::function_field::{FunctionField, parameter_of};
use super::{Entry, Relation};
use crate::arith::{RationalField, SparseMatrix, rank_exact};
use num_rational::BigRational;
use num_traits::{One, Signed, Zero};

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

/// The field a texture's values are read in, for the generic rank and relation search: how an entry's known
/// value is read, the field operations the search needs, and how a row or column factor is written.
pub(super) trait RelationField {
    /// A value of the field.
    type Elem: Clone + PartialEq;
    /// The known value of an entry (zero when known and without value), `None` when unknown.
    fn known(&self, e: &Entry) -> Option<Self::Elem>;
    /// Whether `x` is zero.
    fn is_zero(&self, x: &Self::Elem) -> bool;
    /// `x = c · u` for a non-zero `x`: the representative `u` of the class of `x` up to a non-zero rational
    /// constant, and that constant `c`. Entries with the same `u` are related by the quotient of their `c`.
    fn up_to_constant(&self, x: &Self::Elem) -> (Self::Elem, BigRational);
    /// `a · b`.
    fn mul(&self, a: &Self::Elem, b: &Self::Elem) -> Self::Elem;
    /// `a / b`, `None` when `b` is zero.
    fn div(&self, a: &Self::Elem, b: &Self::Elem) -> Option<Self::Elem>;
    /// The kind (`"equal"`, `"opposite"`, `"proportional"`), the text and whether it depends on the parameter, of
    /// a factor between two rows or two columns.
    fn describe(&self, f: &Self::Elem) -> (&'static str, String, bool);
    /// Exact rank of a dense matrix over the field.
    fn rank(&self, m: &[Vec<Self::Elem>]) -> usize;
}

/// The rationals, for textures whose values are all numbers.
pub(super) struct Rationals;

impl RelationField for Rationals {
    type Elem = BigRational;
    fn known(&self, e: &Entry) -> Option<BigRational> {
        if !e.status.is_known() {
            return None;
        }
        match &e.value {
            None => Some(BigRational::zero()),
            Some(v) => v.as_rational().cloned(),
        }
    }
    fn is_zero(&self, x: &BigRational) -> bool {
        x.is_zero()
    }
    /// The class of `x` up to sign: `(|x|, ±1)`, so entries are related when equal or opposite.
    fn up_to_constant(&self, x: &BigRational) -> (BigRational, BigRational) {
        let sign = if x.is_negative() {
            -BigRational::one()
        } else {
            BigRational::one()
        };
        (x.abs(), sign)
    }
    fn mul(&self, a: &BigRational, b: &BigRational) -> BigRational {
        a * b
    }
    fn div(&self, a: &BigRational, b: &BigRational) -> Option<BigRational> {
        (!b.is_zero()).then(|| a / b)
    }
    fn describe(&self, f: &BigRational) -> (&'static str, String, bool) {
        (constant_kind(f), f.to_string(), false)
    }
    fn rank(&self, m: &[Vec<BigRational>]) -> usize {
        exact_rank(m)
    }
}

/// `"equal"`, `"opposite"` or `"proportional"` for a rational factor.
pub(super) fn constant_kind(f: &BigRational) -> &'static str {
    if f.is_one() {
        "equal"
    } else if f == &-BigRational::one() {
        "opposite"
    } else {
        "proportional"
    }
}

/// `b = f · a` for two equally long vectors, when such an `f` exists and `a ≠ 0`.
fn proportional<F: RelationField>(field: &F, a: &[F::Elem], b: &[F::Elem]) -> Option<F::Elem> {
    let pivot = a.iter().position(|x| !field.is_zero(x))?;
    let f = field.div(&b[pivot], &a[pivot])?;
    a.iter()
        .zip(b)
        .all(|(x, y)| &field.mul(x, &f) == y)
        .then_some(f)
}

/// Largest number of relations listed per texture (each relation links a member to its first partner).
const MAX_RELATIONS: usize = 200;

/// Row `r` of the known values, `None` when some entry of it is unknown.
fn known_row<F: RelationField>(
    field: &F,
    nc: usize,
    entries: &[Entry],
    r: usize,
) -> Option<Vec<F::Elem>> {
    (0..nc).map(|c| field.known(&entries[r * nc + c])).collect()
}

/// Exact rank over the field when every entry is known.
pub(super) fn known_rank<F: RelationField>(
    field: &F,
    nr: usize,
    nc: usize,
    entries: &[Entry],
) -> Option<usize> {
    let m: Option<Vec<Vec<F::Elem>>> = (0..nr).map(|r| known_row(field, nc, entries, r)).collect();
    m.map(|m| field.rank(&m))
}

/// Exact rank of a texture when every entry is known: over Q, or over `Q(parameter)` when some value is a
/// rational function ([`super::function_field`]).
pub(super) fn texture_rank(nr: usize, nc: usize, entries: &[Entry]) -> Option<usize> {
    if entries.iter().all(|e| e.value.is_none()) {
        // every known entry is zero: rank 0 when all are known
        return entries.iter().all(|e| e.status.is_known()).then_some(0);
    }
    match parameter_of(entries) {
        Some(p) => known_rank(&FunctionField::new(p), nr, nc, entries),
        None => known_rank(&Rationals, nr, nc, entries),
    }
}

/// Exact relations of a texture (over `Q(parameter)` when some value is a rational function).
pub(super) fn relations(rows: &[String], columns: &[String], entries: &[Entry]) -> Vec<Relation> {
    if entries.iter().all(|e| e.value.is_none()) {
        return zero_texture_relations(rows, columns, entries);
    }
    match parameter_of(entries) {
        Some(p) => search(&FunctionField::new(p), rows, columns, entries),
        None => search(&Rationals, rows, columns, entries),
    }
}

/// [`search`] for a texture without a non-zero value (every known entry is zero), without materialising
/// values: only the rows and columns whose entries are all known, each as a `"zero"` relation, in the same
/// order and with the same limit.
pub(super) fn zero_texture_relations(
    rows: &[String],
    columns: &[String],
    entries: &[Entry],
) -> Vec<Relation> {
    let nc = columns.len();
    let known = |r: usize, c: usize| entries[r * nc + c].status.is_known();
    let zero = |between: &'static str, label: &String| Relation {
        between,
        kind: "zero",
        first: label.clone(),
        second: String::new(),
        factor: "0".into(),
        factor_depends_on_parameter: false,
    };
    let zero_rows = (0..rows.len())
        .filter(|&r| (0..nc).all(|c| known(r, c)))
        .map(|r| zero("rows", &rows[r]));
    let zero_columns = (0..nc)
        .filter(|&c| (0..rows.len()).all(|r| known(r, c)))
        .map(|c| zero("columns", &columns[c]));
    zero_rows.chain(zero_columns).take(MAX_RELATIONS).collect()
}

/// The relations of a texture over `field`, in this order: entries (each non-zero value linked to the first
/// entry with the same value up to a rational constant), then rows, then columns with every entry known (each
/// zero, or linked to the first earlier one it is proportional to); at most [`MAX_RELATIONS`].
pub(super) fn search<F: RelationField>(
    field: &F,
    rows: &[String],
    columns: &[String],
    entries: &[Entry],
) -> Vec<Relation> {
    let nc = columns.len();
    let mut out = Vec::new();
    let mut firsts: Vec<(F::Elem, BigRational, usize)> = Vec::new();
    for (i, e) in entries.iter().enumerate() {
        let Some(v) = field.known(e).filter(|v| !field.is_zero(v)) else {
            continue;
        };
        let (unit, lead) = field.up_to_constant(&v);
        match firsts.iter().find(|(u, _, _)| u == &unit) {
            Some((_, first_lead, j)) => {
                let factor = &lead / first_lead;
                out.push(Relation {
                    between: "entries",
                    kind: constant_kind(&factor),
                    first: entries[*j].fields.join(" "),
                    second: e.fields.join(" "),
                    factor: factor.to_string(),
                    factor_depends_on_parameter: false,
                });
            }
            None => firsts.push((unit, lead, i)),
        }
    }
    let nr = rows.len();
    let row_vals: Vec<Option<Vec<F::Elem>>> =
        (0..nr).map(|r| known_row(field, nc, entries, r)).collect();
    let col_vals: Vec<Option<Vec<F::Elem>>> = (0..nc)
        .map(|c| (0..nr).map(|r| field.known(&entries[r * nc + c])).collect())
        .collect();
    for (between, labels, vals) in [("rows", rows, row_vals), ("columns", columns, col_vals)] {
        for i in 0..vals.len() {
            let Some(b) = &vals[i] else { continue };
            if b.iter().all(|x| field.is_zero(x)) {
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
                if let Some(f) = proportional(field, a, b) {
                    let (kind, factor, factor_depends_on_parameter) = field.describe(&f);
                    out.push(Relation {
                        between,
                        kind,
                        first: labels[j].clone(),
                        second: labels[i].clone(),
                        factor,
                        factor_depends_on_parameter,
                    });
                    break;
                }
            }
        }
    }
    out.truncate(MAX_RELATIONS);
    out
}
