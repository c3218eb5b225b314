//! Report types of the joint scenario analysis (`crate::scenarios`).

use super::ParticipantView;
use serde::{Deserialize, Serialize};

/// One scenario judged as a whole (the model's irreversible directions
/// first, then every given scenario).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct JointScenarioView {
    pub id: String,
    /// Page name: `scenarios/<slug>.html`.
    pub slug: String,
    pub description: String,
    /// The model's irreversible directions rather than a given flux.
    pub is_default: bool,
    /// "feasible", "infeasible" or "not-decided".
    pub verdict: String,
    /// Why it was not decided.
    #[serde(default, skip_serializing_if = "super::json::none")]
    pub reason: Option<String>,
    /// Active internal reactions with a ΔrG'° (rows of the joint LP).
    pub constrained: usize,
    /// Active internal reactions without ΔrG'° (they do not constrain).
    pub without_data: Vec<String>,
    /// Max-min driving force; below the required force when infeasible.
    pub mdf: Option<MdfView>,
    pub conflicts: Vec<ConflictSetView>,
    /// The search for further conflicting sets stopped at its limit.
    #[serde(default, skip_serializing_if = "super::json::is_false")]
    pub more_conflicts_possible: bool,
    /// Cumulative ΔG' along the longest active chain at the MDF concentrations.
    pub profile: Vec<ProfileStepView>,
    /// The loop law on the given flux (absent for the default scenario).
    #[serde(default, skip_serializing_if = "super::json::none")]
    pub loop_law: Option<LoopLawView>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MdfView {
    /// B in kJ/mol: every active step has −ΔG' ≥ B.
    pub value_kj: f64,
    /// One line, e.g. "the weakest step has at most 3.2 kJ/mol of driving force".
    pub reading: String,
    pub bottlenecks: Vec<BottleneckView>,
    /// One concentration set achieving B.
    pub concentrations: Vec<ConcentrationView>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct BottleneckView {
    pub reaction: String,
    pub slug: String,
    /// Dual value: B rises by this many kJ/mol per kJ/mol of extra driving
    /// force of this step (they sum to 1).
    pub dual: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ConcentrationView {
    pub metabolite: String,
    pub slug: String,
    pub value_m: f64,
    /// The window the LP allowed (mol/L).
    pub min_m: f64,
    pub max_m: f64,
    /// "lower" / "upper" when at a bound of its window.
    pub at_bound: Option<String>,
}

/// An irreducible set of reactions that cannot all run at once.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ConflictSetView {
    /// In pathway order.
    pub members: Vec<ConflictMemberView>,
    /// Smallest achievable Σ wⱼ·ΔG'ⱼ in the flux directions, kJ/mol.
    pub overall_kj: f64,
    /// What running them needs: Σ wⱼ·ΔG'ⱼ ≤ this, kJ/mol.
    pub required_kj: f64,
    /// The concentration bounds and σ allowances that bind.
    #[serde(default, skip_serializing_if = "super::json::empty")]
    pub binding: Vec<BindingView>,
    /// Smallest single changes that would make the set feasible (suggestions).
    pub repairs: Vec<RepairView>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ConflictMemberView {
    pub reaction: String,
    pub slug: String,
    pub equation: String,
    /// "forward" or "backward".
    pub direction: String,
    /// Certificate weight (smallest 1): the set adds up to Σ weight·reaction.
    pub weight: f64,
    pub drg0_kj: f64,
    pub sigma_kj: f64,
    pub participants: Vec<ParticipantView>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct BindingView {
    /// "concentration" or "uncertainty".
    pub kind: String,
    /// Metabolite id, or the error source's label.
    pub subject: String,
    /// Metabolite page slug ("" for an error source).
    pub slug: String,
    /// "upper" or "lower".
    pub side: String,
    /// The bound: mol/L for a concentration, kJ/mol for a deviation.
    pub value: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RepairView {
    /// "widen-range" or "shift-energy".
    pub kind: String,
    /// Metabolite or reaction id.
    pub subject: String,
    pub slug: String,
    /// Decades for a widening, kJ/mol for a shift.
    pub amount: f64,
    /// For a widening, the new bound (mol/L) and its side; for a shift, the
    /// shift in σ of that ΔrG'° when σ > 0.
    #[serde(default, skip_serializing_if = "super::json::none")]
    pub new_bound_m: Option<f64>,
    #[serde(default, skip_serializing_if = "super::json::none")]
    pub side: Option<String>,
    #[serde(default, skip_serializing_if = "super::json::none")]
    pub sigmas: Option<f64>,
    pub text: String,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ProfileStepView {
    pub reaction: String,
    pub slug: String,
    /// ΔG' of the step in its flux direction at the MDF concentrations,
    /// central ΔrG'° (kJ/mol).
    pub dg_kj: f64,
    pub cumulative_kj: f64,
    /// k·σ of the cumulative sum (shared errors counted once).
    pub band_kj: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LoopLawView {
    /// None when decided; else why not.
    pub error: Option<String>,
    pub loop_free: bool,
    pub cycles: Vec<FluxCycleView>,
    /// Every reaction of the given flux: given and loop-free values.
    pub fluxes: Vec<FluxPairView>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FluxCycleView {
    pub members: Vec<CycleMemberView>,
    /// Flux carried around the cycle (times each coefficient).
    pub flux: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CycleMemberView {
    pub reaction: String,
    pub slug: String,
    pub coefficient: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FluxPairView {
    pub reaction: String,
    pub slug: String,
    pub given: f64,
    pub loop_free: f64,
    pub differs: bool,
}
