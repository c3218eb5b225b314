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
        dfg: Option<(f64, f64, String)>,
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
];
const REACTION_COLUMNS: &[&str] = &["reaction", "drg", "sigma", "source"];

/// Apply a side table of ΔG data or concentrations (CSV, or TSV by
/// extension) to the model. Keyed by `metabolite` or `reaction` in the
/// first column; see the README for the columns. Table values replace the
/// model's; every problem is reported with its line.
pub fn apply_side_table(
    path: &Path,
    model: &mut crate::model::Model,
) -> Result<(), Vec<Diagnostic>> {
    let bytes = super::read::read_bytes(path).map_err(|d| vec![d])?;
    apply_side_table_bytes(path, bytes, model)
}

/// [`apply_side_table`] on the file's bytes (`path` names it in messages
/// and decides CSV or TSV).
pub fn apply_side_table_bytes(
    path: &Path,
    bytes: Vec<u8>,
    model: &mut crate::model::Model,
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
    let mut rows = Vec::new();
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
        let cell = |name: &str| {
            column(name)
                .and_then(|c| record.get(c))
                .filter(|v| !v.is_empty())
        };
        let id = record.get(0).unwrap_or("");
        let Some(&index) = ids.get(id) else {
            let what = if is_reaction_table {
                "reaction"
            } else {
                "metabolite"
            };
            let mut d = Diagnostic::new(path, format!("unknown {what} `{id}`")).at(line, 1);
            if let Some(best) = super::schema::did_you_mean(id, ids.keys().copied()) {
                d = d.hint(format!("did you mean `{best}`?"));
            }
            problems.push(d);
            continue;
        };
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
            let dfg = number("dfg", Kind::Energy).map(|v| (v, sigma, source.clone()));
            let dfg0 = number("dfg0", Kind::Energy);
            let dfh0 = number("dfh0", Kind::Energy);
            let min = number("min", Kind::Concentration);
            let max = number("max", Kind::Concentration);
            let measured = number("measured", Kind::Concentration);
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
                    row_problems.push(
                        Diagnostic::new(path, format!("min ({a} M) is greater than max ({b} M)"))
                            .at(line, 1),
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
        if let Some(first) = seen.insert(index, line) {
            if !species_row {
                row_problems.push(
                    Diagnostic::new(path, format!("`{id}` appears twice"))
                        .at(line, 1)
                        .hint(format!("first row at line {first}")),
                );
            }
        }
        if row_problems.is_empty() {
            rows.extend(value);
        } else {
            problems.extend(row_problems);
        }
    }
    if !problems.is_empty() {
        return Err(problems);
    }
    let mut fresh_species: std::collections::HashSet<usize> = Default::default();
    for row in rows {
        match row {
            RowValue::Reaction {
                index,
                drg: (v, s, src),
            } => {
                model.reactions[index].drg_prime = Some(crate::model::Energy {
                    value_kj: v,
                    sigma_kj: s,
                    source: src,
                    at: None,
                });
            }
            RowValue::Metabolite {
                index,
                dfg,
                species,
                range,
                measured,
            } => {
                let m = &mut model.metabolites[index];
                if let Some((v, s, src)) = dfg {
                    m.dfg_prime = Some(crate::model::Energy {
                        value_kj: v,
                        sigma_kj: s,
                        source: src,
                        at: None,
                    });
                }
                if let Some((sp, s, src)) = species {
                    // The table's species replace the model's, row by row.
                    if fresh_species.insert(index) {
                        m.species = Some(crate::model::SpeciesData {
                            species: Vec::new(),
                            sigma_kj: s,
                            source: src,
                        });
                    }
                    if let Some(data) = &mut m.species {
                        data.species.push(sp);
                    }
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
    Ok(())
}
