#!/usr/bin/env python3
"""Side-by-side whole-process comparison for the pass search (run by hand, not by CI).

The same job as

    passbudget passes examples/wrenlet-1.yaml --station Nordkam \
        --set station.Nordkam.latitude_deg=61.2 --days 365 --allow-stale-elements \
        --format csv > /dev/null

done with a general-purpose Python astronomy library: Skyfield's event finder
(`EarthSatellite.find_events`, Skyfield 1.55 with python-sgp4 2.27 and NumPy) for the invented
WRENLET-1 (examples/sat.tle) over the invented station of examples (Nordkam, moved to 61.2 N:
61.2 N, 17.95 E, 210 m, WGS-84) above 5 deg, 365 days from 2026-12-01T12:00:00Z, and the rise and
set times written as CSV. Run from the repository root, timing the whole process:

    /usr/bin/time -f '%e s wall, %U s user' python3 benches/skyfield_find_events.py > /dev/null

Conditions as in tests/data/orbit/make_reference.py: UT1 = UTC (constant delta_t), WGS-72 SGP4.
Skyfield's finder resolves events to about 0.5 s (its default epsilon), passbudget to 0.02 s, so
this comparison favours Skyfield.
"""
import sys

from skyfield.api import EarthSatellite, load, wgs84

LAT, LON, ALT_M, MASK_DEG, DAYS = 61.2, 17.95, 210.0, 5.0, 365

lines = open("examples/sat.tle").read().split("\n")
name, l1, l2 = lines[0].strip(), lines[1].rstrip(), lines[2].rstrip()
ts = load.timescale(delta_t=69.184)
sat = EarthSatellite(l1, l2, name, ts)
topos = wgs84.latlon(LAT, LON, elevation_m=ALT_M)
t0 = ts.utc(2026, 12, 1, 12, 0, 0)
t1 = ts.utc(2026, 12, 1 + DAYS, 12, 0, 0)
times, events = sat.find_events(topos, t0, t1, altitude_degrees=MASK_DEG)
out = sys.stdout
out.write("event,utc\n")
for t, ev in zip(times, events):
    out.write("%s,%s\n" % (("aos", "tca", "los")[ev], t.utc_iso(places=3)))
print(sum(1 for e in events if e == 0), "rises", file=sys.stderr)
