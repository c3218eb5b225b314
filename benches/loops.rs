//! Loop-analysis speed: for each model, the wall time (best and median of
//! several runs) of
//! - the loop-capable set alone (closing, pruning, capability LPs),
//! - the full analysis with elementary loops covering that set,
//! - the energy-generating-cycle tests,
//! - the constraint re-checks of `assess_loop_energies` (default limit of
//!   200), on synthetic ΔrG'° values (a fixed pattern by reaction index) so
//!   that every loop gets a suggested member,
//!
//! with the sizes they produced. Import time is not counted.
//!
//! Run (release profile):
//!     cargo bench --bench loops
//!     cargo bench --bench loops -- path/to/model.xml.gz ...
//! Without paths it uses every `*.xml` / `*.xml.gz` in `$GIBBSITE_MODELS_DIR`
//! or else `../shared/models`. `--runs N` sets the number of runs of the
//! loop-capable set (default 5; the slower stages run `min(N, 2)` times).

use gibbsite::loops::{
    analyse_loops, assess_loop_energies, energy_generating_cycles, CurrencyOptions,
    LoopEnergyOptions, LoopOptions, StandardDeltaG,
};
use gibbsite::model::Model;
use gibbsite::project::sbml::read_sbml;
use std::time::{Duration, Instant};

mod common;

fn main() {
    // `cargo bench` passes `--bench`; ignore flags other than our own.
    let args: Vec<String> = std::env::args().skip(1).collect();
    let runs = common::runs(&args, 5);
    let Some(paths) = common::model_paths(&args) else {
        return;
    };
    println!(
        "{:<16} {:>9} {:>8} {:>8} | {:>9} {:>9} {:>6} | {:>9} {:>7} | {:>9} {:>6} | {:>9} {:>6} {:>4}",
        "model",
        "reactions",
        "pruned",
        "capable",
        "set best",
        "set med",
        "LPs",
        "loops",
        "count",
        "rechecks",
        "checked",
        "cycles",
        "tests",
        "EGC"
    );
    for path in paths {
        let model = match read_sbml(&path) {
            Ok(model) => model,
            Err(error) => {
                println!("{}: not imported:\n{error}", path.display());
                continue;
            }
        };
        bench_model(&model, runs);
    }
}

fn bench_model(model: &Model, runs: usize) {
    let set_only = LoopOptions {
        find_loops: false,
        max_loops: None,
    };
    let (set_times, set) = timed(runs, || analyse_loops(model, &set_only));
    let set = match set {
        Ok(set) => set,
        Err(error) => {
            println!("{}: {error}", model.id);
            return;
        }
    };
    let all_loops = LoopOptions {
        find_loops: true,
        max_loops: None,
    };
    let (loop_times, full) = timed(runs.min(2), || analyse_loops(model, &all_loops));
    let (cycle_times, cycles) = timed(runs.min(2), || {
        energy_generating_cycles(model, &CurrencyOptions::default())
    });
    // Synthetic ΔrG'° (invented, bench only): a fixed pattern by index.
    let standard: Vec<Option<StandardDeltaG>> = (0..model.reactions.len())
        .map(|r| {
            Some(StandardDeltaG {
                value_kj: ((r * 37) % 101) as f64 - 50.0,
                sigma_kj: 2.0,
            })
        })
        .collect();
    let (recheck_times, rechecked) = match &full {
        Ok(analysis) => {
            let (times, energies) = timed(runs.min(2), || {
                assess_loop_energies(
                    model,
                    analysis,
                    &standard,
                    &[],
                    &LoopEnergyOptions::default(),
                )
            });
            let count = energies
                .map(|e| {
                    e.iter()
                        .flat_map(|l| [&l.constrain, &l.constrain_reversed])
                        .flatten()
                        .filter(|c| c.rechecked.is_some())
                        .count()
                        .to_string()
                })
                .unwrap_or_else(|e| e.to_string());
            (times, count)
        }
        Err(_) => (vec![Duration::ZERO], String::new()),
    };
    let loops = full
        .map(|a| a.loops.len().to_string())
        .unwrap_or_else(|e| e.to_string());
    let (tests, found) = cycles
        .map(|c| {
            let found = c.results.iter().filter(|r| r.cycle_exists).count();
            (c.results.len().to_string(), found.to_string())
        })
        .unwrap_or_else(|e| (e.to_string(), String::new()));
    println!(
        "{:<16} {:>9} {:>8} {:>8} | {:>9} {:>9} {:>6} | {:>9} {:>7} | {:>9} {:>6} | {:>9} {:>6} {:>4}",
        model.id,
        model.reactions.len(),
        set.pruning.removed_reactions,
        set.loop_capable.len(),
        show(best(&set_times)),
        show(median(&set_times)),
        set.stats.capability_lp_solves,
        show(best(&loop_times)),
        loops,
        show(best(&recheck_times)),
        rechecked,
        show(best(&cycle_times)),
        tests,
        found
    );
}

/// Runs `work` `runs` times; returns every wall time and the last result.
fn timed<T>(runs: usize, mut work: impl FnMut() -> T) -> (Vec<Duration>, T) {
    let mut times = Vec::with_capacity(runs);
    let mut last = None;
    for _ in 0..runs {
        let start = Instant::now();
        let result = std::hint::black_box(work());
        times.push(start.elapsed());
        last = Some(result);
    }
    (times, last.expect("at least one run"))
}

fn best(times: &[Duration]) -> Duration {
    times.iter().copied().min().unwrap_or_default()
}

fn median(times: &[Duration]) -> Duration {
    let mut sorted = times.to_vec();
    sorted.sort();
    sorted[sorted.len() / 2]
}

fn show(d: Duration) -> String {
    let ms = d.as_secs_f64() * 1000.0;
    if ms < 1000.0 {
        format!("{ms:.1} ms")
    } else {
        format!("{:.2} s", ms / 1000.0)
    }
}
