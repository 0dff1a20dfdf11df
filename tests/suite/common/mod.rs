//! Helpers shared by the test modules: the binary runner and its assertions, the counting
//! allocator, the reader of the `#`-commented reference CSV files, invented fixtures shared with the
//! benchmarks, and tolerances.
#![allow(dead_code)]
pub mod alloc;
pub mod bin;
pub mod data;
pub mod fixtures;
pub mod plan;
pub mod schedule_gen;
pub mod tolerance;
