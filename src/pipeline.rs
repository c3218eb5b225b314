//! The one place that runs the stages, in one direction:
//!
//! ```text
//! load ──▶ Project ──analyse──▶ Analysis ──checks──▶ findings ──report──▶ Report ──render──▶ site/
//! ```
//!
//! Each stage sees only what the previous ones produced: `analysis` knows
//! nothing of checks or the report, the checks read the analysed data only,
//! `report::build` reads the analysed data and the findings, and `site`
//! reads the report only (every number it shows is in the report). The CLI
//! and the collection builder call these functions; so can tests.

use crate::analysis::{Analysis, LoopSearch};
use crate::checks;
use crate::error::Result;
use crate::finding::Finding;
use crate::progress::{self, Progress};
use crate::project::{LoadOptions, Project};
use crate::report::{CheckInfo, Report};
use std::path::{Path, PathBuf};

/// Load a project (folder, settings file, model YAML or SBML) and apply the
/// extra side tables given on the command line after its own.
pub fn load(path: &Path, tables: &[PathBuf], options: &LoadOptions) -> Result<Project> {
    load_with(path, tables, options, &Progress::hidden())
}

/// [`load`], timed as the `import` stage.
pub fn load_with(
    path: &Path,
    tables: &[PathBuf],
    options: &LoadOptions,
    progress: &Progress,
) -> Result<Project> {
    let _stage = progress.stage(progress::IMPORT, None);
    let mut project = Project::load_with(path, options)?;
    project.add_tables(tables)?;
    Ok(project)
}

/// Compute energies, scenarios and loops once.
pub fn analyse(project: &Project) -> Analysis<'_> {
    analyse_with(project, &Progress::hidden())
}

/// [`analyse`], timed as the `thermodynamics`, `loops` and `loop-energies`
/// stages. The loop search needs the model only, so it runs beside the
/// thermodynamics; the loops' energies need both and come last.
pub fn analyse_with<'a>(project: &'a Project, progress: &Progress) -> Analysis<'a> {
    let (model, settings) = (&project.model, &project.settings);
    let (mut analysis, search) = rayon::join(
        || {
            let _stage = progress.stage(progress::THERMODYNAMICS, None);
            Analysis::without_loops(model, settings)
        },
        || {
            settings.loops.then(|| {
                let _stage = progress.stage(progress::LOOPS, None);
                LoopSearch::run(model, settings)
            })
        },
    );
    if let Some(search) = search {
        let _stage = progress.stage(progress::LOOP_ENERGIES, None);
        analysis.add_loop_search(search);
    }
    analysis
}

/// Run every registered check over the analysed data.
pub fn check(analysis: &Analysis) -> Vec<Finding> {
    checks::run_all(analysis)
}

/// The checks that ran, as the report lists them (counts filled in by
/// `report::build`).
pub fn check_catalogue() -> Vec<CheckInfo> {
    checks::REGISTRY
        .iter()
        .map(|c| CheckInfo {
            slug: c.slug.to_string(),
            title: c.title.to_string(),
            description: c.description.to_string(),
            kinds: c.kinds.iter().map(|k| k.to_string()).collect(),
            findings: 0,
        })
        .collect()
}

/// The report from the analysed data and the findings.
pub fn report(project: &Project, analysis: &Analysis, findings: Vec<Finding>) -> Report {
    crate::report::build::build(analysis, findings, check_catalogue(), &project.notes)
}

/// analyse → checks → report.
pub fn report_of(project: &Project) -> Report {
    report_with(project, &Progress::hidden())
}

/// [`report_of`], each stage timed (`thermodynamics`, `loops`, `checks`,
/// `report`).
pub fn report_with(project: &Project, progress: &Progress) -> Report {
    let analysis = analyse_with(project, progress);
    let stage = progress.stage(progress::CHECKS, None);
    let findings = check(&analysis);
    stage.finish();
    let _stage = progress.stage(progress::REPORT, None);
    report(project, &analysis, findings)
}

/// Write the site for `report` (with the theme folder, if any) into `out`,
/// replacing an earlier site only once the new one is complete.
pub fn render(report: &Report, theme_dir: Option<&Path>, out: &Path) -> Result<()> {
    render_with(report, theme_dir, out, &Progress::hidden())
}

/// [`render`], timed as the `pages` stage (counting pages written).
pub fn render_with(
    report: &Report,
    theme_dir: Option<&Path>,
    out: &Path,
    progress: &Progress,
) -> Result<()> {
    crate::site::render_with_progress(report, theme_dir, out, progress)
}

/// [`render_with`] of a report the caller gives up, so the pages are made
/// without a second copy of it; the report comes back (its collections
/// sorted) once the site is written.
pub fn render_owned_with(
    report: Report,
    theme_dir: Option<&Path>,
    out: &Path,
    progress: &Progress,
) -> Result<Report> {
    crate::site::render_owned(report, theme_dir, out, progress)
}

impl Project {
    /// Analyse the project and return the report every output is made from
    /// (analyse → checks → report; see [`report_of`]).
    pub fn analyse(&self) -> Report {
        report_of(self)
    }
}

impl Analysis<'_> {
    /// Every registered check over this analysis (see [`check`]).
    pub fn findings(&self) -> Vec<Finding> {
        check(self)
    }
}
