//! Plain-text listing of findings for the terminal (`gibbsite check`).

use super::{Finding, Report, Severity};
use crate::outcome::Outcome;
use std::fmt::Write;

/// The findings in groups of one severity and kind, most serious first,
/// each group headed by its count (`error infeasible-direction (2)`), then
/// the scenario verdicts, the counts, and the pass/fail line last.
pub fn grouped_text(report: &Report, outcome: &Outcome) -> String {
    let mut out = String::new();
    for ((severity, kind), findings) in groups(report) {
        let _ = writeln!(out, "{} {kind} ({})", severity.slug(), findings.len());
        for f in findings {
            let _ = writeln!(out, "  {}", finding_line(f));
        }
        out.push('\n');
    }
    out.push_str(&scenario_verdicts_text(report));
    let s = &report.summary;
    let kinds = s.by_kind.len();
    let _ = writeln!(
        out,
        "{} findings of {kinds} kind{}: {} errors, {} warnings, {} notes ({} reactions, {} metabolites, {} scenarios)",
        report.findings.len(),
        if kinds == 1 { "" } else { "s" },
        s.errors,
        s.warnings,
        s.notes,
        s.reactions,
        s.metabolites,
        s.scenarios
    );
    let _ = writeln!(out, "{}", outcome.line());
    out
}

/// Findings grouped by (severity, kind) in report order (severity, then kind).
pub fn groups(report: &Report) -> Vec<((Severity, &str), Vec<&Finding>)> {
    let mut groups: std::collections::BTreeMap<(Severity, &str), Vec<&Finding>> =
        Default::default();
    for f in &report.findings {
        groups
            .entry((f.severity, f.kind.as_str()))
            .or_default()
            .push(f);
    }
    groups.into_iter().collect()
}

/// `subject (scenario s): message`.
fn finding_line(f: &Finding) -> String {
    let subject = f.subjects.first().map(String::as_str).unwrap_or("-");
    match &f.scenario {
        Some(s) => format!("{subject} (scenario {s}): {}", f.message),
        None => format!("{subject}: {}", f.message),
    }
}

/// One line per finding: `error[kind] subject (scenario): message`.
pub fn findings_text(report: &Report) -> String {
    let mut out = String::new();
    for f in &report.findings {
        let subject = f.subjects.first().map(String::as_str).unwrap_or("-");
        let _ = write!(out, "{}[{}] {}", f.severity.slug(), f.kind, subject);
        if let Some(s) = &f.scenario {
            let _ = write!(out, " (scenario {s})");
        }
        let _ = writeln!(out, ": {}", f.message);
    }
    out
}

/// One line per scenario judged as a whole: `scenario <id>: feasible (…)`.
pub fn scenario_verdicts_text(report: &Report) -> String {
    let mut out = String::new();
    for s in &report.joint_scenarios {
        let _ = write!(
            out,
            "scenario {} as a whole: {}",
            s.id,
            s.verdict.replace('-', " ")
        );
        match (&s.reason, &s.mdf) {
            (Some(reason), _) => {
                let _ = write!(out, " ({reason})");
            }
            (None, Some(mdf)) => {
                let _ = write!(out, " (max-min driving force {:.2} kJ/mol", mdf.value_kj);
                if !s.conflicts.is_empty() {
                    let _ = write!(out, "; {} conflicting set(s)", s.conflicts.len());
                }
                let _ = write!(out, ")");
            }
            (None, None) => {
                let _ = write!(out, " (no active reaction with ΔG′ data)");
            }
        }
        if let Some(law) = &s.loop_law {
            if !law.loop_free && law.error.is_none() {
                let _ = write!(
                    out,
                    "; the flux carries {} internal cycle(s)",
                    law.cycles.len()
                );
            }
        }
        let _ = writeln!(out);
    }
    out
}
