//! The loop law on a given flux, and a loop-free flux beside it.
//!
//! A flux is loop-free iff potentials μ exist whose differences oppose every
//! active internal flux: dⱼ·Σᵢ νᵢⱼμᵢ < 0 for every internal j with flux of
//! sign dⱼ (Beard et al., Biophys. J. 83 (2002) 79–86; Schellenberger et al.,
//! BMC Bioinformatics 12 (2011) 142). By Gordan's alternative it fails
//! exactly when weights y ≥ 0, not all zero, exist with Σⱼ yⱼdⱼνᵢⱼ = 0 for
//! every metabolite: an internal cycle running with the flux. Both LPs are
//! solved and must disagree.
//!
//! CycleFreeFlux (Desouki et al., Bioinformatics 31 (2015) 2159–2165):
//! minimise Σ |vⱼ| over internal reactions with every boundary flux fixed at
//! its given value, S·v = S·v_given, and each internal vⱼ between 0 and its
//! given value (so no direction is added or reversed). The difference from
//! the given flux is a sum of internal cycles, listed as elementary cycles
//! (vertices of {y ≥ 0, Σ yⱼdⱼνᵢⱼ = 0, Σ y = 1}) with the flux each carries.

use super::feasibility::Undecided;
use super::tolerance::{FLUX_ZERO, SUBSTITUTION_KJ};
use crate::lp::{LinearProgram, LpError, Relation, Sense, Var};
use crate::model::Model;
use std::collections::BTreeMap;

/// An elementary internal cycle carried by the given flux.
#[derive(Debug, Clone, PartialEq)]
pub struct FluxCycle {
    /// (reaction, signed coefficient, smallest magnitude 1).
    pub members: Vec<(usize, f64)>,
    /// Flux the cycle carries (times each coefficient).
    pub flux: f64,
}

#[derive(Debug, Clone, PartialEq)]
pub struct LoopLawResult {
    pub loop_free: bool,
    pub cycles: Vec<FluxCycle>,
    /// Every reaction of the given flux with (given, loop-free) values.
    pub cycle_free: Vec<(usize, f64, f64)>,
}

/// Applies the loop law to `fluxes` (reaction, flux); `internal` says
/// which reactions are internal (boundary fluxes are never cycles).
pub fn analyse(
    model: &Model,
    fluxes: &[(usize, f64)],
    internal: impl Fn(usize) -> bool,
) -> Result<LoopLawResult, Undecided> {
    let scale = fluxes.iter().map(|(_, v)| v.abs()).fold(0.0, f64::max);
    let zero = FLUX_ZERO * scale.max(1.0);
    let active: Vec<(usize, f64)> = fluxes
        .iter()
        .copied()
        .filter(|&(j, v)| internal(j) && v.abs() > zero)
        .collect();
    let loop_free = obeys_loop_law(model, &active)?;
    if loop_free {
        return Ok(LoopLawResult {
            loop_free,
            cycles: Vec::new(),
            cycle_free: fluxes.iter().map(|&(j, v)| (j, v, v)).collect(),
        });
    }
    let corrected = cycle_free_flux(model, fluxes, &internal)?;
    let corrected_active: Vec<(usize, f64)> = corrected
        .iter()
        .copied()
        .filter(|&(j, v)| internal(j) && v.abs() > zero)
        .collect();
    if !obeys_loop_law(model, &corrected_active)? {
        return Err(Undecided(
            "the loop-free flux computed still breaks the loop law".into(),
        ));
    }
    // What was removed is a conformal sum of internal cycles.
    let mut residual: Vec<(usize, f64)> = fluxes
        .iter()
        .zip(&corrected)
        .map(|(&(j, v), &(_, w))| (j, v - w))
        .filter(|&(j, r)| internal(j) && r.abs() > zero)
        .collect();
    let mut cycles = Vec::new();
    while !residual.is_empty() && cycles.len() < fluxes.len() {
        let directed: Vec<(usize, f64)> = residual.iter().map(|&(j, r)| (j, r.signum())).collect();
        let Some(y) = elementary_cycle(model, &directed)? else {
            break;
        };
        // Largest amount that keeps the residual conformal.
        let amount = y
            .iter()
            .map(|&(k, w)| residual[k].1.abs() / w)
            .fold(f64::INFINITY, f64::min);
        let smallest = y.iter().map(|&(_, w)| w).fold(f64::INFINITY, f64::min);
        let mut members: Vec<(usize, f64)> = y
            .iter()
            .map(|&(k, w)| (residual[k].0, residual[k].1.signum() * w / smallest))
            .collect();
        members.sort_by_key(|m| m.0);
        for &(k, w) in &y {
            let r = &mut residual[k].1;
            *r -= r.signum() * amount * w;
        }
        residual.retain(|&(_, r)| r.abs() > zero);
        cycles.push(FluxCycle {
            members,
            flux: amount * smallest,
        });
    }
    Ok(LoopLawResult {
        loop_free,
        cycles,
        cycle_free: fluxes
            .iter()
            .zip(&corrected)
            .map(|(&(j, v), &(_, w))| (j, v, w))
            .collect(),
    })
}

/// Rows of metabolites touched by `reactions`: metabolite → [(k, ν)].
fn metabolite_rows(model: &Model, reactions: &[usize]) -> BTreeMap<usize, Vec<(usize, f64)>> {
    let mut rows: BTreeMap<usize, Vec<(usize, f64)>> = BTreeMap::new();
    for (k, &j) in reactions.iter().enumerate() {
        for &(i, nu) in &model.reactions[j].stoichiometry {
            rows.entry(i).or_default().push((k, nu));
        }
    }
    rows
}

