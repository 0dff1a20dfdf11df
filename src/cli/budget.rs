//! `passbudget budget` (the itemized budget at one instant) and `passbudget atmosphere`.

use crate::cli::common::{note, warn, Format};
use crate::cli::table::{Align, Table};
use crate::cli::window::{
    named_the_one_satellite, one_satellite, stations_and_mission, MissionArgs,
};
use anyhow::{anyhow, bail, Result};
use passbudget::config::limits::{short_number, FREQUENCY_MHZ};
use passbudget::config::station::Station;
use passbudget::config::DefaultUsed;
use passbudget::engfmt::azimuth;
use passbudget::plan::instant::{
    atmosphere_at, instant_budget, AtmosphereAtError, AtmosphereRequest, InstantError,
    InstantGeometry, InstantRequest,
};
use passbudget::report::budget::BudgetDoc;
use passbudget::report::round;
use passbudget::timefmt::parse_utc;
use serde::Serialize;
use std::io::Write;
use std::path::PathBuf;

#[derive(Debug, Clone, clap::Args)]
pub struct BudgetArgs {
    #[command(flatten)]
    pub mission: MissionArgs,
    /// Station: a station file, or the name of one of the mission's stations (case and
    /// punctuation ignored).
    #[arg(long, value_name = "FILE|NAME")]
    pub station: String,
    /// Elevation, deg; the slant range follows from the orbit's semi-major axis.
    #[arg(
        long,
        value_name = "DEG",
        allow_hyphen_values = true,
        conflicts_with = "at",
        required_unless_present = "at"
    )]
    pub elevation_deg: Option<f64>,
    /// Azimuth, deg (-360 to 720, taken modulo 360), with --elevation-deg: where a station's
    /// terrain rises above the horizon its noise depends on it (default: the azimuth in view where
    /// that noise is highest).
    #[arg(
        long,
        value_name = "DEG",
        allow_hyphen_values = true,
        requires = "elevation_deg",
        conflicts_with = "at"
    )]
    pub azimuth_deg: Option<f64>,
    /// Time (RFC 3339 UTC): geometry from the propagated orbit.
    #[arg(long, value_name = "TIME")]
    pub at: Option<String>,
    /// Data rate, bit/s (default: the first rate of the ladder). Its scheme is the ladder's for that rate, or --scheme.
    #[arg(long, value_name = "BPS", allow_hyphen_values = true)]
    pub rate_bps: Option<f64>,
    /// Modulation and coding scheme (default: the ladder's).
    #[arg(long, value_name = "NAME")]
    pub scheme: Option<String>,
    /// Rain exceeded P % of an average year (default: clear sky).
    #[arg(long, value_name = "P", allow_hyphen_values = true)]
    pub exceedance_percent: Option<f64>,
    /// Output on stdout: a table for people, or CSV (one row per budget item) or JSON.
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
    /// Budget at a time more than 90 days from the element epoch (refused otherwise).
    #[arg(long)]
    pub allow_stale_elements: bool,
    /// One satellite of a fleet mission (its name in the mission file): its orbit, transmitter
    /// and modem; a fleet mission needs it.
    #[arg(long, value_name = "NAME")]
    pub satellite: Option<String>,
}

#[derive(Debug, Clone, clap::Args)]
pub struct AtmosphereArgs {
    /// Station file.
    #[arg(long, value_name = "FILE")]
    pub station: PathBuf,
    /// Frequency, MHz.
    #[arg(
        long,
        value_name = "MHZ",
        allow_hyphen_values = true,
        required_unless_present = "frequency_ghz"
    )]
    pub frequency_mhz: Option<f64>,
    /// The older spelling, in GHz (hidden; --frequency-mhz is the one unit of every command).
    #[arg(
        long,
        value_name = "GHZ",
        allow_hyphen_values = true,
        hide = true,
        conflicts_with = "frequency_mhz"
    )]
    pub frequency_ghz: Option<f64>,
    /// Elevation, deg.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true)]
    pub elevation_deg: f64,
    /// Exceedance percentage of an average year (default: clear sky).
    #[arg(long, value_name = "P", allow_hyphen_values = true)]
    pub exceedance_percent: Option<f64>,
    /// Polarization tilt relative to the horizontal, deg (45 = circular).
    #[arg(
        long,
        value_name = "DEG",
        default_value_t = passbudget::config::defaults::POLARIZATION_TILT_DEG.value,
        allow_hyphen_values = true
    )]
    pub polarization_tilt_deg: f64,
    /// Output on stdout: a table for people, or CSV (one row) or JSON.
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
}

