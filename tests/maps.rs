//! Network maps of the demo report: same bytes every time, no overlapping
//! boxes or labels, every link lands on a page, every legend entry shows
//! its second channel, side compounds never become hubs.

use gibbsite::report::Report;
use gibbsite::site::map::render::{Drawn, MapVerdictStyle};
use gibbsite::site::map::{pages, reaction_set_map, MapContext, MapVerdict, READABLE_REACTIONS};
use gibbsite::Project;
use std::collections::BTreeSet;
use std::path::{Component, Path, PathBuf};

fn demo_report() -> Report {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    Project::load(&dir).expect("demo loads").analyse()
}

/// Every drawing of the demo: group maps, overview, neighbourhoods.
fn all_drawings(report: &Report) -> Vec<(String, Drawn)> {
    let ctx = MapContext::new(report);
    let site = pages::group_maps(&ctx);
    let mut out: Vec<(String, Drawn)> = site
        .pages
        .into_iter()
        .map(|p| (format!("maps/{}", p.stem), p.drawn))
        .collect();
    out.push(("maps/index".into(), site.overview));
    for r in &report.reactions {
        if let Some(d) = pages::reaction_neighbourhood(&ctx, &r.id) {
            out.push((format!("reactions/{}", r.slug), d));
        }
    }
    for m in &report.metabolites {
        if let Some(d) = pages::metabolite_neighbourhood(&ctx, &m.id) {
            out.push((format!("metabolites/{}", m.slug), d));
        }
    }
    out
}

#[test]
fn layout_is_deterministic_to_the_byte() {
    // Two analyses and two drawings: identical SVG.
    let a = all_drawings(&demo_report());
    let b = all_drawings(&demo_report());
    assert_eq!(a.len(), b.len());
    // 8 groups + overview + 28 reaction pages + metabolites with a map.
    assert!(a.len() > 37, "{}", a.len());
    for ((name_a, da), (name_b, db)) in a.iter().zip(&b) {
        assert_eq!(name_a, name_b);
        assert_eq!(da.svg, db.svg, "{name_a} differs between runs");
    }
}

#[test]
fn no_box_or_label_overlaps_on_the_demo_maps() {
    let report = demo_report();
    let mut boxes_checked = 0;
    for (name, drawn) in all_drawings(&report) {
        let nodes = &drawn.nodes;
        for (i, a) in nodes.iter().enumerate() {
            // Each label line lies inside its own box…
            for &(x, y, w, h) in &a.labels {
                assert!(
                    x >= a.placed.left() - 1e-6
                        && x + w <= a.placed.right() + 1e-6
                        && y >= a.placed.top() - 1e-6
                        && y + h <= a.placed.bottom() + 1e-6,
                    "{name}: a label of {} leaves its box",
                    a.id
                );
            }
            // …so boxes apart means labels apart too.
            for b in &nodes[i + 1..] {
                assert!(
                    !a.placed.overlaps(&b.placed),
                    "{name}: {} and {} overlap: {:?} {:?}",
                    a.id,
                    b.id,
                    a.placed,
                    b.placed
                );
            }
            boxes_checked += 1;
        }
    }
    assert!(boxes_checked > 200, "{boxes_checked}");
}

#[test]
fn side_compounds_are_labels_not_nodes() {
    let report = demo_report();
    let ctx = MapContext::new(&report);
    for id in [
        "h2o_c", "h_c", "atp_c", "adp_c", "nad_c", "nadh_c", "pi_c", "co2_c",
    ] {
        assert!(ctx.side.contains(id), "{id} should be a side compound");
    }
    // Pathway intermediates stay nodes.
    for id in ["g6p_c", "pyr_c", "lac_c"] {
        assert!(!ctx.side.contains(id), "{id} should be a node");
    }
    let glycolysis = pages::group_maps(&ctx)
        .pages
        .into_iter()
        .find(|p| p.group == "glycolysis")
        .expect("glycolysis map");
    let ids: BTreeSet<&str> = glycolysis
        .drawn
        .nodes
        .iter()
        .map(|n| n.id.as_str())
        .collect();
    assert!(ids.contains("g6p_c") && ids.contains("HEX"));
    assert!(!ids.contains("atp_c") && !ids.contains("h2o_c"));
    // ATP is written on the hexokinase box instead.
    assert!(glycolysis.svg.contains("atp_c → adp_c + h_c"));
}

