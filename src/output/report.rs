//! Readable text tables for `check` and `solve`.

use std::fmt::Write;

use crate::kit::Kit;
use crate::optics::{Entry, Paraxial, Piece};
use crate::plan::fmt2_or_none;
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
