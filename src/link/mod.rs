//! link (filled in by its owner).
