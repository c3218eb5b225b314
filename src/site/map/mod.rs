//! Network maps of the model: where contradictions, loops and missing data
//! sit, drawn as layered SVG.
//!
//! - [`currency`]: which metabolites become side labels instead of hubs;
//! - [`layout`]: the layered layout (swappable behind one function);
//! - [`render`]: the SVG (palette, line styles, legend, links, hover text);
//! - [`pages`]: which maps the site has (groups split into parts, the
//!   overview of groups, neighbourhoods) and their pages.
//!
//! A map is a set of reactions: each reaction is a box, each of its
//! metabolites that is not a side compound a rounded node, and arrows run
//! from substrates through the reaction to products, in the written
//! direction (or the direction of the flux, for a scenario).

pub mod currency;
pub mod layout;
pub mod pages;
pub mod render;

use crate::report::{MetaboliteView, ReactionView, Report, Severity, Verdict};
use std::collections::{BTreeMap, BTreeSet, HashMap, HashSet};

/// Largest number of reactions on one map: above it a group is split
/// into parts linked to each other. 30 reaction boxes with their
/// metabolites stay legible at 100 % zoom on a laptop screen (about 10
/// layers of 6–8 boxes); common practice for pathway posters, not a
/// published figure.
pub const READABLE_REACTIONS: usize = 30;
/// Largest number of reactions on a neighbourhood map (the subject and the
/// nearest others, by steps then id). Small on purpose: every reaction and
/// metabolite page carries one (Recon3D: about 16,000 maps), so their size
/// is most of a large site's map bytes; the group maps show more.
pub const NEIGHBOURHOOD_REACTIONS: usize = 8;
/// Largest number of metabolite boxes on a neighbourhood map; a reaction
/// whose other metabolites do not fit says how many were left out.
pub const NEIGHBOURHOOD_METABOLITES: usize = 12;

/// How a reaction's arrow is styled on a map.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum MapVerdict {
    /// No allowed direction is thermodynamically possible.
    Contradiction,
    /// Possible only near the bounds or within the uncertainty.
    Marginal,
    /// Comfortably possible.
    Consistent,
    /// Both directions allowed and both only marginal: ΔG' stays close to
    /// zero over the allowed concentrations.
    Equilibrium,
    /// No ΔrG'°.
    NoData,
}

impl MapVerdict {
    pub const ALL: [MapVerdict; 5] = [
        MapVerdict::Contradiction,
        MapVerdict::Marginal,
        MapVerdict::Consistent,
        MapVerdict::Equilibrium,
        MapVerdict::NoData,
    ];

    pub fn slug(self) -> &'static str {
        match self {
            MapVerdict::Contradiction => "contradiction",
            MapVerdict::Marginal => "marginal",
            MapVerdict::Consistent => "consistent",
            MapVerdict::Equilibrium => "equilibrium",
            MapVerdict::NoData => "no-data",
        }
    }

    pub fn words(self) -> &'static str {
        match self {
            MapVerdict::Contradiction => "contradiction",
            MapVerdict::Marginal => "marginal",
            MapVerdict::Consistent => "consistent",
            MapVerdict::Equilibrium => "near equilibrium",
            MapVerdict::NoData => "no ΔG data",
        }
    }

    fn from_verdict(v: Verdict) -> MapVerdict {
        match v {
            Verdict::Contradiction => MapVerdict::Contradiction,
            Verdict::Marginal => MapVerdict::Marginal,
            Verdict::Consistent => MapVerdict::Consistent,
            Verdict::AtEquilibrium => MapVerdict::Equilibrium,
            Verdict::NoData => MapVerdict::NoData,
        }
    }
}

/// The map style of a reaction from its verdicts on the directions its
/// bounds allow: the best allowed direction counts (a reversible reaction
/// contradicts only if both ways do); both ways marginal or at equilibrium is "near
/// equilibrium".
pub fn reaction_verdict(r: &ReactionView) -> MapVerdict {
    let allowed: Vec<Verdict> = [
        (r.upper_bound > 0.0, r.forward_verdict),
        (r.lower_bound < 0.0, r.backward_verdict),
    ]
    .into_iter()
    .filter(|(allowed, _)| *allowed)
    .filter_map(|(_, v)| v)
    .collect();
    if r.drg_prime.is_none() || allowed.is_empty() {
        return MapVerdict::NoData;
    }
    if allowed.len() == 2
        && allowed
            .iter()
            .all(|v| matches!(v, Verdict::Marginal | Verdict::AtEquilibrium))
    {
        return MapVerdict::Equilibrium;
    }
    // Verdict orders contradiction < marginal < consistent < no data.
    let best = allowed
        .iter()
        .copied()
        .filter(|v| *v != Verdict::NoData)
        .max()
        .unwrap_or(Verdict::NoData);
    MapVerdict::from_verdict(best)
}

