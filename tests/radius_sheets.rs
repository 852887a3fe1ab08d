//! Radius sheets (issue 8) end to end: the answer file's chords and sagittas
//! against R = c²/(8s) + s/2 and the pieces' own radii, the lens maker's
//! formula from the recovered radii, the gauge page's arcs, and class variants.
//!
//! The kit below is this test's own ("lens tray 4": a meniscus, a
//! plano-concave and a biconvex shape); no number comes from the demo kit.

use raysheet::layout::{self, Templates};
use raysheet::output::answers::to_json;
use raysheet::plan::Group;
use raysheet::scene::Item;
use raysheet::sheets::{Lesson, plan_class, plan_lesson};
use serde_json::Value;

const KIT: &str = r#"title = "Lens tray 4"
[materials.pmma]
index = 1.495
[[pieces]]
id = "men"
material = "pmma"
front = { curve = "convex", radius_mm = 60 }
back = { curve = "concave", radius_mm = 110 }
thickness_mm = 12
height_mm = 50
[[pieces]]
id = "pcc"
material = "pmma"
front = "flat"
back = { curve = "concave", radius_mm = 80 }
thickness_mm = 5
height_mm = 44
[[pieces]]
id = "bcx"
material = "pmma"
front = { curve = "convex", radius_mm = 45 }
back = { curve = "convex", radius_mm = 45 }
thickness_mm = 20
height_mm = 56
[[sheets]]
kind = "radius"
piece = "men"
half_chord_mm = 20
[[sheets]]
kind = "radius"
piece = "pcc"
[[sheets]]
kind = "radius"
piece = "bcx"
"#;

fn lesson() -> Lesson {
    Lesson::from_toml(KIT, "tray.toml").unwrap_or_else(|e| panic!("the kit is valid: {e}"))
}

fn close(a: f64, b: f64, tol: f64, what: &str) {
    assert!((a - b).abs() <= tol, "{what}: expected {b} ± {tol}, got {a}");
}

#[test]
fn chords_and_sagittas_give_back_each_faces_radius() {
    let l = lesson();
    let plans = plan_lesson(&l, &l.paper);
    let a: Value = serde_json::from_str(&to_json(&l.title, None, &plans)).unwrap();
    // (piece radii by face, half-chord): the kit's own numbers; the default
    // half-chord is 80 % of the half-height, to the whole mm below.
    let want: [(&[(&str, f64)], f64); 3] = [
        (&[("front", 60.0), ("back", 110.0)], 20.0),
        (&[("back", 80.0)], 17.0),
        (&[("front", 45.0), ("back", 45.0)], 22.0),
    ];
    for (s, (faces, h)) in a["sheets"].as_array().unwrap().iter().zip(want) {
        assert_eq!(s["kind"], "radius");
        close(s["half_chord_mm"].as_f64().unwrap(), h, 0.0, "half-chord");
        let got = s["faces"].as_array().unwrap();
        assert_eq!(got.len(), faces.len());
        for (g, (face, r)) in got.iter().zip(faces) {
            assert_eq!(g["face"], *face);
            let (c, sag) = (g["chord_mm"].as_f64().unwrap(), g["sagitta_mm"].as_f64().unwrap());
            close(c, 2.0 * h, 1e-9, "chord c = 2h");
            // s = R − √(R² − h²) (DESIGN.md) and R = c²/(8s) + s/2 (DESIGN.md, sheet 6).
            close(sag, r - (r * r - h * h).sqrt(), 1e-9, "sagitta");
            close(c * c / (8.0 * sag) + sag / 2.0, *r, 1e-9, "R from the chord");
            close(g["radius_mm"].as_f64().unwrap(), *r, 0.0, "the piece's radius");
        }
    }
    // The lens maker's formula (thin lens, DESIGN.md) from the recovered
    // radii, signed: front convex +R, back concave +R, back convex −R.
    let n: f64 = 1.495;
    let f = |r1: f64, r2: f64| 1.0 / ((n - 1.0) * (1.0 / r1 - 1.0 / r2));
    close(a["sheets"][0]["thin_lens_focal_mm"].as_f64().unwrap(), f(60.0, 110.0), 1e-9, "meniscus f");
    close(
        a["sheets"][1]["thin_lens_focal_mm"].as_f64().unwrap(),
        1.0 / ((n - 1.0) * (-1.0 / 80.0)),
        1e-9,
        "pcc f",
    );
    close(a["sheets"][2]["thin_lens_focal_mm"].as_f64().unwrap(), f(45.0, -45.0), 1e-9, "bcx f");
}

