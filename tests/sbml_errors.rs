//! Bad SBML input: every problem is reported with file, line, column and a
//! clear message, all at once, and nothing panics.

use gibbsite::error::Error;
use gibbsite::project::sbml::{parse_sbml, read_sbml};
use std::path::Path;

const FILE: &str = "bad.xml";

/// (line, column, message) of every diagnostic.
fn problems(text: &str) -> Vec<(usize, usize, String)> {
    match parse_sbml(text, Path::new(FILE)) {
        Ok(_) => panic!("expected an error for:\n{text}"),
        Err(Error::Input(diagnostics)) => diagnostics
            .into_iter()
            .map(|d| {
                assert_eq!(d.file, Path::new(FILE));
                (d.line.unwrap(), d.column.unwrap(), d.message)
            })
            .collect(),
        Err(other) => panic!("expected an input error, got {other}"),
    }
}

/// 1-based line and column where `needle` first occurs.
fn position_of(text: &str, needle: &str) -> (usize, usize) {
    let offset = text
        .find(needle)
        .unwrap_or_else(|| panic!("{needle} not in text"));
    let before = &text[..offset];
    let line = before.matches('\n').count() + 1;
    let column = before.chars().rev().take_while(|c| *c != '\n').count() + 1;
    (line, column)
}

/// A small valid model; `{species}`, `{reactions}` and `{parameters}` are
/// filled in by each test.
fn document(parameters: &str, species: &str, reactions: &str) -> String {
    format!(
        r#"<?xml version="1.0" encoding="UTF-8"?>
<sbml xmlns="http://www.sbml.org/sbml/level3/version1/core" level="3" version="1"
      xmlns:fbc="http://www.sbml.org/sbml/level3/version1/fbc/version2" fbc:required="false">
  <model id="bad" fbc:strict="true">
    <listOfParameters>
      <parameter id="lb" value="-1000" constant="true"/>
      <parameter id="ub" value="1000" constant="true"/>
{parameters}
    </listOfParameters>
    <listOfCompartments>
      <compartment id="c" name="cytosol" constant="true"/>
    </listOfCompartments>
    <listOfSpecies>
      <species id="M_a_c" compartment="c" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false" fbc:charge="0" fbc:chemicalFormula="C3H6O3"/>
      <species id="M_b_c" compartment="c" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false" fbc:charge="0" fbc:chemicalFormula="C3H6O3"/>
{species}
    </listOfSpecies>
    <listOfReactions>
      <reaction id="R_AB" reversible="true" fast="false" fbc:lowerFluxBound="lb" fbc:upperFluxBound="ub">
        <listOfReactants><speciesReference species="M_a_c" stoichiometry="1" constant="true"/></listOfReactants>
        <listOfProducts><speciesReference species="M_b_c" stoichiometry="1" constant="true"/></listOfProducts>
      </reaction>
{reactions}
    </listOfReactions>
  </model>
</sbml>
"#
    )
}

#[test]
fn the_template_itself_is_valid() {
    // Guards the other tests: their errors come from what they add.
    let model = parse_sbml(&document("", "", ""), Path::new(FILE)).unwrap();
    assert_eq!(model.reactions.len(), 1);
    assert_eq!(model.metabolites.len(), 2);
}

#[test]
fn malformed_xml_gives_line_and_column() {
    let text = "<?xml version=\"1.0\"?>\n<sbml level=\"3\">\n  <model>\n  </modle>\n</sbml>\n";
    let p = problems(text);
    assert_eq!(p.len(), 1);
    let (line, column, message) = &p[0];
    assert_eq!((*line, *column), (4, 3));
    assert_eq!(message, "malformed XML: expected 'model' tag, not 'modle'");
}

#[test]
fn truncated_file_points_at_its_end() {
    let text = "<sbml level=\"3\">\n  <model>\n";
    let p = problems(text);
    // The end of the text: after the last newline.
    assert_eq!(
        p,
        vec![(
            3,
            1,
            "malformed XML: the root node was opened but never closed".to_string()
        )]
    );
}

#[test]
fn undeclared_species() {
    let text = document(
        "",
        "",
        r#"      <reaction id="R_X" reversible="false" fast="false" fbc:lowerFluxBound="lb" fbc:upperFluxBound="ub">
        <listOfReactants><speciesReference species="M_missing_c" stoichiometry="1" constant="true"/></listOfReactants>
      </reaction>"#,
    );
    let p = problems(&text);
    assert_eq!(
        p,
        vec![(
            position_of(&text, "species=\"M_missing_c\"").0,
            position_of(&text, "species=\"M_missing_c\"").1,
            "reaction `R_X` names species `M_missing_c`, which is not declared".to_string()
        )]
    );
}

