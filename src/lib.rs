//! passbudget: pass-by-pass satellite downlink planning.
//!
//! Data flows one way: orbital elements and station files go in
//! ([`orbit`], [`config`]); [`geometry`] turns them into look angles and
//! passes; [`atmosphere`], [`noise`] and [`link`] turn a look angle into an
//! itemized budget; [`plan`] follows the budget over every pass and chooses
//! rates; [`report`] and [`chart`] present the result. Each stage knows
//! nothing of the stages after it.

// No unsafe code of our own. Dependencies have some (the YAML parser under serde_yaml is libyaml
// translated from C), so fuzzing with a sanitizer still matters (DEVELOPERS.md, "Fuzzing").
#![forbid(unsafe_code)]

pub mod atmosphere;
#[cfg(feature = "charts")]
pub mod chart;
pub mod config;
pub mod engfmt;
pub mod geometry;
pub mod infile;
pub mod link;
pub mod noise;
pub mod orbit;
pub mod plan;
pub mod report;
pub mod schedule;
pub mod special;
pub mod timefmt;
pub mod units;

#[cfg(test)]
mod test_rng;
