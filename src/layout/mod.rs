//! Places sheet plans on paper at 1:1: header, the setup drawing (tiled when
//! it does not fit), instructions and measurement table from `templates/`,
//! scale checks, the safety caution and, on keys, the answers and the
//! aberration plot. Never re-traces rays for answers, never writes bytes.

mod memo;
pub use memo::scope as memo_scope;
mod calibrate;
pub mod fit;
mod grades;
mod summary;
mod templates;
pub mod tiles;

pub use calibrate::calibration_scene;
pub use fit::TextFitError;
pub use grades::{ClassPlotData, GroupMarks, grades_scene};
pub use summary::summary_scene;
pub use templates::{FILES as TEMPLATE_FILES, Templates, shipped_text as shipped_template};

use fit::Misfit;

use crate::draw::{Drawing, Words, leading, text, wrap};
use crate::geom::{Point, Vec2};
use crate::paper::bands::{
    CAUTION_MM, GAP_MM, HEADER_MM, SIDE_BLOCK_MM, SIDE_BY_SIDE_FROM_MM, TEXT_BLOCK_MM,
};
use crate::paper::{Orientation, PaperSpec};
use crate::scene::{Anchor, Item, MarkerShape, Page, Rect, Scene, Stroke, Weight};
use crate::sheets::SheetPlan;

/// Which of the two documents a page belongs to.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Role {
    /// The student sheet.
    Student,
    /// The answer key (same coordinates, plus answers).
    Key,
}

/// Overlap between neighbouring tiles, mm.
pub const TILE_OVERLAP_MM: f64 = 12.0;
const BODY_PT: f64 = 8.0;

/// The regions of a page, page mm.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Regions {
    /// Page width and height.
    pub page: (f64, f64),
    /// The printable area inside the margins.
    pub printable: Rect,
    /// Where the setup is drawn.
    pub drawing: Rect,
    /// Instructions and table (or key values and table).
    pub text_block: Rect,
    /// Scale checks and the plot or tile map.
    pub side_block: Rect,
    /// The safety caution.
    pub caution: Rect,
    /// Where the 50 mm scale bar stands when the side block is too short for
    /// it (the compact one-page layout): a strip right of the drawing.
    pub up_strip: Option<Rect>,
}

/// Works out the page regions for this paper. Wide pages (≥ 250 mm printable)
/// put the text and side blocks side by side; narrow ones stack them. The band
/// sizes are [`crate::paper::bands`], which the paper check also uses.
pub fn regions(paper: &PaperSpec) -> Regions {
    let (w, h) = paper.page_mm();
    let m = paper.margin_mm;
    let printable = Rect { min: Point::new(m, m), max: Point::new(w - m, h - m) };
    let pw = printable.width();
    let caution = Rect { min: printable.min, max: Point::new(printable.max.x, m + CAUTION_MM) };
    let (text_block, side_block, footer_top) = if pw >= SIDE_BY_SIDE_FROM_MM {
        let top = m + CAUTION_MM + TEXT_BLOCK_MM;
        let split = m + 152.0;
        (
            Rect { min: Point::new(m, m + CAUTION_MM), max: Point::new(split, top) },
            Rect { min: Point::new(split + 4.0, m + CAUTION_MM), max: Point::new(w - m, top) },
            top,
        )
    } else {
        let side_top = m + CAUTION_MM + SIDE_BLOCK_MM;
        let top = side_top + TEXT_BLOCK_MM;
        (
            Rect { min: Point::new(m, side_top), max: Point::new(w - m, top) },
            Rect { min: Point::new(m, m + CAUTION_MM), max: Point::new(w - m, side_top) },
            top,
        )
    };
    let drawing = Rect { min: Point::new(m, footer_top + GAP_MM), max: Point::new(w - m, h - m - HEADER_MM) };
    Regions { page: (w, h), printable, drawing, text_block, side_block, caution, up_strip: None }
}

/// How a setup is split over pages: columns × rows of tiles.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Tiling {
    /// Tiles along the axis.
    pub columns: usize,
    /// Tiles across the axis.
    pub rows: usize,
}

impl Tiling {
    /// Number of pages.
    pub fn pages(&self) -> usize {
        self.columns.saturating_mul(self.rows)
    }
}

fn tiles_needed(length: f64, window: f64) -> usize {
    if length <= window + 1e-9 {
        1
    } else if window <= TILE_OVERLAP_MM + 1.0 || !length.is_finite() {
        // A window no larger than the overlap never advances (paper the paper
        // check refuses): as many pages as can be counted, so the page limits refuse it.
        usize::MAX
    } else {
        // Saturates for absurd lengths (the build refuses those before layout).
        ((length - TILE_OVERLAP_MM) / (window - TILE_OVERLAP_MM)).ceil().min(1e9) as usize
    }
}

/// Tiles for a setup of `length` × `height` mm in a drawing window of the
/// given size, with [`TILE_OVERLAP_MM`] overlap: n = ⌈(L − o)/(W − o)⌉ when L > W.
pub fn tiling_for(length: f64, height: f64, window: &Rect) -> Tiling {
    Tiling { columns: tiles_needed(length, window.width()), rows: tiles_needed(height, window.height()) }
}

/// Shortest the text and side blocks may become in the compact one-page
/// layout, mm (instructions and a five-row table still fit at the smallest
/// text size; the key plot keeps 30 mm).
pub const COMPACT_BLOCK_MM: f64 = 44.0;

/// The compact one-page layout on wide paper (text and side blocks side by
/// side): the blocks only as tall as the setup leaves, down to
/// [`COMPACT_BLOCK_MM`], and the 50 mm bar in a strip right of the drawing.
/// `None` on narrow paper or when the setup needs more than that.
fn compact_regions(paper: &PaperSpec, s: &crate::sheets::Setup) -> Option<Regions> {
    let rg = regions(paper);
    let p = rg.printable;
    if p.width() < SIDE_BY_SIDE_FROM_MM {
        return None;
    }
    let block = p.height() - HEADER_MM - CAUTION_MM - GAP_MM - s.height() - 0.5;
    if !(COMPACT_BLOCK_MM..TEXT_BLOCK_MM).contains(&block) {
        return None;
    }
    let top = p.min.y + CAUTION_MM + block;
    let text_block = Rect { min: rg.text_block.min, max: Point::new(rg.text_block.max.x, top) };
    let side_block = Rect { min: rg.side_block.min, max: Point::new(rg.side_block.max.x, top) };
    let strip = Rect {
        min: Point::new(p.max.x - tiles::STRIP_MM, top + GAP_MM),
        max: Point::new(p.max.x, p.max.y - HEADER_MM),
    };
    let drawing = Rect {
        min: Point::new(p.min.x, top + GAP_MM),
        max: Point::new(strip.min.x - 1.0, p.max.y - HEADER_MM),
    };
    let fits = s.length() <= drawing.width() + 1e-9 && s.height() <= drawing.height() + 1e-9;
    fits.then_some(Regions { drawing, text_block, side_block, up_strip: Some(strip), ..rg })
}

