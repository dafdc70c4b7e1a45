"""Extract the periodic-term tables of the NREL Solar Position Algorithm.

Source: I. Reda & A. Andreas, "Solar position algorithm for solar radiation applications",
Solar Energy 76, 577-589 (2004) (NREL/TP-560-34302), appendix tables A4.2 (Earth periodic
terms L0-L5, B0-B1, R0-R4) and A4.3 (nutation in longitude and obliquity), as transcribed in
the PyPI wheel of pvlib (BSD-3-Clause), file pvlib/spa.py.

Writes src/physics/data/spa_terms.csv. The Rust build never runs this script; its output is
committed. Regenerate with (the only network access is the pip download):

    pip download pvlib==0.16.1 --no-deps -d /tmp/pv
    python3 scripts/extract_spa_terms.py [--wheel /tmp/pv/pvlib-0.16.1-py3-none-any.whl]

Standard library only: the wheel is opened as a zip and the module parsed with `ast` (never
imported). Output rows:

    L0..L5, B0, B1, R0..R4:  table,A,B,C      (term = A cos(B + C x), x = JME)
    NUT:                     NUT,Y0,Y1,Y2,Y3,Y4,a,b,c,d
"""

import argparse
import ast
import hashlib
import os
import zipfile

VERSION = "0.16.1"
EARTH = ["L0", "L1", "L2", "L3", "L4", "L5", "B0", "B1", "R0", "R1", "R2", "R3", "R4"]
NUT = ["NUTATION_ABCD_ARRAY", "NUTATION_YTERM_ARRAY"]
HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "src", "physics", "data", "spa_terms.csv")


def arrays(source):
    """Module-level `NAME = np.array([...])` assignments as nested Python lists."""
    found = {}
    for node in ast.parse(source).body:
        if not isinstance(node, ast.Assign) or len(node.targets) != 1:
            continue
        target = node.targets[0]
        if not isinstance(target, ast.Name) or target.id not in EARTH + NUT:
            continue
        call = node.value
        if not (isinstance(call, ast.Call) and call.args):
            raise SystemExit(f"{target.id} is not an np.array(...) call")
        found[target.id] = ast.literal_eval(call.args[0])
    missing = [n for n in EARTH + NUT if n not in found]
    if missing:
        raise SystemExit(f"tables not found in spa.py: {missing}")
    return found


def num(x):
    """Shortest decimal that reads back to the same double; integers without a point."""
    f = float(x)
    return str(int(f)) if f == int(f) and abs(f) < 1e15 else repr(f)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--wheel", default=f"/tmp/pv/pvlib-{VERSION}-py3-none-any.whl")
    args = ap.parse_args()
    raw = open(args.wheel, "rb").read()
    sha = hashlib.sha256(raw).hexdigest()
    with zipfile.ZipFile(args.wheel) as z:
        source = z.read("pvlib/spa.py").decode("utf-8")
    t = arrays(source)
    abcd, y = t["NUTATION_ABCD_ARRAY"], t["NUTATION_YTERM_ARRAY"]
    if len(abcd) != len(y):
        raise SystemExit("nutation tables differ in length")
    lines = [
        "# Periodic terms of the Solar Position Algorithm: I. Reda & A. Andreas, Solar Energy 76,",
        "# 577-589 (2004), NREL/TP-560-34302, appendix tables A4.2 (Earth heliocentric longitude L,",
        "# latitude B, radius R; term = A cos(B + C JME)) and A4.3 (nutation: Y0..Y4 multiply",
        "# X0..X4; dpsi += (a + b JCE) sin, deps += (c + d JCE) cos, in 0.0001 arc seconds).",
        f"# Transcribed from pvlib {VERSION} (BSD-3-Clause), pvlib/spa.py, wheel sha256 {sha}.",
        "# Written by scripts/extract_spa_terms.py; do not edit by hand.",
        "table,v1,v2,v3,v4,v5,v6,v7,v8,v9",
    ]
    for name in EARTH:
        for row in t[name]:
            if len(row) != 3:
                raise SystemExit(f"{name}: row with {len(row)} values")
            lines.append(",".join([name] + [num(v) for v in row]))
    for yr, cr in zip(y, abcd):
        lines.append(",".join(["NUT"] + [num(v) for v in list(yr) + list(cr)]))
    with open(OUT, "w", newline="\n") as f:
        f.write("\n".join(lines) + "\n")
    print(f"wrote {os.path.normpath(OUT)}: {len(lines) - 7} rows, wheel sha256 {sha}")


if __name__ == "__main__":
    main()
