//! Constraint re-checks on the loop-capable network, with one warm LP.
//!
//! Question: with one direction of one reaction forbidden, which members of
//! a loop can still carry flux in their loop direction? Forbidding a
//! direction only shrinks the cone of closed-network fluxes, so every flux
//! of the constrained cone lies in the loop-capable network: the question
//! is asked there, compressed (chains merge exactly, see `compress`: each
//! reaction's flux is a fixed multiple of its merged column's flux, so a
//! direction of a reaction is a direction of its column).
//!
//! A member can carry flux of sign t exactly when fixing its column's flux
//! at t is feasible in the (unboxed) cone: scale any flux of that sign. One
//! session over the whole capable network serves every re-check. Each
//! constraint is a fix too: a reversible column that may need one of its
//! directions forbidden carries two slack variables u = p − n (p, n ≥ 0), and
//! fixing p (or n) at 0 forbids the forward (or backward) direction; an
//! irreversible column is fixed at 0. Each feasible solution settles every
//! member it shows carrying flux in its loop direction, so a re-check costs a
//! few warm dual-simplex edits instead of a capability analysis.
//!
//! Many answers need no LP at all: every listed loop is a verified flux of
//! the closed network, so a loop that does not use the forbidden direction
//! shows each of its members still carrying flux in its direction there
//! (and, for a loop that runs both ways, in the opposite one too).
//! [`Witnesses`] settles those; the LP is asked only about the rest, and
//! not at all when nothing is left.

use super::compress::{compress, Merged};
use super::elementary::ElementaryLoop;
use super::local::{self, Neighbourhoods};
use super::network::Directions;
use super::tolerance::FLUX_NONZERO;
use crate::lp::{LinearProgram, LpError, LpSession, Relation, Sense, Var};
use std::collections::{BTreeMap, HashMap};

/// A direction to forbid: (reaction, sign of the forbidden flux).
pub type Forbid = (usize, f64);

/// Listed loops as ready answers to re-check questions.
pub struct Witnesses<'a> {
    loops: &'a [ElementaryLoop],
    /// (reaction, forward?) → (loop position, orientation ±1) of every
    /// verified loop, or reversible loop run backwards, with that reaction
    /// carrying flux in that direction.
    carriers: HashMap<(usize, bool), Vec<(usize, f64)>>,
}

