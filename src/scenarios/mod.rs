//! Flux scenarios judged jointly.
//!
//! The per-step check (`checks::scenario_directions`) asks of every active
//! reaction alone whether some concentrations let it run. Here all active
//! reactions of a scenario must run *at once*, on one set of concentrations
//! and one value of every shared ΔG'° error:
//!
//! * `feasibility`: the joint LP, its max-min driving force and its dual
//!   (Farkas certificate when infeasible);
//! * `conflicts`: minimal conflicting sets (deletion filter seeded from the
//!   certificate) and the smallest repair of each;
//! * `mdf`: the max-min driving force, bottlenecks and concentrations;
//! * `loop_law`: does the given flux carry internal cycles, and a loop-free
//!   flux with the same exchanges (CycleFreeFlux).
//!
//! Every LP goes through `crate::lp` and every answer is checked by
//! substituting it back.

pub mod conflicts;
pub mod feasibility;
pub mod loop_law;
pub mod mdf;
pub mod tolerance;

use crate::analysis::Analysis;
use crate::model::Special;
use crate::thermo::constants::rt;
pub use conflicts::{ConflictSet, Repair};
pub use feasibility::{Binding, Decision, JointProblem, JointVarKind, ProblemBuilder, Undecided};
pub use loop_law::{FluxCycle, LoopLawResult};
pub use mdf::MdfResult;

/// Id of the scenario made of the model's own irreversible directions.
pub const DEFAULT_SCENARIO_ID: &str = "irreversible-directions";

/// Further independent conflicting sets searched after the first.
pub const DEFAULT_EXTRA_CONFLICT_SETS: usize = 5;

/// The joint verdict on a scenario.
#[derive(Debug, Clone, PartialEq)]
pub enum JointOutcome {
    /// Every active step with data can run at once; `None` when no active
    /// step has a ΔrG'° (nothing constrains).
    Feasible(Option<MdfResult>),
    Infeasible {
        /// The largest achievable driving force of the weakest step (below
        /// the required one), kJ/mol.
        mdf: MdfResult,
        conflicts: Vec<ConflictSet>,
        /// The search for further sets stopped at its limit.
        more_sets_possible: bool,
    },
}

/// Everything found about one scenario.
#[derive(Debug, Clone, PartialEq)]
pub struct ScenarioResult {
    pub id: String,
    pub description: String,
    /// The model's irreversible directions, not a given flux.
    pub is_default: bool,
    /// Active internal reactions with their flux (the default scenario: ±1).
    pub active: Vec<(usize, f64)>,
    /// The given flux (empty for the default scenario).
    pub fluxes: Vec<(usize, f64)>,
    pub problem: JointProblem,
    /// Active internal reactions without ΔrG'° (they do not constrain).
    pub without_data: Vec<usize>,
    pub outcome: Result<JointOutcome, Undecided>,
    /// `None` for the default scenario (no flux to judge).
    pub loop_law: Option<Result<LoopLawResult, Undecided>>,
}

/// Options of the scenario analysis.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ScenarioOptions {
    pub extra_conflict_sets: usize,
}

impl Default for ScenarioOptions {
    fn default() -> Self {
        ScenarioOptions {
            extra_conflict_sets: DEFAULT_EXTRA_CONFLICT_SETS,
        }
    }
}

/// Judges the default scenario and every given scenario.
pub fn analyse(analysis: &Analysis, options: &ScenarioOptions) -> Vec<ScenarioResult> {
    let model = analysis.model;
    let mut out = Vec::with_capacity(model.scenarios.len() + 1);
    let default_steps: Vec<(usize, f64)> = model
        .reactions
        .iter()
        .enumerate()
        .filter(|&(j, r)| analysis.is_thermodynamic(j) && r.allows_forward() != r.allows_backward())
        .map(|(j, r)| (j, if r.allows_forward() { 1.0 } else { -1.0 }))
        .collect();
    out.push(analyse_one(
        analysis,
        options,
        DEFAULT_SCENARIO_ID,
        "The model's own irreversible reactions, each running in its only allowed direction",
        true,
        &default_steps,
        &[],
    ));
    for s in &model.scenarios {
        let active: Vec<(usize, f64)> = s
            .fluxes
            .iter()
            .copied()
            .filter(|&(j, v)| analysis.is_thermodynamic(j) && v != 0.0)
            .collect();
        out.push(analyse_one(
            analysis,
            options,
            &s.id,
            &s.description,
            false,
            &active,
            &s.fluxes,
        ));
    }
    out
}

