//! The demo project is a complete input with deliberate problems; the report
//! must catch each of them, with the numbers worked out by hand below.

use gibbsite::report::{Severity, Verdict};
use gibbsite::Project;
use std::path::{Path, PathBuf};
use std::process::Command;

fn demo_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside")
}

fn findings(report: &gibbsite::Report) -> Vec<(Severity, String, String, Option<String>)> {
    report
        .findings
        .iter()
        .map(|f| {
            (
                f.severity,
                f.kind.clone(),
                f.subjects[0].clone(),
                f.scenario.clone(),
            )
        })
        .collect()
}

#[test]
fn demo_report_lists_the_deliberate_problems() {
    let project = Project::load(&demo_dir()).expect("demo loads");
    let report = project.analyse();
    let s = |x: &str| x.to_string();
    assert_eq!(
        findings(&report),
        vec![
            (Severity::Error, s("infeasible-direction"), s("PEPS"), None),
            (
                Severity::Error,
                s("scenario-contradiction"),
                s("LDH"),
                Some(s("dusk"))
            ),
            (
                Severity::Error,
                s("scenario-contradiction"),
                s("PEPS"),
                Some(s("dusk"))
            ),
            (
                Severity::Error,
                s("scenario-contradiction"),
                s("PEPS"),
                Some(s("refit"))
            ),
            (
                Severity::Error,
                s("scenario-infeasible"),
                s("PLC1"),
                Some(s("bloom"))
            ),
            (
                Severity::Warning,
                s("internal-loop"),
                gibbsite::loops::ids::member_set_id("loop", ["PEPS", "PYK"]),
                None
            ),
            (
                Severity::Warning,
                s("scenario-internal-cycle"),
                s("PYK"),
                Some(s("refit"))
            ),
            (
                Severity::Warning,
                s("scenario-marginal"),
                s("GAPD"),
                Some(s("bloom"))
            ),
            (
                Severity::Warning,
                s("scenario-marginal"),
                s("GAPD"),
                Some(s("noon"))
            ),
            (
                Severity::Warning,
                s("scenario-marginal"),
                s("GAPD"),
                Some(s("refit"))
            ),
            (Severity::Note, s("forced-flux"), s("ATPM"), None),
            (Severity::Note, s("no-energy-data"), s("STOR"), None),
            (Severity::Note, s("one-way-reversible"), s("HEX"), None),
            (Severity::Note, s("one-way-reversible"), s("LDH"), None),
        ]
    );
    assert_eq!(
        (
            report.summary.errors,
            report.summary.warnings,
            report.summary.notes
        ),
        (5, 5, 4)
    );
    assert_eq!(report.summary.reactions, 32);
    assert_eq!(report.summary.scenarios, 4);
    assert_eq!(report.compartments.len(), 2);
}

