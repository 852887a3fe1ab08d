//! One scene page as an SVG document at true scale: 1 user unit = 1 mm.
//!
//! The root says `width="{W}mm" height="{H}mm" viewBox="0 0 W H"`, so any SVG
//! viewer or printer maps user units to millimetres. SVG's y axis points down:
//! every y is flipped here (`y_svg = H − y`), once, in [`Flip`]. Numbers are
//! written with at most three decimals (1 µm), trailing zeros trimmed and `-0`
//! written as `0`, so the same page always gives the same bytes.

use std::f64::consts::FRAC_PI_2;
use std::fmt::Write;

use svg::Node;
use svg::node::element::{Element, tag};

use crate::font;
use crate::geom::{Point, Vec2};
use crate::scene::{
    Anchor, Dash, Gray, Item, MM_PER_PT, MarkerShape, OutlinePart, Page, Paint, Rect, Stroke, Weight,
};

use super::{RenderError, check_text};

/// Renders one page as a standalone SVG document titled `title`.
///
/// Fails with [`RenderError::UnsupportedChar`] when a text item holds a
/// character the shipped font cannot show (the PDF renderer refuses the same
/// text, so both formats of a sheet agree), and with [`RenderError::NotFinite`]
/// when a number on the page is NaN, infinite or absurdly large.
pub fn render_svg_page(page: &Page, title: &str) -> Result<String, RenderError> {
    super::check_finite(page)?;
    let w = num(page.width_mm);
    let h = num(page.height_mm);
    let mut ctx = Ctx { flip: Flip { height_mm: page.height_mm }, clips: Vec::new() };
    let mut body = Vec::new();
    ctx.items(&page.items, &mut body)?;

    let mut doc = svg::Document::new()
        .set("width", format!("{w}mm"))
        .set("height", format!("{h}mm"))
        .set("viewBox", format!("0 0 {w} {h}"))
        // Inherited by every line: see the painting conventions in `render`.
        .set("stroke-linecap", "butt")
        .set("stroke-linejoin", "round")
        .add(svg::node::element::Title::new(title));
    if !ctx.clips.is_empty() {
        let mut defs = Element::new(tag::Definitions);
        for clip in ctx.clips {
            defs.append(clip);
        }
        doc = doc.add(defs);
    }
    for el in body {
        doc = doc.add(el);
    }
    let mut out = doc.to_string();
    out.push('\n');
    Ok(out)
}

/// The flip from page coordinates (y up) to SVG user space (y down).
#[derive(Clone, Copy, Debug)]
struct Flip {
    height_mm: f64,
}

impl Flip {
    /// The page height, mm.
    fn height(self) -> f64 {
        self.height_mm
    }

    /// `x,y` of a page point in SVG user units.
    fn pt(self, p: Point) -> String {
        let mut s = String::with_capacity(16);
        fixed(&mut s, p.x, 3);
        s.push(',');
        fixed(&mut s, self.y(p.y), 3);
        s
    }

    /// A page y in SVG user units.
    fn y(self, y_mm: f64) -> f64 {
        self.height_mm - y_mm
    }
}

/// What a page needs while its items are turned into elements.
struct Ctx {
    flip: Flip,
    /// `<clipPath>` elements for the `<defs>`, numbered `clip-1`, `clip-2`… in
    /// document order (per page, so output never depends on earlier renders).
    clips: Vec<Element>,
}

impl Ctx {
    fn items(&mut self, items: &[Item], out: &mut Vec<Element>) -> Result<(), RenderError> {
        for it in items {
            out.push(self.item(it)?);
        }
        Ok(())
    }

    fn item(&mut self, it: &Item) -> Result<Element, RenderError> {
        let f = self.flip;
        Ok(match it {
            Item::Line { from, to, stroke } => line(f, *from, *to, stroke),
            Item::Polyline { points, closed, stroke } => polyline(f, points, *closed, stroke),
            Item::Arc { center, radius_mm, start_rad, sweep_rad, stroke } => {
                arc(f, *center, *radius_mm, *start_rad, *sweep_rad, stroke)
            }
            Item::Outline { parts, fill, stroke } => outline(f, parts, *fill, stroke),
            Item::Marker { at, shape, size_mm, stroke } => marker(f, *at, *shape, *size_mm, stroke),
            Item::Arrowhead { tip, dir, length_mm, width_mm, gray } => {
                arrowhead(f, *tip, *dir, *length_mm, *width_mm, *gray)
            }
            Item::Text { at, text: s, size_pt, weight, anchor, rotate_deg, gray } => {
                text(f, *at, s, *size_pt, *weight, *anchor, *rotate_deg, *gray)?
            }
            Item::Box { rect, fill, stroke } => boxed(f, rect, *fill, stroke.as_ref()),
            Item::Group { clip, offset, items } => self.group(clip, *offset, items)?,
            Item::Scale { sx, sy, about, items } => self.scale(*sx, *sy, *about, items)?,
        })
    }

