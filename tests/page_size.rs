//! No page of the site is over 500 kB (the "site that opens instantly"
//! target of issue 16, common practice for a page a browser shows at once):
//! long lists are split into pages. The report here is the demo's with its
//! loop list and loop-capable set made as long as a genome-scale model's
//! (Recon3D lists about 1,240 loops and 2,400 loop-capable reactions).

use gibbsite::report::{CapableView, LoopView};
use gibbsite::Project;
use std::path::Path;

const MAX_PAGE_BYTES: u64 = 500_000;

fn many_loops_report(loops: usize, capable: usize) -> gibbsite::Report {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    let mut report = Project::load(&dir).expect("demo loads").analyse();
    let lv = report.loops.as_mut().expect("demo has a loop analysis");
    let model: LoopView = lv
        .loops
        .iter()
        .max_by_key(|l| l.members.len())
        .expect("demo has a loop")
        .clone();
    lv.loops = (0..loops)
        .map(|k| LoopView {
            id: format!("loop-{k:010x}"),
            ..model.clone()
        })
        .collect();
    // Findings naming many subjects (a long loop names every member), as
    // on iLB1027_lipid, whose full list pages of 250 rows reached 610 kB.
    let template = report.findings[0].clone();
    report.findings.extend((0..600).map(|k| {
        gibbsite::report::Finding {
            subjects: (0..80)
                .map(|m| format!("R_member_reaction_{k}_{m}"))
                .collect(),
            ..template.clone()
        }
    }));
    let lv = report.loops.as_mut().expect("demo has a loop analysis");
    lv.capable.extend((0..capable).map(|k| CapableView {
        reaction: format!("R_capable_reaction_{k}"),
        slug: format!("R_capable_reaction_{k}"),
        forward: true,
        backward: k % 3 == 0,
    }));
    report
}

#[test]
fn no_page_is_over_500_kb_and_every_loop_is_listed_once() {
    let loops = 1_300;
    let report = many_loops_report(loops, 2_500);
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    gibbsite::site::render(&report, None, &out).expect("site renders");

    let mut pages = 0;
    let mut stack = vec![out.clone()];
    while let Some(dir) = stack.pop() {
        for entry in std::fs::read_dir(&dir).unwrap() {
            let path = entry.unwrap().path();
            if path.is_dir() {
                stack.push(path);
            } else if path.extension().is_some_and(|e| e == "html") {
                pages += 1;
                let size = std::fs::metadata(&path).unwrap().len();
                assert!(size <= MAX_PAGE_BYTES, "{} is {size} bytes", path.display());
            }
        }
    }
    assert!(pages > loops, "{pages} pages");

    // The loop list: pages of at most 200 rows (fewer where rows are long
    // or, on the first page, the loop-capable list takes room), each loop
    // on exactly one of them.
    let per_page = gibbsite::site::lists::LOOP_ROWS_PER_PAGE;
    let mut listed = vec![0; loops];
    let mut count = 0;
    loop {
        let name = match count + 1 {
            1 => "index.html".to_string(),
            n => format!("index.{n}.html"),
        };
        let Ok(html) = std::fs::read_to_string(out.join("loops").join(&name)) else {
            break;
        };
        count += 1;
        let rows = html.matches("<th scope=\"row\"><a href=\"loop-").count();
        assert!((1..=per_page).contains(&rows), "{name}: {rows} rows");
        for (k, seen) in listed.iter_mut().enumerate() {
            if html.contains(&format!("\"loop-{k:010x}.html\">")) {
                *seen += 1;
            }
        }
        // The summary, loop-capable reactions and energy-generating cycles
        // are on the first page only; every page links to the others.
        assert_eq!(html.contains("id=\"capable\""), count == 1, "{name}");
        assert_eq!(html.contains("id=\"energy-cycles\""), count == 1, "{name}");
        assert!(html.contains("class=\"pager\""), "{name}");
    }
    assert!(count >= loops.div_ceil(per_page), "{count} pages");
    assert!(listed.iter().all(|&n| n == 1), "{listed:?}");
    // Every finding is on one page of the full list.
    let findings = report.findings.len();
    let mut on_pages = 0;
    for n in 1.. {
        let Ok(html) = std::fs::read_to_string(out.join(format!("findings/list-{n}.html"))) else {
            break;
        };
        on_pages += html.matches("<tr class=\"row-").count();
    }
    assert_eq!(on_pages, findings);
    // The loop-capable reactions are grouped by direction, each listed once.
    let first = std::fs::read_to_string(out.join("loops/index.html")).unwrap();
    assert!(first.contains("Both directions ("));
    assert!(first.contains("Forward only ("));
    assert_eq!(
        first.matches("<li><code>R_capable_reaction_").count(),
        2_500
    );
}
