//! The cycle map of an internal loop: its reactions as boxes on a circle in
//! loop order, joined by arrows that run clockwise the way the loop turns,
//! with the metabolites passed from one reaction to the next written beside
//! each arrow.
//!
//! The loop analysis lists members by reaction index, which says nothing
//! about how they chain, so [`loop_order`] first finds an order in which
//! each member passes a metabolite on to the next. Direction is never shown
//! by colour: the arrows carry arrowheads and every box says "forward" or
//! "backward" in words.
//!
//! As in [`super::svg`]: model strings (reaction and metabolite ids, names)
//! only go into `<text>` and `<title>` content, which the svg crate
//! escapes; it does NOT escape `"` in attribute values, so attributes carry
//! only numbers and fixed words.

use super::species_chart::shorten;
use super::svg::{round2, text};
use crate::report::LoopMemberView;
use serde::Serialize;
use std::collections::BTreeMap;
use std::f64::consts::PI;
use svg::node::element::{Group, Path, Rectangle, Title};
use svg::Document;

/// Up to this many members, boxes are wide and metabolite labels are
/// stacked horizontal lines; above it boxes narrow and labels turn radial
/// so neighbouring labels cannot collide.
const LARGE_LOOP: usize = 10;
const BOX_HEIGHT: f64 = 38.0;
const WIDE_BOX: f64 = 132.0;
const NARROW_BOX: f64 = 104.0;
/// Space kept between neighbouring boxes along the circle: room for the
/// clearance on both sides and an arrowhead.
const BOX_GAP: f64 = 36.0;
const MIN_RADIUS: f64 = 110.0;
/// Rough advance of one character at the 12 px of the map, used to size
/// the drawing around its labels (generous, so nothing is clipped).
const CHAR_WIDTH: f64 = 7.0;
const LINE_HEIGHT: f64 = 14.0;
/// Distance of metabolite labels outside the circle.
const LABEL_OFFSET: f64 = 12.0;
/// Stacked label lines per arrow before "+ N more".
const MAX_LINES: usize = 3;
/// Longest radial label (metabolites joined by " + ").
const RADIAL_CHARS: usize = 34;
const ARROW_LENGTH: f64 = 10.0;
const ARROW_HALF_WIDTH: f64 = 5.0;
/// Empty space between a box and the arrow leaving or reaching it.
const ARROW_CLEARANCE: f64 = 5.0;
const MARGIN: f64 = 10.0;

/// A drawn map and the shared metabolites it could not fully show.
#[derive(Debug, Clone, PartialEq)]
pub struct LoopMap {
    pub svg: String,
    /// Metabolites that pass between members that are not neighbours on
    /// the map (so no arrow shows that step), sorted by id.
    pub not_on_arrows: Vec<SharedMetabolite>,
}

/// Who makes and who uses a metabolite when the loop turns its way.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct SharedMetabolite {
    pub metabolite: String,
    pub made_by: Vec<String>,
    pub used_by: Vec<String>,
}

/// Signed flux of each metabolite through each member when the loop runs
/// its way: positive = the member produces it, negative = consumes it.
fn flows(members: &[LoopMemberView]) -> Vec<BTreeMap<&str, f64>> {
    members
        .iter()
        .map(|m| {
            let mut flow = BTreeMap::new();
            for p in &m.participants {
                *flow.entry(p.metabolite.as_str()).or_insert(0.0) += m.coefficient * p.coefficient;
            }
            flow.retain(|_, v: &mut f64| *v != 0.0);
            flow
        })
        .collect()
}

/// How many members touch each metabolite.
fn touch_counts<'a>(flows: &[BTreeMap<&'a str, f64>]) -> BTreeMap<&'a str, usize> {
    let mut counts = BTreeMap::new();
    for flow in flows {
        for &m in flow.keys() {
            *counts.entry(m).or_insert(0) += 1;
        }
    }
    counts
}

/// Metabolites member `from` produces and member `to` consumes, the most
/// specific first (those touched by fewest members), then by id.
fn passed<'a>(
    flows: &[BTreeMap<&'a str, f64>],
    counts: &BTreeMap<&'a str, usize>,
    from: usize,
    to: usize,
) -> Vec<&'a str> {
    let mut out: Vec<&str> = flows[from]
        .iter()
        .filter(|&(m, &v)| v > 0.0 && flows[to].get(m).is_some_and(|&w| w < 0.0))
        .map(|(&m, _)| m)
        .collect();
    out.sort_by_key(|m| (counts[m], *m));
    out
}

