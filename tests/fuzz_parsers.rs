//! Property tests: no input, however mangled, makes a parser panic. Each
//! malformed input must come back as an `Error::Input` with diagnostics.

use gibbsite::project::{equation, units};
use gibbsite::{Error, Project};
use proptest::prelude::*;
use std::path::Path;

fn demo_model() -> String {
    std::fs::read_to_string(
        Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside/model.yaml"),
    )
    .unwrap()
}

fn e_coli_core_xml() -> &'static str {
    static TEXT: std::sync::OnceLock<String> = std::sync::OnceLock::new();
    TEXT.get_or_init(read_e_coli_core_xml)
}

fn read_e_coli_core_xml() -> String {
    use std::io::Read;
    let bytes =
        std::fs::read(Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/e_coli_core.xml.gz"))
            .unwrap();
    let mut text = String::new();
    flate2::read::GzDecoder::new(&bytes[..])
        .read_to_string(&mut text)
        .unwrap();
    text
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 300, .. ProptestConfig::default() })]

    #[test]
    fn equations_never_panic(text in "\\PC{0,60}") {
        let _ = equation::parse(&text);
    }

    #[test]
    fn equation_like_text_never_panics(text in "[0-9a-z_ .+<=>-]{0,40}") {
        if let Ok(eq) = equation::parse(&text) {
            prop_assert!(!eq.terms.is_empty());
            prop_assert!(eq.terms.iter().all(|t| t.coefficient != 0.0 && t.coefficient.is_finite()));
        }
    }

    #[test]
    fn quantities_never_panic(text in "\\PC{0,30}") {
        for kind in [units::Kind::Energy, units::Kind::Concentration, units::Kind::Temperature,
                     units::Kind::Potential, units::Kind::Flux] {
            if let Ok(v) = units::parse(&units::RawQuantity::Text(text.clone()), kind) {
                prop_assert!(v.is_finite());
            }
        }
    }

    /// Cut a slice out of the demo model and splice in random text: loading
    /// either succeeds or reports located diagnostics; it never panics.
    #[test]
    fn mangled_models_give_diagnostics(start in 0usize..9000, len in 0usize..200, insert in "\\PC{0,20}") {
        let text = demo_model();
        let start = start.min(text.len());
        let end = (start + len).min(text.len());
        if !text.is_char_boundary(start) || !text.is_char_boundary(end) {
            return Ok(());
        }
        let mangled = format!("{}{}{}", &text[..start], insert, &text[end..]);
        let dir = tempfile::tempdir().unwrap();
        let file = dir.path().join("model.yaml");
        std::fs::write(&file, mangled).unwrap();
        match Project::load(&file) {
            Ok(_) => {}
            Err(Error::Input(diagnostics)) => prop_assert!(!diagnostics.is_empty()),
            Err(other) => prop_assert!(false, "unexpected error kind: {other}"),
        }
    }

    /// The SBML reader on a published model with a slice cut out and random
    /// text spliced in: a model or located diagnostics, never a panic.
    #[test]
    fn mangled_sbml_gives_diagnostics(start in 0usize..400_000, len in 0usize..300, insert in "\\PC{0,20}") {
        let text = e_coli_core_xml();
        let start = start.min(text.len());
        let end = (start + len).min(text.len());
        if !text.is_char_boundary(start) || !text.is_char_boundary(end) {
            return Ok(());
        }
        let mangled = format!("{}{}{}", &text[..start], insert, &text[end..]);
        match gibbsite::project::sbml::parse_sbml(&mangled, Path::new("mangled.xml")) {
            Ok(_) => {}
            Err(Error::Input(diagnostics)) => prop_assert!(!diagnostics.is_empty()),
            Err(other) => prop_assert!(false, "unexpected error kind: {other}"),
        }
    }
}
