//! Coloured rays on keys: each colour of the ray box gets a paint (sRGB, with
//! luminances set apart so a greyscale copy keeps them apart), a dash pattern
//! of its own (unlike any construction line's) and its initial at both ends of
//! its rays, so a black-and-white copy stays readable.

use super::Drawing;
use super::labels::{clip_segment, place_near};
use super::style::{RAY_W, VALUE_PT};
use crate::geom::{Point, Vec2};
use crate::scene::{Dash, Item, Paint, Rect, Stroke};

/// How one colour's rays are drawn.
#[derive(Clone, Debug, PartialEq)]
pub struct ColourStyle {
    /// The stroke's paint.
    pub paint: Paint,
    /// Its dash pattern.
    pub dash: Dash,
    /// The letter printed at both ends of its rays.
    pub initial: String,
}

impl ColourStyle {
    /// The stroke of this colour's rays.
    pub fn stroke(&self) -> Stroke {
        Stroke::solid(RAY_W).paint(self.paint).dashed(self.dash)
    }
}

/// Relative luminance of linear-light sRGB components: Y = 0.2126 R +
/// 0.7152 G + 0.0722 B (IEC 61966-2-1, the ITU-R BT.709 primaries).
pub fn luminance(linear: [f64; 3]) -> f64 {
    0.2126 * linear[0] + 0.7152 * linear[1] + 0.0722 * linear[2]
}

/// The sRGB transfer function (IEC 61966-2-1): linear light 0–1 to the
/// encoded 0–255.
fn encode(v: f64) -> u8 {
    let v = v.clamp(0.0, 1.0);
    let e = if v <= 0.003_130_8 { 12.92 * v } else { 1.055 * v.powf(1.0 / 2.4) - 0.055 };
    #[expect(clippy::cast_possible_truncation, clippy::cast_sign_loss, reason = "rounded value in 0..=255")]
    let b = (e * 255.0).round() as u8;
    b
}

/// The sRGB decoding (IEC 61966-2-1): encoded 0–255 to linear light 0–1.
pub fn decode(v: u8) -> f64 {
    let e = f64::from(v) / 255.0;
    if e <= 0.040_45 { e / 12.92 } else { ((e + 0.055) / 1.055).powf(2.4) }
}

/// A hue for a wavelength, linear light, brightest component 1: a
/// piecewise-linear walk violet → blue → green → yellow → red through anchor
/// hues of our own choosing (a printed key needs a recognisable hue, not a
/// colorimetric match; common practice, no source).
fn hue(wavelength_nm: f64) -> [f64; 3] {
    const ANCHORS: [(f64, [f64; 3]); 9] = [
        (380.0, [0.5, 0.0, 1.0]),
        (450.0, [0.0, 0.0, 1.0]),
        (490.0, [0.0, 0.3, 1.0]),
        (520.0, [0.0, 1.0, 0.1]),
        (560.0, [0.5, 1.0, 0.0]),
        (585.0, [1.0, 0.8, 0.0]),
        (620.0, [1.0, 0.2, 0.0]),
        (650.0, [1.0, 0.0, 0.0]),
        (780.0, [1.0, 0.0, 0.0]),
    ];
    let l = wavelength_nm.clamp(ANCHORS[0].0, ANCHORS[ANCHORS.len() - 1].0);
    for w in ANCHORS.windows(2) {
        let ((a, ca), (b, cb)) = (w[0], w[1]);
        if l <= b {
            let t = (l - a) / (b - a);
            return [0, 1, 2].map(|k| ca[k] + t * (cb[k] - ca[k]));
        }
    }
    ANCHORS[ANCHORS.len() - 1].1
}

/// Darkest and lightest luminance a coloured ray gets: dark enough to print
/// on white, apart enough to tell in grey (our choice, common practice).
pub const LUMINANCE_RANGE: (f64, f64) = (0.05, 0.40);

