//! Flux scenarios judged jointly: feasibility, minimal conflicting sets,
//! max-min driving force, repairs and the loop law on the flux. Every LP
//! answer is checked by substituting it back ([`substituted`]).

use gibbsite::analysis::Analysis;
use gibbsite::scenarios::{
    self, Binding, JointOutcome, JointProblem, JointVarKind, Repair, ScenarioOptions,
    ScenarioResult,
};
use gibbsite::Project;

/// R = 8.314 462 618 J K⁻¹ mol⁻¹ (CODATA 2018, exact), T = 298.15 K:
/// RT = 2.478957 kJ/mol.
const RT: f64 = 8.314_462_618e-3 * 298.15;

fn project(model: &str, settings: &str) -> (tempfile::TempDir, Project) {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("model.yaml"), model).unwrap();
    std::fs::write(
        dir.path().join("gibbsite.yaml"),
        format!("model: model.yaml\nloops: false\n{settings}"),
    )
    .unwrap();
    let project = Project::load(dir.path()).unwrap_or_else(|e| panic!("{e}"));
    (dir, project)
}

fn scenario<'a>(analysis: &'a Analysis, id: &str) -> &'a ScenarioResult {
    analysis
        .scenarios
        .iter()
        .find(|s| s.id == id)
        .unwrap_or_else(|| panic!("no scenario {id}"))
}

fn reaction_id(analysis: &Analysis, problem: &JointProblem, step: usize) -> String {
    analysis.model.reactions[problem.steps[step].reaction]
        .id
        .clone()
}

/// The helper every test uses: substitutes an LP answer back into the
/// problem it answers and returns the largest violation. For the joint LP,
/// `values` are the problem's variables and `b` the driving force claimed.
fn substituted(problem: &JointProblem, subset: &[usize], values: &[f64], b: f64) -> f64 {
    let (lp, used, _) = problem.mdf_program(subset);
    let mut z: Vec<f64> = used.iter().map(|&k| values[k]).collect();
    z.push(b);
    let violation = lp.max_violation(&z);
    // And directly, row by row: every step's ΔG' in its flux direction ≤ −b.
    let direct = subset
        .iter()
        .map(|&s| problem.step_dg(s, values) + b)
        .fold(0.0f64, f64::max);
    violation.max(direct)
}

const CHAIN: &str = "id: chain
compartments: [{id: c}]
metabolites:
  - {id: a, compartment: c}
  - {id: b, compartment: c}
  - {id: d, compartment: c}
  - {id: e, compartment: c}
reactions:
  - {id: AB, equation: a -> b, reaction_energy: {value: 10 kJ/mol, sigma: 0}}
  - {id: BD, equation: b -> d, reaction_energy: {value: 10 kJ/mol, sigma: 0}}
  - {id: DE, equation: d -> e, reaction_energy: {value: 10 kJ/mol, sigma: 0}}
  - {id: EX_a, equation: a <->, role: exchange}
  - {id: EX_e, equation: e <->, role: exchange}
scenarios:
  - {id: run, fluxes: {EX_a: -1, AB: 1, BD: 1, DE: 1, EX_e: 1}}
";

const CHAIN_SETTINGS: &str =
    "default_concentration: {min: 1 uM, max: 10 mM}\nmin_driving_force: 0 kJ/mol\n";

