//! Command-line entry: parse arguments once into a settled command, run it
//! through the library, map the outcome to an exit code.
//!
//! Exit codes: 0 = no finding at or above the `--fail-on` level,
//! 1 = at least one such finding, 2 = bad input or usage, 3 = writing the
//! output failed (disk full, permission).

use clap::{Parser, Subcommand, ValueEnum};
use gibbsite::report::{baseline, Report, Severity};
use gibbsite::{Error, Project};
use std::path::{Path, PathBuf};
use std::process::ExitCode;

#[derive(Parser)]
#[command(
    name = "gibbsite",
    version,
    about = "Thermodynamic consistency report for metabolic models"
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
    /// Largest input file (and decompressed SBML) read, e.g. `512M`, `2G`.
    #[arg(long, global = true, value_name = "SIZE", default_value = "256M", value_parser = parse_size)]
    max_input_size: u64,
}

fn parse_size(text: &str) -> Result<u64, String> {
    gibbsite::project::read::parse_size(text)
}

/// Where a project's files may come from (build and check).
#[derive(clap::Args)]
struct Confine {
    /// Also allow the project's settings to name files in this folder
    /// (symlinks followed); by default everything must be inside the
    /// project folder. May be repeated.
    #[arg(long, value_name = "DIR")]
    allow_dir: Vec<PathBuf>,
}

impl Confine {
    fn options(&self) -> gibbsite::project::LoadOptions {
        gibbsite::project::LoadOptions {
            allowed_dirs: self.allow_dir.clone(),
        }
    }
}

#[derive(Subcommand)]
enum Command {
    /// Analyse a project and write the report site.
    Build {
        /// Project folder, gibbsite.yaml, model .yaml or SBML file (.xml, .xml.gz).
        project: PathBuf,
        /// Output folder (default: `site` inside the project folder, or
        /// `<model>-site` in the current folder for a single file).
        #[arg(short, long)]
        output: Option<PathBuf>,
        #[arg(long, value_enum, default_value_t = FailOn::Error)]
        fail_on: FailOn,
        /// Earlier report.json: only findings not in it decide the exit code.
        #[arg(long)]
        baseline: Option<PathBuf>,
        /// Side table of ΔG data or concentrations (CSV/TSV), keyed by model
        /// id or cross-reference; repeatable, applied after gibbsite.yaml's.
        #[arg(long = "data", value_name = "TABLE")]
        data: Vec<PathBuf>,
        /// Exit with 1 when fewer than this percentage of internal
        /// reactions could be judged (have a ΔG′° estimate), e.g. 50.
        #[arg(long, value_name = "PERCENT", value_parser = gibbsite::report::headline::parse_min_coverage)]
        min_coverage: Option<f64>,
        /// Render with the default theme even if the project has its own
        /// (a project theme is trusted code: use this for third-party models).
        #[arg(long)]
        no_project_theme: bool,
        #[command(flatten)]
        confine: Confine,
    },
    /// Convert an SBML model (.xml or .xml.gz) into a gibbsite project folder.
    Import {
        /// SBML Level 3 file, plain or gzipped.
        model: PathBuf,
        /// Project folder to write (model.yaml and gibbsite.yaml).
        #[arg(short, long)]
        output: PathBuf,
        /// YAML file of compartment conditions (`compartments: {m: {ph: 7.8,
        /// potential: -155 mV}}`), written into gibbsite.yaml.
        #[arg(long)]
        conditions: Option<PathBuf>,
        /// Replace model.yaml and gibbsite.yaml if the folder has them.
        #[arg(long)]
        force: bool,
    },
    /// Build reports for a collection of models and an overview comparing
    /// them; or merge slices built on several machines.
    Collection {
        #[command(subcommand)]
        action: CollectionAction,
    },
    /// Analyse a project and print the findings; writes nothing.
    Check {
        /// Project folder, gibbsite.yaml, model .yaml or SBML file (.xml, .xml.gz).
        project: PathBuf,
        #[arg(long, value_enum, default_value_t = FailOn::Error)]
        fail_on: FailOn,
        /// Earlier report.json: only findings not in it decide the exit code.
        #[arg(long)]
        baseline: Option<PathBuf>,
        /// Side table of ΔG data or concentrations (CSV/TSV), keyed by model
        /// id or cross-reference; repeatable, applied after gibbsite.yaml's.
        #[arg(long = "data", value_name = "TABLE")]
        data: Vec<PathBuf>,
        /// Exit with 1 when fewer than this percentage of internal
        /// reactions could be judged (have a ΔG′° estimate), e.g. 50.
        #[arg(long, value_name = "PERCENT", value_parser = gibbsite::report::headline::parse_min_coverage)]
        min_coverage: Option<f64>,
        /// What to print on standard output.
        #[arg(long, value_enum, default_value_t = Format::Text)]
        format: Format,
        #[command(flatten)]
        confine: Confine,
    },
}

