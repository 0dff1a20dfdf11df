//! Receiving-system noise: sky brightness temperature ([`sky`]) and antenna
//! temperature, Friis receiver cascade and system noise temperature ([`system`]), man-made noise of
//! the surroundings (ITU-R P.372 Table 1, [`man_made`]).

pub mod man_made;
pub mod sky;
pub mod system;
