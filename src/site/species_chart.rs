//! The species distribution of a reactant drawn as an SVG line chart: the
//! mole fraction of each species against pH, with the compartment's pH
//! marked by a vertical line.
//!
//! Lines are told apart without colour: each has its own dash pattern and
//! its label at its right end, and a legend repeats pattern and label. The
//! colours are the Okabe & Ito palette of the theme, written as presentation
//! attributes so the chart reads correctly even under a user stylesheet.
//!
//! As in [`super::svg`]: model strings (species labels, the reactant's name)
//! only go into text nodes, which the svg crate escapes; it does NOT escape
//! `"` in attribute values, so attributes carry only numbers and fixed words.

use super::svg::round2;
use crate::report::SpeciesView;
use svg::node::element::{Group, Line, Polyline, Text, Title};
use svg::Document;

/// Drawing width in user units (the page scales it to its width).
pub const WIDTH: f64 = 640.0;
/// The plot area: pH runs from PLOT_LEFT to PLOT_RIGHT, mole fraction 1 is
/// at PLOT_TOP and 0 at PLOT_BOTTOM.
pub const PLOT_LEFT: f64 = 56.0;
pub const PLOT_RIGHT: f64 = 536.0;
pub const PLOT_TOP: f64 = 24.0;
pub const PLOT_BOTTOM: f64 = 244.0;

/// Species whose fraction stays below this over the whole curve are not
/// drawn: they would lie on the zero line and only hide the axis.
pub const DRAW_THRESHOLD: f64 = 1e-3;

/// Line styles (colour, dash pattern); cycled beyond six species, where
/// the end labels still tell the lines apart. Black is kept for the pH line.
const STYLES: [(&str, &str); 6] = [
    ("#0072b2", "none"),        // blue, solid
    ("#d55e00", "9 4"),         // vermillion, dashed
    ("#009e73", "2 3"),         // bluish green, dotted
    ("#cc79a7", "10 3 2 3"),    // reddish purple, dash-dot
    ("#e69f00", "5 2 1 2 1 2"), // orange, dash-dot-dot
    ("#56b4e9", "14 4"),        // sky blue, long dashes
];

/// Vertical space kept between two end labels (12 px text).
const LABEL_GAP: f64 = 13.0;
const LEGEND_TOP: f64 = PLOT_BOTTOM + 58.0;
const LEGEND_ROW: f64 = 20.0;
const LEGEND_COLUMNS: usize = 3;
const LEGEND_COLUMN_WIDTH: f64 = 200.0;
/// Longest label drawn at a line end / in the legend; the table beside the
/// chart always has the full label.
const END_LABEL_CHARS: usize = 14;
const LEGEND_LABEL_CHARS: usize = 24;
const PLACE_CHARS: usize = 24;

/// A drawn chart and the species left out of it.
#[derive(Debug, Clone, PartialEq)]
pub struct SpeciesChart {
    pub svg: String,
    /// Indices into `entries` of species not drawn (below DRAW_THRESHOLD).
    pub not_drawn: Vec<usize>,
}

/// Linear maps from pH and mole fraction to drawing coordinates.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Axes {
    pub ph_lo: f64,
    pub ph_hi: f64,
}

impl Axes {
    pub fn x(&self, ph: f64) -> f64 {
        let t = (ph - self.ph_lo) / (self.ph_hi - self.ph_lo);
        round2(PLOT_LEFT + t * (PLOT_RIGHT - PLOT_LEFT))
    }

    pub fn y(&self, fraction: f64) -> f64 {
        round2(PLOT_BOTTOM - fraction.clamp(0.0, 1.0) * (PLOT_BOTTOM - PLOT_TOP))
    }
}