/// The regions of a one-page sheet for this plan, if it has one: the usual
/// ones when the setup fits their drawing window and the text (with
/// templates `t`, student sheet and key) fits their text block, else the
/// compact ones when the setup and the text fit theirs. `None`: the sheet
/// takes a cover page, whose text block is taller (a key with every colour
/// traced can have more to say than one page holds), and drawing pages.
pub fn one_page_regions(p: &SheetPlan, paper: &PaperSpec, t: &Templates) -> Option<Regions> {
    memo::one_page(p, paper, t, || one_page_regions_now(p, paper, t))
}

fn one_page_regions_now(p: &SheetPlan, paper: &PaperSpec, t: &Templates) -> Option<Regions> {
    let s = p.setup();
    let rg = regions(paper);
    let text_fits = |r: &Regions| {
        [Role::Student, Role::Key].iter().all(|&role| text_block(p, &r.text_block, t, role).is_ok())
    };
    if tiling_for(s.length(), s.height(), &rg.drawing).pages() == 1 && text_fits(&rg) {
        return Some(rg);
    }
    let c = compact_regions(paper, &s)?;
    text_fits(&c).then_some(c)
}

/// Whether one plan prints on one page of `paper` (with the shipped text; see
/// [`one_page_regions`]).
pub fn fits_one_page(p: &SheetPlan, paper: &PaperSpec) -> bool {
    shipped().is_some_and(|t| one_page_regions(p, paper, t).is_some())
}

/// How one plan's drawing is tiled on `paper` as it is turned (see
/// [`paper_for`]): 1 × 1 when it fits a one-page sheet, else the drawing
/// pages that follow the cover page (see [`tiles`]), counted as the layout
/// cuts them: round the labels of the drawing and its key (in the shipped words).
pub fn tiling_on(p: &SheetPlan, paper: &PaperSpec) -> Tiling {
    if fits_one_page(p, paper) {
        return Tiling { columns: 1, rows: 1 };
    }
    let s = tiles::tiled_area(&p.setup());
    let win = tiles::tile_regions(paper).common.drawing;
    let tiling = tiling_for(s.length(), s.height(), &win);
    let Some(t) = shipped() else { return tiling };
    let boxes = tiled_label_boxes(p, &s, &win, tiling, &t.words);
    let (cols, rows) = tiles::origins(&s, &win, tiling, &boxes);
    Tiling { columns: cols.len(), rows: rows.len() }
}

/// The shipped templates, parsed once.
fn shipped() -> Option<&'static Templates> {
    static SHIPPED: std::sync::OnceLock<Option<Templates>> = std::sync::OnceLock::new();
    SHIPPED.get_or_init(|| Templates::shipped().ok()).as_ref()
}

/// Where a tiled drawing's labels may go, and the text boxes of the drawing
/// and its key there (the tiles are cut round both, so a key page lies over
/// its sheet page).
fn tiled_bounds(s: &crate::sheets::Setup, win: &Rect, tiling: Tiling) -> Rect {
    // Labels stay in the tiled area; across the axis, a single row of drawing
    // pages leaves the window's whole height (the window is centred).
    let cy = (s.y_min + s.y_max) / 2.0;
    let (y_lo, y_hi) = if tiling.rows == 1 {
        (cy - win.height() / 2.0 + 1.0, cy + win.height() / 2.0 - 1.0)
    } else {
        (s.y_min, s.y_max)
    };
    Rect { min: Point::new(s.x_min, y_lo), max: Point::new(s.x_max, y_hi) }
}

fn tiled_label_boxes(
    p: &SheetPlan,
    s: &crate::sheets::Setup,
    win: &Rect,
    tiling: Tiling,
    w: &Words,
) -> Vec<Rect> {
    let bounds = tiled_bounds(s, win, tiling);
    let view = p.view();
    let mut d: Drawing = view.student(bounds, w);
    let key = p.key(&mut d, bounds, w);
    d.items.iter().chain(&key).filter_map(label_box).collect()
}

/// The paper one plan is laid out on. With `orientation = "auto"` a sheet is
/// landscape (the optical axis along the long side) unless it would need more
/// pages than in portrait (or as many, but only the compact layout in landscape), as a tall block or prism setup can, or a landscape
/// page has no room for the drawing at all (A5: see [`PaperSpec::page_mm`]).
pub fn paper_for(p: &SheetPlan, paper: &PaperSpec) -> PaperSpec {
    if paper.orientation != Orientation::Auto {
        return paper.clone();
    }
    let landscape = PaperSpec { orientation: Orientation::Landscape, ..paper.clone() };
    let portrait = PaperSpec { orientation: Orientation::Portrait, ..paper.clone() };
    if landscape.check().is_err() {
        return portrait;
    }
    // Fewer pages first; on a tie, the usual layout before the compact one
    // (whose text blocks are shorter), then landscape.
    let usual = |on: &PaperSpec| {
        let s = p.setup();
        tiling_for(s.length(), s.height(), &regions(on).drawing).pages() == 1
    };
    let rank = |on: &PaperSpec| (pages_on(p, on), !usual(on));
    let wide = rank(&landscape);
    // One page in the usual layout: portrait can at best tie, and a tie stays landscape.
    if wide == (1, false) {
        return paper.clone();
    }
    if rank(&portrait) < wide { portrait } else { paper.clone() }
}

/// Pages on `paper` turned as it is: one, or the cover and the drawing pages.
fn pages_on(p: &SheetPlan, paper: &PaperSpec) -> usize {
    if fits_one_page(p, paper) { 1 } else { tiling_on(p, paper).pages().saturating_add(1) }
}

/// How many pages one plan's student sheet takes (the key takes as many): one,
/// or a cover page and the drawing pages; a gauge page (see
/// [`crate::sheets::SheetView::has_gauge`]) comes on top.
pub fn pages_needed(p: &SheetPlan, paper: &PaperSpec) -> usize {
    pages_on(p, &paper_for(p, paper)) + usize::from(p.view().has_gauge())
}

/// The student sheets and answer keys for a set of plans.
pub struct SheetSet {
    /// Every student sheet, in order.
    pub sheets: Scene,
    /// Every answer key, in order.
    pub keys: Scene,
}

