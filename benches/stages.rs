//! Per-stage wall time and peak memory of a whole build, per model, and a
//! scaling series.
//!
//! Each model runs in a child process of this program (so each peak RSS,
//! VmHWM of /proc/self/status, is that model's alone). The child times the
//! stages of `gibbsite build` through the library API:
//! - `load`: reading the SBML file into a project,
//! - `analyse`: energies, scenarios and the loop analyses (`Analysis::new`),
//! - `checks`: the findings, `report`: building the report,
//! - `render`: writing the site into a temporary folder,
//!
//! `check` = load + analyse + checks + report (what `gibbsite check` does
//! before printing) and `build` = check + render. The peak is taken after
//! the build; then, for the breakdown of `analyse`, the loop stages are
//! timed alone: the loop-capable set, the elementary loops (including the
//! set), and the energy-generating-cycle tests.
//!
//! The scaling series runs the same stages on one model replicated 1×, 2×
//! and 4× as disjoint copies (every reaction and metabolite id suffixed per
//! copy, compartments shared), so time can be read against size.
//!
//! Run (release profile, one benchmark at a time on an idle machine):
//!     cargo bench --bench stages
//!     cargo bench --bench stages -- path/to/model.xml.gz ... [--runs N] [--scale MODEL]
//! Without paths: e_coli_core, iML1515, Recon3D and iLB1027_lipid from
//! `$GIBBSITE_MODELS_DIR` or `../shared/models` (each absent one is named).
//! `--runs N` repeats every child N times and keeps the fastest (default 1);
//! `--scale MODEL` picks the scaled model by file name (default iML1515,
//! else e_coli_core from tests/data); `--no-scale` skips the series.

use gibbsite::loops::{analyse_loops, energy_generating_cycles, CurrencyOptions, LoopOptions};
use gibbsite::model::Model;
use gibbsite::project::Project;
use std::path::{Path, PathBuf};
use std::process::Command;
use std::time::Instant;

mod common;

/// The models of the table, in this order.
const MODELS: [&str; 4] = [
    "e_coli_core.xml.gz",
    "iML1515.xml.gz",
    "Recon3D.xml.gz",
    "iLB1027_lipid.xml.gz",
];

/// Column names of a child's result line, in order (seconds, then MB).
const FIELDS: [&str; 11] = [
    "load", "analyse", "checks", "report", "render", "check", "build", "peak_mb", "loop_set",
    "loops", "egc",
];

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    if let Some(at) = args.iter().position(|a| a == "--child") {
        let path = PathBuf::from(&args[at + 1]);
        let copies = value_of(&args, "--copies").unwrap_or(1);
        child(&path, copies);
        return;
    }
    let runs = common::runs(&args, 1);
    let dir = models_dir();
    let named: Vec<PathBuf> = args
        .iter()
        .enumerate()
        .filter(|&(i, _)| i == 0 || args[i - 1] != "--scale")
        .map(|(_, a)| a)
        .filter(|a| a.ends_with(".xml") || a.ends_with(".xml.gz"))
        .map(PathBuf::from)
        .collect();
    let paths: Vec<PathBuf> = if named.is_empty() {
        MODELS
            .iter()
            .map(|m| dir.join(m))
            .filter(|p| {
                let present = p.is_file();
                if !present {
                    println!(
                        "skipped: {} not found (set GIBBSITE_MODELS_DIR or pass model paths)",
                        p.display()
                    );
                }
                present
            })
            .collect()
    } else {
        named
    };
    println!(
        "stage wall times in seconds (fastest of {runs} run(s)); peak RSS of the whole build in MB"
    );
    header("model");
    for path in &paths {
        let name = common::model_name(path);
        match best_of(runs, path, 1) {
            Ok(values) => row(&name, &values),
            Err(error) => println!("{name}: {error}"),
        }
    }
    if args.iter().any(|a| a == "--no-scale") {
        return;
    }
    let scale = args
        .iter()
        .position(|a| a == "--scale")
        .and_then(|at| args.get(at + 1))
        .map(|m| dir.join(m))
        .unwrap_or_else(|| dir.join("iML1515.xml.gz"));
    let scale = if scale.is_file() {
        scale
    } else {
        let fallback = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/e_coli_core.xml.gz");
        println!(
            "note: {} not found; scaling series on {}",
            scale.display(),
            fallback.display()
        );
        fallback
    };
    println!();
    println!(
        "scaling series: {} as 1, 2 and 4 disjoint copies (load = reading the file once)",
        common::model_name(&scale)
    );
    header("copies");
    for copies in [1, 2, 4] {
        match best_of(runs, &scale, copies) {
            Ok(values) => row(&format!("{copies}×"), &values),
            Err(error) => println!("{copies}×: {error}"),
        }
    }
}