#[test]
fn the_gauge_spans_the_kits_radii_in_equal_steps_of_curvature() {
    let l = lesson();
    let plans = plan_lesson(&l, &l.paper);
    let a: Value = serde_json::from_str(&to_json(&l.title, None, &plans)).unwrap();
    let radii: Vec<f64> =
        a["sheets"][0]["gauge_radii_mm"].as_array().unwrap().iter().map(|v| v.as_f64().unwrap()).collect();
    assert!(radii.len() >= 3, "{radii:?}");
    // The kit's radii run from 45 to 110 mm: the gauge reaches past both ends.
    assert!(radii.iter().any(|r| *r >= 110.0) && radii.iter().any(|r| *r <= 45.0), "{radii:?}");
    // Equal steps of 1/R, to the rounding of each radius to a whole mm.
    let k: Vec<f64> = radii.iter().map(|r| 1.0 / r).collect();
    let steps: Vec<f64> = k.windows(2).map(|w| w[1] - w[0]).collect();
    for (s, (lo, hi)) in steps.iter().zip(radii.iter().zip(&radii[1..])) {
        // A radius rounded by ±0.5 mm moves 1/R by up to 0.5/R².
        let slack = 0.5 / (lo * lo) + 0.5 / (hi * hi);
        close(*s, steps[0], slack + 0.5 / (radii[0] * radii[0]) + 0.5 / (radii[1] * radii[1]), "equal steps");
    }
    // Neighbouring arcs differ visibly over the piece's half-height (25 mm):
    // sagittas at least 1 mm apart.
    let sag = |r: f64| r - (r * r - 25.0f64 * 25.0).sqrt();
    for w in radii.windows(2) {
        assert!((sag(w[1]) - sag(w[0])).abs() >= 1.0, "{w:?}");
    }
    // The gauge page draws each arc at its own radius, numbered.
    let set = layout::layout(&l.title, &plans, &l.paper, &Templates::shipped().unwrap()).unwrap();
    let gauge = set.sheets.pages.iter().find(|p| p.name == "sheet-01-gauge").expect("a gauge page");
    let arcs: Vec<f64> = gauge
        .items
        .iter()
        .filter_map(|i| match i {
            Item::Arc { radius_mm, .. } => Some(*radius_mm),
            _ => None,
        })
        .collect();
    assert_eq!(arcs.len(), radii.len());
    for r in &radii {
        assert!(arcs.contains(r), "{r} among {arcs:?}");
        let label = format!("{r:.0}");
        assert!(
            gauge.items.iter().any(|i| matches!(i, Item::Text { text, .. } if *text == label)),
            "{label} printed"
        );
    }
    // The key has a gauge page too.
    assert!(set.keys.pages.iter().any(|p| p.name == "key-01-gauge"));
}

/// Every arc on a page: (centre x, centre y, radius), mm.
fn arcs_of(items: &[Item]) -> Vec<(f64, f64, f64)> {
    items
        .iter()
        .filter_map(|i| match i {
            Item::Arc { center, radius_mm, .. } => Some((center.x, center.y, *radius_mm)),
            _ => None,
        })
        .collect()
}

