#!/usr/bin/env python3
"""Reference passes of an invented Molniya-like satellite (12 h, e = 0.72) over an invented
station, computed once with Skyfield (run by hand from the repository root; CI never runs it):

    pip install skyfield; python3 tests/data/geometry/make_eccentric_tca_reference.py

Output: tests/data/geometry/eccentric_tca_skyfield.csv (opening with `#` lines naming the
source). The satellite is MOLNIYA-DEMO (catalog number 99904) of tests/suite/passes_search.rs,
not a real satellite; the station is an invented point at 55.0 N, 37.0 E, 200 m above the WGS-84
ellipsoid. Mask 10 deg, geometric altitude (no refraction).

Conditions as in tests/data/orbit/make_reference.py: UT1 = UTC (constant delta_t = 69.184 s),
no polar motion, WGS-72 SGP4 (python-sgp4, opsmode 'i': SDP4 for this 12 h orbit).

Method: sat.find_events(topos, t0, t1, altitude_degrees=10) locates rises, culminations and
sets; each rise and set is refined here by bisection on the altitude to 1e-4 s; the time of
maximum altitude of each pass by golden-section search on the altitude itself (positions only,
no velocity) to 1e-3 s around every culmination that find_events reports in the pass, the
highest kept.
"""
import math

import sgp4
import skyfield
from skyfield.api import EarthSatellite, load, wgs84


def checksum(line):
    s = sum(int(c) if c.isdigit() else (1 if c == "-" else 0) for c in line[:68])
    return line[:68] + str(s % 10)


L1 = checksum("1 99904U          26335.50000000  .00000000  00000-0  00000-0 0    10")
L2 = checksum("2 99904  63.4000  40.0000 7200000 270.0000  10.0000  2.00613000    10")
LAT, LON, ALT_M, MASK_DEG, SPAN_S = 55.0, 37.0, 200.0, 10.0, 3 * 86400.0

ts = load.timescale(delta_t=69.184)
sat = EarthSatellite(L1, L2, "MOLNIYA-DEMO", ts)
topos = wgs84.latlon(LAT, LON, elevation_m=ALT_M)
assert sat.model.operationmode == "i"
assert abs(sat.model.radiusearthkm - 6378.135) < 1e-9 and abs(sat.model.mu - 398600.8) < 1e-9
assert sat.model.method == "d"  # deep space (SDP4)


def t_at(sec):
    return ts.utc(2026, 12, 1, 12, 0, sec)


def alt(sec):
    return (sat - topos).at(t_at(sec)).altaz()[0].degrees


def bisect(f, a, b, tol=1e-4):
    fa = f(a)
    while b - a > tol:
        m = 0.5 * (a + b)
        fm = f(m)
        if (fm > 0) == (fa > 0):
            a, fa = m, fm
        else:
            b = m
    return 0.5 * (a + b)


def golden_max(f, a, b, tol=1e-3):
    g = (math.sqrt(5.0) - 1.0) / 2.0
    c, d = b - g * (b - a), a + g * (b - a)
    fc, fd = f(c), f(d)
    while b - a > tol:
        if fc > fd:
            b, d, fd = d, c, fc
            c = b - g * (b - a)
            fc = f(c)
        else:
            a, c, fc = c, d, fd
            d = a + g * (b - a)
            fd = f(d)
    m = 0.5 * (a + b)
    return m, float(f(m))


t0, t1 = t_at(0.0), t_at(SPAN_S)
times, events = sat.find_events(topos, t0, t1, altitude_degrees=MASK_DEG)
origin = t0.utc_datetime()
passes, current = [], None
for t, ev in zip(times, events):
    sec = (t.utc_datetime() - origin).total_seconds()
    if ev == 0:
        current = {"aos_s": bisect(lambda s: alt(s) - MASK_DEG, sec - 5.0, sec + 5.0), "culm": []}
    elif ev == 1 and current is not None:
        current["culm"].append(sec)
    elif ev == 2 and current is not None:
        current["los_s"] = bisect(lambda s: MASK_DEG - alt(s), sec - 5.0, sec + 5.0)
        best = max(golden_max(alt, c - 120.0, c + 120.0) for c in current["culm"])
        current["tca_s"], current["max_elevation_deg"] = best
        # Cross-check: the zero of the central difference of altitude (h = 0.5 s) by bisection.
        fd = bisect(lambda s: alt(s - 0.5) - alt(s + 0.5), best[0] - 30.0, best[0] + 30.0, 1e-4)
        assert abs(fd - best[0]) < 0.01, (fd, best[0])
        passes.append(current)
        current = None

with open("tests/data/geometry/eccentric_tca_skyfield.csv", "w") as f:
    f.write(
        "# Skyfield %s with sgp4 (python-sgp4) %s; computed once by "
        "tests/data/geometry/make_eccentric_tca_reference.py\n" % (skyfield.__version__, sgp4.__version__)
    )
    f.write("# Invented MOLNIYA-DEMO (99904): %s / %s\n" % (L1, L2))
    f.write("# Invented station 55.0 N, 37.0 E, 200 m (WGS-84); mask 10 deg; window from 2026-12-01T12:00:00Z, %g s\n" % SPAN_S)
    f.write("# UT1 = UTC (delta_t 69.184 s), no polar motion, WGS-72 SDP4 (opsmode i), geometric altitude.\n")
    f.write("# find_events(altitude_degrees=10); rise/set bisected on altitude to 1e-4 s; tca_s = maximum of the\n")
    f.write("# altitude (positions only) by golden-section search to 1e-3 s. Times in s after the window start.\n")
    f.write("aos_s,tca_s,max_elevation_deg,los_s\n")
    for p in passes:
        f.write("%r,%r,%r,%r\n" % (p["aos_s"], p["tca_s"], p["max_elevation_deg"], p["los_s"]))
print(len(passes), "passes")
