//! The station's noise model, prepared once: the ground antenna's reference pattern
//! ([`crate::noise::pattern`]), one antenna-noise table per weather case
//! ([`crate::noise::antenna_table`], the sky brightness from the station's own atmosphere; for
//! a station whose horizon mask rises above the geometric horizon, one table over elevation and
//! azimuth per weather case instead, [`crate::noise::terrain_table`]: the terrain seen by
//! azimuth), and the man-made noise of its surroundings ([`crate::noise::man_made`]). Per step,
//! [`StationNoise::external_at`] interpolates; nothing is integrated.
//!
//! The terrain's part is in the ground term (the terrain radiates as the ground at grazing) and
//! the sky it hides is off the sky term. A measured antenna temperature already holds the
//! terrain where it was measured: with one, the terrain table is not built and the 1-D rule below
//! applies at every azimuth.
//!
//! A measured clear-sky antenna temperature (Y-factor, `antenna.measured_noise_temperature_k`)
//! replaces the integral's clear-sky total; it is split into sky and ground by the integral's
//! clear-sky shares at that elevation, and a weather case adds the integral's excess over clear
//! sky (sky and ground terms separately: the ground term carries the reflected sky):
//! `T_w(e) = M(e) * share(e) + [T_w,model(e) - T_clear,model(e)]`. Between the measured points the
//! temperature is interpolated linearly; outside them the end value is held.

use crate::atmosphere::{PreparedAtmosphere, Weather};
use crate::geometry::HorizonMask;
use crate::noise::antenna_table::{AntennaNoise, AntennaNoiseTable, Brightness, GroundSpec};
use crate::noise::man_made::{man_made_noise, Environment, ManMadeNoise};
use crate::noise::pattern::{NoisePattern, PatternWarnings};
use crate::noise::sky::sky_temperature_unchecked;
use crate::noise::terrain_table::{TerrainGrid, TerrainNoiseTable};
use crate::noise::ExternalNoise;

/// Validity notes of a station's noise model (constant over a plan).
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct NoiseWarnings {
    pub pattern: PatternWarnings,
    /// The frequency is outside the 0.3-250 MHz of the P.372 Table 1 man-made noise curves.
    pub man_made_extrapolated: bool,
    /// The galactic background is continued above 1 GHz where it still adds 1 K or more
    /// ([`crate::noise::sky::galactic_extrapolation_warned`]).
    pub galactic_extrapolated: bool,
}

impl NoiseWarnings {
    pub fn union(&self, o: &NoiseWarnings) -> NoiseWarnings {
        NoiseWarnings {
            pattern: PatternWarnings {
                frequency_outside_envelope_range: self.pattern.frequency_outside_envelope_range
                    || o.pattern.frequency_outside_envelope_range,
                main_beam_narrowed: self.pattern.main_beam_narrowed || o.pattern.main_beam_narrowed,
                aperture_under_a_wavelength: self.pattern.aperture_under_a_wavelength
                    || o.pattern.aperture_under_a_wavelength,
            },
            man_made_extrapolated: self.man_made_extrapolated || o.man_made_extrapolated,
            galactic_extrapolated: self.galactic_extrapolated || o.galactic_extrapolated,
        }
    }

    /// The noise models whose frequency range is passed, as `model (source, range)`.
    pub fn frequency_ranges(&self) -> impl Iterator<Item = &'static str> {
        [
            (
                self.pattern.frequency_outside_envelope_range,
                "sidelobe envelope (ITU-R S.465-6, 2-31 GHz)",
            ),
            (
                self.man_made_extrapolated,
                "man-made noise (ITU-R P.372 Table 1, 0.3-250 MHz)",
            ),
            (
                self.galactic_extrapolated,
                "galactic background (ITU-R P.372 galactic curve, 10 MHz-1 GHz; continued above it, 1 K or more here)",
            ),
        ]
        .into_iter()
        .filter(|(on, _)| *on)
        .map(|(_, m)| m)
    }

    /// The other noise-model warnings (the frequency ranges are in [`Self::frequency_ranges`]).
    pub fn other_messages(&self) -> impl Iterator<Item = &'static str> {
        PatternWarnings {
            frequency_outside_envelope_range: false,
            ..self.pattern
        }
        .messages()
    }
}

