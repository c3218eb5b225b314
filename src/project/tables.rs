//! CSV side tables. A flux scenario table has a header `reaction,flux` and
//! one row per reaction; blank lines and `#` comments are ignored.

use super::units::{self, Kind, RawQuantity};
use crate::error::Diagnostic;
use std::collections::HashMap;
use std::path::Path;

/// Read `reaction,flux` rows. All problems are reported, each with its line.
pub fn read_flux_csv(
    path: &Path,
    reaction_ids: &HashMap<String, usize>,
) -> Result<Vec<(usize, f64)>, Vec<Diagnostic>> {
    let bytes = super::read::read_bytes(path).map_err(|d| vec![d])?;
    read_flux_bytes(path, bytes, reaction_ids)
}

/// [`read_flux_csv`] on the file's bytes (`path` names it in messages).
pub fn read_flux_bytes(
    path: &Path,
    bytes: Vec<u8>,
    reaction_ids: &HashMap<String, usize>,
) -> Result<Vec<(usize, f64)>, Vec<Diagnostic>> {
    let lines = line_starts(&bytes);
    let mut reader = table_reader(path, bytes);
    let headers = match reader.headers() {
        Ok(h) => h.clone(),
        Err(e) => return Err(vec![csv_error(path, &e)]),
    };
    let column = |name: &str| headers.iter().position(|h| h == name);
    let (Some(rc), Some(fc)) = (column("reaction"), column("flux")) else {
        return Err(vec![Diagnostic::new(
            path,
            format!(
                "expected a header with columns `reaction` and `flux`, found `{}`",
                headers.iter().collect::<Vec<_>>().join(",")
            ),
        )
        .at(1, 1)]);
    };
    let mut rows = Vec::new();
    let mut problems = Vec::new();
    // Reaction index → line of its first row: a repeated row is an error,
    // not a silent "last one wins".
    let mut seen: HashMap<usize, usize> = HashMap::new();
    for record in reader.records() {
        let record = match record {
            Ok(r) => r,
            Err(e) => {
                problems.push(csv_error(path, &e));
                continue;
            }
        };
        let line = line_of(&lines, &record);
        let id = record.get(rc).unwrap_or("");
        let flux_text = record.get(fc).unwrap_or("");
        let Some(&idx) = reaction_ids.get(id) else {
            let mut d = Diagnostic::new(path, format!("unknown reaction `{id}`")).at(line, 1);
            if let Some(best) =
                super::schema::did_you_mean(id, reaction_ids.keys().map(String::as_str))
            {
                d = d.hint(format!("did you mean `{best}`?"));
            }
            problems.push(d);
            continue;
        };
        match units::parse(&RawQuantity::Text(flux_text.to_string()), Kind::Flux) {
            Ok(_) if seen.contains_key(&idx) => problems.push(
                Diagnostic::new(
                    path,
                    format!(
                        "reaction `{id}` has a second row (the first is on line {})",
                        seen[&idx]
                    ),
                )
                .at(line, 1)
                .hint("give each reaction one row"),
            ),
            Ok(v) => {
                seen.insert(idx, line);
                rows.push((idx, v));
            }
            Err(e) => {
                problems.push(Diagnostic::new(path, format!("flux of `{id}`: {e}")).at(line, 1))
            }
        }
    }
    if problems.is_empty() {
        Ok(rows)
    } else {
        Err(problems)
    }
}

/// A CSV reader over bytes already read (TSV when the file name ends in
/// `.tsv`) that skips `#` comments and trims cells.
fn table_reader(path: &Path, bytes: Vec<u8>) -> csv::Reader<std::io::Cursor<Vec<u8>>> {
    let tab = path
        .extension()
        .is_some_and(|e| e.eq_ignore_ascii_case("tsv"));
    csv::ReaderBuilder::new()
        .delimiter(if tab { b'\t' } else { b',' })
        .comment(Some(b'#'))
        .trim(csv::Trim::All)
        .from_reader(std::io::Cursor::new(bytes))
}

