"""Command line.

``plotwise audit script.py`` runs a plotting script with a non-interactive backend and audits
every figure it creates. Exit 0: no severe hazard; 1: a severe hazard was found; 2: the script
could not be run.

``plotwise advise data.parquet --task compare --x region --y revenue --out advice.html`` advises
on a Parquet or CSV file, scanned lazily by DuckDB, and writes a self-contained HTML page.
Exit 0: page written; 2: the file, a column or an option could not be used."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path


class ScriptTimeout(BaseException):
    """The audited script ran longer than --timeout seconds."""


def run_script(path: Path, timeout: float = 0) -> list:
    """Run ``path`` as __main__ with the Agg backend and plt.show() a no-op; return its figures.
    A ``timeout`` (seconds, > 0) stops a script that does not end (ScriptTimeout)."""
    import runpy
    import signal

    import matplotlib

    matplotlib.use("Agg", force=True)
    import matplotlib.pyplot as plt

    def stop(signum, frame):
        raise ScriptTimeout

    before = set(plt.get_fignums())
    show = plt.show
    plt.show = lambda *a, **k: None
    old_argv = sys.argv
    sys.argv = [str(path)]
    timed = timeout > 0 and hasattr(signal, "setitimer")
    if timed:
        old_handler = signal.signal(signal.SIGALRM, stop)
        signal.setitimer(signal.ITIMER_REAL, timeout)
    try:
        runpy.run_path(str(path), run_name="__main__")
    finally:
        if timed:
            signal.setitimer(signal.ITIMER_REAL, 0)
            signal.signal(signal.SIGALRM, old_handler)
        plt.show = show
        sys.argv = old_argv
    return [plt.figure(n) for n in plt.get_fignums() if n not in before]


def cmd_audit(args) -> int:
    from plotwise.figure_audit.figure import audit

    path = Path(args.script)
    if not path.is_file():
        print(f"plotwise: no such script: {path}", file=sys.stderr)
        return 2
    try:
        figures = run_script(path, args.timeout)
    except SystemExit as exc:
        print(f"plotwise: {path} called sys.exit({exc.code!r}) before its figures could be audited",
              file=sys.stderr)
        return 2
    except ScriptTimeout:
        print(f"plotwise: {path} was still running after {args.timeout:g} s and was stopped; "
              "raise --timeout if it needs longer", file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        print(f"plotwise: {path} was interrupted before its figures could be audited",
              file=sys.stderr)
        return 2
    except BaseException as exc:  # noqa: BLE001 - the user's script failed: say so briefly
        print(f"plotwise: {path} raised {type(exc).__name__}: {exc}", file=sys.stderr)
        return 2
    if not figures:
        print(f"plotwise: {path} created no matplotlib figures; nothing to audit.")
        return 0
    worst = 0
    for i, fig in enumerate(figures, 1):
        report = audit(fig)
        print(f"figure {i}: " + report.text().replace("plotwise audit: ", "").replace("plotwise audit:", ""))
        if report.worst == "severe":
            worst = 1
    return worst


def cmd_advise(args) -> int:
    from plotwise.errors import PlotwiseError
    from plotwise.notebook.display import SAVE_FORMATS, save_advice
    from plotwise.pipeline import advise

    out = Path(args.out)
    if out.suffix.lower() not in SAVE_FORMATS:  # say so before a long scan, not after
        print(f"plotwise: --out {out}: name the file with one of: {', '.join(SAVE_FORMATS)}",
              file=sys.stderr)
        return 2
    if not args.quiet:
        print(f"plotwise: advising on {args.file} (DuckDB scans it)…", file=sys.stderr,
              flush=True)
    try:
        a = advise(args.file, args.task, x=args.x, y=args.y, hue=args.hue, agg=args.agg,
                   top=args.top)
        out.parent.mkdir(parents=True, exist_ok=True)
        save_advice(a, out, why=tuple(args.why or ()), sheet=args.sheet,
                    title=f"plotwise advice for {Path(args.file).name}")
    except PlotwiseError as exc:
        print(f"plotwise: {exc}", file=sys.stderr)
        return 2
    except OSError as exc:
        print(f"plotwise: cannot write {out}: {exc.strerror or exc}", file=sys.stderr)
        return 2
    best = ", ".join(d.title for d in a.shown())
    print(f"plotwise: wrote {out} ({a.engine}, {a.profile.rows:,} rows; top: {best}; "
          f"{len(a.hazards)} hazards, {len(a.surprises)} surprises)")
    return 0


def main(argv=None) -> int:
    from plotwise import __version__

    parser = argparse.ArgumentParser(prog="plotwise", description="Chart advice and chart audits.")
    parser.add_argument("--version", action="version", version=f"plotwise {__version__}")
    sub = parser.add_subparsers(dest="command", required=True)
    p = sub.add_parser("audit", help="run a plotting script and audit every figure it creates; "
                                     "exit 1 when a severe hazard is found")
    p.add_argument("script", help="path to a Python script that draws with matplotlib/seaborn/pandas")
    p.add_argument("--timeout", type=float, default=300,
                   help="stop the script after this many seconds and exit 2 (default 300; 0: "
                        "no limit)")
    p.set_defaults(func=cmd_audit)
    from plotwise.engine.kinds import REGISTRY
    from plotwise.engine.rules import TASKS

    p = sub.add_parser("advise", help="advise on a Parquet or CSV file (scanned by DuckDB) and "
                                      "write a self-contained HTML page")
    p.add_argument("file", help="path to a .parquet/.pq or .csv/.tsv/.csv.gz file")
    p.add_argument("--task", choices=TASKS, default=None,
                   help="what the chart is for (left out: ranked across all tasks)")
    p.add_argument("--x", help="column on the first axis (inferred when left out)")
    p.add_argument("--y", help="the measure column (inferred when left out)")
    p.add_argument("--hue", help="column shown by colour")
    p.add_argument("--agg", choices=("sum", "mean", "median", "count"),
                   help="how rows are combined per category")
    p.add_argument("--top", type=int, default=3, help="designs drawn side by side (default 3)")
    p.add_argument("--out", default="advice.html",
                   help="the file to write, by its suffix: .html (a self-contained page, the "
                        "default advice.html), or .png, .svg, .pdf (the top designs)")
    p.add_argument("--why", action="append", metavar="KIND", choices=list(REGISTRY),
                   help="also answer why a KIND was not recommended (repeatable)")
    p.add_argument("--quiet", action="store_true", help="no status line on stderr")
    p.add_argument("--sheet", action="store_true",
                   help="also draw every expressive design small, best first")
    p.set_defaults(func=cmd_advise)
    args = parser.parse_args(argv)
    return args.func(args)


if __name__ == "__main__":  # pragma: no cover
    raise SystemExit(main())
