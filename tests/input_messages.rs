//! What a user is told about doubtful or wrong input (issue 12): values
//! that load but are implausible or look like unit slips (warnings with
//! file:line:col), and the wording of common error messages. Every case
//! checks the exact text a user reads.

use gibbsite::report::{Finding, Severity};
use gibbsite::Project;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

/// A project folder in a scratch directory.
struct Scratch {
    tmp: tempfile::TempDir,
}

impl Scratch {
    fn new(files: &[(&str, &str)]) -> Scratch {
        let scratch = Scratch {
            tmp: tempfile::tempdir().unwrap(),
        };
        for (name, text) in files {
            scratch.write(name, text);
        }
        scratch
    }
    fn path(&self, relative: &str) -> PathBuf {
        self.tmp.path().join(relative)
    }
    fn write(&self, relative: &str, text: &str) {
        let path = self.path(relative);
        std::fs::create_dir_all(path.parent().unwrap()).unwrap();
        std::fs::write(path, text).unwrap();
    }
    /// The CLI's `check` on `relative`, with stderr's scratch folder masked.
    fn check(&self, args: &[&str]) -> (Option<i32>, String, String) {
        let out = gibbsite(self.tmp.path(), args);
        let mask = |s: &[u8]| {
            String::from_utf8_lossy(s).replace(&format!("{}/", self.tmp.path().display()), "")
        };
        (out.status.code(), mask(&out.stdout), mask(&out.stderr))
    }
}

fn gibbsite(dir: &Path, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .current_dir(dir)
        .args(args)
        .env("SOURCE_DATE_EPOCH", "0")
        .output()
        .unwrap()
}

/// A small valid model; `{conc}` and `{compartment}` are replaced.
const MODEL: &str = "\
id: tiny
compartments:
  - {id: c{compartment}}
metabolites:
  - {id: a_c, compartment: c, formula: C3H6O3, charge: 0, formation_energy: {value: -500 kJ/mol, sigma: 2 kJ/mol}{conc}}
  - {id: b_c, compartment: c, formula: C3H6O3, charge: 0, formation_energy: {value: -510 kJ/mol, sigma: 2 kJ/mol}}
reactions:
  - {id: R1, equation: a_c <=> b_c}
";

fn model(compartment: &str, conc: &str) -> String {
    MODEL
        .replace("{compartment}", compartment)
        .replace("{conc}", conc)
}

const SETTINGS: &str = "title: tiny\nmodel: model.yaml\n";

/// Findings of the plausibility check, in report order.
fn plausibility(project: &Path) -> Vec<Finding> {
    let loaded = Project::load(project).unwrap_or_else(|e| panic!("should load:\n{e}"));
    let report = loaded.analyse();
    report
        .findings
        .into_iter()
        .filter(|f| gibbsite::project::plausibility::KINDS.contains(&f.kind.as_str()))
        .collect()
}

// ---- point 4: plausibility of input ----

#[test]
fn bare_concentrations_are_read_as_molar_and_warned_with_their_place() {
    let s = Scratch::new(&[
        ("p/gibbsite.yaml", SETTINGS),
        (
            "p/model.yaml",
            &model("", ", concentration: {min: 50, max: 5000}"),
        ),
    ]);
    let found = plausibility(&s.path("p"));
    let messages: Vec<&str> = found.iter().map(|f| f.message.as_str()).collect();
    // Line 5 of the model; the columns are those of `50` and `5000`.
    assert_eq!(
        messages,
        [
            "model.yaml:5:137: concentration min of `a_c`: `50` is read as 50 M (a bare number means mol/L); did you mean 50 mM? — the analysis used the value as read; check the file",
            "model.yaml:5:146: concentration max of `a_c`: `5000` is read as 5000 M (a bare number means mol/L); did you mean 5000 µM? — the analysis used the value as read; check the file",
        ]
    );
    for f in &found {
        assert_eq!(f.kind, "bare-number-unit-slip");
        assert_eq!(f.severity, Severity::Warning);
        assert_eq!(f.subjects, ["a_c"]);
        assert_eq!(f.evidence["line"], 5.0);
    }
    // The value is used as read (50 M), which is why the warning matters.
    assert_eq!(found[0].evidence["value"], 50.0);
    assert_eq!(found[1].evidence["value"], 5000.0);
}

