//! SBML features beyond the BiGG files: fbc version 1 flux bounds, groups,
//! boundary species, Level 3 Version 2, MIRIAM URNs, inline and legacy
//! bounds, defaults. The small documents are written for these tests
//! (invented data, shaped like the SBML L3 and fbc/groups specifications).

use gibbsite::model::{Model, Role, Special};
use gibbsite::project::sbml::parse_sbml;
use std::path::Path;

fn parse(text: &str) -> Model {
    parse_sbml(text, Path::new("test.xml")).unwrap_or_else(|e| panic!("{e}"))
}

fn reaction<'m>(m: &'m Model, id: &str) -> &'m gibbsite::model::Reaction {
    &m.reactions[m.reaction_index(id).unwrap_or_else(|| panic!("{id}"))]
}

fn participants(m: &Model, id: &str) -> Vec<(String, f64)> {
    reaction(m, id)
        .stoichiometry
        .iter()
        .map(|&(i, c)| (m.metabolites[i].id.clone(), c))
        .collect()
}

/// fbc version 1: bounds as `fbc:fluxBound` elements, objective minimised.
const FBC_V1: &str = r#"<?xml version="1.0" encoding="UTF-8"?>
<sbml xmlns="http://www.sbml.org/sbml/level3/version1/core" level="3" version="1"
      xmlns:fbc="http://www.sbml.org/sbml/level3/version1/fbc/version1" fbc:required="false">
  <model id="v1" name="Version one">
    <listOfCompartments>
      <compartment id="c" constant="true"/>
      <compartment id="b" name="boundary" constant="true"/>
    </listOfCompartments>
    <listOfSpecies>
      <species id="A" compartment="c" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false" fbc:charge="-1" fbc:chemicalFormula="C2H3O2"/>
      <species id="B" compartment="c" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false" fbc:charge="-1" fbc:chemicalFormula="C2H3O2"/>
      <species id="A_b" compartment="b" boundaryCondition="true" constant="false" hasOnlySubstanceUnits="false"/>
    </listOfSpecies>
    <fbc:listOfFluxBounds>
      <fbc:fluxBound fbc:id="b1" fbc:reaction="R1" fbc:operation="greaterEqual" fbc:value="-5"/>
      <fbc:fluxBound fbc:id="b2" fbc:reaction="R1" fbc:operation="lessEqual" fbc:value="7.5"/>
      <fbc:fluxBound fbc:id="b3" fbc:reaction="R2" fbc:operation="equal" fbc:value="2"/>
    </fbc:listOfFluxBounds>
    <fbc:listOfObjectives fbc:activeObjective="second">
      <fbc:objective fbc:id="first" fbc:type="maximize">
        <fbc:listOfFluxObjectives>
          <fbc:fluxObjective fbc:reaction="R1" fbc:coefficient="1"/>
        </fbc:listOfFluxObjectives>
      </fbc:objective>
      <fbc:objective fbc:id="second" fbc:type="minimize">
        <fbc:listOfFluxObjectives>
          <fbc:fluxObjective fbc:reaction="R2" fbc:coefficient="0.5"/>
        </fbc:listOfFluxObjectives>
      </fbc:objective>
    </fbc:listOfObjectives>
    <listOfReactions>
      <reaction id="R1" reversible="true" fast="false">
        <listOfReactants><speciesReference species="A" stoichiometry="1" constant="true"/></listOfReactants>
        <listOfProducts><speciesReference species="B" stoichiometry="1" constant="true"/></listOfProducts>
      </reaction>
      <reaction id="R2" reversible="false" fast="false">
        <listOfReactants><speciesReference species="A_b" stoichiometry="1" constant="true"/></listOfReactants>
        <listOfProducts><speciesReference species="A" stoichiometry="1" constant="true"/></listOfProducts>
      </reaction>
      <reaction id="R3" reversible="false" fast="false">
        <listOfReactants><speciesReference species="B" stoichiometry="1" constant="true"/></listOfReactants>
      </reaction>
    </listOfReactions>
  </model>
</sbml>
"#;

#[test]
fn fbc_version_1_bounds_and_minimised_objective() {
    let m = parse(FBC_V1);
    assert_eq!(m.title, "Version one");
    let r1 = reaction(&m, "R1");
    assert_eq!((r1.lower_bound, r1.upper_bound), (-5.0, 7.5));
    let r2 = reaction(&m, "R2");
    assert_eq!((r2.lower_bound, r2.upper_bound), (2.0, 2.0));
    // No bound given: irreversible → [0, 1000] (common practice).
    let r3 = reaction(&m, "R3");
    assert_eq!((r3.lower_bound, r3.upper_bound), (0.0, 1000.0));
    // The active objective is "second"; minimising 0.5·v(R2) = maximising −0.5·v(R2).
    assert_eq!(m.objective, vec![(1, -0.5)]);
}

