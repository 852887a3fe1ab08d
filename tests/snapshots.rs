//! Snapshot tests: the demo kit's drawings dumped as text (one primitive a
//! line, so layout changes are reviewed apart from renderers) and renderer
//! goldens compared byte for byte.
//!
//! After an intended change, regenerate with
//! `RAYSHEET_BLESS=1 cargo test --test snapshots` and review the diff.

use std::path::PathBuf;

use raysheet::demo::DEMO_KIT;
use raysheet::layout::{Templates, layout};
use raysheet::render::{render_pdf, render_svg_page};
use raysheet::scene::dump;
use raysheet::sheets::Lesson;
use raysheet::sheets::plan_lesson;

fn snapshot_path(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/snapshots").join(name)
}

fn check(name: &str, actual: &[u8]) {
    let path = snapshot_path(name);
    if std::env::var_os("RAYSHEET_BLESS").is_some() {
        std::fs::write(&path, actual).expect("write snapshot");
        return;
    }
    let expected = std::fs::read(&path).unwrap_or_else(|e| {
        panic!("{}: {e}; run RAYSHEET_BLESS=1 cargo test --test snapshots", path.display())
    });
    if expected != actual {
        let out = std::env::temp_dir().join(format!("raysheet-new-{name}"));
        let _ = std::fs::write(&out, actual);
        panic!(
            "{name} differs from its snapshot; the new output is at {} (diff it, then bless if intended)",
            out.display()
        );
    }
}

fn demo_set() -> raysheet::layout::SheetSet {
    let kit = Lesson::from_toml(DEMO_KIT, "demo").expect("demo kit");
    let plans = plan_lesson(&kit, &kit.paper);
    layout(&kit.title, &plans, &kit.paper, &Templates::shipped().expect("templates"))
        .expect("the shipped text fits")
}

#[test]
fn demo_sheets_scene_dump() {
    check("demo-sheets.txt", dump(&demo_set().sheets).as_bytes());
}

#[test]
fn demo_keys_scene_dump() {
    check("demo-keys.txt", dump(&demo_set().keys).as_bytes());
}

#[test]
fn demo_key_1_svg_golden() {
    let set = demo_set();
    let svg = render_svg_page(&set.keys.pages[0], &set.keys.title).expect("svg");
    check("demo-key-1.svg", svg.as_bytes());
}

#[test]
fn demo_sheets_pdf_golden() {
    let pdf = render_pdf(&demo_set().sheets).expect("pdf");
    check("demo-sheets.pdf", &pdf);
}
