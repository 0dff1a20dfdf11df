//! Wire format of `budget` (public interface: field names are stable).

use crate::config::DefaultUsed;
use crate::plan::inputs::satellite_name;
use crate::plan::instant::InstantBudget;
use crate::report::round;
use crate::timefmt::format_ms;
use serde::Serialize;

/// JSON of `budget`.
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
    pub sky_noise_k: f64,
    pub ground_noise_k: f64,
    pub man_made_noise_k: f64,
    /// The Sun's and the Moon's noise, K (null without a time: not evaluated).
    pub sun_noise_k: Option<f64>,
    pub moon_noise_k: Option<f64>,
    pub sun_separation_deg: Option<f64>,
    pub moon_separation_deg: Option<f64>,
    pub receiver_noise_k: f64,
    pub antenna_temperature_k: f64,
    pub system_temperature_k: f64,
    pub g_over_t_db_k: f64,
    pub cn0_dbhz: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub rate_bps: f64,
    pub scheme: String,
    /// Channel (coded) bit rate: symbol rate x bits per symbol, bit/s.
    pub channel_rate_bps: f64,
    /// Information bits per bit entering the code (1 without framing overhead).
    pub framing_efficiency: f64,
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
    /// Power flux-density at the station in the band's reference bandwidth, dB(W/m2) (null: no
    /// Article 21 row for the band).
    pub pfd_dbw_m2: Option<f64>,
    pub pfd_reference_bandwidth_hz: Option<f64>,
    /// The Article 21 Table 21-4 limit at this angle of arrival (the elevation), dB(W/m2).
    pub pfd_limit_dbw_m2: Option<f64>,
    /// Limit minus pfd, dB (negative: over the limit; a warning, not an error).
    pub pfd_margin_db: Option<f64>,
    /// How the limit's row is known (`link::pfd::BandLimit::status`: from memory, or the text it
    /// was read in).
    pub pfd_limit_status: Option<&'static str>,
    pub items: Vec<ItemRow>,
    /// The budget's warnings, then its notes (as a plan keeps its notes among
    /// `assumptions.warnings`).
    pub warnings: Vec<String>,
    pub defaults: Vec<DefaultUsed>,
    /// The outputs' one caution ([`super::plan::CAUTION`]).
    pub caution: &'static str,
}

/// One item of the budget.
#[derive(Debug, Serialize, Default)]
pub struct ItemRow {
    pub name: String,
    /// null (empty in CSV): not evaluated, the source says why.
    pub value: Option<f64>,
    pub unit: String,
    pub source: String,
}