#[derive(Subcommand)]
enum CollectionAction {
    /// Build one report per model into <output>/<model>/ using all cores,
    /// then the collection overview (<output>/index.html).
    Build {
        /// Folder of models (SBML files, model .yaml files, project folders)
        /// or a list file (one path per line).
        input: PathBuf,
        /// Output folder.
        #[arg(short, long)]
        output: PathBuf,
        /// Models built at once (default: the number of cores).
        #[arg(short, long)]
        jobs: Option<usize>,
        /// Memory the running models may use together, e.g. 4G or 800M
        /// (default: three quarters of the available memory).
        #[arg(long, value_parser = gibbsite::collection::run::parse_size)]
        memory: Option<u64>,
        /// Build only slice i of n (by sorted path); merge the slices with
        /// `collection merge`.
        #[arg(long, value_name = "I/N")]
        shard: Option<gibbsite::collection::shard::ShardSpec>,
        #[arg(long, value_enum, default_value_t = FailOn::Error)]
        fail_on: FailOn,
        /// Overview title (default: from the folder or list file name).
        #[arg(long)]
        title: Option<String>,
    },
    /// Build the overview from slices made by `collection build --shard`.
    Merge {
        /// Output folders of the slices (one folder may hold several).
        #[arg(required = true)]
        slices: Vec<PathBuf>,
        /// Output folder (may be one of the slice folders).
        #[arg(short, long)]
        output: PathBuf,
        #[arg(long, value_enum, default_value_t = FailOn::Error)]
        fail_on: FailOn,
        /// Overview title (default: the one the slices were built with).
        #[arg(long)]
        title: Option<String>,
    },
}

/// Output of `check`.
#[derive(Clone, Copy, PartialEq, Eq, ValueEnum)]
enum Format {
    /// One line per finding.
    Text,
    /// The full report (as report.json).
    Json,
    /// SARIF 2.1.0 for code-scanning tools.
    Sarif,
    /// A Markdown summary for CI job pages.
    Markdown,
}

/// Which findings make the run exit with 1.
#[derive(Clone, Copy, PartialEq, Eq, ValueEnum)]
enum FailOn {
    Error,
    Warning,
    Never,
}

fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(cli) => cli,
        Err(e) => {
            let _ = e.print();
            return if e.use_stderr() {
                ExitCode::from(2)
            } else {
                ExitCode::SUCCESS
            };
        }
    };
    gibbsite::project::read::set_max_input_size(cli.max_input_size);
    match run(cli.command) {
        Ok(code) => code,
        Err(e) => {
            eprintln!("{e}");
            ExitCode::from(e.exit_code())
        }
    }
}

fn run(command: Command) -> Result<ExitCode, Error> {
    if let Err(message) = gibbsite::report::build::source_date_epoch() {
        return Err(Error::input(gibbsite::Diagnostic::new(
            Path::new("SOURCE_DATE_EPOCH"),
            message,
        )));
    }
    match command {
        Command::Build {
            project,
            output,
            fail_on,
            baseline,
            data,
            no_project_theme,
            min_coverage,
            confine,
        } => {
            let baseline = baseline.as_deref().map(baseline::load).transpose()?;
            let loaded = load(&project, &data, &confine.options())?;
            let report = loaded.analyse();
            let out = output.unwrap_or_else(|| default_output(&project));
            let theme = if no_project_theme {
                None
            } else {
                loaded.settings.theme_dir.as_deref()
            };
            gibbsite::site::render(&report, theme, &out)?;
            print_summary(&report);
            eprintln!("site written to {}", out.display());
            let code = exit_code(&report, fail_on, baseline.as_ref());
            Ok(coverage_gate(&report, min_coverage).unwrap_or(code))
        }
        Command::Import {
            model,
            output,
            conditions,
            force,
        } => {
            let model = gibbsite::project::sbml::read_sbml(&model)?;
            let conditions = conditions
                .as_deref()
                .map(|p| gibbsite::project::conditions::read_file(p, &model))
                .transpose()?
                .unwrap_or_default();
            gibbsite::project::write::write_project_with_conditions(
                &model,
                &output,
                &conditions,
                force,
            )?;
            eprintln!(
                "{} reactions, {} metabolites, {} compartments written to {}",
                model.reactions.len(),
                model.metabolites.len(),
                model.compartments.len(),
                output.display()
            );
            Ok(ExitCode::SUCCESS)
        }
        Command::Collection { action } => run_collection(action),
        Command::Check {
            project,
            fail_on,
            baseline,
            format,
            data,
            min_coverage,
            confine,
        } => {
            let baseline = baseline.as_deref().map(baseline::load).transpose()?;
            let loaded = load(&project, &data, &confine.options())?;
            let report = loaded.analyse();
            let model_file = loaded
                .settings
                .model_files
                .first()
                .map(|p| p.to_string_lossy().into_owned());
            match format {
                Format::Text => print!(
                    "{}{}",
                    gibbsite::report::text::findings_text(&report),
                    gibbsite::report::text::scenario_verdicts_text(&report)
                ),
                Format::Json => print!("{}", gibbsite::report::json::to_json(&report)),
                Format::Sarif => print!(
                    "{}",
                    gibbsite::report::sarif::to_sarif(&report, model_file.as_deref())
                ),
                Format::Markdown => {
                    print!("{}", gibbsite::report::summary::to_markdown(&report, 50))
                }
            }
            print_summary(&report);
            let code = exit_code(&report, fail_on, baseline.as_ref());
            Ok(coverage_gate(&report, min_coverage).unwrap_or(code))
        }
    }
}

