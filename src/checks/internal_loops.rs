//! Internal loops: sets of reactions that can carry flux with every
//! exchange, demand, sink and biomass reaction shut. Around a loop the net
//! reaction is nothing, so no real cell can run it; flux-balance solutions
//! still may. Each elementary loop is a warning naming the member best
//! constrained; ΔrG'° data that do not add up to zero around a loop are an
//! error (inconsistent cycle energies).

use super::{evidence, kj, Check};
use crate::analysis::Analysis;
use crate::finding::{Finding, Severity};

pub const CHECK: Check = Check {
    slug: "loops",
    title: "Internal loops",
    description: "With every boundary reaction shut, no set of reactions may carry flux; ΔrG'° around any cycle must add up to zero.",
    kinds: &[
        "internal-loop",
        "inconsistent-cycle-energy",
        "forced-flux",
        "loop-analysis-incomplete",
    ],
    run,
};

fn run(analysis: &Analysis) -> Vec<Finding> {
    let Some(results) = &analysis.loops else {
        return Vec::new();
    };
    let mut out = Vec::new();
    let found = match &results.loops {
        Ok(found) => found,
        Err(e) => {
            out.push(incomplete(format!("the loop analysis did not finish: {e}")));
            return out;
        }
    };
    for relaxed in &found.closure.relaxed_bounds {
        out.push(Finding {
            kind: "forced-flux".into(),
            severity: Severity::Note,
            subjects: vec![relaxed.reaction.clone()],
            scenario: None,
            message: format!(
                "bounds [{}, {}] force flux; the loop search relaxed them to [{}, {}]",
                relaxed.lower_bound,
                relaxed.upper_bound,
                relaxed.relaxed_lower_bound,
                relaxed.relaxed_upper_bound
            ),
            evidence: evidence(&[
                ("lower_bound", relaxed.lower_bound),
                ("upper_bound", relaxed.upper_bound),
            ]),
        });
    }
    if found.loops_truncated {
        out.push(incomplete(format!(
            "only the first {} elementary loops are listed; {} loop-capable reactions are in none of them",
            found.loops.len(),
            found.uncovered_reactions.len()
        )));
    }
    for problem in &found.problems {
        out.push(incomplete(problem.clone()));
    }
    let energies = results.energies.as_ref().ok();
    if let Err(e) = &results.energies {
        out.push(incomplete(format!("loop energies were not assessed: {e}")));
    }
    for (k, cycle) in found.loops.iter().enumerate() {
        let energy = energies
            .and_then(|es| es.get(k))
            .filter(|e| e.loop_id == cycle.id);
        let mut subjects = vec![cycle.id.clone()];
        subjects.extend(cycle.members.iter().map(|m| m.reaction.clone()));
        let members: Vec<String> = cycle
            .members
            .iter()
            .map(|m| {
                let way = if m.coefficient > 0.0 {
                    ""
                } else {
                    " (backward)"
                };
                let times = if m.coefficient.abs() == 1.0 {
                    String::new()
                } else {
                    format!("{} × ", m.coefficient.abs())
                };
                format!("{times}{}{way}", m.reaction)
            })
            .collect();
        let mut message = format!(
            "{} reactions form a loop that can carry flux with every boundary reaction shut: {}",
            cycle.members.len(),
            members.join(", ")
        );
        let mut ev = evidence(&[("members", cycle.members.len() as f64)]);
        if let Some(c) = energy.and_then(|e| e.constrain.as_ref()) {
            // The ΔG'_min compared is net of the k·σ allowance: say so and
            // give the number before and after.
            let allowance = analysis.reaction_thermo[c.index]
                .as_ref()
                .map_or(0.0, |t| analysis.sigma_multiplier * t.sigma_kj);
            message.push_str(&format!(
                "; least plausible step: {} {} (ΔG' that way at least {} over the allowed concentrations; {} after subtracting the uncertainty allowance {})",
                c.reaction,
                c.forbid,
                kj(c.dg_min_in_loop_direction_kj + allowance),
                kj(c.dg_min_in_loop_direction_kj),
                kj(allowance)
            ));
            ev.insert("allowance_of_suggested".into(), allowance);
            match c.rechecked.as_ref().map(|r| r.breaks_loop) {
                Some(true) => message.push_str(", and forbidding that direction breaks the loop"),
                Some(false) => message
                    .push_str(", but forbidding that direction alone does not break the loop"),
                None => {}
            }
            ev.insert("dg_min_of_suggested".into(), c.dg_min_in_loop_direction_kj);
        }
        if let Some(e) = energy {
            if e.members_without_data.is_empty() {
                ev.insert("drg0_sum".into(), e.sum_kj);
                ev.insert("sigma".into(), e.sigma_kj);
            }
        }
        out.push(Finding {
            kind: "internal-loop".into(),
            severity: Severity::Warning,
            subjects: subjects.clone(),
            scenario: None,
            message,
            evidence: ev,
        });
        if let Some(e) = energy.filter(|e| e.inconsistent) {
            out.push(Finding {
                kind: "inconsistent-cycle-energy".into(),
                severity: Severity::Error,
                subjects,
                scenario: None,
                message: format!(
                    "ΔrG'° around {} adds up to {} instead of 0, more than the allowance {} ({:.2} × σ {}; {:.1} σ off): the reaction energies of this cycle contradict each other",
                    cycle.id,
                    kj(e.sum_kj),
                    kj(analysis.sigma_multiplier * e.sigma_kj),
                    analysis.sigma_multiplier,
                    kj(e.sigma_kj),
                    e.deviation_sigmas.unwrap_or(f64::INFINITY)
                ),
                evidence: evidence(&[
                    ("drg0_sum", e.sum_kj),
                    ("sigma", e.sigma_kj),
                    ("allowance", analysis.sigma_multiplier * e.sigma_kj),
                ]),
            });
        }
    }
    out
}

fn incomplete(message: String) -> Finding {
    Finding {
        kind: "loop-analysis-incomplete".into(),
        severity: Severity::Warning,
        subjects: Vec::new(),
        scenario: None,
        message,
        evidence: Default::default(),
    }
}