    /// `<g transform="matrix(…)">`: x′ = a.x + sx(x − a.x), y′ = a.y + sy(y − a.y)
    /// in the page frame; in SVG's flipped y (y_svg = H − y) that is
    /// y_svg′ = (H − a.y)(1 − sy) + sy·y_svg. One transform, two factors: the
    /// stretch is never made uniform.
    fn scale(&mut self, sx: f64, sy: f64, about: Point, items: &[Item]) -> Result<Element, RenderError> {
        let mut children = Vec::new();
        self.items(items, &mut children)?;
        let h = self.flip.height();
        let mut g = Element::new(tag::Group);
        g.assign(
            "transform",
            format!(
                "matrix({} 0 0 {} {} {})",
                num6(sx),
                num6(sy),
                num6(about.x * (1.0 - sx)),
                num6((h - about.y) * (1.0 - sy))
            ),
        );
        for c in children {
            g.append(c);
        }
        Ok(g)
    }

    /// `<g clip-path>` around `<g transform="translate">`: the clip is given in
    /// the group's own frame (page coordinates after the offset), so it sits on
    /// the outer element, whose user space the offset does not touch.
    fn group(&mut self, clip: &Rect, offset: Vec2, items: &[Item]) -> Result<Element, RenderError> {
        let id = format!("clip-{}", self.clips.len() + 1);
        let mut clip_path = Element::new(tag::ClipPath);
        clip_path.assign("id", id.as_str());
        clip_path.append(rect_element(self.flip, clip));
        self.clips.push(clip_path);

        let mut children = Vec::new();
        self.items(items, &mut children)?;
        // A move up the page (+y) is a move down in SVG user space.
        let mut inner = Element::new(tag::Group);
        inner.assign("transform", format!("translate({} {})", num(offset.x), num(-offset.y)));
        for c in children {
            inner.append(c);
        }
        let mut outer = Element::new(tag::Group);
        outer.assign("clip-path", format!("url(#{id})"));
        outer.append(inner);
        Ok(outer)
    }
}

fn line(f: Flip, from: Point, to: Point, stroke: &Stroke) -> Element {
    path(&format!("M{}L{}", f.pt(from), f.pt(to)), None, Some(stroke))
}

fn polyline(f: Flip, points: &[Point], closed: bool, stroke: &Stroke) -> Element {
    let mut d = String::new();
    for (i, p) in points.iter().enumerate() {
        d.push(if i == 0 { 'M' } else { 'L' });
        d.push_str(&f.pt(*p));
    }
    if closed {
        d.push('Z');
    }
    path(&d, None, Some(stroke))
}

fn arc(f: Flip, center: Point, radius_mm: f64, start_rad: f64, sweep_rad: f64, stroke: &Stroke) -> Element {
    let mut d = format!("M{}", f.pt(on_circle(center, radius_mm, start_rad)));
    arc_commands(&mut d, f, center, radius_mm, start_rad, sweep_rad);
    path(&d, None, Some(stroke))
}

fn outline(f: Flip, parts: &[OutlinePart], fill: Option<Gray>, stroke: &Stroke) -> Element {
    let mut d = String::new();
    let mut current: Option<Point> = None;
    for part in parts {
        match *part {
            OutlinePart::MoveTo { to } => {
                if current.is_some() {
                    d.push('Z');
                }
                d.push('M');
                d.push_str(&f.pt(to));
                current = Some(to);
            }
            OutlinePart::LineTo { to } => {
                d.push(if current.is_some() { 'L' } else { 'M' });
                d.push_str(&f.pt(to));
                current = Some(to);
            }
            OutlinePart::ArcTo { center, radius_mm, start_rad, sweep_rad } => {
                let start = on_circle(center, radius_mm, start_rad);
                join_to(&mut d, f, current, start);
                arc_commands(&mut d, f, center, radius_mm, start_rad, sweep_rad);
                current = Some(on_circle(center, radius_mm, start_rad + sweep_rad));
            }
        }
    }
    d.push('Z');
    path(&d, fill, Some(stroke))
}

