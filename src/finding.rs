//! What the checks produce and every output shows: a [`Finding`] with its
//! [`Severity`], and the [`Verdict`] on a flux direction. Its own module so
//! that analysis, checks and report depend on it rather than on each other
//! (re-exported from `report` where these types used to live).

use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;

#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Severity {
    Error,
    Warning,
    Note,
}

impl Severity {
    pub fn slug(self) -> &'static str {
        match self {
            Severity::Error => "error",
            Severity::Warning => "warning",
            Severity::Note => "note",
        }
    }
}

/// One problem found by a check.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Finding {
    /// Descriptive slug of the check kind, e.g. `direction-contradiction`.
    pub kind: String,
    pub severity: Severity,
    /// Ids of the reactions / metabolites / loops concerned (first = main).
    #[serde(default, skip_serializing_if = "crate::report::json::empty")]
    pub subjects: Vec<String>,
    /// Scenario id when the finding belongs to one flux scenario.
    #[serde(default, skip_serializing_if = "crate::report::json::none")]
    pub scenario: Option<String>,
    pub message: String,
    /// Named numbers backing the message (kJ/mol unless the name says else).
    #[serde(default, skip_serializing_if = "crate::report::json::empty_map")]
    pub evidence: BTreeMap<String, f64>,
}

/// Verdict on whether a flux direction is thermodynamically possible.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Verdict {
    /// Impossible for every allowed concentration even after the uncertainty allowance.
    Contradiction,
    /// Possible only near the concentration bounds or within the uncertainty.
    Marginal,
    /// The best achievable ΔG' in that direction is 0 within the allowance:
    /// no driving force can be shown (its own verdict, never "consistent").
    AtEquilibrium,
    Consistent,
    /// No ΔG'° available.
    NoData,
}

impl Verdict {
    pub fn slug(self) -> &'static str {
        match self {
            Verdict::Contradiction => "contradiction",
            Verdict::Marginal => "marginal",
            Verdict::AtEquilibrium => "at-equilibrium",
            Verdict::Consistent => "consistent",
            Verdict::NoData => "no-data",
        }
    }
}

/// Deterministic order: severity, kind, first subject, scenario, message.
pub fn sort_findings(findings: &mut [Finding]) {
    findings.sort_by(|a, b| {
        (a.severity, &a.kind, &a.subjects, &a.scenario, &a.message).cmp(&(
            b.severity,
            &b.kind,
            &b.subjects,
            &b.scenario,
            &b.message,
        ))
    });
}
