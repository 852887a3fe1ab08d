//! Issue 12, finding 8: edited templates whose text ran off the page (a
//! heading over the sheet-number box, instructions over the table, a word
//! wider than the page, the safety line below it, a scale label that
//! vanished, a column heading silently cut) while the build exited 0. Each
//! case runs the real binary with `--templates` and expects either the text
//! fitted (set smaller or wrapped, never cut) or exit 2 with the template
//! file's line, column and field and what would fit, and nothing written.

use std::path::Path;

mod common {
    pub mod cli;
}
use common::cli::{assert_code, fixture_path, raysheet, text};

const COLUMNS: &str =
    r#"columns = ["Ray", "Height (mm)", "Crossing, mm from the flat face", "Teacher check"]"#;

/// A curved-face template: heading on line 1 (column 11), the instruction
/// list on line 2 (its first entry at column 17), columns on line 3.
fn sheet_template(heading: &str, instructions: &[String], columns: &str) -> String {
    let list: Vec<String> = instructions.iter().map(|s| format!("\"{s}\"")).collect();
    format!("heading = \"{heading}\"\ninstructions = [{}]\n{columns}\n", list.join(", "))
}

/// The shipped common text, one field a line: safety, scale_check,
/// scale_check_vertical, scale_hint (each value at column 1 + its key + 4).
fn common_template(field: &str, value: &str) -> String {
    let mut fields = vec![
        ("safety", "Safety: ray boxes get hot.".to_string()),
        ("scale_check", "Check before use: this bar must measure 100 mm".to_string()),
        ("scale_check_vertical", "must measure 50 mm".to_string()),
        ("scale_hint", "If not, print again at actual size.".to_string()),
    ];
    for f in &mut fields {
        if f.0 == field {
            f.1 = value.to_string();
        }
    }
    fields.iter().map(|(k, v)| format!("{k} = \"{v}\"\n")).collect()
}

/// Builds the half-disc fixture (one curved-face sheet) with `file` replaced
/// by `body`, on `paper` (the kit's A4 when `None`); returns the run and the output folder.
fn build_with(file: &str, body: &str, paper: Option<&str>) -> (std::process::Output, tempfile::TempDir) {
    let tmp = tempfile::tempdir().unwrap();
    let tdir = tmp.path().join("text");
    std::fs::create_dir(&tdir).unwrap();
    std::fs::write(tdir.join(file), body).unwrap();
    let out_dir = tmp.path().join("out");
    let kit = fixture_path("sheets_halfdisc.toml");
    let mut args =
        vec!["build", &kit, "--out", out_dir.to_str().unwrap(), "--templates", tdir.to_str().unwrap()];
    if let Some(p) = paper {
        args.extend(["--paper", p]);
    }
    let run = raysheet(&args, tmp.path());
    (run, tmp)
}

/// Exit 2, one line naming `FILE:LINE:COL: field `F``, with `words`, and no output folder.
fn assert_refused(run: &std::process::Output, tmp: &Path, place: &str, words: &[&str]) {
    assert_code(run, 2);
    let err = text(&run.stderr);
    let line = err.lines().find(|l| l.contains("error")).unwrap_or_default();
    assert!(line.contains(place), "want {place}: {err}");
    for w in words {
        assert!(line.contains(w), "want {w:?}: {err}");
    }
    assert!(!tmp.join("out").exists(), "an output folder was made: {err}");
}

/// The first page of sheet 1 (`sheet-01.svg`, or `sheet-01-tile1.svg` when tiled).
fn svg(tmp: &Path) -> String {
    let dir = tmp.join("out/svg");
    let one = dir.join("sheet-01.svg");
    let path = if one.exists() { one } else { dir.join("sheet-01-tile1.svg") };
    std::fs::read_to_string(path).expect("the sheet's SVG")
}

