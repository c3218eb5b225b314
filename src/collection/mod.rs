//! Collections: many models (strain or tissue models built from one
//! template) analysed in one run, each into its own report, plus an
//! overview page that compares them.
//!
//! ```text
//! <out>/index.html          the collection overview (table, charts, comparison)
//! <out>/collection.json     the overview's data
//! <out>/assets/             theme assets of the overview
//! <out>/<model>/            one full report site per model (report.json inside)
//! <out>/shard-<i>-of-<n>.json   which models this run built and which failed
//! ```
//!
//! - [`discover`] turns a folder or a list file into sorted [`Entry`]s;
//! - [`run`] builds the reports in parallel within a jobs/memory budget;
//! - [`digest`] is the part of a report the overview needs, read from
//!   memory or from a `report.json`;
//! - [`compare`] finds reactions that loop or contradict in some models only;
//! - [`overview`] renders the page, with [`chart`] drawing distributions;
//! - [`shard`] slices a collection for several machines and merges the slices.
//!
//! Whether built in one run or in shards merged later, the overview is made
//! from the same digests in the same order, so its bytes are the same.

pub mod chart;
pub mod compare;
pub mod digest;
pub mod overview;
pub mod run;
pub mod shard;

use crate::error::{Diagnostic, Error, Result};
use serde::{Deserialize, Serialize};
use shard::ShardSpec;
use std::path::{Path, PathBuf};

/// Written into a collection output folder; its presence lets a later run
/// write into a non-empty folder.
pub const MARKER_FILE: &str = ".gibbsite-collection";

/// Which findings make a model's exit status 1.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum FailLevel {
    Error,
    Warning,
    Never,
}

impl FailLevel {
    pub fn slug(self) -> &'static str {
        match self {
            FailLevel::Error => "error",
            FailLevel::Warning => "warning",
            FailLevel::Never => "never",
        }
    }
}

/// Exit status of one model, ordered from best to worst; the collection
/// exits with the worst.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum ModelStatus {
    /// No finding at or above the fail level (exit code 0).
    Passed,
    /// At least one finding at or above the fail level (exit code 1).
    Findings,
    /// The model could not be loaded or its report not written (exit code 2).
    Failed,
}

impl ModelStatus {
    pub fn exit_code(self) -> u8 {
        match self {
            ModelStatus::Passed => 0,
            ModelStatus::Findings => 1,
            ModelStatus::Failed => 2,
        }
    }

    /// Status from finding counts, as `gibbsite build --fail-on` decides.
    pub fn from_counts(errors: usize, warnings: usize, fail_on: FailLevel) -> ModelStatus {
        let failing = match fail_on {
            FailLevel::Never => false,
            FailLevel::Error => errors > 0,
            FailLevel::Warning => errors + warnings > 0,
        };
        if failing {
            ModelStatus::Findings
        } else {
            ModelStatus::Passed
        }
    }
}

/// One model of a collection.
#[derive(Debug, Clone, PartialEq)]
pub struct Entry {
    /// Folder name of its report inside the output (a slug, unique).
    pub name: String,
    /// The path as the collection names it: relative to the collection
    /// folder or as written in the list file. Sorting and sharding use it,
    /// so every machine slices the same way.
    pub source: String,
    /// Where to read it on this machine.
    pub path: PathBuf,
}

/// File names a collection folder may hold as models.
fn is_model_file(name: &str) -> bool {
    let name = name.to_ascii_lowercase();
    if name == crate::project::SETTINGS_FILE {
        return false;
    }
    [".xml", ".xml.gz", ".sbml", ".yaml", ".yml"]
        .iter()
        .any(|ext| name.ends_with(ext))
}