fn marker(f: Flip, at: Point, shape: MarkerShape, size_mm: f64, stroke: &Stroke) -> Element {
    let h = size_mm / 2.0;
    let two_strokes = |a: Vec2, b: Vec2| {
        let d = format!("M{}L{}M{}L{}", f.pt(at - a), f.pt(at + a), f.pt(at - b), f.pt(at + b));
        path(&d, None, Some(stroke))
    };
    match shape {
        MarkerShape::Cross => two_strokes(Vec2::new(h, 0.0), Vec2::new(0.0, h)),
        MarkerShape::Saltire => two_strokes(Vec2::new(h, h), Vec2::new(h, -h)),
        MarkerShape::Dot => circle_painted(f, at, h, stroke.paint),
        MarkerShape::Ring => circle(f, at, h, None, Some(stroke)),
    }
}

fn arrowhead(f: Flip, tip: Point, dir: Vec2, length_mm: f64, width_mm: f64, gray: Gray) -> Element {
    let [a, b, c] = super::arrowhead_corners(tip, dir, length_mm, width_mm);
    path(&format!("M{}L{}L{}Z", f.pt(a), f.pt(b), f.pt(c)), Some(gray), None)
}

#[expect(clippy::too_many_arguments, reason = "one argument per field of Item::Text")]
fn text(
    f: Flip,
    at: Point,
    s: &str,
    size_pt: f64,
    weight: Weight,
    anchor: Anchor,
    rotate_deg: f64,
    gray: Gray,
) -> Result<Element, RenderError> {
    check_text(s, weight)?;
    let (x, y) = (num(at.x), num(f.y(at.y)));
    let mut el = Element::new(tag::Text);
    el.assign("x", x.as_str());
    el.assign("y", y.as_str());
    el.assign("font-family", format!("{}, sans-serif", font::FAMILY));
    el.assign("font-size", num(size_pt * MM_PER_PT));
    if weight == Weight::Bold {
        el.assign("font-weight", "bold");
    }
    let anchor = match anchor {
        Anchor::Start => "start",
        Anchor::Middle => "middle",
        Anchor::End => "end",
    };
    el.assign("text-anchor", anchor);
    // Layout measures text without kerning, and the PDF places glyphs by their
    // advances alone: keep SVG viewers from kerning so anchors agree. A CSS
    // property, not a presentation attribute, hence `style`.
    el.assign("style", "font-kerning:none");
    el.assign("fill", hex_gray(gray));
    if rotate_deg != 0.0 {
        // Counterclockwise on the page (y up) is a negative angle in SVG (y down).
        el.assign("transform", format!("rotate({} {x} {y})", num(-rotate_deg)));
    }
    // The scene's text is exact: keep runs of spaces.
    el.assign("xml:space", "preserve");
    el.append(svg::node::Text::new(s));
    Ok(el)
}

fn boxed(f: Flip, rect: &Rect, fill: Option<Gray>, stroke: Option<&Stroke>) -> Element {
    let mut el = rect_element(f, rect);
    paint(&mut el, fill, stroke);
    el
}

/// A `<rect>` with only its geometry.
fn rect_element(f: Flip, rect: &Rect) -> Element {
    let mut el = Element::new(tag::Rectangle);
    el.assign("x", num(rect.min.x));
    el.assign("y", num(f.y(rect.max.y)));
    el.assign("width", num(rect.width()));
    el.assign("height", num(rect.height()));
    el
}

fn circle(f: Flip, center: Point, radius_mm: f64, fill: Option<Gray>, stroke: Option<&Stroke>) -> Element {
    let mut el = Element::new(tag::Circle);
    el.assign("cx", num(center.x));
    el.assign("cy", num(f.y(center.y)));
    el.assign("r", num(radius_mm));
    paint(&mut el, fill, stroke);
    el
}

/// A filled disc in a stroke's paint (a dot marker), no border.
fn circle_painted(f: Flip, center: Point, radius_mm: f64, paint: Paint) -> Element {
    let mut el = circle(f, center, radius_mm, None, None);
    el.assign("fill", hex_paint(paint));
    el
}

fn path(d: &str, fill: Option<Gray>, stroke: Option<&Stroke>) -> Element {
    let mut el = Element::new(tag::Path);
    el.assign("d", d);
    paint(&mut el, fill, stroke);
    el
}

