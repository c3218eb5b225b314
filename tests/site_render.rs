//! Rendering a hand-built Report into a site: files, links, escaping, the
//! ΔG' bar, theme overrides, all-or-nothing output and determinism.
//!
//! The report is fixture data for the renderer (no analysis runs here).
//! Only the ATP hydrolysis ΔrG'° is a published value; every other number is
//! invented for the test. The last tests render the demo project through
//! the library API and check that site too.

use gibbsite::report::*;
use gibbsite::site::{render, theme::DEFAULT_THEME, write::MARKER_FILE};
use gibbsite::slug::slug;
use gibbsite::Error;
use std::collections::BTreeMap;
use std::fs;
use std::path::{Component, Path, PathBuf};

const HOSTILE_REACTION: &str = "R_<b>&\"'../x";
const HOSTILE_METABOLITE: &str = "M_<b>&\"'../evil";
const CAUTION: &str = "ΔG estimates carry uncertainty; a flagged contradiction is a prompt for \
expert review against measurements and the literature, not a verdict on the biology.";
/// A species label and a compartment name full of HTML and quotes: they
/// may only reach the SVG charts as escaped text, never inside attributes.
const HOSTILE_SPECIES: &str = "A- \"<b>base</b>\"";
const HOSTILE_COMPARTMENT: &str = "peri\"<b>plasm</b>";
/// pK of the invented weak acid HA ⇌ A⁻ + H⁺ and the pH of its compartment.
const ACID_PK: f64 = 7.0;
const PERIPLASM_PH: f64 = 7.5;

/// ATP + H2O = ADP + Pi at 298.15 K, pH 7, I = 0.25 M: ΔrG'° = −36.0353 kJ/mol
/// (Alberty 2003, Thermodynamics of Biochemical Reactions, printed p. 220).
const ATP_HYDROLYSIS_DRG: f64 = -36.0353;

fn energy(value_kj: f64, sigma_kj: f64, source: &str) -> Option<EnergyView> {
    Some(EnergyView {
        value_kj,
        sigma_kj,
        source: source.into(),
    })
}

fn participant(id: &str, name: &str, coefficient: f64) -> ParticipantView {
    ParticipantView {
        metabolite: id.into(),
        slug: slug(id),
        name: name.into(),
        coefficient,
    }
}

fn metabolite(id: &str, name: &str, consumed: &[&str], produced: &[&str]) -> MetaboliteView {
    MetaboliteView {
        id: id.into(),
        slug: slug(id),
        name: name.into(),
        compartment: "c".into(),
        formula: Some("C10H12N5O13P3".into()),
        charge: Some(-4),
        dfg_prime: energy(-2292.61, 1.5, "invented"),
        energy_origin: Some("library".into()),
        concentration_m: RangeView {
            min: 1e-6,
            max: 0.02,
        },
        concentration_is_default: true,
        measured_m: None,
        special: String::new(),
        xrefs: BTreeMap::new(),
        consumed_by: consumed.iter().map(|s| s.to_string()).collect(),
        produced_by: produced.iter().map(|s| s.to_string()).collect(),
        library_key: None,
        energy_problem: None,
        species: None,
    }
}

fn finding(
    kind: &str,
    severity: Severity,
    subjects: &[&str],
    scenario: Option<&str>,
    message: &str,
) -> Finding {
    Finding {
        kind: kind.into(),
        severity,
        subjects: subjects.iter().map(|s| s.to_string()).collect(),
        scenario: scenario.map(str::to_owned),
        message: message.into(),
        evidence: BTreeMap::from([("dg_max".to_string(), -20.0), ("dg_min".to_string(), -60.0)]),
    }
}

/// Mole fraction of the base A⁻ of an acid with pK `pk` at `ph`:
/// 1 / (1 + 10^(pK − pH)) (Henderson–Hasselbalch, common practice).
fn base_fraction(pk: f64, ph: f64) -> f64 {
    1.0 / (1.0 + 10f64.powf(pk - ph))
}

/// The invented weak acid in the periplasm: HA and A⁻ with pK 7, plus a
/// magnesium complex left out (no pMg), so it is neither counted nor drawn.
fn acid_species() -> SpeciesView {
    let base = base_fraction(ACID_PK, PERIPLASM_PH);
    SpeciesView {
        entries: vec![
            SpeciesEntryView {
                label: "HA".into(),
                charge: 0,
                hydrogens: 4,
                magnesium: 0,
                dfg0_kj: -339.96,
                dfh0_kj: Some(-480.5),
                dfg_prime_kj: Some(-20.0),
                fraction: 1.0 - base,
            },
            SpeciesEntryView {
                label: HOSTILE_SPECIES.into(),
                charge: -1,
                hydrogens: 3,
                magnesium: 0,
                dfg0_kj: -300.0,
                dfh0_kj: None,
                dfg_prime_kj: Some(-22.85),
                fraction: base,
            },
            SpeciesEntryView {
                label: "MgA+".into(),
                charge: 1,
                hydrogens: 3,
                magnesium: 1,
                dfg0_kj: -760.0,
                dfh0_kj: None,
                dfg_prime_kj: None,
                fraction: 0.0,
            },
        ],
        ph: PERIPLASM_PH,
        ionic_strength_m: 0.1,
        temperature_k: 298.15,
        pmg: None,
        mean_hydrogens: 4.0 - base,
        mean_charge: -base,
        // The sum over the two counted species, −RT ln Σ exp(−ΔfG'°ᵢ/RT)
        // (Alberty 2003), as the report builder would give it.
        reactant_dfg_prime_kj: {
            let rt = gibbsite::thermo::constants::R_KJ * 298.15;
            Some(-rt * ((20.0 / rt).exp() + (22.85 / rt).exp()).ln())
        },
        // pH 4, 4.5, …, 10 as the report builder would give them.
        curve: (0..=12)
            .map(|k| {
                let ph = 4.0 + 0.5 * k as f64;
                let base = base_fraction(ACID_PK, ph);
                CurvePoint {
                    ph,
                    fractions: vec![1.0 - base, base, 0.0],
                }
            })
            .collect(),
        provenance: vec!["HA: invented <b>for the test</b>".into()],
    }
}

fn energy_term(
    id: &str,
    compartment: &str,
    coefficient: f64,
    dfg: f64,
    sigma: f64,
    origin: &str,
) -> EnergyTermView {
    EnergyTermView {
        metabolite: id.into(),
        slug: slug(id),
        compartment: compartment.into(),
        coefficient,
        dfg_prime_kj: dfg,
        sigma_kj: sigma,
        origin: origin.into(),
    }
}

fn loop_member(
    id: &str,
    name: &str,
    coefficient: f64,
    drg0_kj: Option<(f64, f64)>,
    participants: &[(&str, f64)],
) -> LoopMemberView {
    LoopMemberView {
        reaction: id.into(),
        slug: slug(id),
        name: name.into(),
        equation: format!("equation of {id}"),
        coefficient,
        drg0_kj: drg0_kj.map(|(v, _)| v),
        sigma_kj: drg0_kj.map(|(_, s)| s),
        participants: participants
            .iter()
            .map(|&(m, c)| participant(m, m, c))
            .collect(),
    }
}

/// σ of ΔrG'° of the fixture's reactions (invented, as above).
const HAT_DRG: (f64, f64) = (5.3245, 0.8485);
const HOSTILE_DRG: (f64, f64) = (12.5, 2.0);

/// Two loops over the fixture's reactions. Their participants are invented
/// to chain into cycles (they are not the reactions' equations):
/// loop-10: HAT turns ADP + Pi into the hostile metabolite, the hostile
/// reaction run backward turns that into ATP, ATPH hydrolyses it again;
/// its ΔrG'° do not add up to zero. loop-2 has UNK, which lacks ΔrG'°.
/// Listed out of loop order, and loop-10 before loop-2, as analysis might.
fn loops_view() -> LoopsView {
    let constraint =
        |reaction: &str, forbid: &str, breaks: Option<bool>, still: &[&str]| ConstraintView {
            reaction: reaction.into(),
            slug: slug(reaction),
            forbid: forbid.into(),
            dg_min_kj: 2.5,
            basis: "range".into(),
            breaks_loop: breaks,
            still_looping: still.iter().map(|s| s.to_string()).collect(),
        };
    let loop10 = LoopView {
        id: "loop-10".into(),
        members: vec![
            loop_member(
                "ATPH",
                "ATP hydrolysis",
                1.0,
                Some((ATP_HYDROLYSIS_DRG, 0.5)),
                &[("atp_c", -1.0), ("adp_c", 1.0), ("pi_c", 1.0)],
            ),
            loop_member(
                HOSTILE_REACTION,
                "<b>bold</b> & \"quoted\"",
                -1.0,
                Some(HOSTILE_DRG),
                &[("atp_c", -1.0), (HOSTILE_METABOLITE, 1.0)],
            ),
            loop_member(
                "HAT",
                "acid–proton symport",
                1.0,
                Some(HAT_DRG),
                &[("adp_c", -1.0), ("pi_c", -1.0), (HOSTILE_METABOLITE, 1.0)],
            ),
        ],
        metabolites: vec![
            "adp_c".into(),
            "atp_c".into(),
            "pi_c".into(),
            HOSTILE_METABOLITE.into(),
        ],
        reversible: false,
        verified: true,
        // −36.0353 + 12.5 × (−1) + 5.3245 = −43.2108; σ = √(0.5² + 2² + 0.8485²).
        drg0_sum_kj: Some(ATP_HYDROLYSIS_DRG - HOSTILE_DRG.0 + HAT_DRG.0),
        sigma_kj: Some((0.25f64 + 4.0 + 0.8485 * 0.8485).sqrt()),
        members_without_data: vec![],
        inconsistent: true,
        constrain: Some(constraint("HAT", "forward", Some(true), &[])),
        constrain_reversed: None,
    };
    let loop2 = LoopView {
        id: "loop-2".into(),
        members: vec![
            loop_member(
                "HAT",
                "acid–proton symport",
                -1.0,
                Some(HAT_DRG),
                &[(HOSTILE_METABOLITE, -1.0), ("pi_c", 1.0)],
            ),
            loop_member(
                "UNK",
                "Unknown energy",
                1.0,
                None,
                &[(HOSTILE_METABOLITE, -1.0), ("pi_c", 1.0)],
            ),
        ],
        metabolites: vec!["pi_c".into(), HOSTILE_METABOLITE.into()],
        reversible: false,
        verified: false,
        drg0_sum_kj: None,
        sigma_kj: None,
        members_without_data: vec!["UNK".into()],
        inconsistent: false,
        constrain: Some(constraint("HAT", "backward", Some(false), &["UNK"])),
        constrain_reversed: None,
    };
    LoopsView {
        error: None,
        shut_reactions: 3,
        relaxed_bounds: vec![RelaxedBoundView {
            reaction: "ATPH".into(),
            slug: slug("ATPH"),
            lower_bound: 2.0,
            upper_bound: 1000.0,
            relaxed_lower_bound: 0.0,
            relaxed_upper_bound: 1000.0,
        }],
        reactions_after_pruning: 4,
        pruned_reactions: 7,
        capable: [
            ("UNK", true, false),
            ("ATPH", true, false),
            ("HAT", true, true),
            (HOSTILE_REACTION, false, true),
        ]
        .iter()
        .map(|&(r, forward, backward)| CapableView {
            reaction: r.into(),
            slug: slug(r),
            forward,
            backward,
        })
        .collect(),
        loops: vec![loop10, loop2],
        truncated: false,
        limit: Some(5000),
        uncovered: vec![],
        energy_cycles: vec![
            EnergyCycleView {
                id: Some("cycle-0123456789".into()),
                currency: "atp".into(),
                compartment: "c".into(),
                equation: "atp_c -> adp_c + pi_c".into(),
                named_equation: "ATP → ADP + phosphate".into(),
                slug: "cycle-atp-c".into(),
                cycle_exists: true,
                trivial: false,
                example: vec![
                    loop_member("HAT", "acid–proton symport", 1.0, Some(HAT_DRG), &[]),
                    loop_member(HOSTILE_REACTION, "hostile", -1.0, Some(HOSTILE_DRG), &[]),
                ],
            },
            EnergyCycleView {
                id: None,
                currency: "nadh".into(),
                compartment: "c".into(),
                equation: "nadh_c -> nad_c + h_c".into(),
                named_equation: "NADH → NAD+ + H+".into(),
                slug: "cycle-nadh-c".into(),
                cycle_exists: false,
                trivial: false,
                example: vec![],
            },
        ],
        not_testable: vec!["gtp".into()],
        not_used: vec!["atp in e".into()],
    }
}

