//! The pfd check of a plan ([`crate::link::pfd`]): for every rate option, the worst margin over
//! all angles of arrival against the Article 21 limit of the band, from the spacecraft's EIRP
//! pattern at the orbit's lowest altitude; per pass, the worst margin at the station.

use super::prepare::RateSet;
use super::series::Step;
use crate::link::budget::LinkModel;
use crate::link::pfd::{worst_arrival, BandLimit, Spectrum, WorstArrival};
use crate::orbit::ElementSet;

/// One rate option's worst case over the angles of arrival.
#[derive(Debug, Clone, PartialEq)]
pub struct PfdOption {
    /// `fixed` (a ladder rate) or `adaptive`.
    pub mode: &'static str,
    pub rate_bps: f64,
    pub scheme: String,
    pub occupied_bandwidth_hz: f64,
    pub worst: WorstArrival,
}

/// The plan's pfd check.
#[derive(Debug, Clone, PartialEq)]
pub struct PfdCheck {
    /// The band's row of Table 21-4; `None`: passbudget has no row for the frequency.
    pub band: Option<BandLimit>,
    /// The altitude the worst case is taken at: the perigee of the mean elements above the
    /// WGS-84 equatorial radius (the lowest altitude of the orbit, so the shortest distances), km.
    pub altitude_km: f64,
    /// How each carrier's power is spread over its occupied bandwidth (`pfd.spectrum`).
    pub spectrum: Spectrum,
    pub options: Vec<PfdOption>,
}

/// Perigee altitude of the mean elements: a (1 - e) - R, a = (mu / n^2)^(1/3), km.
pub fn perigee_altitude_km(elements: &ElementSet) -> f64 {
    elements.semi_major_axis_km() * (1.0 - elements.elements.eccentricity)
        - crate::link::pfd::EARTH_RADIUS_KM
}

impl PfdCheck {
    pub fn new(
        link: &LinkModel,
        rates: &RateSet,
        elements: &ElementSet,
        spectrum: Spectrum,
    ) -> PfdCheck {
        let band = BandLimit::for_frequency(link.frequency_hz()).copied();
        let altitude_km = perigee_altitude_km(elements);
        let eirp_at = |off_nadir_deg: f64| {
            link.transmitter()
                .eirp_dbw(off_nadir_deg)
                .map_or(f64::NAN, |(e, _)| e)
        };
        let options = match &band {
            None => Vec::new(),
            Some(b) => {
                let fixed = rates.ladder.iter().map(|o| ("fixed", o));
                let adaptive = rates.adaptive.iter().map(|o| ("adaptive", o));
                fixed
                    .chain(adaptive)
                    .map(|(mode, o)| PfdOption {
                        mode,
                        rate_bps: o.rate_bps,
                        scheme: o.scheme.clone(),
                        occupied_bandwidth_hz: o.occupied_bandwidth_hz,
                        worst: worst_arrival(
                            b,
                            altitude_km,
                            (o.occupied_bandwidth_hz, spectrum),
                            eirp_at,
                        ),
                    })
                    .collect()
            }
        };
        PfdCheck {
            band,
            altitude_km,
            spectrum,
            options,
        }
    }

    /// The warnings of the check: no row for the band, or each option over the limit.
    pub fn warnings(&self, frequency_hz: f64) -> Vec<String> {
        let Some(band) = &self.band else {
            return vec![format!(
                "pfd: passbudget has no Article 21 Table 21-4 row for {}: the power flux-density is not checked",
                crate::engfmt::frequency_mhz(frequency_hz)
            )];
        };
        self.options
            .iter()
            .filter(|o| o.worst.margin_db < 0.0)
            .map(|o| {
                format!(
                    "pfd: {} ({}, {}) exceeds the Article 21 Table 21-4 limit of {} by {:.1} dB at {:.1} deg angle of arrival ({:.1} dB(W/m2) in {}); the limit row is {}; compliance is for the administration to decide",
                    crate::engfmt::rate(o.rate_bps),
                    o.scheme,
                    o.mode,
                    band.label(),
                    -o.worst.margin_db,
                    o.worst.arrival_deg,
                    o.worst.pfd_dbw_m2,
                    reference_label(band.reference_bandwidth_hz),
                    band.status,
                )
            })
            .collect()
    }
}

/// `4 kHz` or `1 MHz`.
pub fn reference_label(hz: f64) -> &'static str {
    if hz >= 1e6 {
        "1 MHz"
    } else {
        "4 kHz"
    }
}

/// The worst margin at the station over a pass's steps for a carrier of
/// `occupied_bandwidth_hz` spread as `spectrum` (every step, tracked or not: the flux arrives
/// either way), with the elevation where it occurs.
pub fn pass_margin(
    band: &BandLimit,
    steps: &[Step],
    (occupied_bandwidth_hz, spectrum): (f64, Spectrum),
) -> Option<(f64, f64)> {
    let share_db = band.share_db(occupied_bandwidth_hz, spectrum);
    steps
        .iter()
        .map(|s| {
            let p = band.at_share(s.eirp_dbw, s.range_km, s.elevation_deg, share_db);
            (p.margin_db, s.elevation_deg)
        })
        .min_by(|a, b| a.0.total_cmp(&b.0))
}

/// The values a plan rests on that were recalled, not read in a published text, one line per
/// kind: the rate options whose threshold is from memory (the built-in CCSDS figures; their names
/// grouped, each once), and the pfd limit's band row when it is from memory. Every output of a
/// plan carries them (the table's notes, the CSV `#` lines, the JSON's `assumptions.warnings`).
pub fn unconfirmed_notes(rates: &RateSet, pfd: &PfdCheck) -> Vec<super::results::Note> {
    use super::results::{Note, NoteKind};
    let mut names: Vec<&str> = Vec::new();
    for spec in rates.ladder_specs.iter().chain(&rates.adaptive_specs) {
        let op = spec.operating();
        if matches!(
            op.provenance,
            crate::link::modcod::Provenance::FromMemory(_)
        ) && !names.contains(&op.name.as_str())
        {
            names.push(op.name.as_str());
        }
    }
    let mut out = Vec::new();
    if !names.is_empty() {
        out.push(Note::new(NoteKind::RecalledThreshold, format!(
            "from memory: the required Eb/N0 of {} (built-in CCSDS thresholds, not confirmed in a published table; threshold_status in the rate options); a measured threshold can replace them (modem.schemes)",
            names.join(", ")
        )));
    }
    if let Some(b) = pfd.band.as_ref().filter(|b| !b.confirmed()) {
        out.push(Note::new(NoteKind::RecalledPfd, format!(
            "from memory: the pfd limit of {} ({} dB(W/m2) in {} at 0-5 deg, Radio Regulations Article 21 Table 21-4) is not confirmed in the text; the pfd margins rest on it (limit_status)",
            b.label(),
            b.low_angle_limit_dbw_m2,
            reference_label(b.reference_bandwidth_hz)
        )));
    }
    out
}