/// The chart of `species` (of the reactant called `title`, in the
/// compartment called `place`), or None when there is no distribution to
/// chart: fewer than two curve points, or fewer than two species reaching
/// DRAW_THRESHOLD (one species alone is a flat line at 1).
pub fn species_chart(title: &str, place: &str, species: &SpeciesView) -> Option<SpeciesChart> {
    let points: Vec<_> = species
        .curve
        .iter()
        .filter(|p| p.ph.is_finite() && p.fractions.len() == species.entries.len())
        .collect();
    let ph_lo = points.iter().map(|p| p.ph).fold(f64::INFINITY, f64::min);
    let ph_hi = points
        .iter()
        .map(|p| p.ph)
        .fold(f64::NEG_INFINITY, f64::max);
    if points.len() < 2 || ph_hi - ph_lo < 1e-9 {
        return None;
    }
    let axes = Axes { ph_lo, ph_hi };
    let (drawn, not_drawn): (Vec<usize>, Vec<usize>) = (0..species.entries.len()).partition(|&k| {
        points
            .iter()
            .any(|p| p.fractions[k].is_finite() && p.fractions[k] >= DRAW_THRESHOLD)
    });
    if drawn.len() < 2 {
        return None;
    }
    let labels: Vec<&str> = drawn
        .iter()
        .map(|&k| species.entries[k].label.as_str())
        .collect();

    let legend_rows = drawn.len().div_ceil(LEGEND_COLUMNS);
    let height = LEGEND_TOP + legend_rows as f64 * LEGEND_ROW;
    let mut doc = Document::new()
        .set("viewBox", (0, 0, WIDTH, height))
        .set("class", "species-chart")
        .set("role", "img")
        .add(Title::new(format!(
            "Mole fraction of each species of {title} from pH {} to {}: {}",
            ph_number(ph_lo),
            ph_number(ph_hi),
            labels.join(", ")
        )))
        .add(frame(&axes));

    if (ph_lo..=ph_hi).contains(&species.ph) {
        doc = doc.add(ph_marker(&axes, species.ph, place));
    }

    let mut ends = Vec::with_capacity(drawn.len());
    for (n, &k) in drawn.iter().enumerate() {
        let (colour, dash) = STYLES[n % STYLES.len()];
        let line: Vec<String> = points
            .iter()
            .filter(|p| p.fractions[k].is_finite())
            .map(|p| format!("{},{}", axes.x(p.ph), axes.y(p.fractions[k])))
            .collect();
        doc = doc.add(styled(
            Polyline::new()
                .set("class", "species-line")
                .set("points", line.join(" ")),
            colour,
            dash,
        ));
        if let Some(last) = points.iter().rev().find(|p| p.fractions[k].is_finite()) {
            ends.push((n, axes.y(last.fractions[k])));
        }
    }
    doc = doc.add(end_labels(&ends, &labels)).add(legend(&labels));
    Some(SpeciesChart {
        svg: doc.to_string(),
        not_drawn,
    })
}

/// Stroke attributes shared by a species line and its legend sample.
fn styled<T: svg::Node>(mut node: T, colour: &str, dash: &str) -> T {
    node.assign("fill", "none");
    node.assign("stroke", colour);
    node.assign("stroke-width", 2.5);
    if dash != "none" {
        node.assign("stroke-dasharray", dash);
    }
    node
}

fn text(x: f64, y: f64, anchor: &str, class: &str, content: String) -> Text {
    Text::new(content)
        .set("x", x)
        .set("y", y)
        .set("text-anchor", anchor)
        .set("class", class)
}

