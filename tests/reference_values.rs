//! raysheet's optics against an outside reference: every value below is read
//! from `tests/reference/rayoptics_values.json`, produced by rayoptics 0.9.8
//! (PyPI, a general-purpose optical design library) via
//! `tests/reference/make_reference.py`. Conventions: `tests/reference/README.md`.

use raysheet::optics::{Entry, Face, Lens as Piece, Outcome, Outline, Paraxial, trace_parallel};
use serde_json::Value;

mod common {
    pub mod close;
}
use common::close::assert_close;

/// Paraxial values and crossings agree to this, mm (the brief's tolerance;
/// rayoptics agrees with the closed forms to about 1e-13 mm).
const TOL_MM: f64 = 1e-9;
/// Exit slopes (dy/dx) agree to this.
const TOL_SLOPE: f64 = 1e-12;

fn reference() -> Value {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/reference/rayoptics_values.json");
    let text = std::fs::read_to_string(path).expect("tests/reference/rayoptics_values.json is readable");
    serde_json::from_str(&text).expect("the reference file is JSON")
}

fn num(v: &Value, key: &str) -> f64 {
    v[key].as_f64().unwrap_or_else(|| panic!("reference field `{key}` is a number in {v}"))
}

fn face(v: &Value) -> Face {
    if v.as_str() == Some("flat") {
        return Face::Flat;
    }
    let radius_mm = num(v, "radius_mm");
    match v["curve"].as_str() {
        Some("convex") => Face::Convex { radius_mm },
        Some("concave") => Face::Concave { radius_mm },
        other => panic!("unknown curve {other:?} in the reference file"),
    }
}

struct Case {
    label: String,
    outline: Outline,
    paraxial: Paraxial,
    json: Value,
}

fn cases() -> Vec<Case> {
    let r = reference();
    assert!(
        r["source"].as_str().is_some_and(|s| s.starts_with("rayoptics 0.9.8")),
        "the reference file names rayoptics 0.9.8 as its source: {}",
        r["source"]
    );
    let list = r["cases"].as_array().expect("`cases` is a list");
    list.iter()
        .map(|c| {
            let entry = match c["enter"].as_str() {
                Some("front") => Entry::Front,
                Some("back") => Entry::Back,
                other => panic!("unknown enter {other:?}"),
            };
            let piece = Piece::new(
                face(&c["front"]),
                face(&c["back"]),
                num(c, "thickness_mm"),
                num(c, "height_mm"),
                num(c, "index"),
            )
            .expect("every reference piece is a valid piece");
            Case {
                label: format!("{} entered from the {}", c["name"].as_str().unwrap_or("?"), entry.as_str()),
                outline: Outline::new(piece, entry),
                paraxial: Paraxial::of(&piece, entry),
                json: c.clone(),
            }
        })
        .collect()
}

#[test]
fn reference_file_covers_the_required_shapes_from_both_sides() {
    // Issue 2, section 5: a converging, a diverging, a meniscus and a
    // plano-convex piece, both entry sides.
    let cases = cases();
    for name in ["biconvex", "biconcave", "meniscus", "planoconvex"] {
        for enter in ["front", "back"] {
            assert!(
                cases.iter().any(|c| c.json["name"].as_str().is_some_and(|n| n.starts_with(name))
                    && c.json["enter"] == enter),
                "no {name} case entered from the {enter}"
            );
        }
    }
    assert!(cases.iter().any(|c| c.paraxial.efl_mm().unwrap() < 0.0), "a diverging case");
}

#[test]
fn thin_lens_focal_length_matches_the_lens_makers_formula_in_the_reference() {
    // `thin_lens_focal_mm` is the one value make_reference.py computes itself
    // (1/f = (n − 1)(1/R1 − 1/R2)), stored beside the rayoptics values.
    for c in cases() {
        let got = c.paraxial.thin_lens_focal_mm().expect("every reference piece has power");
        assert_close(got, num(&c.json, "thin_lens_focal_mm"), TOL_MM, &format!("{}: thin-lens f", c.label));
    }
}

#[test]
fn paraxial_values_match_rayoptics() {
    // rayoptics 0.9.8 via tests/reference/make_reference.py: fod.efl, fod.bfl and
    // −fod.ffl (front focal distance, positive before the entry vertex).
    for c in cases() {
        let px = c.paraxial;
        assert_close(px.efl_mm().unwrap(), num(&c.json, "efl_mm"), TOL_MM, &format!("{}: EFL", c.label));
        assert_close(px.bfl_mm().unwrap(), num(&c.json, "bfl_mm"), TOL_MM, &format!("{}: BFL", c.label));
        assert_close(
            px.front_focal_mm().unwrap(),
            num(&c.json, "front_focal_mm"),
            TOL_MM,
            &format!("{}: front focal distance", c.label),
        );
    }
}

#[test]
fn exact_trace_matches_rayoptics_real_rays() {
    // rayoptics 0.9.8 via tests/reference/make_reference.py: exact real-ray trace
    // of a ray parallel to the axis; crossing from the exit vertex, crossing
    // from the entry vertex and the exit slope dy/dx.
    let mut checked = 0;
    for c in cases() {
        let t = c.outline.t();
        let rays = c.json["rays"].as_array().expect("`rays` is a list");
        assert!(!rays.is_empty(), "{}: no rays", c.label);
        for r in rays {
            let h = num(r, "height_mm");
            assert!(
                r.get("failed").is_none(),
                "{}: the reference ray at {h} mm failed in rayoptics",
                c.label
            );
            let what = format!("{}, ray at {h} mm", c.label);
            let tr = trace_parallel(&c.outline, h, 10.0);
            let x = match tr.outcome {
                Outcome::Crosses { x_mm } | Outcome::Virtual { x_mm } => x_mm,
                other => panic!("{what}: outcome {other:?}, expected a crossing"),
            };
            assert_close(
                x - t,
                num(r, "crossing_from_exit_mm"),
                TOL_MM,
                &format!("{what}: crossing from exit"),
            );
            assert_close(
                x,
                num(r, "crossing_from_entry_mm"),
                TOL_MM,
                &format!("{what}: crossing from entry"),
            );
            let slope = tr.exit_dir.y / tr.exit_dir.x;
            assert_close(slope, num(r, "exit_slope"), TOL_SLOPE, &format!("{what}: exit slope"));
            // A negative crossing from the exit vertex is a virtual crossing (README.md).
            let virtual_expected = num(r, "crossing_from_exit_mm") < 0.0;
            assert_eq!(
                matches!(tr.outcome, Outcome::Virtual { .. }),
                virtual_expected,
                "{what}: real or virtual"
            );
            checked += 1;
        }
    }
    assert!(checked >= 50, "only {checked} reference rays checked");
}
