//! Checks: one file per check, each a pure function of the analysed data
//! ([`Analysis`]) returning findings; they never run analysis steps
//! themselves nor know about the report (`pipeline` calls [`run_all`]).
//! Adding a check means one new file plus one line in [`REGISTRY`].

use crate::analysis::Analysis;
use crate::finding::Finding;

pub mod balance;
pub mod bounds_audit;
pub mod compartment_conditions;
pub mod copied_energy;
pub mod energy_cycles;
pub mod input_plausibility;
pub mod internal_loops;
pub mod missing_energy;
pub mod scenario_directions;
pub mod scenario_joint;
pub mod validity;

/// A registered check.
pub struct Check {
    /// Short name of the check.
    pub slug: &'static str,
    pub title: &'static str,
    pub description: &'static str,
    /// Finding kinds it may report.
    pub kinds: &'static [&'static str],
    pub run: fn(&Analysis) -> Vec<Finding>,
}

/// Every check, in the order the overview lists them.
pub const REGISTRY: &[Check] = &[
    input_plausibility::CHECK,
    balance::CHECK,
    validity::CHECK,
    copied_energy::CHECK,
    bounds_audit::CHECK,
    scenario_directions::CHECK,
    scenario_joint::CHECK,
    missing_energy::CHECK,
    compartment_conditions::CHECK,
    internal_loops::CHECK,
    energy_cycles::CHECK,
];

/// Run every registered check over the analysed data, soften what unset
/// compartment conditions make uncertain, and sort the findings
/// deterministically.
/// Every kind a registered check may report, in registry order, each once.
pub fn kinds() -> Vec<&'static str> {
    let mut seen = std::collections::BTreeSet::new();
    REGISTRY
        .iter()
        .flat_map(|c| c.kinds.iter().copied())
        .filter(|k| seen.insert(*k))
        .collect()
}

pub fn run_all(analysis: &Analysis) -> Vec<Finding> {
    let mut findings: Vec<Finding> = REGISTRY
        .iter()
        .flat_map(|check| (check.run)(analysis))
        .collect();
    compartment_conditions::soften(analysis, &mut findings);
    crate::finding::sort_findings(&mut findings);
    findings
}

/// Shorthand for the evidence map of a finding.
pub(crate) fn evidence(pairs: &[(&str, f64)]) -> std::collections::BTreeMap<String, f64> {
    pairs
        .iter()
        .filter(|(_, v)| v.is_finite())
        .map(|(k, v)| ((*k).to_string(), *v))
        .collect()
}

/// Evidence common to direction verdicts of one reaction.
pub(crate) fn range_evidence(
    analysis: &Analysis,
    j: usize,
) -> std::collections::BTreeMap<String, f64> {
    match &analysis.reaction_thermo[j] {
        Ok(t) => evidence(&[
            ("drg0", t.drg0_kj),
            ("sigma", t.sigma_kj),
            ("allowance", analysis.sigma_multiplier * t.sigma_kj),
            ("dg_min", t.range.min),
            ("dg_max", t.range.max),
        ]),
        Err(_) => Default::default(),
    }
}

/// What a verdict on reaction `j` must add when its ΔrG'° rests on a ΔfG'°
/// copied into compartments of different conditions (empty otherwise).
pub(crate) fn copy_caveat(analysis: &Analysis, j: usize) -> String {
    let Some(copy) = analysis.copied_energy_behind(j) else {
        return String::new();
    };
    let ids: Vec<String> = copy
        .metabolites
        .iter()
        .map(|&i| format!("`{}`", analysis.model.metabolites[i].id))
        .collect();
    let size = match copy.possible_error_kj {
        Some(e) => format!(", so ΔrG'° may be off by up to {}", kj(e)),
        None => String::new(),
    };
    format!(
        " — caution: built on one ΔfG'° copied unconverted into compartments of different conditions ({}){size}",
        ids.join(", ")
    )
}

/// "−12.34 kJ/mol" with a real minus sign, for messages.
pub(crate) fn kj(value: f64) -> String {
    let text = format!("{:.2} kJ/mol", value.abs());
    if value < -0.005 {
        format!("−{text}")
    } else {
        text
    }
}
