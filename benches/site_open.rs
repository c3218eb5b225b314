//! How fast a reviewer sees the overview: each model's site is built into a
//! temporary folder, then its `index.html` is opened from `file://` in
//! headless Chromium, several times, each in a fresh profile (cold cache).
//! The page's own Navigation Timing figures are printed: DOMContentLoaded
//! and the load event (styles, scripts and inline maps done), in ms from
//! navigation start (Chromium's start-up is not counted; headless Chromium
//! reports no paint entries for a frame, so the load event stands for
//! "shown"). Issue 16's target: the Recon3D
//! overview shows in under a second.
//!
//! Run (release profile):
//!     cargo bench --bench site_open
//!     cargo bench --bench site_open -- path/to/model.xml.gz ... [--runs N]
//!     cargo bench --bench site_open -- --site path/to/built/site
//! Without paths it uses every model in `$GIBBSITE_MODELS_DIR` or
//! `../shared/models`. Says "skipped" when Chromium or the models are absent.

#[path = "../tests/common/browser.rs"]
#[allow(dead_code)] // the tests use more of it than this benchmark
mod browser;
mod common;

/// `tests/common/browser.rs` reports through its parent module; a benchmark
/// is never under CI's "must not skip" rule.
#[allow(dead_code)]
fn in_ci() -> bool {
    false
}
#[allow(dead_code)]
fn visible(message: &str) {
    eprintln!("{message}");
}

use gibbsite::project::LoadOptions;
use std::path::{Path, PathBuf};
use std::time::Duration;

/// The harness holds the overview in an iframe that is part of its own
/// markup, so Chromium's `--dump-dom` waits for the overview's load event;
/// the frame's load handler copies the timing entries into the harness DOM.
const HARNESS: &str = r#"<!DOCTYPE html>
<html><head><meta charset="utf-8"><title>open</title></head>
<body>
<pre id="out">pending</pre>
<iframe id="site" style="width:1400px;height:900px;border:0" src="__URL__"
 onload="measure(this)"></iframe>
<script>
function measure(frame) {
  var p = frame.contentWindow.performance;
  var nav = p.getEntriesByType("navigation")[0] || {};
  document.getElementById("out").textContent = JSON.stringify({
    dcl: nav.domContentLoadedEventEnd || -1,
    load: nav.loadEventStart || -1,
    bytes: nav.decodedBodySize || -1
  });
}
</script>
</body></html>
"#;

#[derive(serde::Deserialize)]
struct Timing {
    dcl: f64,
    load: f64,
    bytes: f64,
}

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let runs = common::runs(&args, 5);
    let Some(chromium) = browser::find_chromium() else {
        println!("skipped: Chromium not found on PATH (apt-get install chromium)");
        return;
    };
    let work = tempfile::tempdir().expect("temporary folder");
    let sites: Vec<(String, PathBuf)> = match args.iter().position(|a| a == "--site") {
        Some(at) => {
            let site = PathBuf::from(args.get(at + 1).expect("--site needs a folder"));
            let name = site
                .file_name()
                .map(|n| n.to_string_lossy().into_owned())
                .unwrap_or_else(|| "site".into());
            vec![(name, site)]
        }
        None => {
            let Some(paths) = common::model_paths(&args) else {
                return;
            };
            paths
                .iter()
                .map(|path| {
                    let name = common::model_name(path);
                    let site = work.path().join(&name);
                    build(path, &site);
                    (name, site)
                })
                .collect()
        }
    };
    println!(
        "{:<16} {:>9} {:>10} {:>10} {:>10}",
        "site", "index kB", "DCL ms", "load ms", "load best"
    );
    for (name, site) in sites {
        let index = site.join("index.html");
        let url = format!("file://{}", index.display());
        let harness = work.path().join(format!("open-{name}.html"));
        std::fs::write(&harness, HARNESS.replace("__URL__", &url)).expect("harness written");
        let mut timings = Vec::new();
        for run in 0..runs {
            let profile = work.path().join(format!("profile-{name}-{run}"));
            let output = browser::run(
                &chromium,
                &profile,
                &["--allow-file-access-from-files".into(), "--dump-dom".into()],
                &format!("file://{}", harness.display()),
                Duration::from_secs(60),
            );
            let dom = String::from_utf8_lossy(&output.stdout);
            let Some(json) = dom
                .split("<pre id=\"out\">")
                .nth(1)
                .and_then(|s| s.split("</pre>").next())
            else {
                panic!("no timing in Chromium's output for {name}");
            };
            let json = json.replace("&quot;", "\"");
            let timing: Timing = serde_json::from_str(&json)
                .unwrap_or_else(|e| panic!("timing of {name} not read ({e}): {json}"));
            timings.push(timing);
        }
        let median = |f: fn(&Timing) -> f64| {
            let mut v: Vec<f64> = timings.iter().map(f).collect();
            v.sort_by(f64::total_cmp);
            v[v.len() / 2]
        };
        let best_load = timings.iter().map(|t| t.load).fold(f64::INFINITY, f64::min);
        println!(
            "{:<16} {:>9.1} {:>10.0} {:>10.0} {:>10.0}",
            name,
            median(|t| t.bytes) / 1000.0,
            median(|t| t.dcl),
            median(|t| t.load),
            best_load
        );
    }
    println!("(medians of {runs} cold runs; ms from navigation start of index.html)");
}

/// Builds the report site of `model` into `site`, as `gibbsite build` does.
fn build(model: &Path, site: &Path) {
    let project = match gibbsite::pipeline::load(model, &[], &LoadOptions::default()) {
        Ok(project) => project,
        Err(error) => {
            eprintln!("{error}");
            std::process::exit(2);
        }
    };
    let analysis = gibbsite::pipeline::analyse(&project);
    let findings = gibbsite::pipeline::check(&analysis);
    let report = gibbsite::pipeline::report(&project, &analysis, findings);
    gibbsite::pipeline::render(&report, None, site).expect("site renders");
}
