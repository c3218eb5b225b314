//! Scenario speed on genome-scale models: how long the joint judgement of
//! one flux scenario takes (joint LP and its dual, conflict sets with
//! repairs when infeasible, the loop law and CycleFreeFlux on the flux).
//!
//! For each model:
//! 1. the flux is the model's own objective optimised by flux balance
//!    (max cᵀv, S·v = 0, the model's bounds) and then made loop-free with
//!    CycleFreeFlux, so that potentials exist for it;
//! 2. a side table of ΔrG'° is written for every active internal reaction.
//!    **The values are synthetic** (no data of any organism): from the
//!    loop-law potentials μ of the flux, ΔrG'°ⱼ = 3 kJ/mol·Σᵢνᵢⱼμᵢ −
//!    RT·Σᵢνᵢⱼ·ln(1 mM) − u with u uniform in [0, 2) kJ/mol (fixed seed), σ =
//!    1.5 kJ/mol; so every active step has ΔG' ≤ −3 kJ/mol at 1 mM and the
//!    scenario is feasible ("feasible" variant);
//! 3. the "infeasible" variant makes five active reactions (every 40th)
//!    60 kJ/mol uphill at 1 mM in their flux direction, so the scenario is
//!    infeasible and the conflict search (first set + further sets) runs;
//! 4. each variant is loaded as a project (SBML + side table, loop analysis
//!    off, the flux added as a scenario) and the scenario judged; the loop law is also timed on the
//!    raw flux-balance flux.
//!
//! Run (release profile):
//!     cargo bench --bench scenarios
//!     cargo bench --bench scenarios -- path/to/model.xml.gz ...
//! Without paths it measures e_coli_core and iML1515 from
//! `$GIBBSITE_MODELS_DIR` or `../shared/models` (beside the repository). Target: iML1515 decided in
//! ≤ 2 s.

use gibbsite::analysis::Analysis;
use gibbsite::lp::{LinearProgram, Relation, Sense, Var};
use gibbsite::model::{Model, Role, Special};
use gibbsite::project::sbml::read_sbml;
use gibbsite::scenarios::{self, loop_law, JointOutcome, ScenarioOptions};
use gibbsite::Project;
use std::collections::BTreeMap;
use std::fmt::Write as _;
use std::path::Path;
use std::time::Instant;

mod common;

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let Some(mut paths) = common::model_paths(&args) else {
        return;
    };
    if !args
        .iter()
        .any(|a| a.ends_with(".xml") || a.ends_with(".xml.gz"))
    {
        paths.retain(|p| {
            let name = p.to_string_lossy();
            name.contains("e_coli_core") || name.contains("iML1515")
        });
    }
    println!(
        "{:<14} {:>7} {:>10} | {:<10} {:>6} {:>6} {:>11} {:>10} {:>6} {:>9} | {:>9} {:>6}",
        "model",
        "active",
        "FBA obj",
        "variant",
        "rows",
        "vars",
        "verdict",
        "MDF kJ",
        "sets",
        "judged s",
        "law raw s",
        "cycles"
    );
    for path in paths {
        if let Err(e) = measure(&path) {
            println!("{}: {e}", path.display());
        }
    }
}

fn measure(path: &Path) -> Result<(), String> {
    let model = read_sbml(path).map_err(|e| e.to_string())?;
    let name = common::model_name(path);
    let (objective, raw) = flux_balance(&model)?;
    let internal = |j: usize| model.reactions[j].role == Role::Internal;
    // Loop law on the raw flux-balance flux (its own timing).
    let start = Instant::now();
    let raw_law = loop_law::analyse(&model, &raw, internal).map_err(|e| e.to_string())?;
    let law_seconds = start.elapsed().as_secs_f64();
    let flux = loop_law::cycle_free_flux(&model, &raw, &internal).map_err(|e| e.to_string())?;
    let flux: Vec<(usize, f64)> = flux.into_iter().filter(|(_, v)| v.abs() > 1e-9).collect();
    let active: Vec<(usize, f64)> = flux.iter().copied().filter(|&(j, _)| internal(j)).collect();
    let mu = loop_law::loop_law_potentials(&model, &active)
        .map_err(|e| e.to_string())?
        .ok_or("the CycleFreeFlux flux still carries a cycle")?;
    let energies = synthetic_energies(&model, &active, &mu);
    for variant in ["feasible", "infeasible"] {
        let mut table = energies.clone();
        if variant == "infeasible" {
            for (k, (j, drg)) in table.iter_mut().enumerate() {
                if k % 40 == 20 && k / 40 < 5 {
                    // 60 kJ/mol uphill at 1 mM in its flux direction.
                    let d = flux
                        .iter()
                        .find(|f| f.0 == *j)
                        .map_or(1.0, |f| f.1.signum());
                    *drg = d * 60.0 - q_at_1mm(&model, *j);
                }
            }
        }
        let dir = tempfile::tempdir().map_err(|e| e.to_string())?;
        write_project(dir.path(), path, &model, &table)?;
        // The model stays in its own folder: allow it, as `--allow-dir` does.
        let options = gibbsite::project::LoadOptions {
            allowed_dirs: path.parent().map(Path::to_path_buf).into_iter().collect(),
        };
        let mut project = Project::load_with(dir.path(), &options).map_err(|e| e.to_string())?;
        // A project naming an SBML model does not read `scenarios:` from
        // gibbsite.yaml (only YAML models do), so the flux is added here.
        let mut fluxes: Vec<(usize, f64)> = flux
            .iter()
            .filter_map(|&(j, v)| {
                project
                    .model
                    .reaction_index(&model.reactions[j].id)
                    .map(|k| (k, v))
            })
            .collect();
        fluxes.sort_by_key(|f| f.0);
        project.model.scenarios.push(gibbsite::model::Scenario {
            id: "fba".into(),
            description: "flux balance optimum, loop-free".into(),
            fluxes,
        });
        // Analysis::new judges every scenario; time the one that matters
        // again on its own.
        let analysis = Analysis::new(&project.model, &project.settings);
        let given = analysis
            .scenarios
            .iter()
            .find(|s| s.id == "fba")
            .ok_or("no fba scenario")?;
        let start = Instant::now();
        let judged = scenarios::analyse_one(
            &analysis,
            &ScenarioOptions::default(),
            "fba",
            "",
            false,
            &given.active,
            &given.fluxes,
        );
        let seconds = start.elapsed().as_secs_f64();
        let (verdict, mdf, sets) = match &judged.outcome {
            Ok(JointOutcome::Feasible(m)) => ("feasible", m.as_ref().map(|m| m.value_kj), 0),
            Ok(JointOutcome::Infeasible { mdf, conflicts, .. }) => {
                ("infeasible", Some(mdf.value_kj), conflicts.len())
            }
            Err(_) => ("not decided", None, 0),
        };
        println!(
            "{:<14} {:>7} {:>10.4} | {:<10} {:>6} {:>6} {:>11} {:>10} {:>6} {:>9.3} | {:>9.3} {:>6}",
            name,
            active.len(),
            objective,
            variant,
            judged.problem.steps.len(),
            judged.problem.vars.len(),
            verdict,
            mdf.map_or("—".to_string(), |m| format!("{m:.3}")),
            sets,
            seconds,
            law_seconds,
            raw_law.cycles.len()
        );
    }
    Ok(())
}

