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

use crate::analysis::Analysis;
use crate::checks;
use crate::error::Result;
use crate::finding::Finding;
use crate::project::{LoadOptions, Project};
use crate::report::{CheckInfo, Report};
use std::path::{Path, PathBuf};

/// Load a project (folder, settings file, model YAML or SBML) and apply the
/// extra side tables given on the command line after its own.
pub fn load(path: &Path, tables: &[PathBuf], options: &LoadOptions) -> Result<Project> {
    let mut project = Project::load_with(path, options)?;
    project.add_tables(tables)?;
    Ok(project)
}

/// Compute energies, loops and scenarios once.
pub fn analyse(project: &Project) -> Analysis<'_> {
    Analysis::new(&project.model, &project.settings)
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
    let analysis = analyse(project);
    let findings = check(&analysis);
    report(project, &analysis, findings)
}

/// Write the site for `report` (with the theme folder, if any) into `out`,
/// replacing an earlier site only once the new one is complete.
pub fn render(report: &Report, theme_dir: Option<&Path>, out: &Path) -> Result<()> {
    crate::site::render(report, theme_dir, out)
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
