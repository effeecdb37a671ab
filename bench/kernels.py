"""Speed and accuracy of the numerical kernels against independent references.

    OPENBLAS_NUM_THREADS=1 python bench/kernels.py [--quick] [--json FILE]

``run_kernels(quick=False)`` returns one dict per measurement:

    name, n, ours_s, per_item_us, reference_s, ratio, max_diff, target, met

plus ``reference`` (what ours was timed against), ``max_diff_reference`` where a second
comparison exists, and ``note``. ``ratio`` is reference_s / ours_s (above 1: ours is
faster). Times are the best of a few runs on warmed-up code (one-time set-up such as the
CCT locus table is excluded and reported in the note). ``reference_s`` is None and
``ratio`` None when colour-science is not installed; the accuracy columns then use the
references written here.

Kernels:
- CCT / Duv of 100,000 chromaticities (1000-25000 K, |Duv| <= 0.05, built on Planck's law):
  against colour-science's Ohno (2013) method, timed on a subsample and scaled per point;
  accuracy against Newton's method on Planck's law itself (``cct_duv_from_uv_exact``).
- Spectral integration of 10,000 spectra at 1 nm (360-830 nm, the CMF range, so that
  colour-science does not extrapolate them): against a plain matrix
  product with weights computed here, and against colour-science's ``msds_to_XYZ``
  (CIE 15 integration) on a subsample.
- CIEDE2000 of 1,000,000 pairs: against colour-science's ``delta_E(..., "CIE 2000")``.
- Coverage of the sRGB triangle by 10,000 measured triangles in xy: colour-science has no
  coverage, so the reference is Sutherland-Hodgman clipping written here in plain Python,
  run on a subsample and scaled per gamut.

Not a test: timings on a shared machine vary; compare runs made one after the other.
"""
from __future__ import annotations

import argparse
import json
import os
import sys
import time
from pathlib import Path

os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

import numpy as np  # noqa: E402

try:  # the independent reference is optional
    import colour  # noqa: E402
except ImportError:  # pragma: no cover - depends on the environment
    colour = None

COLUMNS = ("name", "n", "ours_s", "per_item_us", "reference_s", "ratio", "max_diff", "target", "met")


def _best(f, repeats: int):
    """(best wall time of one call in s, its result) over ``repeats`` measurements; calls
    shorter than 20 ms are repeated within each measurement and averaged."""
    t0 = time.perf_counter()
    out = f()
    first = time.perf_counter() - t0
    number = max(1, int(0.02 / first)) if first > 0 else 1
    best = first
    for _ in range(repeats):
        t0 = time.perf_counter()
        for _ in range(number):
            out = f()
        best = min(best, (time.perf_counter() - t0) / number)
    return best, out


def _best_pair(f, g, repeats: int, with_ratio: bool = False):
    """``_best`` of two functions measured alternately, so that both see the same load; with
    ``with_ratio`` also the median over the rounds of time(f) / time(g), which a busy machine
    disturbs less than either time."""
    tf = tg = float("inf")
    ratios = []
    for _ in range(repeats):
        a, rf = _best(f, 1)
        b, rg = _best(g, 1)
        tf, tg = min(tf, a), min(tg, b)
        ratios.append(a / b)
    out = (tf, rf), (tg, rg)
    return (*out, float(np.median(ratios))) if with_ratio else out


def _row(name, n, ours_s, reference_s, max_diff, target, met, reference, note="", **extra):
    return {"name": name, "n": n, "ours_s": ours_s, "per_item_us": ours_s / n * 1e6,
            "reference_s": reference_s, "ratio": (reference_s / ours_s) if reference_s else None,
            "max_diff": max_diff, "target": target, "met": bool(met), "reference": reference,
            "note": note, **extra}


# --- CCT / Duv ---------------------------------------------------------------------------

CCT_SPEEDUP = 300.0           # at least 300 times colour-science's Ohno (2013)
CCT_TOL_K, DUV_TOL = 0.01, 1e-6
CCT_FALLBACK_US = 0.77        # without colour-science: 230 µs / 300, per point


