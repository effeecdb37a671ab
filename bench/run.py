"""The build measured against its limits: one command, a table and JSON.

    python bench/run.py [--specs 200] [--lots 20] [--units 5000] [--jobs 0] [--json FILE]
                        [--quick] [--no-kernels] [--limits] [--keep DIR]

Writes a synthetic library (bench/library.py) into a temporary folder and measures, each
as its own process where a user would run one (so imports and start-up count):
a cold build; an incremental rebuild after one spec changes (and that its site equals a
full serial build byte for byte); ``check`` of the library and of one spec; the time per
diagram after the first (in this process); units assessed per second; peak memory;
the share of the cold build spent in each pipeline stage; and the kernels beside an
independent colour library when it is installed (bench/kernels.py). Nothing here is a
test: figures on a shared machine vary, so compare runs made one after the other.
"""
from __future__ import annotations

import argparse
import hashlib
import json
import os
import platform
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(HERE))

from library import edit_one, spec_name, write_library  # noqa: E402

# (name, limit, unit, "max" = at most / "min" = at least), from the performance targets
TARGETS = {
    "cold_build_s": (10.0, "s", "max"),
    "incremental_build_s": (1.0, "s", "max"),
    "check_one_spec_s": (0.5, "s", "max"),
    "diagram_ms": (25.0, "ms", "max"),
    "assess_100k_units_s": (0.5, "s", "max"),
}


def run_measured(args: list[str], cwd: Path) -> dict:
    """Run ``python -m generator.cli ARGS`` in ``cwd``: wall seconds, exit code, standard
    error, and the child's peak resident memory (MiB) from wait4 where there is one. The
    files earlier runs wrote are flushed to disk first (os.sync, not timed), so that a run
    is not charged for the writeback of the one before it."""
    if hasattr(os, "sync"):
        os.sync()
    t0 = time.perf_counter()
    p = subprocess.Popen([sys.executable, "-m", "generator.cli", *args], cwd=cwd,
                         stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, env=_env())
    err = p.stderr.read()
    if not hasattr(os, "wait4"):
        p.wait()
        return {"seconds": time.perf_counter() - t0, "code": p.returncode, "stderr": err.decode(), "peak_mib": None}
    _, status, usage = os.wait4(p.pid, 0)
    wall = time.perf_counter() - t0
    p.returncode = os.waitstatus_to_exitcode(status)
    per_mib = 1024 * 1024 if sys.platform == "darwin" else 1024      # ru_maxrss: bytes on macOS, KiB on Linux
    return {"seconds": wall, "code": p.returncode, "stderr": err.decode(), "peak_mib": usage.ru_maxrss / per_mib}


PYCACHE: Path | None = None     # the children's bytecode cache (set by main, in the temporary folder)


def _env() -> dict:
    """The children's environment: this checkout first on the path, and a bytecode cache of
    their own, warmed before anything is timed (``warm_up``), as an installed package has its
    .pyc files; a PYTHONDONTWRITEBYTECODE of the calling shell would otherwise make every
    child compile every module again (about 0.1 s)."""
    env = dict(os.environ)
    env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
    if PYCACHE is not None:
        env.pop("PYTHONDONTWRITEBYTECODE", None)
        env["PYTHONPYCACHEPREFIX"] = str(PYCACHE)
    return env


def machine_speed() -> float:
    """Seconds of a fixed pure-Python loop in a fresh process: printed beside the figures, so
    that runs on a machine whose speed wanders (shared, throttled) can be compared."""
    t0 = time.perf_counter()
    subprocess.run([sys.executable, "-c", "sum(range(20_000_000))"], check=True)
    return time.perf_counter() - t0


def warm_up(tmp: Path) -> None:
    """Compile the tool and the modules it imports into the children's bytecode cache, and
    let the table cache (generator/tablecache.py; the benchmark's own, in the temporary folder)
    hold the constant tables, as after a first run."""
    subprocess.run([sys.executable, "-m", "compileall", "-q", str(ROOT / "generator")], env=_env(), check=True,
                   stdout=subprocess.DEVNULL)
    subprocess.run([sys.executable, "-c", "import generator.build, generator.render.site, generator.memo, "
                    "generator.cache, generator.history"], env=_env(), check=True, cwd=tmp)
    _ok(run_measured(["check", f"specs/{spec_name(0)}"], tmp), "warm-up check")


def _ok(r: dict, what: str) -> dict:
    if r["code"] not in (0, 1):
        raise SystemExit(f"{what} failed (exit {r['code']}):\n{r['stderr'][-3000:]}")
    return r