/// `href` values of an SVG.
fn hrefs(svg: &str) -> Vec<String> {
    svg.split("href=\"")
        .skip(1)
        .map(|rest| rest[..rest.find('"').unwrap()].to_string())
        .collect()
}

fn resolve(from: &Path, target: &str) -> PathBuf {
    let mut parts: Vec<Component> = from.parent().unwrap().components().collect();
    for c in Path::new(target).components() {
        match c {
            Component::ParentDir => {
                parts.pop();
            }
            other => parts.push(other),
        }
    }
    parts.iter().collect()
}

/// The legend of every verdict with its second channel: a sample line in
/// the verdict's class with its glyph and its words in `legend`, and the
/// rule giving that class its colour, width and line pattern in `css`.
fn assert_legend_complete(what: &str, legend: &str, css: &str) {
    for v in MapVerdict::ALL {
        let style = MapVerdictStyle::of(v);
        let open = format!("<g class=\"{}\" transform=", style.class);
        let at = legend
            .find(&open)
            .unwrap_or_else(|| panic!("{what}: no legend line for {v:?}"));
        let item = &legend[at..at + legend[at..].find("</g>").unwrap()];
        assert!(item.contains("<path class=\"e\""), "{what}: {item}");
        assert!(item.contains("<path class=\"h\""), "{what}: {item}");
        assert!(
            item.contains(&format!(
                "class=\"g\" x=\"42\" y=\"0\">{}</text>",
                style.glyph
            )),
            "{what}: {item}"
        );
        assert!(item.contains(v.words()), "{what}: no words for {v:?}");
        assert!(
            css.contains(&format!(
                ".nm .{} .e{{stroke:{};stroke-width:{};stroke-dasharray:{}}}",
                style.class, style.colour, style.width, style.dash
            )),
            "{what}: no line style for {v:?}"
        );
    }
}

#[test]
fn every_map_link_resolves_and_every_legend_shows_its_second_channel() {
    let report = demo_report();
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    gibbsite::site::render(&report, None, &out).unwrap();
    // The shared key and stylesheet of the maps on pages.
    let shared_legend = std::fs::read_to_string(out.join("assets/network-map-legend.svg")).unwrap();
    let shared_css = std::fs::read_to_string(out.join("assets/network-map.css")).unwrap();
    let site_css = std::fs::read_to_string(out.join("assets/site.css")).unwrap();
    assert_legend_complete("assets/network-map-legend.svg", &shared_legend, &shared_css);
    let mut files: Vec<PathBuf> = Vec::new();
    for folder in ["maps", "reactions", "metabolites", "loops", "scenarios"] {
        for entry in std::fs::read_dir(out.join(folder)).unwrap() {
            files.push(entry.unwrap().path());
        }
    }
    files.sort();
    let mut links = 0;
    let mut maps = 0;
    let mut standalone = 0;
    for file in &files {
        let text = std::fs::read_to_string(file).unwrap();
        let is_svg = file.extension().is_some_and(|e| e == "svg");
        for block in text.split("<svg class=\"nm net-map\"").skip(1) {
            let svg = &block[..block.find("</svg>").unwrap()];
            maps += 1;
            for target in hrefs(svg) {
                let path = resolve(file, &target);
                assert!(path.is_file(), "{}: {target} has no page", file.display());
                links += 1;
            }
            let overview = file.ends_with("maps/index.html") || file.ends_with("maps/index.svg");
            if overview {
                continue;
            }
            if is_svg {
                // A standalone file opens on its own: its own stylesheet
                // and legend.
                standalone += 1;
                assert_legend_complete(&file.display().to_string(), svg, svg);
            } else {
                // On a page: the shared key beside it, the shared
                // stylesheet linked, no stylesheet repeated per map.
                assert!(!svg.contains("<style>"), "{}", file.display());
                let key = "<img class=\"net-map-key\" src=\"";
                let at = text
                    .find(key)
                    .unwrap_or_else(|| panic!("{}: a map without the key", file.display()))
                    + key.len();
                let src = &text[at..at + text[at..].find('"').unwrap()];
                assert!(resolve(file, src).ends_with("assets/network-map-legend.svg"));
                assert!(resolve(file, src).is_file());
                // (in the one stylesheet of the page, which holds it)
                assert!(text.contains("assets/site.css\">"));
                assert!(site_css.contains(&shared_css));
            }
        }
    }
    // Group maps and overview as pages and files, and neighbourhoods.
    assert!(maps >= 2 * 9 + 28, "{maps}");
    assert!(standalone >= 8, "{standalone}");
    assert!(links > 300, "{links}");
}

