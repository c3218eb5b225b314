//! Drawing a map as SVG: boxes for reactions, rounded boxes for
//! metabolites, arrows styled by verdict with colour AND line pattern,
//! a glyph in every reaction box, a legend on every map, links and hover
//! text (`<title>`).
//!
//! The SVG carries its own `<style>`, so the same bytes work inline in a
//! page and as a standalone `.svg` file (for a paper or a slide).
//!
//! As in [`crate::site::svg`]: model strings only go into `<text>` and
//! `<title>` content, which the svg crate escapes. Attributes carry numbers,
//! fixed words, and links built from page names that `check_slugs` has
//! proved safe (ASCII letters, digits, `_`, `-`).

use super::layout::{self, Placed, Size};
use super::{reaction_verdict, MapContext, MapSpec, MapVerdict, Overlay};
use crate::site::format::energy;
use crate::site::species_chart::shorten;
use petgraph::graph::{DiGraph, NodeIndex};
use std::collections::BTreeMap;
use svg::node::element::{Anchor, Definitions, Group, Marker, Path, Rectangle, Style, Text, Title};

/// Rough advance of one character at the 12 px of the map; generous, so
/// labels stay inside their boxes in common sans-serif fonts.
pub const CHAR_WIDTH: f64 = 7.0;
pub const LINE_HEIGHT: f64 = 14.0;
const PAD_X: f64 = 8.0;
const PAD_Y: f64 = 5.0;
const MARGIN: f64 = 12.0;
const ID_CHARS: usize = 26;
const SIDE_CHARS: usize = 34;
const LEGEND_ITEM_WIDTH: f64 = 220.0;
const LEGEND_COLUMNS: usize = 3;
/// Longest name or equation in the hover text of a small map.
const SMALL_HOVER_CHARS: usize = 90;

/// Our palette (worst pairwise CIE76 ΔE of the five under the simulated
/// deficiencies is ≥ 25; see the test `palette_survives_colour_blindness`).
pub fn colour(v: MapVerdict) -> &'static str {
    match v {
        MapVerdict::Contradiction => "#b8321a",
        MapVerdict::Marginal => "#e69b00",
        MapVerdict::Consistent => "#1f5fa8",
        MapVerdict::Equilibrium => "#7fbfe6",
        MapVerdict::NoData => "#8a8f98",
    }
}

/// The second channel: line pattern (`none` = solid) and width.
pub fn line_style(v: MapVerdict) -> (&'static str, f64) {
    match v {
        MapVerdict::Contradiction => ("none", 3.5),
        MapVerdict::Marginal => ("8 4", 2.5),
        MapVerdict::Consistent => ("none", 1.8),
        MapVerdict::Equilibrium => ("10 3 2 3", 2.5),
        MapVerdict::NoData => ("2 4", 2.0),
    }
}

/// The third channel: a glyph written in every reaction box.
pub fn glyph(v: MapVerdict) -> &'static str {
    match v {
        MapVerdict::Contradiction => "✖",
        MapVerdict::Marginal => "!",
        MapVerdict::Consistent => "✓",
        MapVerdict::Equilibrium => "≈",
        MapVerdict::NoData => "?",
    }
}

/// Every channel of a verdict's style in one place.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MapVerdictStyle {
    pub colour: &'static str,
    /// `stroke-dasharray` (`none` = solid).
    pub dash: &'static str,
    pub width: f64,
    pub glyph: &'static str,
}

impl MapVerdictStyle {
    pub fn of(v: MapVerdict) -> MapVerdictStyle {
        let (dash, width) = line_style(v);
        MapVerdictStyle {
            colour: colour(v),
            dash,
            width,
            glyph: glyph(v),
        }
    }
}

/// Marks a member of an internal loop.
pub const LOOP_GLYPH: &str = "↻";
/// Colour of reactions without flux in a scenario.
const IDLE: &str = "#c4c8ce";

/// The stylesheet inside every map (fixed text of ours, no `<`, `>` or `&`).
fn stylesheet() -> String {
    let mut css = String::from(
        ".nm{font-family:system-ui,-apple-system,'Segoe UI',Roboto,sans-serif;font-size:12px}\
         .nm text{fill:#1d2330}\
         .nm .met rect{fill:#f6f7f9;stroke:#5b6270;stroke-width:1}\
         .nm .rxn rect{fill:#fff;stroke-width:2}\
         .nm .subject rect{fill:#fff6d6;stroke-width:3.5}\
         .nm .side{fill:#5b6270;font-size:11px}\
         .nm .edge{fill:none}\
         .nm .more{fill:#1f5fa8;text-decoration:underline}\
         .nm .legend-title{font-weight:700}\
         .nm .frame{fill:none;stroke:#d5d9df}\
         .nm .grp rect{fill:#fff;stroke:#5b6270;stroke-width:1.5}\
         .nm .grp.has-errors rect{stroke:#b8321a;stroke-width:3}\
         .nm .grp.has-warnings rect{stroke:#e69b00;stroke-width:2.5;stroke-dasharray:8 4}\
         .nm .link{fill:none;stroke:#9aa1ab;stroke-width:1.5}\
         .nm a:hover rect{fill:#eef4fb}\
         .nm .idle rect,.nm path.idle{stroke:#c4c8ce;stroke-dasharray:1 3}\
         .nm .head-idle{fill:#c4c8ce}",
    );
    for v in MapVerdict::ALL {
        let (dash, width) = line_style(v);
        let c = colour(v);
        let s = v.slug();
        css.push_str(&format!(
            ".nm .nmv-{s} rect{{stroke:{c};stroke-dasharray:{dash}}}\
             .nm path.nmv-{s}{{stroke:{c};stroke-width:{width};stroke-dasharray:{dash}}}\
             .nm .head-{s}{{fill:{c}}}\
             .nm .glyph-{s}{{fill:{c};font-weight:700}}"
        ));
    }
    css
}