#[test]
fn a_bare_temperature_of_25_in_the_settings_suggests_celsius() {
    let s = Scratch::new(&[
        (
            "p/gibbsite.yaml",
            "title: tiny\nmodel: model.yaml\ncompartments:\n  c: {ph: 7.2, temperature: 25}\n",
        ),
        ("p/model.yaml", &model("", "")),
    ]);
    let found = plausibility(&s.path("p"));
    assert_eq!(found.len(), 1, "{found:#?}");
    // 25 °C = 298.15 K (definition of the Celsius scale).
    assert_eq!(
        found[0].message,
        "gibbsite.yaml:4:29: compartment `c` temperature: `25` is read as 25 K (a bare number means kelvin); did you mean 25 °C (298.15 K)? — the analysis used the value as read; check the file"
    );
    assert_eq!(found[0].subjects, ["c"]);
    // And through the CLI, as a warning line of `check`.
    let (code, stdout, _) = s.check(&["check", "p", "--fail-on", "warning"]);
    assert_eq!(code, Some(1));
    // `check` groups findings under a `severity kind (count)` line.
    assert!(
        stdout.contains("warning bare-number-unit-slip (1)\n  c: gibbsite.yaml:4:29: compartment `c` temperature: `25` is read as 25 K"),
        "{stdout}"
    );
}

