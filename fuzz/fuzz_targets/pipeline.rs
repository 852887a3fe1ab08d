//! The whole pipeline on any kit the parser accepts: plan → layout → render
//! into PDF and SVG. A build either refuses with an error or gives files in
//! which every PDF has a page, no SVG holds NaN, and the answer file is JSON.
//! (PDF streams are compressed, so a byte search for NaN there finds font
//! data; the renderers' own finiteness check stands for the PDF.) Seed the corpus with the demo kit and `tests/fixtures/*.toml`.
#![no_main]

use libfuzzer_sys::fuzz_target;
use raysheet::output::{Formats, build_plans};
use raysheet::sheets::{Lesson, plan_lesson};

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else { return };
    let Ok(kit) = Lesson::from_toml(text, "fuzz.toml") else { return };
    let plans = plan_lesson(&kit, &kit.paper);
    let Ok(files) = build_plans(&kit, &plans, &kit.paper, Formats { pdf: true, svg: true }, None) else {
        return;
    };
    for f in &files {
        if f.path.ends_with(".pdf") {
            assert!(f.bytes.starts_with(b"%PDF-"), "{}", f.path);
            assert!(!contains(&f.bytes, b"/Count 0"), "{}: a PDF without pages", f.path);
        } else if f.path.ends_with(".svg") {
            // Where a number stands: after an attribute's quote, a space, a
            // comma, a minus or a path command. (Text may hold the letters
            // "NaN": a piece labelled "haNaNdisc" is not a broken number.)
            for bad in [&b"\"NaN"[..], b" NaN", b",NaN", b"-NaN", b"MNaN", b"LNaN", b"ANaN", b"\"inf", b" inf", b",inf"] {
                assert!(!contains(&f.bytes, bad), "{}: a non-finite number in the SVG", f.path);
            }
        } else if f.path.ends_with(".json") {
            assert!(serde_json_ok(&f.bytes), "{}: not JSON", f.path);
        }
    }
});

fn contains(hay: &[u8], needle: &[u8]) -> bool {
    hay.windows(needle.len()).any(|w| w == needle)
}

/// A light check that the answer file is one JSON object (the full parse is
/// in the property test of `cargo test`; serde_json writes no NaN, and the
/// kit's own text may hold those letters).
fn serde_json_ok(bytes: &[u8]) -> bool {
    let t = String::from_utf8_lossy(bytes);
    let t = t.trim();
    t.starts_with('{') && t.ends_with('}')
}
