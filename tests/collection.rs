//! `gibbsite collection`: a small collection made from the demo project
//! (three variants and one broken model) built on one machine, built as
//! three slices and merged, and compared across models.
//!
//! The variants (invented demo data, like the demo itself):
//! - `strain_a`: the demo as it is: PYK and PEPS form an internal loop;
//!   PEPS (only direction) and LDH (dusk flux) are contradictions.
//! - `strain_b`: without PEPS: no loop; PYK is present but not looping.
//! - `strain_c`: LDH renamed `LDH_L` and left out of the dusk scenario, so
//!   it is no contradiction there; matched to LDH by its KEGG reaction id.
//! - `broken.yaml`: a model file with an unknown key full of HTML.

use serde_json::Value;
use std::fs;
use std::path::{Path, PathBuf};
use std::process::Command;

const EPOCH: &str = "1700000000";

fn demo_dir() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside")
}

fn copy_project(to: &Path, edit: impl Fn(&str, String) -> String) {
    fs::create_dir_all(to.join("notes")).unwrap();
    for entry in fs::read_dir(demo_dir()).unwrap() {
        let entry = entry.unwrap();
        let name = entry.file_name().to_string_lossy().into_owned();
        if entry.path().is_dir() && name != "notes" {
            // The rendered demo (`site/`, after the README's first command)
            // is output, not part of the project.
            continue;
        }
        if entry.path().is_dir() {
            for note in fs::read_dir(entry.path()).unwrap() {
                let note = note.unwrap();
                fs::copy(note.path(), to.join(&name).join(note.file_name())).unwrap();
            }
        } else {
            let text = fs::read_to_string(entry.path()).unwrap();
            fs::write(to.join(&name), edit(&name, text)).unwrap();
        }
    }
}

/// Replaces `from` by `to`, insisting that `from` is there.
fn replace(text: String, from: &str, to: &str) -> String {
    assert!(text.contains(from), "the demo no longer contains {from:?}");
    text.replace(from, to)
}

fn make_collection(dir: &Path) {
    let ldh = "{id: LDH,";
    let ldh_xref = "{id: LDH, xrefs: {kegg.reaction: R00703},";
    copy_project(&dir.join("strain_a"), |name, text| match name {
        "model.yaml" => replace(text, ldh, ldh_xref),
        _ => text,
    });
    copy_project(&dir.join("strain_b"), |name, text| {
        match name {
        "model.yaml" => replace(
            replace(
                replace(text, ldh, ldh_xref),
                "  - {id: PEPS, name: PEP synthetase (as annotated), equation: pyr_c + atp_c -> pep_c + adp_c + h_c,\n     group: gluconeogenesis}\n",
                "",
            ),
            // The flux of the `refit` scenario that names it.
            "      PEPS: 2.0\n",
            "",
        ),
        "fluxes_dusk.csv" => replace(text, "PEPS,2.0\n", ""),
        _ => text,
    }
    });
    copy_project(&dir.join("strain_c"), |name, text| match name {
        "model.yaml" => replace(
            replace(text, ldh, "{id: LDH_L, xrefs: {kegg.reaction: R00703},"),
            // Every scenario flux of LDH (noon, bloom, refit).
            "      LDH: ",
            "      LDH_L: ",
        ),
        "fluxes_dusk.csv" => replace(text, "LDH,-2.0\n", ""),
        _ => text,
    });
    fs::write(
        dir.join("broken.yaml"),
        "id: broken\n\"<script>alert(1)</script>\": 1\n",
    )
    .unwrap();
}

