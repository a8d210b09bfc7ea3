"""``report.pdf``: the report as a submittal, drawn with fpdf2 (no browser).

The same rows as ``report.html`` (:mod:`.report_trace`): a summary with the
failures first, the schedule, then every circuit from the load as given to the
chosen cable.  Every page carries a header (project, revision, date, drawing,
tool version) and "page n of N" at its foot.  A circuit's block is kept on one
page: when it does not fit in what is left of the page, it starts a new one; a
block taller than a whole page breaks between table rows, never inside a row.

The file is written atomically (:mod:`.atomic`); its creation date is
``SOURCE_DATE_EPOCH`` when set, else a fixed date, so re-runs are identical.

References
----------
.. [1] ISO 32000-1:2008, PDF 1.7 (the file format fpdf2 writes).
.. [2] fpdf2 documentation: ``FPDF.header``/``footer``, ``alias_nb_pages``,
   ``multi_cell(dry_run=True, output="LINES")``, ``add_font``.
"""

from __future__ import annotations

import os
from collections import Counter
from collections.abc import Sequence
from datetime import datetime, timezone
from functools import lru_cache
from pathlib import Path
from typing import NamedTuple

from .atomic import atomic_path
from .model import CircuitOutcome
from .pdf_ink import Ink, InkLook, InkRow, number_pages
from .pdf_lines import CellLines
from .report_trace import (
    CircuitTrace,
    ReportConfig,
    TraceTable,
    check_counts,
    circuit_trace,
    failures_first,
)
from .rows import LengthUnit, rows

__all__ = ["render_report_pdf", "write_report_pdf", "FONT_FAMILY"]

FONT_FAMILY = "DejaVu"
#: Body text size [pt]; 7 pt still reads on A4 and keeps a circuit's block on one page.
BODY_PT = 7.0
#: Line height of body text [mm] (1.2 x the 7 pt text = 2.47 mm, common practice; 3.1 mm
#: left the sample's longest circuit block, with its drop-from-origin check, over a page).
LINE_MM = 3.0
#: Padding inside a table cell [mm].
PAD_MM = 0.5
#: Fill colours of check outcomes (RGB).
RESULT_FILL = {"pass": (227, 241, 228), "fail": (198, 40, 40), "not_checked": (255, 243, 205),
               "not_applicable": (235, 235, 235)}
#: Grid, header-row fill and text colours of the tables (RGB).
GRID_RGB, HEAD_FILL_RGB, BLACK, WHITE = (170, 170, 170), (238, 241, 245), (0, 0, 0), (255, 255, 255)
#: The page header: size [pt], cell height [mm], text and rule colours (RGB).
HEADER_PT, HEADER_MM, HEADER_RGB, HEADER_RULE_RGB = 7, 4, (80, 80, 80), (180, 180, 180)
#: The footer: its text, size [pt], its cell's top above the page foot and its height [mm].
FOOTER, FOOTER_PT, FOOTER_FROM_FOOT_MM, FOOTER_MM = "page {n} of {total}", 7, 11, 4
#: Column widths as shares of the text width, by the number of columns.
COLUMN_SHARES = {
    3: (0.26, 0.20, 0.54),
    4: (0.15, 0.36, 0.37, 0.12),
    5: (0.2, 0.2, 0.2, 0.2, 0.2),
    6: (0.15, 0.19, 0.07, 0.07, 0.04, 0.48),  # the check column holds "protective_conductor" whole
    7: (0.12, 0.12, 0.12, 0.26, 0.1, 0.14, 0.14),
}


def _font_paths() -> tuple[str, str]:
    """DejaVu Sans (regular, bold): the copy shipped with matplotlib, a dependency of ours."""
    import matplotlib

    base = Path(matplotlib.get_data_path()) / "fonts" / "ttf"
    return str(base / "DejaVuSans.ttf"), str(base / "DejaVuSans-Bold.ttf")


def _creation_date() -> datetime:
    epoch = os.environ.get("SOURCE_DATE_EPOCH", "").strip()
    seconds = int(epoch) if epoch.isdigit() else 0
    return datetime.fromtimestamp(seconds, tz=timezone.utc)


