//! A protractor-like scale of angle ticks round a point, counted from a normal
//! both ways: a tick every degree, a longer one every 5°, a number every 10°.

use super::labels::Placer;
use super::text::{text, text_box};
use crate::geom::{Point, Vec2};
use crate::scene::{Anchor, Item, Rect, Stroke, Weight};

/// Where a scale goes and what it covers.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct AngleScale {
    /// The point the angles are read at (where the rays meet the face).
    pub center: Point,
    /// Direction of 0°: the normal, pointing to the side the scale is on.
    /// Need not be unit length; a zero vector gives an empty scale.
    pub zero: Vec2,
    /// Distance from the centre to the inner end of every tick, mm.
    pub radius_mm: f64,
    /// Lowest angle shown, degrees counterclockwise from `zero` (negative: clockwise).
    pub from_deg: f64,
    /// Highest angle shown, degrees counterclockwise from `zero`.
    pub to_deg: f64,
}

/// How long a tick is.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum TickSize {
    /// A whole degree.
    Degree,
    /// A multiple of 5°.
    Five,
    /// A multiple of 10° (numbered).
    Ten,
}

impl TickSize {
    /// Length of the tick, mm.
    pub fn length_mm(self) -> f64 {
        match self {
            TickSize::Degree => 1.3,
            TickSize::Five => 2.3,
            TickSize::Ten => 3.3,
        }
    }

    /// Line width, mm.
    fn width_mm(self) -> f64 {
        match self {
            TickSize::Degree => 0.12,
            TickSize::Five | TickSize::Ten => 0.18,
        }
    }
}

/// One tick of a scale.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Tick {
    /// Its angle, whole degrees counterclockwise from the scale's zero.
    pub angle_deg: i32,
    /// Its size.
    pub size: TickSize,
    /// End nearer the centre.
    pub inner: Point,
    /// End farther from the centre.
    pub outer: Point,
}

/// One number of a scale.
#[derive(Clone, Debug, PartialEq)]
pub struct ScaleNumber {
    /// The angle it stands for, degrees counterclockwise from the scale's zero.
    pub angle_deg: i32,
    /// What it says: the size of the angle from the normal, unsigned (a
    /// protractor counts up both ways from its zero).
    pub text: String,
    /// Where the middle of its box goes: just beyond its tick, on the tick's line.
    pub center: Point,
    /// Unit direction from the scale's centre through the tick.
    pub radial: Vec2,
}

/// What [`angle_ticks`] makes: the ticks, and the numbers still to be placed.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct AngleTicks {
    /// Every tick, in order of angle.
    pub ticks: Vec<Tick>,
    /// One number for each tick at a multiple of 10°, in order of angle.
    pub numbers: Vec<ScaleNumber>,
}

/// Size of a scale's numbers, pt (the smallest text the sheets print).
pub const NUMBER_PT: f64 = 6.5;
/// Gap between the longest tick's end and a number's box, mm.
const NUMBER_GAP_MM: f64 = 0.6;