/// `passbudget budget`.
pub fn budget(a: BudgetArgs, out: &mut dyn Write) -> Result<()> {
    let overrides = a.mission.overrides()?;
    let values = std::slice::from_ref(&a.station);
    let (stations, mission) = stations_and_mission(values, Some(a.mission.path()), &overrides)?;
    let mut mission = one_satellite(
        mission.expect("a mission file was given"),
        a.satellite.as_deref(),
    )?;
    let station = &stations[0];
    if !mission.stations.iter().any(|s| s == station) {
        // A station file of its own: the budget is that station's.
        mission.stations = vec![station.clone()];
    }
    let geometry = match (&a.at, a.elevation_deg) {
        (Some(t), _) => InstantGeometry::At(parse_utc(t).map_err(|e| anyhow!("--at: {e}"))?),
        (None, Some(e)) => match a.azimuth_deg {
            Some(az) => InstantGeometry::Pointing {
                elevation_deg: e,
                azimuth_deg: az,
            },
            None => InstantGeometry::Elevation(e),
        },
        (None, None) => bail!("give --elevation-deg E or --at TIME"),
    };
    let req = InstantRequest {
        station: station.name.clone(),
        geometry,
        rate_bps: a.rate_bps,
        scheme: a.scheme.clone(),
        exceedance_percent: a.exceedance_percent,
        allow_stale_elements: a.allow_stale_elements,
    };
    let b = instant_budget(&mission, &req).map_err(|e| match e {
        InstantError::StaleElements(s) => {
            anyhow!("--at: {s}; --allow-stale-elements budgets anyway")
        }
        InstantError::Elevation(v) => anyhow!("--elevation-deg {v}: out of range (0 to 90 deg)"),
        InstantError::Azimuth(v) => {
            anyhow!("--azimuth-deg {v}: out of range (-360 to 720 deg, taken modulo 360)")
        }
        InstantError::Range { source }
            if source.key == passbudget::config::limits::RATE_BPS.key =>
        {
            anyhow!("--rate-bps: {source}")
        }
        InstantError::Prepare(passbudget::plan::prepare::PrepareError::Range { source }) => {
            anyhow!("--exceedance-percent: {source}")
        }
        // the rate or scheme asked for: named by its options (the mission's ladder passed its
        // own checks when it was read)
        InstantError::Rate(m) if a.rate_bps.is_some() || a.scheme.is_some() => {
            let flags: Vec<String> = (a.rate_bps.map(|r| format!("--rate-bps {r}")))
                .into_iter()
                .chain(a.scheme.as_ref().map(|s| format!("--scheme {s}")))
                .collect();
            anyhow!("{}: {m}", flags.join(" "))
        }
        e => anyhow::Error::new(e),
    })?;
    named_the_one_satellite(a.satellite.as_deref(), &mission, &b.elements)?;
    let doc = BudgetDoc::new(&b);
    warn(&b.warnings);
    note(&b.notes);
    match a.format {
        Format::Json => writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?,
        Format::Csv => write!(
            out,
            "{}",
            passbudget::report::to_csv(&doc.items, &doc.warnings)?
        )?,
        Format::Table => print_budget(&doc, out)?,
    }
    Ok(())
}