impl BudgetDoc {
    pub fn new(b: &InstantBudget) -> Self {
        let (v, att, look) = (&b.values, &b.attenuation, &b.look);
        let r4 = |x: f64| round(x, 4);
        BudgetDoc {
            satellite: satellite_name(&b.elements),
            station: b.station.station.name.clone(),
            time: b.time.as_ref().map(format_ms),
            weather: match b.exceedance_percent {
                Some(p) => format!("rain exceeded {p} % of an average year"),
                None => "clear sky".into(),
            },
            frequency_hz: b.station.link.frequency_hz(),
            elevation_deg: r4(look.elevation_deg),
            azimuth_deg: b.azimuth_deg.map(|a| super::round_azimuth(a, 4)),
            range_km: r4(look.range_km),
            off_nadir_deg: r4(look.off_nadir_deg),
            eirp_dbw: r4(v.eirp_dbw),
            free_space_loss_db: r4(v.free_space_loss_db),
            gas_db: r4(att.gas_db),
            cloud_db: r4(att.cloud_db),
            rain_db: r4(att.rain_db),
            scintillation_db: r4(att.scintillation_db),
            atmospheric_loss_db: r4(v.atmospheric_loss_db),
            polarization_loss_db: r4(v.polarization_loss_db),
            pointing_loss_db: r4(v.pointing_loss_db),
            antenna_gain_dbi: r4(v.antenna_gain_dbi),
            sky_temperature_k: round(v.sky_temperature_k, 3),
            sky_noise_k: round(v.sky_noise_k, 3),
            ground_noise_k: round(v.ground_noise_k, 3),
            man_made_noise_k: round(v.man_made_noise_k, 3),
            sun_noise_k: b.time.map(|_| round(v.sun_noise_k, 3)),
            moon_noise_k: b.time.map(|_| round(v.moon_noise_k, 3)),
            // deg to 4 decimals, as the items (README "Output fields")
            sun_separation_deg: v.sun_separation_deg.map(r4),
            moon_separation_deg: v.moon_separation_deg.map(r4),
            receiver_noise_k: round(v.receiver_noise_k, 3),
            antenna_temperature_k: round(v.antenna_temperature_k, 3),
            system_temperature_k: round(v.system_temperature_k, 3),
            g_over_t_db_k: r4(v.g_over_t_db_k),
            cn0_dbhz: r4(v.cn0_dbhz),
            rate_bps: v.rate_bps,
            scheme: b.rate.operating().name.to_string(),
            channel_rate_bps: round(v.channel_rate_bps, 1),
            framing_efficiency: round(b.rate.operating().framing_efficiency, 6),
            symbol_rate_baud: round(v.symbol_rate_baud, 1),
            occupied_bandwidth_hz: round(v.occupied_bandwidth_hz, 1),
            ebn0_db: r4(v.ebn0_db),
            esn0_db: r4(v.esn0_db),
            required_ebn0_db: r4(v.required_ebn0_db),
            implementation_loss_db: b.rate.implementation_loss_db(),
            margin_db: r4(v.margin_db),
            required_margin_db: b.rates.required_margin_db,
            closes: b.closes(),
            shannon_capacity_bps: v.shannon_capacity_bps.round(),
            shannon_gap_db: r4(v.shannon_gap_db),
            pfd_dbw_m2: b.pfd.map(|p| r4(p.pfd_dbw_m2)),
            pfd_reference_bandwidth_hz: b.pfd.map(|p| p.reference_bandwidth_hz),
            pfd_limit_dbw_m2: b.pfd.map(|p| r4(p.limit_dbw_m2)),
            pfd_margin_db: b.pfd.map(|p| r4(p.margin_db)),
            pfd_limit_status: b.pfd.map(|p| p.limit_status),
            items: b
                .items
                .iter()
                .map(|i| ItemRow {
                    name: i.name.into(),
                    value: i.value.map(|v| item_value(v, i.unit)),
                    unit: i.unit.into(),
                    source: i.source.to_string(),
                })
                .collect(),
            warnings: b.warnings.iter().chain(&b.notes).cloned().collect(),
            defaults: b.defaults.clone(),
            caution: super::plan::CAUTION,
        }
    }
}

/// An item's value rounded as the document's own fields of its unit are: dB-based units (dB, dBW,
/// dBi, dB/K, dBHz, dB(W/m2)), degrees, km and bit/s/Hz to 4 decimals, kelvin to 3, frequencies
/// and rates (Hz, bit/s, baud) to 0.1; a unitless item (the framing efficiency, the target error
/// rate) to 6 significant digits, so that 1e-6 stays 1e-6. `+ 0.0`: a loss of 0 dB listed as
/// -0 dB would read as a sign.
fn item_value(value: f64, unit: &str) -> f64 {
    let digits = match unit {
        "K" => 3,
        "Hz" | "bit/s" | "baud" => 1,
        "" => return significant(value, 6) + 0.0,
        _ => 4,
    };
    round(value, digits)
}

/// `x` to `n` significant digits.
fn significant(x: f64, n: i32) -> f64 {
    if x == 0.0 || !x.is_finite() {
        return x;
    }
    let scale = n - 1 - x.abs().log10().floor() as i32;
    round(x, scale)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn items_round_as_the_fields_of_their_unit() {
        assert_eq!(item_value(-176.114863065004, "dB"), -176.1149);
        assert_eq!(item_value(3.010299956639812, "dBW"), 3.0103);
        assert_eq!(item_value(18.955232561253393, "K"), 18.955);
        assert_eq!(item_value(22869955.15695067, "bit/s"), 22869955.2);
        assert_eq!(item_value(1e-6, ""), 1e-6);
        assert_eq!(item_value(0.987654321, ""), 0.987654);
        assert_eq!(item_value(-0.0, "dB").to_string(), "0");
        assert_eq!(item_value(-1e-9, ""), -1e-9);
    }
}