#[test]
fn overview_reaches_a_contradiction_in_two_clicks() {
    let report = demo_report();
    let ctx = MapContext::new(&report);
    let site = pages::group_maps(&ctx);
    // PEPS is drawn as a contradiction (irreversible, ΔG' > 0 forward).
    let gluconeogenesis = site
        .pages
        .iter()
        .find(|p| p.group == "gluconeogenesis")
        .unwrap();
    assert!(gluconeogenesis
        .contradictions
        .iter()
        .any(|(id, _, _)| id == "PEPS"));
    // Click 1: the overview links to the group page; click 2: its map
    // links to the reaction page.
    assert!(site
        .overview
        .links
        .contains(&format!("{}.html", gluconeogenesis.stem)));
    assert!(gluconeogenesis
        .drawn
        .links
        .contains(&"../reactions/PEPS.html".to_string()));
    let group = site
        .groups
        .iter()
        .find(|g| g.name == "gluconeogenesis")
        .unwrap();
    assert!(group.errors >= 1);
}

#[test]
fn scenario_overlay_sets_arrow_width_by_flux() {
    let report = demo_report();
    let ctx = MapContext::new(&report);
    // At dusk LDH runs backward (flux −2) and PEPS forward (+2), FBA at −1.
    let svg = reaction_set_map(&ctx, "dusk set", &["LDH", "PEPS", "FBA"], Some("dusk"))
        .expect("known reactions");
    // Widest arrows (|flux| = 2): 1.5 + 4.5; FBA: 1.5 + 4.5 / 2.
    assert!(svg.contains("stroke-width:6.00"), "{svg}");
    assert!(svg.contains("stroke-width:3.75"), "{svg}");
    assert!(svg.contains("arrow width ∝ |flux|"));
    // Unknown ids only: no map.
    assert!(reaction_set_map(&ctx, "none", &["nope"], None).is_none());
}

#[test]
fn group_maps_are_cut_at_the_readable_size() {
    // A chain of 70 reactions in one group: three parts of ≤ 30, linked.
    let mut yaml = String::from(
        "format: gibbsite-model/1\nid: chain\ncompartments:\n  - {id: c, name: cytosol}\nmetabolites:\n",
    );
    for i in 0..=70 {
        yaml.push_str(&format!("  - {{id: m{i}_c, compartment: c}}\n"));
    }
    yaml.push_str("reactions:\n");
    for i in 0..70 {
        yaml.push_str(&format!(
            "  - {{id: R{i:02}, equation: m{i}_c -> m{}_c, group: long route}}\n",
            i + 1
        ));
    }
    let tmp = tempfile::tempdir().unwrap();
    let path = tmp.path().join("model.yaml");
    std::fs::write(&path, yaml).unwrap();
    let report = Project::load(&path).expect("model loads").analyse();
    let ctx = MapContext::new(&report);
    let site = pages::group_maps(&ctx);
    let sizes: Vec<usize> = site.pages.iter().map(|p| p.reactions).collect();
    assert_eq!(sizes, [24, 24, 22]);
    assert!(sizes.iter().all(|&s| s <= READABLE_REACTIONS));
    let stems: Vec<&str> = site.pages.iter().map(|p| p.stem.as_str()).collect();
    assert_eq!(
        stems,
        ["long-route", "long-route-part-2", "long-route-part-3"]
    );
    // The metabolite where part 1 ends links on to part 2.
    assert!(site.pages[0]
        .drawn
        .links
        .contains(&"long-route-part-2.html".to_string()));
    assert!(site.pages[1]
        .drawn
        .links
        .contains(&"long-route.html".to_string()));
}