impl<'a> Witnesses<'a> {
    /// Only verified loops serve (steady state, signs the bounds allow);
    /// their members are sorted by reaction index.
    pub fn new(loops: &'a [ElementaryLoop]) -> Witnesses<'a> {
        let mut carriers: HashMap<(usize, bool), Vec<(usize, f64)>> = HashMap::new();
        for (position, cycle) in loops.iter().enumerate() {
            if !cycle.verified {
                continue;
            }
            let orientations: &[f64] = if cycle.reversible {
                &[1.0, -1.0]
            } else {
                &[1.0]
            };
            for &orientation in orientations {
                for member in &cycle.members {
                    let forward = orientation * member.coefficient > 0.0;
                    carriers
                        .entry((member.index, forward))
                        .or_default()
                        .push((position, orientation));
                }
            }
        }
        Witnesses { loops, carriers }
    }

    /// Whether a listed loop shows `reaction` carrying flux of `sign` with
    /// `forbid` in force: one that carries it and does not use the forbidden
    /// direction (a flux of the closed network without that direction is a
    /// flux of the constrained network).
    pub fn shows(&self, (reaction, sign): (usize, f64), forbid: Forbid) -> bool {
        let Some(carriers) = self.carriers.get(&(reaction, sign > 0.0)) else {
            return false;
        };
        carriers.iter().any(|&(position, orientation)| {
            let members = &self.loops[position].members;
            match members.binary_search_by_key(&forbid.0, |m| m.index) {
                Ok(k) => orientation * members[k].coefficient * forbid.1 < 0.0,
                Err(_) => true,
            }
        })
    }
}

/// Warm LP over the compressed loop-capable network.
pub struct Rechecker {
    session: LpSession,
    /// Per reaction: (merged column, factor) when loop-capable.
    column_of: Vec<Option<(usize, f64)>>,
    /// Merged flux variable per column.
    flux: Vec<Var>,
    allowed: Vec<Directions>,
    /// (column, +1 or −1) → the variable to fix at 0 to forbid that sign.
    forbid_var: BTreeMap<(usize, i8), Var>,
    metabolite_count: usize,
    merged: Vec<Merged>,
    /// For the neighbourhood LP tried before each global one (`local`).
    near: Neighbourhoods,
    /// How the neighbourhood LPs fared: where most questions are answered
    /// "no" (only the whole network can show that), they stop.
    record: local::Record,
}

fn sign_key(sign: f64) -> i8 {
    if sign > 0.0 {
        1
    } else {
        -1
    }
}

impl Rechecker {
    /// `capable`: loop-capable directions per reaction; `forbids`: every
    /// constraint that will be asked about (only their columns get slacks).
    pub fn new(
        metabolite_count: usize,
        columns: &[Vec<(usize, f64)>],
        capable: &[Directions],
        forbids: &[Forbid],
    ) -> Result<Rechecker, LpError> {
        let compressed = compress(metabolite_count, columns, capable);
        let merged = &compressed.merged;
        let near = Neighbourhoods::new(metabolite_count, merged);
        let mut column_of = vec![None; columns.len()];
        for (j, column) in merged.iter().enumerate() {
            for &(r, factor) in &column.members {
                column_of[r] = Some((j, factor));
            }
        }
        let mut lp = LinearProgram::new(Sense::Minimise);
        let flux: Vec<Var> = merged
            .iter()
            .map(|m| {
                let lower = if m.allowed.backward {
                    f64::NEG_INFINITY
                } else {
                    0.0
                };
                let upper = if m.allowed.forward {
                    f64::INFINITY
                } else {
                    0.0
                };
                lp.add_variable(0.0, lower, upper)
            })
            .collect();
        let mut rows: Vec<Vec<(Var, f64)>> = vec![Vec::new(); metabolite_count];
        for (column, &var) in merged.iter().zip(&flux) {
            for &(m, c) in &column.column {
                rows[m].push((var, c));
            }
        }
        for row in rows.iter().filter(|r| !r.is_empty()) {
            lp.add_row(row, Relation::Equal, 0.0);
        }
        let mut forbid_var = BTreeMap::new();
        let mut split: BTreeMap<usize, (Var, Var)> = BTreeMap::new();
        for &(r, sign) in forbids {
            let Some((j, factor)) = column_of[r] else {
                continue;
            };
            let merged_sign = sign_key(sign * factor);
            if !merged[j].allowed.both() {
                forbid_var.insert((j, merged_sign), flux[j]);
                continue;
            }
            let (p, n) = *split.entry(j).or_insert_with(|| {
                let p = lp.add_variable(0.0, 0.0, f64::INFINITY);
                let n = lp.add_variable(0.0, 0.0, f64::INFINITY);
                lp.add_row(&[(flux[j], 1.0), (p, -1.0), (n, 1.0)], Relation::Equal, 0.0);
                (p, n)
            });
            forbid_var.insert((j, merged_sign), if merged_sign > 0 { p } else { n });
        }
        Ok(Rechecker {
            session: LpSession::start(&lp)?,
            column_of,
            flux,
            allowed: merged.iter().map(|m| m.allowed).collect(),
            forbid_var,
            metabolite_count,
            near,
            merged: compressed.merged,
            record: local::Record::default(),
        })
    }

