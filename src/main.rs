//! Command-line entry: parse arguments once into a settled command, run it
//! through the library, map the outcome to an exit code.
//!
//! Exit codes: 0 = no finding at or above the `--fail-on` level,
//! 1 = at least one such finding, 2 = bad input or usage, 3 = writing the
//! output failed (disk full, permission).

use clap::{Parser, Subcommand, ValueEnum};
use gibbsite::outcome::Outcome;
use gibbsite::progress::Progress;
use gibbsite::report::{baseline, kinds::KindFilter, Report};
use gibbsite::{pipeline, Error, Project};
use std::path::{Path, PathBuf};
use std::process::ExitCode;

/// Shown at the end of `--help` of the program and its analysing commands.
const EXIT_CODES: &str = "\
Exit codes:
  0  no finding at or above the --fail-on level (or only ones already in the --baseline)
  1  at least one such finding
  2  bad input or usage (the message names the file, line and what was expected)
  3  writing the output failed (disk full, permission)";

#[derive(Parser)]
#[command(
    name = "gibbsite",
    version,
    about = "Thermodynamic consistency report for metabolic models",
    after_help = EXIT_CODES
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
    /// Largest input file (and decompressed SBML) read, e.g. `512M`, `2G`.
    #[arg(long, global = true, value_name = "SIZE", default_value = "256M", value_parser = parse_size)]
    max_input_size: u64,
    /// Print nothing on stderr but warnings and errors (no progress, no
    /// summary line).
    #[arg(short, long, global = true)]
    quiet: bool,
    /// Print the wall time of every stage on stderr at the end.
    #[arg(long, global = true)]
    timings: bool,
}

