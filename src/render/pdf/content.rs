//! One page's content stream: every item as PDF operators, in millimetres.
//!
//! The stream opens with a single `cm` that scales mm to pt, so every
//! coordinate, line width, dash length and font size after it is in mm (they
//! are all in user space, which that `cm` maps onto the page). The y axis of
//! PDF already points up, like the scene's.

use std::collections::BTreeSet;

use pdf_writer::types::{LineCapStyle, LineJoinStyle};
use pdf_writer::{Content, Str};

use crate::font;
use crate::geom::{Point, Vec2};
use crate::scene::{
    Anchor, Dash, Gray, Item, MM_PER_PT, MarkerShape, OutlinePart, Page, Paint, Rect, Stroke, Weight,
};

use super::bezier::{Cubic, arc_cubics};
use super::fonts::Fonts;
use super::mm_to_pt;
use crate::render::{RenderError, arrowhead_corners};

/// A page's operators (uncompressed) and the faces its text uses.
pub(super) struct PageContent {
    /// The content stream.
    pub bytes: Vec<u8>,
    /// Faces to list in the page's font resources.
    pub weights: BTreeSet<Weight>,
}

/// Turns a page's items into a content stream.
pub(super) fn page_content(page: &Page, fonts: &Fonts) -> Result<PageContent, RenderError> {
    let mut p = Painter { c: Content::new(), fonts, weights: BTreeSet::new() };
    let s = f(mm_to_pt(1.0));
    p.c.transform([s, 0.0, 0.0, s, 0.0, 0.0]);
    // See the painting conventions in `render`: butt caps, round joins.
    p.c.set_line_cap(LineCapStyle::ButtCap);
    p.c.set_line_join(LineJoinStyle::RoundJoin);
    p.items(&page.items)?;
    Ok(PageContent { bytes: p.c.finish().into_vec(), weights: p.weights })
}

/// A coordinate (mm) or factor as a content-stream operand. Values within 1 nm
/// of zero (the cosine of 90°, say) are written as 0 rather than as 6e-17.
fn f(v: f64) -> f32 {
    if v.abs() < 1e-9 { 0.0 } else { v as f32 }
}

struct Painter<'a> {
    c: Content,
    fonts: &'a Fonts,
    weights: BTreeSet<Weight>,
}

