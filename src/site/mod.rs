//! Rendering a [`Report`] into a static site.
//!
//! Templates (minijinja, in `themes/default/`, embedded in the binary and
//! overridable file by file) receive one serialisable context per page:
//! `report` (the whole Report), `site` (lookups derived from it: finding
//! anchors, subject links, findings per reaction/metabolite), `page` (path,
//! `path_to_root`, section) and, on entity pages, `item`. They never see
//! model types. Output is deterministic: collections are sorted before
//! rendering, and the only time shown is `report.tool.generated`.
//!
//! Site layout (all links relative, so it works from `file://` and under
//! any sub-path):
//!
//! ```text
//! index.html  findings.html  coverage.html  missing-energies.csv
//! report.json  assets/<theme assets>
//! reactions/index.html  reactions/<slug>.html
//! metabolites/index.html  metabolites/<slug>.html
//! notes/index.html  notes/<slug>.html      (when the project has notes)
//! loops/index.html  loops/<slug>.html      (the loop pages: one per loop)
//! loops/cycle-<currency>-<compartment>.html (one per energy-generating cycle)
//! scenarios/<slug>.html                    (one per scenario judged as a whole)
//! maps/index.html  maps/<group>.html (+ .svg) (network maps, see [`map`])
//! ```

pub mod bundle;
pub mod coverage;
pub mod derived;
pub mod energy_cycle_pages;
pub mod evidence;
pub mod findings_pages;
pub mod format;
pub mod lists;
pub mod loop_map;
pub mod map;
pub mod markdown;
pub mod overview;
pub mod report_value;
pub mod scenario_svg;
pub mod search;
pub mod species_chart;
pub mod svg;
pub mod theme;
pub mod typeset;
pub mod verdicts;
pub mod write;

use crate::error::Error;
use crate::progress::Progress;
use crate::report::{Finding, Report, Severity};
use minijinja::value::Value;
use minijinja::{context, AutoEscape, Environment, UndefinedBehavior};
use rayon::prelude::*;
use serde::Serialize;
use std::borrow::Cow;
use std::collections::{BTreeMap, BTreeSet};
use std::path::Path;
use theme::Theme;
use write::Staging;

/// Renders `report` into the folder `out`, using the default theme with the
/// files of `theme_dir` laid over it.
///
/// The site is written to a temporary folder beside `out` and renamed into
/// place only when every page succeeded; on error the previous site (if
/// any) is untouched and no temporary folder remains. A non-empty `out`
/// that was not made by gibbsite is never replaced.
pub fn render(report: &Report, theme_dir: Option<&Path>, out: &Path) -> Result<(), Error> {
    render_with_progress(report, theme_dir, out, &Progress::hidden())
}

/// [`render`], shown and timed as the `pages` stage of `progress`.
pub fn render_with_progress(
    report: &Report,
    theme_dir: Option<&Path>,
    out: &Path,
    progress: &Progress,
) -> Result<(), Error> {
    render_owned(report.clone(), theme_dir, out, progress).map(drop)
}

