//! Sheet sets built in-process from the kits in `tests/fixtures/`.

use raysheet::geom::Vec2;
use raysheet::kit::Kit;
use raysheet::layout::{self, Templates};
use raysheet::output::{Formats, Output, build_plans};
use raysheet::paper::{Orientation, PaperSize, PaperSpec};
use raysheet::scene::{Item, Page};
use raysheet::sheets::Lesson;
use raysheet::sheets::{SheetPlan, plan_lesson};

pub fn fixture(name: &str) -> Lesson {
    let path = format!("{}/tests/fixtures/{name}", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).expect("fixture is readable");
    Lesson::from_toml(&text, name).unwrap_or_else(|e| panic!("fixture {name} is valid: {e}"))
}

/// A named paper size with 10 mm margins.
pub fn paper(size: &str, orientation: Orientation) -> PaperSpec {
    PaperSpec { size: PaperSize::named(size).expect("a named size"), orientation, margin_mm: 10.0 }
}

/// The kit planned and built into files.
pub fn build(kit: &Lesson, paper: &PaperSpec, formats: Formats) -> Vec<Output> {
    let plans = plan_lesson(kit, paper);
    build_plans(kit, &plans, paper, formats, None).expect("the kit builds")
}

/// The bytes of the output file `path`.
pub fn file<'a>(outputs: &'a [Output], path: &str) -> &'a [u8] {
    let names: Vec<&str> = outputs.iter().map(|o| o.path.as_str()).collect();
    &outputs.iter().find(|o| o.path == path).unwrap_or_else(|| panic!("no {path} among {names:?}")).bytes
}

/// The sheet and key scenes for `plans`, with the shipped templates.
pub fn scenes(kit: &Kit, plans: &[SheetPlan], paper: &PaperSpec) -> layout::SheetSet {
    layout::layout(&kit.title, plans, paper, &Templates::shipped().expect("shipped templates"))
        .expect("the shipped text fits")
}

/// The setup drawing's offset and children on a page (src/layout/mod.rs,
/// `pages_for`: the sheet frame sits in one `Item::Group`).
pub fn group(page: &Page) -> (Vec2, &[Item]) {
    page.items
        .iter()
        .find_map(|it| match it {
            Item::Group { offset, items, .. } => Some((*offset, items.as_slice())),
            _ => None,
        })
        .expect("the setup drawing is a group")
}