/// The styles of a ray box's colours, in the order given: each colour's hue
/// from its wavelength, its luminance set to one of evenly spaced steps in
/// [`LUMINANCE_RANGE`] (the colour whose hue is darkest gets the darkest
/// step, so hues change least), and dash pattern `k` for the `k`-th colour: a
/// 3 mm dash followed by k + 2 short dashes (construction lines use one or
/// no short dash).
pub fn colour_styles(colours: &[(f64, String)]) -> Vec<ColourStyle> {
    let hues: Vec<[f64; 3]> = colours.iter().map(|(l, _)| hue(*l)).collect();
    let mut order: Vec<usize> = (0..colours.len()).collect();
    order.sort_by(|&a, &b| {
        luminance(hues[a]).total_cmp(&luminance(hues[b])).then(colours[a].0.total_cmp(&colours[b].0))
    });
    let (lo, hi) = LUMINANCE_RANGE;
    let steps = colours.len().saturating_sub(1).max(1) as f64;
    let mut targets = vec![lo; colours.len()];
    for (rank, &i) in order.iter().enumerate() {
        targets[i] = if colours.len() == 1 { (lo + hi) / 2.0 } else { lo + (hi - lo) * rank as f64 / steps };
    }
    colours
        .iter()
        .enumerate()
        .map(|(k, (_, name))| {
            let c = hues[k];
            let y0 = luminance(c);
            let t = targets[k];
            let lin = if t <= y0 {
                c.map(|v| v * t / y0)
            } else {
                let m = (t - y0) / (1.0 - y0);
                c.map(|v| v + m * (1.0 - v))
            };
            ColourStyle {
                paint: Paint::Rgb(lin.map(encode)),
                dash: Dash::Beads {
                    dash_mm: 3.0,
                    bead_mm: 0.6,
                    gap_mm: 0.8,
                    beads: u8::try_from(k + 2).unwrap_or(u8::MAX),
                },
                initial: name.chars().next().map(|c| c.to_uppercase().collect()).unwrap_or_default(),
            }
        })
        .collect()
}

/// One colour's ray to draw: its style and its points (sheet frame).
#[derive(Clone, Debug, PartialEq)]
pub struct ColourPath<'a> {
    /// How it is drawn.
    pub style: &'a ColourStyle,
    /// The path, first point where it parts from the other colours.
    pub points: Vec<Point>,
}

/// Marks the parts of `paths` inside `bounds` as taken for labels, so labels
/// placed before the paths are drawn (the kind's own key labels) keep off
/// them too: near the critical angle the colours of one ray part by
/// degrees, far from the white ray the kind's labels sit beside.
pub fn keep_labels_off(d: &mut Drawing, bounds: &Rect, paths: &[ColourPath]) {
    for p in paths {
        if let Some(shown) = inside(&p.points, bounds) {
            d.placer.block_soft_path(&shown);
        }
    }
}

/// Draws coloured paths on a key and puts each colour's initial near both ends
/// of its ray (the ends inside `bounds`), where the placer finds room. The
/// paths keep other labels off.
pub fn colour_paths(d: &mut Drawing, bounds: &Rect, paths: &[ColourPath]) -> Vec<Item> {
    let mut items = Vec::new();
    let mut ends = Vec::new();
    for p in paths {
        let Some(shown) = inside(&p.points, bounds) else { continue };
        d.placer.block_soft_path(&shown);
        items.push(Item::Polyline { points: shown.clone(), closed: false, stroke: p.style.stroke() });
        ends.push((p.style, shown));
    }
    // The far ends first: there the colours have parted most. Where the end
    // is taken, the initial goes further back along the last segment; at the
    // start, further along the first.
    for (style, pts) in &ends {
        let n = pts.len();
        let (a, b) = (pts[n - 2], pts[n - 1]);
        let u = (b - a).normalized().unwrap_or(Vec2::new(1.0, 0.0));
        let reach = 0.6 * a.distance(b);
        let spots: Vec<Point> = (0..40)
            .map(|k| 3.0 * f64::from(k))
            .filter(|back| *back < reach)
            .map(|back| b - u * back)
            .collect();
        items.extend(initial_at(d, bounds, &style.initial, &spots, u));
    }
    for (style, pts) in &ends {
        // A short first stretch (the colours' few millimetres inside a lens
        // before its exit face) has no room for initials beside it: they go
        // on the next, longer stretch, just past the face, without leaders.
        let first =
            usize::from(pts.len() > 2 && pts[0].distance(pts[1]) < SHORT_FIRST * pts[1].distance(pts[2]));
        let (a, b) = (pts[first], pts[first + 1]);
        let u = (b - a).normalized().unwrap_or(Vec2::new(1.0, 0.0));
        // Where several rays part from one point (a protractor's centre), an
        // initial right at it could belong to any of them: start it where
        // this ray is at least FAN_APART_MM from the others, or half way.
        let len = a.distance(b);
        let (from, reach) = match fan_start_mm(&ends, a, u) {
            Some(f) => (f.min(0.5 * len), 0.75 * len),
            None => (3.0, 0.4 * len),
        };
        let spots: Vec<Point> = (0..40)
            .map(|k| from + 3.0 * f64::from(k))
            .filter(|on| *on < reach)
            .map(|on| a + u * on)
            .collect();
        items.extend(initial_at(d, bounds, &style.initial, &spots, -u));
    }
    items
}