#[test]
fn boundary_species_are_dropped_and_make_boundary_reactions() {
    let m = parse(FBC_V1);
    // A_b is the outside world: not a metabolite, not in any reaction.
    assert_eq!(
        m.metabolites
            .iter()
            .map(|x| x.id.as_str())
            .collect::<Vec<_>>(),
        vec!["A", "B"]
    );
    assert_eq!(participants(&m, "R2"), vec![("A".to_string(), 1.0)]);
    // R2 took A from the outside world: an exchange.
    assert_eq!(reaction(&m, "R2").role, Role::Exchange);
    // R3 consumes B and cannot run backwards: a demand.
    assert_eq!(reaction(&m, "R3").role, Role::Demand);
    assert_eq!(reaction(&m, "R1").role, Role::Internal);
}

/// Level 3 Version 2 with groups, MIRIAM URNs, inline bounds, kinetic-law
/// bounds, a missing stoichiometry and a metabolite on both sides.
const L3V2_GROUPS: &str = r##"<?xml version="1.0" encoding="UTF-8"?>
<sbml xmlns="http://www.sbml.org/sbml/level3/version2/core" level="3" version="2"
      xmlns:fbc="http://www.sbml.org/sbml/level3/version1/fbc/version2" fbc:required="false"
      xmlns:groups="http://www.sbml.org/sbml/level3/version1/groups/version1" groups:required="false">
  <model id="v2">
    <listOfParameters>
      <parameter id="inf" value="INF" constant="true"/>
      <parameter id="minus_inf" value="-INF" constant="true"/>
    </listOfParameters>
    <listOfCompartments>
      <compartment id="cyt" name="Cytoplasm" constant="true"/>
      <compartment id="ext" name="Extracellular" constant="true"/>
    </listOfCompartments>
    <listOfSpecies>
      <species id="atp" compartment="cyt" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false" fbc:charge="-4" fbc:chemicalFormula="C10H12N5O13P3"/>
      <species id="adp" compartment="cyt" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false" fbc:charge="-3" fbc:chemicalFormula="C10H12N5O10P2"/>
      <species id="pi" compartment="cyt" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false" fbc:charge="-2" fbc:chemicalFormula="HO4P"/>
      <species id="proton" metaid="meta_h" compartment="cyt" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false" fbc:charge="1" fbc:chemicalFormula="H"/>
      <species id="water" compartment="cyt" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false">
        <annotation>
          <rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#" xmlns:bqbiol="http://biomodels.net/biology-qualifiers/">
            <rdf:Description rdf:about="#water">
              <bqbiol:is><rdf:Bag>
                <rdf:li rdf:resource="urn:miriam:obo.chebi:CHEBI%3A15377"/>
                <rdf:li rdf:resource="urn:miriam:kegg.compound:C00001"/>
              </rdf:Bag></bqbiol:is>
            </rdf:Description>
          </rdf:RDF>
        </annotation>
      </species>
      <species id="glc_ext" compartment="ext" boundaryCondition="false" constant="false" hasOnlySubstanceUnits="false"/>
    </listOfSpecies>
    <listOfReactions>
      <reaction id="ATPase" metaid="meta_atpase" reversible="false" fbc:lowerFluxBound="0" fbc:upperFluxBound="inf">
        <listOfReactants>
          <speciesReference species="atp" constant="true"/>
          <speciesReference species="water" stoichiometry="1" constant="true"/>
          <speciesReference species="proton" stoichiometry="1" constant="true"/>
        </listOfReactants>
        <listOfProducts>
          <speciesReference species="adp" stoichiometry="1" constant="true"/>
          <speciesReference species="pi" stoichiometry="1" constant="true"/>
          <speciesReference species="proton" stoichiometry="2" constant="true"/>
        </listOfProducts>
      </reaction>
      <reaction id="glc_in" reversible="true">
        <listOfReactants><speciesReference species="glc_ext" stoichiometry="1" constant="true"/></listOfReactants>
        <kineticLaw>
          <listOfLocalParameters>
            <localParameter id="LOWER_BOUND" value="-10"/>
            <localParameter id="UPPER_BOUND" value="0"/>
          </listOfLocalParameters>
        </kineticLaw>
      </reaction>
      <reaction id="cycle" reversible="true" fbc:lowerFluxBound="minus_inf" fbc:upperFluxBound="inf">
        <listOfReactants><speciesReference species="adp" stoichiometry="1" constant="true"/></listOfReactants>
        <listOfProducts><speciesReference species="atp" stoichiometry="1" constant="true"/></listOfProducts>
      </reaction>
    </listOfReactions>
    <groups:listOfGroups>
      <groups:group groups:id="g_energy" groups:name="Energy" groups:kind="partonomy">
        <groups:listOfMembers>
          <groups:member groups:metaIdRef="meta_atpase"/>
          <groups:member groups:idRef="atp"/>
        </groups:listOfMembers>
      </groups:group>
      <groups:group groups:id="g_second" groups:kind="collection">
        <groups:listOfMembers>
          <groups:member groups:idRef="ATPase"/>
          <groups:member groups:idRef="cycle"/>
        </groups:listOfMembers>
      </groups:group>
    </groups:listOfGroups>
  </model>
