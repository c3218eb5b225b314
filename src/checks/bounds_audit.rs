//! Audit of declared flux bounds against thermodynamics: a direction the
//! bounds allow but ΔG' forbids at every allowed concentration is an error;
//! an allowed direction that is only marginally feasible is a warning; a
//! reversible reaction whose ΔG' never changes sign is a note (it could be
//! declared irreversible).

use super::{copy_caveat, kj, range_evidence, Check};
use crate::analysis::Analysis;
use crate::finding::{Finding, Severity, Verdict};

pub const CHECK: Check = Check {
    slug: "bounds",
    title: "Declared directions",
    description: "Each direction the flux bounds allow must be possible for some allowed concentrations (ΔG' < 0 in that direction).",
    kinds: &["infeasible-direction", "marginal-direction", "one-way-reversible"],
    run,
};

fn run(analysis: &Analysis) -> Vec<Finding> {
    let mut out = Vec::new();
    for (j, r) in analysis.model.reactions.iter().enumerate() {
        let Ok(t) = &analysis.reaction_thermo[j] else {
            continue;
        };
        if !analysis.is_thermodynamic(j) {
            continue;
        }
        let allowance = analysis.sigma_multiplier * t.sigma_kj;
        for (direction, allowed, name) in [
            (1.0, r.allows_forward(), "forward"),
            (-1.0, r.allows_backward(), "backward"),
        ] {
            if !allowed {
                continue;
            }
            let best = if direction > 0.0 {
                t.range.min
            } else {
                -t.range.max
            };
            match analysis.verdict(j, direction) {
                // For a reversible reaction an impossible direction is the
                // `one-way-reversible` note below, not an error.
                Verdict::Contradiction if !r.is_reversible() => out.push(Finding {
                    kind: "infeasible-direction".into(),
                    severity: Severity::Error,
                    subjects: vec![r.id.clone()],
                    scenario: None,
                    message: format!(
                        "bounds allow {name} flux, but ΔG' in that direction stays at or above {} for every allowed concentration (uncertainty allowance {}){}",
                        kj(best),
                        kj(allowance),
                        copy_caveat(analysis, j)
                    ),
                    evidence: range_evidence(analysis, j),
                }),
                Verdict::Marginal if !r.is_reversible() => out.push(Finding {
                    kind: "marginal-direction".into(),
                    severity: Severity::Warning,
                    subjects: vec![r.id.clone()],
                    scenario: None,
                    message: format!(
                        "the only allowed direction ({name}) has at best ΔG' = {}, within the uncertainty allowance ({}) plus the minimum driving force{}",
                        kj(best),
                        kj(allowance),
                        copy_caveat(analysis, j)
                    ),
                    evidence: range_evidence(analysis, j),
                }),
                Verdict::AtEquilibrium if !r.is_reversible() => out.push(Finding {
                    kind: "marginal-direction".into(),
                    severity: Severity::Warning,
                    subjects: vec![r.id.clone()],
                    scenario: None,
                    message: format!(
                        "the only allowed direction ({name}) is at equilibrium as far as the data tell: its best ΔG', {}, is 0 within the uncertainty allowance ({}){}",
                        kj(best),
                        kj(allowance),
                        copy_caveat(analysis, j)
                    ),
                    evidence: range_evidence(analysis, j),
                }),
                _ => {}
            }
        }
        if r.is_reversible() {
            let never_backward = t.range.min > allowance;
            let never_forward = t.range.max < -allowance;
            if never_backward || never_forward {
                let way = if never_forward { "forward" } else { "backward" };
                out.push(Finding {
                    kind: "one-way-reversible".into(),
                    severity: Severity::Note,
                    subjects: vec![r.id.clone()],
                    scenario: None,
                    message: format!(
                        "declared reversible, but ΔG' ranges from {} to {}: it can only run {way}; consider constraining its bounds{}",
                        kj(t.range.min),
                        kj(t.range.max),
                        copy_caveat(analysis, j)
                    ),
                    evidence: range_evidence(analysis, j),
                });
            }
        }
    }
    out
}
