"""Regenerate tests/golden/ from the demo specs: python tests/regenerate_golden.py

Legitimate only when a change to the output is intended (a new key, a new page
section, a corrected figure); say so in the commit message. See DEVELOPERS.md.
"""
from __future__ import annotations

import os
import shutil
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
GOLDEN = ROOT / "tests" / "golden"


def golden_files(site: Path) -> dict[str, bytes]:
    """The part of a built site kept as golden output: pages, scripts, results and figure data, not SVG
    (large; the drawing is tested in tests/test_render_*.py and reproducibility in test_reproducible)."""
    out = {}
    for p in sorted(site.rglob("*")):
        if p.is_file() and p.suffix in (".html", ".json", ".csv", ".css", ".js"):
            out[p.relative_to(site).as_posix()] = p.read_bytes()
    return out


def main() -> int:
    sys.path.insert(0, str(ROOT))
    from generator.build import build

    os.chdir(ROOT)
    with tempfile.TemporaryDirectory() as tmp:
        site = Path(tmp) / "site"
        build(Path("specs"), site)
        files = golden_files(site)
    shutil.rmtree(GOLDEN, ignore_errors=True)
    for rel, data in files.items():
        (GOLDEN / rel).parent.mkdir(parents=True, exist_ok=True)
        (GOLDEN / rel).write_bytes(data)
    print(f"wrote {len(files)} files to tests/golden/")
    return 0


if __name__ == "__main__":
    sys.exit(main())
