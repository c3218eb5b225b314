//! Internal reactions without any ΔrG'°: they cannot be judged, so the
//! report says which formation energies are missing.

use super::Check;
use crate::analysis::Analysis;
use crate::finding::{Finding, Severity};

pub const CHECK: Check = Check {
    slug: "no-energy",
    title: "Data coverage",
    description: "Internal reactions lacking a ΔrG'° (given, or from the formation energies of all participants) cannot be judged.",
    kinds: &["no-energy-data"],
    run,
};

/// Above this many reactions without data, one summary note replaces the
/// per-reaction notes (each reaction page still lists what it lacks).
const SUMMARY_ABOVE: usize = 25;

fn run(analysis: &Analysis) -> Vec<Finding> {
    let out = per_reaction(analysis);
    if out.len() <= SUMMARY_ABOVE {
        return out;
    }
    // Which formation energies would unlock the most reactions?
    let mut counts: std::collections::BTreeMap<&str, usize> = Default::default();
    for f in &out {
        for m in &f.subjects[1..] {
            *counts.entry(m.as_str()).or_default() += 1;
        }
    }
    let mut ranked: Vec<(&str, usize)> = counts.into_iter().collect();
    ranked.sort_by(|a, b| b.1.cmp(&a.1).then(a.0.cmp(b.0)));
    ranked.truncate(10);
    let internal = (0..analysis.model.reactions.len())
        .filter(|&j| analysis.is_thermodynamic(j))
        .count();
    vec![Finding {
        kind: "no-energy-data".into(),
        severity: Severity::Note,
        subjects: ranked.iter().map(|(m, _)| m.to_string()).collect(),
        scenario: None,
        message: format!(
            "{} of {internal} internal reactions have no ΔrG'° and cannot be judged; the formation energies missing most often are {}",
            out.len(),
            ranked
                .iter()
                .map(|(m, n)| format!("`{m}` ({n} reactions)"))
                .collect::<Vec<_>>()
                .join(", ")
        ),
        evidence: super::evidence(&[
            ("reactions_without_energy", out.len() as f64),
            ("internal_reactions", internal as f64),
        ]),
    }]
}

fn per_reaction(analysis: &Analysis) -> Vec<Finding> {
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
            message: missing_message(&ids, &missing.reasons),
            evidence: super::evidence(&[("missing_metabolites", ids.len() as f64)]),
        });
    }
    out
}

/// Why there is no ΔrG'°: the metabolites without ΔfG'°, and/or the other
/// reasons (e.g. a membrane step without formulas); never an empty list.
fn missing_message(ids: &[String], reasons: &[String]) -> String {
    let mut parts = Vec::new();
    if !ids.is_empty() {
        parts.push(format!(
            "no formation energy for {}",
            ids.iter()
                .map(|s| format!("`{s}`"))
                .collect::<Vec<_>>()
                .join(", ")
        ));
    }
    parts.extend(reasons.iter().cloned());
    if parts.is_empty() {
        parts.push("its energy could not be computed".to_string());
    }
    format!(
        "no ΔrG'°: no reaction energy given, and {}",
        parts.join("; ")
    )
}

#[cfg(test)]
mod tests {
    use super::missing_message;

    #[test]
    fn message_never_lists_nothing() {
        let reason = "`x` crosses a membrane but has no formula and charge to count the H and charge it carries".to_string();
        let m = missing_message(&[], std::slice::from_ref(&reason));
        assert!(!m.contains("no formation energy for"), "{m}");
        assert!(m.ends_with(&reason), "{m}");
        let m = missing_message(&["a".into(), "b".into()], &[]);
        assert_eq!(
            m,
            "no ΔrG'°: no reaction energy given, and no formation energy for `a`, `b`"
        );
    }
}
