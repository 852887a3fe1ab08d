//! Edited templates on any bytes: the first byte picks which template file is
//! replaced, the rest is its text. `Templates::with_overrides` accepts it or
//! gives a one-line error naming the file; accepted text is laid out and
//! rendered on the demo kit's sheets without a panic, and a render either
//! succeeds or refuses with an error.
#![no_main]

use std::collections::BTreeMap;

use libfuzzer_sys::fuzz_target;
use raysheet::demo;
use raysheet::layout::{TEMPLATE_FILES, Templates, layout};
use raysheet::render::render_pdf;
use raysheet::sheets::{Lesson, plan_lesson};

fuzz_target!(|data: &[u8]| {
    let Some((&pick, rest)) = data.split_first() else { return };
    let Ok(text) = std::str::from_utf8(rest) else { return };
    let name = TEMPLATE_FILES[usize::from(pick) % TEMPLATE_FILES.len()];
    let overrides = BTreeMap::from([(name.to_string(), (format!("mine/{name}"), text.to_string()))]);
    let templates = match Templates::with_overrides(&overrides) {
        Ok(t) => t,
        Err(e) => {
            assert!(e.starts_with(&format!("mine/{name}:")), "{e}");
            assert!(!e.contains('\n'), "a message over several lines: {e:?}");
            return;
        }
    };
    let kit = Lesson::from_toml(demo::DEMO_KIT, demo::DEMO_NAME).expect("the demo kit is valid");
    let plans = plan_lesson(&kit, &kit.paper);
    let set = match layout(&kit.title, &plans, &kit.paper, &templates) {
        Ok(set) => set,
        Err(e) => {
            // Text that cannot fit is refused on one line, naming the file.
            let e = e.to_string();
            assert!(e.starts_with(&format!("mine/{name}:")), "{e}");
            assert!(!e.contains('\n'), "a message over several lines: {e:?}");
            return;
        }
    };
    let _ = render_pdf(&set.sheets);
});
