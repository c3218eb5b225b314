//! Loading a project: the only code that reads user files.
//!
//! A project is a folder with `gibbsite.yaml` (settings) naming one or more
//! model files, optional CSV flux tables and a folder of Markdown notes. A
//! model file (`*.yaml`) or an SBML file may also be given directly; it then
//! runs with default settings. Nothing here writes anything.

pub mod conditions;
pub mod equation;
pub mod limits;
pub mod locations;
pub mod model_file;
pub mod plausibility;
pub mod read;
pub mod sbml;
pub mod schema;
pub mod sourcemap;
pub mod tables;
pub mod units;
pub mod write;
pub mod yaml;

use crate::error::{Diagnostic, Error, Result};
use crate::model::{Model, Range, Role};
use schema::{FileKind, RawModelFile, RawSettings};
use sourcemap::Segment;
use std::path::{Path, PathBuf};

/// Name of the settings file inside a project folder.
pub const SETTINGS_FILE: &str = "gibbsite.yaml";

/// Default allowed concentration range when a metabolite has none:
/// 1 µM – 10 mM (common practice in thermodynamic analyses of metabolism).
pub const DEFAULT_CONCENTRATION: Range = Range {
    min: 1e-6,
    max: 1e-2,
};
pub const DEFAULT_CONFIDENCE: f64 = 0.95;
/// Driving force (kJ/mol) below which a feasible step is reported as marginal.
pub const DEFAULT_MIN_DRIVING_FORCE_KJ: f64 = 1.0;

/// Settled project settings the rest of the code trusts.
#[derive(Debug, Clone, PartialEq)]
pub struct Settings {
    pub title: String,
    pub model_files: Vec<PathBuf>,
    pub notes_dir: Option<PathBuf>,
    pub theme_dir: Option<PathBuf>,
    pub confidence: f64,
    pub default_concentration: Range,
    pub min_driving_force_kj: f64,
    /// Run the loop analysis (internal loops, energy-generating cycles).
    pub loops: bool,
    /// Further independent conflicting sets searched after the first in an
    /// infeasible scenario.
    pub extra_conflict_sets: usize,
    /// Currency key → metabolite ids, overriding automatic recognition.
    pub currencies: std::collections::BTreeMap<String, Vec<String>>,
    /// Compartments (indices, ascending) whose pH and potential nobody
    /// stated: they run at the defaults (pH 7, 0 mV).
    pub unset_conditions: Vec<usize>,
    /// Where a compartment's conditions come from, when the settings say.
    pub condition_sources: std::collections::BTreeMap<usize, String>,
    /// Metabolites and reactions whose energy a side table supplied.
    pub table_metabolites: std::collections::BTreeSet<usize>,
    pub table_reactions: std::collections::BTreeSet<usize>,
    /// Metabolite ids the maps always draw as side labels / as nodes.
    pub map_side: Vec<String>,
    pub map_main: Vec<String>,
    /// Values that loaded but are implausible or look like unit slips,
    /// with their file and line (reported by `checks::input_plausibility`).
    pub input_remarks: Vec<plausibility::Remark>,
}

/// A Markdown note shown in the report.
#[derive(Debug, Clone, PartialEq)]
pub struct Note {
    pub slug: String,
    pub title: String,
    pub markdown: String,
}

/// How a project is loaded (from the command line).
#[derive(Debug, Clone, Default)]
pub struct LoadOptions {
    /// Folders besides the project folder that its settings may point into
    /// (`--allow-dir`).
    pub allowed_dirs: Vec<PathBuf>,
}

/// A loaded, validated project.
#[derive(Debug, Clone)]
pub struct Project {
    pub root: PathBuf,
    pub settings: Settings,
    pub model: Model,
    pub notes: Vec<Note>,
    /// Side tables applied so far (their claims and warnings).
    pub tables: tables::TableSession,
    /// Where each model element is written (for SARIF regions).
    pub source_lines: locations::SourceLines,
}

impl Project {
    /// Load a project folder, its `gibbsite.yaml`, a model YAML file, or an
    /// SBML file (`.xml`, `.xml.gz`, `.sbml`). All input problems are
    /// returned together as `Error::Input`.
    pub fn load(path: &Path) -> Result<Project> {
        Project::load_with(path, &LoadOptions::default())
    }