/// 4 reactions, 6 metabolites in 2 compartments, findings of every
/// severity (three about loops), one note with raw HTML, two loops, and ids
/// full of HTML and path characters.
fn fixture() -> Report {
    let atph = ReactionView {
        id: "ATPH".into(),
        slug: slug("ATPH"),
        name: "ATP hydrolysis".into(),
        equation: "atp_c -> adp_c + pi_c".into(),
        participants: vec![
            participant("atp_c", "ATP", -1.0),
            participant("adp_c", "ADP", 1.0),
            participant("pi_c", "phosphate", 1.0),
        ],
        reversible: true,
        lower_bound: -1000.0,
        upper_bound: 1000.0,
        role: "internal".into(),
        group: Some("energy".into()),
        drg_prime: energy(ATP_HYDROLYSIS_DRG, 0.5, "Alberty 2003, p. 220"),
        energy_origin: Some("reaction".into()),
        k_prime: Some(2.05e6),
        dg_range: Some(RangeView {
            min: -60.0,
            max: -20.0,
        }),
        dg_measured: Some(-45.0),
        forward_verdict: Some(Verdict::Consistent),
        backward_verdict: Some(Verdict::Contradiction),
        scenario_verdicts: vec![ScenarioVerdictView {
            scenario: "growth".into(),
            flux: -2.5,
            verdict: Verdict::Contradiction,
            alone_only: false,
        }],
        missing_data: vec![],
        missing_reasons: vec![],
        energy_terms: vec![],
        transport: None,
        loop_capable: Some("forward".into()),
        loops: vec!["loop-10".into()],
        xrefs: Default::default(),
    };
    let hostile = ReactionView {
        id: HOSTILE_REACTION.into(),
        slug: slug(HOSTILE_REACTION),
        name: "<b>bold</b> & \"quoted\" 'single'".into(),
        equation: format!("adp_c -> {HOSTILE_METABOLITE}"),
        participants: vec![
            participant("adp_c", "ADP", -2.0),
            participant(HOSTILE_METABOLITE, "<b>evil</b>", 1.0),
        ],
        reversible: true,
        lower_bound: -10.0,
        upper_bound: 10.0,
        role: "internal".into(),
        group: None,
        drg_prime: energy(12.5, 2.0, "<b>invented</b>"),
        energy_origin: Some("formation".into()),
        k_prime: Some(6.46e-3),
        dg_range: Some(RangeView {
            min: -10.0,
            max: 30.0,
        }),
        dg_measured: None,
        forward_verdict: Some(Verdict::Marginal),
        backward_verdict: Some(Verdict::Consistent),
        scenario_verdicts: vec![],
        missing_data: vec![],
        missing_reasons: vec![],
        energy_terms: vec![],
        transport: None,
        loop_capable: Some("backward".into()),
        loops: vec!["loop-10".into()],
        xrefs: Default::default(),
    };
    let unknown = ReactionView {
        id: "UNK".into(),
        slug: slug("UNK"),
        name: "Unknown energy".into(),
        equation: format!("{HOSTILE_METABOLITE} -> pi_c"),
        participants: vec![
            participant(HOSTILE_METABOLITE, "<b>evil</b>", -1.0),
            participant("pi_c", "phosphate", 1.0),
        ],
        reversible: false,
        lower_bound: 0.0,
        upper_bound: 1000.0,
        role: "internal".into(),
        group: None,
        drg_prime: None,
        energy_origin: None,
        k_prime: None,
        dg_range: None,
        dg_measured: None,
        forward_verdict: Some(Verdict::NoData),
        backward_verdict: None,
        scenario_verdicts: vec![],
        missing_data: vec![HOSTILE_METABOLITE.into()],
        missing_reasons: vec!["pi_c: species data lack ΔfH° away from 298.15 K".into()],
        energy_terms: vec![],
        transport: None,
        loop_capable: Some("forward".into()),
        loops: vec!["loop-2".into()],
        xrefs: Default::default(),
    };
    // Symport of the acid with a proton into the cytosol. Terms in the
    // report's order (products first); the page lists the consumed first.
    let hat = ReactionView {
        id: "HAT".into(),
        slug: slug("HAT"),
        name: "acid–proton symport".into(),
        equation: "ha_p + h_p -> ha_c + h_c".into(),
        participants: vec![
            participant("ha_c", "acid", 1.0),
            participant("h_c", "H+", 1.0),
            participant("ha_p", "acid", -1.0),
            participant("h_p", "H+", -1.0),
        ],
        reversible: true,
        lower_bound: -10.0,
        upper_bound: 10.0,
        role: "internal".into(),
        group: Some("transport".into()),
        drg_prime: energy(5.3245, 0.8485, "Σ ν·ΔfG'°"),
        energy_origin: Some("formation".into()),
        k_prime: Some(0.1166),
        dg_range: Some(RangeView {
            min: -4.0,
            max: 14.0,
        }),
        dg_measured: None,
        forward_verdict: Some(Verdict::Consistent),
        backward_verdict: Some(Verdict::Consistent),
        scenario_verdicts: vec![],
        missing_data: vec![],
        missing_reasons: vec![],
        energy_terms: vec![
            energy_term("ha_c", "c", 1.0, -25.0, 0.6, "model"),
            energy_term("h_c", "c", 1.0, 0.0, 0.0, "fixed"),
            energy_term("ha_p", "p", -1.0, -23.53, 0.6, "species"),
            energy_term("h_p", "p", -1.0, 0.0, 0.0, "fixed"),
        ],
        transport: Some(TransportView {
            formation_sum_kj: -1.47,
            proton_term_kj: -2.854,
            electrical_term_kj: 9.6485,
            reference_independent: false,
        }),
        loop_capable: Some("both".into()),
        loops: vec!["loop-2".into(), "loop-10".into()],
        xrefs: Default::default(),
    };
    let mut acid_p = metabolite("ha_p", "weak acid", &["HAT"], &[]);
    acid_p.compartment = "p".into();
    acid_p.dfg_prime = energy(-23.53, 0.6, "invented species data");
    acid_p.energy_origin = Some("species".into());
    acid_p.library_key = Some("acid-library-key".into());
    acid_p.species = Some(acid_species());
    let mut acid_c = metabolite("ha_c", "weak acid", &[], &["HAT"]);
    acid_c.dfg_prime = energy(-25.0, 0.6, "invented");
    acid_c.energy_origin = Some("model".into());
    acid_c.energy_problem = Some("ACID-PROBLEM: the library entry lacks ΔfH°".into());
    let mut evil = metabolite(
        HOSTILE_METABOLITE,
        "<b>evil</b>",
        &["UNK"],
        &[HOSTILE_REACTION],
    );
    evil.dfg_prime = None;
    evil.energy_origin = None;
    evil.formula = Some("<b>C</b>".into());
    evil.xrefs = BTreeMap::from([("<b>db</b>".to_string(), vec!["<b>1</b>".to_string()])]);
    let mut atp = metabolite("atp_c", "ATP", &["ATPH"], &[]);
    atp.concentration_is_default = false;
    atp.concentration_m = RangeView {
        min: 1e-3,
        max: 1e-2,
    };
    atp.measured_m = Some(3e-3);
    atp.xrefs = BTreeMap::from([("chebi".to_string(), vec!["CHEBI:30616".to_string()])]);
    let findings = vec![
        finding(
            "direction-contradiction",
            Severity::Error,
            &["ATPH"],
            Some("growth"),
            "ATPH runs backward in scenario growth although ΔG' < 0 for all allowed concentrations.",
        ),
        finding(
            "unbalanced-reaction",
            Severity::Warning,
            &[HOSTILE_REACTION, HOSTILE_METABOLITE],
            None,
            "Reaction <b>x</b> is not mass balanced.",
        ),
        finding(
            "default-concentration",
            Severity::Note,
            &["atp_c", "loop-1"],
            None,
            "NOTE-ONLY-MESSAGE uses the default range.",
        ),
        finding(
            "internal-loop",
            Severity::Warning,
            &["loop-10", "HAT", HOSTILE_REACTION, "ATPH"],
            None,
            "LOOP-10-MESSAGE: 3 reactions form a loop.",
        ),
        finding(
            "inconsistent-cycle-energy",
            Severity::Error,
            &["loop-10", "HAT", HOSTILE_REACTION, "ATPH"],
            None,
            "ΔrG'° around loop-10 adds up to −43.21 instead of 0.",
        ),
        finding(
            "energy-generating-cycle",
            Severity::Error,
            &["atp in c", "HAT", HOSTILE_REACTION],
            None,
            "the model regenerates atp in c from nothing.",
        ),
    ];
    Report {
        schema_version: REPORT_SCHEMA_VERSION,
        tool: ToolInfo {
            name: "gibbsite".into(),
            version: "0.1.0".into(),
            generated: "2024-01-01T00:00:00Z".into(),
        },
        project: ProjectInfo {
            title: "Demo <b>project</b>".into(),
            model_id: "demo".into(),
            model_title: "Demo model".into(),
            temperature_k: 298.15,
            confidence: 0.95,
            sigma_multiplier: 1.96,
            min_driving_force_kj: 1.0,
            default_concentration_m: RangeView {
                min: 1e-6,
                max: 0.02,
            },
            caution: CAUTION.into(),
            map_side: Vec::new(),
            map_main: Vec::new(),
        },
        summary: Summary {
            reactions: 4,
            internal_reactions: 4,
            metabolites: 6,
            compartments: 2,
            scenarios: 1,
            errors: 3,
            warnings: 2,
            notes: 1,
            reactions_with_energy: 3,
            metabolites_with_energy: 5,
            by_kind: BTreeMap::from([
                ("default-concentration".to_string(), 1),
                ("direction-contradiction".to_string(), 1),
                ("energy-generating-cycle".to_string(), 1),
                ("inconsistent-cycle-energy".to_string(), 1),
                ("internal-loop".to_string(), 1),
                ("unbalanced-reaction".to_string(), 1),
            ]),
            checks: vec![CheckInfo {
                slug: "direction-contradiction".into(),
                title: "Flux directions".into(),
                description: "Directions that need ΔG' < 0 where the data say ΔG' > 0.".into(),
                kinds: vec!["direction-contradiction".into()],
                findings: 1,
            }],
        },
        findings,
        compartments: vec![
            CompartmentView {
                id: "p".into(),
                name: HOSTILE_COMPARTMENT.into(),
                ph: PERIPLASM_PH,
                ionic_strength_m: 0.1,
                potential_mv: 0.0,
                temperature_k: 298.15,
                pmg: None,
                conditions_stated: false,
                conditions_source: None,
            },
            CompartmentView {
                id: "c".into(),
                name: "cytosol".into(),
                ph: 7.0,
                ionic_strength_m: 0.25,
                potential_mv: -100.0,
                temperature_k: 298.15,
                pmg: Some(3.0),
                conditions_stated: true,
                conditions_source: Some("a lab notebook".into()),
            },
        ],
        metabolites: vec![
            metabolite("pi_c", "phosphate", &[], &["ATPH", "UNK"]),
            atp,
            metabolite("adp_c", "ADP", &[HOSTILE_REACTION], &["ATPH"]),
            evil,
            acid_p,
            acid_c,
        ],
        reactions: vec![unknown, atph, hat, hostile],
        scenarios: vec![ScenarioView {
            id: "growth".into(),
            description: "Aerobic growth (invented)".into(),
            active_reactions: 2,
            contradictions: 1,
            marginal: 0,
            at_equilibrium: 0,
            consistent: 1,
            no_data: 0,
            joint_verdict: None,
        }],
        notes: vec![NoteView {
            slug: "review".into(),
            title: "Review <notes>".into(),
            markdown: "# Review\n\nSome *emphasis*.\n\n<script>alert(1)</script>\n\n\
                       Inline <b>bold</b> tag.\n\n[ATP hydrolysis](../reactions/ATPH.html)\n\n\
                       ![remote picture](https://example.org/pic.png)\n"
                .into(),
        }],
        loops: Some(loops_view()),
        joint_scenarios: Vec::new(),
        coverage: None,
        headline: None,
        root_causes: Vec::new(),
    }
}

