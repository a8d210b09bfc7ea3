"""The cable schedule as CSV, XLSX and JSON: one row per circuit, the same values in each.

Every row is taken from the contract's JSON object of the circuit
(:func:`cablewright.annotate.jsonout.outcome_to_dict`), so the three files agree
row by row and value by value (same rounding).  Units are in the column headers.
All files are written atomically (:mod:`.atomic`).

The CSV is UTF-8 with a byte-order mark (so spreadsheet programs read ``mm²``
right), comma separated, one header row.

References
----------
.. [1] RFC 4180, "Common Format and MIME Type for Comma-Separated Values (CSV) Files".
.. [2] openpyxl documentation: ``Workbook``, ``Worksheet.freeze_panes``,
   ``column_dimensions``, "Write-only mode" (``Workbook(write_only=True)``,
   ``WriteOnlyCell``).
.. [3] OWASP, "CSV Injection" (common practice): a cell whose text begins with
   ``=``, ``+``, ``-``, ``@``, a tab or a carriage return is taken by spreadsheet
   programs as a formula; such text is written with a leading single quote.
.. [4] ECMA-376-1:2016 (Office Open XML), 18.3.1.4 ``c`` (cell type ``inlineStr``)
   and 18.8.45 ``xf`` (``quotePrefix``): a string cell, shown and kept as text.
.. [5] reproducible-builds.org, "Timestamps" and "Archive metadata": no run
   time in the files, fixed dates on the zip entries, so two runs on the same
   input give the same bytes.
"""

from __future__ import annotations

import csv
import io
import os
import zipfile
from collections.abc import Callable, Iterable, Sequence
from pathlib import Path
from typing import Any

from .atomic import atomic_path, write_text_atomic
from .jsonout import dumps, outcome_to_dict
from .model import CircuitOutcome
from .xlsx_style import setup_print, styled_row

__all__ = [
    "COLUMNS",
    "FORMULA_LEADS",
    "is_formula_like",
    "csv_safe_text",
    "schedule_rows",
    "write_schedule_csv",
    "write_schedule_xlsx",
    "write_schedule_json",
]


def _get(*keys: str) -> Callable[[dict[str, Any]], Any]:
    def getter(data: dict[str, Any]) -> Any:
        value: Any = data
        for key in keys:
            if not isinstance(value, dict):
                return None
            value = value.get(key)
        return value

    return getter


#: Column header -> how to read it from the circuit's JSON object.
def _cable_text(cable: dict[str, Any] | None) -> str | None:
    """The cable as the installer orders it, e.g. ``"2x 4C 240 mm² Cu/XLPE"``."""
    if not cable:
        return None
    lead = f"{cable['parallel']}x " if cable["parallel"] > 1 else ""
    size = cable.get("size_label") or f"{cable['csa_mm2']:g} mm²"
    return f"{lead}{cable['cores']}C {size} {cable['conductor']}/{cable['insulation']}"


def _order_length(data: dict[str, Any]) -> float | None:
    """Design length times the parallel count [m]: the cable to order for the circuit."""
    route, cable = data.get("route"), data.get("cable")
    if not route or not cable or route.get("design_length_m") is None:
        return None
    return round(route["design_length_m"] * cable["parallel"], 1)


COLUMNS: tuple[tuple[str, Callable[[dict[str, Any]], Any]], ...] = (
    ("circuit", _get("id")),
    ("from", _get("from")),
    ("to", _get("to")),
    ("status", _get("status")),
    ("load current [A]", _get("load_current_a")),
    ("device [A]", _get("device_rating_a")),
    ("method", _get("method")),
    ("routed length [m]", _get("route", "routed_length_m")),
    ("design length [m]", _get("route", "design_length_m")),
    ("circuits in group", _get("grouping", "circuits_in_group")),
    ("cables in group", _get("grouping", "cables_in_group")),
    ("governing segment", _get("grouping", "governing_segment")),
    ("correction factor", _get("correction_factor")),
    ("required capacity [A]", _get("required_capacity_a")),
    ("conductor", _get("cable", "conductor")),
    ("insulation", _get("cable", "insulation")),
    ("cores", _get("cable", "cores")),
    ("csa [mm²]", _get("cable", "csa_mm2")),
    ("parallel", _get("cable", "parallel")),
    ("capacity [A]", _get("cable", "capacity_a")),
    ("governed by", _get("cable", "governed_by")),
    ("cable", lambda d: _cable_text(d.get("cable"))),
    ("protective conductor [mm²]", _get("protective_conductor_mm2")),
    ("cable to order [m]", lambda d: _order_length(d)),
    ("voltage drop [%]", _get("voltage_drop", "percent")),
    ("vd from origin [%]", _get("voltage_drop", "cumulative_percent")),
    ("vd limit [%]", _get("voltage_drop", "limit_percent")),
    ("max length for disconnection [m]", _get("max_length_m")),
    ("messages", lambda d: "; ".join(d.get("messages") or ())),
)

