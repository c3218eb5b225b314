//! Which maps the site has, and what their pages show.
//!
//! ```text
//! maps/index.html  maps/index.svg        overview: one box per group
//! maps/<group>.html  maps/<group>.svg    a group (part 1)
//! maps/<group>-part-2.html …             further parts of a large group
//! ```
//!
//! Groups are the model's reaction groups (pathways); a model without
//! groups gets one map per compartment (reactions spanning compartments
//! share a map). Groups above [`READABLE_REACTIONS`] are cut into parts of
//! nearly equal size, in breadth-first order over shared metabolites so a
//! part holds a connected stretch; a metabolite that continues on another
//! part carries links to it.

use super::render::{self, GroupNode};
use super::{
    reaction_verdict, MapContext, MapSpec, MapVerdict, Overlay, NEIGHBOURHOOD_METABOLITES,
    NEIGHBOURHOOD_REACTIONS, READABLE_REACTIONS,
};
use serde::Serialize;
use std::collections::{BTreeMap, BTreeSet};

/// One group map page.
#[derive(Debug, Clone, Serialize)]
pub struct MapPage {
    /// File name without extension, inside `maps/`.
    pub stem: String,
    pub group: String,
    /// 1-based part number and number of parts.
    pub part: usize,
    pub parts: usize,
    /// Stems of every part of the group, in order.
    pub part_stems: Vec<String>,
    pub reactions: usize,
    /// Reactions of the whole group drawn as contradictions: (id, slug,
    /// part number), so the page reaches them in one click.
    pub contradictions: Vec<(String, String, usize)>,
    #[serde(skip)]
    pub svg: String,
    /// Boxes and links of the drawing (for checks).
    #[serde(skip)]
    pub drawn: render::Drawn,
}

/// One row of the overview list.
#[derive(Debug, Clone, Serialize)]
pub struct GroupEntry {
    pub name: String,
    pub stem: String,
    pub reactions: usize,
    pub parts: usize,
    pub errors: usize,
    pub warnings: usize,
    pub contradictions: usize,
}

/// Every group map of a report plus the overview.
#[derive(Debug, Clone)]
pub struct MapSite {
    pub groups: Vec<GroupEntry>,
    pub overview_svg: String,
    pub overview: render::Drawn,
    pub pages: Vec<MapPage>,
    /// "group" or "compartment": what the maps are cut by.
    pub cut_by: &'static str,
}

