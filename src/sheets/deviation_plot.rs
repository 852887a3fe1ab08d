//! The key's small plot of deviation δ against the angle of incidence i for
//! a prism: the plan's traced curve, this sheet's rays and the minimum.

use super::angled::AngledPlan;
use super::angled_drawing::{block_spot, fmt1, label};
use crate::draw::axes::{nice_step, tick_values};
use crate::draw::style::{SMALL_PT, VALUE_PT};
use crate::draw::{Placer, Words, text};
use crate::geom::{Point, Vec2};
use crate::scene::{Anchor, Item, MarkerShape, Rect, Stroke, Weight};

/// The key's plot of deviation δ against the angle of incidence i, inside
/// `rect` (page mm): the plan's traced curve, axes with ticks and numbers,
/// this sheet's rays marked with their letters, and the smallest deviation on
/// the curve marked and named (refined by a parabola through the three
/// samples round it). Empty when the plan has no curve (a right-angle
/// prism) or `rect` is smaller than 30 × 25 mm.
pub fn deviation_plot<F: Copy + PartialEq>(plan: &AngledPlan<F>, rect: Rect, w: &Words) -> Vec<Item> {
    let pts: Vec<(f64, f64)> =
        plan.deviation_curve.iter().copied().filter(|(i, d)| i.is_finite() && d.is_finite()).collect();
    if pts.is_empty() || rect.width() < 30.0 || rect.height() < 25.0 {
        return Vec::new();
    }
    let mut items = Vec::new();
    let fold = |f: fn(&(f64, f64)) -> f64| {
        pts.iter().map(f).fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| (a.min(v), b.max(v)))
    };
    let (mut x0, mut x1) = fold(|p| p.0);
    let (mut y0, mut y1) = fold(|p| p.1);
    let xstep = nice_step((x1 - x0).max(1.0), 5.0);
    x0 = (x0 / xstep).floor() * xstep;
    x1 = ((x1 / xstep).ceil() * xstep).max(x0 + xstep);
    let ystep = nice_step((y1 - y0).max(1.0), 4.0);
    y0 = (y0 / ystep).floor() * ystep;
    y1 = ((y1 / ystep).ceil() * ystep).max(y0 + ystep);
    let inner = Rect {
        min: Point::new(rect.min.x + 11.0, rect.min.y + 9.0),
        max: Point::new(rect.max.x - 3.0, rect.max.y - 7.0),
    };
    let map = |i: f64, d: f64| {
        Point::new(
            inner.min.x + (i - x0) / (x1 - x0) * inner.width(),
            inner.min.y + (d - y0) / (y1 - y0) * inner.height(),
        )
    };
    let frame = Stroke::solid(0.2);
    items.push(Item::Box { rect: inner, fill: None, stroke: Some(frame) });
    for v in tick_values(x0, x1, xstep) {
        let p = map(v, y0);
        items.push(Item::Line { from: p, to: Point::new(p.x, p.y - 1.0), stroke: frame });
        items.push(text(Point::new(p.x, p.y - 3.6), &fmt_tick(v), SMALL_PT, Weight::Regular, Anchor::Middle));
    }
    for v in tick_values(y0, y1, ystep) {
        let p = map(x0, v);
        items.push(Item::Line { from: p, to: Point::new(p.x - 1.0, p.y), stroke: frame });
        items.push(text(
            Point::new(p.x - 1.5, p.y - 0.8),
            &fmt_tick(v),
            SMALL_PT,
            Weight::Regular,
            Anchor::End,
        ));
    }
    let curve: Vec<Point> = pts.iter().map(|&(i, d)| map(i, d)).collect();
    let mut placer = Placer::default();
    placer.block_path(&curve);
    placer.block_path(&[
        inner.min,
        Point::new(inner.max.x, inner.min.y),
        inner.max,
        Point::new(inner.min.x, inner.max.y),
        inner.min,
    ]);
    if curve.len() >= 2 {
        items.push(Item::Polyline { points: curve, closed: false, stroke: Stroke::solid(0.35) });
    }
    // Inside the frame, clear of its border.
    let room = Rect {
        min: Point::new(inner.min.x + 0.5, inner.min.y + 0.5),
        max: Point::new(inner.max.x - 0.5, inner.max.y - 0.5),
    };
    // The minimum, refined by a parabola through the three samples round it.
    if let Some((i_min, d_min)) = curve_minimum(&pts)
        && (x0..=x1).contains(&i_min)
    {
        let at = map(i_min, d_min);
        items.push(Item::Marker { at, shape: MarkerShape::Ring, size_mm: 2.4, stroke: Stroke::solid(0.25) });
        block_spot(&mut placer, at, 1.3);
        let s = w.fill("plot_minimum", &[("deviation", &fmt1(d_min)), ("incidence", &fmt1(i_min))]);
        label(&mut items, &mut placer, &room, &s, SMALL_PT, at, Vec2::new(0.0, 1.0));
    }
    // Every ray's dot first, so no letter is placed over a later ray's dot.
    let dots: Vec<(Point, &str)> = plan
        .rays
        .iter()
        .filter_map(|r| {
            let (Ok(d), true) = (r.deviation_deg, r.path_ok) else { return None };
            ((x0..=x1).contains(&r.incidence_deg) && (y0..=y1).contains(&d))
                .then(|| (map(r.incidence_deg, d), r.letter.as_str()))
        })
        .collect();
    for &(at, _) in &dots {
        items.push(Item::Marker { at, shape: MarkerShape::Dot, size_mm: 1.4, stroke: Stroke::solid(0.2) });
        block_spot(&mut placer, at, 0.8);
    }
    for &(at, letter) in &dots {
        label(&mut items, &mut placer, &room, letter, SMALL_PT, at, Vec2::new(0.0, -1.0));
    }
    items.push(text(
        Point::new(inner.min.x, rect.max.y - 4.0),
        w.say("plot_deviation_title"),
        VALUE_PT,
        Weight::Bold,
        Anchor::Start,
    ));
    items.push(text(
        Point::new((inner.min.x + inner.max.x) / 2.0, rect.min.y + 1.2),
        w.say("plot_incidence_axis"),
        SMALL_PT,
        Weight::Regular,
        Anchor::Middle,
    ));
    items.push(Item::Text {
        at: Point::new(rect.min.x + 2.4, (inner.min.y + inner.max.y) / 2.0),
        text: w.say("plot_deviation_axis").into(),
        size_pt: SMALL_PT,
        weight: Weight::Regular,
        anchor: Anchor::Middle,
        rotate_deg: 90.0,
        gray: 0.0,
    });
    items
}