/// max cᵀv subject to S·v = 0 and the model's bounds (infinite bounds
/// clamped at ±1000, common practice); returns the optimum and the nonzero
/// fluxes.
fn flux_balance(model: &Model) -> Result<(f64, Vec<(usize, f64)>), String> {
    if model.objective.is_empty() {
        return Err("the model has no objective".into());
    }
    let cost: BTreeMap<usize, f64> = model.objective.iter().copied().collect();
    let mut lp = LinearProgram::new(Sense::Maximise);
    let v: Vec<Var> = model
        .reactions
        .iter()
        .enumerate()
        .map(|(j, r)| {
            lp.add_variable(
                cost.get(&j).copied().unwrap_or(0.0),
                r.lower_bound.max(-1000.0),
                r.upper_bound.min(1000.0),
            )
        })
        .collect();
    let mut rows: Vec<Vec<(Var, f64)>> = vec![Vec::new(); model.metabolites.len()];
    for (j, r) in model.reactions.iter().enumerate() {
        for &(i, nu) in &r.stoichiometry {
            rows[i].push((v[j], nu));
        }
    }
    for row in rows.iter().filter(|r| !r.is_empty()) {
        lp.add_row(row, Relation::Equal, 0.0);
    }
    let solution = lp.solve().map_err(|e| e.to_string())?;
    let violation = lp.max_violation(&solution.values);
    if violation > 1e-6 {
        return Err(format!("flux balance answer off by {violation:.1e}"));
    }
    Ok((
        solution.objective,
        v.iter()
            .enumerate()
            .map(|(j, &x)| (j, solution.value(x)))
            .filter(|(_, x)| x.abs() > 1e-9)
            .collect(),
    ))
}

/// Synthetic ΔrG'° for every active reaction (see the module documentation).
fn synthetic_energies(
    model: &Model,
    active: &[(usize, f64)],
    mu: &BTreeMap<usize, f64>,
) -> Vec<(usize, f64)> {
    let mut rng = fastrand::Rng::with_seed(20_261_202);
    active
        .iter()
        .map(|&(j, v)| {
            let r = &model.reactions[j];
            let potential: f64 = r.stoichiometry.iter().map(|&(i, nu)| nu * mu[&i]).sum();
            let q_at_1mm = q_at_1mm(model, j);
            let jitter = 2.0 * rng.f64();
            // In the flux direction: ΔG' at 1 mM = 3·d·Σνμ − jitter·d… ≤ −3.
            (j, 3.0 * potential - q_at_1mm - v.signum() * jitter)
        })
        .collect()
}

/// RT·Σ ν·ln(1 mM) over the participants in Q: the RT ln Q of reaction j
/// with every concentration at 1 mM.
fn q_at_1mm(model: &Model, j: usize) -> f64 {
    let rt = gibbsite::thermo::constants::rt(298.15);
    model.reactions[j]
        .stoichiometry
        .iter()
        .filter(|&&(i, _)| model.metabolites[i].special == Special::None)
        .map(|&(_, nu)| nu * rt * 1e-3f64.ln())
        .sum()
}

fn write_project(
    dir: &Path,
    sbml: &Path,
    model: &Model,
    energies: &[(usize, f64)],
) -> Result<(), String> {
    let mut table =
        String::from("# synthetic values for a benchmark, not data\nreaction,drg,sigma\n");
    for &(j, drg) in energies {
        writeln!(table, "{},{drg:.6},1.5", model.reactions[j].id).unwrap();
    }
    let absolute = sbml.canonicalize().map_err(|e| e.to_string())?;
    let settings = format!(
        "model: {:?}\ntables: [energies.csv]\nloops: false\n",
        absolute.to_string_lossy()
    );
    for (name, text) in [("energies.csv", table), ("gibbsite.yaml", settings)] {
        std::fs::write(dir.join(name), text).map_err(|e| e.to_string())?;
    }
    Ok(())
}
