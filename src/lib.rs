//! raysheet: true-scale ray-optics tracing sheets and answer keys for acrylic
//! pieces: half-discs, lens shapes, blocks and prisms.
//!
//! The pipeline is `kit → sheets → layout → scene → render`: a kit file is
//! validated into millimetres, each sheet is checked and planned by its kind
//! (`sheets/`: curved-face, focal, block, prism), every guide ray is traced
//! exactly with Snell's law through the placed piece (`optics`), the layout
//! places the plans on paper at 1:1 as a device-independent scene, and the
//! renderers turn that scene into SVG or PDF bytes. `plan` holds what every
//! kind shares; `output` gathers a build's files and the text reports; `app`
//! resolves a command line into a job and runs it. Imports point one way,
//! bottom first: geom, font, paper, optics, demo, kit, plan, scene, draw,
//! sheets, layout, render, output, app (`tests/layering.rs`).
//!
//! From a kit string to a drawing:
//!
//! ```
//! use raysheet::layout::{layout, Templates};
//! use raysheet::render::render_svg_page;
//! use raysheet::sheets::{Lesson, plan_lesson};
//!
//! let kit = Lesson::from_toml(
//!     r#"
//!     [materials.acrylic]
//!     index = 1.49
//!
//!     [[pieces]]
//!     id = "hd30"
//!     material = "acrylic"
//!     front = "flat"
//!     back = { curve = "convex", radius_mm = 30 }
//!     thickness_mm = 30
//!     height_mm = 60
//!
//!     [[sheets]]
//!     kind = "curved-face"
//!     piece = "hd30"
//!     heights_mm = [8, -8]
//!     "#,
//!     "example.toml",
//! )?;
//! let plans = plan_lesson(&kit, &kit.paper);
//! // Half-disc, flat face first: the ray at 8 mm meets the axis at
//! // R·n·sinθ1 / sin(θ2 − θ1) from the flat face (DESIGN.md closed form).
//! let (r, n, h): (f64, f64, f64) = (30.0, 1.49, 8.0);
//! let (t1, t2) = ((h / r).asin(), (n * h / r).asin());
//! let expected = r * n * t1.sin() / (t2 - t1).sin();
//! let got = plans[0].lens().unwrap().rays[0].crossing_from_entry_mm.unwrap();
//! assert!((got - expected).abs() < 1e-9);
//!
//! let set = layout(&kit.title, &plans, &kit.paper, &Templates::shipped()?)?;
//! let svg = render_svg_page(&set.keys.pages[0], &set.keys.title)?;
//! assert!(svg.starts_with("<svg") && svg.contains(r#"width="297mm""#));
//! # Ok::<(), Box<dyn std::error::Error>>(())
//! ```
#![forbid(unsafe_code)]

pub mod app;
pub mod demo;
pub mod draw;
pub mod font;
pub mod geom;
pub mod kit;
pub mod layout;
pub mod optics;
pub mod output;
pub mod paper;
pub mod plan;
pub mod render;
pub mod scene;
pub mod sheets;
