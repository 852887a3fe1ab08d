//! The kit parser on any bytes: `Lesson::from_toml` (TOML, validation and every
//! sheet kind's own checks) either gives a lesson or a located error, never a
//! panic, and its error names the file.
#![no_main]

use libfuzzer_sys::fuzz_target;
use raysheet::sheets::Lesson;

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    if let Err(e) = Lesson::from_toml(text, "fuzz.toml") {
        let shown = e.to_string();
        assert!(shown.starts_with("fuzz.toml"), "an error that does not name the file: {shown}");
    }
});