    /// [`Project::load`] with options. Every file the project names is read
    /// inside its folder (symlinks followed) or a folder of
    /// `options.allowed_dirs`; see [`read`].
    pub fn load_with(path: &Path, options: &LoadOptions) -> Result<Project> {
        let folder = if path.is_dir() {
            path
        } else {
            path.parent().unwrap_or(Path::new("."))
        };
        let confinement = read::Confinement::new(folder, &options.allowed_dirs);
        schema::reset_suggestions();
        read::confined(confinement, || Project::load_confined(path))
    }

    fn load_confined(path: &Path) -> Result<Project> {
        if path.is_dir() {
            return load_settings_file(&path.join(SETTINGS_FILE));
        }
        let name = path
            .file_name()
            .map(|n| n.to_string_lossy().to_lowercase())
            .unwrap_or_default();
        if name == SETTINGS_FILE {
            return load_settings_file(path);
        }
        if !path.exists() {
            // The same words whatever kind of file was meant.
            return Err(Error::input(missing(
                Diagnostic::new(path, "no such file or folder"),
                path,
                "expected a project folder, gibbsite.yaml, a model .yaml or an SBML file (.xml, .xml.gz)",
            )));
        }
        if name.ends_with(".xml") || name.ends_with(".xml.gz") || name.ends_with(".sbml") {
            let (model, lines) = sbml::read_sbml_located(path)?;
            let mut project = Project::with_defaults(path, model);
            project.source_lines = lines;
            return Ok(project);
        }
        let folder = path.parent().unwrap_or(Path::new("."));
        let (model, stated, remarks, lines) =
            load_model_files_stated(&[path.to_path_buf()], &[], folder)?;
        let mut project = Project::with_defaults(path, model);
        project.source_lines = lines;
        project.settings.unset_conditions = unset_compartments(&project.model, &stated);
        project.settings.input_remarks = remarks;
        Ok(project)
    }

    /// A project around a model with every setting at its default; no
    /// compartment has stated conditions (as for SBML).
    pub fn with_defaults(path: &Path, model: Model) -> Project {
        let unset_conditions = (0..model.compartments.len()).collect();
        Project {
            root: path.parent().unwrap_or(Path::new(".")).to_path_buf(),
            settings: Settings {
                title: model.title.clone(),
                model_files: vec![path.to_path_buf()],
                notes_dir: None,
                theme_dir: None,
                confidence: DEFAULT_CONFIDENCE,
                default_concentration: DEFAULT_CONCENTRATION,
                min_driving_force_kj: DEFAULT_MIN_DRIVING_FORCE_KJ,
                loops: true,
                extra_conflict_sets: crate::scenarios::DEFAULT_EXTRA_CONFLICT_SETS,
                currencies: Default::default(),
                unset_conditions,
                condition_sources: Default::default(),
                table_metabolites: Default::default(),
                table_reactions: Default::default(),
                map_side: Vec::new(),
                map_main: Vec::new(),
                input_remarks: Vec::new(),
            },
            model,
            notes: Vec::new(),
            tables: Default::default(),
            source_lines: Default::default(),
        }
    }

    /// Apply more side tables (`--data`), after those `gibbsite.yaml` names.
    /// Every problem of every table is reported together.
    pub fn add_tables(&mut self, paths: &[PathBuf]) -> Result<()> {
        let mut diagnostics = Vec::new();
        for path in paths {
            if !path.exists() {
                diagnostics.push(missing(
                    Diagnostic::new(path, "table not found"),
                    path,
                    "expected a CSV or TSV side table",
                ));
                continue;
            }
            if let Err(ds) = tables::apply_side_table(path, &mut self.model, &mut self.tables) {
                diagnostics.extend(ds);
            }
        }
        self.settings.input_remarks.append(&mut self.tables.remarks);
        self.settings.table_metabolites = self.tables.metabolites_with_energy.clone();
        self.settings.table_reactions = self.tables.reactions_with_energy.clone();
        if diagnostics.is_empty() {
            Ok(())
        } else {
            Err(Error::Input(diagnostics))
        }
    }

    /// Problems that did not stop loading, as `file:line: warning: message`.
    pub fn warnings(&self) -> Vec<String> {
        self.tables
            .warnings
            .iter()
            .map(|d| d.to_string().replacen(": error: ", ": warning: ", 1))
            .collect()
    }
}

/// A missing file's diagnostic with its hint: the nearest existing name in
/// its folder, else what was expected there.
fn missing(diagnostic: Diagnostic, path: &Path, expected: &str) -> Diagnostic {
    match read::similar_file(path) {
        Some(name) => diagnostic.hint(format!("did you mean `{name}`?")),
        None => diagnostic.hint(expected),
    }
}

