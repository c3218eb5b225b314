//! Outputs for CI: SARIF, the Markdown summary, and failing only on findings
//! that are new since a baseline report.

use gibbsite::report::{sarif, summary};
use gibbsite::Project;
use serde_json::Value;
use std::path::{Path, PathBuf};
use std::process::Command;

fn demo() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside")
}

/// SARIF paths relative to the repository folder, lines from the project.
fn sarif_options(project: &Project) -> sarif::SarifOptions {
    sarif::SarifOptions {
        root: PathBuf::from(env!("CARGO_MANIFEST_DIR")),
        report_url: Some("https://reports.example.org/lakeside/".into()),
        model_files: project.settings.model_files.clone(),
        lines: project.source_lines.locate(),
    }
}

#[test]
fn sarif_lists_every_finding_with_level_rule_and_stable_fingerprint() {
    let project = Project::load(&demo()).unwrap();
    let report = project.analyse();
    let text = sarif::to_sarif(&report, &sarif_options(&project));
    let v: serde_json::Value = serde_json::from_str(&text).unwrap();
    assert_eq!(v["version"], "2.1.0");
    let results = v["runs"][0]["results"].as_array().unwrap();
    assert_eq!(results.len(), report.findings.len());
    let errors = results.iter().filter(|r| r["level"] == "error").count();
    assert_eq!(errors, report.summary.errors);
    let first = &results[0];
    assert_eq!(first["ruleId"], "infeasible-direction");
    assert_eq!(first["locations"][0]["logicalLocations"][0]["name"], "PEPS");
    assert_eq!(
        first["locations"][0]["physicalLocation"]["artifactLocation"]["uri"],
        "projects/lakeside/model.yaml"
    );
    let rules = v["runs"][0]["tool"]["driver"]["rules"].as_array().unwrap();
    assert!(rules.iter().any(|r| r["id"] == "scenario-contradiction"));
    // Same finding, same fingerprint, run after run; different findings differ.
    let again = Project::load(&demo()).unwrap().analyse();
    assert_eq!(
        sarif::fingerprint(&report.findings[0]),
        sarif::fingerprint(&again.findings[0])
    );
    assert_ne!(
        sarif::fingerprint(&report.findings[1]),
        sarif::fingerprint(&report.findings[2])
    );
}

fn gibbsite(args: &[&str], dir: &Path) -> i32 {
    Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(args)
        .arg(dir)
        .output()
        .unwrap()
        .status
        .code()
        .unwrap()
}

#[test]
fn baseline_makes_only_new_findings_fail() {
    let tmp = tempfile::tempdir().unwrap();
    let baseline = tmp.path().join("report.json");
    std::fs::write(
        &baseline,
        gibbsite::report::json::to_json(&Project::load(&demo()).unwrap().analyse()),
    )
    .unwrap();
    let b = baseline.to_str().unwrap();
    // Nothing new since the baseline: exit 0 even with errors in the report.
    assert_eq!(gibbsite(&["check", "--baseline", b], &demo()), 0);
    // A baseline without the errors: they are new, exit 1.
    let mut old = Project::load(&demo()).unwrap().analyse();
    old.findings.retain(|f| f.kind != "scenario-contradiction");
    std::fs::write(&baseline, gibbsite::report::json::to_json(&old)).unwrap();
    assert_eq!(gibbsite(&["check", "--baseline", b], &demo()), 1);
    // A broken baseline is bad input.
    std::fs::write(&baseline, "{ not json").unwrap();
    assert_eq!(gibbsite(&["check", "--baseline", b], &demo()), 2);
}

/// The joint verdict of every scenario reaches SARIF (run properties) and the
/// terminal listing, feasible ones included.
#[test]
fn sarif_and_text_carry_the_joint_scenario_verdicts() {
    let report = Project::load(&demo()).unwrap().analyse();
    let v: serde_json::Value = serde_json::from_str(&sarif::to_sarif(&report, &Default::default()))
        .expect("SARIF is JSON");
    let verdicts = v["runs"][0]["properties"]["scenarioVerdicts"]
        .as_array()
        .unwrap();
    let pairs: Vec<(&str, &str)> = verdicts
        .iter()
        .map(|s| {
            (
                s["scenario"].as_str().unwrap(),
                s["verdict"].as_str().unwrap(),
            )
        })
        .collect();
    assert_eq!(
        pairs,
        [
            ("irreversible-directions", "infeasible"),
            ("noon", "feasible"),
            ("bloom", "infeasible"),
            ("refit", "infeasible"),
            ("dusk", "infeasible"),
        ]
    );
    let text = gibbsite::report::text::scenario_verdicts_text(&report);
    assert!(text.contains("scenario noon as a whole: feasible (max-min driving force "));
    assert!(text.contains("scenario refit as a whole: infeasible"));
    assert!(text.contains("the flux carries 1 internal cycle(s)"));
}

