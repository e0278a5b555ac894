"""The notebook front: ``%load_ext plotwise`` registers the ``%plotwise`` line magic and the
``%%plotwise`` cell magic. A thin layer: it finds the DataFrame, calls ``advise`` and displays
the result (a widget panel where widgets work, the static advice otherwise)."""

from __future__ import annotations

import ast
import base64
from typing import NoReturn

import pandas as pd
from IPython.core.error import UsageError
from IPython.core.magic import Magics, cell_magic, line_magic, magics_class
from IPython.core.magic_arguments import argument, magic_arguments, parse_argstring

from plotwise.advice import Advice
from plotwise.engine.rules import TASKS
from plotwise.errors import PlotwiseError
from plotwise.pipeline import advise

_LAST: dict = {"advice": None, "name": "df", "panel": None}


def last() -> Advice | None:
    """The advice from the most recent ``%plotwise``/``%%plotwise`` in this session (or None)."""
    return _LAST["advice"]


def _remember(advice: Advice, name: str) -> None:
    _LAST["advice"] = advice
    _LAST["name"] = name


def refuse(message: str) -> NoReturn:
    """Bad use of a magic: a UsageError, which IPython shows as one line (no traceback) and
    which stops "Run All" at this cell instead of carrying on with stale advice."""
    raise UsageError(f"plotwise: {message}")


def is_frame(v) -> bool:
    """A pandas DataFrame or data held by an engine plotwise reads (Polars, PyArrow, DuckDB,
    Dask, Spark)."""
    from plotwise.sources.base import is_engine_data

    return isinstance(v, pd.DataFrame) or is_engine_data(v)


def frames_in(ns: dict) -> list[tuple[str, object]]:
    return [(k, v) for k, v in ns.items() if not k.startswith("_") and is_frame(v)]


def _size(v) -> str:
    if isinstance(v, pd.DataFrame):
        return f"{v.shape[0]}×{v.shape[1]}"
    return f"{type(v).__module__.split('.')[0]} {type(v).__name__}"


def frame_listing(ns: dict) -> str:
    frames = frames_in(ns)
    if not frames:
        return "there are no DataFrames in the namespace."
    return "DataFrames in the namespace: " + ", ".join(
        f"{k} ({_size(v)})" for k, v in frames[:20])


def name_of(frame: pd.DataFrame, ns: dict, default: str = "df") -> str:
    for k, v in ns.items():
        if v is frame and k.isidentifier() and not k.startswith("_"):
            return k
    return default


def run_body(shell, body: str):
    """Run the cell body in the user's namespace like a normal cell; return the value of its
    last expression (or None). Raises what the body raises."""
    code = shell.transform_cell(body)
    tree = ast.parse(code)
    if not tree.body:
        return None
    last_expr = None
    if isinstance(tree.body[-1], ast.Expr):
        last_expr = ast.Expression(tree.body.pop().value)
    ns = shell.user_ns
    if tree.body:
        exec(compile(tree, "<plotwise cell>", "exec"), ns)  # noqa: S102
    if last_expr is not None:
        return eval(compile(last_expr, "<plotwise cell>", "eval"), ns)  # noqa: S307
    return None


def recent_displayed_frame(shell) -> tuple[str | None, pd.DataFrame | None]:
    out = shell.user_ns.get("Out", {}) or {}
    for key in sorted(out, reverse=True):
        if isinstance(out[key], pd.DataFrame):
            frame = out[key]
            return name_of(frame, shell.user_ns, f"Out[{key}]"), frame
    return None, None


def split_positionals(words: list[str]) -> tuple[str | None, list[str]]:
    """(task, rest): the first word is a task when it names one."""
    if words and words[0].lower() in TASKS:
        return words[0].lower(), words[1:]
    return None, words


