"""Write the demo instrument files of the Vela 24 spec (invented suppliers, fixed seed).

    python tools/demo_measurements.py

Three lots: TPW-2611A from Tessaly Panel Works (CSV, x y Y, a 3 x 3 grid of white
points per unit) ships; UO-0611 from Umbrin Optoelectronics (CGATS.17, XYZ) has a white
shifted towards green and does not ship; TPW-2612B from Tessaly (CGATS.17, x y Y) is
centred but holds a few units whose white lies within the uncertainty of the Δu'v'
limit, so the guard-banded rule cannot decide on them.
"""
from __future__ import annotations

from pathlib import Path

import numpy as np

from generator.colour.cct import xy_from_cct_duv
from generator.colour.convert import uv_prime_to_xy, xy_to_uv_prime

OUT = Path(__file__).resolve().parent.parent / "specs" / "measurements" / "vela-24"
WHITE = np.array([0.3127, 0.3290])
PRIMARIES = {"red": (0.640, 0.330), "green": (0.300, 0.600), "blue": (0.150, 0.060)}
GRID = ("TL", "T", "TR", "L", "C", "R", "BL", "B", "BR")
# luminance of each grid point relative to the centre: edges and corners darker
FALLOFF = np.array([0.90, 0.95, 0.91, 0.95, 1.0, 0.96, 0.89, 0.94, 0.90])


def _shift_uv(xy, duv):
    return uv_prime_to_xy(xy_to_uv_prime(np.asarray(xy)) + duv)


def _units(rng, n, white_offset_uv, white_sd, prim_sd, Y_mean, Y_sd):
    units = []
    for _ in range(n):
        w = _shift_uv(WHITE, np.asarray(white_offset_uv) + rng.normal(0, white_sd, 2))
        prim = {k: _shift_uv(v, rng.normal(0, prim_sd, 2)) for k, v in PRIMARIES.items()}
        units.append({"white": w, "Y": rng.normal(Y_mean, Y_sd), "primaries": prim})
    return units


def _off_locus(r, sign):
    """A white Δu'v' = r from D65 across the Planckian locus (CCT kept near 6500 K)."""
    duv = np.linspace(0, 0.01, 2001) * sign
    xy = xy_from_cct_duv(np.full(duv.shape, 6504.0), duv)
    d = np.hypot(*(xy_to_uv_prime(xy) - xy_to_uv_prime(WHITE)).T)
    return xy[int(np.argmin(np.abs(d - r)))]


def write_csv(path, units, lot, supplier, serial0, rng):
    lines = ["# Tessaly Panel Works, end-of-line colour station 3, 3 x 3 grid at 10 % from the edges",
             "serial,lot,supplier,channel,point,x,y,Y"]
    for k, u in enumerate(units):
        s = f"VL24-{serial0 + k:05d}"
        for p, f in zip(GRID, FALLOFF):
            xy = u["white"] if p == "C" else _shift_uv(u["white"], rng.normal(0, 0.0007, 2))
            Y = u["Y"] * (f + rng.normal(0, 0.01) if p != "C" else 1.0)
            lines.append(f"{s},{lot},{supplier},white,{p},{xy[0]:.5f},{xy[1]:.5f},{Y:.2f}")
        for name, xy in u["primaries"].items():
            lines.append(f"{s},{lot},{supplier},{name},,{xy[0]:.5f},{xy[1]:.5f},{u['Y'] * 0.2:.2f}")
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")


def write_cgats_xyz(path, units, lot, supplier, serial0):
    tables = []
    for channel in ("white", "red", "green", "blue"):
        rows = []
        for k, u in enumerate(units):
            xy = u["white"] if channel == "white" else u["primaries"][channel]
            Y = u["Y"] if channel == "white" else u["Y"] * 0.2
            X, Z = xy[0] / xy[1] * Y, (1 - xy[0] - xy[1]) / xy[1] * Y
            rows.append(f'"UO-{serial0 + k:06d}"\t{X:.3f}\t{Y:.3f}\t{Z:.3f}')
        tables.append("\n".join([
            "CGATS.17", f'ORIGINATOR "{supplier}, line B photometer"',
            f'DESCRIPTOR "Vela 24 panels, lot {lot}, channel {channel}"',
            'KEYWORD "LOT"', f'LOT "{lot}"', 'KEYWORD "SUPPLIER"', f'SUPPLIER "{supplier}"',
            'KEYWORD "CHANNEL"', f'CHANNEL "{channel}"', "# XYZ in cd/m2, CIE 1931 2 degree observer",
            "NUMBER_OF_FIELDS 4", "BEGIN_DATA_FORMAT", "SAMPLE_ID\tXYZ_X\tXYZ_Y\tXYZ_Z", "END_DATA_FORMAT",
            f"NUMBER_OF_SETS {len(rows)}", "BEGIN_DATA", *rows, "END_DATA"]))
    path.write_text("\n\n".join(tables) + "\n", encoding="utf-8")


def write_cgats_xyy(path, units, lot, supplier, serial0):
    rows = []
    for k, u in enumerate(units):
        s = f"VL24-{serial0 + k:05d}"
        rows.append(f'{s}\twhite\t{u["white"][0]:.5f}\t{u["white"][1]:.5f}\t{u["Y"]:.2f}')
        for name, xy in u["primaries"].items():
            rows.append(f'{s}\t{name}\t{xy[0]:.5f}\t{xy[1]:.5f}\t{u["Y"] * 0.2:.2f}')
    text = "\n".join([
        "CGATS.17", f'ORIGINATOR "{supplier}, end-of-line colour station 1"', 'CREATED "2026-11-20"',
        'KEYWORD "LOT"', f'LOT "{lot}"', 'KEYWORD "SUPPLIER"', f'SUPPLIER "{supplier}"',
        'KEYWORD "CHANNEL"', "NUMBER_OF_FIELDS 5", "BEGIN_DATA_FORMAT",
        "SAMPLE_ID\tCHANNEL\tXYY_X\tXYY_Y\tXYY_CAPY", "END_DATA_FORMAT",
        f"NUMBER_OF_SETS {len(rows)}", "BEGIN_DATA", *rows, "END_DATA"])
    path.write_text(text + "\n", encoding="utf-8")


def main() -> None:
    rng = np.random.default_rng(2611)
    OUT.mkdir(parents=True, exist_ok=True)
    a = _units(rng, 40, (0, 0), 0.0005, 0.0011, 292, 6)
    write_csv(OUT / "tessaly-lot-TPW-2611A.csv", a, "TPW-2611A", "Tessaly Panel Works", 1, rng)
    b = _units(rng, 30, (-0.0045, 0.0050), 0.0012, 0.0016, 268, 9)
    write_cgats_xyz(OUT / "umbrin-lot-UO-0611.cgats", b, "UO-0611", "Umbrin Optoelectronics", 4101)
    c = _units(rng, 30, (0, 0), 0.0005, 0.0011, 290, 6)
    for k, r in enumerate((0.0040, 0.0046, 0.0052, 0.0058)):   # inside the limit ± U = 0.005 ± 0.0015
        c[3 + 7 * k]["white"] = _off_locus(r, 1 if k % 2 else -1)
    write_cgats_xyy(OUT / "tessaly-lot-TPW-2612B.txt", c, "TPW-2612B", "Tessaly Panel Works", 201)


if __name__ == "__main__":
    main()