/// Runs the CLI from the repository folder; (exit code, stdout, stderr).
fn run(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .unwrap();
    (
        out.status.code().unwrap(),
        String::from_utf8(out.stdout).unwrap(),
        String::from_utf8(out.stderr).unwrap(),
    )
}

/// The demo's findings (tests/demo.rs explains each) grouped by severity
/// and kind with their counts, and the pass/fail line last on stdout.
#[test]
fn text_output_groups_by_kind_with_counts_and_ends_with_the_verdict() {
    let (code, out, _) = run(&["check", "projects/lakeside"]);
    assert_eq!(code, 1);
    let headers: Vec<&str> = out
        .lines()
        .filter(|l| !l.starts_with(' ') && l.ends_with(')') && !l.starts_with("scenario "))
        .filter(|l| l.starts_with("error ") || l.starts_with("warning ") || l.starts_with("note "))
        .collect();
    assert_eq!(
        headers,
        [
            "error infeasible-direction (1)",
            "error scenario-contradiction (3)",
            "error scenario-infeasible (1)",
            "warning internal-loop (1)",
            "warning scenario-internal-cycle (1)",
            "warning scenario-marginal (3)",
            "note forced-flux (1)",
            "note no-energy-data (1)",
            "note one-way-reversible (2)",
        ]
    );
    // Each group lists its findings under it, indented.
    let at = out.find("error scenario-contradiction (3)\n").unwrap();
    let group: Vec<&str> = out[at..].lines().skip(1).take(3).collect();
    assert!(group.iter().all(|l| l.starts_with("  ")), "{group:?}");
    assert!(group[0].starts_with("  LDH (scenario dusk): carries backward flux"));
    // The demo has 25 internal reactions, STOR alone without ΔrG'° (its
    // `stor_c` has no formation energy): 24 of 25 judged, 96 %.
    let report = Project::load(&demo()).unwrap().analyse();
    let cov = report.coverage.as_ref().unwrap();
    assert_eq!((cov.with_energy, cov.internal_reactions), (24, 25));
    let last = out.lines().last().unwrap();
    assert_eq!(
        last,
        "FAIL: 5 errors, 5 warnings, 4 notes (fails on errors); judged 24 of 25 internal reactions (96 %)"
    );
    let (code, out, _) = run(&["check", "projects/lakeside", "--fail-on", "never"]);
    assert_eq!(code, 0);
    assert!(out
        .lines()
        .last()
        .unwrap()
        .starts_with("PASS: 5 errors, 5 warnings, 4 notes (never fails (--fail-on never))"));
    // `build` prints the same line on stdout.
    let tmp = tempfile::tempdir().unwrap();
    let site = tmp.path().join("site");
    let (code, out, _) = run(&[
        "build",
        "projects/lakeside",
        "-o",
        site.to_str().unwrap(),
        "--fail-on",
        "warning",
    ]);
    assert_eq!(code, 1);
    assert_eq!(
        out.trim_end(),
        last.replace("(fails on errors)", "(fails on errors and warnings)")
    );
}

