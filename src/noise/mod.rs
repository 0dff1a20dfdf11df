//! Receiving-system noise: sky brightness temperature ([`sky`]) and antenna
//! temperature, Friis receiver cascade and system noise temperature ([`system`]).

pub mod sky;
pub mod system;
