//! Renderers: `&Scene` in, bytes out (SVG and PDF).
