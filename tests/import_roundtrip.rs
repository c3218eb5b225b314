//! `gibbsite import` writes a project whose YAML loads back into the very
//! model the SBML file gave.

use gibbsite::project::{load_model_files, sbml, write};
use std::path::Path;

fn roundtrip(sbml_path: &Path) {
    let original = sbml::read_sbml(sbml_path).expect("SBML imports");
    let dir = tempfile::tempdir().unwrap();
    write::write_project(&original, dir.path()).unwrap();
    let back = load_model_files(&[dir.path().join("model.yaml")], &[]).expect("written YAML loads");
    assert_eq!(back.compartments, original.compartments);
    for (a, b) in back.metabolites.iter().zip(&original.metabolites) {
        assert_eq!(a, b);
    }
    for (a, b) in back.reactions.iter().zip(&original.reactions) {
        assert_eq!(a, b);
    }
    assert_eq!(back, original);
    // The settings file names the model and loads as a project.
    let project = gibbsite::Project::load(dir.path()).expect("project loads");
    assert_eq!(project.model, original);
}

#[test]
fn e_coli_core_round_trips_through_yaml() {
    roundtrip(&Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/e_coli_core.xml.gz"));
}

mod common;

/// The genome-scale models, when ../shared/models is present.
#[test]
fn shared_models_round_trip() {
    for name in ["iML1515.xml.gz", "Recon3D.xml.gz"] {
        if let Some(path) = common::shared_model_path(name) {
            roundtrip(&path);
        }
    }
}
