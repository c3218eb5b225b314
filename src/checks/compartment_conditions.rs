//! Compartment conditions nobody stated. SBML carries no pH or membrane
//! potential, so an imported model runs every compartment at pH 7 and 0 mV
//! until the curator sets them; a verdict on a step between compartments
//! then rests on those defaults. One note says so, and such verdicts are
//! softened to notes that say what they depend on.

use super::Check;
use crate::analysis::Analysis;
use crate::finding::{Finding, Severity};

pub const CHECK: Check = Check {
    slug: "compartment-conditions",
    title: "Compartment conditions",
    description: "A model with several compartments needs each one's pH and electrical potential; unset ones run at pH 7 and 0 mV, and verdicts on steps between them are notes until they are set.",
    kinds: &["unset-compartment-conditions"],
    run,
};

/// Finding kinds that are direction verdicts of one reaction (its id first
/// among the subjects).
const DIRECTION_KINDS: &[&str] = &[
    "infeasible-direction",
    "marginal-direction",
    "one-way-reversible",
    "scenario-contradiction",
    "scenario-marginal",
];

/// Appended to the message of a softened verdict.
pub const DEPENDS_ON_UNSET: &str = "depends on unset compartment conditions";

fn run(analysis: &Analysis) -> Vec<Finding> {
    let model = analysis.model;
    let unset = &analysis.settings.unset_conditions;
    if model.compartments.len() < 2 || unset.is_empty() {
        return Vec::new();
    }
    let ids: Vec<String> = unset
        .iter()
        .map(|&c| model.compartments[c].id.clone())
        .collect();
    let affected = (0..model.reactions.len())
        .filter(|&j| depends_on_unset_conditions(analysis, j))
        .count();
    vec![Finding {
        kind: "unset-compartment-conditions".into(),
        severity: Severity::Note,
        subjects: Vec::new(),
        scenario: None,
        message: format!(
            "{} of {} compartments have no stated pH or membrane potential ({}): they run at pH 7 and 0 mV, so the ΔrG'° of the {affected} reactions between compartments that touch them rests on defaults, and their verdicts count as notes. Set them under `compartments:` in gibbsite.yaml or with `gibbsite import --conditions`.",
            ids.len(),
            model.compartments.len(),
            ids.join(", ")
        ),
        evidence: super::evidence(&[
            ("unset_compartments", ids.len() as f64),
            ("compartments", model.compartments.len() as f64),
            ("affected_reactions", affected as f64),
        ]),
    }]
}

/// Reaction `j` spans compartments and one of them has unset conditions.
pub fn depends_on_unset_conditions(analysis: &Analysis, j: usize) -> bool {
    let model = analysis.model;
    let unset = &analysis.settings.unset_conditions;
    if model.compartments.len() < 2 || unset.is_empty() {
        return false;
    }
    let mut compartments: Vec<usize> = model.reactions[j]
        .stoichiometry
        .iter()
        .map(|&(i, _)| model.metabolites[i].compartment)
        .collect();
    compartments.sort_unstable();
    compartments.dedup();
    compartments.len() > 1 && compartments.iter().any(|c| unset.binary_search(c).is_ok())
}

/// Direction verdicts on reactions that depend on unset conditions become
/// notes saying so: not an error until someone states the conditions.
pub fn soften(analysis: &Analysis, findings: &mut [Finding]) {
    let index: std::collections::HashMap<&str, usize> = analysis
        .model
        .reactions
        .iter()
        .enumerate()
        .map(|(j, r)| (r.id.as_str(), j))
        .collect();
    for f in findings.iter_mut() {
        // A joint verdict rests on every member of its set; a per-step one
        // on its reaction.
        let members: &[String] = if f.kind == "scenario-infeasible" {
            &f.subjects
        } else if DIRECTION_KINDS.contains(&f.kind.as_str()) {
            &f.subjects[..f.subjects.len().min(1)]
        } else {
            continue;
        };
        let depends = members
            .iter()
            .filter_map(|id| index.get(id.as_str()).copied())
            .any(|j| depends_on_unset_conditions(analysis, j));
        if depends {
            f.severity = Severity::Note;
            f.message = format!("{} ({DEPENDS_ON_UNSET})", f.message);
        }
    }
}
