"""Publish: write a whole site into a temporary folder beside the output, then swap it in.

- Nothing is written outside the output folder: every path of a ``SiteFiles`` is a
  plain relative path, checked when it is added.
- The output folder is checked before anything is written: not the filesystem root,
  not the home folder, not the specs folder nor a folder that holds it, not a folder
  that holds spec files, and an existing folder is replaced only when it is empty or a
  site this tool wrote (it carries the marker file ``MARKER``).
- The swap is one ``renameat2(RENAME_EXCHANGE)`` on Linux, so the output is never
  missing, not even for an instant; elsewhere (or on a filesystem without it) the old
  site is moved aside and the new one moved in, and a build killed between the two
  renames is repaired by the next build.
- Builds into one output are serialised with a lock on the output's parent folder;
  temporary folders left by a killed build are removed by the next build.
- A SIGTERM while publishing (see ``terminate_as_exception``) removes the temporary
  folder and leaves the previous site as it was.
"""
from __future__ import annotations

import contextlib
import ctypes
import ctypes.util
import errno
import fcntl
import json
import os
import shutil
import signal
import sys
import tempfile
from pathlib import Path, PurePosixPath

MARKER = ".colourspec-site"
MARKER_TEXT = b"This folder is a site written by colourspec build; the next build replaces it whole.\n"
SPEC_SUFFIXES = (".yaml", ".yml")
_SCAN_LIMIT = 20_000  # entries looked at when asking whether a foreign folder holds specs


class PublishError(Exception):
    pass


class Terminated(BaseException):
    """SIGTERM, raised as an exception so that clean-up code runs."""


@contextlib.contextmanager
def terminate_as_exception():
    """While active, SIGTERM raises ``Terminated`` in the main thread."""
    def handler(signum, frame):
        raise Terminated()

    try:
        previous = signal.signal(signal.SIGTERM, handler)
    except ValueError:  # not the main thread: leave signals alone
        yield
        return
    try:
        yield
    finally:
        signal.signal(signal.SIGTERM, previous)


class FileRef:
    """Content that already lies in a file no one rewrites in place (a cache entry):
    published as a hard link to that file where the filesystem allows, else copied."""

    __slots__ = ("path",)

    def __init__(self, path: str | os.PathLike) -> None:
        self.path = os.fspath(path)         # a plain string: a site has thousands of these

    def read(self) -> bytes:
        with open(self.path, "rb") as f:
            return f.read()

    def __repr__(self) -> str:
        return f"FileRef({self.path!r})"


class Span:
    """``length`` bytes of a file from ``offset`` (a cached entry of results.json): copied by
    the kernel (copy_file_range) where it can."""

    __slots__ = ("path", "offset", "length")

    def __init__(self, path: Path, offset: int, length: int) -> None:
        self.path, self.offset, self.length = Path(path), offset, length

    def read(self) -> bytes:
        with open(self.path, "rb") as f:
            data = os.pread(f.fileno(), self.length, self.offset)
        if len(data) != self.length:
            raise OSError(errno.EIO, "the file is shorter than it was", str(self.path))
        return data

    def __len__(self) -> int:
        return self.length


class Parts:
    """Content given as pieces (bytes, memoryviews or Spans) written one after the other,
    never joined in memory (a lot library's results.json is hundreds of MB)."""

    __slots__ = ("parts",)

    def __init__(self, parts: list) -> None:
        self.parts = parts

    def read(self) -> bytes:
        return b"".join(p.read() if isinstance(p, Span) else p for p in self.parts)


def _write_parts(f, parts: list) -> None:
    for p in parts:
        if not isinstance(p, Span):
            f.write(p)
            continue
        f.flush()
        with open(p.path, "rb") as src:
            offset, left = p.offset, p.length
            try:
                while left:
                    n = os.copy_file_range(src.fileno(), f.fileno(), left, offset)
                    if n <= 0:
                        raise OSError(errno.EIO, "the file is shorter than it was", str(p.path))
                    offset, left = offset + n, left - n
            except (AttributeError, OSError) as e:      # no copy_file_range here: copy through memory
                if isinstance(e, OSError) and e.errno == errno.EIO:
                    raise
                f.write(os.pread(src.fileno(), left, offset))


