//! The hand-made scene both renderer tests draw: an A4 portrait page with one
//! of every primitive, then a US Letter page.

use std::f64::consts::{FRAC_PI_2, PI};

use raysheet::geom::{Point, Vec2};
use raysheet::scene::{Anchor, Dash, Item, MarkerShape, OutlinePart, Page, Rect, Scene, Stroke, Weight};

/// Start of the 100 mm horizontal line on both pages, mm.
pub const LINE_100_START: Point = Point::new(20.0, 250.0);
/// Start of the 50 mm vertical line on page 1, mm.
pub const LINE_50_START: Point = Point::new(150.0, 150.0);
/// The 90° arc of radius 200 mm on page 1.
pub const ARC_CENTER: Point = Point::new(5.0, 5.0);
pub const ARC_RADIUS: f64 = 200.0;

pub fn text(at: Point, s: &str, size_pt: f64, weight: Weight, anchor: Anchor, rotate_deg: f64) -> Item {
    Item::Text { at, text: s.into(), size_pt, weight, anchor, rotate_deg, gray: 0.0 }
}

/// Two pages, A4 portrait and US Letter, with one of every primitive.
pub fn test_scene() -> Scene {
    let thin = Stroke::solid(0.3);
    // A plano-convex outline: flat face at x = 60, convex face about (40, 120).
    let (dx, dy): (f64, f64) = (30.0, 20.0);
    let lens = Item::Outline {
        parts: vec![
            OutlinePart::MoveTo { to: Point::new(60.0, 140.0) },
            OutlinePart::LineTo { to: Point::new(60.0, 100.0) },
            OutlinePart::LineTo { to: Point::new(70.0, 100.0) },
            OutlinePart::ArcTo {
                center: Point::new(40.0, 120.0),
                radius_mm: dx.hypot(dy),
                start_rad: (-dy).atan2(dx),
                sweep_rad: 2.0 * dy.atan2(dx),
            },
        ],
        fill: Some(0.9),
        stroke: Stroke::solid(0.25),
    };
    let a4 = Page {
        width_mm: 210.0,
        height_mm: 297.0,
        name: "sheet-01".into(),
        items: vec![
            // 100 mm across, 47 mm below the top edge.
            Item::Line { from: LINE_100_START, to: LINE_100_START + Vec2::new(100.0, 0.0), stroke: thin },
            Item::Line { from: LINE_50_START, to: LINE_50_START + Vec2::new(0.0, 50.0), stroke: thin },
            // Solid: the SVG test reads its pixels halfway along.
            Item::Arc {
                center: ARC_CENTER,
                radius_mm: ARC_RADIUS,
                start_rad: 0.0,
                sweep_rad: FRAC_PI_2,
                stroke: Stroke::solid(0.5),
            },
            // A dashed full circle.
            Item::Arc {
                center: Point::new(40.0, 40.0),
                radius_mm: 10.0,
                start_rad: 0.0,
                sweep_rad: 2.0 * PI,
                stroke: thin.dashed(Dash::Dashed { on_mm: 2.0, off_mm: 1.0 }),
            },
            lens,
            Item::Polyline {
                points: vec![Point::new(80.0, 30.0), Point::new(90.0, 40.0), Point::new(100.0, 30.0)],
                closed: true,
                stroke: thin.dashed(Dash::DashDot { long_mm: 6.0, short_mm: 1.0, gap_mm: 1.0 }),
            },
            Item::Marker {
                at: Point::new(30.0, 60.0),
                shape: MarkerShape::Cross,
                size_mm: 4.0,
                stroke: thin,
            },
            Item::Marker {
                at: Point::new(40.0, 60.0),
                shape: MarkerShape::Saltire,
                size_mm: 4.0,
                stroke: thin,
            },
            Item::Marker { at: Point::new(50.0, 60.0), shape: MarkerShape::Dot, size_mm: 2.0, stroke: thin },
            Item::Marker { at: Point::new(60.0, 60.0), shape: MarkerShape::Ring, size_mm: 3.0, stroke: thin },
            Item::Arrowhead {
                tip: Point::new(130.0, 250.0),
                dir: Vec2::new(1.0, 0.0),
                length_mm: 3.0,
                width_mm: 2.0,
                gray: 0.0,
            },
            Item::Box {
                rect: Rect::from_corners(Point::new(20.0, 215.0), Point::new(90.0, 230.0)),
                fill: Some(0.95),
                stroke: Some(Stroke::solid(0.2).gray(0.4)),
            },
            text(Point::new(20.0, 270.0), "θ₁ → n = 1.49", 10.0, Weight::Regular, Anchor::Start, 0.0),
            text(Point::new(105.0, 282.0), "Ærø Ångström", 12.0, Weight::Bold, Anchor::Middle, 0.0),
            text(Point::new(195.0, 150.0), "optical axis", 8.0, Weight::Regular, Anchor::End, 90.0),
            Item::Group {
                clip: Rect::from_corners(Point::new(120.0, 60.0), Point::new(190.0, 120.0)),
                offset: Vec2::new(5.0, 5.0),
                items: vec![
                    Item::Line { from: Point::new(100.0, 80.0), to: Point::new(200.0, 80.0), stroke: thin },
                    Item::Marker {
                        at: Point::new(150.0, 80.0),
                        shape: MarkerShape::Ring,
                        size_mm: 5.0,
                        stroke: thin,
                    },
                ],
            },
        ],
    };
    let letter = Page {
        width_mm: 215.9,
        height_mm: 279.4,
        name: "sheet-02".into(),
        items: vec![
            Item::Line { from: LINE_100_START, to: LINE_100_START + Vec2::new(100.0, 0.0), stroke: thin },
            text(Point::new(20.0, 240.0), "n = 1.49", 10.0, Weight::Regular, Anchor::Start, 0.0),
        ],
    };
    Scene { title: "Curved face — test sheet".into(), pages: vec![a4, letter] }
}