/// The chain a → b → d → e, each step ΔrG'° = +10 kJ/mol, every
/// concentration in [1 µM, 10 mM], 298.15 K, all three steps forward.
/// Each step alone: best ΔG' = 10 + RT·ln(1e-6/1e-2) = 10 − 22.83 =
/// −12.83 kJ/mol (RT·ln 10⁴ = 2.478957 × 9.210340 = 22.832 kJ/mol), so each is
/// "consistent" alone. Together: Σ ΔG' = 30 + RT·ln([e]/[a]) ≥ 30 − 22.832
/// = +7.168 kJ/mol > 0, so the three cannot run at once. ΔrG'° values
/// invented for this test; [1 µM, 10 mM] is the common practice default
/// range; the rest is arithmetic.
#[test]
fn chain_feasible_step_by_step_is_jointly_infeasible() {
    let (_dir, project) = project(CHAIN, CHAIN_SETTINGS);
    let analysis = Analysis::new(&project.model, &project.settings);
    // Alone, every step is consistent.
    for id in ["AB", "BD", "DE"] {
        let j = project.model.reaction_index(id).unwrap();
        assert_eq!(
            analysis.verdict(j, 1.0),
            gibbsite::report::Verdict::Consistent
        );
    }
    let run = scenario(&analysis, "run");
    let Ok(JointOutcome::Infeasible { mdf, conflicts, .. }) = &run.outcome else {
        panic!("{:?}", run.outcome);
    };
    // The MDF LP's answer satisfies its rows with its own B.
    let all: Vec<usize> = (0..run.problem.steps.len()).collect();
    assert!(substituted(&run.problem, &all, &mdf.values, mdf.value_kj) < 1e-6);
    // Hand MDF: 3B ≤ −30 + 22.832 → B = −2.389 kJ/mol.
    assert!((mdf.value_kj - (-(30.0 - RT * 1e4f64.ln()) / 3.0)).abs() < 1e-6);
    assert_eq!(conflicts.len(), 1, "{conflicts:?}");
    let set = &conflicts[0];
    let ids: Vec<String> = set
        .steps
        .iter()
        .map(|&s| reaction_id(&analysis, &run.problem, s))
        .collect();
    assert_eq!(ids, ["AB", "BD", "DE"], "pathway order");
    let expected = 30.0 - RT * 1e4f64.ln();
    assert!((expected - 7.17).abs() < 0.01, "{expected}");
    assert!((set.overall_kj - 7.17).abs() < 0.01, "{}", set.overall_kj);
    assert_eq!(set.weights, vec![1.0, 1.0, 1.0]);
    // Binding: a at its maximum, e at its minimum.
    let binding: Vec<(String, bool)> = set
        .binding
        .iter()
        .map(|b| match *b {
            Binding::Variable(k, up) => match run.problem.vars[k].kind {
                JointVarKind::LnConcentration { metabolite } => {
                    (project.model.metabolites[metabolite].id.clone(), up)
                }
                other => panic!("{other:?}"),
            },
            other => panic!("{other:?}"),
        })
        .collect();
    assert_eq!(binding, [("a".to_string(), true), ("e".to_string(), false)]);
    // Irreducible: drop any one step and the rest can run.
    for drop in 0..3 {
        let rest: Vec<usize> = (0..3).filter(|&s| s != drop).collect();
        let d = run.problem.decide(&rest).unwrap().unwrap();
        assert!(d.is_feasible());
        assert!(substituted(&run.problem, &rest, &d.primal().values, 0.0) < 1e-6);
    }
    // Smallest repair on an end metabolite: 7.168 / (RT ln 10 = 5.708) =
    // 1.2558 decades.
    let (metabolite, decades, upper, new_bound) = set
        .repairs
        .iter()
        .find_map(|r| match *r {
            Repair::WidenRange {
                metabolite,
                decades,
                upper,
                new_bound_m,
            } if ["a", "e"].contains(&project.model.metabolites[metabolite].id.as_str()) => {
                Some((metabolite, decades, upper, new_bound_m))
            }
            _ => None,
        })
        .expect("a widening of a or e");
    assert!(
        (decades - expected / (RT * 10f64.ln())).abs() < 1e-6,
        "{decades}"
    );
    // Apply it (as the curator would) and the scenario becomes feasible.
    let id = &project.model.metabolites[metabolite].id;
    let (min, max) = if upper {
        (1e-6, new_bound * (1.0 + 1e-9))
    } else {
        (new_bound * (1.0 - 1e-9), 1e-2)
    };
    let widened = CHAIN.replace(
        &format!("  - {{id: {id}, compartment: c}}"),
        &format!("  - {{id: {id}, compartment: c, concentration: {{min: {min} M, max: {max} M}}}}"),
    );
    assert_ne!(widened, CHAIN);
    let (_dir2, repaired) = project_with_text(&widened);
    let analysis = Analysis::new(&repaired.model, &repaired.settings);
    let run = scenario(&analysis, "run");
    let Ok(JointOutcome::Feasible(Some(mdf))) = &run.outcome else {
        panic!("{:?}", run.outcome);
    };
    assert!(mdf.value_kj >= -1e-6, "{}", mdf.value_kj);
    let all: Vec<usize> = (0..3).collect();
    assert!(substituted(&run.problem, &all, &mdf.values, 0.0) < 1e-6);
    // The ΔrG'° shift repair of any one step is the same 7.168 kJ/mol.
    let shift = set
        .repairs
        .iter()
        .find_map(|r| match r {
            Repair::ShiftEnergy { shift_kj, .. } => Some(*shift_kj),
            _ => None,
        })
        .unwrap();
    assert!((shift - expected).abs() < 1e-6, "{shift}");
}