/// Every file below `dir`, by relative path with `/` separators.
fn read_tree(dir: &Path) -> BTreeMap<String, Vec<u8>> {
    fn walk(root: &Path, dir: &Path, out: &mut BTreeMap<String, Vec<u8>>) {
        for entry in fs::read_dir(dir).unwrap() {
            let path = entry.unwrap().path();
            if path.is_dir() {
                walk(root, &path, out);
            } else {
                let rel = path.strip_prefix(root).unwrap();
                let name = rel
                    .components()
                    .map(|c| c.as_os_str().to_str().unwrap())
                    .collect::<Vec<_>>()
                    .join("/");
                out.insert(name, fs::read(&path).unwrap());
            }
        }
    }
    let mut out = BTreeMap::new();
    walk(dir, dir, &mut out);
    out
}

fn html_pages(tree: &BTreeMap<String, Vec<u8>>) -> Vec<(&str, String)> {
    tree.iter()
        .filter(|(name, _)| name.ends_with(".html"))
        .map(|(name, bytes)| (name.as_str(), String::from_utf8(bytes.clone()).unwrap()))
        .collect()
}

/// Values of `attr="…"` in `html`, with the entities minijinja writes decoded.
fn attribute_values(html: &str, attr: &str) -> Vec<String> {
    let needle = format!(" {attr}=\"");
    let mut out = Vec::new();
    let mut rest = html;
    while let Some(start) = rest.find(&needle) {
        rest = &rest[start + needle.len()..];
        let end = rest.find('"').unwrap();
        out.push(
            rest[..end]
                .replace("&#x2f;", "/")
                .replace("&#x27;", "'")
                .replace("&quot;", "\"")
                .replace("&lt;", "<")
                .replace("&gt;", ">")
                .replace("&amp;", "&"),
        );
        rest = &rest[end..];
    }
    out
}

fn render_fixture(out: &Path) {
    render(&fixture(), None, out).expect("the fixture renders");
}

#[test]
fn all_expected_files_exist_and_nothing_else() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let tree = read_tree(&out);
    let mut expected: Vec<String> = [
        MARKER_FILE,
        "index.html",
        "findings.html",
        "kinds.html",
        "coverage.html",
        // How to read the pages (what every page would otherwise repeat).
        "guide.html",
        "report.json",
        // The one stylesheet and one script of every page, and their parts.
        "assets/site.css",
        "assets/site.js",
        "assets/style.css",
        "assets/pages.css",
        "assets/table.js",
        "assets/map.js",
        "assets/search.js",
        "assets/search-index.js",
        "assets/findings.js",
        // The full list of findings and the filters' data.
        "findings/list-1.html",
        "findings/data.js",
        // The maps' shared stylesheet and key.
        "assets/network-map.css",
        "assets/network-map-legend.svg",
        // Network maps: the fixture's groups (ATPH in `energy`, HAT in
        // `transport`, the rest without group), each also as SVG.
        "maps/index.html",
        "maps/index.svg",
        "maps/energy.html",
        "maps/energy.svg",
        "maps/transport.html",
        "maps/transport.svg",
        "maps/no-group.html",
        "maps/no-group.svg",
        "reactions/index.html",
        "reactions/ATPH.html",
        "reactions/UNK.html",
        "reactions/HAT.html",
        "metabolites/index.html",
        "metabolites/ha_p.html",
        "metabolites/ha_c.html",
        "metabolites/atp_c.html",
        "metabolites/adp_c.html",
        "metabolites/pi_c.html",
        "notes/index.html",
        "notes/review.html",
        "loops/index.html",
        "loops/loop-2.html",
        "loops/loop-10.html",
        "loops/cycle-atp-c.html",
    ]
    .iter()
    .map(|s| s.to_string())
    .collect();
    expected.push(format!("reactions/{}.html", slug(HOSTILE_REACTION)));
    expected.push(format!("metabolites/{}.html", slug(HOSTILE_METABOLITE)));
    expected.sort();
    assert_eq!(tree.keys().cloned().collect::<Vec<_>>(), expected);
    // report.json is the report itself, compact (the exact round trip of a
    // real report is in tests/report_json.rs; this hand-made fixture
    // repeats names inconsistently, so only its own rows are compared).
    let text = String::from_utf8(tree["report.json"].clone()).unwrap();
    assert_eq!(text, gibbsite::report::json::to_json(&fixture()));
    assert_eq!(text.lines().count(), 1, "no pretty-printing");
    let json: Report = gibbsite::report::json::from_json(&text).unwrap();
    assert_eq!(json.findings, fixture().findings);
    // A metabolite's uses come back from the participants, in report order
    // (the fixture lists them in another order).
    let uses_sorted = |mut metabolites: Vec<gibbsite::report::MetaboliteView>| {
        for m in &mut metabolites {
            m.consumed_by.sort();
            m.produced_by.sort();
        }
        metabolites
    };
    assert_eq!(
        uses_sorted(json.metabolites),
        uses_sorted(fixture().metabolites)
    );
    assert_eq!(json.reactions.len(), 4);
    // Nothing but the site was left next to it (no temporary folder).
    let siblings: Vec<_> = fs::read_dir(tmp.path())
        .unwrap()
        .map(|e| e.unwrap().file_name())
        .collect();
    assert_eq!(siblings, vec![std::ffi::OsString::from("site")]);
}