/// How strongly `from` feeds `to`: a metabolite shared by only these two
/// counts 1, one touched by k members 1/(k−1), so currency metabolites
/// (H⁺, water, ATP) weigh little against the pathway's own intermediates.
fn link_weight(
    flows: &[BTreeMap<&str, f64>],
    counts: &BTreeMap<&str, usize>,
    from: usize,
    to: usize,
) -> f64 {
    passed(flows, counts, from, to)
        .iter()
        .map(|m| 1.0 / (counts[m].max(2) - 1) as f64)
        .sum()
}

/// Search steps allowed before settling for the best order found by
/// local improvement.
const SEARCH_BUDGET: usize = 20_000;
/// Loops longer than this skip the local improvement (cubic in the size).
const IMPROVE_LIMIT: usize = 40;

/// An order of `members` (indices) in which each passes a metabolite on to
/// the next and the last back to the first, starting from the first member
/// and trying the strongest links first.
///
/// A branched loop (one member feeding two others, as non-unit
/// coefficients allow) has no such order; then chains of linked members
/// are built greedily and improved by moving short runs of members, so
/// that as many neighbours as possible are linked. Deterministic: ties go
/// to the lower index.
pub fn loop_order(members: &[LoopMemberView]) -> Vec<usize> {
    let n = members.len();
    if n <= 2 {
        return (0..n).collect();
    }
    let flows = flows(members);
    let counts = touch_counts(&flows);
    let weight: Vec<Vec<f64>> = (0..n)
        .map(|i| {
            (0..n)
                .map(|j| {
                    if i == j {
                        0.0
                    } else {
                        link_weight(&flows, &counts, i, j)
                    }
                })
                .collect()
        })
        .collect();
    // Candidates of each member, strongest link first.
    let next: Vec<Vec<usize>> = (0..n)
        .map(|i| {
            let mut c: Vec<usize> = (0..n).filter(|&j| weight[i][j] > 0.0).collect();
            c.sort_by(|&a, &b| weight[i][b].total_cmp(&weight[i][a]).then(a.cmp(&b)));
            c
        })
        .collect();

    let mut path = vec![0];
    let mut used = vec![false; n];
    used[0] = true;
    let mut steps = 0;
    if closed_walk(&next, &weight, &mut path, &mut used, &mut steps) {
        return path;
    }
    let mut order = chained_order(&weight);
    if n <= IMPROVE_LIMIT {
        improve(&mut order, &weight);
    }
    // The first member back at the top of the map.
    let first = order.iter().position(|&k| k == 0).unwrap_or(0);
    order.rotate_left(first);
    order
}

/// Depth-first search for a cycle through every member.
fn closed_walk(
    next: &[Vec<usize>],
    weight: &[Vec<f64>],
    path: &mut Vec<usize>,
    used: &mut [bool],
    steps: &mut usize,
) -> bool {
    let last = *path.last().expect("the walk starts with one member");
    if path.len() == used.len() {
        return weight[last][path[0]] > 0.0;
    }
    for &j in &next[last] {
        if used[j] {
            continue;
        }
        *steps += 1;
        if *steps > SEARCH_BUDGET {
            return false;
        }
        used[j] = true;
        path.push(j);
        if closed_walk(next, weight, path, used, steps) {
            return true;
        }
        path.pop();
        used[j] = false;
    }
    false
}

/// Follows the strongest link out of each member; where none is left,
/// starts a new chain at a member no unused member feeds.
fn chained_order(weight: &[Vec<f64>]) -> Vec<usize> {
    let n = weight.len();
    let mut order = vec![0];
    let mut used = vec![false; n];
    used[0] = true;
    while order.len() < n {
        let last = *order.last().expect("the order starts with one member");
        let linked = (0..n)
            .filter(|&j| !used[j] && weight[last][j] > 0.0)
            .max_by(|&a, &b| weight[last][a].total_cmp(&weight[last][b]).then(b.cmp(&a)));
        let chosen = linked.unwrap_or_else(|| {
            let fed = |j: usize| (0..n).filter(|&i| !used[i] && weight[i][j] > 0.0).count();
            (0..n)
                .filter(|&j| !used[j])
                .min_by_key(|&j| (fed(j), j))
                .expect("an unused member remains")
        });
        used[chosen] = true;
        order.push(chosen);
    }
    order
}