fn project_with_text(model: &str) -> (tempfile::TempDir, Project) {
    project(model, CHAIN_SETTINGS)
}

/// MDF worked by hand: a → b (ΔrG'° −5 kJ/mol) → c (−1 kJ/mol), σ 0,
/// concentrations in [1 µM, 10 mM]. Adding the rows −5 + RT ln(b/a) ≤ −B
/// and −1 + RT ln(c/b) ≤ −B: −6 + RT ln(c/a) ≤ −2B with ln(c/a) ≥ ln 1e-4,
/// so B = (6 + 22.832)/2 = 14.416 kJ/mol, at a = 10 mM, c = 1 µM and
/// ln(b/a) = (5 − 14.416)/RT = −3.798 → b = 0.224 mM (inside its range).
/// Both steps bind with dual value ½ (each kJ/mol gained on either step
/// raises B by half of it). ΔrG'° values invented for this test.
#[test]
fn max_min_driving_force_of_a_small_pathway() {
    let model = "id: mdf
compartments: [{id: c}]
metabolites:
  - {id: a, compartment: c}
  - {id: b, compartment: c}
  - {id: c, compartment: c}
reactions:
  - {id: R1, equation: a -> b, reaction_energy: {value: -5 kJ/mol, sigma: 0}}
  - {id: R2, equation: b -> c, reaction_energy: {value: -1 kJ/mol, sigma: 0}}
";
    let (_dir, project) = project(
        model,
        "default_concentration: {min: 1 uM, max: 10 mM}\nmin_driving_force: 1 kJ/mol\n",
    );
    let analysis = Analysis::new(&project.model, &project.settings);
    let default = scenario(&analysis, scenarios::DEFAULT_SCENARIO_ID);
    let Ok(JointOutcome::Feasible(Some(mdf))) = &default.outcome else {
        panic!("{:?}", default.outcome);
    };
    let b = (6.0 + RT * 1e4f64.ln()) / 2.0;
    assert!((b - 14.416).abs() < 0.001);
    assert!((mdf.value_kj - b).abs() < 1e-6, "{}", mdf.value_kj);
    assert!(substituted(&default.problem, &[0, 1], &mdf.values, mdf.value_kj) < 1e-6);
    assert_eq!(mdf.bottlenecks.len(), 2);
    for &(_, y) in &mdf.bottlenecks {
        assert!((y - 0.5).abs() < 1e-6, "{y}");
    }
    let conc = |id: &str| {
        let i = project.model.metabolite_index(id).unwrap();
        mdf.concentrations.iter().find(|c| c.0 == i).unwrap().1
    };
    assert!((conc("a") - 1e-2).abs() < 1e-9);
    assert!((conc("c") - 1e-6).abs() < 1e-12);
    let expect_b = 1e-2 * ((5.0 - b) / RT).exp();
    assert!((conc("b") - expect_b).abs() < 1e-9, "{}", conc("b"));
    assert!((conc("b") - 0.224e-3).abs() < 0.001e-3);
    assert_eq!(
        scenarios::mdf::reading(mdf.value_kj),
        "the weakest step has at most 14.4 kJ/mol of driving force"
    );
}

