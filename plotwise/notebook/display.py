"""Text and HTML forms of an Advice, and the notebook mimebundle. Every user-supplied string
passes through html.escape before it reaches HTML."""

from __future__ import annotations

import base64
import html
import io
from typing import TYPE_CHECKING

from plotwise.drawing.codegen import short

if TYPE_CHECKING:  # pragma: no cover
    from plotwise.advice import Advice

SEVERITY_MARK = {"severe": "!!", "warn": "! ", "info": "i "}
SEVERITY_COLOUR = {"severe": "#B00020", "warn": "#8A5A00", "info": "#35618F"}


DISPLAY_SCALE = 2  # PNGs for display carry twice the pixels and are shown at their logical size


def figure_png(fig, scale: int = 1) -> bytes:
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=100 * scale)
    return buf.getvalue()


def logical_size(fig) -> tuple[int, int]:
    """The figure's size in CSS pixels at 100 dpi (what a 2× PNG is displayed at)."""
    w, h = fig.get_size_inches()
    return round(w * 100), round(h * 100)


def alt_text(advice: Advice) -> str:
    """What the top image shows, for readers who cannot see it."""
    shown = "; ".join(f"{i}. {d.summary()}" for i, d in enumerate(advice.shown(), 1))
    return f"plotwise's top designs side by side: {shown}"


def img_tag(png: bytes, alt: str, attrs: str = "", style: str = "") -> str:
    """A PNG inline as an <img> element with alt text (every plotwise image in HTML);
    ``attrs``: attributes before the alt text (class, width), ``style``: an inline style."""
    b64 = base64.b64encode(png).decode("ascii")
    before = f" {attrs}" if attrs else ""
    styled = f" style='{style}'" if style else ""
    return f"<img{before} alt='{_e(alt)}'{styled} src='data:image/png;base64,{b64}'/>"


def advice_text(advice: Advice, limit: int | None = None) -> str:
    lines = [f"plotwise advice — task: {advice.task or 'any'} — {advice.profile.rows} rows, "
             f"{len(advice.profile.fields)} columns"]
    for n in advice.notes:
        lines.append(f"  chosen: {n}")
    if advice.headline:
        lines.append(f"  in one sentence: {advice.headline}")
    lines.append("")
    lines.append("Ranked designs:")
    for i, d in enumerate(advice.designs[:limit] if limit else advice.designs, 1):
        mark = "  " if d.expressive else " x"
        lines.append(f" {mark}{i:>2}. {d.title:<34} {d.task:<12} {d.score:.2f}  {short(d.summary(), 90)}")
    for i, d in enumerate(advice.shown(), 1):
        lines.append("")
        lines.append(f"Why #{i} {d.title}:")
        lines += [f"   - {short(r, 300)}" for r in d.reasons[1:]]
    lines.append("")
    if advice.hazards:
        lines.append("Hazards:")
        for h in advice.hazards:
            lines.append(f" {SEVERITY_MARK[h.severity]} {h.code} ({h.severity}): {h.message}")
            lines.append(f"      fix: {h.fix}")
    else:
        lines.append("Hazards: none found.")
    if advice.surprises:
        lines.append("")
        lines.append("Worth a second look (surprises in the data):")
        for x in advice.surprises:
            lines.append(f" {SEVERITY_MARK[x.severity]} {x.code}: {x.message}")
            lines.append(f"      check: {x.check}")
    return "\n".join(lines)


def _e(text) -> str:
    return html.escape(str(text), quote=True)


STYLE = """
<style>
.pw-advice{font-family:system-ui,-apple-system,Segoe UI,sans-serif;font-size:13px;max-width:1400px}
.pw-advice table{border-collapse:collapse;margin:6px 0}
.pw-advice th,.pw-advice td{border-bottom:1px solid var(--jp-border-color2,#e3e3e3);padding:3px 8px;
  text-align:left !important;vertical-align:top}
.pw-advice th{background:var(--jp-layout-color2,#f5f5f5);color:var(--jp-ui-font-color1,#1a1a1a)}
.pw-advice .pw-x{font-style:italic}
.pw-advice img{max-width:100%;height:auto}
.pw-advice h4{margin:12px 0 4px 0}
.pw-advice ul{margin:2px 0 6px 0}
</style>
"""


# Colours come from JupyterLab's theme variables (light fallbacks for exported pages), so the text
# keeps its contrast in Light and Dark themes; severity is a coloured stripe beside words in the
# text colour, never coloured text.
CELL = ("style='text-align:left;vertical-align:top;padding:3px 8px;"
        "border-bottom:1px solid var(--jp-border-color2,#e3e3e3)'")


