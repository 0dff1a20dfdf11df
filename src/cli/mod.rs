//! Command-line interface (filled in by its owner).

/// Entry point used by `main.rs`; returns the process exit code.
pub fn main_entry() -> i32 {
    0
}
