//! Headless Chromium for the browser tests (tests/browser.rs,
//! tests/browser_site.rs): finding the binary, skipping loudly when it is
//! absent (failing under `CI=true`, where `.ci/run` installs it), running
//! it with a time limit, and reading console errors from its log.

use std::path::{Path, PathBuf};
use std::process::{Command, Output, Stdio};
use std::time::{Duration, Instant};

/// The Chromium binary on PATH (or /usr/bin/chromium), if any.
pub fn find_chromium() -> Option<PathBuf> {
    let path = std::env::var_os("PATH").unwrap_or_default();
    for dir in std::env::split_paths(&path).chain([PathBuf::from("/usr/bin")]) {
        for name in ["chromium", "chromium-browser", "google-chrome"] {
            let candidate = dir.join(name);
            if candidate.is_file() {
                return Some(candidate);
            }
        }
    }
    None
}

/// Chromium, or `None` after saying loudly that `test` did not run.
/// Under `CI=true` a missing Chromium fails the test.
pub fn chromium_or_skip(test: &str) -> Option<PathBuf> {
    if let Some(binary) = find_chromium() {
        return Some(binary);
    }
    if super::in_ci() {
        panic!("chromium is not installed: .ci/run must install it (apt-get install chromium)");
    }
    super::visible(&format!(
        "\n*** skipped: {test}: Chromium not found on PATH (install it with \
         `apt-get install chromium`); the browser check did NOT run ***\n"
    ));
    None
}

/// Runs Chromium headless on `url` with our flags plus `extra`, in its own
/// profile folder, killed after `limit`.
pub fn run(binary: &Path, profile: &Path, extra: &[String], url: &str, limit: Duration) -> Output {
    let mut child = Command::new(binary)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-dev-shm-usage",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
            "--no-first-run",
            "--enable-logging=stderr",
            "--v=0",
            "--window-size=1200,1000",
        ])
        .arg(format!("--user-data-dir={}", profile.display()))
        .args(extra)
        .arg(url)
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("chromium starts");
    // Read both pipes while waiting, so a chatty log cannot block it.
    let stdout = child.stdout.take().unwrap();
    let stderr = child.stderr.take().unwrap();
    let read = |mut pipe: Box<dyn std::io::Read + Send>| {
        std::thread::spawn(move || {
            let mut buf = Vec::new();
            let _ = pipe.read_to_end(&mut buf);
            buf
        })
    };
    let out = read(Box::new(stdout));
    let err = read(Box::new(stderr));
    let start = Instant::now();
    let status = loop {
        if let Some(status) = child.try_wait().expect("chromium runs") {
            break status;
        }
        if start.elapsed() > limit {
            let _ = child.kill();
            let _ = child.wait();
            let log = String::from_utf8_lossy(&err.join().unwrap_or_default()).into_owned();
            panic!("chromium did not finish within {limit:?}:\n{log}");
        }
        std::thread::sleep(Duration::from_millis(50));
    };
    Output {
        status,
        stdout: out.join().unwrap_or_default(),
        stderr: err.join().unwrap_or_default(),
    }
}

/// Console messages Chromium logged as errors, and resources it could not
/// load.
pub fn console_errors(stderr: &str) -> Vec<&str> {
    stderr
        .lines()
        .filter(|l| {
            (l.contains("CONSOLE") && (l.contains("Uncaught") || l.contains("Error")))
                || l.contains("Failed to load resource")
        })
        .collect()
}