def advice_options(func):
    """The options both magics take (applied innermost first, as IPython expects)."""
    for decorator in reversed([
        argument("--x", help="column for the categories, time or first variable"),
        argument("--y", help="column for the measure or second variable"),
        argument("--hue", help="column that splits the data into coloured groups"),
        argument("--top", type=int, default=3, help="how many designs to draw side by side"),
        argument("--agg", help="how rows combine per category: sum, mean, median or count"),
        argument("--palette", help="your colours for groups, comma-separated (names or hex "
                 "codes), e.g. --palette '#0072B2,#E69F00'"),
        argument("--cmap", help="your colormap for lightness encodings, e.g. --cmap viridis"),
        argument("--value-range", dest="value_range", help="the value axis you plan, LOW,HIGH "
                 "(checked, e.g. for a truncated baseline), e.g. --value-range 0,120"),
        argument("--static", action="store_true", help="static display, no widget panel"),
        argument("--quiet", action="store_true", help="no status line while large or engine "
                 "data are advised"),
    ]):
        func = decorator(func)
    return func


LARGE_ROWS = 1_000_000  # frames from this size on get a status line while advised


def slow_to_advise(frame) -> bool:
    return not isinstance(frame, pd.DataFrame) or len(frame) >= LARGE_ROWS


def extra_options(args) -> dict:
    """--agg, --palette, --cmap and --value-range as advise() takes them."""
    out: dict = {}
    if args.palette:
        # (IPython's argument splitting keeps quotes: '#0072B2,#E69F00' arrives quoted)
        text = args.palette.strip().strip("'\"")
        out["palette"] = [c.strip().strip("'\"") for c in text.split(",") if c.strip()]
    if args.cmap:
        out["cmap"] = args.cmap.strip().strip("'\"")
    if args.agg:
        out["agg"] = args.agg.strip().strip("'\"")
    if args.value_range:
        parts = args.value_range.strip().strip("'\"").split(",")
        try:
            low, high = (float(p) for p in parts)
        except ValueError:
            refuse(f"--value-range takes LOW,HIGH (two numbers), not {args.value_range!r}; "
                   "e.g. --value-range 0,120")
        out["value_range"] = (low, high)
    return out