fn models_dir() -> PathBuf {
    std::env::var_os("GIBBSITE_MODELS_DIR")
        .map(PathBuf::from)
        .unwrap_or_else(|| Path::new(env!("CARGO_MANIFEST_DIR")).join("../shared/models"))
}

fn value_of(args: &[String], flag: &str) -> Option<usize> {
    let at = args.iter().position(|a| a == flag)?;
    args.get(at + 1)?.parse().ok()
}

fn header(first: &str) {
    println!(
        "{first:<16} {:>9} {:>6} {:>7} {:>6} {:>6} {:>6} {:>6} {:>6} {:>7} | {:>8} {:>6} {:>6}",
        "reactions",
        "load",
        "analyse",
        "checks",
        "report",
        "render",
        "check",
        "build",
        "peak MB",
        "loop set",
        "loops",
        "EGC"
    );
}

fn row(name: &str, values: &[(String, f64)]) {
    let get = |key: &str| {
        values
            .iter()
            .find(|(k, _)| k == key)
            .map_or(f64::NAN, |(_, v)| *v)
    };
    println!(
        "{name:<16} {:>9} {:>6.2} {:>7.2} {:>6.2} {:>6.2} {:>6.2} {:>6.2} {:>6.2} {:>7.0} | {:>8.2} {:>6.2} {:>6.2}",
        get("reactions"),
        get("load"),
        get("analyse"),
        get("checks"),
        get("report"),
        get("render"),
        get("check"),
        get("build"),
        get("peak_mb"),
        get("loop_set"),
        get("loops"),
        get("egc"),
    );
}

/// Runs the child `runs` times; per field the smallest value (fastest time,
/// smallest peak).
fn best_of(runs: usize, path: &Path, copies: usize) -> Result<Vec<(String, f64)>, String> {
    let mut best: Option<Vec<(String, f64)>> = None;
    for _ in 0..runs {
        let values = run_child(path, copies)?;
        best = Some(match best {
            None => values,
            Some(old) => old
                .into_iter()
                .zip(values)
                .map(|((k, a), (_, b))| (k, a.min(b)))
                .collect(),
        });
    }
    best.ok_or_else(|| "no run".to_string())
}

/// One child process; parses its `RESULT key=value …` line.
fn run_child(path: &Path, copies: usize) -> Result<Vec<(String, f64)>, String> {
    let me = std::env::current_exe().map_err(|e| e.to_string())?;
    let output = Command::new(me)
        .arg("--child")
        .arg(path)
        .arg("--copies")
        .arg(copies.to_string())
        .output()
        .map_err(|e| e.to_string())?;
    let stdout = String::from_utf8_lossy(&output.stdout);
    let Some(line) = stdout.lines().find(|l| l.starts_with("RESULT ")) else {
        return Err(format!(
            "no result ({}): {}",
            output.status,
            String::from_utf8_lossy(&output.stderr)
        ));
    };
    Ok(line
        .split_whitespace()
        .skip(1)
        .filter_map(|kv| {
            let (k, v) = kv.split_once('=')?;
            Some((k.to_string(), v.parse().ok()?))
        })
        .collect())
}

