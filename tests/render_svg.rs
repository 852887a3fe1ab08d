//! The SVG renderer read back with usvg and drawn with resvg: page size in CSS
//! pixels, millimetre user units, pixels on and off the drawn lines, text kept,
//! determinism.

use raysheet::geom::Point;
use raysheet::render::{RenderError, render_svg_page};
use raysheet::scene::{Anchor, Page, Weight};
use resvg::tiny_skia;

mod common {
    pub mod scene;
}
use common::scene::{test_scene, text};

/// CSS: 1 in = 96 px = 25.4 mm (CSS Values and Units Level 3, absolute lengths).
const PX_PER_MM: f64 = 96.0 / 25.4;

/// The shared test scene's A4 portrait page, with one of every primitive.
fn a4_page() -> Page {
    test_scene().pages.remove(0)
}

fn options() -> usvg::Options<'static> {
    let mut opt = usvg::Options::default();
    // The shipped faces, so that text is laid out rather than silently dropped.
    opt.fontdb_mut().load_font_data(include_bytes!("../fonts/DejaVuSans.ttf").to_vec());
    opt.fontdb_mut().load_font_data(include_bytes!("../fonts/DejaVuSans-Bold.ttf").to_vec());
    opt
}

fn parse(svg: &str) -> usvg::Tree {
    usvg::Tree::from_str(svg, &options()).expect("usvg parses the SVG")
}

/// The page drawn at `scale` × 96 dpi on white.
fn draw(tree: &usvg::Tree, scale: f32) -> tiny_skia::Pixmap {
    let size = tree.size().to_int_size().scale_by(scale).unwrap();
    let mut pixmap = tiny_skia::Pixmap::new(size.width(), size.height()).unwrap();
    pixmap.fill(tiny_skia::Color::WHITE);
    resvg::render(tree, tiny_skia::Transform::from_scale(scale, scale), &mut pixmap.as_mut());
    pixmap
}

/// Red channel of the pixel under a page point (y up, from the bottom edge).
fn level(p: &tiny_skia::Pixmap, px_per_mm: f64, page_h: f64, x_mm: f64, y_mm: f64) -> u8 {
    let (x, y) = ((x_mm * px_per_mm) as u32, ((page_h - y_mm) * px_per_mm) as u32);
    p.pixel(x, y).unwrap().red()
}

