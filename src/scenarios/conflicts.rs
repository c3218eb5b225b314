//! Minimal conflicting sets of an infeasible scenario and their smallest
//! repairs.
//!
//! A deletion filter (Chinneck & Dravnieks, ORSA J. Comput. 3 (1991) 157)
//! seeded from the support of the Farkas certificate: drop each member in
//! turn and keep it dropped when the rest stays infeasible; what remains is
//! irreducible (drop any one and the rest can run). Further independent sets:
//! one member of every set found so far (the one with the largest certificate
//! weight) is blocked and the whole scenario searched again.

use super::feasibility::{Binding, DualPoint, JointProblem, JointVarKind, Undecided};
use super::tolerance::{DECIDE_KJ, SUBSTITUTION_KJ};
use crate::lp::{LinearProgram, Relation, Sense, Var};
use std::collections::{BTreeMap, BTreeSet};

/// An irreducible set of steps that cannot all run at once.
#[derive(Debug, Clone, PartialEq)]
pub struct ConflictSet {
    /// Step indices in pathway order.
    pub steps: Vec<usize>,
    /// Certificate weight per step (same order), smallest = 1: the set adds
    /// up to Σ wⱼ·(reaction j in its flux direction).
    pub weights: Vec<f64>,
    /// Smallest achievable Σ wⱼ·ΔG'ⱼ (flux directions) over the allowed
    /// concentrations and ±k·σ, kJ/mol.
    pub overall_kj: f64,
    /// What the set would need: Σ wⱼ·ΔG'ⱼ ≤ −Σ wⱼ·min_driving_force.
    pub required_kj: f64,
    /// Bounds that limit the overall ΔG'.
    pub binding: Vec<Binding>,
    pub repairs: Vec<Repair>,
}

/// A smallest single change that makes a conflicting set feasible
/// (a suggestion; never applied).
#[derive(Debug, Clone, PartialEq)]
pub enum Repair {
    /// Widen metabolite's range by `decades` on one side: the new bound.
    WidenRange {
        metabolite: usize,
        decades: f64,
        upper: bool,
        new_bound_m: f64,
    },
    /// Lower step's ΔG'° in its flux direction by `shift_kj` beyond the
    /// k·σ allowance (`sigmas` = shift / σ, when σ > 0).
    ShiftEnergy {
        step: usize,
        shift_kj: f64,
        sigmas: Option<f64>,
    },
}

/// The first conflicting set (from the certificate `first`) and up to
/// `extra` further independent ones. The flag says the search stopped at
/// its limit while the scenario was still infeasible.
pub fn find(
    problem: &JointProblem,
    all: &[usize],
    first: &DualPoint,
    extra: usize,
) -> Result<(Vec<ConflictSet>, bool), Undecided> {
    let mut sets = Vec::new();
    let mut blocked: BTreeSet<usize> = BTreeSet::new();
    let mut seed: Vec<usize> = first.weights.iter().map(|&(s, _)| s).collect();
    loop {
        // A solver failure while looking for a further set ends the search
        // (saying more sets may exist) instead of losing the sets found.
        let found = deletion_filter(problem, &seed, all).and_then(|m| describe(problem, &m));
        let set = match found {
            Ok(set) => set,
            Err(e) if sets.is_empty() => return Err(e),
            Err(_) => return Ok((sets, true)),
        };
        // Block the member carrying the largest weight.
        let heaviest = set
            .steps
            .iter()
            .zip(&set.weights)
            .max_by(|a, b| a.1.total_cmp(b.1).then(b.0.cmp(a.0)))
            .map(|(&s, _)| s);
        sets.push(set);
        let Some(h) = heaviest else { break };
        blocked.insert(h);
        let rest: Vec<usize> = all
            .iter()
            .copied()
            .filter(|s| !blocked.contains(s))
            .collect();
        if rest.is_empty() {
            break;
        }
        // Only the dual is needed here: a certificate that holds when
        // evaluated proves the rest infeasible on its own (Farkas), and the
        // deletion filter re-checks every subset with both LPs.
        match problem.solve_dual(&rest) {
            Err(_) => return Ok((sets, true)),
            Ok(dual) if problem.certificate_margin(&dual) > DECIDE_KJ => {
                if sets.len() > extra {
                    return Ok((sets, true));
                }
                seed = dual.weights.iter().map(|&(s, _)| s).collect();
            }
            Ok(_) => break,
        }
    }
    Ok((sets, false))
}

fn infeasible(problem: &JointProblem, subset: &[usize]) -> Result<bool, Undecided> {
    Ok(problem
        .decide(subset)?
        .is_some_and(|decision| !decision.is_feasible()))
}