/// [`render_with_progress`] of a report the caller gives up (its
/// collections are sorted in place instead of in a copy); the report comes
/// back, sorted, once the site is written.
pub fn render_owned(
    mut report: Report,
    theme_dir: Option<&Path>,
    out: &Path,
    progress: &Progress,
) -> Result<Report, Error> {
    let mut stage = progress.stage(crate::progress::PAGES, None);
    let theme = Theme::load(theme_dir)?;
    let env = environment(&theme)?;
    check_slugs(&report)?;

    let staging = Staging::new(out)?;
    // report.json in the order of analysis, as `check --format json` prints it.
    staging.write_with("report.json", |out| {
        crate::report::json::write_json(&report, out)
    })?;
    sort_report(&mut report);
    let sorted = std::sync::Arc::new(report);
    if let Some(csv) = coverage::missing_csv(&sorted) {
        staging.write(coverage::MISSING_CSV, csv.as_bytes())?;
    }
    for (name, bytes) in theme.assets() {
        staging.write(&format!("assets/{name}"), bytes)?;
    }
    for (path, bytes) in bundle::files(&theme) {
        staging.write(&path, &bytes)?;
    }
    staging.write(search::INDEX_FILE, search::index_script(&sorted).as_bytes())?;
    let mut files = Vec::new();
    let pages = Pages::new(&sorted);
    let fixed = pages.fixed(&mut files);
    let entities = pages.entities();
    stage.set_length((fixed.len() + entities.len()) as u64);
    // Each page is made, rendered and written by one worker and then
    // dropped: pages go to disk as they are done. The first failing page in
    // order is the error reported, whatever the workers' timing.
    let write = |page: Page| -> Result<(), Error> {
        let html = typeset::html(&render_page(&env, &theme, &page)?);
        staging.write(&page.path, html.as_bytes())?;
        stage.inc(1);
        Ok(())
    };
    let failed = fixed
        .into_par_iter()
        .map(write)
        .find_first(Result::is_err)
        .or_else(|| {
            entities
                .par_iter()
                .map(|e| write(pages.entity(e)))
                .find_first(Result::is_err)
        });
    if let Some(Err(e)) = failed {
        return Err(e);
    }
    // Standalone copies of the maps (for papers and slides).
    for (path, svg) in files {
        staging.write(&path, svg.as_bytes())?;
    }
    staging.commit()?;
    drop(pages);
    Ok(std::sync::Arc::try_unwrap(sorted).unwrap_or_else(|shared| (*shared).clone()))
}

/// The minijinja environment with every theme template and our filters.
pub(crate) fn environment(theme: &Theme) -> Result<Environment<'static>, Error> {
    let mut env = Environment::new();
    // Every template produces HTML, whatever its name: escape always.
    env.set_auto_escape_callback(|_| AutoEscape::Html);
    // A misspelt field is an error, not a silently empty cell.
    env.set_undefined_behavior(UndefinedBehavior::Strict);
    env.set_trim_blocks(true);
    env.set_lstrip_blocks(true);
    format::register(&mut env);
    evidence::register(&mut env);
    typeset::register(&mut env);
    env.add_filter("direction", loop_map::direction_words);
    for (name, source) in theme.templates()? {
        env.add_template_owned(name.to_owned(), source.to_owned())
            .map_err(|e| template_error(theme, name, &e))?;
    }
    Ok(env)
}

/// One page to write: template, output path and page-specific context.
struct Page {
    template: &'static str,
    path: String,
    context: Value,
}

fn render_page(env: &Environment<'_>, theme: &Theme, page: &Page) -> Result<String, Error> {
    let template = env
        .get_template(page.template)
        .map_err(|e| template_error(theme, page.template, &e))?;
    template
        .render(&page.context)
        .map_err(|e| template_error(theme, page.template, &e))
        .map_err(|e| match e {
            Error::Render { template, message } => Error::Render {
                template,
                message: format!("{message}\n  while writing page {}", page.path),
            },
            other => other,
        })
}

/// A template error naming the file it came from (user theme or default),
/// with minijinja's location and the cause chain.
pub(crate) fn template_error(theme: &Theme, page_template: &str, err: &minijinja::Error) -> Error {
    let mut message = err.to_string();
    let mut source = std::error::Error::source(err);
    while let Some(cause) = source {
        message.push_str(&format!("\n  caused by: {cause}"));
        source = cause.source();
    }
    Error::Render {
        template: theme.describe(err.name().unwrap_or(page_template)),
        message,
    }
}

