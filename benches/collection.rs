//! Collection build speed and memory: the twelve strain models of
//! `collection/` plus e_coli_core, iML1515 and iLB1027_lipid (fifteen
//! models; Recon3D only with `--with-recon3d`, since its build alone takes
//! about as long as the goal for all fifteen) from `$GIBBSITE_MODELS_DIR`
//! or `../shared/models`.
//!
//! Prints, per model, the wall time and peak RSS of a single build (a child
//! process running what `gibbsite build` runs) and its time inside the
//! collection run; then the collection's total wall time and peak RSS (a
//! child process running what `gibbsite collection build` runs), and the
//! parallel efficiency = Σ single times / (jobs × collection time).
//!
//! Run (release profile):
//!     cargo bench --bench collection
//!     cargo bench --bench collection -- --jobs 2 --with-recon3d
//! Prints "skipped: …" when the models are absent.

use gibbsite::collection::{self, run::Limits, shard::ShardSpec, FailLevel};
use gibbsite::Project;
use std::path::{Path, PathBuf};
use std::process::Command;
use std::time::Instant;

const ONE_MODEL: &str = "--one-model";
const ONE_COLLECTION: &str = "--one-collection";
const OTHERS: [&str; 3] = [
    "e_coli_core.xml.gz",
    "iML1515.xml.gz",
    "iLB1027_lipid.xml.gz",
];

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    if let Some(at) = args.iter().position(|a| a == ONE_MODEL) {
        one_model(Path::new(&args[at + 1]), Path::new(&args[at + 2]));
        return;
    }
    if let Some(at) = args.iter().position(|a| a == ONE_COLLECTION) {
        let jobs = args[at + 3].parse().expect("jobs");
        one_collection(Path::new(&args[at + 1]), Path::new(&args[at + 2]), jobs);
        return;
    }
    let jobs: usize = args
        .iter()
        .position(|a| a == "--jobs")
        .and_then(|at| args.get(at + 1)?.parse().ok())
        .unwrap_or_else(|| std::thread::available_parallelism().map_or(1, |n| n.get()));
    let dir = std::env::var_os("GIBBSITE_MODELS_DIR")
        .map(PathBuf::from)
        .unwrap_or_else(|| Path::new(env!("CARGO_MANIFEST_DIR")).join("../shared/models"));
    let strains = dir.join("collection");
    let Ok(entries) = std::fs::read_dir(&strains) else {
        println!(
            "skipped: {} not found (set GIBBSITE_MODELS_DIR)",
            strains.display()
        );
        return;
    };
    let mut models: Vec<PathBuf> = entries
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.to_string_lossy().ends_with(".xml.gz"))
        .collect();
    models.sort();
    let mut others: Vec<&str> = OTHERS.to_vec();
    if args.iter().any(|a| a == "--with-recon3d") {
        others.push("Recon3D.xml.gz");
    }
    for other in others {
        let path = dir.join(other);
        if path.is_file() {
            models.push(path);
        } else {
            println!("note: {} not found, measured without it", path.display());
        }
    }
    let tmp = tempfile::tempdir().expect("temporary folder");
    let list = tmp.path().join("models.txt");
    let lines: Vec<String> = models.iter().map(|p| p.display().to_string()).collect();
    std::fs::write(&list, lines.join("\n") + "\n").expect("list file");
    let me = std::env::current_exe().expect("own executable path");
    let cores = std::thread::available_parallelism().map_or(1, |n| n.get());
    println!(
        "{} models, {jobs} jobs, {cores} cores; load average before: {}",
        models.len(),
        load_average()
    );

    // Single builds, one fresh process each.
    let mut singles = Vec::new();
    for (k, path) in models.iter().enumerate() {
        let out = tmp.path().join(format!("single-{k}"));
        let output = Command::new(&me)
            .arg(ONE_MODEL)
            .arg(path)
            .arg(&out)
            .output()
            .expect("child runs");
        let text = String::from_utf8_lossy(&output.stdout);
        let mut fields = text.split_whitespace();
        let seconds: f64 = fields
            .next()
            .and_then(|s| s.parse().ok())
            .unwrap_or(f64::NAN);
        let peak: f64 = fields
            .next()
            .and_then(|s| s.parse().ok())
            .unwrap_or(f64::NAN);
        singles.push((
            collection::model_name(&path.to_string_lossy()),
            seconds,
            peak,
        ));
        let _ = std::fs::remove_dir_all(&out);
    }

    // The collection, in one process.
    let out = tmp.path().join("collection-site");
    let output = Command::new(&me)
        .arg(ONE_COLLECTION)
        .arg(&list)
        .arg(&out)
        .arg(jobs.to_string())
        .output()
        .expect("child runs");
    let text = String::from_utf8_lossy(&output.stdout).into_owned();
    let mut in_collection = std::collections::BTreeMap::new();
    let (mut total, mut peak) = (f64::NAN, f64::NAN);
    for line in text.lines() {
        let f: Vec<&str> = line.split_whitespace().collect();
        match f.as_slice() {
            ["TOTAL", s, p] => {
                total = s.parse().unwrap_or(f64::NAN);
                peak = p.parse().unwrap_or(f64::NAN);
            }
            [name, s] => {
                in_collection.insert(name.to_string(), s.parse::<f64>().unwrap_or(f64::NAN));
            }
            _ => println!("{line}"),
        }
    }

    println!(
        "{:<18} {:>10} {:>14} {:>16}",
        "model", "single s", "single peak MB", "in collection s"
    );
    let mut sum = 0.0;
    for (name, seconds, peak) in &singles {
        sum += seconds;
        println!(
            "{name:<18} {seconds:>10.2} {peak:>14.0} {:>16.2}",
            in_collection.get(name).copied().unwrap_or(f64::NAN)
        );
    }
    let sum_inside: f64 = in_collection.values().sum();
    println!("sum of single builds:            {sum:.1} s");
    println!("sum of build times inside the collection run: {sum_inside:.1} s");
    println!(
        "collection build ({} models, {jobs} jobs): {total:.1} s wall, peak RSS {peak:.0} MB",
        models.len()
    );
    println!(
        "speed-up over building one after the other: {:.2}×; parallel efficiency Σ single / ({jobs} × wall) = {:.0} %",
        sum / total,
        100.0 * sum / (jobs as f64 * total)
    );
    println!("load average after: {}", load_average());
}

