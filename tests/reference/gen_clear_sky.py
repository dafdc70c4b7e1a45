"""Generate tests/fixtures/clear_sky_spectra.csv (clear-sky spectra at 122 wavelengths).

Regenerate with:

    python3 -m venv /tmp/pvenv && /tmp/pvenv/bin/pip install pvlib==0.16.1
    /tmp/pvenv/bin/python tests/reference/gen_clear_sky.py

Reference: pvlib.spectrum.spectrl2 (pvlib 0.16.1, BSD-3-Clause), an implementation of
R. Bird & C. Riordan, SERI/TR-215-2436 (1984), doi:10.2172/5986936. Its relative air mass
input is pvlib.atmosphere.get_relative_airmass(zenith, 'kastenyoung1989') (F. Kasten &
A. T. Young, Appl. Opt. 28, 4735 (1989)) at the apparent zenith. Aerosol defaults
(single-scattering albedo 0.945 at 400 nm, wavelength variation factor 0.095, asymmetry
0.65) are the report's rural aerosol values and pvlib's defaults.

Columns per row (one case, one wavelength):
case, apparent zenith [deg], angle of incidence [deg], tilt [deg], day of year,
pressure [Pa], precipitable water [cm], ozone [atm-cm], aerosol optical depth at 500 nm,
Angstrom exponent, ground albedo, wavelength [nm], direct normal, diffuse horizontal,
plane-of-array global with the Hay-Davies sky, plane-of-array global with an isotropic sky
(pvlib.irradiance.isotropic on spectrl2's diffuse horizontal), all [W m^-2 nm^-1].
"""

import os

import numpy as np
import pvlib

assert pvlib.__version__ == "0.16.1", pvlib.__version__

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "fixtures", "clear_sky_spectra.csv")

# zenith, aoi, tilt, doy, pressure, pwv, ozone, aod500, alpha, albedo
CASES = [
    (0.0, 0.0, 0.0, 1, 101325.0, 1.42, 0.344, 0.084, 1.14, 0.2),
    (48.19, 11.19, 37.0, 80, 101325.0, 1.42, 0.344, 0.084, 1.14, 0.2),
    (30.0, 30.0, 0.0, 172, 101325.0, 2.5, 0.30, 0.10, 1.14, 0.2),
    (60.0, 25.0, 45.0, 266, 90000.0, 0.5, 0.28, 0.05, 1.3, 0.3),
    (70.0, 85.0, 90.0, 355, 101325.0, 4.0, 0.40, 0.30, 0.9, 0.6),
    (75.0, 100.0, 90.0, 200, 100000.0, 1.0, 0.35, 0.15, 1.14, 0.25),
    (85.0, 40.0, 60.0, 45, 95000.0, 2.0, 0.32, 0.20, 1.0, 0.8),
    (20.0, 5.0, 25.0, 300, 80000.0, 0.2, 0.25, 0.02, 1.5, 0.15),
    (45.0, 45.0, 0.0, 365, 101325.0, 5.0, 0.45, 0.50, 0.5, 0.0),
    (10.0, 70.0, 80.0, 120, 70000.0, 0.05, 0.20, 0.01, 2.0, 1.0),
]


def main():
    rows = []
    for k, (z, aoi, tilt, doy, p, w, o3, aod, alpha, alb) in enumerate(CASES):
        am = pvlib.atmosphere.get_relative_airmass(z, "kastenyoung1989")
        s = pvlib.spectrum.spectrl2(
            apparent_zenith=z, aoi=aoi, surface_tilt=tilt, ground_albedo=alb,
            surface_pressure=p, relative_airmass=am, precipitable_water=w,
            ozone=o3, aerosol_turbidity_500nm=aod, dayofyear=doy, alpha=alpha,
        )
        dni = s["dni"][:, 0]
        dhi = s["dhi"][:, 0]
        hay = s["poa_global"][:, 0]
        iso = s["poa_direct"][:, 0] + pvlib.irradiance.isotropic(tilt, dhi) + s["poa_ground_diffuse"][:, 0]
        assert np.all(np.isfinite(hay)) and np.all(np.isfinite(iso))
        for i, wl in enumerate(s["wavelength"]):
            rows.append(
                [k, z, aoi, tilt, doy, p, w, o3, aod, alpha, alb, wl, dni[i], dhi[i], hay[i], iso[i]]
            )
    with open(OUT, "w", newline="\n") as f:
        f.write("# pvlib 0.16.1 spectrum.spectrl2; see tests/reference/gen_clear_sky.py\n")
        f.write("case,zenith_deg,aoi_deg,tilt_deg,day,pressure_pa,pwv_cm,ozone_atm_cm,aod500,"
                "angstrom,albedo,wavelength_nm,dni,dhi,poa_hay_davies,poa_isotropic\n")
        for r in rows:
            f.write(",".join(repr(float(v)) if not isinstance(v, int) else str(v) for v in r) + "\n")
    print(f"wrote {os.path.normpath(OUT)}: {len(rows)} rows")


if __name__ == "__main__":
    main()
