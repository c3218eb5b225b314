//! Flux scenarios judged as a whole: can every active step run at once
//! (one set of concentrations, one value of every shared ΔG'° error), and
//! does the given flux carry internal cycles? The analysis is in
//! `crate::scenarios`; this check turns it into findings.

use super::{evidence, kj, Check};
use crate::analysis::Analysis;
use crate::finding::{Finding, Severity, Verdict};
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
                // A single step that is not consistent on its own is already
                // reported by the per-step checks (contradiction, marginal or
                // at equilibrium), with the severity those verdicts carry.
                if let [only] = set.steps[..] {
                    let step = &s.problem.steps[only];
                    if analysis.verdict(step.reaction, step.direction) != Verdict::Consistent {
                        continue;
                    }
                }
                // Impossible together (best overall ΔG' above zero even with
                // the allowances) is an error; able to run together only with
                // less than the minimum driving force is a warning, as the
                // per-step "marginal" is.
                let impossible = set.overall_kj > crate::scenarios::tolerance::SUBSTITUTION_KJ;
                let names: Vec<String> = reactions
                    .iter()
                    .map(|&j| reaction_id(analysis, j))
                    .collect();
                out.push(Finding {
                    kind: "scenario-infeasible".into(),
                    severity: if impossible {
                        Severity::Error
                    } else {
                        Severity::Warning
                    },
                    subjects: names.clone(),
                    scenario: Some(s.id.clone()),
                    message: if impossible {
                        format!(
                            "{} cannot all run at once in their flux directions: together their best ΔG' is {} (needs at most {}), though each may be possible alone",
                            names.join(", "),
                            signed_kj(set.overall_kj),
                            kj(set.required_kj)
                        )
                    } else {
                        format!(
                            "{} can run at once in their flux directions only with less than the minimum driving force: together their best ΔG' is {} (needs at most {})",
                            names.join(", "),
                            signed_kj(set.overall_kj),
                            kj(set.required_kj)
                        )
                    },
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