/// The pigment pathway pyr → placidate → placidol → placidene, each step
/// ΔrG'° = +9 kJ/mol (σ 0.8, demo values). Alone, PLC1's best ΔG' is
/// 9 + RT ln(1 µM / 5 mM) = 9 − 21.11 = −12.11 kJ/mol (pyruvate at most 5 mM;
/// RT = 2.478957 kJ/mol at 298.15 K), beyond the allowance 1.96 × 0.8 = 1.57
/// plus the 1 kJ/mol minimum: consistent alone. Together:
/// Σ ΔG' = 27 + RT ln([placidene]/[pyr]) ≥ 27 − 21.11 − 3 × 1.568 = +1.18 kJ/mol,
/// and three steps need at most −3 × 1 kJ/mol: infeasible.
#[test]
fn demo_scenarios_judged_as_a_whole() {
    let report = Project::load(&demo_dir()).unwrap().analyse();
    let joint = |id: &str| {
        report
            .joint_scenarios
            .iter()
            .find(|s| s.id == id)
            .unwrap_or_else(|| panic!("{id}"))
    };
    let bloom = joint("bloom");
    assert_eq!(bloom.verdict, "infeasible");
    assert_eq!(bloom.conflicts.len(), 1);
    let set = &bloom.conflicts[0];
    let ids: Vec<&str> = set.members.iter().map(|m| m.reaction.as_str()).collect();
    assert_eq!(ids, ["PLC1", "PLC2", "PLC3"]);
    // R: CODATA 2018 (constants.csv); 1.959964: two-sided 95 % normal
    // quantile (common practice); 27 and σ 0.8: demo values.
    let rt = 8.314_462_618e-3 * 298.15;
    let expected = 27.0 + rt * (1e-6f64 / 5e-3).ln() - 3.0 * 1.959964 * 0.8;
    assert!((expected - 1.18).abs() < 0.005, "{expected}");
    assert!(
        (set.overall_kj - expected).abs() < 1e-3,
        "{}",
        set.overall_kj
    );
    assert!((set.required_kj + 3.0).abs() < 1e-9);
    // Each step is consistent alone, and says so only for itself.
    for id in ids {
        let r = report.reactions.iter().find(|r| r.id == id).unwrap();
        let v = r
            .scenario_verdicts
            .iter()
            .find(|v| v.scenario == "bloom")
            .unwrap();
        assert_eq!(v.verdict, Verdict::Consistent, "{id}");
        assert!(v.alone_only, "{id}");
    }
    // The smallest widening: the set needs Σ ΔG' ≤ −3, so pyruvate's upper
    // bound must rise by (1.18 + 3)/(RT ln 10 = 5.708) = 0.733 decades.
    let widen = set
        .repairs
        .iter()
        .find(|r| r.kind == "widen-range" && r.subject == "pyr_c")
        .unwrap();
    assert!(
        (widen.amount - (expected + 3.0) / (rt * std::f64::consts::LN_10)).abs() < 1e-6,
        "{}",
        widen.amount
    );

    // Noon runs as a whole; its weakest steps share what driving force there is.
    let noon = joint("noon");
    assert_eq!(noon.verdict, "feasible");
    let mdf = noon.mdf.as_ref().unwrap();
    // Bounds 1–3 kJ/mol: a loose check, not worked out by hand.
    assert!(
        mdf.value_kj >= 1.0 && mdf.value_kj < 3.0,
        "{}",
        mdf.value_kj
    );
    assert!(mdf.bottlenecks.iter().any(|b| b.reaction == "GAPD"));
    let duals: f64 = mdf.bottlenecks.iter().map(|b| b.dual).sum();
    assert!((duals - 1.0).abs() < 1e-6, "{duals}");
    assert!(noon.loop_law.as_ref().unwrap().loop_free);

    // The refit turns PYK and PEPS against each other: a cycle carrying
    // 2 (PYK 12 = 10 down glycolysis + 2 around the cycle); the loop-free
    // flux has PYK 10, PEPS 0 and every exchange unchanged.
    let refit = joint("refit");
    let law = refit.loop_law.as_ref().unwrap();
    assert!(!law.loop_free);
    assert_eq!(law.cycles.len(), 1);
    let members: Vec<&str> = law.cycles[0]
        .members
        .iter()
        .map(|m| m.reaction.as_str())
        .collect();
    assert_eq!(members, ["PYK", "PEPS"]);
    assert!((law.cycles[0].flux - 2.0).abs() < 1e-9);
    let flux = |id: &str| law.fluxes.iter().find(|f| f.reaction == id).unwrap();
    assert!((flux("PYK").loop_free - 10.0).abs() < 1e-9);
    assert!(flux("PEPS").loop_free.abs() < 1e-9);
    for f in &law.fluxes {
        if f.reaction.starts_with("EX_") {
            assert_eq!(f.given, f.loop_free, "{}", f.reaction);
        }
    }
    // The model's irreversible directions fail on PEPS alone.
    let default = joint("irreversible-directions");
    assert_eq!(default.verdict, "infeasible");
    assert_eq!(default.conflicts[0].members[0].reaction, "PEPS");
}

