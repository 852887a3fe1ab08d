//! raysheet: true-scale ray-optics tracing sheets and answer keys for acrylic lens kits.
#![forbid(unsafe_code)]

pub mod answers;
pub mod build;
pub mod cli;
pub mod demo;
pub mod font;
pub mod geom;
pub mod kit;
pub mod layout;
pub mod optics;
pub mod paper;
pub mod plan;
pub mod render;
pub mod report;
pub mod scene;
pub mod summary;
