#!/usr/bin/env python3
"""Compute an independent reference for look angles and passes with Skyfield (run once, by hand;
not run by CI). Output: tests/data/orbit/skyfield_{setup,passes,looks}.csv, each opening with
`#` lines naming the source (library versions, calls, conditions).

Satellite: the invented WRENLET-1 of examples/sat.tle. Station: an invented point (no real
ground station) at 45.5 N, 120.3 W, 600 m above the WGS-84 ellipsoid.

Conditions chosen so that differences are ours, not model choices:
  * UT1 = UTC: load.timescale(delta_t=69.184) -- a constant TT - UT1 equal to TT - UTC in
    2026 (32.184 s + 37 leap seconds), checked below by comparing t.ut1 with the UTC JD.
  * No polar motion: the timescale has no polar-motion table (checked below).
  * SGP4 with WGS-72: EarthSatellite calls Satrec.twoline2rv(line1, line2), whose default
    gravity model is WGS72 (python-sgp4); checked below via satrec attributes.
  * Geometric altitude (no refraction): altaz() without temperature/pressure.

Calls: sat = EarthSatellite(l1, l2, name, ts); topos = wgs84.latlon(45.5, -120.3, elevation_m=600);
(sat - topos).at(t).frame_latlon_and_rates(topos) for altitude, azimuth, range and their rates;
sat.find_events(topos, t0, t1, altitude_degrees=0.0) to locate passes, then each event refined
here by bisection (rise/set: sign of altitude; culmination: sign of altitude rate) to 1e-4 s,
because find_events itself resolves only to 0.5 s.
"""
import csv
import math

import sgp4
import skyfield
from sgp4.api import WGS72
from skyfield.api import EarthSatellite, load, wgs84
from skyfield.framelib import itrs

LAT, LON, ALT_M = 45.5, -120.3, 600.0

lines = open("examples/sat.tle").read().split("\n")
name, l1, l2 = lines[0].strip(), lines[1].rstrip(), lines[2].rstrip()

ts = load.timescale(delta_t=69.184)
sat = EarthSatellite(l1, l2, name, ts)
topos = wgs84.latlon(LAT, LON, elevation_m=ALT_M)

# --- checks of the conditions ---
t_check = ts.utc(2026, 12, 1, 12, 0, 0)
utc_jd = 1796126400.0 / 86400.0 + 2440587.5  # 2026-12-01T12:00:00 UTC (Unix time 1796126400) as a Julian date
assert abs((t_check.ut1 - utc_jd) * 86400.0) < 1e-4, (t_check.ut1 - utc_jd) * 86400.0
assert getattr(ts, "polar_motion_table", None) is None
assert sat.model.operationmode == "i"
assert abs(sat.model.radiusearthkm - 6378.135) < 1e-9  # WGS72 (python-sgp4 getgravconst)
assert abs(sat.model.mu - 398600.8) < 1e-9


def t_at(seconds_from_epoch):
    return ts.utc(2026, 12, 1, 12, 0, seconds_from_epoch)


def off_nadir_deg(t):
    # Angle at the satellite between the geocentre and the station, from ITRS vectors.
    s = sat.at(t).frame_xyz(itrs).km
    g = topos.at(t).frame_xyz(itrs).km
    to_centre = [-x for x in s]
    to_station = [b - a for a, b in zip(s, g)]
    dot = sum(a * b for a, b in zip(to_centre, to_station))
    norm = math.sqrt(sum(a * a for a in to_centre)) * math.sqrt(sum(b * b for b in to_station))
    return math.degrees(math.acos(max(-1.0, min(1.0, dot / norm))))


def look(sec):
    t = t_at(sec)
    alt, az, dist, alt_rate, az_rate, range_rate = (sat - topos).at(t).frame_latlon_and_rates(topos)
    return {
        "off_nadir_deg": off_nadir_deg(t),
        "seconds_from_2026_12_01T12": sec,
        "elevation_deg": alt.degrees,
        "azimuth_deg": az.degrees % 360.0,
        "range_km": dist.km,
        "range_rate_km_s": range_rate.km_per_s,
        "elevation_rate_deg_s": alt_rate.degrees.per_second,
    }


