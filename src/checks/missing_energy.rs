//! Internal reactions without any ΔrG'°: they cannot be judged, so the
//! report says which formation energies are missing.

use super::Check;
use crate::analysis::Analysis;
use crate::report::{Finding, Severity};

pub const CHECK: Check = Check {
    slug: "no-energy",
    title: "Data coverage",
    description: "Internal reactions lacking a ΔrG'° (given, or from the formation energies of all participants) cannot be judged.",
    kinds: &["no-energy-data"],
    run,
};

fn run(analysis: &Analysis) -> Vec<Finding> {
    let mut out = Vec::new();
    for (j, r) in analysis.model.reactions.iter().enumerate() {
        if !analysis.is_thermodynamic(j) {
            continue;
        }
        let Err(missing) = &analysis.reaction_thermo[j] else {
            continue;
        };
        let ids: Vec<String> = missing
            .metabolites
            .iter()
            .map(|&i| analysis.model.metabolites[i].id.clone())
            .collect();
        let mut subjects = vec![r.id.clone()];
        subjects.extend(ids.iter().cloned());
        out.push(Finding {
            kind: "no-energy-data".into(),
            severity: Severity::Note,
            subjects,
            scenario: None,
            message: format!(
                "no ΔrG'°: no reaction energy given and no formation energy for {}",
                ids.iter()
                    .map(|s| format!("`{s}`"))
                    .collect::<Vec<_>>()
                    .join(", ")
            ),
            evidence: super::evidence(&[("missing_metabolites", ids.len() as f64)]),
        });
    }
    out
}