/// Where lines start, and whether the csv reader skips them (`#` comments,
/// empty lines). The reader's own line count and record offsets do not
/// account for skipped lines, so a record's line is found from here.
struct Lines {
    starts: Vec<usize>,
    skipped: Vec<bool>,
}

fn line_starts(bytes: &[u8]) -> Lines {
    let starts: Vec<usize> = std::iter::once(0)
        .chain(
            bytes
                .iter()
                .enumerate()
                .filter(|(_, b)| **b == b'\n')
                .map(|(i, _)| i + 1),
        )
        .collect();
    let skipped = starts
        .iter()
        .map(|&s| matches!(bytes.get(s), Some(b'#' | b'\n' | b'\r')))
        .collect();
    Lines { starts, skipped }
}

/// 1-based line of a record: the first line at or after the offset where
/// the reader started it that is not skipped.
fn line_of(lines: &Lines, record: &csv::StringRecord) -> usize {
    let Some(p) = record.position() else {
        return 0;
    };
    let mut index = lines
        .starts
        .partition_point(|&s| s <= p.byte() as usize)
        .saturating_sub(1);
    while lines.skipped.get(index) == Some(&true) {
        index += 1;
    }
    index + 1
}

fn csv_error(path: &Path, e: &csv::Error) -> Diagnostic {
    let d = Diagnostic::new(path, format!("malformed CSV: {}", io_text(e)));
    match e.position() {
        Some(p) => d.at(p.line() as usize, 1),
        None => d,
    }
}

fn io_text(e: &csv::Error) -> String {
    match e.kind() {
        csv::ErrorKind::Io(io) => io.to_string(),
        _ => e.to_string(),
    }
}

/// What a side-table row sets on the model.
#[derive(Debug, Clone, PartialEq)]
enum RowValue {
    Metabolite {
        index: usize,
        dfg: Option<(f64, f64, String, Option<crate::model::StatedConditions>)>,
        species: Option<(crate::model::Species, f64, String)>,
        range: Option<(f64, f64)>,
        measured: Option<f64>,
    },
    Reaction {
        index: usize,
        drg: (f64, f64, String),
    },
}

/// Columns a side table may have (lower case).
const METABOLITE_COLUMNS: &[&str] = &[
    "metabolite",
    "dfg",
    "sigma",
    "source",
    "min",
    "max",
    "measured",
    "dfg0",
    "dfh0",
    "charge",
    "hydrogens",
    "magnesium",
    "ph",
    "ionic_strength",
    "temperature",
];
const REACTION_COLUMNS: &[&str] = &["reaction", "drg", "sigma", "source"];

/// Cross-reference namespaces a metabolite row may be keyed by.
pub const METABOLITE_NAMESPACES: &[&str] = &[
    "chebi",
    "kegg.compound",
    "metanetx.chemical",
    "inchikey",
    "bigg.metabolite",
];
/// Cross-reference namespaces a reaction row may be keyed by (`ec-code`
/// only when one reaction of the model carries it).
pub const REACTION_NAMESPACES: &[&str] = &["kegg.reaction", "rhea", "metanetx.reaction", "ec-code"];

/// State shared by all side tables of one run: which row set each
/// metabolite or reaction, so that two rows reaching one metabolite through
/// different cross-references are caught across files; the warnings; and
/// what the tables supplied (for the coverage view).
/// Which row set an entity: (file, line, key as written).
type Claim = (std::path::PathBuf, usize, String);

#[derive(Debug, Clone, Default)]
pub struct TableSession {
    /// (is reaction, index) → the row that set it.
    claims: HashMap<(bool, usize), Claim>,
    /// (is reaction, index) set by a row keyed by its model id: such rows
    /// win over rows keyed by a cross-reference, in any order.
    by_id: std::collections::HashSet<(bool, usize)>,
    /// Problems that do not stop the run (e.g. a row matching nothing).
    pub warnings: Vec<Diagnostic>,
    /// Cells that loaded but are implausible or look like unit slips
    /// (moved into the project's settings after each table).
    pub remarks: Vec<super::plausibility::Remark>,
    /// Metabolites / reactions that got an energy from a table.
    pub metabolites_with_energy: std::collections::BTreeSet<usize>,
    pub reactions_with_energy: std::collections::BTreeSet<usize>,
}

