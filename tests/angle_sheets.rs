//! Block and prism sheets end to end: the kit's new shapes and fields, their
//! located errors, and the answers in the answer file against the textbook
//! formulas (DESIGN.md, sheets 4 and 5).

use raysheet::output::answers::to_json;
use raysheet::sheets::{Lesson, plan_lesson};
use serde_json::Value;

const FILE: &str = "angles.toml";

/// A kit of our own: a block, an equilateral prism and a right-angle prism.
const KIT: &str = r#"
title = "Angle sheets"
[materials.pmma]
index = 1.49
[[pieces]]
id = "blk"
material = "pmma"
shape = "block"
thickness_mm = 40
height_mm = 90
[[pieces]]
id = "tri"
material = "pmma"
shape = "prism"
apex_deg = 60
side_mm = 50
[[pieces]]
id = "rap"
material = "pmma"
shape = "prism"
apex_deg = 90
side_mm = 40
[[sheets]]
kind = "block"
piece = "blk"
angles_deg = [30, 45, 60]
[[sheets]]
kind = "prism"
piece = "tri"
angles_deg = [35, 45, 55, 65]
[[sheets]]
kind = "prism"
piece = "rap"
[[sheets]]
kind = "prism"
piece = "rap"
enter = "base"
"#;

fn answers() -> Value {
    let lesson = Lesson::from_toml(KIT, FILE).expect("the kit is valid");
    let plans = plan_lesson(&lesson, &lesson.paper);
    serde_json::from_str(&to_json(&lesson.title, None, &plans)).expect("the answer file is JSON")
}

fn close(a: f64, b: f64, tol: f64) {
    assert!((a - b).abs() <= tol, "expected {b} ± {tol}, got {a}");
}

#[test]
fn block_answers_follow_snell_and_the_shift_formula() {
    // sin i = n sin r; d = t·sin(i − r)/cos r; e = i (DESIGN.md, rectangular block).
    let v = answers();
    let sheet = &v["sheets"][0];
    assert_eq!(sheet["kind"], "block");
    for (ray, i) in sheet["rays"].as_array().unwrap().iter().zip([30.0f64, 45.0, 60.0]) {
        let r = (i.to_radians().sin() / 1.49).asin();
        assert_eq!(ray["outcome"], "refracts");
        close(ray["angle_of_incidence_deg"].as_f64().unwrap(), i, 0.0);
        close(ray["refraction_angle_deg"].as_f64().unwrap(), r.to_degrees(), 1e-9);
        close(ray["emergence_angle_deg"].as_f64().unwrap(), i, 1e-9);
        close(ray["lateral_shift_mm"].as_f64().unwrap(), 40.0 * (i.to_radians() - r).sin() / r.cos(), 1e-9);
        assert_eq!(ray["exit_face"], "exit");
        assert_eq!(ray["events"].as_array().unwrap().len(), 2);
        assert!(ray["tolerance_mm"].as_f64().unwrap() > 0.0 && ray["tolerance_deg"].as_f64().unwrap() > 0.0);
    }
}

#[test]
fn prism_answers_give_deviation_minimum_and_limit() {
    // δ = i + e − A; δmin = 2·asin(n sin(A/2)) − A; i_lim = asin(n sin(A − θc)) (DESIGN.md).
    let v = answers();
    let sheet = &v["sheets"][1];
    let (n, a) = (1.49f64, 60f64.to_radians());
    let dmin = 2.0 * (n * (a / 2.0).sin()).asin() - a;
    close(sheet["minimum_deviation_deg"].as_f64().unwrap(), dmin.to_degrees(), 1e-9);
    close(
        sheet["minimum_deviation_incidence_deg"].as_f64().unwrap(),
        (n * (a / 2.0).sin()).asin().to_degrees(),
        1e-9,
    );
    let crit = (1.0 / n).asin();
    close(
        sheet["limiting_incidence_deg"].as_f64().unwrap(),
        (n * (a - crit).sin()).asin().to_degrees(),
        1e-9,
    );
    // Textbook check value (from memory): a 60° prism of n = 1.5 deviates at least 37.2°.
    close((2.0 * (1.5 * (a / 2.0).sin()).asin() - a).to_degrees(), 37.2, 0.05);
    for ray in sheet["rays"].as_array().unwrap() {
        let i = ray["angle_of_incidence_deg"].as_f64().unwrap();
        let e = ray["emergence_angle_deg"].as_f64().unwrap();
        close(ray["deviation_deg"].as_f64().unwrap(), i + e - 60.0, 1e-9);
        assert!(ray["deviation_deg"].as_f64().unwrap() >= dmin.to_degrees() - 1e-9);
        assert_eq!(ray["outcome"], "refracts");
        assert_eq!(ray["exit_face"], "second-side");
    }
}

#[test]
fn right_angle_prism_turns_through_90_and_180_with_reasons_for_missing_values() {
    let v = answers();
    let side = &v["sheets"][2];
    let base = &v["sheets"][3];
    close(side["rays"][0]["deviation_deg"].as_f64().unwrap(), 90.0, 1e-9);
    close(base["rays"][0]["deviation_deg"].as_f64().unwrap(), 180.0, 1e-9);
    assert_eq!(side["rays"][0]["outcome"], "turns");
    assert_eq!(base["rays"][0]["outcome"], "turns");
    // A 90° apex is more than twice the 42.2° critical angle: no ray passes side to side.
    assert!(side["minimum_deviation_deg"].is_null());
    assert!(side["limiting_incidence_deg"].is_null());
    let why = side["not_defined"]["limiting_incidence_deg"].as_str().unwrap();
    assert!(why.contains("twice the critical angle"), "{why}");
    // The 180° turn needs two total reflections and holds only near normal incidence.
    let events: Vec<&str> =
        base["rays"][0]["events"].as_array().unwrap().iter().map(|e| e["event"].as_str().unwrap()).collect();
    assert_eq!(events, ["enters", "total-internal-reflection", "total-internal-reflection", "leaves"]);
    let band = &base["safe_band_deg"];
    assert!(band["max"].as_f64().unwrap() < 4.3 && band["min"].as_f64().unwrap() > -4.3, "{band}");
}

