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
    println!(
        "{:<16} {:>9} {:>7} {:>6} {:>9} {:>10} {:>10} {:>10} {:>10}",
        "model",
        "reactions",
        "groups",
        "parts",
        "largest",
        "groups ms",
        "nbhd ms",
        "all best",
        "all median"
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
        let mut bytes = 0usize;
        for _ in 0..runs {
            let start = Instant::now();
            let ctx = MapContext::new(&report);
            let site = pages::group_maps(&ctx);
            let after_groups = start.elapsed();
            let mut b =
                site.overview_svg.len() + site.pages.iter().map(|p| p.svg.len()).sum::<usize>();
            // As the site draws them: in parallel on rayon's pool.
            let near = pages::neighbourhoods(&ctx);
            b += near.reactions.values().map(String::len).sum::<usize>();
            b += near.metabolites.values().map(String::len).sum::<usize>();
            let total = start.elapsed();
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
        let ms = |d: Duration| format!("{:.0}", d.as_secs_f64() * 1000.0);
        println!(
            "{name:<16} {:>9} {:>7} {:>6} {:>9} {:>10} {:>10} {:>10} {:>10}   ({:.1} MB of SVG)",
            report.reactions.len(),
            sizes.0,
            sizes.1,
            sizes.2,
            ms(group_time),
            ms(nbhd_time),
            ms(totals[0]),
            ms(totals[totals.len() / 2]),
            bytes as f64 / 1e6
        );
    }
}