fn read_text(path: &Path) -> Result<String> {
    read::read_text(path).map_err(Error::input)
}

fn load_settings_file(settings_path: &Path) -> Result<Project> {
    let root = settings_path
        .parent()
        .unwrap_or(Path::new("."))
        .to_path_buf();
    let text = read_text(settings_path)?;
    let mut diagnostics = Vec::new();
    let Some(parsed) =
        yaml::parse::<RawSettings>(settings_path, &text, FileKind::Settings, &mut diagnostics)
    else {
        return Err(Error::Input(diagnostics));
    };
    let raw = parsed.value;
    let map = parsed.map;
    let key = |k: &str| vec![Segment::Key(k.to_string())];
    let at = |p: &[Segment]| map.nearest(p).map(|l| l.pair());

    let confidence = raw.confidence.unwrap_or(DEFAULT_CONFIDENCE);
    if !(0.5..=0.9999).contains(&confidence) {
        diagnostics.push(
            Diagnostic::new(
                settings_path,
                format!("confidence must be between 0.5 and 0.9999, found {confidence}"),
            )
            .at_opt(at(&key("confidence"))),
        );
    }
    let default_concentration = match &raw.default_concentration {
        Some(r) => model_file::validate_range(
            settings_path,
            &map,
            r,
            &key("default_concentration"),
            &mut diagnostics,
        )
        .unwrap_or(DEFAULT_CONCENTRATION),
        None => DEFAULT_CONCENTRATION,
    };
    let min_driving_force_kj = match &raw.min_driving_force {
        Some(q) => match units::parse(q, units::Kind::Energy) {
            Ok(v) if v >= 0.0 => v,
            Ok(v) => {
                diagnostics.push(
                    Diagnostic::new(
                        settings_path,
                        format!("min_driving_force must not be negative, found {v} kJ/mol"),
                    )
                    .at_opt(at(&key("min_driving_force"))),
                );
                DEFAULT_MIN_DRIVING_FORCE_KJ
            }
            Err(e) => {
                diagnostics
                    .push(Diagnostic::new(settings_path, e).at_opt(at(&key("min_driving_force"))));
                DEFAULT_MIN_DRIVING_FORCE_KJ
            }
        },
        None => DEFAULT_MIN_DRIVING_FORCE_KJ,
    };
    // Folders are kept in their resolved form, so the files read from them
    // later (theme files at render time) are checked against the real place.
    let folder = |name: &Option<String>, k: &str, diagnostics: &mut Vec<Diagnostic>| {
        let dir = root.join(name.as_ref()?);
        match read::check_confined(&dir) {
            Ok(real) if real.is_dir() => Some(real),
            Ok(_) => {
                diagnostics.push(
                    Diagnostic::new(
                        settings_path,
                        format!("{k} folder `{}` is not a folder", dir.display()),
                    )
                    .at_opt(at(&key(k))),
                );
                None
            }
            Err(d) if d.message == "file not found" => {
                diagnostics.push(
                    Diagnostic::new(
                        settings_path,
                        format!("{k} folder `{}` not found", dir.display()),
                    )
                    .at_opt(at(&key(k))),
                );
                None
            }
            Err(d) => {
                let mut refused = Diagnostic::new(
                    settings_path,
                    format!("{k} folder `{}` {}", dir.display(), d.message),
                )
                .at_opt(at(&key(k)));
                refused.hint = d.hint;
                diagnostics.push(refused);
                None
            }
        }
    };
    let notes_dir = match &raw.notes {
        Some(_) => folder(&raw.notes, "notes", &mut diagnostics),
        None => {
            let default = root.join("notes");
            if default.is_dir() {
                folder(&Some("notes".to_string()), "notes", &mut diagnostics)
            } else {
                None
            }
        }
    };
    let theme_dir = folder(&raw.theme, "theme", &mut diagnostics);
    let model_files: Vec<PathBuf> = raw.model.0.iter().map(|m| root.join(m)).collect();
    if model_files.is_empty() {
        diagnostics.push(
            Diagnostic::new(settings_path, "`model` names no file").at_opt(at(&key("model"))),
        );
    }
    for (i, file) in model_files.iter().enumerate() {
        let p = if raw.model.0.len() == 1 {
            key("model")
        } else {
            vec![Segment::Key("model".into()), Segment::Index(i)]
        };
        match read::check_confined(file) {
            Ok(_) if file.is_file() => {}
            Ok(_) | Err(_) if !file.exists() => diagnostics.push(missing(
                Diagnostic::new(
                    settings_path,
                    format!("model file `{}` not found", file.display()),
                )
                .at_opt(at(&p)),
                file,
                "`model` names model .yaml or SBML files (.xml, .xml.gz), relative to the project folder",
            )),
            Ok(_) => diagnostics.push(
                Diagnostic::new(
                    settings_path,
                    format!("model file `{}` is not a regular file", file.display()),
                )
                .at_opt(at(&p)),
            ),
            Err(d) => {
                let mut refused = Diagnostic::new(
                    settings_path,
                    format!("model file `{}` {}", file.display(), d.message),
                )
                .at_opt(at(&p));
                refused.hint = d.hint;
                diagnostics.push(refused);
            }
        }
    }
    if !diagnostics.is_empty() {
        return Err(Error::Input(diagnostics));
    }

    let extra: Vec<_> = raw
        .scenarios
        .iter()
        .enumerate()
        .map(|(i, s)| (settings_path.to_path_buf(), &map, s.clone(), i))
        .collect();
    let (mut model, mut stated, mut input_remarks, mut source_lines) =
        load_model_files_stated(&model_files, &extra, &root)?;
    input_remarks.extend(plausibility::scan_settings(
        &shown_relative(settings_path, &root),
        &raw,
        &map,
    ));
    // Scenarios defined in gibbsite.yaml are located there.
    let scenario_ids = raw.scenarios.iter().map(|s| s.id.clone()).collect();
    source_lines.add_yaml(
        settings_path,
        text.clone(),
        vec![vec![], vec![], vec![], scenario_ids],
    );
    let given = conditions::validate(
        settings_path,
        &map,
        &raw.compartments,
        &model,
        &mut diagnostics,
    );
    if !diagnostics.is_empty() {
        return Err(Error::Input(diagnostics));
    }
    conditions::apply(&mut model, &given);
    stated.extend(
        given
            .iter()
            .filter(|(_, c)| c.states_ph_or_potential())
            .map(|(i, _)| model.compartments[*i].id.clone()),
    );
    let condition_sources = given
        .iter()
        .filter_map(|(i, c)| Some((*i, c.source.clone()?)))
        .collect();
    let unset_conditions = unset_compartments(&model, &stated);
    let mut session = tables::TableSession::default();
    apply_side_tables(&mut model, &raw, &root, settings_path, &map, &mut session)?;
    input_remarks.extend(session.remarks.drain(..).map(|mut r| {
        r.file = shown_relative(Path::new(&r.file), &root);
        r
    }));
    apply_role_overrides(&mut model, &raw, settings_path, &map)?;
    check_currency_ids(&model, &raw, settings_path, &map)?;
    let notes = match &notes_dir {
        Some(dir) => read_notes(dir)?,
        None => Vec::new(),
    };
    Ok(Project {
        root,
        settings: Settings {
            title: raw.title.clone().unwrap_or_else(|| model.title.clone()),
            model_files,
            notes_dir,
            theme_dir,
            confidence,
            default_concentration,
            min_driving_force_kj,
            loops: raw.loops.unwrap_or(true),
            extra_conflict_sets: raw
                .conflict_sets
                .unwrap_or(crate::scenarios::DEFAULT_EXTRA_CONFLICT_SETS),
            currencies: raw
                .currencies
                .iter()
                .map(|(k, v)| (k.clone(), v.0.clone()))
                .collect(),
            unset_conditions,
            condition_sources,
            table_metabolites: session.metabolites_with_energy.clone(),
            table_reactions: session.reactions_with_energy.clone(),
            map_side: raw.maps.as_ref().map_or(Vec::new(), |m| m.side.clone()),
            map_main: raw.maps.as_ref().map_or(Vec::new(), |m| m.main.clone()),
            input_remarks,
        },
        model,
        notes,
        tables: session,
        source_lines,
    })
}

