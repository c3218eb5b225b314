//! The unit parser (`-30.5 kJ/mol`, `37 °C`, `1 mM`), for every kind.
#![no_main]
use gibbsite::project::units::{parse, Kind, RawQuantity};
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    let raw = RawQuantity::Text(text.to_string());
    for kind in [
        Kind::Energy,
        Kind::Concentration,
        Kind::Temperature,
        Kind::Potential,
        Kind::IonicStrength,
        Kind::Flux,
        Kind::Plain,
    ] {
        if let Ok(v) = parse(&raw, kind) {
            assert!(v.is_finite(), "{text:?} gave {v}");
        }
    }
});
