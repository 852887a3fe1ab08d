//! Readable text tables for `check` and `solve`.

use std::fmt::Write;

use crate::kit::Kit;
use crate::layout;
use crate::optics::material::{C_LINE_NM, D_LINE_NM, F_LINE_NM};
use crate::optics::{Entry, PUBLISHED, Paraxial, Piece};
use crate::paper::{NAMED_SIZES, Orientation, PaperSize, PaperSpec};
use crate::plan::{fmt1, fmt2_or_none};
use crate::sheets::SheetPlan;

/// The pieces table: shape, sizes, index and, for lens shapes, edge thickness
/// and focal lengths.
pub fn pieces_table(kit: &Kit) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "Pieces");
    let _ = writeln!(
        s,
        "  {:<10} {:<28} {:>7} {:>7} {:>8} {:>6} {:>11} {:>9} {:>12}",
        "id", "front / back", "t mm", "H mm", "edge mm", "n", "thin f mm", "EFL mm", "BFL mm"
    );
    let mut any_lens = false;
    for p in &kit.pieces {
        match &p.piece {
            Piece::Lens(l) => {
                any_lens = true;
                let px = Paraxial::of(l, Entry::Front);
                let _ = writeln!(
                    s,
                    "  {:<10} {:<28} {:>7.2} {:>7.2} {:>8.2} {:>6.3} {:>11} {:>9} {:>12}",
                    p.id,
                    format!("{} / {}", l.front().describe(), l.back().describe()),
                    l.thickness_mm(),
                    l.height_mm(),
                    l.edge_thickness_mm(),
                    l.index(),
                    fmt2_or_none(px.thin_lens_focal_mm()),
                    fmt2_or_none(px.efl_mm()),
                    fmt2_or_none(px.bfl_mm()),
                );
            }
            Piece::Block(b) => {
                let _ = writeln!(
                    s,
                    "  {:<10} {:<28} {:>7.2} {:>7.2} {:>8} {:>6.3}",
                    p.id, "rectangular block", b.thickness_mm, b.height_mm, "-", b.index
                );
            }
            Piece::Prism(pr) => {
                let _ = writeln!(
                    s,
                    "  {:<10} {:<28} {:>7} {:>7} {:>8} {:>6.3}   apex {:.1}°, sides {:.1} mm, base {:.1} mm",
                    p.id,
                    if pr.is_right_angle() { "right-angle prism" } else { "prism" },
                    "-",
                    "-",
                    "-",
                    pr.index,
                    pr.apex_rad.to_degrees(),
                    pr.side_mm,
                    pr.base_mm()
                );
            }
        }
    }
    if kit.pieces.is_empty() {
        let _ = writeln!(s, "  none yet: add [[pieces]] entries (see README.md for the fields)");
    } else if any_lens {
        let _ = writeln!(
            s,
            "  (BFL for light entering the front face; each sheet below gives the values for its own entry side)"
        );
    }
    s
}

/// One sheet's values, band and rays as text.
pub fn sheet_table(p: &SheetPlan) -> String {
    let mut s = String::new();
    let who = match (&p.group, &p.variant) {
        (Some(g), Some(v)) => format!(" [{g}, variant {v}]"),
        _ => String::new(),
    };
    let _ = writeln!(
        s,
        "Sheet {}: {} with piece {}, light enters the {} face{who}",
        p.number,
        p.kind.as_str(),
        p.piece_id,
        p.view().entry_words(&crate::draw::Words::shipped())
    );
    s.push_str(&p.view().report());
    for w in &p.warnings {
        let _ = writeln!(s, "  warning: {w}");
    }
    s
}

/// The whole `check` report.
pub fn check_report(kit: &Kit, plans: &[SheetPlan]) -> String {
    let mut s = format!("{}\n\n", kit.title);
    s.push_str(&pieces_table(kit));
    if plans.is_empty() {
        s.push_str("\nNo sheets: add [[sheets]] entries to make student sheets.\n");
    }
    for p in plans {
        s.push('\n');
        s.push_str(&sheet_table(p));
    }
    s
}

/// How many pages each sheet takes on `paper` (the most over `plans`, which
/// may hold several plans of one sheet: a class set's groups), with a word on
/// each tiled sheet: its tiles and the smallest named paper that holds it on
/// one page. Sheet number → (pages, description).
pub fn sheet_pages<'a>(
    plans: impl Iterator<Item = &'a SheetPlan>,
    paper: &PaperSpec,
) -> std::collections::BTreeMap<usize, (usize, String)> {
    layout::memo_scope(|| sheet_pages_now(plans, paper))
}

