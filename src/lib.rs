//! raysheet: true-scale ray-optics tracing sheets and answer keys for acrylic lens kits.
#![forbid(unsafe_code)]

pub mod font;
pub mod geom;
pub mod render;
pub mod scene;
