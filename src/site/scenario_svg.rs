//! Drawings of the scenario pages: a conflicting set as a small pathway
//! with its binding bounds written on it, and the energy profile
//! (cumulative ΔG' along the longest active chain with its ±k·σ band).
//!
//! As in `svg.rs`, model strings only go into text nodes (escaped by the
//! svg crate); attributes carry numbers and fixed words of our own.

use super::svg::{round2, text};
use crate::report::{BindingView, ConflictSetView, ProfileStepView};
use svg::node::element::{Definitions, Line, Marker, Path, Polygon, Rectangle, Title};
use svg::Document;

const WIDTH: f64 = 640.0;

fn arrow_marker() -> Definitions {
    Definitions::new().add(
        Marker::new()
            .set("id", "scenario-arrow")
            .set("viewBox", (0, 0, 10, 10))
            .set("refX", 9)
            .set("refY", 5)
            .set("markerWidth", 7)
            .set("markerHeight", 7)
            .set("orient", "auto-start-reverse")
            .add(
                Path::new()
                    .set("d", "M 0 0 L 10 5 L 0 10 z")
                    .set("class", "arrow-head"),
            ),
    )
}

/// "≤ 10 mM" / "≥ 1 µM" for a concentration bound; "+3.92" for an error.
fn bound_text(b: &BindingView) -> String {
    if b.kind == "concentration" {
        let sign = if b.side == "upper" { "≤" } else { "≥" };
        format!("{sign} {}", super::format::concentration(b.value))
    } else {
        format!("{:+.2} kJ/mol", b.value)
    }
}

/// The set as a row of boxes (one per reaction, in pathway order) joined by
/// arrows, each box with its reaction id, direction and ΔrG'°; the metabolites
/// passed between steps and the bounds that bind below. Returns `None` for
/// an empty set.
pub fn conflict_drawing(index: usize, set: &ConflictSetView) -> Option<String> {
    let n = set.members.len();
    if n == 0 {
        return None;
    }
    let per_row = n.min(4);
    let rows = n.div_ceil(per_row);
    let box_w = 120.0;
    let box_h = 46.0;
    let gap = (WIDTH - 20.0 - per_row as f64 * box_w) / (per_row.max(2) - 1) as f64;
    let gap = gap.min(60.0);
    let row_h = box_h + 40.0;
    let bindings = set.binding.len();
    let height = 20.0 + rows as f64 * row_h + 22.0 + 16.0 * bindings as f64;
    let mut doc = Document::new()
        .set("viewBox", (0, 0, WIDTH, round2(height)))
        .set("class", "conflict-map")
        .set("role", "img")
        .add(Title::new(format!(
            "Conflicting set {}: {} (best overall ΔG′ {:+.2} kJ/mol)",
            index + 1,
            set.members
                .iter()
                .map(|m| m.reaction.as_str())
                .collect::<Vec<_>>()
                .join(" → "),
            set.overall_kj
        )))
        .add(arrow_marker());
    let mut centres = Vec::new();
    for (k, m) in set.members.iter().enumerate() {
        let row = k / per_row;
        let col = k % per_row;
        let x = 10.0 + col as f64 * (box_w + gap);
        let y = 14.0 + row as f64 * row_h;
        doc = doc
            .add(
                Rectangle::new()
                    .set("x", round2(x))
                    .set("y", round2(y))
                    .set("width", box_w)
                    .set("height", box_h)
                    .set("rx", 6)
                    .set("class", "step-box"),
            )
            .add(text(
                x + box_w / 2.0,
                y + 18.0,
                "middle",
                "step-id",
                m.reaction.clone(),
            ))
            .add(text(
                x + box_w / 2.0,
                y + 36.0,
                "middle",
                "step-detail",
                format!(
                    "{}{} ΔG′° {:+.1}",
                    if m.direction == "forward" {
                        "→"
                    } else {
                        "←"
                    },
                    if m.weight != 1.0 {
                        format!(" ×{}", super::format::number(m.weight))
                    } else {
                        String::new()
                    },
                    m.drg0_kj
                ),
            ));
        centres.push((x, y));
    }
    // Arrows between consecutive steps, labelled with what they pass on.
    for k in 1..n {
        let (x0, y0) = centres[k - 1];
        let (x1, y1) = centres[k];
        let (ax, ay, bx, by) = if (y1 - y0).abs() < 1e-9 {
            (x0 + box_w, y0 + box_h / 2.0, x1, y1 + box_h / 2.0)
        } else {
            (x0 + box_w / 2.0, y0 + box_h, x1 + box_w / 2.0, y1)
        };
        let passed = passed_on(&set.members[k - 1], &set.members[k]);
        doc = doc.add(
            Line::new()
                .set("x1", round2(ax))
                .set("y1", round2(ay))
                .set(
                    "x2",
                    round2(bx - if (y1 - y0).abs() < 1e-9 { 2.0 } else { 0.0 }),
                )
                .set(
                    "y2",
                    round2(by - if (y1 - y0).abs() < 1e-9 { 0.0 } else { 2.0 }),
                )
                .set("class", "step-arrow")
                .set("marker-end", "url(#scenario-arrow)"),
        );
        if !passed.is_empty() {
            doc = doc.add(text(
                (ax + bx) / 2.0,
                (ay + by) / 2.0 - 6.0,
                "middle",
                "passed",
                passed.join(", "),
            ));
        }
    }
    let mut y = 14.0 + rows as f64 * row_h + 4.0;
    doc = doc.add(text(
        10.0,
        y,
        "start",
        "overall",
        format!(
            "best overall ΔG′ {:+.2} kJ/mol, needs ≤ {:+.2} kJ/mol; binding bounds:",
            set.overall_kj, set.required_kj
        ),
    ));
    for b in &set.binding {
        y += 16.0;
        doc = doc.add(text(
            24.0,
            y,
            "start",
            "binding",
            format!("{} {}", b.subject, bound_text(b)),
        ));
    }
    Some(doc.to_string())
}

