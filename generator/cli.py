"""Command line: colourspec build | check | diff | serve | schema | new.

Exit status of `check` (and of `build --gate`): 0 every assessed requirement passes;
1 at least one fails; 2 invalid input or usage; 3 an internal error (a bug: please
report it with the traceback shown). `build` publishes a site that shows failing
verdicts as readily as passing ones, so it exits 0 once the site is written, unless
`--gate` asks it to gate on the verdicts as `check` does.
"""
from __future__ import annotations

import argparse
import sys
import traceback
from pathlib import Path

from . import __version__

EXIT_PASS, EXIT_FAIL, EXIT_INPUT, EXIT_INTERNAL = 0, 1, 2, 3


class _UsageError(Exception):
    pass


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
    b.add_argument("--clean", action="store_true",
                   help="full build: empty the incremental-build cache (.OUT.cache/ beside OUT) first")
    b.add_argument("--no-history", action="store_true",
                   help="leave out the per-spec git history (shown when the specs are in a git repository)")
    b.add_argument("--site-url", metavar="URL", type=_site_url,
                   help="public address of the published site (https://...), for canonical links; "
                        "links between pages stay relative either way")
    b.add_argument("--jobs", "-j", type=_jobs, default=0, metavar="N",
                   help="worker processes for computing and drawing (default 0: one per available CPU; "
                        "1: none); the site is the same bytes either way")
    b.add_argument("--timings", metavar="FILE",
                   help="write the seconds spent in each pipeline stage as JSON ('-' for standard output)")
    sv = sub.add_parser("serve", help="build, serve on 127.0.0.1 and rebuild when a spec or template changes")
    sv.add_argument("specs", nargs="?", default="specs", help="spec file or folder (default: specs/)")
    sv.add_argument("-o", "--output", default="site_output", help="site folder (default: site_output/)")
    sv.add_argument("--port", type=int, default=8000, help="port on 127.0.0.1 (default: 8000; 0 picks a free one)")
    sv.add_argument("--interval", type=float, default=0.2, help="seconds between checks for changes (default: 0.2)")
    sv.add_argument("--no-history", action="store_true",
                    help="leave out the per-spec git history (read again at each rebuild)")
    c = sub.add_parser("check", help="validate and assess without writing a site")
    c.add_argument("specs", nargs="?", default="specs", help="spec file or folder (default: specs/)")
    c.add_argument("--json", metavar="FILE", help="write results.json here ('-' for standard output)")
    c.add_argument("--junit", metavar="FILE", help="write JUnit XML here ('-' for standard output)")
    c.add_argument("--annotations", action="store_true",
                   help="print CI annotations (::error file=...,line=...::message) on standard output")
    c.add_argument("--annotations-limit", type=int, default=None, metavar="N",
                   help="at most N annotations of each kind, then a summary line (default: 10)")
    c.add_argument("--strict", action="store_true",
                   help="warnings and indeterminate verdicts count as failures (exit 1)")
    c.add_argument("--no-gate", action="store_true",
                   help="exit 0 even when requirements fail: only invalid input fails (exit 2), "
                        "e.g. for a pre-commit hook")
    d = sub.add_parser("diff", help="what changed between two spec folders or two git revisions",
                       description="Compare targets, tolerances, requirements and verdicts of two spec "
                                   "folders (OLD NEW) or of the specs folder at two git revisions "
                                   "(--git REV1..REV2 [SPECS]; REV1.. compares with the working folder).")
    d.add_argument("paths", nargs="*", metavar="PATH", help="OLD NEW folders, or with --git the specs folder")
    d.add_argument("--git", metavar="REV1..REV2", help="compare two revisions of SPECS (default specs/)")
    d.add_argument("--format", choices=("text", "md"), default="text", help="text (default) or Markdown")
    d.add_argument("-o", "--output", default="-", help="file to write ('-' for standard output)")
    sc = sub.add_parser("schema", help="write the JSON Schema (draft-07) of the spec format")
    sc.add_argument("-o", "--output", default="-", help="file to write ('-' for standard output)")
    n = sub.add_parser("new", help="write a commented starter spec")
    n.add_argument("path", help="where to write it, e.g. specs/my-panel.yaml")
    n.add_argument("--id", help="spec id (default: from the file name)")
    return p


