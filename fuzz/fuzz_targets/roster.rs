//! Rosters on any bytes: `parse_roster` gives names or an error at a line,
//! never a panic; every accepted name has a distinct, safe folder name (no
//! path separator, not `.` or `..`, no control character).
#![no_main]

use libfuzzer_sys::fuzz_target;
use raysheet::plan::{folder_names, parse_roster};

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    let Ok(names) = parse_roster(text, "roster.csv") else { return };
    let folders = folder_names(&names);
    let mut seen = std::collections::BTreeSet::new();
    for f in &folders {
        assert!(!f.contains(['/', '\\']) && f != "." && f != "..", "unsafe folder {f:?}");
        assert!(!f.chars().any(char::is_control), "control character in folder {f:?}");
        assert!(seen.insert(f.to_lowercase()), "two groups share folder {f:?}");
    }
});
