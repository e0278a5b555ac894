"""The widget panel around an Advice: switch task, pick columns, browse every ranked design,
set a histogram's bin count, copy a design's code. Figures are drawn to PNG bytes from
matplotlib Figure objects (never pyplot), so callbacks leave no figure open.

Where the frontend cannot show widgets (an exported page, a terminal), the panel's mimebundle
also carries the static HTML and PNG of the advice."""

from __future__ import annotations

import base64
from dataclasses import replace

import ipywidgets as widgets

from plotwise.advice import Advice
from plotwise.drawing.codegen import short
from plotwise.engine.memo import FrameMemo, using
from plotwise.engine.rules import TASKS
from plotwise.errors import PlotwiseError
from plotwise.notebook.display import advice_html, alt_text, figure_png, hazards_html, img_tag, surprises_html
from plotwise.pipeline import advise


def _escape(text) -> str:
    import html

    return html.escape(str(text), quote=True)


AUTO = "\x00auto"  # the value of "(auto)" and "any task": plotwise chooses


def _known(value, options) -> str:
    """The request's column as a control value (AUTO when left to plotwise or not listed)."""
    if value is None:
        return AUTO
    label = str(value)
    return label if any(v == label for _, v in options) else AUTO


def _chosen(control):
    """A control's value as advise() takes it (None for "(auto)" and "any task")."""
    return None if control.value == AUTO else control.value