fn sheet_pages_now<'a>(
    plans: impl Iterator<Item = &'a SheetPlan>,
    paper: &PaperSpec,
) -> std::collections::BTreeMap<usize, (usize, String)> {
    let mut worst: std::collections::BTreeMap<usize, (usize, &SheetPlan)> = std::collections::BTreeMap::new();
    for p in plans {
        let n = layout::pages_needed(p, paper);
        let e = worst.entry(p.number).or_insert((n, p));
        if n > e.0 {
            *e = (n, p);
        }
    }
    let turned = |p: &SheetPlan, on: &PaperSpec| match layout::paper_for(p, on).orientation {
        Orientation::Portrait => "portrait",
        _ => "landscape",
    };
    worst
        .into_iter()
        .map(|(number, (pages, p))| {
            let has_gauge = p.view().has_gauge();
            let gauge = if has_gauge { ", and its gauge page" } else { "" };
            if layout::fits_one_page(p, &layout::paper_for(p, paper)) {
                return (number, (pages, format!("one page ({}){gauge}", turned(p, paper))));
            }
            // The drawing's pages and the cover, without the gauge page.
            let pages_tiled = pages - usize::from(has_gauge);
            let t = layout::tiling_on(p, &layout::paper_for(p, paper));
            let setup = p.setup();
            let mut s = format!(
                "tiled over {pages_tiled} pages (the text on page 1, the drawing on {} pages, {} across × {} down, {}) for a setup {:.0} × {:.0} mm; ",
                t.pages(),
                t.columns,
                t.rows,
                turned(p, paper),
                setup.length(),
                setup.height()
            );
            // Named sizes of the paper's own family (ISO 216 A sizes, or US
            // sizes) first, each family from the smallest up; same margin;
            // turned as suits the sheet.
            let iso = |n: &str| n.starts_with('A');
            let ours = paper.size.name == "custom" || iso(&paper.size.name);
            let mut named: Vec<PaperSize> = NAMED_SIZES.iter().filter_map(|(n, ..)| PaperSize::named(n)).collect();
            named.sort_by(|a, b| {
                (iso(&a.name) != ours)
                    .cmp(&(iso(&b.name) != ours))
                    .then((a.width_mm * a.height_mm).total_cmp(&(b.width_mm * b.height_mm)))
            });
            let fits = named
                .into_iter()
                .map(|size| PaperSpec { size, orientation: Orientation::Auto, ..paper.clone() })
                .find(|on| on.check().is_ok() && layout::fits_one_page(p, &layout::paper_for(p, on)));
            match fits {
                Some(on) => s.push_str(&format!("one page of {} ({}) holds it", on.size.name, turned(p, &on))),
                None => s.push_str(
                    "no listed paper holds it on one page (give a larger --paper WIDTHxHEIGHT, or tape the pages together at the join marks)",
                ),
            }
            s.push_str(gauge);
            (number, (pages, s))
        })
        .collect()
}

/// The `check` report's paper section: every sheet's pages on `paper`.
pub fn paper_report<'a>(plans: impl Iterator<Item = &'a SheetPlan>, paper: &PaperSpec) -> String {
    let mut s = format!(
        "Paper: {} ({:.0} × {:.0} mm), {} mm margin\n",
        paper.size.name,
        paper.size.width_mm,
        paper.size.height_mm,
        fmt1(paper.margin_mm)
    );
    for (number, (_, words)) in sheet_pages(plans, paper) {
        let _ = writeln!(s, "  sheet {number}: {words}");
    }
    s
}

/// The `materials` listing: every built-in published material with its kit
/// word, source, formula and n at the F, d and C lines with its Abbe number.
pub fn materials_report() -> String {
    let mut s = String::new();
    let _ = writeln!(s, "Built-in materials: name one in a kit with [materials.NAME] catalog = \"…\"");
    let _ = writeln!(
        s,
        "  {:<22} {:<15} {:>11} {:>11} {:>11} {:>7}",
        "catalog",
        "material",
        format!("n {F_LINE_NM} nm"),
        format!("n {D_LINE_NM} nm"),
        format!("n {C_LINE_NM} nm"),
        "Abbe V"
    );
    for p in &PUBLISHED {
        let m = p.material();
        let v = m.abbe_number().map(|v| format!("{v:.2}")).unwrap_or_else(|| "-".into());
        let _ = writeln!(
            s,
            "  {:<22} {:<15} {:>11.5} {:>11.5} {:>11.5} {:>7}",
            p.word,
            p.substance,
            m.index_at(F_LINE_NM),
            m.index_at(D_LINE_NM),
            m.index_at(C_LINE_NM),
            v
        );
        let _ = writeln!(s, "      source: {}", p.citation);
        let _ = writeln!(s, "      formula: {}", p.form);
    }
    let _ = writeln!(
        s,
        "Abbe V = (n_d − 1)/(n_F − n_C) at these lines. Coefficients as stored in the refractiveindex.info database. Or give your own:\n  sellmeier = {{ b = [...], c_um2 = [...] }}   (n² − 1 = Σ bᵢλ²/(λ² − cᵢ), λ in µm)\n  index = 1.49                                (one index, no dispersion)"
    );
    s
}

/// The `kinds` listing: every sheet kind, from the kind modules themselves:
/// its kit word and title, the pieces it fits, and every field it reads with
/// its type, unit, range and default.
pub fn kinds_report() -> String {
    use crate::sheets::{SHARED_FIELDS, SheetKind};
    let mut s = String::new();
    let _ = writeln!(s, "Sheet kinds (kind = \"…\" in a [[sheets]] table, with piece = \"ID\"):");
    for kind in SheetKind::ALL {
        let def = kind.def();
        let _ = writeln!(s, "\n{}: {}", def.word(), def.title());
        let _ = writeln!(s, "  fits: {}", def.fits());
        for f in def.fields() {
            let _ = writeln!(s, "  {}", f.words());
        }
    }
    let shared: Vec<String> = SHARED_FIELDS.iter().map(|f| f.words()).collect();
    let _ = writeln!(s, "\nEvery kind also reads {}", shared.join("; "));
    let _ = writeln!(s, "`raysheet schema` gives each field's meaning, unit, range and default for editors.");
    s
}
