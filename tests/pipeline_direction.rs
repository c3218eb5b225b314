//! The pipeline runs one way: load → analyse → checks → report → render.
//! These tests hold the direction in place: the types each stage takes, the
//! modules each stage's source may name, and the numbers the site takes from
//! the report instead of recomputing them.

use gibbsite::analysis::Analysis;
use gibbsite::finding::Finding;
use gibbsite::project::Note;
use gibbsite::report::{CheckInfo, Report};
use gibbsite::{checks, pipeline, Project};
use std::path::{Path, PathBuf};

fn demo_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside")
}

/// Every `.rs` file under `src/<dir>` (or the file `src/<dir>` itself), with
/// comments removed so that prose naming a module does not count.
fn sources(dir: &str) -> Vec<(PathBuf, String)> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("src").join(dir);
    let mut files = Vec::new();
    let mut stack = vec![root];
    while let Some(path) = stack.pop() {
        if path.is_dir() {
            for entry in std::fs::read_dir(&path).unwrap() {
                stack.push(entry.unwrap().path());
            }
        } else if path.extension().is_some_and(|e| e == "rs") {
            let text = std::fs::read_to_string(&path).unwrap();
            let code: String = text
                .lines()
                .map(|line| match line.find("//") {
                    Some(k) => &line[..k],
                    None => line,
                })
                .collect::<Vec<_>>()
                .join("\n");
            files.push((path, code));
        }
    }
    assert!(!files.is_empty(), "no sources under src/{dir}");
    files.sort();
    files
}

/// The places in `dir` that name any of `forbidden`.
fn offenders(dir: &str, forbidden: &[&str]) -> Vec<String> {
    let mut found = Vec::new();
    for (path, code) in sources(dir) {
        for (n, line) in code.lines().enumerate() {
            for word in forbidden {
                if line.contains(word) {
                    found.push(format!("{}:{}: `{word}`", path.display(), n + 1));
                }
            }
        }
    }
    found
}

/// `crate::report::…` paths in `dir` other than the finding types that
/// `report` re-exports from `finding`.
fn report_paths_beyond_findings(dir: &str) -> Vec<String> {
    let allowed = ["Finding", "Severity", "Verdict"];
    let mut found = Vec::new();
    for (path, code) in sources(dir) {
        for (k, _) in code.match_indices("crate::report::") {
            let rest = &code[k + "crate::report::".len()..];
            let items: Vec<&str> = if let Some(group) = rest.strip_prefix('{') {
                group[..group.find('}').unwrap_or(group.len())]
                    .split(',')
                    .map(str::trim)
                    .filter(|s| !s.is_empty())
                    .collect()
            } else {
                let end = rest
                    .find(|c: char| !(c.is_alphanumeric() || c == '_'))
                    .unwrap_or(rest.len());
                vec![&rest[..end]]
            };
            for item in items {
                if !allowed.contains(&item) {
                    found.push(format!("{}: crate::report::{item}", path.display()));
                }
            }
        }
    }
    found
}

/// The stages' signatures: checks take the analysed data and give findings;
/// the report is built from the analysed data, the findings, the catalogue
/// of checks and the notes (no project, no check runner). A change of either
/// signature stops this test from compiling.
#[test]
fn stages_take_only_what_the_previous_stage_produced() {
    let run: fn(&Analysis) -> Vec<Finding> = checks::REGISTRY[0].run;
    let all: fn(&Analysis) -> Vec<Finding> = checks::run_all;
    let build: fn(&Analysis, Vec<Finding>, Vec<CheckInfo>, &[Note]) -> Report =
        gibbsite::report::build::build;
    // The stages called one after another give the same report as the
    // one-call entry point (the timestamp aside, which both take from the
    // clock or SOURCE_DATE_EPOCH).
    let project = Project::load(&demo_dir()).expect("demo loads");
    let analysis = pipeline::analyse(&project);
    let first = run(&analysis);
    let findings = all(&analysis);
    assert!(
        first.iter().all(|f| findings.contains(f)),
        "run_all keeps the findings of each check"
    );
    let mut staged = build(
        &analysis,
        findings,
        pipeline::check_catalogue(),
        &project.notes,
    );
    let mut whole = project.analyse();
    staged.tool.generated.clear();
    whole.tool.generated.clear();
    assert_eq!(staged, whole);
    // The demo has deliberate problems (tests/demo.rs), so the counts per
    // check are filled in from the findings.
    assert!(whole.summary.checks.iter().any(|c| c.findings > 0));
    assert_eq!(
        whole
            .summary
            .checks
            .iter()
            .map(|c| c.findings)
            .sum::<usize>(),
        whole
            .findings
            .iter()
            .filter(|f| whole
                .summary
                .checks
                .iter()
                .any(|c| c.kinds.contains(&f.kind)))
            .count()
    );
}

