//! Internal loops in the closed network.
//!
//! [`analyse_loops`] closes the network (boundary reactions shut, forcing
//! bounds relaxed), prunes dead ends, finds the exact set of reactions that
//! can carry flux in it (the loop-capable set, with directions) and lists
//! elementary loops covering that set. [`assess_loop_energies`] confronts
//! the loops with ΔrG'° data; [`energy_generating_cycles`] tests currency
//! dissipation reactions (Fritzemeier et al. 2017).
//! All tolerances live in [`tolerance`].

mod capable;
mod compress;
mod currency;
mod egc;
mod elementary;
mod energy;
mod exact;
pub mod ids;
mod local;
mod network;
mod nullspace;
mod prune;
mod recheck;
pub mod tolerance;

pub use currency::{compound_key, CurrencyOptions, DissipationTest};
pub use egc::{energy_generating_cycles, EnergyCycleAnalysis, EnergyCycleResult};
pub use elementary::{ElementaryLoop, LoopMember};
pub use energy::{
    assess_loop_energies, assess_loop_energies_correlated, ConstraintSuggestion, DeltaGBasis,
    DeltaGRange, LoopEnergy, LoopEnergyOptions, Recheck, StandardDeltaG,
};
pub use network::{Closure, Directions, RelaxedBound};
pub use prune::PruningSummary;

use crate::lp::LpError;
use crate::model::Model;
use network::ClosedNetwork;
use serde::Serialize;

/// Settings of [`analyse_loops`].
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LoopOptions {
    /// Also list elementary loops (more LPs); otherwise only the loop-capable set.
    pub find_loops: bool,
    /// At most this many loops are listed; `None` = no limit.
    pub max_loops: Option<usize>,
}

impl Default for LoopOptions {
    fn default() -> LoopOptions {
        LoopOptions {
            find_loops: true,
            max_loops: Some(5000),
        }
    }
}

/// The analysis could not finish because the LP solver failed.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("loop analysis of model `{model}`: {stage}: {source}")]
pub struct LoopError {
    pub model: String,
    pub stage: &'static str,
    #[source]
    pub source: LpError,
}

/// A reaction that can carry flux in the closed network.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LoopCapableReaction {
    pub reaction: String,
    /// Index into `Model::reactions`.
    pub index: usize,
    /// Can carry flux forward (as written) / backward.
    pub forward: bool,
    pub backward: bool,
}

/// Counters of the work done (no timings: results stay reproducible).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize)]
pub struct LoopStats {
    /// Reactions still allowed a direction after pruning.
    pub reactions_after_pruning: usize,
    /// LP solves for the loop-capable set.
    pub capability_lp_solves: usize,
    /// Reversible reactions shown blocked by the null-space test.
    pub reversible_blocked_by_null_space: usize,
    /// (reaction, direction) pairs that needed their own LP.
    pub direction_lps: usize,
    /// LP solves (including warm edits) for the loop list.
    pub loop_lp_solves: usize,
    /// Loops read off the compressed structure without an LP.
    pub direct_loops: usize,
    /// Loops found by the LP of the target's neighbourhood alone.
    pub local_loops: usize,
    /// Loops whose LP answer failed verification and were recomputed
    /// exactly (rational arithmetic) on their support.
    pub exact_repairs: usize,
}

/// Everything [`analyse_loops`] found.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LoopAnalysis {
    pub model: String,
    pub closure: Closure,
    pub pruning: PruningSummary,
    /// Sorted by reaction index.
    pub loop_capable: Vec<LoopCapableReaction>,
    /// Elementary loops covering the loop-capable set (empty when not asked).
    pub loops: Vec<ElementaryLoop>,
    /// The cap in force on the number of loops.
    pub loop_limit: Option<usize>,
    /// The cap was reached before every loop-capable reaction was covered.
    pub loops_truncated: bool,
    /// Loop-capable reactions in no listed loop (only when truncated, or on
    /// a numerical disagreement, which `problems` then explains).
    pub uncovered_reactions: Vec<String>,
    /// Numerical disagreements worth a look (normally empty).
    pub problems: Vec<String>,
    pub stats: LoopStats,
}