/// PEPS as annotated: pyr + ATP → PEP + ADP (+ H+, fixed by pH).
/// ΔrG'° = ΔfG'°(PEP) + ΔfG'°(ADP) − ΔfG'°(pyr) − ΔfG'°(ATP)
///       = −1179.05 − 1424.70 + 342.65 + 2292.50 = +31.40 kJ/mol (demo values),
/// σ = √(0.8² + 0.5² + 0.6² + 0.5²) = √1.5 = 1.2247 kJ/mol.
/// Lowest ΔG' at 298.15 K: PEP and ADP at their minimum (10 µM, 0.1 mM), pyruvate
/// and ATP at their maximum (5 mM each): 31.40 + RT ln(4e-5) = 31.40 − 25.103 = 6.297.
#[test]
fn demo_numbers_match_hand_calculation() {
    let report = Project::load(&demo_dir()).unwrap().analyse();
    let peps = report.reactions.iter().find(|r| r.id == "PEPS").unwrap();
    let e = peps.drg_prime.as_ref().unwrap();
    assert!((e.value_kj - 31.40).abs() < 1e-9, "{}", e.value_kj);
    assert!((e.sigma_kj - 1.5f64.sqrt()).abs() < 1e-12);
    // R: CODATA 2018 (constants.csv).
    let rt = 8.314_462_618e-3 * 298.15;
    let expected_min = 31.40 + rt * (4e-5f64).ln();
    let range = peps.dg_range.unwrap();
    assert!((range.min - expected_min).abs() < 1e-9, "{}", range.min);
    assert!((range.min - 6.297).abs() < 0.001);
    assert_eq!(peps.forward_verdict, Some(Verdict::Contradiction));
    // K' = exp(−31.40 / RT) at 298.15 K (the demo's 25 °C).
    assert!((peps.k_prime.unwrap() - (-31.40 / rt).exp()).abs() < 1e-15);
    let stor = report.reactions.iter().find(|r| r.id == "STOR").unwrap();
    assert_eq!(stor.missing_data, vec!["stor_c".to_string()]);
    assert!(stor.drg_prime.is_none());
    // GAPD at noon: best ΔG' −1.58 kJ/mol, within the allowance 1.96 × σ with
    // σ = √(0.8² + 0.3² + 0.5² + 1.0² + 0.5²) = √2.23 = 1.493 (demo values,
    // g3p, pi, nad, 13dpg, nadh; H+ has none), i.e. 2.93 kJ/mol: ΔG' = 0
    // within the allowance, so "at equilibrium" (still a scenario-marginal
    // warning), not consistent.
    let gapd = report.reactions.iter().find(|r| r.id == "GAPD").unwrap();
    let noon = gapd
        .scenario_verdicts
        .iter()
        .find(|v| v.scenario == "noon")
        .unwrap();
    assert_eq!(noon.verdict, Verdict::AtEquilibrium);
    assert!((gapd.dg_range.unwrap().min + 1.58).abs() < 0.01);
    let sigma = gapd.drg_prime.as_ref().unwrap().sigma_kj;
    assert!((sigma - 2.23f64.sqrt()).abs() < 1e-12, "{sigma}");
}

fn copy_dir(from: &Path, to: &Path) {
    std::fs::create_dir_all(to).unwrap();
    for entry in std::fs::read_dir(from).unwrap() {
        let path = entry.unwrap().path();
        let target = to.join(path.file_name().unwrap());
        if path.is_dir() {
            if path.file_name().unwrap() != "site" {
                copy_dir(&path, &target);
            }
        } else {
            std::fs::copy(&path, &target).unwrap();
        }
    }
}

fn run_check(dir: &Path) -> i32 {
    Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .arg("check")
        .arg(dir)
        .output()
        .unwrap()
        .status
        .code()
        .unwrap()
}

