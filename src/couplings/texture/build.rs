//! Building one texture: the entries of a two-factor or three-factor operator between the basis classes of its
//! slots, each with its status decided in the order of the parent module's documentation (charge, type
//! theorem, exact value), and the texture's ranks and relations ([`finish`]).
//!
//! Invariant: the entries of every texture built here are row-major over `rows × columns`, one per pair, and
//! an entry gets a value only when the charges allow it, the types reach the codimension and the product
//! bundle is trivial.

use super::family::{FamilyValues, ParameterFamily, family_tensor};
use super::relations::{relations, structural_rank, texture_rank};
use super::{
    CouplingClass, CouplingOptions, CouplingValue, Entry, EntryStatus, FamilySummary,
    MAX_TEXTURE_SIDE, TextureError,
};
use crate::bundle::charge_is_singlet;
use crate::bundle::spectrum::{Multiplet, Spectrum};
use crate::couplings::operators::{Operator, SingletField, singlet_insertions};
use crate::couplings::parametric::FamilyMembers;
use crate::couplings::value::{CouplingEngine, CouplingError};
use num_traits::Zero;

/// One side of a texture: the basis classes of the present multiplets of one kind.
struct Side<'a> {
    labels: Vec<String>,
    /// `(multiplet, class index)` per label.
    classes: Vec<(&'a Multiplet, usize)>,
}

fn side<'a>(spectrum: &'a Spectrum, kind: &str) -> Side<'a> {
    let mut labels = Vec::new();
    let mut classes = Vec::new();
    for m in spectrum.present().filter(|m| m.kind == kind) {
        for i in 0..m.count as usize {
            labels.push(format!("{}#{}", m.label, i + 1));
            classes.push((m, i));
        }
    }
    Side { labels, classes }
}

fn check_side(op: &Operator, what: &'static str, n: usize) -> Result<(), TextureError> {
    if n > MAX_TEXTURE_SIDE {
        return Err(TextureError::TooLarge {
            operator: op.name.clone(),
            what,
            size: n,
        });
    }
    Ok(())
}

pub(super) fn bilinear(
    op: &Operator,
    spectrum: &Spectrum,
    singlets: &[SingletField],
    options: &CouplingOptions,
) -> Result<Vec<CouplingClass>, TextureError> {
    let rows = side(spectrum, op.slots[0]);
    let cols = side(spectrum, op.slots[1]);
    if rows.labels.is_empty() || cols.labels.is_empty() {
        return Ok(vec![]);
    }
    check_side(op, "row", rows.labels.len())?;
    check_side(op, "column", cols.labels.len())?;
    let mut entries = Vec::new();
    for (r, (rm, _)) in rows.classes.iter().enumerate() {
        for (c, (cm, _)) in cols.classes.iter().enumerate() {
            let charges = [rm.charge.as_slice(), cm.charge.as_slice()];
            let allowed = charge_is_singlet(&charges)?;
            entries.push(Entry {
                fields: vec![rows.labels[r].clone(), cols.labels[c].clone()],
                row: r,
                column: c,
                status: if allowed {
                    EntryStatus::AllowedByCharge
                } else {
                    EntryStatus::ForbiddenByCharge
                },
                value: None,
                rational_function: None,
                types: None,
                singlet_insertions: if allowed {
                    vec![]
                } else {
                    singlet_insertions(&charges, singlets, options.singlets)?
                },
            });
        }
    }
    Ok(vec![finish(
        op,
        None,
        rows.labels,
        cols.labels,
        entries,
        vec![],
    )])
}

pub(super) struct Cubic<'a> {
    pub(super) op: &'a Operator,
    pub(super) spectrum: &'a Spectrum,
    pub(super) singlets: &'a [SingletField],
    pub(super) options: &'a CouplingOptions,
    pub(super) k_codim: usize,
    pub(super) coupling_engine: &'a CouplingEngine<'a>,
    /// The family and its shared sample members.
    pub(super) family: Option<(&'a ParameterFamily<'a>, &'a FamilyMembers<'a>)>,
}

