//! Pass-by-pass planning: the budget over every pass, rate choice, usable mask, volumes.
pub mod mask;
pub mod network;
pub mod rate;
pub mod prepare;