/// The reaction sets to draw: (name, reaction ids sorted).
pub fn groups<'a>(ctx: &MapContext<'a>) -> (Vec<(String, Vec<&'a str>)>, &'static str) {
    let mut by: BTreeMap<String, Vec<&str>> = BTreeMap::new();
    let grouped = ctx.report.reactions.iter().any(|r| r.group.is_some());
    let compartment_name: BTreeMap<&str, &str> = ctx
        .report
        .compartments
        .iter()
        .map(|c| {
            (
                c.id.as_str(),
                if c.name.is_empty() {
                    c.id.as_str()
                } else {
                    c.name.as_str()
                },
            )
        })
        .collect();
    for r in &ctx.report.reactions {
        let key = if grouped {
            r.group.clone().unwrap_or_else(|| "(no group)".into())
        } else {
            let places: BTreeSet<&str> = r
                .participants
                .iter()
                .filter_map(|p| ctx.metabolites.get(p.metabolite.as_str()))
                .map(|m| m.compartment.as_str())
                .collect();
            match places.len() {
                0 => "(no metabolites)".into(),
                1 => {
                    let c = places.first().copied().unwrap_or_default();
                    compartment_name.get(c).copied().unwrap_or(c).to_string()
                }
                _ => "between compartments".into(),
            }
        };
        by.entry(key).or_default().push(&r.id);
    }
    for list in by.values_mut() {
        list.sort_unstable();
    }
    (
        by.into_iter().collect(),
        if grouped { "group" } else { "compartment" },
    )
}

/// File-name stem of a group: lowercase letters, digits and `-`.
fn stem_of(name: &str, used: &mut BTreeSet<String>) -> String {
    let mut s = String::new();
    for c in name.chars() {
        if c.is_ascii_alphanumeric() {
            s.push(c.to_ascii_lowercase());
        } else if !s.ends_with('-') {
            s.push('-');
        }
    }
    let mut base: String = s.trim_matches('-').chars().take(60).collect();
    if base.is_empty() || base == "index" {
        base = format!("group-{base}").trim_end_matches('-').to_string();
    }
    let mut stem = base.clone();
    let mut k = 2;
    while !used.insert(stem.clone()) {
        stem = format!("{base}-{k}");
        k += 1;
    }
    stem
}

/// Cuts `reactions` into parts of at most [`READABLE_REACTIONS`], in
/// breadth-first order over shared main metabolites.
pub fn split<'a>(ctx: &MapContext<'a>, reactions: &[&'a str]) -> Vec<Vec<&'a str>> {
    if reactions.len() <= READABLE_REACTIONS {
        return vec![reactions.to_vec()];
    }
    let inside: BTreeSet<&str> = reactions.iter().copied().collect();
    let mut seen: BTreeSet<&str> = BTreeSet::new();
    let mut order: Vec<&str> = Vec::with_capacity(reactions.len());
    for &start in reactions {
        if !seen.insert(start) {
            continue;
        }
        let mut queue = std::collections::VecDeque::from([start]);
        while let Some(r) = queue.pop_front() {
            order.push(r);
            let mut next: BTreeSet<&str> = BTreeSet::new();
            for (m, _) in ctx.main_of.get(r).into_iter().flatten() {
                for &other in ctx.reactions_of.get(m).into_iter().flatten() {
                    if inside.contains(other) && !seen.contains(other) {
                        next.insert(other);
                    }
                }
            }
            for other in next {
                seen.insert(other);
                queue.push_back(other);
            }
        }
    }
    let parts = order.len().div_ceil(READABLE_REACTIONS);
    let size = order.len().div_ceil(parts);
    order.chunks(size).map(|c| c.to_vec()).collect()
}

/// Builds every group map and the overview.
pub fn group_maps(ctx: &MapContext<'_>) -> MapSite {
    let (groups, cut_by) = groups(ctx);
    let mut used: BTreeSet<String> = BTreeSet::from(["index".to_string()]);
    let mut entries = Vec::new();
    let pages: Vec<MapPage>;
    let mut pending: Vec<(MapSpec<'_>, MapPage)> = Vec::new();
    // Group of every reaction, for the overview's links.
    let mut group_of: BTreeMap<&str, usize> = BTreeMap::new();
    for (g, (name, reactions)) in groups.iter().enumerate() {
        for r in reactions {
            group_of.insert(r, g);
        }
        let stem = stem_of(name, &mut used);
        let parts = split(ctx, reactions);
        let part_stems: Vec<String> = (0..parts.len())
            .map(|k| {
                if k == 0 {
                    stem.clone()
                } else {
                    stem_of(&format!("{stem}-part-{}", k + 1), &mut used)
                }
            })
            .collect();
        // Part of every main metabolite, for links between parts.
        let mut parts_of: BTreeMap<&str, BTreeSet<usize>> = BTreeMap::new();
        let mut contradictions = Vec::new();
        for (k, part) in parts.iter().enumerate() {
            for r in part {
                for (m, _) in ctx.main_of.get(r).into_iter().flatten() {
                    parts_of.entry(m).or_default().insert(k);
                }
                let view = ctx.reactions[r];
                if reaction_verdict(view) == MapVerdict::Contradiction {
                    contradictions.push((view.id.clone(), view.slug.clone(), k + 1));
                }
            }
        }
        contradictions.sort();
        let (mut errors, mut warnings) = (0, 0);
        let members: BTreeSet<&str> = reactions.iter().copied().collect();
        for f in &ctx.report.findings {
            if f.subjects.iter().any(|s| members.contains(s.as_str())) {
                match f.severity {
                    crate::report::Severity::Error => errors += 1,
                    crate::report::Severity::Warning => warnings += 1,
                    crate::report::Severity::Note => {}
                }
            }
        }
        for (k, part) in parts.iter().enumerate() {
            let mut elsewhere: BTreeMap<&str, Vec<(String, String)>> = BTreeMap::new();
            for (m, ks) in &parts_of {
                if ks.contains(&k) && ks.len() > 1 {
                    elsewhere.insert(
                        m,
                        ks.iter()
                            .filter(|&&j| j != k)
                            .map(|&j| {
                                (format!("part {}", j + 1), format!("{}.html", part_stems[j]))
                            })
                            .collect(),
                    );
                }
            }
            let title = if parts.len() > 1 {
                format!("Map of {name}, part {} of {}", k + 1, parts.len())
            } else {
                format!("Map of {name}")
            };
            let spec = MapSpec {
                title,
                reactions: part.clone(),
                subject: None,
                overlay: Overlay::Verdicts,
                elsewhere,
                root: "../",
                here: "maps",
                max_metabolites: None,
            };
            // Drawn below, all parts in parallel.
            pending.push((
                spec,
                MapPage {
                    stem: part_stems[k].clone(),
                    group: name.clone(),
                    part: k + 1,
                    parts: parts.len(),
                    part_stems: part_stems.clone(),
                    reactions: part.len(),
                    contradictions: contradictions.clone(),
                    svg: String::new(),
                    drawn: render::Drawn::default(),
                },
            ));
        }
        entries.push(GroupEntry {
            name: name.clone(),
            stem,
            reactions: reactions.len(),
            parts: parts.len(),
            errors,
            warnings,
            contradictions: contradictions.len(),
        });
    }
    {
        // Each part is independent; collect keeps the order.
        use rayon::prelude::*;
        pages = pending
            .into_par_iter()
            .map(|(spec, mut page)| {
                page.drawn = render::draw(ctx, &spec);
                page.svg = page.drawn.svg.clone();
                page
            })
            .collect();
    }
    let links = group_links(ctx, &group_of, groups.len());
    let nodes: Vec<GroupNode> = entries
        .iter()
        .map(|e| GroupNode {
            name: e.name.clone(),
            href: format!("{}.html", e.stem),
            reactions: e.reactions,
            errors: e.errors,
            warnings: e.warnings,
        })
        .collect();
    let overview = render::draw_overview("Overview map of the groups", &nodes, &links);
    MapSite {
        groups: entries,
        overview_svg: overview.svg.clone(),
        overview,
        pages,
        cut_by,
    }
}

/// Links of the overview: A → B when a main metabolite made in A is used
/// in B; each group keeps its three strongest links (most metabolites,
/// then group order), so large models stay legible.
pub fn group_links(
    ctx: &MapContext<'_>,
    group_of: &BTreeMap<&str, usize>,
    count: usize,
) -> Vec<(usize, usize)> {
    let mut made: BTreeMap<&str, BTreeSet<usize>> = BTreeMap::new();
    let mut used: BTreeMap<&str, BTreeSet<usize>> = BTreeMap::new();
    // Sorted, so the weights below are summed in one order every run.
    let mut by_reaction: Vec<(&&str, &Vec<(&str, f64)>)> = ctx.main_of.iter().collect();
    by_reaction.sort_unstable_by_key(|(r, _)| **r);
    for (r, main) in by_reaction {
        let Some(&g) = group_of.get(r) else { continue };
        for &(m, c) in main {
            if c > 0.0 {
                made.entry(m).or_default().insert(g);
            } else {
                used.entry(m).or_default().insert(g);
            }
        }
    }
    let mut weight: BTreeMap<(usize, usize), usize> = BTreeMap::new();
    for (m, makers) in &made {
        let Some(users) = used.get(m) else { continue };
        for &a in makers {
            for &b in users {
                if a != b {
                    *weight.entry((a, b)).or_default() += 1;
                }
            }
        }
    }
    let mut out_of: Vec<Vec<(usize, usize)>> = vec![Vec::new(); count];
    for (&(a, b), &w) in &weight {
        out_of[a].push((w, b));
    }
    let mut links = Vec::new();
    for (a, list) in out_of.iter_mut().enumerate() {
        list.sort_by(|x, y| y.0.cmp(&x.0).then(x.1.cmp(&y.1)));
        for &(_, b) in list.iter().take(3) {
            links.push((a, b));
        }
    }
    links
}

/// The neighbourhood map of a reaction: reactions sharing a main
/// metabolite with it (two steps out in the network of reactions and
/// metabolites), nearest first, at most [`NEIGHBOURHOOD_REACTIONS`].
pub fn reaction_neighbourhood(ctx: &MapContext<'_>, id: &str) -> Option<render::Drawn> {
    let (&key, _) = ctx.reactions.get_key_value(id)?;
    let reactions = ctx.near_reactions(&[key], NEIGHBOURHOOD_REACTIONS);
    let spec = MapSpec {
        title: format!("Neighbourhood of {id}"),
        reactions,
        subject: Some(key),
        overlay: Overlay::Verdicts,
        elsewhere: BTreeMap::new(),
        root: "../",
        here: "reactions",
        max_metabolites: Some(NEIGHBOURHOOD_METABOLITES),
    };
    Some(render::draw(ctx, &spec))
}

/// The neighbourhood map of a metabolite: its reactions and their
/// metabolites. `None` for side compounds (they are written on every
/// reaction instead) and metabolites without reactions.
pub fn metabolite_neighbourhood(ctx: &MapContext<'_>, id: &str) -> Option<render::Drawn> {
    let (&key, list) = ctx.reactions_of.get_key_value(id)?;
    let mut reactions = list.clone();
    reactions.truncate(NEIGHBOURHOOD_REACTIONS);
    let spec = MapSpec {
        title: format!("Neighbourhood of {id}"),
        reactions,
        subject: Some(key),
        overlay: Overlay::Verdicts,
        elsewhere: BTreeMap::new(),
        root: "../",
        here: "metabolites",
        max_metabolites: Some(NEIGHBOURHOOD_METABOLITES),
    };
    Some(render::draw(ctx, &spec))
}

/// Files every site with maps shares: the maps' stylesheet and the key of
/// verdict maps, as (path in the site, content).
pub fn shared_assets() -> [(String, String); 2] {
    [
        (
            "assets/network-map.css".to_string(),
            render::shared_stylesheet(),
        ),
        (
            "assets/network-map-legend.svg".to_string(),
            render::shared_legend(),
        ),
    ]
}

/// The neighbourhood maps of every reaction and metabolite page, as
/// inline SVG by id, drawn in parallel (each map is independent; the
/// result does not depend on the order). The site does not hold them all:
/// it draws each on the worker that writes its page; `bench maps` draws
/// them all here.
pub struct Neighbourhoods<'a> {
    pub reactions: BTreeMap<&'a str, String>,
    pub metabolites: BTreeMap<&'a str, String>,
}

pub fn neighbourhoods<'a>(ctx: &MapContext<'a>) -> Neighbourhoods<'a> {
    use rayon::prelude::*;
    let report = ctx.report;
    let reactions = report
        .reactions
        .par_iter()
        .filter_map(|r| reaction_neighbourhood(ctx, &r.id).map(|d| (r.id.as_str(), d.svg)))
        .collect::<Vec<_>>()
        .into_iter()
        .collect();
    let metabolites = report
        .metabolites
        .par_iter()
        .filter_map(|m| metabolite_neighbourhood(ctx, &m.id).map(|d| (m.id.as_str(), d.svg)))
        .collect::<Vec<_>>()
        .into_iter()
        .collect();
    Neighbourhoods {
        reactions,
        metabolites,
    }
}

/// A network map of each minimal conflicting set of a scenario judged as
/// a whole, in the order of `scenario.conflicts`: arrows in the direction
/// and width of the scenario's fluxes when the scenario has them (the
/// model's own irreversible directions have none: verdicts then).
pub fn conflict_set_maps(
    ctx: &MapContext<'_>,
    scenario: &crate::report::JointScenarioView,
) -> Vec<Option<String>> {
    let has_fluxes = ctx.report.reactions.iter().any(|r| {
        r.scenario_verdicts
            .iter()
            .any(|v| v.scenario == scenario.id && v.flux != 0.0)
    });
    scenario
        .conflicts
        .iter()
        .enumerate()
        .map(|(k, c)| {
            let members: Vec<&str> = c.members.iter().map(|m| m.reaction.as_str()).collect();
            super::reaction_set_map(
                ctx,
                &format!("Conflicting set {} of {}", k + 1, scenario.id),
                &members,
                has_fluxes.then_some(scenario.id.as_str()),
            )
        })
        .collect()
}