impl Cubic<'_> {
    fn types(
        &self,
        cache: &mut std::collections::HashMap<Vec<i64>, Vec<usize>>,
        k: &[i64],
    ) -> Result<Vec<usize>, TextureError> {
        if let Some(t) = cache.get(k) {
            return Ok(t.clone());
        }
        let t = crate::couplings::value::h1_types(self.coupling_engine.engine(), k)?;
        cache.insert(k.to_vec(), t.clone());
        Ok(t)
    }

    /// The textures of one three-factor operator, and the number of Yukawa tensors computed.
    pub(super) fn textures(
        &self,
        types_cache: &mut std::collections::HashMap<Vec<i64>, Vec<usize>>,
        mut summary: Option<&mut FamilySummary>,
    ) -> Result<(Vec<CouplingClass>, usize, usize), TextureError> {
        let op = self.op;
        let rows = side(self.spectrum, op.slots[0]);
        let cols = side(self.spectrum, op.slots[1]);
        let choices = side(self.spectrum, op.slots[2]);
        if rows.labels.is_empty() || cols.labels.is_empty() || choices.labels.is_empty() {
            return Ok((vec![], 0, 0));
        }
        check_side(op, "row", rows.labels.len())?;
        check_side(op, "column", cols.labels.len())?;
        let mut tensors: std::collections::HashMap<[String; 3], FamilyValues> = Default::default();
        let mut warned: Vec<String> = Vec::new();
        // Tensors computed by the engine (not derived by a permutation).
        let mut computed_tensors = 0usize;
        let mut out = Vec::new();
        // Textures with every entry forbidden by charge are not built when no singlet insertions are asked
        // for (the caller drops them anyway); they are counted.
        let mut all_forbidden = 0usize;
        for (h, (hm, hi)) in choices.classes.iter().enumerate() {
            if self.options.singlets == 0 && !any_allowed(&rows, &cols, hm) {
                all_forbidden += 1;
                continue;
            }
            let mut entries = Vec::with_capacity(rows.labels.len() * cols.labels.len());
            let mut warnings = Vec::new();
            for (r, (rm, ri)) in rows.classes.iter().enumerate() {
                for (c, (cm, ci)) in cols.classes.iter().enumerate() {
                    let fields = vec![
                        rows.labels[r].clone(),
                        cols.labels[c].clone(),
                        choices.labels[h].clone(),
                    ];
                    let charges = [
                        rm.charge.as_slice(),
                        cm.charge.as_slice(),
                        hm.charge.as_slice(),
                    ];
                    let mut entry = Entry {
                        fields,
                        row: r,
                        column: c,
                        status: EntryStatus::ForbiddenByCharge,
                        value: None,
                        rational_function: None,
                        types: None,
                        singlet_insertions: vec![],
                    };
                    if !charge_is_singlet(&charges)? {
                        entry.singlet_insertions =
                            singlet_insertions(&charges, self.singlets, self.options.singlets)?;
                        entries.push(entry);
                        continue;
                    }
                    let t = [
                        self.types(types_cache, &rm.line_bundle)?[*ri],
                        self.types(types_cache, &cm.line_bundle)?[*ci],
                        self.types(types_cache, &hm.line_bundle)?[*hi],
                    ];
                    entry.types = Some(t.to_vec());
                    if t.iter().sum::<usize>() < self.k_codim {
                        entry.status = EntryStatus::VanishesByType;
                        entries.push(entry);
                        continue;
                    }
                    let trivial = (0..rm.line_bundle.len())
                        .all(|i| rm.line_bundle[i] + cm.line_bundle[i] + hm.line_bundle[i] == 0);
                    entry.status = EntryStatus::NotComputed;
                    if !self.options.values {
                        push_unique(&mut warnings, "values not requested".to_string());
                    } else if !trivial {
                        push_unique(
                            &mut warnings,
                            "the product line bundle is not trivial (c1(V) != 0)".to_string(),
                        );
                    } else {
                        let key = [rm.label.clone(), cm.label.clone(), hm.label.clone()];
                        if !tensors.contains_key(&key) && !warned.contains(&key.join(" ")) {
                            let triple = [
                                rm.line_bundle.as_slice(),
                                cm.line_bundle.as_slice(),
                                hm.line_bundle.as_slice(),
                            ];
                            let computed = match derivable(&tensors, &key) {
                                // graded antisymmetry: a permutation of an already computed triple
                                Some((source, perm)) => {
                                    if let Some(s) = summary.as_deref_mut() {
                                        s.push_permuted(&source, perm);
                                    }
                                    Ok(tensors[&source].permuted(perm))
                                }
                                None => {
                                    computed_tensors += 1;
                                    match self.family {
                                        None => self
                                            .coupling_engine
                                            .yukawa_tensor(triple)
                                            .map(|t| FamilyValues::Member(Box::new(t))),
                                        Some((f, members)) => family_tensor(
                                            f,
                                            members,
                                            self.coupling_engine,
                                            [&key[0], &key[1], &key[2]],
                                            triple,
                                        )
                                        .map(|(v, record)| {
                                            if let Some(s) = summary.as_deref_mut() {
                                                s.push(record);
                                            }
                                            v
                                        }),
                                    }
                                }
                            };
                            match computed {
                                Ok(t) => {
                                    tensors.insert(key.clone(), t);
                                }
                                Err(e @ CouplingError::TooLarge { .. })
                                | Err(e @ CouplingError::Cohomology(_)) => {
                                    warned.push(key.join(" "));
                                    push_unique(&mut warnings, format!("{}: {e}", key.join(" ")));
                                }
                                Err(e) => return Err(e.into()),
                            }
                        }
                        if let Some(t) = tensors.get(&key) {
                            let value = match t {
                                FamilyValues::Member(t) => {
                                    let v = t.get(*ri, *ci, *hi);
                                    (!v.is_zero()).then(|| CouplingValue::Rational(v.clone()))
                                }
                                FamilyValues::Functions(t) => {
                                    let f = t.get(*ri, *ci, *hi);
                                    (!f.is_zero())
                                        .then(|| CouplingValue::from_function(&t.parameter, f))
                                }
                            };
                            match value {
                                None => entry.status = EntryStatus::ZeroComputed,
                                Some(v) => {
                                    entry.status = EntryStatus::Value;
                                    entry.set_value(v);
                                }
                            }
                        } else if warned.contains(&key.join(" ")) {
                            push_unique(
                                &mut warnings,
                                format!("{}: value refused (see above)", key.join(" ")),
                            );
                        }
                    }
                    entries.push(entry);
                }
            }
            out.push(finish(
                op,
                Some(choices.labels[h].clone()),
                rows.labels.clone(),
                cols.labels.clone(),
                entries,
                warnings,
            ));
        }
        Ok((out, computed_tensors, all_forbidden))
    }
}

