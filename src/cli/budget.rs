//! `passbudget budget` (the itemized budget at one instant) and `passbudget atmosphere`.

use crate::cli::table::{Align, Table};
use crate::cli::Format;
use anyhow::{anyhow, bail, Result};
use passbudget::atmosphere::{mean_radiating_temperature_k, PathSpec, PreparedAtmosphere, Weather};
use passbudget::config::mission::Mission;
use passbudget::config::station::Station;
use passbudget::geometry::Look;
use passbudget::link::budget::RateSpec;
use passbudget::noise::sky::{background_temperature_k, sky_temperature_p618_k};
use passbudget::plan::inputs::{element_age_warning, load_satellite, satellite_name};
use passbudget::plan::prepare::{antenna_aperture, availability_weather, rate_set, station_model};
use passbudget::plan::series::budget_at;
use passbudget::report::round;
use passbudget::timefmt::{format_ms, parse_utc};
use serde::Serialize;
use std::io::Write;
use std::path::PathBuf;

#[derive(Debug, Clone, clap::Args)]
pub struct BudgetArgs {
    /// Mission file.
    #[arg(value_name = "MISSION")]
    pub mission: PathBuf,
    /// Station by name (as in its station file).
    #[arg(long, value_name = "NAME")]
    pub station: String,
    /// Elevation, deg; the slant range follows from the orbit's semi-major axis.
    #[arg(
        long,
        value_name = "E",
        allow_hyphen_values = true,
        conflicts_with = "at",
        required_unless_present = "at"
    )]
    pub elevation_deg: Option<f64>,
    /// Time (RFC 3339 UTC): geometry from the propagated orbit.
    #[arg(long, value_name = "TIME")]
    pub at: Option<String>,
    /// Data rate, bit/s (default: the first rate of the ladder). Its scheme is the ladder's for that rate, or --scheme.
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub rate_bps: Option<f64>,
    /// Modulation and coding scheme (default: the ladder's).
    #[arg(long, value_name = "NAME")]
    pub scheme: Option<String>,
    /// Rain exceeded P % of an average year (default: clear sky).
    #[arg(long, value_name = "P", allow_hyphen_values = true)]
    pub exceedance_percent: Option<f64>,
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
}

#[derive(Debug, Clone, clap::Args)]
pub struct AtmosphereArgs {
    /// Station file.
    #[arg(long, value_name = "FILE")]
    pub station: PathBuf,
    #[arg(long, value_name = "F", allow_hyphen_values = true)]
    pub frequency_ghz: f64,
    #[arg(long, value_name = "E", allow_hyphen_values = true)]
    pub elevation_deg: f64,
    /// Exceedance percentage of an average year (default: clear sky).
    #[arg(long, value_name = "P", allow_hyphen_values = true)]
    pub exceedance_percent: Option<f64>,
    /// Polarization tilt relative to the horizontal, deg (45 = circular).
    #[arg(
        long,
        value_name = "T",
        default_value_t = 45.0,
        allow_hyphen_values = true
    )]
    pub polarization_tilt_deg: f64,
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
}

/// JSON of `budget` (public interface).
#[derive(Debug, Serialize)]
pub struct BudgetDoc {
    pub satellite: String,
    pub station: String,
    pub time: Option<String>,
    pub weather: String,
    pub frequency_hz: f64,
    pub elevation_deg: f64,
    pub azimuth_deg: Option<f64>,
    pub range_km: f64,
    pub off_nadir_deg: f64,
    pub eirp_dbw: f64,
    pub free_space_loss_db: f64,
    pub gas_db: f64,
    pub cloud_db: f64,
    pub rain_db: f64,
    pub scintillation_db: f64,
    pub atmospheric_loss_db: f64,
    pub polarization_loss_db: f64,
    pub pointing_loss_db: f64,
    pub antenna_gain_dbi: f64,
    pub sky_temperature_k: f64,
    pub antenna_temperature_k: f64,
    pub system_temperature_k: f64,
    pub g_over_t_db_k: f64,
    pub cn0_dbhz: f64,
    pub rate_bps: f64,
    pub scheme: String,
    pub symbol_rate_baud: f64,
    pub occupied_bandwidth_hz: f64,
    pub ebn0_db: f64,
    pub esn0_db: f64,
    pub required_ebn0_db: f64,
    pub implementation_loss_db: f64,
    pub margin_db: f64,
    pub required_margin_db: f64,
    pub closes: bool,
    pub shannon_capacity_bps: f64,
    pub shannon_gap_db: f64,
    pub items: Vec<ItemRow>,
    pub warnings: Vec<String>,
    pub defaults: Vec<passbudget::config::DefaultUsed>,
}