#[test]
fn every_local_link_points_to_an_existing_file_and_anchor() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let tree = read_tree(&out);
    check_links(&tree);
    let pages = html_pages(&tree);
    let atph = &pages
        .iter()
        .find(|(n, _)| *n == "reactions/ATPH.html")
        .unwrap()
        .1;
    assert!(atph.contains(r#"href="../assets/site.css""#));
    assert!(atph.contains(r#"href="../metabolites/atp_c.html""#));
}

/// Every href/src of every page resolves to a file of the site (and to an
/// element id when it has a fragment); remote links only in notes.
fn check_links(tree: &BTreeMap<String, Vec<u8>>) {
    let pages = html_pages(tree);
    let ids: BTreeMap<&str, Vec<String>> = pages
        .iter()
        .map(|(name, html)| (*name, attribute_values(html, "id")))
        .collect();
    let mut checked = 0;
    for (name, html) in &pages {
        // Links are written plainly, never with entity-escaped slashes.
        assert!(!html.contains("href=\"..&#x2f;"), "{name}: escaped link");
        assert!(!html.contains("&#x2f;index.html"), "{name}: escaped link");
        let dir: PathBuf = Path::new(name).parent().unwrap().to_path_buf();
        let mut targets: Vec<(&str, String)> = attribute_values(html, "href")
            .into_iter()
            .map(|v| ("href", v))
            .collect();
        targets.extend(
            attribute_values(html, "src")
                .into_iter()
                .map(|v| ("src", v)),
        );
        for (attr, target) in targets {
            if target.starts_with("https://") || target.starts_with("http://") {
                // Only a user's own Markdown link may leave the site, and
                // only as a link the reader clicks, never as a loaded resource.
                assert_eq!(attr, "href", "{name}: remote {attr} {target}");
                assert!(name.starts_with("notes/"), "{name}: remote link {target}");
                continue;
            }
            assert!(
                !target.contains(':'),
                "{name}: link with a scheme: {target}"
            );
            assert!(!target.starts_with('/'), "{name}: absolute link {target}");
            let (path, fragment) = target.split_once('#').unwrap_or((&target, ""));
            let resolved = if path.is_empty() {
                name.to_string()
            } else {
                let mut parts: Vec<String> = dir
                    .components()
                    .map(|c| c.as_os_str().to_str().unwrap().to_owned())
                    .collect();
                for c in Path::new(path).components() {
                    match c {
                        Component::ParentDir => {
                            assert!(parts.pop().is_some(), "{name}: {target} leaves the site");
                        }
                        Component::Normal(p) => parts.push(p.to_str().unwrap().to_owned()),
                        other => panic!("{name}: unexpected path part {other:?} in {target}"),
                    }
                }
                parts.join("/")
            };
            assert!(
                tree.contains_key(&resolved),
                "{name}: broken link {target} → {resolved}"
            );
            if !fragment.is_empty() {
                let page_ids = &ids[resolved.as_str()];
                assert!(
                    page_ids.iter().any(|id| id == fragment),
                    "{name}: missing anchor {target}"
                );
            }
            checked += 1;
        }
    }
    // The check must actually have looked at links: every page has the
    // stylesheet, script, navigation and footer links at least.
    assert!(checked >= 10 * pages.len(), "only {checked} links checked");
}

#[test]
fn model_strings_are_escaped_everywhere() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let tree = read_tree(&out);
    for (name, html) in html_pages(&tree) {
        assert!(!html.contains("<b>"), "{name} contains a raw <b> tag");
        assert!(!html.contains("</b>"), "{name} contains a raw </b> tag");
        assert!(
            !html.contains("<script>alert"),
            "{name} contains the note's script"
        );
        // Our own script tag (the one bundle of tables, map zoom and search;
        // on findings.html also the filter data and script) are the only ones.
        let ours = if name == "findings.html" { 3 } else { 1 };
        assert_eq!(html.matches("<script").count(), ours, "{name}");
        assert!(html.contains(CAUTION), "{name} lacks the caution");
    }
    for name in tree.keys() {
        assert!(
            name.split('/')
                .all(|part| part != ".." && !part.contains('<') && !part.contains('"')),
            "unsafe file name {name}"
        );
    }
    let hostile_page =
        String::from_utf8(tree[&format!("reactions/{}.html", slug(HOSTILE_REACTION))].clone())
            .unwrap();
    // minijinja's HTML escaping of the id …
    assert!(
        hostile_page.contains("R_&lt;b&gt;&amp;&quot;&#x27;..&#x2f;x"),
        "{hostile_page}"
    );
    // … and the svg crate's escaping of the same id in the bar's <title>.
    assert!(
        hostile_page.contains("<title>ΔG′ range of R_&lt;b&gt;&amp;\"'../x:"),
        "{hostile_page}"
    );
    let note = String::from_utf8(tree["notes/review.html"].clone()).unwrap();
    assert!(
        note.contains("&lt;script&gt;alert(1)&lt;/script&gt;"),
        "{note}"
    );
    assert!(
        note.contains("<em>emphasis</em>"),
        "Markdown is still rendered: {note}"
    );
    assert!(
        !note.contains("<img"),
        "a remote image must not load: {note}"
    );
}

#[test]
fn overview_lists_errors_and_warnings_with_counts_and_coverage() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let index = fs::read_to_string(out.join("index.html")).unwrap();
    // The overview leads with the verdict sentence, not with counts, and
    // lists no finding rows (they live on the findings pages).
    let verdict = index.find("id=\"verdict\"").expect("verdict section");
    let fix_first = index.find("id=\"fix-first\"").expect("fix-first section");
    assert!(verdict < fix_first);
    assert!(!index.contains("class=\"cards\""));
    assert!(!index.contains("class=\"meter\""));
    assert!(!index.contains("NOTE-ONLY-MESSAGE"));
    assert!(!index.contains("ATPH runs backward in scenario growth"));
    let list = fs::read_to_string(out.join("findings/list-1.html")).unwrap();
    assert!(list.contains("ATPH runs backward in scenario growth"));
    assert!(list.contains("Reaction &lt;b&gt;x&lt;&#x2f;b&gt; is not mass balanced."));
    let findings = fs::read_to_string(out.join("findings.html")).unwrap();
    assert!(findings.contains("NOTE-ONLY-MESSAGE"));
    // Severity shown by icon and word, not by colour alone.
    assert!(findings.contains("<span class=\"icon\" aria-hidden=\"true\">✖</span> error</span>"));
    assert!(findings.contains("<span class=\"icon\" aria-hidden=\"true\">▲</span> warning</span>"));
    assert!(findings.contains("<span class=\"icon\" aria-hidden=\"true\">●</span> note</span>"));
    // Coverage 3 of 4 internal reactions (the fixture has 3 errors and 2
    // warnings), computed by the site when the report has no headline.
    assert!(
        text_of(&index).contains(
            "Judged 3 of 4 internal reactions (75 %): 3 errors and 2 warnings to review; 1 could not be judged"
        ),
        "{index}"
    );
    assert!(text_of(&index).contains("5 of 6 metabolites have a ΔfG′°"));
    // Scenario table row.
    assert!(index.contains("id=\"scenario-growth\""));
    // The finding's subject without a page (a loop id) is plain text.
    assert!(findings.contains("<code>loop-1</code>"));
}

/// Attribute `name` of the first `<tag …>` carrying `class="class"`.
fn svg_attr(html: &str, tag: &str, class: &str, name: &str) -> f64 {
    let open = format!("<{tag} ");
    let element = html
        .match_indices(&open)
        .map(|(i, _)| &html[i..i + html[i..].find('>').unwrap()])
        .find(|e| e.contains(&format!("class=\"{class}\"")))
        .unwrap_or_else(|| panic!("no <{tag} class={class}>"));
    let values = attribute_values(element, name);
    values[0].parse().unwrap()
}

#[test]
fn range_bar_places_zero_and_the_range() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let page =
        fs::read_to_string(out.join(format!("reactions/{}.html", slug(HOSTILE_REACTION)))).unwrap();
    // Range −10 … 30 kJ/mol, σ = 2 with multiplier 1.96: allowance 3.92.
    let x = svg_attr(&page, "rect", "range", "x");
    let width = svg_attr(&page, "rect", "range", "width");
    let zero = svg_attr(&page, "line", "zero", "x1");
    assert_eq!(
        svg_attr(&page, "line", "zero", "x2"),
        zero,
        "zero line is vertical"
    );
    // Zero lies a quarter of the way along the bar (10 of 40 kJ/mol);
    // coordinates are whole units (±0.5 each, on a bar 400 units long).
    assert!(
        ((zero - x) / width - 0.25).abs() < 3e-3,
        "x={x} w={width} zero={zero}"
    );
    // The drawing spans [−13.92, 33.92] plus 6 % margins on the plot width
    // 48 … 592: x(v) = 48 + (v + 16.7904) / 53.5808 · 544.
    let expect = |v: f64| 48.0 + (v + 16.7904) / 53.5808 * 544.0;
    assert!((x - expect(-10.0)).abs() <= 0.5, "x = {x}");
    assert!((zero - expect(0.0)).abs() <= 0.5, "zero = {zero}");
    assert!(
        (x + width - expect(30.0)).abs() <= 0.5,
        "end = {}",
        x + width
    );
    let ax = svg_attr(&page, "rect", "allowance", "x");
    let aw = svg_attr(&page, "rect", "allowance", "width");
    assert!((ax - expect(-13.92)).abs() <= 0.5 && (ax + aw - expect(33.92)).abs() <= 0.5);
    // Whole units only.
    assert!([x, width, zero, ax, aw].iter().all(|v| v.fract() == 0.0));
    // Values are labelled with a real minus sign.
    // (the svg crate puts text content on its own line)
    let page = page.replace(">\n", ">").replace("\n</text>", "</text>");
    assert!(
        page.contains(">−10.00</text>") && page.contains(">30.00</text>"),
        "{page}"
    );
    let zero_label = format!("class=\"zero-label\" x=\"{zero}\" y=\"11\">0</text>");
    assert!(page.contains(&zero_label), "{page}");

    // A range entirely below zero still shows zero, at the right end.
    let atph = fs::read_to_string(out.join("reactions/ATPH.html")).unwrap();
    let x = svg_attr(&atph, "rect", "range", "x");
    let width = svg_attr(&atph, "rect", "range", "width");
    let zero = svg_attr(&atph, "line", "zero", "x1");
    assert!(
        x + width < zero && zero <= 592.0,
        "x={x} w={width} zero={zero}"
    );
    // No range, no bar (the page still has its network map).
    let unk = fs::read_to_string(out.join("reactions/UNK.html")).unwrap();
    assert!(!unk.contains("dg-bar"));
    assert!(unk.contains("net-map"));
}

#[test]
fn user_theme_replaces_files_one_by_one() {
    let tmp = tempfile::tempdir().unwrap();
    let theme = tmp.path().join("theme");
    fs::create_dir(&theme).unwrap();
    fs::write(theme.join("style.css"), "/* my own style */\n").unwrap();
    fs::write(
        theme.join("note.html"),
        "{% extends \"layout.html\" %}{% block content %}<p>CUSTOM NOTE {{ item.title }}</p>{% endblock %}",
    )
    .unwrap();
    fs::write(theme.join("logo.txt"), "extra asset").unwrap();
    let out = tmp.path().join("site");
    render(&fixture(), Some(&theme), &out).unwrap();
    assert_eq!(
        fs::read_to_string(out.join("assets/style.css")).unwrap(),
        "/* my own style */\n"
    );
    assert_eq!(
        fs::read_to_string(out.join("assets/logo.txt")).unwrap(),
        "extra asset"
    );
    let default_js = DEFAULT_THEME
        .iter()
        .find(|(n, _)| *n == "table.js")
        .unwrap()
        .1;
    assert_eq!(fs::read(out.join("assets/table.js")).unwrap(), default_js);
    let note = fs::read_to_string(out.join("notes/review.html")).unwrap();
    assert!(
        note.contains("<p>CUSTOM NOTE Review &lt;notes&gt;</p>"),
        "{note}"
    );
    // The default layout still wraps the overridden page, and other pages
    // keep their default templates.
    assert!(note.contains("<nav aria-label=\"Sections\">"));
    let index = fs::read_to_string(out.join("index.html")).unwrap();
    assert!(index.contains("What to fix first"));
}

#[test]
fn failed_render_keeps_the_previous_site_and_leaves_no_temporary_folder() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let before = read_tree(&out);

    // A template that fails while rendering (after pages were written).
    let theme = tmp.path().join("theme");
    fs::create_dir(&theme).unwrap();
    fs::write(
        theme.join("reaction.html"),
        "{% extends \"layout.html\" %}{% block content %}{{ item.no_such_field }}{% endblock %}",
    )
    .unwrap();
    let err = render(&fixture(), Some(&theme), &out).unwrap_err();
    match &err {
        Error::Render { template, message } => {
            // Named by its path, so the user knows it is their file.
            assert_eq!(template, &theme.join("reaction.html").display().to_string());
            assert!(message.contains("undefined"), "{message}");
            assert!(
                message.contains("while writing page reactions/"),
                "{message}"
            );
        }
        other => panic!("expected a render error, got {other}"),
    }
    assert_eq!(read_tree(&out), before, "the previous site changed");

    // A template with a syntax error fails before anything is written.
    fs::write(theme.join("reaction.html"), "{% if %}").unwrap();
    assert!(matches!(
        render(&fixture(), Some(&theme), &out),
        Err(Error::Render { .. })
    ));
    assert_eq!(read_tree(&out), before);

    let names: Vec<_> = fs::read_dir(tmp.path())
        .unwrap()
        .map(|e| e.unwrap().file_name().into_string().unwrap())
        .collect();
    let mut names = names;
    names.sort();
    assert_eq!(
        names,
        ["site", "theme"],
        "a temporary folder was left behind"
    );

    // A successful render replaces the old site completely.
    fs::write(out.join("stale.html"), "old").unwrap();
    render_fixture(&out);
    assert!(!out.join("stale.html").exists());
    assert_eq!(read_tree(&out), before);
}

