//! geometry (filled in by its owner).
