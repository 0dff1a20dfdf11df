//! plan (filled in by its owner).
