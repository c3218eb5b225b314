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

/// Names from SBML may hold any Unicode text (controls, DEL, U+0085,
/// U+2028/9, byte-order marks, non-BMP): what `import` writes must read
/// back to the same model.
mod unicode_names {
    use gibbsite::project::{model_from_text, write};
    use proptest::prelude::*;
    use std::path::Path;

    const MODEL: &str = "\
compartments: [{id: c}]
metabolites:
  - {id: a_c, compartment: c}
  - {id: b_c, compartment: c}
reactions:
  - {id: R1, equation: a_c -> b_c}
";

    fn round_trip(title: &str, metabolite: &str, reaction: &str) {
        let path = Path::new("model.yaml");
        let mut model = model_from_text(path, MODEL).unwrap();
        model.title = title.to_string();
        model.metabolites[0].name = metabolite.to_string();
        model.reactions[0].name = reaction.to_string();
        let yaml = write::model_to_yaml(&model);
        let back = model_from_text(path, &yaml)
            .unwrap_or_else(|e| panic!("written YAML does not load: {e}\n{yaml}"));
        assert_eq!(back, model);
    }

    #[test]
    fn the_reported_characters_round_trip() {
        round_trip(
            "del \u{7f} nel \u{85}",
            "ls \u{2028} ps \u{2029}",
            "bom \u{feff} \u{fffe}",
        );
        round_trip(
            "tab\tcr\r\nnul\u{0}",
            "\u{9f}\u{1b}[31m",
            "𝔤𝔦𝔟𝔟𝔰𝔦𝔱𝔢 \"q\" \\ '",
        );
    }

    proptest! {
        #![proptest_config(ProptestConfig { cases: 500, .. ProptestConfig::default() })]
        #[test]
        fn random_unicode_names_round_trip(
            title in any::<String>(),
            metabolite in any::<String>(),
            reaction in "\\PC*|[\u{0}-\u{a0}\u{2028}\u{2029}\u{feff}]{0,20}",
        ) {
            round_trip(&title, &metabolite, &reaction);
        }
    }
}