#[test]
fn a_foreign_folder_is_never_replaced() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("project");
    fs::create_dir(&out).unwrap();
    fs::write(out.join("model.yaml"), "precious").unwrap();
    let err = render(&fixture(), None, &out).unwrap_err();
    assert!(err.to_string().contains("not made by gibbsite"), "{err}");
    assert_eq!(
        fs::read_to_string(out.join("model.yaml")).unwrap(),
        "precious"
    );
    assert_eq!(fs::read_dir(tmp.path()).unwrap().count(), 1);
    // An empty folder is fine.
    let empty = tmp.path().join("empty");
    fs::create_dir(&empty).unwrap();
    render(&fixture(), None, &empty).unwrap();
    assert!(empty.join("index.html").is_file());
}

#[test]
fn unsafe_or_duplicate_slugs_are_refused() {
    let tmp = tempfile::tempdir().unwrap();
    let mut report = fixture();
    report.reactions[0].slug = "../escape".into();
    assert!(matches!(
        render(&report, None, &tmp.path().join("a")),
        Err(Error::Render { .. })
    ));
    let mut report = fixture();
    report.metabolites[1].slug = report.metabolites[0].slug.clone();
    assert!(matches!(
        render(&report, None, &tmp.path().join("b")),
        Err(Error::Render { .. })
    ));
    assert_eq!(fs::read_dir(tmp.path()).unwrap().count(), 0);
}

#[test]
fn output_is_byte_identical_across_renders_and_input_orders() {
    let tmp = tempfile::tempdir().unwrap();
    let (a, b) = (tmp.path().join("a"), tmp.path().join("b"));
    render_fixture(&a);
    // Same report with its lists in another order: same pages.
    let mut shuffled = fixture();
    shuffled.reactions.reverse();
    shuffled.metabolites.reverse();
    shuffled.findings.reverse();
    let loops = shuffled.loops.as_mut().unwrap();
    loops.loops.reverse();
    loops.capable.reverse();
    for l in &mut loops.loops {
        l.members.reverse();
    }
    for r in &mut shuffled.reactions {
        r.loops.reverse();
    }
    render(&shuffled, None, &b).unwrap();
    let (ta, mut tb) = (read_tree(&a), read_tree(&b));
    // report.json mirrors the report as given, so only it may differ.
    tb.insert("report.json".into(), ta["report.json"].clone());
    assert_eq!(ta, tb);
    render_fixture(&b);
    assert_eq!(ta, read_tree(&b));
}

/// The meaningful part (`<main>`) of one reaction page against a stored
/// snapshot; set `UPDATE_SNAPSHOTS=1` to rewrite it after a deliberate change.
#[test]
fn reaction_page_snapshot() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let page = fs::read_to_string(out.join("reactions/ATPH.html")).unwrap();
    let start = page.find("<main").unwrap();
    let end = page.find("</main>").unwrap() + "</main>".len();
    let main = page[start..end]
        .replace(env!("CARGO_PKG_VERSION"), "[version]")
        .replace("2024-01-01T00:00:00Z", "[generated]");
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/site_expected/reaction_ATPH.html");
    if std::env::var_os("UPDATE_SNAPSHOTS").is_some() {
        fs::create_dir_all(path.parent().unwrap()).unwrap();
        fs::write(&path, format!("{main}\n")).unwrap();
    }
    let expected =
        fs::read_to_string(&path).expect("snapshot missing: run with UPDATE_SNAPSHOTS=1");
    assert_eq!(format!("{main}\n"), expected);
}

#[test]
fn an_empty_report_renders_without_notes_pages() {
    let tmp = tempfile::tempdir().unwrap();
    let mut report = fixture();
    report.findings.clear();
    report.reactions.clear();
    report.metabolites.clear();
    report.scenarios.clear();
    report.compartments.clear();
    report.notes.clear();
    report.summary.reactions = 0;
    report.summary.metabolites = 0;
    let out = tmp.path().join("site");
    render(&report, None, &out).unwrap();
    let tree = read_tree(&out);
    assert!(!tree.keys().any(|k| k.starts_with("notes/")));
    let index = String::from_utf8(tree["index.html"].clone()).unwrap();
    assert!(index.contains("Nothing: no finding."));
    assert!(index.contains("The project defines no flux scenarios."));
    assert!(!index.contains("notes/index.html"), "no dead Notes link");
}

// ---------------------------------------------------------------------------
// Thermodynamic detail: species, terms of ΔrG'°, verdict basis.

/// Text of an HTML fragment as a reader sees it: inline tags removed,
/// other tags a space, whitespace collapsed (entities left as written).
fn text_of(html: &str) -> String {
    const INLINE: [&str; 6] = ["span", "a", "code", "strong", "em", "sub"];
    let mut out = String::new();
    let mut rest = html;
    while let Some(start) = rest.find('<') {
        out.push_str(&rest[..start]);
        let end = start + rest[start..].find('>').unwrap();
        let name: String = rest[start + 1..end]
            .trim_start_matches('/')
            .chars()
            .take_while(|c| c.is_ascii_alphanumeric())
            .collect();
        if !INLINE.contains(&name.as_str()) {
            out.push(' ');
        }
        rest = &rest[end + 1..];
    }
    out.push_str(rest);
    out.split_whitespace().collect::<Vec<_>>().join(" ")
}

/// The rows of the first `<table class="…" …>` whose class list is `class`,
/// each as the texts of its cells.
fn table_rows(html: &str, class: &str) -> Vec<Vec<String>> {
    let open = format!("<table class=\"{class}\"");
    let start = html
        .match_indices(&open)
        .map(|(i, _)| i)
        .find(|&i| matches!(html.as_bytes()[i + open.len()], b'>' | b' '))
        .unwrap_or_else(|| panic!("no table {class}"));
    let table = &html[start..start + html[start..].find("</table>").unwrap()];
    table
        .split("<tr")
        .skip(1)
        .map(|row| {
            row.split("<t")
                .skip(1)
                .filter(|cell| cell.starts_with("d") || cell.starts_with("h"))
                .map(|cell| text_of(&format!("<t{cell}")))
                .collect()
        })
        .collect()
}

/// The one `<svg class="class" …>…</svg>` of a page.
fn svg_block<'a>(html: &'a str, class: &str) -> &'a str {
    let open = format!("<svg class=\"{class}\"");
    assert_eq!(html.matches(&open).count(), 1, "expected one {class} chart");
    let start = html.find(&open).unwrap();
    &html[start..start + html[start..].find("</svg>").unwrap()]
}

/// Every (tag, attribute, value) inside an SVG block, parsed strictly: a
/// value holding a stray quote breaks the structure and fails the parse.
fn svg_attributes(svg: &str) -> Vec<(String, String, String)> {
    let mut out = Vec::new();
    for tag in svg.split('<').skip(1) {
        let tag = &tag[..tag.find('>').expect("unclosed tag")];
        if tag.starts_with('/') {
            continue;
        }
        let tag = tag.trim_end_matches('/');
        let (name, mut rest) = tag.split_once(' ').unwrap_or((tag, ""));
        while !rest.trim().is_empty() {
            let (attr, after) = rest
                .trim_start()
                .split_once("=\"")
                .unwrap_or_else(|| panic!("malformed attributes in <{tag}>"));
            assert!(
                attr.chars().all(|c| c.is_ascii_alphanumeric() || c == '-'),
                "odd attribute name {attr:?} in <{tag}>"
            );
            let end = after.find('"').expect("unterminated attribute");
            out.push((name.to_string(), attr.to_string(), after[..end].to_string()));
            rest = &after[end + 1..];
        }
    }
    out
}

/// x1 and x2 of the compartment's pH line.
fn ph_line_x(svg: &str) -> Vec<f64> {
    svg_attributes(svg)
        .iter()
        .skip_while(|(_, attr, value)| !(attr == "class" && value == "ph-line"))
        .filter(|(_, attr, _)| attr == "x1" || attr == "x2")
        .take(2)
        .map(|(_, _, v)| v.parse().unwrap())
        .collect()
}

/// The points of every `<polyline class="species-line">`.
fn species_lines(svg: &str) -> Vec<Vec<(f64, f64)>> {
    svg_attributes(svg)
        .into_iter()
        .filter(|(tag, attr, _)| tag == "polyline" && attr == "points")
        .map(|(_, _, points)| {
            points
                .split(' ')
                .map(|p| {
                    let (x, y) = p.split_once(',').unwrap();
                    (x.parse().unwrap(), y.parse().unwrap())
                })
                .collect()
        })
        .collect()
}