/// Two reactions share b, whose ΔfG'° = +3 kJ/mol has σ = 2 kJ/mol; a and
/// c have ΔfG'° 0 and +1 (σ 0); concentrations fixed at 1 mM (so RT ln Q =
/// 0). With ε the error of b's ΔfG'°: a → b has ΔG' = 3 + ε, b → c has
/// ΔG' = 1 − 3 − ε = −2 − ε. Both negative needs ε < −3 and ε > −2: no single
/// value, though each step alone is fine within k·σ = 1.96 × 2 = 3.92 (a → b
/// with ε = −3.5, b → c with ε = −1). Two independent copies of ε would make it
/// feasible; one shared variable makes it infeasible. ΔfG'° and σ values
/// invented for this test; 1.96: 95 % normal quantile (common practice).
#[test]
fn a_shared_formation_error_takes_one_value() {
    let model = "id: shared
compartments: [{id: c}]
metabolites:
  - {id: a, compartment: c, formation_energy: {value: 0, sigma: 0}}
  - {id: b, compartment: c, formation_energy: {value: 3, sigma: 2}}
  - {id: c, compartment: c, formation_energy: {value: 1, sigma: 0}}
reactions:
  - {id: R1, equation: a -> b}
  - {id: R2, equation: b -> c}
";
    let (_dir, project) = project(
        model,
        "default_concentration: {min: 1 mM, max: 1 mM}\nmin_driving_force: 0 kJ/mol\n",
    );
    let analysis = Analysis::new(&project.model, &project.settings);
    // Two-sided 95 % normal quantile (common practice; digits from memory).
    assert!((analysis.sigma_multiplier - 1.959964).abs() < 1e-6);
    for j in 0..2 {
        assert_ne!(
            analysis.verdict(j, 1.0),
            gibbsite::report::Verdict::Contradiction
        );
    }
    let default = scenario(&analysis, scenarios::DEFAULT_SCENARIO_ID);
    // One deviation variable for b's error, not one per reaction.
    let deviations = default
        .problem
        .vars
        .iter()
        .filter(|v| matches!(v.kind, JointVarKind::Deviation { .. }))
        .count();
    // a, b and c one source each (a and c at σ 0): 3, not 4.
    assert_eq!(deviations, 3);
    let Ok(JointOutcome::Infeasible { mdf, conflicts, .. }) = &default.outcome else {
        panic!("{:?}", default.outcome);
    };
    assert!(substituted(&default.problem, &[0, 1], &mdf.values, mdf.value_kj) < 1e-6);
    // Hand MDF: B ≤ −3 − ε and B ≤ 2 + ε → best ε = −2.5, B = −0.5 kJ/mol.
    assert!((mdf.value_kj + 0.5).abs() < 1e-6, "{}", mdf.value_kj);
    assert_eq!(conflicts.len(), 1);
    assert_eq!(conflicts[0].steps.len(), 2);
    // Overall a → c: +1 kJ/mol whatever ε is.
    assert!((conflicts[0].overall_kj - 1.0).abs() < 1e-9);

    // The same numbers with two independent copies of ε are feasible: the
    // LP with b's error duplicated per reaction (what must not happen).
    let mut split = default.problem.clone();
    let b_var = split.steps[1]
        .terms
        .iter()
        .find(|&&(k, _)| {
            matches!(split.vars[k].kind, JointVarKind::Deviation { .. })
                && split.vars[k].upper > 0.0
        })
        .unwrap()
        .0;
    let copy = split.vars[b_var].clone();
    split.vars.push(gibbsite::scenarios::feasibility::JointVar {
        kind: JointVarKind::Deviation { source: 999 },
        ..copy
    });
    let new = split.vars.len() - 1;
    for t in &mut split.steps[1].terms {
        if t.0 == b_var {
            t.0 = new;
        }
    }
    let d = split.decide(&[0, 1]).unwrap().unwrap();
    assert!(d.is_feasible(), "{:?}", d.primal().value_kj);
    assert!(substituted(&split, &[0, 1], &d.primal().values, 0.0) < 1e-6);
}