/// Do potentials exist with dⱼ·Σ νᵢⱼμᵢ ≤ −1 for every active (j, flux)?
pub fn obeys_loop_law(model: &Model, active: &[(usize, f64)]) -> Result<bool, Undecided> {
    Ok(loop_law_potentials(model, active)?.is_some())
}

/// Potentials μ (metabolite → value) with dⱼ·Σ νᵢⱼμᵢ ≤ −1 for every active
/// (j, flux), checked by substitution; `None` when the flux carries a cycle
/// (then a cycle is found by the alternative LP, so the two agree).
pub fn loop_law_potentials(
    model: &Model,
    active: &[(usize, f64)],
) -> Result<Option<BTreeMap<usize, f64>>, Undecided> {
    if active.is_empty() {
        return Ok(Some(BTreeMap::new()));
    }
    let mut lp = LinearProgram::new(Sense::Minimise);
    let mut mu: BTreeMap<usize, Var> = BTreeMap::new();
    for &(j, _) in active {
        for &(i, _) in &model.reactions[j].stoichiometry {
            mu.entry(i)
                .or_insert_with(|| lp.add_variable(0.0, f64::NEG_INFINITY, f64::INFINITY));
        }
    }
    for &(j, v) in active {
        let d = v.signum();
        let row: Vec<(Var, f64)> = model.reactions[j]
            .stoichiometry
            .iter()
            .map(|&(i, nu)| (mu[&i], d * nu))
            .collect();
        lp.add_row(&row, Relation::LessOrEqual, -1.0);
    }
    let potentials = match lp.solve() {
        Ok(s) => Some(s),
        Err(LpError::Infeasible) => None,
        Err(e) => return Err(e.into()),
    };
    let directed: Vec<(usize, f64)> = active.iter().map(|&(j, v)| (j, v.signum())).collect();
    let cycle = elementary_cycle(model, &directed)?;
    match (potentials, cycle) {
        (Some(s), None) => {
            let violation = lp.max_violation(&s.values);
            if violation > SUBSTITUTION_KJ {
                return Err(Undecided(format!(
                    "loop-law potentials violate their constraints by {violation:.2e}"
                )));
            }
            Ok(Some(mu.iter().map(|(&i, &v)| (i, s.value(v))).collect()))
        }
        (None, Some(_)) => Ok(None),
        _ => Err(Undecided(
            "the loop-law LP and its alternative (a cycle) gave the same answer".into(),
        )),
    }
}

/// A vertex of {y ≥ 0, Σⱼ yⱼdⱼνᵢⱼ = 0 ∀i, Σ y = 1} over `directed`
/// (reaction, direction), as (position in `directed`, yₖ > 0); `None` when
/// no cycle runs in these directions.
pub fn elementary_cycle(
    model: &Model,
    directed: &[(usize, f64)],
) -> Result<Option<Vec<(usize, f64)>>, Undecided> {
    if directed.is_empty() {
        return Ok(None);
    }
    let reactions: Vec<usize> = directed.iter().map(|&(j, _)| j).collect();
    let mut lp = LinearProgram::new(Sense::Minimise);
    let y: Vec<Var> = directed
        .iter()
        .map(|_| lp.add_variable(1.0, 0.0, f64::INFINITY))
        .collect();
    for entries in metabolite_rows(model, &reactions).values() {
        let row: Vec<(Var, f64)> = entries
            .iter()
            .map(|&(k, nu)| (y[k], directed[k].1 * nu))
            .collect();
        lp.add_row(&row, Relation::Equal, 0.0);
    }
    let all: Vec<(Var, f64)> = y.iter().map(|&v| (v, 1.0)).collect();
    lp.add_row(&all, Relation::Equal, 1.0);
    let solution = match lp.solve() {
        Ok(s) => s,
        Err(LpError::Infeasible) => return Ok(None),
        Err(e) => return Err(e.into()),
    };
    let violation = lp.max_violation(&solution.values);
    if violation > 1e-7 {
        return Err(Undecided(format!(
            "a cycle found violates steady state by {violation:.2e}"
        )));
    }
    Ok(Some(
        y.iter()
            .enumerate()
            .map(|(k, &v)| (k, solution.value(v)))
            .filter(|&(_, w)| w > 1e-9)
            .collect(),
    ))
}

/// CycleFreeFlux: the given flux with its internal cycles removed.
pub fn cycle_free_flux(
    model: &Model,
    fluxes: &[(usize, f64)],
    internal: &impl Fn(usize) -> bool,
) -> Result<Vec<(usize, f64)>, Undecided> {
    let reactions: Vec<usize> = fluxes.iter().map(|&(j, _)| j).collect();
    let mut lp = LinearProgram::new(Sense::Minimise);
    let v: Vec<Var> = fluxes
        .iter()
        .map(|&(j, given)| {
            if internal(j) {
                lp.add_variable(given.signum(), given.min(0.0), given.max(0.0))
            } else {
                lp.add_variable(0.0, given, given)
            }
        })
        .collect();
    for entries in metabolite_rows(model, &reactions).values() {
        let row: Vec<(Var, f64)> = entries.iter().map(|&(k, nu)| (v[k], nu)).collect();
        let rhs: f64 = entries.iter().map(|&(k, nu)| nu * fluxes[k].1).sum();
        lp.add_row(&row, Relation::Equal, rhs);
    }
    let solution = lp.solve()?;
    let scale = fluxes.iter().map(|(_, x)| x.abs()).fold(1.0, f64::max);
    let violation = lp.max_violation(&solution.values);
    if violation > 1e-9 * scale {
        return Err(Undecided(format!(
            "the loop-free flux violates its constraints by {violation:.2e}"
        )));
    }
    Ok(fluxes
        .iter()
        .zip(&v)
        .map(|(&(j, _), &var)| (j, solution.value(var)))
        .collect())
}