/// The scale's ticks at every whole degree from `from_deg` to `to_deg`
/// (rounded inward), each starting `radius_mm` from the centre and pointing
/// away from it, longer every 5° and 10°; and a number at every multiple of
/// 10°, its box centred on the tick's line just beyond the tick. A scale from
/// −80° to +80° has 161 ticks and 17 numbers. Returns an empty scale for a
/// zero direction, a radius that is not finite and positive, or an empty range.
pub fn angle_ticks(scale: &AngleScale) -> AngleTicks {
    let mut out = AngleTicks::default();
    let Some(zero) = scale.zero.normalized() else { return out };
    if !(scale.radius_mm.is_finite() && scale.radius_mm > 0.0) {
        return out;
    }
    let (lo, hi) = (scale.from_deg.ceil(), scale.to_deg.floor());
    if !(lo.is_finite() && hi.is_finite()) || lo > hi || hi - lo > 360.0 {
        return out;
    }
    let a0 = zero.angle_rad();
    let mut a = lo;
    while a <= hi {
        // `a` is a whole number of degrees within ±360.
        #[expect(clippy::cast_possible_truncation, reason = "a whole number within ±360")]
        let deg = a as i32;
        let size = if deg % 10 == 0 {
            TickSize::Ten
        } else if deg % 5 == 0 {
            TickSize::Five
        } else {
            TickSize::Degree
        };
        let u = Vec2::from_angle(a0 + a.to_radians());
        let inner = scale.center + u * scale.radius_mm;
        out.ticks.push(Tick { angle_deg: deg, size, inner, outer: inner + u * size.length_mm() });
        if size == TickSize::Ten {
            let label = deg.unsigned_abs().to_string();
            let b = text_box(Point::new(0.0, 0.0), &label, NUMBER_PT, Weight::Regular, Anchor::Middle);
            // Half the box's extent along u, so its nearest side keeps the gap.
            let reach = u.x.abs() * b.width() / 2.0 + u.y.abs() * b.height() / 2.0;
            let r = scale.radius_mm + TickSize::Ten.length_mm() + NUMBER_GAP_MM + reach;
            out.numbers.push(ScaleNumber {
                angle_deg: deg,
                text: label,
                center: scale.center + u * r,
                radial: u,
            });
        }
        a += 1.0;
    }
    out
}

impl AngleTicks {
    /// The ticks as lines.
    pub fn tick_items(&self) -> Vec<Item> {
        self.ticks
            .iter()
            .map(|t| Item::Line { from: t.inner, to: t.outer, stroke: Stroke::solid(t.size.width_mm()) })
            .collect()
    }

    /// Marks every tick as taken, so labels keep off the scale.
    pub fn block_ticks(&self, placer: &mut Placer) {
        for t in &self.ticks {
            placer.block_line(t.inner, t.outer);
        }
    }

