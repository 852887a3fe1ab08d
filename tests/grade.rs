//! Issue 11, marking: `build` writes results.csv; `raysheet grade` marks it
//! against the answers.json the same build wrote. The truth is the build's own
//! answer file (the rows' expected values are read from it here, never typed
//! in); the rules checked are the issue's: within / outside / missing, rows
//! matched by group, sheet, ray and quantity, located errors, nothing written
//! when a file is refused.

use std::path::Path;

mod common {
    pub mod cli;
}
use common::cli::{assert_code, fixture_path, raysheet, text};

/// Builds the three-bench class fixture into `dir/build`.
fn build(dir: &Path) {
    let out =
        raysheet(&["build", &fixture_path("class_trio.toml"), "--out", "build", "--format", "pdf"], dir);
    assert_code(&out, 0);
}

/// The answer file's expected answers, by (group, sheet, ray, quantity).
fn expected(dir: &Path) -> std::collections::BTreeMap<(String, u64, String, String), serde_json::Value> {
    let a: serde_json::Value =
        serde_json::from_slice(&std::fs::read(dir.join("build/answers.json")).unwrap()).unwrap();
    let mut out = std::collections::BTreeMap::new();
    for s in a["sheets"].as_array().unwrap() {
        for m in s["measured"].as_array().unwrap() {
            let key = (
                s["group"].as_str().unwrap().to_string(),
                s["sheet"].as_u64().unwrap(),
                m["ray"].as_str().unwrap().to_string(),
                m["quantity"].as_str().unwrap().to_string(),
            );
            out.insert(key, m.clone());
        }
    }
    out
}

/// The results file's rows with `measured` set by `fill(row index, expected)`.
fn fill(dir: &Path, sep: char, fill: impl Fn(usize, &serde_json::Value) -> String) -> String {
    let want = expected(dir);
    let text = std::fs::read_to_string(dir.join("build/results.csv")).unwrap();
    let mut lines = text.lines();
    let mut out = lines.next().unwrap().replace(',', &sep.to_string());
    out.push('\n');
    for (i, line) in lines.enumerate() {
        let cells: Vec<&str> = line.split(',').collect();
        let key =
            (cells[0].to_string(), cells[2].parse().unwrap(), cells[3].to_string(), cells[4].to_string());
        let m = &want[&key];
        let mut cells: Vec<String> = cells.iter().map(|c| c.to_string()).collect();
        cells[6] = fill(i, m);
        out.push_str(&cells.join(&sep.to_string()));
        out.push('\n');
    }
    out
}

fn grades(dir: &Path) -> Vec<Vec<String>> {
    let mut r = csv::Reader::from_path(dir.join("marks/grades.csv")).unwrap();
    r.records().map(|rec| rec.unwrap().iter().map(str::to_string).collect()).collect()
}

#[test]
fn results_filled_with_the_keys_own_values_are_all_within() {
    let tmp = tempfile::tempdir().unwrap();
    let dir = tmp.path();
    build(dir);
    // The build writes results.csv with the fixed columns and an empty `measured`.
    let results = std::fs::read_to_string(dir.join("build/results.csv")).unwrap();
    assert!(results.starts_with("group,variant,sheet,ray,quantity,unit,measured\n"), "{results}");
    let n = expected(dir).len();
    assert_eq!(results.lines().count(), n + 1, "one row per answer measured");
    // The key's values, as a student would write them (to 0.1 mm).
    std::fs::write(
        dir.join("build/results.csv"),
        fill(dir, ',', |_, m| format!("{:.1}", m["value"].as_f64().unwrap())),
    )
    .unwrap();
    let out = raysheet(&["grade", "build/results.csv", "--out", "marks"], dir);
    assert_code(&out, 0);
    let g = grades(dir);
    assert_eq!(g.len(), n);
    assert!(g.iter().all(|r| r[10] == "within"), "{g:?}");
    // The overview: every group's answers within tolerance out of those measured.
    let per_group = n / 3;
    for bench in ["Window bench", "Sink bench", "Back bench"] {
        let line = format!("  {bench}: {per_group} / {per_group} ({per_group})");
        assert!(text(&out.stdout).contains(&line), "{line}: {}", text(&out.stdout));
    }
}