#[test]
fn metabolite_page_shows_species_table_chart_and_conditions() {
    use gibbsite::site::species_chart::{PLOT_BOTTOM, PLOT_LEFT, PLOT_RIGHT, PLOT_TOP};
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let page = fs::read_to_string(out.join("metabolites/ha_p.html")).unwrap();
    let text = text_of(&page);

    // The compartment and its conditions.
    assert!(
        text.contains("Conditions there pH 7.5, I = 100 mM, T = 298.15 K, ψ = 0 mV"),
        "{text}"
    );
    assert!(
        text.contains("peri&quot;&lt;b&gt;plasm&lt;&#x2f;b&gt; (p)"),
        "{text}"
    );
    // Where ΔfG'° comes from, in words, and the library entry.
    assert!(text.contains("ΔfG′° −23.53 ± 0.60 kJ/mol"), "{text}");
    assert!(text.contains("Computed from the species data given in the model"));
    assert!(
        text.contains("Library entry acid-library-key (matched)"),
        "{text}"
    );
    assert!(text.contains("Transformed at pH 7.5, I = 100 mM, T = 298.15 K"));

    // Species table: label, z, nH, nMg, ΔfG°, ΔfH°, ΔfG'° here, fraction.
    // At pH 7.5 an acid of pK 7 is 1/(1 + 10^−0.5) = 76.0 % base.
    let rows = table_rows(&page, "data species");
    assert_eq!(
        rows[1..],
        [
            ["HA", "0", "4", "0", "−339.96", "−480.50", "−20.00", "0.24"],
            [
                "A- &quot;&lt;b&gt;base&lt;&#x2f;b&gt;&quot;",
                "−1",
                "3",
                "0",
                "−300.00",
                "not given",
                "−22.85",
                "0.76"
            ],
            [
                "MgA+",
                "1",
                "3",
                "1",
                "−760.00",
                "not given",
                "left out",
                "0"
            ],
        ]
    );
    // Averages over species: 4·0.240 + 3·0.760 = 3.24 H, charge −0.76.
    assert!(text.contains("Mean H atoms n̄H 3.24"), "{text}");
    assert!(text.contains("Mean charge z̄ −0.76"), "{text}");
    assert!(text.contains("HA: invented &lt;b&gt;for the test&lt;&#x2f;b&gt;"));
    assert!(text.contains("Not drawn (below 0.1 % over the whole range): MgA+."));

    // The chart: pH 4…10 over x = 56…536, i.e. 80 units per pH unit;
    // fraction 1…0 over y = 24…244.
    assert_eq!(
        (PLOT_LEFT, PLOT_RIGHT, PLOT_TOP, PLOT_BOTTOM),
        (56.0, 536.0, 24.0, 244.0)
    );
    let svg = svg_block(&page, "species-chart");
    let attrs = svg_attributes(svg);
    // pH 7.5: 56 + 3.5 × 80 = 336.
    assert_eq!(ph_line_x(svg), [336.0, 336.0]);
    assert!(
        svg.contains("peri\"&lt;b&gt;plasm&lt;/b&gt;: pH 7.5"),
        "{svg}"
    );

    // Two lines (MgA+ never reaches 0.1 %), 13 points each, pH 4 to 10.
    let lines = species_lines(svg);
    assert_eq!(lines.len(), 2);
    for line in &lines {
        assert_eq!(line.len(), 13);
        assert_eq!(line[0].0, 56.0);
        assert_eq!(line[12].0, 536.0);
        // At pH = pK (x = 56 + 3 × 80 = 296) both species are at 0.5:
        // the middle of the plot, (24 + 244) / 2 = 134.
        assert_eq!(line[6], (296.0, 134.0));
    }
    // At pH 4 the acid is 1/(1 + 10³) = 0.0999 % base: HA at
    // 24 + 0.000999 × 220 = 24.22, A⁻ at 244 − 0.22 = 243.78.
    assert_eq!(lines[0][0].1, 24.22);
    assert_eq!(lines[1][0].1, 243.78);
    // Lines differ by dash pattern, not only by colour.
    let dashes: Vec<&str> = attrs
        .iter()
        .filter(|(tag, attr, _)| tag == "polyline" && attr == "stroke-dasharray")
        .map(|(_, _, v)| v.as_str())
        .collect();
    assert_eq!(
        dashes,
        ["9 4"],
        "the first line is solid, the second dashed"
    );
    // Labels at the line ends and in the legend: escaped text content.
    assert!(svg.contains(">\nHA\n</text>"), "{svg}");
    assert!(
        svg.contains(">\nA- \"&lt;b&gt;base&lt;/b&gt;\"\n</text>"),
        "{svg}"
    );

    // A metabolite without species: no chart, its problem shown.
    let acid_c = text_of(&fs::read_to_string(out.join("metabolites/ha_c.html")).unwrap());
    assert!(acid_c.contains("Given in the model, and taken as valid"));
    assert!(
        acid_c.contains("Problem ▲ ACID-PROBLEM: the library entry lacks ΔfH°"),
        "{acid_c}"
    );
    assert!(acid_c.contains("Conditions there pH 7, I = 250 mM, T = 298.15 K, pMg 3, ψ = −100 mV"));
    assert!(!acid_c.contains("Species"));
}

#[test]
fn svg_attributes_never_carry_model_strings() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let tree = read_tree(&out);
    let mut charts = 0;
    for (name, html) in html_pages(&tree) {
        for block in html.split("<svg").skip(1) {
            let svg = format!("<svg{}", &block[..block.find("</svg>").unwrap()]);
            let network_map = svg.starts_with("<svg class=\"nm net-map\"");
            charts += usize::from(!network_map);
            for (tag, attr, value) in svg_attributes(&svg) {
                // Links of the network maps name pages: page names are
                // sanitised slugs (checked below for their characters);
                // the model string itself is never there.
                if network_map && tag == "a" && attr == "href" {
                    assert!(
                        value
                            .chars()
                            .all(|c| c.is_ascii_alphanumeric() || "._-/".contains(c)),
                        "{name}: <{tag} {attr}={value:?}>"
                    );
                    assert!(!value.contains("<") && !value.contains('"'));
                    continue;
                }
                // Numbers, our own class names and fixed words only.
                assert!(
                    value
                        .chars()
                        .all(|c| c.is_ascii_alphanumeric() || " .,:;#()/-".contains(c)),
                    "{name}: <{tag} {attr}={value:?}>"
                );
                for model in [
                    "HA", "base", "plasm", "ha_p", "R_", "ATPH", "MgA", "UNK", "adp_c", "M_",
                ] {
                    assert!(!value.contains(model), "{name}: <{tag} {attr}={value:?}>");
                }
            }
        }
    }
    // Range bars on 3 reaction pages, the one species chart and the cycle
    // maps of the two loops (network maps not counted).
    assert_eq!(charts, 6);
}

#[test]
fn reaction_page_breaks_down_the_standard_energy() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let page = fs::read_to_string(out.join("reactions/HAT.html")).unwrap();
    let text = text_of(&page);

    // Σ ν·ΔfG'° term by term, consumed first as the equation reads.
    let rows = table_rows(&page, "data terms");
    assert_eq!(
        rows[1..5],
        [
            [
                "−1",
                "ha_p",
                "p pH 7.5",
                "−23.53 ± 0.60",
                "model species data",
                "23.53"
            ],
            [
                "−1",
                "h_p",
                "p pH 7.5",
                "0.00 ± 0.00",
                "fixed by pH",
                "0.00"
            ],
            [
                "1",
                "ha_c",
                "c pH 7",
                "−25.00 ± 0.60",
                "given in the model",
                "−25.00"
            ],
            ["1", "h_c", "c pH 7", "0.00 ± 0.00", "fixed by pH", "0.00"],
        ]
    );
    // 23.53 − 25.00 = −1.47
    assert_eq!(rows[5], ["Σ ν·ΔfG′°", "−1.47"]);
    assert_eq!(rows.len(), 6);
    assert!(page.contains("href=\"../metabolites/ha_p.html\""));
    // H⁺ of the fixture has no page: plain code, no link.
    assert!(page.contains("<code>h_p</code>"));

    // Transport terms: −1.47 − 2.854 + 9.6485 = 5.3245 → 5.32.
    let rows = table_rows(&page, "data transport");
    let numbers: Vec<(&str, &str)> = rows[1..]
        .iter()
        .map(|r| (r[0].as_str(), r[1].as_str()))
        .collect();
    assert_eq!(
        numbers,
        [
            ("Formation energies Σ ν·ΔfG′°", "−1.47"),
            ("Proton term", "−2.85"),
            ("Electrical term", "9.65"),
            ("ΔrG′°", "5.32"),
        ]
    );
    assert!(rows[2][2].contains("hydrogen moved between compartments at different pH"));
    assert!(rows[3][2].contains("charge moved across the membrane potential"));
    assert!(
        text.contains("Depends on the reference compartment."),
        "{text}"
    );
    // σ, its allowance at 95 % (1.96 × 0.8485 = 1.663) and K'.
    assert!(text.contains("ΔrG′° 5.32 ± 0.85 kJ/mol"), "{text}");
    assert!(text.contains("Allowance (95 % confidence) ± 1.66 kJ/mol (1.96 × σ)"));
    assert!(text.contains("K′ 0.117"));

    // A reaction given as a whole has no terms section.
    let atph = fs::read_to_string(out.join("reactions/ATPH.html")).unwrap();
    assert!(!atph.contains("Terms of ΔrG′°"));
    // Missing data with their reasons.
    let unk = text_of(&fs::read_to_string(out.join("reactions/UNK.html")).unwrap());
    assert!(
        unk.contains("Also: pi_c: species data lack ΔfH° away from 298.15 K"),
        "{unk}"
    );
}

#[test]
fn overview_states_the_basis_of_every_verdict_and_the_conditions() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let index = fs::read_to_string(out.join("index.html")).unwrap();
    let text = text_of(&index);
    assert!(
        text.contains(
            "Every verdict allows ±1.96 σ around ΔrG′° (95 % confidence), lets each \
             concentration range over 1 µM … 20 mM unless the metabolite has its own range, \
             and counts a direction as comfortably feasible only with a driving force of at \
             least 1.00 kJ/mol."
        ),
        "{text}"
    );
    let rows = table_rows(&index, "data conditions");
    assert_eq!(
        rows[1..],
        [
            [
                "c",
                "cytosol",
                "7",
                "250 mM",
                "−100 mV",
                "298.15 K",
                "3",
                "a lab notebook"
            ],
            [
                "p",
                "peri&quot;&lt;b&gt;plasm&lt;&#x2f;b&gt;",
                "7.5",
                "100 mM",
                "0 mV",
                "298.15 K",
                "—",
                "not stated: defaults (pH 7, 0 mV)"
            ],
        ]
    );
}

// ---------------------------------------------------------------------------
// The demo project, analysed and rendered through the library API.

fn render_demo(out: &Path) -> Report {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    let report = gibbsite::Project::load(&dir)
        .expect("the demo project loads")
        .analyse();
    render(&report, None, out).expect("the demo renders");
    report
}