/// The demo project copied to `dir` with `extra` appended to its settings.
fn demo_copy_with(dir: &Path, extra: &str) -> PathBuf {
    let src = Path::new(env!("CARGO_MANIFEST_DIR")).join("projects/lakeside");
    let dst = dir.join("lakeside");
    std::fs::create_dir_all(dst.join("notes")).unwrap();
    for name in ["model.yaml", "fluxes_dusk.csv"] {
        std::fs::copy(src.join(name), dst.join(name)).unwrap();
    }
    for entry in std::fs::read_dir(src.join("notes")).unwrap() {
        let entry = entry.unwrap();
        std::fs::copy(entry.path(), dst.join("notes").join(entry.file_name())).unwrap();
    }
    let settings = std::fs::read_to_string(src.join("gibbsite.yaml")).unwrap() + extra;
    std::fs::write(dst.join("gibbsite.yaml"), settings).unwrap();
    dst
}

#[test]
fn settings_override_the_side_compounds() {
    let tmp = tempfile::tempdir().unwrap();
    let dir = demo_copy_with(tmp.path(), "maps:\n  side: [g6p_c]\n  main: [atp_c]\n");
    let report = Project::load(&dir).expect("loads").analyse();
    let ctx = MapContext::new(&report);
    assert!(ctx.side.contains("g6p_c"));
    assert!(!ctx.side.contains("atp_c"));
    assert!(ctx.side.contains("adp_c"));

    // Unknown metabolites and unknown keys are input errors.
    let tmp = tempfile::tempdir().unwrap();
    let dir = demo_copy_with(tmp.path(), "maps:\n  side: [nope_c]\n");
    let Err(err) = Project::load(&dir) else {
        panic!("unknown id accepted");
    };
    let err = err.to_string();
    assert!(
        err.contains("`maps.side` names unknown metabolite `nope_c`"),
        "{err}"
    );
    let tmp = tempfile::tempdir().unwrap();
    let dir = demo_copy_with(tmp.path(), "maps:\n  sides: [g6p_c]\n");
    assert!(Project::load(&dir).is_err());
}

/// A metabolite used by 15 reactions (below the hub degree of the side
/// compounds, so drawn as a node), and one reaction with 21 main
/// metabolites (invented for this test).
fn crowded_model(dir: &Path) -> PathBuf {
    let mut yaml = String::from(
        "format: gibbsite-model/1\nid: crowded\ncompartments:\n  - {id: c, name: cytosol}\nmetabolites:\n  - {id: hub_c, compartment: c}\n",
    );
    for i in 0..15 {
        yaml.push_str(&format!("  - {{id: m{i}_c, compartment: c}}\n"));
    }
    for i in 0..20 {
        yaml.push_str(&format!("  - {{id: w{i}_c, compartment: c}}\n"));
    }
    yaml.push_str("reactions:\n");
    for i in 0..15 {
        yaml.push_str(&format!(
            "  - {{id: R{i:02}, equation: hub_c -> m{i}_c, group: crowd}}\n"
        ));
    }
    let wide: Vec<String> = (0..20).map(|i| format!("w{i}_c")).collect();
    yaml.push_str(&format!(
        "  - {{id: WIDE, equation: m0_c -> {}, group: crowd}}\n",
        wide.join(" + ")
    ));
    let path = dir.join("model.yaml");
    std::fs::write(&path, yaml).unwrap();
    path
}