/// Metabolites the first step makes (in its flux direction) and the next
/// one uses.
fn passed_on(
    a: &crate::report::ConflictMemberView,
    b: &crate::report::ConflictMemberView,
) -> Vec<String> {
    let sign =
        |m: &crate::report::ConflictMemberView| if m.direction == "forward" { 1.0 } else { -1.0 };
    a.participants
        .iter()
        .filter(|p| p.coefficient * sign(a) > 0.0)
        .filter(|p| {
            b.participants
                .iter()
                .any(|q| q.metabolite == p.metabolite && q.coefficient * sign(b) < 0.0)
        })
        .map(|p| p.metabolite.clone())
        .collect()
}

/// Cumulative ΔG' (kJ/mol) after each step as a line from 0, with the
/// ±k·σ band as a shaded polygon and a dashed zero line. `None` for fewer
/// than one step.
pub fn energy_profile(title: &str, steps: &[ProfileStepView]) -> Option<String> {
    if steps.is_empty() || steps.iter().any(|s| !s.cumulative_kj.is_finite()) {
        return None;
    }
    let height = 240.0;
    let (left, right, top, bottom) = (60.0, WIDTH - 20.0, 30.0, height - 56.0);
    let mut lo: f64 = 0.0;
    let mut hi: f64 = 0.0;
    for s in steps {
        lo = lo.min(s.cumulative_kj - s.band_kj);
        hi = hi.max(s.cumulative_kj + s.band_kj);
    }
    if hi - lo < 1e-9 {
        hi += 1.0;
        lo -= 1.0;
    }
    let pad = 0.06 * (hi - lo);
    let (lo, hi) = (lo - pad, hi + pad);
    let y = |v: f64| round2(bottom - (v - lo) / (hi - lo) * (bottom - top));
    let n = steps.len();
    let x = |k: usize| round2(left + k as f64 * (right - left) / n as f64);
    let mut doc = Document::new()
        .set("viewBox", (0, 0, WIDTH, height))
        .set("class", "energy-profile")
        .set("role", "img")
        .add(Title::new(format!(
            "Energy profile of {title}: cumulative ΔG′ after {} steps is {:+.1} kJ/mol",
            n,
            steps[n - 1].cumulative_kj
        )));
    // Band: upper edge left to right, lower edge back.
    let mut points: Vec<(f64, f64)> = vec![(x(0), y(0.0))];
    for (k, s) in steps.iter().enumerate() {
        points.push((x(k + 1), y(s.cumulative_kj + s.band_kj)));
    }
    for (k, s) in steps.iter().enumerate().rev() {
        points.push((x(k + 1), y(s.cumulative_kj - s.band_kj)));
    }
    let points_text = points
        .iter()
        .map(|(a, b)| format!("{a},{b}"))
        .collect::<Vec<_>>()
        .join(" ");
    doc = doc
        .add(
            Polygon::new()
                .set("points", points_text)
                .set("class", "band"),
        )
        .add(
            Line::new()
                .set("x1", left)
                .set("x2", right)
                .set("y1", y(0.0))
                .set("y2", y(0.0))
                .set("class", "zero"),
        )
        .add(text(left - 6.0, y(0.0) + 4.0, "end", "axis", "0".into()))
        .add(text(
            left,
            14.0,
            "start",
            "axis-title",
            "cumulative ΔG′ (kJ/mol)".into(),
        ));
    // The extremes, unless they sit on the zero label.
    for v in [hi - pad, lo + pad] {
        if (y(v) - y(0.0)).abs() > 14.0 {
            doc = doc.add(text(
                left - 6.0,
                y(v) + 4.0,
                "end",
                "axis",
                format!("{v:+.0}"),
            ));
        }
    }
    let mut d = format!("M {} {}", x(0), y(0.0));
    for (k, s) in steps.iter().enumerate() {
        d.push_str(&format!(" L {} {}", x(k + 1), y(s.cumulative_kj)));
    }
    doc = doc.add(Path::new().set("d", d).set("class", "profile-line"));
    for (k, s) in steps.iter().enumerate() {
        doc = doc.add(
            Rectangle::new()
                .set("x", x(k + 1) - 3.0)
                .set("y", y(s.cumulative_kj) - 3.0)
                .set("width", 6)
                .set("height", 6)
                .set("class", "profile-point"),
        );
        // Labels alternate in height so neighbours do not overlap.
        let label_y = bottom + 16.0 + if k % 2 == 0 { 0.0 } else { 14.0 };
        doc = doc.add(text(
            round2((x(k) + x(k + 1)) / 2.0),
            label_y,
            "middle",
            "step-label",
            s.reaction.clone(),
        ));
    }
    Some(doc.to_string())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::{ConflictMemberView, ParticipantView};

    fn member(id: &str, from: &str, to: &str) -> ConflictMemberView {
        let p = |m: &str, c: f64| ParticipantView {
            metabolite: m.into(),
            slug: m.into(),
            name: m.into(),
            coefficient: c,
        };
        ConflictMemberView {
            reaction: id.into(),
            slug: id.into(),
            equation: format!("{from} -> {to}"),
            direction: "forward".into(),
            weight: 1.0,
            drg0_kj: 10.0,
            sigma_kj: 0.0,
            participants: vec![p(from, -1.0), p(to, 1.0)],
        }
    }

    #[test]
    fn conflict_drawing_names_steps_passed_metabolites_and_bounds() {
        let set = ConflictSetView {
            members: vec![member("AB", "a", "b"), member("B<D", "b", "d")],
            overall_kj: 7.17,
            required_kj: 0.0,
            binding: vec![BindingView {
                kind: "concentration".into(),
                subject: "a".into(),
                slug: "a".into(),
                side: "upper".into(),
                value: 0.01,
            }],
            repairs: vec![],
        };
        let svg = conflict_drawing(0, &set).unwrap();
        assert!(svg.contains(">\nAB\n<"), "{svg}");
        // Model text is escaped in text nodes.
        assert!(svg.contains("B&lt;D"), "{svg}");
        assert!(
            svg.contains("class=\"passed\" text-anchor=\"middle\" x=\"160\" y=\"31\">\nb\n<"),
            "the metabolite passed on: {svg}"
        );
        assert!(svg.contains("a ≤ 10 mM"), "{svg}");
        assert!(svg.contains("+7.17 kJ/mol"), "{svg}");
    }

    #[test]
    fn energy_profile_draws_band_and_line() {
        let steps = vec![
            ProfileStepView {
                reaction: "R1".into(),
                slug: "R1".into(),
                dg_kj: -5.0,
                cumulative_kj: -5.0,
                band_kj: 1.0,
            },
            ProfileStepView {
                reaction: "R2".into(),
                slug: "R2".into(),
                dg_kj: 2.0,
                cumulative_kj: -3.0,
                band_kj: 1.5,
            },
        ];
        let svg = energy_profile("noon", &steps).unwrap();
        assert!(svg.contains("class=\"band\""));
        assert!(svg.contains("class=\"profile-line\""));
        assert!(svg.contains("−3.0") || svg.contains("-3.0"), "{svg}");
        assert!(energy_profile("none", &[]).is_none());
    }
}
