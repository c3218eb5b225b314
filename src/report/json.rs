//! `report.json`: the Report as pretty-printed JSON, for CI and other tools.

use super::Report;

/// Serialise the report. Float fields are finite by construction (checks
/// drop non-finite evidence), so serialisation cannot fail on them.
pub fn to_json(report: &Report) -> String {
    let mut text =
        serde_json::to_string_pretty(report).expect("Report contains only serialisable data");
    text.push('\n');
    text
}