def _make_pdf(header: str):
    from fpdf import FPDF

    class _Report(FPDF):
        def header(self) -> None:  # noqa: D401 - fpdf2 hook
            ink = _ink(self)
            ink.font(FONT_FAMILY, "", HEADER_PT)
            ink.text_color(HEADER_RGB)
            ink.cell_line(HEADER_MM, header)
            ink.draw_color(HEADER_RULE_RGB)
            ink.line(self.l_margin, self.get_y(), self.w - self.r_margin, self.get_y())
            ink.flush()
            self.ln(2)
            ink.text_color(BLACK)

    pdf = _Report(orientation="P", unit="mm", format="A4")
    pdf.alias_nb_pages("")  # no alias: "page n of N" is written once N is known (_number_pages)
    regular, bold = _font_paths()
    pdf.add_font(FONT_FAMILY, "", regular)
    pdf.add_font(FONT_FAMILY, "B", bold)
    pdf.set_margins(12, 12, 12)
    pdf.set_auto_page_break(True, margin=14)
    pdf.set_creation_date(_creation_date())
    pdf.set_title("Cable sizing report")
    pdf.set_creator("cablewright")
    return pdf


#: Column shares of the "load as given" table (6 or 7 columns: no cos φ, η for kVA and A).
LOAD_SHARES = {7: (0.12, 0.13, 0.17, 0.1, 0.16, 0.16, 0.16), 5: (0.2, 0.2, 0.2, 0.2, 0.2)}


def _number_pages(pdf) -> None:
    """"page n of N" at the foot of every page, right-aligned (:func:`.pdf_ink.number_pages`)."""
    number_pages(pdf, FONT_FAMILY, FOOTER_PT, FOOTER_FROM_FOOT_MM, FOOTER_MM, FOOTER)


def _widths(pdf, columns: int, headers: Sequence[str] = ()) -> list[float]:
    shares = (LOAD_SHARES.get(columns) if headers[:1] == ("load",) else None) \
        or COLUMN_SHARES.get(columns) or tuple(1.0 / columns for _ in range(columns))
    return [pdf.epw * s for s in shares]


def _lines(pdf) -> CellLines:
    """The line breaker of ``pdf`` (one per document, made on first use)."""
    lines = getattr(pdf, "_cablewright_lines", None)
    if lines is None:
        lines = pdf._cablewright_lines = CellLines(pdf, FONT_FAMILY, LINE_MM, PAD_MM)
    return lines


def _ink(pdf) -> Ink:
    """The content writer of ``pdf`` (one per document, made on first use)."""
    ink = getattr(pdf, "_cablewright_ink", None)
    if ink is None:
        ink = pdf._cablewright_ink = Ink(pdf, FONT_FAMILY, LINE_MM, PAD_MM)
    return ink


@lru_cache(maxsize=64)
def _looks(bold: bool, result: str, cells: int) -> tuple[InkLook, ...]:
    """The cells' looks: a header row (``bold``) filled; a check's result cell (the second) in
    its outcome's colour, a failure's in bold white."""
    if bold:
        return (InkLook("B", HEAD_FILL_RGB),) * cells
    fail = result == "fail"
    second = InkLook("B" if fail else "", RESULT_FILL.get(result, WHITE), WHITE if fail else None)
    return tuple(second if result and i == 1 else InkLook() for i in range(cells))


def _row(pdf, widths: tuple[float, ...], cells: Sequence[str], bold: bool = False,
         result: str = "") -> InkRow:
    """The row measured in its style, once per document (equal rows, one :class:`InkRow`); a
    failed check's result cell (the second) is drawn bold in that height (its lines broken
    again in bold)."""
    rows_made = _rows_made(pdf)
    key = (widths, tuple(cells), bold, result)
    got = rows_made.get(key)
    if got is None:
        style = "B" if bold else ""
        split = _lines(pdf)
        lines = [split(text, w, style, BODY_PT) for w, text in zip(widths, cells, strict=False)]
        height = max([1] + [len(c) for c in lines]) * LINE_MM + 2 * PAD_MM
        if result == "fail" and len(lines) > 1:
            lines[1] = split(cells[1], widths[1], "B", BODY_PT)
        looks = _looks(bold, result, len(lines))
        got = rows_made[key] = InkRow(len(rows_made), height, widths, tuple(lines), looks)
    return got


def _rows_made(pdf) -> dict:
    """The rows of ``pdf`` measured so far (:func:`_row`)."""
    made = getattr(pdf, "_cablewright_rows", None)
    if made is None:
        made = pdf._cablewright_rows = {}
    return made


