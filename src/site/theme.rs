//! Theme files: the default theme is embedded in the binary; a user theme
//! folder replaces it file by file.
//!
//! Files ending in `.html` are minijinja templates; every other file is an
//! asset copied to `assets/` in the site (CSS, JavaScript, images).

use crate::error::Error;
use std::borrow::Cow;
use std::collections::BTreeMap;
use std::fs;
use std::path::{Path, PathBuf};

macro_rules! embed {
    ($($name:literal),* $(,)?) => {
        &[$(
            ($name, include_bytes!(concat!(env!("CARGO_MANIFEST_DIR"), "/themes/default/", $name))),
        )*]
    };
}

/// The default theme, by file name. Adding a file to `themes/default/`
/// means adding its name here (a test checks the two agree).
pub static DEFAULT_THEME: &[(&str, &[u8])] = embed![
    "layout.html",
    "macros.html",
    "index.html",
    "findings.html",
    "kinds.html",
    "findings_list.html",
    "coverage.html",
    "reactions.html",
    "reaction.html",
    "metabolites.html",
    "metabolite.html",
    "notes.html",
    "note.html",
    "loops.html",
    "loop.html",
    "energy_cycle.html",
    "collection.html",
    "scenario.html",
    "maps.html",
    "map.html",
    "map_section.html",
    "map_key.html",
    "style.css",
    "pages.css",
    "table.js",
    "map.js",
    "search.js",
    "pager.html",
    "guide.html",
    "findings.js",
];

/// The theme in use: file name (with `/` between folders) → content.
#[derive(Debug, Clone)]
pub struct Theme {
    files: BTreeMap<String, Cow<'static, [u8]>>,
    /// Names that came from the user's folder, with their path on disk.
    user_files: BTreeMap<String, PathBuf>,
}

impl Theme {
    /// The default theme with every file of `user_dir` (if any) laid over it.
    pub fn load(user_dir: Option<&Path>) -> Result<Theme, Error> {
        let mut files: BTreeMap<String, Cow<'static, [u8]>> = DEFAULT_THEME
            .iter()
            .map(|(name, bytes)| (name.to_string(), Cow::Borrowed(*bytes)))
            .collect();
        let mut user_files = BTreeMap::new();
        if let Some(dir) = user_dir {
            let mut user = BTreeMap::new();
            // A theme is read inside its own folder: a symlink pointing out of
            // it (to a key, a credentials file) is refused, as are devices.
            let confinement = crate::project::read::Confinement::new(dir, &[]);
            crate::project::read::confined(confinement, || read_dir_recursive(dir, "", &mut user))?;
            for (name, (path, bytes)) in user {
                files.insert(name.clone(), Cow::Owned(bytes));
                user_files.insert(name, path);
            }
        }
        Ok(Theme { files, user_files })
    }

    /// Where a theme file comes from, for error messages: the user's file
    /// path, or the name with "(default theme)".
    pub fn describe(&self, name: &str) -> String {
        match self.user_files.get(name) {
            Some(path) => path.display().to_string(),
            None => format!("{name} (default theme)"),
        }
    }

    /// Templates (`*.html`) as text, sorted by name.
    pub fn templates(&self) -> Result<Vec<(&str, &str)>, Error> {
        self.files
            .iter()
            .filter(|(name, _)| is_template(name))
            .map(|(name, bytes)| {
                std::str::from_utf8(bytes)
                    .map(|text| (name.as_str(), text))
                    .map_err(|e| Error::Render {
                        template: self.describe(name),
                        message: format!("the template is not valid UTF-8 ({e})"),
                    })
            })
            .collect()
    }

    /// Everything that is not a template, sorted by name.
    pub fn assets(&self) -> impl Iterator<Item = (&str, &[u8])> {
        self.files
            .iter()
            .filter(|(name, _)| !is_template(name))
            .map(|(name, bytes)| (name.as_str(), bytes.as_ref()))
    }
}

fn is_template(name: &str) -> bool {
    name.ends_with(".html")
}

/// Collects the files below `dir`; hidden files and folders (editor and OS
/// droppings like `.DS_Store`) are skipped. Names only come from existing
/// directory entries, so they cannot climb out of the site folder.
fn read_dir_recursive(
    dir: &Path,
    prefix: &str,
    out: &mut BTreeMap<String, (PathBuf, Vec<u8>)>,
) -> Result<(), Error> {
    let entries = fs::read_dir(dir).map_err(|e| Error::io(dir, e))?;
    for entry in entries {
        let entry = entry.map_err(|e| Error::io(dir, e))?;
        let path = entry.path();
        let Some(file_name) = entry.file_name().to_str().map(str::to_owned) else {
            return Err(Error::io(
                &path,
                std::io::Error::new(
                    std::io::ErrorKind::InvalidData,
                    "theme file names must be valid UTF-8",
                ),
            ));
        };
        if file_name.starts_with('.') {
            continue;
        }
        let name = format!("{prefix}{file_name}");
        // Folders are walked only when they are real folders (a symlinked
        // folder could loop or lead to `/proc`); files are read through the
        // confined, size-capped reader.
        let meta = fs::symlink_metadata(&path).map_err(|e| Error::io(&path, e))?;
        if meta.is_dir() {
            read_dir_recursive(&path, &format!("{name}/"), out)?;
        } else if meta.file_type().is_symlink() && path.is_dir() {
            return Err(Error::input(crate::error::Diagnostic::new(
                &path,
                "a symlinked folder in the theme is not followed; copy the files into the theme",
            )));
        } else {
            let bytes = crate::project::read::read_bytes(&path).map_err(Error::input)?;
            out.insert(name, (path, bytes));
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_default_theme_file_is_embedded() {
        let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("themes/default");
        let mut on_disk: Vec<String> = fs::read_dir(dir)
            .unwrap()
            .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
            .collect();
        on_disk.sort();
        let mut embedded: Vec<String> = DEFAULT_THEME.iter().map(|(n, _)| n.to_string()).collect();
        embedded.sort();
        assert_eq!(on_disk, embedded);
    }
}
