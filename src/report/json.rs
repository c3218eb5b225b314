//! `report.json`: the Report as compact JSON, for CI and other tools.
//!
//! Compact: no indentation, and nothing repeated per row that the rest of
//! the file already says. Left out (and restored by [`from_json`]):
//!
//! - a participant's `slug` and `name` (the metabolite's, found by its id in
//!   `metabolites`), in reactions and in scenario conflicts;
//! - a loop member's `slug`, `name`, `equation` and `participants` (the
//!   reaction's, found by its id in `reactions`);
//! - a missing-ΔfG'° row's `slug`, `name`, `compartment`, `formula` and
//!   `xrefs` (the metabolite's; the slug is `slug::slug` of the id).
//!
//! The fields stay in the Report types (templates see them): they are left
//! out only when serialising to JSON, not when minijinja serialises the
//! report into template values.

use super::Report;
use std::collections::HashMap;

/// Whether a derivable field is left out: in JSON yes, in template values no.
pub(crate) fn left_out<T: ?Sized>(_: &T) -> bool {
    !minijinja::value::serializing_for_value()
}

/// Serialise the report. Float fields are finite by construction (checks
/// drop non-finite evidence), so serialisation cannot fail on them.
pub fn to_json(report: &Report) -> String {
    let mut text = serde_json::to_string(report).expect("Report contains only serialisable data");
    text.push('\n');
    text
}

/// Read a `report.json` written by [`to_json`] (or by an earlier version
/// that wrote every field) and restore the full report.
pub fn from_json(text: &str) -> serde_json::Result<Report> {
    let mut report: Report = serde_json::from_str(text)?;
    restore(&mut report);
    Ok(report)
}

/// Fills in the fields [`to_json`] leaves out, where they are empty.
pub fn restore(report: &mut Report) {
    let metabolites: HashMap<&str, &super::MetaboliteView> = report
        .metabolites
        .iter()
        .map(|m| (m.id.as_str(), m))
        .collect();
    let fill_participants = |participants: &mut [super::ParticipantView]| {
        for p in participants {
            if let Some(m) = metabolites.get(p.metabolite.as_str()) {
                if p.slug.is_empty() {
                    p.slug.clone_from(&m.slug);
                }
                if p.name.is_empty() {
                    p.name.clone_from(&m.name);
                }
            }
        }
    };
    for r in &mut report.reactions {
        fill_participants(&mut r.participants);
    }
    for s in &mut report.joint_scenarios {
        for c in &mut s.conflicts {
            for m in &mut c.members {
                fill_participants(&mut m.participants);
            }
        }
    }
    if let Some(coverage) = &mut report.coverage {
        for row in &mut coverage.missing {
            let Some(m) = metabolites.get(row.metabolite.as_str()) else {
                continue;
            };
            if row.slug.is_empty() {
                row.slug = crate::slug::slug(&row.metabolite);
            }
            if row.name.is_empty() {
                row.name.clone_from(&m.name);
            }
            if row.compartment.is_empty() {
                row.compartment.clone_from(&m.compartment);
            }
            if row.formula.is_none() {
                row.formula.clone_from(&m.formula);
            }
            if row.xrefs.is_empty() {
                row.xrefs.clone_from(&m.xrefs);
            }
        }
    }
    let reactions: HashMap<&str, &super::ReactionView> = report
        .reactions
        .iter()
        .map(|r| (r.id.as_str(), r))
        .collect();
    for l in report.loops.iter_mut().flat_map(|l| &mut l.loops) {
        for member in &mut l.members {
            let Some(r) = reactions.get(member.reaction.as_str()) else {
                continue;
            };
            if member.slug.is_empty() {
                member.slug.clone_from(&r.slug);
            }
            if member.name.is_empty() {
                member.name.clone_from(&r.name);
            }
            if member.equation.is_empty() {
                member.equation.clone_from(&r.equation);
            }
            if member.participants.is_empty() {
                member.participants.clone_from(&r.participants);
            }
        }
    }
}
