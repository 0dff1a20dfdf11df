//! noise (filled in by its owner).