/// Counts by kind, coverage, root causes when given, the pass/fail line, and
/// at most ten example rows per kind with the rest counted.
#[test]
fn markdown_summary_counts_kinds_and_shows_ten_examples_per_kind() {
    let mut report = Project::load(&demo()).unwrap().analyse();
    // Twelve more one-way-reversible notes (fourteen in all), one of them
    // with hostile text.
    let template = report
        .findings
        .iter()
        .find(|f| f.kind == "one-way-reversible")
        .unwrap()
        .clone();
    for i in 0..12 {
        let mut f = template.clone();
        f.subjects = vec![format!("R{i:02}")];
        f.message = "a | b <script>".into();
        report.findings.push(f);
    }
    report.summary.notes += 12;
    let outcome =
        gibbsite::outcome::Outcome::decide(&report, gibbsite::collection::FailLevel::Error, None);
    // A root cause whose title carries a hostile model id.
    report.root_causes = vec![gibbsite::report::RootCauseView {
        kind: "one-metabolite".into(),
        title: "h_c|<b>: charge 0?".into(),
        sentence: "7 findings would balance if h_c had charge +1.".into(),
        metabolites: vec!["h_c|<b>".into()],
        findings: (0..7).collect(),
        finding_kinds: vec!["charge-imbalance".into()],
    }];
    let md = summary::to_markdown(&report, &outcome);
    assert!(
        md.contains("**FAIL**: 5 errors, 5 warnings, 16 notes (fails on errors); judged 24 of 25 internal reactions (96 %)"),
        "{md}"
    );
    assert!(
        md.contains("Coverage: 24 of 25 internal reactions (96 %) have a ΔrG'°"),
        "{md}"
    );
    assert!(md.contains("| error | `scenario-contradiction` | 3 | A step of a flux scenario runs against its ΔG'. |"), "{md}");
    assert!(md.contains("| note | `one-way-reversible` | 14 |"), "{md}");
    assert!(md.contains("| h\\_c\\|&lt;b&gt;: charge 0? | 7 |"), "{md}");
    // The kind's section: ten rows, then the rest counted.
    let at = md.find("### note `one-way-reversible` (14)").unwrap();
    let section = &md[at..md[at..].find("\n### ").map_or(md.len(), |e| at + e)];
    let rows = section.lines().filter(|l| l.starts_with("| `")).count();
    assert_eq!(rows, 10, "{section}");
    assert!(
        section.contains("… and 4 more of this kind in the report."),
        "{section}"
    );
    assert!(md.contains("a \\| b &lt;script&gt;"), "{md}");
    assert!(md.contains("expert review"));
    // No root causes: no section.
    report.root_causes.clear();
    assert!(!summary::to_markdown(&report, &outcome).contains("### Root causes"));
}

fn sarif_schema_validator() -> jsonschema::Validator {
    // The official SARIF 2.1.0 schema (tests/data/sarif/README.md says
    // where it comes from), draft-04, with formats (uri, date-time) checked.
    let schema: Value = serde_json::from_str(
        &std::fs::read_to_string(
            Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/sarif/sarif-schema-2.1.0.json"),
        )
        .unwrap(),
    )
    .unwrap();
    jsonschema::draft4::options()
        .should_validate_formats(true)
        .build(&schema)
        .expect("the SARIF schema compiles")
}

fn assert_valid_sarif(validator: &jsonschema::Validator, sarif: &Value) {
    let errors: Vec<String> = validator
        .iter_errors(sarif)
        .map(|e| format!("{} at {}", e, e.instance_path()))
        .collect();
    assert!(
        errors.is_empty(),
        "SARIF schema violations:\n{}",
        errors.join("\n")
    );
}

/// The schema test can fail: a SARIF log missing `version`, or with a
/// region line of 0, is refused.
#[test]
fn the_sarif_schema_refuses_broken_logs() {
    let validator = sarif_schema_validator();
    let project = Project::load(&demo()).unwrap();
    let mut v: Value = serde_json::from_str(&sarif::to_sarif(
        &project.analyse(),
        &sarif_options(&project),
    ))
    .unwrap();
    assert!(validator.is_valid(&v));
    v["runs"][0]["results"][0]["locations"][0]["physicalLocation"]["region"]["startLine"] =
        0.into();
    assert!(!validator.is_valid(&v));
    v.as_object_mut().unwrap().remove("version");
    assert!(!validator.is_valid(&v));
}