/// Compartments whose id is not among `stated`, ascending.
fn unset_compartments(model: &Model, stated: &std::collections::BTreeSet<String>) -> Vec<usize> {
    (0..model.compartments.len())
        .filter(|&c| !stated.contains(&model.compartments[c].id))
        .collect()
}

fn apply_side_tables(
    model: &mut Model,
    raw: &RawSettings,
    root: &Path,
    settings_path: &Path,
    map: &sourcemap::SourceMap,
    session: &mut tables::TableSession,
) -> Result<()> {
    let Some(tables) = &raw.tables else {
        return Ok(());
    };
    let mut diagnostics = Vec::new();
    for (i, name) in tables.0.iter().enumerate() {
        let path = root.join(name);
        // Anything that exists goes to the reader, which says why it will
        // not read a device, a folder or a file outside the project.
        if !path.exists() {
            let p = if tables.0.len() == 1 {
                vec![Segment::Key("tables".into())]
            } else {
                vec![Segment::Key("tables".into()), Segment::Index(i)]
            };
            diagnostics.push(missing(
                Diagnostic::new(
                    settings_path,
                    format!("table `{}` not found", path.display()),
                )
                .at_opt(map.nearest(&p).map(|l| l.pair())),
                &path,
                "`tables` names CSV or TSV files, relative to the project folder",
            ));
            continue;
        }
        if let Err(ds) = tables::apply_side_table(&path, model, session) {
            diagnostics.extend(ds);
        }
    }
    if diagnostics.is_empty() {
        Ok(())
    } else {
        Err(Error::Input(diagnostics))
    }
}