class _TableLayout(NamedTuple):
    """A table's column widths [mm], header row and rows, measured once."""

    widths: tuple[float, ...]
    head: InkRow
    rows: list[InkRow]

    @property
    def height(self) -> float:
        """Caption, header row and every row [mm]."""
        return LINE_MM + 1 + self.head.height + sum(r.height for r in self.rows)


def _result(t: TraceTable, i: int) -> str:
    return t.results[i] if i < len(t.results) else ""


def _table_layout(pdf, t: TraceTable) -> _TableLayout:
    widths = tuple(_widths(pdf, len(t.headers), t.headers))
    return _TableLayout(widths, _row(pdf, widths, t.headers, True),
                        [_row(pdf, widths, r, result=_result(t, i)) for i, r in enumerate(t.rows)])


def _room(pdf) -> float:
    return pdf.page_break_trigger - pdf.get_y()


def _draw_rows(pdf, rows: Sequence[InkRow]) -> None:
    """Table rows (measured by :func:`_row`) from the current position down; a row that does
    not fit in what is left of the page starts a new one (a row is never cut across pages)."""
    ink = _ink(pdf)
    x0, y = pdf.l_margin, pdf.get_y()
    trigger = pdf.page_break_trigger
    for row in rows:
        if row.height > trigger - y:
            ink.flush()
            pdf.add_page()
            x0, y, trigger = pdf.l_margin, pdf.get_y(), pdf.page_break_trigger
        ink.draw_color(GRID_RGB)
        ink.row(x0, y, BODY_PT, row)
        y += row.height
    ink.flush()
    pdf.set_xy(x0, y)


def _draw_table(pdf, t: TraceTable, layout: _TableLayout | None = None) -> None:
    layout = layout or _table_layout(pdf, t)
    head = LINE_MM + 1 + layout.head.height
    first = layout.rows[0].height if t.rows else 0.0
    if head + first > _room(pdf):  # keep the caption and header with the first row
        pdf.add_page()
    ink = _ink(pdf)
    ink.font(FONT_FAMILY, "B", BODY_PT)
    ink.cell_line(LINE_MM + 1, t.caption)  # fits: room was made above
    _draw_rows(pdf, [layout.head, *layout.rows])
    pdf.ln(1.5)


def _paragraph_height(pdf, text: str, pt: float = BODY_PT, bold: bool = False) -> float:
    return len(_lines(pdf)(text, pdf.epw, "B" if bold else "", pt, padded=False)) * LINE_MM + 0.8


def _paragraph(pdf, text: str, pt: float = BODY_PT, bold: bool = False, color=BLACK) -> None:
    """A paragraph over the text width, placed as ``multi_cell(epw, LINE_MM, text)`` places it.

    Each line goes to a new page when it would pass the page-break line (fpdf2's
    automatic page break, ``FPDF._perform_page_break_if_need_be``); the text starts
    ``c_margin`` in from the left margin.
    """
    style = "B" if bold else ""
    lines = _lines(pdf)(text, pdf.epw, style, pt, padded=False)
    ink = _ink(pdf)
    ink.font(FONT_FAMILY, style, pt)
    ink.text_color(color)
    x = pdf.l_margin + pdf.c_margin
    for line in lines:
        if pdf.get_y() + LINE_MM > pdf.page_break_trigger:
            ink.flush()
            pdf.add_page()
        y = pdf.get_y()
        if line:
            ink.text(x, y + 0.5 * LINE_MM + 0.3 * pdf.font_size, line)
        pdf.set_xy(pdf.l_margin, y + LINE_MM)
    ink.flush()
    ink.text_color(BLACK)
    pdf.ln(0.8)


def _title(t: CircuitTrace) -> str:
    extra = f", {t.not_checked} not checked" if t.not_checked else ""
    return f"{t.title}   [{t.status}{extra}]"


def _block_height(pdf, t: CircuitTrace, layouts: Sequence[_TableLayout]) -> float:
    height = _paragraph_height(pdf, _title(t), 10, True) + 2
    height += sum(_paragraph_height(pdf, "- " + m) for m in t.messages)
    height += sum(_paragraph_height(pdf, line) for line in t.lines)
    return height + sum(layout.height + 1.5 for layout in layouts) + 4


