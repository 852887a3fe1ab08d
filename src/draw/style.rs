//! Line weights, dash patterns and text sizes shared by every kind's drawings.
//!
//! Pencil lines are about 0.3–0.5 mm (common practice, no source); nothing is
//! printed smaller than 6.5 pt.

use crate::scene::Dash;

/// The piece's outline, mm.
pub const OUTLINE_W: f64 = 0.35;
/// Guide lines, mm.
pub const GUIDE_W: f64 = 0.3;
/// Normals, construction lines and angle arcs, mm.
pub const THIN_W: f64 = 0.2;
/// Traced rays on the key, mm.
pub const RAY_W: f64 = 0.3;
/// Grey of traced rays on the key, so they stay apart from the black guide lines.
pub const RAY_GRAY: f64 = 0.25;
/// Labels on the student sheet, pt.
pub const LABEL_PT: f64 = 7.5;
/// Values on the key, pt.
pub const VALUE_PT: f64 = 7.0;
/// The smallest text printed, pt.
pub const SMALL_PT: f64 = 6.5;
/// Normals and extended lines.
pub const LINE_DASH: Dash = Dash::Dashed { on_mm: 2.5, off_mm: 1.5 };
/// Finer dashes for a ray's backward extension, so it differs from a normal.
pub const EXTENSION_DASH: Dash = Dash::Dashed { on_mm: 1.2, off_mm: 1.0 };