#[test]
fn a_bare_temperature_of_25_in_the_model_is_refused_with_the_celsius_hint() {
    let s = Scratch::new(&[
        ("p/gibbsite.yaml", SETTINGS),
        (
            "p/model.yaml",
            &format!("temperature: 25\n{}", model("", "")),
        ),
    ]);
    let (code, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(code, Some(2));
    assert_eq!(
        stderr.trim_end(),
        "p/model.yaml:1:14: error: temperature must be between 250 K and 400 K (−23 °C to 127 °C), found 25 K\n  hint: `25` is read as 25 K (a bare number means kelvin); did you mean 25 °C (298.15 K)?"
    );
}

#[test]
fn a_bare_ionic_strength_of_250_suggests_millimolar() {
    // In a model file 250 M is beyond the hard limit (1 M): an error with the hint.
    let s = Scratch::new(&[
        ("p/gibbsite.yaml", SETTINGS),
        ("p/model.yaml", &model(", ionic_strength: 250", "")),
    ]);
    let (code, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(code, Some(2));
    assert_eq!(
        stderr.trim_end(),
        "p/model.yaml:3:29: error: ionic strength must be between 0 and 1 M, found 250 M\n  hint: `250` is read as 250 M (a bare number means mol/L); did you mean 250 mM?"
    );
    // gibbsite.yaml refuses more than 10 M, with the same hint.
    let s = Scratch::new(&[
        (
            "p/gibbsite.yaml",
            "title: tiny\nmodel: model.yaml\ncompartments:\n  c: {ph: 7.2, ionic_strength: 250}\n",
        ),
        ("p/model.yaml", &model("", "")),
    ]);
    let (code, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(code, Some(2));
    assert_eq!(
        stderr.trim_end(),
        "p/gibbsite.yaml:4:32: error: ionic strength must be between 0 and 10 M, found 250 M\n  hint: `250` is read as 250 M (a bare number means mol/L); did you mean 250 mM?"
    );
    // In gibbsite.yaml up to 10 M loads: a warning with the same suggestion.
    let s = Scratch::new(&[
        (
            "p/gibbsite.yaml",
            "title: tiny\nmodel: model.yaml\ncompartments:\n  c: {ph: 7.2, ionic_strength: 2}\n",
        ),
        ("p/model.yaml", &model("", "")),
    ]);
    let found = plausibility(&s.path("p"));
    assert_eq!(found.len(), 1, "{found:#?}");
    assert_eq!(
        found[0].message,
        "gibbsite.yaml:4:32: compartment `c` ionic_strength: `2` is read as 2 M (a bare number means mol/L); did you mean 2 mM? — the analysis used the value as read; check the file"
    );
}

#[test]
fn values_outside_the_plausible_ranges_are_warned_with_units() {
    let s = Scratch::new(&[
        ("p/gibbsite.yaml", SETTINGS),
        (
            "p/model.yaml",
            &model(
                ", ph: 3.5, ionic_strength: 0.6 M, potential: -350 mV, temperature: 380 K",
                ", concentration: {min: 0.5 pM, max: 2 M}",
            ),
        ),
    ]);
    let found = plausibility(&s.path("p"));
    let shown: Vec<(&str, &str)> = found
        .iter()
        .map(|f| (f.kind.as_str(), f.message.split(" — ").next().unwrap()))
        .collect();
    assert_eq!(
        shown,
        [
            ("implausible-concentration", "model.yaml:5:137: concentration min of `a_c` is `0.5 pM`: 5e-13 M is below 1 pM, less than one molecule in a bacterial cell"),
            ("implausible-concentration", "model.yaml:5:150: concentration max of `a_c` is `2 M`: 2 M is above 1 M, more than any metabolite pool of a cell"),
            ("implausible-ionic-strength", "model.yaml:3:38: compartment `c` ionic_strength is `0.6 M`: 0.6 M is above 0.5 M, beyond the range of the extended Debye–Hückel correction"),
            ("implausible-ph", "model.yaml:3:17: compartment `c` pH is `3.5`: 3.5 is outside 4–10, the range of cellular compartments"),
            ("implausible-potential", "model.yaml:3:56: compartment `c` potential is `-350 mV`: -350 mV is beyond ±300 mV, more than biological membranes hold"),
            ("implausible-temperature", "model.yaml:3:78: compartment `c` temperature is `380 K`: 380 K (106.85 °C) is outside 273–373 K (0–100 °C), where water is liquid"),
        ]
    );
}

#[test]
fn side_table_cells_are_judged_too() {
    // A table named in gibbsite.yaml: bare numbers in `min`/`max` cells.
    let s = Scratch::new(&[
        (
            "p/gibbsite.yaml",
            "title: tiny\nmodel: model.yaml\ntables: conc.csv\n",
        ),
        ("p/model.yaml", &model("", "")),
        ("p/conc.csv", "metabolite,min,max\nb_c,50,5000\n"),
    ]);
    let found = plausibility(&s.path("p"));
    let messages: Vec<&str> = found.iter().map(|f| f.message.as_str()).collect();
    // Table positions are line and field number, as in every table message.
    assert_eq!(
        messages,
        [
            "conc.csv:2:2: column `min` of `b_c`: `50` is read as 50 M (a bare number means mol/L); did you mean 50 mM? — the analysis used the value as read; check the file",
            "conc.csv:2:3: column `max` of `b_c`: `5000` is read as 5000 M (a bare number means mol/L); did you mean 5000 µM? — the analysis used the value as read; check the file",
        ]
    );
    // A `--data` table, through the CLI: a value with a unit out of range.
    let s = Scratch::new(&[
        ("p/gibbsite.yaml", SETTINGS),
        ("p/model.yaml", &model("", "")),
        ("p/conc.csv", "metabolite,min,max\nb_c,1 mM,2 M\n"),
    ]);
    let (code, stdout, _) = s.check(&["check", "p", "--data", "p/conc.csv"]);
    assert_eq!(code, Some(0), "{stdout}");
    assert!(
        stdout.contains("warning implausible-concentration (1)\n  b_c: p/conc.csv:2:3: column `max` of `b_c` is `2 M`: 2 M is above 1 M"),
        "{stdout}"
    );
}

#[test]
fn the_demo_has_no_implausible_values() {
    let demo = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    assert_eq!(plausibility(&demo), Vec::<Finding>::new());
}

// ---- point 9: error messages ----

#[test]
fn a_plus_glued_to_an_id_asks_for_spaces() {
    let s = Scratch::new(&[
        ("p/gibbsite.yaml", SETTINGS),
        (
            "p/model.yaml",
            &MODEL
                .replace("{compartment}", "")
                .replace("{conc}", "")
                .replace("a_c <=> b_c", "a_c <=> b_c +a_c"),
        ),
    ]);
    let (code, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(code, Some(2));
    // Column 36 is where `+a_c` starts in `  - {id: R1, equation: a_c <=> b_c +a_c}`.
    assert_eq!(
        stderr.trim_end(),
        "p/model.yaml:8:36: error: cannot read equation of reaction `R1`: expected `+` between terms, found `+a_c`; put spaces around '+'"
    );
}

#[test]
fn terms_joined_without_spaces_are_named_as_such() {
    let s = Scratch::new(&[
        ("p/gibbsite.yaml", SETTINGS),
        (
            "p/model.yaml",
            &model("", "").replace("a_c <=> b_c", "a_c+b_c <=> b_c"),
        ),
    ]);
    let (code, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(code, Some(2));
    assert_eq!(
        stderr.trim_end(),
        "p/model.yaml:8:24: error: unknown metabolite `a_c+b_c` in equation of reaction `R1`\n  hint: put spaces around '+': `a_c + b_c`"
    );
}

#[test]
fn min_above_max_echoes_the_values_as_written_and_names_the_metabolite() {
    let s = Scratch::new(&[
        ("p/gibbsite.yaml", SETTINGS),
        (
            "p/model.yaml",
            &model("", ", concentration: {min: 5 mM, max: 500 uM}"),
        ),
    ]);
    let (code, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(code, Some(2));
    assert_eq!(
        stderr.trim_end(),
        "p/model.yaml:5:137: error: min `5 mM` is greater than max `500 uM` in the concentration range of metabolite `a_c`"
    );
    // The settings' default range names itself.
    let s = Scratch::new(&[
        (
            "p/gibbsite.yaml",
            "title: tiny\nmodel: model.yaml\ndefault_concentration: {min: 10 mM, max: 1 uM}\n",
        ),
        ("p/model.yaml", &model("", "")),
    ]);
    let (_, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(
        stderr.trim_end(),
        "p/gibbsite.yaml:3:30: error: min `10 mM` is greater than max `1 uM` in the concentration range of `default_concentration`"
    );
    // A side table row: the cells as written and the row's id (the
    // column of a table position is the field number, as for every table message).
    let s = Scratch::new(&[
        (
            "p/gibbsite.yaml",
            "title: tiny\nmodel: model.yaml\ntables: conc.csv\n",
        ),
        ("p/model.yaml", &model("", "")),
        ("p/conc.csv", "metabolite,min,max\nb_c,2 mM,20 uM\n"),
    ]);
    let (code, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(code, Some(2));
    assert_eq!(
        stderr.trim_end(),
        "p/conc.csv:2:2: error: min `2 mM` is greater than max `20 uM` for `b_c`"
    );
}

#[test]
fn a_missing_model_file_reads_like_a_missing_project() {
    let s = Scratch::new(&[
        ("p/gibbsite.yaml", "title: tiny\nmodel: modle.yaml\n"),
        ("p/model.yaml", &model("", "")),
    ]);
    let expected = "hint: expected a project folder, gibbsite.yaml, a model .yaml or an SBML file (.xml, .xml.gz)";
    // A project folder, an SBML file and a model file that do not exist:
    // one form of words, one hint.
    for missing in ["nowhere", "nowhere.xml", "nowhere.yaml"] {
        let (code, _, stderr) = s.check(&["check", missing]);
        assert_eq!(code, Some(2));
        assert_eq!(
            stderr.trim_end(),
            format!("{missing}: error: no such file or folder\n  {expected}")
        );
    }
    // A near miss gets the nearest existing name.
    let (_, _, stderr) = s.check(&["check", "p/modl.yaml"]);
    assert_eq!(
        stderr.trim_end(),
        "p/modl.yaml: error: no such file or folder\n  hint: did you mean `model.yaml`?"
    );
    // And so does a model file named in gibbsite.yaml.
    let (code, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(code, Some(2));
    assert_eq!(
        stderr.trim_end(),
        "p/gibbsite.yaml:2:8: error: model file `p/modle.yaml` not found\n  hint: did you mean `model.yaml`?"
    );
}

#[test]
fn a_missing_scenario_or_table_file_suggests_the_nearest_name() {
    let s = Scratch::new(&[
        (
            "p/gibbsite.yaml",
            "title: tiny\nmodel: model.yaml\nscenarios:\n  - {id: day, file: fluxes_dya.csv}\n",
        ),
        ("p/model.yaml", &model("", "")),
        ("p/fluxes_day.csv", "reaction,flux\nR1,1\n"),
    ]);
    let (code, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(code, Some(2));
    assert_eq!(
        stderr.trim_end(),
        "p/fluxes_dya.csv: error: file not found\n  hint: did you mean `fluxes_day.csv`? (named at p/gibbsite.yaml:4:21)"
    );
    let s = Scratch::new(&[
        (
            "p/gibbsite.yaml",
            "title: tiny\nmodel: model.yaml\ntables: [energies.csv]\n",
        ),
        ("p/model.yaml", &model("", "")),
        ("p/energy.csv", "id,dfg\n"),
    ]);
    let (code, _, stderr) = s.check(&["check", "p"]);
    assert_eq!(code, Some(2));
    assert_eq!(
        stderr.trim_end(),
        "p/gibbsite.yaml:3:9: error: table `p/energies.csv` not found\n  hint: did you mean `energy.csv`?"
    );
    // A `--data` table.
    let s = Scratch::new(&[
        ("p/gibbsite.yaml", SETTINGS),
        ("p/model.yaml", &model("", "")),
        ("p/energy.csv", "id,dfg\n"),
    ]);
    let (code, _, stderr) = s.check(&["check", "p", "--data", "p/enrgy.csv"]);
    assert_eq!(code, Some(2));
    assert_eq!(
        stderr.trim_end(),
        "p/enrgy.csv: error: table not found\n  hint: did you mean `energy.csv`?"
    );
    // Nothing alike: the hint says what belongs there.
    let (_, _, stderr) = s.check(&["check", "p", "--data", "p/zzz.csv"]);
    assert_eq!(
        stderr.trim_end(),
        "p/zzz.csv: error: table not found\n  hint: expected a CSV or TSV side table"
    );
}

#[test]
fn help_names_the_fail_on_levels_and_the_exit_codes() {
    let out = gibbsite(Path::new("."), &["check", "--help"]);
    assert_eq!(out.status.code(), Some(0));
    let help = String::from_utf8_lossy(&out.stdout);
    for line in [
        "Lowest severity that makes the run exit with 1",
        "warning: Exit 1 when a finding of severity error or warning is present",
        "Exit codes:",
        "  2  bad input or usage",
    ] {
        assert!(help.contains(line), "`{line}` missing from:\n{help}");
    }
}

// ---- point 10: provenance of library values ----

#[test]
fn library_values_say_where_they_were_printed_and_how_they_were_checked() {
    let demo = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    let report = Project::load(&demo).unwrap().analyse();
    // The demo's glucose comes from the built-in library (`library: glucose`).
    let glc = report
        .metabolites
        .iter()
        .find(|m| m.id == "glc_c")
        .expect("glc_c in the demo");
    assert_eq!(glc.energy_origin.as_deref(), Some("library"));
    let source = &glc.dfg_prime.as_ref().unwrap().source;
    // The wording the test in thermo::provenance checks: the printed ΔfG°
    // of glucose (Alberty 2003, p. 333) and the printed ΔrG° = −10.87 kJ/mol
    // it must add up to (p. 334).
    assert_eq!(
        source,
        "built-in library ('glucose'): ΔfG° printed in Alberty 2003 (Problem 6.7, p. 333); checked: the species values of glucose, G6P²⁻, HPO4²⁻ and H2O add up to the ΔrG° = −10.87 kJ/mol printed for G6P²⁻ + H2O = glucose + HPO4²⁻ (Alberty 2003, p. 334) within 0.01 kJ/mol (a check of the transcription)"
    );
    // Shown on the metabolite's page, and the reaction using it points there.
    let out = tempfile::tempdir().unwrap();
    let site = out.path().join("site");
    gibbsite::site::render(&report, None, &site).unwrap();
    let page = std::fs::read_to_string(site.join("metabolites/glc_c.html")).unwrap();
    assert!(
        page.contains("ΔfG° printed in Alberty 2003 (Problem 6.7, p. 333); checked: "),
        "provenance missing from the glc_c page"
    );
    let hex = std::fs::read_to_string(site.join("reactions/HEX.html")).unwrap();
    assert!(hex.contains(
        "Library terms: each metabolite’s page says where its values were printed and how they were checked"
    ));
}

#[test]
fn values_recalled_from_memory_still_say_so() {
    // Mg²⁺'s ΔfG° is recalled from memory and cannot be confirmed (it
    // cancels from every library value); ADP's species are recalled and
    // checked through ATP hydrolysis.
    let mg = gibbsite::thermo::library::lookup_key("magnesium").unwrap();
    assert_eq!(
        mg.source(),
        "built-in library ('magnesium'): ΔfG° of Mg²⁺ recalled from memory of Alberty 2003's species tables; not checked against a printed value: it cancels from every value computed from the library, so no printed value can confirm it"
    );
    let adp = gibbsite::thermo::library::lookup_key("adp")
        .unwrap()
        .source();
    assert!(adp.contains("recalled from memory"), "{adp}");
    assert!(adp.contains("reproduce the printed ΔrG'° of ATP + H2O = ADP + phosphate at pH 5–9, I = 0.25 M, at 298.15 K and 313.15 K (Alberty 2003, pp. 220 and 290) within 0.001 kJ/mol"), "{adp}");
}