fn gibbsite(args: &[&str]) -> (i32, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_gibbsite"))
        .args(args)
        .env("SOURCE_DATE_EPOCH", EPOCH)
        .output()
        .expect("runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

fn s(p: &Path) -> &str {
    p.to_str().unwrap()
}

#[test]
fn three_slices_merged_give_the_same_overview_bytes_as_one_run() {
    let tmp = tempfile::tempdir().unwrap();
    let models = tmp.path().join("models");
    make_collection(&models);

    let single = tmp.path().join("single");
    let (code, err) = gibbsite(&["collection", "build", s(&models), "-o", s(&single)]);
    // broken.yaml cannot load: the worst model decides the exit code.
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("4 models, 1 failed; overview written"),
        "{err}"
    );

    // Each slice on "its own machine", merged into a fourth folder.
    let mut slices = Vec::new();
    for i in 1..=3 {
        let dir = tmp.path().join(format!("slice{i}"));
        let (code, err) = gibbsite(&[
            "collection",
            "build",
            s(&models),
            "-o",
            s(&dir),
            "--shard",
            &format!("{i}/3"),
        ]);
        // Sorted sources: broken.yaml, strain_a, strain_b, strain_c →
        // slice 1: broken.yaml, strain_c; 2: strain_a; 3: strain_b.
        let expected = if i == 1 { 2 } else { 1 };
        assert_eq!(code, expected, "slice {i}: {err}");
        assert!(dir.join(format!("shard-{i}-of-3.json")).is_file());
        assert!(
            !dir.join("index.html").exists(),
            "a slice writes no overview"
        );
        slices.push(dir);
    }
    assert!(slices[0].join("strain_c/report.json").is_file());
    assert!(slices[1].join("strain_a/report.json").is_file());
    assert!(slices[2].join("strain_b/report.json").is_file());

    let merged = tmp.path().join("merged");
    let mut args = vec!["collection", "merge"];
    args.extend(slices.iter().map(|p| s(p)));
    args.extend(["-o", s(&merged)]);
    let (code, err) = gibbsite(&args);
    assert_eq!(code, 2, "{err}");

    for file in [
        "index.html",
        "collection.json",
        "assets/style.css",
        "assets/table.js",
    ] {
        let a = fs::read(single.join(file)).unwrap();
        let b = fs::read(merged.join(file)).unwrap();
        assert!(
            a == b,
            "{file} differs between the single run and the merge"
        );
    }
    // The model reports were copied, so the overview's links work.
    for model in ["strain_a", "strain_b", "strain_c"] {
        assert_eq!(
            fs::read(single.join(model).join("index.html")).unwrap(),
            fs::read(merged.join(model).join("index.html")).unwrap()
        );
    }

    // Merging in place: all slices downloaded into one folder.
    let together = tmp.path().join("together");
    fs::create_dir(&together).unwrap();
    for dir in &slices {
        for entry in fs::read_dir(dir).unwrap() {
            let entry = entry.unwrap();
            let to = together.join(entry.file_name());
            if entry.path().is_dir() {
                copy_dir(&entry.path(), &to);
            } else {
                fs::copy(entry.path(), to).unwrap();
            }
        }
    }
    let (code, err) = gibbsite(&["collection", "merge", s(&together), "-o", s(&together)]);
    assert_eq!(code, 2, "{err}");
    assert!(
        fs::read(single.join("index.html")).unwrap()
            == fs::read(together.join("index.html")).unwrap()
    );
}

fn copy_dir(from: &Path, to: &Path) {
    fs::create_dir_all(to).unwrap();
    for entry in fs::read_dir(from).unwrap() {
        let entry = entry.unwrap();
        let target = to.join(entry.file_name());
        if entry.path().is_dir() {
            copy_dir(&entry.path(), &target);
        } else {
            fs::copy(entry.path(), target).unwrap();
        }
    }
}

fn models_of(side: &Value) -> Vec<String> {
    side.as_array()
        .unwrap()
        .iter()
        .map(|m| m.get("model").unwrap_or(m).as_str().unwrap().to_string())
        .collect()
}

#[test]
fn overview_table_comparison_and_escaping() {
    let tmp = tempfile::tempdir().unwrap();
    let models = tmp.path().join("models");
    make_collection(&models);
    let out = tmp.path().join("out");
    let (code, err) = gibbsite(&[
        "collection",
        "build",
        s(&models),
        "-o",
        s(&out),
        "--jobs",
        "2",
    ]);
    assert_eq!(code, 2, "{err}");
    let data: Value =
        serde_json::from_str(&fs::read_to_string(out.join("collection.json")).unwrap()).unwrap();
    assert_eq!(data["generated"], "2023-11-14T22:13:20Z");
    assert_eq!(
        (data["models"].as_u64(), data["failed"].as_u64()),
        (Some(4), Some(1))
    );

    // Rows in sorted order; the figures are those of the demo's report
    // (tests/demo.rs): 32 reactions, 5 errors (PEPS alone, PEPS at dusk
    // and in the refit, LDH at dusk, the pigment set in the bloom), loop
    // {PYK, PEPS}.
    let rows = data["rows"].as_array().unwrap();
    let names: Vec<&str> = rows.iter().map(|r| r["name"].as_str().unwrap()).collect();
    assert_eq!(names, ["broken", "strain_a", "strain_b", "strain_c"]);
    assert_eq!(rows[0]["exit_code"], 2);
    assert!(
        rows[0]["error"]
            .as_str()
            .unwrap()
            .starts_with("broken.yaml"),
        "path relative to the collection: {}",
        rows[0]["error"]
    );
    let a = &rows[1]["figures"];
    assert_eq!(
        (a["reactions"].as_u64(), a["errors"].as_u64()),
        (Some(32), Some(5))
    );
    assert_eq!(
        (a["loop_capable"].as_u64(), a["elementary_loops"].as_u64()),
        (Some(2), Some(1))
    );
    // PEPS (only direction and dusk flux) and LDH (dusk flux).
    assert_eq!(a["contradictions"], 2);
    assert_eq!(rows[1]["exit_code"], 1);
    let b = &rows[2]["figures"];
    assert_eq!(
        (b["reactions"].as_u64(), b["loop_capable"].as_u64()),
        (Some(31), Some(0))
    );
    assert_eq!(b["contradictions"], 1, "only LDH without PEPS");
    assert_eq!(
        rows[3]["figures"]["contradictions"], 1,
        "only PEPS: LDH_L has no dusk flux"
    );

    let rows = data["comparison"]["rows"].as_array().unwrap();
    let find = |difference: &str, reaction: &str| {
        rows.iter()
            .find(|r| r["difference"] == difference && r["reactions"][0] == reaction)
            .unwrap_or_else(|| panic!("no {difference} row for {reaction}: {rows:#?}"))
    };
    let peps = find("loop", "PEPS");
    assert_eq!(models_of(&peps["flagged"]), ["strain_a", "strain_c"]);
    assert_eq!(models_of(&peps["absent"]), ["strain_b"]);
    let pyk = find("loop", "PYK");
    assert_eq!(models_of(&pyk["flagged"]), ["strain_a", "strain_c"]);
    assert_eq!(models_of(&pyk["not_flagged"]), ["strain_b"]);
    assert_eq!(pyk["flagged"][0]["href"], "strain_a/reactions/PYK.html");
    // LDH and LDH_L are one reaction, matched by the KEGG id.
    let ldh = find("contradiction", "LDH");
    assert_eq!(ldh["reactions"], serde_json::json!(["LDH", "LDH_L"]));
    assert_eq!(
        ldh["matched_by"],
        serde_json::json!(["kegg.reaction:R00703"])
    );
    assert_eq!(models_of(&ldh["flagged"]), ["strain_a", "strain_b"]);
    assert_eq!(models_of(&ldh["not_flagged"]), ["strain_c"]);
    assert_eq!(ldh["not_flagged"][0]["reaction"], "LDH_L");
    let peps = find("contradiction", "PEPS");
    assert_eq!(models_of(&peps["absent"]), ["strain_b"]);
    assert_eq!(rows.len(), 4, "{rows:#?}");

    let html = fs::read_to_string(out.join("index.html")).unwrap();
    assert!(!html.contains("<script>alert"), "model strings are escaped");
    assert!(
        html.contains("&lt;script&gt;alert(1)&lt;&#x2f;script&gt;"),
        "{html}"
    );
    // Relative links only: to each report and to the reaction pages.
    assert!(html.contains(r#"<a href="strain_a/index.html">strain_a</a>"#));
    assert!(html.contains(r#"href="strain_a/reactions/PYK.html""#));
    assert!(!html.contains("href=\"/") && !html.contains("href=\"http"));
    assert!(html.contains("data-sortable"));
    assert_eq!(html.matches("<svg").count(), 6, "six distribution charts");
    assert!(html.contains("lowest 31 (strain_b), median 32, highest 32 (strain_a, strain_c)"));
    assert!(out.join("strain_a/index.html").is_file());
    assert!(!out.join("broken").exists());
}

#[test]
fn merge_refuses_an_incomplete_set_of_slices() {
    let tmp = tempfile::tempdir().unwrap();
    let models = tmp.path().join("models");
    make_collection(&models);
    let one = tmp.path().join("one");
    let (code, err) = gibbsite(&[
        "collection",
        "build",
        s(&models),
        "-o",
        s(&one),
        "--shard",
        "2/3",
    ]);
    assert_eq!(code, 1, "{err}");
    let merged = tmp.path().join("merged");
    let (code, err) = gibbsite(&["collection", "merge", s(&one), "-o", s(&merged)]);
    assert_eq!(code, 2);
    assert!(err.contains("slices 1, 3 of 3 missing"), "{err}");
    assert!(!merged.exists(), "nothing written");
}

#[test]
fn bad_collection_inputs_are_usage_errors_with_nothing_written() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("out");
    // A single project is not a collection.
    let (code, err) = gibbsite(&["collection", "build", s(&demo_dir()), "-o", s(&out)]);
    assert_eq!(code, 2);
    assert!(err.contains("use `gibbsite build`"), "{err}");
    // A list file naming a missing model: file and line.
    let list = tmp.path().join("models.txt");
    fs::write(&list, "# strains\n\nmissing.xml\n").unwrap();
    let (code, err) = gibbsite(&["collection", "build", s(&list), "-o", s(&out)]);
    assert_eq!(code, 2);
    assert!(
        err.contains("models.txt:3:1: error: `missing.xml` not found"),
        "{err}"
    );
    let (code, err) = gibbsite(&[
        "collection",
        "build",
        s(&list),
        "-o",
        s(&out),
        "--shard",
        "4/3",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("1 ≤ i ≤ n"), "{err}");
    assert!(!out.exists());
    // An output folder of other files is never written into.
    fs::create_dir(&out).unwrap();
    fs::write(out.join("thesis.tex"), "mine").unwrap();
    let models = tmp.path().join("models");
    make_collection(&models);
    let (code, err) = gibbsite(&["collection", "build", s(&models), "-o", s(&out)]);
    assert_eq!(code, 2);
    assert!(err.contains("refusing"), "{err}");
    assert_eq!(fs::read_dir(&out).unwrap().count(), 1);
}

#[test]
fn a_list_file_names_models_relative_to_itself() {
    let tmp = tempfile::tempdir().unwrap();
    let models = tmp.path().join("models");
    make_collection(&models);
    let list = tmp.path().join("pick.txt");
    fs::write(
        &list,
        "models/strain_b\n# not this one: models/strain_a\nmodels/strain_c\n",
    )
    .unwrap();
    let out = tmp.path().join("out");
    let (code, err) = gibbsite(&[
        "collection",
        "build",
        s(&list),
        "-o",
        s(&out),
        "--fail-on",
        "never",
    ]);
    assert_eq!(code, 0, "{err}");
    let data: Value =
        serde_json::from_str(&fs::read_to_string(out.join("collection.json")).unwrap()).unwrap();
    assert_eq!(data["title"], "Model collection pick");
    let sources: Vec<&str> = data["rows"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| r["source"].as_str().unwrap())
        .collect();
    assert_eq!(sources, ["models/strain_b", "models/strain_c"]);
}
