//! The collection overview: `index.html` (table, distribution charts,
//! comparison) and `collection.json` (the same data) at the top of the
//! output folder, rendered with the theme's `collection.html`.

use super::chart;
use super::compare::{self, Compared, Comparison};
use super::digest::Digest;
use super::{FailLevel, ModelStatus};
use crate::error::{Error, Result};
use crate::site::theme::Theme;
use minijinja::context;
use minijinja::value::Value;
use serde::Serialize;
use std::path::Path;

/// Shape marker of `collection.json`.
pub const OVERVIEW_FORMAT: &str = "gibbsite-collection/1";

/// One model as the overview receives it.
#[derive(Debug, Clone)]
pub struct ModelResult {
    pub name: String,
    pub source: String,
    pub result: std::result::Result<Digest, String>,
}

/// Everything the overview is made from (in collection order).
#[derive(Debug, Clone)]
pub struct Collection {
    pub title: String,
    pub fail_on: FailLevel,
    pub models: Vec<ModelResult>,
}

/// Figures of a model that loaded.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Figures {
    pub model_id: String,
    pub title: String,
    pub reactions: usize,
    pub internal_reactions: usize,
    pub metabolites: usize,
    /// `None`: loop analysis off or unfinished (see `loop_error`).
    pub loop_capable: Option<usize>,
    pub elementary_loops: Option<usize>,
    pub loops_truncated: bool,
    pub loop_error: Option<String>,
    pub loop_analysis: bool,
    pub energy_cycles: Option<usize>,
    pub contradictions: usize,
    pub errors: usize,
    pub warnings: usize,
    pub notes: usize,
    pub reactions_with_energy: usize,
    /// Internal reactions with ΔrG'°, percent.
    pub coverage_percent: f64,
}

/// A row of the table.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Row {
    pub name: String,
    pub source: String,
    /// The model's report, relative to the overview (none when it failed).
    pub href: Option<String>,
    pub status: ModelStatus,
    pub exit_code: u8,
    pub error: Option<String>,
    pub figures: Option<Figures>,
}

#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ChartView {
    pub id: &'static str,
    pub title: &'static str,
    pub svg: String,
    /// "lowest … median … highest …" with the models at the ends.
    pub summary: String,
}

/// The data of `collection.json` and of the page.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Overview {
    pub format: &'static str,
    pub title: String,
    pub generated: String,
    pub tool: String,
    pub version: String,
    pub fail_on: FailLevel,
    pub models: usize,
    pub passed: usize,
    pub with_findings: usize,
    pub failed: usize,
    /// Exit code of the collection: the worst model's.
    pub exit_code: u8,
    pub rows: Vec<Row>,
    pub comparison: Comparison,
}

fn figures(d: &Digest) -> Figures {
    let finished = d.loops.as_ref().filter(|l| l.error.is_none());
    Figures {
        model_id: d.model_id.clone(),
        title: d.title.clone(),
        reactions: d.reactions,
        internal_reactions: d.internal_reactions,
        metabolites: d.metabolites,
        loop_capable: finished.map(|l| l.capable.len()),
        elementary_loops: finished.map(|l| l.elementary),
        loops_truncated: finished.is_some_and(|l| l.truncated),
        loop_error: d.loops.as_ref().and_then(|l| l.error.clone()),
        loop_analysis: d.loops.is_some(),
        energy_cycles: finished.map(|l| l.energy_cycles),
        contradictions: d.contradictions.len(),
        errors: d.errors,
        warnings: d.warnings,
        notes: d.notes,
        reactions_with_energy: d.reactions_with_energy,
        coverage_percent: 100.0 * d.coverage(),
    }
}

/// The overview's data from the models' results.
pub fn overview(c: &Collection) -> Overview {
    let rows: Vec<Row> = c
        .models
        .iter()
        .map(|m| {
            let status = match &m.result {
                Ok(d) => ModelStatus::from_counts(d.errors, d.warnings, c.fail_on),
                Err(_) => ModelStatus::Failed,
            };
            Row {
                name: m.name.clone(),
                source: m.source.clone(),
                href: m.result.is_ok().then(|| format!("{}/index.html", m.name)),
                status,
                exit_code: status.exit_code(),
                error: m.result.as_ref().err().cloned(),
                figures: m.result.as_ref().ok().map(figures),
            }
        })
        .collect();
    let compared: Vec<Compared> = c
        .models
        .iter()
        .filter_map(|m| {
            m.result.as_ref().ok().map(|digest| Compared {
                name: &m.name,
                digest,
            })
        })
        .collect();
    let count = |s: ModelStatus| rows.iter().filter(|r| r.status == s).count();
    Overview {
        format: OVERVIEW_FORMAT,
        title: c.title.clone(),
        generated: crate::report::build::generated_timestamp(),
        tool: env!("CARGO_PKG_NAME").into(),
        version: env!("CARGO_PKG_VERSION").into(),
        fail_on: c.fail_on,
        models: rows.len(),
        passed: count(ModelStatus::Passed),
        with_findings: count(ModelStatus::Findings),
        failed: count(ModelStatus::Failed),
        exit_code: rows.iter().map(|r| r.exit_code).max().unwrap_or(0),
        comparison: compare::compare(&compared),
        rows,
    }
}

