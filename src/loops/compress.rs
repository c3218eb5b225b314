//! Exact compression of linear chains before the LPs.
//!
//! A metabolite touched by exactly two reactions a and b fixes their ratio:
//! S_ma·v_a + S_mb·v_b = 0, so v_b = ρ·v_a with ρ = −S_ma/S_mb. The two
//! merge into one column a + ρ·b (the metabolite drops out) whose allowed
//! directions are those of a that b can follow. The merged network has
//! exactly the same steady-state fluxes, reaction by reaction (each original
//! flux is a fixed multiple of one merged flux), so capability questions
//! answered on it are exact for the original. Merging alternates with the
//! dead-end rules of `prune`, since a merge can leave a metabolite with a
//! single consumer or producer. This is the chain compression used by
//! elementary-mode tools (common practice); it shrinks the LPs a lot in
//! genome-scale models, where most metabolites link exactly two reactions.

use super::network::Directions;
use super::tolerance::ELIMINATION_DROP;
use std::collections::{BTreeMap, BTreeSet};

/// A merged column: its stoichiometry and how original reactions follow it.
#[derive(Debug, Clone, PartialEq)]
pub struct Merged {
    /// (metabolite, coefficient), sorted by metabolite.
    pub column: Vec<(usize, f64)>,
    /// (original reaction, factor): v_reaction = factor·λ.
    pub members: Vec<(usize, f64)>,
    pub allowed: Directions,
}

/// The compressed network.
#[derive(Debug, Clone, PartialEq)]
pub struct Compressed {
    pub merged: Vec<Merged>,
}

impl Compressed {
    /// Directions of each original reaction, given directions of the merged
    /// columns (original reactions in no merged column get none).
    pub fn expand(
        &self,
        merged_directions: &[Directions],
        reaction_count: usize,
    ) -> Vec<Directions> {
        let mut out = vec![Directions::NONE; reaction_count];
        for (column, directions) in self.merged.iter().zip(merged_directions) {
            for &(r, factor) in &column.members {
                out[r] = if factor > 0.0 {
                    *directions
                } else {
                    Directions {
                        forward: directions.backward,
                        backward: directions.forward,
                    }
                };
            }
        }
        out
    }
}

struct Column {
    entries: BTreeMap<usize, f64>,
    members: Vec<(usize, f64)>,
    allowed: Directions,
}