#[test]
fn demo_site_links_resolve_and_the_overview_lists_its_problems() {
    use gibbsite::site::format::energy;
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    let report = render_demo(&out);
    let tree = read_tree(&out);
    check_links(&tree);

    // Errors and warnings of the demo (see tests/demo.rs for why each is
    // there), in the full list: severity, kind, subject, scenario.
    // The loop's id comes from its member set (loops::ids).
    let loop_id = gibbsite::loops::ids::member_set_id("loop", ["PEPS", "PYK"]);
    let loop_subjects = format!("{loop_id}, PYK, PEPS");
    let index = String::from_utf8(tree["index.html"].clone()).unwrap();
    let list = String::from_utf8(tree["findings/list-1.html"].clone()).unwrap();
    let rows = table_rows(&list, "data findings");
    let listed: Vec<[&str; 4]> = rows[1..]
        .iter()
        .filter(|r| r[0] != "● note")
        .map(|r| [r[0].as_str(), r[1].as_str(), r[2].as_str(), r[3].as_str()])
        .collect();
    assert_eq!(
        listed,
        [
            ["✖ error", "infeasible-direction", "PEPS", "—"],
            ["✖ error", "scenario-contradiction", "LDH", "dusk"],
            ["✖ error", "scenario-contradiction", "PEPS", "dusk"],
            ["✖ error", "scenario-contradiction", "PEPS", "refit"],
            [
                "✖ error",
                "scenario-infeasible",
                "PLC1, PLC2, PLC3",
                "bloom"
            ],
            ["▲ warning", "internal-loop", loop_subjects.as_str(), "—"],
            ["▲ warning", "scenario-internal-cycle", "PYK, PEPS", "refit"],
            ["▲ warning", "scenario-marginal", "GAPD", "bloom"],
            ["▲ warning", "scenario-marginal", "GAPD", "noon"],
            ["▲ warning", "scenario-marginal", "GAPD", "refit"],
        ]
    );
    // The basis of verdicts: confidence 0.95 gives the two-sided normal
    // quantile 1.96 (common practice); the demo's default range and
    // driving force are those of projects/lakeside/gibbsite.yaml.
    assert!(text_of(&index).contains(
        "Every verdict allows ±1.96 σ around ΔrG′° (95 % confidence), lets each concentration \
         range over 1 µM … 10 mM unless the metabolite has its own range, and counts a direction \
         as comfortably feasible only with a driving force of at least 1.00 kJ/mol."
    ));

    // The demo's one loop (PYK and PEPS, each other's reverse): its subject
    // links to its page, the loop index lists it with the report's numbers.
    assert!(list.contains(&format!(
        "<a href=\"../loops/{loop_id}.html\">{loop_id}</a>"
    )));
    let view = &report
        .loops
        .as_ref()
        .expect("the demo analyses loops")
        .loops;
    assert_eq!(view.len(), 1);
    let (sum, sigma) = (view[0].drg0_sum_kj.unwrap(), view[0].sigma_kj.unwrap());
    let loops = String::from_utf8(tree["loops/index.html"].clone()).unwrap();
    let rows = table_rows(&loops, "data loops");
    assert_eq!(rows.len(), 2);
    assert_eq!(
        rows[1][..5],
        [
            loop_id.as_str(),
            "2",
            "PEPS forward, PYK forward",
            &format!("{} ± {}", energy(sum), energy(sigma)),
            "✔ adds up to zero",
        ]
    );
    // Both ΔrG'° are sums of the same formation energies with opposite
    // signs, so around the loop they cancel (common practice: Σ ν·ΔfG'°
    // over a cycle telescopes to zero).
    assert_eq!(energy(sum), "0.00");
    assert!(text_of(&loops).contains("Loop-capable reactions 2"));
    let page = String::from_utf8(tree[&format!("loops/{loop_id}.html")].clone()).unwrap();
    let svg = svg_block(&page, "loop-map");
    // Drawn from the first by id.
    assert_eq!(svg_texts(svg, "node-id"), ["PEPS", "PYK"]);
    assert_eq!(svg.matches("class=\"arrowhead\"").count(), 2);
    // PYK makes pyruvate and ATP, which PEPS uses, and PEPS gives back
    // PEP, ADP and H⁺ (their equations in projects/lakeside).
    assert!(
        svg.contains("<title>PYK → PEPS: passes atp_c, pyr_c</title>"),
        "{svg}"
    );
    assert!(
        svg.contains("<title>PEPS → PYK: passes adp_c, h_c, pep_c</title>"),
        "{svg}"
    );
}

#[test]
fn demo_pages_show_transport_terms_and_species() {
    use gibbsite::site::format::energy;
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    let report = render_demo(&out);

    // ATP synthase: 4 H⁺ from the lake water (0 mV) into the cytosol
    // (−200 mV). Cytosolic charge gained: +3 (3 H⁺) + (−4) (ATP⁴⁻) − (−3)
    // (ADP³⁻) − (−2) (HPO₄²⁻) = +4, so the electrical term is
    // F·4·(−0.200 V) = 96.485 kJ/(mol·V) × (−0.8 V) = −77.19 kJ/mol
    // (F: CODATA 2018; the charge sum as in Jol et al. 2010).
    let atps = fs::read_to_string(out.join("reactions/ATPS.html")).unwrap();
    let rows = table_rows(&atps, "data transport");
    assert_eq!(rows[3][..2], ["Electrical term", "−77.19"]);
    // The other rows show the report's numbers, and the total is ΔrG'°.
    let view = report.reactions.iter().find(|r| r.id == "ATPS").unwrap();
    let t = view.transport.as_ref().unwrap();
    assert_eq!(rows[1][1], energy(t.formation_sum_kj));
    assert_eq!(rows[2][1], energy(t.proton_term_kj));
    assert_eq!(
        rows[4][..2],
        ["ΔrG′°", &energy(view.drg_prime.as_ref().unwrap().value_kj)]
    );
    // Σ ν·ΔfG'° of the terms table is the formation sum.
    let terms = table_rows(&atps, "data terms");
    assert_eq!(terms.last().unwrap()[1], energy(t.formation_sum_kj));
    assert_eq!(terms.len(), 1 + view.energy_terms.len() + 1);

    // ATP in the cytosol: three species drawn, the Mg complexes left out
    // (no pMg), and the pH line at pH 7: x = 56 + 3 × 80 = 296.
    let atp = fs::read_to_string(out.join("metabolites/atp_c.html")).unwrap();
    let svg = svg_block(&atp, "species-chart");
    assert_eq!(species_lines(svg).len(), 3);
    assert_eq!(ph_line_x(svg), [296.0, 296.0]);
    assert!(text_of(&atp)
        .contains("Not drawn (below 0.1 % over the whole range): MgATP2-, MgHATP-, Mg2ATP."));
    // Glucose has one species: a sentence instead of a flat line.
    let glc = fs::read_to_string(out.join("metabolites/glc_c.html")).unwrap();
    assert!(!glc.contains("species-chart"));
    assert!(text_of(&glc)
        .contains("One species makes up practically the whole reactant from pH 4 to 10"));
}

// ---------------------------------------------------------------------------
// Internal loops and energy-generating cycles.

/// Every `<text class="class" …>content</text>` of an SVG block, in order.
fn svg_texts(svg: &str, class: &str) -> Vec<String> {
    let open = format!("class=\"{class}\"");
    svg.split("<text ")
        .skip(1)
        .filter(|t| t[..t.find('>').unwrap()].contains(&open))
        .map(|t| {
            t[t.find('>').unwrap() + 1..t.find("</text>").unwrap()]
                .trim()
                .to_string()
        })
        .collect()
}

/// The numbers of a path's `d` after `M`/`L` (x, y pairs), in order.
fn path_points(d: &str) -> Vec<(f64, f64)> {
    d.split(['M', 'L', 'Z'])
        .filter(|p| !p.trim().is_empty())
        .map(|p| {
            let (x, y) = p.trim().split_once(',').unwrap();
            (x.parse().unwrap(), y.parse().unwrap())
        })
        .collect()
}

#[test]
fn loop_index_lists_every_loop_with_its_numbers() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let index = fs::read_to_string(out.join("loops/index.html")).unwrap();
    let text = text_of(&index);
    assert!(
        text.contains(
            "Loops 2: 1 with inconsistent ΔrG′°, 1 with incomplete data \
             Loop-capable reactions 4 Energy-generating cycles 1 found in 2 tests"
        ),
        "{text}"
    );
    // What was done to close the network.
    assert!(text.contains("Boundary reactions shut 3 Bounds relaxed to include zero 1"));
    assert!(text.contains("Removed by dead-end pruning 7 reactions, 4 left"));
    assert_eq!(
        table_rows(&index, "data relaxed")[1..],
        [["ATPH", "[2, 1000]", "[0, 1000]"]]
    );
    // Loop-capable reactions grouped by their directions.
    assert!(text.contains("Loop-capable reactions (4) 4 reactions can carry flux"));
    assert!(
        text.contains("Both directions (1) HAT Forward only"),
        "{text}"
    );
    assert!(text.contains("UNK"));
    assert!(text.contains("Backward only (1) R_&lt;b&gt;&amp;&quot;&#x27;..&#x2f;x"));

    // loop-2 before loop-10 (numbers compare as numbers); members in the
    // order they pass metabolites on (ATPH → HAT → the hostile reaction,
    // though listed ATPH, hostile, HAT). Σ coefficient × ΔrG'° of loop-10:
    // −36.0353 − 12.5 + 5.3245 = −43.2108, σ = √(0.5² + 2² + 0.8485²) = 2.229.
    let hostile = "R_&lt;b&gt;&amp;&quot;&#x27;..&#x2f;x";
    assert_eq!(
        table_rows(&index, "data loops")[1..],
        [
            [
                "loop-2 not verified",
                "2",
                "HAT backward, UNK forward",
                "—",
                "○ incomplete data",
                "forbid HAT backward ▲ does not break it alone",
            ],
            [
                "loop-10",
                "3",
                &format!("ATPH forward, HAT forward, {hostile} backward"),
                "−43.21 ± 2.23",
                "✖ inconsistent",
                "forbid HAT forward ✔ breaks the loop",
            ],
        ]
    );
    assert!(index.contains("<a href=\"loop-2.html\">loop-2</a>"));
    assert!(index.contains("<a href=\"loop-10.html\">loop-10</a>"));
    // The list stays usable when long: sortable and filterable, no drawings.
    assert!(index.contains("<table class=\"data loops\" data-filter data-sortable>"));
    assert!(!index.contains("<svg"));

    // Energy-generating-cycle tests: a found cycle by icon and word.
    assert_eq!(
        table_rows(&index, "data energy-cycles")[1..],
        [
            [
                "atp",
                "c",
                "ATP → ADP + phosphate",
                "✖ yes",
                &format!("HAT forward, {hostile} backward"),
            ],
            ["nadh", "c", "NADH → NAD+ + H+", "✔ no", "—"],
        ]
    );
    assert!(index.contains(&format!("id=\"cycle-{}\"", slug("atp in c"))));
    assert!(text
        .contains("Not testable, for want of a complete dissipation reaction in the model: gtp."));
    // A found cycle links to its page; tests left out are named.
    assert!(index.contains("<a href=\"cycle-atp-c.html\""));
    assert!(text.contains("not used as a currency in that compartment): atp in e."));
}

