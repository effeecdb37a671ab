"""Command line: colourspec build | check | schema | new.

Exit status of `check` (and of `build --gate`): 0 every assessed requirement passes;
1 at least one fails; 2 invalid input or usage; 3 an internal error (a bug: please
report it with the traceback shown). `build` publishes a site that shows failing
verdicts as readily as passing ones, so it exits 0 once the site is written, unless
`--gate` asks it to gate on the verdicts as `check` does.
"""
from __future__ import annotations

import argparse
import json
import sys
import traceback
from pathlib import Path

from . import __version__

EXIT_PASS, EXIT_FAIL, EXIT_INPUT, EXIT_INTERNAL = 0, 1, 2, 3


class _Parser(argparse.ArgumentParser):
    def error(self, message):  # usage errors exit 2 with a short message
        self.print_usage(sys.stderr)
        print(f"colourspec: error: {message}", file=sys.stderr)
        raise SystemExit(EXIT_INPUT)


def _parser() -> argparse.ArgumentParser:
    p = _Parser(prog="colourspec", description="Validate colour specs, assess them and publish a site.")
    p.add_argument("--version", action="version", version=f"colourspec {__version__}")
    sub = p.add_subparsers(dest="command", required=True, parser_class=_Parser)
    b = sub.add_parser("build", help="validate, assess and write the static site")
    b.add_argument("specs", nargs="?", default="specs", help="spec file or folder (default: specs/)")
    b.add_argument("-o", "--output", default="site_output", help="site folder (default: site_output/)")
    b.add_argument("--gate", action="store_true",
                   help="exit 1 when a requirement fails, as check does (default: 0 once the site is written)")
    c = sub.add_parser("check", help="validate and assess without writing a site")
    c.add_argument("specs", nargs="?", default="specs", help="spec file or folder (default: specs/)")
    c.add_argument("--json", metavar="FILE", help="write results.json here ('-' for standard output)")
    c.add_argument("--junit", metavar="FILE", help="write JUnit XML here")
    sc = sub.add_parser("schema", help="write the JSON Schema (draft-07) of the spec format")
    sc.add_argument("-o", "--output", default="-", help="file to write ('-' for standard output)")
    n = sub.add_parser("new", help="write a commented starter spec")
    n.add_argument("path", help="where to write it, e.g. specs/my-panel.yaml")
    n.add_argument("--id", help="spec id (default: from the file name)")
    return p


def _report_problems(problems) -> None:
    for pr in problems:
        print(pr.format(), file=sys.stderr)
    n_err = sum(p.severity == "error" for p in problems)
    n_warn = len(problems) - n_err
    if n_err:
        print(f"{n_err} error(s){f', {n_warn} warning(s)' if n_warn else ''}: nothing was assessed or written.",
              file=sys.stderr)


def _verdict_line(summary) -> str:
    n = len(summary.evaluated)
    fails = summary.failing
    ind = [e.spec.id for e in summary.evaluated if e.assessment.verdict == "indeterminate"]
    parts = [f"{len(fails)} fail" if fails else "all pass"]
    if ind:
        parts.append(f"{len(ind)} indeterminate")
    return f"{n} spec{'s' if n != 1 else ''}: {', '.join(parts)}" + (f" ({', '.join(fails)})" if fails else "")


def _write_out(path: str, text: str) -> None:
    if path == "-":
        sys.stdout.write(text)
    else:
        Path(path).write_text(text, encoding="utf-8")


def cmd_check(args) -> int:
    from .build import check
    from .render.results import dumps

    summary = check(Path(args.specs))
    for w in summary.warnings:
        print(w.format(), file=sys.stderr)
    if args.json:
        _write_out(args.json, dumps(summary.results))
    if args.junit:
        from .render.junit import junit_xml

        _write_out(args.junit, junit_xml(summary.results))
    print(f"Checked {_verdict_line(summary)} in {summary.seconds:.2f} s", file=sys.stderr)
    return summary.exit_code


def cmd_build(args) -> int:
    from .build import build

    summary = build(Path(args.specs), Path(args.output))
    for w in summary.warnings:
        print(w.format(), file=sys.stderr)
    out = args.output.rstrip("/") + "/"
    print(f"Built {summary.pages - 1} spec pages and {summary.figures} diagrams into {out} in "
          f"{summary.seconds:.1f} s ({_verdict_line(summary)}); open {out}index.html")
    return summary.exit_code if args.gate else EXIT_PASS


def cmd_schema(args) -> int:
    from .docs import json_schema_text

    _write_out(args.output, json_schema_text())
    return EXIT_PASS


def cmd_new(args) -> int:
    from .starter import write_starter

    return write_starter(Path(args.path), args.id)


def main(argv: list[str] | None = None) -> int:
    from .publish import PublishError, Terminated, terminate_as_exception
    from .spec.limits import LimitsError, limits
    from .spec.problems import InputError

    args = _parser().parse_args(argv)
    try:
        limits()  # a bad COLOURSPEC_MAX_* setting is a usage error, reported before any work
        with terminate_as_exception():
            return {"build": cmd_build, "check": cmd_check, "new": cmd_new, "schema": cmd_schema}[args.command](args)
    except LimitsError as e:
        print(f"colourspec: {e}", file=sys.stderr)
        return EXIT_INPUT
    except Terminated:
        print("colourspec: terminated; nothing half-written was published", file=sys.stderr)
        return 128 + 15
    except InputError as e:
        _report_problems(e.problems)
        return EXIT_INPUT
    except PublishError as e:
        print(f"colourspec: {e}", file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt:
        print("colourspec: interrupted; the previous site is unchanged", file=sys.stderr)
        return 130
    except Exception:  # a bug, not bad input: say so, with the traceback for the report
        traceback.print_exc()
        print("colourspec: internal error (exit 3). This is a bug in colourspec, not in your spec; "
              "please report it with the lines above.", file=sys.stderr)
        return EXIT_INTERNAL


if __name__ == "__main__":
    sys.exit(main())