/// Analysis knows nothing of the stages after it.
#[test]
fn analysis_does_not_call_checks_report_or_site() {
    let found = offenders(
        "analysis.rs",
        &[
            "crate::checks",
            "crate::report",
            "crate::site",
            "crate::pipeline",
        ],
    );
    assert!(found.is_empty(), "{found:#?}");
}

/// Checks read the analysed data: they neither run analysis steps nor know
/// the report or the site.
#[test]
fn checks_do_not_call_back_into_analysis_or_forward_into_output() {
    let found = offenders(
        "checks",
        &[
            "Analysis::new",
            "analyse_loops",
            "scenarios::analyse",
            "crate::site",
            "crate::pipeline",
        ],
    );
    assert!(found.is_empty(), "{found:#?}");
    let found = report_paths_beyond_findings("checks");
    assert!(found.is_empty(), "{found:#?}");
}

/// The report is built from results: it runs neither analysis nor checks.
#[test]
fn report_does_not_run_analysis_or_checks() {
    let found = offenders(
        "report",
        &[
            "crate::checks",
            "Analysis::new",
            "analyse_loops",
            "scenarios::analyse",
            "crate::site",
            "crate::pipeline",
        ],
    );
    assert!(found.is_empty(), "{found:#?}");
}

/// The site takes thermodynamic numbers from the report: it has no gas
/// constant, Faraday constant or thermodynamic code of its own.
#[test]
fn site_has_no_thermodynamic_constants() {
    let found = offenders(
        "site",
        &[
            "thermo::",
            "R_KJ",
            "F_KJ_PER_V",
            "8.314",
            "analysis::",
            "crate::checks",
        ],
    );
    assert!(found.is_empty(), "{found:#?}");
}

/// The reactant's ΔfG'° the metabolite page shows comes with the report:
/// −RT ln Σ exp(−ΔfG'°ᵢ/RT) over the counted species (Alberty,
/// Thermodynamics of Biochemical Reactions, Wiley 2003, the sum over species
/// of his printed programs, pp. 222 and 289).
#[test]
fn species_views_carry_the_reactant_energy() {
    let report = Project::load(&demo_dir()).unwrap().analyse();
    let mut checked = 0;
    for m in &report.metabolites {
        let Some(species) = &m.species else { continue };
        let rt = gibbsite::thermo::constants::R_KJ * species.temperature_k;
        let counted: Vec<f64> = species
            .entries
            .iter()
            .filter_map(|e| e.dfg_prime_kj)
            .collect();
        // Shifted by the lowest energy so thousands of kJ/mol do not overflow.
        let lowest = counted.iter().copied().fold(f64::INFINITY, f64::min);
        let sum: f64 = counted.iter().map(|g| (-(g - lowest) / rt).exp()).sum();
        let expected = lowest - rt * sum.ln();
        let got = species.reactant_dfg_prime_kj.expect("species counted");
        // Library values use Alberty's own R (8.31451 J/K/mol): the two gas
        // constants differ by 6 parts per million (CODATA 2018), far below
        // the 0.01 kJ/mol the pages print.
        assert!(
            (got - expected).abs() < 1e-3,
            "{}: {got} vs {expected}",
            m.id
        );
        checked += 1;
    }
    assert!(checked > 0, "the demo has metabolites with species data");
}
