//! Reproductions of the hostile-input review (issue 14): a project from a
//! stranger must not read the runner's files into the site, exhaust memory
//! or time, pass silently, or disturb the previous site. Every case runs the
//! CLI as CI would and checks the message, its location, the exit code and
//! that the previous site is byte-identical afterwards.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

const MODEL: &str = "\
id: tiny
compartments: [{id: c}]
metabolites:
  - {id: a_c, compartment: c, formula: C3H6O3, charge: 0, formation_energy: {value: -500 kJ/mol, sigma: 2 kJ/mol}}
  - {id: b_c, compartment: c, formula: C3H6O3, charge: 0, formation_energy: {value: -510 kJ/mol, sigma: 2 kJ/mol}}
reactions:
  - {id: R1, equation: a_c <=> b_c}
";

/// A scratch folder with a good project (`proj/`), a secret beside it and a
/// previous site built from the good project (`site/`).
struct Scene {
    tmp: tempfile::TempDir,
}

impl Scene {
    fn new() -> Scene {
        let scene = Scene {
            tmp: tempfile::tempdir().unwrap(),
        };
        std::fs::create_dir(scene.project()).unwrap();
        scene.write("proj/model.yaml", MODEL);
        scene.write("proj/gibbsite.yaml", "title: tiny\nmodel: model.yaml\n");
        scene.write("secret.txt", "PRIVATE KEY 0123456789\n");
        let out = gibbsite(&["build", "-o"], &[&scene.site(), &scene.project()], &[]);
        assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
        scene
    }

    fn root(&self) -> &Path {
        self.tmp.path()
    }
    fn project(&self) -> PathBuf {
        self.root().join("proj")
    }
    fn site(&self) -> PathBuf {
        self.root().join("site")
    }
    fn write(&self, relative: &str, text: &str) -> PathBuf {
        let path = self.root().join(relative);
        std::fs::create_dir_all(path.parent().unwrap()).unwrap();
        std::fs::write(&path, text).unwrap();
        path
    }
    #[cfg(unix)]
    fn symlink(&self, target: &Path, relative: &str) {
        let link = self.root().join(relative);
        std::fs::create_dir_all(link.parent().unwrap()).unwrap();
        std::os::unix::fs::symlink(target, link).unwrap();
    }

    /// Runs `build` of the project into the previous site and checks the
    /// outcome: exit code, every expected text in stderr, the site unchanged.
    fn build_fails(&self, extra: &[&str], code: i32, expected: &[&str]) -> String {
        self.build_fails_env(extra, &[], code, expected)
    }

    fn build_fails_env(
        &self,
        extra: &[&str],
        env: &[(&str, &str)],
        code: i32,
        expected: &[&str],
    ) -> String {
        let before = snapshot(&self.site());
        let mut args = vec!["build"];
        args.extend_from_slice(extra);
        args.push("-o");
        let out = gibbsite(&args, &[&self.site(), &self.project()], env);
        let err = stderr(&out).replace(&format!("{}/", self.root().display()), "<tmp>/");
        assert_eq!(out.status.code(), Some(code), "{err}");
        for e in expected {
            assert!(err.contains(e), "expected `{e}` in:\n{err}");
        }
        assert_eq!(snapshot(&self.site()), before, "the previous site changed");
        assert_eq!(
            std::fs::read_dir(self.root()).unwrap().count(),
            std::fs::read_dir(self.root())
                .unwrap()
                .filter(|e| !e
                    .as_ref()
                    .unwrap()
                    .file_name()
                    .to_string_lossy()
                    .starts_with('.'))
                .count(),
            "a staging folder was left behind"
        );
        err
    }
}

fn gibbsite(args: &[&str], paths: &[&Path], env: &[(&str, &str)]) -> Output {
    let mut command = Command::new(env!("CARGO_BIN_EXE_gibbsite"));
    command.args(args).args(paths).env("SOURCE_DATE_EPOCH", "0");
    for (k, v) in env {
        command.env(k, v);
    }
    command.output().unwrap()
}

fn stderr(out: &Output) -> String {
    String::from_utf8_lossy(&out.stderr).into_owned()
}

/// Every file below `dir` with its bytes.
fn snapshot(dir: &Path) -> BTreeMap<PathBuf, Vec<u8>> {
    let mut files = BTreeMap::new();
    let mut stack = vec![dir.to_path_buf()];
    while let Some(d) = stack.pop() {
        for entry in std::fs::read_dir(&d).unwrap() {
            let path = entry.unwrap().path();
            if path.is_dir() {
                stack.push(path);
            } else {
                files.insert(path.clone(), std::fs::read(&path).unwrap());
            }
        }
    }
    assert!(files.len() > 3, "the previous site has pages");
    files
}

