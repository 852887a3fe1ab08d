//! A setup larger than the one-page drawing window is printed as a cover page
//! and drawing pages ("tiles"). The cover has everything a one-page sheet has
//! but the drawing: header, instructions and table (or, on a key, the answers
//! and the plot), the scale checks, the caution, and a map of the tiles. The
//! tiles give the drawing the whole page but for a header, a footer (a note,
//! the 100 mm scale bar, a small map) and a strip at the right (the 50 mm bar).
//!
//! Tiles overlap by at least [`TILE_OVERLAP_MM`] and are spread evenly over the
//! setup, so no page holds a sliver; where a label would be cut by a tile's
//! edge, the next tile starts before the label, so every label is whole on at
//! least one page.

use super::{Regions, TILE_OVERLAP_MM, Tiling};
use crate::geom::Point;
use crate::paper::PaperSpec;
use crate::paper::bands::{CAUTION_MM, GAP_MM, HEADER_MM};
use crate::scene::Rect;
use crate::sheets::Setup;

/// The footer of a drawing page, above the caution: the note, the 100 mm bar
/// and the small map.
pub const FOOTER_MM: f64 = 20.0;
/// The strip at the right of a drawing page that holds the 50 mm bar.
pub const STRIP_MM: f64 = 11.0;

/// Room kept round a tiled setup for its labels, mm: on a one-page sheet
/// labels may use the whole window, on drawing pages only the tiled area.
pub const LABEL_MARGIN_MM: f64 = 10.0;

/// The area the drawing pages cover: the setup and [`LABEL_MARGIN_MM`] round it.
pub fn tiled_area(s: &Setup) -> Setup {
    Setup {
        x_min: s.x_min - LABEL_MARGIN_MM,
        x_max: s.x_max + LABEL_MARGIN_MM,
        y_min: s.y_min - LABEL_MARGIN_MM,
        y_max: s.y_max + LABEL_MARGIN_MM,
    }
}

/// The regions of a drawing page, page mm.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct TileRegions {
    /// The page's regions shared with a one-page sheet (header, caution);
    /// `drawing` is the tile's window.
    pub common: Regions,
    /// The footer, above the caution.
    pub footer: Rect,
    /// The strip at the right of the window, for the 50 mm bar.
    pub strip: Rect,
}

/// Works out a drawing page's regions for this paper.
pub fn tile_regions(paper: &PaperSpec) -> TileRegions {
    let mut common = super::regions(paper);
    let p = common.printable;
    let footer = Rect {
        min: Point::new(p.min.x, p.min.y + CAUTION_MM),
        max: Point::new(p.max.x, p.min.y + CAUTION_MM + FOOTER_MM),
    };
    let strip = Rect {
        min: Point::new(p.max.x - STRIP_MM, footer.max.y + GAP_MM),
        max: Point::new(p.max.x, p.max.y - HEADER_MM),
    };
    common.drawing = Rect {
        min: Point::new(p.min.x, footer.max.y + GAP_MM),
        max: Point::new(strip.min.x - 1.0, p.max.y - HEADER_MM),
    };
    TileRegions { common, footer, strip }
}

