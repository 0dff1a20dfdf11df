//! chart (filled in by its owner).