def _cct_points(n, seed=1):
    """uv at known T and Duv off the Planckian locus from Planck's law (exact normal)."""
    from generator.colour.planck import planck_uv_tangent

    rng = np.random.default_rng(seed)
    T = 1e6 / rng.uniform(1e6 / 25000, 1e6 / 1000, n)
    D = rng.uniform(-0.05, 0.05, n)
    q, dq = planck_uv_tangent(T)
    nrm = np.stack([dq[:, 1], -dq[:, 0]], axis=-1)
    nrm /= np.linalg.norm(nrm, axis=-1, keepdims=True)
    return q + D[:, None] * nrm, T, D


def bench_cct(quick=False) -> list[dict]:
    from generator.colour import cct

    n = 10_000 if quick else 100_000
    n_ref = 300 if quick else 2000
    n_exact = 2000 if quick else 10_000
    uv, _, _ = _cct_points(n)
    cct.locus_table.cache_clear()
    t0 = time.perf_counter()
    cct.locus_table("cie1931-2")
    setup = time.perf_counter() - t0
    ours_s, (T, D) = _best(lambda: cct.cct_duv_from_uv(uv), 3 if quick else 5)
    t_exact, (Te, De) = _best(lambda: cct.cct_duv_from_uv_exact(uv[:n_exact]), 1)
    dT = float(np.max(np.abs(T[:n_exact] - Te)))
    dD = float(np.max(np.abs(D[:n_exact] - De)))
    ref_s = dT_ref = dD_ref = None
    note = (f"one-time locus table and start grid {setup * 1e3:.0f} ms (excluded); exact = Newton on "
            f"Planck's law over {n_exact} points ({t_exact / n_exact * 1e6:.1f} µs/point); max |ΔDuv| vs "
            f"exact {dD:.1e}")
    if colour is not None:
        colour.temperature.uv_to_CCT_Ohno2013(uv[:2])          # warm-up: its own table
        t_ref, ref = _best(lambda: colour.temperature.uv_to_CCT_Ohno2013(uv[:n_ref]), 1)
        ref_s = t_ref / n_ref * n
        dT_ref = float(np.max(np.abs(T[:n_ref] - ref[:, 0])))
        dD_ref = float(np.max(np.abs(D[:n_ref] - ref[:, 1])))
        note += (f"; colour-science Ohno 2013 timed on {n_ref} points ({t_ref / n_ref * 1e6:.0f} µs/point) "
                 f"and scaled to {n}; vs it max |ΔT| {dT_ref:.3f} K, |ΔDuv| {dD_ref:.1e}")
        met = ref_s / ours_s >= CCT_SPEEDUP and dT <= CCT_TOL_K and dD <= DUV_TOL
        target = (f">= {CCT_SPEEDUP:.0f}x colour-science Ohno 2013; |ΔT| <= {CCT_TOL_K} K, "
                  f"|ΔDuv| <= {DUV_TOL:g} vs exact")
    else:
        met = ours_s / n * 1e6 <= CCT_FALLBACK_US and dT <= CCT_TOL_K and dD <= DUV_TOL
        target = f"<= {CCT_FALLBACK_US} µs/point; |ΔT| <= {CCT_TOL_K} K, |ΔDuv| <= {DUV_TOL:g} vs exact"
    return [_row("CCT/Duv (CIE 1960 uv, 1000-25000 K, |Duv| <= 0.05)", n, ours_s, ref_s, dT, target, met,
                 "colour-science uv_to_CCT_Ohno2013 (subsample, scaled)", note,
                 max_diff_reference=dT_ref, max_diff_duv=dD, max_diff_duv_reference=dD_ref)]


# --- spectral integration ----------------------------------------------------------------

MATMUL_SLACK = 1.10           # "at least as fast as a plain matmul", within 10 % timer noise
SPECTRAL_REL_TOL = 1e-6


