//! One page per energy-generating cycle (`loops/cycle-<currency>-<compartment>.html`):
//! the dissipation as an equation of names, the trivial case (one reaction
//! that is the dissipation reversed) in words, the example flux, a network
//! map of its reactions and the findings naming it.

use super::{map, Page};
use crate::report::{EnergyCycleView, Report};
use minijinja::context;
use minijinja::value::Value;
use std::collections::BTreeMap;

/// How the energy-cycle check names a cycle among a finding's subjects.
pub fn subject(cycle: &EnergyCycleView) -> String {
    format!("{} in {}", cycle.currency, cycle.compartment)
}

/// Page name of a cycle: the report's slug, sanitised again (the report
/// may come from elsewhere than our own analysis).
pub fn page_name(cycle: &EnergyCycleView) -> String {
    crate::slug::slug(&cycle.slug)
}

/// The cycles that exist (and so have a page), in report order.
pub fn cycles(report: &Report) -> impl Iterator<Item = &EnergyCycleView> {
    report
        .loops
        .iter()
        .flat_map(|l| &l.energy_cycles)
        .filter(|c| c.cycle_exists && !c.slug.is_empty())
}

/// Subject text ("atp in c") → page name, for the findings' links.
pub fn subject_pages(report: &Report) -> BTreeMap<String, String> {
    cycles(report).map(|c| (subject(c), page_name(c))).collect()
}

/// The page of one cycle that exists.
pub(super) fn page(
    report: &Report,
    c: &EnergyCycleView,
    maps: &map::MapContext<'_>,
    page: &dyn Fn(&'static str, String, &str, &str, Value) -> Page,
    findings_of: &dyn Fn(Option<&Vec<usize>>) -> Value,
) -> Page {
    let subject = subject(c);
    let indices: Vec<usize> = report
        .findings
        .iter()
        .enumerate()
        .filter(|(_, f)| f.subjects.contains(&subject))
        .map(|(i, _)| i)
        .collect();
    let members: Vec<&str> = c.example.iter().map(|m| m.reaction.as_str()).collect();
    let network_map = map::reaction_set_map(
        maps,
        &format!("Reactions of the {subject} energy-generating cycle"),
        &members,
        None,
    );
    page(
        "energy_cycle.html",
        format!("loops/{}.html", page_name(c)),
        "loops",
        &format!("Energy-generating cycle: {subject}"),
        context! {
            item => Value::from_serialize(c),
            findings => findings_of(Some(&indices)),
            network_map => network_map.map(Value::from_safe_string),
            cycle_reactions => members.len(),
        },
    )
}
