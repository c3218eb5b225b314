//! Distribution of one figure across the models of a collection, drawn as
//! a histogram with the `svg` crate. As in `site::svg`, attributes carry
//! only numbers and fixed words we write; text nodes carry only numbers
//! and fixed words too (no model names: the page's caption names them).

use crate::site::svg::{round2, text};
use svg::node::element::{Line, Rectangle, Title};
use svg::Document;

const WIDTH: f64 = 320.0;
const HEIGHT: f64 = 170.0;
const LEFT: f64 = 34.0;
const RIGHT: f64 = 306.0;
const TOP: f64 = 22.0;
const BOTTOM: f64 = 130.0;
/// Bins to aim for; fewer when the values are few integers.
const TARGET_BINS: f64 = 8.0;

/// Bins of a histogram: `[start + k·width, start + (k+1)·width)`.
#[derive(Debug, Clone, PartialEq)]
pub struct Bins {
    pub start: f64,
    pub width: f64,
    pub counts: Vec<usize>,
}

/// 1, 2 or 5 times a power of ten, at least `raw`.
fn nice_step(raw: f64) -> f64 {
    let power = 10f64.powf(raw.log10().floor());
    [1.0, 2.0, 5.0, 10.0]
        .into_iter()
        .map(|m| m * power)
        .find(|s| *s >= raw * (1.0 - 1e-9))
        .unwrap_or(10.0 * power)
}

/// Bins over finite `values`; `integer` keeps bin edges on whole numbers.
pub fn bins(values: &[f64], integer: bool) -> Option<Bins> {
    let finite: Vec<f64> = values.iter().copied().filter(|v| v.is_finite()).collect();
    let min = finite.iter().copied().fold(f64::INFINITY, f64::min);
    let max = finite.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    if finite.is_empty() {
        return None;
    }
    let mut width = if max > min {
        nice_step((max - min) / TARGET_BINS)
    } else {
        1.0
    };
    if integer {
        width = width.max(1.0).round();
    }
    let start = (min / width).floor() * width;
    let n = (((max - start) / width).floor() as usize + 1).max(1);
    let mut counts = vec![0; n];
    for v in finite {
        let k = (((v - start) / width).floor() as usize).min(n - 1);
        counts[k] += 1;
    }
    Some(Bins {
        start,
        width,
        counts,
    })
}

/// A plain number for an axis label: no trailing zeros, real minus sign.
fn label_number(v: f64) -> String {
    let s = if (v - v.round()).abs() < 1e-9 {
        format!("{}", v.round() as i64)
    } else {
        let s = format!("{v:.3}");
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    };
    s.replace('-', "\u{2212}")
}