def findings_html(items, kind: str, last: str, empty: str, headers: tuple[str, ...]) -> str:
    """Hazards or surprises as a table (inline styles, so it reads the same inside any
    frontend): severity, code, message and ``last`` (the fix, or what to check)."""
    if not items:
        return f"<p class='pw-none'>{empty}</p>"
    rows = "".join(
        f"<tr class='pw-{kind}' data-code='{_e(x.code)}'>"
        f"<td {CELL}><b style='border-left:4px solid {SEVERITY_COLOUR[x.severity]};"
        f"padding-left:5px'>{_e(x.severity)}</b></td>"
        f"<td {CELL}><code>{_e(x.code)}</code></td><td {CELL}>{_e(x.message)}</td>"
        f"<td {CELL}>{_e(getattr(x, last))}</td></tr>"
        for x in items)
    head = "".join(f"<th {CELL}>{t}</th>" for t in headers)
    return f"<table style='border-collapse:collapse'><tr>{head}</tr>{rows}</table>"


def hazards_html(hazards) -> str:
    return findings_html(hazards, "hazard", "fix", "No hazards found.",
                         ("severity", "code", "what could mislead", "fix"))


def surprises_html(surprises) -> str:
    """What in the data deserves a second look."""
    return findings_html(surprises, "surprise", "check", "Nothing unexpected found.",
                         ("severity", "code", "what was found", "what to check"))


def profile_html(advice: Advice) -> str:
    rows = "".join(
        f"<tr><td>{_e(short(f.label, 60))}</td><td>{_e(f.level)}</td><td>{f.distinct}</td>"
        f"<td>{f.missing}</td><td>{_e('; '.join(f.evidence))}</td></tr>"
        for f in advice.fields.values())
    return ("<table><tr><th>column</th><th>level</th><th>distinct</th><th>missing</th>"
            f"<th>evidence</th></tr>{rows}</table>")


def advice_html(advice: Advice, image: bool = True, profile: bool = False, png: bytes | None = None,
                size: tuple[int, int] | None = None) -> str:
    parts = [STYLE, "<div class='pw-advice'>",
             f"<h4>plotwise advice — task: {_e(advice.task or 'any')} "
             f"({advice.profile.rows} rows, {len(advice.profile.fields)} columns)</h4>"]
    if advice.notes:
        parts.append("<p>Notes: " + "; ".join(_e(n) for n in advice.notes) + "</p>")
    if advice.headline:
        parts.append(f"<p class='pw-headline'><b>In one sentence:</b> {_e(advice.headline)}</p>")
    if image:
        if png is None:
            fig = advice.show()
            png, size = figure_png(fig, DISPLAY_SCALE), logical_size(fig)
        parts.append(img_tag(png, alt_text(advice), f"width='{size[0]}'" if size else ""))
    parts.append("<h4>Hazards</h4>" + hazards_html(advice.hazards))
    if advice.surprises:
        parts.append("<h4>Worth a second look</h4>" + surprises_html(advice.surprises))
    parts.append("<h4>Why the top designs rank where they do</h4>")
    for i, d in enumerate(advice.shown(), 1):
        items = "".join(f"<li>{_e(r)}</li>" for r in d.reasons[1:])
        parts.append(f"<p><b>{i}. {_e(d.title)}</b> — {_e(d.summary())}</p><ul>{items}</ul>")
    rows = "".join(
        f"<tr class='{'' if d.expressive else 'pw-x'}'><td>{i}</td><td>{_e(d.title)}</td>"
        f"<td>{_e(d.task)}</td><td>{d.score:.2f}</td><td>{_e(d.summary())}</td></tr>"
        for i, d in enumerate(advice.designs, 1))
    parts.append("<h4>All candidate designs</h4><table><tr><th>rank</th><th>kind</th><th>task</th>"
                 f"<th>score</th><th>reason</th></tr>{rows}</table>")
    if profile:
        parts.append("<h4>Columns</h4>" + profile_html(advice))
    parts.append("<p style='color:var(--jp-content-font-color2,#555);font-size:11px'>"
                 "plotwise's advice is heuristic; charts "
                 "behind medical, safety or financial decisions deserve review by someone "
                 "accountable for them.</p></div>")
    return "".join(parts)


