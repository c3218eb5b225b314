//! Every folder under tests/cases/bad is a project with a deliberate input
//! error. Loading it must fail with exactly the diagnostics in its
//! `expected.txt` (file:line:column, message, hint), and the CLI must exit 2
//! without touching an existing output folder.

use gibbsite::{Error, Project};
use std::path::{Path, PathBuf};
use std::process::Command;

fn cases() -> Vec<PathBuf> {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/cases/bad");
    let mut dirs: Vec<PathBuf> = std::fs::read_dir(&root)
        .expect("tests/cases/bad exists")
        .map(|e| e.unwrap().path())
        .filter(|p| p.is_dir())
        .collect();
    dirs.sort();
    assert!(
        dirs.len() >= 10,
        "expected the bad-input cases, found {}",
        dirs.len()
    );
    dirs
}

/// The error text a user sees, with the case folder masked as `<case>`.
fn error_text(case: &Path) -> String {
    match Project::load(case) {
        Ok(_) => panic!("{} loaded without error", case.display()),
        Err(e @ Error::Input(_)) => e
            .to_string()
            .replace(&format!("{}/", case.display()), "<case>/"),
        Err(other) => panic!("{}: not an input error: {other}", case.display()),
    }
}

#[test]
fn each_bad_input_gives_the_expected_located_errors() {
    let mut failures = Vec::new();
    for case in cases() {
        let got = error_text(&case);
        let expected_path = case.join("expected.txt");
        if std::env::var_os("GIBBSITE_BLESS").is_some() {
            std::fs::write(&expected_path, format!("{got}\n")).unwrap();
            continue;
        }
        let expected = std::fs::read_to_string(&expected_path)
            .unwrap_or_else(|_| panic!("missing {}", expected_path.display()));
        if got.trim_end() != expected.trim_end() {
            failures.push(format!(
                "== {}\n-- expected\n{}\n-- got\n{}",
                case.display(),
                expected.trim_end(),
                got
            ));
        }
        // Every diagnostic names a line (the point of these cases).
        for line in got.lines().filter(|l| l.contains(": error: ")) {
            let location = line.split(": error: ").next().unwrap();
            let parts: Vec<&str> = location.rsplitn(3, ':').collect();
            assert!(
                parts.len() == 3
                    && parts[0].parse::<usize>().is_ok()
                    && parts[1].parse::<usize>().is_ok(),
                "no line:column in `{line}`"
            );
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn all_problems_are_reported_at_once() {
    let case = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/cases/bad/all-at-once");
    let Err(Error::Input(diagnostics)) = Project::load(&case) else {
        panic!("expected input errors");
    };
    assert_eq!(diagnostics.len(), 5);
    let lines: Vec<usize> = diagnostics.iter().map(|d| d.line.unwrap()).collect();
    assert_eq!(lines, vec![4, 8, 10, 13, 14]);
}

#[test]
fn cli_exits_2_and_leaves_existing_output_untouched() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    std::fs::create_dir(&out).unwrap();
    std::fs::write(out.join("index.html"), "previous good site").unwrap();
    for case in cases() {
        let status = Command::new(env!("CARGO_BIN_EXE_gibbsite"))
            .arg("build")
            .arg(&case)
            .arg("-o")
            .arg(&out)
            .output()
            .unwrap();
        assert_eq!(status.status.code(), Some(2), "{}", case.display());
        let stderr = String::from_utf8_lossy(&status.stderr);
        assert!(stderr.contains("error:"), "{stderr}");
        let entries: Vec<_> = std::fs::read_dir(&out).unwrap().collect();
        assert_eq!(
            entries.len(),
            1,
            "output folder changed for {}",
            case.display()
        );
        assert_eq!(
            std::fs::read_to_string(out.join("index.html")).unwrap(),
            "previous good site"
        );
        // No temporary folder left beside it either.
        assert_eq!(std::fs::read_dir(tmp.path()).unwrap().count(), 1);
    }
}

#[test]
fn usage_errors_exit_2() {
    let out = Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(["build"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    let out = Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(["check", "no/such/project"])
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&out.stderr).contains("no/such/project"));
}