/// What `gibbsite build` runs, timed; prints "seconds peak-MB".
fn one_model(path: &Path, out: &Path) {
    let start = Instant::now();
    let project = Project::load(path).expect("model loads");
    let report = project.analyse();
    let theme = project.settings.theme_dir.clone();
    drop(project);
    gibbsite::site::render(&report, theme.as_deref(), out).expect("site renders");
    println!(
        "{:.3} {:.1}",
        start.elapsed().as_secs_f64(),
        peak_memory_mb().unwrap_or(f64::NAN)
    );
}

/// What `gibbsite collection build` runs, timed; prints "name seconds" per
/// model and "TOTAL seconds peak-MB".
fn one_collection(list: &Path, out: &Path, jobs: usize) {
    let start = Instant::now();
    let options = collection::BuildOptions {
        limits: Limits::new(Some(jobs), None),
        shard: ShardSpec::WHOLE,
        fail_on: FailLevel::Never,
        title: None,
    };
    let times = std::sync::Mutex::new(Vec::new());
    let finished = collection::build(list, out, &options, &|o, line| {
        eprintln!("{line}");
        times
            .lock()
            .unwrap()
            .push((o.entry.name.clone(), o.seconds));
    })
    .expect("collection builds");
    let total = start.elapsed().as_secs_f64();
    for (name, seconds) in times.into_inner().unwrap() {
        println!("{name} {seconds:.3}");
    }
    if finished.failed > 0 {
        println!("note: {} models failed", finished.failed);
    }
    println!(
        "TOTAL {total:.3} {:.1}",
        peak_memory_mb().unwrap_or(f64::NAN)
    );
}

/// Peak resident set size of this process (VmHWM in /proc/self/status), MB.
fn peak_memory_mb() -> Option<f64> {
    let status = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = status.lines().find(|l| l.starts_with("VmHWM:"))?;
    let kb: f64 = line.split_whitespace().nth(1)?.parse().ok()?;
    Some(kb * 1024.0 / 1e6)
}

fn load_average() -> String {
    std::fs::read_to_string("/proc/loadavg")
        .map(|s| s.split_whitespace().take(3).collect::<Vec<_>>().join(" "))
        .unwrap_or_else(|_| "unknown".into())
}
