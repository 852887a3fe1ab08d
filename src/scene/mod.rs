//! The device-independent drawing: pages of lines, arcs, polylines, markers,
//! arrowheads, text and boxes in page millimetres.
//!
//! Page coordinates: origin at the bottom-left corner of the paper, x to the
//! right, y **up**, millimetres. Renderers own the unit conversion and, for SVG,
//! the flip to a downward y axis. Nothing here knows about a file format.

mod dump;

pub use dump::dump;

use crate::geom::{Point, Vec2};

// Text in a scene names its face and its size in points; both belong to the
// text layer (`font`) and are re-exported here for the scene's users.
pub use crate::font::{MM_PER_PT, Weight};

/// A whole document: one or more pages of the same kind (student sheets, keys…).
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Scene {
    /// Document title (goes into PDF metadata and SVG `<title>`).
    pub title: String,
    /// Pages in order.
    pub pages: Vec<Page>,
}

/// One sheet of paper.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Page {
    /// Paper width, mm (after orientation).
    pub width_mm: f64,
    /// Paper height, mm (after orientation).
    pub height_mm: f64,
    /// Short name of the page, used for SVG file names (`sheet-01`, `key-01-t2`).
    pub name: String,
    /// Items painted in order: later items on top.
    pub items: Vec<Item>,
}

/// Grey level: 0.0 is black, 1.0 is white.
pub type Gray = f64;

/// What a line is painted with: a grey level, or a colour in sRGB (IEC
/// 61966-2-1) for coloured rays. A coloured stroke always comes with a dash
/// pattern of its own, so a black-and-white copy keeps the colours apart.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Paint {
    /// A grey level: 0.0 is black, 1.0 is white.
    Grey(Gray),
    /// Red, green and blue in sRGB, each 0–255.
    Rgb([u8; 3]),
}

/// How a line is dashed.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Dash {
    /// A continuous line.
    Solid,
    /// Dashes of `on_mm` separated by gaps of `off_mm`.
    Dashed {
        /// Dash length, mm.
        on_mm: f64,
        /// Gap length, mm.
        off_mm: f64,
    },
    /// Long dash, gap, short dash, gap (centre lines).
    DashDot {
        /// Long dash, mm.
        long_mm: f64,
        /// Short dash, mm.
        short_mm: f64,
        /// Each gap, mm.
        gap_mm: f64,
    },
    /// A dash followed by `beads` short dashes: dash, gap, then bead and gap
    /// `beads` times (coloured rays: one bead count per colour).
    Beads {
        /// The long dash, mm.
        dash_mm: f64,
        /// Each short dash, mm.
        bead_mm: f64,
        /// Each gap, mm.
        gap_mm: f64,
        /// How many short dashes follow the long one.
        beads: u8,
    },
}

impl Dash {
    /// The on/off lengths in order, mm, as both renderers write them (empty:
    /// solid).
    pub fn pattern_mm(&self) -> Vec<f64> {
        match *self {
            Dash::Solid => Vec::new(),
            Dash::Dashed { on_mm, off_mm } => vec![on_mm, off_mm],
            Dash::DashDot { long_mm, short_mm, gap_mm } => vec![long_mm, gap_mm, short_mm, gap_mm],
            Dash::Beads { dash_mm, bead_mm, gap_mm, beads } => {
                let mut v = vec![dash_mm, gap_mm];
                for _ in 0..beads {
                    v.extend([bead_mm, gap_mm]);
                }
                v
            }
        }
    }
}

/// How a line is painted.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Stroke {
    /// Line width, mm.
    pub width_mm: f64,
    /// Grey or colour of the line.
    pub paint: Paint,
    /// Dash pattern.
    pub dash: Dash,
}

impl Stroke {
    /// A solid black line `width_mm` wide.
    pub const fn solid(width_mm: f64) -> Stroke {
        Stroke { width_mm, paint: Paint::Grey(0.0), dash: Dash::Solid }
    }

    /// The same stroke with another grey.
    pub const fn gray(self, gray: Gray) -> Stroke {
        Stroke { paint: Paint::Grey(gray), ..self }
    }

    /// The same stroke in another paint.
    pub const fn paint(self, paint: Paint) -> Stroke {
        Stroke { paint, ..self }
    }

    /// The same stroke with another dash pattern.
    pub const fn dashed(self, dash: Dash) -> Stroke {
        Stroke { dash, ..self }
    }
}

/// Horizontal anchoring of a text line at its reference point.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Anchor {
    /// The reference point is the left end of the baseline.
    Start,
    /// The reference point is the middle of the baseline.
    Middle,
    /// The reference point is the right end of the baseline.
    End,
}

/// Shapes of point markers.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum MarkerShape {
    /// An upright cross `+`.
    Cross,
    /// A diagonal cross `×`.
    Saltire,
    /// A filled disc.
    Dot,
    /// An open circle.
    Ring,
}

/// An axis-aligned rectangle in page mm.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Rect {
    /// Bottom-left corner.
    pub min: Point,
    /// Top-right corner.
    pub max: Point,
}