/// Fill and stroke attributes; `None` paints nothing of that kind.
fn paint(el: &mut Element, fill: Option<Gray>, stroke: Option<&Stroke>) {
    el.assign("fill", fill.map_or_else(|| String::from("none"), hex_gray));
    match stroke {
        None => el.assign("stroke", "none"),
        Some(s) => {
            el.assign("stroke", hex_paint(s.paint));
            el.assign("stroke-width", num(s.width_mm));
            if let Some(dash) = dash_array(&s.dash) {
                el.assign("stroke-dasharray", dash);
            }
        }
    }
}

/// The `stroke-dasharray` value in mm (user units), `None` for a solid line.
fn dash_array(dash: &Dash) -> Option<String> {
    let values = match *dash {
        Dash::Solid => return None,
        Dash::Dashed { .. } | Dash::DashDot { .. } | Dash::Beads { .. } => dash.pattern_mm(),
    };
    Some(values.into_iter().map(num).collect::<Vec<_>>().join(" "))
}

/// The point at `angle_rad` (counterclockwise from +x, y up) on a circle.
fn on_circle(center: Point, radius_mm: f64, angle_rad: f64) -> Point {
    center + Vec2::from_angle(angle_rad) * radius_mm
}

/// Continues a path from `current` to `start`: a move when there is no current
/// point, a line when the outline left a gap before an arc, nothing otherwise.
fn join_to(d: &mut String, f: Flip, current: Option<Point>, start: Point) {
    match current {
        None => {
            d.push('M');
            d.push_str(&f.pt(start));
        }
        Some(c) if c.distance(start) > GAP_MM => {
            d.push('L');
            d.push_str(&f.pt(start));
        }
        Some(_) => {}
    }
}

/// Below this, an arc's start and the outline's current point are the same point.
const GAP_MM: f64 = 1e-6;

/// Appends `A` commands for an arc whose start is the current point.
///
/// The sweep is cut into equal pieces of at most 90°, so each piece is a
/// "small" arc (large-arc flag 0) with no 180° ambiguity, and a full circle
/// (whose end equals its start, which a single `A` cannot draw) is four pieces.
/// Counterclockwise on the page (y up) is counterclockwise on screen too, which
/// in SVG's y-down user space is the negative-angle direction: sweep flag 0.
fn arc_commands(d: &mut String, f: Flip, center: Point, radius_mm: f64, start_rad: f64, sweep_rad: f64) {
    let pieces = arc_pieces(sweep_rad);
    let sweep_flag = if sweep_rad > 0.0 { 0 } else { 1 };
    let r = num(radius_mm);
    for i in 1..=pieces {
        let end = on_circle(center, radius_mm, start_rad + sweep_rad * f64::from(i) / f64::from(pieces));
        let _ = write!(d, "A{r},{r} 0 0 {sweep_flag} {}", f.pt(end));
    }
}

/// How many ≤ 90° pieces an arc of `sweep_rad` is cut into (0 for no sweep).
fn arc_pieces(sweep_rad: f64) -> u32 {
    let s = sweep_rad.abs();
    if !s.is_finite() || s == 0.0 {
        return 0;
    }
    // The 1e-9 keeps an exact quarter from becoming two pieces through rounding;
    // |sweep| ≤ 2π by the scene's contract, and the cap only guards bad input.
    let quarters = (s / FRAC_PI_2 - 1e-9).ceil().clamp(1.0, 8.0);
    #[expect(clippy::cast_possible_truncation, clippy::cast_sign_loss, reason = "a whole number in 1..=8")]
    let n = quarters as u32;
    n
}

/// A grey level as `#rrggbb` (0 black, 1 white; clamped).
/// A paint as `#rrggbb`.
fn hex_paint(paint: Paint) -> String {
    match paint {
        Paint::Grey(g) => hex_gray(g),
        Paint::Rgb([r, g, b]) => format!("#{r:02x}{g:02x}{b:02x}"),
    }
}

fn hex_gray(gray: Gray) -> String {
    #[expect(clippy::cast_possible_truncation, clippy::cast_sign_loss, reason = "rounded value in 0..=255")]
    let v = (gray.clamp(0.0, 1.0) * 255.0).round() as u8;
    format!("#{v:02x}{v:02x}{v:02x}")
}

/// A factor or offset of a printer's correction, to 1e-6 (a stretch of
/// 1.0101 must not become 1.010): [`fixed`] with six decimals.
fn num6(v: f64) -> String {
    let mut s = String::new();
    fixed(&mut s, v, 6);
    s
}

/// A number with at most three decimals (1 µm), trailing zeros trimmed, `-0`
/// as `0`: [`fixed`] with three decimals.
fn num(v: f64) -> String {
    let mut s = String::new();
    fixed(&mut s, v, 3);
    s
}