fn push_unique(v: &mut Vec<String>, s: String) {
    if !v.contains(&s) {
        v.push(s);
    }
}

/// Whether some (row, column) pair with the choice `hm` is allowed by charge; a charge error counts as allowed
/// (the texture is then built and reports it).
fn any_allowed(rows: &Side, cols: &Side, hm: &Multiplet) -> bool {
    fn distinct<'a>(side: &Side<'a>) -> Vec<&'a [i64]> {
        let mut seen: Vec<&'a [i64]> = Vec::new();
        for (m, _) in &side.classes {
            if !seen.contains(&m.charge.as_slice()) {
                seen.push(&m.charge);
            }
        }
        seen
    }
    let cols = distinct(cols);
    distinct(rows).iter().any(|r| {
        cols.iter()
            .any(|c| charge_is_singlet(&[r, c, hm.charge.as_slice()]).unwrap_or(true))
    })
}

/// An already computed tensor whose slots, permuted by `perm` (slot `s` of `key` is slot `perm[s]` of the
/// source), give `key` — its values then follow by graded antisymmetry ([`YukawaTensor::permuted`]).
///
/// [`YukawaTensor::permuted`]: crate::couplings::value::YukawaTensor::permuted
fn derivable(
    tensors: &std::collections::HashMap<[String; 3], FamilyValues>,
    key: &[String; 3],
) -> Option<([String; 3], [usize; 3])> {
    const PERMUTATIONS: [[usize; 3]; 5] = [[1, 0, 2], [2, 1, 0], [0, 2, 1], [1, 2, 0], [2, 0, 1]];
    PERMUTATIONS.iter().find_map(|&perm| {
        // source[perm[s]] = key[s]
        let mut source = key.clone();
        for s in 0..3 {
            source[perm[s]] = key[s].clone();
        }
        (source != *key && tensors.contains_key(&source)).then_some((source, perm))
    })
}

pub(super) fn finish(
    op: &Operator,
    choice: Option<String>,
    rows: Vec<String>,
    columns: Vec<String>,
    entries: Vec<Entry>,
    warnings: Vec<String>,
) -> CouplingClass {
    let (nr, nc) = (rows.len(), columns.len());
    let pattern = |keep: &dyn Fn(EntryStatus) -> bool| -> Vec<Vec<bool>> {
        (0..nr)
            .map(|r| (0..nc).map(|c| keep(entries[r * nc + c].status)).collect())
            .collect()
    };
    let full_rank = structural_rank(&pattern(&|s| s != EntryStatus::ForbiddenByCharge));
    let structural_rank_after_type = structural_rank(&pattern(&|s| {
        !matches!(
            s,
            EntryStatus::ForbiddenByCharge | EntryStatus::VanishesByType
        )
    }));
    let rank = texture_rank(nr, nc, &entries);
    let relations = relations(&rows, &columns, &entries);
    CouplingClass {
        operator: op.name.clone(),
        slots: op.slots.clone(),
        choice,
        rows,
        columns,
        entries,
        structural_rank: full_rank,
        structural_rank_after_type,
        rank,
        relations,
        warnings,
    }
}