fn print_budget(doc: &BudgetDoc, out: &mut dyn Write) -> Result<()> {
    let head = match &doc.time {
        Some(t) => format!(
            "{} to {} at {} ({}), elevation {:.2} deg, azimuth {} deg",
            doc.satellite,
            doc.station,
            t,
            doc.weather,
            doc.elevation_deg,
            azimuth(doc.azimuth_deg.unwrap_or(0.0), 1)
        ),
        None => match doc.azimuth_deg {
            Some(az) => format!(
                "{} to {} at elevation {:.2} deg, azimuth {} deg ({})",
                doc.satellite,
                doc.station,
                doc.elevation_deg,
                azimuth(az, 1),
                doc.weather
            ),
            None => format!(
                "{} to {} at elevation {:.2} deg ({})",
                doc.satellite, doc.station, doc.elevation_deg, doc.weather
            ),
        },
    };
    writeln!(out, "{head}")?;
    let mut t = Table::new(&[
        ("item", Align::Left),
        ("value", Align::Right),
        ("unit", Align::Left),
        ("source", Align::Left),
    ]);
    for i in &doc.items {
        let (value, unit) = match i.value {
            None => ("-".to_string(), i.unit.clone()),
            Some(v) => match passbudget::engfmt::budget_value(v, &i.unit) {
                Some((text, unit)) => (text, unit.to_string()),
                None => (item_value(v, &i.unit), i.unit.clone()),
            },
        };
        t.row(vec![
            i.name.replace('_', " "),
            value,
            unit,
            i.source.clone(),
        ]);
    }
    write!(out, "{}", t.render())?;
    writeln!(
        out,
        "margin {:.2} dB against a required {:.1} dB: the link {} at {} ({}); Shannon gap at the occupied bandwidth {:.2} dB",
        doc.margin_db,
        doc.required_margin_db,
        if doc.closes { "closes" } else { "does not close" },
        passbudget::engfmt::rate(doc.rate_bps),
        doc.scheme,
        doc.shannon_gap_db
    )?;
    print_defaults(&doc.defaults, out)?;
    writeln!(out, "{}", passbudget::report::plan::CAUTION)?;
    Ok(())
}

/// A budget value as printed (below 10^4 for Hz, bit/s and baud, which take an SI prefix from
/// there, `engfmt::budget_value`): whole units for Hz, bit/s and baud, else two decimals; tiny
/// non-zero values in exponent form; no "-0.00" for a zero gain or loss.
fn item_value(value: f64, unit: &str) -> String {
    let digits: usize = if unit == "Hz" || unit == "bit/s" || unit == "baud" {
        0
    } else {
        2
    };
    if value.abs() < 0.5 * 10f64.powi(-(digits as i32)) && (unit == "dB" || unit == "dBi") {
        format!("{:.*}", digits, 0.0)
    } else if value != 0.0 && value.abs() < 0.01 {
        format!("{value:.1e}")
    } else {
        format!("{value:.digits$}")
    }
}