#[test]
fn unsupported_level_and_version() {
    let text = "<?xml version=\"1.0\"?>\n<sbml xmlns=\"http://www.sbml.org/sbml/level2/version4\" level=\"2\" version=\"4\">\n  <model id=\"m\"/>\n</sbml>\n";
    let err = parse_sbml(text, Path::new(FILE)).unwrap_err();
    let d = &err.diagnostics()[0];
    assert_eq!((d.line, d.column), (Some(2), Some(1)));
    assert_eq!(
        d.message,
        "SBML Level 2 Version 4 is not supported (expected Level 3 Version 1 or 2)"
    );
    assert_eq!(
        d.hint.as_deref(),
        Some("save the model as SBML Level 3 with the fbc package")
    );
}

#[test]
fn unsupported_required_package() {
    let text = r#"<?xml version="1.0"?>
<sbml xmlns="http://www.sbml.org/sbml/level3/version1/core" level="3" version="1"
      xmlns:comp="http://www.sbml.org/sbml/level3/version1/comp/version1" comp:required="true">
  <model id="m"/>
</sbml>
"#;
    let p = problems(text);
    let (line, column) = position_of(text, "comp:required");
    assert_eq!(line, 3);
    assert_eq!(
        p,
        vec![(
            line,
            column,
            "the model requires the SBML package `comp` version 1, which is not supported"
                .to_string()
        )]
    );
    // The same package, not required, is ignored: what remains is that the
    // model has no reactions.
    let optional = text.replace("comp:required=\"true\"", "comp:required=\"false\"");
    let p = problems(&optional);
    assert_eq!(p.len(), 1);
    assert_eq!(p[0].2, "the model defines no reactions");
}

#[test]
fn missing_bound_parameter() {
    let text = document(
        "",
        "",
        r#"      <reaction id="R_Y" reversible="false" fast="false" fbc:lowerFluxBound="zero_bound" fbc:upperFluxBound="ub">
        <listOfReactants><speciesReference species="M_a_c" stoichiometry="1" constant="true"/></listOfReactants>
      </reaction>"#,
    );
    let (line, column) = position_of(&text, "fbc:lowerFluxBound=\"zero_bound\"");
    let err = parse_sbml(&text, Path::new(FILE)).unwrap_err();
    let d = &err.diagnostics()[0];
    assert_eq!((d.line, d.column), (Some(line), Some(column)));
    assert_eq!(
        d.message,
        "the lower flux bound of reaction `R_Y` is parameter `zero_bound`, which is not declared or has no value"
    );
    // The whole text a user sees: file:line:column: error: message, then hint.
    assert_eq!(
        err.to_string(),
        format!(
            "bad.xml:{line}:{column}: error: the lower flux bound of reaction `R_Y` is parameter `zero_bound`, which is not declared or has no value\n  hint: declare it in <listOfParameters> with a numeric `value`"
        )
    );
}

#[test]
fn non_numeric_stoichiometry() {
    let text = document(
        "",
        "",
        r#"      <reaction id="R_Z" reversible="false" fast="false">
        <listOfReactants><speciesReference species="M_a_c" stoichiometry="two" constant="true"/></listOfReactants>
      </reaction>"#,
    );
    let p = problems(&text);
    let (line, column) = position_of(&text, "stoichiometry=\"two\"");
    assert_eq!(
        p,
        vec![(
            line,
            column,
            "stoichiometry `two` of `M_a_c` in reaction `R_Z` is not a number".to_string()
        )]
    );
}