/// Lays out every plan as a student sheet and a key. Template text is set at
/// the largest size that fits its room (see [`fit`]); text that cannot fit
/// even at the smallest size is refused with the template file's line.
pub fn layout(
    kit_title: &str,
    plans: &[SheetPlan],
    paper: &PaperSpec,
    t: &Templates,
) -> Result<SheetSet, TextFitError> {
    memo::scope(|| layout_now(kit_title, plans, paper, t))
}

fn layout_now(
    kit_title: &str,
    plans: &[SheetPlan],
    paper: &PaperSpec,
    t: &Templates,
) -> Result<SheetSet, TextFitError> {
    let mut sheets = Scene { title: format!("{kit_title}: student sheets"), pages: Vec::new() };
    let mut keys = Scene { title: format!("{kit_title}: answer keys"), pages: Vec::new() };
    for p in plans {
        sheets.pages.extend(pages_for(kit_title, p, paper, t, Role::Student)?);
        keys.pages.extend(pages_for(kit_title, p, paper, t, Role::Key)?);
    }
    Ok(SheetSet { sheets, keys })
}

/// A misfit located in its template file, with the paper it was measured on.
fn locate(m: Misfit, t: &Templates, paper: &PaperSpec, rg: &Regions) -> TextFitError {
    let place = if m.file == "common.toml" {
        t.common.places.of(&m.field)
    } else if m.file == templates::WORDS_FILE {
        // A key the teacher's file left out keeps the shipped text: name the shipped file.
        match t.word_places.get(&m.field) {
            Some(p) => p.clone(),
            None => format!("templates/{}: field `{}`", templates::WORDS_FILE, m.field),
        }
    } else {
        t.sheet(&m.file).places.of(&m.field)
    };
    let turn = if rg.page.0 > rg.page.1 { "landscape" } else { "portrait" };
    TextFitError(format!(
        "{place}: {} (measured on {} paper in {turn}, {:.0} mm printable across); the text would run off its place on the page",
        m.why,
        paper.size.name,
        rg.printable.width()
    ))
}

fn sheet_text<'a>(p: &SheetPlan, t: &'a Templates) -> &'a templates::SheetText {
    t.sheet(p.view().template())
}

/// A file-name stem for a plan's pages: `sheet-03` or `sheet-03-bench-a`.
pub fn page_stem(p: &SheetPlan, role: Role) -> String {
    let kind = if role == Role::Student { "sheet" } else { "key" };
    format!("{kind}-{:02}", p.number)
}

/// The pages of one plan (a cover and drawing pages when tiled, see
/// [`tiles`]; then its gauge page, if it has one), or the template text that
/// cannot fit on this paper.
pub fn pages_for(
    kit_title: &str,
    p: &SheetPlan,
    paper: &PaperSpec,
    t: &Templates,
    role: Role,
) -> Result<Vec<Page>, TextFitError> {
    let mut pages = drawing_pages(kit_title, p, paper, t, role)?;
    if p.view().has_gauge() {
        let paper = &paper_for(p, paper);
        let rg = regions(paper);
        let at = |m: Misfit| locate(m, t, paper, &rg);
        let head = header_text(p, &rg, t).map_err(at)?;
        let labels = scale_labels(&rg.side_block, t).map_err(at)?;
        let foot = caution(&rg.caution, t).map_err(at)?;
        let w = &t.words;
        let mut items = header(kit_title, p, &rg, &head, role, None, w);
        // The drawing's and the text block's room: above the scale bars on
        // narrow paper (the side block under the text block), beside them on
        // wide paper.
        let stacked = rg.side_block.max.y <= rg.text_block.min.y + 1e-9;
        let room = if stacked {
            Rect { min: Point::new(rg.printable.min.x, rg.side_block.max.y + GAP_MM), max: rg.drawing.max }
        } else {
            Rect { min: rg.text_block.min, max: Point::new(rg.text_block.max.x, rg.drawing.max.y) }
        };
        items.extend(p.view().gauge(room, role == Role::Key, w));
        let r = &rg.side_block;
        let y = r.min.y + 6.0;
        items.extend(across_bar(r.min.x + 1.0, y, &labels));
        items.extend(up_bar(r.max.x - 3.0, r.min.y + 4.0, &labels));
        items.extend(foot);
        pages.push(Page {
            width_mm: rg.page.0,
            height_mm: rg.page.1,
            name: format!("{}-gauge", page_stem(p, role)),
            items,
        });
    }
    Ok(pages)
}

