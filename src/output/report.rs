//! Readable text tables for `check` and `solve`.

use std::fmt::Write;

use crate::kit::Kit;
use crate::optics::{Entry, Paraxial};
use crate::plan::{SheetPlan, fmt_mm};

fn opt(v: Option<f64>) -> String {
    // Adding 0.0 turns −0.0 into 0.0; values that round to zero print unsigned.
    v.map(|x| if x.abs() < 0.005 { "0.00".to_string() } else { format!("{:.2}", x + 0.0) })
        .unwrap_or_else(|| "none".into())
}

/// The pieces table: faces, sizes, index, edge thickness, focal lengths.
pub fn pieces_table(kit: &Kit) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "Pieces");
    let _ = writeln!(
        s,
        "  {:<10} {:<28} {:>7} {:>7} {:>8} {:>6} {:>11} {:>9} {:>12}",
        "id", "front / back", "t mm", "H mm", "edge mm", "n", "thin f mm", "EFL mm", "BFL mm"
    );
    for p in &kit.pieces {
        let px = Paraxial::of(&p.piece, Entry::Front);
        let _ = writeln!(
            s,
            "  {:<10} {:<28} {:>7.2} {:>7.2} {:>8.2} {:>6.3} {:>11} {:>9} {:>12}",
            p.id,
            format!("{} / {}", p.piece.front().describe(), p.piece.back().describe()),
            p.piece.thickness_mm(),
            p.piece.height_mm(),
            p.piece.edge_thickness_mm(),
            p.piece.index(),
            opt(px.thin_lens_focal_mm()),
            opt(px.efl_mm()),
            opt(px.bfl_mm()),
        );
    }
    if kit.pieces.is_empty() {
        let _ = writeln!(s, "  none yet: add [[pieces]] entries (see README.md for the fields)");
    } else {
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
        p.entry.as_str()
    );
    let px = &p.paraxial;
    let _ =
        writeln!(s, "  thin-lens focal length (lens maker's formula): {} mm", opt(px.thin_lens_focal_mm()));
    let front = match px.front_focal_mm() {
        Some(d) if d < 0.0 => format!("{} mm after the entry vertex (virtual)", opt(Some(-d))),
        d => format!("{} mm before the entry vertex", opt(d)),
    };
    let back = match px.bfl_mm() {
        Some(b) if b < 0.0 => format!("{} mm before the exit vertex (virtual)", opt(Some(-b))),
        b => format!("{} mm after the exit vertex", opt(b)),
    };
    let _ = writeln!(s, "  thick piece: EFL {} mm; rear focus {back}; front focus {front}", opt(px.efl_mm()));
    let _ = writeln!(
        s,
        "  principal planes: front {} mm from the entry vertex, rear {} mm from the exit vertex",
        opt(px.front_principal_mm()),
        opt(px.rear_principal_mm())
    );
    match &p.band {
        Some(b) => {
            let _ = writeln!(s, "  safe band: {:.1} to {:.1} mm either side of the axis", b.min_mm, b.max_mm);
            let _ = writeln!(s, "    lower end: {}", b.min_reason);
            let _ = writeln!(s, "    upper end: {}", b.max_reason);
        }
        None => {
            let _ = writeln!(s, "  safe band: none");
        }
    }
    let _ = writeln!(
        s,
        "  {:<3}  {:>9}  {:<26} {:>12} {:>11} {:>9} {:>8}  exit face",
        "ray", "height mm", "outcome", "from entry", "from exit", "angle °", "± mm"
    );
    for r in &p.rays {
        let _ = writeln!(
            s,
            "  {:<3}  {:>9}  {:<26} {:>12} {:>11} {:>9} {:>8}  {}",
            r.letter,
            fmt_mm(r.height_mm),
            r.trace.outcome.as_str(),
            opt(r.crossing_from_entry_mm),
            opt(r.crossing_from_exit_mm),
            r.exit_angle_deg.map(|a| format!("{a:.1}")).unwrap_or_else(|| "-".into()),
            r.tolerance_mm.map(|a| format!("{a:.1}")).unwrap_or_else(|| "-".into()),
            r.exit_face.unwrap_or("-")
        );
        if let Some([a, b]) = r.trace_back {
            let _ = writeln!(
                s,
                "  {:<3}  {:>9}  trace-back points ({:.1}, {:.1}) and ({:.1}, {:.1}) mm from the entry vertex",
                "", "", a.x, a.y, b.x, b.y
            );
        }
    }
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
