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

    // The loop list: pages of 200 rows, each loop on exactly one of them.
    let per_page = gibbsite::site::lists::LOOP_ROWS_PER_PAGE;
    let count = loops.div_ceil(per_page);
    let mut listed = vec![0; loops];
    for n in 1..=count {
        let name = if n == 1 {
            "index.html".to_string()
        } else {
            format!("index.{n}.html")
        };
        let html = std::fs::read_to_string(out.join("loops").join(&name)).unwrap();
        let rows = html.matches("<th scope=\"row\"><a href=\"loop-").count();
        assert_eq!(rows, per_page.min(loops - (n - 1) * per_page), "{name}");
        for (k, seen) in listed.iter_mut().enumerate() {
            if html.contains(&format!("\"loop-{k:010x}.html\">")) {
                *seen += 1;
            }
        }
        // The summary, loop-capable reactions and energy-generating cycles
        // are on the first page only; every page links to the others.
        assert_eq!(html.contains("id=\"capable\""), n == 1, "{name}");
        assert_eq!(html.contains("id=\"energy-cycles\""), n == 1, "{name}");
        assert!(html.contains("class=\"pager\""), "{name}");
    }
    assert!(listed.iter().all(|&n| n == 1), "{listed:?}");
    assert!(!out.join(format!("loops/index.{}.html", count + 1)).exists());
    // The loop-capable reactions are grouped by direction, each listed once.
    let first = std::fs::read_to_string(out.join("loops/index.html")).unwrap();
    assert!(first.contains("Both directions ("));
    assert!(first.contains("Forward only ("));
    assert_eq!(
        first.matches("<li><code>R_capable_reaction_").count(),
        2_500
    );
}
