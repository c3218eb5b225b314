//! Safe graph reasoning before any LP: dead-end metabolites and the
//! directions their balance forces.
//!
//! Every rule here follows from one metabolite's steady-state balance
//! Σᵣ S_mr·v_r = 0 alone, so it never removes a flux the closed network
//! allows:
//! - a metabolite that no allowed direction of any reaction consumes (or none
//!   produces), or that touches a single reaction, forces every reaction
//!   touching it to zero (dead end, common practice);
//! - when all reactions of a metabolite but one can only produce it, that one
//!   must consume it: it keeps only its consuming direction (and the mirror
//!   case).
//!
//! A cycle filter on the metabolite–reaction graph is deliberately absent: with
//! non-unit stoichiometry a reaction on no directed cycle can still carry flux
//! in a closed network (see the tests).

use super::network::Directions;
use serde::Serialize;

/// What pruning removed or narrowed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize)]
pub struct PruningSummary {
    /// Reactions with at least one allowed direction before pruning.
    pub reactions_before: usize,
    /// Reactions forced to zero flux by dead-end metabolites.
    pub removed_reactions: usize,
    /// Metabolites found to be dead ends (while still touching a reaction).
    pub dead_end_metabolites: usize,
    /// Reactions that lost one of their two directions.
    pub narrowed_reactions: usize,
}

/// Narrows `allowed` in place. `columns` holds each reaction's stoichiometry.
pub fn prune(
    metabolite_count: usize,
    columns: &[Vec<(usize, f64)>],
    allowed: &mut [Directions],
) -> PruningSummary {
    let mut summary = PruningSummary {
        reactions_before: allowed.iter().filter(|d| d.any()).count(),
        ..PruningSummary::default()
    };
    let mut rows: Vec<Vec<(usize, f64)>> = vec![Vec::new(); metabolite_count];
    for (r, column) in columns.iter().enumerate() {
        for &(m, c) in column {
            rows[m].push((r, c));
        }
    }
    let mut queued = vec![true; metabolite_count];
    let mut work: Vec<usize> = (0..metabolite_count).rev().collect();
    let mut dead = vec![false; metabolite_count];
    let was_active: Vec<bool> = allowed.iter().map(|d| d.any()).collect();
    let was_both: Vec<bool> = allowed.iter().map(|d| d.both()).collect();

    while let Some(m) = work.pop() {
        queued[m] = false;
        let mut changed: Vec<usize> = Vec::new();
        let active: Vec<(usize, f64)> = rows[m]
            .iter()
            .copied()
            .filter(|(r, _)| allowed[*r].any())
            .collect();
        if active.is_empty() {
            continue;
        }
        let produces = |r: usize, c: f64| allowed[r].allows(c);
        let consumes = |r: usize, c: f64| allowed[r].allows(-c);
        let producers: Vec<usize> = active
            .iter()
            .filter(|(r, c)| produces(*r, *c))
            .map(|(r, _)| *r)
            .collect();
        let consumers: Vec<usize> = active
            .iter()
            .filter(|(r, c)| consumes(*r, *c))
            .map(|(r, _)| *r)
            .collect();
        if active.len() == 1 || producers.is_empty() || consumers.is_empty() {
            if !dead[m] {
                dead[m] = true;
                summary.dead_end_metabolites += 1;
            }
            for &(r, _) in &active {
                allowed[r] = Directions::NONE;
                changed.push(r);
            }
        } else {
            // The only consumer must consume; the only producer must produce.
            if let [only] = consumers[..] {
                let c = coefficient(&active, only);
                if restrict(&mut allowed[only], -c) {
                    changed.push(only);
                }
            }
            if let [only] = producers[..] {
                let c = coefficient(&active, only);
                if restrict(&mut allowed[only], c) {
                    changed.push(only);
                }
            }
        }
        for r in changed {
            for &(other, _) in &columns[r] {
                if !queued[other] {
                    queued[other] = true;
                    work.push(other);
                }
            }
        }
    }
    for r in 0..allowed.len() {
        if was_active[r] && !allowed[r].any() {
            summary.removed_reactions += 1;
        } else if was_both[r] && !allowed[r].both() {
            summary.narrowed_reactions += 1;
        }
    }
    summary
}

fn coefficient(active: &[(usize, f64)], reaction: usize) -> f64 {
    active
        .iter()
        .find(|(r, _)| *r == reaction)
        .map(|(_, c)| *c)
        .unwrap_or(0.0)
}

/// Keeps only the direction in which the reaction changes the metabolite
/// with the sign of `wanted` (coefficient × flux sign); true when narrowed.
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