fn error(text: &str) -> String {
    Lesson::from_toml(text, FILE).expect_err("the kit is refused").to_string()
}

#[test]
fn sheets_that_do_not_fit_their_piece_are_refused_where_they_are_written() {
    let e = error(&KIT.replace("kind = \"block\"\npiece = \"blk\"", "kind = \"block\"\npiece = \"tri\""));
    assert!(e.contains("field `sheets[1].kind`") && e.contains("needs a rectangular block"), "{e}");
    let e = error(&KIT.replace("kind = \"block\"\npiece = \"blk\"", "kind = \"focal\"\npiece = \"blk\""));
    assert!(e.contains("needs a lens shape") && e.contains("piece `blk` is a block"), "{e}");
    let e = error(&KIT.replace("piece = \"rap\"\nenter = \"base\"", "piece = \"tri\"\nenter = \"base\""));
    assert!(e.contains("field `sheets[4].enter`") && e.contains("right-angle prism"), "{e}");
}

#[test]
fn bad_prism_and_block_values_name_the_field_and_the_range() {
    let e = error(&KIT.replace("apex_deg = 60", "apex_deg = 180"));
    assert!(e.contains("field `pieces[2].apex_deg`") && e.contains("below 180 degrees"), "{e}");
    let e = error(&KIT.replace("side_mm = 50", "side_mm = 4"));
    assert!(e.contains("field `pieces[2].side_mm`") && e.contains("from 10 to 300 mm"), "{e}");
    let e = error(&KIT.replace("angles_deg = [30, 45, 60]", "angles_deg = [30, 95]"));
    assert!(e.contains("field `sheets[1].angles_deg[2]`") && e.contains("from 0 to 89.9 degrees"), "{e}");
    let e = error(&KIT.replace("angles_deg = [30, 45, 60]", "heights_mm = [5]"));
    assert!(
        e.contains("unknown field `heights_mm` on a block sheet")
            && e.contains("accepted here: kind, piece, angles_deg"),
        "{e}"
    );
    let e = error(
        &KIT.replace("thickness_mm = 40\nheight_mm = 90", "thickness_mm = 40\nheight_mm = 90\napex_deg = 60"),
    );
    assert!(e.contains("a block has no `apex_deg`"), "{e}");
    let e = error(&KIT.replace("apex_deg = 60\nside_mm = 50", "apex_deg = 60"));
    assert!(e.contains("missing field `side_mm`"), "{e}");
}

#[test]
fn default_angles_lie_in_the_band_and_bracket_minimum_deviation() {
    let text = KIT.replace("angles_deg = [35, 45, 55, 65]\n", "");
    let lesson = Lesson::from_toml(&text, FILE).unwrap();
    let plans = plan_lesson(&lesson, &lesson.paper);
    let v: Value = serde_json::from_str(&to_json("t", None, &plans)).unwrap();
    let sheet = &v["sheets"][1];
    let imin = sheet["minimum_deviation_incidence_deg"].as_f64().unwrap();
    let angles: Vec<f64> = sheet["rays"]
        .as_array()
        .unwrap()
        .iter()
        .map(|r| r["angle_of_incidence_deg"].as_f64().unwrap())
        .collect();
    assert!(angles.iter().any(|a| *a < imin) && angles.iter().any(|a| *a > imin), "{angles:?} around {imin}");
    assert!(sheet["rays"].as_array().unwrap().iter().all(|r| r["in_safe_band"] == true));
}

#[test]
fn class_variants_give_groups_their_own_angles_inside_the_band() {
    use raysheet::plan::{Group, folder_names};
    use raysheet::sheets::plan_class;
    let text = KIT.replace("angles_deg = [30, 45, 60]\n", "").replace("angles_deg = [35, 45, 55, 65]\n", "");
    let lesson = Lesson::from_toml(&text, FILE).unwrap();
    let names: Vec<String> = (1..=6).map(|i| format!("Bench {i}")).collect();
    let groups = names
        .iter()
        .cloned()
        .zip(folder_names(&names))
        .map(|(name, folder)| Group { name, folder })
        .collect();
    let cp = plan_class(&lesson, &lesson.paper, groups, 2027);
    for sheet in 0..2 {
        let mut seen = std::collections::BTreeSet::new();
        for g in &cp.plans {
            let v: Value =
                serde_json::from_str(&to_json("t", None, std::slice::from_ref(&g[sheet]))).unwrap();
            let rays = v["sheets"][0]["rays"].as_array().unwrap().clone();
            let angles: Vec<f64> =
                rays.iter().map(|r| r["angle_of_incidence_deg"].as_f64().unwrap()).collect();
            // Whole degrees (the 1° grid), every ray in the band and graded.
            assert!(angles.iter().all(|a| (a - a.round()).abs() < 1e-9), "{angles:?}");
            assert!(rays.iter().all(|r| r["in_safe_band"] == true && r["graded"] == true), "{angles:?}");
            seen.insert(format!("{angles:?}"));
        }
        assert_eq!(seen.len(), cp.plans.len(), "sheet {}: every group has its own angles", sheet + 1);
    }
    // Byte-identical from the same seed.
    let again = plan_class(&lesson, &lesson.paper, cp.groups.clone(), 2027);
    assert_eq!(to_json("t", Some(2027), &again.plans.concat()), to_json("t", Some(2027), &cp.plans.concat()));
}
