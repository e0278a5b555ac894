"""The other charts: "why not the chart I had in mind?" (``Advice.why_not``) and a sheet of every
expressive design drawn small (``Advice.sheet``). Both read an Advice; why_not may ask the
pipeline (through the Advice's ``_advise``) the same question under another task when the kind
answers a different one."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from plotwise.engine.design import Design
from plotwise.engine.hazards import Hazard
from plotwise.engine.kinds import REGISTRY
from plotwise.errors import PlotwiseError

if TYPE_CHECKING:  # pragma: no cover
    from plotwise.advice import Advice

PART_NAMES = {"effectiveness": "effectiveness", "task_fit": "task fit", "data_fit": "data fit"}
SHEET_MAX = 12  # panels on one sheet; the rest are counted below it


@dataclass(repr=False)
class WhyNot:
    """The answer to "why not a <kind>?" for one Advice."""

    kind: str
    verdict: str  # one sentence
    details: list[str] = field(default_factory=list)  # rank, score parts, hazards, better choice
    design: Design | None = None  # the kind's best design for these data, when there is one
    rank: int | None = None  # its rank in the advice it was found in (1 = best)
    task: str | None = None  # the task it was ranked for
    better: Design | None = None  # the design plotwise recommends instead
    hazards: list[Hazard] = field(default_factory=list)
    _advice: Advice | None = field(default=None, repr=False, compare=False)

    @property
    def drawable(self) -> bool:
        return self.design is not None and self._advice is not None

    def text(self) -> str:
        return "\n".join([self.verdict] + [f"  - {d}" for d in self.details])

    def __str__(self) -> str:
        return self.text()

    def __repr__(self) -> str:
        return self.text()

    def _repr_mimebundle_(self, include=None, exclude=None):
        return {"text/plain": self.text(), "text/html": self._repr_html_()}

    def _repr_html_(self) -> str:
        import html

        items = "".join(f"<li>{html.escape(d)}</li>" for d in self.details)
        img = ""
        if self.drawable:
            import base64

            from plotwise.notebook.display import figure_png

            try:
                png = base64.b64encode(figure_png(self.draw())).decode("ascii")
                img = (f"<img alt='{html.escape(self.kind, quote=True)} of these data, not "
                       f"recommended' src='data:image/png;base64,{png}'/>")
            except PlotwiseError:
                img = ""
        return (f"<div class='pw-why'><p><b>{html.escape(self.verdict)}</b></p><ul>{items}</ul>"
                f"{img}</div>")

    def draw(self):
        """The kind drawn for these data, titled as not recommended (a Figure)."""
        if self.design is None or self._advice is None:
            raise PlotwiseError(f"there is no {self.kind} design of these data to draw: "
                                f"{self.verdict}")
        from plotwise.drawing.render import draw_row

        return draw_row([self.design], self._advice._frame(), ranks=[self.rank or 0],
                        prefix="not recommended · ")


def _parts(d: Design) -> str:
    return ", ".join(f"{PART_NAMES.get(k, k)} {v:.2f}" for k, v in d.parts.items())


def _in(advice: Advice, kind: str) -> tuple[int, Design] | None:
    for i, d in enumerate(advice.designs, 1):
        if d.kind == kind:
            return i, d
    return None


def _answer(advice: Advice, kind: str, rank: int, d: Design, note: str | None) -> WhyNot:
    best = advice.shown(1)[0]
    hazards = list(d.hazards) + [h for h in advice.hazards if kind in h.kinds and h not in
                                 d.hazards]
    details = [note] if note else []
    where = f"for {d.task}" + (f" of {', '.join(map(repr, d.columns))}" if d.columns else "")
    if not d.expressive:
        bad = [r.split(": ", 1)[-1] for r in d.reasons if r.startswith("not expressive")]
        verdict = (f"A {kind} cannot show these data truthfully: "
                   f"{bad[0] if bad else d.summary()}")
    elif rank == 1:
        verdict = f"A {kind} is already the top design {where} (score {d.score:.2f})."
    else:
        verdict = (f"A {kind} ranks {rank} of {len(advice.designs)} {where}, with "
                   f"{d.score:.2f} against {best.score:.2f} for the {best.title} at the top.")
    if d.parts and best.parts and d is not best:
        details.append(f"its score parts: {_parts(d)}; the {best.title}'s: {_parts(best)}.")
    details += [r for r in d.reasons[1:] if r.startswith(("data fit", "task fit", "effective"))]
    details += [f"hazard {h.code} ({h.severity}): {h.message}" for h in hazards]
    if d is not best:
        details.append(f"better: the {best.title} (rank 1) answers the same question — "
                       f"{best.summary()}")
    return WhyNot(kind, verdict, details, design=d, rank=rank, task=d.task, better=best,
                  hazards=hazards, _advice=advice)


def why_not(advice: Advice, kind: str) -> WhyNot:
    """Why plotwise did not recommend a ``kind`` for this advice's question."""
    if kind not in REGISTRY:
        raise PlotwiseError(f"unknown chart kind {kind!r}; plotwise knows: "
                            f"{', '.join(REGISTRY)}.")
    found = _in(advice, kind)
    refusals: list[str] = []
    if found:
        return _answer(advice, kind, *found, None)
    serves = [t for t, v in REGISTRY[kind].task_fit.items() if v > 0]
    asked = advice.task
    others = [t for t in serves if t != asked]
    advise = advice._advise  # plotwise.advise, handed over by the pipeline (no import cycle)
    if advice._df is not None and others and advise is not None:
        req = {k: advice.request.get(k) for k in ("x", "y", "hue", "agg")}
        top = advice.shown(1)[0]
        data = advice._input if advice._input is not None else advice._df
        for t in others:
            tries = [req]
            if t == "distribution" and top.y:  # the measure's own distribution, split by x
                tries.append({"x": top.y, "hue": top.x if top.x != top.y else None})
            hit = None
            for kw in tries:
                try:
                    other = advise(data, t, **kw)
                except PlotwiseError as exc:
                    refusals.append(f"asked as {t}: {exc}")
                    continue
                hit = _in(other, kind)
                if hit:
                    break
                kinds = ", ".join(dict.fromkeys(d.kind for d in other.designs))
                refusals.append(f"asked as {t}, these columns give {kinds} — not a {kind}.")
            if hit:
                rank, d = hit
                note = (f"a {kind} answers {t}, not {asked or 'the tasks ranked here'}; the "
                        f"answer below is for the question asked as {t}.")
                answer = _answer(other, kind, rank, d, note)
                answer.verdict = (f"A {kind} answers {t}, not {asked}: " if asked else
                                  f"A {kind} answers {t}: ") + answer.verdict[0].lower() + \
                    answer.verdict[1:]
                return answer
    fields = advice.profile.fields
    cols = ", ".join(f"{c!r} {fields[c].level}" if c in fields else repr(c)
                     for c in advice.shown(1)[0].columns)
    what = " or ".join(serves)
    why = refusals[0] if refusals else (
        f"its marks ({', '.join(REGISTRY[kind].channels)}) do not fit these columns")
    return WhyNot(kind, f"A {kind} cannot show these columns ({cols}): it answers {what}; "
                  f"{why}", details=refusals[1:],
                  better=advice.shown(1)[0], _advice=advice)


def sheet_designs(advice: Advice) -> tuple[list[Design], list[int], int]:
    """The designs of the sheet (expressive ones, best first, at most SHEET_MAX), their ranks
    and how many more there are."""
    ranked = [(i, d) for i, d in enumerate(advice.designs, 1) if d.expressive]
    shown = ranked[:SHEET_MAX]
    return [d for _, d in shown], [i for i, _ in shown], len(ranked) - len(shown)
