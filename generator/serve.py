"""colourspec serve: build, serve on 127.0.0.1, rebuild when an input changes, reload pages.

Each rebuild is incremental (generator/cache.py): only the specs an edit touches are
drawn again. The site is built with a small script (static/reload.js) that polls
``__colourspec/status.json``, answered from memory by this server: it carries the build
number (a page reloads when it changes) and the errors of the last build. A broken spec
does not stop the server or replace the last good site: its errors are shown over the
page until the spec is fixed.
"""
from __future__ import annotations

import http.server
import json
import signal
import sys
import threading
import time
import traceback
from functools import partial
from pathlib import Path

STATUS_PATH = "/__colourspec/status.json"


class State:
    """The last build's number and errors, shared between the watcher and the server."""

    def __init__(self) -> None:
        self.lock = threading.Lock()
        self.build = 0
        self.errors: list[str] = []
        self.seconds = 0.0

    def status_json(self) -> bytes:
        with self.lock:
            return json.dumps({"build": self.build, "errors": self.errors,
                               "seconds": round(self.seconds, 3)}).encode("utf-8")


def watched_files(specs: Path, templates: Path, skip: tuple[Path, ...] = ()) -> dict[str, tuple[int, int]]:
    """Modification time and size of every file the site is made from: specs and the
    measurement files beside them, templates and static assets. Hidden files and folders
    (such as the incremental-build cache) are not watched, nor the folders in ``skip``
    (the site itself, when it lies inside a watched folder)."""
    skip = tuple(p.resolve() for p in skip)
    out = {}
    roots = [specs.parent if specs.is_file() else specs, templates]
    for root in roots:
        if not root.exists():
            continue
        for p in sorted(root.rglob("*")):
            if (p.is_file() and not any(part.startswith(".") for part in p.relative_to(root).parts)
                    and not any(d == p.resolve() or d in p.resolve().parents for d in skip)):
                st = p.stat()
                out[str(p)] = (st.st_mtime_ns, st.st_size)
    return out


def rebuild(specs: Path, out: Path, state: State, history: bool = False) -> None:
    """Build once (reusing unchanged specs' files from the cache); record the errors
    instead of raising, so that serving goes on."""
    from .build import build
    from .publish import PublishError
    from .spec.problems import InputError

    t0 = time.perf_counter()
    errors: list[str] = []
    reused = 0
    try:
        reused = build(specs, out, reload=True, history=history).reused
    except InputError as e:
        errors = [p.format() for p in e.problems]
    except PublishError as e:
        errors = [str(e)]
    except Exception:  # a bug: show it in the page and keep serving
        errors = ["internal error (a bug in colourspec, please report it):", traceback.format_exc()]
    with state.lock:
        state.build += 1
        state.errors = errors
        state.seconds = time.perf_counter() - t0
    when = time.strftime("%H:%M:%S")
    if errors:
        print(f"[{when}] build {state.build} failed ({len(errors)} problem(s)); the last good site stays up:",
              file=sys.stderr)
        for line in errors:
            print("  " + line, file=sys.stderr)
    else:
        note = f" ({reused} unchanged pages reused)" if reused else ""
        print(f"[{when}] build {state.build} done in {state.seconds:.2f} s{note}", file=sys.stderr)


_NO_SITE = """<!doctype html><html lang="en"><head><meta charset="utf-8"><title>colourspec: build failed</title>
<script src="/static/reload.js"></script></head><body><main><h1>The site could not be built</h1>
<p>Fix the problems below and save; this page reloads when the build succeeds.</p></main></body></html>"""


class Handler(http.server.SimpleHTTPRequestHandler):
    state: State
    site: Path

    def do_GET(self):  # noqa: N802 (http.server's name)
        path = self.path.split("?", 1)[0]
        if path == STATUS_PATH:
            return self._send(self.state.status_json(), "application/json")
        if path == "/static/reload.js" and not (self.site / "static" / "reload.js").is_file():
            from .render.pages import templates_dir

            return self._send((templates_dir() / "static" / "reload.js").read_bytes(), "text/javascript")
        if not (self.site / "index.html").is_file() and path in ("/", "/index.html"):
            return self._send(_NO_SITE.encode("utf-8"), "text/html; charset=utf-8")
        return super().do_GET()

    def _send(self, body: bytes, ctype: str):
        self.send_response(200)
        self.send_header("Content-Type", ctype)
        self.send_header("Cache-Control", "no-store")
        self.send_header("Content-Length", str(len(body)))
        self.end_headers()
        self.wfile.write(body)

    def end_headers(self):
        self.send_header("Cache-Control", "no-store")
        super().end_headers()

    def log_message(self, format, *args):  # quiet: the watcher prints what matters
        pass


def start_server(out: Path, state: State, port: int) -> http.server.ThreadingHTTPServer:
    out = out.resolve()
    handler = type("BoundHandler", (Handler,), {"state": state, "site": out})
    server = http.server.ThreadingHTTPServer(("127.0.0.1", port), partial(handler, directory=str(out)))
    threading.Thread(target=server.serve_forever, name="colourspec-http", daemon=True).start()
    return server


def watch(specs: Path, out: Path, state: State, interval: float, stop: threading.Event,
          history: bool = False) -> None:
    from .render.pages import templates_dir

    templates = templates_dir()
    seen = watched_files(specs, templates, (out,))
    while not stop.wait(interval):
        now = watched_files(specs, templates, (out,))
        if now != seen:
            seen = now
            rebuild(specs, out, state, history)


def _stop_on_sigterm(signum, frame):
    raise KeyboardInterrupt


def serve(specs: Path, out: Path, port: int = 8000, interval: float = 0.2, history: bool = False) -> int:
    """Serve until interrupted (Ctrl-C or SIGTERM); the server is shut down on the way out.
    ``history`` shows each spec's git history, read again at every rebuild."""
    if threading.current_thread() is threading.main_thread():
        signal.signal(signal.SIGTERM, _stop_on_sigterm)
    state = State()
    rebuild(specs, out, state, history)
    server = start_server(out, state, port)
    host, bound = server.server_address[:2]
    print(f"Serving {out.as_posix().rstrip('/')}/ at http://{host}:{bound}/ ; watching {specs.as_posix()} and "
          "the templates (Ctrl-C stops)", file=sys.stderr)
    stop = threading.Event()
    try:
        watch(specs, out, state, interval, stop, history)
    except KeyboardInterrupt:
        print("colourspec: stopped serving", file=sys.stderr)
    finally:
        stop.set()
        server.shutdown()
        server.server_close()
    return 0