/// Appends `v` rounded to `decimals` (3 or 6) decimal places, trailing zeros
/// and a trailing point dropped, `-0` written as `0`: the same text as
/// `format!("{v:.3}")` (or `.6`) trimmed, without the general float
/// formatter.
///
/// `v · 10^decimals` is rounded to a whole number and written as digits.
/// That product carries a rounding error of at most half a unit in its last
/// place, so where it lies within that error (with room to spare) of a half —
/// where rounding the exact value could go the other way — and where it is too
/// large for exact whole numbers, the standard formatter, which rounds the
/// exact binary value, writes it instead.
fn fixed(out: &mut String, v: f64, decimals: u32) {
    let scale = if decimals == 6 { 1e6 } else { 1e3 };
    let x = v * scale;
    let near_half = ((x - x.floor()) - 0.5).abs() <= 1e-9 + x.abs() * 1e-15;
    if !x.is_finite() || x.abs() >= 1e15 || near_half {
        let s = format!("{v:.prec$}", prec = decimals as usize);
        out.push_str(&trim(s));
        return;
    }
    #[expect(clippy::cast_possible_truncation, reason = "|x| < 1e15, a whole number after round")]
    let n = x.round() as i64;
    if n == 0 {
        out.push('0');
        return;
    }
    if n < 0 {
        out.push('-');
    }
    let n = n.unsigned_abs();
    let unit = if decimals == 6 { 1_000_000 } else { 1_000 };
    let (whole, mut frac) = (n / unit, n % unit);
    let _ = write!(out, "{whole}");
    if frac != 0 {
        out.push('.');
        let mut digits = decimals;
        while frac % 10 == 0 {
            frac /= 10;
            digits -= 1;
        }
        let _ = write!(out, "{frac:0width$}", width = digits as usize);
    }
}

/// Trailing zeros and a trailing point dropped; `-0` written as `0`.
fn trim(s: String) -> String {
    let mut s = s;
    if s.contains('.') {
        while s.ends_with('0') {
            s.pop();
        }
        if s.ends_with('.') {
            s.pop();
        }
    }
    if s == "-0" {
        s = String::from("0");
    }
    s
}

#[cfg(test)]
mod tests {
    use std::f64::consts::PI;

    use super::*;

    #[test]
    fn numbers_have_three_decimals_at_most_and_no_negative_zero() {
        assert_eq!(num(210.0), "210");
        assert_eq!(num(3.527_777_7), "3.528");
        assert_eq!(num(0.1), "0.1");
        assert_eq!(num(-0.0), "0");
        assert_eq!(num(-0.000_4), "0");
        assert_eq!(num(-1.25), "-1.25");
        assert_eq!(num(1.000_4), "1");
        assert_eq!(num(99.999_9), "100");
    }

    #[test]
    fn fixed_decimals_write_what_the_standard_formatter_writes() {
        // The reference is Rust's own `{:.3}` / `{:.6}` (exact decimal rounding
        // of the binary value), trimmed. Values: random magnitudes from 1e-7 to
        // 1e9, both signs, and exact binary ties (k/16, k/2048), which the fast
        // path must hand to the formatter.
        let slow = |v: f64, d: usize| trim(format!("{v:.d$}"));
        let mut seed = 0x2545_f491_4f6c_dd1d_u64;
        let mut values: Vec<f64> = (0..20_000)
            .map(|_| {
                seed ^= seed << 13;
                seed ^= seed >> 7;
                seed ^= seed << 17;
                let mantissa = (seed >> 11) as f64 / (1_u64 << 53) as f64;
                let exp = (seed % 17) as i32 - 7;
                let sign = if seed & 1 == 0 { 1.0 } else { -1.0 };
                sign * mantissa * 10_f64.powi(exp)
            })
            .collect();
        values.extend((-4000..4000).map(|k| f64::from(k) / 16.0));
        values.extend((-4000..4000).map(|k| f64::from(k) / 2048.0));
        values.extend([0.0, -0.0, 1e9, -1e9, 0.000_5, 0.001_5, 2.000_5, 1e-300, 123_456.789_5]);
        for v in values {
            for d in [3_u32, 6] {
                let mut fast = String::new();
                fixed(&mut fast, v, d);
                assert_eq!(fast, slow(v, d as usize), "{v:e} to {d} decimals");
            }
        }
    }

