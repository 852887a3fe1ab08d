//! Random but valid kits go all the way through planning, layout and both
//! renderers without a panic, and every output parses: the answer file as
//! JSON, every SVG with usvg. A small budget keeps it quick.

use proptest::prelude::*;
use raysheet::output::{Formats, build_plans};
use raysheet::sheets::Lesson;
use raysheet::sheets::plan_lesson;

fn face(kind: u8, r: f64) -> String {
    match kind % 3 {
        0 => "\"flat\"".to_string(),
        1 => format!("{{ curve = \"convex\", radius_mm = {r:.3} }}"),
        _ => format!("{{ curve = \"concave\", radius_mm = {r:.3} }}"),
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]
    #[test]
    fn random_valid_kits_build_without_panicking(
        front in 0u8..3, back in 0u8..3,
        r1 in 1.0f64..6.0, r2 in 1.0f64..6.0,
        t in 2.0f64..60.0, h in 10.0f64..120.0, n in 1.3f64..1.9,
        rays in 1u32..8, spacing in 4.0f64..15.0,
        focal in proptest::bool::ANY, back_first in proptest::bool::ANY,
        paper in 0usize..4,
    ) {
        // Radii as multiples of the half-height, so most pieces are valid.
        let a = h / 2.0;
        let text = format!(
            "[materials.m]\nindex = {n:.4}\n[ray_box]\nrays = {rays}\nspacing_mm = {spacing:.2}\nray_width_mm = 1.5\n\
             [paper]\nsize = \"{}\"\n\
             [[pieces]]\nid = \"p\"\nmaterial = \"m\"\nfront = {}\nback = {}\nthickness_mm = {t:.3}\nheight_mm = {h:.3}\n\
             [[sheets]]\nkind = \"{}\"\npiece = \"p\"\nenter = \"{}\"\n",
            ["A4", "A3", "Letter", "Legal"][paper],
            face(front, r1 * a),
            face(back, r2 * a),
            if focal { "focal" } else { "curved-face" },
            if back_first { "back" } else { "front" },
        );
        // Invalid combinations (negative edge, a sheet kind that does not fit)
        // are refused with an error, which is fine here.
        let Ok(kit) = Lesson::from_toml(&text, "random.toml") else { return Ok(()) };
        let plans = plan_lesson(&kit, &kit.paper);
        match build_plans(&kit, &plans, &kit.paper, Formats { pdf: true, svg: true }, None) {
            Ok(files) => {
                for f in &files {
                    if f.path.ends_with(".json") {
                        prop_assert!(serde_json::from_slice::<serde_json::Value>(&f.bytes).is_ok());
                    } else if f.path.ends_with(".svg") {
                        let svg = std::str::from_utf8(&f.bytes).unwrap();
                        prop_assert!(usvg::Tree::from_str(svg, &usvg::Options::default()).is_ok(), "{}", f.path);
                    } else {
                        prop_assert!(f.bytes.starts_with(b"%PDF-"));
                    }
                }
            }
            // A setup too large to print is refused with a message, not a panic.
            Err(e) => prop_assert!(e.to_string().contains("pages"), "{e}"),
        }
    }
}
