//! atmosphere (filled in by its owner).