/// What the CLI prints on stderr besides warnings and errors.
struct Output {
    quiet: bool,
    timings: bool,
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

/// Which findings count, and against which baseline (build and check).
#[derive(clap::Args)]
struct Findings {
    /// Keep only findings of this kind (repeatable); the others are left
    /// out of every output and of the exit code.
    #[arg(long, value_name = "KIND", value_parser = kind_parser())]
    only: Vec<String>,
    /// Leave out findings of this kind (repeatable).
    #[arg(long, value_name = "KIND", value_parser = kind_parser())]
    skip: Vec<String>,
    /// Accept a --baseline made from a model with a different id.
    #[arg(long)]
    baseline_any_model: bool,
}

fn kind_parser() -> clap::builder::PossibleValuesParser {
    use gibbsite::report::kinds;
    // Each kind's one-line summary is its help in `--help`.
    clap::builder::PossibleValuesParser::new(gibbsite::checks::kinds().into_iter().map(|k| {
        let value = clap::builder::PossibleValue::new(k);
        match kinds::help(k) {
            Some(h) => value.help(h.summary),
            None => value,
        }
    }))
}

impl Findings {
    /// Filter the report, check the baseline's model, decide pass or fail.
    fn settle(
        &self,
        report: &mut Report,
        fail_on: FailOn,
        baseline: Option<(&Path, &Report)>,
    ) -> Result<Outcome, Error> {
        let filter = KindFilter::new(&self.only, &self.skip, &gibbsite::checks::kinds())
            .map_err(|e| Error::input(gibbsite::Diagnostic::new(Path::new("--only/--skip"), e)))?;
        filter.apply(report);
        if let Some((path, b)) = baseline {
            baseline::check_model(report, b, path, self.baseline_any_model)?;
        }
        Ok(Outcome::decide(
            report,
            fail_on.level(),
            baseline.map(|(_, b)| b),
        ))
    }
}

#[derive(Subcommand)]
enum Command {
    /// Analyse a project and write the report site.
    #[command(after_help = EXIT_CODES)]
    Build {
        /// Project folder, gibbsite.yaml, model .yaml or SBML file (.xml, .xml.gz).
        project: PathBuf,
        /// Output folder (default: `site` inside the project folder, or
        /// `<model>-site` in the current folder for a single file).
        #[arg(short, long)]
        output: Option<PathBuf>,
        /// Lowest severity that makes the run exit with 1 (see "Exit codes").
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
        #[command(flatten)]
        findings: Findings,
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
    #[command(after_help = EXIT_CODES)]
    Check {
        /// Project folder, gibbsite.yaml, model .yaml or SBML file (.xml, .xml.gz).
        project: PathBuf,
        /// Lowest severity that makes the run exit with 1 (see "Exit codes").
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
        #[command(flatten)]
        findings: Findings,
        /// Folder that SARIF file paths are relative to (the repository
        /// root in CI; default: the current folder).
        #[arg(long, value_name = "DIR", default_value = ".")]
        sarif_root: PathBuf,
        /// Absolute URL where the report site is published; SARIF rules
        /// link to their kind in it.
        #[arg(long, value_name = "URL", value_parser = gibbsite::report::sarif::parse_report_url)]
        report_url: Option<String>,
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
        /// Lowest severity that makes the run exit with 1 (see "Exit codes").
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
        /// Lowest severity that makes the run exit with 1 (see "Exit codes").
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
    /// Findings grouped by kind with counts, then a pass/fail line.
    Text,
    /// The full report (as report.json).
    Json,
    /// SARIF 2.1.0 for code-scanning tools.
    Sarif,
    /// A Markdown summary for CI job pages.
    Markdown,
}

impl FailOn {
    fn level(self) -> gibbsite::collection::FailLevel {
        use gibbsite::collection::FailLevel;
        match self {
            FailOn::Error => FailLevel::Error,
            FailOn::Warning => FailLevel::Warning,
            FailOn::Never => FailLevel::Never,
        }
    }
}

/// Which findings make the run exit with 1.
#[derive(Clone, Copy, PartialEq, Eq, ValueEnum)]
enum FailOn {
    /// Exit 1 when a finding of severity error is present.
    Error,
    /// Exit 1 when a finding of severity error or warning is present.
    Warning,
    /// Always exit 0 after a complete run (bad input still exits 2).
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
    let output = Output {
        quiet: cli.quiet,
        timings: cli.timings,
    };
    match run(cli.command, &output) {
        Ok(code) => code,
        Err(e) => {
            eprintln!("{e}");
            ExitCode::from(e.exit_code())
        }
    }
}

fn run(command: Command, shown: &Output) -> Result<ExitCode, Error> {
    let progress = Progress::new(shown.quiet);
    if let Err(message) = gibbsite::report::build::source_date_epoch() {
        return Err(Error::input(gibbsite::Diagnostic::new(
            Path::new("SOURCE_DATE_EPOCH"),
            message,
        )));
    }
    match command {
        Command::Build {
            project,
            output: out_dir,
            fail_on,
            baseline,
            data,
            no_project_theme,
            min_coverage,
            confine,
            findings,
        } => {
            let (loaded, report, outcome) = judge(
                &project,
                &data,
                &confine,
                &findings,
                Gate {
                    fail_on,
                    baseline: baseline.as_deref(),
                    min_coverage,
                },
                &progress,
            )?;
            let out = out_dir.unwrap_or_else(|| default_output(&project));
            let theme = if no_project_theme {
                None
            } else {
                loaded.settings.theme_dir.clone()
            };
            // The model is not needed for the pages: free it first.
            drop(loaded);
            let report = pipeline::render_owned_with(report, theme.as_deref(), &out, &progress)?;
            shown.finish(&report, &progress);
            if !shown.quiet {
                eprintln!("site written to {}", out.display());
            }
            println!("{}", outcome.line());
            Ok(ExitCode::from(outcome.exit_code()))
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
            if !shown.quiet {
                eprintln!(
                    "{} reactions, {} metabolites, {} compartments written to {}",
                    model.reactions.len(),
                    model.metabolites.len(),
                    model.compartments.len(),
                    output.display()
                );
            }
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
            findings,
            sarif_root,
            report_url,
        } => {
            let (loaded, report, outcome) = judge(
                &project,
                &data,
                &confine,
                &findings,
                Gate {
                    fail_on,
                    baseline: baseline.as_deref(),
                    min_coverage,
                },
                &progress,
            )?;
            match format {
                Format::Text => print!(
                    "{}",
                    gibbsite::report::text::grouped_text(&report, &outcome)
                ),
                Format::Json => print!("{}", gibbsite::report::json::to_json(&report)),
                Format::Sarif => {
                    let options = gibbsite::report::sarif::SarifOptions {
                        root: sarif_root,
                        report_url,
                        model_files: loaded.settings.model_files.clone(),
                        lines: loaded.source_lines.locate(),
                    };
                    print!("{}", gibbsite::report::sarif::to_sarif(&report, &options))
                }
                Format::Markdown => print!(
                    "{}",
                    gibbsite::report::summary::to_markdown(&report, &outcome)
                ),
            }
            // Text and Markdown end with the pass/fail line themselves.
            shown.finish(&report, &progress);
            if matches!(format, Format::Json | Format::Sarif) && !shown.quiet {
                eprintln!("{}", outcome.line());
            }
            Ok(ExitCode::from(outcome.exit_code()))
        }
    }
}

/// What decides pass or fail besides the findings themselves.
struct Gate<'a> {
    fail_on: FailOn,
    baseline: Option<&'a Path>,
    min_coverage: Option<f64>,
}

/// Load, analyse and report a project, then settle the outcome: the
/// `--only`/`--skip` filter, the baseline, the fail level and the coverage
/// floor (whose shortfall is also said on stderr).
fn judge(
    project: &Path,
    data: &[PathBuf],
    confine: &Confine,
    findings: &Findings,
    gate: Gate<'_>,
    progress: &Progress,
) -> Result<(Project, Report, Outcome), Error> {
    let baseline = gate
        .baseline
        .map(|p| Ok::<_, Error>((p, baseline::load(p)?)))
        .transpose()?;
    let loaded = load(project, data, &confine.options(), progress)?;
    let mut report = pipeline::report_with(&loaded, progress);
    let mut outcome = findings.settle(
        &mut report,
        gate.fail_on,
        baseline.as_ref().map(|(p, b)| (*p, b)),
    )?;
    outcome.require_coverage(&report, gate.min_coverage);
    if let Some(short) = &outcome.coverage_short {
        eprintln!("{short}");
    }
    Ok((loaded, report, outcome))
}

/// Load a project, apply `--data` tables and print load warnings.
fn load(
    project: &Path,
    data: &[PathBuf],
    options: &gibbsite::project::LoadOptions,
    progress: &Progress,
) -> Result<Project, Error> {
    let loaded = pipeline::load_with(project, data, options, progress)?;
    for w in loaded.warnings() {
        eprintln!("{w}");
    }
    Ok(loaded)
}

fn run_collection(action: CollectionAction) -> Result<ExitCode, Error> {
    use gibbsite::collection::{self, run::Limits, shard::ShardSpec};
    let level = FailOn::level;
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

impl Output {
    /// The summary line and, with `--timings`, the table of stage times.
    fn finish(&self, report: &Report, progress: &Progress) {
        if !self.quiet {
            print_summary(report);
        }
        if self.timings {
            eprint!("{}", progress.timings().table());
        }
    }
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

#[cfg(test)]
mod tests {
    use super::*;
    use clap::CommandFactory;

    /// Every option, argument and possible value of every command, with the
    /// path of commands leading to it, that has no help text.
    fn without_help(command: &clap::Command, path: &str, out: &mut Vec<String>) {
        for arg in command.get_arguments() {
            let id = arg.get_id().as_str();
            // clap's own --help and --version carry their text.
            if id == "help" || id == "version" {
                continue;
            }
            if arg.get_help().is_none() && arg.get_long_help().is_none() {
                out.push(format!("{path} {id}"));
            }
            // Flags have the implicit values true/false; only real choices count.
            let choices = if arg.get_action().takes_values() {
                arg.get_possible_values()
            } else {
                Vec::new()
            };
            for value in choices {
                if value.get_help().is_none() {
                    out.push(format!("{path} {id}={}", value.get_name()));
                }
            }
        }
        for sub in command.get_subcommands() {
            if sub.get_name() == "help" {
                continue;
            }
            let sub_path = format!("{path} {}", sub.get_name());
            if sub.get_about().is_none() {
                out.push(format!("{sub_path} (command)"));
            }
            without_help(sub, &sub_path, out);
        }
    }

    #[test]
    fn every_command_option_and_argument_has_help_text() {
        let command = Cli::command();
        command.clone().debug_assert();
        let mut missing = Vec::new();
        without_help(&command, "gibbsite", &mut missing);
        assert_eq!(missing, Vec::<String>::new(), "options without help text");
    }

    #[test]
    fn help_lists_the_exit_codes() {
        let mut command = Cli::command();
        let help = command.render_long_help().to_string();
        for line in [
            "Exit codes:",
            "  1  at least one such finding",
            "  2  bad input",
            "  3  writing the output failed",
        ] {
            assert!(help.contains(line), "`{line}` missing from:\n{help}");
        }
        let check = command.find_subcommand_mut("check").unwrap();
        let help = check.render_long_help().to_string();
        assert!(help.contains("Exit codes:"), "{help}");
        assert!(
            help.contains("Lowest severity that makes the run exit with 1"),
            "{help}"
        );
    }
}