def bench_spectral(quick=False) -> list[dict]:
    from generator.colour.spectrum import spectrum_XYZ
    from generator.data import cmfs

    n = 10_000                                                  # cheap: the same in quick mode
    n_ref = 50 if quick else 200
    wl = np.arange(360.0, 831.0)
    rng = np.random.default_rng(2)
    peaks = rng.uniform(430, 660, (n, 1))
    values = np.exp(-0.5 * ((wl - peaks) / rng.uniform(8, 40, (n, 1))) ** 2) + rng.uniform(0, 0.1, (n, 1))
    grid, cmf = cmfs("cie1931-2")
    W = np.ascontiguousarray(cmf[int(wl[0] - grid[0]):int(wl[-1] - grid[0]) + 1])   # x̄ȳz̄ Δλ, Δλ = 1 nm
    spectrum_XYZ(wl, values[:2])                                 # warm-up: weights cached
    reps = 25
    (ours_s, ours), (mm_s, mm), ratio = _best_pair(lambda: spectrum_XYZ(wl, values), lambda: values @ W, reps,
                                                   with_ratio=True)
    d_mm = float(np.max(np.abs(ours - mm) / np.abs(mm)))
    rows = [_row("spectral integration vs plain matmul (1 nm, 360-830 nm)", n, ours_s, mm_s, d_mm,
                 f"median over {reps} alternating rounds of time(ours) / time(plain matmul with precomputed "
                 f"weights) <= {MATMUL_SLACK:.2f} (10 % for timer noise)",
                 ratio <= MATMUL_SLACK and d_mm <= 1e-12, "values @ weights computed in the benchmark",
                 f"median time ratio ours / matmul {ratio:.3f}; max_diff relative", median_time_ratio=ratio)]
    if colour is not None:
        cm = colour.MSDS_CMFS["CIE 1931 2 Degree Standard Observer"]

        def ref():
            msds = colour.MultiSpectralDistributions(values[:n_ref].T, wl)
            return np.asarray(colour.msds_to_XYZ(msds, cm, k=1, method="Integration"))

        t_ref, r = _best(ref, 1)
        d_ref = float(np.max(np.abs(ours[:n_ref] - r) / np.abs(r)))
        rows.append(_row("spectral integration vs colour-science", n, ours_s, t_ref / n_ref * n, d_ref,
                         f"max relative difference <= {SPECTRAL_REL_TOL:g} (CMF copies differ by up to 5e-7)",
                         d_ref <= SPECTRAL_REL_TOL, "colour-science msds_to_XYZ, Integration (subsample, scaled)",
                         f"timed on {n_ref} spectra and scaled to {n}; max_diff relative"))
    return rows


# --- CIEDE2000 ---------------------------------------------------------------------------

DE_TOL = 1e-9


def bench_ciede2000(quick=False) -> list[dict]:
    from generator.colour.difference import delta_e_2000

    n = 100_000 if quick else 1_000_000
    rng = np.random.default_rng(3)
    lab1 = np.stack([rng.uniform(0, 100, n), rng.uniform(-110, 110, n), rng.uniform(-110, 110, n)], axis=-1)
    lab2 = lab1 + rng.normal(0, 4, (n, 3))
    lab2[::97, 1:] = 0.0                                        # neutral samples: the zero-chroma branches
    ours_s, ours = _best(lambda: delta_e_2000(lab1, lab2), 3)
    ref_s = d = None
    if colour is not None:
        ref_s, ref = _best(lambda: colour.delta_E(lab1, lab2, method="CIE 2000"), 2)
        d = float(np.max(np.abs(ours - ref)))
        met = d <= DE_TOL and ours_s <= ref_s
        target = f"at least as fast as colour-science; |ΔE00 − colour-science| <= {DE_TOL:g}"
    else:
        met = ours_s / n * 1e6 <= 1.0
        target = "<= 1 µs/pair"
    return [_row("CIEDE2000", n, ours_s, ref_s, d, target, met, "colour-science delta_E(method='CIE 2000')")]


# --- coverage ----------------------------------------------------------------------------

COVERAGE_SPEEDUP = 10.0       # per gamut, against the same clipping in plain Python
COVERAGE_TOL = 1e-9           # percentage points


def _area(poly):
    # shoelace formula
    return 0.5 * sum(x0 * y1 - x1 * y0 for (x0, y0), (x1, y1) in zip(poly, poly[1:] + poly[:1], strict=True))


def _clip_polygon(subject, clip):
    """Sutherland & Hodgman (CACM 17(1), 1974): ``subject`` clipped by the convex,
    counter-clockwise polygon ``clip``; plain Python, one polygon at a time."""
    out = list(subject)
    for (ax, ay), (bx, by) in zip(clip, clip[1:] + clip[:1], strict=True):
        inp, out = out, []
        if not inp:
            break

        def side(p, ax=ax, ay=ay, bx=bx, by=by):
            return (bx - ax) * (p[1] - ay) - (by - ay) * (p[0] - ax)

        prev = inp[-1]
        for cur in inp:
            sc, sp = side(cur), side(prev)
            if (sc >= 0) != (sp >= 0):
                t = sp / (sp - sc)
                out.append((prev[0] + t * (cur[0] - prev[0]), prev[1] + t * (cur[1] - prev[1])))
            if sc >= 0:
                out.append(cur)
            prev = cur
    return out


