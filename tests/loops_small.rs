//! Loop analysis of small hand-made networks whose loops are known by
//! construction (the expected sets follow from the steady-state balance
//! S·v = 0 by hand; each test says how).

use gibbsite::loops::{
    analyse_loops, assess_loop_energies, energy_generating_cycles, CurrencyOptions, DeltaGRange,
    LoopAnalysis, LoopEnergyOptions, LoopOptions, StandardDeltaG,
};
use gibbsite::model::{Compartment, Metabolite, Model, Reaction, Role};
use std::collections::BTreeMap;

/// Builds a model from `(id, equation, lower, upper, role)`, equations as
/// `[(metabolite id, coefficient)]`; metabolite ids end in `_<compartment>`.
/// (id, equation, lower bound, upper bound, role).
type Spec<'a> = (&'a str, &'a [(&'a str, f64)], f64, f64, Role);

fn model(reactions: &[Spec<'_>]) -> Model {
    let mut metabolites: Vec<Metabolite> = Vec::new();
    let mut compartments: Vec<Compartment> = Vec::new();
    let mut built = Vec::new();
    for (id, equation, lower, upper, role) in reactions {
        let mut stoichiometry = Vec::new();
        for (met, coef) in equation.iter() {
            let index = match metabolites.iter().position(|m| m.id == *met) {
                Some(i) => i,
                None => {
                    let compartment_id = met.rsplit('_').next().unwrap();
                    let compartment = match compartments.iter().position(|c| c.id == compartment_id)
                    {
                        Some(c) => c,
                        None => {
                            compartments.push(Compartment {
                                id: compartment_id.to_string(),
                                name: compartment_id.to_string(),
                                ph: 7.0,
                                ionic_strength_m: 0.25,
                                potential_mv: 0.0,
                                temperature_k: None,
                                pmg: None,
                            });
                            compartments.len() - 1
                        }
                    };
                    metabolites.push(Metabolite {
                        id: met.to_string(),
                        name: met.to_string(),
                        compartment,
                        formula: None,
                        charge: None,
                        dfg_prime: None,
                        species: None,
                        library: None,
                        concentration: None,
                        measured_m: None,
                        special: Default::default(),
                        xrefs: BTreeMap::new(),
                        sbo: None,
                    });
                    metabolites.len() - 1
                }
            };
            stoichiometry.push((index, *coef));
        }
        stoichiometry.sort_by_key(|(m, _)| *m);
        built.push(Reaction {
            id: id.to_string(),
            name: id.to_string(),
            stoichiometry,
            lower_bound: *lower,
            upper_bound: *upper,
            drg_prime: None,
            group: None,
            role: *role,
            sbo: None,
            xrefs: BTreeMap::new(),
        });
    }
    Model {
        id: "hand-made".to_string(),
        title: String::new(),
        temperature_k: 298.15,
        compartments,
        metabolites,
        reactions: built,
        scenarios: Vec::new(),
        objective: Vec::new(),
    }
}

const I: Role = Role::Internal;
const X: Role = Role::Exchange;

fn capable(analysis: &LoopAnalysis) -> Vec<(String, bool, bool)> {
    analysis
        .loop_capable
        .iter()
        .map(|r| (r.reaction.clone(), r.forward, r.backward))
        .collect()
}

fn cap(id: &str, forward: bool, backward: bool) -> (String, bool, bool) {
    (id.to_string(), forward, backward)
}

/// Every listed loop: verified, elementary, and S·v = 0 recomputed here.
fn check_loops(model: &Model, analysis: &LoopAnalysis) {
    assert!(analysis.problems.is_empty(), "{:?}", analysis.problems);
    for cycle in &analysis.loops {
        assert!(cycle.verified && cycle.elementary, "{cycle:?}");
        let mut balance = vec![0.0; model.metabolites.len()];
        for m in &cycle.members {
            for &(met, c) in &model.reactions[m.index].stoichiometry {
                balance[met] += c * m.coefficient;
            }
            let r = &model.reactions[m.index];
            assert!(if m.coefficient > 0.0 {
                r.upper_bound > 0.0
            } else {
                r.lower_bound < 0.0
            });
        }
        assert!(balance.iter().all(|b| b.abs() < 1e-9), "{balance:?}");
    }
    // Every loop-capable reaction lies on a listed loop.
    for r in &analysis.loop_capable {
        assert!(
            analysis
                .loops
                .iter()
                .any(|l| l.members.iter().any(|m| m.index == r.index)),
            "{} in no loop",
            r.reaction
        );
    }
}

// A → B → C → A, irreversible: the only closed flux is v1 = v2 = v3 > 0
// (balance of A, B, C by hand). The exchange of A is shut.
#[test]
fn three_reaction_cycle() {
    let m = model(&[
        ("R1", &[("a_c", -1.0), ("b_c", 1.0)], 0.0, 1000.0, I),
        ("R2", &[("b_c", -1.0), ("c_c", 1.0)], 0.0, 1000.0, I),
        ("R3", &[("c_c", -1.0), ("a_c", 1.0)], 0.0, 1000.0, I),
        ("EX_a", &[("a_c", -1.0)], -10.0, 1000.0, X),
    ]);
    let a = analyse_loops(&m, &LoopOptions::default()).unwrap();
    assert_eq!(a.closure.shut_reactions, vec!["EX_a"]);
    assert_eq!(
        capable(&a),
        vec![
            cap("R1", true, false),
            cap("R2", true, false),
            cap("R3", true, false)
        ]
    );
    assert_eq!(a.loops.len(), 1);
    let coefficients: Vec<f64> = a.loops[0].members.iter().map(|m| m.coefficient).collect();
    assert_eq!(coefficients, vec![1.0, 1.0, 1.0]);
    assert!(a.loops[0].integer_coefficients && !a.loops[0].reversible);
    assert_eq!(a.loops[0].metabolites, vec!["a_c", "b_c", "c_c"]);
    check_loops(&m, &a);
}

// Two reversible copies of A ⇌ B (isozymes written twice): v1 = −v2 is a
// closed flux in both directions; the pathway reactions around them are not
// on any loop (A is made only by an uptake that is shut).
#[test]
fn reversible_duplicate_pair() {
    let m = model(&[
        ("EX_a", &[("a_c", 1.0)], 0.0, 10.0, X),
        ("ISO1", &[("a_c", -1.0), ("b_c", 1.0)], -1000.0, 1000.0, I),
        ("ISO2", &[("a_c", -1.0), ("b_c", 1.0)], -1000.0, 1000.0, I),
        ("NEXT", &[("b_c", -1.0), ("d_c", 1.0)], 0.0, 1000.0, I),
        ("EX_d", &[("d_c", -1.0)], 0.0, 1000.0, X),
    ]);
    let a = analyse_loops(&m, &LoopOptions::default()).unwrap();
    assert_eq!(
        capable(&a),
        vec![cap("ISO1", true, true), cap("ISO2", true, true)]
    );
    assert_eq!(a.loops.len(), 1, "the reversed loop is the same cycle");
    let l = &a.loops[0];
    assert!(l.reversible);
    assert_eq!(l.members.len(), 2);
    assert_eq!(l.members[0].coefficient, -l.members[1].coefficient);
    check_loops(&m, &a);
}

// Transport pair between compartments: uniport A_e ⇌ A_c, antiport
// A_c + B_e ⇌ A_e + B_c, uniport B_c ⇌ B_e. Summed they cancel, so the three
// form one loop running either way; the exchanges are shut.
#[test]
fn loop_through_a_transport_pair() {
    let m = model(&[
        ("EX_a", &[("a_e", -1.0)], -10.0, 10.0, X),
        ("EX_b", &[("b_e", -1.0)], -10.0, 10.0, X),
        ("Auni", &[("a_e", -1.0), ("a_c", 1.0)], -1000.0, 1000.0, I),
        (
            "ABanti",
            &[("a_c", -1.0), ("b_e", -1.0), ("a_e", 1.0), ("b_c", 1.0)],
            -1000.0,
            1000.0,
            I,
        ),
        ("Buni", &[("b_c", -1.0), ("b_e", 1.0)], -1000.0, 1000.0, I),
    ]);
    let a = analyse_loops(&m, &LoopOptions::default()).unwrap();
    assert_eq!(
        capable(&a),
        vec![
            cap("Auni", true, true),
            cap("ABanti", true, true),
            cap("Buni", true, true)
        ]
    );
    assert_eq!(a.loops.len(), 1);
    let signs: Vec<f64> = a.loops[0].members.iter().map(|m| m.coefficient).collect();
    assert!(signs == vec![1.0, 1.0, 1.0] || signs == vec![-1.0, -1.0, -1.0]);
    check_loops(&m, &a);
}

// The brief's non-unit network: A → 2 B, B → A, B → C, C → E, 2 E → C.
// Balances: A: v1 = v2; B: 2v1 = v2 + v3 ⇒ v3 = v1; E: v4 = 2v5;
// C: v3 + v5 = v4 ⇒ v5 = v3. So v = (1, 1, 1, 2, 1): all five carry flux,
// although B → C lies on no directed cycle of the metabolite–reaction graph
// (nothing leads from C back to B).
#[test]
fn non_unit_stoichiometry_network_loops_through_an_acyclic_reaction() {
    let m = model(&[
        ("R1", &[("a_c", -1.0), ("b_c", 2.0)], 0.0, 1000.0, I),
        ("R2", &[("b_c", -1.0), ("a_c", 1.0)], 0.0, 1000.0, I),
        ("R3", &[("b_c", -1.0), ("c_c", 1.0)], 0.0, 1000.0, I),
        ("R4", &[("c_c", -1.0), ("e_c", 1.0)], 0.0, 1000.0, I),
        ("R5", &[("e_c", -2.0), ("c_c", 1.0)], 0.0, 1000.0, I),
    ]);
    let a = analyse_loops(&m, &LoopOptions::default()).unwrap();
    assert_eq!(a.loop_capable.len(), 5);
    assert_eq!(a.pruning.removed_reactions, 0);
    assert_eq!(a.loops.len(), 1);
    let coefficients: Vec<f64> = a.loops[0].members.iter().map(|m| m.coefficient).collect();
    assert_eq!(coefficients, vec![1.0, 1.0, 1.0, 2.0, 1.0]);
    check_loops(&m, &a);
}

// A linear pathway with a reversible step and a side branch: no closed flux
// (every metabolite chain ends in a shut exchange), so no loop.
#[test]
fn network_without_loop() {
    let m = model(&[
        ("EX_a", &[("a_e", 1.0)], 0.0, 10.0, X),
        ("T", &[("a_e", -1.0), ("a_c", 1.0)], -1000.0, 1000.0, I),
        ("R1", &[("a_c", -1.0), ("b_c", 1.0)], -1000.0, 1000.0, I),
        ("R2", &[("b_c", -1.0), ("c_c", 2.0)], 0.0, 1000.0, I),
        ("R3", &[("c_c", -1.0), ("d_c", 1.0)], -1000.0, 1000.0, I),
        ("R4", &[("b_c", -1.0), ("d_c", 1.0)], 0.0, 1000.0, I),
        ("BIOMASS", &[("d_c", -1.0)], 0.0, 1000.0, Role::Biomass),
    ]);
    let a = analyse_loops(&m, &LoopOptions::default()).unwrap();
    assert!(a.loop_capable.is_empty());
    assert!(a.loops.is_empty());
    assert_eq!(a.closure.shut_reactions, vec!["EX_a", "BIOMASS"]);
    // Dead ends alone settle it: a_e, then everything upstream of the shut ends.
    assert_eq!(a.pruning.removed_reactions, 5);
    assert_eq!(a.stats.capability_lp_solves, 0);
}

// Directions are exact: A → B (irreversible) with B ⇌ A (reversible) loops
// only as v1 = v2 > 0, so the reversible step can run forward only. A
// forcing lower bound (3) is relaxed to 0 and reported.
#[test]
fn reversible_reaction_in_series_with_an_irreversible_one_loops_one_way() {
    let m = model(&[
        ("R1", &[("a_c", -1.0), ("b_c", 1.0)], 3.0, 1000.0, I),
        ("R2", &[("b_c", -1.0), ("a_c", 1.0)], -1000.0, 1000.0, I),
        ("R3", &[("b_c", -1.0), ("d_c", 1.0)], -1000.0, 1000.0, I),
        ("R4", &[("d_c", -1.0), ("b_c", 1.0)], -1000.0, 1000.0, I),
    ]);
    let a = analyse_loops(&m, &LoopOptions::default()).unwrap();
    assert_eq!(a.closure.relaxed_bounds.len(), 1);
    assert_eq!(a.closure.relaxed_bounds[0].reaction, "R1");
    assert_eq!(a.closure.relaxed_bounds[0].relaxed_lower_bound, 0.0);
    assert_eq!(
        capable(&a),
        vec![
            cap("R1", true, false),
            cap("R2", true, false),
            cap("R3", true, true),
            cap("R4", true, true),
        ]
    );
    check_loops(&m, &a);
}

// A reversible direction that neither pruning nor coupling settles:
// A ⇌ B (R1), two parallel irreversible B → C (R2, R7), C → A (R3),
// C ⇌ A (R4), and a reversible duplicate pair B ⇌ E (R5, R6). Balance of B:
// v1 = v2 + v7 (the pair cancels), so v1 ≥ 0 although R1 is reversible and
// proportional to neither R2 nor R7; R4 runs both ways (against R3 or
// against R1 + R2). Only the per-direction LP can prove R1 backward blocked.
#[test]
fn reversible_member_of_an_irreversible_cycle_is_one_way() {
    let m = model(&[
        ("R1", &[("a_c", -1.0), ("b_c", 1.0)], -1000.0, 1000.0, I),
        ("R2", &[("b_c", -1.0), ("c_c", 1.0)], 0.0, 1000.0, I),
        ("R3", &[("c_c", -1.0), ("a_c", 1.0)], 0.0, 1000.0, I),
        ("R4", &[("c_c", -1.0), ("a_c", 1.0)], -1000.0, 1000.0, I),
        ("R5", &[("b_c", -1.0), ("e_c", 1.0)], -1000.0, 1000.0, I),
        ("R6", &[("e_c", -1.0), ("b_c", 1.0)], -1000.0, 1000.0, I),
        ("R7", &[("b_c", -1.0), ("c_c", 1.0)], 0.0, 1000.0, I),
    ]);
    let a = analyse_loops(&m, &LoopOptions::default()).unwrap();
    assert_eq!(a.pruning.narrowed_reactions, 0);
    assert_eq!(
        capable(&a),
        vec![
            cap("R1", true, false),
            cap("R2", true, false),
            cap("R3", true, false),
            cap("R4", true, true),
            cap("R5", true, true),
            cap("R6", true, true),
            cap("R7", true, false),
        ]
    );
    assert!(a.stats.direction_lps >= 1);
    check_loops(&m, &a);
}

// Loops meet published ΔrG'° values: the same reaction ATP + H2O = ADP + Pi
// written twice (isozymes), one with ΔrG'° at 298.15 K and one, by mistake,
// with the value at 313.15 K (both pH 7, I = 0.25 M; Alberty 2003,
// Thermodynamics of Biochemical Reactions, pp. 220 and 290: −36.0353 and
// −36.6852 kJ/mol). Around the loop ISO1 forward + ISO2 backward the sum is
// −36.0353 + 36.6852 = 0.6499 kJ/mol instead of 0.
#[test]
fn inconsistent_cycle_energy_from_mixed_temperatures() {
    let m = model(&[
        (
            "ISO1",
            &[
                ("atp_c", -1.0),
                ("h2o_c", -1.0),
                ("adp_c", 1.0),
                ("pi_c", 1.0),
            ],
            -1000.0,
            1000.0,
            I,
        ),
        (
            "ISO2",
            &[
                ("atp_c", -1.0),
                ("h2o_c", -1.0),
                ("adp_c", 1.0),
                ("pi_c", 1.0),
            ],
            -1000.0,
            1000.0,
            I,
        ),
    ]);
    let a = analyse_loops(&m, &LoopOptions::default()).unwrap();
    assert_eq!(a.loops.len(), 1);
    let data = |sigma: f64| {
        vec![
            Some(StandardDeltaG {
                value_kj: -36.0353,
                sigma_kj: sigma,
            }),
            Some(StandardDeltaG {
                value_kj: -36.6852,
                sigma_kj: sigma,
            }),
        ]
    };
    // 1.96: two-sided 95 % normal quantile (common practice).
    let options = LoopEnergyOptions {
        confidence: 1.96,
        recheck_limit: None,
    };
    // σ = 0.1 and 0.5 below: invented for this test.
    // σ = 0.1 each: k·σ_sum = 1.96·0.1414 = 0.277 < 0.6499 → inconsistent.
    let energies = assess_loop_energies(&m, &a, &data(0.1), &[], &options).unwrap();
    let e = &energies[0];
    assert!((e.sum_kj.abs() - 0.6499).abs() < 1e-9, "{}", e.sum_kj);
    assert!((e.sigma_kj - 0.1 * 2f64.sqrt()).abs() < 1e-12);
    assert!(e.inconsistent);
    assert!((e.deviation_sigmas.unwrap() - 0.6499 / (0.1 * 2f64.sqrt())).abs() < 1e-6);
    // σ = 0.5 each: k·σ_sum = 1.386 > 0.6499 → within uncertainty.
    let energies = assess_loop_energies(&m, &a, &data(0.5), &[], &options).unwrap();
    assert!(!energies[0].inconsistent);

    // ΔG' ranges (ΔrG'° ± RT ln 10⁶ ≈ ±34.25 kJ/mol, a common-practice
    // concentration span of 1 µM–1 M): whichever way the loop runs, the
    // member running ATP synthesis (backward) has ΔG'_min > 0 and is named;
    // forbidding that direction leaves the other orientation only, so the
    // loop as listed no longer runs.
    // R: CODATA 2018 (constants.csv).
    let span = 8.314462618e-3 * 298.15 * (1e6f64).ln();
    let ranges = vec![
        Some(DeltaGRange {
            min_kj: -36.0353 - span,
            max_kj: -36.0353 + span,
        }),
        Some(DeltaGRange {
            min_kj: -36.6852 - span,
            max_kj: -36.6852 + span,
        }),
    ];
    let energies = assess_loop_energies(&m, &a, &data(0.1), &ranges, &options).unwrap();
    let e = &energies[0];
    let named = e.constrain.as_ref().unwrap();
    assert_eq!(named.forbid, "backward");
    let backward_member = a.loops[0]
        .members
        .iter()
        .find(|m| m.coefficient < 0.0)
        .unwrap();
    assert_eq!(named.reaction, backward_member.reaction);
    let expected = if named.reaction == "ISO1" {
        36.0353 - span
    } else {
        36.6852 - span
    };
    assert!((named.dg_min_in_loop_direction_kj - expected).abs() < 1e-9);
    assert!(named.rechecked.as_ref().unwrap().breaks_loop);
    let reversed = e.constrain_reversed.as_ref().unwrap();
    assert_eq!(reversed.forbid, "backward");
    assert_ne!(reversed.reaction, named.reaction);
}

// Constraining a member does not always break the loop's reactions: with a
// third copy, forbidding one backward direction leaves the other two copies
// looping (R2 ⇌ R3), which the re-check reports.
#[test]
fn constraint_recheck_reports_remaining_loops() {
    let eq: &[(&str, f64)] = &[("a_c", -1.0), ("b_c", 1.0)];
    let m = model(&[
        ("R1", eq, -1000.0, 1000.0, I),
        ("R2", eq, -1000.0, 1000.0, I),
        ("R3", eq, -1000.0, 1000.0, I),
    ]);
    let a = analyse_loops(&m, &LoopOptions::default()).unwrap();
    let first = &a.loops[0];
    let ranges: Vec<Option<DeltaGRange>> = (0..3)
        .map(|r| {
            // Only the first loop's backward member gets a range that
            // makes it stand out (ranges invented for this test).
            let backward = first
                .members
                .iter()
                .any(|m| m.index == r && m.coefficient < 0.0);
            Some(if backward {
                DeltaGRange {
                    min_kj: -20.0,
                    max_kj: -10.0,
                }
            } else {
                DeltaGRange {
                    min_kj: -1.0,
                    max_kj: 1.0,
                }
            })
        })
        .collect();
    // 1.96: two-sided 95 % normal quantile (common practice).
    let options = LoopEnergyOptions {
        confidence: 1.96,
        recheck_limit: None,
    };
    let energies = assess_loop_energies(&m, &a, &[], &ranges, &options).unwrap();
    let named = energies[0].constrain.as_ref().unwrap();
    assert_eq!(named.forbid, "backward");
    assert!((named.dg_min_in_loop_direction_kj - 10.0).abs() < 1e-12);
    let recheck = named.rechecked.as_ref().unwrap();
    // The forward member can still loop forward against the third copy.
    assert!(!recheck.breaks_loop);
    assert_eq!(recheck.still_looping.len(), 1);
}

// Energy-generating cycle (Fritzemeier et al., PLoS Comput. Biol. 13 (2017)
// e1005494): an internal reaction making ATP from ADP + Pi with nothing
// consumed lets ATP + H2O → ADP + Pi + H+ run in the closed network.
#[test]
fn energy_generating_cycle_found_and_absent() {
    let hydrolysis: &[(&str, f64)] = &[
        ("atp_c", -1.0),
        ("h2o_c", -1.0),
        ("adp_c", 1.0),
        ("pi_c", 1.0),
        ("h_c", 1.0),
    ];
    let kinase: &[(&str, f64)] = &[
        ("atp_c", -1.0),
        ("glc_c", -1.0),
        ("adp_c", 1.0),
        ("g6p_c", 1.0),
        ("h_c", 1.0),
    ];
    let bogus: Vec<(&str, f64)> = hydrolysis.iter().map(|&(m, c)| (m, -c)).collect();
    let with_cycle = model(&[
        ("HEX", kinase, 0.0, 1000.0, I),
        ("FREE_ATP", &bogus, 0.0, 1000.0, I),
    ]);
    let result = energy_generating_cycles(&with_cycle, &CurrencyOptions::default()).unwrap();
    let atp: Vec<_> = result
        .results
        .iter()
        .filter(|r| r.test.currency == "atp")
        .collect();
    assert_eq!(atp.len(), 1);
    assert_eq!(atp[0].test.compartment, "c");
    assert!(atp[0].cycle_exists);
    assert_eq!(atp[0].example.len(), 1);
    assert_eq!(atp[0].example[0].reaction, "FREE_ATP");
    assert!((atp[0].example[0].coefficient - 1.0).abs() < 1e-9);
    assert!(result.not_testable.contains(&"nadh".to_string()));

    let without = model(&[
        ("HEX", kinase, 0.0, 1000.0, I),
        (
            "H2O_dummy",
            &[("h2o_c", -1.0), ("pi_c", -1.0), ("h_c", 1.0)],
            0.0,
            0.0,
            I,
        ),
    ]);
    let result = energy_generating_cycles(&without, &CurrencyOptions::default()).unwrap();
    let atp: Vec<_> = result
        .results
        .iter()
        .filter(|r| r.test.currency == "atp")
        .collect();
    assert_eq!(atp.len(), 1);
    assert!(!atp[0].cycle_exists);
    assert!(atp[0].example.is_empty());
}

// The override map replaces recognition by id: metabolites named in
// another scheme are found when listed.
#[test]
fn currency_override_map() {
    let model = model(&[(
        "MAKE",
        &[
            ("X1_c", 1.0),
            ("X2_c", -1.0),
            ("X3_c", -1.0),
            ("X4_c", -1.0),
        ],
        0.0,
        1000.0,
        I,
    )]);
    let mut overrides = BTreeMap::new();
    overrides.insert("nadh".to_string(), vec!["X1_c".to_string()]);
    overrides.insert("nad".to_string(), vec!["X2_c".to_string()]);
    overrides.insert("h".to_string(), vec!["X3_c".to_string()]);
    let options = CurrencyOptions {
        overrides,
        proton_gradients: Some(Vec::new()),
    };
    let result = energy_generating_cycles(&model, &options).unwrap();
    let nadh: Vec<_> = result
        .results
        .iter()
        .filter(|r| r.test.currency == "nadh")
        .collect();
    assert_eq!(nadh.len(), 1);
    assert_eq!(
        nadh[0].test.equation,
        vec![
            ("X1_c".to_string(), -1.0),
            ("X2_c".to_string(), 1.0),
            ("X3_c".to_string(), 1.0)
        ]
    );
    // MAKE consumes X4 as well, which nothing supplies: no cycle.
    assert!(!nadh[0].cycle_exists);
}

// Recognition by cross reference when ids follow no known scheme: KEGG
// compound ids of ATP (C00002), ADP (C00008), orthophosphate (C00009), water
// (C00001) and H+ (C00080), from memory. A free ATP-regenerating reaction is
// then caught as an energy-generating cycle (Fritzemeier et al. 2017).
#[test]
fn currency_recognised_by_kegg_cross_reference() {
    let mut m = model(&[(
        "MAKE",
        &[
            ("s1_c", -1.0),
            ("s2_c", -1.0),
            ("s3_c", -1.0),
            ("s4_c", 1.0),
            ("s5_c", 1.0),
        ],
        0.0,
        1000.0,
        I,
    )]);
    for (id, kegg) in [
        ("s1_c", "C00008"),
        ("s2_c", "C00009"),
        ("s3_c", "C00080"),
        ("s4_c", "C00002"),
        ("s5_c", "C00001"),
    ] {
        let index = m.metabolite_index(id).unwrap();
        m.metabolites[index]
            .xrefs
            .insert("kegg.compound".to_string(), vec![kegg.to_string()]);
    }
    let result = energy_generating_cycles(&m, &CurrencyOptions::default()).unwrap();
    let atp: Vec<_> = result
        .results
        .iter()
        .filter(|r| r.test.currency == "atp")
        .collect();
    assert_eq!(atp.len(), 1);
    assert_eq!(
        atp[0].test.equation,
        vec![
            ("s4_c".to_string(), -1.0),
            ("s5_c".to_string(), -1.0),
            ("s1_c".to_string(), 1.0),
            ("s2_c".to_string(), 1.0),
            ("s3_c".to_string(), 1.0),
        ]
    );
    assert!(atp[0].cycle_exists);
    assert_eq!(atp[0].example[0].reaction, "MAKE");
}

// The results are plain serialisable data (report.json and the site read
// them): ids, directions and coefficients survive a JSON round of serde.
#[test]
fn results_serialise_to_json() {
    let m = model(&[
        ("R1", &[("a_c", -1.0), ("b_c", 2.0)], 0.0, 1000.0, I),
        ("R2", &[("b_c", -2.0), ("a_c", 1.0)], -1000.0, 1000.0, I),
    ]);
    let a = analyse_loops(&m, &LoopOptions::default()).unwrap();
    let json = serde_json::to_value(&a).unwrap();
    assert_eq!(json["loop_capable"][0]["reaction"], "R1");
    // R1 makes 2 B from A, R2 (reversible) can only close it forward.
    assert_eq!(json["loop_capable"][1]["forward"], true);
    assert_eq!(json["loop_capable"][1]["backward"], false);
    let members = &json["loops"][0]["members"];
    assert_eq!(members[0]["coefficient"], 1.0);
    assert_eq!(members[1]["coefficient"], 1.0);
    assert_eq!(json["loops"][0]["metabolites"][1], "b_c");
    let cycles = energy_generating_cycles(&m, &CurrencyOptions::default()).unwrap();
    assert!(serde_json::to_string(&cycles)
        .unwrap()
        .contains("not_testable"));
}
