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