/// Copy the demo and repair its deliberate errors: PEPS written the right way
/// round is no longer uphill, and the dusk scenario (lactate oxidation against
/// the NAD ratio), the pigment bloom and the refit flux are dropped.
fn consistent_copy(into: &Path) {
    copy_dir(&demo_dir(), into);
    let model = std::fs::read_to_string(into.join("model.yaml")).unwrap();
    let fixed = model.replace(
        "equation: pyr_c + atp_c -> pep_c + adp_c + h_c",
        "equation: pep_c + adp_c + h_c -> pyr_c + atp_c",
    );
    assert_ne!(model, fixed);
    // The pigment bloom and the refit flux are deliberate problems too.
    let cut = fixed.find("  # Each pigment step alone").unwrap();
    std::fs::write(into.join("model.yaml"), &fixed[..cut]).unwrap();
    let settings = std::fs::read_to_string(into.join("gibbsite.yaml")).unwrap();
    let cut = settings.find("scenarios:").unwrap();
    std::fs::write(into.join("gibbsite.yaml"), &settings[..cut]).unwrap();
}

#[test]
fn check_exits_1_on_the_demo_and_0_on_a_consistent_copy() {
    assert_eq!(run_check(&demo_dir()), 1);
    let tmp = tempfile::tempdir().unwrap();
    consistent_copy(tmp.path());
    assert_eq!(run_check(tmp.path()), 0);
    let report = Project::load(tmp.path()).unwrap().analyse();
    assert_eq!(report.summary.errors, 0);
    // --fail-on warning still fails on the marginal GAPD step at noon.
    let code = Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(["check", "--fail-on", "warning"])
        .arg(tmp.path())
        .output()
        .unwrap()
        .status
        .code();
    assert_eq!(code, Some(1));
}

#[test]
fn build_writes_a_site_with_report_json() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    let status = Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .arg("build")
        .arg(demo_dir())
        .arg("-o")
        .arg(&out)
        .env("SOURCE_DATE_EPOCH", "1700000000")
        .output()
        .unwrap();
    assert_eq!(
        status.status.code(),
        Some(1),
        "errors in the demo give exit 1"
    );
    let json: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(out.join("report.json")).unwrap()).unwrap();
    assert_eq!(json["tool"]["generated"], "2023-11-14T22:13:20Z");
    assert_eq!(json["summary"]["errors"], 5);
    // One page per scenario judged as a whole, with its drawings.
    let bloom = std::fs::read_to_string(out.join("scenarios/bloom.html")).unwrap();
    assert!(bloom.contains("Infeasible as a whole"));
    assert!(bloom.contains("class=\"conflict-map\""));
    assert!(
        bloom.contains("pyr_c ≤ 5 mM"),
        "binding bound on the drawing"
    );
    let noon = std::fs::read_to_string(out.join("scenarios/noon.html")).unwrap();
    assert!(noon.contains("Max-min driving force"));
    assert!(noon.contains("class=\"energy-profile\""));
    let refit = std::fs::read_to_string(out.join("scenarios/refit.html")).unwrap();
    assert!(refit.contains("Loop-free flux beside the given one"));
    let plc1 = std::fs::read_to_string(out.join("reactions/PLC1.html")).unwrap();
    assert!(plc1.contains("alone only"));
    assert!(json["project"]["caution"]
        .as_str()
        .unwrap()
        .contains("expert review"));
}

