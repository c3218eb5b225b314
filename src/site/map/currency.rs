//! Which metabolites a map draws as small side labels on their reactions
//! instead of as nodes: water, H+, ATP/ADP, NAD(P)(H), CoA, Pi, PPi, CO2,
//! NH4+, O2 and every other compound that would turn into a hub.
//!
//! A metabolite is a side compound when, in this order:
//! 1. the project's `map_main` list names it → never (drawn as a node);
//! 2. the project's `map_side` list names it → always;
//! 3. the model marks it as the proton or water of its compartment;
//! 4. the currency recognition of the loop analysis
//!    ([`crate::loops::compound_key`]: BiGG-style id base or KEGG/ChEBI
//!    cross reference) knows it, except acetate and acetyl-CoA, which are
//!    main metabolites of pathways;
//! 5. its id base is one of [`EXTRA_BASES`] (small inorganic side products
//!    the loop analysis has no use for);
//! 6. it takes part in at least [`HUB_DEGREE`] reactions of the model.

use crate::report::{MetaboliteView, Report};
use std::collections::BTreeSet;

/// Reactions a metabolite must take part in to count as a hub. Chosen so
/// that on the genome-scale models in ../shared/models pathway
/// intermediates (glutamate, pyruvate: 10–19 reactions per compartment)
/// stay nodes while cofactors go to the side (common practice: a fixed
/// degree cut, not a published value).
pub const HUB_DEGREE: usize = 20;

/// Id bases (after the `M_` prefix and the compartment suffix) of side
/// compounds not among the currencies of the loop analysis.
pub const EXTRA_BASES: &[&str] = &["ppi", "co2", "nh4", "nh3", "o2", "hco3", "h2o2", "so4"];

/// Currency keys of the loop analysis that are main metabolites on a map.
const KEPT_KEYS: &[&str] = &["ac", "accoa"];

/// Ids of the side compounds of `report`.
pub fn side_compounds(report: &Report) -> BTreeSet<String> {
    let main: BTreeSet<&str> = report.project.map_main.iter().map(String::as_str).collect();
    let side: BTreeSet<&str> = report.project.map_side.iter().map(String::as_str).collect();
    report
        .metabolites
        .iter()
        .filter(|m| !main.contains(m.id.as_str()))
        .filter(|m| side.contains(m.id.as_str()) || is_side(m))
        .map(|m| m.id.clone())
        .collect()
}

/// The automatic rules 3–6 for one metabolite.
fn is_side(m: &MetaboliteView) -> bool {
    if !m.special.is_empty() {
        return true;
    }
    if let Some(key) = crate::loops::compound_key(&m.id, &m.compartment, &m.xrefs) {
        if !KEPT_KEYS.contains(&key) {
            return true;
        }
    }
    let bare = m.id.strip_prefix("M_").unwrap_or(&m.id);
    let compartment = m.compartment.strip_prefix("C_").unwrap_or(&m.compartment);
    let base = bare
        .strip_suffix(compartment)
        .and_then(|rest| rest.strip_suffix('_'))
        .unwrap_or(bare);
    if EXTRA_BASES.contains(&base) {
        return true;
    }
    let mut reactions: Vec<&String> = m.consumed_by.iter().chain(&m.produced_by).collect();
    reactions.sort();
    reactions.dedup();
    reactions.len() >= HUB_DEGREE
}
