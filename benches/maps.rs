//! Network-map speed: for each model, the wall time (best and median of
//! several runs) of drawing every map the site has — group maps (with
//! their parts), the overview and the neighbourhood maps of every reaction
//! and metabolite page (in parallel, as the site draws them) — from a
//! ready report, and the bytes of SVG the pages carry inline. Loading, analysis and
//! writing files are not counted. Budget (issue 13): all maps of Recon3D
//! together within 1 s on the 2-core reference machine.
//!
//! Run (release profile):
//!     cargo bench --bench maps
//!     cargo bench --bench maps -- path/to/model.xml.gz ...
//! Without paths it uses every `*.xml` / `*.xml.gz` in `$GIBBSITE_MODELS_DIR`
//! or else `../shared/models` (and says "skipped" when there is none).
//! `--runs N` sets the number of runs (default 3).
//!
//! Other programs on the machine slow the wall time down; the CPU time of
//! this process (user + system, all threads, from `/proc/self/stat`) and
//! the CPU time per map are printed too, with the load average, so a
//! figure from a busy machine can be judged.

use gibbsite::project::Project;
use gibbsite::site::map::{pages, MapContext, READABLE_REACTIONS};
use std::time::{Duration, Instant};

mod common;

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let runs = common::runs(&args, 3);
    let Some(paths) = common::model_paths(&args) else {
        return;
    };
    if let Ok(load) = std::fs::read_to_string("/proc/loadavg") {
        println!("load average at start: {}", load.trim());
    }
    println!(
        "{:<16} {:>9} {:>7} {:>6} {:>9} {:>10} {:>10} {:>10} {:>10} {:>8} {:>8} {:>7}",
        "model",
        "reactions",
        "groups",
        "parts",
        "largest",
        "groups ms",
        "nbhd ms",
        "all best",
        "all median",
        "maps",
        "cpu ms",
        "µs/map"
    );
    for path in paths {
        let name = common::model_name(&path);
        let mut project = match Project::load(&path) {
            Ok(p) => p,
            Err(e) => {
                println!("{name:<16} failed to load: {e}");
                continue;
            }
        };
        // The maps need verdicts and findings, not the loop analysis.
        project.settings.loops = false;
        let report = project.analyse();
        let mut totals = Vec::new();
        let mut group_time = Duration::MAX;
        let mut nbhd_time = Duration::MAX;
        let mut sizes = (0, 0, 0);
        let mut bytes = (0usize, 0usize, 0usize);
        let mut maps = 0usize;
        let mut cpu = Vec::new();
        for _ in 0..runs {
            let cpu_start = cpu_seconds();
            let start = Instant::now();
            let ctx = MapContext::new(&report);
            let site = pages::group_maps(&ctx);
            let after_groups = start.elapsed();
            let group_bytes =
                site.overview_svg.len() + site.pages.iter().map(|p| p.svg.len()).sum::<usize>();
            // As the site draws them: in parallel on rayon's pool.
            let near = pages::neighbourhoods(&ctx);
            let near_bytes = near.reactions.values().map(String::len).sum::<usize>()
                + near.metabolites.values().map(String::len).sum::<usize>();
            let b = (
                group_bytes,
                near_bytes,
                near.reactions.len() + near.metabolites.len(),
            );
            let total = start.elapsed();
            if let (Some(a), Some(z)) = (cpu_start, cpu_seconds()) {
                cpu.push(z - a);
            }
            maps = 1 + site.pages.len() + near.reactions.len() + near.metabolites.len();
            group_time = group_time.min(after_groups);
            nbhd_time = nbhd_time.min(total - after_groups);
            totals.push(total);
            bytes = b;
            sizes = (
                site.groups.len(),
                site.pages.len(),
                site.pages.iter().map(|p| p.reactions).max().unwrap_or(0),
            );
            assert!(
                sizes.2 <= READABLE_REACTIONS,
                "a map exceeds the readable size"
            );
        }
        totals.sort();
        cpu.sort_by(f64::total_cmp);
        let ms = |d: Duration| format!("{:.0}", d.as_secs_f64() * 1000.0);
        // Median CPU time of the runs.
        let cpu_median = cpu.get(cpu.len() / 2).copied();
        println!(
            "{name:<16} {:>9} {:>7} {:>6} {:>9} {:>10} {:>10} {:>10} {:>10} {:>8} {:>8} {:>7}   (SVG: groups {:.1} MB, neighbourhoods {:.1} MB = {:.2} kB per map)",
            report.reactions.len(),
            sizes.0,
            sizes.1,
            sizes.2,
            ms(group_time),
            ms(nbhd_time),
            ms(totals[0]),
            ms(totals[totals.len() / 2]),
            maps,
            cpu_median.map_or("?".into(), |c| format!("{:.0}", c * 1000.0)),
            cpu_median.map_or("?".into(), |c| format!("{:.0}", c * 1e6 / maps.max(1) as f64)),
            bytes.0 as f64 / 1e6,
            bytes.1 as f64 / 1e6,
            bytes.1 as f64 / 1e3 / bytes.2.max(1) as f64
        );
    }
}

/// CPU time (user + system) of this process so far, in seconds, from
/// `/proc/self/stat` (fields 14 and 15, in clock ticks of 1/100 s: the
/// fixed USER_HZ of Linux's proc interface); `None` elsewhere.
fn cpu_seconds() -> Option<f64> {
    let stat = std::fs::read_to_string("/proc/self/stat").ok()?;
    // The command name (field 2) may hold spaces: count after its ')'.
    let rest = &stat[stat.rfind(')')? + 2..];
    let fields: Vec<&str> = rest.split(' ').collect();
    let ticks = |i: usize| fields.get(i - 3)?.parse::<f64>().ok();
    Some((ticks(14)? + ticks(15)?) / 100.0)
}