impl Rect {
    /// The rectangle spanning two corners (in any order).
    pub fn from_corners(a: Point, b: Point) -> Rect {
        Rect { min: Point::new(a.x.min(b.x), a.y.min(b.y)), max: Point::new(a.x.max(b.x), a.y.max(b.y)) }
    }

    /// Width, mm.
    pub fn width(&self) -> f64 {
        self.max.x - self.min.x
    }

    /// Height, mm.
    pub fn height(&self) -> f64 {
        self.max.y - self.min.y
    }

    /// Whether `p` lies inside or on the border.
    pub fn contains(&self, p: Point) -> bool {
        (self.min.x..=self.max.x).contains(&p.x) && (self.min.y..=self.max.y).contains(&p.y)
    }

    /// Whether two rectangles overlap (touching edges do not count).
    pub fn overlaps(&self, o: &Rect) -> bool {
        self.min.x < o.max.x && o.min.x < self.max.x && self.min.y < o.max.y && o.min.y < self.max.y
    }
}

/// One drawing primitive. Renderers match on this exhaustively: a new variant
/// does not compile until both renderers draw it.
#[derive(Clone, Debug, PartialEq)]
pub enum Item {
    /// A straight line.
    Line {
        /// Start point.
        from: Point,
        /// End point.
        to: Point,
        /// Paint.
        stroke: Stroke,
    },
    /// Connected straight segments; closed joins the last point to the first.
    Polyline {
        /// Vertices in order (at least two).
        points: Vec<Point>,
        /// Whether to close the figure.
        closed: bool,
        /// Paint.
        stroke: Stroke,
    },
    /// A circular arc, angles counterclockwise from +x in page coordinates (y up).
    Arc {
        /// Centre.
        center: Point,
        /// Radius, mm.
        radius_mm: f64,
        /// Angle of the start point.
        start_rad: f64,
        /// Signed sweep, counterclockwise positive; |sweep| ≤ 2π.
        sweep_rad: f64,
        /// Paint.
        stroke: Stroke,
    },
    /// A closed outline made of straight and arc pieces, stroked and optionally filled.
    Outline {
        /// The pieces in order; each starts where the previous one ended.
        parts: Vec<OutlinePart>,
        /// Optional fill grey.
        fill: Option<Gray>,
        /// Paint for the border.
        stroke: Stroke,
    },
    /// A point marker centred on `at`.
    Marker {
        /// Centre.
        at: Point,
        /// Shape.
        shape: MarkerShape,
        /// Overall size (width of the cross, diameter of the disc), mm.
        size_mm: f64,
        /// Paint (the fill of a dot uses the stroke's grey).
        stroke: Stroke,
    },
    /// A filled triangular arrowhead with its tip at `tip`, pointing along `dir`.
    Arrowhead {
        /// Tip.
        tip: Point,
        /// Pointing direction (unit).
        dir: Vec2,
        /// Length from base to tip, mm.
        length_mm: f64,
        /// Width of the base, mm.
        width_mm: f64,
        /// Fill grey.
        gray: Gray,
    },
    /// One line of text.
    Text {
        /// Reference point on the baseline.
        at: Point,
        /// The characters, exactly as they should appear.
        text: String,
        /// Font size in points (1 pt = 25.4/72 mm).
        size_pt: f64,
        /// Which face.
        weight: Weight,
        /// Horizontal anchoring at `at`.
        anchor: Anchor,
        /// Counterclockwise rotation about `at`, degrees (0 = horizontal).
        rotate_deg: f64,
        /// Fill grey.
        gray: Gray,
    },
    /// An axis-aligned box, stroked and optionally filled.
    Box {
        /// The rectangle.
        rect: Rect,
        /// Optional fill grey.
        fill: Option<Gray>,
        /// Optional border (None: fill only).
        stroke: Option<Stroke>,
    },
    /// A group of items moved by `offset` and clipped to `clip` (given in the
    /// page coordinates *after* the offset). Used for tiling large setups.
    Group {
        /// Visible region on the page.
        clip: Rect,
        /// Added to every coordinate of the children.
        offset: Vec2,
        /// The children.
        items: Vec<Item>,
    },
    /// Items stretched by `sx` along x and `sy` along y about the point
    /// `about`: a printer's measured correction, applied to a whole page.
    Scale {
        /// Stretch along the page's x axis.
        sx: f64,
        /// Stretch along the page's y axis.
        sy: f64,
        /// The point that stays put (the page's centre).
        about: Point,
        /// The children.
        items: Vec<Item>,
    },
}

/// A piece of an [`Item::Outline`].
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum OutlinePart {
    /// A straight line to `to`.
    LineTo {
        /// End point.
        to: Point,
    },
    /// An arc about `center` (start point is the current point).
    ArcTo {
        /// Centre of the arc.
        center: Point,
        /// Radius, mm.
        radius_mm: f64,
        /// Angle of the start point.
        start_rad: f64,
        /// Signed sweep.
        sweep_rad: f64,
    },
    /// Start of the figure (must be first).
    MoveTo {
        /// Start point.
        to: Point,
    },
}
