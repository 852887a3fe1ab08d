//! The class summary as pages: one table of every group, variant, sheet,
//! guide heights, predicted crossings with tolerances and focal lengths.

use super::{regions, signed};
use crate::draw::text;
use crate::geom::Point;
use crate::paper::PaperSpec;
use crate::plan::ClassPlan;
use crate::scene::{Anchor, Item, Page, Scene, Stroke, Weight};

/// The summary document.
pub fn summary_scene(kit_title: &str, class: &ClassPlan, paper: &PaperSpec) -> Scene {
    let rg = regions(paper);
    let (w, h) = rg.page;
    let area = rg.printable;
    let row_h = 4.6;
    let size = 7.0;
    let cols: [(&str, f64); 9] = [
        ("Group", 0.16),
        ("Variant", 0.07),
        ("Sheet", 0.05),
        ("Piece, entry", 0.14),
        ("Ray", 0.04),
        ("Height", 0.08),
        ("Predicted crossing", 0.3),
        ("Thin f / EFL", 0.09),
        ("BFL", 0.07),
    ];
    let mut xs = Vec::new();
    let mut x = area.min.x;
    for (_, f) in cols {
        xs.push(x);
        x += f * area.width();
    }
    let mut rows: Vec<[String; 9]> = Vec::new();
    for plans in &class.plans {
        for p in plans {
            for (k, r) in p.rays_top_down().into_iter().enumerate() {
                let first = k == 0;
                let (ref_x, ref_words) = p.measure_from();
                let tol = match (r.graded, r.tolerance_mm) {
                    (true, Some(t)) => format!(" ± {t:.1}"),
                    _ => String::new(),
                };
                let crossing = match r.crossing_from_entry_mm {
                    Some(x) if x < p.outline.t() && ref_x > 0.0 => {
                        format!("{:.1}{tol} before the exit face", p.outline.t() - x)
                    }
                    Some(x) => format!("{:.1}{tol} {ref_words}", x - ref_x),
                    None => r.trace.outcome.as_str().to_string(),
                };
                let crossing = if r.crossing_from_entry_mm.is_some() && !r.graded {
                    format!("{crossing} (not graded)")
                } else {
                    crossing
                };
                let opt =
                    |v: Option<f64>| v.map(|v| format!("{:.1}", v + 0.0)).unwrap_or_else(|| "none".into());
                rows.push([
                    if first { p.group.clone().unwrap_or_default() } else { String::new() },
                    if first { p.variant.clone().unwrap_or_default() } else { String::new() },
                    if first { p.number.to_string() } else { String::new() },
                    if first { format!("{}, {}", p.piece_id, p.entry.as_str()) } else { String::new() },
                    r.letter.clone(),
                    signed(r.height_mm),
                    crossing,
                    if first {
                        format!("{} / {}", opt(p.paraxial.thin_lens_focal_mm()), opt(p.paraxial.efl_mm()))
                    } else {
                        String::new()
                    },
                    if first { opt(p.paraxial.bfl_mm()) } else { String::new() },
                ]);
            }
        }
    }
    let per_page = (((area.height() - 22.0) / row_h).floor() as usize).max(1);
    let pages_n = rows.len().div_ceil(per_page).max(1);
    let mut scene = Scene { title: format!("{kit_title}: class summary"), pages: Vec::new() };
    for pg in 0..pages_n {
        let mut items = vec![
            text(
                Point::new(area.min.x, area.max.y - 5.0),
                &format!("{kit_title}: class summary (seed {})", class.seed),
                12.0,
                Weight::Bold,
                Anchor::Start,
            ),
            text(
                Point::new(area.min.x, area.max.y - 10.0),
                &format!(
                    "page {} of {} · distances in mm, measured as on each sheet; ± is the grading tolerance along the axis",
                    pg + 1,
                    pages_n
                ),
                7.5,
                Weight::Regular,
                Anchor::Start,
            ),
        ];
        let top = area.max.y - 14.0;
        for (j, (name, _)) in cols.iter().enumerate() {
            items.push(text(
                Point::new(xs[j] + 0.8, top - row_h + 1.3),
                name,
                size,
                Weight::Bold,
                Anchor::Start,
            ));
        }
        items.push(Item::Line {
            from: Point::new(area.min.x, top - row_h),
            to: Point::new(area.max.x, top - row_h),
            stroke: Stroke::solid(0.3),
        });
        for (k, row) in rows.iter().skip(pg * per_page).take(per_page).enumerate() {
            let y = top - (k as f64 + 2.0) * row_h + 1.3;
            if !row[0].is_empty() || !row[2].is_empty() {
                items.push(Item::Line {
                    from: Point::new(area.min.x, y + row_h - 1.3),
                    to: Point::new(area.max.x, y + row_h - 1.3),
                    stroke: Stroke::solid(0.15),
                });
            }
            for (j, cell) in row.iter().enumerate() {
                let weight = if j == 6 { Weight::Bold } else { Weight::Regular };
                items.push(text(Point::new(xs[j] + 0.8, y), cell, size, weight, Anchor::Start));
            }
        }
        scene.pages.push(Page { width_mm: w, height_mm: h, name: format!("summary-{:02}", pg + 1), items });
    }
    scene
}
