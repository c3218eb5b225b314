//! Elementary loops through the loop-capable reactions.
//!
//! For a target reaction and direction, the LP
//!   min Σ |v_r|  s.t.  S·v = 0,  v_target = ±1,  signs as capable
//! has an optimal vertex that is an elementary flux mode of the closed
//! network (a vertex of the cone cut by the plane v_target = ±1 within one
//! orthant); the simplex returns such a vertex. Targets whose loop can be
//! read off the compressed structure (a column that balances by itself, or
//! two proportional columns with compatible directions) skip the LP: that
//! loop is elementary too, though not necessarily L1-minimal, and any
//! elementary loop through the target serves the cover. Before the LP of the
//! whole network, the same LP is solved over the target's neighbourhood
//! (`local`): much smaller, and a loop there is an elementary loop of the
//! whole network too. Each loop is checked back:
//! S·v = 0 within tolerance, signs allowed by the bounds, and the support's
//! columns have a one-dimensional null space (elementary).

use super::compress::{compress, Merged};
use super::exact;
use super::local;
use super::network::Directions;
use super::nullspace::Elimination;
use super::tolerance::{
    FLUX_NONZERO, INTEGER_MULTIPLIER_MAX, INTEGER_SNAP, LOOP_RESIDUAL, PROPORTIONAL_KEY_SCALE,
    PROPORTIONAL_MATCH,
};
use crate::lp::{LinearProgram, LpError, LpSession, Relation, Sense, Var};
use rayon::prelude::*;
use serde::Serialize;
use std::collections::{BTreeMap, BTreeSet};

/// One reaction of a loop.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LoopMember {
    pub reaction: String,
    /// Index into `Model::reactions`.
    pub index: usize,
    /// Relative flux: positive = forward as written, negative = backward.
    pub coefficient: f64,
}

/// An elementary internal loop.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ElementaryLoop {
    /// `loop-<10 hex>` from the member reaction ids (see `loops::ids`).
    pub id: String,
    /// Sorted by reaction index.
    pub members: Vec<LoopMember>,
    /// Metabolites the loop's reactions touch (ids, sorted): its cycle map.
    pub metabolites: Vec<String>,
    /// Coefficients were snapped to integers (otherwise smallest |coef| = 1).
    pub integer_coefficients: bool,
    /// Every member may also run the other way, so the loop runs backwards too.
    pub reversible: bool,
    /// Largest |S·v| over the loop's metabolites, relative to the largest term.
    pub residual: f64,
    /// Residual within tolerance and every sign allowed by the bounds.
    pub verified: bool,
    /// The support's columns have a one-dimensional null space.
    pub elementary: bool,
}

/// What loop enumeration produced.
#[derive(Debug, Clone, PartialEq)]
pub struct LoopSet {
    pub loops: Vec<ElementaryLoop>,
    /// Capable reactions that appear in no listed loop.
    pub uncovered: Vec<usize>,
    pub truncated: bool,
    pub lp_solves: usize,
    /// Loops read off the structure without an LP.
    pub direct_loops: usize,
    /// Loops found by the LP of a target's neighbourhood (see `local`).
    pub local_loops: usize,
    /// Loops whose LP answer was poor, recomputed exactly on their support.
    pub exact_repairs: usize,
    /// LP answers that were no loop even after exact repair (why, per answer).
    pub dropped: Vec<String>,
}

/// Names needed to describe loops.
pub struct Names<'a> {
    pub reactions: &'a [String],
    pub metabolites: &'a [String],
}