def _coverage_reference(tri, ref):
    tri = [tuple(map(float, p)) for p in tri]
    if _area(tri) < 0:
        tri = tri[::-1]
    if _area(tri) == 0:
        return 0.0
    return min(100.0, 100.0 * _area(_clip_polygon([tuple(map(float, p)) for p in ref], tri)) / _area(
        [tuple(map(float, p)) for p in ref]))


def bench_coverage(quick=False) -> list[dict]:
    from generator.colour.gamut_batch import coverage_many
    from generator.data import REFERENCE_SPACES

    n = 2000 if quick else 10_000
    n_ref = 300 if quick else 1000
    ref = np.array(REFERENCE_SPACES["srgb"].primaries, dtype=float)
    rng = np.random.default_rng(4)
    tris = ref + rng.normal(0, 0.03, (n, 3, 2))
    tris[::5] = tris[::5, ::-1]                                 # clockwise ones too
    (ours_s, ours), (t_ref, r) = _best_pair(lambda: coverage_many(tris, ref),
                                            lambda: np.array([_coverage_reference(t, ref) for t in tris[:n_ref]]), 3)
    d = float(np.max(np.abs(ours[:n_ref] - r)))
    ref_s = t_ref / n_ref * n
    return [_row("coverage of sRGB by measured triangles (xy)", n, ours_s, ref_s, d,
                 f">= {COVERAGE_SPEEDUP:.0f}x plain-Python Sutherland-Hodgman per gamut; |Δ| <= {COVERAGE_TOL:g} "
                 "percentage points", ref_s / ours_s >= COVERAGE_SPEEDUP and d <= COVERAGE_TOL,
                 "Sutherland-Hodgman in plain Python, written in this benchmark (subsample, scaled)",
                 f"colour-science has no coverage; reference timed on {n_ref} gamuts and scaled to {n}")]


def run_kernels(quick: bool = False) -> list[dict]:
    """Every kernel's row (see the module docstring); ``quick`` uses smaller inputs."""
    rows = []
    for bench in (bench_cct, bench_spectral, bench_ciede2000, bench_coverage):
        rows += bench(quick)
    return rows


def _fmt(v, digits=3):
    if v is None:
        return "—"
    if isinstance(v, bool):
        return "yes" if v else "NO"
    if isinstance(v, float):
        return f"{v:.{digits}g}"
    return str(v)


def print_table(rows) -> None:
    head = ("kernel", "n", "ours s", "µs/item", "reference s", "ratio", "max diff", "met")
    lines = [head] + [(r["name"], _fmt(r["n"]), _fmt(r["ours_s"]), _fmt(r["per_item_us"]), _fmt(r["reference_s"]),
                       _fmt(r["ratio"]), _fmt(r["max_diff"], 2), _fmt(r["met"])) for r in rows]
    widths = [max(len(line[i]) for line in lines) for i in range(len(head))]
    for k, line in enumerate(lines):
        print("  ".join(c.ljust(w) if i == 0 else c.rjust(w) for i, (c, w) in enumerate(zip(line, widths, strict=True))))
        if k == 0:
            print("  ".join("-" * w for w in widths))
    for r in rows:
        note = f"; {r['note']}" if r["note"] else ""
        print(f"- {r['name']}: target {r['target']}; reference: {r['reference']}{note}")


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="smaller inputs")
    ap.add_argument("--json", help="also write the rows to this file")
    args = ap.parse_args(argv)
    t0 = time.perf_counter()
    rows = run_kernels(quick=args.quick)
    print_table(rows)
    text = json.dumps(rows, indent=2, ensure_ascii=False)
    print(text)
    if args.json:
        Path(args.json).write_text(text + "\n", encoding="utf-8")
    print(f"{len(rows)} kernels in {time.perf_counter() - t0:.1f} s", file=sys.stderr)
    return 0 if all(r["met"] for r in rows) else 1


if __name__ == "__main__":
    sys.exit(main())