#[test]
fn page_is_210_by_297_mm_at_96_dpi_with_a_mm_view_box() {
    let svg = render_svg_page(&a4_page(), "Curved face").unwrap();
    assert!(svg.contains(r#"width="210mm""#) && svg.contains(r#"height="297mm""#), "{svg}");
    assert!(svg.contains(r#"viewBox="0 0 210 297""#), "{svg}");
    assert!(svg.contains("<title>Curved face</title>"), "{svg}");
    let tree = parse(&svg);
    // 210 mm and 297 mm at 96 px per inch (CSS): 793.70 × 1122.52 px.
    let size = tree.size();
    assert!((f64::from(size.width()) - 793.70).abs() < 0.01, "{size:?}");
    assert!((f64::from(size.height()) - 1122.52).abs() < 0.01, "{size:?}");
    // The view box maps one user unit to one millimetre: the first path, the
    // 100 mm line from x = 20 mm, spans 377.95 px from 75.59 px.
    let b = first_path_box(tree.root()).expect("a path");
    assert!((f64::from(b.width()) - 100.0 * PX_PER_MM).abs() < 0.01, "{b:?}");
    assert!((f64::from(b.left()) - 20.0 * PX_PER_MM).abs() < 0.01, "{b:?}");
}

/// The absolute bounding box (px) of the first path in document order.
fn first_path_box(group: &usvg::Group) -> Option<usvg::Rect> {
    group.children().iter().find_map(|node| match node {
        usvg::Node::Path(p) => Some(p.abs_bounding_box()),
        usvg::Node::Group(g) => first_path_box(g),
        usvg::Node::Text(_) | usvg::Node::Image(_) => None,
    })
}

#[test]
fn pixels_on_the_lines_are_dark_and_beside_them_light() {
    let tree = parse(&render_svg_page(&a4_page(), "t").unwrap());
    // Twice 96 dpi, so a 0.3 mm line is 2.3 px wide.
    let pm = draw(&tree, 2.0);
    let s = 2.0 * PX_PER_MM;
    let at = |x, y| level(&pm, s, 297.0, x, y);
    // The 100 mm line at y = 250 mm, and 5 mm beside it.
    assert!(at(70.0, 250.0) < 100, "on the line: {}", at(70.0, 250.0));
    assert!(at(70.0, 255.0) > 200, "5 mm off: {}", at(70.0, 255.0));
    // The 50 mm line at x = 150 mm.
    assert!(at(150.0, 175.0) < 100);
    assert!(at(155.0, 175.0) > 200);
    // The 200 mm arc about (5, 5) at 45°: counterclockwise in page terms, so it
    // passes above and right of the centre, not below it.
    let d = 200.0 / 2.0_f64.sqrt();
    assert!(at(5.0 + d, 5.0 + d) < 128, "on the arc: {}", at(5.0 + d, 5.0 + d));
    assert!(at(5.0 + d - 4.0, 5.0 + d - 4.0) > 200);
    // The lens outline is filled with 0.9 grey (230 of 255) inside.
    let inside = at(65.0, 120.0);
    assert!((225..=235).contains(&inside), "lens fill: {inside}");
    // The group's line is moved up by 5 mm and clipped at x = 190 mm.
    assert!(at(150.0, 85.0) < 100, "grouped line: {}", at(150.0, 85.0));
    assert!(at(150.0, 80.0) > 200);
    assert!(at(195.0, 85.0) > 200, "clipped away: {}", at(195.0, 85.0));
    // The length of the 100 mm line in pixels: 100 mm × 2 × 96/25.4 = 755.9 px.
    let row = ((297.0 - 250.0) * s) as u32;
    let dark: Vec<u32> = (0..(125.0 * s) as u32).filter(|&x| pm.pixel(x, row).unwrap().red() < 128).collect();
    let run = f64::from(dark.last().unwrap() - dark[0] + 1);
    assert!((run - 100.0 * s).abs() <= 2.0, "{run} px, want {}", 100.0 * s);
}

/// Every text node in the tree, with its absolute bounding box in px.
fn texts(group: &usvg::Group, out: &mut Vec<(String, usvg::Rect, usize)>) {
    for node in group.children() {
        match node {
            usvg::Node::Group(g) => texts(g, out),
            usvg::Node::Text(t) => {
                let s: String = t.chunks().iter().map(|c| c.text()).collect();
                out.push((s, t.abs_bounding_box(), t.flattened().children().len()));
            }
            usvg::Node::Path(_) | usvg::Node::Image(_) => {}
        }
    }
}

#[test]
fn text_is_laid_out_with_the_shipped_font_and_anchored_where_asked() {
    let tree = parse(&render_svg_page(&a4_page(), "t").unwrap());
    let mut found = Vec::new();
    texts(tree.root(), &mut found);
    let names: Vec<&str> = found.iter().map(|t| t.0.as_str()).collect();
    assert_eq!(names, ["θ₁ → n = 1.49", "Ærø Ångström", "optical axis"]);
    for (s, _, glyph_groups) in &found {
        assert!(*glyph_groups > 0, "{s:?} was dropped (no font?)");
    }
    // "Ærø Ångström" is anchored at its middle, x = 105 mm (ink within 1 mm of it).
    let b = found[1].1;
    let mid_mm = f64::from(b.left() + b.right()) / 2.0 / PX_PER_MM;
    assert!((mid_mm - 105.0).abs() < 1.0, "middle at {mid_mm} mm");
    // "θ₁ → n = 1.49" starts at x = 20 mm and sits on the baseline y = 270 mm
    // (27 mm below the top): its ink lies above it, but for the subscript's
    // tail, which dips below by less than 1 mm at 10 pt.
    let b = found[0].1;
    assert!((f64::from(b.left()) / PX_PER_MM - 20.0).abs() < 1.0, "{b:?}");
    let (top_mm, bottom_mm) = (f64::from(b.top()) / PX_PER_MM, f64::from(b.bottom()) / PX_PER_MM);
    assert!(bottom_mm > 27.0 && bottom_mm < 28.0 && top_mm > 23.0, "{b:?}");
    // "optical axis", turned 90° counterclockwise, ends at y = 150 mm: it runs
    // up the page, so its box is taller than wide and its end, the top of the
    // box, is 147 mm below the top edge.
    let b = found[2].1;
    assert!(b.height() > b.width(), "{b:?}");
    assert!((f64::from(b.top()) / PX_PER_MM - 147.0).abs() < 1.0, "{b:?}");
}

#[test]
fn the_same_page_gives_the_same_string() {
    let a = render_svg_page(&a4_page(), "t").unwrap();
    let other = Page { width_mm: 100.0, height_mm: 50.0, name: "o".into(), items: vec![] };
    let _ = render_svg_page(&other, "o").unwrap();
    let b = render_svg_page(&a4_page(), "t").unwrap();
    assert_eq!(a, b);
}

#[test]
fn text_the_font_lacks_is_refused() {
    let mut page = a4_page();
    page.items.push(text(Point::new(10.0, 10.0), "漢字", 10.0, Weight::Bold, Anchor::Start, 0.0));
    assert_eq!(
        render_svg_page(&page, "t"),
        Err(RenderError::UnsupportedChar { ch: '漢', text: "漢字".into() })
    );
}

/// Issue 12, finding 4: `index = 1e155` wrote `LNaN,NaN` into SVG paths with
/// exit 0. A page holding a number that is not finite is refused.
#[test]
fn nan_in_output_svg_refused() {
    use raysheet::scene::Item;
    for bad in [f64::NAN, f64::NEG_INFINITY] {
        let mut page = a4_page();
        page.items.push(text(Point::new(bad, 20.0), "A", 10.0, Weight::Regular, Anchor::Start, 0.0));
        assert!(matches!(
            render_svg_page(&page, "t"),
            Err(RenderError::NotFinite { what: "text position", .. })
        ));
        let mut page = a4_page();
        page.items.push(Item::Marker {
            at: Point::new(5.0, 5.0),
            shape: raysheet::scene::MarkerShape::Dot,
            size_mm: bad,
            stroke: raysheet::scene::Stroke::solid(0.2),
        });
        assert!(matches!(
            render_svg_page(&page, "t"),
            Err(RenderError::NotFinite { what: "marker size", .. })
        ));
    }
}
