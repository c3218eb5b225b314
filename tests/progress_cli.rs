//! Progress and stage timings on stderr: `--timings` prints a table of the
//! stages with their wall times, `--quiet` keeps stderr empty for a clean
//! run. (Progress bars themselves are drawn only on a terminal, which a test
//! never has; the timings are data, see `progress::Timings`.)

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn demo_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside")
}

fn gibbsite(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(args)
        .output()
        .expect("gibbsite runs")
}

#[test]
fn timings_list_every_stage_with_its_seconds() {
    let out = tempfile::tempdir().unwrap();
    let site = out.path().join("site");
    let run = gibbsite(&[
        "build",
        demo_dir().to_str().unwrap(),
        "-o",
        site.to_str().unwrap(),
        "--fail-on",
        "never",
        "--timings",
    ]);
    assert!(run.status.success(), "{run:?}");
    let stderr = String::from_utf8(run.stderr).unwrap();
    let seconds = |stage: &str| -> f64 {
        let line = stderr
            .lines()
            .find(|l| l.split_whitespace().next() == Some(stage))
            .unwrap_or_else(|| panic!("no line for {stage} in\n{stderr}"));
        line.split_whitespace().nth(1).unwrap().parse().unwrap()
    };
    let stages = [
        "import",
        "thermodynamics",
        "loops",
        "loop-energies",
        "checks",
        "report",
        "pages",
    ];
    for stage in stages {
        assert!(seconds(stage) >= 0.0);
    }
    // The total is wall time: the loop search runs beside the
    // thermodynamics, so it is at most the sum of the stages and at least
    // the longest one (each printed to 1 ms).
    let sum: f64 = stages.iter().map(|s| seconds(s)).sum();
    let longest = stages.iter().map(|s| seconds(s)).fold(0.0, f64::max);
    let total = seconds("total");
    assert!(total <= sum + 0.01 && total >= longest - 0.002, "{stderr}");
    // The pages stage counts the pages written: every .html file of the site.
    let pages_line = stderr.lines().find(|l| l.starts_with("pages")).unwrap();
    let counted: usize = pages_line
        .split_whitespace()
        .nth(2)
        .unwrap()
        .parse()
        .unwrap();
    let mut html = 0;
    let mut stack = vec![site.clone()];
    while let Some(dir) = stack.pop() {
        for entry in std::fs::read_dir(dir).unwrap() {
            let path = entry.unwrap().path();
            if path.is_dir() {
                stack.push(path);
            } else if path.extension().is_some_and(|e| e == "html") {
                html += 1;
            }
        }
    }
    assert_eq!(counted, html);
}

#[test]
fn quiet_build_and_check_print_nothing_on_stderr() {
    let out = tempfile::tempdir().unwrap();
    let site = out.path().join("site");
    let build = gibbsite(&[
        "build",
        demo_dir().to_str().unwrap(),
        "-o",
        site.to_str().unwrap(),
        "--quiet",
    ]);
    // The demo has deliberate errors: exit 1, and the site is written.
    assert_eq!(build.status.code(), Some(1), "{build:?}");
    assert!(site.join("index.html").is_file());
    assert_eq!(String::from_utf8_lossy(&build.stderr), "");
    let check = gibbsite(&["check", demo_dir().to_str().unwrap(), "-q"]);
    assert_eq!(check.status.code(), Some(1), "{check:?}");
    assert_eq!(String::from_utf8_lossy(&check.stderr), "");
    assert!(!check.stdout.is_empty(), "findings still go to stdout");
    // Without --quiet the same build says what it did.
    let loud = gibbsite(&[
        "build",
        demo_dir().to_str().unwrap(),
        "-o",
        site.to_str().unwrap(),
    ]);
    assert!(String::from_utf8_lossy(&loud.stderr).contains("site written to"));
}
