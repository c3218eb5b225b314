//! The equation parser (`2 a_c + b_c <=> c_c`).
#![no_main]
use libfuzzer_sys::fuzz_target;

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = std::str::from_utf8(data) {
        let _ = gibbsite::project::equation::parse(text);
    }
});