fn marker(slug: &str) -> Marker {
    Marker::new()
        .set("id", format!("nm-head-{slug}"))
        .set("viewBox", "0 0 10 10")
        .set("refX", 9)
        .set("refY", 5)
        .set("markerWidth", 9)
        .set("markerHeight", 9)
        .set("markerUnits", "userSpaceOnUse")
        .set("orient", "auto")
        .add(
            Path::new()
                .set("class", format!("head-{slug}"))
                .set("d", "M0,0 L10,5 L0,10 z"),
        )
}

fn text(x: f64, y: f64, class: &str, content: String) -> Text {
    Text::new(content)
        .set("x", x)
        .set("y", y)
        .set("class", class)
}

fn text_width(s: &str) -> f64 {
    s.chars().count() as f64 * CHAR_WIDTH
}

/// What a drawn map is made of, for the page and for tests.
#[derive(Debug, Clone, Default)]
pub struct Drawn {
    pub svg: String,
    pub nodes: Vec<DrawnNode>,
    /// Every `href` in the drawing, relative to the page holding it.
    pub links: Vec<String>,
    /// Line pattern and glyph shown for each verdict in the legend.
    pub legend: Vec<(MapVerdict, &'static str, &'static str)>,
    frame: Frame,
}

/// A box of the drawing with the text lines inside it (in drawing units).
#[derive(Debug, Clone)]
pub struct DrawnNode {
    pub id: String,
    pub is_reaction: bool,
    pub placed: Placed,
    /// Estimated extent of each text line: (left, top, width, height).
    pub labels: Vec<(f64, f64, f64, f64)>,
}