/// Judges one scenario: `active` are internal reactions with their flux.
pub fn analyse_one(
    analysis: &Analysis,
    options: &ScenarioOptions,
    id: &str,
    description: &str,
    is_default: bool,
    active: &[(usize, f64)],
    fluxes: &[(usize, f64)],
) -> ScenarioResult {
    let (problem, without_data) = build_problem(analysis, active);
    let outcome = judge(&problem, options);
    let loop_law = (!is_default)
        .then(|| loop_law::analyse(analysis.model, fluxes, |j| analysis.is_thermodynamic(j)));
    ScenarioResult {
        id: id.to_string(),
        description: description.to_string(),
        is_default,
        active: active.to_vec(),
        fluxes: fluxes.to_vec(),
        problem,
        without_data,
        outcome,
        loop_law,
    }
}

/// The joint verdict on a problem: MDF when feasible, conflicting sets
/// with repairs when not.
pub fn judge(problem: &JointProblem, options: &ScenarioOptions) -> Result<JointOutcome, Undecided> {
    let all: Vec<usize> = (0..problem.steps.len()).collect();
    let Some(decision) = problem.decide(&all)? else {
        return Ok(JointOutcome::Feasible(None));
    };
    let mdf = mdf::describe(problem, &decision);
    match decision {
        Decision::Feasible { .. } => Ok(JointOutcome::Feasible(Some(mdf))),
        Decision::Infeasible { dual, .. } => {
            let (conflicts, more_sets_possible) =
                conflicts::find(problem, &all, &dual, options.extra_conflict_sets)?;
            Ok(JointOutcome::Infeasible {
                mdf,
                conflicts,
                more_sets_possible,
            })
        }
    }
}

/// The joint LP of `active` (internal reactions with a flux of that sign):
/// one row per reaction with a ΔrG'°, the others listed as without data.
pub fn build_problem(analysis: &Analysis, active: &[(usize, f64)]) -> (JointProblem, Vec<usize>) {
    let mut builder = ProblemBuilder::new(analysis.settings.min_driving_force_kj);
    let mut without_data = Vec::new();
    let k = analysis.sigma_multiplier;
    for &(j, flux) in active {
        let Ok(t) = &analysis.reaction_thermo[j] else {
            without_data.push(j);
            continue;
        };
        let mut q_terms = Vec::new();
        for &(i, nu) in &analysis.model.reactions[j].stoichiometry {
            if analysis.model.metabolites[i].special != Special::None {
                continue;
            }
            let var = builder.variable(JointVarKind::LnConcentration { metabolite: i }, || {
                ln_window(analysis, i)
            });
            q_terms.push((var, nu));
        }
        let error_terms: Vec<(usize, f64)> = analysis.errors.reactions[j]
            .iter()
            .map(|&(s, c)| {
                let sigma = analysis.errors.sources[s].sigma_kj;
                let var = builder.variable(JointVarKind::Deviation { source: s }, || {
                    (-k * sigma, k * sigma)
                });
                (var, c)
            })
            .collect();
        builder.step(
            j,
            flux.signum(),
            t.drg0_kj,
            t.sigma_kj,
            rt(t.temperature_k),
            &q_terms,
            &error_terms,
            Some(k * analysis.errors.reaction_sigma(j)),
        );
    }
    (builder.finish(), without_data)
}

/// ln of the concentrations metabolite `i` may take in the joint LP: its
/// allowed range, or for a measured one the measurement within
/// [`feasibility::MEASURED_FACTOR`] either way.
pub fn ln_window(analysis: &Analysis, i: usize) -> (f64, f64) {
    const FLOOR: f64 = 1e-30;
    let (min, max) = match analysis.model.metabolites[i].measured_m {
        Some(m) if m > 0.0 => (
            m / feasibility::MEASURED_FACTOR,
            m * feasibility::MEASURED_FACTOR,
        ),
        _ => {
            let r = analysis.concentration(i);
            (r.min, r.max)
        }
    };
    (min.max(FLOOR).ln(), max.max(FLOOR).ln())
}

impl ScenarioResult {
    /// The joint verdict in one word.
    pub fn verdict(&self) -> JointVerdict {
        match &self.outcome {
            Ok(JointOutcome::Feasible(_)) => JointVerdict::Feasible,
            Ok(JointOutcome::Infeasible { .. }) => JointVerdict::Infeasible,
            Err(_) => JointVerdict::NotDecided,
        }
    }
}

/// Feasible / infeasible / not decided.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum JointVerdict {
    Feasible,
    Infeasible,
    NotDecided,
}

impl JointVerdict {
    pub fn slug(self) -> &'static str {
        match self {
            JointVerdict::Feasible => "feasible",
            JointVerdict::Infeasible => "infeasible",
            JointVerdict::NotDecided => "not-decided",
        }
    }
}