/// The pages of one plan's drawing: one, or a cover and the drawing pages.
fn drawing_pages(
    kit_title: &str,
    p: &SheetPlan,
    paper: &PaperSpec,
    t: &Templates,
    role: Role,
) -> Result<Vec<Page>, TextFitError> {
    let paper = &paper_for(p, paper);
    let rg = regions(paper);
    let at = |m: Misfit| locate(m, t, paper, &rg);
    // Every page of the plan has the same header, text block, side block and
    // caution text, so their fit is settled once, before the tiles.
    let w = &t.words;
    let head = header_text(p, &rg, t).map_err(at)?;
    let labels = scale_labels(&rg.side_block, t).map_err(at)?;
    let foot = caution(&rg.caution, t).map_err(at)?;
    let s = p.setup();
    let length = s.length();
    let cy = (s.y_min + s.y_max) / 2.0;
    let stem = page_stem(p, role);
    let view = p.view();
    if let Some(rg) = one_page_regions(p, paper, t) {
        // Labels may go anywhere in the window around the centred setup.
        let win = rg.drawing;
        let spare_x = (win.width() - length) / 2.0;
        let spare_y = win.height() / 2.0;
        let bounds = Rect {
            min: Point::new(s.x_min - spare_x + 1.0, cy - spare_y + 1.0),
            max: Point::new(s.x_max + spare_x - 1.0, cy + spare_y - 1.0),
        };
        let mut d: Drawing = view.student(bounds, w);
        let mut items = std::mem::take(&mut d.items);
        if role == Role::Key {
            items.extend(p.key(&mut d, bounds, w));
        }
        labels_inside(&items, &bounds, w).map_err(at)?;
        let offset =
            Vec2::new(win.min.x + (win.width() - length) / 2.0 - s.x_min, (win.min.y + win.max.y) / 2.0 - cy);
        let mut page_items = header(kit_title, p, &rg, &head, role, None, w);
        page_items.push(Item::Group { clip: win, offset, items });
        page_items.extend(text_block(p, &rg.text_block, t, role).map_err(at)?);
        match rg.up_strip {
            Some(strip) => {
                page_items.extend(side_block_without_up_bar(p, &rg.side_block, &labels, role, w));
                page_items.extend(up_bar(strip.max.x - 3.0, strip.min.y + 2.0, &labels));
            }
            None => page_items.extend(side_block(p, &rg.side_block, &labels, role, w)),
        }
        page_items.extend(foot);
        return Ok(vec![Page { width_mm: rg.page.0, height_mm: rg.page.1, name: stem, items: page_items }]);
    }
    // Tiled: the tiles' edges avoid cutting labels.
    let tr = tiles::tile_regions(paper);
    let win = tr.common.drawing;
    // The drawing pages cover the setup and room round it for labels.
    let s = tiles::tiled_area(&s);
    let tiling = tiling_for(s.length(), s.height(), &win);
    let bounds = tiled_bounds(&s, &win, tiling);
    let mut d: Drawing = view.student(bounds, w);
    let mut items = std::mem::take(&mut d.items);
    let key_items = p.key(&mut d, bounds, w);
    labels_inside(&items, &bounds, w).map_err(at)?;
    labels_inside(&key_items, &bounds, w).map_err(at)?;
    // The tiles are cut alike for the sheet and its key (the key's labels
    // count for both), so a key page lies exactly over its sheet page.
    let label_boxes: Vec<Rect> = items.iter().chain(&key_items).filter_map(label_box).collect();
    if role == Role::Key {
        items.extend(key_items);
    }
    let (cols, rows) = tiles::origins(&s, &win, tiling, &label_boxes);
    let total = tiling.pages() + 1;
    items.extend(join_marks(&cols, &rows, &win, &label_boxes));
    // The cover: everything but the drawing, and a map of the drawing pages
    // at the top of the drawing window; the text block has the rest of it.
    let map_room = Rect {
        min: Point::new(rg.drawing.min.x, (rg.drawing.max.y - COVER_MAP_MM).max(rg.drawing.min.y)),
        max: rg.drawing.max,
    };
    let mut cover_text = rg.text_block;
    cover_text.max.y = cover_text.max.y.max(map_room.min.y - GAP_MM);
    let mut cover = header(kit_title, p, &rg, &head, role, Some((0, total)), w);
    cover.extend(tile_cover(&cols, &rows, &win, &map_room, w));
    cover.extend(text_block(p, &cover_text, t, role).map_err(at)?);
    cover.extend(side_block(p, &rg.side_block, &labels, role, w));
    cover.extend(foot.iter().cloned());
    let mut pages =
        vec![Page { width_mm: rg.page.0, height_mm: rg.page.1, name: stem.clone(), items: cover }];
    for (row, &top) in rows.iter().enumerate() {
        for (col, &left) in cols.iter().enumerate() {
            let n = row * tiling.columns + col;
            let offset = Vec2::new(win.min.x - left, win.max.y - top);
            let mut page_items = header(kit_title, p, &tr.common, &head, role, Some((n + 1, total)), w);
            page_items.push(Item::Group { clip: win, offset, items: items.clone() });
            page_items.extend(tile_footer(&tr, &labels, (col, row), tiling, (n + 1, total), w));
            page_items.extend(foot.iter().cloned());
            pages.push(Page {
                width_mm: rg.page.0,
                height_mm: rg.page.1,
                name: format!("{stem}-tile{}", n + 1),
                items: page_items,
            });
        }
    }
    Ok(pages)
}

/// Every drawn label from `words.toml` lies inside the room labels have
/// (`bounds`, with a 1 mm allowance, turned labels included): an edited
/// label that the placer could only put partly outside would be cut off by
/// the drawing window or run off the page, so it is refused with its key.
fn labels_inside(items: &[Item], bounds: &Rect, w: &Words) -> Result<(), Misfit> {
    let room = Rect {
        min: Point::new(bounds.min.x - 1.0, bounds.min.y - 1.0),
        max: Point::new(bounds.max.x + 1.0, bounds.max.y + 1.0),
    };
    for it in items {
        let Item::Text { at, text: s, size_pt, weight, anchor, rotate_deg, .. } = it else { continue };
        let b = crate::draw::text_box(*at, s, *size_pt, *weight, *anchor);
        let (sin, cos) = rotate_deg.to_radians().sin_cos();
        let turned: Vec<Point> = [b.min, Point::new(b.max.x, b.min.y), b.max, Point::new(b.min.x, b.max.y)]
            .iter()
            .map(|p| {
                let (dx, dy) = (p.x - at.x, p.y - at.y);
                Point::new(at.x + dx * cos - dy * sin, at.y + dx * sin + dy * cos)
            })
            .collect();
        if turned.iter().all(|p| room.contains(*p)) {
            continue;
        }
        // Text from the kit or from numbers alone is not the teacher's words to shorten.
        let Some(key) = w.key_of(s) else { continue };
        return Err(Misfit {
            file: templates::WORDS_FILE.into(),
            field: key.to_string(),
            why: format!(
                "the drawing label \"{}\" ({} characters, {:.0} mm at {size_pt} pt) finds no place inside the {:.0} × {:.0} mm drawing it labels; shorten it",
                fit::quote(s, 40),
                s.chars().count(),
                crate::font::text_width_mm(s, *size_pt, *weight),
                bounds.width(),
                bounds.height()
            ),
        });
    }
    Ok(())
}

/// The upright box of a text item (a label, turned or not), in its own frame.
fn label_box(item: &Item) -> Option<Rect> {
    match item {
        Item::Text { at, text: s, size_pt, weight, anchor, rotate_deg, .. } => {
            Some(crate::draw::turned_text_box(*at, s, *size_pt, *weight, *anchor, *rotate_deg))
        }
        _ => None,
    }
}