/// Currency overrides must name metabolites of the model.
fn check_currency_ids(
    model: &Model,
    raw: &RawSettings,
    settings_path: &Path,
    map: &sourcemap::SourceMap,
) -> Result<()> {
    let mut diagnostics = Vec::new();
    for (key, ids) in &raw.currencies {
        for id in &ids.0 {
            if model.metabolite_index(id).is_none() {
                let p = vec![Segment::Key("currencies".into()), Segment::Key(key.clone())];
                diagnostics.push(
                    Diagnostic::new(
                        settings_path,
                        format!("currency `{key}` names unknown metabolite `{id}`"),
                    )
                    .at_opt(map.nearest(&p).map(|l| l.pair())),
                );
            }
        }
    }
    // Map overrides too.
    let lists = raw
        .maps
        .iter()
        .flat_map(|m| [("side", &m.side), ("main", &m.main)]);
    for (list, ids) in lists {
        for id in ids {
            if model.metabolite_index(id).is_none() {
                let p = vec![Segment::Key("maps".into()), Segment::Key(list.into())];
                diagnostics.push(
                    Diagnostic::new(
                        settings_path,
                        format!("`maps.{list}` names unknown metabolite `{id}`"),
                    )
                    .at_opt(map.nearest(&p).map(|l| l.pair())),
                );
            }
        }
    }
    if diagnostics.is_empty() {
        Ok(())
    } else {
        Err(Error::Input(diagnostics))
    }
}

fn apply_role_overrides(
    model: &mut Model,
    raw: &RawSettings,
    settings_path: &Path,
    map: &sourcemap::SourceMap,
) -> Result<()> {
    let mut diagnostics = Vec::new();
    for (id, role) in &raw.roles {
        let p = vec![Segment::Key("roles".into()), Segment::Key(id.clone())];
        let Some(r) = model.reaction_index(id) else {
            diagnostics.push(
                Diagnostic::new(
                    settings_path,
                    format!("role override names unknown reaction `{id}`"),
                )
                .at_opt(map.key(&p).map(|l| l.pair())),
            );
            continue;
        };
        match Role::from_slug(role) {
            Some(role) => model.reactions[r].role = role,
            None => diagnostics.push(
                Diagnostic::new(
                    settings_path,
                    format!("unknown role `{role}`; expected one of internal, exchange, demand, sink, biomass"),
                )
                .at_opt(map.value(&p).map(|l| l.pair())),
            ),
        }
    }
    if diagnostics.is_empty() {
        Ok(())
    } else {
        Err(Error::Input(diagnostics))
    }
}

/// Load and validate model files sharing one namespace; SBML files named in
/// `gibbsite.yaml` are imported in memory.
pub fn load_model_files(
    files: &[PathBuf],
    extra_scenarios: &[(PathBuf, &sourcemap::SourceMap, schema::RawScenario, usize)],
) -> Result<Model> {
    let folder = Path::new(".");
    load_model_files_stated(files, extra_scenarios, folder).map(|(model, ..)| model)
}

/// A file as shown in warnings: relative to the project folder when inside it.
fn shown_relative(file: &Path, folder: &Path) -> String {
    file.strip_prefix(folder)
        .unwrap_or(file)
        .display()
        .to_string()
}

/// As [`load_model_files`], with the ids of compartments whose model file
/// states a pH or a potential (none for SBML, which has no such data), and
/// the implausible values of the files (shown relative to `folder`).
type LoadedModel = (
    Model,
    std::collections::BTreeSet<String>,
    Vec<plausibility::Remark>,
    locations::SourceLines,
);

