//! A half-disc's curved face is drawn on the side the rays meet it.
//!
//! Regression (issue 9, found by the layout check on A4 portrait): the lens
//! sheets rebuilt each face's arc "the short way" between its two ends, which
//! is ambiguous for a 180° face; for some radii (30.8 mm among them) rounding
//! chose the other half, so the student sheet showed the half-disc mirrored,
//! with its curved face toward the ray box, while the traced rays (and the
//! key's answers) had it on the far side. The outline is now drawn from the
//! traced shape's own edges.

use raysheet::geom::Point;
use raysheet::scene::{Item, OutlinePart, Rect};
use raysheet::sheets::{Lesson, plan_lesson};

/// Every arc part of the drawn outline: the point halfway along it.
fn arc_midpoints(items: &[Item]) -> Vec<Point> {
    let mut out = Vec::new();
    for item in items {
        if let Item::Outline { parts, .. } = item {
            for p in parts {
                if let OutlinePart::ArcTo { center, radius_mm, start_rad, sweep_rad } = p {
                    let t = start_rad + sweep_rad / 2.0;
                    out.push(Point::new(center.x + radius_mm * t.cos(), center.y + radius_mm * t.sin()));
                }
            }
        }
    }
    out
}

#[test]
fn half_disc_curved_face_drawn_mirrored() {
    let words = raysheet::layout::Templates::shipped().unwrap().words;
    // Radii 10.0 to 60.0 mm in 0.1 mm steps, each a full half-disc (thickness
    // R, height 2R), read flat face first and curved face first.
    for tenth in 100..=600 {
        let r = f64::from(tenth) / 10.0;
        for (front, back, enter) in [
            ("\"flat\"".to_string(), format!("{{ curve = \"convex\", radius_mm = {r} }}"), "front"),
            (format!("{{ curve = \"convex\", radius_mm = {r} }}"), "\"flat\"".to_string(), "back"),
        ] {
            let kit = format!(
                "[materials.m]\nindex = 1.45\n[[pieces]]\nid = \"p\"\nmaterial = \"m\"\nfront = {front}\nback = {back}\n\
                 thickness_mm = {r}\nheight_mm = {}\n[[sheets]]\nkind = \"curved-face\"\npiece = \"p\"\nenter = \"{enter}\"\n",
                2.0 * r
            );
            let lesson = Lesson::from_toml(&kit, "half-disc.toml").unwrap();
            let plan = &plan_lesson(&lesson, &lesson.paper)[0];
            let big = Rect { min: Point::new(-1e4, -1e4), max: Point::new(1e4, 1e4) };
            let d = plan.view().student(big, &words);
            let mids = arc_midpoints(&d.items);
            assert_eq!(mids.len(), 1, "R {r}: one curved face");
            // The sheet frame puts the entry face's vertex at x = 0 and the
            // exit face's at x = thickness (DESIGN.md, sign conventions): read
            // flat face first, the curved face is the exit face.
            let m = mids[0];
            assert!(m.y.abs() < 1e-6, "R {r}: the arc's middle is on the axis: {m:?}");
            assert!(
                (m.x - r).abs() < 1e-6,
                "R {r}, enter {enter}: the curved face's vertex is drawn at x = {}",
                m.x
            );
        }
    }
}
