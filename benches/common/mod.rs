//! Shared by the benchmark programs: which model files to measure.

use std::path::{Path, PathBuf};

/// The SBML files named on the command line, else every `*.xml` /
/// `*.xml.gz` in `$GIBBSITE_MODELS_DIR` or `../shared/models`, smallest
/// first. `None` (after saying so) when there is nothing to measure.
#[allow(dead_code)] // not every benchmark takes its models this way
pub fn model_paths(args: &[String]) -> Option<Vec<PathBuf>> {
    let is_model = |name: &str| name.ends_with(".xml") || name.ends_with(".xml.gz");
    let mut paths: Vec<PathBuf> = args
        .iter()
        .filter(|a| is_model(a))
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
            return None;
        };
        paths = entries
            .filter_map(|e| e.ok().map(|e| e.path()))
            .filter(|p| is_model(&p.to_string_lossy()))
            .collect();
        // Smallest first, so the quick figures show before the slow ones.
        paths.sort_by_key(|p| std::fs::metadata(p).map(|m| m.len()).unwrap_or(0));
    }
    Some(paths)
}

/// `--runs N` from the command line (at least 1), else `default`.
#[allow(dead_code)] // not every benchmark repeats its runs
pub fn runs(args: &[String], default: usize) -> usize {
    args.iter()
        .position(|a| a == "--runs")
        .and_then(|at| args.get(at + 1))
        .and_then(|n| n.parse::<usize>().ok())
        .unwrap_or(default)
        .max(1)
}

/// A model's short name: its file name without `.xml` / `.xml.gz`.
#[allow(dead_code)] // not every benchmark prints names this way
pub fn model_name(path: &Path) -> String {
    path.file_name()
        .map(|n| {
            n.to_string_lossy()
                .replace(".xml.gz", "")
                .replace(".xml", "")
        })
        .unwrap_or_default()
}
