//! Layout of the rendered site (issue 12, point 6): long lists split into
//! pages of at most 500 rows, the site-wide search index shipped as a
//! script file, a search box on every page that stays hidden without
//! JavaScript, and the narrow-screen rules that keep verdict columns in
//! view. How pages fit the window in a real browser is checked by
//! tests/browser_site.rs.

use gibbsite::report::Report;
use std::fs;
use std::path::Path;

fn demo_report() -> Report {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    gibbsite::Project::load(&dir)
        .expect("the demo project loads")
        .analyse()
}

/// The demo's reactions copied until there are `n` (ids `COPY00001_…`),
/// so the reactions list needs several pages.
fn with_reactions(mut report: Report, n: usize) -> Report {
    let originals = report.reactions.clone();
    let mut k = 0;
    while report.reactions.len() < n {
        let mut r = originals[k % originals.len()].clone();
        k += 1;
        r.id = format!("COPY{k:05}_{}", r.id);
        r.slug = r.id.clone();
        report.reactions.push(r);
    }
    report
}

fn rows(html: &str) -> usize {
    let body = &html[html.find("<tbody>").unwrap()..html.find("</tbody>").unwrap()];
    body.matches("<tr>").count()
}

#[test]
fn long_lists_are_split_into_pages_of_at_most_500_rows() {
    let report = with_reactions(demo_report(), 1001);
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    gibbsite::site::render(&report, None, &out).unwrap();
    let dir = out.join("reactions");
    let pages: Vec<String> = ["index.html", "index.2.html", "index.3.html"]
        .iter()
        .map(|p| fs::read_to_string(dir.join(p)).unwrap_or_else(|e| panic!("{p}: {e}")))
        .collect();
    assert!(!dir.join("index.4.html").exists());
    assert_eq!(
        pages.iter().map(|p| rows(p)).collect::<Vec<_>>(),
        [500, 500, 1]
    );
    // Every reaction appears on exactly one page, in the sorted order.
    let mut ids: Vec<String> = report.reactions.iter().map(|r| r.slug.clone()).collect();
    ids.sort();
    let listed: Vec<String> = pages
        .iter()
        .flat_map(|p| {
            let body = &p[p.find("<tbody>").unwrap()..p.find("</tbody>").unwrap()];
            body.split("<th scope=\"row\"><a href=\"")
                .skip(1)
                .map(|s| s[..s.find(".html\"").unwrap()].to_string())
                .collect::<Vec<_>>()
        })
        .collect();
    assert_eq!(listed, ids);
    // Each page links to the others and marks itself.
    assert!(pages[1].contains("<a href=\"index.html\">1–500</a>"));
    assert!(pages[1].contains("<span class=\"current\" aria-current=\"page\">501–1000</span>"));
    assert!(pages[1].contains("<a href=\"index.3.html\">1001–1001</a>"));
    assert!(pages[2].contains("<title>Reactions (3 of 3) · "));
    // The demo's metabolites fit on one page: no pager.
    let metabolites = fs::read_to_string(out.join("metabolites/index.html")).unwrap();
    assert!(!metabolites.contains("class=\"pager\""));
    assert!(!out.join("metabolites/index.2.html").exists());
    // 500 rows stay far below 500 kB (Recon3D's lists are this size per page).
    for (k, p) in pages.iter().enumerate() {
        assert!(p.len() < 500_000, "page {} is {} bytes", k + 1, p.len());
    }
}