/// Join marks in the overlaps between tiles, in the sheet frame: a cross in a
/// ring near both ends of every overlap, so neighbouring pages line up; each
/// moved along its overlap, where needed, off the drawing's labels.
fn join_marks(cols: &[f64], rows: &[f64], win: &Rect, labels: &[Rect]) -> Vec<Item> {
    const SIZE: f64 = 7.0;
    let free = |at: Point| {
        let r = Rect {
            min: Point::new(at.x - SIZE / 2.0 - 0.5, at.y - SIZE / 2.0 - 0.5),
            max: Point::new(at.x + SIZE / 2.0 + 0.5, at.y + SIZE / 2.0 + 0.5),
        };
        !labels.iter().any(|l| l.overlaps(&r))
    };
    // The first free point from `start` stepping by `step` along the
    // overlap's length, trying a few places across it; `start` if none is free.
    let find = |start: Point, step: Vec2, across: Vec2, reach: f64| {
        let steps = (reach / step.length()).floor().max(0.0) as usize;
        (0..=steps)
            .flat_map(|k| [0.0, -1.0, 1.0, -2.0, 2.0].map(move |a| start + step * k as f64 + across * a))
            .find(|p| free(*p))
            .unwrap_or(start)
    };
    let mut at = Vec::new();
    let (w, h) = (win.width(), win.height());
    for pair in cols.windows(2) {
        // The overlap is [pair[1], pair[0] + w]; a mark fits with 1 mm to spare.
        let x = (pair[1] + pair[0] + w) / 2.0;
        let slack = ((pair[0] + w - pair[1]) - SIZE - 2.0).max(0.0) / 4.0;
        for &top in rows {
            let reach = h / 2.0 - SIZE;
            at.push(find(Point::new(x, top - 6.0), Vec2::new(0.0, -2.0), Vec2::new(slack, 0.0), reach));
            at.push(find(Point::new(x, top - h + 6.0), Vec2::new(0.0, 2.0), Vec2::new(slack, 0.0), reach));
        }
    }
    for pair in rows.windows(2) {
        // The overlap is [pair[0] − h, pair[1]].
        let y = (pair[1] + pair[0] - h) / 2.0;
        let slack = ((pair[1] - (pair[0] - h)) - SIZE - 2.0).max(0.0) / 4.0;
        for &left in cols {
            let reach = w / 2.0 - SIZE;
            at.push(find(Point::new(left + 6.0, y), Vec2::new(2.0, 0.0), Vec2::new(0.0, slack), reach));
            at.push(find(Point::new(left + w - 6.0, y), Vec2::new(-2.0, 0.0), Vec2::new(0.0, slack), reach));
        }
    }
    let stroke = Stroke::solid(0.25);
    at.into_iter()
        .flat_map(|p| {
            [
                Item::Marker { at: p, shape: MarkerShape::Cross, size_mm: SIZE, stroke },
                Item::Marker { at: p, shape: MarkerShape::Ring, size_mm: 4.0, stroke },
            ]
        })
        .collect()
}

/// Height of the cover's map of the drawing pages and its note, mm.
const COVER_MAP_MM: f64 = 38.0;

/// The cover's map of the drawing pages, in the cover's drawing window: every
/// page's window, not to scale, numbered by page, with how to join them.
fn tile_cover(cols: &[f64], rows: &[f64], win: &Rect, room: &Rect, w: &Words) -> Vec<Item> {
    let mut out = Vec::new();
    // One drawing page: the drawing would fit, but not with the text beside
    // it (a long key): nothing to join, so no map.
    let single = cols.len() * rows.len() == 1;
    let note = if single {
        w.say("cover_note_single").to_string()
    } else {
        w.fill("cover_note", &[("last", &(cols.len() * rows.len() + 1).to_string())])
    };
    let lines = wrap(&note, BODY_PT, Weight::Regular, room.width() - 4.0);
    let mut y = room.max.y - 4.0;
    for l in &lines {
        out.push(text(Point::new(room.min.x + 2.0, y), l, BODY_PT, Weight::Regular, Anchor::Start));
        y -= leading(BODY_PT);
    }
    if single {
        return out;
    }
    // The map: a grid of the pages as they join, each cell as wide as the
    // window is tall relative to its width, as large as the room allows.
    let avail = Rect {
        min: Point::new(room.min.x + 4.0, room.min.y + 2.0),
        max: Point::new(room.max.x - 4.0, y - 2.0),
    };
    let (nc, nr) = (cols.len() as f64, rows.len() as f64);
    let aspect = win.height() / win.width();
    let cw = (avail.width() / nc).min(avail.height() / (nr * aspect)).min(40.0);
    let ch = cw * aspect;
    let x0 = avail.min.x + (avail.width() - cw * nc) / 2.0;
    let y_top = avail.max.y - (avail.height() - ch * nr) / 2.0;
    for row in 0..rows.len() {
        for col in 0..cols.len() {
            let min = Point::new(x0 + col as f64 * cw, y_top - (row as f64 + 1.0) * ch);
            let rect = Rect { min, max: Point::new(min.x + cw, min.y + ch) };
            out.push(Item::Box { rect, fill: None, stroke: Some(Stroke::solid(0.3)) });
            let n = row * cols.len() + col + 2;
            let pt = (ch * 0.5 / crate::scene::MM_PER_PT).clamp(6.5, 10.0);
            out.push(text(
                Point::new(min.x + cw / 2.0, min.y + ch / 2.0 - 0.35 * pt * crate::scene::MM_PER_PT),
                &format!("{n}"),
                pt,
                Weight::Bold,
                Anchor::Middle,
            ));
        }
    }
    out
}

/// A drawing page's footer and strip: where the page goes, the 100 mm bar at
/// the bottom left and the 50 mm bar in the strip at the right.
fn tile_footer(
    tr: &tiles::TileRegions,
    labels: &ScaleLabels,
    at: (usize, usize),
    tiling: Tiling,
    page: (usize, usize),
    w: &Words,
) -> Vec<Item> {
    let f = tr.footer;
    let mut out = across_bar(f.min.x + 1.0, f.min.y + 6.0, labels);
    let s = |n: usize| n.to_string();
    let note = if tiling.pages() == 1 {
        w.fill("tile_footer_single", &[("page", &s(page.0 + 1)), ("pages", &s(page.1))])
    } else {
        w.fill(
            "tile_footer",
            &[
                ("page", &s(page.0 + 1)),
                ("pages", &s(page.1)),
                ("column", &s(at.0 + 1)),
                ("columns", &s(tiling.columns)),
                ("row", &s(at.1 + 1)),
                ("rows", &s(tiling.rows)),
            ],
        )
    };

    let lines = wrap(&note, 7.0, Weight::Regular, f.width() - 2.0);
    for (i, l) in lines.iter().enumerate() {
        out.push(text(
            Point::new(f.min.x + 1.0, f.max.y - 2.5 - 3.0 * i as f64),
            l,
            7.0,
            Weight::Regular,
            Anchor::Start,
        ));
    }
    out.extend(up_bar(tr.strip.max.x - 3.0, tr.strip.min.y + 2.0, labels));
    out
}

/// The identity box's lines (group, and variant code or sheet number), their
/// size and the box, top right of the printable area.
fn identity_box(p: &SheetPlan, rg: &Regions, w: &Words) -> (Vec<String>, f64, Rect) {
    let top = rg.printable.max.y;
    let left = rg.printable.min.x;
    let right = rg.printable.max.x;
    let mut lines = Vec::new();
    if let Some(g) = &p.group {
        lines.push(g.clone());
    }
    lines.push(match &p.variant {
        Some(v) => w.fill("identity_variant", &[("code", v)]),
        None => w.fill("identity_sheet", &[("number", &p.number.to_string())]),
    });
    // A long group name is set smaller so the box leaves room for the heading,
    // and on narrow paper (A5) also wrapped to two lines at 7 pt.
    let widest = |lines: &[String], size: f64| {
        lines.iter().map(|l| crate::font::text_width_mm(l, size, Weight::Bold)).fold(0.0, f64::max)
    };
    let pw = right - left;
    let box_pt = if widest(&lines, 10.0) <= 0.35 * pw {
        10.0
    } else if widest(&lines, 8.0) <= 0.3 * pw || p.group.is_none() {
        8.0
    } else {
        let group = wrap(&lines[0], 7.0, Weight::Bold, 0.28 * pw);
        if group.len() <= 2 {
            lines.splice(0..1, group);
        }
        7.0
    };
    let wmax = widest(&lines, box_pt);
    let bx = Rect { min: Point::new(right - wmax - 6.0, top - 12.5), max: Point::new(right, top) };
    (lines, box_pt, bx)
}

