//! Flux scenarios judged as a whole: can every active step run at once
//! (one set of concentrations, one value of every shared ΔG'° error), and
//! does the given flux carry internal cycles? The analysis is in
//! `crate::scenarios`; this check turns it into findings.

use super::{evidence, kj, Check};
use crate::analysis::Analysis;
use crate::report::{Finding, Severity, Verdict};
use crate::scenarios::{JointOutcome, ScenarioResult};

pub const CHECK: Check = Check {
    slug: "scenario-joint",
    title: "Scenarios as a whole",
    description: "All active steps of a scenario (and the model's irreversible directions) must be able to run at once on one set of concentrations; a given flux must carry no internal cycle.",
    kinds: &[
        "scenario-infeasible",
        "scenario-not-decided",
        "scenario-internal-cycle",
    ],
    run,
};

fn run(analysis: &Analysis) -> Vec<Finding> {
    let mut out = Vec::new();
    for s in &analysis.scenarios {
        joint_findings(analysis, s, &mut out);
        cycle_findings(analysis, s, &mut out);
    }
    out
}

fn reaction_id(analysis: &Analysis, j: usize) -> String {
    analysis.model.reactions[j].id.clone()
}

fn joint_findings(analysis: &Analysis, s: &ScenarioResult, out: &mut Vec<Finding>) {
    match &s.outcome {
        Err(e) => out.push(Finding {
            kind: "scenario-not-decided".into(),
            severity: Severity::Warning,
            subjects: vec![s.id.clone()],
            scenario: Some(s.id.clone()),
            message: format!("the joint feasibility of this scenario was not decided: {e}"),
            evidence: Default::default(),
        }),
        Ok(JointOutcome::Infeasible { conflicts, mdf, .. }) => {
            for set in conflicts {
                let reactions: Vec<usize> = set
                    .steps
                    .iter()
                    .map(|&k| s.problem.steps[k].reaction)
                    .collect();
                // A single step that is a contradiction on its own is already
                // reported by the per-step checks.
                if let [only] = set.steps[..] {
                    let step = &s.problem.steps[only];
                    if analysis.verdict(step.reaction, step.direction) == Verdict::Contradiction {
                        continue;
                    }
                }
                let names: Vec<String> = reactions
                    .iter()
                    .map(|&j| reaction_id(analysis, j))
                    .collect();
                out.push(Finding {
                    kind: "scenario-infeasible".into(),
                    severity: Severity::Error,
                    subjects: names.clone(),
                    scenario: Some(s.id.clone()),
                    message: format!(
                        "{} cannot all run at once in their flux directions: together their best ΔG' is {} (needs at most {}), though each may be possible alone",
                        names.join(", "),
                        signed_kj(set.overall_kj),
                        kj(set.required_kj)
                    ),
                    evidence: evidence(&[
                        ("overall_dg", set.overall_kj),
                        ("required_dg", set.required_kj),
                        ("max_min_driving_force", mdf.value_kj),
                        ("set_size", set.steps.len() as f64),
                    ]),
                });
            }
        }
        Ok(JointOutcome::Feasible(_)) => {}
    }
}

fn cycle_findings(analysis: &Analysis, s: &ScenarioResult, out: &mut Vec<Finding>) {
    match &s.loop_law {
        None => {}
        Some(Err(e)) => out.push(Finding {
            kind: "scenario-not-decided".into(),
            severity: Severity::Warning,
            subjects: vec![s.id.clone()],
            scenario: Some(s.id.clone()),
            message: format!("the loop law on this scenario's flux was not decided: {e}"),
            evidence: Default::default(),
        }),
        Some(Ok(result)) => {
            for cycle in &result.cycles {
                let names: Vec<String> = cycle
                    .members
                    .iter()
                    .map(|&(j, _)| reaction_id(analysis, j))
                    .collect();
                out.push(Finding {
                    kind: "scenario-internal-cycle".into(),
                    severity: Severity::Warning,
                    subjects: names.clone(),
                    scenario: Some(s.id.clone()),
                    message: format!(
                        "the flux carries an internal cycle through {} ({} flux units around it); no potentials can drive it, a loop-free flux with the same exchanges is on the scenario page",
                        names.join(", "),
                        (cycle.flux * 1e6).round() / 1e6
                    ),
                    evidence: evidence(&[("cycle_flux", cycle.flux)]),
                });
            }
        }
    }
}

/// "+7.17 kJ/mol" / "−2.00 kJ/mol": the sign matters for an overall ΔG'.
fn signed_kj(value: f64) -> String {
    if value > 0.005 {
        format!("+{}", kj(value))
    } else {
        kj(value)
    }
}