#[test]
fn templates_that_run_off_the_page_a_300_word_heading() {
    let heading = vec!["Refraction"; 300].join(" ");
    let (run, tmp) = build_with("curved-face.toml", &sheet_template(&heading, &[], COLUMNS), None);
    assert_refused(
        &run,
        tmp.path(),
        "text/curved-face.toml:1:11: field `heading`",
        &["3299 characters", "8 pt", "sheet-number box", "shorten it to about"],
    );
    // A heading a little long for 13 pt is set smaller, in full.
    let longer = "Refraction of a narrow ray at the curved face of a half-disc block";
    let (run, tmp) = build_with("curved-face.toml", &sheet_template(longer, &[], COLUMNS), None);
    assert_code(&run, 0);
    assert!(svg(tmp.path()).contains(&format!("{longer}: sheet 1")));
}

#[test]
fn templates_that_run_off_the_page_a_100000_character_instruction() {
    // 100,000 characters is more than any template file may hold (64 KiB).
    let huge = vec!["mark"; 20_000].join(" ");
    let lines = ["1. Check the scale bars.".to_string(), huge];
    let (run, tmp) = build_with("curved-face.toml", &sheet_template("Refraction", &lines, COLUMNS), None);
    assert_refused(&run, tmp.path(), "text/curved-face.toml", &["larger than 64 KiB"]);
    // 10,000 characters: read, then refused for the room it would need.
    let long = vec!["mark"; 2_000].join(" ");
    let lines = ["1. Check the scale bars.".to_string(), long];
    let (run, tmp) = build_with("curved-face.toml", &sheet_template("Refraction", &lines, COLUMNS), None);
    // Line 2; the second entry starts after `instructions = ["1. Check the scale bars.", `.
    assert_refused(
        &run,
        tmp.path(),
        "text/curved-face.toml:2:45: field `instructions[2]`",
        &["lines at 6.5 pt", "measurement table", "shorten the instructions"],
    );
    // Seven entries of two lines each fit by setting them smaller.
    let two_lines = "Mark where the ray leaves the curved face and two points on the ray beyond it, then join them with a ruler.";
    let seven = vec![two_lines.to_string(); 7];
    let (run, tmp) = build_with("curved-face.toml", &sheet_template("Refraction", &seven, COLUMNS), None);
    assert_code(&run, 0);
    assert!(svg(tmp.path()).contains("font-size=\"") && svg(tmp.path()).contains("two points on the ray"));
}

#[test]
fn templates_that_run_off_the_page_a_2000_character_word() {
    let word = "x".repeat(2_000);
    let lines = ["1. Check.".to_string(), format!("2. {word} here")];
    let (run, tmp) = build_with("curved-face.toml", &sheet_template("Refraction", &lines, COLUMNS), None);
    assert_refused(
        &run,
        tmp.path(),
        "text/curved-face.toml:2:30: field `instructions[2]`",
        &["2000 characters", "break it up"],
    );
    // In the heading too.
    let (run, tmp) = build_with("curved-face.toml", &sheet_template(&word, &[], COLUMNS), None);
    assert_refused(&run, tmp.path(), "text/curved-face.toml:1:11: field `heading`", &["2000 characters"]);
}

#[test]
fn templates_that_run_off_the_page_a_long_safety_line() {
    let safety = vec!["Never look into the lamp."; 40].join(" ");
    let (run, tmp) = build_with("common.toml", &common_template("safety", &safety), None);
    assert_refused(
        &run,
        tmp.path(),
        "text/common.toml:1:10: field `safety`",
        &["6.5 pt", "holds 2 lines", "shorten it to about"],
    );
    // A caution of two lines is printed whole: no line dropped.
    let two = ["Never look into the lamp."; 9].join(" ");
    let (run, tmp) = build_with("common.toml", &common_template("safety", &two), None);
    assert_code(&run, 0);
    let s = svg(tmp.path());
    let shown: usize = two.split(' ').filter(|w| s.contains(w)).count();
    assert_eq!(shown, two.split(' ').count(), "every word of the caution is printed");
}