/// The heading line and its size: the largest of [`fit::HEADING_PT`] that fits
/// left of the identity box, or the template's heading refused.
fn header_text(p: &SheetPlan, rg: &Regions, t: &Templates) -> Result<(String, f64), Misfit> {
    let heading = &sheet_text(p, t).heading;
    let (_, _, bx) = identity_box(p, rg, &t.words);
    let line = t.words.fill("heading_line", &[("heading", heading), ("number", &p.number.to_string())]);
    // What the line adds to the heading, for the message.
    let suffix = t.words.fill("heading_line", &[("heading", ""), ("number", &p.number.to_string())]);
    let room = bx.min.x - 3.0 - rg.printable.min.x;
    match fit::one_line(&line, &fit::HEADING_PT, Weight::Bold, room) {
        Ok(pt) => Ok((line, pt)),
        Err(_) => {
            let floor = fit::HEADING_PT[fit::HEADING_PT.len() - 1];
            let suffix_mm = crate::font::text_width_mm(&suffix, floor, Weight::Bold);
            Err(Misfit {
                file: p.view().template().to_string(),
                field: "heading".into(),
                why: format!(
                    "\"{}\" ({} characters) is {:.0} mm wide at {floor} pt, the smallest heading size, and the header has {:.0} mm left of the sheet-number box for it (after \"{suffix}\"); shorten it to about {} characters",
                    fit::quote(heading, 40),
                    heading.chars().count(),
                    crate::font::text_width_mm(heading, floor, Weight::Bold),
                    (room - suffix_mm).max(0.0),
                    fit::chars_that_fit(heading, floor, Weight::Bold, room - suffix_mm)
                ) + &match &p.group {
                    Some(g) => {
                        format!(" (the box holds the group name \"{g}\": a shorter one leaves more room)")
                    }
                    None => String::new(),
                },
            })
        }
    }
}

fn header(
    kit_title: &str,
    p: &SheetPlan,
    rg: &Regions,
    heading: &(String, f64),
    role: Role,
    page: Option<(usize, usize)>,
    w: &Words,
) -> Vec<Item> {
    let top = rg.printable.max.y;
    let left = rg.printable.min.x;
    let mut items = Vec::new();
    let role_word = match role {
        Role::Student => w.say("role_student"),
        Role::Key => w.say("role_key"),
    };
    let piece = match &p.piece_label {
        Some(l) => w.fill("piece_with_id", &[("label", l), ("id", &p.piece_id)]),
        None => p.piece_id.clone(),
    };
    // The identity box: group and variant code (or the sheet number).
    let (lines, box_pt, bx) = identity_box(p, rg, w);
    let right = rg.printable.max.x;
    items.push(Item::Box { rect: bx, fill: None, stroke: Some(Stroke::solid(0.4)) });
    let n = lines.len() as f64;
    let step = box_pt * 0.46;
    for (i, l) in lines.iter().enumerate() {
        let y = top - 6.25 + (n - 1.0) * step / 2.0 - i as f64 * step - box_pt * 0.13;
        items.push(text(Point::new(right - 3.0, y), l, box_pt, Weight::Bold, Anchor::End));
    }
    // The heading at the largest size from 13 pt down to 8 pt that fits left of the box.
    let (heading_line, heading_pt) = heading;
    items.push(text(Point::new(left, top - 5.0), heading_line, *heading_pt, Weight::Bold, Anchor::Start));
    // The subtitle fits left of the identity box: 8 pt, else two lines of 7 pt.
    let entry = p.view().entry_words(w);
    let slots =
        [("kit", kit_title), ("piece", piece.as_str()), ("entry", entry.as_str()), ("role", role_word)];
    let subtitle = match page {
        Some((n, total)) => {
            let (n, of) = ((n + 1).to_string(), total.to_string());
            w.fill("subtitle_page", &[&slots[..], &[("page", n.as_str()), ("pages", of.as_str())]].concat())
        }
        None => w.fill("subtitle", &slots),
    };
    let room = bx.min.x - 3.0 - left;
    if crate::font::text_width_mm(&subtitle, BODY_PT, Weight::Regular) <= room {
        items.push(text(Point::new(left, top - 10.5), &subtitle, BODY_PT, Weight::Regular, Anchor::Start));
    } else {
        for (i, l) in wrap(&subtitle, 7.0, Weight::Regular, room).iter().take(2).enumerate() {
            items.push(text(
                Point::new(left, top - 9.4 - 3.0 * i as f64),
                l,
                7.0,
                Weight::Regular,
                Anchor::Start,
            ));
        }
    }
    items.push(Item::Line {
        from: Point::new(left, top - 14.0),
        to: Point::new(bx.min.x - 3.0, top - 14.0),
        stroke: Stroke::solid(0.2),
    });
    items
}

fn caution(r: &Rect, t: &Templates) -> Result<Vec<Item>, Misfit> {
    let b = fit::caution(&t.common.safety, r.width()).map_err(|why| Misfit {
        file: "common.toml".into(),
        field: "safety".into(),
        why,
    })?;
    let mut out = Vec::new();
    for (i, l) in b.lines.iter().enumerate() {
        let y = r.max.y - 3.0 - i as f64 * leading(b.size_pt);
        out.push(Item::Text {
            at: Point::new(r.min.x, y),
            text: l.clone(),
            size_pt: b.size_pt,
            weight: Weight::Regular,
            anchor: Anchor::Start,
            rotate_deg: 0.0,
            gray: 0.15,
        });
    }
    Ok(out)
}

fn fill(template: &str, p: &SheetPlan, w: &Words) -> String {
    let piece = p.piece_label.clone().unwrap_or_else(|| w.fill("piece_unnamed", &[("id", &p.piece_id)]));
    template.replace("{piece}", &piece).replace("{entry}", &p.view().entry_words(w))
}

