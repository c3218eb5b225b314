//! The single contract between analysis and every output (site, report.json,
//! SARIF, CI summary). Plain serialisable data: no model types leak through,
//! so templates and external tools see one stable shape.

use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;

pub mod baseline;
pub mod build;
pub mod coverage;
pub mod headline;
pub mod json;
pub mod kinds;
pub mod root_causes;
pub mod sarif;
pub mod scenario_build;
pub mod scenario_view;
pub mod summary;
pub mod text;

pub use crate::finding::{Finding, Severity, Verdict};
pub use headline::{HeadlineState, HeadlineView};
pub use root_causes::RootCauseView;
pub use scenario_view::*;

/// Version of the `report.json` shape; bump on breaking changes.
/// Version 2: `report.json` is compact and leaves out what it repeats
/// (see `json`). Version 3: it also leaves out fields at their default,
/// page names equal to the id and what other rows give (equations, uses of
/// metabolites, loop lists, member energies).
pub const REPORT_SCHEMA_VERSION: u32 = 3;

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Report {
    pub schema_version: u32,
    pub tool: ToolInfo,
    pub project: ProjectInfo,
    pub summary: Summary,
    /// Sorted: severity, kind, first subject, scenario.
    pub findings: Vec<Finding>,
    pub compartments: Vec<CompartmentView>,
    pub metabolites: Vec<MetaboliteView>,
    pub reactions: Vec<ReactionView>,
    #[serde(default, skip_serializing_if = "json::empty")]
    pub scenarios: Vec<ScenarioView>,
    #[serde(default, skip_serializing_if = "json::empty")]
    pub notes: Vec<NoteView>,
    /// Internal loops and energy-generating cycles; `None` when switched off.
    pub loops: Option<LoopsView>,
    /// Every scenario judged as a whole, the model's irreversible
    /// directions first.
    #[serde(default, skip_serializing_if = "json::empty")]
    pub joint_scenarios: Vec<JointScenarioView>,
    /// How far the ΔG data reach (see `report::coverage`).
    #[serde(default)]
    pub coverage: Option<CoverageView>,
    /// Judged internal reactions and the sentence joining verdict and
    /// coverage (see `report::headline`).
    #[serde(default)]
    pub headline: Option<HeadlineView>,
    /// Findings sharing one cause, most explained first (see
    /// `report::root_causes`).
    #[serde(default, skip_serializing_if = "json::empty")]
    pub root_causes: Vec<RootCauseView>,
}

