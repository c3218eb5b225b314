//! The coverage view: counts on the demo against a hand count, and the CSV
//! export read back as a side table.

use gibbsite::Project;
use std::path::Path;

fn demo() -> Project {
    Project::load(&Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside")).unwrap()
}

/// Hand count from projects/lakeside/model.yaml: 32 reactions, 7 of them
/// boundary (EX_glc_e, EX_lac_e, EX_etoh_e, EX_co2_e, EX_h_e, DM_stor_c,
/// DM_plcC_c), so 25 internal; STOR lacks ΔfG'° of stor_c, so 24 have ΔrG'°.
/// By strongest source among the terms (model formation_energy > species >
/// library):
/// * library: GLCt (glc_e, glc_c both `library: glucose`) = 1;
/// * species: LACt, ETOHt, CO2t (lactate, ethanol, CO2 species; H⁺ fixed) = 3;
/// * model: HEX, PGI, PFK, FBP, FBA, TPI, GAPD, PGK, PGM, ENO, PYK, LDH,
///   PDC, ADH, PEPS, ATPS, ATPM, and the pigment steps PLC1–PLC3 (their
///   own `reaction_energy`) = 20.
///
/// Compartments: every internal reaction touches c (25, 24 with ΔrG'°);
/// e is touched by the four transports and ATPS (h_e) = 5, all with ΔrG'°.
/// Groups: glycolysis 10/10, transport 4/4, fermentation 3/3,
/// gluconeogenesis 2/2 (FBP, PEPS), energy 1/1, upkeep 1/1, pigment 3/3,
/// storage 0/1.
#[test]
fn demo_coverage_equals_the_hand_count() {
    let report = demo().analyse();
    let c = report.coverage.as_ref().unwrap();
    assert_eq!((c.internal_reactions, c.with_energy), (25, 24));
    let by_source: Vec<(&str, usize)> = c
        .by_source
        .iter()
        .map(|s| (s.source.as_str(), s.reactions))
        .collect();
    assert_eq!(
        by_source,
        [
            ("side-table", 0),
            ("model", 20),
            ("species", 3),
            ("library", 1),
            ("transport-rule", 0),
            ("conditions", 0)
        ]
    );
    let groups = |v: &[gibbsite::report::GroupCoverageView]| -> Vec<(String, usize, usize)> {
        v.iter()
            .map(|g| (g.label.clone(), g.with_energy, g.reactions))
            .collect()
    };
    assert_eq!(
        groups(&c.by_compartment),
        [("c".to_string(), 24, 25), ("e".to_string(), 5, 5)]
    );
    let g = groups(&c.by_group);
    let expected = [
        ("energy", 1, 1),
        ("fermentation", 3, 3),
        ("gluconeogenesis", 2, 2),
        ("glycolysis", 10, 10),
        ("pigment", 3, 3),
        ("storage", 0, 1),
        ("transport", 4, 4),
        ("upkeep", 1, 1),
    ];
    assert_eq!(
        g,
        expected
            .iter()
            .map(|&(l, a, b)| (l.to_string(), a, b))
            .collect::<Vec<_>>()
    );
    assert_eq!(c.missing.len(), 1);
    let m = &c.missing[0];
    assert_eq!(
        (m.metabolite.as_str(), m.blocks, m.only_gap),
        ("stor_c", 1, 1)
    );
}

#[test]
fn the_export_reads_back_as_a_side_table() {
    let project = demo();
    let report = project.analyse();
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("site");
    gibbsite::site::render(&report, None, &out).unwrap();
    let csv = std::fs::read_to_string(out.join("missing-energies.csv")).unwrap();
    assert!(csv.contains("\nmetabolite,dfg,sigma,source,ph,ionic_strength\n"));
    assert!(csv.contains("\n# 1. stor_c \"lakeglucan (storage polymer unit)\" in c, C6H10O5: blocks 1 reaction, the only gap in 1\nstor_c,,,,,\n"));
    let page = std::fs::read_to_string(out.join("coverage.html")).unwrap();
    assert!(page.contains("href=\"missing-energies.csv\""));
    assert!(std::fs::read_to_string(out.join("index.html"))
        .unwrap()
        .contains("href=\"coverage.html\""));

    // As exported (empty values): accepted, and changes nothing.
    let empty = dir.path().join("empty.csv");
    std::fs::write(&empty, &csv).unwrap();
    let mut again = demo();
    again.add_tables(&[empty]).unwrap();
    assert_eq!(again.model, project.model);
    // Filled in (an invented demo value): STOR gets its ΔrG'°.
    let filled = dir.path().join("filled.csv");
    std::fs::write(
        &filled,
        csv.replace("stor_c,,,,,", "stor_c,-662.0,2.0,demo value,,"),
    )
    .unwrap();
    let mut again = demo();
    again.add_tables(&[filled]).unwrap();
    let c = again.analyse().coverage.unwrap();
    assert_eq!((c.with_energy, c.missing.len()), (25, 0));
    assert_eq!(c.by_source[0].reactions, 1, "STOR counts under side table");
}
