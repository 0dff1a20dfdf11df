//! Receiving-system noise: sky brightness temperature ([`sky`]) and antenna
//! temperature, Friis receiver cascade and system noise temperature ([`system`]), man-made noise of
//! the surroundings (ITU-R P.372 Table 1, [`man_made`]), the Sun's and the Moon's disk brightness
//! ([`sun`], [`moon`]) and the antenna temperature a bright disk adds near the beam ([`disk`]).

pub mod disk;
pub mod man_made;
pub mod moon;
pub mod sky;
pub mod sun;
pub mod system;
