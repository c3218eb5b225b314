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
//!   `xrefs` (the metabolite's; the slug is `slug::slug` of the id);
//! - a reaction's `equation` (written again from its participants and
//!   bounds, as `report::build::equation_text` writes it) and `loops` (the
//!   listed loops it is a member of);
//! - a metabolite's `consumed_by` and `produced_by` (the reactions whose
//!   participants consume / produce it, in report order);
//! - a loop member's `drg0_kj` and `sigma_kj` (its reaction's `drg_prime`);
//! - a page name (`slug`) equal to the id, which is every slug without the
//!   `-<8 hex>` suffix `slug::slug` adds when it changes an id;
//! - ΔrG'° `source` of the transport rule (`thermo::transport_only::SOURCE`,
//!   restored where `energy_origin` is `transport-rule`);
//! - every field at its default: `null`, `false`, `""`, `[]`, `{}`.
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

/// A field at its default (`None`, `false`, empty) left out of JSON.
pub(crate) fn none<T>(value: &Option<T>) -> bool {
    value.is_none() && left_out(value)
}

pub(crate) fn empty<T>(value: &[T]) -> bool {
    value.is_empty() && left_out(value)
}

pub(crate) fn empty_text(value: &str) -> bool {
    value.is_empty() && left_out(value)
}

pub(crate) fn empty_map<K, V>(value: &std::collections::BTreeMap<K, V>) -> bool {
    value.is_empty() && left_out(value)
}

pub(crate) fn is_false(value: &bool) -> bool {
    !*value && left_out(value)
}

/// A page name equal to its id: `slug::slug` appends `-<8 hex>` whenever
/// it changes an id (and `slug::unique_slugs` when it disambiguates), so a
/// slug without that suffix is the id itself.
pub(crate) fn plain_slug(slug: &str) -> bool {
    left_out(slug) && !has_hash_suffix(slug)
}

fn has_hash_suffix(slug: &str) -> bool {
    let bytes = slug.as_bytes();
    bytes.len() >= 9
        && bytes[bytes.len() - 9] == b'-'
        && bytes[bytes.len() - 8..]
            .iter()
            .all(|b| b.is_ascii_digit() || (b'a'..=b'f').contains(b))
}

/// The source sentence every transport-rule ΔrG'° shares.
pub(crate) fn transport_source(source: &str) -> bool {
    left_out(source) && source == crate::thermo::transport_only::SOURCE
}

/// Serialise the report. Float fields are finite by construction (checks
/// drop non-finite evidence), so serialisation cannot fail on them.
pub fn to_json(report: &Report) -> String {
    let mut text = serde_json::to_string(report).expect("Report contains only serialisable data");
    text.push('\n');
    text
}

/// Write the report as [`to_json`] does, straight into `out` (no copy of
/// the whole text in memory; give a buffered writer).
pub fn write_json(report: &Report, mut out: impl std::io::Write) -> std::io::Result<()> {
    serde_json::to_writer(&mut out, report).map_err(std::io::Error::from)?;
    out.write_all(b"\n")
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
    for r in &mut report.reactions {
        if r.slug.is_empty() {
            r.slug.clone_from(&r.id);
        }
        if r.equation.is_empty() {
            r.equation = equation_text(&r.participants, r.lower_bound, r.upper_bound);
        }
        if let Some(e) = &mut r.drg_prime {
            if e.source.is_empty() && r.energy_origin.as_deref() == Some("transport-rule") {
                e.source = crate::thermo::transport_only::SOURCE.to_string();
            }
        }
    }
    for m in &mut report.metabolites {
        if m.slug.is_empty() {
            m.slug.clone_from(&m.id);
        }
    }
    restore_uses(report);
    restore_loop_lists(report);
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
    let Some(loops) = &mut report.loops else {
        return;
    };
    // A page name left out is the id itself (see `plain_slug`).
    for c in &mut loops.capable {
        if c.slug.is_empty() {
            c.slug.clone_from(&c.reaction);
        }
    }
    for b in &mut loops.relaxed_bounds {
        if b.slug.is_empty() {
            b.slug.clone_from(&b.reaction);
        }
    }
    let members = loops
        .loops
        .iter_mut()
        .flat_map(|l| {
            for c in [&mut l.constrain, &mut l.constrain_reversed]
                .into_iter()
                .flatten()
            {
                if c.slug.is_empty() {
                    c.slug.clone_from(&c.reaction);
                }
            }
            &mut l.members
        })
        .chain(loops.energy_cycles.iter_mut().flat_map(|c| &mut c.example));
    for member in members {
        let Some(r) = reactions.get(member.reaction.as_str()) else {
            continue;
        };
        if member.drg0_kj.is_none() && member.sigma_kj.is_none() {
            if let Some(e) = &r.drg_prime {
                member.drg0_kj = Some(e.value_kj);
                member.sigma_kj = Some(e.sigma_kj);
            }
        }
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

/// `2 a + b -> c` from the participants in their order, with the arrow the
/// bounds allow: the text `report::build::equation_text` writes.
fn equation_text(participants: &[super::ParticipantView], lower: f64, upper: f64) -> String {
    let terms: Vec<(f64, &str)> = participants
        .iter()
        .map(|p| (p.coefficient, p.metabolite.as_str()))
        .collect();
    super::build::equation_from_terms(&terms, upper > 0.0, lower < 0.0)
}

/// A metabolite's `consumed_by` / `produced_by` from the participants of
/// every reaction (negative coefficient: consumed), filled only where both
/// are empty.
fn restore_uses(report: &mut Report) {
    let mut index: HashMap<&str, usize> = HashMap::new();
    for (i, m) in report.metabolites.iter().enumerate() {
        if m.consumed_by.is_empty() && m.produced_by.is_empty() {
            index.insert(m.id.as_str(), i);
        }
    }
    if index.is_empty() {
        return;
    }
    let mut uses: Vec<(Vec<String>, Vec<String>)> =
        vec![Default::default(); report.metabolites.len()];
    for r in &report.reactions {
        for p in &r.participants {
            if let Some(&i) = index.get(p.metabolite.as_str()) {
                let list = if p.coefficient < 0.0 {
                    &mut uses[i].0
                } else {
                    &mut uses[i].1
                };
                list.push(r.id.clone());
            }
        }
    }
    for (m, (consumed, produced)) in report.metabolites.iter_mut().zip(uses) {
        if m.consumed_by.is_empty() && m.produced_by.is_empty() {
            m.consumed_by = consumed;
            m.produced_by = produced;
        }
    }
}

/// Each reaction's `loops`: the listed loops it is a member of, in list
/// order (filled only where no reaction has any).
fn restore_loop_lists(report: &mut Report) {
    let Some(loops) = &report.loops else {
        return;
    };
    if report.reactions.iter().any(|r| !r.loops.is_empty()) {
        return;
    }
    let index = report.reaction_positions();
    let mut lists: Vec<Vec<String>> = vec![Vec::new(); report.reactions.len()];
    for l in &loops.loops {
        let mut seen = std::collections::HashSet::new();
        for m in &l.members {
            if let Some(&j) = index.get(m.reaction.as_str()) {
                if seen.insert(j) {
                    lists[j].push(l.id.clone());
                }
            }
        }
    }
    for (r, list) in report.reactions.iter_mut().zip(lists) {
        r.loops = list;
    }
}