/// "7", "7.5", "7.25": pH values as people write them (ASCII digits only,
/// pH is never negative here).
fn ph_number(ph: f64) -> String {
    let s = format!("{:.2}", ph);
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// Shortens `label` to `max` characters with an ellipsis.
pub(crate) fn shorten(label: &str, max: usize) -> String {
    if label.chars().count() <= max {
        label.to_string()
    } else {
        let mut s: String = label.chars().take(max - 1).collect();
        s.push('…');
        s
    }
}

/// Grid, axes, ticks and axis titles.
fn frame(axes: &Axes) -> Group {
    let mut g = Group::new().set("class", "frame");
    for k in 0..=4 {
        let fraction = k as f64 / 4.0;
        let y = axes.y(fraction);
        g = g
            .add(
                Line::new()
                    .set("class", if k == 0 { "axis" } else { "grid" })
                    .set("x1", PLOT_LEFT)
                    .set("x2", PLOT_RIGHT)
                    .set("y1", y)
                    .set("y2", y),
            )
            .add(text(
                PLOT_LEFT - 8.0,
                y + 4.0,
                "end",
                "tick",
                ["0", "0.25", "0.5", "0.75", "1"][k].to_string(),
            ));
    }
    let first = axes.ph_lo.ceil() as i64;
    let last = axes.ph_hi.floor() as i64;
    for ph in first..=last {
        let x = axes.x(ph as f64);
        g = g
            .add(
                Line::new()
                    .set("class", "axis")
                    .set("x1", x)
                    .set("x2", x)
                    .set("y1", PLOT_BOTTOM)
                    .set("y2", PLOT_BOTTOM + 5.0),
            )
            .add(text(
                x,
                PLOT_BOTTOM + 19.0,
                "middle",
                "tick",
                ph.to_string(),
            ));
    }
    let middle = round2((PLOT_TOP + PLOT_BOTTOM) / 2.0);
    g.add(
        Line::new()
            .set("class", "axis")
            .set("x1", PLOT_LEFT)
            .set("x2", PLOT_LEFT)
            .set("y1", PLOT_TOP)
            .set("y2", PLOT_BOTTOM),
    )
    .add(text(
        round2((PLOT_LEFT + PLOT_RIGHT) / 2.0),
        PLOT_BOTTOM + 38.0,
        "middle",
        "axis-title",
        "pH".into(),
    ))
    .add(
        text(14.0, middle, "middle", "axis-title", "mole fraction".into())
            .set("transform", format!("rotate(-90 14 {middle})")),
    )
}

/// The compartment's pH: a vertical black line labelled above the plot.
fn ph_marker(axes: &Axes, ph: f64, place: &str) -> Group {
    let x = axes.x(ph);
    // Keep the label inside the drawing near either end of the axis.
    let anchor = if x < PLOT_LEFT + 30.0 {
        "start"
    } else if x > PLOT_RIGHT - 30.0 {
        "end"
    } else {
        "middle"
    };
    Group::new()
        .set("class", "ph-marker")
        .add(
            Line::new()
                .set("class", "ph-line")
                .set("x1", x)
                .set("x2", x)
                .set("y1", PLOT_TOP - 6.0)
                .set("y2", PLOT_BOTTOM)
                .set("stroke", "#000")
                .set("stroke-width", 1.5),
        )
        .add(text(
            x,
            PLOT_TOP - 10.0,
            anchor,
            "ph-label",
            format!("{}: pH {}", shorten(place, PLACE_CHARS), ph_number(ph)),
        ))
}

/// Label positions: each as close to its line's end as possible, at least
/// LABEL_GAP apart, all between the top and bottom of the plot.
pub fn spread_labels(wanted: &[f64]) -> Vec<f64> {
    let mut order: Vec<usize> = (0..wanted.len()).collect();
    order.sort_by(|&a, &b| wanted[a].total_cmp(&wanted[b]).then(a.cmp(&b)));
    let top = PLOT_TOP + 4.0;
    let bottom = PLOT_BOTTOM + 4.0;
    let mut placed: Vec<f64> = order.iter().map(|&i| wanted[i] + 4.0).collect();
    // Push down past the label above, then up from the bottom edge.
    for n in 0..placed.len() {
        let floor = if n == 0 {
            top
        } else {
            placed[n - 1] + LABEL_GAP
        };
        placed[n] = placed[n].max(floor);
    }
    for n in (0..placed.len()).rev() {
        let ceiling = if n + 1 == placed.len() {
            bottom
        } else {
            placed[n + 1] - LABEL_GAP
        };
        placed[n] = placed[n].min(ceiling);
    }
    let mut out = vec![0.0; wanted.len()];
    for (n, &i) in order.iter().enumerate() {
        out[i] = round2(placed[n]);
    }
    out
}

/// Each line's label at its right end, joined to it by a short leader.
fn end_labels(ends: &[(usize, f64)], labels: &[&str]) -> Group {
    let ys: Vec<f64> = ends.iter().map(|&(_, y)| y).collect();
    let placed = spread_labels(&ys);
    let mut g = Group::new().set("class", "end-labels");
    for (&(n, y), label_y) in ends.iter().zip(placed) {
        let (colour, _) = STYLES[n % STYLES.len()];
        g = g
            .add(
                Line::new()
                    .set("x1", PLOT_RIGHT + 2.0)
                    .set("y1", y)
                    .set("x2", PLOT_RIGHT + 10.0)
                    .set("y2", round2(label_y - 4.0))
                    .set("stroke", colour)
                    .set("stroke-width", 1),
            )
            .add(text(
                PLOT_RIGHT + 13.0,
                label_y,
                "start",
                "end-label",
                shorten(labels[n], END_LABEL_CHARS),
            ));
    }
    g
}

/// A sample of every line style with its label, in rows of three.
fn legend(labels: &[&str]) -> Group {
    let mut g = Group::new().set("class", "legend");
    for (n, label) in labels.iter().enumerate() {
        let (colour, dash) = STYLES[n % STYLES.len()];
        let x = PLOT_LEFT + (n % LEGEND_COLUMNS) as f64 * LEGEND_COLUMN_WIDTH;
        let y = LEGEND_TOP + (n / LEGEND_COLUMNS) as f64 * LEGEND_ROW;
        g = g
            .add(styled(
                Line::new()
                    .set("x1", x)
                    .set("x2", x + 34.0)
                    .set("y1", y - 4.0)
                    .set("y2", y - 4.0),
                colour,
                dash,
            ))
            .add(text(
                x + 42.0,
                y,
                "start",
                "legend-label",
                shorten(label, LEGEND_LABEL_CHARS),
            ));
    }
    g
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn axes_map_the_ph_range_and_fractions_onto_the_plot() {
        let axes = Axes {
            ph_lo: 4.0,
            ph_hi: 10.0,
        };
        assert_eq!(axes.x(4.0), PLOT_LEFT);
        assert_eq!(axes.x(10.0), PLOT_RIGHT);
        // 480 units for 6 pH units: 80 per pH unit.
        assert_eq!(axes.x(7.0), 296.0);
        assert_eq!(axes.y(1.0), PLOT_TOP);
        assert_eq!(axes.y(0.0), PLOT_BOTTOM);
        assert_eq!(axes.y(0.5), 134.0);
        // Rounding noise outside [0, 1] stays on the plot.
        assert_eq!(axes.y(1.0000001), PLOT_TOP);
        assert_eq!(axes.y(-1e-12), PLOT_BOTTOM);
    }

    #[test]
    fn end_labels_keep_their_distance_and_stay_on_the_plot() {
        // Three lines ending near zero and one near one.
        let placed = spread_labels(&[PLOT_BOTTOM, PLOT_BOTTOM, PLOT_TOP, PLOT_BOTTOM - 1.0]);
        let mut sorted = placed.clone();
        sorted.sort_by(f64::total_cmp);
        for pair in sorted.windows(2) {
            assert!(pair[1] - pair[0] >= LABEL_GAP - 1e-9, "{placed:?}");
        }
        assert!(
            sorted[0] >= PLOT_TOP && sorted[3] <= PLOT_BOTTOM + 4.0,
            "{placed:?}"
        );
        // The line ending at the top keeps its label where it wanted it.
        assert_eq!(placed[2], PLOT_TOP + 4.0);
        // Labels that do not collide are not moved.
        assert_eq!(spread_labels(&[100.0, 200.0]), vec![104.0, 204.0]);
    }

    #[test]
    fn long_labels_are_shortened_with_an_ellipsis() {
        assert_eq!(shorten("HATP3-", 14), "HATP3-");
        assert_eq!(shorten("nH 12, z -4, Mg 1", 14), "nH 12, z -4, …");
        assert_eq!(ph_number(7.0), "7");
        assert_eq!(ph_number(7.25), "7.25");
        assert_eq!(ph_number(8.5), "8.5");
    }
}