/// How a row's first cell names what it is about.
enum RowKey {
    /// A model id.
    Id(usize),
    /// A cross-reference and every entity carrying it.
    Xref(Vec<usize>),
}

/// `namespace:id` split and normalised the way imported cross-references
/// are; ids compared without case except BiGG's.
fn xref_key(namespace: &str, id: &str) -> (String, String) {
    let (ns, id) = super::sbml::normalise_xref(namespace, id);
    if ns.starts_with("bigg.") {
        (ns, id)
    } else {
        let id = id.to_uppercase();
        (ns, id)
    }
}

/// (namespace, id) → entities carrying that cross-reference.
fn xref_index<'a>(
    xrefs: impl Iterator<Item = &'a std::collections::BTreeMap<String, Vec<String>>>,
) -> HashMap<(String, String), Vec<usize>> {
    let mut index: HashMap<(String, String), Vec<usize>> = HashMap::new();
    for (i, map) in xrefs.enumerate() {
        for (ns, ids) in map {
            for id in ids {
                let entry = index.entry(xref_key(ns, id)).or_default();
                if entry.last() != Some(&i) {
                    entry.push(i);
                }
            }
        }
    }
    index
}

/// Apply a side table of ΔG data or concentrations (CSV, or TSV by
/// extension) to the model. Keyed by `metabolite` or `reaction` in the
/// first column; see the README for the columns. Table values replace the
/// model's; every problem is reported with its line.
pub fn apply_side_table(
    path: &Path,
    model: &mut crate::model::Model,
    session: &mut TableSession,
) -> Result<(), Vec<Diagnostic>> {
    let bytes = super::read::read_bytes(path).map_err(|d| vec![d])?;
    apply_side_table_bytes(path, bytes, model, session)
}