HEADERS: tuple[str, ...] = tuple(name for name, _ in COLUMNS)


def schedule_rows(outcomes: Iterable[CircuitOutcome]) -> list[dict[str, Any]]:
    """One dict per circuit, keyed by the column headers of :data:`COLUMNS`.

    Blank cells are ``None``; numbers keep the rounding of the JSON document.
    """
    rows = []
    for outcome in outcomes:
        data = outcome_to_dict(outcome, "size")
        rows.append({name: get(data) for name, get in COLUMNS})
    return rows


#: First characters that make a spreadsheet program read a cell as a formula
#: (OWASP "CSV Injection", common practice).
FORMULA_LEADS: tuple[str, ...] = ("=", "+", "-", "@", "\t", "\r")


def is_formula_like(text: str) -> bool:
    """True when a spreadsheet program would take ``text`` for a formula.

    Examples
    --------
    >>> is_formula_like("=HYPERLINK(1)"), is_formula_like("-5"), is_formula_like("P-101")
    (True, True, False)
    """
    return text.startswith(FORMULA_LEADS)


def csv_safe_text(text: str) -> str:
    """``text`` for a CSV cell: a leading single quote where it would read as a formula.

    Examples
    --------
    >>> csv_safe_text("=1+2"), csv_safe_text("@SUM(A1)"), csv_safe_text("MCC-1")
    ("'=1+2", "'@SUM(A1)", 'MCC-1')
    """
    return "'" + text if is_formula_like(text) else text