def files_of(site: Path) -> dict[str, str]:
    """Relative path -> SHA-256 of every file, read one at a time so the benchmark process
    stays small (a child's peak memory reported by wait4 can include the parent's pages)."""
    return {p.relative_to(site).as_posix(): hashlib.sha256(p.read_bytes()).hexdigest()
            for p in sorted(site.rglob("*")) if p.is_file()}


def measure_builds(tmp: Path, info: dict, jobs: int, quick: bool) -> dict:
    specs, site = tmp / "specs", tmp / "site"
    jobs_args = ["--jobs", str(jobs)]
    colds = []
    for _ in range(1 if quick else 3):     # the median of three: a shared machine's speed wanders
        for old in (site, tmp / ".site.cache"):     # cold as in a fresh checkout: no site or cache to delete
            shutil.rmtree(old, ignore_errors=True)
        r = _ok(run_measured(["build", "specs", "-o", "site", "--clean", "--no-history",
                              "--timings", "cold.json", *jobs_args], tmp), "cold build")
        colds.append(r | {"timings": json.loads((tmp / "cold.json").read_text())})
    cold = sorted(colds, key=lambda r: r["seconds"])[len(colds) // 2]
    timings = cold["timings"]
    incs = []
    # specs without a lot file, as most edits are (a lot spec redraws its lot pages too)
    edits = [i for i in (11, 57, 133, 3, 7, 1) if i < info["specs"] and i % 5 != 4
             and i not in info["lot_specs"]][: 1 if quick else 3]
    for k, i in enumerate(edits):
        edit_one(specs, i, k)
        r = _ok(run_measured(["build", "specs", "-o", "site", "--no-history", "--timings", "inc.json", *jobs_args],
                             tmp), "incremental build")
        incs.append(r | {"timings": json.loads((tmp / "inc.json").read_text())})
    serial = _ok(run_measured(["build", "specs", "-o", "serial", "--clean", "--no-history", "--jobs", "1",
                               "--timings", "serial.json"], tmp), "serial build")
    one = spec_name(edits[0] if edits else 0)
    checks_one = [_ok(run_measured(["check", f"specs/{one}"], tmp), "check") for _ in range(3)]
    check_all = _ok(run_measured(["check", "specs"], tmp), "check")
    identical = files_of(site) == files_of(tmp / "serial")
    inc_t = statistics.median(r["seconds"] for r in incs) if incs else None
    return {
        "cold": {"seconds": cold["seconds"], "runs": [round(r["seconds"], 3) for r in colds],
                 "peak_mib": max(r["peak_mib"] or 0 for r in colds), "jobs": timings["jobs"],
                 "in_build_seconds": timings["seconds"], "stages": timings["stages"],
                 "figures": timings["figures"], "pages": timings["pages"]},
        "serial": {"seconds": serial["seconds"], "peak_mib": serial["peak_mib"],
                   "stages": json.loads((tmp / "serial.json").read_text())["stages"]},
        "incremental": {"seconds": inc_t, "runs": [round(r["seconds"], 3) for r in incs],
                        "peak_mib": max((r["peak_mib"] or 0) for r in incs) if incs else None,
                        "evaluations_reused": [r["timings"]["evaluations_reused"] for r in incs],
                        "pages_reused": [r["timings"]["pages_reused"] for r in incs],
                        "identical_to_full_serial_build": identical},
        "check_one": {"seconds": statistics.median(r["seconds"] for r in checks_one), "file": one,
                      "peak_mib": max(r["peak_mib"] or 0 for r in checks_one)},
        "check_all": {"seconds": check_all["seconds"], "peak_mib": check_all["peak_mib"]},
    }


def measure_in_process(tmp: Path, info: dict, repeats: int) -> dict:
    """Per-diagram drawing times and units assessed per second, in this process."""
    os.chdir(tmp)
    from generator.assess.requirements import assess
    from generator.build import evaluate
    from generator.render import diagrams as D

    evaluated, _ = evaluate(tmp / "specs")
    lot_ids = {f"bench-panel-{i:03d}" for i in info["lot_specs"]}
    with_lots = [e for e in evaluated if e.spec.id in lot_ids]
    units = sum(len(e.assessment.table) for e in with_lots if e.assessment.table is not None)
    t0 = time.perf_counter()
    for e in with_lots:
        assess(e.spec, e.derived)
    t_assess = time.perf_counter() - t0

    sample = [e for e in evaluated if e.spec.id not in lot_ids][:20]
    D.spec_figures(sample[0])            # the first in a process: imports, fonts, static layers
    times: dict[str, list[float]] = {"xy": [], "uv": [], "white": []}
    for _ in range(repeats):
        for e in sample:
            for which in times:
                layer = D.layer_for(e, which)
                D._SVG_MEMO.clear()
                t = time.perf_counter()
                D._draw(which, layer, "benchmark", "benchmark")
                times[which].append((time.perf_counter() - t) * 1000)
    from figures import figure_times

    os.chdir(ROOT)
    demo = figure_times(repeats)
    return {"units": units, "assess_seconds": t_assess, "units_per_second": units / t_assess if t_assess else None,
            "diagram_ms": {k: statistics.median(v) for k, v in times.items()},
            "diagram_draws": sum(len(v) for v in times.values()),
            "demo_figures_ms": {k: (v if k == "first_ms" else v["median_ms"]) for k, v in demo.items()}}


def measure_kernels(quick: bool) -> list[dict] | str:
    try:
        from kernels import run_kernels
    except ImportError as e:
        return f"kernel comparison not available ({e})"
    return run_kernels(quick=quick)


def target_rows(builds: dict, inproc: dict) -> list[dict]:
    units = inproc["units"]
    per_100k = inproc["assess_seconds"] * 100_000 / units if units else None
    measured = {
        "cold_build_s": builds["cold"]["seconds"],
        "incremental_build_s": builds["incremental"]["seconds"],
        "check_one_spec_s": builds["check_one"]["seconds"],
        "diagram_ms": max(inproc["diagram_ms"].values()),
        "assess_100k_units_s": per_100k,
    }
    rows = []
    for name, (limit, unit, kind) in TARGETS.items():
        v = measured[name]
        met = v is not None and (v <= limit if kind == "max" else v >= limit)
        by = None if v is None or met else (v / limit if kind == "max" else limit / v)
        rows.append({"name": name, "value": v, "unit": unit, "target": f"{'<=' if kind == 'max' else '>='} {limit:g}",
                     "met": met, "missed_by_factor": by})
    return rows


def _fmt(v, nd=3):
    return "—" if v is None else (f"{v:.{nd}f}" if isinstance(v, float) else str(v))


def print_report(report: dict) -> None:
    b, p = report["builds"], report["in_process"]
    lib = report["library"]
    print(f"\nLibrary: {lib['specs']} specs, {lib['lots']} lots x {lib['units_per_lot']} units "
          f"({lib['units']} units), {b['cold']['figures']} diagrams; {report['machine']['cpus']} CPUs, "
          f"jobs {b['cold']['jobs']}")
    print("Each build and check is its own process, timed whole, after a warm-up that compiled the modules\n"
          "into a bytecode cache of the children's own and stored the constant tables in a table cache;\n"
          "a cold build starts, as in a fresh checkout, with no site and no build cache; the files of\n"
          "earlier runs are flushed to disk (sync) before each timed run.")
    sp = report["machine_speed_s"]
    print(f"Machine speed (a fixed Python loop, s): {sp['before_builds']:.3f} before the builds, "
          f"{sp['after_builds']:.3f} after (lower is faster)")
    print(f"{'measure':44} {'value':>12}")
    lines = [
        ("cold build, whole process, median (s)", b["cold"]["seconds"]),
        ("cold build, serial --jobs 1 (s)", b["serial"]["seconds"]),
        ("incremental rebuild, one spec edited (s)", b["incremental"]["seconds"]),
        ("  identical to a full serial build", str(b["incremental"]["identical_to_full_serial_build"])),
        ("check, one spec, whole process (s)", b["check_one"]["seconds"]),
        ("check, whole library, whole process (s)", b["check_all"]["seconds"]),
        *[(f"diagram {k}, median after the first (ms)", v) for k, v in p["diagram_ms"].items()],
        *[(f"demo site {k.replace('_ms', '')} figure (ms)" if k != "first_ms" else "demo site, first figure of a process (ms)", v)
          for k, v in p["demo_figures_ms"].items()],
        ("units assessed per second", p["units_per_second"]),
        ("peak memory, cold build (MiB)", b["cold"]["peak_mib"]),
        ("peak memory, check one spec (MiB)", b["check_one"]["peak_mib"]),
    ]
    for name, v in lines:
        print(f"{name:44} {_fmt(v, 1 if isinstance(v, float) and v > 100 else 3):>12}")
    print("\nShare of the cold build (serial) by stage:")
    st = b["serial"]["stages"]
    total = sum(st.values()) or 1.0
    for k, v in st.items():
        print(f"  {k:10} {v:8.3f} s {100 * v / total:5.1f} %")
    print("\nTargets:")
    for r in report["targets"]:
        miss = "" if r["met"] else (f"  missed by x{r['missed_by_factor']:.2f}" if r["missed_by_factor"] else "  not measured")
        print(f"  {r['name']:24} {_fmt(r['value']):>10} {r['unit']:3} target {r['target']:>8} "
              f"{'met' if r['met'] else 'MISSED'}{miss}")
    k = report["kernels"]
    if isinstance(k, str):
        print(f"\nKernels: {k}")
    else:
        print("\nKernels (ours beside the independent reference):")
        for r in k:
            ratio = f"x{r['ratio']:.0f}" if r.get("ratio") else "—"
            print(f"  {r['name']:34} n={r['n']:>9} ours {r['ours_s']:8.4f} s ({r['per_item_us']:.3f} µs each) "
                  f"ref {_fmt(r.get('reference_s'), 3):>8} s ratio {ratio:>7} max diff {_fmt(r.get('max_diff'), 6)}"
                  f"  target {r.get('target', '')} {'met' if r.get('met') else 'MISSED' if r.get('met') is False else ''}")


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--specs", type=int, default=200)
    ap.add_argument("--lots", type=int, default=20)
    ap.add_argument("--units", type=int, default=5000, help="units per lot")
    ap.add_argument("--jobs", type=int, default=0, help="build worker processes (0: one per CPU)")
    ap.add_argument("--repeats", type=int, default=3, help="draws of each sampled diagram")
    ap.add_argument("--json", metavar="FILE", help="also write the JSON report here")
    ap.add_argument("--quick", action="store_true", help="one incremental edit, smaller kernel batches")
    ap.add_argument("--no-kernels", action="store_true")
    ap.add_argument("--limits", action="store_true",
                    help="also time the refusal of hostile input (bench/limits.py: alias bombs, huge files)")
    ap.add_argument("--keep", metavar="DIR", help="build in DIR (kept) instead of a temporary folder")
    a = ap.parse_args(argv)
    t_start = time.perf_counter()
    with tempfile.TemporaryDirectory(prefix="colourspec-bench-") as t:
        tmp = Path(a.keep).resolve() if a.keep else Path(t)
        tmp.mkdir(parents=True, exist_ok=True)
        info = write_library(tmp / "specs", a.specs, a.lots, a.units)
        print(f"wrote {info['specs']} specs and {info['lots']} lot files into a temporary folder", file=sys.stderr)
        global PYCACHE
        PYCACHE = tmp / "pycache"
        os.environ.setdefault("COLOURSPEC_CACHE", str(tmp / "tables"))   # not the user's cache folder
        warm_up(tmp)
        speed_before = machine_speed()
        builds = measure_builds(tmp, info, a.jobs, a.quick)
        speed_after = machine_speed()
        print("builds measured", file=sys.stderr)
        inproc = measure_in_process(tmp, info, a.repeats)
        os.chdir(ROOT)
    kernels = [] if a.no_kernels else measure_kernels(a.quick)
    from generator import __version__
    from generator.parallel import available_cpus

    report = {"format": "colourspec-bench/1", "version": __version__,
              "machine_speed_s": {"before_builds": speed_before, "after_builds": speed_after,
                                  "loop": "sum(range(20_000_000)) in a fresh process"},
              "setup": "children with a warmed bytecode cache (PYTHONPYCACHEPREFIX in the temporary folder) "
                       "and the constant tables in a table cache of the benchmark's own (COLOURSPEC_CACHE)",
              "machine": {"cpus": available_cpus(), "python": platform.python_version(),
                          "platform": platform.platform()},
              "library": info | {"lot_specs": len(info["lot_specs"])}, "builds": builds, "in_process": inproc,
              "targets": target_rows(builds, inproc), "kernels": kernels,
              "bench_seconds": time.perf_counter() - t_start}
    print_report(report)
    if a.limits:
        import limits

        print("\nRefusing hostile input (each a fresh `colourspec check`):")
        limits.main()
    text = json.dumps(report, indent=2, default=float)
    print("\n" + text)
    if a.json:
        Path(a.json).write_text(text + "\n", encoding="utf-8")
    return 0 if builds["incremental"]["identical_to_full_serial_build"] else 1


if __name__ == "__main__":
    sys.exit(main())