impl Painter<'_> {
    fn items(&mut self, items: &[Item]) -> Result<(), RenderError> {
        for it in items {
            self.item(it)?;
        }
        Ok(())
    }

    fn item(&mut self, it: &Item) -> Result<(), RenderError> {
        match it {
            Item::Line { from, to, stroke } => self.line(*from, *to, stroke),
            Item::Polyline { points, closed, stroke } => self.polyline(points, *closed, stroke),
            Item::Arc { center, radius_mm, start_rad, sweep_rad, stroke } => {
                self.arc(*center, *radius_mm, *start_rad, *sweep_rad, stroke);
            }
            Item::Outline { parts, fill, stroke } => self.outline(parts, *fill, stroke),
            Item::Marker { at, shape, size_mm, stroke } => self.marker(*at, *shape, *size_mm, stroke),
            Item::Arrowhead { tip, dir, length_mm, width_mm, gray } => {
                self.arrowhead(*tip, *dir, *length_mm, *width_mm, *gray);
            }
            Item::Text { at, text, size_pt, weight, anchor, rotate_deg, gray } => {
                self.text(*at, text, *size_pt, *weight, *anchor, *rotate_deg, *gray)?;
            }
            Item::Box { rect, fill, stroke } => self.boxed(rect, *fill, stroke.as_ref()),
            Item::Group { clip, offset, items } => self.group(clip, *offset, items)?,
            Item::Scale { sx, sy, about, items } => {
                // x′ = a.x + sx(x − a.x), y′ = a.y + sy(y − a.y), in millimetres
                // (the page's own cm has already turned mm into points).
                self.c.save_state();
                self.c.transform([
                    f(*sx),
                    0.0,
                    0.0,
                    f(*sy),
                    f(about.x * (1.0 - sx)),
                    f(about.y * (1.0 - sy)),
                ]);
                let drawn = self.items(items);
                self.c.restore_state();
                drawn?
            }
        }
        Ok(())
    }

    fn line(&mut self, from: Point, to: Point, stroke: &Stroke) {
        self.set_stroke(stroke);
        self.c.move_to(f(from.x), f(from.y)).line_to(f(to.x), f(to.y)).stroke();
    }

    fn polyline(&mut self, points: &[Point], closed: bool, stroke: &Stroke) {
        let Some((first, rest)) = points.split_first() else { return };
        self.set_stroke(stroke);
        self.c.move_to(f(first.x), f(first.y));
        for p in rest {
            self.c.line_to(f(p.x), f(p.y));
        }
        if closed {
            self.c.close_and_stroke();
        } else {
            self.c.stroke();
        }
    }

    fn arc(&mut self, center: Point, radius_mm: f64, start_rad: f64, sweep_rad: f64, stroke: &Stroke) {
        self.set_stroke(stroke);
        let start = center + Vec2::from_angle(start_rad) * radius_mm;
        self.c.move_to(f(start.x), f(start.y));
        self.cubics(&arc_cubics(center, radius_mm, start_rad, sweep_rad));
        self.c.stroke();
    }

    /// One path: each `MoveTo` starts a subpath (closing the one before), arcs
    /// start from the current point, and the figure is closed; filled first,
    /// then stroked, when it has a fill.
    fn outline(&mut self, parts: &[OutlinePart], fill: Option<Gray>, stroke: &Stroke) {
        self.set_stroke(stroke);
        let mut current: Option<Point> = None;
        for part in parts {
            match *part {
                OutlinePart::MoveTo { to } => {
                    if current.is_some() {
                        self.c.close_path();
                    }
                    self.c.move_to(f(to.x), f(to.y));
                    current = Some(to);
                }
                OutlinePart::LineTo { to } => {
                    match current {
                        Some(_) => self.c.line_to(f(to.x), f(to.y)),
                        None => self.c.move_to(f(to.x), f(to.y)),
                    };
                    current = Some(to);
                }
                OutlinePart::ArcTo { center, radius_mm, start_rad, sweep_rad } => {
                    let start = center + Vec2::from_angle(start_rad) * radius_mm;
                    match current {
                        None => {
                            self.c.move_to(f(start.x), f(start.y));
                        }
                        // The outline left a gap before the arc: bridge it with a line.
                        Some(c) if c.distance(start) > GAP_MM => {
                            self.c.line_to(f(start.x), f(start.y));
                        }
                        Some(_) => {}
                    }
                    self.cubics(&arc_cubics(center, radius_mm, start_rad, sweep_rad));
                    current = Some(center + Vec2::from_angle(start_rad + sweep_rad) * radius_mm);
                }
            }
        }
        if current.is_none() {
            return;
        }
        match fill {
            Some(g) => {
                self.c.set_fill_gray(f(g));
                self.c.close_fill_nonzero_and_stroke();
            }
            None => {
                self.c.close_and_stroke();
            }
        }
    }

    fn marker(&mut self, at: Point, shape: MarkerShape, size_mm: f64, stroke: &Stroke) {
        let h = size_mm / 2.0;
        match shape {
            MarkerShape::Cross => self.two_strokes(at, Vec2::new(h, 0.0), Vec2::new(0.0, h), stroke),
            MarkerShape::Saltire => self.two_strokes(at, Vec2::new(h, h), Vec2::new(h, -h), stroke),
            MarkerShape::Dot => {
                self.circle(at, h);
                self.fill_paint(stroke.paint);
                self.c.fill_nonzero();
            }
            MarkerShape::Ring => {
                self.set_stroke(stroke);
                self.circle(at, h);
                self.c.close_and_stroke();
            }
        }
    }

    /// Two strokes through `at`, along `a` and along `b` (half-lengths).
    fn two_strokes(&mut self, at: Point, a: Vec2, b: Vec2, stroke: &Stroke) {
        self.set_stroke(stroke);
        for v in [a, b] {
            let (p, q) = (at - v, at + v);
            self.c.move_to(f(p.x), f(p.y)).line_to(f(q.x), f(q.y));
        }
        self.c.stroke();
    }

    fn arrowhead(&mut self, tip: Point, dir: Vec2, length_mm: f64, width_mm: f64, gray: Gray) {
        let [a, b, c] = arrowhead_corners(tip, dir, length_mm, width_mm);
        self.c.set_fill_gray(f(gray));
        self.c
            .move_to(f(a.x), f(a.y))
            .line_to(f(b.x), f(b.y))
            .line_to(f(c.x), f(c.y))
            .close_path()
            .fill_nonzero();
    }

    /// One line of text. The text matrix turns by `rotate_deg` about `at` and
    /// starts the line so that `at` is its start, middle or end (widths from the
    /// glyph advances, no kerning: what layout measures). The font size in `Tf`
    /// is in mm, since the CTM is.
    #[expect(clippy::too_many_arguments, reason = "one argument per field of Item::Text")]
    fn text(
        &mut self,
        at: Point,
        text: &str,
        size_pt: f64,
        weight: Weight,
        anchor: Anchor,
        rotate_deg: f64,
        gray: Gray,
    ) -> Result<(), RenderError> {
        let cids = self.fonts.encode(weight, text)?;
        self.weights.insert(weight);
        let width = font::text_width_mm(text, size_pt, weight);
        let back = match anchor {
            Anchor::Start => 0.0,
            Anchor::Middle => width / 2.0,
            Anchor::End => width,
        };
        let (sin, cos) = rotate_deg.to_radians().sin_cos();
        let origin = at - Vec2::new(cos, sin) * back;
        self.c.set_fill_gray(f(gray));
        self.c.begin_text();
        self.c.set_font(Fonts::resource_name(weight), f(size_pt * MM_PER_PT));
        self.c.set_text_matrix([f(cos), f(sin), f(-sin), f(cos), f(origin.x), f(origin.y)]);
        self.c.show(Str(&cids));
        self.c.end_text();
        Ok(())
    }

    fn boxed(&mut self, rect: &Rect, fill: Option<Gray>, stroke: Option<&Stroke>) {
        if fill.is_none() && stroke.is_none() {
            return;
        }
        if let Some(s) = stroke {
            self.set_stroke(s);
        }
        if let Some(g) = fill {
            self.c.set_fill_gray(f(g));
        }
        self.c.rect(f(rect.min.x), f(rect.min.y), f(rect.width()), f(rect.height()));
        match (fill, stroke) {
            (Some(_), Some(_)) => self.c.fill_nonzero_and_stroke(),
            (Some(_), None) => self.c.fill_nonzero(),
            (None, _) => self.c.stroke(),
        };
    }

    /// `q`, clip to the rectangle (in the group's own frame), move the
    /// children by `offset`, draw them, `Q`.
    fn group(&mut self, clip: &Rect, offset: Vec2, items: &[Item]) -> Result<(), RenderError> {
        self.c.save_state();
        self.c
            .rect(f(clip.min.x), f(clip.min.y), f(clip.width()), f(clip.height()))
            .clip_nonzero()
            .end_path();
        self.c.transform([1.0, 0.0, 0.0, 1.0, f(offset.x), f(offset.y)]);
        let drawn = self.items(items);
        self.c.restore_state();
        drawn
    }

    /// A full circle as a closed path of cubics (not yet painted).
    fn circle(&mut self, center: Point, radius_mm: f64) {
        let start = center + Vec2::new(radius_mm, 0.0);
        self.c.move_to(f(start.x), f(start.y));
        self.cubics(&arc_cubics(center, radius_mm, 0.0, std::f64::consts::TAU));
        self.c.close_path();
    }

    fn cubics(&mut self, cubics: &[Cubic]) {
        for k in cubics {
            self.c.cubic_to(f(k.c1.x), f(k.c1.y), f(k.c2.x), f(k.c2.y), f(k.to.x), f(k.to.y));
        }
    }

    /// Width, grey and dash of the next stroke, all in mm under the page's CTM.
    fn set_stroke(&mut self, s: &Stroke) {
        self.c.set_line_width(f(s.width_mm));
        match s.paint {
            Paint::Grey(g) => {
                self.c.set_stroke_gray(f(g));
            }
            Paint::Rgb(rgb) => {
                let [r, g, b] = rgb.map(|v| f32::from(v) / 255.0);
                self.c.set_stroke_rgb(r, g, b);
            }
        }
        let dash: Vec<f32> = match s.dash {
            Dash::Solid => Vec::new(),
            Dash::Dashed { .. } | Dash::DashDot { .. } | Dash::Beads { .. } => {
                s.dash.pattern_mm().into_iter().map(f).collect()
            }
        };
        self.c.set_dash_pattern(dash, 0.0);
    }

    /// The fill colour of the next fill: a grey (`g`) or an sRGB colour (`rg`).
    fn fill_paint(&mut self, paint: Paint) {
        match paint {
            Paint::Grey(g) => {
                self.c.set_fill_gray(f(g));
            }
            Paint::Rgb(rgb) => {
                let [r, g, b] = rgb.map(|v| f32::from(v) / 255.0);
                self.c.set_fill_rgb(r, g, b);
            }
        }
    }
}

