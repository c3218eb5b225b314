//! Energy-generating cycles (Fritzemeier et al., PLoS Comput. Biol. 13
//! (2017) e1005494): with every boundary reaction shut, the model must not be
//! able to regenerate ATP, reduced cofactors, acetyl-CoA or a proton gradient
//! from nothing.

use super::{evidence, Check};
use crate::analysis::Analysis;
use crate::finding::{Finding, Severity};

pub const CHECK: Check = Check {
    slug: "energy-cycles",
    title: "Energy-generating cycles",
    description: "With every boundary reaction shut, a dissipation reaction of each energy currency (ATP, GTP, NADH, NADPH, FADH2, quinols, acetyl-CoA, proton gradients, …) must not be able to carry flux.",
    kinds: &["energy-generating-cycle"],
    run,
};

fn run(analysis: &Analysis) -> Vec<Finding> {
    let Some(results) = &analysis.loops else {
        return Vec::new();
    };
    let Ok(cycles) = &results.energy_cycles else {
        // The failure is reported once, by the internal-loop check's
        // `loop-analysis-incomplete` when the loop analysis fails too; here
        // it would only repeat.
        return match &results.energy_cycles {
            Err(e) => vec![Finding {
                kind: "loop-analysis-incomplete".into(),
                severity: Severity::Warning,
                subjects: Vec::new(),
                scenario: None,
                message: format!("energy-generating cycles were not tested: {e}"),
                evidence: Default::default(),
            }],
            Ok(_) => Vec::new(),
        };
    };
    cycles
        .results
        .iter()
        .filter(|r| r.cycle_exists)
        .map(|r| {
            let equation = r.test.named_equation(analysis.model);
            let mut subjects = vec![format!("{} in {}", r.test.currency, r.test.compartment)];
            subjects.extend(r.example.iter().map(|m| m.reaction.clone()));
            let how = match r.example.as_slice() {
                [only] => format!(
                    "one reaction does it alone: {} run {} is exactly the reverse of the dissipation, so it undoes the dissipation with nothing else involved; its bounds should not allow that direction, or its equation lacks what pays for it",
                    only.reaction,
                    if only.coefficient > 0.0 { "forward" } else { "backward" },
                ),
                example => format!(
                    "an example uses {} reactions: {}",
                    example.len(),
                    example
                        .iter()
                        .map(|m| format!(
                            "{} {}",
                            m.reaction,
                            if m.coefficient > 0.0 { "forward" } else { "backward" }
                        ))
                        .collect::<Vec<_>>()
                        .join(", ")
                ),
            };
            Finding {
                kind: "energy-generating-cycle".into(),
                severity: Severity::Error,
                subjects,
                scenario: None,
                message: format!(
                    "the model regenerates {} in {} from nothing: with every boundary reaction shut, the dissipation {equation} can carry flux; {how}",
                    r.test.currency, r.test.compartment,
                ),
                evidence: evidence(&[("example_reactions", r.example.len() as f64)]),
            }
        })
        .collect()
}
