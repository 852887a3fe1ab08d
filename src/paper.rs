//! Paper sizes (ISO 216 and US), orientation and margin.

/// A sheet size in portrait (width ≤ height), mm.
#[derive(Clone, Debug, PartialEq)]
pub struct PaperSize {
    /// Name as shown to the user (`A4`, `Letter`, `custom`).
    pub name: String,
    /// Short side, mm.
    pub width_mm: f64,
    /// Long side, mm.
    pub height_mm: f64,
}

/// The named sizes: ISO 216 A4 210 × 297 mm and A3 297 × 420 mm; US Letter
/// 8.5 × 11 in, Legal 8.5 × 14 in, Tabloid 11 × 17 in (1 in = 25.4 mm).
pub const NAMED_SIZES: &[(&str, f64, f64)] = &[
    ("A4", 210.0, 297.0),
    ("A3", 297.0, 420.0),
    ("Letter", 215.9, 279.4),
    ("Legal", 215.9, 355.6),
    ("Tabloid", 279.4, 431.8),
];

impl PaperSize {
    /// A named size, case-insensitive. `None` for an unknown name.
    pub fn named(name: &str) -> Option<PaperSize> {
        NAMED_SIZES.iter().find(|(n, ..)| n.eq_ignore_ascii_case(name.trim())).map(|&(n, w, h)| PaperSize {
            name: n.to_string(),
            width_mm: w,
            height_mm: h,
        })
    }

    /// A custom size; the sides are sorted so width ≤ height.
    pub fn custom(a_mm: f64, b_mm: f64) -> PaperSize {
        PaperSize { name: "custom".into(), width_mm: a_mm.min(b_mm), height_mm: a_mm.max(b_mm) }
    }

    /// The accepted names, for hints.
    pub fn names() -> String {
        NAMED_SIZES.iter().map(|(n, ..)| *n).collect::<Vec<_>>().join(", ")
    }
}

/// How the page is turned.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Orientation {
    /// Long side vertical.
    Portrait,
    /// Long side horizontal.
    Landscape,
    /// Chosen per sheet: landscape, since the optical axis runs along the long side.
    Auto,
}

impl Orientation {
    /// Parses `portrait`, `landscape` or `auto`.
    pub fn parse(s: &str) -> Option<Orientation> {
        match s.trim().to_ascii_lowercase().as_str() {
            "portrait" => Some(Orientation::Portrait),
            "landscape" => Some(Orientation::Landscape),
            "auto" => Some(Orientation::Auto),
            _ => None,
        }
    }
}

/// Paper, orientation and printer margin, as resolved from the kit and the command line.
#[derive(Clone, Debug, PartialEq)]
pub struct PaperSpec {
    /// The sheet size.
    pub size: PaperSize,
    /// Orientation.
    pub orientation: Orientation,
    /// Margin kept clear on every side, mm (printers cannot print to the edge).
    pub margin_mm: f64,
}

impl Default for PaperSpec {
    fn default() -> PaperSpec {
        PaperSpec {
            size: PaperSize { name: "A4".into(), width_mm: 210.0, height_mm: 297.0 },
            orientation: Orientation::Auto,
            margin_mm: 10.0,
        }
    }
}

/// Smallest printable area we accept on each side after margins, mm.
pub const MIN_PRINTABLE_MM: f64 = 100.0;

impl PaperSpec {
    /// Width and height of the page for a drawing whose long direction is
    /// horizontal (the optical axis): landscape for `Auto`.
    pub fn page_mm(&self) -> (f64, f64) {
        match self.orientation {
            Orientation::Portrait => (self.size.width_mm, self.size.height_mm),
            Orientation::Landscape | Orientation::Auto => (self.size.height_mm, self.size.width_mm),
        }
    }

    /// Checks that the margin leaves a usable printable area. The error says why.
    pub fn check(&self) -> Result<(), String> {
        let m = self.margin_mm;
        if !(m.is_finite() && m >= 0.0) {
            return Err(format!(
                "margin {m} mm must be a number of millimetres, 0 or more (10 is a safe default)"
            ));
        }
        let short = self.size.width_mm - 2.0 * m;
        if short < MIN_PRINTABLE_MM {
            return Err(format!(
                "a margin of {m} mm on {} paper ({} × {} mm) leaves {short:.1} mm of printable width; at least {MIN_PRINTABLE_MM} mm is needed, so use a margin of at most {:.1} mm or larger paper",
                self.size.name,
                self.size.width_mm,
                self.size.height_mm,
                ((self.size.width_mm - MIN_PRINTABLE_MM) / 2.0).max(0.0)
            ));
        }
        Ok(())
    }
}