// ---- 1. paths confined to the project ----

#[test]
fn theme_outside_the_project_is_refused() {
    let s = Scene::new();
    s.write("elsewhere/.ssh/id_ed25519", "PRIVATE KEY");
    s.write(
        "proj/gibbsite.yaml",
        "title: tiny\nmodel: model.yaml\ntheme: ../elsewhere/.ssh\n",
    );
    s.build_fails(
        &[],
        2,
        &[
            "<tmp>/proj/gibbsite.yaml:3:8: error: theme folder `<tmp>/proj/../elsewhere/.ssh` resolves (symlinks followed) to a place outside the project folder",
            "hint: keep the project's files inside its folder, or allow another folder with --allow-dir",
        ],
    );
}

#[test]
fn a_folder_named_on_the_command_line_is_allowed() {
    let s = Scene::new();
    s.write("shared-theme/style.css", "body { color: teal }");
    s.write(
        "proj/gibbsite.yaml",
        "title: tiny\nmodel: model.yaml\ntheme: ../shared-theme\n",
    );
    let allowed = s.root().join("shared-theme");
    let out = gibbsite(
        &["build", "--allow-dir"],
        &[&allowed, Path::new("-o"), &s.site(), &s.project()],
        &[],
    );
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let css = std::fs::read_to_string(s.site().join("assets/style.css")).unwrap();
    assert_eq!(css, "body { color: teal }");
}

#[cfg(unix)]
#[test]
fn symlinked_note_pointing_outside_is_refused() {
    let s = Scene::new();
    s.symlink(&s.root().join("secret.txt"), "proj/notes/credentials.md");
    let err = s.build_fails(
        &[],
        2,
        &["<tmp>/proj/notes/credentials.md: error: resolves (symlinks followed) to a place outside the project folder; refusing to read it"],
    );
    assert!(!err.contains("PRIVATE KEY"));
}

#[cfg(unix)]
#[test]
fn symlink_inside_the_theme_pointing_outside_is_refused() {
    let s = Scene::new();
    s.write("proj/theme/style.css", "body {}");
    s.symlink(&s.root().join("secret.txt"), "proj/theme/leak.txt");
    s.write(
        "proj/gibbsite.yaml",
        "title: tiny\nmodel: model.yaml\ntheme: theme\n",
    );
    s.build_fails(
        &[],
        2,
        &["leak.txt: error: resolves (symlinks followed) to a place outside the project folder"],
    );
}

#[cfg(unix)]
#[test]
fn symlinked_model_file_outside_is_refused_without_echoing_it() {
    let s = Scene::new();
    std::fs::remove_file(s.project().join("model.yaml")).unwrap();
    s.symlink(&s.root().join("secret.txt"), "proj/model.yaml");
    let err = s.build_fails(
        &[],
        2,
        &["<tmp>/proj/gibbsite.yaml:2:8: error: model file `<tmp>/proj/model.yaml` resolves (symlinks followed) to a place outside the project folder"],
    );
    assert!(!err.contains("PRIVATE KEY"), "{err}");
}

#[test]
fn a_non_yaml_model_file_is_described_not_echoed() {
    let s = Scene::new();
    let content = format!("root:x:0:0:{}\n", "y".repeat(1_360));
    s.write("proj/model.yaml", &content);
    let err = s.build_fails(
        &[],
        2,
        &["<tmp>/proj/model.yaml:1:1: error: invalid type: a string of 1,371 bytes, expected a mapping"],
    );
    assert!(!err.contains("root:x"), "{err}");
}

#[test]
fn no_project_theme_renders_with_the_default_theme() {
    let s = Scene::new();
    s.write(
        "proj/theme/layout.html",
        "{{ broken( <script>evil()</script>",
    );
    s.write(
        "proj/gibbsite.yaml",
        "title: tiny\nmodel: model.yaml\ntheme: theme\n",
    );
    let out = gibbsite(
        &["build", "--no-project-theme", "-o"],
        &[&s.site(), &s.project()],
        &[],
    );
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let index = std::fs::read_to_string(s.site().join("index.html")).unwrap();
    assert!(!index.contains("evil()"));
}

// ---- 2. bounded reads ----

