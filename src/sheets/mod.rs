//! Sheet kinds: what each kind of practical sheet measures and how.

pub mod angled;
pub mod angled_drawing;
pub mod block;
pub mod deviation_plot;
pub mod prism;