/// ATP synthase ADP + Pi + 4 H+(out) → ATP + H2O + 3 H+(in). The chemistry is
/// ΔrG'° = +36.03 kJ/mol (demo values); moving 4 H+ from pH 8.0 outside into
/// pH 7.0 at ψ = −200 mV costs 4·RT ln10·(8.0 − 7.0) (less the small
/// ionic-strength difference) and gains 4·F·0.200 V = −77.188 kJ/mol
/// (F exact, CODATA 2018). Only the membrane potential makes the step run.
#[test]
fn membrane_potential_decides_the_atp_synthase_verdict() {
    let report = Project::load(&demo_dir()).unwrap().analyse();
    let atps = report.reactions.iter().find(|r| r.id == "ATPS").unwrap();
    let t = atps.transport.as_ref().unwrap();
    assert!((t.formation_sum_kj - 36.03).abs() < 1e-9);
    // F and R: CODATA 2018 (constants.csv); 36.03: demo value.
    assert!((t.electrical_term_kj + 4.0 * 96.485_332_12 * 0.200).abs() < 1e-6);
    let rt_ln10 = 8.314_462_618e-3 * 298.15 * std::f64::consts::LN_10;
    // Debye–Hückel part of μ(H+): RTα·√I/(1 + 1.6√I) at I = 0.25 and 0.1 M (Alberty 2003, RTα = 2.91482).
    let dh = |i: f64| 2.91482 * i.sqrt() / (1.0 + 1.6 * i.sqrt());
    let expected_proton = 4.0 * (rt_ln10 * (8.0 - 7.0) - (dh(0.25) - dh(0.1)));
    assert!(
        (t.proton_term_kj - expected_proton).abs() < 1e-6,
        "{}",
        t.proton_term_kj
    );
    assert!(t.reference_independent);
    assert_eq!(atps.forward_verdict, Some(Verdict::Consistent));

    // The same model with the membrane potential switched off.
    let tmp = tempfile::tempdir().unwrap();
    copy_dir(&demo_dir(), tmp.path());
    let model = std::fs::read_to_string(tmp.path().join("model.yaml")).unwrap();
    let flat = model.replace("potential: -200 mV", "potential: 0 mV");
    assert_ne!(model, flat);
    std::fs::write(tmp.path().join("model.yaml"), flat).unwrap();
    let report = Project::load(tmp.path()).unwrap().analyse();
    let atps = report.reactions.iter().find(|r| r.id == "ATPS").unwrap();
    assert_eq!(atps.forward_verdict, Some(Verdict::Contradiction));
    assert!(report
        .findings
        .iter()
        .any(|f| f.kind == "infeasible-direction" && f.subjects[0] == "ATPS"));
}

/// Glucose from the built-in library (single species, nH = 12, z = 0; Alberty 2003
/// p. 333 value) at pH 7, I = 0.25 M: ΔfG'° = −426.71 kJ/mol (reference README,
/// computed with the book's formula). A neutral compound moved between
/// compartments has ΔrG'° = 0 whatever the pH and potential (first principles).
#[test]
fn library_values_and_neutral_transport() {
    let report = Project::load(&demo_dir()).unwrap().analyse();
    let glc = report.metabolites.iter().find(|m| m.id == "glc_c").unwrap();
    assert_eq!(glc.energy_origin.as_deref(), Some("library"));
    assert!((glc.dfg_prime.as_ref().unwrap().value_kj + 426.71).abs() < 0.01);
    let species = glc.species.as_ref().unwrap();
    assert_eq!(species.entries.len(), 1);
    assert_eq!(species.curve.len(), 61);
    for name in ["GLCt", "ETOHt", "CO2t"] {
        let r = report.reactions.iter().find(|r| r.id == name).unwrap();
        assert!(
            r.drg_prime.as_ref().unwrap().value_kj.abs() < 1e-9,
            "{name}"
        );
    }
    // The model's own ATP value wins over the library's, which is still matched by xref.
    let atp = report.metabolites.iter().find(|m| m.id == "atp_c").unwrap();
    assert_eq!(atp.energy_origin.as_deref(), Some("model"));
    assert_eq!(atp.library_key.as_deref(), Some("atp"));
}

