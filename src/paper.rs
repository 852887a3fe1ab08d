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

/// The named sizes: ISO 216 A4 210 × 297 mm, A3 297 × 420 mm and A5
/// 148 × 210 mm; US Letter 8.5 × 11 in, Legal 8.5 × 14 in, Tabloid 11 × 17 in
/// (1 in = 25.4 mm).
pub const NAMED_SIZES: &[(&str, f64, f64)] = &[
    ("A4", 210.0, 297.0),
    ("A5", 148.0, 210.0),
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

/// The calibration page's rulers: 180 mm along the paper's long edge and
/// 120 mm along its short edge (both fit A5 and up with 10 mm margins).
pub const LONG_RULER_MM: f64 = 180.0;
/// See [`LONG_RULER_MM`].
pub const SHORT_RULER_MM: f64 = 120.0;

/// What a teacher measured on the calibration page their printer printed:
/// the page is then stretched by 180/long along the paper's long edge and
/// 120/short along its short edge, whatever the sheet's orientation.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PrinterCorrection {
    /// The 180 mm ruler as printed, mm.
    pub long_ruler_mm: f64,
    /// The 120 mm ruler as printed, mm.
    pub short_ruler_mm: f64,
}

impl PrinterCorrection {
    /// The stretch along the long and the short edge.
    pub fn factors(&self) -> (f64, f64) {
        (LONG_RULER_MM / self.long_ruler_mm, SHORT_RULER_MM / self.short_ruler_mm)
    }

    /// The stretch along a page's x and y axes: the long edge is x on a
    /// landscape page, y on a portrait one.
    pub fn page_factors(&self, width_mm: f64, height_mm: f64) -> (f64, f64) {
        let (long, short) = self.factors();
        if width_mm >= height_mm { (long, short) } else { (short, long) }
    }