/// YAML demo: valid SARIF 2.1.0; one rule per kind with help and a link
/// into the report; every finding about a model element has the line
/// where that element's `id` is written; coverage in the run properties.
#[test]
fn sarif_of_the_yaml_demo_is_valid_located_and_has_a_rule_per_kind() {
    let project = Project::load(&demo()).unwrap();
    let report = project.analyse();
    let v: Value =
        serde_json::from_str(&sarif::to_sarif(&report, &sarif_options(&project))).unwrap();
    assert_valid_sarif(&sarif_schema_validator(), &v);
    let run = &v["runs"][0];
    let rules = run["tool"]["driver"]["rules"].as_array().unwrap();
    let rule_ids: Vec<&str> = rules.iter().map(|r| r["id"].as_str().unwrap()).collect();
    assert_eq!(
        rule_ids,
        report
            .summary
            .by_kind
            .keys()
            .map(String::as_str)
            .collect::<Vec<_>>()
    );
    for r in rules {
        let id = r["id"].as_str().unwrap();
        assert_eq!(
            r["helpUri"],
            format!("https://reports.example.org/lakeside/kinds.html#kind-{id}")
        );
        let help = r["help"]["text"].as_str().unwrap();
        assert!(help.len() > 40 && help.contains("Check “"), "{id}: {help}");
        assert_ne!(r["shortDescription"]["text"], r["fullDescription"]["text"]);
    }
    // Each help link lands on its kind's entry of the site's kinds page.
    let tmp = tempfile::tempdir().unwrap();
    gibbsite::site::render(&report, None, &tmp.path().join("site")).unwrap();
    let kinds_page = std::fs::read_to_string(tmp.path().join("site/kinds.html")).unwrap();
    for r in rules {
        let uri = r["helpUri"].as_str().unwrap();
        let fragment = uri.split_once('#').unwrap().1;
        let at = kinds_page
            .find(&format!("<dt id=\"{fragment}\">"))
            .unwrap_or_else(|| panic!("{fragment} not on kinds.html"));
        let entry = &kinds_page[at..at + kinds_page[at..].find("</dd>").unwrap()];
        let help = r["help"]["text"].as_str().unwrap();
        let first = help.split(". ").next().unwrap();
        assert!(
            // As the page shows it: escaped, then typeset (ΔG' → ΔG′).
            entry.contains(&gibbsite::site::typeset::html(
                &first
                    .replace('&', "&amp;")
                    .replace('<', "&lt;")
                    .replace('>', "&gt;")
                    .replace('\'', "&#x27;")
            )),
            "{entry}\n{first}"
        );
    }
    let model = std::fs::read_to_string(demo().join("model.yaml")).unwrap();
    let model_lines: Vec<&str> = model.lines().collect();
    let results = run["results"].as_array().unwrap();
    let mut located = 0;
    for (r, f) in results.iter().zip(&report.findings) {
        assert_eq!(r["ruleId"], f.kind);
        assert_eq!(
            rules[r["ruleIndex"].as_u64().unwrap() as usize]["id"],
            f.kind
        );
        let physical = &r["locations"][0]["physicalLocation"];
        assert_eq!(
            physical["artifactLocation"]["uri"],
            "projects/lakeside/model.yaml"
        );
        // The first subject written in the model file, if any.
        let subject = f.subjects.iter().find(|s| {
            model_lines
                .iter()
                .any(|l| l.contains(&format!("id: {s},")) || l.contains(&format!("id: {s}}}")))
        });
        match subject {
            Some(s) => {
                let line = physical["region"]["startLine"].as_u64().expect("a line") as usize;
                assert!(
                    model_lines[line - 1].contains(&format!("id: {s}")),
                    "{}: line {line} is {:?}",
                    f.kind,
                    model_lines[line - 1]
                );
                located += 1;
            }
            None => assert!(physical.get("region").is_none(), "{}", f.kind),
        }
    }
    // Every demo finding names a reaction or compartment except none: all 14.
    assert_eq!(located, report.findings.len());
    // Scenarios defined in gibbsite.yaml are located there (`dusk`, line
    // of its `- id: dusk`).
    let lines = project.source_lines.locate();
    let (file, line) = lines.get("dusk").expect("dusk is located");
    assert!(file.ends_with("projects/lakeside/gibbsite.yaml"));
    let settings = std::fs::read_to_string(demo().join("gibbsite.yaml")).unwrap();
    assert!(settings.lines().nth(line - 1).unwrap().contains("id: dusk"));
    assert_eq!(lines.get("PEPS").unwrap().0, demo().join("model.yaml"));
    // Loop findings are located through their member reactions.
    let lp = results
        .iter()
        .find(|r| r["ruleId"] == "internal-loop")
        .unwrap();
    let line = lp["locations"][0]["physicalLocation"]["region"]["startLine"]
        .as_u64()
        .unwrap();
    assert!(
        model_lines[line as usize - 1].contains("id: PYK")
            || model_lines[line as usize - 1].contains("id: PEPS")
    );
    let cov = &run["properties"]["coverage"];
    assert_eq!(
        (
            cov["judgedReactions"].as_u64(),
            cov["internalReactions"].as_u64()
        ),
        (Some(24), Some(25))
    );
    assert_eq!(cov["percent"], 96.0);
}

