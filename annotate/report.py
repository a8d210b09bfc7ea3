"""The HTML report: one self-contained file (inline CSS, preview inlined as a data URI).

It shows a summary, the preview, and for every circuit the calculation step by
step with the source of every factor and check, so a qualified person can follow
and check it.  All text from the drawing, the schedule and the sizing is escaped
(``html.escape``).

References
----------
.. [1] RFC 2397, "The data URL scheme" (the inlined preview image).
.. [2] IEC 60364-4-43:2008, 433.1 (Ib <= In <= Iz, the order the steps follow).
"""

from __future__ import annotations

import base64
import html
import os
import re
from collections import Counter
from collections.abc import Iterable, Sequence
from pathlib import Path
from typing import Any

from .atomic import write_text_atomic
from .model import CircuitOutcome
from .report_trace import (
    ReportConfig,
    TraceTable,
    check_counts,
    circuit_trace,
    failures_first,
    report_date,
)
from .rows import LengthUnit, rows

__all__ = ["render_report_html", "write_report_html", "header_text"]

_CSS = """
body{font-family:system-ui,-apple-system,"Segoe UI",Roboto,Arial,sans-serif;margin:2em auto;
max-width:1100px;color:#1a1a1a;line-height:1.4;padding:0 1em}
h1{font-size:1.6em;margin-bottom:.2em}h2{margin-top:2em;border-bottom:2px solid #ccc}
h3{margin-bottom:.3em}
table{border-collapse:collapse;margin:.5em 0 1em 0;font-size:.92em}
th,td{border:1px solid #bbb;padding:.25em .6em;text-align:left;vertical-align:top}
th{background:#eef1f5}td.num{text-align:right;font-variant-numeric:tabular-nums}
.caution{border:2px solid #b00020;background:#fff4f4;padding:.8em 1em;margin:1em 0;
font-weight:600}
.status{display:inline-block;padding:.05em .6em;border-radius:.8em;font-size:.85em;
font-weight:600;color:#fff}
.ok{background:#2e7d32}.warning{background:#b26a00}.fail{background:#c62828}
.error{background:#6a1b9a}.status.not_checked{background:#fff3cd;color:#6d4c00;border:1px dashed #b26a00}
.circuit{border:1px solid #ddd;border-radius:6px;padding:.5em 1em;margin:1em 0}
.msgs li{color:#8a4b00}.preview img{max-width:100%;border:1px solid #ccc}
.muted{color:#666;font-size:.9em}ol.steps>li{margin:.35em 0}
table.trace{width:100%}table.trace caption{text-align:left;font-weight:600;padding:.2em 0}
.res{display:inline-block;padding:0 .4em;border-radius:.3em}
.res.pass{background:#e3f1e4;color:#1b5e20}.res.fail{background:#c62828;color:#fff;font-weight:700}
.res.not_checked{background:#fff3cd;color:#6d4c00;border:1px dashed #b26a00}
.res.not_applicable{background:#eee;color:#555}
.pagehead{color:#555;font-size:.85em;border-bottom:1px solid #ccc;padding-bottom:.2em}
@media print{.pagehead{display:none}}
"""


#: Finds a character ``html.escape`` would replace (``& < > " '``); most texts have none.
_NEEDS_ESCAPE = re.compile("[&<>\"']").search


def _e(value: Any) -> str:
    """``value`` as HTML text: ``html.escape(str(value), quote=True)``, "" for ``None``.

    A text with nothing to replace is returned as it is (what ``html.escape``
    returns for it), without its five replacements.
    """
    if value is None:
        return ""
    text = value if type(value) is str else str(value)
    return html.escape(text, quote=True) if _NEEDS_ESCAPE(text) else text


def _num(value: float | None, digits: int = 2, unit: str = "") -> str:
    if value is None:
        return "–"
    text = f"{float(value):.{digits}f}"
    return f"{text} {unit}".strip()


#: Words of a check's result in the report: a check not made never reads "ok".
_CHECK_RESULT_WORD = {"pass": "ok", "fail": "fail", "not_checked": "not checked",
                      "not_applicable": "not applicable"}


def _status(status: str) -> str:
    cls = status if status in ("ok", "warning", "fail", "error") else (
        "warning" if status.startswith("not ") else "error")
    return f'<span class="status {cls}">{_e(status)}</span>'


def _table(headers: Sequence[str], rows: Iterable[Sequence[str]], numeric: set[int] = set()) -> str:  # noqa: B006
    out = ["<table><thead><tr>"]
    out += [f"<th>{_e(h)}</th>" for h in headers]
    out.append("</tr></thead><tbody>")
    for row in rows:
        out.append("<tr>")
        for i, cell in enumerate(row):
            cls = ' class="num"' if i in numeric else ""
            out.append(f"<td{cls}>{cell}</td>")
        out.append("</tr>")
    out.append("</tbody></table>")
    return "".join(out)


