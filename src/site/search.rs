//! The site-wide search index, shipped as a script file
//! (`assets/search-index.js`) so it works from `file://`, where pages may
//! not fetch files: the search box (theme asset `search.js`) adds a
//! `<script>` element for it the first time the box is used.
//!
//! Each entry is `[kind, id, name, path]` with `path` relative to the
//! site's root; model strings are plain JSON data, which the search script
//! only ever puts into text nodes.

use crate::report::Report;

/// Where the index is written in the site.
pub const INDEX_FILE: &str = "assets/search-index.js";

/// The index script: one global array, in the report's order.
pub fn index_script(report: &Report) -> String {
    let mut entries: Vec<[&str; 4]> = Vec::new();
    let paths: Vec<String> = report
        .reactions
        .iter()
        .map(|r| format!("reactions/{}.html", r.slug))
        .chain(
            report
                .metabolites
                .iter()
                .map(|m| format!("metabolites/{}.html", m.slug)),
        )
        .chain(
            report
                .loops
                .iter()
                .flat_map(|l| &l.loops)
                .map(|l| format!("loops/{}.html", crate::slug::slug(&l.id))),
        )
        .chain(
            report
                .joint_scenarios
                .iter()
                .map(|s| format!("scenarios/{}.html", s.slug)),
        )
        .chain(
            report
                .notes
                .iter()
                .map(|n| format!("notes/{}.html", n.slug)),
        )
        .collect();
    let mut path = paths.iter().map(String::as_str);
    let mut next = || path.next().unwrap_or_default();
    for r in &report.reactions {
        entries.push(["reaction", &r.id, &r.name, next()]);
    }
    for m in &report.metabolites {
        entries.push(["metabolite", &m.id, &m.name, next()]);
    }
    for l in report.loops.iter().flat_map(|l| &l.loops) {
        entries.push(["loop", &l.id, "", next()]);
    }
    for s in &report.joint_scenarios {
        entries.push(["scenario", &s.id, &s.description, next()]);
    }
    for n in &report.notes {
        entries.push(["note", &n.title, "", next()]);
    }
    let json = serde_json::to_string(&entries).expect("strings always serialise");
    // Keep `</` out in case a theme inlines the index in a page.
    let json = json.replace("</", "<\\/");
    format!(
        "// Search index of this site (generated; read by search.js).\n\
         window.gibbsiteSearch = {json};\n"
    )
}