    /// The larger of the two corrections, as a fraction (0.012 for 1.2 %).
    pub fn largest(&self) -> f64 {
        let (a, b) = self.factors();
        (a - 1.0).abs().max((b - 1.0).abs())
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

/// The bands every sheet page keeps outside the setup drawing, mm. The layout
/// draws them; the paper check uses them to tell whether a drawing fits at all,
/// so they live here, below both.
pub mod bands {
    /// The header (heading, subtitle, identity box) at the top.
    pub const HEADER_MM: f64 = 15.0;
    /// The safety caution at the bottom.
    pub const CAUTION_MM: f64 = 8.0;
    /// Instructions and the measurement table.
    pub const TEXT_BLOCK_MM: f64 = 58.0;
    /// Scale checks and the plot or tile map (stacked under the text block on narrow pages).
    pub const SIDE_BLOCK_MM: f64 = 56.0;
    /// Space between the text block and the drawing.
    pub const GAP_MM: f64 = 3.0;
    /// Printable width from which the text and side blocks sit side by side.
    pub const SIDE_BY_SIDE_FROM_MM: f64 = 250.0;
    /// Smallest drawing window, mm on each side: well above the 12 mm tile
    /// overlap, so a tiled setup advances at least 28 mm a page.
    pub const MIN_DRAWING_MM: f64 = 40.0;
}

impl PaperSpec {
    /// Width and height of the page for a drawing whose long direction is
    /// horizontal (the optical axis): landscape for `Auto`, unless a landscape
    /// page leaves no room for the drawing (small paper such as A5) and a
    /// portrait one does.
    pub fn page_mm(&self) -> (f64, f64) {
        let portrait = (self.size.width_mm, self.size.height_mm);
        let landscape = (self.size.height_mm, self.size.width_mm);
        match self.orientation {
            Orientation::Portrait => portrait,
            Orientation::Landscape => landscape,
            Orientation::Auto if !self.fits(landscape) && self.fits(portrait) => portrait,
            Orientation::Auto => landscape,
        }
    }

    /// The setup drawing's window on a page of `page` (width, height) mm with
    /// this margin: the printable width, and the height left under the header
    /// and above the text, side and caution bands.
    pub fn drawing_window_mm(&self, page: (f64, f64)) -> (f64, f64) {
        use bands::*;
        let m = self.margin_mm;
        let width = page.0 - 2.0 * m;
        let below = if width >= SIDE_BY_SIDE_FROM_MM {
            CAUTION_MM + TEXT_BLOCK_MM
        } else {
            CAUTION_MM + SIDE_BLOCK_MM + TEXT_BLOCK_MM
        };
        (width, page.1 - 2.0 * m - below - GAP_MM - HEADER_MM)
    }

    fn fits(&self, page: (f64, f64)) -> bool {
        let (w, h) = self.drawing_window_mm(page);
        w >= bands::MIN_DRAWING_MM && h >= bands::MIN_DRAWING_MM
    }

    /// The smallest portrait paper that holds a sheet with this margin, mm:
    /// [`MIN_PRINTABLE_MM`] across, and the bands plus the smallest drawing down.
    pub fn smallest_paper_mm(&self) -> (f64, f64) {
        use bands::*;
        let m = self.margin_mm;
        let below = CAUTION_MM + SIDE_BLOCK_MM + TEXT_BLOCK_MM + GAP_MM + HEADER_MM;
        (MIN_PRINTABLE_MM + 2.0 * m, below + MIN_DRAWING_MM + 2.0 * m)
    }

    /// The largest margin, to 0.1 mm, that this paper and orientation accept
    /// (the printable width and the drawing area both count, so A5 allows
    /// 15 mm, not the 24 mm its width alone would); `None` when even no margin
    /// is too much. Room only shrinks as the margin grows, so a bisection over
    /// tenths of a millimetre finds it.
    pub fn largest_margin_mm(&self) -> Option<f64> {
        let ok = |tenths: i64| PaperSpec { margin_mm: tenths as f64 / 10.0, ..self.clone() }.check().is_ok();
        let width_limit = ((self.size.width_mm - MIN_PRINTABLE_MM) / 2.0).max(0.0);
        if !width_limit.is_finite() || !ok(0) {
            return None;
        }
        let (mut lo, mut hi) = (0_i64, (width_limit * 10.0).floor() as i64 + 1);
        // ok(lo) holds and ok(hi) fails (hi is past the width limit).
        while hi - lo > 1 {
            let mid = (lo + hi) / 2;
            if ok(mid) { lo = mid } else { hi = mid }
        }
        Some(lo as f64 / 10.0)
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
        let portrait = (self.size.width_mm, self.size.height_mm);
        let landscape = (self.size.height_mm, self.size.width_mm);
        let fits = match self.orientation {
            Orientation::Portrait => self.fits(portrait),
            Orientation::Landscape => self.fits(landscape),
            Orientation::Auto => self.fits(portrait) || self.fits(landscape),
        };
        if !fits {
            let (dw, dh) = self.drawing_window_mm(self.page_mm());
            let (min_w, min_h) = self.smallest_paper_mm();
            let turn = if self.orientation == Orientation::Landscape && self.fits(portrait) {
                "turn it to portrait (orientation portrait or auto), or "
            } else {
                ""
            };
            return Err(format!(
                "{} paper ({} × {} mm) with a {m} mm margin leaves a drawing area of {:.0} × {:.0} mm under the header, text, scale checks and caution; a sheet needs at least {min} × {min} mm: {turn}use paper at least {min_w:.0} × {min_h:.0} mm in portrait (A5, 148 × 210 mm, works with a margin up to 15 mm), or a smaller margin",
                self.size.name,
                self.size.width_mm,
                self.size.height_mm,
                dw.max(0.0),
                dh.max(0.0),
                min = bands::MIN_DRAWING_MM,
            ));
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn spec(size: PaperSize, orientation: Orientation) -> PaperSpec {
        PaperSpec { size, orientation, margin_mm: 10.0 }
    }

    /// The hint once said "up to 24 mm" on A5, from its width alone; the
    /// drawing area below the bands allows 15 mm (210 − 2m − 140 ≥ 40, the
    /// bands and the smallest drawing in [`bands`]).
    #[test]
    fn largest_margin_counts_the_drawing_area_not_only_the_width() {
        let a5 = spec(PaperSize::custom(148.0, 210.0), Orientation::Auto);
        assert_eq!(a5.largest_margin_mm(), Some(15.0));
        // A4 in portrait is limited by its width: (210 − 100) / 2.
        assert_eq!(spec(PaperSize::named("A4").unwrap(), Orientation::Auto).largest_margin_mm(), Some(55.0));
        // A4 in landscape: side by side until the printable width falls under 250 mm, (297 − 250) / 2.
        assert_eq!(
            spec(PaperSize::named("A4").unwrap(), Orientation::Landscape).largest_margin_mm(),
            Some(23.5)
        );
        assert_eq!(spec(PaperSize::custom(90.0, 400.0), Orientation::Auto).largest_margin_mm(), None);
        for p in [a5, spec(PaperSize::named("Letter").unwrap(), Orientation::Portrait)] {
            let m = p.largest_margin_mm().unwrap();
            assert!(PaperSpec { margin_mm: m, ..p.clone() }.check().is_ok());
            assert!(PaperSpec { margin_mm: m + 0.1, ..p.clone() }.check().is_err());
        }
    }
}
