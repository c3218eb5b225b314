//! The published genome-scale models in ../shared/models (or
//! `$GIBBSITE_MODELS_DIR`) import without error, when that folder exists;
//! otherwise each test prints that it skipped.
//!
//! Sizes: shared/models/README.md (e_coli_core: Orth, Fleming & Palsson,
//! EcoSal Plus 2010; iML1515: Monk et al., Nat. Biotechnol. 35 (2017) 904;
//! Recon3D: Brunk et al., Nat. Biotechnol. 36 (2018) 272). Role counts are
//! the SBO terms of the files (SBO:0000627/628/629/632). Balance counts were
//! made by an independent count over the SBML files (a short script reading
//! formulas and charges, skipping boundary and biomass reactions).

use gibbsite::checks::balance;
use gibbsite::model::{Model, Role};
use std::collections::BTreeMap;

mod common;
use common::shared_model;

fn role_counts(m: &Model) -> BTreeMap<Role, usize> {
    let mut counts = BTreeMap::new();
    for r in &m.reactions {
        *counts.entry(r.role).or_insert(0) += 1;
    }
    counts
}

fn finding_counts(m: &Model) -> BTreeMap<String, usize> {
    let mut counts = BTreeMap::new();
    for f in balance::findings(m) {
        *counts.entry(f.kind).or_insert(0) += 1;
    }
    counts
}

#[test]
fn e_coli_core_imports() {
    let Some(m) = shared_model("e_coli_core.xml.gz") else {
        return;
    };
    assert_eq!((m.reactions.len(), m.metabolites.len()), (95, 72));
    assert!(finding_counts(&m).is_empty());
}

#[test]
fn iml1515_imports() {
    let Some(m) = shared_model("iML1515.xml.gz") else {
        return;
    };
    assert_eq!((m.reactions.len(), m.metabolites.len()), (2712, 1877));
    assert_eq!(m.compartments.len(), 3);
    assert_eq!(
        role_counts(&m),
        BTreeMap::from([
            (Role::Internal, 2373),
            (Role::Exchange, 331),
            (Role::Demand, 6),
            (Role::Biomass, 2),
        ])
    );
    // No internal reaction is unbalanced; 173 hold a generic group (R, X).
    assert_eq!(
        finding_counts(&m),
        BTreeMap::from([("unbalance-unchecked".to_string(), 173)])
    );
    let biomass = m
        .reaction_index("R_BIOMASS_Ec_iML1515_core_75p37M")
        .unwrap();
    assert_eq!(m.objective, vec![(biomass, 1.0)]);
}

#[test]
fn recon3d_imports() {
    let Some(m) = shared_model("Recon3D.xml.gz") else {
        return;
    };
    assert_eq!((m.reactions.len(), m.metabolites.len()), (10600, 5835));
    assert_eq!(m.compartments.len(), 9);
    assert_eq!(
        role_counts(&m),
        BTreeMap::from([
            (Role::Internal, 8791),
            (Role::Exchange, 1560),
            (Role::Demand, 145),
            (Role::Sink, 101),
            (Role::Biomass, 3),
        ])
    );
    // Recon3D as distributed gives H+ the charge 0 in every compartment, so
    // most reactions that move a proton come out charge-unbalanced.
    assert_eq!(
        finding_counts(&m),
        BTreeMap::from([
            ("charge-imbalance".to_string(), 2930),
            ("mass-imbalance".to_string(), 60),
            ("unbalance-unchecked".to_string(), 1020),
        ])
    );
    let h_c = &m.metabolites[m.metabolite_index("M_h_c").unwrap()];
    assert_eq!((h_c.formula.as_deref(), h_c.charge), (Some("H"), Some(0)));
    assert_eq!(h_c.special, gibbsite::model::Special::Proton);
    // The species without a formula (M_protein_c) makes its reactions unchecked.
    assert_eq!(
        m.metabolites.iter().filter(|x| x.formula.is_none()).count(),
        1
    );
}

/// A missing model skips visibly outside CI and fails under CI=true (the
/// rule for every test that needs ../shared/models).
#[test]
fn missing_models_skip_outside_ci_and_fail_in_ci() {
    let absent = std::path::Path::new("/nonexistent/gibbsite/model.xml.gz");
    assert_eq!(common::missing_model(absent, false), None);
    let in_ci = std::panic::catch_unwind(|| common::missing_model(absent, true));
    let message = in_ci.expect_err("CI must fail on a missing model");
    let text = message
        .downcast_ref::<String>()
        .cloned()
        .unwrap_or_default();
    assert!(text.contains("CI=true"), "{text}");
}