#[cfg(unix)]
#[test]
fn devices_are_not_read_even_when_allowed() {
    let s = Scene::new();
    s.write(
        "proj/gibbsite.yaml",
        "title: tiny\nmodel: model.yaml\ntables: [/dev/zero]\n",
    );
    s.build_fails(
        &["--allow-dir", "/dev"],
        2,
        &["/dev/zero: error: not a regular file (devices, pipes and folders are not read)"],
    );
}

#[test]
fn files_over_the_size_limit_are_refused() {
    let s = Scene::new();
    s.build_fails(
        &["--max-input-size", "100"],
        2,
        &[
            "<tmp>/proj/model.yaml: error: the file is larger than the input size limit of 100 bytes",
            "hint: raise the limit with --max-input-size",
        ],
    );
}

#[test]
fn decompressed_sbml_is_capped() {
    use std::io::Write;
    let s = Scene::new();
    // 4 MiB of blanks inside valid XML compress to a few kB.
    let mut gz = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::best());
    gz.write_all(b"<?xml version=\"1.0\"?>\n<sbml>").unwrap();
    gz.write_all(&vec![b' '; 4 << 20]).unwrap();
    gz.write_all(b"</sbml>\n").unwrap();
    let bytes = gz.finish().unwrap();
    assert!(bytes.len() < 64 << 10);
    std::fs::write(s.project().join("bomb.xml.gz"), bytes).unwrap();
    s.write("proj/gibbsite.yaml", "title: tiny\nmodel: bomb.xml.gz\n");
    s.build_fails(
        &["--max-input-size", "1M"],
        2,
        &["<tmp>/proj/bomb.xml.gz: error: the decompressed SBML is larger than the input size limit of 1 MiB"],
    );
}

// ---- 3. no network from a page ----