/// Puts every collection of the report in a fixed order, so the same
/// report always gives the same bytes whatever order analysis used.
fn sort_report(r: &mut Report) {
    r.findings.sort_by(|a, b| {
        (
            a.severity,
            &a.kind,
            a.subjects.first(),
            &a.scenario,
            &a.message,
        )
            .cmp(&(
                b.severity,
                &b.kind,
                b.subjects.first(),
                &b.scenario,
                &b.message,
            ))
    });
    // Cause → finding indices follow the order just set.
    r.root_causes = crate::report::root_causes::root_causes(r);
    if r.headline.is_none() {
        r.headline = Some(crate::report::headline::headline(r));
    }
    r.compartments.sort_by(|a, b| a.id.cmp(&b.id));
    r.scenarios.sort_by(|a, b| a.id.cmp(&b.id));
    r.metabolites.sort_by(|a, b| a.id.cmp(&b.id));
    for m in &mut r.metabolites {
        for list in [&mut m.consumed_by, &mut m.produced_by] {
            list.sort();
            list.dedup();
        }
        for ids in m.xrefs.values_mut() {
            ids.sort();
        }
    }
    r.reactions.sort_by(|a, b| a.id.cmp(&b.id));
    for reaction in &mut r.reactions {
        // Participants keep the equation's order; the rest is sorted.
        reaction
            .scenario_verdicts
            .sort_by(|a, b| a.scenario.cmp(&b.scenario));
        reaction.missing_data.sort();
        reaction
            .loops
            .sort_by(|a, b| natural_key(a).cmp(&natural_key(b)));
    }
    if let Some(loops) = &mut r.loops {
        loops
            .loops
            .sort_by(|a, b| natural_key(&a.id).cmp(&natural_key(&b.id)));
        for l in &mut loops.loops {
            // Members in the order they pass metabolites on, as the cycle
            // map draws them, so table and map read the same way round;
            // sorted first so the order does not depend on the input's.
            l.members.sort_by(|a, b| a.reaction.cmp(&b.reaction));
            let order = loop_map::loop_order(&l.members);
            l.members = order.iter().map(|&k| l.members[k].clone()).collect();
        }
        loops.capable.sort_by(|a, b| a.reaction.cmp(&b.reaction));
        loops
            .relaxed_bounds
            .sort_by(|a, b| a.reaction.cmp(&b.reaction));
        loops.uncovered.sort();
        // Energy-cycle tests keep the analysis's order (ATP first).
    }
}

/// `loop-2` before `loop-10`: a trailing number compares as a number.
fn natural_key(id: &str) -> (&str, u64, &str) {
    let digits = id.len() - id.trim_end_matches(|c: char| c.is_ascii_digit()).len();
    let (stem, number) = id.split_at(id.len() - digits);
    (stem, number.parse().unwrap_or(0), id)
}

/// Slugs become file names: they must be safe and distinct.
fn check_slugs(report: &Report) -> Result<(), Error> {
    let loop_slugs: Vec<(&str, String)> = report
        .loops
        .iter()
        .flat_map(|l| &l.loops)
        .map(|l| (l.id.as_str(), crate::slug::slug(&l.id)))
        .collect();
    let groups: [(&str, Vec<(&str, &str)>); 5] = [
        (
            "scenario",
            report
                .joint_scenarios
                .iter()
                .map(|s| (s.id.as_str(), s.slug.as_str()))
                .collect(),
        ),
        (
            "reaction",
            report
                .reactions
                .iter()
                .map(|r| (r.id.as_str(), r.slug.as_str()))
                .collect(),
        ),
        (
            "metabolite",
            report
                .metabolites
                .iter()
                .map(|m| (m.id.as_str(), m.slug.as_str()))
                .collect(),
        ),
        (
            "note",
            report
                .notes
                .iter()
                .map(|n| (n.title.as_str(), n.slug.as_str()))
                .collect(),
        ),
        (
            "loop",
            loop_slugs.iter().map(|(id, s)| (*id, s.as_str())).collect(),
        ),
    ];
    for (what, entries) in groups {
        let mut seen = BTreeSet::new();
        for (id, slug) in entries {
            let safe = !slug.is_empty()
                && slug.len() <= 200
                && slug.chars().all(|c| c.is_ascii_alphanumeric() || c == '_' || c == '-')
                // `index` is the list page of each folder.
                && slug != "index";
            if !safe {
                return Err(Error::Render {
                    template: format!("{what} pages"),
                    message: format!("the {what} {id:?} has an unsafe page name {slug:?}"),
                });
            }
            if !seen.insert(slug.to_ascii_lowercase()) {
                return Err(Error::Render {
                    template: format!("{what} pages"),
                    message: format!(
                        "two {what}s share the page name {slug:?} (names differing only in case \
                         collide on some file systems)"
                    ),
                });
            }
        }
    }
    Ok(())
}