/// Finds elementary loops until every capable reaction is covered or
/// `limit` loops are listed.
pub fn find_loops(
    columns: &[Vec<(usize, f64)>],
    capable: &[Directions],
    allowed: &[Directions],
    names: &Names<'_>,
    limit: Option<usize>,
) -> Result<LoopSet, LpError> {
    let members: Vec<usize> = (0..columns.len()).filter(|&r| capable[r].any()).collect();
    let mut result = LoopSet {
        loops: Vec::new(),
        uncovered: Vec::new(),
        truncated: false,
        lp_solves: 0,
        direct_loops: 0,
        local_loops: 0,
        exact_repairs: 0,
        dropped: Vec::new(),
    };
    if members.is_empty() {
        return Ok(result);
    }
    // Chains of the capable network merge exactly (see `compress`); its
    // elementary modes are those of the original network, and the L1 norm
    // is kept by weighting each merged flux with Σ|factor| of its members.
    let metabolite_count = names.metabolites.len();
    let compressed = compress(metabolite_count, columns, capable);
    let merged = &compressed.merged;
    // A reversible merged flux is split as u = p − n (p, n ≥ 0), both parts
    // weighted: Σ weight·(p + n) is the L1 norm at any vertex (the two parts
    // have opposite columns, so no basis holds both), and the LP keeps only
    // the steady-state rows instead of two |u| rows per reversible column.
    let mut lp = LinearProgram::new(Sense::Minimise);
    let mut parts: Vec<FluxParts> = Vec::with_capacity(merged.len());
    for column in merged {
        let weight: f64 = column.members.iter().map(|(_, f)| f.abs()).sum();
        let d = column.allowed;
        parts.push(FluxParts {
            forward: d
                .forward
                .then(|| lp.add_variable(weight, 0.0, f64::INFINITY)),
            backward: d
                .backward
                .then(|| lp.add_variable(weight, 0.0, f64::INFINITY)),
        });
    }
    let mut rows: Vec<Vec<(Var, f64)>> = vec![Vec::new(); metabolite_count];
    for (column, part) in merged.iter().zip(&parts) {
        for &(m, c) in &column.column {
            if let Some(p) = part.forward {
                rows[m].push((p, c));
            }
            if let Some(n) = part.backward {
                rows[m].push((n, -c));
            }
        }
    }
    for row in rows.iter().filter(|row| !row.is_empty()) {
        lp.add_row(row, Relation::Equal, 0.0);
    }
    // A fixed number of workers, each with its own warm session. Targets go
    // out in batches of that size, in order, and results are taken in order,
    // so the list does not depend on timing or on the machine.
    let mut sessions: Vec<LpSession> = (0..LOOP_WORKERS)
        .map(|_| LpSession::start(&lp))
        .collect::<Result<_, _>>()?;
    result.lp_solves += LOOP_WORKERS;

    // Targets in the order of their first reaction, for reproducible lists.
    let mut order: Vec<usize> = (0..merged.len()).collect();
    order.sort_by_key(|&j| merged[j].members.iter().map(|(r, _)| *r).min());
    let partners = proportional_partners(merged);
    let near = local::Neighbourhoods::new(metabolite_count, merged);
    let mut local_record = local::Record::default();
    let mut local_found: BTreeMap<usize, Option<Vec<(usize, f64)>>> = BTreeMap::new();
    // Merged columns of the loops listed last: searched along with each
    // neighbourhood, as loops of one family share their far part.
    let mut recent: std::collections::VecDeque<Vec<usize>> = Default::default();
    let mut covered = vec![false; columns.len()];
    let mut keys: BTreeSet<Vec<(usize, bool)>> = BTreeSet::new();
    let mut next = 0;
    loop {
        // Targets with a loop read off the structure (see `direct_loop`) or
        // found in their neighbourhood (see `local`) are taken on their own,
        // in order; the others go to the LP workers.
        let mut batch = Vec::with_capacity(LOOP_WORKERS);
        let mut direct = None;
        while batch.len() < LOOP_WORKERS {
            let Some(&target) = order.get(next) else {
                break;
            };
            if is_covered(&merged[target], &covered) {
                next += 1;
                continue;
            }
            if let Some(found) = direct_loop(merged, &partners, target) {
                if batch.is_empty() {
                    next += 1;
                    result.direct_loops += 1;
                    direct = Some(found);
                }
                break;
            }
            if local_record.worth_trying() {
                if !local_found.contains_key(&target) {
                    // The neighbourhood searches of the next uncovered targets,
                    // side by side: each answer depends on its target only, so
                    // the list does not depend on the machine (answers for
                    // targets covered meanwhile are dropped unused).
                    let window: Vec<usize> = order[next..]
                        .iter()
                        .copied()
                        .filter(|&t| {
                            !is_covered(&merged[t], &covered)
                                && !local_found.contains_key(&t)
                                && direct_loop(merged, &partners, t).is_none()
                        })
                        .take(LOCAL_WINDOW)
                        .collect();
                    let shared: BTreeSet<usize> = recent.iter().flatten().copied().collect();
                    let shared: Vec<usize> = shared.into_iter().collect();
                    let answers = window
                        .par_iter()
                        .map(|&t| local::local_loop(metabolite_count, merged, &near, t, &shared))
                        .collect::<Result<Vec<_>, LpError>>()?;
                    local_found.extend(window.into_iter().zip(answers));
                }
                if let Some(found) = local_found.get(&target).cloned().flatten() {
                    if batch.is_empty() {
                        next += 1;
                        local_record.note(true);
                        result.local_loops += 1;
                        direct = Some(found);
                    }
                    break;
                }
                local_record.note(false);
            }
            next += 1;
            batch.push(target);
        }
        if batch.is_empty() && direct.is_none() {
            break;
        }
        if limit.is_some_and(|l| result.loops.len() >= l) {
            result.truncated = true;
            break;
        }
        let outcomes: Vec<Result<TargetOutcome, LpError>> = if let Some(found) = direct {
            vec![Ok((Some(found), 0))]
        } else {
            std::thread::scope(|scope| {
                let handles: Vec<_> = batch
                    .iter()
                    .zip(sessions.iter_mut())
                    .map(|(&target, session)| {
                        let part = parts[target];
                        let parts = &parts;
                        scope.spawn(move || {
                            let (values, solves) = loop_through(session, part)?;
                            let lambdas = values.map(|values| {
                                parts
                                    .iter()
                                    .enumerate()
                                    .map(|(j, p)| (j, p.value(&values)))
                                    .filter(|(_, lambda)| *lambda != 0.0)
                                    .collect()
                            });
                            Ok((lambdas, solves))
                        })
                    })
                    .collect();
                handles
                    .into_iter()
                    .map(|h| h.join().expect("loop worker panicked"))
                    .collect()
            })
        };
        for outcome in outcomes {
            let (found, solves) = outcome?;
            result.lp_solves += solves;
            let Some(lambdas) = found else {
                continue;
            };
            if limit.is_some_and(|l| result.loops.len() >= l) {
                result.truncated = true;
                break;
            }
            let support: Vec<usize> = lambdas.iter().map(|&(j, _)| j).collect();
            let mut flux: Vec<(usize, f64)> = lambdas
                .iter()
                .flat_map(|&(j, lambda)| {
                    merged[j].members.iter().map(move |&(r, f)| (r, f * lambda))
                })
                .filter(|(_, v)| *v != 0.0)
                .collect();
            flux.sort_by_key(|(r, _)| *r);
            let Some(cycle) = describe_loop(columns, capable, allowed, names, &flux) else {
                continue;
            };
            let cycle = if cycle.verified {
                cycle
            } else {
                match repair_loop(columns, capable, allowed, names, &flux) {
                    Some(repaired) => {
                        result.exact_repairs += 1;
                        repaired
                    }
                    None => {
                        result.dropped.push(format!(
                            "an LP answer through {} was not a steady state (relative residual {:.3e}) and no exact loop lies on its support; not listed",
                            cycle.members.first().map_or("?", |m| m.reaction.as_str()),
                            cycle.residual
                        ));
                        continue;
                    }
                }
            };
            for m in &cycle.members {
                covered[m.index] = true;
            }
            let key: Vec<(usize, bool)> = cycle
                .members
                .iter()
                .map(|m| (m.index, m.coefficient > 0.0))
                .collect();
            let reversed: Vec<(usize, bool)> = key.iter().map(|&(r, s)| (r, !s)).collect();
            if keys.contains(&key) || keys.contains(&reversed) {
                continue;
            }
            keys.insert(key);
            if recent.len() == RECENT_LOOPS {
                recent.pop_front();
            }
            recent.push_back(support);
            let mut cycle = cycle;
            cycle.id = super::ids::member_set_id(
                "loop",
                cycle.members.iter().map(|m| m.reaction.as_str()),
            );
            result.loops.push(cycle);
        }
    }
    let mut ids: Vec<String> = result.loops.iter().map(|l| l.id.clone()).collect();
    super::ids::disambiguate(&mut ids);
    for (cycle, id) in result.loops.iter_mut().zip(ids) {
        cycle.id = id;
    }
    result.uncovered = members.into_iter().filter(|&r| !covered[r]).collect();
    Ok(result)
}

