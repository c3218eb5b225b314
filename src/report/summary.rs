//! A short Markdown summary for CI job pages and pull-request comments.

use super::{Report, Severity};
use std::fmt::Write;

/// Counts, the error and warning findings (at most `limit`), and the caution.
pub fn to_markdown(report: &Report, limit: usize) -> String {
    let s = &report.summary;
    let mut out = String::new();
    let _ = writeln!(out, "## gibbsite: {}\n", cell(&report.project.title));
    let _ = writeln!(
        out,
        "**{} errors, {} warnings, {} notes** — {} reactions ({} internal, {} with ΔrG'°), {} metabolites, {} scenarios.\n",
        s.errors, s.warnings, s.notes, s.reactions, s.internal_reactions, s.reactions_with_energy, s.metabolites, s.scenarios
    );
    let shown: Vec<_> = report
        .findings
        .iter()
        .filter(|f| f.severity != Severity::Note)
        .collect();
    if !shown.is_empty() {
        out.push_str("| severity | kind | subject | scenario | message |\n|---|---|---|---|---|\n");
        for f in shown.iter().take(limit) {
            let _ = writeln!(
                out,
                "| {} | `{}` | {} | {} | {} |",
                f.severity.slug(),
                f.kind,
                cell(f.subjects.first().map(String::as_str).unwrap_or("")),
                cell(f.scenario.as_deref().unwrap_or("")),
                cell(&f.message)
            );
        }
        if shown.len() > limit {
            let _ = writeln!(out, "\n… and {} more in the report.", shown.len() - limit);
        }
        out.push('\n');
    }
    let _ = writeln!(out, "> {}", cell(&report.project.caution));
    out
}

/// Model text inside a Markdown table cell: no pipes, no line breaks, no
/// HTML (angle brackets become entities).
fn cell(text: &str) -> String {
    text.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('|', "\\|")
        .replace(['\n', '\r'], " ")
}
