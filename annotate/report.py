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
from collections import Counter
from collections.abc import Iterable, Sequence
from pathlib import Path
from typing import Any

from .atomic import write_text_atomic
from .model import CircuitOutcome

__all__ = ["render_report_html", "write_report_html"]

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
.error{background:#6a1b9a}
.circuit{border:1px solid #ddd;border-radius:6px;padding:.5em 1em;margin:1em 0}
.msgs li{color:#8a4b00}.preview img{max-width:100%;border:1px solid #ccc}
.muted{color:#666;font-size:.9em}ol.steps>li{margin:.35em 0}
"""


def _e(value: Any) -> str:
    return html.escape("" if value is None else str(value), quote=True)


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


def _circuit_section(o: CircuitOutcome) -> str:
    parts = [
        f'<section class="circuit" id="c-{_e(o.circuit_id)}">',
        f"<h3>{_e(o.circuit_id)}: {_e(o.from_tag)} → {_e(o.to_tag)} {_status(o.status)}</h3>",
    ]
    if o.messages:
        parts.append(
            '<ul class="msgs">' + "".join(f"<li>{_e(m)}</li>" for m in o.messages) + "</ul>"
        )
    route = o.route
    if route is not None:
        segs = ", ".join(getattr(route, "segment_ids", ()) or ()) or "–"
        parts.append(
            "<p>Route: routed length "
            f"<b>{_num(getattr(route, 'routed_length_m', None), 1, 'm')}</b> "
            f"(tails {_num(getattr(route, 'source_tail_m', None), 1, 'm')} + "
            f"{_num(getattr(route, 'load_tail_m', None), 1, 'm')}), design length "
            f"<b>{_num(getattr(route, 'design_length_m', None), 1, 'm')}</b>; "
            f"segments {_e(segs)}.</p>"
        )
    group = o.group
    if group is not None:
        parts.append(
            f"<p>Grouping: {_e(getattr(group, 'circuits_in_group', '–'))} circuits, "
            f"{_e(getattr(group, 'cables_in_group', '–'))} cables on the most crowded segment.</p>"
        )
    s = o.sizing
    if s is None:
        parts.append("<p class='muted'>Not sized.</p></section>")
        return "".join(parts)
    steps = ['<ol class="steps">']
    steps.append(f"<li>Design current I<sub>b</sub> = <b>{_num(s.load_current_a, 1, 'A')}</b></li>")
    kind = f" ({_e(s.device_kind)})" if s.device_kind else ""
    steps.append(
        f"<li>Protective device rating I<sub>n</sub> = <b>{_num(s.device_rating_a, 0, 'A')}</b>{kind}</li>"
    )
    steps.append(
        f"<li>Installation method <b>{_e(s.method or '–')}</b>"
        + (f", governing segment {_e(s.governing_segment)}" if s.governing_segment else "")
        + (f", {s.cables_in_group} cables in the group" if s.cables_in_group else "")
        + "</li>"
    )
    if s.factors:
        rows = [(_e(f.name), _num(f.value, 3), _e(f.source), _e(f.detail)) for f in s.factors]
        steps.append(
            "<li>Correction factors:"
            + _table(("factor", "value", "source", "read at"), rows, {1})
            + f"Overall correction factor k = <b>{_num(s.correction_factor, 3)}</b></li>"
        )
    else:
        steps.append(
            f"<li>Overall correction factor k = <b>{_num(s.correction_factor, 3)}</b></li>"
        )
    steps.append(
        "<li>Required tabulated capacity I<sub>n</sub> / k = "
        f"<b>{_num(s.required_capacity_a, 1, 'A')}</b></li>"
    )
    if s.cable is not None:
        c = s.cable
        steps.append(
            f"<li>Chosen cable <b>{_e(c.describe())}</b>: corrected capacity I<sub>z</sub> = "
            f"<b>{_num(c.capacity_a, 1, 'A')}</b> (all {c.parallel} in parallel), "
            f"size set by <b>{_e(c.governed_by)}</b></li>"
        )
    else:
        steps.append("<li>No cable chosen.</li>")
    vd = s.voltage_drop
    if vd is not None:
        vd_sources = sorted(
            {ch.source for ch in s.checks if "drop" in ch.name.lower() and ch.source}
        )
        src = f" (source: {_e('; '.join(vd_sources))})" if vd_sources else ""
        steps.append(
            f"<li>Voltage drop at I<sub>b</sub> over the design length: <b>{_num(vd.volts, 2, 'V')}</b> = "
            f"<b>{_num(vd.percent, 2, '%')}</b>, limit {_num(vd.limit_percent, 2, '%')}; "
            f"{_num(vd.mv_per_a_m, 3, 'mV/A/m')}; simplified formula "
            f"{_num(vd.annex_g_percent, 2, '%')}{src}</li>"
        )
    steps.append("</ol>")
    parts += steps
    if s.checks:
        rows = [
            (
                _e(ch.name),
                _status(_CHECK_RESULT_WORD.get(ch.result.value, ch.result.value)),
                _num(ch.value, 3),
                _num(ch.limit, 3),
                _e(ch.unit),
                _e(ch.source),
                _e(ch.message),
            )
            for ch in s.checks
        ]
        parts.append("<h4>Checks</h4>")
        parts.append(
            _table(("check", "result", "value", "limit", "unit", "source", "note"), rows, {2, 3})
        )
    parts.append("</section>")
    return "".join(parts)


def render_report_html(
    outcomes: Sequence[CircuitOutcome],
    *,
    title: str,
    drawing_name: str,
    preview_png: bytes | None,
    cautions: str,
    extra_sections: Sequence[str] = (),
    drawing_facts: Sequence[tuple[str, str]] = (),
) -> str:
    """The report as one HTML string (see :func:`write_report_html`)."""
    counts = Counter(o.status for o in outcomes)
    caution = f'<div class="caution">{_e(cautions)}</div>'
    out = [
        "<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'>",
        f"<title>{_e(title)}</title><style>{_CSS}</style></head><body>",
        f"<h1>{_e(title)}</h1><p class='muted'>Drawing: {_e(drawing_name)}</p>",
        caution,
        *_facts_table(drawing_facts),
        "<h2>Summary</h2>",
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
    ]
    if preview_png:
        data = base64.b64encode(preview_png).decode("ascii")
        out.append(
            "<h2>Drawing</h2><div class='preview'>"
            f"<img alt='annotated drawing {_e(drawing_name)}' src='data:image/png;base64,{data}'></div>"
        )
    rows = []
    for o in outcomes:
        s = o.sizing
        cable = s.cable.describe() if s is not None and s.cable is not None else "–"
        length = getattr(o.route, "routed_length_m", None) if o.route is not None else None
        rows.append(
            (
                f"<a href='#c-{_e(o.circuit_id)}'>{_e(o.circuit_id)}</a>",
                _e(o.from_tag),
                _e(o.to_tag),
                _e(cable),
                _num(s.device_rating_a, 0, "A") if s is not None else "–",
                _num(length, 1, "m"),
                _status(o.status),
            )
        )
    out.append("<h2>Schedule</h2>")
    out.append(
        _table(
            ("circuit", "from", "to", "cable", "device", "routed length", "status"), rows, {4, 5}
        )
    )
    out += list(extra_sections)  # changes, quantities, fill (annotate/report_sections.py)
    out.append("<h2>Circuits, step by step</h2>")
    out += [_circuit_section(o) for o in outcomes]
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

    Returns
    -------
    pathlib.Path
    """
    text = render_report_html(
        outcomes, title=title, drawing_name=drawing_name, preview_png=preview_png, cautions=cautions,
        extra_sections=extra_sections,
        drawing_facts=drawing_facts,
    )
    return write_text_atomic(path, text, encoding="utf-8")
