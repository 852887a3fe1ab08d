//! The printer-check page: a 180 mm ruler along the paper's long edge and a
//! 120 mm ruler along its short edge, meeting at their zeros in an L (it fits
//! A5 and up with 10 mm margins), millimetre ticks, every 5 mm longer, every
//! 10 mm numbered, and what to do with the readings.

use crate::draw::{Words, leading, text, wrap};
use crate::geom::Point;
use crate::paper::{LONG_RULER_MM, Orientation, PaperSpec, SHORT_RULER_MM};
use crate::scene::{Anchor, Item, Page, Scene, Stroke, Weight};

/// Where the rulers' common zero sits, mm from the page's bottom left corner
/// (inside 10 mm margins with room for the numbers and names below and left).
const ZERO: (f64, f64) = (15.0, 19.0);

/// The calibration page on `paper`, portrait (the long ruler up the page).
pub fn calibration_scene(paper: &PaperSpec, w: &Words) -> Scene {
    let portrait = PaperSpec { orientation: Orientation::Portrait, ..paper.clone() };
    let (pw, ph) = portrait.page_mm();
    let (x0, y0) = ZERO;
    let mut items = Vec::new();
    let bar = Stroke::solid(0.3);
    let tick = Stroke::solid(0.15);
    // The long ruler, up the page; ticks to its right.
    items.push(Item::Line { from: Point::new(x0, y0), to: Point::new(x0, y0 + LONG_RULER_MM), stroke: bar });
    // The short ruler, across the page; ticks above it.
    items.push(Item::Line { from: Point::new(x0, y0), to: Point::new(x0 + SHORT_RULER_MM, y0), stroke: bar });
    let len = |k: u32| {
        if k % 10 == 0 {
            5.0
        } else if k % 5 == 0 {
            3.0
        } else {
            1.5
        }
    };
    for k in 0..=(LONG_RULER_MM as u32) {
        let y = y0 + f64::from(k);
        items.push(Item::Line { from: Point::new(x0, y), to: Point::new(x0 + len(k), y), stroke: tick });
        if k % 10 == 0 && k > 0 {
            items.push(text(
                Point::new(x0 + 6.0, y - 1.0),
                &k.to_string(),
                7.0,
                Weight::Regular,
                Anchor::Start,
            ));
        }
    }
    for k in 0..=(SHORT_RULER_MM as u32) {
        let x = x0 + f64::from(k);
        items.push(Item::Line { from: Point::new(x, y0), to: Point::new(x, y0 + len(k)), stroke: tick });
        if k % 10 == 0 && k > 0 {
            items.push(text(Point::new(x, y0 - 3.2), &k.to_string(), 7.0, Weight::Regular, Anchor::Middle));
        }
    }
    items.push(text(Point::new(x0 - 1.0, y0 - 3.2), "0", 7.0, Weight::Regular, Anchor::End));
    let n = |v: f64| format!("{v:.0}");
    items.push(Item::Text {
        at: Point::new(x0 - 2.5, y0 + LONG_RULER_MM / 2.0),
        text: w.fill("calibrate_long", &[("length", &n(LONG_RULER_MM))]),
        size_pt: 8.0,
        weight: Weight::Bold,
        anchor: Anchor::Middle,
        rotate_deg: 90.0,
        gray: 0.0,
    });
    items.push(text(
        Point::new(x0 + SHORT_RULER_MM / 2.0, y0 - 7.3),
        &w.fill("calibrate_short", &[("length", &n(SHORT_RULER_MM))]),
        8.0,
        Weight::Bold,
        Anchor::Middle,
    ));
    // The heading and the steps, inside the L, right of the long ruler's numbers.
    let left = x0 + 16.0;
    let room = pw - paper.margin_mm - left;
    let mut y = (y0 + LONG_RULER_MM).min(ph - paper.margin_mm) - 4.0;
    for l in wrap(w.say("calibrate_title"), 11.0, Weight::Bold, room) {
        items.push(text(Point::new(left, y), &l, 11.0, Weight::Bold, Anchor::Start));
        y -= leading(11.0);
    }
    y -= 2.0;
    let steps = [
        w.say("calibrate_step_1"),
        w.say("calibrate_step_2"),
        w.say("calibrate_step_3"),
        w.say("calibrate_step_4"),
        w.say("calibrate_step_5"),
    ];
    for step in steps {
        for l in wrap(step, 8.5, Weight::Regular, room) {
            items.push(text(Point::new(left, y), &l, 8.5, Weight::Regular, Anchor::Start));
            y -= leading(8.5);
        }
        y -= 1.5;
    }
    Scene {
        title: w.say("calibrate_title").to_string(),
        pages: vec![Page { width_mm: pw, height_mm: ph, name: "calibration".into(), items }],
    }
}