/// How well `order` chains, read around the circle: every linked pair of
/// neighbours counts far more than the strength of the links.
fn chain_score(order: &[usize], weight: &[Vec<f64>]) -> f64 {
    (0..order.len())
        .map(|k| {
            let w = weight[order[k]][order[(k + 1) % order.len()]];
            if w > 0.0 {
                1000.0 + w
            } else {
                0.0
            }
        })
        .sum()
}

/// Moves runs of one to three members elsewhere while that links more
/// neighbours (the "or-opt" move of tour improvement), taking the first
/// improving move each round.
fn improve(order: &mut Vec<usize>, weight: &[Vec<f64>]) {
    let n = order.len();
    let mut best = chain_score(order, weight);
    for _round in 0..(2 * n) {
        let mut improved = false;
        'search: for run in 1..=3.min(n - 1) {
            for from in 0..=(n - run) {
                for to in 0..=(n - run) {
                    if to == from {
                        continue;
                    }
                    let mut candidate = order.clone();
                    let moved: Vec<usize> = candidate.drain(from..from + run).collect();
                    candidate.splice(to..to, moved);
                    let score = chain_score(&candidate, weight);
                    if score > best + 1e-9 {
                        *order = candidate;
                        best = score;
                        improved = true;
                        break 'search;
                    }
                }
            }
        }
        if !improved {
            break;
        }
    }
}

/// "forward", "backward", "2 × backward".
pub fn direction_words(coefficient: f64) -> String {
    let way = if coefficient < 0.0 {
        "backward"
    } else {
        "forward"
    };
    let times = coefficient.abs();
    if (times - 1.0).abs() < 1e-9 {
        way.to_string()
    } else {
        format!("{} × {way}", super::format::number(times))
    }
}

/// Geometry of the circle: node `k` sits at angle θₖ, starting at the top
/// and going clockwise (SVG's y axis points down).
struct Ring {
    radius: f64,
    count: usize,
    box_width: f64,
}

impl Ring {
    fn for_members(count: usize) -> Ring {
        let box_width = if count > LARGE_LOOP {
            NARROW_BOX
        } else {
            WIDE_BOX
        };
        // Neighbours straddling the top are side by side: the chord
        // between them must hold a box and the gap.
        let radius = (box_width + BOX_GAP) / (2.0 * (PI / count as f64).sin());
        Ring {
            radius: round2(radius.max(MIN_RADIUS)),
            count,
            box_width,
        }
    }

    fn angle(&self, k: f64) -> f64 {
        -PI / 2.0 + 2.0 * PI * k / self.count as f64
    }

    fn point(&self, angle: f64, radius: f64) -> (f64, f64) {
        (radius * angle.cos(), radius * angle.sin())
    }

    /// Angle beyond node `k`'s centre (towards `sign` = ±1) at which the
    /// circle leaves its box plus the clearance. The box is convex and
    /// smaller than the circle, so the circle crosses its edge once on each
    /// side: bisection finds it.
    fn exit_angle(&self, k: usize, sign: f64) -> f64 {
        let centre = self.angle(k as f64);
        let (cx, cy) = self.point(centre, self.radius);
        let half_w = self.box_width / 2.0 + ARROW_CLEARANCE;
        let half_h = BOX_HEIGHT / 2.0 + ARROW_CLEARANCE;
        let inside = |phi: f64| {
            let (x, y) = self.point(centre + sign * phi, self.radius);
            (x - cx).abs() <= half_w && (y - cy).abs() <= half_h
        };
        let (mut lo, mut hi) = (0.0, PI / self.count as f64);
        if inside(hi) {
            return hi;
        }
        for _ in 0..40 {
            let mid = (lo + hi) / 2.0;
            if inside(mid) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        hi
    }
}

/// Extent of everything drawn, so the view box fits the drawing.
#[derive(Default)]
struct Bounds {
    min_x: f64,
    max_x: f64,
    min_y: f64,
    max_y: f64,
}

impl Bounds {
    fn add(&mut self, x: f64, y: f64) {
        self.min_x = self.min_x.min(x);
        self.max_x = self.max_x.max(x);
        self.min_y = self.min_y.min(y);
        self.max_y = self.max_y.max(y);
    }