/// Link target of a finding subject.
#[derive(Serialize)]
struct SubjectLink<'a> {
    id: &'a str,
    /// "reaction", "metabolite", "loop", "energy-cycle" or "" when the id
    /// has no page.
    kind: &'static str,
    /// Page name.
    slug: Cow<'a, str>,
}

#[derive(Serialize)]
struct FindingEntry<'a> {
    /// Fragment id on its page of the full list.
    anchor: String,
    /// That page's file name in `findings/` (`list-N.html`).
    list: String,
    #[serde(flatten)]
    finding: &'a Finding,
    links: Vec<SubjectLink<'a>>,
}

#[derive(Serialize)]
struct EntityRef<'a> {
    slug: &'a str,
    name: &'a str,
}

/// Lookups derived from the report, shared by every page.
#[derive(Serialize)]
struct SiteIndex<'a> {
    findings: Vec<FindingEntry<'a>>,
    /// Indices into `findings`, for every reaction / metabolite id.
    reaction_findings: BTreeMap<&'a str, Vec<usize>>,
    metabolite_findings: BTreeMap<&'a str, Vec<usize>>,
    loop_findings: BTreeMap<&'a str, Vec<usize>>,
    reactions: BTreeMap<&'a str, EntityRef<'a>>,
    metabolites: BTreeMap<&'a str, EntityRef<'a>>,
    /// Page name of every loop id.
    loops: BTreeMap<&'a str, String>,
    /// Finding counts by severity slug, for every reaction id.
    reaction_counts: BTreeMap<&'a str, BTreeMap<&'static str, usize>>,
    /// Direction badges and one-line verdict of every reaction id.
    verdicts: BTreeMap<&'a str, verdicts::ReactionVerdicts>,
}