#[derive(Debug, Serialize)]
pub struct ItemRow {
    pub name: String,
    pub value: f64,
    pub unit: String,
    pub source: String,
}

/// `passbudget budget`.
pub fn budget(a: BudgetArgs, out: &mut dyn Write) -> Result<()> {
    let mission = Mission::load(&a.mission)?;
    let st = mission
        .stations
        .iter()
        .find(|s| s.name.eq_ignore_ascii_case(a.station.trim()))
        .ok_or_else(|| {
            anyhow!(
                "{}: no station named '{}' (the mission has: {})",
                a.mission.display(),
                a.station,
                mission
                    .stations
                    .iter()
                    .map(|s| s.name.as_str())
                    .collect::<Vec<_>>()
                    .join(", ")
            )
        })?;
    let model = station_model(&mission, st, None)?;
    let rates = rate_set(&mission, &model.link)?;
    let modem = mission.modem.as_ref().expect("rate_set checked the modem");
    let (elements, prop) = load_satellite(&mission.elements_path, mission.select.as_deref())?;
    let (look, time) = match (&a.at, a.elevation_deg) {
        (Some(t), _) => {
            let t = parse_utc(t).map_err(|e| anyhow!("--at: {e}"))?;
            crate::cli::warn(
                &element_age_warning(&elements, t, t)
                    .into_iter()
                    .collect::<Vec<_>>(),
            );
            let s = prop
                .ecef_at(&t)
                .map_err(|e| anyhow!("{}: {e}", elements.label()))?;
            let look = model.observer.look(&s);
            if look.elevation_deg < 0.0 {
                bail!(
                    "{} is below the horizon of {} at {} (elevation {:.2} deg): no budget",
                    elements.label(),
                    st.name,
                    format_ms(&t),
                    look.elevation_deg
                );
            }
            (look, Some(t))
        }
        (None, Some(e)) => {
            if !(0.0..=90.0).contains(&e) {
                bail!("--elevation-deg {e}: out of range (0 to 90 deg)");
            }
            let p = model.observer.position_km();
            let station_radius_km = (p[0] * p[0] + p[1] * p[1] + p[2] * p[2]).sqrt();
            let (range_km, off_nadir_deg) = passbudget::geometry::slant::slant_range_km(
                station_radius_km,
                prop.semi_major_axis_km(),
                e,
            )?;
            (
                Look {
                    azimuth_deg: f64::NAN,
                    elevation_deg: e,
                    range_km,
                    range_rate_km_s: 0.0,
                    off_nadir_deg,
                    elevation_rate_deg_s: 0.0,
                    azimuth_rate_deg_s: 0.0,
                },
                None,
            )
        }
        (None, None) => bail!("give --elevation-deg E or --at TIME"),
    };
    // The rate and its scheme: the ladder entry with that rate, or --scheme, or the ladder's first.
    let rate_bps = a.rate_bps.unwrap_or(rates.ladder[0].rate_bps);
    let spec: RateSpec = match (
        &a.scheme,
        rates.ladder.iter().position(|o| o.rate_bps == rate_bps),
    ) {
        (None, Some(i)) => rates.ladder_specs[i],
        (name, _) => {
            let name = name
                .clone()
                .unwrap_or_else(|| rates.ladder[0].scheme.clone());
            let idx = passbudget::link::modcod::scheme_index(&name)?;
            let op = passbudget::link::modcod::operating_point(idx, Some(modem.target_ber))?;
            model
                .link
                .rate_spec(rate_bps, op, modem.roll_off, modem.implementation_loss_db)
                .map_err(|e| anyhow!("--rate-bps {rate_bps} with {name}: {e}"))?
        }
    };
    let pct = a.exceedance_percent;
    let weather =
        availability_weather(pct, std::slice::from_ref(&model))?.unwrap_or(Weather::ClearSky);
    let (att, v) = budget_at(&model, &look, weather, spec)?;
    let op = spec.operating();
    let mut items: Vec<ItemRow> = Vec::new();
    for (name, value, source) in [
        ("gas", att.gas_db, "ITU-R P.676-12 Annex 2"),
        ("cloud", att.cloud_db, "ITU-R P.840-9"),
        ("rain", att.rain_db, "ITU-R P.618-14 2.2.1.1, P.838-3"),
        (
            "scintillation",
            att.scintillation_db,
            "ITU-R P.618-14 2.4.1",
        ),
    ] {
        items.push(ItemRow {
            name: format!("{name}_loss"),
            value: -value,
            unit: "dB".into(),
            source: source.into(),
        });
    }
    let link_items = model.link.itemize(
        passbudget::link::budget::BudgetGeometry {
            elevation_deg: look.elevation_deg,
            range_km: look.range_km,
            off_nadir_deg: look.off_nadir_deg,
        },
        passbudget::link::budget::AtmosphereLoss {
            total_db: att.total_db,
            absorptive_db: att.absorptive_db,
            mean_radiating_temperature_k: model.mean_radiating_temperature_k,
        },
        spec,
    )?;
    // The atmosphere's components go right after the free-space loss, before their total.
    let atmosphere_items = std::mem::take(&mut items);
    for i in link_items {
        let after_fsl = i.name == "free_space_loss";
        items.push(ItemRow {
            name: i.name.into(),
            value: i.value,
            unit: i.unit.into(),
            source: i.source.into(),
        });
        if after_fsl {
            items.extend(atmosphere_items.iter().map(|a| ItemRow {
                name: a.name.clone(),
                value: a.value,
                unit: a.unit.clone(),
                source: a.source.clone(),
            }));
        }
    }
    items.push(ItemRow {
        name: "required_margin".into(),
        value: rates.required_margin_db,
        unit: "dB".into(),
        source: "mission modem.required_margin_db".into(),
    });
    let mut warnings: Vec<String> = att.warnings.messages().map(String::from).collect();
    if v.pattern_clamped {
        warnings.push("the spacecraft antenna table does not reach this off-nadir angle: its end value was used".into());
    }
    if v.galactic_extrapolated {
        warnings.push(
            "galactic background extrapolated beyond ITU-R P.372's range (a term below 1 K here)"
                .into(),
        );
    }
    let mut defaults = mission.defaults.clone();
    defaults.extend(st.defaults.iter().cloned());
    let doc = BudgetDoc {
        satellite: satellite_name(&elements),
        station: st.name.clone(),
        time: time.as_ref().map(format_ms),
        weather: match pct {
            Some(p) => format!("rain exceeded {p} % of an average year"),
            None => "clear sky".into(),
        },
        frequency_hz: model.link.frequency_hz(),
        elevation_deg: round(look.elevation_deg, 4),
        azimuth_deg: if look.azimuth_deg.is_nan() {
            None
        } else {
            Some(round(look.azimuth_deg, 4))
        },
        range_km: round(look.range_km, 4),
        off_nadir_deg: round(look.off_nadir_deg, 4),
        eirp_dbw: round(v.eirp_dbw, 4),
        free_space_loss_db: round(v.free_space_loss_db, 4),
        gas_db: round(att.gas_db, 4),
        cloud_db: round(att.cloud_db, 4),
        rain_db: round(att.rain_db, 4),
        scintillation_db: round(att.scintillation_db, 4),
        atmospheric_loss_db: round(v.atmospheric_loss_db, 4),
        polarization_loss_db: round(v.polarization_loss_db, 4),
        pointing_loss_db: round(v.pointing_loss_db, 4),
        antenna_gain_dbi: round(v.antenna_gain_dbi, 4),
        sky_temperature_k: round(v.sky_temperature_k, 3),
        antenna_temperature_k: round(v.antenna_temperature_k, 3),
        system_temperature_k: round(v.system_temperature_k, 3),
        g_over_t_db_k: round(v.g_over_t_db_k, 4),
        cn0_dbhz: round(v.cn0_dbhz, 4),
        rate_bps: v.rate_bps,
        scheme: op.name.to_string(),
        symbol_rate_baud: round(v.symbol_rate_baud, 1),
        occupied_bandwidth_hz: round(v.occupied_bandwidth_hz, 1),
        ebn0_db: round(v.ebn0_db, 4),
        esn0_db: round(v.esn0_db, 4),
        required_ebn0_db: round(v.required_ebn0_db, 4),
        implementation_loss_db: spec.implementation_loss_db(),
        margin_db: round(v.margin_db, 4),
        required_margin_db: rates.required_margin_db,
        closes: v.margin_db >= rates.required_margin_db,
        shannon_capacity_bps: v.shannon_capacity_bps.round(),
        shannon_gap_db: round(v.shannon_gap_db, 4),
        items,
        warnings,
        defaults,
    };
    match a.format {
        Format::Json => writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?,
        Format::Csv => {
            let rows: Vec<&ItemRow> = doc.items.iter().collect();
            write!(out, "{}", passbudget::report::to_csv(&rows)?)?
        }
        Format::Table => {
            let head = match &doc.time {
                Some(t) => format!(
                    "{} to {} at {} ({}), elevation {:.2} deg, azimuth {:.1} deg",
                    doc.satellite,
                    doc.station,
                    t,
                    doc.weather,
                    doc.elevation_deg,
                    doc.azimuth_deg.unwrap_or(0.0)
                ),
                None => format!(
                    "{} to {} at elevation {:.2} deg ({})",
                    doc.satellite, doc.station, doc.elevation_deg, doc.weather
                ),
            };
            writeln!(out, "{head}")?;
            let mut t = Table::new(&[
                ("item", Align::Left),
                ("value", Align::Right),
                ("unit", Align::Left),
                ("source", Align::Left),
            ]);
            for i in &doc.items {
                let digits = if i.unit == "Hz" || i.unit == "bit/s" || i.unit == "baud" {
                    0
                } else {
                    2
                };
                let value = if i.value.abs() < 0.5 * 10f64.powi(-(digits as i32))
                    && (i.unit == "dB" || i.unit == "dBi")
                {
                    format!("{:.*}", digits, 0.0)
                } else if i.value != 0.0 && i.value.abs() < 0.01 {
                    format!("{:.1e}", i.value)
                } else {
                    format!("{:.*}", digits, i.value)
                };
                t.row(vec![
                    i.name.replace('_', " "),
                    value,
                    i.unit.clone(),
                    i.source.clone(),
                ]);
            }
            write!(out, "{}", t.render())?;
            writeln!(
                out,
                "margin {:.2} dB against a required {:.1} dB: the link {} at {:.0} bit/s ({}); Shannon gap of the scheme {:.2} dB",
                doc.margin_db,
                doc.required_margin_db,
                if doc.closes { "closes" } else { "does not close" },
                doc.rate_bps,
                doc.scheme,
                doc.shannon_gap_db
            )?;
            for w in &doc.warnings {
                writeln!(out, "warning: {w}")?;
            }
            for d in &doc.defaults {
                writeln!(out, "default: {} = {} ({})", d.key, d.value, d.source)?;
            }
            writeln!(out, "Planning estimate only; see the README for cautions.")?;
        }
    }
    Ok(())
}