class SiteFiles:
    """A site to publish: relative POSIX path -> bytes, a FileRef to a file holding them, or
    Parts."""

    def __init__(self) -> None:
        self.files: dict[str, bytes | FileRef | Parts] = {}

    def add(self, rel: str, content: str | bytes | FileRef | Parts) -> None:
        p = PurePosixPath(rel)
        if (p.is_absolute() or ".." in p.parts or not p.parts or rel != str(p) or "\\" in rel
                or any(ord(c) < 32 for c in rel)):
            raise PublishError(f"refusing to write outside the site: {rel!r}")
        if rel in self.files:
            raise PublishError(f"two outputs for one path: {rel}")
        if rel == MARKER:
            raise PublishError(f"{MARKER} is the publisher's own marker file")
        self.files[rel] = content.encode("utf-8") if isinstance(content, str) else content


def _holds_specs(folder: Path, limit: int | None) -> bool:
    """Whether a folder (not following links) holds a spec file, looking at no more than
    ``limit`` entries (the answer only chooses the message for a folder refused anyway)."""
    seen = 0
    for _, dirs, files in os.walk(folder):
        if any(f.endswith(SPEC_SUFFIXES) for f in files):
            return True
        seen += len(dirs) + len(files)
        if limit is not None and seen > limit:
            return False
    return False


