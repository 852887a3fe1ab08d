//! The class summary as pages: one table of every group, variant, sheet,
//! guide heights, predicted crossings with tolerances and focal lengths.

use super::regions;
use crate::draw::text;
use crate::geom::Point;
use crate::paper::PaperSpec;
use crate::scene::{Anchor, Item, Page, Scene, Stroke, Weight};
use crate::sheets::ClassPlan;

/// The summary document.
pub fn summary_scene(kit_title: &str, class: &ClassPlan, paper: &PaperSpec) -> Scene {
    let rg = regions(paper);
    let (w, h) = rg.page;
    let area = rg.printable;
    let row_h = 4.6;
    let size = 7.0;
    let cols: [(&str, f64); 9] = [
        ("Group", 0.15),
        ("Variant", 0.07),
        ("Sheet", 0.05),
        ("Piece, entry", 0.13),
        ("Ray", 0.04),
        ("Guide", 0.08),
        ("Predicted (accept range)", 0.28),
        ("Sheet values", 0.13),
        ("", 0.07),
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
            for (k, cells) in p.view().summary_cells().into_iter().enumerate() {
                let first = k == 0;
                let [ray, guide, predicted, facts, more] = cells;
                rows.push([
                    if first { p.group.clone().unwrap_or_default() } else { String::new() },
                    if first { p.variant.clone().unwrap_or_default() } else { String::new() },
                    if first { p.number.to_string() } else { String::new() },
                    if first { format!("{}, {}", p.piece_id, p.view().entry_words()) } else { String::new() },
                    ray,
                    guide,
                    predicted,
                    if first { facts } else { String::new() },
                    if first { more } else { String::new() },
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