/// Number of loop workers (threads with their own LP session). Fixed, not
/// taken from the machine, so the loop list is the same everywhere.
const LOOP_WORKERS: usize = 2;

/// Merged fluxes (column, λ) of a loop (none when the target has no loop)
/// and LP solves.
type TargetOutcome = (Option<Vec<(usize, f64)>>, usize);

/// Targets whose neighbourhood searches run side by side at a time.
const LOCAL_WINDOW: usize = 32;

/// Loops listed last whose columns join every neighbourhood search.
const RECENT_LOOPS: usize = 8;

/// Every reaction of merged column `column` is in a listed loop already.
fn is_covered(column: &Merged, covered: &[bool]) -> bool {
    column.members.iter().all(|(r, _)| covered[*r])
}

/// Groups of merged columns with proportional stoichiometry: per column, the
/// other columns c·S_j of its group with their factor c (in column order).
fn proportional_partners(merged: &[Merged]) -> Vec<Vec<(usize, f64)>> {
    let mut groups: BTreeMap<Vec<(usize, i64)>, Vec<usize>> = BTreeMap::new();
    for (j, column) in merged.iter().enumerate() {
        let Some(&(_, first)) = column.column.first() else {
            continue;
        };
        // Rounded shape as a grouping key only; factors are checked below,
        // and a pair the rounding splits merely goes to the LP.
        let key = column
            .column
            .iter()
            .map(|&(m, c)| (m, (c / first * PROPORTIONAL_KEY_SCALE).round() as i64))
            .collect();
        groups.entry(key).or_default().push(j);
    }
    let mut partners = vec![Vec::new(); merged.len()];
    for group in groups.values().filter(|g| g.len() > 1) {
        for &j in group {
            for &k in group {
                if k == j {
                    continue;
                }
                let a = &merged[j].column;
                let b = &merged[k].column;
                let factor = b[0].1 / a[0].1;
                let proportional = a.iter().zip(b).all(|(&(_, x), &(_, y))| {
                    (y - factor * x).abs() <= PROPORTIONAL_MATCH * y.abs().max(x.abs())
                });
                if proportional {
                    partners[j].push((k, factor));
                }
            }
        }
    }
    partners
}