    /// A line of text of `chars` characters at (x, y) with `anchor`.
    fn add_text(&mut self, x: f64, y: f64, anchor: &str, chars: usize) {
        let width = chars as f64 * CHAR_WIDTH;
        let (left, right) = match anchor {
            "start" => (x, x + width),
            "end" => (x - width, x),
            _ => (x - width / 2.0, x + width / 2.0),
        };
        self.add(left, y - LINE_HEIGHT);
        self.add(right, y + 4.0);
    }
}

/// The map of a loop whose `members` are already in loop order (see
/// [`loop_order`]), or None for fewer than two members. `title` (the loop
/// id) names the drawing.
pub fn loop_map(title: &str, members: &[LoopMemberView]) -> Option<LoopMap> {
    let n = members.len();
    if n < 2 {
        return None;
    }
    let flows = flows(members);
    let counts = touch_counts(&flows);
    let large = n > LARGE_LOOP;
    let circle = Ring::for_members(n);
    let (radius, box_width) = (circle.radius, circle.box_width);
    let id_chars = ((box_width - 12.0) / CHAR_WIDTH) as usize;
    let mut bounds = Bounds::default();

    let mut doc = Document::new().set("class", "loop-map").set("role", "img");
    let description: Vec<String> = members
        .iter()
        .map(|m| format!("{} {}", m.reaction, direction_words(m.coefficient)))
        .collect();
    doc = doc.add(Title::new(format!(
        "Cycle map of {title}: {}, then back to the first",
        description.join(", then ")
    )));

    // Arrows first, so boxes and labels sit on top of them.
    let mut arrows = Group::new().set("class", "arrows");
    let mut labels = Group::new().set("class", "passed");
    for k in 0..n {
        let to = (k + 1) % n;
        let start = circle.angle(k as f64) + circle.exit_angle(k, 1.0);
        let end = circle.angle(k as f64 + 1.0) - circle.exit_angle(to, -1.0);
        let tip_back = end - ARROW_LENGTH / radius;
        let (x1, y1) = circle.point(start, radius);
        let (x2, y2) = circle.point(tip_back, radius);
        let (tx, ty) = circle.point(end, radius);
        // Clockwise tangent at the tip, and its normal.
        let (dx, dy) = (-end.sin(), end.cos());
        let (bx, by) = (tx - ARROW_LENGTH * dx, ty - ARROW_LENGTH * dy);
        let passed_here = passed(&flows, &counts, k, to);
        let linked = if passed_here.is_empty() {
            "arrow unlinked"
        } else {
            "arrow"
        };
        let mut arrow = Group::new().set("class", linked).add(Title::new(format!(
            "{} → {}{}",
            members[k].reaction,
            members[to].reaction,
            if passed_here.is_empty() {
                ": nothing passes directly (the loop branches)".to_string()
            } else {
                format!(": passes {}", passed_here.join(", "))
            }
        )));
        arrow = arrow
            .add(Path::new().set("class", "arc").set(
                "d",
                format!(
                    "M{},{} A{radius},{radius} 0 0 1 {},{}",
                    round2(x1),
                    round2(y1),
                    round2(x2),
                    round2(y2)
                ),
            ))
            .add(Path::new().set("class", "arrowhead").set(
                "d",
                format!(
                    "M{},{} L{},{} L{},{} Z",
                    round2(tx),
                    round2(ty),
                    round2(bx + ARROW_HALF_WIDTH * dy),
                    round2(by - ARROW_HALF_WIDTH * dx),
                    round2(bx - ARROW_HALF_WIDTH * dy),
                    round2(by + ARROW_HALF_WIDTH * dx)
                ),
            ));
        arrows = arrows.add(arrow);
        bounds.add(x1, y1);
        bounds.add(tx, ty);

        if !passed_here.is_empty() {
            let middle = circle.angle(k as f64 + 0.5);
            labels = labels.add(if large {
                radial_label(&circle, middle, &passed_here, &mut bounds)
            } else {
                stacked_label(&circle, middle, &passed_here, &mut bounds)
            });
        }
    }
    doc = doc.add(arrows).add(labels);

    let mut nodes = Group::new().set("class", "nodes");
    for (k, m) in members.iter().enumerate() {
        let (x, y) = circle.point(circle.angle(k as f64), radius);
        let way = direction_words(m.coefficient);
        let name = if m.name.is_empty() {
            String::new()
        } else {
            format!(" ({})", m.name)
        };
        let left = x - box_width / 2.0;
        let top = y - BOX_HEIGHT / 2.0;
        nodes = nodes.add(
            Group::new()
                .set(
                    "class",
                    if m.coefficient < 0.0 {
                        "node backward"
                    } else {
                        "node forward"
                    },
                )
                .add(Title::new(format!(
                    "Step {}: {}{name}, runs {way}",
                    k + 1,
                    m.reaction
                )))
                .add(
                    Rectangle::new()
                        .set("x", round2(left))
                        .set("y", round2(top))
                        .set("width", box_width)
                        .set("height", BOX_HEIGHT)
                        .set("rx", 4),
                )
                .add(text(
                    x,
                    top + 16.0,
                    "middle",
                    "node-id",
                    shorten(&m.reaction, id_chars),
                ))
                .add(text(
                    x,
                    top + 31.0,
                    "middle",
                    "node-way",
                    shorten(
                        &format!("{} · {}", k + 1, way.replace(" × ", "× ")),
                        id_chars + 4,
                    ),
                )),
        );
        bounds.add(left, top);
        bounds.add(left + box_width, top + BOX_HEIGHT);
    }
    doc = doc.add(nodes);
    // The turning sense in the middle, in words and with an arrow glyph.
    doc = doc
        .add(text(0.0, -4.0, "middle", "centre", "loop direction".into()))
        .add(text(0.0, 14.0, "middle", "centre", "clockwise ↻".into()));

    let (x0, y0) = (bounds.min_x - MARGIN, bounds.min_y - MARGIN);
    let width = round2(bounds.max_x - bounds.min_x + 2.0 * MARGIN);
    let height = round2(bounds.max_y - bounds.min_y + 2.0 * MARGIN);
    doc = doc
        .set("viewBox", (round2(x0), round2(y0), width, height))
        // Natural size; the stylesheet only ever shrinks it to the page.
        .set("width", width)
        .set("height", height);

    let neighbours = |i: usize, j: usize| (i + 1) % n == j;
    let not_on_arrows = counts
        .keys()
        .filter_map(|&m| {
            let made: Vec<usize> = (0..n)
                .filter(|&i| flows[i].get(m).is_some_and(|&v| v > 0.0))
                .collect();
            let used: Vec<usize> = (0..n)
                .filter(|&j| flows[j].get(m).is_some_and(|&v| v < 0.0))
                .collect();
            let hidden = made
                .iter()
                .any(|&i| used.iter().any(|&j| !neighbours(i, j)));
            let names = |ks: &[usize]| ks.iter().map(|&k| members[k].reaction.clone()).collect();
            hidden.then(|| SharedMetabolite {
                metabolite: m.to_string(),
                made_by: names(&made),
                used_by: names(&used),
            })
        })
        .collect();
    Some(LoopMap {
        svg: doc.to_string(),
        not_on_arrows,
    })
}

/// Up to [`MAX_LINES`] metabolite ids stacked outside the circle at
/// `angle`, growing away from it.
fn stacked_label(circle: &Ring, angle: f64, ids: &[&str], bounds: &mut Bounds) -> Group {
    let (x, y) = circle.point(angle, circle.radius + LABEL_OFFSET);
    let (cos, sin) = (angle.cos(), angle.sin());
    let anchor = if cos > 0.3 {
        "start"
    } else if cos < -0.3 {
        "end"
    } else {
        "middle"
    };
    let mut lines: Vec<String> = ids
        .iter()
        .take(if ids.len() > MAX_LINES {
            MAX_LINES - 1
        } else {
            MAX_LINES
        })
        .map(|id| shorten(id, 24))
        .collect();
    if ids.len() > lines.len() {
        lines.push(format!("+ {} more", ids.len() - lines.len()));
    }
    let block = LINE_HEIGHT * lines.len() as f64;
    // First baseline: above the point near the top, below it near the
    // bottom, centred on it at the sides.
    let first = if sin < -0.3 {
        y - block + LINE_HEIGHT - 2.0
    } else if sin > 0.3 {
        y + LINE_HEIGHT - 2.0
    } else {
        y - block / 2.0 + LINE_HEIGHT - 3.0
    };
    let mut label = Group::new().set("class", "metabolite");
    for (i, line) in lines.iter().enumerate() {
        let baseline = first + i as f64 * LINE_HEIGHT;
        bounds.add_text(x, baseline, anchor, line.chars().count());
        label = label.add(text(x, baseline, anchor, "metabolite-id", line.clone()));
    }
    label
}

/// One line of metabolite ids pointing radially out of the circle, turned
/// to read left to right on either half.
fn radial_label(circle: &Ring, angle: f64, ids: &[&str], bounds: &mut Bounds) -> Group {
    let (x, y) = circle.point(angle, circle.radius + LABEL_OFFSET);
    let mut degrees = angle.to_degrees();
    let right_half = angle.cos() >= 0.0;
    if !right_half {
        degrees -= 180.0;
    }
    let anchor = if right_half { "start" } else { "end" };
    let line = shorten(&ids.join(" + "), RADIAL_CHARS);
    let length = line.chars().count() as f64 * CHAR_WIDTH;
    let (ex, ey) = circle.point(angle, circle.radius + LABEL_OFFSET + length);
    bounds.add(ex - 6.0, ey - 6.0);
    bounds.add(ex + 6.0, ey + 6.0);
    let (x, y) = (round2(x), round2(y));
    Group::new().set("class", "metabolite").add(
        text(x, y + 4.0, anchor, "metabolite-id", line).set(
            "transform",
            format!("rotate({} {x} {})", round2(degrees), round2(y + 4.0)),
        ),
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::ParticipantView;

    fn member(id: &str, coefficient: f64, participants: &[(&str, f64)]) -> LoopMemberView {
        LoopMemberView {
            reaction: id.into(),
            slug: id.into(),
            name: String::new(),
            equation: String::new(),
            coefficient,
            drg0_kj: None,
            sigma_kj: None,
            participants: participants
                .iter()
                .map(|&(m, c)| ParticipantView {
                    metabolite: m.into(),
                    slug: m.into(),
                    name: String::new(),
                    coefficient: c,
                })
                .collect(),
        }
    }

    /// A → B → C → D → A listed out of order, D run backwards, and H⁺
    /// touched by every member (invented, common practice for a cycle).
    fn scrambled() -> Vec<LoopMemberView> {
        vec![
            member("R1", 1.0, &[("a", -1.0), ("b", 1.0), ("h", 1.0)]),
            member("R3", 1.0, &[("c", -1.0), ("d", 1.0), ("h", -1.0)]),
            member("R2", 1.0, &[("b", -1.0), ("c", 1.0), ("h", 1.0)]),
            // Written a → d; run backward it turns d into a.
            member("R4", -1.0, &[("a", -1.0), ("d", 1.0), ("h", 1.0)]),
        ]
    }

    #[test]
    fn order_follows_the_metabolites_passed_on() {
        let members = scrambled();
        // R1 (a→b), R2 (b→c), R3 (c→d), R4 backward (d→a).
        assert_eq!(loop_order(&members), vec![0, 2, 1, 3]);
        let flows = flows(&members);
        let counts = touch_counts(&flows);
        assert_eq!(passed(&flows, &counts, 3, 0), vec!["a"]);
        // h is produced by R1 and consumed by R3: not a neighbour of R1
        // in the order, so it is passed only on R2 → R3 (specific first).
        assert_eq!(passed(&flows, &counts, 2, 1), vec!["c", "h"]);
    }

    #[test]
    fn map_has_one_box_and_one_arrowhead_per_member() {
        let members = scrambled();
        let order = loop_order(&members);
        let ordered: Vec<_> = order.iter().map(|&k| members[k].clone()).collect();
        let map = loop_map("loop-9", &ordered).unwrap();
        assert_eq!(map.svg.matches("<rect").count(), 4);
        assert_eq!(map.svg.matches("class=\"arrowhead\"").count(), 4);
        assert!(map.svg.contains("3 · forward"), "{}", map.svg);
        assert!(map.svg.contains("4 · backward"), "{}", map.svg);
        // H⁺ made by R1 is used by R3, two steps on: listed beside the map.
        assert_eq!(
            map.not_on_arrows,
            [SharedMetabolite {
                metabolite: "h".into(),
                made_by: vec!["R1".into(), "R2".into()],
                used_by: vec!["R3".into(), "R4".into()],
            }]
        );
        // Every neighbour passes something on: no dashed arrow.
        assert!(!map.svg.contains("unlinked"));
    }

    #[test]
    fn a_branched_loop_links_as_many_neighbours_as_it_can() {
        // A makes two y, used by B and C alike; both make z, of which D
        // uses two to give back the x A uses (invented; balanced: common
        // practice for a loop). No order links all four neighbours.
        let members = vec![
            member("D", 1.0, &[("z", -2.0), ("x", 1.0)]),
            member("B", 1.0, &[("y", -1.0), ("z", 1.0)]),
            member("A", 1.0, &[("x", -1.0), ("y", 2.0)]),
            member("C", 1.0, &[("y", -1.0), ("z", 1.0)]),
        ];
        let order = loop_order(&members);
        // D → A → B, then C (nothing passes B → C), then C → D.
        assert_eq!(order, vec![0, 2, 1, 3]);
        let ordered: Vec<_> = order.iter().map(|&k| members[k].clone()).collect();
        let map = loop_map("loop-3", &ordered).unwrap();
        assert_eq!(map.svg.matches("<g class=\"arrow unlinked\">").count(), 1);
        assert_eq!(map.svg.matches("<g class=\"arrow\">").count(), 3);
        // y also goes from A to C, z from B to D: listed beside the map.
        let listed: Vec<&str> = map
            .not_on_arrows
            .iter()
            .map(|s| s.metabolite.as_str())
            .collect();
        assert_eq!(listed, ["y", "z"]);
        assert_eq!(map.not_on_arrows[1].made_by, ["B", "C"]);
        assert_eq!(map.not_on_arrows[1].used_by, ["D"]);
    }

    #[test]
    fn boxes_never_overlap_up_to_thirty_members() {
        for n in [2, 3, 5, 10, 11, 30] {
            let members: Vec<_> = (0..n)
                .map(|k| {
                    let here = format!("m{k}");
                    let next = format!("m{}", (k + 1) % n);
                    member(
                        &format!("REACTION_{k}"),
                        1.0,
                        &[(here.as_str(), -1.0), (next.as_str(), 1.0)],
                    )
                })
                .collect();
            let map = loop_map("loop", &members).unwrap();
            let c = Ring::for_members(n);
            let (radius, width) = (c.radius, c.box_width);
            for k in 0..n {
                let (x1, y1) = c.point(c.angle(k as f64), radius);
                let (x2, y2) = c.point(c.angle(k as f64 + 1.0), radius);
                assert!(
                    (x1 - x2).abs() >= width || (y1 - y2).abs() >= BOX_HEIGHT,
                    "n = {n}: boxes {k} and {} overlap",
                    k + 1
                );
                // The arrow between them has room for its head.
                let span = c.angle(1.0)
                    - c.angle(0.0)
                    - c.exit_angle(k, 1.0)
                    - c.exit_angle((k + 1) % n, -1.0);
                assert!(span * radius > ARROW_LENGTH + 4.0, "n = {n}: arrow {k}");
            }
            assert_eq!(map.svg.matches("class=\"arrowhead\"").count(), n);
        }
    }

    #[test]
    fn directions_are_written_in_words() {
        assert_eq!(direction_words(1.0), "forward");
        assert_eq!(direction_words(-1.0), "backward");
        assert_eq!(direction_words(-2.0), "2 × backward");
        assert_eq!(direction_words(0.5), "0.5 × forward");
    }
}