def _jobs(text: str) -> int:
    if not text.isdigit():
        raise argparse.ArgumentTypeError(f"expected a whole number >= 0, found {text!r}")
    return int(text)


def _site_url(text: str) -> str:
    if not text.startswith(("https://", "http://")) or len(text.split("//", 1)[1].strip("/")) == 0:
        raise argparse.ArgumentTypeError(f"expected an address starting with https:// or http://, found {text!r}")
    return text.rstrip("/") + "/"


def _report_problems(problems) -> None:
    for pr in problems:
        print(pr.format(), file=sys.stderr)
    n_err = sum(p.severity == "error" for p in problems)
    n_warn = len(problems) - n_err
    if n_err:
        print(f"{n_err} error(s){f', {n_warn} warning(s)' if n_warn else ''}: nothing was assessed or written.",
              file=sys.stderr)


NAMED_FAILS = 10    # failing specs named on the summary line


def _verdict_line(summary) -> str:
    n = len(summary.evaluated)
    fails = summary.failing
    ind = [e.spec.id for e in summary.evaluated if e.assessment.verdict == "indeterminate"]
    parts = [f"{len(fails)} fail" if fails else "all pass"]
    if ind:
        parts.append(f"{len(ind)} indeterminate")
    named = ", ".join(fails[:NAMED_FAILS]) + (f" and {len(fails) - NAMED_FAILS} more: see results.json"
                                              if len(fails) > NAMED_FAILS else "")
    return f"{n} spec{'s' if n != 1 else ''}: {', '.join(parts)}" + (f" ({named})" if fails else "")


def _write_out(path: str, text: str) -> None:
    if path == "-":
        sys.stdout.write(text)
    else:
        Path(path).write_text(text, encoding="utf-8")


def _annotations(args, problems, evaluated=()) -> None:
    from .render import annotations as A
    from .spec.locate import locate_row, unit_files

    items = [A.from_problem(p) for p in problems]
    for e in evaluated:
        files = unit_files(e.spec)
        for row in e.assessment.rows:
            if row["verdict"] != "pass":
                items.append(A.from_row(e.spec, row, locate_row(e.spec.source, row, files)))
    limit = A.DEFAULT_LIMIT if args.annotations_limit is None else args.annotations_limit
    sys.stdout.write(A.render(items, limit))


def cmd_check(args) -> int:
    from .build import check
    from .render.results import dumps
    from .spec.problems import InputError

    to_stdout = [name for name, v in (("--json", args.json), ("--junit", args.junit),
                                       ("--annotations", "-" if args.annotations else None)) if v == "-"]
    if len(to_stdout) > 1:
        raise _UsageError(f"{' and '.join(to_stdout)} cannot both write to standard output; "
                          "give a FILE for all but one")
    if args.annotations_limit is not None and args.annotations_limit < 0:
        raise _UsageError("--annotations-limit: expected a number >= 0")
    try:
        summary = check(Path(args.specs))
    except InputError as e:
        if args.annotations:
            _annotations(args, e.problems)
        raise
    for w in summary.warnings:
        print(w.format(), file=sys.stderr)
    if args.json:
        _write_out(args.json, dumps(summary.results))
    if args.junit:
        from .render.junit import junit_xml

        _write_out(args.junit, junit_xml(summary.results))
    if args.annotations:
        _annotations(args, summary.warnings, summary.evaluated)
    code = summary.exit_code
    strict_note = ""
    if args.strict and code == EXIT_PASS:
        n_ind = sum(e.assessment.verdict == "indeterminate" for e in summary.evaluated)
        if summary.warnings or n_ind:
            code = EXIT_FAIL
            strict_note = (f"; --strict: {len(summary.warnings)} warning(s) and {n_ind} indeterminate "
                           "spec(s) count as failures")
    print(f"Checked {_verdict_line(summary)} in {summary.seconds:.2f} s{strict_note}", file=sys.stderr)
    return EXIT_PASS if args.no_gate else code