/// What the arrows show.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Overlay<'a> {
    /// Verdicts of the directions the bounds allow.
    Verdicts,
    /// One flux scenario: verdict of the flux's direction, arrow width by
    /// |flux|, arrows in the direction of the flux.
    Scenario(&'a str),
}

/// Lookups shared by every map of a report. Hash maps: drawing the maps
/// of a genome-scale model looks ids up millions of times, and nothing
/// iterates these in an order that reaches the output (common practice).
/// The neighbourhood maps (thousands per site) work on positions instead
/// of ids: reaction `i` is `report.reactions[i]`, metabolite `j` is
/// `met_ids[j]` (the report's metabolites first, then ids named only by
/// reactions).
pub struct MapContext<'a> {
    pub report: &'a Report,
    pub side: HashSet<String>,
    pub reactions: HashMap<&'a str, &'a ReactionView>,
    pub metabolites: HashMap<&'a str, &'a MetaboliteView>,
    /// Main (non-side) metabolites of each reaction: (id, coefficient).
    pub main_of: HashMap<&'a str, Vec<(&'a str, f64)>>,
    /// Reactions of each main metabolite, sorted.
    pub reactions_of: HashMap<&'a str, Vec<&'a str>>,
    /// (errors, warnings) among the findings naming each reaction.
    pub counts: HashMap<&'a str, (usize, usize)>,
    /// Position of each reaction in `report.reactions`.
    index: HashMap<&'a str, usize>,
    /// Rank of each reaction (by position) in id order.
    rank: Vec<u32>,
    /// Main metabolites of each reaction (by position): (metabolite, coefficient).
    main_idx: Vec<Vec<(u32, f64)>>,
    /// Reactions (positions, in id order) of each main metabolite.
    reactions_idx: Vec<Vec<u32>>,
    /// Metabolite ids by position.
    met_ids: Vec<&'a str>,
    /// Labels and hover texts on verdict maps, made the first time a map
    /// needs them: a reaction of a genome-scale model is on a dozen
    /// neighbourhood maps.
    texts: Vec<std::sync::OnceLock<render::ReactionText>>,
    met_texts: Vec<std::sync::OnceLock<render::MetaboliteText>>,
}