/// [`apply_side_table`] on the file's bytes (`path` names it in messages
/// and decides CSV or TSV).
pub fn apply_side_table_bytes(
    path: &Path,
    bytes: Vec<u8>,
    model: &mut crate::model::Model,
    session: &mut TableSession,
) -> Result<(), Vec<Diagnostic>> {
    let lines = line_starts(&bytes);
    let mut reader = table_reader(path, bytes);
    let headers: Vec<String> = match reader.headers() {
        Ok(h) => h.iter().map(|c| c.to_lowercase()).collect(),
        Err(e) => return Err(vec![csv_error(path, &e)]),
    };
    let is_reaction_table = headers.first().map(String::as_str) == Some("reaction");
    let allowed = if is_reaction_table {
        REACTION_COLUMNS
    } else {
        METABOLITE_COLUMNS
    };
    let mut problems = Vec::new();
    let mut remarks = Vec::new();
    if !matches!(
        headers.first().map(String::as_str),
        Some("metabolite" | "reaction")
    ) {
        problems.push(
            Diagnostic::new(path, "the first column must be `metabolite` or `reaction`").at(1, 1),
        );
        return Err(problems);
    }
    for (k, h) in headers.iter().enumerate() {
        if !allowed.contains(&h.as_str()) {
            let mut d = Diagnostic::new(path, format!("unknown column `{h}`")).at(1, k + 1);
            d = match super::schema::did_you_mean(h, allowed.iter().copied()) {
                Some(best) => d.hint(format!("did you mean `{best}`?")),
                None => d.hint(format!("expected columns: {}", allowed.join(", "))),
            };
            problems.push(d);
        }
    }
    if !problems.is_empty() {
        return Err(problems);
    }
    let column = |name: &str| headers.iter().position(|h| h == name);
    let ids: HashMap<&str, usize> = if is_reaction_table {
        model
            .reactions
            .iter()
            .enumerate()
            .map(|(i, r)| (r.id.as_str(), i))
            .collect()
    } else {
        model
            .metabolites
            .iter()
            .enumerate()
            .map(|(i, m)| (m.id.as_str(), i))
            .collect()
    };
    let xrefs = if is_reaction_table {
        xref_index(model.reactions.iter().map(|r| &r.xrefs))
    } else {
        xref_index(model.metabolites.iter().map(|m| &m.xrefs))
    };
    let (what, namespaces) = if is_reaction_table {
        ("reaction", REACTION_NAMESPACES)
    } else {
        ("metabolite", METABOLITE_NAMESPACES)
    };
    let entity_id = |index: usize| -> &str {
        if is_reaction_table {
            &model.reactions[index].id
        } else {
            &model.metabolites[index].id
        }
    };
    let mut rows: Vec<(Vec<usize>, bool, RowValue)> = Vec::new();
    let mut claims: Vec<((bool, usize), Claim)> = Vec::new();
    let mut seen: HashMap<usize, (usize, String)> = HashMap::new();
    for record in reader.records() {
        let record = match record {
            Ok(r) => r,
            Err(e) => {
                problems.push(csv_error(path, &e));
                continue;
            }
        };
        let line = line_of(&lines, &record);
        let cell = |name: &str| {
            column(name)
                .and_then(|c| record.get(c))
                .filter(|v| !v.is_empty())
        };
        let id = record.get(0).unwrap_or("");
        let key = match ids.get(id) {
            Some(&index) => RowKey::Id(index),
            None => match id.split_once(':') {
                Some((ns, local)) if namespaces.contains(&xref_key(ns, local).0.as_str()) => {
                    let (ns, local) = xref_key(ns, local);
                    let targets = xrefs.get(&(ns.clone(), local)).cloned().unwrap_or_default();
                    if ns == "ec-code" && targets.len() > 1 {
                        session.warnings.push(
                            Diagnostic::new(
                                path,
                                format!(
                                    "`{id}` names {} reactions ({}); an EC number is used only when one reaction carries it, so this row is skipped",
                                    targets.len(),
                                    targets.iter().map(|&j| entity_id(j)).collect::<Vec<_>>().join(", ")
                                ),
                            )
                            .at(line, 1),
                        );
                        continue;
                    }
                    if targets.is_empty() {
                        session.warnings.push(
                            Diagnostic::new(
                                path,
                                format!("`{id}` matches no {what} of the model; row skipped"),
                            )
                            .at(line, 1),
                        );
                        continue;
                    }
                    RowKey::Xref(targets)
                }
                Some((ns, _)) if !ns.is_empty() && !ns.contains(char::is_whitespace) => {
                    problems.push(
                        Diagnostic::new(
                            path,
                            format!("unknown cross-reference namespace `{ns}` in `{id}`"),
                        )
                        .at(line, 1)
                        .hint(format!(
                            "{what} rows may be keyed by a model id or by {}",
                            namespaces
                                .iter()
                                .map(|n| format!("`{n}:…`"))
                                .collect::<Vec<_>>()
                                .join(", ")
                        )),
                    );
                    continue;
                }
                _ => {
                    let mut d = Diagnostic::new(path, format!("unknown {what} `{id}`")).at(line, 1);
                    if let Some(best) = super::schema::did_you_mean(id, ids.keys().copied()) {
                        d = d.hint(format!("did you mean `{best}`?"));
                    }
                    problems.push(d);
                    continue;
                }
            },
        };
        let (targets, by_xref) = match key {
            RowKey::Id(index) => (vec![index], false),
            RowKey::Xref(targets) => (targets, true),
        };
        let index = targets[0];
        let mut row_problems = Vec::new();
        let mut number = |name: &str, kind: Kind| -> Option<f64> {
            let text = cell(name)?;
            match units::parse(&RawQuantity::Text(text.to_string()), kind) {
                Ok(v) => Some(v),
                Err(e) => {
                    let col = column(name).unwrap_or(0) + 1;
                    row_problems
                        .push(Diagnostic::new(path, format!("column `{name}`: {e}")).at(line, col));
                    None
                }
            }
        };
        let sigma = number("sigma", Kind::Energy).unwrap_or(0.0);
        let source = cell("source").unwrap_or("").to_string();
        let value = if is_reaction_table {
            number("drg", Kind::Energy).map(|v| RowValue::Reaction {
                index,
                drg: (v, sigma, source),
            })
        } else {
            let at = crate::model::StatedConditions {
                ph: number("ph", Kind::Plain),
                ionic_strength_m: number("ionic_strength", Kind::IonicStrength),
                temperature_k: number("temperature", Kind::Temperature),
            };
            let at = (at != crate::model::StatedConditions::default()).then_some(at);
            let dfg = number("dfg", Kind::Energy).map(|v| (v, sigma, source.clone(), at));
            let dfg0 = number("dfg0", Kind::Energy);
            let dfh0 = number("dfh0", Kind::Energy);
            let min = number("min", Kind::Concentration);
            let max = number("max", Kind::Concentration);
            let measured = number("measured", Kind::Concentration);
            for &(name, quantity) in super::plausibility::TABLE_COLUMNS {
                let field = column(name).map_or(1, |c| c + 1);
                if let Some(remark) = cell(name).and_then(|text| {
                    let shown = path.display().to_string();
                    super::plausibility::judge_cell(&shown, (line, field), id, name, quantity, text)
                }) {
                    remarks.push(remark);
                }
            }
            let int = |name: &str, problems: &mut Vec<Diagnostic>| -> Option<i64> {
                let text = cell(name)?;
                match text.parse::<i64>() {
                    Ok(v) => Some(v),
                    Err(_) => {
                        let col = column(name).unwrap_or(0) + 1;
                        problems.push(
                            Diagnostic::new(
                                path,
                                format!("column `{name}`: expected a whole number, found `{text}`"),
                            )
                            .at(line, col),
                        );
                        None
                    }
                }
            };
            let charge = int("charge", &mut row_problems);
            let hydrogens = int("hydrogens", &mut row_problems);
            let magnesium = int("magnesium", &mut row_problems);
            let species = match (dfg0, charge, hydrogens) {
                (Some(g), Some(z), Some(h)) if h >= 0 && magnesium.unwrap_or(0) >= 0 => Some((
                    crate::model::Species {
                        dfg0_kj: g,
                        dfh0_kj: dfh0,
                        charge: z as i32,
                        hydrogens: h as u32,
                        magnesium: magnesium.unwrap_or(0) as u32,
                    },
                    sigma,
                    source.clone(),
                )),
                (None, None, None) => None,
                _ => {
                    row_problems.push(
                        Diagnostic::new(
                            path,
                            "species rows need `dfg0`, `charge` and non-negative `hydrogens`",
                        )
                        .at(line, 1),
                    );
                    None
                }
            };
            let range = match (min, max) {
                (Some(a), Some(b)) if a > 0.0 && b > 0.0 && a <= b => Some((a, b)),
                (None, None) => None,
                (Some(a), Some(b)) if a > b => {
                    // Echo the cells as written (a unit slip shows itself).
                    let written = |name: &str| cell(name).unwrap_or("").trim().to_string();
                    row_problems.push(
                        Diagnostic::new(
                            path,
                            format!(
                                "min `{}` is greater than max `{}` for `{id}`",
                                written("min"),
                                written("max")
                            ),
                        )
                        .at(line, column("min").map_or(1, |c| c + 1)),
                    );
                    None
                }
                (Some(_), Some(_)) => {
                    row_problems
                        .push(Diagnostic::new(path, "concentrations must be positive").at(line, 1));
                    None
                }
                _ => {
                    row_problems
                        .push(Diagnostic::new(path, "give both `min` and `max`").at(line, 1));
                    None
                }
            };
            if let Some(m) = measured {
                if m <= 0.0 {
                    row_problems
                        .push(Diagnostic::new(path, "concentrations must be positive").at(line, 1));
                }
            }
            Some(RowValue::Metabolite {
                index,
                dfg,
                species,
                range,
                measured,
            })
        };
        // Several rows per metabolite only for species data.
        let species_row = matches!(
            &value,
            Some(RowValue::Metabolite {
                species: Some(_),
                dfg: None,
                range: None,
                measured: None,
                ..
            })
        );
        for &target in &targets {
            match seen.get(&target) {
                Some((first, first_key)) if first_key == id && !species_row && target == index => {
                    row_problems.push(
                        Diagnostic::new(path, format!("`{id}` appears twice"))
                            .at(line, 1)
                            .hint(format!("first row at line {first}")),
                    );
                }
                Some((_, first_key)) if first_key == id => {}
                // Two cross-references reaching one entity: a conflict. A
                // model id next to a cross-reference is not: the id wins.
                Some((first, first_key)) if by_xref && !ids.contains_key(first_key.as_str()) => {
                    row_problems.push(
                        Diagnostic::new(
                            path,
                            format!(
                                "`{}` gets data from two rows: `{first_key}` at {}:{first} and `{id}` at {}:{line}",
                                entity_id(target),
                                path.display(),
                                path.display()
                            ),
                        )
                        .at(line, 1),
                    );
                }
                _ => {}
            }
            if by_xref {
                if let Some((file, first, first_key)) =
                    session.claims.get(&(is_reaction_table, target))
                {
                    if file != path {
                        row_problems.push(
                            Diagnostic::new(
                                path,
                                format!(
                                    "`{}` gets data from two rows: `{first_key}` at {}:{first} and `{id}` at {}:{line}",
                                    entity_id(target),
                                    file.display(),
                                    path.display()
                                ),
                            )
                            .at(line, 1),
                        );
                    }
                }
            }
            seen.entry(target).or_insert((line, id.to_string()));
        }
        if row_problems.is_empty() {
            if let Some(value) = value {
                if by_xref {
                    for &target in &targets {
                        claims.push((
                            (is_reaction_table, target),
                            (path.to_path_buf(), line, id.to_string()),
                        ));
                    }
                }
                rows.push((targets, by_xref, value));
            }
        } else {
            problems.extend(row_problems);
        }
    }
    if !problems.is_empty() {
        return Err(problems);
    }
    session.remarks.extend(remarks);
    for (key, claim) in claims {
        session.claims.entry(key).or_insert(claim);
    }
    // Rows keyed by cross-reference first, so that model ids win.
    rows.sort_by_key(|(_, by_xref, _)| !*by_xref);
    let mut fresh_species: std::collections::HashSet<usize> = Default::default();
    for (targets, by_xref, row) in rows {
        for target in targets {
            let key = (is_reaction_table, target);
            if by_xref && session.by_id.contains(&key) {
                continue;
            }
            if !by_xref {
                session.by_id.insert(key);
            }
            apply_row(model, session, &mut fresh_species, target, row.clone());
        }
    }
    Ok(())
}

