# Writes the rows of tests/data/geometry/moon_de421.csv (run once by hand; CI never runs it).
# pip install astropy jplephem de421; python3 make_moon_reference.py
import warnings
from astropy.utils import iers
iers.conf.auto_download = False
iers.conf.auto_max_age = None
iers.conf.iers_degraded_accuracy = 'warn'
warnings.simplefilter('ignore')
import numpy as np
from astropy.time import Time
from astropy.coordinates import EarthLocation, AltAz, GCRS, CartesianRepresentation
import astropy.units as u, astropy, erfa
import de421, jplephem
from jplephem.ephem import Ephemeris
eph = Ephemeris(de421)
stations = [(38.52, -2.31, 780.0), (64.8, -147.5, 200.0), (-29.0, 115.3, 300.0), (1.35, 103.8, 20.0)]
times = ['1990-03-11T04:20:00Z', '1994-08-30T21:05:00Z', '1999-12-22T17:45:00Z', '2003-05-16T03:40:00Z',
         '2008-10-02T11:15:00Z', '2012-06-04T19:30:00Z', '2016-11-14T13:52:00Z', '2020-01-10T19:10:00Z',
         '2024-04-08T18:17:00Z', '2026-12-02T08:51:00Z', '2029-07-21T06:00:00Z', '2033-02-27T23:25:00Z',
         '2037-09-13T15:00:00Z', '2041-05-05T09:45:00Z', '2044-10-19T01:30:00Z', '2045-12-21T10:00:00Z']
emrat = eph.EMRAT
for i, t in enumerate(times):
    lat, lon, h = stations[i % len(stations)]
    loc = EarthLocation.from_geodetic(lon=lon*u.deg, lat=lat*u.deg, height=h*u.m)
    tt = Time(t.replace('Z', ''), scale='utc')
    tt.delta_ut1_utc = 0.0
    jd = tt.tdb.jd
    moon = np.array(eph.position('moon', jd)).ravel()          # geocentric, km, ICRF
    emb = np.array(eph.position('earthmoon', jd)).ravel()
    sun = np.array(eph.position('sun', jd)).ravel()
    earth = emb - moon / (1.0 + emrat)
    sun_geo = sun - earth
    c = GCRS(CartesianRepresentation(moon * u.km), obstime=tt)
    aa = c.transform_to(AltAz(obstime=tt, location=loc, pressure=0 * u.hPa))
    obs, _ = loc.get_gcrs_posvel(tt)
    obs = obs.xyz.to_value(u.km)
    a, b = sun_geo - moon, obs - moon
    phase = np.degrees(np.arctan2(np.linalg.norm(np.cross(a, b)), np.dot(a, b)))
    print(f"{t},{lat},{lon},{h},{aa.az.deg:.6f},{aa.alt.deg:.6f},{aa.distance.to_value(u.km):.3f},{phase:.5f}")
print("# astropy", astropy.__version__, "pyerfa", erfa.__version__, "jplephem", jplephem.__version__, "de421", de421.__version__ if hasattr(de421, '__version__') else '2008.1')