#[test]
fn neighbourhood_maps_are_capped_and_say_what_they_leave_out() {
    use gibbsite::site::map::{NEIGHBOURHOOD_METABOLITES, NEIGHBOURHOOD_REACTIONS};
    let tmp = tempfile::tempdir().unwrap();
    let report = Project::load(&crowded_model(tmp.path()))
        .expect("loads")
        .analyse();
    let ctx = MapContext::new(&report);
    let count = |d: &Drawn, reactions: bool| {
        d.nodes
            .iter()
            .filter(|n| n.is_reaction == reactions)
            .count()
    };
    // R05 reaches all 16 reactions within two steps (through hub_c, then m0_c).
    let near = pages::reaction_neighbourhood(&ctx, "R05").unwrap();
    assert_eq!(count(&near, true), NEIGHBOURHOOD_REACTIONS);
    assert!(count(&near, false) <= NEIGHBOURHOOD_METABOLITES);
    // The subject comes first and is highlighted.
    assert_eq!(near.nodes[0].id, "R05");
    assert_eq!(near.svg.matches(" sj\"").count(), 1);
    // The hub's map: its first reactions only.
    let hub = pages::metabolite_neighbourhood(&ctx, "hub_c").unwrap();
    assert_eq!(count(&hub, true), NEIGHBOURHOOD_REACTIONS);
    assert!(count(&hub, false) <= NEIGHBOURHOOD_METABOLITES);
    // WIDE has 21 main metabolites: 12 boxes at most, the rest counted.
    let wide = pages::reaction_neighbourhood(&ctx, "WIDE").unwrap();
    assert_eq!(count(&wide, false), NEIGHBOURHOOD_METABOLITES);
    assert!(wide.svg.contains("+9 more not drawn"), "{}", wide.svg);
    // Hover text once per reaction, on its link (the map's own title
    // first); these metabolites have no names, so their boxes add none. A
    // small map shortens long equations (the page has them in full).
    assert_eq!(wide.svg.matches("<title>").count(), 1 + count(&wide, true));
    assert_eq!(wide.svg.matches("class=\"r ").count(), count(&wide, true));
    let equation = &report
        .reactions
        .iter()
        .find(|r| r.id == "WIDE")
        .unwrap()
        .equation;
    assert!(equation.chars().count() > 90);
    // As escaped in the hover text.
    let equation = equation.replace('>', "&gt;");
    assert!(!wide.svg.contains(&equation));
    // A group map is a full map: no cap on metabolites, whole hover texts.
    let site = pages::group_maps(&ctx);
    let part = site
        .pages
        .iter()
        .find(|p| p.drawn.nodes.iter().any(|n| n.id == "WIDE"))
        .unwrap();
    assert!(!part.svg.contains("more not drawn"));
    assert!(part.drawn.nodes.iter().any(|n| n.id == "w19_c"));
    assert!(part.svg.contains(&equation));
    // The page links to where the limits are stated, once for the site.
    let out = tmp.path().join("site");
    gibbsite::site::render(&report, None, &out).unwrap();
    let page = std::fs::read_to_string(out.join("reactions/R05.html")).unwrap();
    assert!(page.contains("href=\"../guide.html#map\""));
    let guide = std::fs::read_to_string(out.join("guide.html")).unwrap();
    assert!(guide.contains(&format!(
        "at most {NEIGHBOURHOOD_REACTIONS} reactions (the nearest ones) and {NEIGHBOURHOOD_METABOLITES} metabolite boxes"
    )));
}

