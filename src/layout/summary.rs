//! The class summary as pages: one table of every group, variant, sheet,
//! guide heights, predicted crossings with tolerances and focal lengths.

use super::regions;
use crate::draw::{Words, text};
use crate::geom::Point;
use crate::paper::PaperSpec;
use crate::scene::{Anchor, Item, Page, Scene, Stroke, Weight};
use crate::sheets::ClassPlan;

/// The summary document.
pub fn summary_scene(kit_title: &str, class: &ClassPlan, paper: &PaperSpec, t: &super::Templates) -> Scene {
    let words = &t.words;
    let rg = regions(paper);
    let (w, h) = rg.page;
    let area = rg.printable;
    let row_h = 4.6;
    let size = 7.0;
    let cols: [(&str, f64); 9] = [
        (words.say("summary_group"), 0.15),
        (words.say("summary_variant"), 0.07),
        (words.say("summary_sheet"), 0.05),
        (words.say("summary_piece"), 0.13),
        (words.say("summary_ray"), 0.04),
        (words.say("summary_guide"), 0.08),
        (words.say("summary_predicted"), 0.28),
        (words.say("summary_values"), 0.13),
        ("", 0.07),
    ];
    let mut xs = Vec::new();
    let mut x = area.min.x;
    for (_, f) in cols {
        xs.push(x);
        x += f * area.width();
    }
    let rows = summary_lines(class, words);
    let per_page = (((area.height() - 22.0) / row_h).floor() as usize).max(1);
    let pages = paginate(&rows, per_page);
    let pages_n = pages.len();
    let mut scene = Scene { title: format!("{kit_title}: class summary"), pages: Vec::new() };
    for (pg, page_rows) in pages.iter().enumerate() {
        let mut items = vec![
            text(
                Point::new(area.min.x, area.max.y - 5.0),
                &words.fill("summary_title", &[("kit", kit_title), ("seed", &class.seed.to_string())]),
                12.0,
                Weight::Bold,
                Anchor::Start,
            ),
            text(
                Point::new(area.min.x, area.max.y - 10.0),
                &words.fill(
                    "summary_subtitle",
                    &[("page", &(pg + 1).to_string()), ("pages", &pages_n.to_string())],
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
        for (k, (starts_sheet, row)) in page_rows.iter().enumerate() {
            let y = top - (k as f64 + 2.0) * row_h + 1.3;
            if *starts_sheet {
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

/// The summary table's rows for every group's sheets, in order.
fn summary_lines(class: &ClassPlan, w: &Words) -> Vec<SummaryLine> {
    let mut rows: Vec<SummaryLine> = Vec::new();
    for plans in &class.plans {
        for p in plans {
            let head = [
                p.group.clone().unwrap_or_default(),
                p.variant.clone().unwrap_or_default(),
                p.number.to_string(),
                w.fill("summary_piece_entry", &[("piece", &p.piece_id), ("entry", &p.view().entry_words(w))]),
            ];
            for (k, cells) in p.view().summary_cells(w).into_iter().enumerate() {
                let first = k == 0;
                let [ray, guide, predicted, facts, more] = cells;
                let [group, variant, sheet, piece] = head.clone();
                rows.push(SummaryLine {
                    starts_sheet: first,
                    head: head.clone(),
                    cells: [
                        if first { group } else { String::new() },
                        if first { variant } else { String::new() },
                        if first { sheet } else { String::new() },
                        if first { piece } else { String::new() },
                        ray,
                        guide,
                        predicted,
                        if first { facts } else { String::new() },
                        if first { more } else { String::new() },
                    ],
                });
            }
        }
    }
    rows
}

/// One row of the summary table: its nine cells (the group, variant, sheet
/// and piece cells blank on a sheet's later rows), whether it is the sheet's
/// first row, and the four cells that name the sheet.
struct SummaryLine {
    starts_sheet: bool,
    head: [String; 4],
    cells: [String; 9],
}

/// The rows split into pages of `per_page` (at least one page, at least one
/// row a page). A page that opens in the middle of a sheet's rows repeats
/// that sheet's group, variant, sheet and piece cells on its first row, so
/// every page says whose rows it holds.
fn paginate(rows: &[SummaryLine], per_page: usize) -> Vec<Vec<(bool, [String; 9])>> {
    let per_page = per_page.max(1);
    let mut pages: Vec<Vec<(bool, [String; 9])>> = rows
        .chunks(per_page)
        .map(|chunk| {
            chunk
                .iter()
                .enumerate()
                .map(|(k, r)| {
                    let mut cells = r.cells.clone();
                    if k == 0 && !r.starts_sheet {
                        for (cell, head) in cells.iter_mut().zip(&r.head) {
                            cell.clone_from(head);
                        }
                    }
                    (r.starts_sheet, cells)
                })
                .collect()
        })
        .collect();
    if pages.is_empty() {
        pages.push(Vec::new());
    }
    pages
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::paper::{Orientation, PaperSize};
    use crate::plan::{Group, folder_names};
    use crate::sheets::{Lesson, plan_class};

    fn class(paper: &PaperSpec) -> ClassPlan {
        let text = include_str!("../../tests/fixtures/issue9_class.toml");
        let lesson = Lesson::from_toml(text, "issue9_class.toml").expect("the fixture is valid");
        let names: Vec<String> = (1..=6).map(|i| format!("Group {i}")).collect();
        let groups = names
            .iter()
            .cloned()
            .zip(folder_names(&names))
            .map(|(name, folder)| Group { name, folder })
            .collect();
        plan_class(&lesson, paper, groups, 909)
    }

    fn paper(orientation: Orientation) -> PaperSpec {
        PaperSpec { size: PaperSize::named("A4").expect("A4"), orientation, margin_mm: 10.0 }
    }

    /// Issue 9: a page that continues a sheet's rows left its first row's
    /// group, variant and sheet cells blank.
    #[test]
    fn summary_continuation_page_repeats_group_variant_and_sheet() {
        let mut continued = 0;
        for orientation in [Orientation::Portrait, Orientation::Landscape] {
            let paper = paper(orientation);
            let class = class(&paper);
            let rg = regions(&paper);
            let scene =
                summary_scene("Issue 9 bench", &class, &paper, &crate::layout::Templates::shipped().unwrap());
            assert!(scene.pages.len() >= 2, "the fixture's summary runs over pages");
            // Continuation pages in the rows themselves (the fixture has 3- and
            // 5-ray sheets, so some page opens inside a sheet).
            let lines = summary_lines(&class, &Words::shipped());
            let per_page = (((rg.printable.height() - 22.0) / 4.6).floor() as usize).max(1);
            continued += lines.chunks(per_page).filter(|c| !c[0].starts_sheet).count();
            for (n, page) in scene.pages.iter().enumerate() {
                // The cells of the page's first row: texts on the highest
                // baseline below the column headings.
                let texts: Vec<(f64, f64, &str)> = page
                    .items
                    .iter()
                    .filter_map(|it| match it {
                        Item::Text { at, text, size_pt, .. } if (*size_pt - 7.0).abs() < 1e-9 => {
                            Some((at.x, at.y, text.as_str()))
                        }
                        _ => None,
                    })
                    .collect();
                let heading_y = texts.iter().find(|t| t.2 == "Group").map(|t| t.1).expect("column headings");
                let first_y =
                    texts.iter().filter(|t| t.1 < heading_y - 1e-6).map(|t| t.1).fold(f64::MIN, f64::max);
                let mut row: Vec<(f64, &str)> =
                    texts.iter().filter(|t| (t.1 - first_y).abs() < 1e-9).map(|t| (t.0, t.2)).collect();
                row.sort_by(|a, b| a.0.total_cmp(&b.0));
                assert_eq!(row.len(), 9, "page {}: {row:?}", n + 1);
                for (j, name) in ["group", "variant", "sheet"].iter().enumerate() {
                    assert!(
                        !row[j].1.is_empty(),
                        "{orientation:?} page {}: first row has no {name}: {row:?}",
                        n + 1
                    );
                }
            }
        }
        assert!(continued >= 1, "some page opens inside a sheet's rows, so the test means something");
    }

    #[test]
    fn paginate_repeats_the_head_only_where_a_sheet_continues() {
        let line = |starts_sheet: bool, ray: &str| SummaryLine {
            starts_sheet,
            head: ["G1".into(), "v1".into(), "2".into(), "p, front".into()],
            cells: std::array::from_fn(|j| match j {
                0..=3 if starts_sheet => ["G1", "v1", "2", "p, front"][j].to_string(),
                4 => ray.to_string(),
                _ => String::new(),
            }),
        };
        let rows = [line(true, "A"), line(false, "B"), line(false, "C")];
        let pages = paginate(&rows, 2);
        assert_eq!(pages.len(), 2);
        assert_eq!(pages[0][1].1[0], "", "a continuation row on the same page stays blank");
        assert_eq!(&pages[1][0].1[..5], ["G1", "v1", "2", "p, front", "C"]);
        assert!(!pages[1][0].0, "a repeated head does not start a new sheet");
        assert_eq!(paginate(&[], 5).len(), 1, "an empty summary still has a page");
    }
}