/// The models of a collection, sorted by `source`.
///
/// `input` is a folder (its SBML / model YAML files and its subfolders that
/// hold a `gibbsite.yaml`; hidden entries skipped) or a list file (one path
/// per line, relative to the list's folder; blank lines and `#` comments
/// skipped). Problems are input errors (exit 2, nothing written).
pub fn discover(input: &Path) -> Result<Vec<Entry>> {
    let mut found: Vec<(String, PathBuf)> = Vec::new();
    if input.is_dir() {
        if input.join(crate::project::SETTINGS_FILE).is_file() {
            return Err(Error::input(Diagnostic::new(
                input,
                "this folder is one project (it has gibbsite.yaml); use `gibbsite build` for it, \
                 or give the folder that holds several projects or model files",
            )));
        }
        let entries = std::fs::read_dir(input).map_err(|e| Error::io(input, e))?;
        for entry in entries {
            let entry = entry.map_err(|e| Error::io(input, e))?;
            let file_name = entry.file_name().to_string_lossy().into_owned();
            if file_name.starts_with('.') {
                continue;
            }
            let path = entry.path();
            let is_project = path.is_dir() && path.join(crate::project::SETTINGS_FILE).is_file();
            if is_project || (path.is_file() && is_model_file(&file_name)) {
                found.push((file_name, path));
            }
        }
    } else if input.is_file() {
        if is_model_file(&input.to_string_lossy()) {
            return Err(Error::input(Diagnostic::new(
                input,
                "this is one model; use `gibbsite build` for it, or give a folder of models \
                 or a list file (one path per line)",
            )));
        }
        let text = std::fs::read_to_string(input).map_err(|e| {
            Error::input(Diagnostic::new(
                input,
                format!("cannot read list file: {e}"),
            ))
        })?;
        let base = input.parent().unwrap_or(Path::new("."));
        let mut problems = Vec::new();
        for (n, line) in text.lines().enumerate() {
            let line = line.trim();
            if line.is_empty() || line.starts_with('#') {
                continue;
            }
            let path = base.join(line);
            if !path.exists() {
                problems.push(
                    Diagnostic::new(
                        input,
                        format!("`{line}` not found (looked for {})", path.display()),
                    )
                    .at(n + 1, 1),
                );
                continue;
            }
            found.push((line.to_string(), path));
        }
        if !problems.is_empty() {
            return Err(Error::Input(problems));
        }
    } else {
        return Err(Error::input(Diagnostic::new(
            input,
            "no such file or folder; expected a folder of models or a list file",
        )));
    }
    if found.is_empty() {
        return Err(Error::input(Diagnostic::new(
            input,
            "no models found (expected SBML .xml/.xml.gz/.sbml files, model .yaml files or \
             project folders with gibbsite.yaml)",
        )));
    }
    found.sort();
    found.dedup_by(|a, b| a.0 == b.0);
    let mut entries: Vec<Entry> = Vec::with_capacity(found.len());
    let mut problems = Vec::new();
    let mut seen = std::collections::BTreeMap::new();
    for (source, path) in found {
        let name = model_name(&source);
        if let Some(first) = seen.insert(name.to_ascii_lowercase(), source.clone()) {
            problems.push(Diagnostic::new(
                input,
                format!("`{first}` and `{source}` would both be reported in the folder `{name}`; rename one"),
            ));
            continue;
        }
        entries.push(Entry { name, source, path });
    }
    if !problems.is_empty() {
        return Err(Error::Input(problems));
    }
    Ok(entries)
}

/// Report folder name of a model: its file name without the model
/// extensions, as a slug; never a name the overview itself uses.
pub fn model_name(source: &str) -> String {
    let file = source
        .trim_end_matches(['/', '\\'])
        .rsplit(['/', '\\'])
        .next()
        .unwrap_or(source);
    let lower = file.to_ascii_lowercase();
    let mut stem = file;
    for ext in [".xml.gz", ".xml", ".sbml", ".yaml", ".yml"] {
        if lower.ends_with(ext) {
            stem = &file[..file.len() - ext.len()];
            break;
        }
    }
    let name = crate::slug::slug(stem);
    if name.eq_ignore_ascii_case("assets") || name.to_ascii_lowercase().starts_with("shard-") {
        format!("{name}-model")
    } else {
        name
    }
}

/// Error text without the collection folder's own path, so the overview
/// reads the same on every machine that built a slice.
pub(crate) fn relative_message(message: &str, root: &Path) -> String {
    let root = root.to_string_lossy();
    let root = root.trim_end_matches('/');
    if root.is_empty() || root == "." {
        return message.to_string();
    }
    message.replace(&format!("{root}/"), "")
}

/// How `build` runs.
#[derive(Debug, Clone)]
pub struct BuildOptions {
    pub limits: run::Limits,
    /// Build only this slice (and no overview unless it is the whole).
    pub shard: ShardSpec,
    pub fail_on: FailLevel,
    /// Overview title (default from the folder or list file name).
    pub title: Option<String>,
}