/// "lowest 3 (a), median 4, highest 9 (b, c)": the models at the ends,
/// at most three named.
fn summary(points: &[(&str, f64)], unit: &str) -> String {
    let mut values: Vec<f64> = points.iter().map(|p| p.1).collect();
    values.sort_by(f64::total_cmp);
    let n = values.len();
    let median = if n % 2 == 1 {
        values[n / 2]
    } else {
        (values[n / 2 - 1] + values[n / 2]) / 2.0
    };
    let show = |v: f64| {
        let s = if (v - v.round()).abs() < 1e-9 {
            format!("{}", v.round() as i64)
        } else {
            format!("{v:.1}")
        };
        format!("{}{unit}", s.replace('-', "\u{2212}"))
    };
    let at = |v: f64| {
        let names: Vec<&str> = points.iter().filter(|p| p.1 == v).map(|p| p.0).collect();
        let mut s = names.iter().take(3).copied().collect::<Vec<_>>().join(", ");
        if names.len() > 3 {
            s.push_str(&format!(" and {} more", names.len() - 3));
        }
        s
    };
    format!(
        "lowest {} ({}), median {}, highest {} ({})",
        show(values[0]),
        at(values[0]),
        show(median),
        show(values[n - 1]),
        at(values[n - 1])
    )
}

fn charts(rows: &[Row]) -> Vec<ChartView> {
    type Pick = fn(&Figures) -> Option<f64>;
    let specs: [(&'static str, &'static str, Pick, bool, &str); 6] = [
        (
            "reactions",
            "Reactions",
            |f| Some(f.reactions as f64),
            true,
            "",
        ),
        (
            "loop-capable",
            "Loop-capable reactions",
            |f| f.loop_capable.map(|v| v as f64),
            true,
            "",
        ),
        (
            "elementary-loops",
            "Elementary loops listed",
            |f| f.elementary_loops.map(|v| v as f64),
            true,
            "",
        ),
        (
            "contradictions",
            "Reactions with a contradiction",
            |f| Some(f.contradictions as f64),
            true,
            "",
        ),
        (
            "warnings",
            "Warnings",
            |f| Some(f.warnings as f64),
            true,
            "",
        ),
        (
            "coverage",
            "Internal reactions with ΔrG′°",
            |f| Some(f.coverage_percent),
            false,
            " %",
        ),
    ];
    specs
        .into_iter()
        .filter_map(|(id, title, pick, integer, unit)| {
            let points: Vec<(&str, f64)> = rows
                .iter()
                .filter_map(|r| Some((r.name.as_str(), pick(r.figures.as_ref()?)?)))
                .collect();
            if points.is_empty() {
                return None;
            }
            let values: Vec<f64> = points.iter().map(|p| p.1).collect();
            Some(ChartView {
                id,
                title,
                svg: chart::histogram(&title.to_lowercase(), &values, integer, unit),
                summary: summary(&points, unit),
            })
        })
        .collect()
}

/// Renders the page (default theme) for `data`.
pub fn render_page(data: &Overview) -> Result<String> {
    let theme = Theme::load(None)?;
    let env = crate::site::environment(&theme)?;
    let charts: Vec<Value> = charts(&data.rows)
        .into_iter()
        .map(|c| {
            context! {
                id => c.id,
                title => c.title,
                summary => c.summary,
                // Our own drawing; model strings never enter it.
                svg => Value::from_safe_string(c.svg),
            }
        })
        .collect();
    let template = env
        .get_template("collection.html")
        .map_err(|e| crate::site::template_error(&theme, "collection.html", &e))?;
    template
        .render(context! {
            collection => Value::from_serialize(data),
            charts => charts,
            caution => crate::report::build::CAUTION,
            path_to_root => Value::from_safe_string(String::new()),
        })
        .map_err(|e| crate::site::template_error(&theme, "collection.html", &e))
}

/// Writes `index.html`, `collection.json` and the theme assets into `out`.
pub fn write(out: &Path, data: &Overview) -> Result<()> {
    let html = render_page(data)?;
    let json = serde_json::to_string_pretty(data).map_err(|e| Error::Render {
        template: "collection.json".into(),
        message: e.to_string(),
    })?;
    let theme = Theme::load(None)?;
    for (name, bytes) in theme.assets() {
        write_file(&out.join("assets").join(name), bytes)?;
    }
    write_file(&out.join("collection.json"), format!("{json}\n").as_bytes())?;
    write_file(&out.join("index.html"), html.as_bytes())
}

/// Writes through a temporary file renamed into place, so a reader never
/// sees half a page.
fn write_file(path: &Path, bytes: &[u8]) -> Result<()> {
    let folder = path.parent().unwrap_or(Path::new("."));
    std::fs::create_dir_all(folder).map_err(|e| Error::io(folder, e))?;
    let mut tmp = tempfile::NamedTempFile::new_in(folder).map_err(|e| Error::io(folder, e))?;
    std::io::Write::write_all(&mut tmp, bytes).map_err(|e| Error::io(path, e))?;
    tmp.persist(path).map_err(|e| Error::io(path, e.error))?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn summary_names_the_models_at_both_ends() {
        let s = summary(&[("a", 3.0), ("b", 9.0), ("c", 4.0), ("d", 3.0)], "");
        assert_eq!(s, "lowest 3 (a, d), median 3.5, highest 9 (b)");
        let s = summary(&[("a", 12.5)], " %");
        assert_eq!(s, "lowest 12.5 % (a), median 12.5 %, highest 12.5 % (a)");
    }
}
