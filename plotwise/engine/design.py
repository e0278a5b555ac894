"""The records that pass between the engine's stages: ``Roles`` (which column plays which part),
``Design`` (one candidate chart) and ``DesignOptions`` (its variant and drawing plan)."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from plotwise.engine.kinds import REGISTRY, kind
from plotwise.engine.vocab import STATS, TASKS, checked
from plotwise.errors import PlotwiseError

if TYPE_CHECKING:  # pragma: no cover
    from plotwise.engine.hazards import Hazard
    from plotwise.engine.profile import Profile


@dataclass
class DesignOptions:
    """How a design is drawn beyond its kind and encoding. The first group is set when the
    candidate is made; the rest by the pipeline's plan for this data (sampling, bins, colours)."""

    # The variant -------------------------------------------------------------------------------
    share: bool = False  # values drawn as % of their total
    non_aligned: bool = False  # stacked segments on shifting baselines (read less accurately)
    time_as_categories: bool = False  # time points drawn as evenly spaced categories
    matrix: list[str] = field(default_factory=list)  # columns of a correlation matrix
    binned: bool = False  # a 2-D histogram of two numeric variables
    # The plan ----------------------------------------------------------------------------------
    palette: list[str] | None = None  # the caller's colours for groups
    cmap: str | None = None  # the caller's colormap (its name) for lightness
    log_columns: list[str] = field(default_factory=list)  # columns drawn on a log axis
    bins: str | int | None = None  # histogram bin rule ("fd", "sturges") or a bin count
    break_gaps: bool = False  # a line breaks at gaps in time instead of joining across
    sample: tuple[int, int] | None = None  # (above, k): draw a seeded sample of k rows above
    prebin: bool = False  # count into bins with numpy before drawing (large data)
    note: str | None = None  # what the panel shows, said on the panel
    complete_rows: int = 0  # engine data: rows complete in the used columns
    edges: tuple[float, float, int, bool] | None = None  # engine bins: (low, width, k, log)
    engine_sample: int | None = None  # engine data: about this many rows come back


# Set by plotwise.drawing when it is imported: writes a design's code (the engine never imports
# drawing; this is the one door from a Design to its code).
CODE_WRITERS: list[Callable[[Design, str], str]] = []


@dataclass
class Design:
    """One candidate chart: a kind, its encoding and statistic, and (after scoring) its score."""

    kind: str  # a name in plotwise.engine.kinds.KINDS
    task: str  # a Task
    encoding: dict[str, str]  # visual channel -> column label (or a derived quantity)
    roles: dict[str, str]  # measure / category / hue / facet -> column label
    x: str | None = None  # column on the category/time/first axis
    y: str | None = None  # the measure (or second variable for correlate)
    hue: str | None = None
    facet: str | None = None
    stat: str = "raw"  # a Stat
    zero_based: bool = False
    log_scale: bool = False
    horizontal: bool = False
    options: DesignOptions = field(default_factory=DesignOptions)
    score: float = 0.0
    reasons: list[str] = field(default_factory=list)
    expressive: bool = True
    hazards: list[Hazard] = field(default_factory=list)
    parts: dict[str, float] = field(default_factory=dict)  # effectiveness / task_fit / data_fit
    profile: Profile | None = field(default=None, repr=False, compare=False)

    def __post_init__(self) -> None:
        record = kind(self.kind)
        checked(self.task, TASKS, "task")
        checked(self.stat, STATS, "statistic")
        allowed = set(record.channels) | ({"facet"} if record.facets else set())
        extra = set(self.encoding) - allowed
        if extra:
            raise PlotwiseError(f"a {self.kind} design cannot use the channel(s) {sorted(extra)}.")

    @property
    def record(self):
        return REGISTRY[self.kind]

    @property
    def title(self) -> str:
        name = self.kind
        if self.facet is not None:
            name += f" · small multiples by {self.facet}"
        return name

    @property
    def columns(self) -> list[str]:
        cols = list(self.options.matrix)
        for c in (self.x, self.y, self.hue, self.facet):
            if c is not None and c not in cols:
                cols.append(c)
        return cols

    def summary(self) -> str:
        return self.reasons[0] if self.reasons else self.kind

    def code(self, name: str = "df") -> str:
        """A short runnable pandas + seaborn + matplotlib snippet that redraws this design from
        the DataFrame variable ``name`` (written by plotwise.drawing)."""
        if not CODE_WRITERS:
            raise PlotwiseError("code generation lives in plotwise.drawing; import plotwise first.")
        return CODE_WRITERS[0](self, name)

    def __repr__(self) -> str:
        return f"Design({self.title!r}, task={self.task!r}, score={self.score:.2f})"


@dataclass
class Roles:
    """Columns chosen for a task, and the words explaining any that were inferred."""

    x: str | None = None
    y: str | None = None
    hue: str | None = None
    period: str | None = None  # a column with exactly two time points, for slope designs
    matrix: list[str] = field(default_factory=list)  # numeric columns for a correlation matrix
    notes: list[str] = field(default_factory=list)