def _circuit_block(pdf, t: CircuitTrace) -> None:
    layouts = [_table_layout(pdf, table) for table in t.tables]
    height = _block_height(pdf, t, layouts)
    usable = pdf.page_break_trigger - pdf.t_margin - 8  # below the page header
    if height > _room(pdf) and height <= usable:
        pdf.add_page()  # the whole block on the next page
    pdf.set_draw_color(120, 120, 120)
    pdf.line(pdf.l_margin, pdf.get_y(), pdf.w - pdf.r_margin, pdf.get_y())
    pdf.ln(1)
    _paragraph(pdf, _title(t), 10, True)
    for m in t.messages:
        _paragraph(pdf, "- " + m, color=(138, 75, 0))
    for line in t.lines:
        _paragraph(pdf, line)
    for table, layout in zip(t.tables, layouts, strict=True):
        _draw_table(pdf, table, layout)
    pdf.ln(2)


def render_report_pdf(
    outcomes: Sequence[CircuitOutcome],
    *,
    title: str,
    drawing_name: str,
    cautions: str,
    config: ReportConfig | None = None,
    tool_version: str = "",
    unit: LengthUnit | None = None,
) -> bytes:
    """The report as PDF bytes (see :func:`write_report_pdf`)."""
    from .report import header_text

    config = config or ReportConfig()
    pdf = _make_pdf(header_text(config, drawing_name, tool_version))
    pdf.add_page()
    _paragraph(pdf, title, 14, True)
    _paragraph(pdf, cautions, BODY_PT, True, (176, 0, 32))
    counts = Counter(o.status for o in outcomes)
    checks = check_counts(outcomes)
    summary = TraceTable("Summary", ("circuits", "ok", "warning", "fail", "error"),
                         ((str(len(outcomes)), str(counts.get("ok", 0)), str(counts.get("warning", 0)),
                           str(counts.get("fail", 0)), str(counts.get("error", 0))),))
    _draw_table(pdf, summary)
    _draw_table(pdf, TraceTable("Checks over all circuits",
                                ("made", "pass", "fail", "not checked", "not applicable"),
                                ((str(checks["pass"] + checks["fail"]), str(checks["pass"]),
                                  str(checks["fail"]), str(checks["not_checked"]),
                                  str(checks["not_applicable"])),)))
    bad = failures_first(outcomes)
    if bad:
        _draw_table(pdf, TraceTable("Circuits to look at first", ("circuit", "status", "reason"),
                                    tuple(bad)))
    table = rows(outcomes, unit)
    unit = table[0].unit if table else unit
    listed = tuple(
        (r.circuit_id, r.from_tag, r.to_tag, r.cable.text if r.cable is not None else "-",
         f"{r.device_rating_a:g} A" if r.device_rating_a else "-", r.unit.text(r.routed_length_m, 1),
         r.status)
        for r in table
    )
    _draw_table(pdf, TraceTable("Schedule", ("circuit", "from", "to", "cable", "device",
                                             "routed length", "status"), listed))
    pdf.add_page()
    _paragraph(pdf, "Circuits, step by step", 12, True)
    _paragraph(pdf, "Each circuit: the load as given, Ib and its formula, the device, every correction "
                    "factor with its table and row, the capacity table and its tabulated value, Iz, and "
                    "every check with its value, limit and clause. \"not checked\" is not a pass.")
    for o in outcomes:
        _circuit_block(pdf, circuit_trace(o, unit))
    _paragraph(pdf, cautions, BODY_PT, True, (176, 0, 32))
    _number_pages(pdf)
    return bytes(pdf.output())


def write_report_pdf(
    path: str | os.PathLike[str],
    outcomes: Sequence[CircuitOutcome],
    *,
    title: str,
    drawing_name: str,
    cautions: str,
    config: ReportConfig | None = None,
    tool_version: str = "",
    unit: LengthUnit | None = None,
) -> Path:
    """Write ``report.pdf`` atomically.

    Parameters
    ----------
    path : path-like
        The ``.pdf`` file to write.
    outcomes : sequence of CircuitOutcome
        Every circuit, in schedule order.
    title : str
        Heading of the first page.
    drawing_name : str
        Name of the drawing (page header).
    cautions : str
        Shown on the first and the last page.
    config : ReportConfig, optional
        Project, revision and date of the page header.
    tool_version : str
        Our version, in the page header.
    unit : LengthUnit, optional
        Unit of the lengths (:func:`.rows.length_unit`); ``None``: the rule set's.

    Returns
    -------
    pathlib.Path
    """
    data = render_report_pdf(outcomes, title=title, drawing_name=drawing_name, cautions=cautions,
                             config=config, tool_version=tool_version, unit=unit)
    with atomic_path(path) as tmp:
        Path(tmp).write_bytes(data)
    return Path(path)