/// SBML (e_coli_core, tests/data/README.md): valid SARIF, and each located
/// finding's line is the start tag of the element with that id.
#[test]
fn sarif_of_sbml_points_at_the_element_line() {
    let file = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/e_coli_core.xml.gz");
    let project = Project::load(&file).unwrap();
    let report = project.analyse();
    let v: Value =
        serde_json::from_str(&sarif::to_sarif(&report, &sarif_options(&project))).unwrap();
    assert_valid_sarif(&sarif_schema_validator(), &v);
    let text = {
        use std::io::Read;
        let mut s = String::new();
        flate2::read::GzDecoder::new(std::fs::File::open(&file).unwrap())
            .read_to_string(&mut s)
            .unwrap();
        s
    };
    let lines: Vec<&str> = text.lines().collect();
    let mut located = 0;
    for (r, f) in v["runs"][0]["results"]
        .as_array()
        .unwrap()
        .iter()
        .zip(&report.findings)
    {
        let physical = &r["locations"][0]["physicalLocation"];
        assert_eq!(
            physical["artifactLocation"]["uri"],
            "tests/data/e_coli_core.xml.gz"
        );
        let Some(line) = physical["region"]["startLine"].as_u64() else {
            continue;
        };
        let subject = f
            .subjects
            .iter()
            .find(|s| text.contains(&format!("id=\"{s}\"")))
            .expect("a located finding names an SBML element");
        // The start tag begins on that line; its id may follow on the next.
        let tag: String = lines[line as usize - 1..(line as usize + 2).min(lines.len())].join(" ");
        assert!(
            tag.trim_start().starts_with('<') && tag.contains(&format!("id=\"{subject}\"")),
            "{subject}: {tag}"
        );
        located += 1;
    }
    // Every finding naming an element is located (e_coli_core: all but the
    // compartment-conditions note, which names none).
    let about_elements = report
        .findings
        .iter()
        .filter(|f| {
            f.subjects
                .iter()
                .any(|s| text.contains(&format!("id=\"{s}\"")))
        })
        .count();
    assert_eq!(located, about_elements);
    assert!(located >= 6, "only {located} findings located");
}

