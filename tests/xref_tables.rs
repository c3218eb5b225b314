//! One side table for many models: rows keyed by cross-references.

use gibbsite::Project;
use std::path::{Path, PathBuf};

const MODEL_A: &str = "id: a
compartments:
  - {id: c, ph: 7.0, ionic_strength: 0.25 M}
  - {id: m, ph: 8.0, ionic_strength: 0.25 M}
metabolites:
  - {id: glc_c, compartment: c, formula: C6H12O6, charge: 0, xrefs: {chebi: \"CHEBI:4167\"}}
  - {id: glc_m, compartment: m, formula: C6H12O6, charge: 0, xrefs: {chebi: \"CHEBI:4167\"}}
  - {id: urea_c, compartment: c, formula: CH4N2O, charge: 0, xrefs: {kegg.compound: C00086}}
  - {id: etoh_c, compartment: c, formula: C2H6O, charge: 0, xrefs: {bigg.metabolite: etoh}}
reactions:
  - {id: GLCt, equation: glc_c <-> glc_m, xrefs: {ec-code: 1.1.1.1}}
  - {id: UREAd, equation: urea_c <-> , xrefs: {kegg.reaction: R00001, ec-code: 1.1.1.1}}
";

/// Different ids, one compartment at other conditions, other xref spellings.
const MODEL_B: &str = "id: b
compartments:
  - {id: cyt, ph: 6.5, ionic_strength: 0.1 M}
metabolites:
  - {id: \"glucose[cyt]\", compartment: cyt, xrefs: {chebi: \"4167\", kegg.compound: C00031}}
  - {id: \"urea[cyt]\", compartment: cyt, xrefs: {kegg.compound: c00086}}
reactions:
  - {id: GLCUREA, equation: \"glucose[cyt] <-> urea[cyt]\"}
";

/// Species data at I = 0 for two compounds, keyed by ChEBI and by KEGG.
/// Glucose: ΔfG° = −915.90 kJ/mol, one species with nH = 12 (Alberty 2003,
/// Thermodynamics of Biochemical Reactions, Problem 6.7, printed p. 333).
/// Urea: ΔfG° = −202.80 kJ/mol, nH = 4 (derived from the printed ΔfG'° =
/// −39.74 kJ/mol at pH 7, I = 0.25 M, Alberty 2003 Table 4.2, p. 79, as in
/// the built-in library).
const TABLE: &str = "# one table for two models
metabolite,dfg0,charge,hydrogens,sigma,source,dfg,ph,ionic_strength
chebi:CHEBI:4167,-915.90,0,12,0.4,Alberty 2003 p. 333,,,
kegg.compound:C00086,-202.80,0,4,0.4,Alberty 2003 p. 79,,,
bigg.metabolite:etoh,,,,1.0,invented for this test,60.0,7.0,0.1 M
";

fn write(dir: &Path, name: &str, text: &str) -> PathBuf {
    let p = dir.join(name);
    std::fs::write(&p, text).unwrap();
    p
}

fn load(dir: &Path, model: &str, tables: &[PathBuf]) -> gibbsite::Result<Project> {
    let m = write(dir, &format!("{}.yaml", &model[4..5]), model);
    let mut p = Project::load(&m)?;
    p.add_tables(tables)?;
    Ok(p)
}

fn dfg(report: &gibbsite::report::Report, id: &str) -> (f64, String) {
    let m = report.metabolites.iter().find(|m| m.id == id).unwrap();
    (
        m.dfg_prime.as_ref().unwrap().value_kj,
        m.energy_origin.clone().unwrap(),
    )
}

#[test]
fn one_table_serves_two_models_transformed_per_compartment() {
    let dir = tempfile::tempdir().unwrap();
    let table = write(dir.path(), "energies.csv", TABLE);
    let a = load(dir.path(), MODEL_A, std::slice::from_ref(&table)).unwrap();
    let b = load(dir.path(), MODEL_B, std::slice::from_ref(&table)).unwrap();
    assert!(a.warnings().is_empty());
    // Model B has no ethanol: its row is skipped with a warning.
    assert_eq!(b.warnings().len(), 1);
    assert!(b.warnings()[0].ends_with(
        ":5:1: warning: `bigg.metabolite:etoh` matches no metabolite of the model; row skipped"
    ));
    // The same species data reached both models, in every compartment.
    let sp = |p: &Project, id: &str| {
        let m = &p.model.metabolites[p.model.metabolite_index(id).unwrap()];
        let s = m.species.as_ref().unwrap();
        (s.species[0].dfg0_kj, s.species[0].hydrogens, s.sigma_kj)
    };
    assert_eq!(sp(&a, "glc_c"), (-915.90, 12, 0.4));
    assert_eq!(sp(&a, "glc_m"), sp(&b, "glucose[cyt]"));
    assert_eq!(sp(&a, "urea_c"), sp(&b, "urea[cyt]"));
    let (ra, rb) = (a.analyse(), b.analyse());
    // Urea at pH 7, I = 0.25 M: −39.74 kJ/mol printed (Alberty 2003, Table
    // 4.2, p. 79); the CODATA R moves it by < 0.02 kJ/mol.
    let (urea_a, origin) = dfg(&ra, "urea_c");
    assert_eq!(origin, "species");
    assert!((urea_a + 39.74).abs() < 0.02, "{urea_a}");
    // Transformed per compartment (Alberty's transform, one species):
    // ΔfG'° = ΔfG° + nH·RT·ln10·pH − RTα·(z² − nH)·√I/(1 + 1.6√I).
    // R: CODATA 2018; RTα = 2.91482 and B = 1.6: Alberty 2003, Problem 3.1,
    // printed p. 260 (constants.csv).
    let rt_ln10 = 8.314462618e-3 * 298.15 * std::f64::consts::LN_10;
    let dh = |i: f64| 2.91482 * i.sqrt() / (1.0 + 1.6 * i.sqrt());
    let expected = |g0: f64, nh: f64, ph: f64, i: f64| g0 + nh * rt_ln10 * ph + nh * dh(i);
    let (urea_b, _) = dfg(&rb, "urea[cyt]");
    assert!((urea_b - expected(-202.80, 4.0, 6.5, 0.1)).abs() < 1e-6);
    let (glc_c, _) = dfg(&ra, "glc_c");
    let (glc_m, _) = dfg(&ra, "glc_m");
    let (glc_b, _) = dfg(&rb, "glucose[cyt]");
    assert!((glc_c - expected(-915.90, 12.0, 7.0, 0.25)).abs() < 1e-6);
    assert!((glc_m - expected(-915.90, 12.0, 8.0, 0.25)).abs() < 1e-6);
    assert!((glc_b - expected(-915.90, 12.0, 6.5, 0.1)).abs() < 1e-6);
    // A ΔfG'° row says where it holds (the shift itself is not done here).
    let etoh = &a.model.metabolites[3].dfg_prime.as_ref().unwrap();
    assert_eq!(etoh.value_kj, 60.0);
    let at = etoh.at.unwrap();
    assert_eq!(
        (at.ph, at.ionic_strength_m, at.temperature_k),
        (Some(7.0), Some(0.1), None)
    );
    assert_eq!(a.settings.table_metabolites.len(), 4);
}

#[test]
fn two_rows_reaching_one_metabolite_conflict_with_both_positions() {
    let dir = tempfile::tempdir().unwrap();
    let table = write(
        dir.path(),
        "t.csv",
        "metabolite,dfg\nchebi:4167,-400\nkegg.compound:C00031,-410\n",
    );
    let Err(gibbsite::Error::Input(d)) = load(dir.path(), MODEL_B, std::slice::from_ref(&table))
    else {
        panic!("expected a conflict");
    };
    let t = table.display();
    assert_eq!(d.len(), 1);
    assert_eq!(
        d[0].message,
        format!("`glucose[cyt]` gets data from two rows: `chebi:4167` at {t}:2 and `kegg.compound:C00031` at {t}:3")
    );
    assert_eq!(d[0].line, Some(3));
    // Across two files: each file is fine alone, together they conflict.
    let one = write(dir.path(), "one.csv", "metabolite,dfg\nchebi:4167,-400\n");
    let two = write(
        dir.path(),
        "two.csv",
        "metabolite,dfg\nkegg.compound:C00031,-410\n",
    );
    let Err(gibbsite::Error::Input(d)) = load(dir.path(), MODEL_B, &[one.clone(), two.clone()])
    else {
        panic!("expected a conflict");
    };
    assert_eq!(
        d[0].message,
        format!(
            "`glucose[cyt]` gets data from two rows: `chebi:4167` at {}:2 and `kegg.compound:C00031` at {}:2",
            one.display(),
            two.display()
        )
    );
}

#[test]
fn unknown_namespace_is_an_error() {
    let dir = tempfile::tempdir().unwrap();
    let table = write(dir.path(), "t.csv", "metabolite,dfg\npubchem:5793,-400\n");
    let Err(gibbsite::Error::Input(d)) = load(dir.path(), MODEL_B, &[table]) else {
        panic!("expected an error");
    };
    assert_eq!(
        d[0].message,
        "unknown cross-reference namespace `pubchem` in `pubchem:5793`"
    );
    assert_eq!(
        d[0].hint.as_deref(),
        Some("metabolite rows may be keyed by a model id or by `chebi:…`, `kegg.compound:…`, `metanetx.chemical:…`, `inchikey:…`, `bigg.metabolite:…`")
    );
}

#[test]
fn an_xref_matching_nothing_is_a_warning() {
    let dir = tempfile::tempdir().unwrap();
    let table = write(
        dir.path(),
        "t.csv",
        "metabolite,dfg\nchebi:99999999,-400\nchebi:4167,-401\n",
    );
    let p = load(dir.path(), MODEL_B, std::slice::from_ref(&table)).unwrap();
    assert_eq!(
        p.warnings(),
        vec![format!(
            "{}:2:1: warning: `chebi:99999999` matches no metabolite of the model; row skipped",
            table.display()
        )]
    );
    assert_eq!(
        p.model.metabolites[0].dfg_prime.as_ref().unwrap().value_kj,
        -401.0
    );
}

#[test]
fn reaction_rows_by_kegg_and_unique_ec_only() {
    let dir = tempfile::tempdir().unwrap();
    let table = write(
        dir.path(),
        "r.csv",
        "reaction,drg,sigma\nkegg.reaction:R00001,-5,1\nec-code:1.1.1.1,-7,1\n",
    );
    let p = load(dir.path(), MODEL_A, std::slice::from_ref(&table)).unwrap();
    assert_eq!(
        p.model.reactions[1].drg_prime.as_ref().unwrap().value_kj,
        -5.0
    );
    assert!(p.model.reactions[0].drg_prime.is_none());
    assert_eq!(
        p.warnings(),
        vec![format!(
            "{}:3:1: warning: `ec-code:1.1.1.1` names 2 reactions (GLCt, UREAd); an EC number is used only when one reaction carries it, so this row is skipped",
            table.display()
        )]
    );
}

#[test]
fn the_command_line_takes_data_tables() {
    let dir = tempfile::tempdir().unwrap();
    let model = write(dir.path(), "a.yaml", MODEL_A);
    let table = write(dir.path(), "energies.csv", TABLE);
    let out = std::process::Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(["check", "--format", "json", "--data"])
        .arg(&table)
        .arg(&model)
        .output()
        .unwrap();
    assert!(out.status.code() == Some(0) || out.status.code() == Some(1));
    let report: gibbsite::report::Report = serde_json::from_slice(&out.stdout).unwrap();
    let (urea, origin) = dfg(&report, "urea_c");
    assert_eq!(origin, "species");
    assert!((urea + 39.74).abs() < 0.02);
}