#[test]
fn values_moved_past_the_tolerance_are_outside_and_empty_cells_missing() {
    let tmp = tempfile::tempdir().unwrap();
    let dir = tmp.path();
    build(dir);
    // Row 0: 1.01 tolerances too far; row 1: 0.99 tolerances (inside); row 2: empty;
    // the rest exact. Semicolon-separated with a decimal comma, as a spreadsheet in
    // a comma-decimal locale saves it.
    let filled = fill(dir, ';', |i, m| {
        let (v, t) = (m["value"].as_f64().unwrap(), m["tolerance"].as_f64().unwrap());
        match i {
            0 => format!("{:.3}", v + 1.01 * t).replace('.', ","),
            1 => format!("{:.3}", v - 0.99 * t).replace('.', ","),
            2 => String::new(),
            _ => format!("{v:.3}").replace('.', ","),
        }
    });
    std::fs::write(dir.join("build/results.csv"), filled).unwrap();
    let out = raysheet(&["grade", "build/results.csv", "--out", "marks"], dir);
    assert_code(&out, 0);
    let g = grades(dir);
    assert_eq!(g[0][10], "outside");
    assert_eq!(g[1][10], "within");
    assert_eq!(g[2][10], "missing");
    assert!(g[3..].iter().all(|r| r[10] == "within"), "{g:?}");
    // The difference is measured − predicted.
    let d: f64 = g[0][9].parse().unwrap();
    let t: f64 = g[0][8].parse().unwrap();
    assert!((d - 1.01 * t).abs() < 2e-3, "{d} vs {t}");
}

#[test]
fn a_kit_edited_after_the_build_changes_no_mark() {
    let tmp = tempfile::tempdir().unwrap();
    let dir = tmp.path();
    let kit = dir.join("kit.toml");
    std::fs::copy(fixture_path("class_trio.toml"), &kit).unwrap();
    assert_code(&raysheet(&["build", "kit.toml", "--out", "build", "--format", "pdf"], dir), 0);
    std::fs::write(
        dir.join("build/results.csv"),
        fill(dir, ',', |i, m| {
            let v = m["value"].as_f64().unwrap();
            format!("{:.1}", v + if i % 2 == 0 { 3.0 } else { 0.0 })
        }),
    )
    .unwrap();
    let out = raysheet(&["grade", "build/results.csv", "--out", "marks", "--kit", "kit.toml"], dir);
    assert_code(&out, 0);
    assert!(!text(&out.stderr).contains("has changed"), "{}", text(&out.stderr));
    let before = std::fs::read(dir.join("marks/grades.csv")).unwrap();
    // The acrylic's index edited in the kit: the marks come from the build's answers.
    let edited = std::fs::read_to_string(&kit).unwrap().replace("index = 1.49", "index = 1.52");
    assert_ne!(edited, std::fs::read_to_string(&kit).unwrap());
    std::fs::write(&kit, edited).unwrap();
    let out = raysheet(&["grade", "build/results.csv", "--out", "marks", "--kit", "kit.toml"], dir);
    assert_code(&out, 0);
    // The build's answer file records the kit's SHA-256: the change is said, the marks stay.
    assert!(
        text(&out.stderr).contains("kit.toml: the kit has changed since the build"),
        "{}",
        text(&out.stderr)
    );
    assert_eq!(std::fs::read(dir.join("marks/grades.csv")).unwrap(), before);
}

/// Every class of bad row gets its line and column and what would be
/// accepted, and nothing is written.
#[test]
fn bad_rows_are_refused_with_their_place() {
    let tmp = tempfile::tempdir().unwrap();
    let dir = tmp.path();
    build(dir);
    let good = fill(dir, ',', |_, m| format!("{:.1}", m["value"].as_f64().unwrap()));
    let lines: Vec<&str> = good.lines().collect();
    let with_line = |k: usize, from: &str, to: &str| {
        let mut l: Vec<String> = lines.iter().map(|s| s.to_string()).collect();
        l[k] = l[k].replacen(from, to, 1);
        l.join("\n") + "\n"
    };
    let measured_of = |k: usize| lines[k].rsplit(',').next().unwrap().to_string();
    let cases = [
        (
            with_line(2, "Window bench", "Door bench"),
            "results.csv:3:1:",
            "\"Door bench\" is not in the build's answer file",
        ),
        (with_line(2, ",A,", ",Q,"), "results.csv:3:4:", "it asks for"),
        (
            with_line(2, &measured_of(2), &format!("{} mm", measured_of(2))),
            "results.csv:3:7:",
            "unit in the cell",
        ),
        (with_line(2, &measured_of(2), "about ninety"), "results.csv:3:7:", "is not a number"),
        (with_line(2, ",1,", ",one,"), "results.csv:3:3:", "is not a sheet number"),
        (format!("{}{}\n", good, lines[1]), "results.csv:", "was given already on line 2"),
    ];
    for (text_in, place, why) in cases {
        std::fs::write(dir.join("build/results.csv"), &text_in).unwrap();
        let out = raysheet(&["grade", "build/results.csv", "--out", "marks"], dir);
        assert_code(&out, 2);
        let err = text(&out.stderr);
        assert!(err.contains(place) && err.contains(why), "{place} {why}: {err}");
        assert!(!dir.join("marks").exists(), "nothing written when refused");
    }
    // A variant code a spreadsheet turned into a number is only a warning.
    let first_variant = lines[1].split(',').nth(1).unwrap();
    std::fs::write(dir.join("build/results.csv"), with_line(1, &format!(",{first_variant},"), ",2E+45,"))
        .unwrap();
    let out = raysheet(&["grade", "build/results.csv", "--out", "marks"], dir);
    assert_code(&out, 0);
    assert!(text(&out.stderr).contains("variant \"2E+45\" differs"), "{}", text(&out.stderr));
}

