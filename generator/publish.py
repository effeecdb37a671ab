"""Publish: write a whole site into a temporary folder beside the output, then swap it in.

A failed build leaves the previous site untouched. The writer refuses paths outside
the output folder and a second write to one path, and never replaces a folder that
holds spec files.
"""
from __future__ import annotations

import os
import shutil
import tempfile
from pathlib import Path, PurePosixPath


class PublishError(Exception):
    pass


class SiteFiles:
    """An in-memory site: relative POSIX path -> bytes."""

    def __init__(self) -> None:
        self.files: dict[str, bytes] = {}

    def add(self, rel: str, content: str | bytes) -> None:
        p = PurePosixPath(rel)
        if p.is_absolute() or ".." in p.parts or not p.parts or rel != str(p):
            raise PublishError(f"refusing to write outside the site: {rel!r}")
        if rel in self.files:
            raise PublishError(f"two outputs for one path: {rel}")
        self.files[rel] = content.encode("utf-8") if isinstance(content, str) else content


def _holds_specs(folder: Path) -> bool:
    return any(p.suffix in (".yaml", ".yml") for p in folder.rglob("*") if p.is_file()) if folder.is_dir() else False


def publish(site: SiteFiles, out: Path) -> None:
    out = out.resolve()
    if out.exists() and not out.is_dir():
        raise PublishError(f"{out.name} exists and is not a folder")
    if out.exists() and _holds_specs(out) and not (out / "results.json").exists():
        raise PublishError(f"refusing to replace {out.name}/: it holds spec files and is not a built site")
    out.parent.mkdir(parents=True, exist_ok=True)
    tmp = Path(tempfile.mkdtemp(prefix=f".{out.name}.new-", dir=out.parent))
    try:
        for rel in sorted(site.files):
            target = tmp / rel
            target.parent.mkdir(parents=True, exist_ok=True)
            target.write_bytes(site.files[rel])
        old = None
        if out.exists():
            old = Path(tempfile.mkdtemp(prefix=f".{out.name}.old-", dir=out.parent))
            os.rmdir(old)
            os.replace(out, old)
        os.replace(tmp, out)
        if old is not None:
            shutil.rmtree(old, ignore_errors=True)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