/// A tick number: whole numbers without decimals, a true minus sign.
fn fmt_tick(v: f64) -> String {
    let s = if (v - v.round()).abs() < 1e-9 { format!("{:.0}", v + 0.0) } else { format!("{v:.1}") };
    if s == "-0" { "0".into() } else { s.replace('-', "\u{2212}") }
}

/// The lowest point of a sampled curve: the vertex of the parabola through
/// the lowest sample and its neighbours, or the lowest sample itself where
/// the three points do not curve upward. `None` when the lowest sample is at
/// an end of the curve (no minimum inside it: a block's flat curve, or a
/// curve cut short) or the curve rises less than 0.05° on either side.
fn curve_minimum(pts: &[(f64, f64)]) -> Option<(f64, f64)> {
    let k = (0..pts.len()).min_by(|&a, &b| pts[a].1.total_cmp(&pts[b].1))?;
    if k == 0 || k + 1 >= pts.len() {
        return None;
    }
    let lowest = pts[k].1;
    let rises = |side: &[(f64, f64)]| side.iter().any(|p| p.1 > lowest + 0.05);
    if !(rises(&pts[..k]) && rises(&pts[k + 1..])) {
        return None;
    }
    let ((xa, ya), (xb, yb), (xc, yc)) = (pts[k - 1], pts[k], pts[k + 1]);
    // Vertex of the parabola through three points (Lagrange form).
    let den = (xa - xb) * (xa - xc) * (xb - xc);
    let a = (xc * (yb - ya) + xb * (ya - yc) + xa * (yc - yb)) / den;
    let b = (xc * xc * (ya - yb) + xb * xb * (yc - ya) + xa * xa * (yb - yc)) / den;
    let c = (xb * xc * (xb - xc) * ya + xc * xa * (xc - xa) * yb + xa * xb * (xa - xb) * yc) / den;
    if !(a.is_finite() && a > 0.0) {
        return Some(pts[k]);
    }
    let x = -b / (2.0 * a);
    if !(xa..=xc).contains(&x) {
        return Some(pts[k]);
    }
    Some((x, c - b * b / (4.0 * a)))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::optics::Prism;
    use crate::sheets::angled_drawing::tests::{block_plan, prism_plan, right_plan, texts};
    use crate::sheets::prism::{PrismEntry, minimum_deviation_deg};

    #[test]
    fn the_deviation_plot_marks_the_minimum_and_the_rays() {
        let p = Prism::new(60.0, 50.0, 1.491).unwrap();
        let plan = prism_plan(&[35.0, 45.0, 55.0, 65.0]);
        let rect = Rect::from_corners(Point::new(10.0, 10.0), Point::new(120.0, 80.0));
        let items = deviation_plot(&plan, rect, &Words::shipped());
        let t = texts(&items);
        for (s, b, size) in &t {
            assert!(*size >= 6.5);
            assert!(rect.contains(b.min) && rect.contains(b.max), "{s:?} {b:?}");
        }
        for (k, (s, b, _)) in t.iter().enumerate() {
            for (u, c, _) in &t[k + 1..] {
                assert!(!b.overlaps(c), "{s:?} overlaps {u:?}");
            }
        }
        let names: Vec<&str> = t.iter().map(|x| x.0.as_str()).collect();
        for l in ["A", "B", "C", "D"] {
            assert!(names.contains(&l), "{names:?}");
        }
        // The minimum from the sampled curve, refined by a parabola, against
        // the closed form δmin = 2·asin(n·sin(A/2)) − A (DESIGN.md).
        let (dmin, imin) = minimum_deviation_deg(&p).unwrap();
        let (i_found, d_found) = curve_minimum(&plan.deviation_curve).unwrap();
        assert!((d_found - dmin).abs() < 0.01, "{d_found} vs {dmin}");
        assert!((i_found - imin).abs() < 0.3, "{i_found} vs {imin}");
        let want = format!("minimum deviation {}° at i = {}°", fmt1(d_found), fmt1(i_found));
        assert!(names.contains(&want.as_str()), "{names:?}");
        // Right-angle prisms have no curve; a block's flat curve has no minimum inside it.
        assert!(deviation_plot(&right_plan(PrismEntry::Side, &[0.0]), rect, &Words::shipped()).is_empty());
        assert_eq!(curve_minimum(&block_plan().deviation_curve), None);
        let flat = deviation_plot(&block_plan(), rect, &Words::shipped());
        assert!(!texts(&flat).iter().any(|x| x.0.starts_with("minimum")));
    }

    #[test]
    fn a_parabolas_vertex_is_found_between_samples() {
        let pts: Vec<(f64, f64)> = (0..9).map(f64::from).map(|x| (x, (x - 3.3) * (x - 3.3) + 2.0)).collect();
        let (x, y) = curve_minimum(&pts).unwrap();
        assert!((x - 3.3).abs() < 1e-12 && (y - 2.0).abs() < 1e-12, "{x} {y}");
        assert_eq!(curve_minimum(&[]), None);
        assert_eq!(curve_minimum(&[(0.0, 1.0), (1.0, 2.0)]), None);
    }
}