/// A coloured path's first stretch shorter than this fraction of its second
/// carries no initial: the initial goes on the second.
const SHORT_FIRST: f64 = 0.5;

/// How far apart, across, rays that part from one point are where their
/// colours' initials start, mm.
const FAN_APART_MM: f64 = 8.0;

/// Distance along a path starting at `a` in direction `u` at which it is
/// [`FAN_APART_MM`] from every other ray starting at the same point (other
/// rays: directions more than 1° apart; the colours of one ray part by less);
/// `None` when no other ray starts there.
fn fan_start_mm(ends: &[(&ColourStyle, Vec<Point>)], a: Point, u: Vec2) -> Option<f64> {
    let min_sin = ends
        .iter()
        .filter(|(_, p)| p.len() >= 2 && p[0].distance(a) < 0.5)
        .filter_map(|(_, p)| (p[1] - p[0]).normalized())
        // Past 90° apart a ray is as far from this one as from their start.
        .map(|v| if u.dot(v) < 0.0 { 1.0 } else { u.cross(v).abs() })
        .filter(|s| *s > 1f64.to_radians().sin())
        .fold(f64::INFINITY, f64::min);
    min_sin.is_finite().then(|| (FAN_APART_MM / min_sin).max(3.0))
}

/// An initial near the first of `spots` where the placer finds room (its
/// leader-free standoffs only), else near the first spot wherever it can.
fn initial_at(d: &mut Drawing, bounds: &Rect, initial: &str, spots: &[Point], prefer: Vec2) -> Vec<Item> {
    for p in spots {
        let mut trial = d.placer.clone();
        if let Some(items) = place_near(&mut trial, bounds, initial, VALUE_PT, *p, prefer)
            && !items.iter().any(|i| matches!(i, Item::Line { .. }))
        {
            d.placer = trial;
            return items;
        }
    }
    spots
        .first()
        .and_then(|p| place_near(&mut d.placer, bounds, initial, VALUE_PT, *p, prefer))
        .unwrap_or_default()
}

/// Length of a legend's stroke sample, mm.
const SAMPLE_MM: f64 = 14.0;

