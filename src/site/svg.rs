//! The ΔG' range of a reaction drawn as a horizontal bar against zero.
//!
//! Model strings only ever go into text nodes here (the `<title>`): the svg
//! crate escapes `&`, `<` and `>` in text but NOT `"` in attribute values,
//! (checked in 0.18.0: `Value` stores attribute strings verbatim), so
//! attributes carry only numbers and fixed words we write ourselves.

use super::format::energy;
use svg::node::element::{Definitions, Line, Path, Pattern, Rectangle, Text, Title};
use svg::Document;

/// Drawing size in user units (the page scales it to its width).
pub const WIDTH: f64 = 640.0;
pub const HEIGHT: f64 = 92.0;
/// Horizontal extent of the plot inside the drawing.
pub const PLOT_LEFT: f64 = 48.0;
pub const PLOT_RIGHT: f64 = 592.0;

const BAR_TOP: f64 = 34.0;
const BAR_HEIGHT: f64 = 16.0;
const ALLOWANCE_PAD: f64 = 5.0;

/// What the bar shows, in kJ/mol.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RangeBar {
    /// ΔG' over the allowed concentrations.
    pub min: f64,
    pub max: f64,
    /// Half-width of the uncertainty allowance (multiplier × σ), ≥ 0.
    pub allowance: f64,
    /// ΔrG'° (ΔG' at 1 M for every reactant), marked with a tick.
    pub standard: Option<f64>,
    /// ΔG' at the measured concentrations, marked with a circle.
    pub measured: Option<f64>,
}

/// Linear map from kJ/mol to x coordinates; the domain always includes 0
/// so the zero line is on every bar.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Scale {
    pub lo: f64,
    pub hi: f64,
}

impl Scale {
    pub fn for_bar(bar: &RangeBar) -> Scale {
        let allowance = bar.allowance.max(0.0);
        let mut lo = (bar.min - allowance).min(0.0);
        let mut hi = (bar.max + allowance).max(0.0);
        for v in [bar.standard, bar.measured].into_iter().flatten() {
            lo = lo.min(v);
            hi = hi.max(v);
        }
        let span = hi - lo;
        // Also catches NaN (which `range_bar` filters out before).
        if span.is_nan() || span <= 1e-9 {
            return Scale {
                lo: lo - 1.0,
                hi: hi + 1.0,
            };
        }
        // A margin so labels at the ends do not touch the frame.
        let pad = 0.06 * span;
        Scale {
            lo: lo - pad,
            hi: hi + pad,
        }
    }

    pub fn x(&self, v: f64) -> f64 {
        let t = (v - self.lo) / (self.hi - self.lo);
        round2(PLOT_LEFT + t * (PLOT_RIGHT - PLOT_LEFT))
    }
}

/// Two decimals keep the SVG short and identical across platforms.
pub(crate) fn round2(v: f64) -> f64 {
    (v * 100.0).round() / 100.0 + 0.0
}

/// A text element at (x, y) rounded to two decimals; the content is escaped
/// by the svg crate (model strings go only here, never into attributes).
pub(crate) fn text(x: f64, y: f64, anchor: &str, class: &str, content: String) -> Text {
    Text::new(content)
        .set("x", round2(x))
        .set("y", round2(y))
        .set("text-anchor", anchor)
        .set("class", class)
}

/// A label of the bar; its anchor comes from the stylesheet (`svg.dg-bar
/// text` is centred, classes `start` and `end` move it), not an attribute
/// on every label.
fn label(x: f64, y: f64, class: &str, text: String) -> Text {
    Text::new(text).set("x", x).set("y", y).set("class", class)
}

/// Whole user units: the bar is 640 units wide, so a unit is well under a
/// pixel at any page width, and integers keep the drawing short.
fn whole(v: f64) -> f64 {
    v.round() + 0.0
}

