//! Rosters on any bytes: `read_roster` decodes them (UTF-8, or UTF-16 with a
//! byte-order mark) and gives names or an error at a line, never a panic;
//! every accepted name is in NFC and has a distinct, safe folder name (no path
//! separator, not `.` or `..`, no control or invisible formatting character,
//! no leading or trailing dot or space).
#![no_main]

use libfuzzer_sys::fuzz_target;
use raysheet::plan::{folder_names, read_roster};

fuzz_target!(|data: &[u8]| {
    let names = match read_roster(data, "roster.csv") {
        Ok(names) => names,
        Err(e) => {
            assert!(e.to_string().starts_with("roster.csv"), "unlocated error {e}");
            return;
        }
    };
    assert!(!names.is_empty(), "an accepted roster has names");
    let folders = folder_names(&names);
    let mut seen = std::collections::BTreeSet::new();
    for f in &folders {
        assert!(!f.contains(['/', '\\']) && f != "." && f != "..", "unsafe folder {f:?}");
        assert!(!f.starts_with(['.', ' ']) && !f.ends_with(['.', ' ']), "dot or space at an end of {f:?}");
        assert!(!f.chars().any(char::is_control), "control character in folder {f:?}");
        assert!(!f.contains(['\u{200B}', '\u{200D}', '\u{202E}', '\u{2067}', '\u{FEFF}']), "invisible character in {f:?}");
        assert!(seen.insert(f.to_lowercase()), "two groups share folder {f:?}");
    }
});