fn text_block(p: &SheetPlan, r: &Rect, t: &Templates, role: Role) -> Result<Vec<Item>, Misfit> {
    let st = sheet_text(p, t);
    let file = p.view().template();
    let mut out = Vec::new();
    let mut y = r.max.y - 3.0;
    let rows_text = p.view().table_rows(role == Role::Key, &t.words);
    let rows = rows_text.len() + 1;
    let widths = p.view().table_widths();
    // Room for each column heading: the column less 1 mm either side.
    let head_room: Vec<f64> = widths.iter().map(|f| f * r.width() - 2.0).collect();
    let column_error = |(j, why): (usize, String)| Misfit {
        file: file.to_string(),
        field: format!("columns[{}]", j + 1),
        why,
    };
    // Whether a heading wraps does not depend on the table's size: only on the smallest size.
    let two_line_head =
        fit::column_heads(&st.columns, &head_room, fit::FLOOR_PT).map_err(column_error)?.wrapped();
    let head_min = if two_line_head { fit::two_line_row_mm() } else { fit::MIN_ROW_MM };
    let (lines, size): (Vec<String>, f64) =
        match role {
            Role::Student => {
                let filled: Vec<String> = st.instructions.iter().map(|l| fill(l, p, &t.words)).collect();
                let table_mm = head_min + (rows - 1) as f64 * fit::MIN_ROW_MM;
                let b = fit::paragraphs(&filled, r.width(), r.height(), table_mm).map_err(|(i, why)| {
                    Misfit { file: file.to_string(), field: format!("instructions[{}]", i + 1), why }
                })?;
                (b.lines, b.size_pt)
            }
            Role::Key => {
                let table_mm = head_min + (rows - 1) as f64 * fit::MIN_ROW_MM;
                key_text(&p.key_lines(&t.words), r, table_mm, &t.words)?
            }
        };
    let lead = leading(size);
    for l in &lines {
        out.push(text(Point::new(r.min.x, y), l, size, Weight::Regular, Anchor::Start));
        y -= lead;
    }
    // The measurement table.
    let avail = y - r.min.y - 1.0;
    let row_h = if two_line_head {
        ((avail - head_min) / (rows - 1).max(1) as f64).clamp(fit::MIN_ROW_MM, 6.0)
    } else {
        (avail / rows as f64).clamp(fit::MIN_ROW_MM, 6.0)
    };
    let head_h = if two_line_head { head_min.max(row_h) } else { row_h };
    let mut x = r.min.x;
    let xs: Vec<f64> = widths
        .iter()
        .map(|f| {
            let x0 = x;
            x += f * r.width();
            x0
        })
        .collect();
    let top = y + 0.8;
    let stroke = Stroke::solid(0.2);
    let tsize = if row_h < 4.4 { fit::FLOOR_PT } else { 7.5 };
    // Every cell on as many lines as its column needs (a key's long outcome
    // words on narrow paper); a row is as tall as its tallest cell.
    let graded = p.view().graded_column();
    let weight_of = |j: usize| if j == graded && role == Role::Key { Weight::Bold } else { Weight::Regular };
    let cell_lines: Vec<Vec<Vec<String>>> = rows_text
        .iter()
        .map(|row| {
            row.iter()
                .enumerate()
                .take(xs.len())
                .map(|(j, c)| {
                    let room = widths[j] * r.width() - 2.0;
                    if crate::font::text_width_mm(c, tsize, weight_of(j)) <= room {
                        vec![c.clone()]
                    } else {
                        wrap(c, tsize, weight_of(j), room)
                    }
                })
                .collect()
        })
        .collect();
    let lead_t = leading(tsize);
    let row_hs: Vec<f64> = cell_lines
        .iter()
        .map(|cells| {
            let n = cells.iter().map(Vec::len).max().unwrap_or(1);
            if n <= 1 { row_h } else { row_h.max(n as f64 * lead_t + 1.2) }
        })
        .collect();
    // The heading row (taller when a heading wraps), then the data rows.
    let row_top = |k: usize| {
        if k == 0 { top } else { top - head_h - row_hs.iter().take(k - 1).sum::<f64>() }
    };
    for k in 0..=rows {
        let yy = row_top(k);
        out.push(Item::Line { from: Point::new(r.min.x, yy), to: Point::new(r.max.x, yy), stroke });
    }
    for &xx in xs.iter().chain(std::iter::once(&r.max.x)) {
        out.push(Item::Line { from: Point::new(xx, top), to: Point::new(xx, row_top(rows)), stroke });
    }
    // Column headings at the table's size, or smaller, or on two lines; never cut.
    let heads = fit::column_heads(&st.columns, &head_room, tsize).map_err(column_error)?;
    let head_lead = leading(heads.size_pt);
    for (j, head) in heads.lines.iter().enumerate().take(xs.len()) {
        // The last line where a one-line heading sits, earlier lines above it.
        for (i, l) in head.iter().enumerate() {
            let yy = row_top(1) + head_h.min(row_h) * 0.3 + (head.len() - 1 - i) as f64 * head_lead;
            out.push(text(Point::new(xs[j] + 1.0, yy), l, heads.size_pt, Weight::Bold, Anchor::Start));
        }
    }
    for (k, cells) in cell_lines.iter().enumerate() {
        // The last line where a one-line cell sits, earlier lines above it.
        let base = row_top(k + 2) + row_h * 0.3;
        let n = cells.iter().map(Vec::len).max().unwrap_or(1);
        for (j, lines) in cells.iter().enumerate() {
            for (i, l) in lines.iter().enumerate() {
                let yy = base + (n - 1 - i) as f64 * lead_t;
                out.push(text(Point::new(xs[j] + 1.0, yy), l, tsize, weight_of(j), Anchor::Start));
            }
        }
    }
    Ok(out)
}

/// The key's lines at 6.8 pt, or at the smallest size when they need it, so
/// the measurement table still fits under them; else the `words.toml` key
/// of the longest line is refused.
fn key_text(key_lines: &[String], r: &Rect, table_mm: f64, w: &Words) -> Result<(Vec<String>, f64), Misfit> {
    let room = r.height() - 4.0 - table_mm;
    for pt in [6.8, fit::FLOOR_PT] {
        let lines: Vec<String> =
            key_lines.iter().flat_map(|l| wrap(l, pt, Weight::Regular, r.width())).collect();
        let fits = lines.iter().all(|l| crate::font::text_width_mm(l, pt, Weight::Regular) <= r.width());
        if fits && lines.len() as f64 * leading(pt) <= room {
            return Ok((lines, pt));
        }
    }
    let longest = key_lines.iter().max_by_key(|l| l.chars().count()).cloned().unwrap_or_default();
    let n = key_lines.iter().map(|l| wrap(l, fit::FLOOR_PT, Weight::Regular, r.width()).len()).sum::<usize>();
    Err(Misfit {
        file: templates::WORDS_FILE.into(),
        field: w.key_of(&longest).unwrap_or("?").to_string(),
        why: format!(
            "the answer key's text wraps to {n} lines at {} pt, the smallest size, on a {:.0} mm line, and the text block holds {:.0} above the measurement table; this is its longest line (\"{}\"); shorten it",
            fit::FLOOR_PT,
            r.width(),
            (room / leading(fit::FLOOR_PT)).floor().max(0.0),
            fit::quote(&longest, 40)
        ),
    })
}