/// Irreducible infeasible subset of `seed` (falls back to `all` if the
/// seed is, against the certificate, not infeasible on its own).
fn deletion_filter(
    problem: &JointProblem,
    seed: &[usize],
    all: &[usize],
) -> Result<Vec<usize>, Undecided> {
    let mut kept: Vec<usize> = seed.to_vec();
    kept.sort_unstable();
    if !infeasible(problem, &kept)? {
        kept = all.to_vec();
    }
    for s in kept.clone() {
        let trial: Vec<usize> = kept.iter().copied().filter(|&t| t != s).collect();
        if infeasible(problem, &trial)? {
            kept = trial;
        }
    }
    Ok(kept)
}

/// Weights, overall ΔG', binding bounds, pathway order and repairs of an
/// irreducible set.
fn describe(problem: &JointProblem, members: &[usize]) -> Result<ConflictSet, Undecided> {
    let dual = problem.solve_dual(members)?;
    let smallest = dual
        .weights
        .iter()
        .map(|&(_, y)| y)
        .fold(f64::INFINITY, f64::min);
    let scale = if smallest.is_finite() && smallest > 0.0 {
        1.0 / smallest
    } else {
        1.0
    };
    let weight_of: BTreeMap<usize, f64> =
        dual.weights.iter().map(|&(s, y)| (s, y * scale)).collect();
    let weighted: Vec<(usize, f64)> = weight_of.iter().map(|(&s, &w)| (s, w)).collect();
    let (overall_kj, binding) = problem.best_overall(&weighted)?;
    let total: f64 = weighted.iter().map(|(_, w)| w).sum();
    let steps = pathway_order(problem, members);
    let weights = steps
        .iter()
        .map(|s| weight_of.get(s).copied().unwrap_or(0.0))
        .collect();
    let repairs = repairs(problem, members)?;
    Ok(ConflictSet {
        steps,
        weights,
        overall_kj,
        required_kj: -total * problem.min_driving_force_kj,
        binding,
        repairs,
    })
}

/// Steps ordered so that each consumes what an earlier one produces where
/// possible: start with a step fed by no other member, follow products.
pub fn pathway_order(problem: &JointProblem, members: &[usize]) -> Vec<usize> {
    // In the flux direction a positive concentration coefficient is a product.
    let made = |s: usize| -> BTreeSet<usize> {
        problem.steps[s]
            .terms
            .iter()
            .filter(|&&(k, a)| a > 0.0 && is_concentration(problem, k))
            .map(|&(k, _)| k)
            .collect()
    };
    let used = |s: usize| -> BTreeSet<usize> {
        problem.steps[s]
            .terms
            .iter()
            .filter(|&&(k, a)| a < 0.0 && is_concentration(problem, k))
            .map(|&(k, _)| k)
            .collect()
    };
    let mut left: Vec<usize> = members.to_vec();
    left.sort_by_key(|&s| problem.steps[s].reaction);
    let mut order = Vec::with_capacity(left.len());
    while !left.is_empty() {
        let next = match order.last() {
            Some(&last) => {
                let products = made(last);
                left.iter()
                    .position(|&s| !used(s).is_disjoint(&products))
                    .unwrap_or_else(|| start(&left, &made, &used))
            }
            None => start(&left, &made, &used),
        };
        order.push(left.remove(next));
    }
    order
}

fn start(
    left: &[usize],
    made: &dyn Fn(usize) -> BTreeSet<usize>,
    used: &dyn Fn(usize) -> BTreeSet<usize>,
) -> usize {
    left.iter()
        .position(|&s| {
            let needs = used(s);
            left.iter().all(|&o| o == s || made(o).is_disjoint(&needs))
        })
        .unwrap_or(0)
}

fn is_concentration(problem: &JointProblem, k: usize) -> bool {
    matches!(problem.vars[k].kind, JointVarKind::LnConcentration { .. })
}

/// The smallest single widening or ΔG'° shift that lets `members` run.
fn repairs(problem: &JointProblem, members: &[usize]) -> Result<Vec<Repair>, Undecided> {
    let mut out = Vec::new();
    let mut vars: Vec<usize> = members
        .iter()
        .flat_map(|&s| problem.steps[s].terms.iter().map(|&(k, _)| k))
        .filter(|&k| is_concentration(problem, k))
        .collect();
    vars.sort_unstable();
    vars.dedup();
    for k in vars {
        if let Some(r) = widen(problem, members, k)? {
            out.push(r);
        }
    }
    for &s in members {
        if let Some(r) = shift(problem, members, s)? {
            out.push(r);
        }
    }
    out.sort_by(|a, b| repair_key(a).total_cmp(&repair_key(b)));
    Ok(out)
}

