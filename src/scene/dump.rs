//! A readable text dump of a scene, one primitive a line, for snapshot tests.

use std::fmt::Write;

use super::{Dash, Item, OutlinePart, Paint, Scene, Stroke};

fn stroke(s: &Stroke) -> String {
    let dash = match s.dash {
        Dash::Solid => String::from("solid"),
        Dash::Dashed { on_mm, off_mm } => format!("dash {on_mm:.2}/{off_mm:.2}"),
        Dash::DashDot { long_mm, short_mm, gap_mm } => {
            format!("dashdot {long_mm:.2}/{short_mm:.2}/{gap_mm:.2}")
        }
        Dash::Beads { dash_mm, bead_mm, gap_mm, beads } => {
            format!("beads {dash_mm:.2}/{bead_mm:.2}/{gap_mm:.2}x{beads}")
        }
    };
    let paint = match s.paint {
        Paint::Grey(g) => format!("g{g:.2}"),
        Paint::Rgb([r, g, b]) => format!("rgb#{r:02x}{g:02x}{b:02x}"),
    };
    format!("w{:.2} {paint} {dash}", s.width_mm)
}

fn item(out: &mut String, it: &Item, indent: usize) {
    let pad = " ".repeat(indent);
    let _ = match it {
        Item::Line { from, to, stroke: s } => {
            writeln!(out, "{pad}line ({:.2},{:.2})-({:.2},{:.2}) {}", from.x, from.y, to.x, to.y, stroke(s))
        }
        Item::Polyline { points, closed, stroke: s } => {
            let pts: Vec<String> = points.iter().map(|p| format!("({:.2},{:.2})", p.x, p.y)).collect();
            writeln!(
                out,
                "{pad}polyline{} {} {}",
                if *closed { " closed" } else { "" },
                pts.join(" "),
                stroke(s)
            )
        }
        Item::Arc { center, radius_mm, start_rad, sweep_rad, stroke: s } => writeln!(
            out,
            "{pad}arc c({:.2},{:.2}) r{:.2} from {:.2}° sweep {:.2}° {}",
            center.x,
            center.y,
            radius_mm,
            start_rad.to_degrees(),
            sweep_rad.to_degrees(),
            stroke(s)
        ),
        Item::Outline { parts, fill, stroke: s } => {
            let mut txt = String::new();
            for p in parts {
                match p {
                    OutlinePart::MoveTo { to } => {
                        let _ = write!(txt, " M({:.2},{:.2})", to.x, to.y);
                    }
                    OutlinePart::LineTo { to } => {
                        let _ = write!(txt, " L({:.2},{:.2})", to.x, to.y);
                    }
                    OutlinePart::ArcTo { center, radius_mm, start_rad, sweep_rad } => {
                        let _ = write!(
                            txt,
                            " A(c {:.2},{:.2} r{:.2} {:.2}° {:+.2}°)",
                            center.x,
                            center.y,
                            radius_mm,
                            start_rad.to_degrees(),
                            sweep_rad.to_degrees()
                        );
                    }
                }
            }
            let fill = fill.map(|g| format!(" fill g{g:.2}")).unwrap_or_default();
            writeln!(out, "{pad}outline{txt}{fill} {}", stroke(s))
        }
        Item::Marker { at, shape, size_mm, stroke: s } => {
            writeln!(out, "{pad}marker {shape:?} ({:.2},{:.2}) {size_mm:.2} {}", at.x, at.y, stroke(s))
        }
        Item::Arrowhead { tip, dir, length_mm, width_mm, gray } => writeln!(
            out,
            "{pad}arrow tip({:.2},{:.2}) dir({:.3},{:.3}) {length_mm:.2}x{width_mm:.2} g{gray:.2}",
            tip.x, tip.y, dir.x, dir.y
        ),
        Item::Text { at, text, size_pt, weight, anchor, rotate_deg, gray } => writeln!(
            out,
            "{pad}text ({:.2},{:.2}) {size_pt:.1}pt {weight:?} {anchor:?} rot{rotate_deg:.0} g{gray:.2} {text:?}",
            at.x, at.y
        ),
        Item::Box { rect, fill, stroke: s } => writeln!(
            out,
            "{pad}box ({:.2},{:.2})-({:.2},{:.2}){}{}",
            rect.min.x,
            rect.min.y,
            rect.max.x,
            rect.max.y,
            fill.map(|g| format!(" fill g{g:.2}")).unwrap_or_default(),
            s.map(|s| format!(" {}", stroke(&s))).unwrap_or_default()
        ),
        Item::Scale { sx, sy, about, items } => {
            let _ = writeln!(out, "{pad}scale {sx:.6} {sy:.6} about ({:.2},{:.2})", about.x, about.y);
            for child in items {
                item(out, child, indent + 2);
            }
            Ok(())
        }
        Item::Group { clip, offset, items } => {
            let _ = writeln!(
                out,
                "{pad}group clip ({:.2},{:.2})-({:.2},{:.2}) offset ({:.2},{:.2})",
                clip.min.x, clip.min.y, clip.max.x, clip.max.y, offset.x, offset.y
            );
            for child in items {
                item(out, child, indent + 2);
            }
            Ok(())
        }
    };
}

/// The scene as text: a header per page and one line per primitive, numbers to 0.01 mm.
pub fn dump(scene: &Scene) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "scene {:?}", scene.title);
    for (i, page) in scene.pages.iter().enumerate() {
        let _ = writeln!(out, "page {} {:?} {:.2}x{:.2} mm", i + 1, page.name, page.width_mm, page.height_mm);
        for it in &page.items {
            item(&mut out, it, 2);
        }
    }
    out
}
