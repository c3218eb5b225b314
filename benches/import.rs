//! SBML import speed and memory: imports each model and prints the wall time
//! (best and median of several runs), the best CPU time of the importing
//! thread, the time of the balance check, and the peak resident memory
//! (VmHWM) of a process that imports that one model.
//!
//! Run (release profile):
//!     cargo bench --bench import
//!     cargo bench --bench import -- path/to/model.xml.gz ...
//! Without paths it imports every `*.xml` / `*.xml.gz` in `$GIBBSITE_MODELS_DIR`
//! or else `../shared/models`. Each model runs in its own child process so
//! its peak memory is its own.

use gibbsite::checks::balance;
use gibbsite::project::sbml::read_sbml;
use std::path::{Path, PathBuf};
use std::process::Command;
use std::time::{Duration, Instant};

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
    let mut paths: Vec<PathBuf> = args
        .iter()
        .filter(|a| !a.starts_with("--"))
        .map(PathBuf::from)
        .collect();
    if paths.is_empty() {
        let dir = std::env::var_os("GIBBSITE_MODELS_DIR")
            .map(PathBuf::from)
            .unwrap_or_else(|| Path::new(env!("CARGO_MANIFEST_DIR")).join("../shared/models"));
        let Ok(entries) = std::fs::read_dir(&dir) else {
            println!(
                "skipped: {} not found (set GIBBSITE_MODELS_DIR or pass model paths)",
                dir.display()
            );
            return;
        };
        paths = entries
            .filter_map(|e| e.ok().map(|e| e.path()))
            .filter(|p| {
                let name = p.to_string_lossy();
                name.ends_with(".xml") || name.ends_with(".xml.gz")
            })
            .collect();
        paths.sort();
    }
    println!(
        "{:<20} {:>9} {:>8} {:>8} {:>8} {:>9} {:>8} {:>10} {:>8}",
        "model",
        "reactions",
        "species",
        "file MB",
        "best s",
        "median s",
        "cpu s",
        "balance s",
        "peak MB"
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
    times.sort();
    cpu_times.sort();
    let file_mb = std::fs::metadata(path).map_or(0.0, |m| m.len() as f64 / 1e6);
    let name = path
        .file_name()
        .map_or_else(String::new, |n| n.to_string_lossy().into_owned());
    println!(
        "{:<20} {:>9} {:>8} {:>8.2} {:>8.3} {:>9.3} {:>8.3} {:>10.3} {:>8.1}",
        name,
        model.reactions.len(),
        model.metabolites.len(),
        file_mb,
        times[0].as_secs_f64(),
        times[times.len() / 2].as_secs_f64(),
        cpu_times[0].as_secs_f64(),
        balance_time.as_secs_f64(),
        peak_memory_mb().unwrap_or(f64::NAN),
    );
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
