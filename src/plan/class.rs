//! Class sets: every group gets its own guide heights (and, where the sheet
//! allows, entry side), drawn inside each sheet's safe band on a ruler grid.

use super::variants::{draw_code, sheet_stream, shuffle};
use super::{SheetPlan, plan_sheet, plan_sheet_in_band, safe_band, to_grid};
use crate::kit::{Kit, SheetKind, SheetSpec};
use crate::optics::{Entry, Outline, Paraxial};
use crate::paper::PaperSpec;

/// One group of a class set.
#[derive(Clone, Debug, PartialEq)]
pub struct Group {
    /// The name exactly as given (printed on the sheets).
    pub name: String,
    /// A safe folder name for its files (`03-bench-c`).
    pub folder: String,
}

/// The plans of a class set, group by group.
#[derive(Clone, Debug, PartialEq)]
pub struct ClassPlan {
    /// The groups in order.
    pub groups: Vec<Group>,
    /// `plans[g]` holds group g's sheets in kit order.
    pub plans: Vec<Vec<SheetPlan>>,
    /// Things the teacher should know (a band too narrow for distinct variants…).
    pub notes: Vec<String>,
    /// The seed used.
    pub seed: u64,
}

/// One way to set up a sheet for a group.
#[derive(Clone, Debug, PartialEq)]
struct Setting {
    entry: Entry,
    heights: Vec<f64>,
}

/// The safe band for one entry side of a sheet.
fn band_for(kit: &Kit, spec: &SheetSpec, paper: &PaperSpec, entry: Entry) -> Option<super::SafeBand> {
    let piece = kit.pieces[spec.piece].piece;
    let outline = Outline::new(piece, entry);
    let lead = super::lead_in_for(&Paraxial::of(&piece, entry), paper);
    safe_band(&outline, &super::rules_for(kit, paper, &outline, lead))
}

fn grid_values(lo: f64, hi: f64, grid: f64) -> Vec<f64> {
    let a = (lo / grid - 1e-9).ceil() as i64;
    let b = (hi / grid + 1e-9).floor() as i64;
    (a..=b).map(|k| k as f64 * grid).collect()
}

/// Every allowed setting of a sheet, in a fixed order. `band(entry)` is the
/// sheet's safe band for that entry side, worked out once by the caller.
fn settings(kit: &Kit, spec: &SheetSpec, band: &dyn Fn(Entry) -> Option<super::SafeBand>) -> Vec<Setting> {
    let piece = kit.pieces[spec.piece].piece;
    let grid = kit.class.grid_mm;
    let w = kit.ray_box.ray_width_mm;
    if let Some(h) = &spec.heights_mm {
        return vec![Setting { entry: spec.entry, heights: h.clone() }];
    }
    // Turning round a piece whose two faces are alike gives the same setup, so
    // it adds no variety.
    let symmetric = piece.front() == piece.back();
    let entries =
        if spec.vary_entry && !symmetric { vec![spec.entry, spec.entry.flipped()] } else { vec![spec.entry] };
    let mut out = Vec::new();
    for entry in entries {
        let Some(band) = band(entry) else { continue };
        match spec.kind {
            SheetKind::CurvedFace => {
                // A symmetric pair ±low (rays at the same height on both sides
                // cross at the same point) and one high ray on either side
                // (spherical aberration), at least two ray widths apart.
                let values = grid_values(band.min_mm, band.max_mm, grid);
                let mid = band.min_mm + band.width() * 0.6;
                for &low in values.iter().filter(|&&v| v <= mid) {
                    for &high in values.iter().filter(|&&v| v - low >= 2.0 * w) {
                        for side in [1.0, -1.0] {
                            let mut hs = vec![low, -low, side * high];
                            hs.sort_by(|a, b| b.total_cmp(a));
                            out.push(Setting { entry, heights: hs });
                        }
                    }
                }
                if out.is_empty() {
                    for &low in &values {
                        out.push(Setting { entry, heights: vec![low, -low] });
                    }
                }
            }
            SheetKind::Focal => {
                // The ray box's comb, moved up or down by a grid step: every ray
                // must stay below the band's upper end.
                let n = kit.ray_box.rays;
                let s = kit.ray_box.spacing_mm;
                for off in grid_values(-s / 2.0 + grid, s / 2.0, grid) {
                    let hs: Vec<f64> = (0..n)
                        .rev()
                        .map(|i| to_grid(off + (f64::from(i) - f64::from(n - 1) / 2.0) * s, grid / 4.0))
                        .collect();
                    if hs.iter().all(|h| h.abs() <= band.max_mm) {
                        out.push(Setting { entry, heights: hs });
                    }
                }
            }
        }
    }
    out
}

/// Plans a class set: for each sheet, all allowed settings are shuffled with
/// that sheet's ChaCha8 stream and dealt to the groups in order, so groups
/// differ wherever the band has room; then each group–sheet gets a unique
/// variant code.
pub fn plan_class(kit: &Kit, paper: &PaperSpec, groups: Vec<Group>, seed: u64) -> ClassPlan {
    let mut notes = Vec::new();
    let mut plans: Vec<Vec<SheetPlan>> = vec![Vec::new(); groups.len()];
    for spec in &kit.sheets {
        let bands = [band_for(kit, spec, paper, Entry::Front), band_for(kit, spec, paper, Entry::Back)];
        let band = |e: Entry| bands[usize::from(e == Entry::Back)].clone();
        let mut options = settings(kit, spec, &band);
        let mut rng = sheet_stream(seed, spec.number);
        let piece = kit.pieces[spec.piece].piece;
        if spec.vary_entry && piece.front() == piece.back() {
            notes.push(format!(
                "sheet {}: piece {} has two alike faces, so turning it round (vary_entry) gives no new settings",
                spec.number, kit.pieces[spec.piece].id
            ));
        }
        if spec.heights_mm.is_some() {
            notes.push(format!(
                "sheet {} has fixed heights_mm, so every group gets the same guide heights",
                spec.number
            ));
        } else if options.is_empty() {
            notes.push(format!(
                "sheet {}: no guide heights qualify, so every group gets the default heights",
                spec.number
            ));
        } else if options.len() < groups.len() {
            notes.push(format!(
                "sheet {}: the safe band has room for only {} different setting(s) for {} groups, so some groups share guide heights",
                spec.number,
                options.len(),
                groups.len()
            ));
        }
        shuffle(&mut rng, &mut options);
        for (g, group) in groups.iter().enumerate() {
            let plan = match options.get(g % options.len().max(1)) {
                Some(o) => plan_sheet_in_band(kit, spec, paper, o.entry, Some(&o.heights), band(o.entry)),
                None => plan_sheet(kit, spec, paper, spec.entry, None),
            };
            let mut plan = plan;
            plan.group = Some(group.name.clone());
            plans[g].push(plan);
        }
    }
    let mut codes_rng = sheet_stream(seed, 0);
    let mut used = std::collections::BTreeSet::new();
    for group_plans in &mut plans {
        for p in group_plans.iter_mut() {
            let code = loop {
                let c = draw_code(&mut codes_rng);
                if used.insert(c.clone()) {
                    break c;
                }
            };
            p.variant = Some(code);
        }
    }
    ClassPlan { groups, plans, notes, seed }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grid_values_are_inclusive_and_on_the_grid() {
        assert_eq!(grid_values(2.2, 4.0, 0.5), vec![2.5, 3.0, 3.5, 4.0]);
        assert!(grid_values(3.1, 3.4, 0.5).is_empty());
    }
}