fn repair_key(r: &Repair) -> f64 {
    match r {
        Repair::WidenRange { decades, .. } => *decades,
        Repair::ShiftEnergy {
            sigmas, shift_kj, ..
        } => sigmas.unwrap_or(*shift_kj + 1e6),
    }
}

/// LP rows of `members` with B fixed at the required driving force, over
/// local variables; `relax` may edit a variable's bounds and add terms.
struct RepairLp {
    lp: LinearProgram,
    var_of: BTreeMap<usize, Var>,
}

fn repair_lp(
    problem: &JointProblem,
    members: &[usize],
    free: Option<usize>,
    extra: Option<(usize, Var)>,
    lp: LinearProgram,
) -> RepairLp {
    let mut lp = lp;
    let mut var_of = BTreeMap::new();
    for &s in members {
        for &(k, _) in &problem.steps[s].terms {
            var_of.entry(k).or_insert_with(|| {
                let v = &problem.vars[k];
                if Some(k) == free {
                    lp.add_variable(0.0, f64::NEG_INFINITY, f64::INFINITY)
                } else {
                    lp.add_variable(0.0, v.lower, v.upper)
                }
            });
        }
    }
    for &s in members {
        let step = &problem.steps[s];
        let mut row: Vec<(Var, f64)> = step.terms.iter().map(|&(k, a)| (var_of[&k], a)).collect();
        if let Some((target, t)) = extra {
            if target == s {
                row.push((t, -1.0));
            }
        }
        lp.add_row(
            &row,
            Relation::LessOrEqual,
            step.rhs - problem.min_driving_force_kj,
        );
    }
    problem.add_allowance_rows(&mut lp, members, &|k| var_of[&k]);
    RepairLp { lp, var_of }
}

fn checked_solve(lp: &LinearProgram) -> Result<Option<Vec<f64>>, Undecided> {
    match lp.solve() {
        Ok(solution) => {
            let violation = lp.max_violation(&solution.values);
            if violation > SUBSTITUTION_KJ {
                return Err(Undecided(format!(
                    "a repair LP answer violates its constraints by {violation:.2e}"
                )));
            }
            Ok(Some(solution.values))
        }
        Err(crate::lp::LpError::Infeasible) => Ok(None),
        Err(e) => Err(e.into()),
    }
}

/// Smallest w ≥ 0 with xₖ ∈ [lower − w, upper + w] letting the set run.
fn widen(problem: &JointProblem, members: &[usize], k: usize) -> Result<Option<Repair>, Undecided> {
    let mut lp = LinearProgram::new(Sense::Minimise);
    let w = lp.add_variable(1.0, 0.0, f64::INFINITY);
    let RepairLp { mut lp, var_of } = repair_lp(problem, members, Some(k), None, lp);
    let x = var_of[&k];
    let var = &problem.vars[k];
    lp.add_row(&[(x, 1.0), (w, 1.0)], Relation::GreaterOrEqual, var.lower);
    lp.add_row(&[(x, 1.0), (w, -1.0)], Relation::LessOrEqual, var.upper);
    let Some(values) = checked_solve(&lp)? else {
        return Ok(None);
    };
    let JointVarKind::LnConcentration { metabolite } = var.kind else {
        return Ok(None);
    };
    let widening = values[w.0];
    let upper = values[x.0] > var.upper;
    Ok(Some(Repair::WidenRange {
        metabolite,
        decades: widening / std::f64::consts::LN_10,
        upper,
        new_bound_m: if upper {
            (var.upper + widening).exp()
        } else {
            (var.lower - widening).exp()
        },
    }))
}

/// Smallest t ≥ 0 lowering step `s`'s ΔG' (flux direction) that lets the
/// set run.
fn shift(problem: &JointProblem, members: &[usize], s: usize) -> Result<Option<Repair>, Undecided> {
    let mut lp = LinearProgram::new(Sense::Minimise);
    let t = lp.add_variable(1.0, 0.0, f64::INFINITY);
    let RepairLp { lp, .. } = repair_lp(problem, members, None, Some((s, t)), lp);
    let Some(values) = checked_solve(&lp)? else {
        return Ok(None);
    };
    let shift_kj = values[t.0];
    let sigma = problem.steps[s].sigma_kj;
    Ok(Some(Repair::ShiftEnergy {
        step: s,
        shift_kj,
        sigmas: (sigma > 0.0).then(|| shift_kj / sigma),
    }))
}