/// Set one row's values on metabolite or reaction `target`.
fn apply_row(
    model: &mut crate::model::Model,
    session: &mut TableSession,
    fresh_species: &mut std::collections::HashSet<usize>,
    target: usize,
    row: RowValue,
) {
    match row {
        RowValue::Reaction {
            drg: (v, s, src), ..
        } => {
            model.reactions[target].drg_prime = Some(crate::model::Energy {
                value_kj: v,
                sigma_kj: s,
                source: src,
                at: None,
            });
            session.reactions_with_energy.insert(target);
        }
        RowValue::Metabolite {
            dfg,
            species,
            range,
            measured,
            ..
        } => {
            let m = &mut model.metabolites[target];
            if let Some((v, s, src, at)) = dfg {
                m.dfg_prime = Some(crate::model::Energy {
                    value_kj: v,
                    sigma_kj: s,
                    source: src,
                    at,
                });
                session.metabolites_with_energy.insert(target);
            }
            if let Some((sp, s, src)) = species {
                // The table's species replace the model's, row by row.
                if fresh_species.insert(target) {
                    m.species = Some(crate::model::SpeciesData {
                        species: Vec::new(),
                        sigma_kj: s,
                        source: src,
                    });
                }
                if let Some(data) = &mut m.species {
                    data.species.push(sp);
                }
                session.metabolites_with_energy.insert(target);
            }
            if let Some((a, b)) = range {
                m.concentration = Some(crate::model::Range { min: a, max: b });
            }
            if measured.is_some() {
                m.measured_m = measured;
            }
        }
    }
}
