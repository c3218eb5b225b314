//! The YAML model loader: any text must give a model or diagnostics, never
//! a panic, and stay fast (nesting is capped before parsing).
#![no_main]
use libfuzzer_sys::fuzz_target;
use std::path::Path;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    let path = Path::new("model.yaml");
    if let Ok(model) = gibbsite::project::model_from_text(path, text) {
        // What loads must write back and load again (the import round trip).
        let written = gibbsite::project::write::model_to_yaml(&model);
        let _ = gibbsite::project::model_from_text(path, &written);
    }
});
