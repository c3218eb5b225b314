//! Plain-text listing of findings for the terminal (`gibbsite check`).

use super::Report;
use std::fmt::Write;

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
