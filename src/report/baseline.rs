//! Comparing a report with an earlier one, so CI fails only on findings that
//! are new since that baseline (identity: kind, subjects and scenario).

use super::sarif::fingerprint;
use super::{Finding, Report};
use crate::error::{Diagnostic, Error, Result};
use std::collections::HashSet;
use std::path::Path;

/// Read a `report.json` written by an earlier run.
pub fn load(path: &Path) -> Result<Report> {
    // Bounded and regular files only, like every other input.
    let text = crate::project::read::read_text(path).map_err(|d| {
        Error::input(Diagnostic::new(
            path,
            format!("cannot read baseline: {}", d.message),
        ))
    })?;
    super::json::from_json(&text).map_err(|e| {
        Error::input(
            Diagnostic::new(path, format!("not a gibbsite report.json: {e}"))
                .at(e.line(), e.column()),
        )
    })
}

/// A baseline must be a report of the same model (same model id): findings
/// of another model would all look new or fixed. `any_model` (the CLI's
/// `--baseline-any-model`) allows it on purpose, e.g. after a renaming.
pub fn check_model(report: &Report, baseline: &Report, path: &Path, any_model: bool) -> Result<()> {
    if any_model || baseline.project.model_id == report.project.model_id {
        return Ok(());
    }
    Err(Error::input(
        Diagnostic::new(
            path,
            format!(
                "the baseline is a report of model `{}`, but this run checks model `{}`",
                baseline.project.model_id, report.project.model_id
            ),
        )
        .hint(
            "use a report.json of the same model, or pass --baseline-any-model to compare anyway",
        ),
    ))
}

/// Findings of `report` that the baseline does not have.
pub fn new_findings<'a>(report: &'a Report, baseline: &Report) -> Vec<&'a Finding> {
    let known: HashSet<String> = baseline.findings.iter().map(fingerprint).collect();
    report
        .findings
        .iter()
        .filter(|f| !known.contains(&fingerprint(f)))
        .collect()
}