def _trace_table(t: TraceTable) -> str:
    out = [f"<table class='trace'><caption>{_e(t.caption)}</caption><thead><tr>"]
    out += [f"<th>{_e(h)}</th>" for h in t.headers]
    out.append("</tr></thead><tbody>")
    results = t.results
    for i, row in enumerate(t.rows):
        result = results[i] if i < len(results) else ""
        cells = [f"<td>{_e(cell)}</td>" for cell in row]
        if result:
            res = _e(result)
            if len(cells) > 1:  # the result word marked by its outcome
                cells[1] = f"<td><span class='res {res}'>{_e(row[1])}</span></td>"
            out.append(f"<tr class='{res}'>" + "".join(cells) + "</tr>")
        else:
            out.append("<tr>" + "".join(cells) + "</tr>")
    out.append("</tbody></table>")
    return "".join(out)


def _circuit_section(o: CircuitOutcome, unit: LengthUnit | None = None) -> str:
    t = circuit_trace(o, unit)
    parts = [
        f'<section class="circuit" id="c-{_e(o.circuit_id)}">',
        f"<h3>{_e(t.title)} {_status(o.status)}"
        + (f" <span class='status not_checked'>{t.not_checked} not checked</span>" if t.not_checked else "")
        + "</h3>",
    ]
    if t.messages:
        parts.append('<ul class="msgs">' + "".join(f"<li>{_e(m)}</li>" for m in t.messages) + "</ul>")
    parts += [f"<p>{_e(line)}</p>" for line in t.lines]
    parts += [_trace_table(table) for table in t.tables]
    parts.append("</section>")
    return "".join(parts)


def _css_string(text: str) -> str:
    """``text`` as a CSS string literal (for the page header of the print style)."""
    out = "".join(ch if ch.isalnum() or ch in " .,:;-_/()+#" else f"\\{ord(ch):x} " for ch in text)
    return f'"{out}"'


def header_text(config: ReportConfig, drawing_name: str, tool_version: str = "") -> str:
    """The line at the head of every printed page: project, revision, date, drawing, tool."""
    parts = [f"Project: {config.project or drawing_name}",
             f"revision {config.revision or '-'}"]
    date = report_date(config)
    if date:
        parts.append(date)
    parts.append(f"drawing {drawing_name}")
    if tool_version:
        parts.append(f"cablewright {tool_version}")
    return " | ".join(parts)


def _print_css(header: str) -> str:
    # Printed as a submittal (CSS Paged Media Level 3, @page margin boxes): A4, the
    # project line on every page, "page n of N" below; each circuit starts a page and
    # its block and every table row are kept whole (CSS Fragmentation Level 3,
    # break-before: page, break-inside: avoid); 7.5 pt fits a circuit on one A4 page.
    return (
        "@page{size:A4;margin:16mm 12mm 16mm 12mm;"
        f"@top-left{{content:{_css_string(header)};font-size:8pt;color:#444}}"
        '@bottom-right{content:"page " counter(page) " of " counter(pages);font-size:8pt}}'
        "@media print{body{max-width:none;margin:0;padding:0;font-size:7.5pt;line-height:1.2}"
        ".circuit,tr,.caution,.summary{break-inside:avoid;page-break-inside:avoid}"
        ".circuit{break-before:page;page-break-before:always;border:0;padding:0;margin:0}"
        "table.trace{margin:.2em 0 .5em 0}th,td{padding:.1em .4em}h3{margin:.2em 0}"
        "h2,h3{break-after:avoid;page-break-after:avoid}thead{display:table-header-group}"
        ".preview{break-inside:avoid}.preview img{max-height:240mm}a{color:inherit;"
        "text-decoration:none}.screen-only{display:none}}"
    )