/// The bar as an inline `<svg>` element. `title` (e.g. the reaction id) is
/// escaped by the svg crate as text content.
pub fn range_bar(title: &str, bar: &RangeBar) -> String {
    if !(bar.min.is_finite() && bar.max.is_finite() && bar.allowance.is_finite()) {
        return String::new();
    }
    let scale = Scale::for_bar(bar);
    let x = |v: f64| whole(scale.x(v));
    let (x_min, x_max, x_zero) = (x(bar.min), x(bar.max), x(0.0));
    let allowance = bar.allowance.max(0.0);

    let hatch = Pattern::new()
        .set("id", "hatch")
        .set("width", 6)
        .set("height", 6)
        .set("patternUnits", "userSpaceOnUse")
        .set("patternTransform", "rotate(45)")
        .add(
            Line::new()
                .set("x1", 0)
                .set("y1", 0)
                .set("x2", 0)
                .set("y2", 6)
                .set("class", "hatch-line"),
        );

    let mut doc = Document::new()
        .set("viewBox", (0, 0, WIDTH, HEIGHT))
        .set("class", "dg-bar")
        .set("role", "img")
        // A first-child <title> is the accessible name of the drawing.
        .add(Title::new(format!(
            "ΔG′ range of {title}: {} to {} kJ/mol",
            energy(bar.min),
            energy(bar.max)
        )))
        // Axis across the whole plot.
        .add(
            Line::new()
                .set("class", "axis")
                .set("x1", PLOT_LEFT)
                .set("x2", PLOT_RIGHT)
                .set("y1", BAR_TOP + BAR_HEIGHT / 2.0)
                .set("y2", BAR_TOP + BAR_HEIGHT / 2.0),
        );

    if allowance > 0.0 {
        // The hatching is defined only on bars that use it.
        let (a_min, a_max) = (x(bar.min - allowance), x(bar.max + allowance));
        doc = doc.add(Definitions::new().add(hatch)).add(
            Rectangle::new()
                .set("class", "allowance")
                .set("x", a_min)
                .set("y", BAR_TOP - ALLOWANCE_PAD)
                .set("width", a_max - a_min)
                .set("height", BAR_HEIGHT + 2.0 * ALLOWANCE_PAD)
                .set("fill", "url(#hatch)"),
        );
    }
    // A range of one value still gets a visible sliver, centred on it.
    let (bar_x, bar_w) = if x_max - x_min < 2.0 {
        (
            whole((scale.x(bar.min) + scale.x(bar.max)) / 2.0 - 1.0),
            2.0,
        )
    } else {
        (x_min, x_max - x_min)
    };
    doc = doc.add(
        Rectangle::new()
            .set("class", "range")
            .set("x", bar_x)
            .set("y", BAR_TOP)
            .set("width", bar_w)
            .set("height", BAR_HEIGHT),
    );

    if let Some(standard) = bar.standard.filter(|v| v.is_finite()) {
        let x = x(standard);
        doc = doc.add(
            Path::new()
                .set("class", "standard")
                .set("d", format!("M{x},{} l-5,-7 h10 z", BAR_TOP - 1.0)),
        );
    }
    if let Some(measured) = bar.measured.filter(|v| v.is_finite()) {
        let x = x(measured);
        doc = doc.add(
            svg::node::element::Circle::new()
                .set("class", "measured")
                .set("cx", x)
                .set("cy", BAR_TOP + BAR_HEIGHT / 2.0)
                .set("r", 4.5),
        );
    }

    // Zero drawn last and heavy, so it stays visible over the bar.
    doc = doc
        .add(
            Line::new()
                .set("class", "zero")
                .set("x1", x_zero)
                .set("x2", x_zero)
                .set("y1", 14)
                .set("y2", BAR_TOP + BAR_HEIGHT + 12.0),
        )
        .add(label(x_zero, 11.0, "zero-label", "0".into()));

    // Value labels under the bar; stacked when they would overlap.
    let below = BAR_TOP + BAR_HEIGHT + 24.0;
    if (bar.max - bar.min).abs() < 1e-9 {
        doc = doc.add(label(x_min, below, "value", energy(bar.min)));
    } else if x_max - x_min < 70.0 {
        doc = doc
            .add(label(x_min, below, "value end", energy(bar.min)))
            .add(label(x_max, below + 14.0, "value start", energy(bar.max)));
    } else {
        doc = doc
            .add(label(x_min, below, "value", energy(bar.min)))
            .add(label(x_max, below, "value", energy(bar.max)));
    }
    doc.add(label(PLOT_RIGHT, 11.0, "unit end", "kJ/mol".into()))
        .to_string()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn scale_always_contains_zero_and_the_range() {
        let bar = RangeBar {
            min: 10.0,
            max: 30.0,
            allowance: 5.0,
            standard: None,
            measured: None,
        };
        let s = Scale::for_bar(&bar);
        // Domain [0, 35] with 6 % margins on each side.
        assert!((s.lo - -2.1).abs() < 1e-9, "{s:?}");
        assert!((s.hi - 37.1).abs() < 1e-9, "{s:?}");
        assert!(s.x(0.0) > PLOT_LEFT && s.x(0.0) < s.x(10.0));
    }

    #[test]
    fn title_text_is_escaped() {
        let bar = RangeBar {
            min: -1.0,
            max: 1.0,
            allowance: 0.0,
            standard: None,
            measured: None,
        };
        let svg = range_bar("<b>&\"'", &bar);
        assert!(svg.contains("&lt;b&gt;&amp;"), "{svg}");
        assert!(!svg.contains("<b>"));
    }
}
