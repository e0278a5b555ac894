"""The result of ``plotwise.advise()``: an ``Advice`` holds the profile, the ranked designs and
the hazards, and can draw its top designs and display itself. The stages run in
plotwise.pipeline."""

from __future__ import annotations

from dataclasses import dataclass, field

import pandas as pd

from plotwise.engine.design import Design
from plotwise.engine.hazards import Hazard
from plotwise.engine.profile import FieldProfile, Profile
from plotwise.engine.surprises import Surprise
from plotwise.errors import PlotwiseError


@dataclass
class Advice:
    """What plotwise recommends for one frame and task."""

    task: str | None
    profile: Profile
    designs: list[Design]
    hazards: list[Hazard]
    notes: list[str] = field(default_factory=list)
    top: int = 3
    request: dict = field(default_factory=dict)  # the arguments advise() was called with
    headline: str | None = None  # one sentence, when a single number says it better than a chart
    surprises: list[Surprise] = field(default_factory=list)  # what deserves a second look
    _df: object | None = field(default=None, repr=False, compare=False)  # pandas or engine data
    _input: object | None = field(default=None, repr=False, compare=False)  # what advise() got
    _advise: object | None = field(default=None, repr=False, compare=False)  # plotwise.advise

    @property
    def fields(self) -> dict[str, FieldProfile]:
        return self.profile.fields

    @property
    def best(self) -> Design:
        return self.designs[0]

    def design(self, kind: str, task: str | None = None) -> Design:
        """The best-ranked design of ``kind`` (and ``task``)."""
        for d in self.designs:
            if d.kind == kind and (task is None or d.task == task):
                return d
        kinds = ", ".join(dict.fromkeys(d.kind for d in self.designs))
        raise PlotwiseError(f"no {kind!r} design in this advice; it has: {kinds}.")

    def shown(self, top: int | None = None) -> list[Design]:
        """The designs drawn side by side: the best ``top`` that state nothing false (a design
        that fails the expressiveness test is listed, never drawn as a recommendation, unless
        nothing else exists)."""
        good = [d for d in self.designs if d.expressive]
        return (good or self.designs[:1])[: (top or self.top)]

    def show(self, top: int | None = None):
        """A matplotlib Figure with the top designs side by side (not shown through pyplot)."""
        from plotwise.drawing.render import draw_row

        return draw_row(self.shown(top), self._frame(), surprises=self.surprises)

    def draw(self, which: int | str | Design = 0, ax=None):
        """Draw one design (index, kind or Design) on ``ax``; a new Figure when ax is None."""
        from plotwise.drawing.render import (
            PANEL_HEIGHT_IN,
            PANEL_WIDTH_IN,
            LiteralFigure,
            draw,
            plot_style,
        )

        d = self._pick(which)
        if ax is None:
            with plot_style():
                fig = LiteralFigure(figsize=(PANEL_WIDTH_IN * 1.3, PANEL_HEIGHT_IN),
                                    layout="constrained")
                ax = fig.subplots()
        draw(d, self._frame(), ax)
        return ax

    def why_not(self, kind: str):
        """Why plotwise did not recommend a ``kind`` here: whether it can show these columns,
        its rank and score parts beside the top design's, its hazards, the better choice. The
        answer's ``draw()`` draws it, titled as not recommended, whenever a design of that kind
        exists for these data."""
        from plotwise.alternatives import why_not

        return why_not(self, kind)

    def sheet(self):
        """Every expressive design as a small panel in one Figure, best first (at most 12; the
        rest are counted below)."""
        from plotwise.alternatives import sheet_designs
        from plotwise.drawing.render import draw_sheet

        designs, ranks, more = sheet_designs(self)
        return draw_sheet(designs, self._frame(), ranks, more)

    def code(self, which: int | str | Design = 0, name: str = "df") -> str:
        return self._pick(which).code(name)

    def table(self) -> pd.DataFrame:
        """All candidate designs, ranked: rank, kind, task, score, the one-line reason."""
        return pd.DataFrame({
            "rank": range(1, len(self.designs) + 1),
            "kind": [d.title for d in self.designs],
            "task": [d.task for d in self.designs],
            "score": [round(d.score, 2) for d in self.designs],
            "reason": [d.summary() for d in self.designs],
        })

    def hazard_codes(self) -> list[str]:
        return [h.code for h in self.hazards]

    def surprise_codes(self) -> list[str]:
        return [s.code for s in self.surprises]

    def _pick(self, which) -> Design:
        if isinstance(which, Design):
            return which
        if isinstance(which, str):
            return self.design(which)
        try:
            return self.designs[which]
        except (IndexError, TypeError):
            raise PlotwiseError(
                f"no design {which!r}; pick 0..{len(self.designs) - 1} or a kind name."
            ) from None

    def _frame(self):
        """What the drawing code reads as ``df``: the caller's frame, or the engine's data."""
        if self._df is None:
            raise PlotwiseError("this advice holds no data to draw.")
        src = self.profile.source
        return src.native if src is not None else self._df

    @property
    def engine(self) -> str:
        """Which engine computed the advice: 'pandas', or the engine holding the data."""
        src = self.profile.source
        return "pandas" if src is None else src.engine_name

    # Display ---------------------------------------------------------------------------------
    def text(self) -> str:
        from plotwise.notebook.display import advice_text

        return advice_text(self)

    def html(self, image: bool = True, profile: bool = False, why: tuple[str, ...] = (),
             sheet: bool = False) -> str:
        """The advice as HTML; ``why`` adds 'why not' answers for those kinds, ``sheet`` the
        sheet of every expressive design."""
        from plotwise.notebook.display import advice_html, alternatives_html

        return advice_html(self, image=image, profile=profile) + alternatives_html(self, why,
                                                                                   sheet)

    def __str__(self) -> str:
        return self.text()

    def __repr__(self) -> str:
        kinds = ", ".join(d.title for d in self.shown())
        return (f"<Advice task={self.task!r}: {len(self.designs)} designs (top: {kinds}); "
                f"{len(self.hazards)} hazards>")

    def _repr_mimebundle_(self, include=None, exclude=None):
        from plotwise.notebook.display import advice_bundle

        return advice_bundle(self, include, exclude)

    def _repr_html_(self) -> str:
        return self.html()

    def save(self, path, why: tuple[str, ...] = (), sheet: bool = False) -> None:
        """Write the advice by the file's suffix: .png (2× pixels), .svg or .pdf hold the top
        designs side by side; .html a self-contained page (with ``why`` answers and the
        ``sheet`` when asked for)."""
        from plotwise.notebook.display import save_advice

        save_advice(self, path, why, sheet)
