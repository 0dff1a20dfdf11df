//! config (filled in by its owner).