#[test]
fn standalone_svg_files_open_on_their_own() {
    let report = demo_report();
    let ctx = MapContext::new(&report);
    let site = pages::group_maps(&ctx);
    let page = &site.pages[0];
    let file = page.drawn.standalone();
    // Its own stylesheet with every verdict's style, its legend, the same
    // drawing.
    assert!(file.contains("<style>"));
    assert!(file.contains("xmlns=\"http://www.w3.org/2000/svg\""));
    assert_legend_complete("standalone", &file, &file);
    assert!(file.contains("class=\"nm-key\""));
    assert!(page.drawn.body().contains("<a href=\"../reactions/"));
    assert!(file.contains(page.drawn.body()));
    assert!(page.svg.contains(page.drawn.body()));
    // The inline copy has neither stylesheet nor legend; it is smaller.
    assert!(!page.svg.contains("<style>"));
    assert!(!page.svg.contains("nm-key"));
    assert!(page.svg.len() < file.len());
    // The file's viewBox includes the legend below the drawing.
    let height = |svg: &str| -> f64 {
        let at = svg.find("viewBox=\"").unwrap() + 9;
        let view: Vec<f64> = svg[at..at + svg[at..].find('"').unwrap()]
            .split(' ')
            .map(|v| v.parse().unwrap())
            .collect();
        view[3]
    };
    assert!(height(&file) > height(&page.svg) + 50.0);
}

#[test]
fn every_conflicting_set_has_a_network_map_on_its_scenario_page() {
    let report = demo_report();
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("site");
    gibbsite::site::render(&report, None, &out).unwrap();
    let mut sets = 0;
    for s in &report.joint_scenarios {
        let page = std::fs::read_to_string(out.join(format!("scenarios/{}.html", s.slug))).unwrap();
        let maps: Vec<&str> = page.split("<svg class=\"nm net-map\"").skip(1).collect();
        assert_eq!(maps.len(), s.conflicts.len(), "{}", s.id);
        for (map, set) in maps.iter().zip(&s.conflicts) {
            let svg = &map[..map.find("</svg>").unwrap()];
            // Every member drawn, linked to its page.
            for m in &set.members {
                assert!(
                    svg.contains(&format!(
                        "href=\"../reactions/{}.html\"",
                        gibbsite::slug::slug(&m.reaction)
                    )),
                    "{}: {} not on the map",
                    s.id,
                    m.reaction
                );
            }
            sets += 1;
        }
    }
    // The demo's dusk scenario has two sets (PEPS; LDH), bloom one of three
    // reactions (see tests/demo.rs and tests/scenarios_joint.rs).
    assert!(sets >= 4, "{sets}");
    // At dusk the flux overlay is used: arrows sized by |flux|.
    let dusk = std::fs::read_to_string(out.join("scenarios/dusk.html")).unwrap();
    assert!(dusk.contains("arrow width ∝ |flux|"));
}

#[test]
fn hover_texts_give_id_equation_and_energy_range() {
    let report = demo_report();
    let ctx = MapContext::new(&report);
    let escape = |s: &str| {
        s.replace('&', "&amp;")
            .replace('<', "&lt;")
            .replace('>', "&gt;")
    };
    for r in &report.reactions {
        let near = pages::reaction_neighbourhood(&ctx, &r.id).unwrap();
        // The subject's link: its hover text comes first inside it.
        let open = near.svg.find(" sj\"><title>").expect("subject drawn") + 12;
        let title = &near.svg[open..open + near.svg[open..].find("</title>").unwrap()];
        let lines: Vec<&str> = title.split('\n').collect();
        assert!(lines[0].starts_with(&escape(&r.id)), "{title}");
        assert_eq!(lines[1], escape(&r.equation), "{title}");
        match &r.dg_range {
            Some(_) => assert!(
                lines[2].starts_with("ΔG′ ")
                    && lines[2].contains(" to ")
                    && lines[2].contains("kJ/mol"),
                "{title}"
            ),
            None => assert!(lines[2].starts_with("ΔG′ unknown"), "{title}"),
        }
    }
    // A metabolite box's hover text is its name (the id is its label).
    let pyk = pages::reaction_neighbourhood(&ctx, "PYK").unwrap();
    let name = &report
        .metabolites
        .iter()
        .find(|m| m.id == "pyr_c")
        .unwrap()
        .name;
    assert!(!name.is_empty());
    assert!(
        pyk.svg.contains(&format!(
            "<a href=\"../metabolites/pyr_c.html\" class=\"m\"><title>{}</title>",
            escape(name)
        )),
        "{}",
        pyk.svg
    );
    // Links to pages of the same folder are short.
    assert!(pyk.svg.contains("<a href=\"PYK.html\" class=\"r "));
}
