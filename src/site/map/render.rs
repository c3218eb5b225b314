//! Drawing a map as SVG: boxes for reactions, rounded boxes for
//! metabolites, arrows styled by verdict with colour AND line pattern,
//! a glyph in every reaction box, a legend, links and hover text
//! (`<title>`).
//!
//! Every site draws thousands of maps (Recon3D: about 16,000
//! neighbourhoods), so the SVG is written straight into one `String` and
//! kept terse: one `<a>` per reaction holds its hover text, its arrows
//! (one path for the lines, one for the heads, drawn as small triangles
//! instead of per-map `<marker>` definitions), its box and its labels;
//! coordinates have at most one decimal; the styles live in the shared
//! stylesheet (`assets/network-map.css`), under the short class names
//! below. A standalone `.svg` file carries its own copy of the stylesheet
//! and the legend ([`Drawn::standalone`]).
//!
//! | class | on | meaning |
//! |---|---|---|
//! | `r` | `<a>` / `<g>` | a reaction: its arrows and its box |
//! | `m` | `<a>` / `<g>` | a metabolite box |
//! | `sj` | with `r` or `m` | the page's subject (yellow fill) |
//! | `vc` `vm` `vo` `ve` `vn` | with `r` | verdict: contradiction, marginal, consistent, near equilibrium, no data |
//! | `vi` | with `r` | no flux in the scenario (idle) |
//! | `e`, `h` | `<path>` | arrow lines, arrow heads |
//! | `g` | `<tspan>` / `<text>` | the verdict glyph |
//! | `sd` | `<text>` | side compounds and notes under a reaction id |
//! | `mo` | `<text>` | link to another part of a group map |
//! | `kt` | `<text>` | title of a legend |
//!
//! Model strings only go into `<text>` and `<title>` content, escaped by
//! minijinja's HTML escaper. Attributes carry numbers, fixed words, and
//! links built from page names that `check_slugs` has proved safe (ASCII
//! letters, digits, `_`, `-`).

use super::layout::{self, Placed, Size};
use super::{reaction_verdict, MapContext, MapSpec, MapVerdict, Overlay};
use crate::report::ReactionView;
use crate::site::format::energy;
use crate::site::species_chart::shorten;
use minijinja::HtmlEscape;
use petgraph::graph::{DiGraph, NodeIndex};
use std::fmt::Write as _;

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
/// Length and half width of an arrow head.
const HEAD_LENGTH: f64 = 9.0;
const HEAD_HALF: f64 = 4.0;

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

/// Class of a verdict in the drawing (see the table at the top).
pub fn class(v: MapVerdict) -> &'static str {
    match v {
        MapVerdict::Contradiction => "vc",
        MapVerdict::Marginal => "vm",
        MapVerdict::Consistent => "vo",
        MapVerdict::Equilibrium => "ve",
        MapVerdict::NoData => "vn",
    }
}

/// Class of a reaction without flux in a scenario.
const IDLE_CLASS: &str = "vi";

/// Every channel of a verdict's style in one place.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MapVerdictStyle {
    pub colour: &'static str,
    /// `stroke-dasharray` (`none` = solid).
    pub dash: &'static str,
    pub width: f64,
    pub glyph: &'static str,
    /// Class of the reaction's `<a>` in the drawing.
    pub class: &'static str,
}

impl MapVerdictStyle {
    pub fn of(v: MapVerdict) -> MapVerdictStyle {
        let (dash, width) = line_style(v);
        MapVerdictStyle {
            colour: colour(v),
            dash,
            width,
            glyph: glyph(v),
            class: class(v),
        }
    }
}

/// Marks a member of an internal loop.
pub const LOOP_GLYPH: &str = "↻";
/// Colour of reactions without flux in a scenario.
const IDLE: &str = "#c4c8ce";

/// The stylesheet of every map (fixed text of ours, no `<`, `>` or `&`).
fn stylesheet() -> String {
    let mut css = String::from(
        ".nm{font-family:system-ui,-apple-system,'Segoe UI',Roboto,sans-serif;font-size:12px}\
         .nm text{fill:#1d2330}\
         .nm .m rect{fill:#f6f7f9;stroke:#5b6270;stroke-width:1}\
         .nm .r rect{fill:#fff;stroke-width:2}\
         .nm .sj rect{fill:#fff6d6;stroke-width:3.5}\
         .nm .sd{fill:#5b6270;font-size:11px}\
         .nm .e{fill:none}\
         .nm .h{stroke:none}\
         .nm .g{font-weight:700}\
         .nm .mo{fill:#1f5fa8;text-decoration:underline}\
         .nm .kt{font-weight:700}\
         .nm .grp rect{fill:#fff;stroke:#5b6270;stroke-width:1.5}\
         .nm .grp.has-errors rect{stroke:#b8321a;stroke-width:3}\
         .nm .grp.has-warnings rect{stroke:#e69b00;stroke-width:2.5;stroke-dasharray:8 4}\
         .nm .link{fill:none;stroke:#9aa1ab;stroke-width:1.5}\
         .nm a:hover rect{fill:#eef4fb}",
    );
    for v in MapVerdict::ALL {
        let (dash, width) = line_style(v);
        let c = colour(v);
        let k = class(v);
        let _ = write!(
            css,
            ".nm .{k} rect{{stroke:{c};stroke-dasharray:{dash}}}\
             .nm .{k} .e{{stroke:{c};stroke-width:{width};stroke-dasharray:{dash}}}\
             .nm .{k} .h,.nm .{k} .g{{fill:{c}}}"
        );
    }
    let _ = write!(
        css,
        ".nm .{IDLE_CLASS} rect,.nm .{IDLE_CLASS} .e{{stroke:{IDLE};stroke-dasharray:1 3}}\
         .nm .{IDLE_CLASS} .h{{fill:{IDLE}}}"
    );
    css
}