/// A loop through merged column `target` read off the structure, no LP
/// needed: a column that balances by itself (a chain that closed on itself
/// during compression), or two columns S_k = c·S_j, which balance as
/// λ_j = s, λ_k = −s/c when both signs are allowed. Both are elementary
/// (one or two columns, rank one less); signs are tried +1 first, partners
/// in column order, as in the LP path.
fn direct_loop(
    merged: &[Merged],
    partners: &[Vec<(usize, f64)>],
    target: usize,
) -> Option<Vec<(usize, f64)>> {
    let allowed = merged[target].allowed;
    for sign in [1.0, -1.0] {
        if !allowed.allows(sign) {
            continue;
        }
        if merged[target].column.is_empty() {
            return Some(vec![(target, sign)]);
        }
        for &(k, factor) in &partners[target] {
            let lambda = -sign / factor;
            if merged[k].allowed.allows(lambda) {
                let mut pair = vec![(target, sign), (k, lambda)];
                pair.sort_by_key(|(j, _)| *j);
                return Some(pair);
            }
        }
    }
    None
}

/// LP variables of a merged flux: its forward and backward parts.
#[derive(Debug, Clone, Copy)]
struct FluxParts {
    forward: Option<Var>,
    backward: Option<Var>,
}

impl FluxParts {
    fn value(&self, values: &[f64]) -> f64 {
        self.forward.map_or(0.0, |p| values[p.0]) - self.backward.map_or(0.0, |n| values[n.0])
    }
}

