"""Generate tests/fixtures/solar_position.csv: the sun's position at random moments and places.

Regenerate with (pvlib from PyPI, a general-purpose solar-resource library, as the reference):

    python3 -m venv /tmp/pvenv && /tmp/pvenv/bin/pip install pvlib
    /tmp/pvenv/bin/python tests/reference/gen_solar_position.py

Reference: pvlib.spa.solar_position with its numpy implementation (PVLIB_USE_NUMBA unset),
pvlib.spa.transit_sunrise_sunset, pvlib.spa.calculate_deltat and pvlib.irradiance.aoi; all
implement I. Reda & A. Andreas, Solar Energy 76, 577 (2004) and, for delta T, the
polynomials of Espenak & Meeus (NASA/TP-2006-214141).

Rows: a fixed seed draws UTC instants in 1950-2049 (seconds with a fraction), latitude
-90..90 (plus rows at exactly +-90 and longitude +-180), elevation, pressure, temperature,
surface tilt and azimuth (clockwise from north). atmos_refract = 0.5667 deg. delta T is
pvlib's estimate for the row's year and month (written in the row). Columns:

    year,month,day,hour,minute,second,lat,lon,elev_m,pressure_hpa,temp_c,tilt,surf_az,
    delta_t_s,zenith,azimuth,incidence,eot_min,transit_s,sunrise_s,sunset_s

zenith is the apparent (refraction-corrected) topocentric zenith [deg]; azimuth clockwise
from north [deg]; incidence from pvlib.irradiance.aoi on the apparent zenith; eot in minutes;
transit/sunrise/sunset in seconds after 0 h UTC of the row's date, 'polar' when the sun does
not cross the standard altitude. Numbers are shortest round-trip decimal text.
"""

import calendar
import os
import random
from pathlib import Path

import numpy as np

os.environ.pop("PVLIB_USE_NUMBA", None)
import pvlib  # noqa: E402
from pvlib import spa  # noqa: E402

OUT = Path(__file__).resolve().parents[1] / "fixtures" / "solar_position.csv"
N = 50


def rows():
    rng = random.Random(20261202)
    for i in range(N):
        year = rng.randint(1950, 2049)
        month = rng.randint(1, 12)
        day = rng.randint(1, calendar.monthrange(year, month)[1])
        hour, minute = rng.randint(0, 23), rng.randint(0, 59)
        second = round(rng.uniform(0, 59.999), 3)
        lat = round(rng.uniform(-90, 90), 6)
        lon = round(rng.uniform(-180, 180), 6)
        if i == 0:
            lat, lon = 90.0, 180.0
        elif i == 1:
            lat, lon = -90.0, -180.0
        elif i == 2:
            lat, lon = 0.0, 180.0
        elev = round(rng.uniform(0, 4000), 2)
        pressure = round(rng.uniform(500, 1050), 1)
        temp = round(rng.uniform(-30, 40), 1)
        tilt = round(rng.uniform(0, 90), 3)
        surf_az = round(rng.uniform(0, 360), 3)
        yield year, month, day, hour, minute, second, lat, lon, elev, pressure, temp, tilt, surf_az


def num(x):
    return repr(float(x))


def main():
    out = [
        f"# pvlib {pvlib.__version__} spa (numpy) reference; written by tests/reference/gen_solar_position.py",
        "year,month,day,hour,minute,second,lat,lon,elev_m,pressure_hpa,temp_c,tilt,surf_az,"
        "delta_t_s,zenith,azimuth,incidence,eot_min,transit_s,sunrise_s,sunset_s",
    ]
    for year, month, day, hour, minute, second, lat, lon, elev, p, t, tilt, saz in rows():
        midnight = calendar.timegm((year, month, day, 0, 0, 0))
        unix = np.array([midnight + hour * 3600 + minute * 60 + second], dtype=float)
        dt = float(spa.calculate_deltat(year, month))
        app_zen, _zen, _e, _ae, az, eot = (
            float(v[0]) for v in spa.solar_position(unix, lat, lon, elev, p, t, dt, 0.5667)
        )
        aoi = float(pvlib.irradiance.aoi(tilt, saz, app_zen, az))
        tr, sr, ss = (
            v[0] for v in spa.transit_sunrise_sunset(np.array([float(midnight)]), lat, lon, dt, 1)
        )
        events = ["polar" if np.isnan(v) else num(v - midnight) for v in (tr, sr, ss)]
        if events[1] == "polar":
            events[0] = "polar"  # transit is left unchecked on polar rows
        vals = [year, month, day, hour, minute]
        out.append(
            ",".join([str(v) for v in vals] + [num(v) for v in (second, lat, lon, elev, p, t, tilt, saz, dt, app_zen, az, aoi, eot)] + events)
        )
    OUT.write_text("\n".join(out) + "\n")
    print(f"wrote {OUT}: {N} rows")


if __name__ == "__main__":
    main()