/// What a build or merge did.
#[derive(Debug, Clone)]
pub struct Finished {
    /// Models built (or merged) and how many of them failed.
    pub models: usize,
    pub failed: usize,
    /// The worst model status: the exit code of the run.
    pub worst: ModelStatus,
    /// The overview's data, when one was written.
    pub overview: Option<overview::Overview>,
}

/// Builds the reports of the collection at `input` (a slice of it with
/// `--shard`) into `out`, then the overview when the whole collection was
/// built. `progress` receives each finished model with a line saying how
/// it went.
pub fn build(
    input: &Path,
    out: &Path,
    options: &BuildOptions,
    progress: &(dyn Fn(&run::ModelOutcome, &str) + Sync),
) -> Result<Finished> {
    let entries = discover(input)?;
    let root = if input.is_dir() {
        input.to_path_buf()
    } else {
        input.parent().unwrap_or(Path::new(".")).to_path_buf()
    };
    let title = options
        .title
        .clone()
        .unwrap_or_else(|| default_title(input));
    let slice = options.shard.select(&entries);
    prepare_output(out)?;
    let done = std::sync::atomic::AtomicUsize::new(0);
    let total = slice.len();
    let outcomes = run::build_models(&slice, &root, out, options.limits, &|o| {
        let k = done.fetch_add(1, std::sync::atomic::Ordering::Relaxed) + 1;
        progress(o, &progress_line(k, total, o));
    });
    let file = shard::ShardFile {
        format: shard::SHARD_FORMAT.into(),
        title: title.clone(),
        shard: options.shard,
        collection_models: entries.len(),
        fingerprint: shard::fingerprint(&entries),
        models: outcomes
            .iter()
            .map(|o| shard::ShardModel {
                name: o.entry.name.clone(),
                source: o.entry.source.clone(),
                error: o.result.as_ref().err().cloned(),
            })
            .collect(),
    };
    write_json(&out.join(options.shard.file_name()), &file)?;
    let results: Vec<overview::ModelResult> = outcomes
        .into_iter()
        .map(|o| overview::ModelResult {
            name: o.entry.name,
            source: o.entry.source,
            result: o.result,
        })
        .collect();
    finish(
        out,
        title,
        options.fail_on,
        results,
        options.shard.count == 1,
    )
}

/// Builds the overview in `out` from the slices in `inputs` (output
/// folders of `build --shard`, possibly made on different machines). Model
/// folders not already in `out` are copied there.
pub fn merge(
    inputs: &[PathBuf],
    out: &Path,
    fail_on: FailLevel,
    title: Option<String>,
) -> Result<Finished> {
    let shards = shard::read_shards(inputs)?;
    prepare_output(out)?;
    let out_real = std::fs::canonicalize(out).map_err(|e| Error::io(out, e))?;
    let mut results = Vec::new();
    for s in &shards {
        let in_place = std::fs::canonicalize(&s.dir).is_ok_and(|d| d == out_real);
        for m in &s.file.models {
            let result = match &m.error {
                Some(error) => Err(error.clone()),
                None => {
                    let target = out.join(&m.name);
                    if !in_place {
                        replace_site(&s.dir.join(&m.name), &target)?;
                    }
                    digest::Digest::read(&target.join("report.json"))
                        .map_err(|e| relative_message(&e.to_string(), out))
                }
            };
            results.push(overview::ModelResult {
                name: m.name.clone(),
                source: m.source.clone(),
                result,
            });
        }
    }
    // Collection order, as a single run has it.
    results.sort_by(|a, b| a.source.cmp(&b.source));
    let title = title.unwrap_or_else(|| shards[0].file.title.clone());
    finish(out, title, fail_on, results, true)
}

fn finish(
    out: &Path,
    title: String,
    fail_on: FailLevel,
    models: Vec<overview::ModelResult>,
    write_overview: bool,
) -> Result<Finished> {
    let failed = models.iter().filter(|m| m.result.is_err()).count();
    let worst = models
        .iter()
        .map(|m| match &m.result {
            Ok(d) => ModelStatus::from_counts(d.errors, d.warnings, fail_on),
            Err(_) => ModelStatus::Failed,
        })
        .max()
        .unwrap_or(ModelStatus::Passed);
    let count = models.len();
    let data = if write_overview {
        let data = overview::overview(&overview::Collection {
            title,
            fail_on,
            models,
        });
        overview::write(out, &data)?;
        Some(data)
    } else {
        None
    };
    Ok(Finished {
        models: count,
        failed,
        worst,
        overview: data,
    })
}