/// Which internal reactions have a ΔrG'° (and so a direction verdict).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CoverageView {
    pub internal_reactions: usize,
    /// Internal reactions with a ΔrG'°.
    pub with_energy: usize,
    /// Reactions with a ΔrG'° by the source it is attributed to (every
    /// source listed, zeros included; a Σ ν·ΔfG'° counts under the
    /// strongest source among its terms: side table, model value, species
    /// data, library).
    pub by_source: Vec<SourceCountView>,
    /// Per compartment: internal reactions with a participant there.
    pub by_compartment: Vec<GroupCoverageView>,
    /// Per reaction group (`(no group)` for the rest), sorted by label.
    pub by_group: Vec<GroupCoverageView>,
    /// Metabolites whose missing ΔfG'° leaves internal reactions without
    /// ΔrG'°, most blocking first.
    pub missing: Vec<MissingMetaboliteView>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SourceCountView {
    /// `side-table`, `model`, `species`, `library`, `transport-rule`, `conditions`.
    pub source: String,
    pub label: String,
    pub reactions: usize,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct GroupCoverageView {
    pub label: String,
    pub reactions: usize,
    pub with_energy: usize,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MissingMetaboliteView {
    pub metabolite: String,
    /// `slug` (`slug::slug` of the id), `name`, `compartment`, `formula` and
    /// `xrefs`: the metabolite's own (left out of report.json).
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub slug: String,
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub name: String,
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub compartment: String,
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub formula: Option<String>,
    /// Internal reactions lacking ΔrG'° that need this ΔfG'°.
    pub blocks: usize,
    /// Of those, the ones where it is the only missing ΔfG'°.
    pub only_gap: usize,
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub xrefs: BTreeMap<String, Vec<String>>,
}

/// What the loop analysis found in the closed network.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LoopsView {
    /// Why the analysis did not finish, if it did not.
    #[serde(default, skip_serializing_if = "json::none")]
    pub error: Option<String>,
    /// Boundary reactions shut to close the network.
    pub shut_reactions: usize,
    /// Bounds that forced flux, relaxed to include zero.
    #[serde(default, skip_serializing_if = "json::empty")]
    pub relaxed_bounds: Vec<RelaxedBoundView>,
    /// Reactions left after dead-end pruning / removed by it.
    pub reactions_after_pruning: usize,
    pub pruned_reactions: usize,
    /// Every reaction that can carry flux in the closed network.
    pub capable: Vec<CapableView>,
    pub loops: Vec<LoopView>,
    /// The list stops at `limit` loops before covering every capable reaction.
    #[serde(default, skip_serializing_if = "json::is_false")]
    pub truncated: bool,
    #[serde(default, skip_serializing_if = "json::none")]
    pub limit: Option<usize>,
    #[serde(default, skip_serializing_if = "json::empty")]
    pub uncovered: Vec<String>,
    pub energy_cycles: Vec<EnergyCycleView>,
    /// Currencies without a complete dissipation reaction in the model.
    #[serde(default, skip_serializing_if = "json::empty")]
    pub not_testable: Vec<String>,
    /// Dissipations not tested because nothing in the model makes or
    /// consumes the currency in that compartment ("atp in e").
    #[serde(default, skip_serializing_if = "json::empty")]
    pub not_used: Vec<String>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RelaxedBoundView {
    pub reaction: String,
    #[serde(default, skip_serializing_if = "json::plain_slug")]
    pub slug: String,
    pub lower_bound: f64,
    pub upper_bound: f64,
    pub relaxed_lower_bound: f64,
    pub relaxed_upper_bound: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CapableView {
    pub reaction: String,
    #[serde(default, skip_serializing_if = "json::plain_slug")]
    pub slug: String,
    #[serde(default, skip_serializing_if = "json::is_false")]
    pub forward: bool,
    #[serde(default, skip_serializing_if = "json::is_false")]
    pub backward: bool,
}

/// One elementary loop.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LoopView {
    /// `loop-<10 hex>` from its member reactions (`loops::ids`; its page
    /// is `loops/<id>.html`).
    pub id: String,
    pub members: Vec<LoopMemberView>,
    /// Metabolites its reactions touch (ids), for the cycle map.
    pub metabolites: Vec<String>,
    /// Every member can also run the other way.
    #[serde(default, skip_serializing_if = "json::is_false")]
    pub reversible: bool,
    /// S·v = 0 within tolerance and every direction allowed by the bounds.
    pub verified: bool,
    /// Σ coef·ΔrG'° over members with data, its σ, and the members without.
    #[serde(default, skip_serializing_if = "json::none")]
    pub drg0_sum_kj: Option<f64>,
    #[serde(default, skip_serializing_if = "json::none")]
    pub sigma_kj: Option<f64>,
    #[serde(default, skip_serializing_if = "json::empty")]
    pub members_without_data: Vec<String>,
    /// Complete data whose sum is beyond k·σ of zero.
    #[serde(default, skip_serializing_if = "json::is_false")]
    pub inconsistent: bool,
    #[serde(default, skip_serializing_if = "json::none")]
    pub constrain: Option<ConstraintView>,
    /// For a reversible loop run backwards.
    #[serde(default, skip_serializing_if = "json::none")]
    pub constrain_reversed: Option<ConstraintView>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LoopMemberView {
    pub reaction: String,
    /// `slug`, `name`, `equation` and `participants`: the reaction's own
    /// (left out of report.json, see `json`).
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub slug: String,
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub name: String,
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub equation: String,
    /// Relative flux around the loop: negative = runs backward.
    pub coefficient: f64,
    /// `drg0_kj` and `sigma_kj`: the reaction's `drg_prime` (left out of
    /// report.json).
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub drg0_kj: Option<f64>,
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub sigma_kj: Option<f64>,
    /// (metabolite id, slug, coefficient in the reaction) for the cycle map.
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub participants: Vec<ParticipantView>,
}

/// The member best constrained to break a loop.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ConstraintView {
    pub reaction: String,
    #[serde(default, skip_serializing_if = "json::plain_slug")]
    pub slug: String,
    /// "forward" or "backward": the direction to forbid.
    pub forbid: String,
    /// Smallest ΔG' of that reaction in the loop's direction, kJ/mol.
    pub dg_min_kj: f64,
    /// "range" (from concentration bounds ± k·σ) or "standard" (ΔrG'° ± k·σ).
    pub basis: String,
    /// Whether forbidding that direction stops the loop (None: not re-checked).
    #[serde(default, skip_serializing_if = "json::none")]
    pub breaks_loop: Option<bool>,
    #[serde(default, skip_serializing_if = "json::empty")]
    pub still_looping: Vec<String>,
}

/// One energy-generating-cycle test.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct EnergyCycleView {
    /// `cycle-<10 hex>` from its member set (the tested dissipation, as
    /// `<currency> in <compartment>`, and the example's reactions; see
    /// `loops::ids`); `None` when no cycle exists.
    #[serde(default, skip_serializing_if = "json::none")]
    pub id: Option<String>,
    pub currency: String,
    pub compartment: String,
    /// The dissipation reaction tested, e.g. `atp_c + h2o_c -> adp_c + pi_c + h_c`.
    pub equation: String,
    /// The same with metabolite names, e.g. `ATP + H2O → ADP + phosphate + H+`.
    #[serde(default)]
    pub named_equation: String,
    /// Page of the cycle (`loops/<slug>.html`), written when it exists.
    #[serde(default)]
    pub slug: String,
    #[serde(default, skip_serializing_if = "json::is_false")]
    pub cycle_exists: bool,
    /// The example is one reaction, run exactly as the dissipation reversed.
    #[serde(default, skip_serializing_if = "json::is_false")]
    pub trivial: bool,
    /// Reactions of an example flux (with the dissipation at 1).
    #[serde(default, skip_serializing_if = "json::empty")]
    pub example: Vec<LoopMemberView>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ToolInfo {
    pub name: String,
    pub version: String,
    /// RFC 3339 UTC; honours SOURCE_DATE_EPOCH for reproducible builds.
    pub generated: String,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ProjectInfo {
    pub title: String,
    pub model_id: String,
    pub model_title: String,
    pub temperature_k: f64,
    /// Confidence level of verdicts, e.g. 0.95.
    pub confidence: f64,
    /// Multiplier of σ matching `confidence` (e.g. 1.96).
    pub sigma_multiplier: f64,
    /// Smallest driving force (kJ/mol) counted as comfortably feasible.
    pub min_driving_force_kj: f64,
    pub default_concentration_m: RangeView,
    /// The standing caution printed on every report.
    pub caution: String,
    /// Metabolite ids the network maps always draw as side labels / as
    /// nodes (the project's `maps:` settings).
    #[serde(default, skip_serializing_if = "json::empty")]
    pub map_side: Vec<String>,
    #[serde(default, skip_serializing_if = "json::empty")]
    pub map_main: Vec<String>,
}

#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct RangeView {
    pub min: f64,
    pub max: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Summary {
    pub reactions: usize,
    pub internal_reactions: usize,
    pub metabolites: usize,
    pub compartments: usize,
    pub scenarios: usize,
    pub errors: usize,
    pub warnings: usize,
    pub notes: usize,
    /// Internal reactions with a ΔrG'° (from any origin).
    pub reactions_with_energy: usize,
    /// Metabolites with a ΔfG'° (from any origin).
    pub metabolites_with_energy: usize,
    /// Finding counts per kind slug.
    pub by_kind: BTreeMap<String, usize>,
    /// What was checked: (slug, one-line description).
    pub checks: Vec<CheckInfo>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CheckInfo {
    pub slug: String,
    pub title: String,
    pub description: String,
    /// Finding kinds this check reports.
    pub kinds: Vec<String>,
    /// Number of findings it reported.
    pub findings: usize,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CompartmentView {
    pub id: String,
    pub name: String,
    pub ph: f64,
    pub ionic_strength_m: f64,
    pub potential_mv: f64,
    pub temperature_k: f64,
    #[serde(default, skip_serializing_if = "json::none")]
    pub pmg: Option<f64>,
    /// False when nobody stated its pH or potential (defaults in use).
    #[serde(default = "stated_by_default")]
    pub conditions_stated: bool,
    /// Where its conditions come from, when the settings say.
    #[serde(default, skip_serializing_if = "json::none")]
    pub conditions_source: Option<String>,
}

fn stated_by_default() -> bool {
    true
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct EnergyView {
    pub value_kj: f64,
    pub sigma_kj: f64,
    #[serde(default, skip_serializing_if = "json::transport_source")]
    pub source: String,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct MetaboliteView {
    pub id: String,
    /// Sanitised file stem for this metabolite's page.
    #[serde(default, skip_serializing_if = "json::plain_slug")]
    pub slug: String,
    pub name: String,
    pub compartment: String,
    #[serde(default, skip_serializing_if = "json::none")]
    pub formula: Option<String>,
    #[serde(default, skip_serializing_if = "json::none")]
    pub charge: Option<i32>,
    /// ΔfG'° at the compartment's conditions, when known.
    #[serde(default, skip_serializing_if = "json::none")]
    pub dfg_prime: Option<EnergyView>,
    /// Where `dfg_prime` came from: "model", "model-converted", "species",
    /// "library", "fixed" (H+), "fixed-pmg" (free Mg²⁺).
    #[serde(default, skip_serializing_if = "json::none")]
    pub energy_origin: Option<String>,
    pub concentration_m: RangeView,
    /// True when the range is the project default, not the metabolite's own.
    pub concentration_is_default: bool,
    #[serde(default, skip_serializing_if = "json::none")]
    pub measured_m: Option<f64>,
    /// "proton", "water" or "" for ordinary metabolites.
    #[serde(default, skip_serializing_if = "json::empty_text")]
    pub special: String,
    #[serde(default, skip_serializing_if = "json::empty_map")]
    pub xrefs: BTreeMap<String, Vec<String>>,
    /// Ids of reactions that consume / produce it.
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub consumed_by: Vec<String>,
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub produced_by: Vec<String>,
    /// Built-in library entry matched (by key or cross-reference), if any.
    #[serde(default, skip_serializing_if = "json::none")]
    pub library_key: Option<String>,
    /// Why available data could not be used, if so.
    #[serde(default, skip_serializing_if = "json::none")]
    pub energy_problem: Option<String>,
    /// Species-level data and their distribution, when the energy came from
    /// species (model or library).
    #[serde(default, skip_serializing_if = "json::none")]
    pub species: Option<SpeciesView>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SpeciesView {
    pub entries: Vec<SpeciesEntryView>,
    /// Conditions of the transform (the compartment's).
    pub ph: f64,
    pub ionic_strength_m: f64,
    pub temperature_k: f64,
    #[serde(default, skip_serializing_if = "json::none")]
    pub pmg: Option<f64>,
    pub mean_hydrogens: f64,
    pub mean_charge: f64,
    /// ΔfG'° of the reactant made of the species counted here (the sum over
    /// species, Alberty 2003), kJ/mol; `None` when no species was counted.
    #[serde(default)]
    pub reactant_dfg_prime_kj: Option<f64>,
    /// Species mole fractions over pH 4–10: (pH, fraction of each entry).
    pub curve: Vec<CurvePoint>,
    /// Where each value comes from.
    pub provenance: Vec<String>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SpeciesEntryView {
    /// Species name when known (e.g. "HATP3-"), else built from z and nH.
    pub label: String,
    pub charge: i32,
    pub hydrogens: u32,
    pub magnesium: u32,
    pub dfg0_kj: f64,
    #[serde(default, skip_serializing_if = "json::none")]
    pub dfh0_kj: Option<f64>,
    /// Transformed ΔfG'° of the species at the compartment (None if left out).
    #[serde(default, skip_serializing_if = "json::none")]
    pub dfg_prime_kj: Option<f64>,
    /// Mole fraction at the compartment's conditions.
    pub fraction: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CurvePoint {
    pub ph: f64,
    pub fractions: Vec<f64>,
}

/// One term of Σ ν·ΔfG'°.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct EnergyTermView {
    pub metabolite: String,
    pub slug: String,
    pub compartment: String,
    pub coefficient: f64,
    pub dfg_prime_kj: f64,
    pub sigma_kj: f64,
    pub origin: String,
}

/// Terms of ΔrG'° for a reaction spanning compartments.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct TransportView {
    pub formation_sum_kj: f64,
    pub proton_term_kj: f64,
    pub electrical_term_kj: f64,
    pub reference_independent: bool,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ParticipantView {
    pub metabolite: String,
    /// `slug` and `name`: the metabolite's own (left out of report.json).
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub slug: String,
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub name: String,
    /// Signed coefficient (negative = consumed).
    pub coefficient: f64,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ScenarioVerdictView {
    pub scenario: String,
    pub flux: f64,
    pub verdict: Verdict,
    /// The step is possible alone, but the scenario as a whole is not: its
    /// "consistent" or "marginal" holds only for the step alone.
    #[serde(default)]
    pub alone_only: bool,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ReactionView {
    pub id: String,
    #[serde(default, skip_serializing_if = "json::plain_slug")]
    pub slug: String,
    pub name: String,
    /// Equation written with metabolite ids.
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub equation: String,
    pub participants: Vec<ParticipantView>,
    #[serde(default, skip_serializing_if = "json::is_false")]
    pub reversible: bool,
    pub lower_bound: f64,
    pub upper_bound: f64,
    pub role: String,
    #[serde(default, skip_serializing_if = "json::none")]
    pub group: Option<String>,
    /// ΔrG'° with σ, when known.
    #[serde(default, skip_serializing_if = "json::none")]
    pub drg_prime: Option<EnergyView>,
    /// "reaction" (given for the reaction) or "formation" (Σ ν·ΔfG'°).
    #[serde(default, skip_serializing_if = "json::none")]
    pub energy_origin: Option<String>,
    /// K' = exp(−ΔrG'°/RT).
    #[serde(default, skip_serializing_if = "json::none")]
    pub k_prime: Option<f64>,
    /// ΔG' range over the allowed concentrations, kJ/mol (no σ allowance).
    #[serde(default, skip_serializing_if = "json::none")]
    pub dg_range: Option<RangeView>,
    /// ΔG' at measured concentrations (range bounds where unmeasured), when all are measured.
    #[serde(default, skip_serializing_if = "json::none")]
    pub dg_measured: Option<f64>,
    /// Verdict for the directions the bounds allow.
    #[serde(default, skip_serializing_if = "json::none")]
    pub forward_verdict: Option<Verdict>,
    #[serde(default, skip_serializing_if = "json::none")]
    pub backward_verdict: Option<Verdict>,
    #[serde(default, skip_serializing_if = "json::empty")]
    pub scenario_verdicts: Vec<ScenarioVerdictView>,
    /// Metabolites whose missing data left this reaction without ΔrG'°.
    #[serde(default, skip_serializing_if = "json::empty")]
    pub missing_data: Vec<String>,
    /// Other reasons for a missing ΔrG'°.
    #[serde(default, skip_serializing_if = "json::empty")]
    pub missing_reasons: Vec<String>,
    /// Σ ν·ΔfG'° term by term (when ΔrG'° comes from formation energies).
    #[serde(default, skip_serializing_if = "json::empty")]
    pub energy_terms: Vec<EnergyTermView>,
    /// Proton and electrical terms of a transport step.
    #[serde(default, skip_serializing_if = "json::none")]
    pub transport: Option<TransportView>,
    /// Directions it can carry flux in the closed network ("forward",
    /// "backward", "both"), when it can.
    #[serde(default, skip_serializing_if = "json::none")]
    pub loop_capable: Option<String>,
    /// Ids of the listed loops it belongs to.
    #[serde(default, skip_serializing_if = "json::left_out")]
    pub loops: Vec<String>,
    /// Cross references: namespace (e.g. "kegg.reaction") → ids. Lets a
    /// collection match one reaction across models whose ids differ.
    #[serde(default, skip_serializing_if = "json::empty_map")]
    pub xrefs: BTreeMap<String, Vec<String>>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ScenarioView {
    pub id: String,
    pub description: String,
    pub active_reactions: usize,
    pub contradictions: usize,
    pub marginal: usize,
    #[serde(default)]
    pub at_equilibrium: usize,
    pub consistent: usize,
    pub no_data: usize,
    /// Joint verdict: "feasible", "infeasible" or "not-decided".
    #[serde(default)]
    pub joint_verdict: Option<String>,
}

#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct NoteView {
    pub slug: String,
    pub title: String,
    /// Markdown source; rendered by the site without raw HTML.
    pub markdown: String,
}

impl Report {
    /// Position of each reaction in `reactions`, by id.
    pub fn reaction_positions(&self) -> std::collections::HashMap<&str, usize> {
        self.reactions
            .iter()
            .enumerate()
            .map(|(j, r)| (r.id.as_str(), j))
            .collect()
    }

    pub fn count(&self, severity: Severity) -> usize {
        self.findings
            .iter()
            .filter(|f| f.severity == severity)
            .count()
    }
}