/// A flux with a known cycle: EX_a takes up 1, R1 a → b carries 3, R2
/// b → c and R3 c → a carry 2 each (a cycle R1-R2-R3 carrying 2), R4 b → d
/// and EX_d carry 1. Steady state: a: +1 − 3 + 2 = 0, b: 3 − 2 − 1 = 0, c: 2 − 2,
/// d: 1 − 1. The loop-free flux keeps EX_a = −1 and EX_d = 1 with R1 = R4 = 1,
/// R2 = R3 = 0.
#[test]
fn the_loop_law_finds_the_cycle_and_removes_it() {
    let model = "id: cyc
compartments: [{id: c}]
metabolites:
  - {id: a, compartment: c}
  - {id: b, compartment: c}
  - {id: c, compartment: c}
  - {id: d, compartment: c}
reactions:
  - {id: R1, equation: a -> b}
  - {id: R2, equation: b <-> c}
  - {id: R3, equation: c -> a}
  - {id: R4, equation: b -> d}
  - {id: EX_a, equation: a <->, role: exchange}
  - {id: EX_d, equation: d <->, role: exchange}
scenarios:
  - {id: spin, fluxes: {EX_a: -1, R1: 3, R2: 2, R3: 2, R4: 1, EX_d: 1}}
  - {id: straight, fluxes: {EX_a: -1, R1: 1, R4: 1, EX_d: 1}}
";
    let (_dir, project) = project(model, "");
    let analysis = Analysis::new(&project.model, &project.settings);
    let spin = scenario(&analysis, "spin");
    let result = spin.loop_law.as_ref().unwrap().as_ref().unwrap();
    assert!(!result.loop_free);
    assert_eq!(result.cycles.len(), 1);
    let ids: Vec<(String, f64)> = result.cycles[0]
        .members
        .iter()
        .map(|&(j, c)| (project.model.reactions[j].id.clone(), c))
        .collect();
    assert_eq!(
        ids,
        [("R1".into(), 1.0), ("R2".into(), 1.0), ("R3".into(), 1.0)]
    );
    assert!((result.cycles[0].flux - 2.0).abs() < 1e-9);
    let corrected: Vec<(String, f64, f64)> = result
        .cycle_free
        .iter()
        .map(|&(j, v, w)| (project.model.reactions[j].id.clone(), v, w))
        .collect();
    let expect = [
        ("R1", 3.0, 1.0),
        ("R2", 2.0, 0.0),
        ("R3", 2.0, 0.0),
        ("R4", 1.0, 1.0),
        ("EX_a", -1.0, -1.0),
        ("EX_d", 1.0, 1.0),
    ];
    for (id, given, free) in expect {
        let row = corrected.iter().find(|r| r.0 == id).unwrap();
        assert!((row.1 - given).abs() < 1e-12, "{id}");
        assert!((row.2 - free).abs() < 1e-9, "{id}: {}", row.2);
        // Never reversed, never larger.
        assert!(row.2 * row.1 >= 0.0 && row.2.abs() <= row.1.abs() + 1e-12);
    }
    // Substituted back: the corrected flux is at steady state…
    for i in 0..project.model.metabolites.len() {
        let net: f64 = result
            .cycle_free
            .iter()
            .map(|&(j, _, w)| {
                project.model.reactions[j]
                    .stoichiometry
                    .iter()
                    .filter(|&&(m, _)| m == i)
                    .map(|&(_, nu)| nu * w)
                    .sum::<f64>()
            })
            .sum();
        assert!(net.abs() < 1e-9, "metabolite {i}: {net}");
    }
    // …and obeys the loop law (potentials exist).
    let active: Vec<(usize, f64)> = result
        .cycle_free
        .iter()
        .filter(|&&(j, _, w)| analysis.is_thermodynamic(j) && w.abs() > 1e-9)
        .map(|&(j, _, w)| (j, w))
        .collect();
    assert!(scenarios::loop_law::obeys_loop_law(&project.model, &active).unwrap());
    // The straight flux obeys the loop law as given.
    let straight = scenario(&analysis, "straight");
    let result = straight.loop_law.as_ref().unwrap().as_ref().unwrap();
    assert!(result.loop_free && result.cycles.is_empty());
    let _ = ScenarioOptions::default();
}

