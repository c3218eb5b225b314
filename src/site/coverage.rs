//! The coverage page's CSV export: the metabolites whose missing ΔfG'°
//! blocks the most reactions, with empty value columns, ready to fill and
//! feed back as a side table (`--data`, or `tables:` in gibbsite.yaml).

use crate::report::Report;

/// File name of the export, at the site's root.
pub const MISSING_CSV: &str = "missing-energies.csv";

/// The export, or `None` when the report has no coverage section.
///
/// Comment lines (`#`, skipped by the side-table reader) carry what a
/// curator needs to look a value up: rank, name, compartment, formula, the
/// reactions it blocks and the cross-references. Each data row has the
/// model id and empty `dfg`, `sigma`, `source`, `ph`, `ionic_strength`
/// cells; rows left empty change nothing when read back.
pub fn missing_csv(report: &Report) -> Option<String> {
    let coverage = report.coverage.as_ref()?;
    let mut out = String::new();
    let one_line = |s: &str| s.replace(['\r', '\n'], " ");
    out.push_str(&format!(
        "# ΔfG'° missing in {} ({}), most blocking first: each blocks that many internal reactions without ΔrG'°.\n",
        one_line(&report.project.model_title),
        one_line(&report.project.model_id)
    ));
    out.push_str("# Fill dfg (ΔfG'° in kJ/mol; at the compartment's conditions, or say where in ph / ionic_strength) and sigma, name the source,\n# and read it back as a side table: gibbsite build <model> --data <this file>. Rows left empty change nothing.\n");
    // One record at a time (comment lines go between records), quoted
    // as CSV needs.
    let row = |fields: &[&str]| -> String {
        let mut writer = csv::WriterBuilder::new()
            .has_headers(false)
            .from_writer(Vec::new());
        // Writing into a Vec cannot fail.
        let _ = writer.write_record(fields);
        writer
            .into_inner()
            .map(|bytes| String::from_utf8_lossy(&bytes).into_owned())
            .unwrap_or_default()
    };
    out.push_str(&row(&[
        "metabolite",
        "dfg",
        "sigma",
        "source",
        "ph",
        "ionic_strength",
    ]));
    for (rank, m) in coverage.missing.iter().enumerate() {
        let xrefs: Vec<String> = m
            .xrefs
            .iter()
            .flat_map(|(ns, ids)| ids.iter().map(move |id| format!("{ns}:{id}")))
            .collect();
        out.push_str(&format!(
            "# {}. {} \"{}\" in {}{}: blocks {} reaction{}, the only gap in {}{}\n",
            rank + 1,
            one_line(&m.metabolite),
            one_line(&m.name),
            one_line(&m.compartment),
            m.formula
                .as_deref()
                .map(|f| format!(", {}", one_line(f)))
                .unwrap_or_default(),
            m.blocks,
            if m.blocks == 1 { "" } else { "s" },
            m.only_gap,
            if xrefs.is_empty() {
                String::new()
            } else {
                format!("; {}", one_line(&xrefs.join(" ")))
            }
        ));
        out.push_str(&row(&[&m.metabolite, "", "", "", "", ""]));
    }
    Some(out)
}
