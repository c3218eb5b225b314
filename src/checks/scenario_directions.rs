//! Flux scenarios against thermodynamics: every reaction carrying flux in a
//! scenario needs ΔG' < 0 in the direction of that flux.

use super::{copy_caveat, kj, range_evidence, Check};
use crate::analysis::Analysis;
use crate::finding::{Finding, Severity, Verdict};

pub const CHECK: Check = Check {
    slug: "scenario",
    title: "Scenario flux directions",
    description: "In each flux scenario, every active internal reaction must be able to run in the direction of its flux.",
    kinds: &["scenario-contradiction", "scenario-marginal"],
    run,
};

fn run(analysis: &Analysis) -> Vec<Finding> {
    let mut out = Vec::new();
    for scenario in &analysis.model.scenarios {
        for &(j, flux) in &scenario.fluxes {
            if !analysis.is_thermodynamic(j) {
                continue;
            }
            let r = &analysis.model.reactions[j];
            let direction = flux.signum();
            let Ok(t) = &analysis.reaction_thermo[j] else {
                continue;
            };
            let best = if direction > 0.0 {
                t.range.min
            } else {
                -t.range.max
            };
            let name = if direction > 0.0 {
                "forward"
            } else {
                "backward"
            };
            let allowance = analysis.sigma_multiplier * t.sigma_kj;
            let mut evidence = range_evidence(analysis, j);
            evidence.insert("flux".into(), flux);
            let (kind, severity, message) = match analysis.verdict(j, direction) {
                Verdict::Contradiction => (
                    "scenario-contradiction",
                    Severity::Error,
                    format!(
                        "carries {name} flux {flux} but ΔG' in that direction is at best {} (uncertainty allowance {}){}",
                        kj(best),
                        kj(allowance),
                        copy_caveat(analysis, j)
                    ),
                ),
                Verdict::Marginal => (
                    "scenario-marginal",
                    Severity::Warning,
                    format!(
                        "carries {name} flux {flux} with at best ΔG' = {}: feasible only near the concentration bounds or within the uncertainty ({}){}",
                        kj(best),
                        kj(allowance),
                        copy_caveat(analysis, j)
                    ),
                ),
                Verdict::AtEquilibrium => (
                    "scenario-marginal",
                    Severity::Warning,
                    format!(
                        "carries {name} flux {flux} but is at equilibrium as far as the data tell: its best ΔG' that way, {}, is 0 within the uncertainty allowance ({}), so no driving force can be shown{}",
                        kj(best),
                        kj(allowance),
                        copy_caveat(analysis, j)
                    ),
                ),
                _ => continue,
            };
            out.push(Finding {
                kind: kind.into(),
                severity,
                subjects: vec![r.id.clone()],
                scenario: Some(scenario.id.clone()),
                message,
                evidence,
            });
        }
    }
    out
}
