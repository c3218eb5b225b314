//! Conditions per compartment from gibbsite.yaml and `import --conditions`;
//! verdicts that rest on unset conditions are notes that say so.

use gibbsite::report::Severity;
use gibbsite::Project;

/// Proton export against an inside-negative, inside-alkaline membrane:
/// impossible once the conditions are stated, undecidable before.
const MODEL: &str = "id: t
compartments: [{id: c, name: cytosol}, {id: e, name: outside}]
metabolites:
  - {id: h_c, compartment: c, formula: H, charge: 1}
  - {id: h_e, compartment: e, formula: H, charge: 1}
reactions:
  - {id: HEX, equation: h_c -> h_e}
";

fn load(settings: &str) -> (tempfile::TempDir, gibbsite::Result<Project>) {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("model.yaml"), MODEL).unwrap();
    std::fs::write(dir.path().join("gibbsite.yaml"), settings).unwrap();
    let p = Project::load(dir.path());
    (dir, p)
}

#[test]
fn unset_conditions_give_one_note_and_soften_verdicts() {
    let (_dir, project) = load("model: model.yaml\n");
    let report = project.unwrap().analyse();
    let unset: Vec<_> = report
        .findings
        .iter()
        .filter(|f| f.kind == "unset-compartment-conditions")
        .collect();
    assert_eq!(unset.len(), 1);
    assert_eq!(
        unset[0].message,
        "2 of 2 compartments have no stated pH or membrane potential (c, e): they run at pH 7 and 0 mV, so the ΔrG'° of the 1 reactions between compartments that touch them rests on defaults, and their verdicts count as notes. Set them under `compartments:` in gibbsite.yaml or with `gibbsite import --conditions`."
    );
    // ΔrG'° = 0 with defaults: the only direction is marginal, but as a note.
    let hex: Vec<_> = report
        .findings
        .iter()
        .filter(|f| f.subjects.first().map(String::as_str) == Some("HEX"))
        .collect();
    assert_eq!(hex.len(), 1);
    assert_eq!(hex[0].kind, "marginal-direction");
    assert_eq!(hex[0].severity, Severity::Note);
    assert!(hex[0]
        .message
        .ends_with("(depends on unset compartment conditions)"));
    assert!(!report.compartments[0].conditions_stated);
}

#[test]
fn stated_conditions_apply_and_the_verdict_counts() {
    let (_dir, project) = load(
        "model: model.yaml
compartments:
  c: {ph: 7.75, potential: -150 mV, source: \"invented for this test\"}
  e: {ph: 7.0, potential: 0 mV}
",
    );
    let project = project.unwrap();
    assert_eq!(project.model.compartments[0].ph, 7.75);
    assert_eq!(project.model.compartments[0].potential_mv, -150.0);
    let report = project.analyse();
    assert!(report
        .findings
        .iter()
        .all(|f| f.kind != "unset-compartment-conditions"));
    // H+(in) → H+(out) is the README's proton import reversed: +18.754 kJ/mol
    // (−RT·ln10·0.75 = −4.281, F·(−0.150 V) = −14.473 for the import).
    let drg = report.reactions[0].drg_prime.as_ref().unwrap().value_kj;
    assert!((drg - 18.754).abs() < 2e-3, "{drg}");
    let f = report
        .findings
        .iter()
        .find(|f| f.subjects.first().map(String::as_str) == Some("HEX"))
        .unwrap();
    assert_eq!(
        (f.kind.as_str(), f.severity),
        ("infeasible-direction", Severity::Error)
    );
    assert_eq!(
        report.compartments[0].conditions_source.as_deref(),
        Some("invented for this test")
    );
}

#[test]
fn unknown_compartment_in_conditions_is_an_error_with_its_line() {
    let (_dir, project) = load("model: model.yaml\ncompartments:\n  m: {ph: 7.8}\n");
    let Err(gibbsite::Error::Input(d)) = project else {
        panic!("expected an input error");
    };
    assert_eq!(d.len(), 1);
    assert_eq!(d[0].message, "conditions name unknown compartment `m`");
    assert_eq!(d[0].line, Some(3));
}

#[test]
fn import_writes_the_conditions_into_the_project() {
    let dir = tempfile::tempdir().unwrap();
    let model = gibbsite::project::load_model_files(
        &[{
            let p = dir.path().join("in.yaml");
            std::fs::write(&p, MODEL).unwrap();
            p
        }],
        &[],
    )
    .unwrap();
    let file = dir.path().join("conditions.yaml");
    // pH 7.2 / −160 mV: typical cytosol values (common practice); e pH 7.4
    // invented for this test.
    std::fs::write(
        &file,
        "compartments:\n  c: {ph: 7.2, potential: -160 mV, source: \"common practice\"}\n  e: {ph: 7.4}\n",
    )
    .unwrap();
    let conditions = gibbsite::project::conditions::read_file(&file, &model).unwrap();
    let out = dir.path().join("project");
    gibbsite::project::write::write_project_with_conditions(&model, &out, &conditions, false)
        .unwrap();
    let project = Project::load(&out).unwrap();
    let c = &project.model.compartments[0];
    assert_eq!((c.ph, c.potential_mv), (7.2, -160.0));
    assert_eq!(project.model.compartments[1].ph, 7.4);
    assert!(project.settings.unset_conditions.is_empty());
    assert_eq!(
        project
            .settings
            .condition_sources
            .get(&0)
            .map(String::as_str),
        Some("common practice")
    );
}