enum NodeKind<'a> {
    Reaction(&'a str),
    Metabolite(&'a str),
}

struct NodeText {
    lines: Vec<(String, &'static str)>,
}

/// Draws one map of reactions.
pub fn draw(ctx: &MapContext<'_>, spec: &MapSpec<'_>) -> Drawn {
    let scenario_flux = |r: &str| -> Option<(f64, MapVerdict)> {
        let Overlay::Scenario(s) = spec.overlay else {
            return None;
        };
        let view = ctx.reactions.get(r)?;
        view.scenario_verdicts
            .iter()
            .find(|v| v.scenario == s && v.flux != 0.0)
            .map(|v| (v.flux, MapVerdict::from_verdict(v.verdict)))
    };
    let max_flux = spec
        .reactions
        .iter()
        .filter_map(|r| scenario_flux(r))
        .map(|(f, _)| f.abs())
        .fold(0.0, f64::max);

    // Nodes: reactions in the given order, then their main metabolites.
    let mut graph: DiGraph<Size, ()> = DiGraph::new();
    let mut kinds: Vec<NodeKind> = Vec::new();
    let mut texts: Vec<NodeText> = Vec::new();
    let mut metabolite_node: BTreeMap<&str, usize> = BTreeMap::new();
    // Edge list: (tail, head, reaction id).
    let mut edges: Vec<(usize, usize, &str)> = Vec::new();
    let mut reaction_nodes: Vec<usize> = Vec::new();
    for &rid in &spec.reactions {
        let Some(r) = ctx.reactions.get(rid) else {
            continue;
        };
        let sign = scenario_flux(rid).map_or(1.0, |(f, _)| f.signum());
        let verdict = match spec.overlay {
            Overlay::Verdicts => Some(reaction_verdict(r)),
            Overlay::Scenario(_) => scenario_flux(rid).map(|(_, v)| v),
        };
        let mut first = match verdict {
            Some(v) => format!("{} {}", glyph(v), shorten(&r.id, ID_CHARS)),
            None => shorten(&r.id, ID_CHARS),
        };
        if !r.loops.is_empty() {
            first.push(' ');
            first.push_str(LOOP_GLYPH);
        }
        let side_in: Vec<&str> = r
            .participants
            .iter()
            .filter(|p| ctx.side.contains(&p.metabolite) && p.coefficient * sign < 0.0)
            .map(|p| p.metabolite.as_str())
            .collect();
        let side_out: Vec<&str> = r
            .participants
            .iter()
            .filter(|p| ctx.side.contains(&p.metabolite) && p.coefficient * sign > 0.0)
            .map(|p| p.metabolite.as_str())
            .collect();
        let mut lines = vec![(first, "rid")];
        if !side_in.is_empty() || !side_out.is_empty() {
            let words = format!("{} → {}", side_in.join(" + "), side_out.join(" + "));
            lines.push((shorten(words.trim(), SIDE_CHARS), "side"));
        }
        // On a small map, metabolites beyond the cap are left out; the
        // reaction box says how many.
        let main: Vec<(&str, f64)> = ctx.main_of.get(rid).cloned().unwrap_or_default();
        let mut drawn_main = Vec::with_capacity(main.len());
        let mut new_boxes = 0;
        for &(m, c) in &main {
            let known = metabolite_node.contains_key(m);
            match spec.max_metabolites {
                Some(cap) if !known && metabolite_node.len() + new_boxes >= cap => {}
                _ => {
                    if !known && !drawn_main.iter().any(|&(d, _)| d == m) {
                        new_boxes += 1;
                    }
                    drawn_main.push((m, c));
                }
            }
        }
        let left_out = main.len() - drawn_main.len();
        if left_out > 0 {
            lines.push((format!("+{left_out} more not drawn"), "side"));
        }
        let node = graph.add_node(box_size(&lines)).index();
        kinds.push(NodeKind::Reaction(rid));
        texts.push(NodeText { lines });
        reaction_nodes.push(node);
        for &(m, coefficient) in &drawn_main {
            let mnode = *metabolite_node.entry(m).or_insert_with(|| {
                let mut lines = vec![(shorten(m, ID_CHARS), "mid")];
                if let Some(links) = spec.elsewhere.get(m) {
                    let words: Vec<&str> = links.iter().map(|(l, _)| l.as_str()).collect();
                    lines.push((format!("↗ {}", words.join(" ")), "more"));
                }
                let index = graph.add_node(box_size(&lines)).index();
                kinds.push(NodeKind::Metabolite(m));
                texts.push(NodeText { lines });
                index
            });
            if coefficient * sign < 0.0 {
                edges.push((mnode, node, rid));
            } else {
                edges.push((node, mnode, rid));
            }
        }
    }
    for &(a, b, _) in &edges {
        graph.add_edge(NodeIndex::new(a), NodeIndex::new(b), ());
    }
    let placed = layout::layered(&graph);

    // Drawing.
    let root = spec.root;
    let mut links = Vec::new();
    // The arrows of one reaction share one link and one hover text.
    let mut edge_group = Group::new().set("class", "edges");
    let mut e = 0;
    while e < edges.len() {
        let rid = edges[e].2;
        let r = ctx.reactions[rid];
        let (class, width) = match spec.overlay {
            Overlay::Verdicts => (reaction_verdict(r).slug(), None),
            Overlay::Scenario(_) => match scenario_flux(rid) {
                Some((f, v)) => (
                    v.slug(),
                    Some(1.5 + 4.5 * f.abs() / max_flux.max(f64::MIN_POSITIVE)),
                ),
                None => ("idle", None),
            },
        };
        // A small map gives the hover text once, on the reaction's box.
        let mut arrows = if spec.max_metabolites.is_some() {
            Group::new()
        } else {
            Group::new().add(Title::new(reaction_hover(ctx, rid, spec)))
        };
        while e < edges.len() && edges[e].2 == rid {
            let (a, b, _) = edges[e];
            let d = edge_path(&placed.nodes[a], &placed.nodes[b], &placed.bends[e]);
            let mut path = Path::new()
                .set("class", format!("edge {}", verdict_class(class)))
                .set("d", d)
                .set("marker-end", format!("url(#nm-head-{class})"));
            if let Some(w) = width {
                path = path.set("style", format!("stroke-width:{:.2}", w));
            }
            arrows = arrows.add(path);
            e += 1;
        }
        let href = format!("{root}reactions/{}.html", r.slug);
        links.push(href.clone());
        edge_group = edge_group.add(Anchor::new().set("href", href).add(arrows));
    }

    let mut node_group = Group::new().set("class", "nodes");
    let mut drawn_nodes = Vec::new();
    for (v, kind) in kinds.iter().enumerate() {
        let p = placed.nodes[v];
        let (id, href, class, hover, is_reaction) = match kind {
            NodeKind::Reaction(rid) => {
                let r = ctx.reactions[rid];
                let class = match spec.overlay {
                    Overlay::Verdicts => verdict_class(reaction_verdict(r).slug()),
                    Overlay::Scenario(_) => match scenario_flux(rid) {
                        Some((_, v)) => verdict_class(v.slug()),
                        None => "idle".to_string(),
                    },
                };
                (
                    *rid,
                    format!("{root}reactions/{}.html", r.slug),
                    format!("rxn {class}"),
                    reaction_hover(ctx, rid, spec),
                    true,
                )
            }
            NodeKind::Metabolite(m) => {
                let view = ctx.metabolites.get(m);
                let name = view.map_or("", |x| x.name.as_str());
                (
                    *m,
                    // No page, no link.
                    view.map_or(String::new(), |x| {
                        format!("{root}metabolites/{}.html", x.slug)
                    }),
                    "met".to_string(),
                    if name.is_empty() {
                        m.to_string()
                    } else {
                        format!("{m} — {name}")
                    },
                    false,
                )
            }
        };
        let class = if spec.subject == Some(id) {
            format!("{class} subject")
        } else {
            class
        };
        let rect = Rectangle::new()
            .set("x", round2(p.left()))
            .set("y", round2(p.top()))
            .set("width", round2(p.width))
            .set("height", round2(p.height))
            .set("rx", if is_reaction { 2 } else { 10 });
        let mut g = Group::new()
            .set("class", class)
            .add(Title::new(hover))
            .add(rect);
        let mut labels = Vec::new();
        let mut more: Option<Group> = None;
        for (i, (line, class)) in texts[v].lines.iter().enumerate() {
            let x = round2(p.left() + PAD_X);
            let baseline = round2(p.top() + PAD_Y + LINE_HEIGHT * (i as f64 + 1.0) - 3.0);
            labels.push((
                x,
                p.top() + PAD_Y + LINE_HEIGHT * i as f64,
                text_width(line),
                LINE_HEIGHT,
            ));
            if *class == "more" {
                // Links to the other parts, each its own <a>.
                let mut mg = Group::new();
                let mut cx = x;
                let prefix = "↗ ";
                mg = mg.add(text(cx, baseline, "side", prefix.into()));
                cx += text_width(prefix);
                if let NodeKind::Metabolite(m) = kind {
                    for (label, target) in spec.elsewhere.get(m).into_iter().flatten() {
                        links.push(target.clone());
                        mg = mg.add(Anchor::new().set("href", target.clone()).add(text(
                            cx,
                            baseline,
                            "more",
                            label.clone(),
                        )));
                        cx += text_width(label) + CHAR_WIDTH;
                    }
                }
                more = Some(mg);
                continue;
            }
            let content = line.clone();
            if *class == "rid" {
                // The glyph in the verdict's colour, then the id.
                if let Some((glyph_text, rest)) = content.split_once(' ') {
                    if MapVerdict::ALL.iter().any(|v| glyph(*v) == glyph_text) {
                        let v = MapVerdict::ALL
                            .into_iter()
                            .find(|v| glyph(*v) == glyph_text)
                            .unwrap_or(MapVerdict::NoData);
                        g = g
                            .add(text(
                                x,
                                baseline,
                                &format!("glyph-{}", v.slug()),
                                glyph_text.into(),
                            ))
                            .add(text(
                                round2(x + text_width("✖ ")),
                                baseline,
                                "rid",
                                rest.to_string(),
                            ));
                        continue;
                    }
                }
            }
            g = g.add(text(x, baseline, class, content));
        }
        if href.is_empty() {
            node_group = node_group.add(g);
        } else {
            links.push(href.clone());
            node_group = node_group.add(Anchor::new().set("href", href).add(g));
        }
        if let Some(mg) = more {
            node_group = node_group.add(mg);
        }
        drawn_nodes.push(DrawnNode {
            id: id.to_string(),
            is_reaction,
            placed: p,
            labels,
        });
    }

    let scenario_note = match spec.overlay {
        Overlay::Scenario(_) if max_flux > 0.0 => Some(format!(
            "arrow width ∝ |flux| (widest: {}); arrows point the way the flux runs",
            crate::site::format::number(max_flux)
        )),
        _ => None,
    };
    let verdicts_only = matches!(spec.overlay, Overlay::Verdicts);
    // A verdict map leaves its legend to the shared key
    // (`assets/network-map-legend.svg`) on pages; only its standalone
    // copy carries one. A scenario map keeps its own (idle arrows, widths).
    let (legend_text, legend_height, legend_width, legend_entries) = if verdicts_only {
        let cached = fixed_parts();
        (cached.1.clone(), cached.2, cached.3, cached.4.clone())
    } else {
        let (g, h, w, e) = legend(spec.overlay, scenario_note);
        (g.to_string(), h, w, e)
    };
    let body = Group::new()
        .set("transform", format!("translate({MARGIN},{MARGIN})"))
        .add(edge_group)
        .add(node_group)
        .to_string();
    let mut used: Vec<&str> = edges
        .iter()
        .map(|&(_, _, rid)| match spec.overlay {
            Overlay::Verdicts => reaction_verdict(ctx.reactions[rid]).slug(),
            Overlay::Scenario(_) => scenario_flux(rid).map_or("idle", |(_, v)| v.slug()),
        })
        .collect();
    used.sort_unstable();
    used.dedup();
    let frame = Frame {
        title: Title::new(spec.title.clone()).to_string(),
        width: placed.width,
        height: placed.height,
        markers: used.iter().map(|slug| marker(slug).to_string()).collect(),
        legend: legend_text,
        legend_height,
        legend_width,
        legend_inline: !verdicts_only,
        all_markers: if verdicts_only {
            fixed_parts().0.clone()
        } else {
            defs(spec.overlay).to_string()
        },
    };
    Drawn {
        svg: frame.inline(&body),
        nodes: drawn_nodes,
        links,
        legend: legend_entries,
        frame,
    }
}

/// The parts a map's SVG is assembled from, as text: the inline copy for a
/// page (styles from the shared `assets/network-map.css`, only the arrow
/// heads it uses, no legend on verdict maps) and the standalone `.svg`
/// (its own stylesheet, every arrow head, the legend).
#[derive(Debug, Clone, Default)]
pub struct Frame {
    title: String,
    width: f64,
    height: f64,
    markers: Vec<String>,
    legend: String,
    legend_height: f64,
    legend_width: f64,
    legend_inline: bool,
    all_markers: String,
}

impl Frame {
    fn open(&self, with_legend: bool) -> (String, f64) {
        let width = if with_legend {
            self.width.max(self.legend_width)
        } else {
            self.width
        };
        let (w, h) = (
            round2(width + 2.0 * MARGIN),
            round2(
                self.height
                    + 2.0 * MARGIN
                    + if with_legend {
                        self.legend_height + MARGIN
                    } else {
                        0.0
                    },
            ),
        );
        (
            format!(
                "<svg class=\"nm net-map\" height=\"{h}\" role=\"img\" viewBox=\"0 0 {w} {h}\" width=\"{w}\" xmlns=\"http://www.w3.org/2000/svg\">\n{}\n",
                self.title
            ),
            round2(MARGIN + self.height + MARGIN),
        )
    }

    fn legend_at(&self, y: f64) -> String {
        format!(
            "<g class=\"nm-key\" transform=\"translate({MARGIN},{y})\">\n{}\n</g>\n",
            self.legend
        )
    }

    /// The map for a page.
    fn inline(&self, body: &str) -> String {
        let (open, legend_y) = self.open(self.legend_inline);
        let mut out = open;
        if !self.markers.is_empty() {
            out.push_str("<defs>");
            for m in &self.markers {
                out.push_str(m);
            }
            out.push_str("</defs>\n");
        }
        out.push_str(body);
        out.push('\n');
        if self.legend_inline {
            out.push_str(&self.legend_at(legend_y));
        }
        out.push_str("</svg>");
        out
    }
}

impl Drawn {
    /// The map as a file of its own (for a paper or a slide): its own
    /// stylesheet, every arrow head and the legend.
    pub fn standalone(&self) -> String {
        let f = &self.frame;
        let (open, legend_y) = f.open(true);
        let body_start = self.svg.find("<g transform=").unwrap_or(self.svg.len());
        let body_end = self
            .svg
            .find("<g class=\"nm-key\"")
            .or_else(|| self.svg.rfind("</svg>"))
            .unwrap_or(self.svg.len())
            .max(body_start);
        let mut out = open;
        out.push_str(&Style::new(stylesheet()).to_string());
        out.push('\n');
        out.push_str(&f.all_markers);
        out.push('\n');
        out.push_str(&self.svg[body_start..body_end]);
        out.push_str(&f.legend_at(legend_y));
        out.push_str("</svg>");
        out
    }
}

type FixedParts = (
    String,
    String,
    f64,
    f64,
    Vec<(MapVerdict, &'static str, &'static str)>,
);

/// Stylesheet + markers, the legend, its height and width and entries, of
/// verdict maps, as SVG text.
fn fixed_parts() -> &'static FixedParts {
    static PARTS: std::sync::OnceLock<FixedParts> = std::sync::OnceLock::new();
    PARTS.get_or_init(|| {
        let (group, height, width, entries) = legend(Overlay::Verdicts, None);
        (
            defs(Overlay::Verdicts).to_string(),
            group.to_string(),
            height,
            width,
            entries,
        )
    })
}

fn verdict_class(slug: &str) -> String {
    if slug == "idle" {
        "idle".into()
    } else {
        format!("nmv-{slug}")
    }
}

fn defs(overlay: Overlay<'_>) -> Definitions {
    let mut defs = Definitions::new();
    for v in MapVerdict::ALL {
        defs = defs.add(marker(v.slug()));
    }
    if matches!(overlay, Overlay::Scenario(_)) {
        defs = defs.add(marker("idle"));
    }
    defs
}

fn box_size(lines: &[(String, &'static str)]) -> Size {
    let widest = lines.iter().map(|(l, _)| text_width(l)).fold(0.0, f64::max);
    Size {
        width: round2(widest + 2.0 * PAD_X),
        height: round2(LINE_HEIGHT * lines.len() as f64 + 2.0 * PAD_Y),
    }
}

fn round2(v: f64) -> f64 {
    crate::site::svg::round2(v)
}

/// Hover text of a reaction: name, equation, ΔG' range, verdict.
fn reaction_hover(ctx: &MapContext<'_>, rid: &str, spec: &MapSpec<'_>) -> String {
    let overlay = spec.overlay;
    let r = ctx.reactions[rid];
    // A small map shortens long names and equations (the page has them).
    let cut = |text: &str| {
        if spec.max_metabolites.is_some() {
            shorten(text, SMALL_HOVER_CHARS)
        } else {
            text.to_string()
        }
    };
    let mut s = if r.name.is_empty() {
        r.id.clone()
    } else {
        format!("{} — {}", r.id, cut(&r.name))
    };
    s.push('\n');
    s.push_str(&cut(&r.equation));
    match &r.dg_range {
        Some(range) => s.push_str(&format!(
            "\nΔG′ range: {} to {} kJ/mol",
            energy(range.min),
            energy(range.max)
        )),
        None => s.push_str("\nΔG′ range: unknown"),
    }
    match overlay {
        Overlay::Verdicts => {
            s.push_str(&format!("\nMap style: {}", reaction_verdict(r).words()));
        }
        Overlay::Scenario(id) => match r.scenario_verdicts.iter().find(|v| v.scenario == id) {
            Some(v) => s.push_str(&format!(
                "\nFlux in {id}: {} ({})",
                crate::site::format::number(v.flux),
                MapVerdict::from_verdict(v.verdict).words()
            )),
            None => s.push_str(&format!("\nNo flux in {id}")),
        },
    }
    let (errors, warnings) = ctx.counts.get(rid).copied().unwrap_or_default();
    if errors + warnings > 0 {
        s.push_str(&format!(
            "\nFindings: {errors} error(s), {warnings} warning(s)"
        ));
    }
    s
}

/// Path of an arrow from box `a` to box `b` through `bends`, leaving and
/// entering boxes on the side facing the next point.
fn edge_path(a: &Placed, b: &Placed, bends: &[(f64, f64)]) -> String {
    let first_target = bends.first().copied().unwrap_or((b.x, b.y));
    let start = if first_target.1 > a.y {
        (a.x, a.bottom())
    } else {
        (a.x, a.top())
    };
    let last_source = bends.last().copied().unwrap_or((a.x, a.y));
    let end = if last_source.1 < b.y {
        (b.x, b.top())
    } else {
        (b.x, b.bottom())
    };
    let mut points = vec![start];
    points.extend_from_slice(bends);
    points.push(end);
    let mut d = format!("M{},{}", round2(points[0].0), round2(points[0].1));
    for pair in points.windows(2) {
        let (p, q) = (pair[0], pair[1]);
        let mid = round2((p.1 + q.1) / 2.0);
        d.push_str(&format!(
            " C{},{} {},{} {},{}",
            round2(p.0),
            mid,
            round2(q.0),
            mid,
            round2(q.0),
            round2(q.1)
        ));
    }
    d
}

type LegendParts = (
    Group,
    f64,
    f64,
    Vec<(MapVerdict, &'static str, &'static str)>,
);

/// The legend: every verdict with its colour, line pattern and glyph, then
/// the loop mark, side labels and metabolite boxes.
fn legend(overlay: Overlay<'_>, scenario_note: Option<String>) -> LegendParts {
    let mut g = Group::new().set("class", "legend");
    g = g.add(text(0.0, 12.0, "legend-title", "Key".into()));
    let mut entries = Vec::new();
    let mut items: Vec<Group> = Vec::new();
    for v in MapVerdict::ALL {
        let (dash, _) = line_style(v);
        let slug = v.slug();
        items.push(
            Group::new()
                .add(
                    Path::new()
                        .set("class", format!("edge nmv-{slug}"))
                        .set("d", "M0,-4 L34,-4")
                        .set("marker-end", format!("url(#nm-head-{slug})")),
                )
                .add(text(42.0, 0.0, &format!("glyph-{slug}"), glyph(v).into()))
                .add(text(56.0, 0.0, "legend-text", v.words().into())),
        );
        entries.push((v, dash, glyph(v)));
    }
    if matches!(overlay, Overlay::Scenario(_)) {
        items.push(
            Group::new()
                .add(
                    Path::new()
                        .set("class", "edge idle")
                        .set("d", "M0,-4 L34,-4")
                        .set("style", "stroke:#c4c8ce;stroke-width:1.5"),
                )
                .add(text(
                    56.0,
                    0.0,
                    "legend-text",
                    "no flux in the scenario".into(),
                )),
        );
    }
    items.push(
        Group::new()
            .add(text(0.0, 0.0, "rid", LOOP_GLYPH.into()))
            .add(text(
                18.0,
                0.0,
                "legend-text",
                "member of an internal loop".into(),
            )),
    );
    items.push(
        Group::new()
            .add(text(0.0, 0.0, "side", "atp → adp".into()))
            .add(text(70.0, 0.0, "legend-text", "side compounds".into())),
    );
    items.push(
        Group::new()
            .add(
                Rectangle::new()
                    .set("x", 0)
                    .set("y", -11)
                    .set("width", 34)
                    .set("height", 14)
                    .set("rx", 7)
                    .set("style", "fill:#f6f7f9;stroke:#5b6270"),
            )
            .add(text(42.0, 0.0, "legend-text", "metabolite".into())),
    );
    let rows = items.len().div_ceil(LEGEND_COLUMNS);
    for (i, item) in items.into_iter().enumerate() {
        let (col, row) = (i % LEGEND_COLUMNS, i / LEGEND_COLUMNS);
        g = g.add(item.set(
            "transform",
            format!(
                "translate({},{})",
                round2(col as f64 * LEGEND_ITEM_WIDTH),
                round2(30.0 + row as f64 * 20.0)
            ),
        ));
    }
    let mut height = 30.0 + rows as f64 * 20.0;
    if let Some(note) = scenario_note {
        g = g.add(text(0.0, height + 6.0, "legend-text", note));
        height += 20.0;
    }
    // `IDLE` documents the colour the stylesheet gives idle arrows.
    debug_assert_eq!(IDLE, "#c4c8ce");
    (
        g,
        height,
        LEGEND_ITEM_WIDTH * LEGEND_COLUMNS as f64,
        entries,
    )
}

/// One node of the overview map.
#[derive(Debug, Clone)]
pub struct GroupNode {
    pub name: String,
    pub href: String,
    pub reactions: usize,
    pub errors: usize,
    pub warnings: usize,
}

/// The overview: one box per group (name, reactions, error and warning
/// counts), lines between groups that pass metabolites on.
pub fn draw_overview(title: &str, groups: &[GroupNode], links: &[(usize, usize)]) -> Drawn {
    let mut graph: DiGraph<Size, ()> = DiGraph::new();
    let mut lines_of = Vec::new();
    for g in groups {
        let lines = vec![
            (shorten(&g.name, 30), "gname"),
            (
                format!(
                    "{} reactions · ✖ {} · ▲ {}",
                    g.reactions, g.errors, g.warnings
                ),
                "side",
            ),
        ];
        graph.add_node(box_size(&lines));
        lines_of.push(lines);
    }
    for &(a, b) in links {
        graph.add_edge(NodeIndex::new(a), NodeIndex::new(b), ());
    }
    let placed = layout::layered(&graph);
    let mut edge_group = Group::new().set("class", "edges");
    for (e, &(a, b)) in links.iter().enumerate() {
        edge_group = edge_group.add(Path::new().set("class", "link").set(
            "d",
            edge_path(&placed.nodes[a], &placed.nodes[b], &placed.bends[e]),
        ));
    }
    let mut node_group = Group::new().set("class", "nodes");
    let mut nodes = Vec::new();
    let mut hrefs = Vec::new();
    for (i, g) in groups.iter().enumerate() {
        let p = placed.nodes[i];
        let class = if g.errors > 0 {
            "grp has-errors"
        } else if g.warnings > 0 {
            "grp has-warnings"
        } else {
            "grp"
        };
        let mut el = Group::new()
            .set("class", class)
            .add(Title::new(format!(
                "{}: {} reactions, {} error(s), {} warning(s)",
                g.name, g.reactions, g.errors, g.warnings
            )))
            .add(
                Rectangle::new()
                    .set("x", round2(p.left()))
                    .set("y", round2(p.top()))
                    .set("width", round2(p.width))
                    .set("height", round2(p.height))
                    .set("rx", 4),
            );
        let mut labels = Vec::new();
        for (k, (line, class)) in lines_of[i].iter().enumerate() {
            let x = round2(p.left() + PAD_X);
            let y = round2(p.top() + PAD_Y + LINE_HEIGHT * (k as f64 + 1.0) - 3.0);
            el = el.add(text(x, y, class, line.clone()));
            labels.push((
                x,
                p.top() + PAD_Y + LINE_HEIGHT * k as f64,
                text_width(line),
                LINE_HEIGHT,
            ));
        }
        hrefs.push(g.href.clone());
        node_group = node_group.add(Anchor::new().set("href", g.href.clone()).add(el));
        nodes.push(DrawnNode {
            id: g.name.clone(),
            is_reaction: false,
            placed: p,
            labels,
        });
    }
    let key = Group::new()
        .set("class", "legend")
        .add(text(0.0, 12.0, "legend-title", "Key".into()))
        .add(text(
            0.0,
            30.0,
            "legend-text",
            "one box per group of reactions; ✖ errors and ▲ warnings among the findings on its reactions"
                .into(),
        ))
        .add(text(
            0.0,
            48.0,
            "legend-text",
            "red solid frame: has errors · amber dashed frame: warnings only · grey line: groups that pass metabolites on"
                .into(),
        ));
    let frame = Frame {
        title: Title::new(title.to_string()).to_string(),
        width: placed.width,
        height: placed.height,
        markers: Vec::new(),
        legend: key.to_string(),
        legend_height: 60.0,
        legend_width: 100.0 * CHAR_WIDTH,
        legend_inline: true,
        all_markers: String::new(),
    };
    let body = Group::new()
        .set("transform", format!("translate({MARGIN},{MARGIN})"))
        .add(edge_group)
        .add(node_group)
        .to_string();
    Drawn {
        svg: frame.inline(&body),
        nodes,
        links: hrefs,
        legend: Vec::new(),
        frame,
    }
}

/// The stylesheet of every map, shared by the pages as
/// `assets/network-map.css` (standalone `.svg` files carry their own copy).
pub fn shared_stylesheet() -> String {
    stylesheet()
}

/// The key of verdict maps as a file of its own
/// (`assets/network-map-legend.svg`), shown beside every map of a page.
pub fn shared_legend() -> String {
    let parts = fixed_parts();
    let (w, h) = (
        round2(parts.3 + 2.0 * MARGIN),
        round2(parts.2 + 2.0 * MARGIN),
    );
    format!(
        "<svg class=\"nm net-map-key\" height=\"{h}\" role=\"img\" viewBox=\"0 0 {w} {h}\" width=\"{w}\" xmlns=\"http://www.w3.org/2000/svg\">\n<title>Key of the network maps</title>\n{}\n{}\n<g transform=\"translate({MARGIN},{MARGIN})\">\n{}\n</g>\n</svg>\n",
        Style::new(stylesheet()),
        parts.0,
        parts.1
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Colour-vision-deficiency simulation matrices for severity 1.0
    /// (protanopia, deuteranopia, tritanopia), applied to linear sRGB:
    /// Machado, Oliveira & Fernandes, "A physiologically-based model for
    /// simulation of color vision deficiency", IEEE Trans. Vis. Comput.
    /// Graph. 15 (2009) 1291–1298, table of precomputed matrices.
    const MACHADO_2009: [(&str, [[f64; 3]; 3]); 3] = [
        (
            "protanopia",
            [
                [0.152286, 1.052583, -0.204868],
                [0.114503, 0.786281, 0.099216],
                [-0.003882, -0.048116, 1.051998],
            ],
        ),
        (
            "deuteranopia",
            [
                [0.367322, 0.860646, -0.227968],
                [0.280085, 0.672501, 0.047413],
                [-0.011820, 0.042940, 0.968881],
            ],
        ),
        (
            "tritanopia",
            [
                [1.255528, -0.076749, -0.178779],
                [-0.078411, 0.930809, 0.147602],
                [0.004733, 0.691367, 0.303900],
            ],
        ),
    ];

    /// sRGB transfer function and sRGB→XYZ (D65) matrix: IEC 61966-2-1.
    fn linear(hex: &str) -> [f64; 3] {
        let c = |i: usize| {
            let v = u8::from_str_radix(&hex[i..i + 2], 16).unwrap() as f64 / 255.0;
            if v <= 0.04045 {
                v / 12.92
            } else {
                ((v + 0.055) / 1.055).powf(2.4)
            }
        };
        [c(1), c(3), c(5)]
    }

    /// CIE 1976 L*a*b* of a linear sRGB colour (CIE 15:2004, D65 white).
    fn lab(rgb: [f64; 3]) -> [f64; 3] {
        let [r, g, b] = rgb.map(|v| v.clamp(0.0, 1.0));
        let x = 0.4124 * r + 0.3576 * g + 0.1805 * b;
        let y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
        let z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
        let f = |t: f64| {
            let d: f64 = 6.0 / 29.0;
            if t > d.powi(3) {
                t.cbrt()
            } else {
                t / (3.0 * d * d) + 4.0 / 29.0
            }
        };
        let (fx, fy, fz) = (f(x / 0.95047), f(y), f(z / 1.08883));
        [116.0 * fy - 16.0, 500.0 * (fx - fy), 200.0 * (fy - fz)]
    }

    fn delta_e(a: [f64; 3], b: [f64; 3]) -> f64 {
        ((a[0] - b[0]).powi(2) + (a[1] - b[1]).powi(2) + (a[2] - b[2]).powi(2)).sqrt()
    }

    #[test]
    fn palette_survives_colour_blindness() {
        // Threshold: ΔE*ab ≥ 20 between every two verdict colours, for
        // normal vision and each simulated dichromacy. ΔE ≈ 2.3 is a just
        // noticeable difference (Sharma, Digital Color Imaging Handbook,
        // 2003); 20 keeps thin lines apart at a glance (common practice).
        let mut views: Vec<(&str, [[f64; 3]; 3])> = vec![(
            "normal",
            [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]],
        )];
        views.extend(MACHADO_2009);
        for (name, m) in views {
            let sim = |hex: &str| {
                let c = linear(hex);
                let row = |k: usize| m[k][0] * c[0] + m[k][1] * c[1] + m[k][2] * c[2];
                lab([row(0), row(1), row(2)])
            };
            for (i, a) in MapVerdict::ALL.iter().enumerate() {
                for b in &MapVerdict::ALL[i + 1..] {
                    let d = delta_e(sim(colour(*a)), sim(colour(*b)));
                    assert!(d >= 20.0, "{name}: {a:?} vs {b:?} only ΔE {d:.1}");
                }
            }
        }
    }

    #[test]
    fn second_channel_alone_tells_verdicts_apart() {
        let styles: std::collections::BTreeSet<(String, String)> = MapVerdict::ALL
            .iter()
            .map(|v| {
                let (dash, width) = line_style(*v);
                (format!("{dash}/{width}"), glyph(*v).to_string())
            })
            .collect();
        let dashes: std::collections::BTreeSet<String> =
            styles.iter().map(|s| s.0.clone()).collect();
        let glyphs: std::collections::BTreeSet<String> =
            styles.iter().map(|s| s.1.clone()).collect();
        assert_eq!(dashes.len(), 5);
        assert_eq!(glyphs.len(), 5);
    }

    #[test]
    fn edge_path_leaves_downward_boxes_at_the_bottom() {
        let a = Placed {
            x: 50.0,
            y: 10.0,
            width: 40.0,
            height: 20.0,
            layer: 0,
        };
        let b = Placed {
            x: 80.0,
            y: 100.0,
            width: 40.0,
            height: 20.0,
            layer: 1,
        };
        assert_eq!(edge_path(&a, &b, &[]), "M50,20 C50,55 80,55 80,90");
        // Upward (a reversed edge): top of a to bottom of b.
        assert_eq!(edge_path(&b, &a, &[]), "M80,90 C80,55 50,55 50,20");
    }
}
