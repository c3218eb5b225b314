//! One stylesheet and one script per page: `assets/site.css` and
//! `assets/site.js`, joined at build time from the theme's files, so a
//! page asks the browser for two assets instead of six and carries two
//! links instead of six.
//!
//! The parts stay in the theme as separate files (and are still written to
//! `assets/` one by one, for a user theme's own pages and the collection
//! overview): a user theme that replaces `style.css` changes the bundle
//! too. A theme that brings its own `site.css` or `site.js` gets that file
//! as it is.

use super::theme::Theme;

/// The bundled stylesheet and script, by file name in `assets/`.
pub const CSS: &str = "site.css";
pub const JS: &str = "site.js";

/// Theme files joined into `site.css`, in cascade order (the map
/// stylesheet, made by `site::map`, comes last).
const CSS_PARTS: [&str; 2] = ["style.css", "pages.css"];
/// Theme files joined into `site.js`; each is a self-contained function
/// expression, so joining them changes nothing in their scope.
const JS_PARTS: [&str; 3] = ["table.js", "map.js", "search.js"];

/// (`assets/<name>`, content) of the bundles the theme does not bring itself.
pub fn files(theme: &Theme) -> Vec<(String, Vec<u8>)> {
    let mut out = Vec::new();
    let has = |name: &str| theme.assets().any(|(n, _)| n == name);
    if !has(CSS) {
        let map_css = super::map::pages::shared_assets()
            .into_iter()
            .find(|(path, _)| path.ends_with(".css"))
            .map(|(_, css)| css.into_bytes());
        out.push((
            format!("assets/{CSS}"),
            join(theme, &CSS_PARTS, map_css.as_deref()),
        ));
    }
    if !has(JS) {
        out.push((format!("assets/{JS}"), join(theme, &JS_PARTS, None)));
    }
    out
}

/// The named theme files (those the theme has) and `extra`, each ending in
/// a line break.
fn join(theme: &Theme, parts: &[&str], extra: Option<&[u8]>) -> Vec<u8> {
    let mut out = Vec::new();
    let named = parts
        .iter()
        .filter_map(|part| theme.assets().find(|(n, _)| n == part).map(|(_, b)| b));
    for bytes in named.chain(extra) {
        out.extend_from_slice(bytes);
        if !bytes.ends_with(b"\n") {
            out.push(b'\n');
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bundles_hold_every_part_in_order() {
        let theme = Theme::load(None).unwrap();
        let files = files(&theme);
        let get = |name: &str| {
            let (_, bytes) = files.iter().find(|(p, _)| p.ends_with(name)).unwrap();
            String::from_utf8(bytes.clone()).unwrap()
        };
        let css = get(CSS);
        let style = css.find("--ink:").expect("style.css");
        let pages = css.find("nav.pager").expect("pages.css");
        let (_, map_css) = super::super::map::pages::shared_assets()
            .into_iter()
            .find(|(path, _)| path.ends_with(".css"))
            .unwrap();
        let map = css.find(map_css.as_str()).expect("the map stylesheet");
        assert!(style < pages && pages < map);
        let js = get(JS);
        for marker in ["data-sortable", "data-zoom", "search-index.js"] {
            assert!(js.contains(marker), "{marker}");
        }
    }

    #[test]
    fn a_theme_with_its_own_bundle_keeps_it() {
        let dir = tempfile::tempdir().unwrap();
        std::fs::write(dir.path().join("site.css"), "body{}").unwrap();
        let theme = Theme::load(Some(dir.path())).unwrap();
        let names: Vec<String> = files(&theme).into_iter().map(|(p, _)| p).collect();
        assert_eq!(names, ["assets/site.js"]);
    }
}