@magics_class
class PlotwiseMagics(Magics):
    """Chart advice on the active DataFrame."""

    def _show(self, advice: Advice, name: str, use_panel: bool) -> None:
        from IPython.display import display

        _remember(advice, name)
        if use_panel:
            try:
                from plotwise.notebook.panel import AdvicePanel
            except ImportError:  # no ipywidgets: the static display serves
                AdvicePanel = None
            if AdvicePanel is not None:
                # The advice is ordinary display data (saved with the notebook, read by
                # nbconvert and viewers); the panel's controls update it in place.
                from plotwise.notebook.display import companion_bundle

                handle = {}

                def keep(a: Advice, png: bytes) -> None:
                    _remember(a, name)
                    bundle = companion_bundle(a, png)
                    if "h" in handle:
                        handle["h"].update(bundle, raw=True)

                panel = AdvicePanel(advice, frame_name=name, on_advice=keep)
                _LAST["panel"] = panel
                handle["h"] = display(companion_bundle(advice, panel._top_png), raw=True,
                                      display_id=True)
                display(panel)
                return
        display(advice)

    def _advise(self, frame, args, task, name) -> None:
        from IPython.display import display

        status = None
        if not args.quiet and slow_to_advise(frame):
            # engine data or a large frame: say what is being computed while it runs
            what = (f"{len(frame):,} rows" if isinstance(frame, pd.DataFrame)
                    else f"the {type(frame).__name__} {name!r}" if not isinstance(frame, str)
                    else repr(frame))
            status = display({"text/plain": f"plotwise: advising on {what}…"}, raw=True,
                             display_id=True)
        try:
            advice = advise(frame, task, x=args.x, y=args.y, hue=args.hue, top=args.top,
                            **extra_options(args))
        except PlotwiseError as exc:
            refuse(str(exc))
        finally:
            if status is not None:
                status.update({"text/plain": ""}, raw=True)
        self._show(advice, name, not args.static)

    @magic_arguments("plotwise")
    @argument("words", nargs="*", help="TASK (compare, trend, proportion, correlate, "
              "distribution; optional) then DF_NAME; or 'code N' to put design N's code in the "
              "next cell; 'why KIND' to ask why a kind was not recommended; 'sheet' to draw "
              "every expressive design small")
    @advice_options
    @line_magic("plotwise")
    def plotwise_line(self, line: str = ""):
        """Advise on a DataFrame by name: %plotwise [TASK] DF_NAME [--x COL] [--y COL]
        [--hue COL] [--top N] [--agg HOW] [--palette C1,C2,...] [--cmap NAME]
        [--value-range LOW,HIGH] [--static]. %plotwise code N puts the code of design N (1 = best)
        from the last advice into the next cell; %plotwise why KIND answers why the last advice
        did not recommend KIND; %plotwise sheet draws every expressive design of it small."""
        args = parse_argstring(self.plotwise_line, line)
        words = list(args.words)
        # 'code', 'why' and 'sheet' are sub-commands, unless the line names only a DataFrame
        # called so (a frame named `code` can still be advised on)
        lone_frame = len(words) == 1 and is_frame(self.shell.user_ns.get(words[0]))
        if words and words[0] == "code" and not lone_frame:
            return self._code(words[1:])
        if words and words[0] in ("why", "sheet") and not lone_frame:
            return self._alternatives(words[0], words[1:])
        task, rest = split_positionals(words)
        ns = self.shell.user_ns
        if len(rest) == 2 and task is None:
            refuse(f"unknown task {rest[0]!r}; use one of: {', '.join(TASKS)} (or leave it out).")
            return None
        if len(rest) != 1:
            raise UsageError("name one DataFrame: %plotwise [TASK] DF_NAME [options]; "
                             + frame_listing(ns))
        name = rest[0]
        frame = ns.get(name)
        if frame is None and name.lower().endswith((".parquet", ".pq", ".csv", ".tsv", ".csv.gz")):
            frame = name  # a file path: DuckDB scans it
        if frame is None:
            refuse(f"no variable named {name!r}; " + frame_listing(ns))
            return None
        if not (is_frame(frame) or isinstance(frame, str)):
            refuse(f"{name!r} is a {type(frame).__name__}, not a DataFrame; "
                      + frame_listing(ns))
            return None
        self._advise(frame, args, task, name if name.isidentifier() else "df")
        return None

    @magic_arguments("%plotwise")
    @argument("words", nargs="*", help="TASK (optional) and, optionally, the DataFrame's name")
    @advice_options
    @cell_magic("plotwise")
    def plotwise_cell(self, line: str, cell: str):
        """Run the cell, then advise on the DataFrame its last expression returns:
        %%plotwise [TASK] [DF_NAME] [--x COL] [--y COL] [--hue COL] [--top N] [--static].
        When the cell returns no DataFrame, the one named on the magic line is used, then the
        most recently displayed one.
        %%plotwise audit: run a plotting cell, show each figure it drew and audit it below."""
        args = parse_argstring(self.plotwise_cell, line)
        if args.words and args.words[0] == "audit":
            return self._audit_cell(cell)
        task, rest = split_positionals(list(args.words))
        if len(rest) > 1:
            raise UsageError("at most one DataFrame name after the task: %%plotwise [TASK] [DF_NAME]")
        ns = self.shell.user_ns
        try:
            value = run_body(self.shell, cell)
        except Exception:  # the user's own code failed: show it as a normal cell would
            self.shell.showtraceback()
            return None
        frame, name = None, "df"
        if is_frame(value):
            frame, name = value, name_of(value, ns)
        elif isinstance(value, (tuple, list)) and sum(is_frame(v) for v in value) > 1:
            refuse("the cell returns several DataFrames; return one, or name it on the magic "
                      "line. " + frame_listing(ns))
            return None
        elif rest:
            frame = ns.get(rest[0])
            name = rest[0]
            if not is_frame(frame):
                what = "not a DataFrame in the namespace" if rest[0] in ns else (
                    f"neither a task ({', '.join(TASKS)}) nor a variable")
                refuse(f"{rest[0]!r} is {what}; " + frame_listing(ns))
                return None
        else:
            name, frame = recent_displayed_frame(self.shell)
            if frame is None:
                refuse("the cell returned no DataFrame and none was displayed before; end the "
                          "cell with the DataFrame, or name it: %%plotwise TASK DF_NAME. "
                          + frame_listing(ns))
                return None
        self._advise(frame, args, task, name)
        return None

    def _audit_cell(self, cell: str):
        import matplotlib.pyplot as plt
        from IPython.display import display
        from matplotlib.axes import Axes
        from matplotlib.figure import Figure

        from plotwise.figure_audit.figure import audit, recover_frame

        before = set(plt.get_fignums())
        try:
            value = run_body(self.shell, cell)
        except Exception:
            self.shell.showtraceback()
            return None
        figures = [plt.figure(n) for n in plt.get_fignums() if n not in before]
        if isinstance(value, Axes):
            value = value.figure
        if isinstance(value, Figure) and value not in figures:
            figures.append(value)
        if not figures:
            refuse("the cell drew no matplotlib figure; nothing to audit.")
            return None
        try:
            for fig in figures:
                display(fig)
                report = audit(fig)
                display(report)
                for ax in fig.get_axes():
                    found = recover_frame(ax)
                    if found is None or not report.hazards:
                        continue
                    frame, task = found
                    try:
                        display(advise(frame, task))
                    except PlotwiseError:
                        pass
                    break
        finally:
            for fig in figures:  # shown above; closing keeps the inline backend from repeating them
                plt.close(fig)
        return None

    def _alternatives(self, what: str, words: list[str]):
        from IPython.display import display

        from plotwise.engine.kinds import REGISTRY

        advice = last()
        if advice is None:
            refuse("no advice yet in this session; run %plotwise or %%plotwise first.")
            return None
        if what == "sheet":
            if words:
                raise UsageError("usage: %plotwise sheet (draws the last advice's designs)")
            from plotwise.notebook.display import figure_png

            kinds = ", ".join(dict.fromkeys(d.kind for d in advice.designs if d.expressive))
            png = base64.b64encode(figure_png(advice.sheet())).decode("ascii")
            display({"image/png": png,
                     "text/plain": f"<sheet of the expressive designs: {kinds}>"}, raw=True)
            return None
        if len(words) != 1:
            raise UsageError("usage: %plotwise why KIND, e.g. %plotwise why pie; kinds: "
                             + ", ".join(REGISTRY))
        try:
            display(advice.why_not(words[0]))
        except PlotwiseError as exc:
            refuse(str(exc))
        return None

    def _code(self, words: list[str]):
        advice = last()
        if advice is None:
            refuse("no advice yet in this session; run %plotwise or %%plotwise first.")
            return None
        if len(words) != 1 or not words[0].isdigit():
            raise UsageError("usage: %plotwise code N (N = rank of the design, 1 = best)")
        n = int(words[0])
        if not 1 <= n <= len(advice.designs):
            refuse(f"no design {n}; the last advice ranks designs 1..{len(advice.designs)}.")
            return None
        code = advice.designs[n - 1].code(_LAST["name"] if _LAST["name"].isidentifier() else "df")
        self.shell.set_next_input(code, replace=False)
        return None


def load_ipython_extension(ipython) -> None:
    ipython.register_magics(PlotwiseMagics)


def unload_ipython_extension(ipython) -> None:
    mm = ipython.magics_manager
    for kind in ("line", "cell"):
        mm.magics[kind].pop("plotwise", None)
