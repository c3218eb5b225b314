//! Energy-generating cycles (Fritzemeier et al., PLoS Comput. Biol. 13
//! (2017) e1005494): in the closed network, add one dissipation reaction of
//! a currency (e.g. ATP + H2O → ADP + Pi + H+) and ask whether it can carry
//! positive flux. If it can, internal reactions regenerate the currency from
//! nothing.
//!
//! All dissipation reactions are first added together and the exact
//! loop-capable analysis run once: a dissipation blocked with all of them
//! present is blocked alone too (fewer reactions, fewer fluxes). For each
//! one that can run, the L1-minimal flux with it fixed at 1 and the other
//! dissipations shut, over the reactions capable in the joint network
//! (every flux of the single-dissipation network lies there), both decides
//! it exactly and gives an example with few reactions.

use super::capable::capable_directions;
use super::currency::{dissipation_tests, CurrencyOptions, DissipationTest};
use super::elementary::LoopMember;
use super::network::{ClosedNetwork, Directions};
use super::prune::prune;
use super::tolerance::FLUX_NONZERO;
use super::LoopError;
use crate::lp::{LinearProgram, LpError, Relation, Sense, Var};
use crate::model::Model;
use rayon::prelude::*;
use serde::Serialize;

/// Outcome of one dissipation test.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EnergyCycleResult {
    pub test: DissipationTest,
    /// The dissipation reaction can carry flux in the closed network.
    pub cycle_exists: bool,
    /// Model reactions of an example flux with the dissipation at 1
    /// (empty when no cycle exists).
    pub example: Vec<LoopMember>,
    /// The example is one reaction: S·v = 0 with the dissipation at 1 makes
    /// its column, times its flux, the dissipation's column negated, so that
    /// reaction run the example's way is exactly the reverse of the
    /// dissipation (it makes the currency with nothing else involved).
    pub trivial: bool,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct EnergyCycleAnalysis {
    pub results: Vec<EnergyCycleResult>,
    /// Currencies the model has no complete dissipation reaction for.
    pub not_testable: Vec<String>,
    /// Dissipations left out because no reaction makes or consumes the
    /// currency in that compartment ("atp in e").
    pub not_used: Vec<String>,
}

/// Runs every dissipation test the model allows.
pub fn energy_generating_cycles(
    model: &Model,
    options: &CurrencyOptions,
) -> Result<EnergyCycleAnalysis, LoopError> {
    let error = |source| LoopError {
        model: model.id.clone(),
        stage: "energy-generating cycles",
        source,
    };
    let plan = dissipation_tests(model, options);
    let tests = plan.tests;
    let (mut network, _) = ClosedNetwork::close(model);
    let dissipations: Vec<usize> = tests
        .iter()
        .map(|test| network.add_reaction(test.column.clone(), Directions::FORWARD))
        .collect();
    prune(
        network.metabolite_count,
        &network.columns,
        &mut network.allowed,
    );
    let joint = capable_directions(&network.columns, &network.allowed).map_err(error)?;
    // Each test is its own LP from scratch: they run on every core, and
    // results are collected in test order.
    let results = tests
        .into_par_iter()
        .zip(dissipations.par_iter())
        .map(|(test, &d)| {
            let mut allowed = joint.capable.clone();
            for &other in &dissipations {
                if other != d {
                    allowed[other] = Directions::NONE;
                }
            }
            let example = if allowed[d].forward {
                minimal_flux_through(&network.columns, &allowed, network.metabolite_count, d)
                    .map_err(error)?
            } else {
                None
            };
            let example: Vec<LoopMember> = example
                .unwrap_or_default()
                .into_iter()
                .filter(|&(r, _)| r != d)
                .map(|(r, coefficient)| LoopMember {
                    reaction: model.reactions[r].id.clone(),
                    index: r,
                    coefficient,
                })
                .collect();
            Ok(EnergyCycleResult {
                cycle_exists: !example.is_empty(),
                trivial: example.len() == 1,
                test,
                example,
            })
        })
        .collect::<Result<Vec<_>, LoopError>>()?;
    Ok(EnergyCycleAnalysis {
        results,
        not_testable: plan.not_testable,
        not_used: plan.not_used,
    })
}

/// min Σ|v| with S·v = 0, v_target = 1, signs as allowed; `None` when
/// infeasible. Returns (reaction, flux) of the support.
fn minimal_flux_through(
    columns: &[Vec<(usize, f64)>],
    allowed: &[Directions],
    metabolite_count: usize,
    target: usize,
) -> Result<Option<Vec<(usize, f64)>>, LpError> {
    let mut lp = LinearProgram::new(Sense::Minimise);
    let mut vars: Vec<Option<Var>> = vec![None; columns.len()];
    for (r, d) in allowed.iter().enumerate() {
        if !d.any() {
            continue;
        }
        let var = if r == target {
            lp.add_variable(1.0, 1.0, 1.0)
        } else {
            match (d.forward, d.backward) {
                (true, true) => {
                    let u = lp.add_variable(0.0, f64::NEG_INFINITY, f64::INFINITY);
                    let a = lp.add_variable(1.0, 0.0, f64::INFINITY);
                    lp.add_row(&[(a, 1.0), (u, -1.0)], Relation::GreaterOrEqual, 0.0);
                    lp.add_row(&[(a, 1.0), (u, 1.0)], Relation::GreaterOrEqual, 0.0);
                    u
                }
                (true, false) => lp.add_variable(1.0, 0.0, f64::INFINITY),
                _ => lp.add_variable(-1.0, f64::NEG_INFINITY, 0.0),
            }
        };
        vars[r] = Some(var);
    }
    let mut rows: Vec<Vec<(Var, f64)>> = vec![Vec::new(); metabolite_count];
    for (r, column) in columns.iter().enumerate() {
        if let Some(var) = vars[r] {
            for &(m, c) in column {
                rows[m].push((var, c));
            }
        }
    }
    for row in rows.iter().filter(|row| !row.is_empty()) {
        lp.add_row(row, Relation::Equal, 0.0);
    }
    match lp.solve() {
        Ok(solution) => Ok(Some(
            vars.iter()
                .enumerate()
                .filter_map(|(r, v)| v.map(|v| (r, solution.value(v))))
                .filter(|(_, x)| x.abs() >= FLUX_NONZERO)
                .collect(),
        )),
        Err(LpError::Infeasible) => Ok(None),
        Err(other) => Err(other),
    }
}