/// The scale bars' three labels at their sizes: (text, pt) for the 100 mm
/// bar's label, the hint under it and the 50 mm bar's label.
struct ScaleLabels {
    across: (String, f64),
    hint: (String, f64),
    up: (String, f64),
}

/// Room for the horizontal bar's label and hint: from the bar's start to
/// 3 mm short of the vertical bar, whose ticks and turned label sit at the right.
fn label_room(r: &Rect) -> f64 {
    (r.max.x - 6.0) - (r.min.x + 1.0)
}

/// The 50 mm bar's label runs along it, turned: it may be as long as the bar.
const UP_LABEL_MM: f64 = 50.0;

fn scale_labels(r: &Rect, t: &Templates) -> Result<ScaleLabels, Misfit> {
    let c = &t.common;
    let fit = |field: &str, s: &str, sizes: &[f64], weight: Weight, room: f64, place: &str| {
        fit::one_line(s, sizes, weight, room).map(|pt| (s.to_string(), pt)).map_err(|why| Misfit {
            file: "common.toml".into(),
            field: field.into(),
            why: format!("{place}, {why}"),
        })
    };
    Ok(ScaleLabels {
        across: fit(
            "scale_check",
            &c.scale_check,
            &fit::SMALL_PT,
            Weight::Bold,
            label_room(r),
            "over the 100 mm scale bar",
        )?,
        hint: fit(
            "scale_hint",
            &c.scale_hint,
            &[fit::FLOOR_PT],
            Weight::Regular,
            label_room(r),
            "under the 100 mm scale bar",
        )?,
        up: fit(
            "scale_check_vertical",
            &c.scale_check_vertical,
            &fit::SMALL_PT,
            Weight::Bold,
            UP_LABEL_MM,
            "along the 50 mm scale bar",
        )?,
    })
}

/// The 100 mm scale bar from `(x0, y)` to the right, its label above and the
/// hint below.
fn across_bar(x0: f64, y: f64, labels: &ScaleLabels) -> Vec<Item> {
    let bar = Stroke::solid(0.35);
    let mut out = vec![Item::Line { from: Point::new(x0, y), to: Point::new(x0 + 100.0, y), stroke: bar }];
    for k in 0..=10 {
        let x = x0 + 10.0 * f64::from(k);
        let len = if k % 5 == 0 { 2.5 } else { 1.3 };
        out.push(Item::Line {
            from: Point::new(x, y),
            to: Point::new(x, y + len),
            stroke: Stroke::solid(0.2),
        });
    }
    out.push(text(Point::new(x0, y + 3.6), &labels.across.0, labels.across.1, Weight::Bold, Anchor::Start));
    out.push(text(Point::new(x0, y - 3.6), &labels.hint.0, labels.hint.1, Weight::Regular, Anchor::Start));
    out
}

/// The 50 mm scale bar up from `(vx, vy0)`, ticks to the left and its label
/// turned along it.
fn up_bar(vx: f64, vy0: f64, labels: &ScaleLabels) -> Vec<Item> {
    let mut out = vec![Item::Line {
        from: Point::new(vx, vy0),
        to: Point::new(vx, vy0 + 50.0),
        stroke: Stroke::solid(0.35),
    }];
    for k in 0..=5 {
        let yy = vy0 + 10.0 * f64::from(k);
        out.push(Item::Line {
            from: Point::new(vx, yy),
            to: Point::new(vx - 2.0, yy),
            stroke: Stroke::solid(0.2),
        });
    }
    out.push(Item::Text {
        at: Point::new(vx - 3.0, vy0 + 25.0),
        text: labels.up.0.clone(),
        size_pt: labels.up.1,
        weight: Weight::Bold,
        anchor: Anchor::Middle,
        rotate_deg: 90.0,
        gray: 0.0,
    });
    out
}

fn side_block(p: &SheetPlan, r: &Rect, labels: &ScaleLabels, role: Role, w: &Words) -> Vec<Item> {
    // Scale checks: 100 mm across at the bottom, 50 mm up at the right.
    side_block_rest(p, r, Some(r.max.x - 3.0), labels, role, w)
}

/// The side block with the 50 mm bar elsewhere (the compact layout's strip):
/// the plot or note may run to the block's right edge.
fn side_block_without_up_bar(
    p: &SheetPlan,
    r: &Rect,
    labels: &ScaleLabels,
    role: Role,
    w: &Words,
) -> Vec<Item> {
    side_block_rest(p, r, None, labels, role, w)
}

/// The 100 mm bar at the bottom of the side block, the 50 mm bar at `up_x`
/// (if here), and above the 100 mm bar, left of the 50 mm one, the key's plot
/// or the student note.
fn side_block_rest(
    p: &SheetPlan,
    r: &Rect,
    up_x: Option<f64>,
    labels: &ScaleLabels,
    role: Role,
    w: &Words,
) -> Vec<Item> {
    let y = r.min.y + 6.0;
    let mut out = across_bar(r.min.x + 1.0, y, labels);
    let right = match up_x {
        Some(vx) => {
            out.extend(up_bar(vx, r.min.y + 4.0, labels));
            vx - 6.0
        }
        None => r.max.x - 1.0,
    };
    let upper = Rect { min: Point::new(r.min.x, y + 8.0), max: Point::new(right, r.max.y) };
    if role == Role::Key && upper.height() > 20.0 {
        out.extend(p.view().key_plot(upper, w));
    } else if role == Role::Student && upper.height() > 20.0 && !p.view().student_plot(upper, w).is_empty() {
        out.extend(p.view().student_plot(upper, w));
    } else if role == Role::Student
        && let Some(msg) = p.view().student_note(w)
    {
        // Wrapped to the room left of the vertical scale bar, the last line where one line would be.
        let lines = wrap(&msg, BODY_PT, Weight::Regular, upper.width());
        let n = lines.len() as f64;
        for (i, l) in lines.iter().enumerate() {
            let y = upper.min.y + 6.0 + (n - 1.0 - i as f64) * leading(BODY_PT);
            out.push(text(Point::new(upper.min.x, y), l, BODY_PT, Weight::Regular, Anchor::Start));
        }
    }
    out
}
