//! Sheet kinds: what each kind of practical sheet measures and how.

pub mod angled;
pub mod block;
pub mod prism;
