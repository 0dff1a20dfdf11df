//! The itemized budget at one instant: one station of a mission, at a given time (geometry from
//! the propagated orbit) or at a given elevation (slant range from the orbit's semi-major axis).
//! It goes through [`super::series::budget_at`], which ends in the same function as the plan's
//! steps (`link_of_terms`); the plan interpolates the orbit and the elevation-only terms
//! ([`crate::orbit::spline`], [`super::path_table`]) where this computes them directly, so
//! `budget --at` and the plan agree to within those stated bounds.

use super::bodies::PassBodies;
use super::inputs::{element_age_warning, element_notes, load_satellite, SatelliteError};
use super::path_table::PathTerms;
use super::prepare::{
    availability_weather, rate_set, station_model, PrepareError, RateSet, StationModel,
};
use super::series::{budget_at, link_inputs, SeriesError};
use crate::atmosphere::{Attenuation, Weather};
use crate::config::limits::short_number;
use crate::config::mission::Mission;
use crate::config::DefaultUsed;
use crate::geometry::look::LineOfSight;
use crate::geometry::Look;
use crate::link::budget::{BudgetItem, BudgetValues, RateSpec};
use crate::noise::ExternalNoise;
use crate::orbit::ElementSet;
use crate::timefmt::format_ms;
use chrono::{DateTime, Utc};

/// Where the satellite is.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum InstantGeometry {
    /// At this time, from the propagated orbit.
    At(DateTime<Utc>),
    /// At this elevation, deg (0 to 90); range from the orbit's semi-major axis. For a station
    /// whose terrain rises above the geometric horizon the antenna noise depends on the azimuth
    /// too: it is taken at the azimuth where it is highest at that elevation among those whose
    /// terrain is not above it ([`crate::plan::noise::StationNoise::worst_azimuth_deg`]), which
    /// the budget reports.
    Elevation(f64),
    /// At this elevation and azimuth, deg; range from the orbit's semi-major axis.
    Pointing {
        elevation_deg: f64,
        azimuth_deg: f64,
    },
}

/// What to budget.
#[derive(Debug, Clone, PartialEq)]
pub struct InstantRequest {
    /// Station name, as in its station file, compared as `--station NAME` compares it
    /// ([`crate::config::station::same_station`]: case, punctuation and Unicode form set aside).
    pub station: String,
    pub geometry: InstantGeometry,
    /// Data rate, bit/s (default: the ladder's first rate).
    pub rate_bps: Option<f64>,
    /// Scheme (default: the ladder's scheme for that rate, else the ladder's first).
    pub scheme: Option<String>,
    /// Rain exceeded this percentage of an average year (default: clear sky).
    pub exceedance_percent: Option<f64>,
    /// Budget at a time more than
    /// [`MAX_ELEMENT_AGE_DAYS`](super::inputs::MAX_ELEMENT_AGE_DAYS) from the element epoch.
    pub allow_stale_elements: bool,
}