</sbml>
"##;

#[test]
fn level_3_version_2_with_groups() {
    let m = parse(L3V2_GROUPS);
    // First group listing a reaction wins (by metaIdRef here); a group
    // without a name is known by its id.
    assert_eq!(reaction(&m, "ATPase").group.as_deref(), Some("Energy"));
    assert_eq!(reaction(&m, "cycle").group.as_deref(), Some("g_second"));
    assert_eq!(reaction(&m, "glc_in").group, None);
}

#[test]
fn stoichiometry_defaults_and_net_coefficients() {
    let m = parse(L3V2_GROUPS);
    // atp without stoichiometry counts 1; proton 1 consumed, 2 produced → net +1.
    assert_eq!(
        participants(&m, "ATPase"),
        vec![
            ("atp".to_string(), -1.0),
            ("adp".to_string(), 1.0),
            ("pi".to_string(), 1.0),
            ("proton".to_string(), 1.0),
            ("water".to_string(), -1.0),
        ]
    );
}

#[test]
fn inline_infinite_and_legacy_bounds() {
    let m = parse(L3V2_GROUPS);
    let atpase = reaction(&m, "ATPase");
    assert_eq!(
        (atpase.lower_bound, atpase.upper_bound),
        (0.0, f64::INFINITY)
    );
    let cycle = reaction(&m, "cycle");
    assert_eq!(
        (cycle.lower_bound, cycle.upper_bound),
        (f64::NEG_INFINITY, f64::INFINITY)
    );
    // Kinetic-law LOWER_BOUND / UPPER_BOUND of older files.
    let uptake = reaction(&m, "glc_in");
    assert_eq!((uptake.lower_bound, uptake.upper_bound), (-10.0, 0.0));
    // One-sided with only extracellular species: exchange.
    assert_eq!(uptake.role, Role::Exchange);
    assert_eq!(atpase.role, Role::Internal);
}

#[test]
fn urn_cross_references_and_special_metabolites() {
    let m = parse(L3V2_GROUPS);
    let water = &m.metabolites[m.metabolite_index("water").unwrap()];
    assert_eq!(water.xrefs["chebi"], vec!["CHEBI:15377"]);
    assert_eq!(water.xrefs["kegg.compound"], vec!["C00001"]);
    // No formula: recognised as water by its ChEBI id.
    assert_eq!(water.special, Special::Water);
    assert_eq!(water.formula, None);
    let proton = &m.metabolites[m.metabolite_index("proton").unwrap()];
    assert_eq!(proton.special, Special::Proton);
    let atp = &m.metabolites[m.metabolite_index("atp").unwrap()];
    assert_eq!(atp.special, Special::None);
    // Names default to ids.
    assert_eq!(atp.name, "atp");
    assert_eq!(m.compartments[0].name, "Cytoplasm");
    // No objective in this file.
    assert!(m.objective.is_empty());
}

#[test]
fn same_text_same_model() {
    // Import is deterministic: the same bytes give the same model.
    assert_eq!(parse(L3V2_GROUPS), parse(L3V2_GROUPS));
}

#[test]
fn fbc_version_3_reads_like_version_2() {
    // fbc version 3 keeps version 2's bounds and charges (it adds key-value
    // annotations, which are not read).
    let v3 = L3V2_GROUPS.replace("fbc/version2", "fbc/version3");
    assert_ne!(v3, L3V2_GROUPS);
    let (m2, m3) = (parse(L3V2_GROUPS), parse(&v3));
    assert_eq!(m2, m3);
    assert_eq!(reaction(&m3, "ATPase").upper_bound, f64::INFINITY);
    assert_eq!(m3.metabolites[0].charge, Some(-4));
}