/// `raysheet fit KIT RESULTS`: the kit's line to change, and the JSON the
/// issue fixes (`materials`: `material`, `index`, `uncertainty`, `measurements`).
#[test]
fn fit_prints_the_index_and_the_kit_line() {
    let tmp = tempfile::tempdir().unwrap();
    let dir = tmp.path();
    build(dir);
    std::fs::write(
        dir.join("build/results.csv"),
        fill(dir, ',', |i, m| {
            let (v, t) = (m["value"].as_f64().unwrap(), m["tolerance"].as_f64().unwrap());
            format!("{:.2}", v + if i % 2 == 0 { 0.3 * t } else { -0.3 * t })
        }),
    )
    .unwrap();
    let kit = fixture_path("class_trio.toml");
    let out = raysheet(&["fit", &kit, "build/results.csv"], dir);
    assert_code(&out, 0);
    let t = text(&out.stdout);
    assert!(
        t.starts_with("acrylic-f: n = 1.4") && t.contains("In the kit: [materials.acrylic-f] index = 1."),
        "{t}"
    );
    let out = raysheet(&["fit", &kit, "build/results.csv", "--json"], dir);
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let m = &v["materials"][0];
    assert_eq!(m["material"], "acrylic-f");
    assert!(m["index"].as_f64().unwrap() > 1.4 && m["uncertainty"].as_f64().unwrap() > 0.0, "{v}");
    assert_eq!(m["measurements"].as_u64().unwrap() as usize, expected(dir).len());
    // Too few numbers: said, no index.
    let one =
        fill(
            dir,
            ',',
            |i, m| if i == 0 { format!("{:.1}", m["value"].as_f64().unwrap()) } else { String::new() },
        );
    std::fs::write(dir.join("build/results.csv"), one).unwrap();
    let t = text(&raysheet(&["fit", &kit, "build/results.csv"], dir).stdout);
    assert!(t.contains("no index: 1 number measured"), "{t}");
}

/// grades.pdf: the class overview, then every sheet with a curve plotted with
/// each group's measurements. The marks' plot data carries every measured
/// number of the curve's quantity, at its ray's own guide height.
#[test]
fn grades_pdf_plots_every_groups_measurements_against_the_curve() {
    let tmp = tempfile::tempdir().unwrap();
    let dir = tmp.path();
    build(dir);
    let filled = fill(dir, ',', |_, m| format!("{:.2}", m["value"].as_f64().unwrap()));
    let answers = std::fs::read_to_string(dir.join("build/answers.json")).unwrap();
    let g = raysheet::output::grade::grade(&filled, "results.csv", &answers, "answers.json").unwrap();
    // class_trio.toml: one curve-face sheet, three groups, entered flat face first.
    assert_eq!(g.plots.len(), 1);
    let p = &g.plots[0];
    assert_eq!((p.x.as_str(), p.y.as_str()), ("height_mm", "crossing_from_flat_face_mm"));
    let want = expected(dir).keys().filter(|k| k.3 == p.y).count();
    assert_eq!(p.points.len(), want, "every measured crossing from the flat face");
    assert!(p.points.iter().all(|q| q.2), "the key's own values are within");
    // Each point lies on the exact curve (within the 0.01 mm rounding of the
    // filled-in values and the curve's sampling): interpolate the curve at its height.
    for &(h, y, _) in &p.points {
        let seg = p.curve.windows(2).find(|w| w[0].0 <= h && h <= w[1].0).expect("inside the curve");
        let t = (h - seg[0].0) / (seg[1].0 - seg[0].0);
        let on = seg[0].1 + t * (seg[1].1 - seg[0].1);
        assert!((on - y).abs() < 0.3, "({h}, {y}) against {on}");
    }
    std::fs::write(dir.join("build/results.csv"), filled).unwrap();
    assert_code(&raysheet(&["grade", "build/results.csv", "--out", "marks"], dir), 0);
    let doc = lopdf::Document::load(dir.join("marks/grades.pdf")).unwrap();
    assert_eq!(doc.get_pages().len(), 2, "the overview, and one page for the plot");
}