/// Exit 1 with one line when the judged share is below `--min-coverage`.
fn coverage_gate(report: &Report, min_percent: Option<f64>) -> Option<ExitCode> {
    let line = gibbsite::report::headline::below_minimum(report.headline.as_ref()?, min_percent?)?;
    eprintln!("{line}");
    Some(ExitCode::from(1))
}

/// Load a project, apply `--data` tables and print load warnings.
fn load(
    project: &Path,
    data: &[PathBuf],
    options: &gibbsite::project::LoadOptions,
) -> Result<Project, Error> {
    let mut loaded = Project::load_with(project, options)?;
    loaded.add_tables(data)?;
    for w in loaded.warnings() {
        eprintln!("{w}");
    }
    Ok(loaded)
}

fn run_collection(action: CollectionAction) -> Result<ExitCode, Error> {
    use gibbsite::collection::{self, run::Limits, shard::ShardSpec, FailLevel};
    let level = |f: FailOn| match f {
        FailOn::Error => FailLevel::Error,
        FailOn::Warning => FailLevel::Warning,
        FailOn::Never => FailLevel::Never,
    };
    let finished = match action {
        CollectionAction::Build {
            input,
            output,
            jobs,
            memory,
            shard,
            fail_on,
            title,
        } => {
            let options = collection::BuildOptions {
                limits: Limits::new(jobs, memory),
                shard: shard.unwrap_or(ShardSpec::WHOLE),
                fail_on: level(fail_on),
                title,
            };
            collection::build(&input, &output, &options, &|_, line| eprintln!("{line}"))?
        }
        CollectionAction::Merge {
            slices,
            output,
            fail_on,
            title,
        } => collection::merge(&slices, &output, level(fail_on), title)?,
    };
    eprintln!(
        "{} models, {} failed; {}",
        finished.models,
        finished.failed,
        match &finished.overview {
            Some(_) => "overview written".to_string(),
            None => "slice written (merge the slices for the overview)".to_string(),
        }
    );
    Ok(ExitCode::from(finished.worst.exit_code()))
}

fn default_output(project: &Path) -> PathBuf {
    if project.is_dir() {
        return project.join("site");
    }
    let name = project
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    if name == gibbsite::project::SETTINGS_FILE {
        return project.parent().unwrap_or(Path::new(".")).join("site");
    }
    let stem = name.split('.').next().unwrap_or("model");
    PathBuf::from(format!("{}-site", gibbsite::slug::slug(stem)))
}

fn print_summary(report: &Report) {
    eprintln!(
        "{} errors, {} warnings, {} notes ({} reactions, {} metabolites, {} scenarios)",
        report.summary.errors,
        report.summary.warnings,
        report.summary.notes,
        report.summary.reactions,
        report.summary.metabolites,
        report.summary.scenarios
    );
}

/// 1 when a finding at or above the `fail_on` level exists (with a
/// baseline: one that the baseline does not have).
fn exit_code(report: &Report, fail_on: FailOn, baseline: Option<&Report>) -> ExitCode {
    let counted: Vec<&gibbsite::report::Finding> = match baseline {
        Some(b) => {
            let new = baseline::new_findings(report, b);
            eprintln!("{} findings are new since the baseline", new.len());
            new
        }
        None => report.findings.iter().collect(),
    };
    let at_least = |s: Severity| counted.iter().filter(|f| f.severity <= s).count() > 0;
    let failing = match fail_on {
        FailOn::Never => false,
        FailOn::Error => at_least(Severity::Error),
        FailOn::Warning => at_least(Severity::Warning),
    };
    if failing {
        ExitCode::from(1)
    } else {
        ExitCode::SUCCESS
    }
}