/// One target: the L1-minimal loop with the merged flux at +1 (forward part
/// fixed at 1, backward part at 0), or else at −1. Returns the LP values
/// (or none: no loop either way) and the number of LP solves.
fn loop_through(
    session: &mut LpSession,
    part: FluxParts,
) -> Result<(Option<Vec<f64>>, usize), LpError> {
    let mut solves = 0;
    for (on, off) in [(part.forward, part.backward), (part.backward, part.forward)] {
        let Some(on) = on else { continue };
        if let Some(off) = off {
            // Zero flux stays feasible: no state copy needed.
            session.fix_feasible(off, 0.0)?;
            solves += 1;
        }
        // The part exists only in a direction the target can loop in
        // (`capable`), so the fix is feasible: no state copy to return to.
        // Should the solver still find it infeasible, the session is rebuilt
        // and the other direction tried, as before.
        let attempt = session.fix_feasible(on, 1.0).map(|s| s.values.clone());
        session.release(on)?;
        solves += 2;
        if let Some(off) = off {
            session.release(off)?;
            solves += 1;
        }
        match attempt {
            Ok(values) => return Ok((Some(values), solves)),
            Err(LpError::Infeasible) => continue,
            Err(other) => return Err(other),
        }
    }
    Ok((None, solves))
}

/// Turns an LP flux into a normalised, checked loop.
fn describe_loop(
    columns: &[Vec<(usize, f64)>],
    capable: &[Directions],
    allowed: &[Directions],
    names: &Names<'_>,
    flux: &[(usize, f64)],
) -> Option<ElementaryLoop> {
    let largest = flux.iter().map(|(_, v)| v.abs()).fold(0.0, f64::max);
    if largest == 0.0 {
        return None;
    }
    let support: Vec<(usize, f64)> = flux
        .iter()
        .copied()
        .filter(|(_, v)| v.abs() >= FLUX_NONZERO * largest)
        .collect();
    let smallest = support
        .iter()
        .map(|(_, v)| v.abs())
        .fold(f64::INFINITY, f64::min);
    let scaled: Vec<f64> = support.iter().map(|(_, v)| v / smallest).collect();
    let (coefficients, integer_coefficients) = snap_to_integers(&scaled);
    let members: Vec<LoopMember> = support
        .iter()
        .zip(&coefficients)
        .map(|(&(r, _), &coefficient)| LoopMember {
            reaction: names.reactions[r].clone(),
            index: r,
            coefficient,
        })
        .collect();

    let mut balance: std::collections::BTreeMap<usize, (f64, f64)> = Default::default();
    for m in &members {
        for &(metabolite, c) in &columns[m.index] {
            let entry = balance.entry(metabolite).or_insert((0.0, 0.0));
            entry.0 += c * m.coefficient;
            entry.1 = entry.1.max((c * m.coefficient).abs());
        }
    }
    let residual = balance
        .values()
        .map(|(sum, scale)| if *scale > 0.0 { sum.abs() / scale } else { 0.0 })
        .fold(0.0, f64::max);
    let signs_allowed = members
        .iter()
        .all(|m| allowed[m.index].allows(m.coefficient));
    let support_columns: Vec<Vec<(usize, f64)>> =
        members.iter().map(|m| columns[m.index].clone()).collect();
    let elementary = Elimination::new(names.metabolites.len(), &support_columns).nullity() == 1;
    let reversible = members
        .iter()
        .all(|m| capable[m.index].allows(-m.coefficient));
    Some(ElementaryLoop {
        id: String::new(),
        metabolites: balance
            .keys()
            .map(|&m| names.metabolites[m].clone())
            .collect(),
        members,
        integer_coefficients,
        reversible,
        residual,
        verified: residual <= LOOP_RESIDUAL && signs_allowed,
        elementary,
    })
}

