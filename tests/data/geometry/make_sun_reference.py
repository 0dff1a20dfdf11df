# Writes the rows of tests/data/geometry/sun_astropy.csv (run once by hand; CI never runs it).
# pip install astropy; python3 make_sun_reference.py
import warnings
from astropy.utils import iers
iers.conf.auto_download = False
iers.conf.auto_max_age = None
iers.conf.iers_degraded_accuracy = 'warn'
warnings.simplefilter('ignore')
from astropy.time import Time
from astropy.coordinates import EarthLocation, AltAz, get_body
import astropy.units as u, astropy, erfa
loc = EarthLocation.from_geodetic(lon=-2.31*u.deg, lat=38.52*u.deg, height=780*u.m)
times = ['2026-12-02T08:51:00Z','2026-12-02T12:00:00Z','2026-06-21T12:10:00Z','2027-03-20T07:00:00Z','2030-09-23T17:30:00Z','2000-01-01T12:00:00Z','1995-07-04T15:00:00Z','2045-12-21T10:00:00Z','2026-12-02T08:52:07.839Z','1950-01-01T12:00:00Z','1950-06-21T09:00:00Z','1972-10-15T14:00:00Z','2050-06-21T16:00:00Z','2050-12-31T11:00:00Z']
for t in times:
    tt = Time(t.replace('Z',''), scale='utc')
    tt.delta_ut1_utc = 0.0
    s = get_body('sun', tt, loc).transform_to(AltAz(obstime=tt, location=loc, pressure=0*u.hPa))
    print(f"{t},{s.az.deg:.6f},{s.alt.deg:.6f}")
print("# astropy", astropy.__version__, "pyerfa", erfa.__version__)
