//! The embedded demo kit: a scenario of our own (Elmbrook Secondary, lab B).

/// The demo kit's TOML text.
pub const DEMO_KIT: &str = include_str!("kit.toml");

/// The name the demo kit goes by in messages.
pub const DEMO_NAME: &str = "demo kit (embedded)";