/// The histogram as an inline `<svg>`; `what` names the figure (a fixed
/// phrase of ours, e.g. "loop-capable reactions"), `unit` is appended to
/// axis values (e.g. " %"). Empty when there is nothing to draw.
pub fn histogram(what: &str, values: &[f64], integer: bool, unit: &str) -> String {
    let Some(b) = bins(values, integer) else {
        return String::new();
    };
    let models: usize = b.counts.iter().sum();
    let tallest = b.counts.iter().copied().max().unwrap_or(1).max(1) as f64;
    let slot = (RIGHT - LEFT) / b.counts.len() as f64;
    let edge = |k: usize| b.start + k as f64 * b.width;
    let mut doc = Document::new()
        .set("viewBox", (0, 0, WIDTH, HEIGHT))
        .set("class", "histogram")
        .set("role", "img")
        .add(Title::new(format!(
            "Histogram of {what} over {models} model{}",
            if models == 1 { "" } else { "s" }
        )))
        .add(
            Line::new()
                .set("class", "axis")
                .set("x1", LEFT)
                .set("x2", RIGHT)
                .set("y1", BOTTOM)
                .set("y2", BOTTOM),
        )
        .add(text(
            LEFT - 6.0,
            TOP + 4.0,
            "end",
            "count",
            label_number(tallest),
        ))
        .add(text(LEFT - 6.0, BOTTOM, "end", "count", "0".into()))
        .add(text(LEFT, TOP - 10.0, "start", "unit", "models".into()));
    for (k, &count) in b.counts.iter().enumerate() {
        let (lo, hi) = (edge(k), edge(k + 1));
        let range = if integer && b.width == 1.0 {
            format!("{}{unit}", label_number(lo))
        } else {
            format!("{} to below {}{unit}", label_number(lo), label_number(hi))
        };
        let x = LEFT + k as f64 * slot;
        if count == 0 {
            continue;
        }
        let h = (BOTTOM - TOP) * count as f64 / tallest;
        doc = doc
            .add(
                Rectangle::new()
                    .set("class", "bar")
                    .set("x", round2(x + 1.0))
                    .set("y", round2(BOTTOM - h))
                    .set("width", round2((slot - 2.0).max(1.0)))
                    .set("height", round2(h))
                    .add(Title::new(format!(
                        "{count} model{}: {range}",
                        if count == 1 { "" } else { "s" }
                    ))),
            )
            .add(text(
                x + slot / 2.0,
                BOTTOM - h - 3.0,
                "middle",
                "count",
                count.to_string(),
            ));
    }
    // Edges under the axis: first, last, and the middle one when it fits.
    let n = b.counts.len();
    let mut ticks = vec![0, n];
    if n >= 4 {
        ticks.insert(1, n / 2);
    }
    for k in ticks {
        let (x, anchor) = (
            LEFT + k as f64 * slot,
            if k == 0 {
                "start"
            } else if k == n {
                "end"
            } else {
                "middle"
            },
        );
        let value = if integer && b.width == 1.0 && k == n {
            // Whole-number bins are labelled by the value they hold.
            edge(k) - 1.0
        } else {
            edge(k)
        };
        doc = doc
            .add(
                Line::new()
                    .set("class", "tick")
                    .set("x1", round2(x))
                    .set("x2", round2(x))
                    .set("y1", BOTTOM)
                    .set("y2", BOTTOM + 4.0),
            )
            .add(text(
                x,
                BOTTOM + 17.0,
                anchor,
                "value",
                format!("{}{unit}", label_number(value)),
            ));
    }
    doc.to_string()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bins_cover_every_value_with_nice_widths() {
        let b = bins(&[2714.0, 2748.0, 2742.0, 2765.0, 2782.0], true).unwrap();
        // Range 68 / 8 = 8.5 → width 10 starting at 2710.
        assert_eq!((b.start, b.width), (2710.0, 10.0));
        assert_eq!(b.counts, [1, 0, 0, 2, 0, 1, 0, 1]);
        assert_eq!(b.counts.iter().sum::<usize>(), 5);
    }

    #[test]
    fn equal_and_fractional_values() {
        let b = bins(&[3.0, 3.0], true).unwrap();
        assert_eq!((b.start, b.width, b.counts.clone()), (3.0, 1.0, vec![2]));
        let b = bins(&[0.0, 0.25, 1.0], false).unwrap();
        // 1 / 8 = 0.125 → 0.2.
        assert_eq!(b.width, 0.2);
        assert_eq!(b.counts, [1, 1, 0, 0, 0, 1]);
        assert!(bins(&[f64::NAN], false).is_none());
    }

    #[test]
    fn histogram_has_one_bar_per_filled_bin_and_an_accessible_name() {
        let svg = histogram("elementary loops", &[1.0, 1.0, 2.0, 5.0], true, "");
        assert_eq!(svg.matches("class=\"bar\"").count(), 3, "{svg}");
        assert!(svg.contains("<title>Histogram of elementary loops over 4 models</title>"));
        assert!(svg.contains("<title>2 models: 1</title>"));
        assert!(histogram("x", &[], true, "").is_empty());
    }
}