/// Where each tile's window starts along one direction: `n` windows of width
/// `window` cover `[min, min + length]`, spread evenly (every overlap the
/// same, at least [`TILE_OVERLAP_MM`]), then each start moved back, where it
/// can be, so that no label span in `labels` is cut by both neighbouring
/// windows. More windows are used when moving back leaves the end uncovered
/// (`pages_needed` counts them the same way, from the same labels).
pub fn starts(min: f64, length: f64, window: f64, n: usize, labels: &[(f64, f64)]) -> Vec<f64> {
    if n <= 1 {
        return vec![min];
    }
    let end = min + length;
    for n in n..n + 4 {
        let mut s = vec![min];
        for j in 1..n {
            let prev = s[j - 1];
            // The even share of what is left, never more than the window less the overlap.
            let left = (end - window - prev).max(0.0);
            let mut t = (prev + left / (n - j) as f64).min(prev + window - TILE_OVERLAP_MM);
            let edge = prev + window;
            // Move back before any label that the previous window cuts at its
            // right edge, or that this start would cut and the previous window
            // does not hold whole. Only back, so this ends.
            loop {
                let moved = labels
                    .iter()
                    .filter(|&&(lo, hi)| {
                        let cut_by_edge = lo < edge && hi > edge;
                        let cut_here = lo < t && hi > t && hi > edge - 0.5;
                        (cut_by_edge || cut_here) && hi - lo < window - 2.0
                    })
                    .map(|&(lo, _)| lo - 1.0)
                    .fold(t, f64::min);
                if moved >= t - 1e-9 || moved <= prev + 1.0 {
                    break;
                }
                t = moved;
            }
            s.push(t);
        }
        if s[n - 1] + window >= end - 1e-6 {
            return s;
        }
    }
    // Labels could not all be kept whole: spread evenly and accept the cut.
    let step = (length - window) / (n - 1) as f64;
    (0..n).map(|j| min + j as f64 * step).collect()
}

/// The tile windows' origins in the sheet frame: the left edge of each column
/// and the top edge of each row, for a setup and window; `labels` are the
/// drawing's text boxes, kept whole where the windows allow.
pub fn origins(s: &Setup, win: &Rect, tiling: Tiling, labels: &[Rect]) -> (Vec<f64>, Vec<f64>) {
    let xs: Vec<(f64, f64)> = labels.iter().map(|r| (r.min.x, r.max.x)).collect();
    // Rows run downwards from the top: measure down from y_max.
    let ys: Vec<(f64, f64)> = labels.iter().map(|r| (s.y_max - r.max.y, s.y_max - r.min.y)).collect();
    // A single column or row is centred in the window.
    let cols = if tiling.columns == 1 {
        vec![(s.x_min + s.x_max - win.width()) / 2.0]
    } else {
        starts(s.x_min, s.length(), win.width(), tiling.columns, &xs)
    };
    let rows = if tiling.rows == 1 {
        vec![(s.y_min + s.y_max + win.height()) / 2.0]
    } else {
        starts(0.0, s.height(), win.height(), tiling.rows, &ys).iter().map(|d| s.y_max - d).collect()
    };
    (cols, rows)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Issue 9 ("no page holds a sliver"): a 116 mm setup in a 106 mm window
    /// took a full page and a 22 mm sliver. Spread evenly, both tiles hold
    /// the same share and the overlap is wider than the minimum.
    #[test]
    fn tiled_page_holds_a_sliver() {
        let s = starts(0.0, 116.0, 106.0, 2, &[]);
        assert_eq!(s, vec![0.0, 10.0]);
        let s = starts(-50.0, 300.0, 120.0, 3, &[]);
        assert_eq!(s, vec![-50.0, 40.0, 130.0]);
        for w in s.windows(2) {
            assert!(w[1] - w[0] <= 120.0 - TILE_OVERLAP_MM);
        }
    }

    /// Issue 9 ("labels cut by tile edges"): an answer label across the edge
    /// of one tile and the start of the next was cut on both pages. Each label
    /// now lies whole inside at least one window.
    #[test]
    fn label_cut_by_both_tiles() {
        let (window, length) = (100.0, 250.0);
        for labels in
            [vec![(55.0, 80.0)], vec![(95.0, 110.0), (170.0, 196.0)], vec![(20.0, 45.0), (88.0, 120.0)]]
        {
            let s = starts(0.0, length, window, 3, &labels);
            assert!(s[s.len() - 1] + window >= length, "{s:?}");
            for w in s.windows(2) {
                assert!(w[1] - w[0] <= window - TILE_OVERLAP_MM + 1e-9, "{s:?}");
            }
            for &(lo, hi) in &labels {
                assert!(
                    s.iter().any(|&a| lo >= a && hi <= a + window),
                    "{lo}–{hi} is cut on every tile: {s:?}"
                );
            }
        }
    }
}