fn site_index(report: &Report) -> SiteIndex<'_> {
    let reactions: BTreeMap<&str, EntityRef> = report
        .reactions
        .iter()
        .map(|r| {
            (
                r.id.as_str(),
                EntityRef {
                    slug: &r.slug,
                    name: &r.name,
                },
            )
        })
        .collect();
    let metabolites: BTreeMap<&str, EntityRef> = report
        .metabolites
        .iter()
        .map(|m| {
            (
                m.id.as_str(),
                EntityRef {
                    slug: &m.slug,
                    name: &m.name,
                },
            )
        })
        .collect();
    let loops: BTreeMap<&str, String> = report
        .loops
        .iter()
        .flat_map(|l| &l.loops)
        .map(|l| (l.id.as_str(), crate::slug::slug(&l.id)))
        .collect();
    // Subjects naming an energy-generating cycle ("atp in c") link to its page.
    let energy_cycles = energy_cycle_pages::subject_pages(report);
    let mut loop_findings: BTreeMap<&str, Vec<usize>> =
        loops.keys().map(|id| (*id, Vec::new())).collect();
    let mut reaction_findings: BTreeMap<&str, Vec<usize>> =
        reactions.keys().map(|id| (*id, Vec::new())).collect();
    let mut metabolite_findings: BTreeMap<&str, Vec<usize>> =
        metabolites.keys().map(|id| (*id, Vec::new())).collect();
    let mut reaction_counts: BTreeMap<&str, BTreeMap<&'static str, usize>> = reactions
        .keys()
        .map(|id| {
            let zero = [Severity::Error, Severity::Warning, Severity::Note]
                .map(|s| (s.slug(), 0))
                .into();
            (*id, zero)
        })
        .collect();
    let list_pages = findings_pages::split(report);
    let mut findings = Vec::with_capacity(report.findings.len());
    for (index, finding) in report.findings.iter().enumerate() {
        let mut links = Vec::new();
        let mut seen = BTreeSet::new();
        for id in &finding.subjects {
            let link = if let Some(r) = reactions.get(id.as_str()) {
                if seen.insert(("r", id.as_str())) {
                    reaction_findings.entry(id).or_default().push(index);
                    *reaction_counts
                        .entry(id)
                        .or_default()
                        .entry(finding.severity.slug())
                        .or_default() += 1;
                }
                SubjectLink {
                    id,
                    kind: "reaction",
                    slug: Cow::Borrowed(r.slug),
                }
            } else if let Some(m) = metabolites.get(id.as_str()) {
                if seen.insert(("m", id.as_str())) {
                    metabolite_findings.entry(id).or_default().push(index);
                }
                SubjectLink {
                    id,
                    kind: "metabolite",
                    slug: Cow::Borrowed(m.slug),
                }
            } else if let Some(slug) = loops.get(id.as_str()) {
                if seen.insert(("l", id.as_str())) {
                    loop_findings.entry(id).or_default().push(index);
                }
                SubjectLink {
                    id,
                    kind: "loop",
                    slug: Cow::Owned(slug.clone()),
                }
            } else if let Some(page) = energy_cycles.get(id) {
                SubjectLink {
                    id,
                    kind: "energy-cycle",
                    slug: Cow::Owned(page.clone()),
                }
            } else {
                SubjectLink {
                    id,
                    kind: "",
                    slug: Cow::Borrowed(""),
                }
            };
            links.push(link);
        }
        findings.push(FindingEntry {
            anchor: format!("finding-{}", index + 1),
            list: list_pages.page_name(index),
            finding,
            links,
        });
    }
    SiteIndex {
        findings,
        reaction_findings,
        metabolite_findings,
        loop_findings,
        reactions,
        metabolites,
        loops,
        reaction_counts,
        verdicts: verdicts::reaction_verdicts(report),
    }
}

/// What every page's context is made from: the report and the lookups
/// derived from it, as template values shared by all pages (cheap to clone).
/// Pages are made one at a time from it ([`Pages::fixed`] for the few list
/// pages, [`Pages::entity`] for each reaction, metabolite, loop,
/// energy-generating cycle and scenario), so the whole site is never held in memory.
struct Pages<'r> {
    report: &'r Report,
    report_value: Value,
    site_value: Value,
    all_findings: Value,
    index: SiteIndex<'r>,
    maps: map::MapContext<'r>,
}