impl<'a> MapContext<'a> {
    pub fn new(report: &'a Report) -> MapContext<'a> {
        let side: HashSet<String> = currency::side_compounds(report).into_iter().collect();
        let reactions: HashMap<&str, &ReactionView> = report
            .reactions
            .iter()
            .map(|r| (r.id.as_str(), r))
            .collect();
        let mut met_ids: Vec<&str> = report.metabolites.iter().map(|m| m.id.as_str()).collect();
        let mut met_index: HashMap<&str, u32> = met_ids
            .iter()
            .enumerate()
            .map(|(j, m)| (*m, j as u32))
            .collect();
        let mut main_of = HashMap::new();
        let mut main_idx = Vec::with_capacity(report.reactions.len());
        let mut reactions_of: HashMap<&str, Vec<&str>> = HashMap::new();
        for r in &report.reactions {
            let main: Vec<(&str, f64)> = r
                .participants
                .iter()
                .filter(|p| !side.contains(&p.metabolite))
                .map(|p| (p.metabolite.as_str(), p.coefficient))
                .collect();
            for (m, _) in &main {
                reactions_of.entry(m).or_default().push(&r.id);
            }
            main_idx.push(
                main.iter()
                    .map(|&(m, c)| {
                        let next = met_ids.len() as u32;
                        let j = *met_index.entry(m).or_insert(next);
                        if j == next {
                            met_ids.push(m);
                        }
                        (j, c)
                    })
                    .collect(),
            );
            main_of.insert(r.id.as_str(), main);
        }
        for list in reactions_of.values_mut() {
            list.sort_unstable();
            list.dedup();
        }
        let index = report.reaction_positions();
        let mut by_id: Vec<usize> = (0..report.reactions.len()).collect();
        by_id.sort_unstable_by_key(|&i| report.reactions[i].id.as_str());
        let mut rank = vec![0u32; by_id.len()];
        for (k, &i) in by_id.iter().enumerate() {
            rank[i] = k as u32;
        }
        let mut reactions_idx: Vec<Vec<u32>> = vec![Vec::new(); met_ids.len()];
        for &i in &by_id {
            for &(j, _) in &main_idx[i] {
                let list = &mut reactions_idx[j as usize];
                if list.last() != Some(&(i as u32)) {
                    list.push(i as u32);
                }
            }
        }
        let mut counts: HashMap<&str, (usize, usize)> = HashMap::new();
        for f in &report.findings {
            let mut seen = BTreeSet::new();
            for s in &f.subjects {
                if let Some((id, _)) = reactions.get_key_value(s.as_str()) {
                    if seen.insert(*id) {
                        let c = counts.entry(id).or_default();
                        match f.severity {
                            Severity::Error => c.0 += 1,
                            Severity::Warning => c.1 += 1,
                            Severity::Note => {}
                        }
                    }
                }
            }
        }
        MapContext {
            report,
            side,
            reactions,
            metabolites: report
                .metabolites
                .iter()
                .map(|m| (m.id.as_str(), m))
                .collect(),
            main_of,
            reactions_of,
            counts,
            index,
            rank,
            main_idx,
            reactions_idx,
            texts: std::iter::repeat_with(std::sync::OnceLock::new)
                .take(report.reactions.len())
                .collect(),
            met_texts: std::iter::repeat_with(std::sync::OnceLock::new)
                .take(met_ids.len())
                .collect(),
            met_ids,
        }
    }

    /// Position of a reaction in `report.reactions`.
    pub(crate) fn reaction_index(&self, rid: &str) -> Option<usize> {
        self.index.get(rid).copied()
    }

    /// Main metabolites of the reaction at position `i`.
    pub(crate) fn main_at(&self, i: usize) -> &[(u32, f64)] {
        &self.main_idx[i]
    }

    /// Id of the metabolite at position `j`, and its view when the report has one.
    pub(crate) fn metabolite_at(&self, j: u32) -> (&'a str, Option<&'a MetaboliteView>) {
        let j = j as usize;
        (self.met_ids[j], self.report.metabolites.get(j))
    }

    /// Labels and hover text of the reaction at position `i` on verdict
    /// maps (made once).
    pub(crate) fn reaction_text(&self, i: usize) -> &render::ReactionText {
        self.texts[i].get_or_init(|| render::ReactionText::for_verdicts(self, i))
    }

    /// Label and hover text of the metabolite at position `j` (made once).
    pub(crate) fn metabolite_text(&self, j: u32) -> &render::MetaboliteText {
        self.met_texts[j as usize].get_or_init(|| render::MetaboliteText::new(self, j))
    }

    /// Reactions within `steps` steps of `start` (a reaction step goes
    /// through a shared main metabolite), nearest first then by id, at most
    /// `limit`.
    pub fn near_reactions(&self, start: &[&'a str], limit: usize) -> Vec<&'a str> {
        let start: Vec<usize> = start
            .iter()
            .filter_map(|r| self.reaction_index(r))
            .collect();
        self.near_positions(&start, limit)
            .into_iter()
            .map(|i| self.report.reactions[i].id.as_str())
            .collect()
    }

    /// [`Self::near_reactions`] on positions.
    fn near_positions(&self, start: &[usize], limit: usize) -> Vec<usize> {
        let mut found: Vec<usize> = Vec::with_capacity(limit);
        let mut frontier: Vec<usize> = start.to_vec();
        let mut next: Vec<usize> = Vec::new();
        while !frontier.is_empty() && found.len() < limit {
            frontier.sort_unstable_by_key(|&i| self.rank[i]);
            frontier.dedup();
            next.clear();
            for &r in &frontier {
                if found.len() >= limit {
                    break;
                }
                if found.contains(&r) {
                    continue;
                }
                found.push(r);
                for &(m, _) in &self.main_idx[r] {
                    next.extend(
                        self.reactions_idx[m as usize]
                            .iter()
                            .map(|&o| o as usize)
                            .filter(|o| !found.contains(o)),
                    );
                }
            }
            std::mem::swap(&mut frontier, &mut next);
        }
        found
    }
}

/// One map to draw: its reactions and how to show them.
#[derive(Debug, Clone)]
pub struct MapSpec<'a> {
    /// Accessible name of the drawing (model strings allowed: text only).
    pub title: String,
    pub reactions: Vec<&'a str>,
    /// Reaction or metabolite id drawn as the page's subject.
    pub subject: Option<&'a str>,
    pub overlay: Overlay<'a>,
    /// Metabolites that continue on other maps: id → (label, href).
    pub elsewhere: BTreeMap<&'a str, Vec<(String, String)>>,
    /// Prefix from the page holding the map to the site root ("../").
    pub root: &'a str,
    /// Folder of the page holding the map ("reactions"): links to pages
    /// of the same folder leave out the way there and back.
    pub here: &'a str,
    /// A small map (neighbourhoods): at most this many metabolite boxes,
    /// shortened hover texts given once per reaction. `None`: a full map.
    pub max_metabolites: Option<usize>,
}

/// Map of an arbitrary set of reactions (for example a minimal conflicting
/// set of a scenario), drawn for a page one folder below the site root.
/// Unknown ids are ignored; `None` when none is known.
pub fn reaction_set_map(
    ctx: &MapContext<'_>,
    title: &str,
    reaction_ids: &[&str],
    scenario: Option<&str>,
) -> Option<String> {
    let mut ids: Vec<&str> = reaction_ids
        .iter()
        .filter_map(|id| ctx.reactions.get_key_value(id).map(|(k, _)| *k))
        .collect();
    ids.sort_unstable();
    ids.dedup();
    if ids.is_empty() {
        return None;
    }
    let spec = MapSpec {
        title: title.to_string(),
        reactions: ids,
        subject: None,
        overlay: scenario.map_or(Overlay::Verdicts, Overlay::Scenario),
        elsewhere: BTreeMap::new(),
        root: "../",
        here: "",
        max_metabolites: None,
    };
    Some(render::draw(ctx, &spec).svg)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::{EnergyView, ReactionView};

    fn reaction(lb: f64, ub: f64, fwd: Option<Verdict>, bwd: Option<Verdict>) -> ReactionView {
        ReactionView {
            id: "R".into(),
            slug: "R".into(),
            name: String::new(),
            equation: String::new(),
            participants: Vec::new(),
            reversible: lb < 0.0 && ub > 0.0,
            lower_bound: lb,
            upper_bound: ub,
            role: "internal".into(),
            group: None,
            drg_prime: Some(EnergyView {
                value_kj: 0.0,
                sigma_kj: 1.0,
                source: String::new(),
            }),
            energy_origin: None,
            xrefs: Default::default(),
            k_prime: None,
            dg_range: None,
            dg_measured: None,
            forward_verdict: fwd,
            backward_verdict: bwd,
            scenario_verdicts: Vec::new(),
            missing_data: Vec::new(),
            missing_reasons: Vec::new(),
            energy_terms: Vec::new(),
            transport: None,
            loop_capable: None,
            loops: Vec::new(),
        }
    }

    #[test]
    fn map_verdict_takes_the_allowed_directions() {
        use Verdict::*;
        let c = Some(Contradiction);
        let m = Some(Marginal);
        let ok = Some(Consistent);
        // Irreversible forward: only the forward verdict counts.
        assert_eq!(
            reaction_verdict(&reaction(0.0, 10.0, c, ok)),
            MapVerdict::Contradiction
        );
        // Reversible: one possible way is enough.
        assert_eq!(
            reaction_verdict(&reaction(-10.0, 10.0, c, ok)),
            MapVerdict::Consistent
        );
        assert_eq!(
            reaction_verdict(&reaction(-10.0, 10.0, m, m)),
            MapVerdict::Equilibrium
        );
        assert_eq!(
            reaction_verdict(&reaction(-10.0, 0.0, ok, m)),
            MapVerdict::Marginal
        );
        let mut none = reaction(0.0, 10.0, ok, None);
        none.drg_prime = None;
        assert_eq!(reaction_verdict(&none), MapVerdict::NoData);
    }
}