    /// Places each number where it is meant to go if that is free and inside
    /// `bounds`; otherwise beside that spot, a little along the scale either
    /// way, or twice as far; then the same a step further out along its
    /// tick's line, up to three steps (guide lines running through the
    /// number's place, which spread apart outward); failing all, the number is
    /// left out, never drawn over a line or a label.
    pub fn place_numbers(&self, placer: &mut Placer, bounds: &Rect) -> Vec<Item> {
        let mut items = Vec::new();
        for n in &self.numbers {
            let b = text_box(Point::new(0.0, 0.0), &n.text, NUMBER_PT, Weight::Regular, Anchor::Middle);
            let mid_y = (b.min.y + b.max.y) / 2.0;
            // Aside far enough that the box clears the tick's line by 0.8 mm.
            let along = n.radial.perp();
            let shift = along.x.abs() * b.width() / 2.0 + along.y.abs() * b.height() / 2.0 + 0.8;
            // Further aside, or further out (and aside there), where guides lie
            // close together: rays through the centre spread apart outward.
            let out = n.radial * (b.width().max(b.height()) + 0.5);
            let centers: Vec<Point> = (0..4)
                .flat_map(|k| {
                    let base = n.center + out * f64::from(k);
                    [0.0, 1.0, -1.0, 2.0, -2.0].map(|a| base + along * (a * shift))
                })
                .collect();
            let boxes: Vec<Rect> = centers
                .iter()
                .map(|c| Rect {
                    min: Point::new(c.x + b.min.x, c.y - b.height() / 2.0),
                    max: Point::new(c.x + b.max.x, c.y + b.height() / 2.0),
                })
                .collect();
            if let Some(k) = placer.try_choose(&boxes, bounds) {
                let c = centers[k];
                items.push(text(
                    Point::new(c.x, c.y - mid_y),
                    &n.text,
                    NUMBER_PT,
                    Weight::Regular,
                    Anchor::Middle,
                ));
            }
        }
        items
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geom::testutil::assert_close;

    fn scale(from: f64, to: f64) -> AngleScale {
        AngleScale {
            center: Point::new(3.0, -2.0),
            zero: Vec2::new(-1.0, 0.0),
            radius_mm: 30.0,
            from_deg: from,
            to_deg: to,
        }
    }

    #[test]
    fn eighty_degrees_each_way_gives_161_ticks_and_17_numbers() {
        let f = angle_ticks(&scale(-80.0, 80.0));
        assert_eq!(f.ticks.len(), 161);
        assert_eq!(f.ticks.iter().filter(|t| t.size == TickSize::Ten).count(), 17);
        assert_eq!(f.ticks.iter().filter(|t| t.size == TickSize::Five).count(), 16);
        let texts: Vec<&str> = f.numbers.iter().map(|n| n.text.as_str()).collect();
        assert_eq!(
            texts,
            [
                "80", "70", "60", "50", "40", "30", "20", "10", "0", "10", "20", "30", "40", "50", "60",
                "70", "80"
            ]
        );
        // Every tick starts on the circle and points straight away from the centre.
        for t in &f.ticks {
            assert_close(t.inner.distance(Point::new(3.0, -2.0)), 30.0, 1e-9);
            assert_close(t.outer.distance(t.inner), t.size.length_mm(), 1e-9);
            assert_close((t.inner - Point::new(3.0, -2.0)).cross(t.outer - t.inner), 0.0, 1e-9);
        }
    }

    #[test]
    fn a_ten_degree_number_sits_on_its_tick_line_beyond_the_tick() {
        let f = angle_ticks(&scale(-80.0, 80.0));
        let c = Point::new(3.0, -2.0);
        let n = f.numbers.iter().find(|n| n.angle_deg == 30).unwrap();
        // 30° counterclockwise from −x points down and to the left: 210° from +x.
        assert_close((n.center - c).angle_rad().to_degrees(), -150.0, 1e-9);
        let n = f.numbers.iter().find(|n| n.angle_deg == -10).unwrap();
        assert_eq!(n.text, "10");
        assert_close((n.center - c).angle_rad().to_degrees(), 170.0, 1e-9);
        assert!(n.center.distance(c) > 30.0 + TickSize::Ten.length_mm());
    }

    #[test]
    fn ranges_round_inward_and_odd_input_gives_an_empty_scale() {
        assert_eq!(angle_ticks(&scale(-20.5, 20.5)).ticks.len(), 41);
        assert_eq!(angle_ticks(&scale(3.2, 3.7)).ticks.len(), 0);
        let mut s = scale(-10.0, 10.0);
        s.zero = Vec2::new(0.0, 0.0);
        assert_eq!(angle_ticks(&s), AngleTicks::default());
        let mut s = scale(-10.0, 10.0);
        s.radius_mm = f64::NAN;
        assert_eq!(angle_ticks(&s), AngleTicks::default());
        assert_eq!(angle_ticks(&scale(f64::NEG_INFINITY, 0.0)), AngleTicks::default());
    }

    #[test]
    fn a_number_with_a_line_through_it_moves_aside_or_is_left_out() {
        let f = angle_ticks(&scale(-30.0, 30.0));
        let mut p = Placer::default();
        f.block_ticks(&mut p);
        // A guide line along the 0° tick, out past the numbers.
        let c = Point::new(3.0, -2.0);
        p.block_line(c, c + Vec2::new(-60.0, 0.0));
        let bounds = Rect::from_corners(Point::new(-100.0, -100.0), Point::new(100.0, 100.0));
        let items = f.place_numbers(&mut p, &bounds);
        assert_eq!(items.len(), 7);
        let zero = items
            .iter()
            .find_map(|i| match i {
                Item::Text { at, text, .. } if text == "0" => Some(*at),
                _ => None,
            })
            .unwrap();
        // Moved along the scale, off the line y = −2.
        let b = text_box(zero, "0", NUMBER_PT, Weight::Regular, Anchor::Middle);
        assert!(b.min.y > -2.0 || b.max.y < -2.0, "{b:?}");
        // No number touches a tick or another number.
        for (k, a) in p.boxes().iter().enumerate() {
            assert!(p.boxes()[k + 1..].iter().all(|o| !a.overlaps(o)));
            assert!(f.ticks.iter().all(|t| {
                let mut q = Placer::default();
                q.block_line(t.inner, t.outer);
                q.is_free(a, 0.0)
            }));
        }
    }
}
