//! Slicing a collection across machines and putting the slices together.
//!
//! `--shard i/n` takes every n-th model of the collection sorted by its
//! path, starting at the i-th (round robin spreads large and small models
//! evenly). Every run writes `shard-<i>-of-<n>.json` beside the model
//! folders: the models it built, which failed and why, and a fingerprint of
//! the whole sorted list so slices from different checkouts are not mixed.
//! Merging reads those files and each model's `report.json`.

use super::Entry;
use crate::error::{Diagnostic, Error, Result};
use serde::{Deserialize, Serialize};
use std::path::{Path, PathBuf};
use std::str::FromStr;

/// Shape marker of the shard file.
pub const SHARD_FORMAT: &str = "gibbsite-collection-shard/1";

/// Slice `index` (1-based) of `count`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub struct ShardSpec {
    pub index: usize,
    pub count: usize,
}

impl ShardSpec {
    pub const WHOLE: ShardSpec = ShardSpec { index: 1, count: 1 };

    pub fn file_name(self) -> String {
        format!("shard-{}-of-{}.json", self.index, self.count)
    }

    /// The entries (sorted by source) this slice builds.
    pub fn select(self, entries: &[Entry]) -> Vec<Entry> {
        entries
            .iter()
            .enumerate()
            .filter(|(k, _)| k % self.count == self.index - 1)
            .map(|(_, e)| e.clone())
            .collect()
    }
}

impl FromStr for ShardSpec {
    type Err = String;
    fn from_str(s: &str) -> std::result::Result<ShardSpec, String> {
        let bad = || format!("expected a slice as i/n with 1 ≤ i ≤ n (e.g. 2/5), found `{s}`");
        let (i, n) = s.split_once('/').ok_or_else(bad)?;
        let (index, count): (usize, usize) = (
            i.trim().parse().map_err(|_| bad())?,
            n.trim().parse().map_err(|_| bad())?,
        );
        if index == 0 || index > count {
            return Err(bad());
        }
        Ok(ShardSpec { index, count })
    }
}

/// One model of a slice.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ShardModel {
    pub name: String,
    pub source: String,
    /// Why it has no report (then the folder holds none).
    pub error: Option<String>,
}

/// Contents of `shard-<i>-of-<n>.json`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ShardFile {
    pub format: String,
    pub title: String,
    pub shard: ShardSpec,
    /// Models in the whole collection, and a fingerprint of their sorted
    /// sources: every slice of one collection has the same.
    pub collection_models: usize,
    pub fingerprint: String,
    pub models: Vec<ShardModel>,
}

/// FNV-1a (64 bit) over the sorted sources: the same on every machine.
pub fn fingerprint(entries: &[Entry]) -> String {
    let mut hash: u64 = 0xcbf2_9ce4_8422_2325;
    for e in entries {
        for &b in e.source.as_bytes().iter().chain(b"\n") {
            hash ^= u64::from(b);
            hash = hash.wrapping_mul(0x0000_0100_0000_01b3);
        }
    }
    format!("{hash:016x}")
}

/// Every shard file in `dir`, sorted by name.
fn shard_files(dir: &Path) -> Result<Vec<PathBuf>> {
    let entries = std::fs::read_dir(dir).map_err(|e| Error::io(dir, e))?;
    let mut files = Vec::new();
    for entry in entries {
        let entry = entry.map_err(|e| Error::io(dir, e))?;
        let name = entry.file_name().to_string_lossy().into_owned();
        if name.starts_with("shard-") && name.ends_with(".json") {
            files.push(entry.path());
        }
    }
    files.sort();
    Ok(files)
}

/// A slice found on disk: the folder holding its model folders, and its file.
#[derive(Debug, Clone)]
pub struct FoundShard {
    pub dir: PathBuf,
    pub file: ShardFile,
}