#[test]
fn protocol_relative_images_in_notes_do_not_load() {
    let s = Scene::new();
    s.write(
        "proj/notes/pics.md",
        "# Pics\n\n![a](//host/a.png) ![b](\\\\host\\b.png) ![c](pics/c.png)\n",
    );
    let out = gibbsite(&["build", "-o"], &[&s.site(), &s.project()], &[]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    let page = std::fs::read_to_string(s.site().join("notes/pics.html")).unwrap();
    assert_eq!(page.matches("<img").count(), 1, "{page}");
    assert!(page.contains(r#"<img src="pics/c.png""#), "{page}");
    assert!(page.contains(r#"<a href="//host/a.png">a</a>"#), "{page}");
}

// ---- 4. no quadratic blow-ups ----

#[test]
fn deep_nesting_is_refused_before_parsing() {
    let s = Scene::new();
    let deep = format!(
        "id: deep\nreactions: {}{}\n",
        "{a: ".repeat(200_000),
        "}".repeat(200_000)
    );
    s.write("proj/model.yaml", &deep);
    let started = std::time::Instant::now();
    let err = s.build_fails(
        &[],
        2,
        &[
            "<tmp>/proj/model.yaml:2:",
            "error: nesting deeper than 64 levels",
        ],
    );
    assert!(err.lines().count() < 5, "{err}");
    // Not a speed measurement: a guard against the 178 s case.
    assert!(started.elapsed().as_secs() < 60);
}

#[test]
fn long_unknown_ids_are_not_echoed_whole() {
    let s = Scene::new();
    let id = "x".repeat(1_000_000);
    s.write(
        "proj/model.yaml",
        &MODEL.replace(
            "{id: R1, equation: a_c <=> b_c}",
            &format!("{{id: R1, equation: a_c <=> {id}}}"),
        ),
    );
    let err = s.build_fails(&[], 2, &["(1,000,000 bytes)"]);
    assert!(err.len() < 2_000, "{} bytes of stderr", err.len());
}

// ---- 5. no silent passes ----

#[test]
fn empty_models_are_errors() {
    for (file, text, at) in [
        ("model.yaml", "", "model.yaml:1:1"),
        ("model.yaml", "{}\n", "model.yaml:1:1"),
        (
            "model.xml",
            "<?xml version=\"1.0\"?>\n<sbml xmlns=\"http://www.sbml.org/sbml/level3/version1/core\" level=\"3\" version=\"1\">\n  <model/>\n</sbml>\n",
            "model.xml:3:3",
        ),
    ] {
        let s = Scene::new();
        s.write(&format!("proj/{file}"), text);
        s.write("proj/gibbsite.yaml", &format!("model: {file}\n"));
        s.build_fails(
            &[],
            2,
            &[&format!("{at}: error: the model defines no reactions")],
        );
    }
}

#[test]
fn duplicate_flux_rows_name_both_lines() {
    let s = Scene::new();
    s.write("proj/flux.csv", "reaction,flux\nR1,1\nR1,2\n");
    s.write(
        "proj/gibbsite.yaml",
        "model: model.yaml\nscenarios:\n  - {id: day, file: flux.csv}\n",
    );
    s.build_fails(
        &[],
        2,
        &["<tmp>/proj/flux.csv:3:1: error: reaction `R1` has a second row (the first is on line 2)"],
    );
}

#[test]
fn values_outside_sane_ranges_are_rejected_with_the_range() {
    for (from, to, message) in [
        (
            "a_c <=> b_c",
            "1e300 a_c <=> b_c",
            "model.yaml:7:24: error: cannot read equation of reaction `R1`: coefficient 1e300 is outside the accepted range (at most 1e6 in size)",
        ),
        (
            "compartments: [{id: c}]",
            "compartments: [{id: c, temperature: 1000 K}]",
            "temperature must be between 250 K and 400 K",
        ),
        (
            "compartments: [{id: c}]",
            "compartments: [{id: c, ionic_strength: 5 M}]",
            "ionic strength must be between 0 and 1 M, found 5 M",
        ),
        (
            "compartments: [{id: c}]",
            "compartments: [{id: c, potential: 5 V}]",
            "electrical potential must be between -1 V and 1 V, found 5000 mV",
        ),
        (
            "formula: C3H6O3, charge: 0,",
            "formula: C3H6O3, charge: 1000,",
            "charge 1000 is outside the accepted range -100 to 100",
        ),
    ] {
        let s = Scene::new();
        let text = MODEL.replacen(from, to, 1);
        assert_ne!(text, MODEL);
        s.write("proj/model.yaml", &text);
        s.build_fails(&[], 2, &[message]);
    }
}

#[test]
fn malformed_source_date_epoch_is_an_error() {
    let s = Scene::new();
    s.build_fails_env(
        &[],
        &[("SOURCE_DATE_EPOCH", "yesterday")],
        2,
        &["SOURCE_DATE_EPOCH: error: SOURCE_DATE_EPOCH must be a whole number of seconds since 1970-01-01 UTC, found `yesterday`"],
    );
}

// ---- 6. atomic swap ----

#[test]
fn stale_staging_folders_of_dead_runs_are_removed() {
    let s = Scene::new();
    // A run killed mid-render left this (pid far above any pid_max).
    s.write(".site.tmp-AbCdEf/.gibbsite-staging", "pid 4000000000\n");
    s.write(".site.tmp-AbCdEf/index.html", "half");
    // Not marked as ours: left alone.
    s.write(".site.tmp-unmarked/index.html", "someone else's");
    let out = gibbsite(&["build", "-o"], &[&s.site(), &s.project()], &[]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    assert!(!s.root().join(".site.tmp-AbCdEf").exists());
    assert!(s.root().join(".site.tmp-unmarked/index.html").exists());
    let names: Vec<String> = std::fs::read_dir(s.root())
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter(|n| n.starts_with(".site."))
        .collect();
    assert_eq!(names, vec![".site.tmp-unmarked".to_string()]);
}

#[test]
fn the_output_folder_exists_at_every_instant_of_a_rebuild() {
    let s = Scene::new();
    let site = s.site();
    let stop = std::sync::Arc::new(std::sync::atomic::AtomicBool::new(false));
    let watcher = {
        let stop = stop.clone();
        let site = site.clone();
        std::thread::spawn(move || {
            let mut missing = 0u32;
            let mut looks = 0u32;
            while !stop.load(std::sync::atomic::Ordering::Relaxed) {
                looks += 1;
                if !site.join("index.html").exists() {
                    missing += 1;
                }
            }
            (missing, looks)
        })
    };
    for _ in 0..3 {
        let out = gibbsite(&["build", "-o"], &[&site, &s.project()], &[]);
        assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    }
    stop.store(true, std::sync::atomic::Ordering::Relaxed);
    let (missing, looks) = watcher.join().unwrap();
    assert!(looks > 100, "the watcher looked {looks} times");
    if cfg!(target_os = "linux") {
        assert_eq!(
            missing, 0,
            "the site was missing {missing} of {looks} times"
        );
    }
}

// ---- 7. import safety ----

#[test]
fn import_refuses_to_overwrite_without_force() {
    let s = Scene::new();
    let sbml = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/data/e_coli_core.xml.gz");
    let before = std::fs::read(s.project().join("model.yaml")).unwrap();
    let out = gibbsite(&["import"], &[&sbml, Path::new("-o"), &s.project()], &[]);
    assert_eq!(out.status.code(), Some(2));
    assert!(
        stderr(&out).contains(
            "already holds model.yaml and gibbsite.yaml; refusing to overwrite a project"
        ),
        "{}",
        stderr(&out)
    );
    assert_eq!(
        std::fs::read(s.project().join("model.yaml")).unwrap(),
        before
    );
    let out = gibbsite(
        &["import", "--force"],
        &[&sbml, Path::new("-o"), &s.project()],
        &[],
    );
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    assert_ne!(
        std::fs::read(s.project().join("model.yaml")).unwrap(),
        before
    );
}

// ---- 8. markdown output ----

#[test]
fn markdown_summary_keeps_ids_inert() {
    let s = Scene::new();
    // An unbalanced reaction gives an error finding whose subject is the id.
    let id = "![t](https://host/x.png)@team";
    let model = MODEL
        .replace(
            "formula: C3H6O3, charge: 0, formation_energy: {value: -510",
            "formula: C3H7O3, charge: 0, formation_energy: {value: -510",
        )
        .replace("{id: R1,", &format!("{{id: \"{id}\","));
    s.write("proj/model.yaml", &model);
    let out = gibbsite(&["check", "--format", "markdown"], &[&s.project()], &[]);
    let md = String::from_utf8_lossy(&out.stdout);
    assert!(md.contains(&format!("`{id}`")), "{md}");
    assert!(!md.contains(&format!(" {id}")), "{md}");
}

// ---- 9. portable page names ----

#[test]
fn windows_reserved_names_do_not_become_page_names() {
    let s = Scene::new();
    s.write(
        "proj/model.yaml",
        &MODEL
            .replace("R1", "CON")
            .replace("a_c", "aux")
            .replace("b_c", "Nul"),
    );
    let out = gibbsite(&["build", "-o"], &[&s.site(), &s.project()], &[]);
    assert_eq!(out.status.code(), Some(0), "{}", stderr(&out));
    for file in snapshot(&s.site()).keys() {
        let stem = file
            .file_stem()
            .unwrap()
            .to_string_lossy()
            .to_ascii_uppercase();
        assert!(
            !["CON", "AUX", "NUL"].contains(&stem.as_str()),
            "{}",
            file.display()
        );
    }
}

// ---- 10. messages and exit codes ----

#[test]
fn latin1_model_file_says_where_and_what() {
    let s = Scene::new();
    let mut bytes = MODEL.as_bytes().to_vec();
    bytes.splice(4..4, b"caf\xe9".iter().copied());
    std::fs::write(s.project().join("model.yaml"), bytes).unwrap();
    s.build_fails(
        &[],
        2,
        &[
            "<tmp>/proj/model.yaml:1:8: error: the file is not valid UTF-8 text: byte 0xE9 at offset 7",
            "hint: the file looks like Latin-1 or Windows-1252; save it as UTF-8",
        ],
    );
}

#[test]
fn output_failures_exit_3() {
    let s = Scene::new();
    // The output's parent is a file: the site cannot be written there.
    s.write("not-a-folder", "x");
    let out = gibbsite(
        &["build", "-o"],
        &[&s.root().join("not-a-folder/site"), &s.project()],
        &[],
    );
    assert_eq!(out.status.code(), Some(3), "{}", stderr(&out));
    assert!(stderr(&out).contains("cannot write"), "{}", stderr(&out));
}

#[test]
fn did_you_mean_is_looked_up_a_bounded_number_of_times() {
    let s = Scene::new();
    // 150 ids one typo-like suffix away from `R1`: R1aa, R1ab, …
    let rows: String = (0..150u8)
        .map(|i| {
            format!(
                "R1{}{},1\n",
                (b'a' + i / 26) as char,
                (b'a' + i % 26) as char
            )
        })
        .collect();
    s.write("proj/flux.csv", &format!("reaction,flux\n{rows}"));
    s.write(
        "proj/gibbsite.yaml",
        "model: model.yaml\nscenarios:\n  - {id: day, file: flux.csv}\n",
    );
    let err = s.build_fails(
        &[],
        2,
        &[
            "<tmp>/proj/flux.csv:2:1: error: unknown reaction `R1aa`\n  hint: did you mean `R1`?",
            "150 problems found",
        ],
    );
    assert_eq!(err.matches("error: unknown reaction").count(), 150);
    assert_eq!(err.matches("hint: did you mean").count(), 100);
}