def alt(sec):
    return (sat - topos).at(t_at(sec)).altaz()[0].degrees


def alt_rate(sec):
    return look(sec)["elevation_rate_deg_s"]


def bisect(f, a, b, tol=1e-4):
    fa = f(a)
    for _ in range(200):
        if b - a < tol:
            break
        m = 0.5 * (a + b)
        fm = f(m)
        if (fm > 0) == (fa > 0):
            a, fa = m, fm
        else:
            b = m
    return 0.5 * (a + b)


span_s = 2 * 86400.0
t0, t1 = t_at(0.0), t_at(span_s)
times, events = sat.find_events(topos, t0, t1, altitude_degrees=0.0)
epoch_dt = t0.utc_datetime()
passes = []
current = {}
for t, ev in zip(times, events):
    sec = (t.utc_datetime() - epoch_dt).total_seconds()
    if ev == 0:
        current = {"aos_s": bisect(alt, sec - 2.0, sec + 2.0)}
    elif ev == 1 and "aos_s" in current:
        tca = bisect(alt_rate, sec - 2.0, sec + 2.0)
        current["tca_s"] = tca
        current["max_elevation_deg"] = alt(tca)
    elif ev == 2 and "tca_s" in current:
        current["los_s"] = bisect(lambda s: -alt(s), sec - 2.0, sec + 2.0)
        passes.append(current)
        current = {}

# Look angles: every 20 minutes over the span (mostly below the horizon: the geometry is
# valid there too) plus three points inside each of the first four passes.
samples = [look(float(s)) for s in range(0, int(span_s) + 1, 1200)]
for p in passes[:4]:
    for frac in (0.2, 0.5, 0.8):
        samples.append(look(p["aos_s"] + frac * (p["los_s"] - p["aos_s"])))

HEADER = [
    "Skyfield %s with sgp4 (python-sgp4) %s; computed once by tests/data/orbit/make_reference.py"
    % (skyfield.__version__, sgp4.__version__),
    "Calls: load.timescale(delta_t=69.184); EarthSatellite(l1, l2, name, ts);",
    "wgs84.latlon(45.5, -120.3, elevation_m=600.0); (sat - topos).at(t).frame_latlon_and_rates(topos);",
    "off_nadir_deg from sat.at(t).frame_xyz(itrs) and topos.at(t).frame_xyz(itrs);",
    "sat.find_events(topos, t0, t1, altitude_degrees=0.0) refined by bisection to 1e-4 s.",
    "Conditions: UT1 = UTC (constant delta_t = TT-UTC = 69.184 s), no polar motion, WGS-72 SGP4",
    "(opsmode i), geometric altitude (no refraction).",
]


def write_csv(path, what, columns, rows):
    with open(path, "w", newline="") as f:
        for line in HEADER + [what]:
            f.write("# " + line + "\n")
        w = csv.writer(f, lineterminator="\n")
        w.writerow(columns)
        for r in rows:
            w.writerow([repr(v) if isinstance(v, float) else v for v in r])


write_csv(
    "tests/data/orbit/skyfield_setup.csv",
    "This file: the elements (examples/sat.tle), the station and the time window of the reference.",
    ["name", "line1", "line2", "latitude_deg", "longitude_deg", "altitude_m", "time_origin_utc", "span_s", "min_elevation_deg"],
    [[name, l1, l2, LAT, LON, ALT_M, "2026-12-01T12:00:00Z", span_s, 0.0]],
)
PASS_COLUMNS = ["aos_s", "tca_s", "max_elevation_deg", "los_s"]
write_csv(
    "tests/data/orbit/skyfield_passes.csv",
    "This file: passes above 0 deg; times in s after time_origin_utc of skyfield_setup.csv.",
    PASS_COLUMNS,
    [[p[c] for c in PASS_COLUMNS] for p in passes],
)
LOOK_COLUMNS = list(samples[0].keys())
write_csv(
    "tests/data/orbit/skyfield_looks.csv",
    "This file: look angles; seconds_from_2026_12_01T12 after time_origin_utc of skyfield_setup.csv.",
    LOOK_COLUMNS,
    [[s[c] for c in LOOK_COLUMNS] for s in samples],
)
print(len(passes), "passes;", len(samples), "looks")