/// Everything that makes the antenna temperature of one station.
#[derive(Debug, Clone, PartialEq)]
pub struct StationNoise {
    pattern: NoisePattern,
    ground: GroundSpec,
    mean_radiating_temperature_k: f64,
    background_k: f64,
    clear: CaseTable,
    /// The measured clear-sky table, `[elevation_deg, temperature_k]`, and the model's clear table.
    measured: Option<(Vec<[f64; 2]>, AntennaNoiseTable)>,
    availability: Option<(Weather, CaseTable)>,
    /// The terrain above the geometric horizon ([`crate::noise::terrain::terrain_profile`]), if
    /// any (none with a measured antenna temperature).
    terrain: Option<HorizonMask>,
    man_made: Option<(Environment, ManMadeNoise)>,
    warnings: NoiseWarnings,
}

/// The antenna-noise table of one weather case: over elevation alone, or over elevation and
/// azimuth for a station with terrain (whose table over elevation alone would go unused, so it
/// is not built).
#[derive(Debug, Clone, PartialEq)]
enum CaseTable {
    Flat(AntennaNoiseTable),
    Terrain(TerrainNoiseTable),
}

impl CaseTable {
    #[inline]
    fn at(&self, elevation_deg: f64, azimuth_deg: f64) -> AntennaNoise {
        match self {
            CaseTable::Flat(t) => t.at(elevation_deg),
            CaseTable::Terrain(t) => t.at(elevation_deg, azimuth_deg),
        }
    }
}

/// What a station's noise model is built from ([`StationNoise::new`]).
#[derive(Debug, Clone)]
pub struct NoiseInputs {
    /// The ground antenna's pattern (reference or measured).
    pub pattern: NoisePattern,
    /// The ground's temperature and emissivity.
    pub ground: GroundSpec,
    /// Mean radiating temperature of the atmosphere, K (P.618-14 eq. 69).
    pub mean_radiating_temperature_k: f64,
    /// Cosmic and galactic background, K.
    pub background_k: f64,
    /// The link's frequency, Hz (the man-made term and the galactic background's warning).
    pub frequency_hz: f64,
    /// The P.372 environment category of the surroundings.
    pub man_made: Option<Environment>,
    /// A measured antenna temperature against elevation, `[elevation_deg, kelvin]` rows.
    pub measured: Option<Vec<[f64; 2]>>,
    /// The terrain profile above the geometric horizon
    /// ([`crate::noise::terrain::terrain_profile`] of the horizon mask).
    pub terrain: Option<HorizonMask>,
}

impl StationNoise {
    /// The tables of a station's antenna noise from `inputs`: the clear-sky table and the
    /// man-made term; with terrain and no measured antenna temperature, the clear-sky table over
    /// elevation and azimuth instead of the one over elevation alone; with `availability`, that
    /// weather case's table as well, both cases' tables built together at little more than the
    /// cost of one ([`AntennaNoiseTable::build_cases`]: each the table built alone; or
    /// [`TerrainNoiseTable::build_cases`] with terrain, whose raised-horizon rows are shared).
    pub fn new(
        inputs: NoiseInputs,
        atmosphere: &PreparedAtmosphere,
        availability: Option<Weather>,
    ) -> Self {
        let NoiseInputs {
            pattern,
            ground,
            mean_radiating_temperature_k,
            background_k,
            frequency_hz,
            man_made,
            measured,
            terrain,
        } = inputs;
        let man_made = man_made.map(|e| (e, man_made_noise(e, frequency_hz)));
        let warnings = NoiseWarnings {
            pattern: pattern.warnings(),
            man_made_extrapolated: man_made.is_some_and(|m| m.1.extrapolated),
            galactic_extrapolated: crate::noise::sky::galactic_extrapolation_warned(frequency_hz),
        };
        let mut s = Self {
            clear: CaseTable::Flat(AntennaNoiseTable::from_rows(&[])),
            pattern,
            ground,
            mean_radiating_temperature_k,
            background_k,
            availability: None,
            man_made,
            warnings,
            measured: None,
            terrain: if measured.is_none() { terrain } else { None },
        };
        let brightness = s.brightness(atmosphere, Weather::ClearSky);
        let rain = availability
            .filter(|w| *w != Weather::ClearSky)
            .map(|w| (w, s.brightness(atmosphere, w)));
        let mut cases = vec![&brightness];
        cases.extend(rain.as_ref().map(|(_, b)| b));
        if let Some(t) = &s.terrain {
            let mut tables =
                TerrainNoiseTable::build_cases(&s.pattern, &cases, t, &TerrainGrid::default())
                    .into_iter()
                    .map(CaseTable::Terrain);
            s.clear = tables.next().expect("one table per case");
            s.availability = rain.map(|(w, _)| (w, tables.next().expect("one table per case")));
            return s;
        }
        let mut models = AntennaNoiseTable::build_cases(&s.pattern, &cases).into_iter();
        let model = models.next().expect("one table per case");
        s.clear = CaseTable::Flat(match measured {
            Some(m) => {
                let table = combine(&m, &model, &model);
                s.measured = Some((m, model));
                table
            }
            None => model,
        });
        if let Some((w, _)) = rain {
            let table = s.availability_table(models.next().expect("one table per case"));
            s.availability = Some((w, CaseTable::Flat(table)));
        }
        s
    }

