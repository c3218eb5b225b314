//! Command-line entry: parse arguments once into a settled command, run it
//! through the library, map the outcome to an exit code.
//!
//! Exit codes: 0 = no finding at or above the `--fail-on` level,
//! 1 = at least one such finding, 2 = bad input or usage.

use clap::{Parser, Subcommand, ValueEnum};
use gibbsite::report::{Report, Severity};
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
    },
    /// Convert an SBML model (.xml or .xml.gz) into a gibbsite project folder.
    Import {
        /// SBML Level 3 file, plain or gzipped.
        model: PathBuf,
        /// Project folder to write (model.yaml and gibbsite.yaml).
        #[arg(short, long)]
        output: PathBuf,
    },
    /// Analyse a project and print the findings; writes nothing.
    Check {
        /// Project folder, gibbsite.yaml, model .yaml or SBML file (.xml, .xml.gz).
        project: PathBuf,
        #[arg(long, value_enum, default_value_t = FailOn::Error)]
        fail_on: FailOn,
    },
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
    match run(cli.command) {
        Ok(code) => code,
        Err(e) => {
            eprintln!("{e}");
            ExitCode::from(2)
        }
    }
}

fn run(command: Command) -> Result<ExitCode, Error> {
    match command {
        Command::Build {
            project,
            output,
            fail_on,
        } => {
            let loaded = Project::load(&project)?;
            let report = loaded.analyse();
            let out = output.unwrap_or_else(|| default_output(&project));
            gibbsite::site::render(&report, loaded.settings.theme_dir.as_deref(), &out)?;
            print_summary(&report);
            eprintln!("site written to {}", out.display());
            Ok(exit_code(&report, fail_on))
        }
        Command::Import { model, output } => {
            let model = gibbsite::project::sbml::read_sbml(&model)?;
            gibbsite::project::write::write_project(&model, &output)?;
            eprintln!(
                "{} reactions, {} metabolites, {} compartments written to {}",
                model.reactions.len(),
                model.metabolites.len(),
                model.compartments.len(),
                output.display()
            );
            Ok(ExitCode::SUCCESS)
        }
        Command::Check { project, fail_on } => {
            let loaded = Project::load(&project)?;
            let report = loaded.analyse();
            print!("{}", gibbsite::report::text::findings_text(&report));
            print_summary(&report);
            Ok(exit_code(&report, fail_on))
        }
    }
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

fn exit_code(report: &Report, fail_on: FailOn) -> ExitCode {
    let failing = match fail_on {
        FailOn::Never => false,
        FailOn::Error => report.count(Severity::Error) > 0,
        FailOn::Warning => report.count(Severity::Error) + report.count(Severity::Warning) > 0,
    };
    if failing {
        ExitCode::from(1)
    } else {
        ExitCode::SUCCESS
    }
}