class AdvicePanel(widgets.VBox):
    """An ipywidgets panel showing one Advice and letting the reader change it."""

    def __init__(self, advice: Advice, frame_name: str = "df", on_advice=None):
        """``on_advice(advice, png)`` is called with each new advice the controls produce (the
        magics keep a static copy of it in the notebook with it)."""
        self.advice = advice
        self._on_advice = on_advice
        self.frame_name = frame_name if frame_name.isidentifier() else "df"
        # Re-advise on what the caller gave (a file path stays a path, so the code opens it).
        self._frame = advice._input if advice._input is not None else advice._frame()
        self._busy = False
        # Advice and top figure per question already asked: going back to one is instant. The
        # frame is the same object for the panel's whole life, so the answers stay valid.
        self._cache: dict[tuple, tuple[Advice, bytes]] = {}
        self._details: dict[tuple, bytes] = {}  # detail images by question, design and bins
        # The frame's profile, converted columns and whole-frame findings, kept between
        # questions (valid while the frame keeps its identity, shape, columns and dtypes).
        self._memo = FrameMemo(self._frame)
        req = advice.request
        # ipywidgets reads a Dropdown value of None as "nothing selected" (a blank control), so
        # "(auto)" and "any task" carry a sentinel of their own.
        auto = [("(auto)", AUTO)]
        cols = auto + [(short(c, 30), c) for c in advice.fields]
        w = "190px"
        self.task = widgets.Dropdown(options=[("any task", AUTO)] + [(t, t) for t in TASKS],
                                     value=req.get("task") or AUTO, description="task",
                                     layout=widgets.Layout(width=w))
        self.x = widgets.Dropdown(options=cols, value=_known(req.get("x"), cols), description="x",
                                  layout=widgets.Layout(width=w))
        self.y = widgets.Dropdown(options=cols, value=_known(req.get("y"), cols), description="y",
                                  layout=widgets.Layout(width=w))
        self.hue = widgets.Dropdown(options=cols, value=_known(req.get("hue"), cols),
                                    description="hue",
                                    layout=widgets.Layout(width=w))
        self.message = widgets.HTML()
        # Images as HTML <img> elements: each carries alt text naming what it shows (widgets'
        # Image takes none, and a tooltip on it stops JupyterLab drawing the widget at all).
        self.top_image = widgets.HTML(layout=widgets.Layout(width="100%", max_width="1400px"))
        self.hazards = widgets.HTML()
        # Every control carries a label of its own (a <label> for assistive technology too).
        self.designs = widgets.Select(options=[], rows=12, description="design",
                                      style={"description_width": "initial"},
                                      layout=widgets.Layout(width="360px"))
        self.detail_image = widgets.HTML(layout=widgets.Layout(max_width="620px"))
        self.bins = widgets.IntSlider(value=20, min=3, max=120, description="bins",
                                      continuous_update=False,
                                      layout=widgets.Layout(width="360px", display="none"))
        self.reasons = widgets.HTML(layout=widgets.Layout(max_width="620px"))
        self.code = widgets.Textarea(description="code", style={"description_width": "initial"},
                                     layout=widgets.Layout(width="100%", height="220px"))
        for control in (self.task, self.x, self.y, self.hue):
            control.observe(self._on_question, names="value")
        # Stable class names for styling and for browser tests.
        for widget, name in ((self.task, "task"), (self.x, "x"), (self.y, "y"), (self.hue, "hue"),
                             (self.message, "message"), (self.top_image, "top-box"),
                             (self.hazards, "hazards"), (self.designs, "designs"),
                             (self.detail_image, "detail-box"), (self.bins, "bins"),
                             (self.reasons, "reasons"), (self.code, "code")):
            widget.add_class(f"pw-{name}")
        self.designs.observe(self._on_design, names="value")
        self.bins.observe(self._on_bins, names="value")
        header = widgets.HBox([self.task, self.x, self.y, self.hue])
        browse = widgets.HBox([
            widgets.VBox([widgets.HTML("<b>All designs, best first</b>"), self.designs, self.bins]),
            widgets.VBox([self.detail_image, self.reasons]),
        ])
        super().__init__(layout=widgets.Layout(max_width="1400px"), children=[
            header, self.message, self.top_image,
            widgets.HTML("<b>What could mislead</b>"), self.hazards,
            widgets.HTML("<b>Look closer</b>"), browse,
            widgets.HTML("<b>Code for the selected design</b> (copy into a cell)"), self.code,
        ])
        self.add_class("pw-panel")
        self._show_advice()

    # Updates -----------------------------------------------------------------------------
    def _key(self, a: Advice) -> tuple:
        r = a.request
        return tuple(str(r.get(k)) for k in ("task", "x", "y", "hue"))

    def _show_advice(self, png: bytes | None = None) -> None:
        a = self.advice
        self._top_png = png if png is not None else figure_png(a.show())
        self._cache[self._key(a)] = (a, self._top_png)
        if self._on_advice is not None:
            self._on_advice(a, self._top_png)
        self.top_image.value = img_tag(self._top_png, alt_text(a), "class='pw-top'",
                                       "max-width:100%;width:100%")
        self.hazards.value = hazards_html(a.hazards) + (
            "<b>Worth a second look</b>" + surprises_html(a.surprises) if a.surprises else "")
        self._busy = True
        try:
            self.designs.options = [
                (f"{i:>2}. {d.title} ({d.task}) {d.score:.2f}" + ("" if d.expressive else " ✗"), i - 1)
                for i, d in enumerate(a.designs, 1)]
            self.designs.value = 0
        finally:
            self._busy = False
        self._show_design(0)

    def _show_design(self, index: int, bins: int | None = None) -> None:
        d = self.advice.designs[index]
        if d.kind == "histogram":
            if bins is not None:
                d = replace(d, options=replace(d.options, bins=int(bins)))
            self.bins.layout.display = "flex"
        else:
            self.bins.layout.display = "none"
        self.selected = d
        try:
            key = self._key(self.advice) + (index, d.options.bins)
            if key not in self._details:
                self._details[key] = figure_png(self.advice.draw(d).figure)
            self.detail_image.value = img_tag(
                self._details[key], f"design {index + 1} of the ranked list: {d.summary()}",
                "class='pw-detail'", "max-width:620px;width:100%")
            self.message.value = ""
        except PlotwiseError as exc:
            self.message.value = f"<span style='color:var(--jp-error-color1,#B00020)'>{_escape(exc)}</span>"
        items = "".join(f"<li>{_escape(r)}</li>" for r in d.reasons)
        own = "".join(f"<li><b>{_escape(h.code)}</b>: {_escape(h.message)} <i>Fix:</i> "
                      f"{_escape(h.fix)}</li>" for h in d.hazards)
        self.reasons.value = (f"<b>{_escape(d.title)}</b> — score {d.score:.2f}<ul>{items}</ul>"
                              + (f"<b>Hazards of this design</b><ul>{own}</ul>" if own else ""))
        self.code.value = d.code(self.frame_name)

    def _on_question(self, change) -> None:
        if self._busy:
            return
        asked = {"task": _chosen(self.task), "x": _chosen(self.x), "y": _chosen(self.y),
                 "hue": _chosen(self.hue)}
        cached = self._cache.get(tuple(str(asked[k]) for k in ("task", "x", "y", "hue")))
        if cached is not None:  # asked before: no advising, no drawing
            self.advice = cached[0]
            self.message.value = ""
            self._show_advice(cached[1])
            return
        controls = (self.task, self.x, self.y, self.hue, self.designs, self.bins)
        for c in controls:
            c.disabled = True
        rows = self.advice.profile.rows
        self.message.value = (f"<span class='pw-status'>Advising on {rows:,} rows "
                              f"({_escape(self.advice.engine)}) and drawing the top designs…"
                              "</span>")
        try:
            kept = {k: self.advice.request.get(k) for k in ("agg", "value_range", "palette",
                                                             "cmap")}
            with using(self._memo, self._frame):
                self.advice = advise(self._frame, asked["task"], x=asked["x"], y=asked["y"],
                                     hue=asked["hue"], top=self.advice.top, **kept)
        except PlotwiseError as exc:
            shown = self.advice.request
            cols = ", ".join(f"{k} = {shown[k]}" for k in ("x", "y", "hue") if shown.get(k))
            self.message.value = (f"<span style='color:var(--jp-error-color1,#B00020)'>"
                                  f"{_escape(exc)}</span><br>"
                                  "<i>Still showing the previous advice "
                                  f"({_escape(self.advice.task or 'any task')}"
                                  f"{'; ' + _escape(cols) if cols else ''}).</i>")
            return
        finally:
            for c in controls:
                c.disabled = False
        self.message.value = ""
        self._show_advice()

    def _on_design(self, change) -> None:
        if self._busy or change["new"] is None:
            return
        self._show_design(change["new"])

    def _on_bins(self, change) -> None:
        if self._busy or self.selected.kind != "histogram":
            return
        self._show_design(self.designs.value, bins=change["new"])

    # Display -----------------------------------------------------------------------------
    def _repr_mimebundle_(self, **kwargs):
        bundle = super()._repr_mimebundle_(**kwargs) or {}
        bundle = dict(bundle)
        if self._on_advice is not None:  # a static copy sits beside the panel: no second one
            bundle["text/plain"] = ("plotwise panel (interactive); the advice it shows is kept "
                                    "as static output beside it.")
            return bundle
        bundle["text/html"] = advice_html(self.advice, png=self._top_png)
        bundle["image/png"] = base64.b64encode(self._top_png).decode("ascii")
        bundle["text/plain"] = self.advice.text()
        return bundle