def render_report_html(
    outcomes: Sequence[CircuitOutcome],
    *,
    title: str,
    drawing_name: str,
    preview_png: bytes | None,
    cautions: str,
    extra_sections: Sequence[str] = (),
    drawing_facts: Sequence[tuple[str, str]] = (),
    config: ReportConfig | None = None,
    tool_version: str = "",
    unit: LengthUnit | None = None,
) -> str:
    """The report as one HTML string (see :func:`write_report_html`)."""
    config = config or ReportConfig()
    header = header_text(config, drawing_name, tool_version)
    counts = Counter(o.status for o in outcomes)
    checks = check_counts(outcomes)
    caution = f'<div class="caution">{_e(cautions)}</div>'
    out = [
        "<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>",
        f"<title>{_e(title)}</title><style>{_CSS}{_print_css(header)}</style></head><body>",
        f"<p class='pagehead'>{_e(header)}</p>",
        f"<h1>{_e(title)}</h1><p class='muted'>Drawing: {_e(drawing_name)}</p>",
        caution,
        "<h2>Summary</h2><div class='summary'>",
        _table(
            ("circuits", "ok", "warning", "fail", "error"),
            [
                (
                    str(len(outcomes)),
                    str(counts.get("ok", 0)),
                    str(counts.get("warning", 0)),
                    str(counts.get("fail", 0)),
                    str(counts.get("error", 0)),
                )
            ],
            {0, 1, 2, 3, 4},
        ),
        _table(
            ("checks made", "pass", "fail", "not checked", "not applicable"),
            [(str(checks["pass"] + checks["fail"]), str(checks["pass"]), str(checks["fail"]),
              str(checks["not_checked"]), str(checks["not_applicable"]))],
            {0, 1, 2, 3, 4},
        ),
        "</div>",
    ]
    bad = failures_first(outcomes)
    if bad:
        out.append("<h3>Circuits to look at first</h3>")
        out.append(_table(("circuit", "status", "reason"),
                          [(f"<a href='#c-{_e(c)}'>{_e(c)}</a>", _status(st), _e(why))
                           for c, st, why in bad]))
    out += list(_facts_table(drawing_facts))
    if preview_png:
        data = base64.b64encode(preview_png).decode("ascii")
        out.append(
            "<h2>Drawing</h2><div class='preview'>"
            f"<img alt='annotated drawing {_e(drawing_name)}' src='data:image/png;base64,{data}'></div>"
        )
    table = rows(outcomes, unit)
    unit = table[0].unit if table else unit
    listed = [
        (
            f"<a href='#c-{_e(r.circuit_id)}'>{_e(r.circuit_id)}</a>",
            _e(r.from_tag),
            _e(r.to_tag),
            _e(r.cable.text if r.cable is not None else "–"),
            _num(r.device_rating_a, 0, "A"),
            r.unit.text(r.routed_length_m, 1, missing="–"),
            _status(r.status),
        )
        for r in table
    ]
    out.append("<h2>Schedule</h2>")
    out.append(
        _table(
            ("circuit", "from", "to", "cable", "device", "routed length", "status"), listed, {4, 5}
        )
    )
    out += list(extra_sections)  # changes, quantities, fill (annotate/report_sections.py)
    out.append("<h2>Circuits, step by step</h2>")
    out.append("<p class='muted'>Each circuit: the load as given, Ib and its formula, the device, "
               "every correction factor with its table and row, the capacity table and its "
               "tabulated value, Iz, and every check with its value, limit and clause. "
               "A check that could not be made reads \"not checked\" with the reason; it is not a pass.</p>")
    out += [_circuit_section(o, unit) for o in outcomes]
    out.append(caution)
    out.append("</body></html>")
    return "\n".join(out)


def _facts_table(facts: Sequence[tuple[str, str]]) -> list[str]:
    """The drawing's units, extents and scale check as a two-column table (none when empty)."""
    if not facts:
        return []
    rows = "".join(f"<tr><th>{_e(k)}</th><td>{_e(v)}</td></tr>" for k, v in facts)
    return ["<h2>Drawing as read</h2>", f"<table>{rows}</table>"]


def write_report_html(
    path: str | os.PathLike[str],
    outcomes: Sequence[CircuitOutcome],
    *,
    title: str,
    drawing_name: str,
    preview_png: bytes | None,
    cautions: str,
    extra_sections: Sequence[str] = (),
    drawing_facts: Sequence[tuple[str, str]] = (),
    config: ReportConfig | None = None,
    tool_version: str = "",
    unit: LengthUnit | None = None,
) -> Path:
    """Write the HTML report, atomically.

    Parameters
    ----------
    path : path-like
        The ``.html`` file to write.
    outcomes : sequence of CircuitOutcome
        Every circuit, in schedule order.
    title : str
        Heading of the report.
    drawing_name : str
        Name of the drawing, shown under the title.
    preview_png : bytes or None
        PNG of the annotated drawing (see :func:`.preview.render_preview_png`),
        inlined as a data URI; ``None`` for no picture.
    cautions : str
        Shown in a box at the top and at the bottom.
    extra_sections : sequence of str
        HTML sections placed after the schedule (see :mod:`.report_sections`).
    drawing_facts : sequence of (name, text)
        How the drawing was read (units and where they came from, extents,
        scale check), shown under the title.
    config : ReportConfig, optional
        Project, revision and date of the page header (``[annotate]`` keys).
    tool_version : str
        Our version, in the page header.
    unit : LengthUnit, optional
        Unit of the lengths (:func:`.rows.length_unit`); ``None``: the rule set's.

    Returns
    -------
    pathlib.Path
    """
    text = render_report_html(
        outcomes, title=title, drawing_name=drawing_name, preview_png=preview_png, cautions=cautions,
        extra_sections=extra_sections,
        drawing_facts=drawing_facts, config=config, tool_version=tool_version, unit=unit,
    )
    return write_text_atomic(path, text, encoding="utf-8")