def _csv_cell(value: Any) -> str:
    """A cell's CSV text; numbers as numbers, text made safe (:func:`csv_safe_text`)."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        return str(value)  # a real number, negative or not, stays a number
    return csv_safe_text(str(value))


def write_schedule_csv(path: str | os.PathLike[str], outcomes: Sequence[CircuitOutcome]) -> Path:
    """Write the schedule as CSV (UTF-8 with BOM, RFC 4180 quoting); returns the path."""
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\r\n")
    writer.writerow(HEADERS)
    for row in schedule_rows(outcomes):
        writer.writerow([_csv_cell(row[h]) for h in HEADERS])
    return write_text_atomic(path, buf.getvalue(), encoding="utf-8-sig", newline="")


def write_schedule_xlsx(path: str | os.PathLike[str], outcomes: Sequence[CircuitOutcome],
                        extra_sheets: Sequence[tuple[str, Sequence[str], Sequence[Sequence[Any]]]] = ()) -> Path:
    """Write the schedule as an Excel workbook; returns the path.

    One sheet ``schedule``: bold header, frozen below the header, an auto-filter,
    numbers stored as numbers shown with their unit, failed rows filled, columns wide
    enough for their contents, printed landscape one page wide with the header
    repeated (:mod:`.xlsx_style`).
    """
    from openpyxl import Workbook
    from openpyxl.cell import WriteOnlyCell
    from openpyxl.styles import Alignment, Font
    from openpyxl.utils import get_column_letter

    # write-only mode streams the rows (time and memory linear in the rows, no
    # cell objects kept); sheet settings go in before the first row
    wb = Workbook(write_only=True)
    ws = wb.create_sheet("schedule")
    rows = schedule_rows(outcomes)
    for i, header in enumerate(HEADERS, start=1):
        longest = max([len(header)] + [len(_csv_cell(r[header])) for r in rows])
        ws.column_dimensions[get_column_letter(i)].width = min(60, max(8, longest + 2))
    ws.freeze_panes = "B2"
    setup_print(ws)  # landscape, fit to width, header row repeated (annotate/xlsx_style.py)
    ws.auto_filter.ref = f"A1:{get_column_letter(len(HEADERS))}{len(rows) + 1}"
    bold = Font(bold=True)
    middle = Alignment(wrap_text=False, vertical="center")
    head = []
    for header in HEADERS:
        cell = WriteOnlyCell(ws, value=header)
        cell.font = bold
        cell.alignment = middle
        head.append(cell)
    ws.append(head)
    for row in rows:  # unit number formats, failed rows filled (annotate/xlsx_style.py)
        ws.append(_text_safe(styled_row(ws, HEADERS, [row[h] for h in HEADERS], row["status"])))
    for title, headers, sheet_rows in extra_sheets:  # e.g. BOQ, segments (annotate/takeoff.py xlsx_sheets)
        extra = wb.create_sheet(title)
        setup_print(extra)
        extra.append([WriteOnlyCell(extra, value=h) for h in headers])
        for sheet_row in sheet_rows:
            extra.append([_xlsx_cell(extra, v) for v in sheet_row])
    try:
        with atomic_path(path) as tmp:
            wb.save(tmp)
            tmp.write_bytes(_reproducible_zip(tmp.read_bytes()))
    finally:
        if not ws.closed:  # saving failed early: end the sheet's row stream and temp file
            ws.close()
    return Path(path)


def _text_safe(cells: list[Any]) -> list[Any]:
    """Styled cells whose formula-like text is stored as text (see :func:`_xlsx_cell`)."""
    for cell in cells:
        if isinstance(cell.value, str) and is_formula_like(cell.value):
            cell.data_type = "s"
            cell.quotePrefix = True
    return cells


def _xlsx_cell(ws: Any, value: Any) -> Any:
    """A value for the write-only sheet: text that reads as a formula becomes a string cell.

    openpyxl stores a ``str`` beginning with ``=`` as a formula; such text (and
    text beginning with any of :data:`FORMULA_LEADS`) is written as a string
    cell with ``quotePrefix`` set, so the spreadsheet keeps it as text [4]_.
    """
    if not isinstance(value, str) or not is_formula_like(value):
        return value
    from openpyxl.cell import WriteOnlyCell

    cell = WriteOnlyCell(ws, value=value)
    cell.data_type = "s"
    cell.quotePrefix = True
    return cell


#: Date of every entry of the XLSX zip: the earliest a zip can hold (APPNOTE 4.4.6),
#: as reproducible-builds.org suggests for archives [5]_.
_ZIP_DATE = (1980, 1, 1, 0, 0, 0)


def _reproducible_zip(data: bytes) -> bytes:
    """The workbook with fixed zip entry dates and no created/modified time.

    openpyxl stamps the save time into ``docProps/core.xml`` and on every zip
    entry; both are replaced so the file depends on its contents only [5]_.
    """
    import re

    out = io.BytesIO()
    with zipfile.ZipFile(io.BytesIO(data)) as src, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as dst:
        for info in src.infolist():
            content = src.read(info.filename)
            if info.filename == "docProps/core.xml":
                content = re.sub(rb"<dcterms:(created|modified)[^>]*>[^<]*</dcterms:\1>", b"", content)
            entry = zipfile.ZipInfo(info.filename, date_time=_ZIP_DATE)
            entry.compress_type = zipfile.ZIP_DEFLATED
            entry.external_attr = 0o644 << 16
            dst.writestr(entry, content)
    return out.getvalue()


def write_schedule_json(path: str | os.PathLike[str], outcomes: Sequence[CircuitOutcome],
                        extra: dict[str, Any] | None = None) -> Path:
    """Write the contract's JSON document (``{"circuits": [...]}`` and ``extra``'s
    top-level keys); returns the path."""
    return write_text_atomic(path, dumps(outcomes, "size", extra) + "\n", encoding="utf-8")