    /// With `forbid` in force, which of `wanted` (reaction, loop sign) can
    /// still carry flux of that sign; `known` holds answers already settled
    /// (`Some(true)` from a [`Witnesses`] loop), one per entry. Returns one
    /// flag per entry and the number of LP edits.
    pub fn still_capable(
        &mut self,
        forbid: Forbid,
        wanted: &[(usize, f64)],
        known: &[Option<bool>],
    ) -> Result<(Vec<bool>, usize), LpError> {
        let mut solves = 0;
        let mut settled: Vec<Option<bool>> = known.to_vec();
        // (column, merged sign) per wanted entry.
        let targets: Vec<Option<(usize, f64)>> = wanted
            .iter()
            .map(|&(r, sign)| self.column_of[r].map(|(j, f)| (j, (sign * f).signum())))
            .collect();
        let forbidden = self.column_of[forbid.0].map(|(j, f)| (j, (forbid.1 * f).signum()));
        for (k, target) in targets.iter().enumerate() {
            if settled[k].is_some() {
                continue;
            }
            match *target {
                None => settled[k] = Some(false),
                Some((j, t)) if !self.allowed[j].allows(t) => settled[k] = Some(false),
                Some((j, t)) if Some((j, t)) == forbidden => settled[k] = Some(false),
                // The other sign of an irreversible forbidden column is
                // not allowed anyway (caught above).
                _ => {}
            }
        }
        // A flux in a target's neighbourhood that avoids the forbidden
        // direction settles it (and every other target it carries) without
        // the LP of the whole network.
        for k in 0..wanted.len() {
            let (None, Some(target)) = (settled[k], targets[k]) else {
                continue;
            };
            if !self.record.worth_trying() {
                break;
            }
            let near = local::flux_avoiding(
                self.metabolite_count,
                &self.merged,
                &self.near,
                target,
                forbidden,
            )?;
            self.record.note(near.is_some());
            if let Some(found) = near {
                for (other, target) in targets.iter().enumerate() {
                    if let (None, Some((i, s))) = (settled[other], *target) {
                        if found.iter().any(|&(c, l)| c == i && s * l >= FLUX_NONZERO) {
                            settled[other] = Some(true);
                        }
                    }
                }
                settled[k] = Some(true);
            }
        }
        if settled.iter().all(Option::is_some) {
            return Ok((
                settled.into_iter().map(|s| s == Some(true)).collect(),
                solves,
            ));
        }
        let forbid_var =
            forbidden.and_then(|(j, t)| self.forbid_var.get(&(j, sign_key(t))).copied());
        if let Some(var) = forbid_var {
            // Zero flux stays feasible: no state copy needed.
            self.session.fix_feasible(var, 0.0)?;
            solves += 1;
        }
        for k in 0..wanted.len() {
            if settled[k].is_some() {
                continue;
            }
            let (j, t) = targets[k].expect("unsettled targets have a column");
            let attempt = self.session.fix(self.flux[j], t).map(|s| s.values.clone());
            solves += 1;
            match attempt {
                Ok(values) => {
                    for (other, target) in targets.iter().enumerate() {
                        if let (None, Some((i, s))) = (settled[other], *target) {
                            if s * values[self.flux[i].0] >= FLUX_NONZERO {
                                settled[other] = Some(true);
                            }
                        }
                    }
                    // The fix itself shows the target, whatever the round-off.
                    settled[k] = Some(true);
                    self.session.release(self.flux[j])?;
                    solves += 1;
                }
                Err(LpError::Infeasible) => settled[k] = Some(false),
                Err(other) => return Err(other),
            }
        }
        if let Some(var) = forbid_var {
            self.session.release(var)?;
            solves += 1;
        }
        Ok((
            settled.into_iter().map(|s| s == Some(true)).collect(),
            solves,
        ))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::loops::LoopMember;

    fn listed(members: &[(usize, f64)], reversible: bool, verified: bool) -> ElementaryLoop {
        ElementaryLoop {
            id: String::new(),
            members: members
                .iter()
                .map(|&(index, coefficient)| LoopMember {
                    reaction: format!("R{index}"),
                    index,
                    coefficient,
                })
                .collect(),
            metabolites: Vec::new(),
            integer_coefficients: true,
            reversible,
            residual: 0.0,
            verified,
            elementary: true,
        }
    }

    // Three copies of A ⇌ B, R0, R1, R2 (balance by hand, common practice):
    // R0 − R1 and R1 − R2 are loops, both runnable backwards. With R0's
    // forward direction forbidden, R1 − R2 run backwards still shows R1
    // backward and R2 forward; nothing listed shows R0 forward without
    // using it, and an unverified or one-way loop is not read backwards.
    #[test]
    fn listed_loops_settle_questions_that_avoid_the_forbidden_direction() {
        let loops = vec![
            listed(&[(0, 1.0), (1, -1.0)], true, true),
            listed(&[(1, 1.0), (2, -1.0)], true, true),
        ];
        let witnesses = Witnesses::new(&loops);
        let forbid = (0, 1.0);
        assert!(witnesses.shows((1, -1.0), forbid));
        assert!(witnesses.shows((2, 1.0), forbid));
        assert!(witnesses.shows((1, 1.0), forbid));
        assert!(!witnesses.shows((0, 1.0), forbid));
        // R0 backward: R0 − R1 run backwards, which does not run R0 forward.
        assert!(witnesses.shows((0, -1.0), forbid));
        // Forbidding R0 backward instead leaves R0 forward shown by R0 − R1.
        assert!(witnesses.shows((0, 1.0), (0, -1.0)));

        let one_way = vec![listed(&[(1, 1.0), (2, -1.0)], false, true)];
        let witnesses = Witnesses::new(&one_way);
        assert!(witnesses.shows((1, 1.0), forbid));
        assert!(!witnesses.shows((1, -1.0), forbid));
        let unverified = vec![listed(&[(1, 1.0), (2, -1.0)], true, false)];
        assert!(!Witnesses::new(&unverified).shows((1, 1.0), forbid));
    }
}
