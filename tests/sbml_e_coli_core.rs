//! Import of the E. coli core model (Orth, Fleming & Palsson, EcoSal Plus
//! 2010), as shipped in tests/data/e_coli_core.xml.gz (BiGG SBML, L3V1 fbc 2).
//!
//! Counts and values below were read from the published model and its SBML
//! file; each assertion names where its number comes from.

use gibbsite::checks::balance;
use gibbsite::model::{Model, Role, Special};
use gibbsite::project::sbml::{parse_sbml, read_sbml};
use std::collections::BTreeMap;
use std::io::Read;
use std::path::{Path, PathBuf};

fn data_file() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/e_coli_core.xml.gz")
}

fn model() -> Model {
    read_sbml(&data_file()).expect("e_coli_core imports")
}

fn reaction<'m>(model: &'m Model, id: &str) -> &'m gibbsite::model::Reaction {
    &model.reactions[model.reaction_index(id).expect(id)]
}

#[test]
fn sizes_match_the_publication() {
    let m = model();
    // Orth, Fleming & Palsson 2010: 95 reactions, 72 metabolites.
    assert_eq!(m.reactions.len(), 95);
    assert_eq!(m.metabolites.len(), 72);
    // Two compartments in the SBML file: e (extracellular space), c (cytosol).
    let compartments: Vec<(&str, &str)> = m
        .compartments
        .iter()
        .map(|c| (c.id.as_str(), c.name.as_str()))
        .collect();
    assert_eq!(
        compartments,
        vec![("e", "extracellular space"), ("c", "cytosol")]
    );
    assert_eq!(m.id, "e_coli_core");
    // Import defaults (documented in project::sbml): pH 7, I = 0.25 M, 0 mV, 298.15 K.
    for c in &m.compartments {
        assert_eq!((c.ph, c.ionic_strength_m, c.potential_mv), (7.0, 0.25, 0.0));
    }
    assert_eq!(m.temperature_k, 298.15);
}

#[test]
fn roles_exchanges_and_biomass() {
    let m = model();
    let mut roles: BTreeMap<Role, Vec<&str>> = BTreeMap::new();
    for r in &m.reactions {
        roles.entry(r.role).or_default().push(&r.id);
    }
    // The file has 20 reactions with SBO:0000627 (exchange), all named R_EX_*,
    // one biomass reaction (SBO:0000629), and no demand or sink reactions.
    assert_eq!(roles[&Role::Exchange].len(), 20);
    assert!(roles[&Role::Exchange]
        .iter()
        .all(|id| id.starts_with("R_EX_")));
    assert_eq!(roles[&Role::Biomass], vec!["R_BIOMASS_Ecoli_core_w_GAM"]);
    assert_eq!(roles[&Role::Internal].len(), 74);
    assert!(!roles.contains_key(&Role::Demand) && !roles.contains_key(&Role::Sink));
}

#[test]
fn bounds_objective_and_reversibility() {
    let m = model();
    // ATP maintenance of 8.39 mmol/gDW/h and glucose uptake of 10 mmol/gDW/h:
    // the bounds of the published model (parameters R_ATPM_lower_bound and
    // R_EX_glc__D_e_lower_bound in the file).
    let atpm = reaction(&m, "R_ATPM");
    assert_eq!((atpm.lower_bound, atpm.upper_bound), (8.39, 1000.0));
    assert!(!atpm.is_reversible());
    let glc = reaction(&m, "R_EX_glc__D_e");
    assert_eq!((glc.lower_bound, glc.upper_bound), (-10.0, 1000.0));
    // R_FORt: reversible="true" in the file, yet bounds [-1000, 0]: in gibbsite
    // "reversible" follows the bounds, so it is not.
    let fort = reaction(&m, "R_FORt");
    assert!(!fort.is_reversible());
    assert_eq!((fort.lower_bound, fort.upper_bound), (-1000.0, 0.0));
    // 47 reactions are reversible="true" in the file; R_FORt's bounds allow one
    // direction only, leaving 46 whose bounds allow both.
    assert_eq!(m.reactions.iter().filter(|r| r.is_reversible()).count(), 46);
    // Objective: maximise the biomass reaction with coefficient 1.
    let biomass = m.reaction_index("R_BIOMASS_Ecoli_core_w_GAM").unwrap();
    assert_eq!(m.objective, vec![(biomass, 1.0)]);
}