/// One entity page still to be made.
enum Entity<'r> {
    Reaction(&'r crate::report::ReactionView),
    Metabolite(&'r crate::report::MetaboliteView),
    Loop(&'r crate::report::LoopView),
    EnergyCycle(&'r crate::report::EnergyCycleView),
    Scenario(&'r crate::report::JointScenarioView),
}

impl<'r> Pages<'r> {
    fn new(shared: &'r std::sync::Arc<Report>) -> Pages<'r> {
        let report: &'r Report = shared;
        let report_value = report_value::report_value(std::sync::Arc::clone(shared));
        let index = site_index(report);
        let site_value = Value::from_serialize(&index);
        // Findings of one page as values shared with `site.findings`.
        let all_findings = site_value.get_attr("findings").unwrap_or_default();
        Pages {
            report,
            report_value,
            site_value,
            all_findings,
            index,
            maps: map::MapContext::new(report),
        }
    }

    fn findings_of(&self, indices: Option<&Vec<usize>>) -> Value {
        indices
            .into_iter()
            .flatten()
            .filter_map(|&i| self.all_findings.get_item_by_index(i).ok())
            .collect()
    }

    fn page(
        &self,
        template: &'static str,
        path: String,
        section: &str,
        title: &str,
        extra: Value,
    ) -> Page {
        let depth = path.matches('/').count();
        // Our own value, not model data: safe, so `/` is not escaped in hrefs.
        let root = Value::from_safe_string("../".repeat(depth));
        let info = context! {
            path => path.clone(),
            path_to_root => root.clone(),
            section => section,
            title => title,
        };
        Page {
            template,
            path,
            context: context! {
                report => self.report_value.clone(),
                site => self.site_value.clone(),
                page => info,
                path_to_root => root,
                ..extra
            },
        }
    }

    /// Every entity page still to be made, in a fixed order.
    fn entities(&self) -> Vec<Entity<'r>> {
        let report = self.report;
        report
            .reactions
            .iter()
            .map(Entity::Reaction)
            .chain(report.metabolites.iter().map(Entity::Metabolite))
            .chain(report.loops.iter().flat_map(|l| &l.loops).map(Entity::Loop))
            .chain(energy_cycle_pages::cycles(report).map(Entity::EnergyCycle))
            .chain(report.joint_scenarios.iter().map(Entity::Scenario))
            .collect()
    }

    /// The list pages, maps and notes; standalone files (the maps' `.svg`
    /// copies) go to `files` as (path, content).
    fn fixed(&self, files: &mut Vec<(String, String)>) -> Vec<Page> {
        let report = self.report;
        let page = |template, path, section: &str, title: &str, extra| {
            self.page(template, path, section, title, extra)
        };
        let mut out = vec![
            page(
                "index.html",
                "index.html".into(),
                "overview",
                "Overview",
                context! {
                    causes => Value::from_serialize(findings_pages::causes(report)),
                    kinds => Value::from_serialize(findings_pages::kind_counts(report)),
                    headline_html => overview::headline_html(report).map(Value::from_safe_string),
                    fix_first => findings_pages::FIX_FIRST,
                },
            ),
            page(
                "findings.html",
                "findings.html".into(),
                "findings",
                "Findings",
                context! { grouped => Value::from_serialize(findings_pages::grouped(report)) },
            ),
            page(
                "kinds.html",
                "kinds.html".into(),
                "findings",
                "Finding kinds",
                context! { kinds => crate::report::kinds::site_rows(report) },
            ),
            page(
                "guide.html",
                "guide.html".into(),
                "overview",
                "Reading these pages",
                context! {
                    neighbourhood_reactions => map::NEIGHBOURHOOD_REACTIONS,
                    neighbourhood_metabolites => map::NEIGHBOURHOOD_METABOLITES,
                },
            ),
            page(
                "coverage.html",
                "coverage.html".into(),
                "coverage",
                "Data coverage",
                context! { missing_csv => coverage::MISSING_CSV },
            ),
        ];
        for list in findings_pages::list(report) {
            let title = format!("All findings, page {} of {}", list.number, list.pages);
            let path = format!("findings/list-{}.html", list.number);
            let extra = context! { list => Value::from_serialize(&list) };
            out.push(page("findings_list.html", path, "findings", &title, extra));
        }
        files.push((
            findings_pages::DATA_JS.into(),
            findings_pages::data_js(report),
        ));
        for (template, dir, title, total) in [
            (
                "reactions.html",
                "reactions",
                "Reactions",
                report.reactions.len(),
            ),
            (
                "metabolites.html",
                "metabolites",
                "Metabolites",
                report.metabolites.len(),
            ),
        ] {
            for p in lists::pages(dir, total) {
                let title = match p.pages {
                    1 => title.to_string(),
                    n => format!("{title} ({} of {n})", p.number),
                };
                let extra = context! { pager => Value::from_serialize(&p) };
                out.push(page(template, p.path, dir, &title, extra));
            }
        }
        out.extend(
            map_pages(&self.maps, files)
                .into_iter()
                .map(|(path, title, extra)| {
                    let template = if path == "maps/index.html" {
                        "maps.html"
                    } else {
                        "map.html"
                    };
                    page(template, path, "maps", &title, extra)
                }),
        );
        if !report.notes.is_empty() {
            out.push(page(
                "notes.html",
                "notes/index.html".into(),
                "notes",
                "Notes",
                context! {},
            ));
        }
        for note in &report.notes {
            out.push(page(
                "note.html",
                format!("notes/{}.html", note.slug),
                "notes",
                &note.title,
                context! {
                    item => Value::from_serialize(note),
                    body => Value::from_safe_string(markdown::to_html(&note.markdown)),
                },
            ));
        }
        // Always written: it says so when the analysis was switched off.
        for p in lists::loop_list(report) {
            let title = match p.pages {
                1 => "Loops".to_string(),
                n => format!("Loops ({} of {n})", p.number),
            };
            let extra = context! { pager => Value::from_serialize(&p) };
            out.push(page("loops.html", p.path, "loops", &title, extra));
        }
        out
    }

    /// The page of one reaction, metabolite, loop, energy-generating cycle
    /// or scenario.
    fn entity(&self, entity: &Entity<'r>) -> Page {
        let report = self.report;
        match *entity {
            Entity::Reaction(reaction) => {
                let multiplier = report.project.sigma_multiplier;
                let bar = reaction.dg_range.map(|range| {
                    svg::range_bar(
                        &reaction.id,
                        &svg::RangeBar {
                            min: range.min,
                            max: range.max,
                            allowance: reaction
                                .drg_prime
                                .as_ref()
                                .map_or(0.0, |e| multiplier * e.sigma_kj),
                            standard: reaction.drg_prime.as_ref().map(|e| e.value_kj),
                            measured: reaction.dg_measured,
                        },
                    )
                });
                self.page(
                    "reaction.html",
                    format!("reactions/{}.html", reaction.slug),
                    "reactions",
                    &reaction.id,
                    context! {
                        item => Value::from_serialize(reaction),
                        findings => self.findings_of(self.index.reaction_findings.get(reaction.id.as_str())),
                        range_bar => bar.map(Value::from_safe_string),
                        breakdown => derived::breakdown(reaction),
                        network_map => map::pages::reaction_neighbourhood(&self.maps, &reaction.id)
                            .map(|d| Value::from_safe_string(d.svg)),
                    },
                )
            }
            Entity::Metabolite(metabolite) => {
                let species = metabolite.species.as_ref();
                let place = report
                    .compartments
                    .iter()
                    .find(|c| c.id == metabolite.compartment)
                    .map_or(metabolite.compartment.as_str(), |c| c.name.as_str());
                let chart =
                    species.and_then(|s| species_chart::species_chart(&metabolite.id, place, s));
                self.page(
                    "metabolite.html",
                    format!("metabolites/{}.html", metabolite.slug),
                    "metabolites",
                    &metabolite.id,
                    context! {
                        item => Value::from_serialize(metabolite),
                        findings => self.findings_of(self.index.metabolite_findings.get(metabolite.id.as_str())),
                        verdict_line => Value::from_serialize(verdicts::metabolite_line(
                            &self.index.metabolite_findings.get(metabolite.id.as_str())
                                .map_or(Vec::new(), |v| v.iter().map(|&i| &report.findings[i]).collect::<Vec<_>>()),
                            metabolite.dfg_prime.is_some(),
                            metabolite.consumed_by.len() + metabolite.produced_by.len(),
                            &metabolite.special,
                        )),
                        species_chart => chart.as_ref().map(|c| Value::from_safe_string(c.svg.clone())),
                        // Labels of the species too scarce to draw.
                        not_drawn => chart.as_ref().map(|c| {
                            c.not_drawn
                                .iter()
                                .filter_map(|&k| species.map(|s| s.entries[k].label.clone()))
                                .collect::<Vec<_>>()
                        }),
                        species_dfg_prime_kj => species.and_then(|s| s.reactant_dfg_prime_kj),
                        network_map => map::pages::metabolite_neighbourhood(&self.maps, &metabolite.id)
                            .map(|d| Value::from_safe_string(d.svg)),
                    },
                )
            }
            Entity::Loop(l) => {
                let map = loop_map::loop_map(&l.id, &l.members);
                self.page(
                    "loop.html",
                    format!("loops/{}.html", self.index.loops[l.id.as_str()]),
                    "loops",
                    &l.id,
                    context! {
                        item => Value::from_serialize(l),
                        findings => self.findings_of(self.index.loop_findings.get(l.id.as_str())),
                        cycle_map => map.as_ref().map(|m| Value::from_safe_string(m.svg.clone())),
                        network_map => {
                            let members: Vec<&str> =
                                l.members.iter().map(|m| m.reaction.as_str()).collect();
                            map::reaction_set_map(&self.maps, &format!("Reactions of {}", l.id), &members, None)
                                .map(Value::from_safe_string)
                        },
                        not_on_arrows => map.map(|m| m.not_on_arrows),
                    },
                )
            }
            Entity::EnergyCycle(c) => energy_cycle_pages::page(
                report,
                c,
                &self.maps,
                &|template, path, section, title, extra| {
                    self.page(template, path, section, title, extra)
                },
                &|indices| self.findings_of(indices),
            ),
            Entity::Scenario(s) => scenario_page(
                &|template, path, section, title, extra| {
                    self.page(template, path, section, title, extra)
                },
                &self.maps,
                s,
            ),
        }
    }
}

/// The page of one scenario judged as a whole, with its drawings.
fn scenario_page(
    page: &dyn Fn(&'static str, String, &str, &str, Value) -> Page,
    maps: &map::MapContext<'_>,
    s: &crate::report::JointScenarioView,
) -> Page {
    let conflict_network_maps: Vec<Value> = map::pages::conflict_set_maps(maps, s)
        .into_iter()
        .map(|svg| Value::from_safe_string(svg.unwrap_or_default()))
        .collect();
    let conflict_maps: Vec<Value> = s
        .conflicts
        .iter()
        .enumerate()
        .map(|(k, c)| {
            Value::from_safe_string(scenario_svg::conflict_drawing(k, c).unwrap_or_default())
        })
        .collect();
    let profile = scenario_svg::energy_profile(&s.id, &s.profile);
    page(
        "scenario.html",
        format!("scenarios/{}.html", s.slug),
        "overview",
        &s.id,
        context! {
            item => Value::from_serialize(s),
            conflict_maps => conflict_maps,
            conflict_network_maps => conflict_network_maps,
            profile_svg => profile.map(Value::from_safe_string),
        },
    )
}

/// The map pages (path, title, context) and their standalone `.svg` files.
fn map_pages(
    maps: &map::MapContext<'_>,
    files: &mut Vec<(String, String)>,
) -> Vec<(String, String, Value)> {
    let site = map::pages::group_maps(maps);
    files.extend(map::pages::shared_assets());
    files.push(("maps/index.svg".into(), site.overview.standalone()));
    let mut out = vec![(
        "maps/index.html".to_string(),
        "Maps".to_string(),
        context! {
            groups => Value::from_serialize(&site.groups),
            cut_by => site.cut_by,
            map_svg => Value::from_safe_string(site.overview_svg),
            readable_reactions => map::READABLE_REACTIONS,
        },
    )];
    for p in site.pages {
        files.push((format!("maps/{}.svg", p.stem), p.drawn.standalone()));
        let title = if p.parts > 1 {
            format!("{} ({} of {})", p.group, p.part, p.parts)
        } else {
            p.group.clone()
        };
        out.push((
            format!("maps/{}.html", p.stem),
            title,
            context! {
                item => Value::from_serialize(&p),
                cut_by => site.cut_by,
                map_svg => Value::from_safe_string(p.svg),
                readable_reactions => map::READABLE_REACTIONS,
            },
        ));
    }
    out
}