fn progress_line(k: usize, total: usize, o: &run::ModelOutcome) -> String {
    let what = match &o.result {
        Ok(d) => format!(
            "{} errors, {} warnings, {} reactions",
            d.errors, d.warnings, d.reactions
        ),
        Err(e) => format!("FAILED: {}", e.lines().next().unwrap_or("")),
    };
    format!(
        "[{k}/{total}] {} ({:.1} s): {what}",
        o.entry.name, o.seconds
    )
}

/// "Model collection <name>" from the folder or list file name.
fn default_title(input: &Path) -> String {
    let name = input
        .canonicalize()
        .ok()
        .and_then(|p| p.file_name().map(|n| n.to_string_lossy().into_owned()))
        .unwrap_or_else(|| input.display().to_string());
    let stem = if input.is_file() {
        name.rsplit_once('.')
            .map_or(name.as_str(), |(s, _)| s)
            .to_string()
    } else {
        name
    };
    format!("Model collection {stem}")
}

/// `out` may be written when it does not exist, is empty, or was made by
/// a collection run (marker file); never a folder of other files.
fn prepare_output(out: &Path) -> Result<()> {
    if out.exists() {
        if !out.is_dir() {
            return Err(Error::io(
                out,
                std::io::Error::other("exists and is not a folder"),
            ));
        }
        let empty = std::fs::read_dir(out)
            .map_err(|e| Error::io(out, e))?
            .next()
            .is_none();
        if !empty && !out.join(MARKER_FILE).is_file() {
            return Err(Error::io(
                out,
                std::io::Error::other(
                    "exists, is not empty and was not made by `gibbsite collection`; refusing to \
                     write into it (remove it or choose another output folder)",
                ),
            ));
        }
    }
    std::fs::create_dir_all(out).map_err(|e| Error::io(out, e))?;
    std::fs::write(
        out.join(MARKER_FILE),
        "This folder was generated by gibbsite collection; model folders are replaced on every run.\n",
    )
    .map_err(|e| Error::io(out, e))
}

/// Copies a model's site from a slice folder into the merged output,
/// replacing an earlier copy (only a folder gibbsite made).
fn replace_site(from: &Path, to: &Path) -> Result<()> {
    if to.exists() {
        if !to.join(crate::site::write::MARKER_FILE).is_file() {
            return Err(Error::io(
                to,
                std::io::Error::other(
                    "exists and is not a gibbsite report; refusing to replace it",
                ),
            ));
        }
        std::fs::remove_dir_all(to).map_err(|e| Error::io(to, e))?;
    }
    shard::copy_dir(from, to)
}

fn write_json<T: Serialize>(path: &Path, value: &T) -> Result<()> {
    let json = serde_json::to_string_pretty(value).map_err(|e| Error::Render {
        template: path.display().to_string(),
        message: e.to_string(),
    })?;
    std::fs::write(path, format!("{json}\n")).map_err(|e| Error::io(path, e))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn model_names_drop_extensions_and_avoid_reserved_folders() {
        assert_eq!(model_name("iML1515.xml.gz"), "iML1515");
        assert_eq!(model_name("strains/iZ_1308.XML"), "iZ_1308");
        assert_eq!(model_name("lakeside/"), "lakeside");
        assert_eq!(model_name("assets.yaml"), "assets-model");
        assert_eq!(model_name("shard-1.xml"), "shard-1-model");
        // Unsafe characters become a slug with a hash.
        assert!(model_name("a b.xml").starts_with("a_b-"));
    }

    #[test]
    fn status_follows_the_fail_level() {
        use ModelStatus::*;
        assert_eq!(ModelStatus::from_counts(1, 0, FailLevel::Error), Findings);
        assert_eq!(ModelStatus::from_counts(0, 3, FailLevel::Error), Passed);
        assert_eq!(ModelStatus::from_counts(0, 3, FailLevel::Warning), Findings);
        assert_eq!(ModelStatus::from_counts(5, 3, FailLevel::Never), Passed);
        assert!(Failed > Findings && Findings > Passed);
        assert_eq!(Failed.exit_code(), 2);
    }

    #[test]
    fn error_messages_lose_the_collection_path() {
        let m = relative_message("/tmp/c/bad.yaml:3:1: error: x", Path::new("/tmp/c/"));
        assert_eq!(m, "bad.yaml:3:1: error: x");
    }
}