#[test]
fn search_index_is_a_script_and_every_page_has_the_search_box() {
    let report = demo_report();
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    gibbsite::site::render(&report, None, &out).unwrap();
    let script = fs::read_to_string(out.join("assets/search-index.js")).unwrap();
    let json = script
        .split_once("window.gibbsiteSearch = ")
        .expect("the index assigns one global")
        .1
        .trim_end()
        .strip_suffix(';')
        .unwrap();
    let entries: Vec<[String; 4]> = serde_json::from_str(json).unwrap();
    let loops = report.loops.as_ref().map_or(0, |l| l.loops.len());
    assert_eq!(
        entries.len(),
        report.reactions.len()
            + report.metabolites.len()
            + loops
            + report.joint_scenarios.len()
            + report.notes.len()
    );
    let adh = entries.iter().find(|e| e[1] == "ADH").unwrap();
    assert_eq!(
        adh,
        &[
            "reaction".to_string(),
            "ADH".into(),
            "alcohol dehydrogenase".into(),
            "reactions/ADH.html".into()
        ]
    );
    // Every entry's page exists.
    for e in &entries {
        assert!(out.join(&e[3]).is_file(), "{e:?}");
    }
    // The search script is our own asset, part of the one script of every
    // page; it makes the box (pages carry no markup for it), and every page
    // gives it the way back to the root.
    assert!(out.join("assets/search.js").is_file());
    let script = fs::read_to_string(out.join("assets/site.js")).unwrap();
    assert!(script.contains(&fs::read_to_string(out.join("assets/search.js")).unwrap()));
    assert!(script.contains("form.className = \"site-search\""));
    for (path, root) in [
        ("index.html", ""),
        ("reactions/index.html", "../"),
        ("reactions/ADH.html", "../"),
        ("metabolites/glc_c.html", "../"),
        ("findings.html", ""),
    ] {
        let html = fs::read_to_string(out.join(path)).unwrap();
        assert!(
            html.contains(&format!(
                "<body class=\"section-{}\" data-root=\"{root}\">",
                section(path)
            )),
            "{path}"
        );
        assert!(
            html.contains(&format!(
                "<script src=\"{root}assets/site.js\" defer></script>"
            )),
            "{path}"
        );
        // One stylesheet and one script per page.
        assert_eq!(
            html.matches("<link rel=\"stylesheet\"").count(),
            1,
            "{path}"
        );
        if path != "findings.html" {
            // (the findings page also loads its filters' data)
            assert_eq!(html.matches("<script").count(), 1, "{path}");
        }
    }
}

/// The top-bar section of a page of the demo site.
fn section(path: &str) -> &str {
    match path.split_once('/') {
        Some((folder, _)) => folder,
        None if path == "index.html" => "overview",
        None => path.trim_end_matches(".html"),
    }
}

#[test]
fn narrow_screens_keep_ids_and_verdicts_and_drop_secondary_columns() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    gibbsite::site::render(&demo_report(), None, &out).unwrap();
    let css = fs::read_to_string(out.join("assets/pages.css")).unwrap();
    let narrow = &css[css
        .find("@media (max-width: 600px)")
        .expect("a narrow layout")..];
    assert!(narrow.contains("table.data .secondary { display: none; }"));
    assert!(css.contains("overflow-wrap: anywhere"));
    assert!(css.contains("table.data { display: block; max-width: 100%; overflow-x: auto; }"));
    // On the reactions list the name and energy columns give way; the id,
    // the two verdicts and the findings stay.
    let list = fs::read_to_string(out.join("reactions/index.html")).unwrap();
    let head = &list[list.find("<thead>").unwrap()..list.find("</thead>").unwrap()];
    let kept: Vec<&str> = head
        .split("<th scope=\"col\"")
        .skip(1)
        .filter(|th| !th.contains("class=\"secondary\""))
        .map(|th| {
            let text = &th[th.find('>').unwrap() + 1..];
            &text[..text.find('<').unwrap()]
        })
        .collect();
    assert_eq!(kept, ["Reaction", "Forward", "Backward", "Findings"]);
}

/// A reaction that is the subject of many findings (a transporter in
/// hundreds of loops) keeps a small page: 50 rows and a pointer to the
/// findings pages, where every finding is listed.
#[test]
fn entity_pages_show_at_most_50_findings() {
    let mut report = demo_report();
    let template = report
        .findings
        .iter()
        .find(|f| f.subjects.iter().any(|s| s == "PYK"))
        .expect("the demo has a finding about PYK")
        .clone();
    let before = report
        .findings
        .iter()
        .filter(|f| f.subjects.iter().any(|s| s == "PYK"))
        .count();
    for i in 0..60 {
        let mut f = template.clone();
        f.message = format!("copy {i} of a finding about PYK");
        report.findings.push(f);
    }
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    gibbsite::site::render(&report, None, &out).unwrap();
    let slug = &report
        .reactions
        .iter()
        .find(|r| r.id == "PYK")
        .unwrap()
        .slug;
    let page = fs::read_to_string(out.join(format!("reactions/{slug}.html"))).unwrap();
    let at = page.find("<h2 id=\"findings\">").unwrap();
    let section = &page[at..];
    let body =
        &section[section.find("<ul class=\"findings\">").unwrap()..section.find("</ul>").unwrap()];
    assert_eq!(body.matches("<li class=\"row-").count(), 50);
    let total = before + 60;
    assert!(section.contains(&format!("Findings about this reaction ({total})")));
    assert!(section.contains(&format!("The first 50 of {total} are shown")));
    // The full list still has every one.
    let lists: String = fs::read_dir(out.join("findings"))
        .unwrap()
        .map(|e| fs::read_to_string(e.unwrap().path()).unwrap())
        .collect();
    for i in 0..60 {
        assert!(lists.contains(&format!("copy {i} of a finding about PYK")));
    }
}