fn load_model_files_stated(
    files: &[PathBuf],
    extra_scenarios: &[(PathBuf, &sourcemap::SourceMap, schema::RawScenario, usize)],
    folder: &Path,
) -> Result<LoadedModel> {
    if let [single] = files {
        let name = single.to_string_lossy().to_lowercase();
        if name.ends_with(".xml") || name.ends_with(".xml.gz") || name.ends_with(".sbml") {
            let (model, lines) = sbml::read_sbml_located(single)?;
            return Ok((model, Default::default(), Vec::new(), lines));
        }
    }
    let mut diagnostics = Vec::new();
    let mut sources = Vec::new();
    let mut texts = Vec::new();
    for file in files {
        let text = match read_text(file) {
            Ok(t) => t,
            Err(e) => {
                diagnostics.extend(e.diagnostics().iter().cloned());
                continue;
            }
        };
        if let Some(parsed) =
            yaml::parse::<RawModelFile>(file, &text, FileKind::Model, &mut diagnostics)
        {
            sources.push(model_file::ModelSource {
                file: file.clone(),
                raw: parsed.value,
                map: parsed.map,
            });
            texts.push(text);
        }
    }
    let model = if sources.len() == files.len() {
        model_file::build(&sources, extra_scenarios, &mut diagnostics)
    } else {
        None
    };
    let stated = sources
        .iter()
        .flat_map(|s| &s.raw.compartments)
        .filter(|c| c.ph.is_some() || c.potential.is_some())
        .map(|c| c.id.clone())
        .collect();
    let remarks = sources
        .iter()
        .flat_map(|s| plausibility::scan_model(&shown_relative(&s.file, folder), &s.raw, &s.map))
        .collect();
    let mut lines = locations::SourceLines::default();
    for (source, text) in sources.iter().zip(texts) {
        let raw = &source.raw;
        let ids = |items: Vec<&String>| items.into_iter().cloned().collect::<Vec<_>>();
        lines.add_yaml(
            &source.file,
            text,
            vec![
                ids(raw.reactions.iter().map(|r| &r.id).collect()),
                ids(raw.metabolites.iter().map(|m| &m.id).collect()),
                ids(raw.compartments.iter().map(|c| &c.id).collect()),
                ids(raw.scenarios.iter().map(|s| &s.id).collect()),
            ],
        );
    }
    match model {
        Some(m) if diagnostics.is_empty() => Ok((m, stated, remarks, lines)),
        _ => {
            diagnostics.sort();
            diagnostics.dedup();
            Err(Error::Input(diagnostics))
        }
    }
}

/// Parse and validate one model YAML text (`file` names it in messages), as
/// [`load_model_files`] does for a single file. The fuzz target's entry.
pub fn model_from_text(file: &Path, text: &str) -> Result<Model> {
    schema::reset_suggestions();
    let mut diagnostics = Vec::new();
    let model = yaml::parse::<RawModelFile>(file, text, FileKind::Model, &mut diagnostics)
        .and_then(|parsed| {
            let source = model_file::ModelSource {
                file: file.to_path_buf(),
                raw: parsed.value,
                map: parsed.map,
            };
            model_file::build(&[source], &[], &mut diagnostics)
        });
    match model {
        Some(m) if diagnostics.is_empty() => Ok(m),
        _ => {
            diagnostics.sort();
            diagnostics.dedup();
            Err(Error::Input(diagnostics))
        }
    }
}

/// Notes: every `*.md` file of the folder, sorted by file name; the title is
/// the first `# ` heading, else the file stem.
fn read_notes(dir: &Path) -> Result<Vec<Note>> {
    let entries = std::fs::read_dir(dir).map_err(|e| Error::io(dir, e))?;
    let mut files: Vec<PathBuf> = entries
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|x| x == "md") && p.is_file())
        .collect();
    files.sort();
    let mut notes = Vec::new();
    for file in files {
        let markdown = read_text(&file)?;
        let stem = file
            .file_stem()
            .map(|s| s.to_string_lossy().into_owned())
            .unwrap_or_default();
        let title = markdown
            .lines()
            .find_map(|l| l.strip_prefix("# "))
            .map(|t| t.trim().to_string())
            .unwrap_or_else(|| stem.clone());
        notes.push(Note {
            slug: crate::slug::slug(&stem),
            title,
            markdown,
        });
    }
    Ok(notes)
}
