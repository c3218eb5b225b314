//! The SBML reader, from raw bytes (gzip or not) to a model.
#![no_main]
use libfuzzer_sys::fuzz_target;
use std::path::Path;

fuzz_target!(|data: &[u8]| {
    let path = Path::new("model.xml");
    let Ok(text) = gibbsite::project::sbml::decode(data.to_vec(), path) else {
        return;
    };
    if let Ok(model) = gibbsite::project::sbml::parse_sbml(&text, path) {
        let _ = gibbsite::project::write::model_to_yaml(&model);
    }
});
