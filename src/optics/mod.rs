//! Optics of a cylindrical acrylic piece in the plane of the paper: faces,
//! Snell's law, the exact trace through the outline, and the paraxial
//! (lens maker's and thick-lens) values.
//!
//! Sheet frame (DESIGN.md): x along the optical axis in the direction of the
//! light, y across it (up), millimetres. The entry vertex, where the axis first
//! meets the piece, is at x = 0; the exit vertex is at x = t.

mod face;
mod outline;
mod paraxial;
mod piece;
mod snell;
mod trace;

pub use face::Face;
pub use outline::{Boundary, Outline};
pub use paraxial::Paraxial;
pub use piece::{Entry, Piece, PieceError};
pub use snell::{Refraction, refract};
pub use trace::{Outcome, Trace, trace_parallel, trace_ray};