    /// Build the table of `weather` (the availability case), replacing any other.
    pub fn prepare_weather(&mut self, atmosphere: &PreparedAtmosphere, weather: Weather) {
        let done = self.availability.as_ref().map(|(w, ..)| *w) == Some(weather);
        if weather != Weather::ClearSky && !done {
            let brightness = self.brightness(atmosphere, weather);
            let table = match &self.terrain {
                Some(t) => {
                    CaseTable::Terrain(TerrainNoiseTable::build(&self.pattern, &brightness, t))
                }
                None => CaseTable::Flat(
                    self.availability_table(AntennaNoiseTable::build(&self.pattern, &brightness)),
                ),
            };
            self.availability = Some((weather, table));
        }
    }

    /// The availability case's table from its model table: with a measured antenna temperature,
    /// the measurement moved by the model's change from clear sky.
    fn availability_table(&self, model: AntennaNoiseTable) -> AntennaNoiseTable {
        match &self.measured {
            Some((m, clear_model)) => combine(m, clear_model, &model),
            None => model,
        }
    }

    /// The surroundings' brightness in `weather`.
    fn brightness(&self, atmosphere: &PreparedAtmosphere, weather: Weather) -> Brightness {
        let (tmr, bg) = (self.mean_radiating_temperature_k, self.background_k);
        // Tsky(el) = Tmr (1 - 10^(-A/10)) + Tbg 10^(-A/10)   (P.618-14 eq. 69)
        Brightness::new(
            |el| sky_temperature_unchecked(atmosphere.at(el, weather).absorptive_db, tmr, bg),
            self.ground,
        )
    }

    /// The antenna's noise terms at boresight `elevation_deg` and `azimuth_deg` in `weather`
    /// (the azimuth matters only for a station with terrain above the geometric horizon); `None`
    /// when that weather's table was not prepared. Interpolation only; allocates nothing.
    #[inline]
    pub fn external_at(
        &self,
        elevation_deg: f64,
        azimuth_deg: f64,
        weather: Weather,
    ) -> Option<ExternalNoise> {
        let a = self.case(weather)?.at(elevation_deg, azimuth_deg);
        Some(ExternalNoise {
            sky_k: a.sky_k,
            ground_k: a.ground_k,
            man_made_k: self.man_made_k(),
            sun_k: 0.0,
            moon_k: 0.0,
        })
    }

    /// The station has a terrain table: its antenna noise depends on the azimuth.
    pub fn has_terrain(&self) -> bool {
        matches!(self.clear, CaseTable::Terrain(_))
    }

    /// The table of `weather`, if it was prepared.
    fn case(&self, weather: Weather) -> Option<&CaseTable> {
        match (weather, &self.availability) {
            (Weather::ClearSky, _) => Some(&self.clear),
            (w, Some((a, t))) if *a == w => Some(t),
            _ => None,
        }
    }

    /// The azimuth (deg, on a 0.5 deg grid) where the antenna noise at `elevation_deg` in
    /// `weather` is highest among the azimuths where the terrain does not rise above that
    /// elevation (a satellite there is in view); where it rises above it everywhere, the azimuth
    /// of the lowest terrain. The rule of a budget given an elevation and no azimuth. `None`
    /// without terrain (the azimuth does not matter) or when the weather was not prepared.
    pub fn worst_azimuth_deg(&self, elevation_deg: f64, weather: Weather) -> Option<f64> {
        let terrain = self.terrain.as_ref().filter(|_| self.has_terrain())?;
        let mut best: Option<(f64, f64)> = None;
        let mut lowest: Option<(f64, f64)> = None;
        for i in 0..720 {
            let az = 0.5 * i as f64;
            let h = terrain.limit_deg(az);
            if lowest.is_none_or(|(_, l)| h < l) {
                lowest = Some((az, h));
            }
            if h > elevation_deg {
                continue;
            }
            let t = self.external_at(elevation_deg, az, weather)?.total_k();
            if best.is_none_or(|(_, b)| t > b) {
                best = Some((az, t));
            }
        }
        best.or(lowest).map(|(az, _)| az)
    }