def cmd_build(args) -> int:
    from .build import build
    from .parallel import available_cpus

    jobs = args.jobs or available_cpus()
    summary = build(Path(args.specs), Path(args.output), clean=args.clean, history=not args.no_history,
                    site_url=args.site_url, jobs=jobs)
    if args.timings:
        import json

        _write_out(args.timings, json.dumps({
            "seconds": round(summary.seconds, 4), "jobs": jobs,
            "stages": {k: round(v, 4) for k, v in summary.stages.items()},
            "specs": len(summary.evaluated), "pages": summary.pages, "figures": summary.figures,
            "pages_reused": summary.reused, "evaluations_reused": summary.recalled}, indent=2) + "\n")
    for w in summary.warnings:
        print(w.format(), file=sys.stderr)
    out = args.output.rstrip("/") + "/"
    n_spec = summary.pages - 1
    reused = f"; {summary.reused} unchanged pages reused" if summary.reused else ""
    print(f"Built {n_spec} spec pages and {summary.figures} diagrams into {out} in "
          f"{summary.seconds:.1f} s ({_verdict_line(summary)}{reused}); open {out}index.html")
    return summary.exit_code if args.gate else EXIT_PASS


def cmd_diff(args) -> int:
    from . import diff as D

    try:
        if args.git:
            rev_a, sep, rev_b = args.git.partition("..")
            if not sep or not rev_a or rev_b.startswith("."):
                raise _UsageError("--git: expected REV1..REV2 (or REV1.. for the working folder), "
                                  f"found {args.git!r}")
            if len(args.paths) > 1:
                raise _UsageError("with --git give at most one path: the specs folder")
            specs = args.paths[0] if args.paths else "specs"
            old, new = D.side(specs, rev_a), D.side(specs, rev_b or None)
            labels = (rev_a, rev_b or "working folder")
        else:
            if len(args.paths) != 2:
                raise _UsageError("expected two spec folders, OLD NEW (or --git REV1..REV2)")
            old, new = D.side(args.paths[0]), D.side(args.paths[1])
            labels = tuple(args.paths)
    except D.DiffError as e:
        raise _UsageError(str(e)) from None
    diffs = D.compare(old, new)
    report = D.markdown_report if args.format == "md" else D.text_report
    _write_out(args.output, report(diffs, *labels))
    print(f"Compared {len(old)} and {len(new)} specs: {D._counts(diffs)}", file=sys.stderr)
    return EXIT_PASS


def cmd_schema(args) -> int:
    from .docs import json_schema_text

    _write_out(args.output, json_schema_text())
    return EXIT_PASS


def cmd_serve(args) -> int:
    from .serve import serve

    return serve(Path(args.specs), Path(args.output), args.port, args.interval, history=not args.no_history)


def cmd_new(args) -> int:
    from .starter import write_starter

    return write_starter(Path(args.path), args.id)


GC_THRESHOLD = (50_000, 20, 100)


def _collect_less_often() -> None:
    """A build allocates millions of small dicts, tuples and lists (rows, points, nodes),
    few of them in cycles; at Python's default threshold (700) the cycle collector ran
    thousands of times and took a fifth of a build of the bench library (19.8 s -> 15.9 s
    serial, the same peak memory). Cycles are still collected, less often."""
    import gc

    if gc.get_threshold()[0] < GC_THRESHOLD[0]:
        gc.set_threshold(*GC_THRESHOLD)


def main(argv: list[str] | None = None) -> int:
    from .publish import PublishError, Terminated, terminate_as_exception
    from .spec.limits import LimitsError, limits
    from .spec.problems import InputError

    args = _parser().parse_args(argv)
    _collect_less_often()
    try:
        limits()  # a bad COLOURSPEC_MAX_* setting is a usage error, reported before any work
        with terminate_as_exception():
            return {"build": cmd_build, "check": cmd_check, "diff": cmd_diff, "new": cmd_new,
                    "schema": cmd_schema, "serve": cmd_serve}[args.command](args)
    except LimitsError as e:
        print(f"colourspec: {e}", file=sys.stderr)
        return EXIT_INPUT
    except Terminated:
        print("colourspec: terminated; nothing half-written was published", file=sys.stderr)
        return 128 + 15
    except InputError as e:
        _report_problems(e.problems)
        return EXIT_INPUT
    except _UsageError as e:
        print(f"colourspec: error: {e}", file=sys.stderr)
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