/// JSON of `atmosphere` (public interface).
#[derive(Debug, Serialize)]
pub struct AtmosphereDoc {
    pub station: String,
    pub frequency_ghz: f64,
    pub elevation_deg: f64,
    pub exceedance_percent: Option<f64>,
    pub polarization_tilt_deg: f64,
    pub gas_db: f64,
    pub cloud_db: f64,
    pub rain_db: f64,
    pub scintillation_db: f64,
    pub total_db: f64,
    pub rain_height_km: f64,
    pub specific_rain_attenuation_db_km: f64,
    pub mean_radiating_temperature_k: f64,
    pub sky_temperature_k: f64,
    pub warnings: Vec<String>,
    pub defaults: Vec<passbudget::config::DefaultUsed>,
}

/// `passbudget atmosphere`.
pub fn atmosphere(a: AtmosphereArgs, out: &mut dyn Write) -> Result<()> {
    let st = Station::load(&a.station)?;
    if !(a.frequency_ghz.is_finite() && a.frequency_ghz > 0.0) {
        bail!(
            "--frequency-ghz {}: must be a finite number above zero",
            a.frequency_ghz
        );
    }
    if !(a.elevation_deg.is_finite() && (0.0..=90.0).contains(&a.elevation_deg)) {
        bail!(
            "--elevation-deg {}: out of range (0 to 90 deg)",
            a.elevation_deg
        );
    }
    let mut defaults = st.defaults.clone();
    // The station's own aperture, by the same rule as `budget` and `plan`; without an antenna
    // block, 1 m at 0.5 (a documented default).
    let (d, eta) = match st.antenna.as_ref() {
        Some(ant) => antenna_aperture(&ant.gain, a.frequency_ghz * 1e9),
        None => {
            defaults.push(passbudget::config::DefaultUsed { key: "antenna.diameter_m".into(), value: "1".into(), source: "scintillation aperture averaging: 1 m at efficiency 0.5 assumed (no antenna block in the station file)".into() });
            (1.0, 0.5)
        }
    };
    let c = &st.climate;
    let site = passbudget::plan::prepare::atmosphere_site(&st);
    let prepared = PreparedAtmosphere::new(
        &site,
        &PathSpec {
            frequency_ghz: a.frequency_ghz,
            polarization_tilt_deg: a.polarization_tilt_deg,
            antenna_diameter_m: d,
            antenna_efficiency: eta,
        },
    )
    .map_err(|e| anyhow!("{}: atmosphere: {e}", a.station.display()))?;
    let weather = match a.exceedance_percent {
        Some(p) => {
            if c.rain_rate_001_mm_h.is_none() {
                bail!(
                    "{}: climate.rain_rate_001_mm_h is needed for an exceedance percentage",
                    a.station.display()
                );
            }
            Weather::exceedance(p).map_err(|e| anyhow!("--exceedance-percent: {e}"))?
        }
        None => Weather::ClearSky,
    };
    let att = prepared.at(a.elevation_deg, weather);
    let tmr = mean_radiating_temperature_k(c.temperature_k);
    let (bg, _) = background_temperature_k(a.frequency_ghz * 1e9)?;
    let tsky = sky_temperature_p618_k(att.absorptive_db, tmr, bg)?;
    let doc = AtmosphereDoc {
        station: st.name.clone(),
        frequency_ghz: a.frequency_ghz,
        elevation_deg: a.elevation_deg,
        exceedance_percent: a.exceedance_percent,
        polarization_tilt_deg: a.polarization_tilt_deg,
        gas_db: round(att.gas_db, 6),
        cloud_db: round(att.cloud_db, 6),
        rain_db: round(att.rain_db, 6),
        scintillation_db: round(att.scintillation_db, 6),
        total_db: round(att.total_db, 6),
        rain_height_km: round(att.rain_height_km, 4),
        specific_rain_attenuation_db_km: round(att.specific_rain_attenuation_db_km, 6),
        mean_radiating_temperature_k: round(tmr, 3),
        sky_temperature_k: round(tsky, 3),
        warnings: att.warnings.messages().map(String::from).collect(),
        defaults,
    };
    match a.format {
        Format::Json => writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?,
        Format::Csv => write!(
            out,
            "{}",
            passbudget::report::to_csv(std::slice::from_ref(&AtmosphereRow::from(&doc)))?
        )?,
        Format::Table => {
            writeln!(
                out,
                "{} at {} GHz, elevation {} deg, {}",
                doc.station,
                doc.frequency_ghz,
                doc.elevation_deg,
                match doc.exceedance_percent {
                    Some(p) => format!("exceeded {p} % of an average year"),
                    None => "clear sky".into(),
                }
            )?;
            let mut t = Table::new(&[
                ("component", Align::Left),
                ("value", Align::Right),
                ("unit", Align::Left),
                ("model", Align::Left),
            ]);
            for (n, v, u, m) in [
                ("gases", doc.gas_db, "dB", "ITU-R P.676-12 Annex 2"),
                ("clouds", doc.cloud_db, "dB", "ITU-R P.840-9"),
                (
                    "rain",
                    doc.rain_db,
                    "dB",
                    "ITU-R P.618-14 2.2.1.1 with P.838-3",
                ),
                (
                    "scintillation",
                    doc.scintillation_db,
                    "dB",
                    "ITU-R P.618-14 2.4.1",
                ),
                ("total", doc.total_db, "dB", "ITU-R P.618-14 2.5"),
                (
                    "rain height",
                    doc.rain_height_km,
                    "km",
                    "station value or ITU-R P.839-2 rule",
                ),
                (
                    "specific rain attenuation",
                    doc.specific_rain_attenuation_db_km,
                    "dB/km",
                    "ITU-R P.838-3 at R0.01",
                ),
                (
                    "mean radiating temperature",
                    doc.mean_radiating_temperature_k,
                    "K",
                    "ITU-R P.618-14 eq (70)",
                ),
                (
                    "sky brightness temperature",
                    doc.sky_temperature_k,
                    "K",
                    "ITU-R P.618-14 eq (69)",
                ),
            ] {
                t.row(vec![n.into(), format!("{v:.3}"), u.into(), m.into()]);
            }
            write!(out, "{}", t.render())?;
            for w in &doc.warnings {
                writeln!(out, "warning: {w}")?;
            }
            for d in &doc.defaults {
                writeln!(out, "default: {} = {} ({})", d.key, d.value, d.source)?;
            }
        }
    }
    Ok(())
}

/// Flat CSV form of the atmosphere result.
#[derive(Debug, Serialize)]
struct AtmosphereRow {
    station: String,
    frequency_ghz: f64,
    elevation_deg: f64,
    exceedance_percent: Option<f64>,
    gas_db: f64,
    cloud_db: f64,
    rain_db: f64,
    scintillation_db: f64,
    total_db: f64,
    rain_height_km: f64,
    specific_rain_attenuation_db_km: f64,
    sky_temperature_k: f64,
}

impl From<&AtmosphereDoc> for AtmosphereRow {
    fn from(d: &AtmosphereDoc) -> Self {
        AtmosphereRow {
            station: d.station.clone(),
            frequency_ghz: d.frequency_ghz,
            elevation_deg: d.elevation_deg,
            exceedance_percent: d.exceedance_percent,
            gas_db: d.gas_db,
            cloud_db: d.cloud_db,
            rain_db: d.rain_db,
            scintillation_db: d.scintillation_db,
            total_db: d.total_db,
            rain_height_km: d.rain_height_km,
            specific_rain_attenuation_db_km: d.specific_rain_attenuation_db_km,
            sky_temperature_k: d.sky_temperature_k,
        }
    }
}