#[test]
fn loop_page_sums_the_energies_around_the_loop() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let page = fs::read_to_string(out.join("loops/loop-10.html")).unwrap();
    let text = text_of(&page);
    let hostile = "R_&lt;b&gt;&amp;&quot;&#x27;..&#x2f;x";
    // Step, reaction, name, equation, direction, ΔrG'° ± σ, coefficient ×
    // ΔrG'° (ATP hydrolysis: Alberty 2003, p. 220; the others invented).
    let rows = table_rows(&page, "data members");
    assert_eq!(
        rows[1..4],
        [
            [
                "1",
                "ATPH",
                "ATP hydrolysis",
                "equation of ATPH",
                "forward",
                "−36.04 ± 0.50",
                "−36.04"
            ],
            [
                "2",
                "HAT",
                "acid–proton symport",
                "equation of HAT",
                "forward",
                "5.32 ± 0.85",
                "5.32"
            ],
            [
                "3",
                hostile,
                "&lt;b&gt;bold&lt;&#x2f;b&gt; &amp; &quot;quoted&quot;",
                &format!("equation of {hostile}"),
                "backward",
                "12.50 ± 2.00",
                "−12.50"
            ],
        ]
    );
    assert_eq!(rows[4], ["Σ coefficient × ΔrG′°", "σ 2.23", "−43.21"]);
    // The sum, what it means, and that it is an error here: 1.96 σ is
    // 1.96 × 2.2293 = 4.37 kJ/mol, far less than |−43.21|.
    assert!(
        text.contains("Σ coefficient × ΔrG′° = −43.21 ± 2.23 kJ/mol ✖ inconsistent"),
        "{text}"
    );
    assert!(text.contains("The reaction energies of this loop contradict each other."));
    assert!(text.contains("farther from zero than 1.96 σ (4.37 kJ/mol)"));
    // The suggested constraint.
    assert!(text.contains(
        "Forbid HAT running forward: it is the member least able to run the way the loop needs."
    ));
    assert!(text.contains("Smallest ΔG′ in the loop’s direction 2.50 kJ/mol — positive"));
    assert!(text.contains("Basis ΔG′ over the allowed concentrations, widened by ±1.96 σ"));
    assert!(text.contains("Breaks the loop ✔ breaks the loop"));
    // Findings naming the loop, and no others.
    assert!(text.contains("LOOP-10-MESSAGE"));
    assert!(text.contains("around loop-10 adds up to −43.21 instead of 0."));
    assert!(!text.contains("NOTE-ONLY-MESSAGE"));
    assert!(!text.contains("regenerates atp"));

    // A loop with a member lacking data has no sum, and says why.
    let loop2 = text_of(&fs::read_to_string(out.join("loops/loop-2.html")).unwrap());
    assert!(loop2.contains("○ incomplete data The sum cannot be formed: no ΔrG′° for UNK."));
    assert!(
        loop2.contains("Σ coefficient × ΔrG′° incomplete"),
        "{loop2}"
    );
    assert!(loop2.contains("Not verified."));
    assert!(loop2.contains("▲ does not break it alone — still looping with it forbidden: UNK"));
    assert!(loop2.contains("Findings about this loop None."));
}

#[test]
fn cycle_map_draws_each_member_once_with_arrowheads_in_loop_order() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let page = fs::read_to_string(out.join("loops/loop-10.html")).unwrap();
    let svg = svg_block(&page, "loop-map");
    // One box per member, in loop order, its direction in words.
    assert_eq!(svg.matches("<g class=\"node ").count(), 3);
    assert_eq!(svg.matches("<rect ").count(), 3);
    // The svg crate escapes <, > and & in text (quotes need no escaping there).
    let hostile = "R_&lt;b&gt;&amp;\"'../x";
    assert_eq!(svg_texts(svg, "node-id"), ["ATPH", "HAT", hostile]);
    assert_eq!(
        svg_texts(svg, "node-way"),
        ["1 · forward", "2 · forward", "3 · backward"]
    );
    assert!(svg.contains("<g class=\"node backward\">"));
    // One arrow per step, each naming what passes on.
    assert_eq!(svg.matches("class=\"arrowhead\"").count(), 3);
    assert!(
        svg.contains("<title>ATPH → HAT: passes adp_c, pi_c</title>"),
        "{svg}"
    );
    assert!(svg.contains(&format!(
        "<title>HAT → {hostile}: passes M_&lt;b&gt;&amp;\"'../evil</title>"
    )));
    assert!(svg.contains(&format!("<title>{hostile} → ATPH: passes atp_c</title>")));
    assert!(
        !svg.contains("unlinked"),
        "every neighbour passes something on"
    );

    // Each arrowhead's tip lies at the next box, not at the one it leaves:
    // the arrows run from step k to step k + 1 (and from the last to the first).
    let attrs = svg_attributes(svg);
    let centres: Vec<(f64, f64)> = attrs
        .iter()
        .filter(|(tag, attr, _)| tag == "rect" && attr == "x")
        .zip(
            attrs
                .iter()
                .filter(|(tag, attr, _)| tag == "rect" && attr == "y"),
        )
        .map(|((_, _, x), (_, _, y))| {
            // Boxes are 132 × 38 up to ten members.
            (
                x.parse::<f64>().unwrap() + 66.0,
                y.parse::<f64>().unwrap() + 19.0,
            )
        })
        .collect();
    let tips: Vec<(f64, f64)> = attrs
        .windows(2)
        .filter(|w| w[0].2 == "arrowhead" && w[1].1 == "d")
        .map(|w| path_points(&w[1].2)[0])
        .collect();
    assert_eq!((centres.len(), tips.len()), (3, 3));
    let distance =
        |a: (f64, f64), b: (f64, f64)| ((a.0 - b.0).powi(2) + (a.1 - b.1).powi(2)).sqrt();
    for k in 0..3 {
        let (from, to) = (centres[k], centres[(k + 1) % 3]);
        assert!(
            distance(tips[k], to) < distance(tips[k], from),
            "arrow {k} points back: tip {:?}, boxes {from:?} → {to:?}",
            tips[k]
        );
    }
    // The two-member loop: two boxes, two arrows.
    let loop2 = fs::read_to_string(out.join("loops/loop-2.html")).unwrap();
    let svg2 = svg_block(&loop2, "loop-map");
    assert_eq!(svg2.matches("<g class=\"node ").count(), 2);
    assert_eq!(svg2.matches("class=\"arrowhead\"").count(), 2);
}

#[test]
fn finding_subjects_link_to_loop_pages_and_reactions_name_their_loops() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render_fixture(&out);
    let tree = read_tree(&out);
    check_links(&tree);
    let findings = String::from_utf8(tree["findings.html"].clone()).unwrap();
    assert_eq!(
        findings
            .matches("<a href=\"loops/loop-10.html\">loop-10</a>")
            .count(),
        2
    );
    assert!(findings.contains("<a href=\"loops/cycle-atp-c.html\">atp in c</a>"));
    // An id without a page stays plain text.
    assert!(findings.contains("<code>loop-1</code>"));
    let list = String::from_utf8(tree["findings/list-1.html"].clone()).unwrap();
    assert!(list.contains("<a href=\"../loops/loop-10.html\">loop-10</a>"));
    // Reaction pages: the directions it can loop in and its loops.
    let hat = String::from_utf8(tree["reactions/HAT.html"].clone()).unwrap();
    assert!(text_of(&hat).contains(
        "Loops can carry flux in both directions with every boundary reaction shut; \
         member of loop-2, loop-10"
    ));
    assert!(hat.contains("<a href=\"../loops/loop-2.html\">loop-2</a>"));
    let unk = text_of(&String::from_utf8(tree["reactions/UNK.html"].clone()).unwrap());
    assert!(unk.contains(
        "Loops can carry flux forward with every boundary reaction shut; member of loop-2"
    ));
    // "Loops" is in the navigation of every page.
    for (name, html) in html_pages(&tree) {
        assert!(html.contains("loops/index.html\""), "{name}");
    }
}

#[test]
fn switched_off_loop_analysis_is_stated_and_makes_no_loop_pages() {
    let tmp = tempfile::tempdir().unwrap();
    let mut report = fixture();
    report.loops = None;
    for r in &mut report.reactions {
        r.loop_capable = None;
        r.loops.clear();
    }
    let out = tmp.path().join("site");
    render(&report, None, &out).unwrap();
    let tree = read_tree(&out);
    check_links(&tree);
    let loop_files: Vec<&String> = tree.keys().filter(|k| k.starts_with("loops/")).collect();
    assert_eq!(loop_files, ["loops/index.html"]);
    let index = text_of(&String::from_utf8(tree["loops/index.html"].clone()).unwrap());
    assert!(index.contains("The loop analysis was switched off for this report"));
    // Subjects naming loops now have no page.
    let findings = String::from_utf8(tree["findings.html"].clone()).unwrap();
    assert!(findings.contains("<code>loop-10</code>"));
    assert!(findings.contains("<code>atp in c</code>"));
    let hat = String::from_utf8(tree["reactions/HAT.html"].clone()).unwrap();
    assert!(!hat.contains("<dt>Loops</dt>"));
}

// ---------------------------------------------------------------------------
// A genome-scale model: iML1515 (Monk et al., Nat. Biotechnol. 35 (2017)
// 904), from ../shared/models or `$GIBBSITE_MODELS_DIR`, skipped with a
// visible message when absent.

mod common;
use common::shared_model_path;

#[test]
fn iml1515_site_links_resolve_and_every_loop_has_its_page_and_map() {
    let Some(path) = shared_model_path("iML1515.xml.gz") else {
        return;
    };
    let report = gibbsite::Project::load(&path)
        .expect("iML1515 loads")
        .analyse();
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    render(&report, None, &out).expect("iML1515 renders");
    let tree = read_tree(&out);
    check_links(&tree);
    let view = report
        .loops
        .as_ref()
        .expect("loops are analysed by default");
    assert!(!view.loops.is_empty(), "iML1515 has internal loops");
    let index = String::from_utf8(tree["loops/index.html"].clone()).unwrap();
    assert_eq!(table_rows(&index, "data loops").len(), 1 + view.loops.len());
    for l in &view.loops {
        let page = String::from_utf8(tree[&format!("loops/{}.html", slug(&l.id))].clone()).unwrap();
        let svg = svg_block(&page, "loop-map");
        assert_eq!(
            svg.matches("<g class=\"node ").count(),
            l.members.len(),
            "{}",
            l.id
        );
        assert_eq!(
            svg.matches("class=\"arrowhead\"").count(),
            l.members.len(),
            "{}",
            l.id
        );
        let mut drawn = svg_texts(svg, "node-id");
        let mut members: Vec<String> = l.members.iter().map(|m| m.reaction.clone()).collect();
        drawn.sort();
        members.sort();
        assert_eq!(drawn, members, "{}", l.id);
    }
}

#[test]
fn an_unfinished_loop_analysis_shows_its_error() {
    let tmp = tempfile::tempdir().unwrap();
    let mut report = fixture();
    let loops = report.loops.as_mut().unwrap();
    loops.error = Some("the LP solver gave up <b>here</b>".into());
    loops.loops.clear();
    loops.capable.clear();
    for r in &mut report.reactions {
        r.loop_capable = None;
        r.loops.clear();
    }
    let out = tmp.path().join("site");
    render(&report, None, &out).unwrap();
    let index = text_of(&fs::read_to_string(out.join("loops/index.html")).unwrap());
    assert!(
        index.contains(
            "▲ The analysis did not finish. the LP solver gave up &lt;b&gt;here&lt;&#x2f;b&gt;"
        ),
        "{index}"
    );
    assert!(index.contains("Loops (0)"));
    assert!(!index.contains("No internal loops"), "not a clean bill");
    let hat = text_of(&fs::read_to_string(out.join("reactions/HAT.html")).unwrap());
    assert!(hat.contains("Loops not known (the loop analysis did not finish)"));
}