#[test]
fn all_problems_at_once_in_file_order() {
    let text = document(
        r#"      <parameter id="odd" value="lots" constant="true"/>"#,
        r#"      <species id="M_d_x" compartment="x" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false"/>
      <species id="M_a_c" compartment="c" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false"/>
      <species id="M_e_c" compartment="c" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false" fbc:charge="minus"/>"#,
        r#"      <reaction id="R_1" reversible="false" fast="false" fbc:lowerFluxBound="nope" fbc:upperFluxBound="ub">
        <listOfReactants><speciesReference species="M_q_c" stoichiometry="-1" constant="true"/></listOfReactants>
      </reaction>
      <reaction id="R_2" reversible="false" fast="false" fbc:lowerFluxBound="ub" fbc:upperFluxBound="lb">
        <listOfProducts><speciesReference species="M_a_c" constant="true"/></listOfProducts>
      </reaction>"#,
    );
    let p = problems(&text);
    let at = |needle: &str| position_of(&text, needle);
    let expected = vec![
        (
            at("value=\"lots\""),
            "parameter `odd` has value `lots`, expected a number",
        ),
        (
            at("compartment=\"x\""),
            "species `M_d_x` is in compartment `x`, which is not declared",
        ),
        (
            // The second declaration of M_a_c, not the first.
            position_of(
                &text,
                "id=\"M_a_c\" compartment=\"c\" boundaryCondition=\"false\" constant=\"false\" hasOnlySubstanceUnits=\"false\"/>",
            ),
            "species id `M_a_c` is already used by a species",
        ),
        (
            at("fbc:charge=\"minus\""),
            "species `M_e_c` has charge `minus`, expected an integer",
        ),
        (
            at("fbc:lowerFluxBound=\"nope\""),
            "the lower flux bound of reaction `R_1` is parameter `nope`, which is not declared or has no value",
        ),
        (
            at("stoichiometry=\"-1\""),
            "stoichiometry `-1` of `M_q_c` in reaction `R_1` must be a finite number not below 0",
        ),
        (
            at("<reaction id=\"R_2\""),
            "reaction `R_2` has lower flux bound 1000 above its upper flux bound -1000",
        ),
    ];
    let expected: Vec<(usize, usize, String)> = expected
        .into_iter()
        .map(|((line, column), message)| (line, column, message.to_string()))
        .collect();
    assert_eq!(p, expected);
    let err = parse_sbml(&text, Path::new(FILE)).unwrap_err();
    assert!(err.to_string().ends_with("\n7 problems found"), "{err}");
}

#[test]
fn not_sbml_at_all() {
    let p = problems("<?xml version=\"1.0\"?>\n<html><body/></html>\n");
    assert_eq!(
        p,
        vec![(
            2,
            1,
            "not an SBML document: the root element is <html>, expected <sbml>".to_string()
        )]
    );
    let p = problems(
        "<sbml xmlns=\"http://www.sbml.org/sbml/level3/version1/core\" level=\"3\" version=\"1\"/>",
    );
    assert_eq!(
        p,
        vec![(1, 1, "the SBML document has no <model> element".to_string())]
    );
}

#[test]
fn doctype_is_refused_without_panic() {
    let text = "<?xml version=\"1.0\"?>\n<!DOCTYPE sbml [<!ENTITY x \"y\">]>\n<sbml/>\n";
    let p = problems(text);
    assert_eq!(
        p,
        vec![(2, 1, "malformed XML: XML with DTD detected".to_string())]
    );
}

#[test]
fn file_level_errors() {
    let dir = tempfile::tempdir().unwrap();
    // Missing file: an input error naming the path (exit 2, not 3).
    let missing = dir.path().join("none.xml");
    match read_sbml(&missing) {
        Err(Error::Input(d)) => {
            assert_eq!(d[0].file, missing);
            assert_eq!(d[0].message, "file not found");
        }
        other => panic!("expected an input error, got {other:?}"),
    }
    // Bytes that are not UTF-8 (Latin-1 é on line 2, column 9).
    let latin1 = dir.path().join("latin1.xml");
    std::fs::write(&latin1, b"<sbml>\n<model n\xe9ame=\"x\"/>\n</sbml>\n").unwrap();
    let err = read_sbml(&latin1).unwrap_err();
    let d = &err.diagnostics()[0];
    assert_eq!(
        d.message,
        "the file is not valid UTF-8 text: byte 0xE9 at offset 15"
    );
    assert_eq!((d.line, d.column), (Some(2), Some(9)));
    assert!(d.hint.as_deref().unwrap().contains("Latin-1"));
    // A gzip header followed by garbage.
    let broken = dir.path().join("broken.xml.gz");
    std::fs::write(
        &broken,
        [0x1f, 0x8b, 8, 0, 0, 0, 0, 0, 0, 3, 0xff, 0xff, 0xff],
    )
    .unwrap();
    let err = read_sbml(&broken).unwrap_err();
    assert!(
        err.diagnostics()[0]
            .message
            .starts_with("cannot decompress the gzip data: "),
        "{err}"
    );
}