    /// The terrain table of `weather`, if the station has one and the weather was prepared.
    pub fn terrain_table_of(&self, weather: Weather) -> Option<&TerrainNoiseTable> {
        match self.case(weather)? {
            CaseTable::Terrain(t) => Some(t),
            CaseTable::Flat(_) => None,
        }
    }

    /// The man-made noise temperature, K (0 without a category).
    pub fn man_made_k(&self) -> f64 {
        self.man_made.map_or(0.0, |m| m.1.temperature_k)
    }

    pub fn man_made(&self) -> Option<(Environment, ManMadeNoise)> {
        self.man_made
    }

    pub fn pattern(&self) -> &NoisePattern {
        &self.pattern
    }

    pub fn ground(&self) -> GroundSpec {
        self.ground
    }

    /// The clear-sky table over elevation; `None` for a station with terrain, whose clear-sky
    /// table is over elevation and azimuth ([`Self::terrain_table_of`]).
    pub fn clear_table(&self) -> Option<&AntennaNoiseTable> {
        match &self.clear {
            CaseTable::Flat(t) => Some(t),
            CaseTable::Terrain(_) => None,
        }
    }

    pub fn warnings(&self) -> NoiseWarnings {
        self.warnings
    }

    /// Where the sky and the ground terms come from, as the outputs name them: the integral over
    /// the pattern actually used ([`NoisePattern::label`]) or the station's measured antenna
    /// temperature split by that integral's shares (module doc), the terrain of the horizon mask
    /// when it is part of the ground term.
    pub fn term_sources(&self) -> NoiseSources {
        let pattern = self.pattern.label();
        let (sky, ground) = match &self.measured {
            Some(_) => (
                format!("antenna.measured_noise_temperature_k, its sky share by the integral over {pattern}; a weather case adds the integral's excess over clear sky"),
                format!("antenna.measured_noise_temperature_k, its ground share by the integral over {pattern}; a weather case adds the integral's excess over clear sky"),
            ),
            None => (
                format!("sky over {pattern}, ITU-R P.618-14 eq. (69)"),
                if self.has_terrain() {
                    format!("ground over {pattern}: e Tg + (1 - e) Tsky(mirror); with the terrain of horizon_mask at this azimuth, e Tg + (1 - e) Tsky(0)")
                } else {
                    format!("ground over {pattern}: e Tg + (1 - e) Tsky(mirror)")
                },
            ),
        };
        NoiseSources {
            sky,
            ground,
            sun: format!("solar disk over {pattern}, ITU-R P.372 quiet Sun or given flux"),
            moon: format!("lunar disk over {pattern}, 140-280 K by phase (1-100 GHz)"),
        }
    }
}

/// The sources of a station's noise terms ([`StationNoise::term_sources`]).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct NoiseSources {
    pub sky: String,
    pub ground: String,
    pub sun: String,
    pub moon: String,
}

/// The measured clear-sky table `m` with the model's shares and weather excess (module doc).
fn combine(
    m: &[[f64; 2]],
    clear_model: &AntennaNoiseTable,
    weather_model: &AntennaNoiseTable,
) -> AntennaNoiseTable {
    let mut elevations: Vec<f64> = weather_model.rows().map(|r| r.0).collect();
    elevations.extend(m.iter().map(|r| r[0]));
    elevations.sort_by(f64::total_cmp);
    elevations.dedup();
    let rows: Vec<(f64, AntennaNoise)> = elevations
        .into_iter()
        .map(|e| {
            let (c, w) = (clear_model.at(e), weather_model.at(e));
            let total = measured_at(m, e);
            // share of the sky in the model's clear-sky total
            let share = if c.total_k() > 0.0 {
                c.sky_k / c.total_k()
            } else {
                1.0
            };
            let noise = AntennaNoise {
                sky_k: (total * share + w.sky_k - c.sky_k).max(0.0),
                ground_k: (total * (1.0 - share) + w.ground_k - c.ground_k).max(0.0),
            };
            (e, noise)
        })
        .collect();
    AntennaNoiseTable::from_rows(&rows)
}

/// Linear interpolation in a measured table, the end values held outside it.
fn measured_at(m: &[[f64; 2]], e: f64) -> f64 {
    let i = m.partition_point(|r| r[0] <= e);
    if i == 0 {
        return m[0][1];
    }
    if i >= m.len() {
        return m[m.len() - 1][1];
    }
    let (a, b) = (m[i - 1], m[i]);
    a[1] + (b[1] - a[1]) * (e - a[0]) / (b[0] - a[0])
}