/// The child: one model (replicated `copies` times), one line of figures.
fn child(path: &Path, copies: usize) {
    let start = Instant::now();
    let loaded = match Project::load(path) {
        Ok(project) => project,
        Err(error) => {
            eprintln!("{error}");
            std::process::exit(2);
        }
    };
    let load = start.elapsed().as_secs_f64();
    let project = if copies > 1 {
        Project::with_defaults(path, replicate(&loaded.model, copies))
    } else {
        loaded
    };
    let start = Instant::now();
    let analysis = gibbsite::pipeline::analyse(&project);
    let analyse = start.elapsed().as_secs_f64();
    let start = Instant::now();
    let findings = gibbsite::pipeline::check(&analysis);
    let checks = start.elapsed().as_secs_f64();
    let start = Instant::now();
    let report = gibbsite::pipeline::report(&project, &analysis, findings);
    let report_time = start.elapsed().as_secs_f64();
    let out = tempfile::tempdir().expect("temporary folder");
    let start = Instant::now();
    gibbsite::pipeline::render(&report, None, &out.path().join("site")).expect("site renders");
    let render = start.elapsed().as_secs_f64();
    let peak = peak_memory_mb().unwrap_or(f64::NAN);
    drop(report);
    drop(analysis);
    let model = &project.model;
    let set_only = LoopOptions {
        find_loops: false,
        max_loops: None,
    };
    let start = Instant::now();
    let set = analyse_loops(model, &set_only);
    let loop_set = start.elapsed().as_secs_f64();
    std::hint::black_box(set.is_ok());
    let start = Instant::now();
    let loops = analyse_loops(model, &LoopOptions::default());
    let loop_time = start.elapsed().as_secs_f64();
    std::hint::black_box(loops.is_ok());
    let start = Instant::now();
    let cycles = energy_generating_cycles(model, &CurrencyOptions::default());
    let egc = start.elapsed().as_secs_f64();
    std::hint::black_box(cycles.is_ok());
    let check = load + analyse + checks + report_time;
    let values = [
        load,
        analyse,
        checks,
        report_time,
        render,
        check,
        check + render,
        peak,
        loop_set,
        loop_time,
        egc,
    ];
    let mut line = format!("RESULT reactions={}", model.reactions.len());
    for (key, value) in FIELDS.iter().zip(values) {
        line.push_str(&format!(" {key}={value}"));
    }
    println!("{line}");
}

/// `copies` disjoint copies of `model`: ids suffixed `__c1`, `__c2`, …,
/// metabolite references shifted, compartments shared, no scenarios.
fn replicate(model: &Model, copies: usize) -> Model {
    let mut out = model.clone();
    out.metabolites.clear();
    out.reactions.clear();
    out.scenarios.clear();
    out.objective.clear();
    let (m, r) = (model.metabolites.len(), model.reactions.len());
    for copy in 0..copies {
        let suffix = format!("__c{}", copy + 1);
        for metabolite in &model.metabolites {
            let mut metabolite = metabolite.clone();
            metabolite.id.push_str(&suffix);
            out.metabolites.push(metabolite);
        }
        for reaction in &model.reactions {
            let mut reaction = reaction.clone();
            reaction.id.push_str(&suffix);
            for entry in &mut reaction.stoichiometry {
                entry.0 += copy * m;
            }
            out.reactions.push(reaction);
        }
        out.objective
            .extend(model.objective.iter().map(|&(j, c)| (j + copy * r, c)));
    }
    out
}

/// Peak resident set size of this process (VmHWM in /proc/self/status), MB.
fn peak_memory_mb() -> Option<f64> {
    let status = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = status.lines().find(|l| l.starts_with("VmHWM:"))?;
    let kb: f64 = line.split_whitespace().nth(1)?.parse().ok()?;
    Some(kb / 1024.0)
}
