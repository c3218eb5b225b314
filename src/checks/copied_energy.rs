//! One ΔfG'° given for a compound in compartments of different pH, ionic
//! strength or temperature without saying where it holds (`at:`): it cannot
//! be right everywhere, and transport steps between those compartments get a
//! wrong ΔrG'° (see `thermo::copies`).

use super::{evidence, kj, Check};
use crate::analysis::Analysis;
use crate::finding::{Finding, Severity};

pub const CHECK: Check = Check {
    slug: "copied-energy",
    title: "Formation energies copied between compartments",
    description: "A ΔfG'° holds at one pH, ionic strength and temperature; the same value given in compartments of different conditions needs `at:` so it can be moved to each.",
    kinds: &["copied-formation-energy"],
    run,
};

fn run(analysis: &Analysis) -> Vec<Finding> {
    let model = analysis.model;
    analysis
        .copied_energies
        .iter()
        .map(|copy| {
            let ids: Vec<String> = copy
                .metabolites
                .iter()
                .map(|&i| model.metabolites[i].id.clone())
                .collect();
            let places: Vec<String> = copy
                .metabolites
                .iter()
                .map(|&i| {
                    let c = &model.compartments[model.metabolites[i].compartment];
                    format!(
                        "`{}` in {} (pH {}, I = {} M, {} K)",
                        model.metabolites[i].id,
                        c.id,
                        c.ph,
                        c.ionic_strength_m,
                        model.compartment_temperature(model.metabolites[i].compartment)
                    )
                })
                .collect();
            let size = match copy.possible_error_kj {
                Some(e) => format!(
                    "between these compartments the value differs by up to {} for a single species with this formula and charge",
                    kj(e)
                ),
                None => "its error cannot be sized (no formula and charge, or different temperatures); about nH × 5.7 kJ/mol per pH unit for nH hydrogen atoms".to_string(),
            };
            let reactions: Vec<String> = copy
                .reactions
                .iter()
                .map(|&j| model.reactions[j].id.clone())
                .collect();
            let affected = if reactions.is_empty() {
                String::new()
            } else {
                format!(
                    "; the ΔrG'° of {} rests on it",
                    reactions
                        .iter()
                        .map(|r| format!("`{r}`"))
                        .collect::<Vec<_>>()
                        .join(", ")
                )
            };
            let mut subjects = ids;
            subjects.extend(reactions);
            let mut ev = evidence(&[
                ("value", copy.value_kj),
                ("metabolites", copy.metabolites.len() as f64),
            ]);
            if let Some(e) = copy.possible_error_kj {
                ev.insert("possible_error".into(), e);
            }
            Finding {
                kind: "copied-formation-energy".into(),
                severity: Severity::Warning,
                subjects,
                scenario: None,
                message: format!(
                    "the same ΔfG'° ({}) is given for {} without `at:` saying where it holds, so it is taken as valid under different conditions; {size}{affected}. Give `at: {{ph, ionic_strength, temperature}}` (or species data) so it is moved to each compartment",
                    kj(copy.value_kj),
                    places.join(", ")
                ),
                evidence: ev,
            }
        })
        .collect()
}
