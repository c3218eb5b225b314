//! SBML import speed and memory: imports each model and prints the wall time
//! (first import of the process, best and median of several runs), the best
//! CPU time of the importing
//! thread, the time of the balance check, and the peak resident memory
//! (VmHWM) of a process that imports that one model. It then writes the
//! model as gibbsite YAML (what `gibbsite import` writes) and times loading
//! that YAML back (best of several runs, with and without serde_yaml alone).
//!
//! Run (release profile):
//!     cargo bench --bench import
//!     cargo bench --bench import -- path/to/model.xml.gz ...
//! Without paths it imports every `*.xml` / `*.xml.gz` in `$GIBBSITE_MODELS_DIR`
//! or else `../shared/models`. Each model runs in its own child process so
//! its peak memory is its own.

use gibbsite::checks::balance;
use gibbsite::project::sbml::read_sbml;
use std::path::Path;
use std::process::Command;
use std::time::{Duration, Instant};

mod common;

const RUNS: usize = 5;
const CHILD_FLAG: &str = "--one-model";

fn main() {
    // `cargo bench` passes `--bench`; ignore flags other than our own.
    let args: Vec<String> = std::env::args().skip(1).collect();
    if let Some(at) = args.iter().position(|a| a == CHILD_FLAG) {
        let Some(path) = args.get(at + 1) else {
            eprintln!("{CHILD_FLAG} needs a path");
            std::process::exit(2);
        };
        measure(Path::new(path));
        return;
    }
    let Some(paths) = common::model_paths(&args) else {
        return;
    };
    println!(
        "{:<20} {:>9} {:>8} {:>8} {:>8} {:>8} {:>9} {:>8} {:>10} {:>8} {:>8} {:>11} {:>12}",
        "model",
        "reactions",
        "species",
        "file MB",
        "first s",
        "best s",
        "median s",
        "cpu s",
        "balance s",
        "peak MB",
        "yaml MB",
        "yaml load s",
        "serde_yaml s"
    );
    let me = std::env::current_exe().expect("own executable path");
    for path in paths {
        let status = Command::new(&me).arg(CHILD_FLAG).arg(&path).status();
        if !matches!(status, Ok(s) if s.success()) {
            println!("{}: failed ({status:?})", path.display());
        }
    }
}

/// Imports one model RUNS times, then prints one table row.
fn measure(path: &Path) {
    let mut times: Vec<Duration> = Vec::with_capacity(RUNS);
    let mut cpu_times: Vec<Duration> = Vec::with_capacity(RUNS);
    let mut model = None;
    for _ in 0..RUNS {
        // A real run imports once: free the previous model first so the
        // peak memory is that of one import.
        drop(model.take());
        let cpu_start = thread_cpu_time();
        let start = Instant::now();
        let imported = match read_sbml(path) {
            Ok(m) => m,
            Err(e) => {
                eprintln!("{e}");
                std::process::exit(1);
            }
        };
        times.push(start.elapsed());
        cpu_times.push(thread_cpu_time().saturating_sub(cpu_start));
        model = Some(imported);
    }
    let model = model.expect("at least one run");
    let start = Instant::now();
    let findings = balance::findings(&model);
    let balance_time = start.elapsed();
    std::hint::black_box(&findings);
    // The first import of a process is what a real run pays (fresh memory
    // pages); later ones reuse the allocator's freed memory.
    let first = times[0];
    times.sort();
    cpu_times.sort();
    let peak_import = peak_memory_mb().unwrap_or(f64::NAN);
    let (yaml_mb, yaml_load, serde_only) = yaml_round(&model);
    let file_mb = std::fs::metadata(path).map_or(0.0, |m| m.len() as f64 / 1e6);
    let name = path
        .file_name()
        .map_or_else(String::new, |n| n.to_string_lossy().into_owned());
    println!(
        "{:<20} {:>9} {:>8} {:>8.2} {:>8.3} {:>8.3} {:>9.3} {:>8.3} {:>10.3} {:>8.1} {:>8.2} {:>11.3} {:>12.3}",
        name,
        model.reactions.len(),
        model.metabolites.len(),
        file_mb,
        first.as_secs_f64(),
        times[0].as_secs_f64(),
        times[times.len() / 2].as_secs_f64(),
        cpu_times[0].as_secs_f64(),
        balance_time.as_secs_f64(),
        peak_import,
        yaml_mb,
        yaml_load.as_secs_f64(),
        serde_only.as_secs_f64(),
    );
}

/// Write the model as gibbsite YAML, then time loading it back: the full
/// loader (parse + validation into a Model) and serde_yaml's parse alone,
/// to show how much of the time the YAML crate takes.
fn yaml_round(model: &gibbsite::model::Model) -> (f64, Duration, Duration) {
    let dir = tempfile::tempdir().expect("temporary folder");
    gibbsite::project::write::write_project(model, dir.path()).expect("YAML written");
    let file = dir.path().join("model.yaml");
    let text = std::fs::read_to_string(&file).expect("YAML readable");
    let mut full = Duration::MAX;
    let mut serde_only = Duration::MAX;
    for _ in 0..RUNS {
        let start = Instant::now();
        let back = gibbsite::project::load_model_files(std::slice::from_ref(&file), &[])
            .expect("written YAML loads");
        full = full.min(start.elapsed());
        std::hint::black_box(back);
        let start = Instant::now();
        let raw: gibbsite::project::schema::RawModelFile =
            serde_yaml::from_str(&text).expect("YAML parses");
        serde_only = serde_only.min(start.elapsed());
        std::hint::black_box(raw);
    }
    (text.len() as f64 / 1e6, full, serde_only)
}

/// CPU time this thread has run (first field of
/// /proc/thread-self/schedstat, ns): unlike wall time it does not grow when
/// other processes share the cores.
fn thread_cpu_time() -> Duration {
    std::fs::read_to_string("/proc/thread-self/schedstat")
        .ok()
        .and_then(|s| s.split_whitespace().next()?.parse::<u64>().ok())
        .map_or(Duration::ZERO, Duration::from_nanos)
}

/// Peak resident set size of this process (VmHWM in /proc/self/status), MB.
fn peak_memory_mb() -> Option<f64> {
    let status = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = status.lines().find(|l| l.starts_with("VmHWM:"))?;
    let kb: f64 = line.split_whitespace().nth(1)?.parse().ok()?;
    Some(kb * 1024.0 / 1e6)
}