/// Two independent conflicts in one scenario: the chain above and a second
/// chain p → q → r with the same numbers. The default search finds both
/// (blocking the heaviest member of the first leaves the second); with
/// `conflict_sets: 0` only the first is listed and the search says it
/// stopped at its limit.
#[test]
fn further_conflicting_sets_and_their_limit() {
    let model = CHAIN.replace(
        "  - {id: EX_a, equation: a <->, role: exchange}",
        "  - {id: PQ, equation: p -> q, reaction_energy: {value: 10 kJ/mol, sigma: 0}}
  - {id: QR, equation: q -> r, reaction_energy: {value: 10 kJ/mol, sigma: 0}}
  - {id: RS, equation: r -> s, reaction_energy: {value: 10 kJ/mol, sigma: 0}}
  - {id: EX_a, equation: a <->, role: exchange}",
    );
    let model = model.replace(
        "  - {id: e, compartment: c}",
        "  - {id: e, compartment: c}
  - {id: p, compartment: c}
  - {id: q, compartment: c}
  - {id: r, compartment: c}
  - {id: s, compartment: c}",
    );
    let model = model.replace("DE: 1, EX_e: 1}", "DE: 1, EX_e: 1, PQ: 1, QR: 1, RS: 1}");
    for (settings, expect_sets, expect_more) in [
        (CHAIN_SETTINGS.to_string(), 2, false),
        (format!("{CHAIN_SETTINGS}conflict_sets: 0\n"), 1, true),
    ] {
        let (_dir, project) = project(&model, &settings);
        let analysis = Analysis::new(&project.model, &project.settings);
        let run = scenario(&analysis, "run");
        let Ok(JointOutcome::Infeasible {
            conflicts,
            more_sets_possible,
            mdf,
        }) = &run.outcome
        else {
            panic!("{:?}", run.outcome);
        };
        let all: Vec<usize> = (0..run.problem.steps.len()).collect();
        assert!(substituted(&run.problem, &all, &mdf.values, mdf.value_kj) < 1e-6);
        assert_eq!(conflicts.len(), expect_sets, "{settings}");
        assert_eq!(*more_sets_possible, expect_more);
        let mut sets: Vec<Vec<String>> = conflicts
            .iter()
            .map(|c| {
                c.steps
                    .iter()
                    .map(|&s| reaction_id(&analysis, &run.problem, s))
                    .collect()
            })
            .collect();
        sets.sort();
        let chains: Vec<Vec<String>> = [["AB", "BD", "DE"], ["PQ", "QR", "RS"]]
            .iter()
            .map(|s| s.iter().map(|x| x.to_string()).collect())
            .collect();
        for set in &sets {
            assert!(chains.contains(set), "{set:?}");
        }
        if expect_sets == 2 {
            assert_eq!(sets, chains);
        }
        for c in conflicts {
            assert!((c.overall_kj - (30.0 - RT * 1e4f64.ln())).abs() < 1e-6);
        }
    }
}
