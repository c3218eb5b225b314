//! How far the ΔG data reach: which internal reactions get a ΔrG'° (and so
//! a direction verdict), from which source, per compartment and per group,
//! and which missing formation energies block the most reactions — the list
//! a curator fills first.

use super::{CoverageView, GroupCoverageView, MissingMetaboliteView, SourceCountView};
use crate::analysis::{Analysis, EnergyOrigin};
use std::collections::BTreeMap;

/// Where a reaction's ΔrG'° comes from, strongest first: the order in which
/// a Σ ν·ΔfG'° is attributed when its terms come from several sources.
pub const SOURCES: &[(&str, &str)] = &[
    ("side-table", "side table"),
    ("model", "model value"),
    ("species", "species data in the model"),
    ("library", "built-in library"),
    (
        "transport-rule",
        "transport rule (single-species approximation)",
    ),
    ("conditions", "compartment conditions only (H⁺ moved)"),
];

/// The coverage figures of one analysis.
pub fn coverage(analysis: &Analysis) -> CoverageView {
    let model = analysis.model;
    let internal: Vec<usize> = (0..model.reactions.len())
        .filter(|&j| analysis.is_thermodynamic(j))
        .collect();
    let mut by_source: BTreeMap<&str, usize> = BTreeMap::new();
    let mut blocks: BTreeMap<usize, (usize, usize)> = BTreeMap::new();
    let mut with_energy = 0;
    for &j in &internal {
        match &analysis.reaction_thermo[j] {
            Ok(t) => {
                with_energy += 1;
                *by_source
                    .entry(reaction_source(analysis, j, t.origin))
                    .or_default() += 1;
            }
            Err(missing) => {
                for &i in &missing.metabolites {
                    let entry = blocks.entry(i).or_default();
                    entry.0 += 1;
                    if missing.metabolites.len() == 1 {
                        entry.1 += 1;
                    }
                }
            }
        }
    }
    let group_view = |label: String, members: &[usize]| GroupCoverageView {
        label,
        reactions: members.len(),
        with_energy: members
            .iter()
            .filter(|&&j| analysis.reaction_thermo[j].is_ok())
            .count(),
    };
    let by_compartment = model
        .compartments
        .iter()
        .enumerate()
        .map(|(c, comp)| {
            let members: Vec<usize> = internal
                .iter()
                .copied()
                .filter(|&j| {
                    model.reactions[j]
                        .stoichiometry
                        .iter()
                        .any(|&(i, _)| model.metabolites[i].compartment == c)
                })
                .collect();
            group_view(comp.id.clone(), &members)
        })
        .collect();
    let mut groups: BTreeMap<String, Vec<usize>> = BTreeMap::new();
    for &j in &internal {
        let label = model.reactions[j]
            .group
            .clone()
            .unwrap_or_else(|| "(no group)".into());
        groups.entry(label).or_default().push(j);
    }
    let by_group = groups
        .into_iter()
        .map(|(label, members)| group_view(label, &members))
        .collect();
    let mut missing: Vec<MissingMetaboliteView> = blocks
        .into_iter()
        .map(|(i, (blocks, only_gap))| {
            let m = &model.metabolites[i];
            MissingMetaboliteView {
                metabolite: m.id.clone(),
                slug: crate::slug::slug(&m.id),
                name: m.name.clone(),
                compartment: model.compartments[m.compartment].id.clone(),
                formula: m.formula.clone(),
                blocks,
                only_gap,
                xrefs: m.xrefs.clone(),
            }
        })
        .collect();
    missing.sort_by(|a, b| {
        b.blocks
            .cmp(&a.blocks)
            .then(b.only_gap.cmp(&a.only_gap))
            .then(a.metabolite.cmp(&b.metabolite))
    });
    CoverageView {
        internal_reactions: internal.len(),
        with_energy,
        by_source: SOURCES
            .iter()
            .map(|&(source, label)| SourceCountView {
                source: source.into(),
                label: label.into(),
                reactions: by_source.get(source).copied().unwrap_or(0),
            })
            .collect(),
        by_compartment,
        by_group,
        missing,
    }
}

/// The source a reaction's ΔrG'° is attributed to (see [`SOURCES`]).
fn reaction_source(analysis: &Analysis, j: usize, origin: EnergyOrigin) -> &'static str {
    let settings = analysis.settings;
    match origin {
        EnergyOrigin::Reaction if settings.table_reactions.contains(&j) => "side-table",
        EnergyOrigin::Reaction => "model",
        EnergyOrigin::TransportRule => "transport-rule",
        EnergyOrigin::Formation => {
            let mut best = "conditions";
            let rank = |s: &str| {
                SOURCES
                    .iter()
                    .position(|&(k, _)| k == s)
                    .unwrap_or(usize::MAX)
            };
            for &(i, _) in &analysis.model.reactions[j].stoichiometry {
                let Some(e) = analysis.metabolite_energy(i) else {
                    continue;
                };
                let source = if settings.table_metabolites.contains(&i) {
                    "side-table"
                } else {
                    match e.origin {
                        "model" => "model",
                        "species" => "species",
                        "library" => "library",
                        _ => continue, // H⁺, fixed by the pH
                    }
                };
                if rank(source) < rank(best) {
                    best = source;
                }
            }
            best
        }
    }
}
