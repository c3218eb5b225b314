//! CSV/TSV tables: flux scenario tables and side tables of ΔG data against
//! a small fixed model. The first byte picks the table kind and delimiter.
#![no_main]
use gibbsite::project::tables;
use libfuzzer_sys::fuzz_target;
use std::collections::HashMap;
use std::path::Path;
use std::sync::OnceLock;

const MODEL: &str = "\
compartments: [{id: c}]
metabolites:
  - {id: a_c, compartment: c, formula: C2H4O2, charge: 0}
  - {id: b_c, compartment: c, formula: C2H4O2, charge: 0}
reactions:
  - {id: R1, equation: a_c -> b_c}
  - {id: R2, equation: b_c <=> a_c}
";

fn model() -> &'static gibbsite::model::Model {
    static MODEL_CELL: OnceLock<gibbsite::model::Model> = OnceLock::new();
    MODEL_CELL.get_or_init(|| {
        gibbsite::project::model_from_text(Path::new("model.yaml"), MODEL)
            .expect("the fuzz model loads")
    })
}

fuzz_target!(|data: &[u8]| {
    let Some((&selector, rest)) = data.split_first() else {
        return;
    };
    let path = Path::new(if selector & 1 == 0 { "t.csv" } else { "t.tsv" });
    if selector & 2 == 0 {
        let ids: HashMap<String, usize> = model()
            .reactions
            .iter()
            .enumerate()
            .map(|(i, r)| (r.id.clone(), i))
            .collect();
        let _ = tables::read_flux_bytes(path, rest.to_vec(), &ids);
    } else {
        let mut m = model().clone();
        let _ = tables::apply_side_table_bytes(path, rest.to_vec(), &mut m, &mut tables::TableSession::default());
    }
});