/// Below this, an arc's start and the outline's current point are the same point.
const GAP_MM: f64 = 1e-6;

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scene::Scene;

    fn content_of(items: Vec<Item>) -> String {
        let scene = Scene {
            title: "t".into(),
            pages: vec![Page { width_mm: 210.0, height_mm: 297.0, name: "p".into(), items }],
        };
        let fonts = Fonts::collect([&scene]).unwrap();
        String::from_utf8_lossy(&page_content(&scene.pages[0], &fonts).unwrap().bytes).into_owned()
    }

    #[test]
    fn the_page_opens_with_one_mm_to_pt_cm() {
        let s = content_of(vec![]);
        // 72/25.4 = 2.834645669…, written as the nearest f32.
        assert!(s.starts_with("2.8346457 0 0 2.8346457 0 0 cm\n0 J\n1 j"), "{s}");
        assert_eq!(s.matches(" cm").count(), 1);
    }

    #[test]
    fn dashes_and_widths_are_written_in_mm() {
        let s = content_of(vec![Item::Line {
            from: Point::new(10.0, 20.0),
            to: Point::new(110.0, 20.0),
            stroke: Stroke::solid(0.25).gray(0.5).dashed(Dash::Dashed { on_mm: 3.0, off_mm: 1.5 }),
        }]);
        assert!(s.contains("0.25 w\n0.5 G\n[3 1.5] 0 d\n10 20 m\n110 20 l\nS"), "{s}");
    }

    #[test]
    fn a_group_clips_before_it_translates() {
        let s = content_of(vec![Item::Group {
            clip: Rect::from_corners(Point::new(10.0, 10.0), Point::new(60.0, 40.0)),
            offset: Vec2::new(5.0, -2.0),
            items: vec![],
        }]);
        assert!(s.contains("q\n10 10 50 30 re\nW\nn\n1 0 0 1 5 -2 cm\nQ"), "{s}");
    }

    #[test]
    fn rotated_middle_text_starts_half_its_width_back_along_the_baseline() {
        let s = content_of(vec![Item::Text {
            at: Point::new(100.0, 50.0),
            text: "MM".into(),
            size_pt: 10.0,
            weight: Weight::Regular,
            anchor: Anchor::Middle,
            rotate_deg: 90.0,
            gray: 0.0,
        }]);
        // Width of "MM" at 10 pt: 2 × 1767/2048 em × 3.5278 mm (see font.rs), so
        // the line starts 3.0437 mm below `at` when it runs straight up.
        let half = font::text_width_mm("MM", 10.0, Weight::Regular) / 2.0;
        assert!((half - 3.0437).abs() < 1e-3, "{half}");
        let want = format!("/F1 {} Tf", f(10.0 * MM_PER_PT));
        assert!(s.contains(&want), "{s}");
        let y = f(50.0 - half);
        assert!(s.contains(&format!(" 100 {y} Tm")), "{s}");
    }
}