/// Writes `v` with at most one decimal (`12`, `12.5`, `-0.5`).
fn num(out: &mut String, v: f64) {
    let tenths = (v * 10.0).round() as i64;
    if tenths < 0 {
        out.push('-');
    }
    let t = tenths.unsigned_abs();
    let _ = write!(out, "{}", t / 10);
    if t % 10 != 0 {
        let _ = write!(out, ".{}", t % 10);
    }
}

/// Text content, escaped.
fn esc(out: &mut String, s: &str) {
    let _ = write!(out, "{}", HtmlEscape(s));
}

fn escaped(s: &str) -> String {
    HtmlEscape(s).to_string()
}

/// `<text [class] x y>`.
fn text_open(out: &mut String, x: f64, y: f64, class: &str) {
    out.push_str("<text");
    if !class.is_empty() {
        let _ = write!(out, " class=\"{class}\"");
    }
    out.push_str(" x=\"");
    num(out, x);
    out.push_str("\" y=\"");
    num(out, y);
    out.push_str("\">");
}

/// `<text [class] x y>` around `content_html` (already escaped).
fn text_el(out: &mut String, x: f64, y: f64, class: &str, content_html: &str) {
    text_open(out, x, y, class);
    out.push_str(content_html);
    out.push_str("</text>");
}