#[test]
fn metabolites_formulas_charges_xrefs() {
    let m = model();
    let glc = &m.metabolites[m.metabolite_index("M_glc__D_e").unwrap()];
    assert_eq!(glc.name, "D-Glucose");
    assert_eq!(m.compartments[glc.compartment].id, "e");
    assert_eq!(glc.formula.as_deref(), Some("C6H12O6"));
    assert_eq!(glc.charge, Some(0));
    assert_eq!(glc.sbo.as_deref(), Some("SBO:0000247"));
    assert_eq!(glc.xrefs["kegg.compound"], vec!["C00031"]);
    assert_eq!(glc.xrefs["metanetx.chemical"], vec!["MNXM41"]);
    assert_eq!(glc.xrefs["inchikey"], vec!["WQZGKKKJIJFFOK-GASJEMHNSA-N"]);
    assert_eq!(glc.xrefs["bigg.metabolite"], vec!["glc__D"]);
    assert_eq!(
        glc.xrefs["chebi"],
        vec!["CHEBI:12965", "CHEBI:20999", "CHEBI:4167", "CHEBI:17634"]
    );
    // ATP as in BiGG: C10H12N5O13P3, charge -4.
    let atp = &m.metabolites[m.metabolite_index("M_atp_c").unwrap()];
    assert_eq!(
        (atp.formula.as_deref(), atp.charge),
        (Some("C10H12N5O13P3"), Some(-4))
    );
    // H+ and water in both compartments are recognised.
    let special = |s: Special| -> Vec<&str> {
        m.metabolites
            .iter()
            .filter(|x| x.special == s)
            .map(|x| x.id.as_str())
            .collect()
    };
    assert_eq!(special(Special::Proton), vec!["M_h_c", "M_h_e"]);
    assert_eq!(special(Special::Water), vec!["M_h2o_c", "M_h2o_e"]);
    // Reaction cross references: PFK is EC 2.7.1.11 (file annotation).
    let pfk = reaction(&m, "R_PFK");
    assert_eq!(pfk.xrefs["ec-code"], vec!["2.7.1.11"]);
    assert_eq!(pfk.xrefs["bigg.reaction"], vec!["PFK"]);
}

#[test]
fn stoichiometry_of_pfk() {
    let m = model();
    // R_PFK: M_atp_c + M_f6p_c -> M_adp_c + M_fdp_c + M_h_c (file).
    let pfk = reaction(&m, "R_PFK");
    let mut named: Vec<(&str, f64)> = pfk
        .stoichiometry
        .iter()
        .map(|&(i, c)| (m.metabolites[i].id.as_str(), c))
        .collect();
    named.sort_by(|a, b| a.0.cmp(b.0));
    assert_eq!(
        named,
        vec![
            ("M_adp_c", 1.0),
            ("M_atp_c", -1.0),
            ("M_f6p_c", -1.0),
            ("M_fdp_c", 1.0),
            ("M_h_c", 1.0)
        ]
    );
    // Model invariant: sorted by metabolite index, no zeros.
    for r in &m.reactions {
        assert!(
            r.stoichiometry.windows(2).all(|w| w[0].0 < w[1].0),
            "{}",
            r.id
        );
        assert!(r.stoichiometry.iter().all(|&(_, c)| c != 0.0), "{}", r.id);
    }
}

#[test]
fn every_internal_reaction_is_balanced() {
    let m = model();
    // The file balances every reaction in atoms and charge except the 20
    // exchanges and the biomass reaction (checked by an independent count over
    // the SBML file, and by the model's authors' design).
    assert!(
        balance::findings(&m).is_empty(),
        "{:#?}",
        balance::findings(&m)
    );
    let unbalanced: Vec<&str> = (0..m.reactions.len())
        .filter(|&r| {
            let b = balance::reaction_imbalance(&m, r);
            !(b.is_mass_balanced() && b.is_charge_balanced())
        })
        .map(|r| m.reactions[r].id.as_str())
        .collect();
    let mut expected: Vec<&str> = m
        .reactions
        .iter()
        .filter(|r| r.role == Role::Exchange || r.role == Role::Biomass)
        .map(|r| r.id.as_str())
        .collect();
    expected.sort_unstable();
    let mut unbalanced_sorted = unbalanced.clone();
    unbalanced_sorted.sort_unstable();
    assert_eq!(unbalanced_sorted, expected);
    assert_eq!(unbalanced.len(), 21);
    // An exchange carries its metabolite out: R_EX_h_e removes one H+.
    let ex_h = m.reaction_index("R_EX_h_e").unwrap();
    assert_eq!(
        balance::reaction_imbalance(&m, ex_h).text(),
        "H: -1, charge: -1"
    );
}

#[test]
fn plain_and_gzipped_give_the_same_model() {
    let mut text = String::new();
    flate2::read::GzDecoder::new(std::fs::File::open(data_file()).unwrap())
        .read_to_string(&mut text)
        .unwrap();
    let plain = parse_sbml(&text, Path::new("e_coli_core.xml")).unwrap();
    assert_eq!(plain, model());
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("e_coli_core.xml");
    std::fs::write(&path, &text).unwrap();
    assert_eq!(read_sbml(&path).unwrap(), plain);
}