/// The defaults taken, under a table (warnings go to stderr through [`warn`], in every format).
fn print_defaults(defaults: &[DefaultUsed], out: &mut dyn Write) -> Result<()> {
    for d in defaults {
        writeln!(out, "default: {} = {} ({})", d.key, d.value, d.source)?;
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
    pub defaults: Vec<DefaultUsed>,
    /// The outputs' one caution.
    pub caution: &'static str,
}

/// `passbudget atmosphere`.
pub fn atmosphere(a: AtmosphereArgs, out: &mut dyn Write) -> Result<()> {
    let doc = atmosphere_doc(&a)?;
    warn(&doc.warnings);
    match a.format {
        Format::Json => writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?,
        Format::Csv => write!(
            out,
            "{}",
            passbudget::report::to_csv(
                std::slice::from_ref(&AtmosphereRow::from(&doc)),
                &doc.warnings
            )?
        )?,
        Format::Table => {
            print_atmosphere(&doc, out)?;
            writeln!(out, "{}", passbudget::report::plan::CAUTION)?;
        }
    }
    Ok(())
}

/// The atmosphere at one elevation for a station file.
fn atmosphere_doc(a: &AtmosphereArgs) -> Result<AtmosphereDoc> {
    // (`atmosphere` has no mission, so no station names: a name given for a file is said so)
    if !a.station.exists() {
        bail!(
            "--station {}: no such file; atmosphere takes a station file (e.g. stations/nordkam.yaml), not a station's name",
            a.station.display()
        );
    }
    let st = Station::load(&a.station)?;
    let frequency_ghz = match (a.frequency_mhz, a.frequency_ghz) {
        (Some(mhz), _) => {
            FREQUENCY_MHZ
                .check(mhz)
                .map_err(|e| anyhow!("--frequency-mhz: {e}"))?;
            mhz / 1e3
        }
        (None, Some(ghz)) => ghz,
        (None, None) => bail!("give --frequency-mhz F"),
    };
    let req = AtmosphereRequest {
        frequency_ghz,
        elevation_deg: a.elevation_deg,
        exceedance_percent: a.exceedance_percent,
        polarization_tilt_deg: a.polarization_tilt_deg,
    };
    let at = atmosphere_at(&st, &req).map_err(|e| match e {
        AtmosphereAtError::Range { source } => {
            anyhow!("--{}: {source}", source.key.replace('_', "-"))
        }
        AtmosphereAtError::Prepare(passbudget::plan::prepare::PrepareError::Range { source }) => {
            anyhow!("--exceedance-percent: {source}")
        }
        e => anyhow::Error::new(e),
    })?;
    let att = &at.attenuation;
    Ok(AtmosphereDoc {
        station: st.name.clone(),
        frequency_ghz,
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
        mean_radiating_temperature_k: round(at.mean_radiating_temperature_k, 3),
        sky_temperature_k: round(at.sky_temperature_k, 3),
        warnings: at.warnings.clone(),
        defaults: at.defaults.clone(),
        caution: passbudget::report::plan::CAUTION,
    })
}

fn print_atmosphere(doc: &AtmosphereDoc, out: &mut dyn Write) -> Result<()> {
    writeln!(
        out,
        "{} at {} GHz, elevation {} deg, {}",
        doc.station,
        short_number(doc.frequency_ghz),
        short_number(doc.elevation_deg),
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
            // (no rain in clear sky: the 0 is not the rate at R0.01)
            match doc.exceedance_percent {
                Some(_) => "ITU-R P.838-3 at R0.01",
                None => "ITU-R P.838-3; rain case only (--exceedance-percent)",
            },
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
    print_defaults(&doc.defaults, out)?;
    Ok(())
}

/// Flat CSV form of the atmosphere result.
#[derive(Debug, Serialize, Default)]
struct AtmosphereRow {
    station: String,
    frequency_ghz: f64,
    elevation_deg: f64,
    exceedance_percent: Option<f64>,
    polarization_tilt_deg: f64,
    gas_db: f64,
    cloud_db: f64,
    rain_db: f64,
    scintillation_db: f64,
    total_db: f64,
    rain_height_km: f64,
    specific_rain_attenuation_db_km: f64,
    mean_radiating_temperature_k: f64,
    sky_temperature_k: f64,
}

impl From<&AtmosphereDoc> for AtmosphereRow {
    fn from(d: &AtmosphereDoc) -> Self {
        AtmosphereRow {
            station: d.station.clone(),
            frequency_ghz: d.frequency_ghz,
            elevation_deg: d.elevation_deg,
            exceedance_percent: d.exceedance_percent,
            polarization_tilt_deg: d.polarization_tilt_deg,
            gas_db: d.gas_db,
            cloud_db: d.cloud_db,
            rain_db: d.rain_db,
            scintillation_db: d.scintillation_db,
            total_db: d.total_db,
            rain_height_km: d.rain_height_km,
            specific_rain_attenuation_db_km: d.specific_rain_attenuation_db_km,
            mean_radiating_temperature_k: d.mean_radiating_temperature_k,
            sky_temperature_k: d.sky_temperature_k,
        }
    }
}
