"""Numeric tables that take a tenth of a second to build, kept between processes.

A table is a dict of numpy arrays stored as one ``.npz`` file (no pickles) in the user's
cache folder: ``$COLOURSPEC_CACHE`` if set (``off`` keeps nothing), else
``$XDG_CACHE_HOME/colourspec``, else ``~/.cache/colourspec``. The file name carries a
digest of everything the table is computed from (the caller's key, the source and data
of ``generator.colour`` and ``generator.data``, numpy's version), so a stored table is
the same bits a fresh build gives; an unreadable or damaged file is built again, and a
cache folder that cannot be written only costs the build time.
"""
from __future__ import annotations

import hashlib
import os
import tempfile
from functools import lru_cache
from pathlib import Path

import numpy as np

FORMAT = "colourspec-tables/1"


def cache_root() -> Path | None:
    v = os.environ.get("COLOURSPEC_CACHE")
    if v is not None:
        return None if v.strip().lower() in ("", "off", "0", "no") else Path(v)
    base = os.environ.get("XDG_CACHE_HOME")
    if not base:
        home = os.path.expanduser("~")
        if home.startswith("~") or not os.path.isabs(home):     # no home folder: keep nothing
            return None
        base = os.path.join(home, ".cache")
    return Path(base) / "colourspec"


@lru_cache(maxsize=1)
def inputs_digest() -> str:
    """The colorimetry source and data a table may be computed from, and numpy's version."""
    here = Path(__file__).resolve().parent
    h = hashlib.sha256(f"{FORMAT}\0numpy {np.__version__}\0".encode())
    for folder in (here / "colour", here / "data"):
        for p in sorted(folder.iterdir()):
            if p.suffix in (".py", ".csv") and p.is_file():
                h.update(p.name.encode() + b"\0" + hashlib.sha256(p.read_bytes()).digest())
    return h.hexdigest()


def stored_arrays(name: str, key: str, build) -> dict[str, np.ndarray]:
    """``build()`` (a dict of arrays), or the same arrays stored by an earlier process."""
    root = cache_root()
    if root is None:
        return build()
    digest = hashlib.sha256(f"{name}\0{key}\0{inputs_digest()}".encode()).hexdigest()[:40]
    path = root / f"{name}-{digest}.npz"
    try:
        with np.load(path, allow_pickle=False) as z:
            return {k: z[k] for k in z.files}
    except Exception:       # noqa: BLE001 -- missing, or damaged in any way: built again
        pass
    arrays = build()
    try:
        write_atomically(path, lambda f: np.savez(f, **arrays))
    except OSError:
        pass                # a cache folder that cannot be written only costs the build time
    return arrays


def write_atomically(path: Path, write) -> None:
    """``write(binary file)`` into a temporary file beside ``path``, then renamed over it, so
    that another process reads the old file or the new one, never half of one; the folder is
    made if needed, and nothing is left behind when ``write`` fails."""
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}-", dir=path.parent)
    try:
        with os.fdopen(fd, "wb") as f:
            write(f)
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
