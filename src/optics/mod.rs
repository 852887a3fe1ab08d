//! Optics of cylindrical acrylic pieces in the plane of the paper: faces and
//! pieces (lens shapes, blocks, prisms), Snell's law, the exact trace of any
//! ray through any placed outline, measurements over a trace, and the
//! paraxial (lens maker's and thick-lens) values of lens shapes.
//!
//! Lens sheet frame (DESIGN.md): x along the optical axis in the direction of
//! the light, y across it (up), millimetres. The entry vertex, where the axis
//! first meets the piece, is at x = 0; the exit vertex is at x = t. Blocks and
//! prisms have no axis: their sheets place them and measure angles from the
//! normals of their faces.

mod axial;
mod face;
mod lens;
pub mod material;
pub mod measure;
mod outline;
mod paraxial;
mod piece;
mod snell;
mod trace;

pub use axial::{AxialTrace, Outcome, trace_parallel, trace_ray};
pub use face::Face;
pub use lens::{Entry, Lens};
pub use material::{Dispersion, MAX_INDEX, Material, MaterialError, PUBLISHED, Published, VISIBLE_NM};
pub use outline::{Boundary, Outline};
pub use paraxial::Paraxial;
pub use piece::{Block, BlockFace, MAX_PIECE_MM, MIN_PIECE_MM, Piece, PieceError, Prism, PrismFace};
pub use snell::{Refraction, refract};
pub use trace::{End, Event, EventKind, MAX_EVENTS, Trace, angle_from_normal, trace};