/// Error of [`instant_budget`].
#[derive(Debug, thiserror::Error)]
pub enum InstantError {
    #[error("{mission}: no station named '{name}' (the mission has: {known})")]
    NoStation {
        mission: String,
        name: String,
        known: String,
    },
    #[error(transparent)]
    Prepare(#[from] PrepareError),
    #[error(transparent)]
    Satellite(#[from] SatelliteError),
    #[error(transparent)]
    StaleElements(#[from] super::inputs::StaleElements),
    #[error("{satellite}: {source}")]
    Propagation {
        satellite: String,
        #[source]
        source: crate::orbit::PropagationError,
    },
    #[error("{satellite} is below the horizon of {station} at {time} (elevation {elevation_deg:.2} deg): no budget")]
    BelowHorizon {
        satellite: String,
        station: String,
        time: String,
        elevation_deg: f64,
    },
    #[error("elevation: {0} deg is out of range (0 to 90 deg)")]
    Elevation(String),
    #[error("azimuth: {0} deg is out of range (-360 to 720 deg, taken modulo 360)")]
    Azimuth(String),
    #[error(transparent)]
    Slant(#[from] crate::geometry::slant::SlantError),
    #[error("{satellite}: the orbit's perigee is {perigee_radius_km:.0} km from the Earth's centre, not above both the Earth's equatorial radius ({earth_radius_km} km, where SGP4 stops) and the station's radius ({station_radius_km:.0} km): the elements describe no orbit to budget at an elevation")]
    PerigeeInsideEarth {
        satellite: String,
        perigee_radius_km: f64,
        earth_radius_km: f64,
        station_radius_km: f64,
    },
    #[error("{0}")]
    Rate(String),
    /// A value out of its range in [`crate::config::limits`].
    #[error("{}: {source}", .source.key)]
    Range {
        #[source]
        source: crate::config::limits::RangeError,
    },
    #[error(transparent)]
    Series(#[from] SeriesError),
    #[error(transparent)]
    Budget(#[from] crate::link::budget::BudgetError),
}

/// The budget at one instant, itemized.
#[derive(Debug, Clone)]
pub struct InstantBudget {
    pub elements: ElementSet,
    pub station: StationModel,
    pub rates: RateSet,
    pub time: Option<DateTime<Utc>>,
    /// The geometry the budget was made for. For a budget at a given elevation without an
    /// azimuth, `look.azimuth_deg` is the azimuth the terrain's noise was taken at (the worst,
    /// [`InstantGeometry::Elevation`]) for a station with terrain, else 0, and
    /// [`InstantBudget::azimuth_deg`] says `None`.
    pub look: Look,
    /// Azimuth, deg: of the satellite for a time-based geometry, the one given, or the one the
    /// terrain's noise was taken at for an elevation alone (`None` without terrain).
    pub azimuth_deg: Option<f64>,
    pub exceedance_percent: Option<f64>,
    pub attenuation: Attenuation,
    pub values: BudgetValues,
    pub rate: RateSpec,
    /// The link's items with the atmosphere's components right after the free-space loss.
    pub items: Vec<BudgetItem>,
    pub warnings: Vec<String>,
    /// What was chosen for the budget, not a problem: the element set taken from a history, the
    /// OMM fields read past ([`element_notes`], a plan's [`super::NoteKind::ElementSet`]).
    pub notes: Vec<String>,
    pub defaults: Vec<DefaultUsed>,
    /// The pfd at the station against the band's Article 21 limit (`None`: no row for the band).
    pub pfd: Option<crate::link::pfd::PfdAt>,
}

impl InstantBudget {
    /// The link closes with the required margin: C/N0 reaches the rate's threshold (the same test
    /// the plan applies at every step).
    pub fn closes(&self) -> bool {
        let op = self.rate.operating();
        self.values.cn0_dbhz
            >= crate::link::budget::threshold_cn0_dbhz(
                self.values.rate_bps,
                op.required_ebn0_db,
                self.rate.implementation_loss_db(),
                self.rates.required_margin_db,
            )
    }
}

/// The budget of `req` in `mission`.
///
/// ```no_run
/// use passbudget::config::mission::Mission;
/// use passbudget::plan::instant::{instant_budget, InstantGeometry, InstantRequest};
///
/// let mission = Mission::load("examples/wrenlet-1.yaml".as_ref())?;
/// let req = InstantRequest {
///     station: "Nordkam".into(),
///     geometry: InstantGeometry::Elevation(10.0),
///     rate_bps: None,
///     scheme: None,
///     exceedance_percent: None,
///     allow_stale_elements: false,
/// };
/// let b = instant_budget(&mission, &req)?;
/// println!("margin {:.2} dB, closes: {}", b.values.margin_db, b.closes());
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
pub fn instant_budget(
    mission: &Mission,
    req: &InstantRequest,
) -> Result<InstantBudget, InstantError> {
    let st = find_station(mission, &req.station)?;
    let mut model = station_model(mission, st, None)?;
    let rates = rate_set(mission, &model.link)?;
    // An element-set history: the set for the instant asked, else for the mission's window start,
    // else the latest set.
    let when = match req.geometry {
        InstantGeometry::At(t) => t,
        InstantGeometry::Elevation(_) | InstantGeometry::Pointing { .. } => mission
            .start
            .unwrap_or(chrono::DateTime::<chrono::Utc>::MAX_UTC),
    };
    let (elements, prop, selection) =
        load_satellite(&mission.elements_path, mission.select.as_deref(), when)?;
    if let InstantGeometry::At(t) = req.geometry {
        super::inputs::check_element_age(&elements, t, t, req.allow_stale_elements)?;
    }
    let (mut look, time, line) = look_at(&model, &elements, &prop, req.geometry)?;
    let rate = rate_spec(mission, &model, &rates, req)?;
    let weather = availability_weather(req.exceedance_percent, std::slice::from_ref(&model))?
        .unwrap_or(Weather::ClearSky);
    model.prepare_weather(weather);
    let (azimuth_deg, terrain_lines) =
        terrain_azimuth(st, &model, (req.geometry, weather), &mut look);
    // With a time, the Sun and the Moon are where they are then (a track of zero length).
    let bodies = time
        .map(|t| -> Result<PassBodies, SeriesError> {
            let mut b = PassBodies::new(&model.observer, &t, &t)?;
            model.bodies.reset(&mut b, &t, &t)?;
            Ok(b)
        })
        .transpose()?;
    let at = bodies
        .as_ref()
        .zip(time.as_ref())
        .map(|(b, t)| model.bodies.at(b, t, look.azimuth_deg, look.elevation_deg));
    let (att, values) = budget_at(&model, &look, weather, at, rate)?;
    let mut items = items(&model, &look, &att, &values, rate, at.is_some())?;
    items.push(BudgetItem {
        name: "required_margin",
        value: Some(rates.required_margin_db),
        unit: "dB",
        source: "mission modem.required_margin_db".into(),
    });
    // The same lines as a plan's: frequency ranges grouped in one.
    let mut warnings = super::series::PassWarnings {
        atmosphere: att.warnings,
        noise: model.noise.warnings(),
        // without a time the Sun and the Moon are not evaluated: no word on their models
        bodies: time.map(|_| model.bodies.warnings()).unwrap_or_default(),
        pattern_clamped: values.pattern_clamped,
        below_horizon: values.below_horizon,
        pfd_exceeded: false,
    }
    .lines(model.link.frequency_hz());
    let spectrum = mission.pfd_spectrum();
    let pfd = pfd_at(&model, &look, &values, spectrum);
    items.extend(pfd.iter().flat_map(|p| pfd_items(p, spectrum)));
    warnings.extend(pfd_warning(&model, pfd.as_ref()));
    warnings.extend(terrain_lines);
    warnings.extend(line.and_then(|l| mount_cannot_keep_up(&model, &l)));
    warnings.extend(below_min_elevation(mission, &model, &look));
    warnings.extend(eccentric_orbit_line(&model, &elements, &prop, &look, time));
    if let Some(t) = time {
        warnings.extend(element_age_warning(&elements, t, t));
        warnings.extend(super::bodies::position_years_warning(&t, &t));
    }
    let notes = element_notes(&elements, &selection);
    let mut defaults = mission.defaults.clone();
    defaults.extend(st.defaults.iter().cloned());
    Ok(InstantBudget {
        elements,
        station: model,
        rates,
        time,
        azimuth_deg,
        look,
        exceedance_percent: req.exceedance_percent,
        attenuation: att,
        values,
        rate,
        items,
        warnings,
        notes,
        defaults,
        pfd,
    })
}

/// The pfd at the station for this budget's carrier, against the band's limit
/// ([`crate::link::pfd`]); `None` when passbudget has no row for the band.
fn pfd_at(
    model: &StationModel,
    look: &Look,
    values: &crate::link::budget::BudgetValues,
    spectrum: crate::link::pfd::Spectrum,
) -> Option<crate::link::pfd::PfdAt> {
    crate::link::pfd::BandLimit::for_frequency(model.link.frequency_hz()).map(|b| {
        b.at(
            values.eirp_dbw,
            look.range_km,
            look.elevation_deg,
            values.occupied_bandwidth_hz,
            spectrum,
        )
    })
}

/// The pfd's items of the budget (the JSON's `pfd_*` fields, for the table and the CSV): the pfd
/// in the band's reference bandwidth, that bandwidth, the limit (its source: how the band's row
/// is known) and the margin.
fn pfd_items(p: &crate::link::pfd::PfdAt, spectrum: crate::link::pfd::Spectrum) -> [BudgetItem; 4] {
    let per = super::pfd::reference_label(p.reference_bandwidth_hz);
    let status = if p.limit_status.starts_with("from memory") {
        "from memory (Article 21 Table 21-4 row not confirmed in the text)"
    } else {
        p.limit_status
    };
    [
        BudgetItem {
            name: "pfd",
            value: Some(p.pfd_dbw_m2),
            unit: "dB(W/m2)",
            source: match spectrum {
                crate::link::pfd::Spectrum::Uniform => format!("in {per}: EIRP - 10 log10(4 pi d^2) - 10 log10(max(B, B_ref) / B_ref), {}", spectrum.label()),
                _ => format!("in {per}: EIRP - 10 log10(4 pi d^2) + 10 log10(largest share of the power in one B_ref), {}", spectrum.label()),
            }
            .into(),
        },
        BudgetItem {
            name: "pfd_reference_bandwidth",
            value: Some(p.reference_bandwidth_hz),
            unit: "Hz",
            source: "the band's Article 21 Table 21-4 row".into(),
        },
        BudgetItem {
            name: "pfd_limit",
            value: Some(p.limit_dbw_m2),
            unit: "dB(W/m2)",
            source: format!("at this angle of arrival (the elevation); {status}").into(),
        },
        BudgetItem {
            name: "pfd_margin",
            value: Some(p.margin_db),
            unit: "dB",
            source: "limit minus pfd (negative: over the limit, a warning; compliance is for the administration to decide)".into(),
        },
    ]
}

/// The pfd's warning: no row for the band, or over the limit.
fn pfd_warning(model: &StationModel, pfd: Option<&crate::link::pfd::PfdAt>) -> Option<String> {
    let f = model.link.frequency_hz();
    match pfd {
        None => Some(format!(
            "pfd: passbudget has no Article 21 Table 21-4 row for {}: the power flux-density is not checked",
            crate::engfmt::frequency_mhz(f)
        )),
        Some(p) if p.margin_db < 0.0 => Some(format!(
            "pfd: {:.1} dB(W/m2) in {} exceeds the Article 21 Table 21-4 limit ({:.1}) by {:.1} dB at this geometry (limit row {}); compliance is for the administration to decide",
            p.pfd_dbw_m2,
            super::pfd::reference_label(p.reference_bandwidth_hz),
            p.limit_dbw_m2,
            -p.margin_db,
            p.limit_status
        )),
        Some(_) => None,
    }
}

fn find_station<'m>(
    mission: &'m Mission,
    name: &str,
) -> Result<&'m crate::config::station::Station, InstantError> {
    mission
        .stations
        .iter()
        .find(|s| crate::config::station::same_station(name, &s.name))
        .ok_or_else(|| InstantError::NoStation {
            mission: mission.source.display().to_string(),
            name: name.to_string(),
            known: mission
                .stations
                .iter()
                .map(|s| s.name.as_str())
                .collect::<Vec<_>>()
                .join(", "),
        })
}

/// The look, and with a time that time and the line of sight (for the mount).
type LookAt = (Look, Option<DateTime<Utc>>, Option<LineOfSight>);

fn look_at(
    model: &StationModel,
    elements: &ElementSet,
    prop: &crate::orbit::Propagator,
    geometry: InstantGeometry,
) -> Result<LookAt, InstantError> {
    match geometry {
        InstantGeometry::At(t) => {
            let s = prop
                .ecef_at(&t)
                .map_err(|source| InstantError::Propagation {
                    satellite: elements.label(),
                    source,
                })?;
            let (look, line) = model.observer.look_and_line(&s);
            if look.elevation_deg < 0.0 {
                return Err(InstantError::BelowHorizon {
                    satellite: elements.label(),
                    station: model.station.name.clone(),
                    time: format_ms(&t),
                    elevation_deg: look.elevation_deg,
                });
            }
            Ok((look, Some(t), Some(line)))
        }
        InstantGeometry::Elevation(e)
        | InstantGeometry::Pointing {
            elevation_deg: e, ..
        } => {
            if !(0.0..=90.0).contains(&e) {
                return Err(InstantError::Elevation(short_number(e)));
            }
            // The azimuth given, or 0 until the budget chooses one (InstantGeometry::Elevation).
            let azimuth_deg = match geometry {
                // Beyond a turn either way an azimuth is a typing slip (and 1e300 deg keeps no
                // digits of its own after the wrap).
                InstantGeometry::Pointing { azimuth_deg, .. }
                    if !(-360.0..=720.0).contains(&azimuth_deg) =>
                {
                    return Err(InstantError::Azimuth(short_number(azimuth_deg)));
                }
                InstantGeometry::Pointing { azimuth_deg, .. } => azimuth_deg.rem_euclid(360.0),
                _ => 0.0,
            };
            let perigee_radius_km = prop.semi_major_axis_km() * (1.0 - prop.eccentricity());
            let earth_radius_km = crate::orbit::propagate::WGS72_RADIUS_KM;
            let station_radius_km = station_radius_km(model);
            if perigee_radius_km <= earth_radius_km.max(station_radius_km) {
                return Err(InstantError::PerigeeInsideEarth {
                    satellite: elements.label(),
                    perigee_radius_km,
                    earth_radius_km,
                    station_radius_km,
                });
            }
            let (range_km, off_nadir_deg) = crate::geometry::slant::slant_range_km(
                station_radius_km,
                prop.semi_major_axis_km(),
                e,
            )?;
            let look = Look {
                azimuth_deg,
                elevation_deg: e,
                range_km,
                range_rate_km_s: 0.0,
                off_nadir_deg,
                elevation_rate_deg_s: 0.0,
                azimuth_rate_deg_s: 0.0,
            };
            Ok((look, None, None))
        }
    }
}

/// The line when the station's mount cannot keep up with the satellite at this instant: an axis
/// rate beyond its limit ([`crate::geometry::mount::Mount::can_follow`], the instant's test). A
/// plan follows the mount over the pass and loses the seconds its pointing lags by more than a
/// quarter beamwidth, which begin and end a little apart from these: around here, not exactly
/// here.
fn mount_cannot_keep_up(model: &StationModel, line: &LineOfSight) -> Option<String> {
    let m = model.station.mount.as_ref()?;
    let r = m.rates(&line.enu_km, &line.enu_rate_km_s);
    if m.can_follow(r, None) {
        return None;
    }
    let primary = r.primary_deg_s.abs() > m.primary_max_rate_deg_s;
    let (axis, need, limit) = match primary {
        true => (
            "primary (keyhole)",
            r.primary_deg_s,
            m.primary_max_rate_deg_s,
        ),
        false => ("secondary", r.secondary_deg_s, m.secondary_max_rate_deg_s),
    };
    let need = match need.abs() {
        v if v > 1e3 => "over 1000".to_string(),
        v => format!("{v:.2}"),
    };
    Some(format!(
        "the station's mount cannot keep up here: its {axis} axis would need {need} deg/s against a limit of {limit} deg/s; a plan loses the satellite around here (mount lost)"
    ))
}

fn station_radius_km(model: &StationModel) -> f64 {
    let p = model.observer.position_km();
    (p[0] * p[0] + p[1] * p[1] + p[2] * p[2]).sqrt()
}

/// How far the free-space loss at an elevation may differ, either way, between the orbit's
/// perigee or apogee radius and its semi-major axis before a budget at the semi-major axis says
/// so, dB (this project's rule: a sixth of the usual 3 dB required margin).
pub const ECCENTRIC_LOSS_DEPARTURE_DB: f64 = 0.5;

/// The line when a budget at an elevation (taken at the orbit's semi-major axis) differs by more
/// than [`ECCENTRIC_LOSS_DEPARTURE_DB`] of free-space loss from the same elevation at the
/// perigee or the apogee radius: both ranges and both losses against the budget's. `None` at a
/// moment (`--at`) and for an orbit this near circular. The perigee radius is above the station's
/// ([`InstantError::PerigeeInsideEarth`]).
fn eccentric_orbit_line(
    model: &StationModel,
    elements: &ElementSet,
    prop: &crate::orbit::Propagator,
    look: &Look,
    time: Option<DateTime<Utc>>,
) -> Option<String> {
    use crate::geometry::slant::slant_range_km;
    if time.is_some() {
        return None;
    }
    let (a_km, e) = (prop.semi_major_axis_km(), prop.eccentricity());
    let r0 = station_radius_km(model);
    let range = |r: f64| slant_range_km(r0, r, look.elevation_deg).ok().map(|x| x.0);
    let lo = range(a_km * (1.0 - e))?;
    let hi = range(a_km * (1.0 + e))?;
    let db = |d: f64| 20.0 * (d / look.range_km).log10();
    let (lo_db, hi_db) = (db(lo), db(hi));
    (hi_db.max(-lo_db) > ECCENTRIC_LOSS_DEPARTURE_DB).then(|| {
        format!(
            "{}: eccentric orbit (e = {e:.4}): at {:.2} deg elevation the range would be {lo:.0} km at perigee and {hi:.0} km at apogee, the free-space loss {lo_db:+.2} and {hi_db:+.2} dB against this budget's (negative: less loss; the pfd margin moves as much the other way), which takes the semi-major axis ({:.0} km range); --at TIME budgets a moment of the orbit",
            elements.label(),
            look.elevation_deg,
            look.range_km
        )
    })
}

/// The line when the line of sight is below the minimum elevation a plan applies (the mission's
/// `planning.mask_deg`, else the station's `min_elevation_deg`): a plan counts no second there.
fn below_min_elevation(mission: &Mission, model: &StationModel, look: &Look) -> Option<String> {
    let (min, key) = match mission.mask_deg {
        Some(m) => (m, "the mission's planning.mask_deg"),
        None => (
            model.configured_min_elevation_deg,
            "the station's min_elevation_deg",
        ),
    };
    (look.elevation_deg < min).then(|| {
        format!(
            "the elevation ({:.2} deg) is below {key} ({min} deg): a plan counts no second here",
            look.elevation_deg
        )
    })
}

/// The rate and its scheme: the ladder entry with that rate, or the asked scheme, or the ladder's first.
fn rate_spec(
    mission: &Mission,
    model: &StationModel,
    rates: &RateSet,
    req: &InstantRequest,
) -> Result<RateSpec, InstantError> {
    let rate_bps = req.rate_bps.unwrap_or(rates.ladder[0].rate_bps);
    // The one range of a data rate (config::limits), as for the ladder in the file.
    let rate_bps = crate::config::limits::RATE_BPS
        .check(rate_bps)
        .map_err(|source| InstantError::Range { source })?;
    if let (None, Some(i)) = (
        &req.scheme,
        rates.ladder.iter().position(|o| o.rate_bps == rate_bps),
    ) {
        return Ok(rates.ladder_specs[i]);
    }
    let modem = mission
        .modem
        .as_ref()
        .ok_or_else(|| InstantError::Rate("the mission has no modem block".into()))?;
    let name = req
        .scheme
        .clone()
        .unwrap_or_else(|| rates.ladder[0].scheme.clone());
    let bad = |e: &dyn std::fmt::Display| InstantError::Rate(format!("{name}: {e}"));
    let idx = modem.schemes.index(&name).map_err(|e| bad(&e))?;
    let op = modem
        .schemes
        .operating_point(idx, Some(modem.target_ber))
        .map_err(|e| bad(&e))?;
    model
        .link
        .rate_spec(rate_bps, op, modem.roll_off, modem.implementation_loss_db)
        .map_err(|e| {
            InstantError::Rate(format!(
                "rate {} bit/s with {name}: {e}",
                short_number(rate_bps)
            ))
        })
}

/// The azimuth of the budget (the satellite's, the one given, or for an elevation alone the one
/// where the terrain's noise is highest among those whose terrain is not above it, set in `look`;
/// `None` without terrain noise) and the lines about the terrain: that azimuth chosen, and a line
/// of sight below the terrain (`horizon_mask` above the geometric horizon: the path is blocked).
/// For an elevation alone the path is blocked only where the terrain is above it at every
/// azimuth (the lowest terrain is then named).
fn terrain_azimuth(
    st: &crate::config::station::Station,
    model: &StationModel,
    (geometry, weather): (InstantGeometry, Weather),
    look: &mut Look,
) -> (Option<f64>, Vec<String>) {
    let terrain = crate::noise::terrain::terrain_profile(&st.horizon_mask);
    let mut lines = Vec::new();
    let azimuth_deg = match geometry {
        InstantGeometry::At(_) | InstantGeometry::Pointing { .. } => Some(look.azimuth_deg),
        InstantGeometry::Elevation(e) => model.noise.worst_azimuth_deg(e, weather),
    };
    let blocked = match (geometry, &terrain) {
        (_, None) => None,
        (InstantGeometry::Elevation(e), Some(t)) => {
            // the lowest terrain is at a vertex of the profile
            let h = t.lowest_limit_deg();
            let az = t.points().iter().find(|p| p[1] <= h).map_or(0.0, |p| p[0]);
            (e < h).then_some((az, h))
        }
        (_, Some(t)) => {
            let h = t.limit_deg(look.azimuth_deg);
            (look.elevation_deg < h).then_some((look.azimuth_deg, h))
        }
    };
    if let (InstantGeometry::Elevation(_), Some(az)) = (geometry, azimuth_deg) {
        look.azimuth_deg = az;
        let az = crate::engfmt::azimuth(az, 1);
        lines.push(match blocked {
            None => format!("no azimuth given: the terrain's noise is taken at azimuth {az} deg, where it is highest at this elevation among the azimuths whose terrain is not above it"),
            Some(_) => format!("no azimuth given: the terrain is above this elevation at every azimuth; its noise is taken at azimuth {az} deg, where the terrain is lowest"),
        });
    }
    if let Some((az, h)) = blocked {
        let az = crate::engfmt::azimuth(az, 1);
        lines.insert(0, format!(
            "the line of sight (elevation {:.2} deg, azimuth {az} deg) is below the terrain of horizon_mask there ({h:.1} deg): the path is blocked, and these figures are not a link",
            look.elevation_deg
        ));
    }
    (azimuth_deg, lines)
}

/// The link's items with the atmosphere's components (as losses) right after the free-space loss.
fn items(
    model: &StationModel,
    look: &Look,
    att: &Attenuation,
    values: &BudgetValues,
    rate: RateSpec,
    bodies_evaluated: bool,
) -> Result<Vec<BudgetItem>, InstantError> {
    let atmosphere = [
        ("gas_loss", att.gas_db, "ITU-R P.676-12 Annex 2"),
        ("cloud_loss", att.cloud_db, "ITU-R P.840-9"),
        ("rain_loss", att.rain_db, "ITU-R P.618-14 2.2.1.1, P.838-3"),
        (
            "scintillation_loss",
            att.scintillation_db,
            "ITU-R P.618-14 2.4.1",
        ),
    ]
    .map(|(name, value, source)| BudgetItem {
        name,
        value: Some(-value),
        unit: "dB",
        source: source.into(),
    });
    let terms = PathTerms::of(
        att,
        model.mean_radiating_temperature_k,
        model.link.background_temperature_k(),
    );
    let (geometry, atmosphere_loss) = link_inputs(model, look, &terms);
    // The noise terms budget_at used (the Sun's and the Moon's need the time).
    let external = ExternalNoise {
        sky_k: values.sky_noise_k,
        ground_k: values.ground_noise_k,
        man_made_k: values.man_made_noise_k,
        sun_k: values.sun_noise_k,
        moon_k: values.moon_noise_k,
    };
    let link_items = model
        .link
        .itemize(geometry, atmosphere_loss, external, rate)?;
    let mut items = Vec::with_capacity(link_items.len() + atmosphere.len());
    // The noise terms' sources as this station makes them (pattern, measured table, terrain).
    let sources = model.noise.term_sources();
    for mut i in link_items {
        match i.name {
            "sky_noise" => i.source = sources.sky.clone().into(),
            "ground_noise" => i.source = sources.ground.clone().into(),
            "sun_noise" => i.source = sources.sun.clone().into(),
            "moon_noise" => i.source = sources.moon.clone().into(),
            _ => {}
        }
        if !bodies_evaluated {
            not_evaluated(&mut i);
        }
        let after_fsl = i.name == "free_space_loss";
        let after_moon = i.name == "moon_noise";
        items.push(i);
        if after_fsl {
            items.extend(atmosphere.iter().cloned());
        }
        if after_moon {
            items.extend(separation_items(values));
        }
    }
    Ok(items)
}

/// Without a time (a budget at an elevation) the Sun and the Moon are not evaluated: their items
/// carry no value and say so, and the antenna temperature's source says they are left out.
fn not_evaluated(i: &mut BudgetItem) {
    match i.name {
        "sun_noise" | "moon_noise" => {
            i.value = None;
            i.source = NOT_EVALUATED.into();
        }
        "antenna_temperature" => {
            i.source =
                "sky + ground + man-made (Sun and Moon not evaluated: no time given (--at))".into();
        }
        _ => {}
    }
}

/// The source of the Sun's and the Moon's items of a budget without a time.
pub const NOT_EVALUATED: &str = "not evaluated: no time given (--at)";

/// The Sun's and the Moon's angles from the pointing, when the budget has a time.
fn separation_items(values: &BudgetValues) -> impl Iterator<Item = BudgetItem> {
    let sun = values.sun_separation_deg.map(|value| BudgetItem {
        name: "sun_separation",
        value: Some(value),
        unit: "deg",
        source: "Sun: Astronomical Almanac low-precision formulae".into(),
    });
    let moon = values.moon_separation_deg.map(|value| BudgetItem {
        name: "moon_separation",
        value: Some(value),
        unit: "deg",
        source: "Moon: Meeus ch. 47".into(),
    });
    sun.into_iter().chain(moon)
}

/// What to evaluate with [`atmosphere_at`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct AtmosphereRequest {
    pub frequency_ghz: f64,
    pub elevation_deg: f64,
    /// Rain exceeded this percentage of an average year; `None` for clear sky.
    pub exceedance_percent: Option<f64>,
    /// Polarization tilt for ITU-R P.838-3, deg (45 for circular polarization).
    pub polarization_tilt_deg: f64,
}

/// The atmosphere along one elevation at a station: each ITU-R component, the mean radiating
/// temperature and the sky brightness temperature.
#[derive(Debug, Clone)]
pub struct AtmosphereAt {
    pub attenuation: Attenuation,
    pub mean_radiating_temperature_k: f64,
    pub sky_temperature_k: f64,
    pub warnings: Vec<String>,
    /// The station's defaults plus any taken here (the scintillation aperture).
    pub defaults: Vec<DefaultUsed>,
}

/// Error of [`atmosphere_at`].
#[derive(Debug, thiserror::Error)]
pub enum AtmosphereAtError {
    #[error("{}: {source}", .source.key)]
    Range {
        #[source]
        source: crate::config::limits::RangeError,
    },
    #[error(transparent)]
    Prepare(#[from] PrepareError),
    #[error("{station}: atmosphere: {source}")]
    Model {
        station: String,
        #[source]
        source: crate::atmosphere::AtmosphereError,
    },
    #[error("sky temperature: {0}")]
    Noise(String),
}

/// The atmosphere at one elevation for a station, with the ranges of [`crate::config::limits`]
/// and the station's own aperture for scintillation ([`super::prepare::antenna_aperture`], the
/// rule of `budget` and `plan`; without an antenna block, the defaults of
/// [`crate::config::defaults::SCINTILLATION_DIAMETER_M`]).
pub fn atmosphere_at(
    st: &crate::config::station::Station,
    req: &AtmosphereRequest,
) -> Result<AtmosphereAt, AtmosphereAtError> {
    use crate::config::{defaults, limits};
    let range = |r: &limits::Range, v: f64| {
        r.check(v)
            .map_err(|source| AtmosphereAtError::Range { source })
    };
    let frequency_ghz = range(&limits::FREQUENCY_GHZ, req.frequency_ghz)?;
    let elevation_deg = range(&limits::ELEVATION_DEG, req.elevation_deg)?;
    let tilt_deg = range(&limits::POLARIZATION_TILT_DEG, req.polarization_tilt_deg)?;
    // Only the defaults the atmosphere uses: the climate, and the aperture for scintillation.
    let used = |key: &str| {
        key.starts_with("climate.") || key == "antenna.efficiency" || key == "antenna.diameter_m"
    };
    let mut defaults_used: Vec<DefaultUsed> = st
        .defaults
        .iter()
        .filter(|d| used(&d.key))
        .cloned()
        .collect();
    let mut take = |d: &defaults::DefaultValue<f64>| {
        defaults_used.push(DefaultUsed {
            key: d.key.to_string(),
            value: defaults::Shown::shown(&d.value),
            source: d.source.to_string(),
        });
        d.value
    };
    let (diameter_m, efficiency) = match st.antenna.as_ref() {
        Some(ant) => super::prepare::antenna_aperture(&ant.gain, frequency_ghz * 1e9),
        None => (
            take(&defaults::SCINTILLATION_DIAMETER_M),
            take(&defaults::SCINTILLATION_EFFICIENCY),
        ),
    };
    let site = super::prepare::atmosphere_site(st);
    let path = crate::atmosphere::PathSpec {
        frequency_ghz,
        polarization_tilt_deg: tilt_deg,
        antenna_diameter_m: diameter_m,
        antenna_efficiency: efficiency,
    };
    let prepared = crate::atmosphere::PreparedAtmosphere::new(&site, &path).map_err(|source| {
        AtmosphereAtError::Model {
            station: st.source.display().to_string(),
            source,
        }
    })?;
    let station = std::slice::from_ref(st);
    let weather = super::prepare::availability_weather_for(req.exceedance_percent, station)?
        .unwrap_or(Weather::ClearSky);
    let att = prepared.at(elevation_deg, weather);
    let tmr = crate::atmosphere::mean_radiating_temperature_k(st.climate.temperature_k);
    let noise = |e: &dyn std::fmt::Display| AtmosphereAtError::Noise(e.to_string());
    let (bg, _) =
        crate::noise::sky::background_temperature_k(frequency_ghz * 1e9).map_err(|e| noise(&e))?;
    let tsky = crate::noise::sky::sky_temperature_p618_k(att.absorptive_db, tmr, bg)
        .map_err(|e| noise(&e))?;
    Ok(AtmosphereAt {
        // the frequency-range lines in one, as a budget's
        warnings: super::series::frequency_range_line(
            frequency_ghz * 1e9,
            att.warnings.frequency_ranges(),
        )
        .into_iter()
        .chain(att.warnings.other_messages().map(String::from))
        .collect(),
        attenuation: att,
        mean_radiating_temperature_k: tmr,
        sky_temperature_k: tsky,
        defaults: defaults_used,
    })
}
