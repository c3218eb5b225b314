//! Values that loaded but are unlikely for a living cell, or bare numbers
//! whose default unit was probably not the one meant (`50` read as 50 M).
//! The loader accepts them, so without this check a unit slip would change
//! verdicts silently. The rules live in `project::plausibility`; this check
//! turns the located remarks into warnings.

use super::Check;
use crate::analysis::Analysis;
use crate::project::plausibility;
use crate::report::{Finding, Severity};

pub const CHECK: Check = Check {
    slug: "input-plausibility",
    title: "Plausibility of input values",
    description: "Concentrations outside 1 pM–1 M, temperatures outside 273–373 K, ionic strength above 0.5 M, membrane potentials beyond ±300 mV, pH outside 4–10, and bare numbers whose default unit looks like a slip; each with its file, line and column.",
    kinds: plausibility::KINDS,
    run,
};

fn run(analysis: &Analysis) -> Vec<Finding> {
    analysis
        .settings
        .input_remarks
        .iter()
        .map(|r| {
            let mut evidence = vec![("value", r.value)];
            if let Some(line) = r.line {
                evidence.push(("line", line as f64));
            }
            if let Some(column) = r.column {
                evidence.push(("column", column as f64));
            }
            Finding {
                kind: r.kind.to_string(),
                severity: Severity::Warning,
                subjects: r.subject.iter().cloned().collect(),
                scenario: None,
                message: format!(
                    "{}: {} — the analysis used the value as read; check the file",
                    r.location(),
                    r.message
                ),
                evidence: super::evidence(&evidence),
            }
        })
        .collect()
}
