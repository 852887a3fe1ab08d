//! The key's small plot of crossing position against guide height
//! (spherical aberration): draws the curve the plan sampled from the exact trace.

use super::LensPlan as SheetPlan;
use crate::draw::axes::nice_step;
use crate::draw::{Words, text};
use crate::geom::Point;
use crate::scene::{Anchor, Dash, Item, MarkerShape, Rect, Stroke, Weight};

/// Plot items inside `area` (page mm). Distances on the vertical axis are
/// from the exit vertex (negative for virtual crossings, plotted as their size).
pub fn aberration_plot(plan: &SheetPlan, area: Rect, w: &Words) -> Vec<Item> {
    let mut items = Vec::new();
    // The same reference as the sheet's table: the flat face or the exit face.
    let (t, ref_words) = plan.measure_from(w);
    let top_h = plan.crossing_curve.top_height_mm;
    let pts: Vec<(f64, f64)> = plan
        .crossing_curve
        .points
        .iter()
        .map(|p| (p.height_mm, (p.crossing_from_entry_mm - t).abs()))
        .collect();
    let parax = plan.paraxial.rear_focus_x().map(|f| (f - t).abs());
    if pts.is_empty() {
        return items;
    }
    // Every guide ray's own crossing is a dot on the plot, even one beyond
    // the sampled curve (a ray outside the safe band): the axes take them in.
    let dots: Vec<(f64, f64)> = plan
        .rays
        .iter()
        .filter_map(|r| Some((r.height_mm.abs(), (r.crossing_from_entry_mm? - t).abs())))
        .filter(|&(h, d)| h > 0.0 && h.is_finite() && d.is_finite())
        .collect();
    let (mut y0, mut y1) = pts
        .iter()
        .chain(&dots)
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), p| (a.min(p.1), b.max(p.1)));
    if let Some(p) = parax {
        y0 = y0.min(p);
        y1 = y1.max(p);
    }
    let (lowest, highest) = (y0, y1);
    let ystep = nice_step(y1 - y0, 4.0);
    y0 = (y0 / ystep).floor() * ystep;
    y1 = ((y1 / ystep).ceil() * ystep).max(y0 + ystep);
    // A dot on the frame would sit on a tick number: keep a step's room.
    if lowest - y0 < 0.03 * (y1 - y0) {
        y0 -= ystep;
    }
    if y1 - highest < 0.03 * (y1 - y0) && dots.iter().any(|d| d.1 == highest) {
        y1 += ystep;
    }
    let widest = dots.iter().map(|d| d.0).fold(top_h, f64::max);
    let xstep = nice_step(widest, 4.0);
    let mut x1 = (widest / xstep).ceil() * xstep;
    if dots.iter().any(|d| x1 - d.0 < 0.03 * x1) {
        x1 += xstep;
    }
    // Inner plot box, leaving room for tick labels and titles.
    let inner = Rect {
        min: Point::new(area.min.x + 9.0, area.min.y + 8.0),
        max: Point::new(area.max.x - 2.0, area.max.y - 6.0),
    };
    let map = |h: f64, d: f64| {
        Point::new(inner.min.x + h / x1 * inner.width(), inner.min.y + (d - y0) / (y1 - y0) * inner.height())
    };
    let frame = Stroke::solid(0.2);
    items.push(Item::Box { rect: inner, fill: None, stroke: Some(frame) });
    let mut v = 0.0;
    while v <= x1 + 1e-9 {
        let p = map(v, y0);
        items.push(Item::Line { from: p, to: Point::new(p.x, p.y - 1.0), stroke: frame });
        items.push(text(
            Point::new(p.x, p.y - 3.6),
            &format!("{v:.0}"),
            6.5,
            Weight::Regular,
            Anchor::Middle,
        ));
        v += xstep;
    }
    let mut v = y0;
    while v <= y1 + 1e-9 {
        let p = map(0.0, v);
        items.push(Item::Line { from: p, to: Point::new(p.x - 1.0, p.y), stroke: frame });
        items.push(text(
            Point::new(p.x - 1.5, p.y - 0.8),
            &format!("{v:.0}"),
            6.5,
            Weight::Regular,
            Anchor::End,
        ));
        v += ystep;
    }
    if let Some(p) = parax {
        items.push(Item::Line {
            from: map(0.0, p),
            to: map(x1, p),
            stroke: Stroke::solid(0.2).gray(0.35).dashed(Dash::Dashed { on_mm: 1.5, off_mm: 1.0 }),
        });
        let at = map(x1, p);
        let below = p > (y0 + y1) / 2.0;
        let dy = if below { -2.8 } else { 1.0 };
        items.push(text(
            Point::new(at.x - 1.0, at.y + dy),
            w.say("plot_paraxial"),
            6.5,
            Weight::Regular,
            Anchor::End,
        ));
    }
    items.push(Item::Polyline {
        points: pts.iter().map(|&(h, d)| map(h, d)).collect(),
        closed: false,
        stroke: Stroke::solid(0.35),
    });
    for &(h, d) in &dots {
        items.push(Item::Marker {
            at: map(h, d),
            shape: MarkerShape::Dot,
            size_mm: 1.4,
            stroke: Stroke::solid(0.2),
        });
    }
    items.push(text(
        Point::new(inner.min.x, area.max.y - 3.5),
        w.say("plot_aberration_title"),
        7.0,
        Weight::Bold,
        Anchor::Start,
    ));
    items.push(text(
        Point::new((inner.min.x + inner.max.x) / 2.0, area.min.y + 1.0),
        w.say("plot_height_axis"),
        6.5,
        Weight::Regular,
        Anchor::Middle,
    ));
    items.push(Item::Text {
        at: Point::new(area.min.x + 1.8, (inner.min.y + inner.max.y) / 2.0),
        text: w.fill("plot_crossing_axis", &[("where", ref_words)]),
        size_pt: 6.5,
        weight: Weight::Regular,
        anchor: Anchor::Middle,
        rotate_deg: 90.0,
        gray: 0.0,
    });
    items
}

#[cfg(test)]
mod tests {
    #[test]
    fn nice_steps() {
        assert_eq!(super::nice_step(37.0, 4.0), 10.0);
        assert_eq!(super::nice_step(7.0, 4.0), 2.0);
        assert_eq!(super::nice_step(18.0, 4.0), 5.0);
    }
}