/// Compresses the network given by `columns` and `allowed` (reactions
/// without a direction are left out).
pub fn compress(
    metabolite_count: usize,
    columns: &[Vec<(usize, f64)>],
    allowed: &[Directions],
) -> Compressed {
    let mut cols: Vec<Column> = columns
        .iter()
        .zip(allowed)
        .enumerate()
        .map(|(r, (column, &allowed))| Column {
            entries: column.iter().copied().collect(),
            members: vec![(r, 1.0)],
            allowed,
        })
        .collect();
    let scale = columns
        .iter()
        .flatten()
        .map(|(_, c)| c.abs())
        .fold(0.0, f64::max);
    let drop = ELIMINATION_DROP * scale.max(1.0);
    let mut rows: Vec<BTreeSet<usize>> = vec![BTreeSet::new(); metabolite_count];
    for (j, column) in cols.iter().enumerate() {
        if column.allowed.any() {
            for &m in column.entries.keys() {
                rows[m].insert(j);
            }
        }
    }
    let mut queued = vec![true; metabolite_count];
    let mut work: Vec<usize> = (0..metabolite_count).rev().collect();

    while let Some(m) = work.pop() {
        queued[m] = false;
        let touching: Vec<usize> = rows[m].iter().copied().collect();
        if touching.is_empty() {
            continue;
        }
        let mut changed: Vec<usize> = Vec::new();
        let producers: Vec<usize> = touching
            .iter()
            .copied()
            .filter(|&j| cols[j].allowed.allows(cols[j].entries[&m]))
            .collect();
        let consumers: Vec<usize> = touching
            .iter()
            .copied()
            .filter(|&j| cols[j].allowed.allows(-cols[j].entries[&m]))
            .collect();
        if touching.len() == 1 || producers.is_empty() || consumers.is_empty() {
            for &j in &touching {
                cols[j].allowed = Directions::NONE;
                changed.push(j);
            }
        } else if touching.len() == 2 {
            let (a, b) = (touching[0], touching[1]);
            let ratio = -cols[a].entries[&m] / cols[b].entries[&m];
            let allowed_b = cols[b].allowed;
            let merged_allowed = Directions {
                forward: cols[a].allowed.forward && allowed_b.allows(ratio),
                backward: cols[a].allowed.backward && allowed_b.allows(-ratio),
            };
            let absorbed = std::mem::replace(
                &mut cols[b],
                Column {
                    entries: BTreeMap::new(),
                    members: Vec::new(),
                    allowed: Directions::NONE,
                },
            );
            for &metabolite in absorbed.entries.keys() {
                rows[metabolite].remove(&b);
            }
            let target = &mut cols[a];
            for (metabolite, value) in absorbed.entries {
                *target.entries.entry(metabolite).or_insert(0.0) += ratio * value;
            }
            target.entries.insert(m, 0.0);
            target
                .members
                .extend(absorbed.members.iter().map(|&(r, f)| (r, f * ratio)));
            target.allowed = merged_allowed;
            // Cancellation residue is exactly what a merge of integer
            // coefficients leaves; anything near zero is dropped.
            let dropped: Vec<usize> = target
                .entries
                .iter()
                .filter(|(_, v)| v.abs() <= drop)
                .map(|(k, _)| *k)
                .collect();
            for metabolite in dropped {
                target.entries.remove(&metabolite);
                rows[metabolite].remove(&a);
                changed_row(&mut work, &mut queued, metabolite);
            }
            // Keep merged coefficients of order one for the LP.
            let largest = target.entries.values().map(|v| v.abs()).fold(0.0, f64::max);
            if largest > 0.0 {
                for v in target.entries.values_mut() {
                    *v /= largest;
                }
                for member in &mut target.members {
                    member.1 /= largest;
                }
            }
            for &metabolite in target.entries.keys() {
                rows[metabolite].insert(a);
            }
            if !target.allowed.any() {
                changed.push(a);
            } else {
                for &metabolite in cols[a].entries.keys() {
                    changed_row(&mut work, &mut queued, metabolite);
                }
            }
        } else {
            if let [only] = consumers[..] {
                let c = cols[only].entries[&m];
                if restrict(&mut cols[only].allowed, -c) {
                    changed.push(only);
                }
            }
            if let [only] = producers[..] {
                let c = cols[only].entries[&m];
                if restrict(&mut cols[only].allowed, c) {
                    changed.push(only);
                }
            }
        }
        for j in changed {
            let metabolites: Vec<usize> = cols[j].entries.keys().copied().collect();
            if !cols[j].allowed.any() {
                for &metabolite in &metabolites {
                    rows[metabolite].remove(&j);
                }
            }
            for metabolite in metabolites {
                changed_row(&mut work, &mut queued, metabolite);
            }
        }
    }
    Compressed {
        merged: cols
            .into_iter()
            .filter(|c| c.allowed.any())
            .map(|c| Merged {
                column: c.entries.into_iter().collect(),
                members: c.members,
                allowed: c.allowed,
            })
            .collect(),
    }
}

fn changed_row(work: &mut Vec<usize>, queued: &mut [bool], metabolite: usize) {
    if !queued[metabolite] {
        queued[metabolite] = true;
        work.push(metabolite);
    }
}

fn restrict(directions: &mut Directions, wanted: f64) -> bool {
    let keep = if wanted > 0.0 {
        Directions::FORWARD
    } else {
        Directions::BACKWARD
    };
    let narrowed = directions.intersect(keep);
    let changed = narrowed != *directions;
    *directions = narrowed;
    changed
}

#[cfg(test)]
mod tests {
    use super::*;

    // A → B → C → A (irreversible): B and C each link two reactions, so the
    // cycle collapses to one column with no metabolite left (a loop by
    // itself), members in ratio 1 : 1 : 1 (balance by hand).
    #[test]
    fn cycle_collapses_to_an_empty_column() {
        let columns = vec![
            vec![(0, -1.0), (1, 1.0)],
            vec![(1, -1.0), (2, 1.0)],
            vec![(0, 1.0), (2, -1.0)],
        ];
        let c = compress(3, &columns, &[Directions::FORWARD; 3]);
        assert_eq!(c.merged.len(), 1);
        assert!(c.merged[0].column.is_empty());
        assert_eq!(c.merged[0].allowed, Directions::FORWARD);
        let mut factors: Vec<f64> = c.merged[0].members.iter().map(|m| m.1).collect();
        factors.dedup();
        assert_eq!(factors.len(), 1);
    }

    // Opposed irreversible steps A → B and C → B linked at B cannot both
    // run: B has only producers, so both are blocked (dead end).
    #[test]
    fn conflicting_directions_block_the_chain() {
        let columns = vec![vec![(0, -1.0), (1, 1.0)], vec![(2, -1.0), (1, 1.0)]];
        let c = compress(3, &columns, &[Directions::FORWARD; 2]);
        assert!(c.merged.is_empty());
    }
}