#[test]
fn the_keys_gauge_page_lays_over_the_students_and_names_the_arcs_each_face_lies_between() {
    let l = lesson();
    let plans = plan_lesson(&l, &l.paper);
    let set = layout::layout(&l.title, &plans, &l.paper, &Templates::shipped().unwrap()).unwrap();
    let page = |pages: &[raysheet::scene::Page], name: &str| {
        pages.iter().find(|p| p.name == name).unwrap().items.clone()
    };
    // The meniscus (sheet 1): front convex R = 60, back concave R = 110.
    let student = arcs_of(&page(&set.sheets.pages, "sheet-01-gauge"));
    let key = arcs_of(&page(&set.keys.pages, "key-01-gauge"));
    // Same gauge arcs at the same coordinates, so the key overlays the page.
    assert_eq!(&key[..student.len()], &student[..]);
    // The key adds one arc per curved face, at the face's radius, through
    // the same vertex (centre x − R is the vertex's x).
    let vertex_x = student[0].0 - student[0].2;
    let extra = &key[student.len()..];
    assert_eq!(extra.len(), 2, "{extra:?}");
    for (r, a) in [60.0, 110.0].iter().zip(extra) {
        close(a.2, *r, 1e-12, "face arc radius");
        close(a.0 - a.2, vertex_x, 1e-9, "face arc through the vertex");
    }
    // Its words name the neighbouring gauge arcs, which bracket the radius.
    let texts: Vec<String> = page(&set.keys.pages, "key-01-gauge")
        .iter()
        .filter_map(|i| match i {
            Item::Text { text, .. } => Some(text.clone()),
            _ => None,
        })
        .collect();
    let radii: Vec<f64> = student.iter().map(|a| a.2).collect();
    for r in [60.0f64, 110.0] {
        let line =
            texts.iter().find(|t| t.contains(&format!("R = {r:.1} mm"))).expect("a line for each face");
        let named: Vec<f64> =
            line.split(|c: char| !c.is_ascii_digit()).filter_map(|w| w.parse::<f64>().ok()).collect();
        let lower = radii.iter().copied().filter(|g| *g < r).fold(0.0, f64::max);
        let upper = radii.iter().copied().filter(|g| *g > r).fold(f64::INFINITY, f64::min);
        assert!(named.contains(&lower) && named.contains(&upper), "{line}: {lower} and {upper}");
    }
    // The student's page says nothing of the faces.
    assert!(
        !page(&set.sheets.pages, "sheet-01-gauge")
            .iter()
            .any(|i| matches!(i, Item::Text { text, .. } if text.contains("R = ")))
    );
}

#[test]
fn class_variants_vary_the_chord_and_the_student_sheet_has_no_outline() {
    let l = lesson();
    let groups: Vec<Group> =
        (1..=6).map(|k| Group { name: format!("Table {k}"), folder: format!("{k:02}-table-{k}") }).collect();
    let class = plan_class(&l, &l.paper, groups, 3);
    let hs: Vec<String> = class
        .plans
        .iter()
        .map(|g| {
            let a: Value =
                serde_json::from_str(&to_json(&l.title, None, std::slice::from_ref(&g[2]))).unwrap();
            a["sheets"][0]["half_chord_mm"].to_string()
        })
        .collect();
    let distinct: std::collections::BTreeSet<&String> = hs.iter().collect();
    assert_eq!(distinct.len(), hs.len(), "{hs:?}");
    // A fixed half_chord_mm is the same for every group.
    assert!(class.plans.iter().all(|g| g[0].view().answers()["half_chord_mm"] == 20.0));
    // Students trace the real piece: the sheet draws no outline; the key does.
    let plans = plan_lesson(&l, &l.paper);
    let set = layout::layout(&l.title, &plans, &l.paper, &Templates::shipped().unwrap()).unwrap();
    let has_outline = |items: &[Item]| {
        fn walk(items: &[Item]) -> bool {
            items.iter().any(|i| match i {
                Item::Outline { .. } => true,
                Item::Group { items, .. } => walk(items),
                _ => false,
            })
        }
        walk(items)
    };
    assert!(!has_outline(&set.sheets.pages[0].items));
    assert!(has_outline(&set.keys.pages[0].items));
}