fn rect_el(out: &mut String, p: &Placed, rx: Option<u32>) {
    out.push_str("<rect x=\"");
    num(out, p.left());
    out.push_str("\" y=\"");
    num(out, p.top());
    out.push_str("\" width=\"");
    num(out, p.width);
    out.push_str("\" height=\"");
    num(out, p.height);
    if let Some(rx) = rx {
        let _ = write!(out, "\" rx=\"{rx}");
    }
    out.push_str("\"/>");
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

/// The labels of a reaction box and its hover text, computed once per
/// reaction for the verdict maps ([`MapContext::reaction_text`]) and
/// reused by every map that shows the reaction.
#[derive(Debug, Clone)]
pub struct ReactionText {
    /// `None`: no flux in the scenario (no glyph).
    verdict: Option<MapVerdict>,
    /// The id (shortened) and the loop mark, escaped.
    id_html: String,
    /// Characters of the first line, glyph included.
    first_chars: usize,
    /// Side compounds ("atp_c → adp_c"), escaped, and their characters.
    side_html: Option<String>,
    side_chars: usize,
    /// Hover text of small maps (long names and equations shortened), escaped.
    hover_small: String,
}

impl ReactionText {
    /// Labels of the reaction at position `i` with its side compounds in
    /// the direction `sign` (+1 as written), with the verdict `verdict`.
    fn new(ctx: &MapContext<'_>, i: usize, sign: f64, verdict: Option<MapVerdict>) -> Self {
        let r = &ctx.report.reactions[i];
        let mut first = shorten(&r.id, ID_CHARS);
        if !r.loops.is_empty() {
            first.push(' ');
            first.push_str(LOOP_GLYPH);
        }
        let first_chars = first.chars().count() + if verdict.is_some() { 2 } else { 0 };
        let side = |want: f64| -> Vec<&str> {
            r.participants
                .iter()
                .filter(|p| ctx.side.contains(&p.metabolite) && p.coefficient * sign * want > 0.0)
                .map(|p| p.metabolite.as_str())
                .collect()
        };
        let (side_in, side_out) = (side(-1.0), side(1.0));
        let (side_html, side_chars) = if side_in.is_empty() && side_out.is_empty() {
            (None, 0)
        } else {
            let words = format!("{} → {}", side_in.join(" + "), side_out.join(" + "));
            let line = shorten(words.trim(), SIDE_CHARS);
            (Some(escaped(&line)), line.chars().count())
        };
        ReactionText {
            verdict,
            id_html: escaped(&first),
            first_chars,
            side_html,
            side_chars,
            hover_small: String::new(),
        }
    }

    /// The cached labels of a verdict map.
    pub(crate) fn for_verdicts(ctx: &MapContext<'_>, i: usize) -> Self {
        let r = &ctx.report.reactions[i];
        let mut text = ReactionText::new(ctx, i, 1.0, Some(reaction_verdict(r)));
        text.hover_small = reaction_hover(ctx, r, Overlay::Verdicts, true);
        text
    }
}

/// The label and hover text of a metabolite box, computed once per
/// metabolite ([`MapContext::metabolite_text`]).
#[derive(Debug, Clone)]
pub struct MetaboliteText {
    /// The id (shortened), escaped, and its characters.
    label_html: String,
    label_chars: usize,
    /// Hover text, escaped: the name (and the id when the label shortens
    /// it); empty when it would only repeat the label.
    hover: String,
}

impl MetaboliteText {
    pub(crate) fn new(ctx: &MapContext<'_>, j: u32) -> Self {
        let (id, view) = ctx.metabolite_at(j);
        let label = shorten(id, ID_CHARS);
        let name = view.map_or("", |v| v.name.as_str());
        let shortened = label != id;
        let mut hover = String::new();
        if shortened {
            esc(&mut hover, id);
        }
        if !name.is_empty() && name != id {
            if shortened {
                hover.push_str(" — ");
            }
            esc(&mut hover, name);
        }
        MetaboliteText {
            label_html: escaped(&label),
            label_chars: label.chars().count(),
            hover,
        }
    }
}

/// One reaction as it is drawn on one map.
struct ReactionNode<'r, 't> {
    view: &'r ReactionView,
    node: usize,
    text: std::borrow::Cow<'t, ReactionText>,
    /// "+3 more not drawn".
    more: Option<String>,
    /// Verdict class (or idle).
    class: &'static str,
    /// Arrow width by flux (scenario overlay).
    width: Option<f64>,
}

/// Where a link from the map's page to `folder/slug.html` goes.
fn href(out: &mut String, spec: &MapSpec<'_>, folder: &str, slug: &str) {
    if spec.here != folder {
        out.push_str(spec.root);
        out.push_str(folder);
        out.push('/');
    }
    out.push_str(slug);
    out.push_str(".html");
}

/// Draws one map of reactions.
pub fn draw(ctx: &MapContext<'_>, spec: &MapSpec<'_>) -> Drawn {
    let scenario_flux = |r: &ReactionView| -> Option<(f64, MapVerdict)> {
        let Overlay::Scenario(s) = spec.overlay else {
            return None;
        };
        r.scenario_verdicts
            .iter()
            .find(|v| v.scenario == s && v.flux != 0.0)
            .map(|v| (v.flux, MapVerdict::from_verdict(v.verdict)))
    };
    let positions: Vec<usize> = spec
        .reactions
        .iter()
        .filter_map(|r| ctx.reaction_index(r))
        .collect();
    let max_flux = positions
        .iter()
        .filter_map(|&i| scenario_flux(&ctx.report.reactions[i]))
        .map(|(f, _)| f.abs())
        .fold(0.0, f64::max);
    let small = spec.max_metabolites.is_some();

    // Nodes: reactions in the given order, then their main metabolites.
    let capacity = positions.len() * 3;
    let mut graph: DiGraph<Size, ()> = DiGraph::with_capacity(capacity, capacity);
    let mut reactions: Vec<ReactionNode> = Vec::with_capacity(positions.len());
    // Metabolite nodes in order of appearance: (metabolite, node).
    let mut metabolites: Vec<(u32, usize)> = Vec::with_capacity(capacity);
    let node_of = |metabolites: &[(u32, usize)], m: u32| {
        metabolites.iter().find(|&&(k, _)| k == m).map(|&(_, n)| n)
    };
    // Edge list: (tail, head, index into `reactions`).
    let mut edges: Vec<(usize, usize, usize)> = Vec::with_capacity(capacity);
    let mut drawn_main: Vec<(u32, f64)> = Vec::new();
    for &i in &positions {
        let r = &ctx.report.reactions[i];
        let flux = scenario_flux(r);
        let sign = flux.map_or(1.0, |(f, _)| f.signum());
        let (text, vclass, width) = match spec.overlay {
            Overlay::Verdicts => {
                let t = ctx.reaction_text(i);
                let v = t.verdict.unwrap_or(MapVerdict::NoData);
                (std::borrow::Cow::Borrowed(t), class(v), None)
            }
            Overlay::Scenario(_) => {
                let v = flux.map(|(_, v)| v);
                let t = ReactionText::new(ctx, i, sign, v);
                let (c, w) = match flux {
                    Some((f, v)) => (
                        class(v),
                        Some(1.5 + 4.5 * f.abs() / max_flux.max(f64::MIN_POSITIVE)),
                    ),
                    None => (IDLE_CLASS, None),
                };
                (std::borrow::Cow::Owned(t), c, w)
            }
        };
        // On a small map, metabolites beyond the cap are left out; the
        // reaction box says how many.
        let main = ctx.main_at(i);
        drawn_main.clear();
        let mut new_boxes = 0;
        for &(m, c) in main {
            let known = node_of(&metabolites, m).is_some();
            match spec.max_metabolites {
                Some(cap) if !known && metabolites.len() + new_boxes >= cap => {}
                _ => {
                    if !known && !drawn_main.iter().any(|&(d, _)| d == m) {
                        new_boxes += 1;
                    }
                    drawn_main.push((m, c));
                }
            }
        }
        let left_out = main.len() - drawn_main.len();
        let more = (left_out > 0).then(|| format!("+{left_out} more not drawn"));
        let mut widest = text.first_chars.max(text.side_chars);
        if let Some(m) = &more {
            widest = widest.max(m.chars().count());
        }
        let lines = 1 + usize::from(text.side_html.is_some()) + usize::from(more.is_some());
        let node = graph.add_node(box_size(widest, lines)).index();
        let k = reactions.len();
        for &(m, coefficient) in &drawn_main {
            let mnode = match node_of(&metabolites, m) {
                Some(n) => n,
                None => {
                    let mut chars = ctx.metabolite_text(m).label_chars;
                    let mut lines = 1;
                    if !spec.elsewhere.is_empty() {
                        if let Some(links) = spec.elsewhere.get(ctx.metabolite_at(m).0) {
                            lines += 1;
                            chars = chars.max(more_line(links).chars().count());
                        }
                    }
                    let n = graph.add_node(box_size(chars, lines)).index();
                    metabolites.push((m, n));
                    n
                }
            };
            if coefficient * sign < 0.0 {
                edges.push((mnode, node, k));
            } else {
                edges.push((node, mnode, k));
            }
        }
        reactions.push(ReactionNode {
            view: r,
            node,
            text,
            more,
            class: vclass,
            width,
        });
    }
    for &(a, b, _) in &edges {
        graph.add_edge(NodeIndex::new(a), NodeIndex::new(b), ());
    }
    let placed = layout::layered(&graph);

    // Drawing: each reaction (arrows, box, labels) in one link, then the
    // metabolites, so arrow heads end on top of the boxes they point at.
    let mut links = Vec::with_capacity(graph.node_count());
    let mut drawn_nodes = Vec::with_capacity(graph.node_count());
    let mut body = String::with_capacity(600 + 250 * graph.node_count());
    let mut e = 0;
    for (k, rn) in reactions.iter().enumerate() {
        let r = rn.view;
        body.push_str("<a href=\"");
        let at = body.len();
        href(&mut body, spec, "reactions", &r.slug);
        links.push(body[at..].to_string());
        let _ = write!(body, "\" class=\"r {}", rn.class);
        if spec.subject == Some(r.id.as_str()) {
            body.push_str(" sj");
        }
        body.push_str("\"><title>");
        if small {
            body.push_str(&rn.text.hover_small);
        } else {
            body.push_str(&reaction_hover(ctx, r, spec.overlay, false));
        }
        body.push_str("</title>");
        // The arrows: one path of lines, one of heads.
        let first_edge = e;
        while e < edges.len() && edges[e].2 == k {
            e += 1;
        }
        if e > first_edge {
            let arrows = || {
                edges[first_edge..e]
                    .iter()
                    .zip(&placed.bends[first_edge..e])
            };
            body.push_str("<path class=\"e\" d=\"");
            for (&(a, b, _), bends) in arrows() {
                edge_path(&mut body, &placed.nodes[a], &placed.nodes[b], bends, true);
            }
            body.push('"');
            if let Some(w) = rn.width {
                let _ = write!(body, " style=\"stroke-width:{w:.2}\"");
            }
            body.push_str("/><path class=\"h\" d=\"");
            for (&(a, b, _), bends) in arrows() {
                arrow_head(&mut body, &placed.nodes[a], &placed.nodes[b], bends);
            }
            body.push_str("\"/>");
        }
        // The box and its labels.
        let p = placed.nodes[rn.node];
        rect_el(&mut body, &p, None);
        let x = p.left() + PAD_X;
        let baseline = |i: usize| p.top() + PAD_Y + LINE_HEIGHT * (i as f64 + 1.0) - 3.0;
        let mut labels = Vec::with_capacity(3);
        let mut line = |i: usize, chars: usize| {
            labels.push((
                x,
                p.top() + PAD_Y + LINE_HEIGHT * i as f64,
                chars as f64 * CHAR_WIDTH,
                LINE_HEIGHT,
            ));
            baseline(i)
        };
        let y = line(0, rn.text.first_chars);
        text_open(&mut body, x, y, "");
        if let Some(v) = rn.text.verdict {
            let _ = write!(body, "<tspan class=\"g\">{}</tspan> ", glyph(v));
        }
        body.push_str(&rn.text.id_html);
        body.push_str("</text>");
        let mut i = 1;
        if let Some(side) = &rn.text.side_html {
            let y = line(i, rn.text.side_chars);
            text_el(&mut body, x, y, "sd", side);
            i += 1;
        }
        if let Some(more) = &rn.more {
            let y = line(i, more.chars().count());
            text_el(&mut body, x, y, "sd", more);
        }
        body.push_str("</a>");
        drawn_nodes.push(DrawnNode {
            id: r.id.clone(),
            is_reaction: true,
            placed: p,
            labels,
        });
    }
    for &(m, node) in &metabolites {
        let p = placed.nodes[node];
        let (id, view) = ctx.metabolite_at(m);
        let text = ctx.metabolite_text(m);
        let subject = if spec.subject == Some(id) { " sj" } else { "" };
        // No page, no link.
        match view {
            Some(v) => {
                body.push_str("<a href=\"");
                let at = body.len();
                href(&mut body, spec, "metabolites", &v.slug);
                links.push(body[at..].to_string());
                let _ = write!(body, "\" class=\"m{subject}\">");
            }
            None => {
                let _ = write!(body, "<g class=\"m{subject}\">");
            }
        }
        if !text.hover.is_empty() {
            let _ = write!(body, "<title>{}</title>", text.hover);
        }
        rect_el(&mut body, &p, Some(10));
        let x = p.left() + PAD_X;
        let mut labels = vec![(
            x,
            p.top() + PAD_Y,
            text.label_chars as f64 * CHAR_WIDTH,
            LINE_HEIGHT,
        )];
        text_el(
            &mut body,
            x,
            p.top() + PAD_Y + LINE_HEIGHT - 3.0,
            "",
            &text.label_html,
        );
        body.push_str(if view.is_some() { "</a>" } else { "</g>" });
        if let Some(targets) = spec.elsewhere.get(id) {
            // Links to the other parts, each its own <a>, outside the
            // metabolite's link.
            let top = p.top() + PAD_Y + LINE_HEIGHT;
            let y = top + LINE_HEIGHT - 3.0;
            labels.push((x, top, text_width(&more_line(targets)), LINE_HEIGHT));
            let prefix = "↗ ";
            text_el(&mut body, x, y, "sd", prefix);
            let mut cx = x + text_width(prefix);
            for (label, target) in targets {
                let _ = write!(body, "<a href=\"{target}\">");
                text_el(&mut body, cx, y, "mo", &escaped(label));
                body.push_str("</a>");
                links.push(target.clone());
                cx += text_width(label) + CHAR_WIDTH;
            }
        }
        drawn_nodes.push(DrawnNode {
            id: id.to_string(),
            is_reaction: false,
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
    // A verdict map leaves its legend to the shared key
    // (`assets/network-map-legend.svg`) on pages; only its standalone
    // copy carries one. A scenario map keeps its own (idle arrows, widths).
    let (legend, legend_entries) = match spec.overlay {
        Overlay::Verdicts => (Legend::Verdicts, fixed_legend().entries.clone()),
        Overlay::Scenario(_) => {
            let l = legend(spec.overlay, scenario_note);
            let entries = l.entries.clone();
            (Legend::Own(l), entries)
        }
    };
    let mut title = String::with_capacity(spec.title.len() + 16);
    esc(&mut title, &spec.title);
    let frame = Frame {
        title,
        width: placed.width,
        height: placed.height,
        legend,
        body: 0..0,
    };
    let (svg, frame) = frame.inline(&body);
    Drawn {
        svg,
        nodes: drawn_nodes,
        links,
        legend: legend_entries,
        frame,
    }
}

/// The second line of a metabolite box that continues on other parts.
fn more_line(links: &[(String, String)]) -> String {
    let words: Vec<&str> = links.iter().map(|(l, _)| l.as_str()).collect();
    format!("↗ {}", words.join(" "))
}

/// The legend of a map: the shared one of verdict maps, or its own.
#[derive(Debug, Clone, Default)]
enum Legend {
    #[default]
    Verdicts,
    Own(LegendParts),
}

impl Legend {
    fn parts(&self) -> &LegendParts {
        match self {
            Legend::Verdicts => fixed_legend(),
            Legend::Own(l) => l,
        }
    }
}

/// What a map's SVG is assembled from: the inline copy for a page (styles
/// from the shared `assets/network-map.css`, no legend on verdict maps)
/// and the standalone `.svg` (its own stylesheet and the legend).
#[derive(Debug, Clone, Default)]
pub struct Frame {
    /// Escaped.
    title: String,
    width: f64,
    height: f64,
    legend: Legend,
    /// Where the drawing sits in the inline SVG.
    body: std::ops::Range<usize>,
}

impl Frame {
    /// The opening tag and title; the drawing's origin is at the margin.
    fn open(&self, out: &mut String, with_legend: bool, standalone: bool) {
        let legend = self.legend.parts();
        let width = if with_legend {
            self.width.max(legend.width)
        } else {
            self.width
        };
        let w = width + 2.0 * MARGIN;
        let h = self.height
            + 2.0 * MARGIN
            + if with_legend {
                legend.height + MARGIN
            } else {
                0.0
            };
        out.push_str("<svg class=\"nm net-map\" width=\"");
        num(out, w);
        out.push_str("\" height=\"");
        num(out, h);
        let _ = write!(out, "\" viewBox=\"-{MARGIN} -{MARGIN} ");
        num(out, w);
        out.push(' ');
        num(out, h);
        out.push_str("\" role=\"img\"");
        if standalone {
            out.push_str(" xmlns=\"http://www.w3.org/2000/svg\"");
        }
        let _ = write!(out, "><title>{}</title>", self.title);
    }

    fn legend_at(&self, out: &mut String) {
        out.push_str("<g class=\"nm-key\" transform=\"translate(0,");
        num(out, self.height + MARGIN);
        out.push_str(")\">");
        out.push_str(&self.legend.parts().svg);
        out.push_str("</g>");
    }

    /// The map for a page, and the frame that remembers where its drawing is.
    fn inline(mut self, body: &str) -> (String, Frame) {
        let with_legend = matches!(self.legend, Legend::Own(_));
        let mut out = String::with_capacity(body.len() + 200);
        self.open(&mut out, with_legend, false);
        let start = out.len();
        out.push_str(body);
        self.body = start..out.len();
        if with_legend {
            self.legend_at(&mut out);
        }
        out.push_str("</svg>");
        (out, self)
    }
}

impl Drawn {
    /// The drawing itself (boxes, arrows, labels), without frame and legend.
    pub fn body(&self) -> &str {
        self.svg.get(self.frame.body.clone()).unwrap_or_default()
    }

    /// The map as a file of its own (for a paper or a slide): its own
    /// stylesheet and the legend.
    pub fn standalone(&self) -> String {
        let f = &self.frame;
        let mut out = String::with_capacity(self.svg.len() + 8000);
        f.open(&mut out, true, true);
        let _ = write!(out, "<style>{}</style>", stylesheet());
        out.push_str(self.body());
        f.legend_at(&mut out);
        out.push_str("</svg>\n");
        out
    }
}

/// Size of a box for `lines` lines of at most `widest_chars` characters;
/// the width is even, so whole-number left edges give whole-number centres.
fn box_size(widest_chars: usize, lines: usize) -> Size {
    let width = widest_chars as f64 * CHAR_WIDTH + 2.0 * PAD_X;
    Size {
        width: 2.0 * (width / 2.0).ceil(),
        height: LINE_HEIGHT * lines as f64 + 2.0 * PAD_Y,
    }
}

/// Hover text of a reaction, escaped: id and name, equation, ΔG' range,
/// how it is drawn, findings. `small`: long names and equations shortened
/// (the page has them in full).
fn reaction_hover(
    ctx: &MapContext<'_>,
    r: &ReactionView,
    overlay: Overlay<'_>,
    small: bool,
) -> String {
    let mut s = String::with_capacity(64 + r.name.len() + r.equation.len());
    // Model strings escaped; numbers and our own words are safe as they are.
    let model = |s: &mut String, text: &str| {
        if small && text.chars().count() > SMALL_HOVER_CHARS {
            esc(s, &shorten(text, SMALL_HOVER_CHARS));
        } else {
            esc(s, text);
        }
    };
    model(&mut s, &r.id);
    if !r.name.is_empty() {
        s.push_str(" — ");
        model(&mut s, &r.name);
    }
    s.push('\n');
    model(&mut s, &r.equation);
    match &r.dg_range {
        Some(range) => {
            let _ = write!(
                s,
                "\nΔG′ {} to {} kJ/mol",
                energy(range.min),
                energy(range.max)
            );
        }
        None => s.push_str("\nΔG′ unknown"),
    }
    match overlay {
        // "ΔG′ unknown" already says what "no ΔG data" would.
        Overlay::Verdicts if r.dg_range.is_none() && reaction_verdict(r) == MapVerdict::NoData => {}
        Overlay::Verdicts => {
            let _ = write!(s, "; {}", reaction_verdict(r).words());
        }
        Overlay::Scenario(id) => {
            let found = r.scenario_verdicts.iter().find(|v| v.scenario == id);
            s.push_str(if found.is_some() {
                "; flux in "
            } else {
                "; no flux in "
            });
            model(&mut s, id);
            if let Some(v) = found {
                let _ = write!(
                    s,
                    ": {} ({})",
                    crate::site::format::number(v.flux),
                    MapVerdict::from_verdict(v.verdict).words()
                );
            }
        }
    }
    let (errors, warnings) = ctx.counts.get(r.id.as_str()).copied().unwrap_or_default();
    let plural = |n: usize| if n == 1 { "" } else { "s" };
    let mut sep = "; ";
    if errors > 0 {
        let _ = write!(s, "{sep}{errors} error{}", plural(errors));
        sep = ", ";
    }
    if warnings > 0 {
        let _ = write!(s, "{sep}{warnings} warning{}", plural(warnings));
    }
    s
}

/// Where an arrow from box `a` to box `b` through `bends` starts and ends:
/// it leaves and enters boxes on the side facing the next point. Also
/// whether it enters `b` from above.
fn arrow_ends(a: &Placed, b: &Placed, bends: &[(f64, f64)]) -> ((f64, f64), (f64, f64), bool) {
    let first_target = bends.first().copied().unwrap_or((b.x, b.y));
    let start = if first_target.1 > a.y {
        (a.x, a.bottom())
    } else {
        (a.x, a.top())
    };
    let last_source = bends.last().copied().unwrap_or((a.x, a.y));
    let downward = last_source.1 < b.y;
    let end = if downward {
        (b.x, b.top())
    } else {
        (b.x, b.bottom())
    };
    (start, end, downward)
}

/// Appends the path of an arrow from box `a` to box `b` through `bends`
/// (cubic curves, vertical at every point); `head`: the line stops where
/// the arrow head begins.
fn edge_path(out: &mut String, a: &Placed, b: &Placed, bends: &[(f64, f64)], head: bool) {
    let (start, mut end, downward) = arrow_ends(a, b, bends);
    if head {
        end.1 += if downward {
            1.0 - HEAD_LENGTH
        } else {
            HEAD_LENGTH - 1.0
        };
    }
    let mut p = start;
    out.push('M');
    num(out, p.0);
    out.push(',');
    num(out, p.1);
    for &q in bends.iter().chain(std::iter::once(&end)) {
        // Control points on a whole number: half a unit makes no visible
        // difference to the curve.
        let mid = ((p.1 + q.1) / 2.0).round();
        if (p.0 - q.0).abs() < 0.05 {
            // A straight drop.
            out.push('V');
            num(out, q.1);
            p = q;
            continue;
        }
        out.push('C');
        for (i, (x, y)) in [(p.0, mid), (q.0, mid), (q.0, q.1)].into_iter().enumerate() {
            if i > 0 {
                out.push(' ');
            }
            num(out, x);
            out.push(',');
            num(out, y);
        }
        p = q;
    }
}

/// Appends the head of the arrow from box `a` to box `b`: a triangle with
/// its tip on `b`'s edge.
fn arrow_head(out: &mut String, a: &Placed, b: &Placed, bends: &[(f64, f64)]) {
    let (_, (x, y), downward) = arrow_ends(a, b, bends);
    let l = if downward { HEAD_LENGTH } else { -HEAD_LENGTH };
    out.push('M');
    num(out, x - HEAD_HALF);
    out.push(',');
    num(out, y - l);
    out.push_str("h8l-4,");
    num(out, l);
    out.push('z');
}

/// The legend as SVG text, its size and its entries.
#[derive(Debug, Clone, Default)]
struct LegendParts {
    svg: String,
    height: f64,
    width: f64,
    entries: Vec<(MapVerdict, &'static str, &'static str)>,
}

/// The legend: every verdict with its colour, line pattern and glyph, then
/// the loop mark, side labels and metabolite boxes.
fn legend(overlay: Overlay<'_>, scenario_note: Option<String>) -> LegendParts {
    let mut entries = Vec::new();
    // Each item: its class and its content at (0, 0).
    let mut items: Vec<(&str, String)> = Vec::new();
    let sample = |label: &str| {
        let mut s = String::from(
            "<path class=\"e\" d=\"M0,-4H26\"/><path class=\"h\" d=\"M26,-8v8l9,-4z\"/>",
        );
        s.push_str(label);
        s
    };
    for v in MapVerdict::ALL {
        let (dash, _) = line_style(v);
        let mut label = String::new();
        text_el(&mut label, 42.0, 0.0, "g", glyph(v));
        text_el(&mut label, 56.0, 0.0, "", &escaped(v.words()));
        items.push((class(v), sample(&label)));
        entries.push((v, dash, glyph(v)));
    }
    if matches!(overlay, Overlay::Scenario(_)) {
        let mut label = String::new();
        text_el(&mut label, 56.0, 0.0, "", "no flux in the scenario");
        items.push((IDLE_CLASS, sample(&label)));
    }
    let mut s = String::new();
    text_el(&mut s, 0.0, 0.0, "", LOOP_GLYPH);
    text_el(&mut s, 18.0, 0.0, "", "member of an internal loop");
    items.push(("", s));
    let mut s = String::new();
    text_el(&mut s, 0.0, 0.0, "sd", "atp → adp");
    text_el(&mut s, 70.0, 0.0, "", "side compounds");
    items.push(("", s));
    let mut s = String::from(
        "<g class=\"m\"><rect x=\"0\" y=\"-11\" width=\"34\" height=\"14\" rx=\"7\"/></g>",
    );
    text_el(&mut s, 42.0, 0.0, "", "metabolite");
    items.push(("", s));

    let mut svg = String::new();
    text_el(&mut svg, 0.0, 12.0, "kt", "Key");
    let rows = items.len().div_ceil(LEGEND_COLUMNS);
    for (i, (class, item)) in items.into_iter().enumerate() {
        let (col, row) = (i % LEGEND_COLUMNS, i / LEGEND_COLUMNS);
        svg.push_str("<g");
        if !class.is_empty() {
            let _ = write!(svg, " class=\"{class}\"");
        }
        svg.push_str(" transform=\"translate(");
        num(&mut svg, col as f64 * LEGEND_ITEM_WIDTH);
        svg.push(',');
        num(&mut svg, 30.0 + row as f64 * 20.0);
        svg.push_str(")\">");
        svg.push_str(&item);
        svg.push_str("</g>");
    }
    let mut height = 30.0 + rows as f64 * 20.0;
    if let Some(note) = scenario_note {
        text_el(&mut svg, 0.0, height + 6.0, "", &escaped(&note));
        height += 20.0;
    }
    LegendParts {
        svg,
        height,
        width: LEGEND_ITEM_WIDTH * LEGEND_COLUMNS as f64,
        entries,
    }
}

/// The legend of verdict maps, made once.
fn fixed_legend() -> &'static LegendParts {
    static PARTS: std::sync::OnceLock<LegendParts> = std::sync::OnceLock::new();
    PARTS.get_or_init(|| legend(Overlay::Verdicts, None))
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
        let lines = [
            (shorten(&g.name, 30), "gname"),
            (
                format!(
                    "{} reactions · ✖ {} · ▲ {}",
                    g.reactions, g.errors, g.warnings
                ),
                "sd",
            ),
        ];
        let widest = lines.iter().map(|(l, _)| l.chars().count()).max();
        graph.add_node(box_size(widest.unwrap_or(0), lines.len()));
        lines_of.push(lines);
    }
    for &(a, b) in links {
        graph.add_edge(NodeIndex::new(a), NodeIndex::new(b), ());
    }
    let placed = layout::layered(&graph);
    let mut body = String::new();
    for (e, &(a, b)) in links.iter().enumerate() {
        body.push_str("<path class=\"link\" d=\"");
        edge_path(
            &mut body,
            &placed.nodes[a],
            &placed.nodes[b],
            &placed.bends[e],
            false,
        );
        body.push_str("\"/>");
    }
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
        let _ = write!(body, "<a href=\"{}\" class=\"{class}\"><title>", g.href);
        esc(
            &mut body,
            &format!(
                "{}: {} reactions, {} error(s), {} warning(s)",
                g.name, g.reactions, g.errors, g.warnings
            ),
        );
        body.push_str("</title>");
        rect_el(&mut body, &p, Some(4));
        let mut labels = Vec::new();
        for (k, (line, class)) in lines_of[i].iter().enumerate() {
            let x = p.left() + PAD_X;
            let y = p.top() + PAD_Y + LINE_HEIGHT * (k as f64 + 1.0) - 3.0;
            text_el(&mut body, x, y, class, &escaped(line));
            labels.push((
                x,
                p.top() + PAD_Y + LINE_HEIGHT * k as f64,
                text_width(line),
                LINE_HEIGHT,
            ));
        }
        body.push_str("</a>");
        hrefs.push(g.href.clone());
        nodes.push(DrawnNode {
            id: g.name.clone(),
            is_reaction: false,
            placed: p,
            labels,
        });
    }
    let mut key = String::new();
    text_el(&mut key, 0.0, 12.0, "kt", "Key");
    text_el(
        &mut key,
        0.0,
        30.0,
        "",
        "one box per group of reactions; ✖ errors and ▲ warnings among the findings on its reactions",
    );
    text_el(
        &mut key,
        0.0,
        48.0,
        "",
        "red solid frame: has errors · amber dashed frame: warnings only · grey line: groups that pass metabolites on",
    );
    let mut escaped_title = String::new();
    esc(&mut escaped_title, title);
    let frame = Frame {
        title: escaped_title,
        width: placed.width,
        height: placed.height,
        legend: Legend::Own(LegendParts {
            svg: key,
            height: 60.0,
            width: 100.0 * CHAR_WIDTH,
            entries: Vec::new(),
        }),
        body: 0..0,
    };
    let (svg, frame) = frame.inline(&body);
    Drawn {
        svg,
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
    let parts = fixed_legend();
    let mut out = String::from("<svg class=\"nm net-map-key\" width=\"");
    let (w, h) = (parts.width + 2.0 * MARGIN, parts.height + 2.0 * MARGIN);
    num(&mut out, w);
    out.push_str("\" height=\"");
    num(&mut out, h);
    let _ = write!(out, "\" viewBox=\"-{MARGIN} -{MARGIN} ");
    num(&mut out, w);
    out.push(' ');
    num(&mut out, h);
    let _ = writeln!(
        out,
        "\" role=\"img\" xmlns=\"http://www.w3.org/2000/svg\"><title>Key of the network maps</title><style>{}</style>{}</svg>",
        stylesheet(),
        parts.svg
    );
    out
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
        let path = |a: &Placed, b: &Placed, head: bool| {
            let mut s = String::new();
            edge_path(&mut s, a, b, &[], head);
            s
        };
        assert_eq!(path(&a, &b, false), "M50,20C50,55 80,55 80,90");
        // Upward (a reversed edge): top of a to bottom of b.
        assert_eq!(path(&b, &a, false), "M80,90C80,55 50,55 50,20");
        // With a head the line stops 8 short of the box (1 inside the
        // head); the head's tip touches the box.
        assert_eq!(path(&a, &b, true), "M50,20C50,51 80,51 80,82");
        // Straight below: a vertical line.
        let below = Placed { x: 50.0, ..b };
        assert_eq!(path(&a, &below, false), "M50,20V90");
        let mut head = String::new();
        arrow_head(&mut head, &a, &b, &[]);
        assert_eq!(head, "M76,81h8l-4,9z");
        let mut head = String::new();
        arrow_head(&mut head, &b, &a, &[]);
        assert_eq!(head, "M46,29h8l-4,-9z");
    }

    #[test]
    fn numbers_have_at_most_one_decimal() {
        let s = |v: f64| {
            let mut s = String::new();
            num(&mut s, v);
            s
        };
        assert_eq!(s(12.0), "12");
        assert_eq!(s(12.54), "12.5");
        assert_eq!(s(-0.46), "-0.5");
        assert_eq!(s(-0.04), "0");
        assert_eq!(s(0.96), "1");
    }
}
