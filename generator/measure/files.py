"""Which measurement files a spec may read, and reading them by format.

A path is relative to the spec file that names it and must stay inside the specs
folder: absolute paths, paths through '..' that leave it and symbolic links that point
out of it are refused.
"""
from __future__ import annotations

from pathlib import Path

from .cgats import parse_cgats
from .csvfile import parse_csv
from .records import Records

FORMATS = {".csv": "csv", ".cgats": "cgats", ".txt": "cgats", ".cgt": "cgats"}


class PathRefused(Exception):
    def __init__(self, message: str, hint: str = ""):
        super().__init__(message)
        self.message, self.hint = message, hint


def locate(written: str, spec_dir: Path, root: Path) -> Path:
    """The file a spec's ``measurements`` entry names, or PathRefused saying why not."""
    p = Path(written)
    if p.is_absolute() or written.startswith(("/", "\\")) or (len(written) > 1 and written[1] == ":"):
        raise PathRefused(f"expected a path relative to the spec file, found the absolute path {written!r}",
                          "put the file beside the spec, e.g. measurements/lot-2611.csv")
    target = (spec_dir / p).resolve()
    base = root.resolve()
    if not target.is_relative_to(base):
        link = " (through a symbolic link)" if (spec_dir / p).is_symlink() else ""
        raise PathRefused(f"expected a file inside the specs folder, found {written!r} leading out of it{link}",
                          "measurement files must live under the specs folder")
    if not target.is_file():
        raise PathRefused(f"expected a measurement file, found nothing at {written!r}",
                          "paths are relative to the spec file")
    if p.suffix.lower() not in FORMATS:
        raise PathRefused(f"expected a .csv, .cgats or .txt (CGATS.17) file, found {written!r}")
    return target


class FolderFiles:
    """Measurement files on disk, found relative to the real location of the spec file that
    names them (``spec_paths``: spec file name as shown -> its path) inside ``root``."""

    def __init__(self, root: Path, spec_paths: dict[str, Path] | None = None):
        self.root, self.spec_paths = root, dict(spec_paths or {})

    def find(self, written: str, spec_file: str) -> Path:
        real = self.spec_paths.get(spec_file, Path(spec_file))
        return locate(written, real.parent, self.root)

    def read_bytes(self, path: Path) -> bytes:
        return path.read_bytes()


class NoFiles:
    """For specs given as bytes with no folder to read measurement files from."""

    def find(self, written: str, spec_file: str):
        raise PathRefused(f"expected a measurement file, found {written!r} with no folder to read it from",
                          "load the specs from their folder")

    def read_bytes(self, path) -> bytes:  # pragma: no cover - find always refuses
        raise OSError("no folder")


def read(path: Path, shown: str, observer: str = "cie1931-2", data: bytes | None = None) -> list[Records]:
    """Parse one file (its ``data`` if already read); ``shown`` is the name errors carry.
    Raises ReadError on bad content."""
    from .records import ReadError

    try:
        text = (path.read_bytes() if data is None else data).decode("utf-8-sig")
    except UnicodeDecodeError as e:
        raise ReadError(shown, 1, 1, "file", f"expected UTF-8 text, found a byte that is not ({e.reason})") from None
    if FORMATS[Path(path).suffix.lower()] == "csv":
        return [parse_csv(text, shown, observer)]
    return parse_cgats(text, shown)
