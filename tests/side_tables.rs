//! Side tables add ΔG data and concentrations to a model without editing it.

use gibbsite::Project;
use std::path::Path;

fn project_with(tables: &[(&str, &str)]) -> (tempfile::TempDir, gibbsite::Result<Project>) {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(
        dir.path().join("model.yaml"),
        "id: t\ncompartments: [{id: c}]\nmetabolites:\n  - {id: a, compartment: c}\n  - {id: b, compartment: c}\nreactions:\n  - {id: R1, equation: a <-> b}\n",
    )
    .unwrap();
    let names: Vec<&str> = tables.iter().map(|(n, _)| *n).collect();
    std::fs::write(
        dir.path().join("gibbsite.yaml"),
        format!("model: model.yaml\ntables: [{}]\n", names.join(", ")),
    )
    .unwrap();
    for (name, text) in tables {
        std::fs::write(dir.path().join(name), text).unwrap();
    }
    let loaded = Project::load(dir.path());
    (dir, loaded)
}

#[test]
fn formation_energies_concentrations_and_species_from_tables() {
    let (_dir, project) = project_with(&[
        // Energy, σ and concentrations of a: invented for this test.
        (
            "metabolites.csv",
            "metabolite,dfg,sigma,source,min,max,measured\na,-10 kJ/mol,1.5,lab,1 mM,5 mM,2 mM\n",
        ),
        // Two species rows for b (a weak acid, invented numbers).
        (
            "species.tsv",
            "metabolite\tdfg0\tcharge\thydrogens\tsigma\tsource\nb\t-100\t-1\t3\t0.5\tbook\nb\t-140\t0\t4\t0.5\tbook\n",
        ),
    ]);
    let project = project.expect("tables load");
    let a = &project.model.metabolites[0];
    let e = a.dfg_prime.as_ref().unwrap();
    assert_eq!(
        (e.value_kj, e.sigma_kj, e.source.as_str()),
        (-10.0, 1.5, "lab")
    );
    let c = a.concentration.unwrap();
    assert!((c.min - 1e-3).abs() < 1e-15 && (c.max - 5e-3).abs() < 1e-15);
    assert!((a.measured_m.unwrap() - 2e-3).abs() < 1e-15);
    let b = project.model.metabolites[1].species.as_ref().unwrap();
    assert_eq!(b.species.len(), 2);
    assert_eq!((b.species[1].charge, b.species[1].hydrogens), (0, 4));
    assert_eq!(b.source, "book");
}

#[test]
fn reaction_energies_from_a_table_override_the_sum() {
    let (_dir, project) = project_with(&[(
        "reactions.csv",
        "reaction,drg,sigma\nR1,-7.3 kcal/mol,0.4\n",
    )]);
    let project = project.unwrap();
    // 1 kcal = 4.184 kJ (common practice): −7.3 kcal/mol = −30.5432 kJ/mol.
    let e = project.model.reactions[0].drg_prime.as_ref().unwrap();
    assert!((e.value_kj + 30.5432).abs() < 1e-9);
    let report = project.analyse();
    assert_eq!(
        report.reactions[0].energy_origin.as_deref(),
        Some("reaction")
    );
}

#[test]
fn table_errors_name_file_and_line() {
    let case = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/cases/bad/side-table-errors");
    let Err(gibbsite::Error::Input(d)) = Project::load(&case) else {
        panic!("expected errors");
    };
    let lines: Vec<(String, usize)> = d
        .iter()
        .map(|d| {
            (
                d.file.file_name().unwrap().to_string_lossy().into_owned(),
                d.line.unwrap(),
            )
        })
        .collect();
    assert_eq!(
        lines,
        vec![
            ("energies.csv".to_string(), 3),
            ("energies.csv".to_string(), 4),
            ("energies.csv".to_string(), 5),
            ("reactions.tsv".to_string(), 1),
        ]
    );
}