/// A loop whose floating-point LP answer fails verification, recomputed
/// exactly (see `exact`): on the LP's support (large entries), else on every
/// entry the LP made nonzero, the unique null-space vector, oriented like the
/// LP answer. Accepted only when every sign is allowed and the float check
/// then passes; `None` when neither support carries an exact loop.
fn repair_loop(
    columns: &[Vec<(usize, f64)>],
    capable: &[Directions],
    allowed: &[Directions],
    names: &Names<'_>,
    flux: &[(usize, f64)],
) -> Option<ElementaryLoop> {
    let largest = flux.iter().map(|(_, v)| v.abs()).fold(0.0, f64::max);
    let large: Vec<(usize, f64)> = flux
        .iter()
        .copied()
        .filter(|(_, v)| v.abs() >= FLUX_NONZERO * largest)
        .collect();
    let nonzero: Vec<(usize, f64)> = flux.iter().copied().filter(|(_, v)| *v != 0.0).collect();
    for support in [large, nonzero] {
        let support_columns: Vec<Vec<(usize, f64)>> =
            support.iter().map(|&(r, _)| columns[r].clone()).collect();
        let Some(vector) = exact::unique_null_vector(&support_columns) else {
            continue;
        };
        let Some(values) = vector
            .iter()
            .map(exact::to_f64)
            .collect::<Option<Vec<f64>>>()
        else {
            continue;
        };
        // Orientation: the one agreeing with the LP on more of the flux.
        let agreement: f64 = support
            .iter()
            .zip(&values)
            .map(|(&(_, lp), &x)| (lp * x).signum() * lp.abs())
            .sum();
        let sign = if agreement < 0.0 { -1.0 } else { 1.0 };
        let exact_flux: Vec<(usize, f64)> = support
            .iter()
            .zip(&values)
            .filter(|(_, &x)| x != 0.0)
            .map(|(&(r, _), &x)| (r, sign * x))
            .collect();
        if let Some(cycle) = describe_loop(columns, capable, allowed, names, &exact_flux) {
            if cycle.verified && cycle.elementary {
                return Some(cycle);
            }
        }
    }
    None
}