def _is_our_site(folder: Path) -> bool:
    if (folder / MARKER).is_file():
        return True
    # a site written before the marker existed: our results.json and nothing else of note
    try:
        doc = json.loads((folder / "results.json").read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return False
    return (isinstance(doc, dict) and str(doc.get("format", "")).startswith("colourspec-results/")
            and not (folder / ".git").exists())


def _within(path: Path, folder: Path) -> bool:
    return path == folder or folder in path.parents


def check_output(out: Path, protect: tuple[Path, ...] = ()) -> Path:
    """The output folder as an absolute real path, or PublishError saying why not."""
    shown = str(out)
    if not str(out) or any(ord(c) < 32 or ord(c) == 127 for c in str(out)):
        raise PublishError(f"refusing the output folder {shown!r}: expected a folder name without control characters")
    real = Path(os.path.realpath(out))
    if real.parent == real:
        raise PublishError(f"refusing to write the site to {shown}: the output must be a folder of its own, "
                           "not the root of the filesystem")
    with contextlib.suppress(RuntimeError, KeyError):
        if real == Path.home().resolve():
            raise PublishError(f"refusing to write the site to {shown}: that is the home folder")
    for p in protect:
        pr = Path(os.path.realpath(p))
        if _within(pr, real):
            raise PublishError(f"refusing to write the site to {shown}: it would replace the specs in {p}; "
                               "choose a folder of its own, such as site_output/")
    if real.exists() or real.is_symlink():
        if not real.is_dir():
            raise PublishError(f"refusing to write the site to {shown}: it exists and is not a folder")
        if any(real.iterdir()):
            ours = _is_our_site(real)  # our own site is looked through whole; anything else is refused
            if _holds_specs(real, None if ours else _SCAN_LIMIT):
                raise PublishError(f"refusing to replace {shown}: it holds spec files and is not a built site")
            if not ours:
                raise PublishError(f"refusing to replace {shown}: it is not empty and not a site written by "
                                   f"colourspec (no {MARKER}); choose another folder or empty it yourself")
    return real


def _exchange(a: Path, b: Path) -> bool:
    """Swap two paths atomically (Linux renameat2 RENAME_EXCHANGE); False if unsupported."""
    if not sys.platform.startswith("linux"):
        return False
    libc = ctypes.CDLL(ctypes.util.find_library("c") or "libc.so.6", use_errno=True)
    fn = getattr(libc, "renameat2", None)
    if fn is None:
        return False
    AT_FDCWD, RENAME_EXCHANGE = -100, 2
    fn.argtypes = [ctypes.c_int, ctypes.c_char_p, ctypes.c_int, ctypes.c_char_p, ctypes.c_uint]
    if fn(AT_FDCWD, os.fsencode(a), AT_FDCWD, os.fsencode(b), RENAME_EXCHANGE) == 0:
        return True
    err = ctypes.get_errno()
    if err in (errno.EINVAL, errno.ENOSYS, errno.ENOTSUP, errno.EOPNOTSUPP):
        return False
    raise OSError(err, os.strerror(err), str(a))


def _link_or_copy(src: str, target: str) -> None:
    """A hard link to ``src`` (no bytes written), or a copy where links are refused (another
    filesystem, a filesystem without them)."""
    try:
        os.link(src, target)
    except OSError as e:
        if e.errno == errno.ENOENT and not os.path.exists(src):
            raise
        shutil.copyfile(src, target)


def _swap_in(tmp: Path, out: Path) -> None:
    if not out.exists():
        os.rename(tmp, out)
    elif _exchange(tmp, out):
        shutil.rmtree(tmp, ignore_errors=True)  # tmp now holds the previous site
    else:
        old = tmp.with_name(tmp.name.replace(".new-", ".old-", 1))
        os.rename(out, old)
        os.rename(tmp, out)
        shutil.rmtree(old, ignore_errors=True)


@contextlib.contextmanager
def _locked(folder: Path):
    fd = os.open(folder, os.O_RDONLY)
    try:
        with contextlib.suppress(OSError):  # a filesystem without locks: build without one
            fcntl.flock(fd, fcntl.LOCK_EX)
        yield
    finally:
        os.close(fd)


def _clean_stale(out: Path) -> None:
    """Under the lock: temporary folders of killed builds go; a site moved aside by a build
    killed between its two renames comes back."""
    new, old = f".{out.name}.new-", f".{out.name}.old-"
    leftovers = sorted(p for p in out.parent.iterdir() if p.name.startswith((new, old)))
    for p in leftovers:
        if p.is_dir() and not p.is_symlink():
            if p.name.startswith(old) and not out.exists() and _is_our_site(p):
                os.rename(p, out)
            else:
                shutil.rmtree(p, ignore_errors=True)


def _source_date_epoch() -> int | None:
    v = os.environ.get("SOURCE_DATE_EPOCH", "").strip()
    return int(v) if v.isdigit() else None


def publish(site: SiteFiles, out: Path, protect: tuple[Path, ...] = ()) -> Path:
    """Write ``site`` to ``out`` in one swap; ``protect`` are paths (the specs) that the
    output must not contain. Returns the real output path."""
    real = check_output(out, protect)
    try:
        return _publish(site, out, real, protect)
    except OSError as e:  # the disk, not the specs or the tool: say where and why
        raise PublishError(f"cannot write the site to {out}: {e.strerror or e}"
                           + (f" ({e.filename})" if e.filename else "")) from e


def _publish(site: SiteFiles, out: Path, real: Path, protect: tuple[Path, ...]) -> Path:
    real.parent.mkdir(parents=True, exist_ok=True)
    epoch = _source_date_epoch()
    with _locked(real.parent):
        _clean_stale(real)
        real = check_output(out, protect)  # again, now that no other build can change it
        tmp = Path(tempfile.mkdtemp(prefix=f".{real.name}.new-", dir=real.parent))
        try:
            files = dict(site.files)
            files[MARKER] = MARKER_TEXT
            root = str(tmp)
            made = {root}
            for rel in sorted(files):       # plain strings: thousands of files, pathlib costs
                target = os.path.join(root, rel)
                folder = os.path.dirname(target)
                if folder not in made:
                    os.makedirs(folder, exist_ok=True)
                    made.add(folder)
                content = files[rel]
                if isinstance(content, FileRef):
                    _link_or_copy(content.path, target)
                else:
                    with open(target, "xb") as f:
                        if isinstance(content, Parts):
                            _write_parts(f, content.parts)
                        else:
                            f.write(content)
            if epoch is not None:  # reproducible archives of the site: every mtime from SOURCE_DATE_EPOCH
                for d, _, names in sorted(os.walk(tmp), reverse=True):
                    for n in names:
                        os.utime(os.path.join(d, n), (epoch, epoch))
                    os.utime(d, (epoch, epoch))
            os.chmod(tmp, 0o755)  # mkdtemp makes it private; a site is for reading
            _swap_in(tmp, real)
        except BaseException:
            shutil.rmtree(tmp, ignore_errors=True)
            raise
    return real
