//! Helpers shared by integration tests: finding the optional genome-scale
//! models of ../shared/models and saying visibly when they are absent.
#![allow(dead_code)] // each test file uses a part

pub mod browser;

use std::path::{Path, PathBuf};

/// `GIBBSITE_MODELS_DIR` when set (a checkout whose `shared/` is elsewhere),
/// else `../shared/models` beside the repository.
pub fn shared_models_dir() -> PathBuf {
    match std::env::var_os("GIBBSITE_MODELS_DIR") {
        Some(dir) => PathBuf::from(dir),
        None => Path::new(env!("CARGO_MANIFEST_DIR")).join("../shared/models"),
    }
}

/// Path of a shared model, or `None` after printing that the test skipped.
/// Under `CI=true` a missing model is a failure, never a silent pass.
pub fn shared_model_path(file: &str) -> Option<PathBuf> {
    let path = shared_models_dir().join(file);
    if path.is_file() {
        Some(path)
    } else {
        missing_model(&path, in_ci())
    }
}

/// `CI=true` in the environment (as CI services set it).
pub fn in_ci() -> bool {
    std::env::var("CI").is_ok_and(|v| v.eq_ignore_ascii_case("true"))
}

/// What a test does when a shared model is absent: in CI it fails loudly;
/// elsewhere it says "skipped" where `cargo test` shows it and passes.
pub fn missing_model(path: &Path, ci: bool) -> Option<PathBuf> {
    if ci {
        panic!(
            "{} not found, and CI=true: the shared models must be present in CI (set GIBBSITE_MODELS_DIR)",
            path.display()
        );
    }
    visible(&format!(
        "skipped: {} not found (set GIBBSITE_MODELS_DIR)",
        path.display()
    ));
    None
}

/// A shared model imported, or `None` (skipped, with a visible message).
pub fn shared_model(file: &str) -> Option<gibbsite::model::Model> {
    let path = shared_model_path(file)?;
    Some(
        gibbsite::project::sbml::read_sbml(&path)
            .unwrap_or_else(|e| panic!("{file} should import:\n{e}")),
    )
}

/// Writes past the test harness's output capture (which only catches the
/// print macros), so a skip shows in every `cargo test` run.
pub fn visible(message: &str) {
    use std::io::Write;
    let _ = writeln!(std::io::stderr(), "{message}");
}
