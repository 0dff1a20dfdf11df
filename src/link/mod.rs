//! Radio link: free-space loss ([`path`]), spacecraft and ground antennas
//! ([`antenna`]), polarization mismatch ([`polarization`]), modulation and coding
//! ([`modcod`], the mission's own schemes in [`schemes`]), channel capacity ([`capacity`]) and the prepared link budget
//! ([`budget`]). Special functions (erfc, Q and inverses) live in [`crate::special`].
//!
//! The budget takes atmospheric numbers as plain inputs
//! ([`budget::AtmosphereLoss`]); it does not depend on the atmosphere module.

pub mod antenna;
pub mod budget;
pub mod capacity;
pub mod modcod;
pub mod path;
pub mod pfd;
pub mod polarization;
pub mod schemes;
