"""How long refusing hostile input takes and how much memory it uses: prints figures,
asserts nothing (run: python bench/limits.py, or python bench/run.py --limits). Each case runs `colourspec check`
in a fresh process: the whole run's time including start-up, the time spent in check
itself, and the process's peak resident set size. Quote medians of several runs on a
shared machine."""
from __future__ import annotations

import os
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
MiB = 1024 * 1024


def alias_bomb() -> bytes:
    lines = ["spec: 1", "id: bomb", "l0: &l0 [" + ", ".join(["lol"] * 10) + "]"]
    lines += [f"l{i}: &l{i} [" + ", ".join([f"*l{i - 1}"] * 10) + "]" for i in range(1, 12)]
    return ("\n".join(lines) + "\n").encode()  # 10^12 values once expanded


CASES = {
    "demo spec (baseline)": lambda: (ROOT / "specs" / "corvinta-atlas-27-studio.yaml").read_bytes(),
    "alias bomb, 10^12 values expanded": alias_bomb,
    "flat list, 8 MiB of tiny values": lambda: b"[" + b"0," * (4 * MiB - 2) + b"]\n",
    "flat list just under the node limit": lambda: b"spec: 1\nid: flat\nx: [" + b"0," * 49_990 + b"0]\n",
    "nesting 5000 deep": lambda: b"a: " + b"[" * 5000 + b"]" * 5000 + b"\n",
    "nesting 100 deep, block mappings": lambda: "".join("  " * i + f"k{i}:\n" for i in range(100)).encode(),
    "one 7 MiB scalar": lambda: b"spec: 1\nid: big\ntitle: " + b"x" * (7 * MiB) + b"\n",
}


CHILD = ("import resource, sys, time\nfrom generator.cli import main\nt = time.perf_counter()\n"
         "s = main(['check', 'specs'])\nrss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss\n"
         "sys.stderr.write(f'CHECK {time.perf_counter() - t:.3f} RSS {rss}')\nsys.exit(s)")


def run(name: str, data: bytes | None, sparse: int = 0) -> None:
    with tempfile.TemporaryDirectory() as d:
        specs = Path(d) / "specs"
        specs.mkdir()
        f = specs / "case.yaml"
        if sparse:
            with open(f, "wb") as fh:
                fh.truncate(sparse)
        else:
            f.write_bytes(data)
        t0 = time.perf_counter()
        r = subprocess.run([sys.executable, "-c", CHILD], cwd=d, capture_output=True, text=True,
                           env=dict(os.environ, PYTHONPATH=str(ROOT)))
        dt = time.perf_counter() - t0
        rss = int(r.stderr.rsplit("RSS ", 1)[1])
        inside = float(r.stderr.rsplit("CHECK ", 1)[1].split()[0])
        first = next((ln for ln in r.stderr.splitlines() if ln.startswith("specs/")), r.stderr.strip()[-60:])
        print(f"{name:36s} exit {r.returncode}  {dt:5.2f} s ({inside:5.2f} s in check)  "
              f"peak RSS {rss / 1024:5.0f} MiB  {first[:80]}")


def main() -> None:
    print("process start-up alone (python -m generator --version):", end=" ")
    t0 = time.perf_counter()
    subprocess.run([sys.executable, "-m", "generator", "--version"], cwd=ROOT, capture_output=True)
    print(f"{time.perf_counter() - t0:.2f} s")
    for name, make in CASES.items():
        run(name, make())
    run("sparse file of 64 GiB", None, sparse=64 * 1024**3)


if __name__ == "__main__":
    main()