    #[test]
    fn greys_are_hex() {
        assert_eq!(hex_gray(0.0), "#000000");
        assert_eq!(hex_gray(1.0), "#ffffff");
        assert_eq!(hex_gray(0.5), "#808080");
        assert_eq!(hex_gray(2.0), "#ffffff");
    }

    #[test]
    fn y_is_flipped_against_the_page_height() {
        let f = Flip { height_mm: 297.0 };
        assert_eq!(f.pt(Point::new(10.0, 0.0)), "10,297");
        assert_eq!(f.pt(Point::new(10.0, 297.0)), "10,0");
        assert_eq!(f.pt(Point::new(0.0, 100.5)), "0,196.5");
    }

    #[test]
    fn arcs_are_cut_into_quarters_at_most() {
        assert_eq!(arc_pieces(0.0), 0);
        assert_eq!(arc_pieces(0.3), 1);
        assert_eq!(arc_pieces(FRAC_PI_2), 1);
        assert_eq!(arc_pieces(-PI), 2);
        assert_eq!(arc_pieces(PI + 0.01), 3);
        assert_eq!(arc_pieces(2.0 * PI), 4);
    }

    #[test]
    fn a_counterclockwise_half_circle_uses_sweep_flag_0_and_ends_on_the_circle() {
        // Centre (50, 50) r 10 on a 100 mm page, from 0° ccw through 90° (page top,
        // SVG y 30) to 180°.
        let mut d = String::new();
        arc_commands(&mut d, Flip { height_mm: 100.0 }, Point::new(50.0, 50.0), 10.0, 0.0, PI);
        assert_eq!(d, "A10,10 0 0 0 50,40A10,10 0 0 0 40,50");
        let mut d = String::new();
        arc_commands(&mut d, Flip { height_mm: 100.0 }, Point::new(50.0, 50.0), 10.0, 0.0, -FRAC_PI_2);
        assert_eq!(d, "A10,10 0 0 1 50,60");
    }

    #[test]
    fn a_group_gets_a_numbered_clip_and_a_flipped_translate() {
        let page = Page {
            width_mm: 100.0,
            height_mm: 100.0,
            name: "p".into(),
            items: vec![Item::Group {
                clip: Rect::from_corners(Point::new(10.0, 10.0), Point::new(60.0, 40.0)),
                offset: Vec2::new(5.0, 2.0),
                items: vec![Item::Line {
                    from: Point::new(0.0, 0.0),
                    to: Point::new(1.0, 1.0),
                    stroke: Stroke::solid(0.3),
                }],
            }],
        };
        let svg = render_svg_page(&page, "t").unwrap();
        assert!(svg.contains(r#"<clipPath id="clip-1">"#), "{svg}");
        assert!(svg.contains(r#"<rect height="30" width="50" x="10" y="60"/>"#), "{svg}");
        assert!(svg.contains(r#"<g clip-path="url(#clip-1)">"#), "{svg}");
        assert!(svg.contains(r#"transform="translate(5 -2)""#), "{svg}");
    }

    #[test]
    fn rotated_bold_text_is_escaped_and_turned_the_svg_way() {
        let page = Page {
            width_mm: 100.0,
            height_mm: 100.0,
            name: "p".into(),
            items: vec![Item::Text {
                at: Point::new(20.0, 30.0),
                text: "a < b & θ".into(),
                size_pt: 10.0,
                weight: Weight::Bold,
                anchor: Anchor::Middle,
                rotate_deg: 90.0,
                gray: 0.0,
            }],
        };
        let svg = render_svg_page(&page, "t").unwrap();
        // 10 pt = 10 × 25.4/72 mm = 3.5278 mm (ISO 32000-1 point).
        assert!(svg.contains(r#"font-size="3.528""#), "{svg}");
        assert!(svg.contains(r#"font-weight="bold""#), "{svg}");
        assert!(svg.contains(r#"transform="rotate(-90 20 70)""#), "{svg}");
        assert!(svg.contains(">a &lt; b &amp; θ</text>"), "{svg}");
    }

    #[test]
    fn text_the_font_lacks_is_refused() {
        let page = Page {
            width_mm: 100.0,
            height_mm: 100.0,
            name: "p".into(),
            items: vec![Item::Text {
                at: Point::new(20.0, 30.0),
                text: "漢".into(),
                size_pt: 10.0,
                weight: Weight::Regular,
                anchor: Anchor::Start,
                rotate_deg: 0.0,
                gray: 0.0,
            }],
        };
        assert!(matches!(render_svg_page(&page, "t"), Err(RenderError::UnsupportedChar { ch: '漢', .. })));
    }
}