/// Scales coefficients (smallest |c| = 1 already) by the smallest multiplier
/// that makes all of them integers within tolerance.
fn snap_to_integers(scaled: &[f64]) -> (Vec<f64>, bool) {
    for multiplier in 1..=INTEGER_MULTIPLIER_MAX {
        let m = f64::from(multiplier);
        let close = scaled.iter().all(|c| {
            let x = c * m;
            (x - x.round()).abs() <= INTEGER_SNAP * x.abs().max(1.0)
        });
        if close {
            return (scaled.iter().map(|c| (c * m).round()).collect(), true);
        }
    }
    (scaled.to_vec(), false)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn column(entries: &[(usize, f64)], allowed: Directions) -> Merged {
        Merged {
            column: entries.to_vec(),
            members: Vec::new(),
            allowed,
        }
    }

    // Steady-state balance by hand (common practice): A → B and
    // 2 B → 2 A balance as 1·(A → B) + ½·(2 B → 2 A); a second A → B
    // cannot close a loop with the first (both produce B).
    #[test]
    fn proportional_columns_give_two_reaction_loops() {
        let merged = vec![
            column(&[(0, -1.0), (1, 1.0)], Directions::FORWARD),
            column(&[(0, 2.0), (1, -2.0)], Directions::FORWARD),
            column(&[(0, -1.0), (1, 1.0)], Directions::FORWARD),
            column(&[], Directions::BACKWARD),
        ];
        let partners = proportional_partners(&merged);
        assert_eq!(partners[0], vec![(1, -2.0), (2, 1.0)]);
        assert_eq!(
            direct_loop(&merged, &partners, 0),
            Some(vec![(0, 1.0), (1, 0.5)])
        );
        assert_eq!(
            direct_loop(&merged, &partners, 2),
            Some(vec![(1, 0.5), (2, 1.0)])
        );
        // A column that balances by itself is a loop alone, in its direction.
        assert_eq!(direct_loop(&merged, &partners, 3), Some(vec![(3, -1.0)]));
        let alone = vec![merged[0].clone(), merged[2].clone()];
        assert_eq!(direct_loop(&alone, &proportional_partners(&alone), 0), None);
    }

    // A nearly degenerate answer of the kind the simplex gave on iLB1027_lipid
    // (BiGG): three mitochondrial antiporters, oaa/akg, akg/mal and mal/oaa,
    // that cancel exactly as 1·OAA/AKG − 1·AKG/MAL − 1·MAL/OAA (balance by
    // hand), at huge and slightly wrong multiples, plus two steps A → B → C
    // that close no loop at all. The float answer fails verification; its
    // exact repair is the three-antiporter loop; flux on the open chain alone
    // has no loop to repair.
    #[test]
    fn poor_lp_answer_is_repaired_to_the_exact_loop_on_its_support() {
        // oaa_c 0, oaa_m 1, akg_c 2, akg_m 3, mal_c 4, mal_m 5, A 6, B 7, C 8.
        let columns = vec![
            vec![(0, -1.0), (1, 1.0), (2, 1.0), (3, -1.0)],
            vec![(2, 1.0), (3, -1.0), (4, -1.0), (5, 1.0)],
            vec![(0, -1.0), (1, 1.0), (4, 1.0), (5, -1.0)],
            vec![(6, -1.0), (7, 1.0)],
            vec![(7, -1.0), (8, 1.0)],
        ];
        let reactions: Vec<String> = ["OAAAKG", "AKGMAL", "MALOAA", "AB", "BC"]
            .iter()
            .map(|s| s.to_string())
            .collect();
        let metabolites: Vec<String> = (0..9).map(|m| format!("m{m}")).collect();
        let names = Names {
            reactions: &reactions,
            metabolites: &metabolites,
        };
        let both = vec![Directions::BOTH; 5];
        let poor = vec![
            (0, 583_680.970_600_193_7),
            (1, -583_680.971_997_571),
            (2, -583_680.979_440_731_1),
            (3, 1.0),
            (4, 1.097_681_714_557_022_6),
        ];
        let float = describe_loop(&columns, &both, &both, &names, &poor).unwrap();
        assert!(!float.verified, "residual {}", float.residual);
        let repaired = repair_loop(&columns, &both, &both, &names, &poor).unwrap();
        let members: Vec<(&str, f64)> = repaired
            .members
            .iter()
            .map(|m| (m.reaction.as_str(), m.coefficient))
            .collect();
        assert_eq!(
            members,
            vec![("OAAAKG", 1.0), ("AKGMAL", -1.0), ("MALOAA", -1.0)]
        );
        assert!(repaired.verified && repaired.elementary && repaired.residual == 0.0);
        // Orientation follows the LP answer: the same flux reversed.
        let reversed: Vec<(usize, f64)> = poor.iter().map(|&(r, v)| (r, -v)).collect();
        let back = repair_loop(&columns, &both, &both, &names, &reversed).unwrap();
        assert_eq!(back.members[0].coefficient, -1.0);
        // A direction the bounds forbid is not repaired into a loop.
        let mut one_way = both.clone();
        one_way[1] = Directions::FORWARD;
        assert!(repair_loop(&columns, &both, &one_way, &names, &poor).is_none());
        // The open chain alone is no loop, exactly or otherwise.
        assert!(repair_loop(&columns, &both, &both, &names, &[(3, 1.0), (4, 1.1)]).is_none());
    }

    // Arithmetic (common practice): 1, 1.5, 0.5·… → smallest multiplier 2.
    #[test]
    fn snaps_ratios_to_small_integers() {
        assert_eq!(
            snap_to_integers(&[1.0, 1.5, -2.0]),
            (vec![2.0, 3.0, -4.0], true)
        );
        assert_eq!(snap_to_integers(&[1.0, 1.0 + 1e-9]), (vec![1.0, 1.0], true));
        let (c, integer) = snap_to_integers(&[1.0, std::f64::consts::PI]);
        assert!(!integer);
        assert_eq!(c[1], std::f64::consts::PI);
    }
}