/// Paths relative to `--sarif-root` (default: the current folder), with
/// `..` for a model outside it.
#[test]
fn sarif_paths_follow_the_sarif_root() {
    let uri = |args: &[&str]| {
        let (code, out, err) = run(args);
        assert_eq!(code, 1, "{err}");
        let v: Value = serde_json::from_str(&out).unwrap();
        v["runs"][0]["results"][0]["locations"][0]["physicalLocation"]["artifactLocation"]["uri"]
            .as_str()
            .unwrap()
            .to_string()
    };
    let absolute = demo();
    let absolute = absolute.to_str().unwrap();
    assert_eq!(
        uri(&["check", absolute, "--format", "sarif"]),
        "projects/lakeside/model.yaml"
    );
    assert_eq!(
        uri(&[
            "check",
            "projects/lakeside",
            "--format",
            "sarif",
            "--sarif-root",
            "projects"
        ]),
        "lakeside/model.yaml"
    );
    assert_eq!(
        uri(&[
            "check",
            "projects/lakeside",
            "--format",
            "sarif",
            "--sarif-root",
            "tests/data"
        ]),
        "../../projects/lakeside/model.yaml"
    );
    // Help links must be absolute: a relative report address is refused.
    let (code, _, err) = run(&[
        "check",
        "projects/lakeside",
        "--format",
        "sarif",
        "--report-url",
        "site/",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("expected an absolute URL"), "{err}");
    assert_eq!(
        sarif::relative_uri(Path::new("/a/b c/m#1.yaml"), Path::new("/a")),
        "b%20c/m%231.yaml"
    );
}

/// `--only` / `--skip` keep or drop kinds in every output and the exit
/// code; an unknown kind is a usage error listing the valid kinds.
#[test]
fn only_and_skip_filter_kinds_and_unknown_kinds_are_refused() {
    let (code, out, _) = run(&[
        "check",
        "projects/lakeside",
        "--only",
        "internal-loop",
        "--only",
        "forced-flux",
    ]);
    // Only a warning and a note left: passes on errors.
    assert_eq!(code, 0, "{out}");
    assert!(
        out.contains("warning internal-loop (1)\n") && out.contains("note forced-flux (1)\n"),
        "{out}"
    );
    assert!(!out.contains("scenario-contradiction"), "{out}");
    assert!(out.ends_with("PASS: 0 errors, 1 warning, 1 note (fails on errors); judged 24 of 25 internal reactions (96 %)\n"), "{out}");
    let (code, out, _) = run(&[
        "check",
        "projects/lakeside",
        "--format",
        "json",
        "--skip",
        "scenario-contradiction",
        "--skip",
        "infeasible-direction",
    ]);
    assert_eq!(code, 1, "scenario-infeasible is still an error");
    let report: gibbsite::Report = serde_json::from_str(&out).unwrap();
    assert_eq!(report.findings.len(), 10);
    assert_eq!(report.summary.errors, 1);
    assert!(!report
        .summary
        .by_kind
        .contains_key("scenario-contradiction"));
    let (code, _, err) = run(&["check", "projects/lakeside", "--skip", "internal-lop"]);
    assert_eq!(code, 2);
    assert!(err.contains("internal-lop"), "{err}");
    for kind in gibbsite::checks::kinds() {
        assert!(err.contains(kind), "{kind} missing from: {err}");
    }
}

/// A baseline of another model is refused (exit 2, both ids named) unless
/// `--baseline-any-model`.
#[test]
fn baseline_of_another_model_is_an_error_unless_allowed() {
    let tmp = tempfile::tempdir().unwrap();
    let path = tmp.path().join("report.json");
    let mut other = Project::load(&demo()).unwrap().analyse();
    other.project.model_id = "some_other_model".into();
    std::fs::write(&path, gibbsite::report::json::to_json(&other)).unwrap();
    let b = path.to_str().unwrap();
    let (code, _, err) = run(&["check", "projects/lakeside", "--baseline", b]);
    assert_eq!(code, 2);
    assert!(
        err.contains("the baseline is a report of model `some_other_model`, but this run checks model `gplacida_core`"),
        "{err}"
    );
    assert!(err.contains("--baseline-any-model"), "{err}");
    let (code, out, _) = run(&[
        "check",
        "projects/lakeside",
        "--baseline",
        b,
        "--baseline-any-model",
    ]);
    assert_eq!(code, 0, "same findings: nothing new");
    assert!(
        out.lines().last().unwrap().starts_with(
            "PASS: 0 errors, 0 warnings, 0 notes new since the baseline (14 already in it)"
        ),
        "{out}"
    );
}

/// A small model with three elementary loops (a triangle, a square
/// sharing `a` with it, and two parallel steps) and an energy-generating
/// cycle (A1 + A2 make ATP from ADP + Pi out of nothing), written once as
/// is and once with its reactions and metabolites in reverse order.
fn loop_model(reverse: bool) -> String {
    let mut metabolites: Vec<String> = [
        "a", "b", "c", "d", "e", "f", "g", "k", "atp_c", "adp_c", "pi_c", "h2o_c", "h_c", "x_c",
    ]
    .iter()
    .map(|m| format!("  - {{id: {m}, compartment: c}}"))
    .collect();
    let mut reactions: Vec<&str> = vec![
        "  - {id: T1, equation: a <-> b}",
        "  - {id: T2, equation: b <-> c}",
        "  - {id: T3, equation: c <-> a}",
        "  - {id: S1, equation: a <-> f}",
        "  - {id: S2, equation: f <-> g}",
        "  - {id: S3, equation: g <-> k}",
        "  - {id: S4, equation: k <-> a}",
        "  - {id: P1, equation: d <-> e}",
        "  - {id: P2, equation: d <-> e}",
        "  - {id: L1, equation: a <-> d}",
        "  - {id: EX_a, equation: a <->}",
        "  - {id: A1, equation: adp_c + pi_c + h_c -> x_c}",
        "  - {id: A2, equation: x_c -> atp_c + h2o_c}",
    ];
    if reverse {
        metabolites.reverse();
        reactions.reverse();
    }
    format!(
        "id: loops\ncompartments: [{{id: c}}]\nmetabolites:\n{}\nreactions:\n{}\n",
        metabolites.join("\n"),
        reactions.join("\n")
    )
}

/// Loop ids come from the member set: reordering the model file keeps
/// them, and a baseline made before the reordering reports nothing new.
#[test]
fn loop_ids_survive_reordering_and_the_baseline_sees_nothing_new() {
    let tmp = tempfile::tempdir().unwrap();
    let load = |name: &str, reverse: bool| {
        let path = tmp.path().join(name);
        std::fs::write(&path, loop_model(reverse)).unwrap();
        (path.clone(), Project::load(&path).unwrap().analyse())
    };
    let (_, before) = load("before.yaml", false);
    let (after_path, after) = load("after.yaml", true);
    let ids = |r: &gibbsite::Report| {
        let mut ids: Vec<(String, Vec<String>)> = r
            .loops
            .as_ref()
            .unwrap()
            .loops
            .iter()
            .map(|l| {
                let mut m: Vec<String> = l.members.iter().map(|m| m.reaction.clone()).collect();
                m.sort();
                (l.id.clone(), m)
            })
            .collect();
        ids.sort();
        ids
    };
    let expected: Vec<(String, Vec<String>)> = {
        let mut e: Vec<(String, Vec<String>)> = [
            vec!["P1", "P2"],
            vec!["S1", "S2", "S3", "S4"],
            vec!["T1", "T2", "T3"],
        ]
        .iter()
        .map(|m| {
            (
                gibbsite::loops::ids::member_set_id("loop", m.iter().copied()),
                m.iter().map(|s| s.to_string()).collect(),
            )
        })
        .collect();
        e.sort();
        e
    };
    assert_eq!(ids(&before), expected);
    assert_eq!(ids(&after), expected);
    // The energy-generating cycle's id: its dissipation and reactions.
    let cycle_ids = |r: &gibbsite::Report| -> Vec<Option<String>> {
        r.loops
            .as_ref()
            .unwrap()
            .energy_cycles
            .iter()
            .filter(|c| c.cycle_exists)
            .map(|c| c.id.clone())
            .collect()
    };
    let cycle = gibbsite::loops::ids::member_set_id("cycle", ["atp in c", "A1", "A2"]);
    assert_eq!(cycle_ids(&before), [Some(cycle.clone())]);
    assert_eq!(cycle_ids(&after), [Some(cycle)]);
    assert!(expected
        .iter()
        .all(|(id, _)| id.len() == "loop-".len() + 10));
    // The baseline diff: no finding is new.
    assert!(!before.findings.is_empty());
    assert!(gibbsite::report::baseline::new_findings(&after, &before).is_empty());
    let baseline = tmp.path().join("before.json");
    std::fs::write(&baseline, gibbsite::report::json::to_json(&before)).unwrap();
    let (code, out, err) = run(&[
        "check",
        after_path.to_str().unwrap(),
        "--baseline",
        baseline.to_str().unwrap(),
        "--fail-on",
        "warning",
    ]);
    assert_eq!(code, 0, "{out}{err}");
    assert!(
        out.lines()
            .last()
            .unwrap()
            .starts_with("PASS: 0 errors, 0 warnings, 0 notes new since the baseline"),
        "{out}"
    );
}

/// Every registered kind has our help text (SARIF rules, kinds.html, the
/// Markdown summary), and no help text is left for a kind no check reports.
#[test]
fn every_registered_kind_has_help_and_no_help_is_orphaned() {
    let kinds = gibbsite::checks::kinds();
    for k in &kinds {
        let h = gibbsite::report::kinds::help(k)
            .unwrap_or_else(|| panic!("no help text for kind `{k}`"));
        assert!(h.summary.ends_with('.') && h.help.ends_with('.'), "{k}");
    }
    for k in gibbsite::report::kinds::helped_kinds() {
        assert!(kinds.contains(&k), "help for unregistered kind {k}");
    }
}