/// PEPS as annotated (pyr + ATP → PEP + ADP) undoes pyruvate kinase: the pair
/// is an internal loop. ΔrG'° around it is exactly 0 (both from the same
/// formation energies); PEPS is the step to constrain (its ΔG' in the loop
/// direction is at least 6.30 − 2.40 = 3.90 kJ/mol), and forbidding it breaks
/// the loop.
#[test]
fn the_demo_loop_is_found_with_its_fix() {
    let report = Project::load(&demo_dir()).unwrap().analyse();
    let loops = report.loops.as_ref().unwrap();
    assert_eq!(
        loops
            .capable
            .iter()
            .map(|c| c.reaction.as_str())
            .collect::<Vec<_>>(),
        ["PYK", "PEPS"]
    );
    assert_eq!(loops.loops.len(), 1);
    let l = &loops.loops[0];
    let members: Vec<(&str, f64)> = l
        .members
        .iter()
        .map(|m| (m.reaction.as_str(), m.coefficient))
        .collect();
    assert_eq!(members, [("PYK", 1.0), ("PEPS", 1.0)]);
    assert!(l.verified && !l.reversible && !l.inconsistent);
    assert!(l.drg0_sum_kj.unwrap().abs() < 1e-9);
    let c = l.constrain.as_ref().unwrap();
    assert_eq!(
        (c.reaction.as_str(), c.forbid.as_str()),
        ("PEPS", "forward")
    );
    assert!((c.dg_min_kj - 3.897).abs() < 0.01, "{}", c.dg_min_kj);
    assert_eq!(c.breaks_loop, Some(true));
    // No currency is regenerated from nothing.
    assert!(loops.energy_cycles.iter().all(|e| !e.cycle_exists));
    assert!(loops.energy_cycles.iter().any(|e| e.currency == "atp"));
    let pyk = report.reactions.iter().find(|r| r.id == "PYK").unwrap();
    // The loop id comes from its member set (loops::ids), not discovery order.
    assert_eq!(
        pyk.loops,
        [gibbsite::loops::ids::member_set_id("loop", ["PEPS", "PYK"])]
    );
    assert_eq!(pyk.loops[0], "loop-eec1c24eca");
    assert_eq!(pyk.loop_capable.as_deref(), Some("forward"));
}

/// Numbers the demo notes quote about compartments must be the model's: for
/// every "<compartment name> (pH x, ψ = y mV)" in a note, x and y equal that
/// compartment's pH and potential, and every compartment is described so.
#[test]
fn notes_quote_the_models_compartments() {
    let project = Project::load(&demo_dir()).unwrap();
    let text: String = std::fs::read_dir(demo_dir().join("notes"))
        .unwrap()
        .map(|e| std::fs::read_to_string(e.unwrap().path()).unwrap())
        .collect::<Vec<_>>()
        .join("\n")
        .split_whitespace()
        .collect::<Vec<_>>()
        .join(" ");
    let number = |s: &str| -> f64 {
        s.trim_matches(|c: char| !(c.is_ascii_digit() || c == '.' || c == '−' || c == '-'))
            .replace('−', "-")
            .parse()
            .unwrap_or_else(|_| panic!("a number: {s:?}"))
    };
    for c in &project.model.compartments {
        let key = format!("{} (pH ", c.name);
        let at = text
            .find(&key)
            .unwrap_or_else(|| panic!("notes describe {} as `{key}…)`", c.name));
        let rest = &text[at + key.len()..];
        let inside = &rest[..rest.find(')').unwrap()];
        let (ph, psi) = inside.split_once(", ψ = ").expect("pH and ψ");
        assert_eq!(number(ph), c.ph, "pH of {} in the notes", c.name);
        assert_eq!(
            number(psi.trim_end_matches(" mV")),
            c.potential_mv,
            "ψ of {} in the notes",
            c.name
        );
    }
    // Every pH the notes mention is one of the model's.
    for (i, _) in text.match_indices("pH ") {
        let word = text[i + 3..].split([' ', ',', ')']).next().unwrap();
        if word.starts_with(|c: char| c.is_ascii_digit()) {
            let value = number(word);
            assert!(
                project.model.compartments.iter().any(|c| c.ph == value),
                "pH {value} in the notes is no compartment's"
            );
        }
    }
}
