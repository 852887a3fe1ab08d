//! What every sheet kind shares: the 1-D safe band, ray letters, the seeded
//! variant stream and codes, groups, rosters and folder names. Data, not drawing,
//! and nothing particular to one kind of sheet.

mod folders;
mod letters;
mod roster;
mod roster_text;
pub mod scan;
pub mod variants;

pub use folders::{folder_names, slug};
pub use letters::{RAY_LETTERS, ray_letters, top_down};
pub use roster::{RosterError, parse_roster, read_roster};
pub use roster_text::{RosterEncoding, decode_roster};

/// One group of a class set.
#[derive(Clone, Debug, PartialEq)]
pub struct Group {
    /// The name exactly as given (printed on the sheets).
    pub name: String,
    /// A safe folder name for its files (`03-bench-c`).
    pub folder: String,
}

/// Rounds to the nearest multiple of `grid`.
pub fn to_grid(v: f64, grid: f64) -> f64 {
    (v / grid).round() * grid
}

/// A length for messages: integers without decimals, else one decimal.
pub fn fmt_mm(v: f64) -> String {
    if (v - v.round()).abs() < 1e-9 { format!("{}", v.round()) } else { format!("{v:.1}") }
}

/// An index of refraction as printed: at most 4 decimals, trailing zeros
/// dropped (1.5, 1.49, 1.4901). A formula's n is known to about 2×10⁻⁴ at best
/// (Beadie et al.'s stated accuracy, DESIGN.md), so more digits say nothing.
pub fn fmt_index(n: f64) -> String {
    let s = format!("{n:.4}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// One decimal, with −0.0 written as 0.0 (adding +0.0 does that in IEEE 754).
pub fn fmt1(v: f64) -> String {
    format!("{:.1}", v + 0.0)
}

/// Two decimals, `0.00` for anything that rounds to zero (no "−0.00"), and
/// `none` for no value.
pub fn fmt2_or_none(v: Option<f64>) -> String {
    v.map(|x| if x.abs() < 0.005 { "0.00".to_string() } else { format!("{:.2}", x + 0.0) })
        .unwrap_or_else(|| "none".into())
}

#[cfg(test)]
mod tests {
    use super::fmt_index;

    #[test]
    fn an_index_prints_with_at_most_four_decimals() {
        assert_eq!(fmt_index(1.5), "1.5");
        assert_eq!(fmt_index(1.49), "1.49");
        assert_eq!(fmt_index(1.491), "1.491");
        // Beadie's PMMA at 656.3 nm, n = 1.490066 (computed from DESIGN.md's formula).
        assert_eq!(fmt_index(1.4900659704496255), "1.4901");
        assert_eq!(fmt_index(2.0), "2");
    }
}
