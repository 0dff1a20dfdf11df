//! orbit (filled in by its owner).