impl LoopAnalysis {
    /// Directions in which each model reaction can loop (model order).
    pub fn capable_directions(&self, reaction_count: usize) -> Vec<Directions> {
        let mut out = vec![Directions::NONE; reaction_count];
        for r in &self.loop_capable {
            if r.index < reaction_count {
                out[r.index] = Directions {
                    forward: r.forward,
                    backward: r.backward,
                };
            }
        }
        out
    }
}

/// Pruned closed network and its loop-capable directions.
struct CapableNetwork {
    network: ClosedNetwork,
    closure: Closure,
    pruning: PruningSummary,
    capability: capable::Capability,
}

fn capable_network(model: &Model) -> Result<CapableNetwork, LoopError> {
    let (mut network, closure) = ClosedNetwork::close(model);
    let pruning = prune::prune(
        network.metabolite_count,
        &network.columns,
        &mut network.allowed,
    );
    let capability =
        capable::capable_directions(&network.columns, &network.allowed).map_err(|source| {
            LoopError {
                model: model.id.clone(),
                stage: "loop-capable set",
                source,
            }
        })?;
    Ok(CapableNetwork {
        network,
        closure,
        pruning,
        capability,
    })
}

/// Internal-loop analysis of a whole model.
pub fn analyse_loops(model: &Model, options: &LoopOptions) -> Result<LoopAnalysis, LoopError> {
    let CapableNetwork {
        network,
        closure,
        pruning,
        capability,
    } = capable_network(model)?;
    let loop_capable: Vec<LoopCapableReaction> = capability
        .capable
        .iter()
        .enumerate()
        .filter(|(_, d)| d.any())
        .map(|(r, d)| LoopCapableReaction {
            reaction: model.reactions[r].id.clone(),
            index: r,
            forward: d.forward,
            backward: d.backward,
        })
        .collect();
    let mut stats = LoopStats {
        reactions_after_pruning: network.allowed.iter().filter(|d| d.any()).count(),
        capability_lp_solves: capability.lp_solves,
        reversible_blocked_by_null_space: capability.reversible_blocked_by_null_space,
        direction_lps: capability.direction_lps,
        loop_lp_solves: 0,
        direct_loops: 0,
        local_loops: 0,
        exact_repairs: 0,
    };
    let mut analysis = LoopAnalysis {
        model: model.id.clone(),
        closure,
        pruning,
        loop_capable,
        loops: Vec::new(),
        loop_limit: options.max_loops,
        loops_truncated: false,
        uncovered_reactions: Vec::new(),
        problems: Vec::new(),
        stats,
    };
    if !options.find_loops {
        return Ok(analysis);
    }
    let reaction_names: Vec<String> = model.reactions.iter().map(|r| r.id.clone()).collect();
    let metabolite_names: Vec<String> = model.metabolites.iter().map(|m| m.id.clone()).collect();
    let names = elementary::Names {
        reactions: &reaction_names,
        metabolites: &metabolite_names,
    };
    let set = elementary::find_loops(
        &network.columns,
        &capability.capable,
        &network.allowed,
        &names,
        options.max_loops,
    )
    .map_err(|source| LoopError {
        model: model.id.clone(),
        stage: "elementary loops",
        source,
    })?;
    stats.loop_lp_solves = set.lp_solves;
    stats.direct_loops = set.direct_loops;
    stats.local_loops = set.local_loops;
    stats.exact_repairs = set.exact_repairs;
    analysis.stats = stats;
    analysis.loops_truncated = set.truncated;
    analysis.uncovered_reactions = set
        .uncovered
        .iter()
        .map(|&r| model.reactions[r].id.clone())
        .collect();
    if !set.truncated && !set.uncovered.is_empty() {
        analysis.problems.push(format!(
            "{} loop-capable reaction(s) admitted no loop LP solution: {}",
            set.uncovered.len(),
            analysis.uncovered_reactions.join(", ")
        ));
    }
    analysis.problems.extend(set.dropped.iter().cloned());
    for cycle in &set.loops {
        if !cycle.verified {
            analysis.problems.push(format!(
                "{} failed verification (relative residual {:.3e})",
                cycle.id, cycle.residual
            ));
        }
        if !cycle.elementary {
            analysis
                .problems
                .push(format!("{} is not elementary", cycle.id));
        }
    }
    analysis.loops = set.loops;
    Ok(analysis)
}
