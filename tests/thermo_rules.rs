//! Rules of the thermodynamics engine a reviewer checks by hand: correlated
//! uncertainty per compound, formation energies copied between
//! compartments, validity ranges, and what the messages say. Each case is a
//! small model whose answer is worked out beside it.

use gibbsite::report::Report;
use gibbsite::Project;

/// Loads a one-file model (YAML text) with default settings.
fn load(yaml: &str) -> (tempfile::TempDir, Project) {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("model.yaml");
    std::fs::write(&path, yaml).unwrap();
    let project = Project::load(&path).unwrap_or_else(|e| panic!("model loads:\n{e}"));
    (dir, project)
}

fn analyse(yaml: &str) -> Report {
    load(yaml).1.analyse()
}

fn reaction_sigma(report: &Report, id: &str) -> f64 {
    report
        .reactions
        .iter()
        .find(|r| r.id == id)
        .unwrap_or_else(|| panic!("{id}"))
        .drg_prime
        .as_ref()
        .unwrap_or_else(|| panic!("{id} has ΔrG'°"))
        .sigma_kj
}

/// Glucose moved between two compartments with equal conditions, its ΔfG'°
/// one copied value (σ 0.5 kJ/mol) in both. The net stoichiometry per
/// compound is zero, so σ(ΔrG'°) = 0 (JCGM 100:2008 §5.2 with correlation
/// 1; the independent rule would give √(0.5² + 0.5²) = 0.707).
#[test]
fn transport_of_one_compound_has_no_uncertainty() {
    let model = |source_e: &str| {
        format!(
            "id: t
compartments: [{{id: c, ph: 7}}, {{id: e, ph: 7}}]
metabolites:
  - {{id: glc_c, compartment: c, formula: C6H12O6, charge: 0, xrefs: {{chebi: 'CHEBI:4167'}},
     formation_energy: {{value: -426.71, sigma: 0.5, source: 'one table'}}}}
  - {{id: glc_e, compartment: e, formula: C6H12O6, charge: 0, xrefs: {{chebi: 'CHEBI:4167'}},
     formation_energy: {{value: -426.71, sigma: 0.5, source: '{source_e}'}}}}
reactions:
  - {{id: GLCt, equation: glc_e <-> glc_c}}
"
        )
    };
    let report = analyse(&model("one table"));
    assert_eq!(reaction_sigma(&report, "GLCt"), 0.0);
    // Values from two different sources are independent: √(0.25 + 0.25).
    let report = analyse(&model("another table"));
    assert!((reaction_sigma(&report, "GLCt") - 0.5f64.hypot(0.5)).abs() < 1e-12);

    // The library's glucose in both compartments: one compound too (the demo's
    // GLCt between pH 8 and pH 7).
    let report =
        Project::load(&std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside"))
            .unwrap()
            .analyse();
    assert_eq!(reaction_sigma(&report, "GLCt"), 0.0);
    assert_eq!(reaction_sigma(&report, "LACt"), 0.0);
}

/// a → b → c → a, with ΔfG'° of a, b, c from separate sources (σ 0.5 each)
/// and c → a given as a reaction energy (σ 0.5). Around the loop a and c
/// each appear in two steps with opposite signs:
///
/// - independent rule: σ² = (0.25 + 0.25) + (0.25 + 0.25) + 0.25 = 1.25,
///   σ = 1.118;
/// - per compound: the net balance is b: −1 + 1 = 0, a: −1, c: +1 (from the
///   first two steps) plus the given value: σ² = 0.25 + 0.25 + 0.25 = 0.75,
///   σ = 0.866 (JCGM 100:2008 §5.2).
///
/// ΔrG'° = −10 + (−10) + 18.1 = −1.9 kJ/mol around the loop. At 95 %
/// (k = 1.96) the allowance is 1.697 with the correct σ, so the data are
/// inconsistent; with 1.118 it would be 2.191 and the error hidden.
#[test]
fn loop_sum_uses_the_net_balance_per_compound() {
    let report = analyse(
        "id: t
compartments: [{id: c}]
metabolites:
  - {id: a, compartment: c, formation_energy: {value: -100, sigma: 0.5, source: s1}}
  - {id: b, compartment: c, formation_energy: {value: -110, sigma: 0.5, source: s2}}
  - {id: x, compartment: c, formation_energy: {value: -120, sigma: 0.5, source: s3}}
reactions:
  - {id: R1, equation: a -> b}
  - {id: R2, equation: b -> x}
  - {id: R3, equation: x -> a, reaction_energy: {value: 18.1, sigma: 0.5, source: s4}}
",
    );
    let loops = report.loops.as_ref().unwrap();
    assert_eq!(loops.loops.len(), 1);
    let l = &loops.loops[0];
    assert!((l.drg0_sum_kj.unwrap() + 1.9).abs() < 1e-9);
    let sigma = l.sigma_kj.unwrap();
    assert!((sigma - 0.75f64.sqrt()).abs() < 1e-12, "{sigma}");
    assert!((sigma - 0.866).abs() < 0.001);
    assert!(l.inconsistent);
    assert!(report
        .findings
        .iter()
        .any(|f| f.kind == "inconsistent-cycle-energy"));
    // Each step alone keeps its own σ: √0.5 for R1, R2; 0.5 for R3.
    assert!((reaction_sigma(&report, "R1") - 0.5f64.sqrt()).abs() < 1e-12);
    assert!((reaction_sigma(&report, "R3") - 0.5).abs() < 1e-12);
    // The independent rule, for comparison: √1.25 = 1.118 > 1.9 / 1.96.
    let independent = (0.5f64 + 0.5 + 0.25).sqrt();
    assert!((independent - 1.118).abs() < 0.001);
    assert!(1.9 < 1.959_964 * independent);
}