#[test]
fn templates_that_run_off_the_page_a_long_scale_check_label() {
    let label = "Check before use with a ruler against a known length: this bar must measure exactly 100 mm";
    let (run, tmp) = build_with("common.toml", &common_template("scale_check", label), None);
    assert_refused(
        &run,
        tmp.path(),
        "text/common.toml:2:15: field `scale_check`",
        &["over the 100 mm scale bar", "shorten it to about"],
    );
    let up = "this bar beside the drawing must measure exactly 50 mm with a ruler";
    let (run, tmp) = build_with("common.toml", &common_template("scale_check_vertical", up), None);
    assert_refused(
        &run,
        tmp.path(),
        "text/common.toml:3:24: field `scale_check_vertical`",
        &["along the 50 mm scale bar"],
    );
    let hint = ["print again at 100 %"; 8].join(", ");
    let (run, tmp) = build_with("common.toml", &common_template("scale_hint", &hint), None);
    assert_refused(
        &run,
        tmp.path(),
        "text/common.toml:4:14: field `scale_hint`",
        &["under the 100 mm scale bar"],
    );
}

#[test]
fn templates_that_run_off_the_page_a_long_column_heading() {
    let cut = r#"columns = ["Ray", "Height of the guide line above the optical axis, measured in millimetres", "Crossing", "Check"]"#;
    let (run, tmp) = build_with("curved-face.toml", &sheet_template("Refraction", &[], cut), None);
    // `columns = ["Ray", ` is 18 characters: the second entry opens at column 19.
    assert_refused(
        &run,
        tmp.path(),
        "text/curved-face.toml:3:19: field `columns[2]`",
        &["measurement table", "a heading has 2", "shorten it to about"],
    );
    // A heading too long for one line of its column wraps to two, in full, never cut.
    let two = r#"columns = ["Ray", "Ray height mm", "Crossing, mm from the flat face", "Check"]"#;
    let (run, tmp) = build_with("curved-face.toml", &sheet_template("Refraction", &[], two), Some("148x210"));
    assert_code(&run, 0);
    let s = svg(tmp.path());
    let words = ["Ray", "height", "mm"];
    assert!(words.iter().all(|w| s.contains(w)), "the whole heading is printed");
}

/// The same text is measured against the paper of each build: a heading that
/// fits beside the sheet-number box on A4 is refused on A5, naming the paper.
#[test]
fn templates_that_run_off_the_page_are_measured_on_the_actual_paper() {
    let heading = "Refraction of a narrow ray at the curved face of a half-disc acrylic block";
    let body = sheet_template(heading, &[], COLUMNS);
    let (run, _tmp) = build_with("curved-face.toml", &body, None);
    assert_code(&run, 0);
    let (run, tmp) = build_with("curved-face.toml", &body, Some("148x210"));
    assert_refused(
        &run,
        tmp.path(),
        "text/curved-face.toml:1:11: field `heading`",
        &["custom paper in portrait"],
    );
}

/// Measuring the heading against the room beside the identity box must not
/// refuse the shipped text for a valid class set: a 40-character group name
/// (the most a sheet takes) on A5 wraps in the box and the heading is set
/// smaller, so the demo kit builds.
#[test]
fn templates_that_run_off_the_page_shipped_text_with_the_longest_group_name_on_a5() {
    let tmp = tempfile::tempdir().unwrap();
    let kit = raysheet(&["demo", "--print-kit"], tmp.path());
    assert_code(&kit, 0);
    std::fs::write(tmp.path().join("k.toml"), &kit.stdout).unwrap();
    std::fs::write(tmp.path().join("r.csv"), "name\nAbcdefghij Klmnopqrst Uvwxyzabcd Efghijk\n").unwrap();
    let run =
        raysheet(&["build", "k.toml", "--out", "o", "--paper", "148x210", "--roster", "r.csv"], tmp.path());
    assert_code(&run, 0);
}