/// A legend: per row a sample of a colour's stroke (if any), then its text
/// (a colour's initial, name, wavelength and index; the index's source), placed in the first free
/// corner of `bounds` (then along its top and bottom edges); `None` when no
/// place is free.
pub fn legend(d: &mut Drawing, bounds: &Rect, rows: &[(Option<&ColourStyle>, String)]) -> Option<Vec<Item>> {
    use super::text::{leading, text, text_box};
    use crate::scene::{Anchor, Weight};
    let step = leading(VALUE_PT);
    let text_w = rows
        .iter()
        .map(|(_, r)| text_box(Point::new(0.0, 0.0), r, VALUE_PT, Weight::Regular, Anchor::Start).width())
        .fold(0.0, f64::max);
    let sample = if rows.iter().any(|r| r.0.is_some()) { SAMPLE_MM + 1.5 } else { 0.0 };
    let (w, h) = (sample + text_w, step * rows.len() as f64);
    let inset = 1.0;
    let (x0, x1) = (bounds.min.x + inset, bounds.max.x - inset - w);
    let (y0, y1) = (bounds.min.y + inset, bounds.max.y - inset - h);
    let mut corners = vec![Point::new(x0, y1), Point::new(x1, y1), Point::new(x0, y0), Point::new(x1, y0)];
    for k in 1..8 {
        let x = x0 + (x1 - x0) * f64::from(k) / 8.0;
        corners.push(Point::new(x, y1));
        corners.push(Point::new(x, y0));
    }
    let boxes: Vec<Rect> = corners.iter().map(|c| Rect::from_corners(*c, *c + Vec2::new(w, h))).collect();
    let pick = d.placer.try_choose(&boxes, bounds)?;
    let b = boxes[pick];
    let mut items = Vec::new();
    for (k, (style, row)) in rows.iter().enumerate() {
        let base = b.max.y - step * (k as f64 + 1.0) + 0.3 * step;
        let mid = base + 0.3 * VALUE_PT * crate::scene::MM_PER_PT;
        if let Some(style) = style {
            items.push(Item::Line {
                from: Point::new(b.min.x, mid),
                to: Point::new(b.min.x + SAMPLE_MM, mid),
                stroke: style.stroke(),
            });
        }
        items.push(text(Point::new(b.min.x + sample, base), row, VALUE_PT, Weight::Regular, Anchor::Start));
    }
    Some(items)
}

/// The part of a path inside `r`: from its first point inside to where it
/// first leaves; `None` when less than a segment is inside.
fn inside(points: &[Point], r: &Rect) -> Option<Vec<Point>> {
    let mut out: Vec<Point> = Vec::new();
    for w in points.windows(2) {
        match clip_segment(w[0], w[1], r) {
            Some((a, b)) => {
                if out.is_empty() {
                    out.push(a);
                }
                out.push(b);
                if b.distance(w[1]) > 1e-9 {
                    break;
                }
            }
            None if !out.is_empty() => break,
            None => {}
        }
    }
    (out.len() >= 2).then_some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn rgb(p: Paint) -> [u8; 3] {
        match p {
            Paint::Rgb(c) => c,
            Paint::Grey(_) => panic!("a colour style is a colour"),
        }
    }

    #[test]
    fn red_green_blue_get_their_hues_and_luminances_apart() {
        let styles = colour_styles(&[(656.3, "red".into()), (532.0, "green".into()), (486.1, "blue".into())]);
        let [r, g, b] = [0, 1, 2].map(|k| rgb(styles[k].paint));
        // Each keeps its hue: its own component the largest.
        assert!(r[0] > r[1] && r[0] > r[2], "{r:?}");
        assert!(g[1] > g[0] && g[1] > g[2], "{g:?}");
        assert!(b[2] > b[0] && b[2] > b[1], "{b:?}");
        // Luminances at the three steps of LUMINANCE_RANGE, red darkest (its hue's Y is lowest).
        let y = [r, g, b].map(|c| luminance(c.map(decode)));
        assert!(
            (y[0] - 0.05).abs() < 0.01 && (y[2] - 0.225).abs() < 0.01 && (y[1] - 0.40).abs() < 0.01,
            "{y:?}"
        );
        // Dash patterns all different, and none a construction line's (two or four entries).
        let pats: Vec<Vec<f64>> = styles.iter().map(|s| s.dash.pattern_mm()).collect();
        assert!(pats.iter().all(|p| p.len() >= 6), "{pats:?}");
        assert!(pats[0] != pats[1] && pats[1] != pats[2] && pats[0] != pats[2]);
        assert_eq!(styles.iter().map(|s| s.initial.as_str()).collect::<Vec<_>>(), ["R", "G", "B"]);
    }

    #[test]
    fn srgb_encoding_round_trips() {
        for v in [0u8, 1, 10, 50, 128, 200, 255] {
            assert_eq!(encode(decode(v)), v);
        }
    }
}