def advice_bundle(advice: Advice, include=None, exclude=None) -> tuple[dict, dict]:
    """The display data (and metadata) for the types the front end asks for: a terminal that
    wants text only gets no figure drawn at all."""
    wanted = {"text/plain", "text/html", "image/png"}
    if include:
        wanted &= set(include)
    if exclude:
        wanted -= set(exclude)
    data: dict = {}
    meta: dict = {}
    if wanted & {"text/html", "image/png"}:
        fig = advice.show()
        png, size = figure_png(fig, DISPLAY_SCALE), logical_size(fig)
        if "text/html" in wanted:
            data["text/html"] = advice_html(advice, png=png, size=size)
        if "image/png" in wanted:
            data["image/png"] = base64.b64encode(png).decode("ascii")
            meta["image/png"] = {"width": size[0], "height": size[1]}
    if "text/plain" in wanted:
        data["text/plain"] = advice_text(advice, limit=10)
    return data, meta


# A static copy of the advice shown beside the live panel, so that a saved notebook keeps what the
# controls last produced. While the panel lives it hides the copy (no duplicate); when the panel
# cannot render (reopened without a kernel) the copy shows and the failed widget's output in the
# same cell is hidden. Where <style> is stripped (untrusted notebooks) both simply show.
COMPANION_STYLE = (
    "<style>"
    ".jp-OutputArea:has(.pw-panel) .pw-static,.output_area:has(.pw-panel) .pw-static,"
    ".jp-Cell-outputArea:has(.pw-panel) .pw-static{display:none}"
    ".jp-OutputArea:has(.pw-static) .jp-OutputArea-output"
    "[data-mime-type='application/vnd.jupyter.widget-view+json']:not(:has(.pw-panel))"
    "{display:none}"
    "</style>")


def companion_bundle(advice: Advice, png: bytes, size: tuple[int, int] | None = None) -> dict:
    """The static copy's display data: the whole advice as HTML (image inline) and as text."""
    return {"text/html": COMPANION_STYLE + "<div class='pw-static'>"
                         + advice_html(advice, png=png, size=size) + "</div>",
            "image/png": base64.b64encode(png).decode("ascii"),
            "text/plain": advice_text(advice, limit=10)}


SAVE_FORMATS = (".png", ".svg", ".pdf", ".html", ".htm")


def save_advice(advice: Advice, path, why: tuple[str, ...] = (), sheet: bool = False,
                title: str | None = None) -> None:
    """Write the advice by the file's suffix: the top designs as PNG (2×), SVG or PDF, or the
    whole advice as a self-contained HTML page."""
    from pathlib import Path

    from plotwise.errors import PlotwiseError

    out = Path(path)
    suffix = out.suffix.lower()
    if suffix not in SAVE_FORMATS:
        raise PlotwiseError(f"cannot save as {suffix or 'a file without a suffix'!r}; name the "
                            f"file with one of: {', '.join(SAVE_FORMATS)}.")
    if suffix in (".html", ".htm"):
        title = title or f"plotwise advice: {advice.task or 'any task'}"
        out.write_text(page_html(advice, title, why, sheet), encoding="utf-8")
        return
    fig = advice.show()
    if suffix == ".png":
        out.write_bytes(figure_png(fig, DISPLAY_SCALE))
    else:
        fig.savefig(out, format=suffix[1:])


def alternatives_html(advice: Advice, why: tuple[str, ...] = (), sheet: bool = False) -> str:
    """'Why not' answers for the kinds in ``why``, and the sheet of every expressive design."""
    parts = []
    for kind in why:
        parts.append(f"<h4>Why not a {_e(kind)}?</h4>" + advice.why_not(kind)._repr_html_())
    if sheet:
        kinds = ", ".join(dict.fromkeys(d.kind for d in advice.designs if d.expressive))
        parts.append("<h4>Every design worth a look</h4>" + img_tag(
            figure_png(advice.sheet()), "sheet of the expressive designs: " + kinds))
    return "".join(parts)


def page_html(advice: Advice, title: str, why: tuple[str, ...] = (), sheet: bool = False) -> str:
    """A self-contained HTML page (figures inline as PNG, no scripts, no links out): the advice,
    the column profile, the code of each shown design, and the 'why not' answers and the sheet
    when asked for. Readable offline."""
    code = "".join(
        f"<details><summary>Code for {i}. {_e(d.title)}</summary><pre>{_e(d.code())}</pre></details>"
        for i, d in enumerate(advice.shown(), 1))
    return ("<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>"
            f"<title>{_e(title)}</title><meta name='viewport' content='width=device-width'>"
            "<style>body{font-family:system-ui,sans-serif;margin:24px;max-width:1400px}"
            "img{max-width:100%;height:auto}pre{background:#f6f6f6;padding:8px;overflow-x:auto;"
            "font-size:12px}</style></head><body>"
            f"<h2>{_e(title)}</h2>" + advice_html(advice, image=True, profile=True) + code
            + alternatives_html(advice, why, sheet) + "</body></html>\n")
