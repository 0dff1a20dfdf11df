//! report (filled in by its owner).