/// Reads the shard files of `dirs` and checks they make one complete
/// collection: same count, fingerprint and title, every slice exactly once,
/// no model twice.
pub fn read_shards(dirs: &[PathBuf]) -> Result<Vec<FoundShard>> {
    let mut found = Vec::new();
    for dir in dirs {
        let files = shard_files(dir)?;
        if files.is_empty() {
            return Err(Error::input(Diagnostic::new(
                dir,
                "no shard-<i>-of-<n>.json here; expected the output folder of `gibbsite collection build`",
            )));
        }
        for path in files {
            let text = std::fs::read_to_string(&path).map_err(|e| Error::io(&path, e))?;
            let file: ShardFile = serde_json::from_str(&text).map_err(|e| {
                Error::input(
                    Diagnostic::new(&path, format!("not a gibbsite shard file: {e}"))
                        .at(e.line(), e.column()),
                )
            })?;
            if file.format != SHARD_FORMAT {
                return Err(Error::input(Diagnostic::new(
                    &path,
                    format!("shard format `{}` is not `{SHARD_FORMAT}`", file.format),
                )));
            }
            found.push((
                path,
                FoundShard {
                    dir: dir.clone(),
                    file,
                },
            ));
        }
    }
    let (first_path, first) = &found[0];
    let mut problems = Vec::new();
    let mut seen_slices = std::collections::BTreeMap::new();
    let mut seen_models = std::collections::BTreeMap::new();
    for (path, s) in &found {
        let f = &s.file;
        if f.shard.count != first.file.shard.count
            || f.fingerprint != first.file.fingerprint
            || f.collection_models != first.file.collection_models
            || f.title != first.file.title
        {
            problems.push(Diagnostic::new(
                path,
                format!(
                    "belongs to another collection or slicing than {} (slices of {} models, fingerprint {}, title {:?})",
                    first_path.display(),
                    first.file.collection_models,
                    first.file.fingerprint,
                    first.file.title
                ),
            ));
            continue;
        }
        if let Some(other) = seen_slices.insert(f.shard.index, path.clone()) {
            problems.push(Diagnostic::new(
                path,
                format!(
                    "slice {} of {} is also in {}",
                    f.shard.index,
                    f.shard.count,
                    other.display()
                ),
            ));
        }
        for m in &f.models {
            if let Some(other) = seen_models.insert(m.name.clone(), path.clone()) {
                problems.push(Diagnostic::new(
                    path,
                    format!("model `{}` is also in {}", m.name, other.display()),
                ));
            }
        }
    }
    let count = first.file.shard.count;
    let missing: Vec<String> = (1..=count)
        .filter(|i| !seen_slices.contains_key(i))
        .map(|i| i.to_string())
        .collect();
    if problems.is_empty() && !missing.is_empty() {
        problems.push(Diagnostic::new(
            first_path,
            format!(
                "slice{} {} of {count} missing",
                if missing.len() == 1 { "" } else { "s" },
                missing.join(", ")
            ),
        ));
    }
    if problems.is_empty() && seen_models.len() != first.file.collection_models {
        problems.push(Diagnostic::new(
            first_path,
            format!(
                "the slices list {} models, the collection has {}",
                seen_models.len(),
                first.file.collection_models
            ),
        ));
    }
    if !problems.is_empty() {
        return Err(Error::Input(problems));
    }
    Ok(found.into_iter().map(|(_, s)| s).collect())
}

/// Copies the folder `from` to `to` (which must not exist).
pub fn copy_dir(from: &Path, to: &Path) -> Result<()> {
    std::fs::create_dir_all(to).map_err(|e| Error::io(to, e))?;
    let entries = std::fs::read_dir(from).map_err(|e| Error::io(from, e))?;
    for entry in entries {
        let entry = entry.map_err(|e| Error::io(from, e))?;
        let target = to.join(entry.file_name());
        let kind = entry.file_type().map_err(|e| Error::io(&entry.path(), e))?;
        if kind.is_dir() {
            copy_dir(&entry.path(), &target)?;
        } else if kind.is_file() {
            std::fs::copy(entry.path(), &target).map_err(|e| Error::io(&target, e))?;
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn entries(n: usize) -> Vec<Entry> {
        (0..n)
            .map(|k| Entry {
                name: format!("m{k}"),
                source: format!("m{k}.xml"),
                path: PathBuf::from(format!("m{k}.xml")),
            })
            .collect()
    }

    #[test]
    fn slices_are_disjoint_and_cover_the_collection() {
        let all = entries(7);
        let slices: Vec<Vec<Entry>> = (1..=3)
            .map(|i| ShardSpec { index: i, count: 3 }.select(&all))
            .collect();
        let names = |s: &[Entry]| s.iter().map(|e| e.name.clone()).collect::<Vec<_>>();
        assert_eq!(names(&slices[0]), ["m0", "m3", "m6"]);
        assert_eq!(names(&slices[1]), ["m1", "m4"]);
        assert_eq!(names(&slices[2]), ["m2", "m5"]);
        assert_eq!(ShardSpec::WHOLE.select(&all), all);
    }

    #[test]
    fn shard_spec_parses_i_of_n() {
        assert_eq!(
            "2/5".parse::<ShardSpec>(),
            Ok(ShardSpec { index: 2, count: 5 })
        );
        assert!("0/3".parse::<ShardSpec>().is_err());
        assert!("4/3".parse::<ShardSpec>().is_err());
        assert!("2".parse::<ShardSpec>().is_err());
        assert_eq!(
            ShardSpec { index: 2, count: 5 }.file_name(),
            "shard-2-of-5.json"
        );
    }

    #[test]
    fn fingerprint_depends_on_the_sorted_list() {
        let a = entries(3);
        let mut b = entries(3);
        assert_eq!(fingerprint(&a), fingerprint(&b));
        b[2].source = "other.xml".into();
        assert_ne!(fingerprint(&a), fingerprint(&b));
    }
}
