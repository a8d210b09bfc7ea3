"""The cable schedule as CSV, XLSX and JSON: one row per circuit, the same values in each.

Every row is read from the circuit's typed :class:`.rows.ScheduleRow`, the rows
``schedule.json`` is written from too, so the three files agree row by row and
value by value (same rounding).  Units are in the column headers; lengths are in
the unit of the rule set (metres for IEC, feet for NEC) or of
``[annotate] length_unit`` (:func:`.rows.length_unit`); ``schedule.json`` keeps metres.
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
from itertools import chain
from pathlib import Path
from typing import Any

from .atomic import atomic_path, write_text_atomic
from .jsonout import dump_pieces
from .model import CircuitOutcome
from .rows import METRE, LengthUnit, ScheduleRow, rows
from .rows import length_unit as length_unit_of
from .xlsx_rows import SheetRows, splice_rows
from .xlsx_style import RowCells, setup_print

__all__ = [
    "COLUMNS",
    "HEADERS",
    "columns",
    "schedule_table",
    "FORMULA_LEADS",
    "is_formula_like",
    "csv_safe_text",
    "schedule_rows",
    "write_schedule_csv",
    "write_schedule_xlsx",
    "write_schedule_json",
]


def _order_length(row: ScheduleRow) -> float | None:
    """Design length times the parallel count, in the row's unit: the cable to order."""
    design = row.unit.rounded(row.design_length_m)
    if design is None or row.cable is None:
        return None
    return round(design * row.cable.parallel, 1)


#: A cell of a row: its value as the files write it (``None`` for a blank).
Cell = Callable[[ScheduleRow], Any]


def columns(unit: LengthUnit = METRE) -> tuple[tuple[str, Cell], ...]:
    """Column header -> its cell of a :class:`.rows.ScheduleRow`, lengths in ``unit``
    (rounded as the JSON rounds metres)."""
    u = unit.symbol
    return (
        ("circuit", lambda r: r.circuit_id),
        ("from", lambda r: r.from_tag),
        ("to", lambda r: r.to_tag),
        ("status", lambda r: r.status),
        ("load current [A]", lambda r: r.load_current_a),
        ("device [A]", lambda r: r.device_rating_a),
        ("method", lambda r: r.method or None),
        (f"routed length [{u}]", lambda r: r.unit.rounded(r.routed_length_m)),
        (f"design length [{u}]", lambda r: r.unit.rounded(r.design_length_m)),
        ("circuits in group", lambda r: r.grouping.circuits_in_group if r.grouping else None),
        ("cables in group", lambda r: r.grouping.cables_in_group if r.grouping else None),
        ("governing segment", lambda r: r.grouping.governing_segment if r.grouping else None),
        ("correction factor", lambda r: r.correction_factor),
        ("required capacity [A]", lambda r: r.required_capacity_a),
        ("conductor", lambda r: r.cable.selection.conductor if r.cable else None),
        ("insulation", lambda r: r.cable.selection.insulation if r.cable else None),
        ("cores", lambda r: r.cable.selection.cores if r.cable else None),
        ("csa [mm²]", lambda r: r.cable.csa_mm2 if r.cable else None),
        ("parallel", lambda r: r.cable.parallel if r.cable else None),
        ("capacity [A]", lambda r: r.cable.capacity_a if r.cable else None),
        ("governed by", lambda r: r.cable.selection.governed_by if r.cable else None),
        ("cable", lambda r: r.cable.text if r.cable else None),
        ("protective conductor [mm²]", lambda r: r.protective_conductor_mm2),
        (f"cable to order [{u}]", _order_length),
        ("voltage drop [%]", lambda r: r.drop.percent if r.drop else None),
        ("vd from origin [%]", lambda r: r.drop.cumulative_percent if r.drop else None),
        ("vd limit [%]", lambda r: r.drop.limit_percent if r.drop else None),
        (f"max length for disconnection [{u}]", lambda r: r.unit.rounded(r.max_length_m, 3)),
        ("messages", lambda r: "; ".join(r.messages)),
    )


#: The columns with lengths in metres (the IEC rule set's unit).
COLUMNS = columns(METRE)
HEADERS: tuple[str, ...] = tuple(name for name, _ in COLUMNS)


def schedule_table(outcomes: Iterable[CircuitOutcome], unit: LengthUnit | None = None,
                   length_unit: str = "") -> tuple[tuple[str, ...], list[dict[str, Any]]]:
    """The headers and one dict per circuit keyed by them (see :func:`schedule_rows`)."""
    headers, values = _value_rows(outcomes, unit, length_unit)
    return headers, [dict(zip(headers, row, strict=True)) for row in values]


def _value_rows(outcomes: Iterable[CircuitOutcome], unit: LengthUnit | None = None,
                length_unit: str = "") -> tuple[tuple[str, ...], list[list[Any]]]:
    """The headers and one list of cell values per circuit, in the headers' order."""
    table = rows(outcomes, unit, length_unit)
    cols = columns(table[0].unit if table else (unit or length_unit_of("iec", length_unit)))
    headers = tuple(name for name, _ in cols)
    cells = [cell for _, cell in cols]
    return headers, [[cell(row) for cell in cells] for row in table]


def schedule_rows(outcomes: Iterable[CircuitOutcome], unit: LengthUnit | None = None,
                  length_unit: str = "") -> list[dict[str, Any]]:
    """One dict per circuit, keyed by the column headers of :func:`columns`.

    Blank cells are ``None``; numbers keep the rounding of the JSON document;
    lengths are in ``unit`` (``None``: the rule set's, or ``length_unit``: "m", "ft").
    """
    return schedule_table(outcomes, unit, length_unit)[1]


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


def write_schedule_csv(path: str | os.PathLike[str], outcomes: Sequence[CircuitOutcome],
                       unit: LengthUnit | None = None) -> Path:
    """Write the schedule as CSV (UTF-8 with BOM, RFC 4180 quoting); returns the path.

    Lengths are in ``unit`` (``None``: the unit of the rule set the circuits were sized with).
    """
    headers, table = schedule_table(outcomes, unit)
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\r\n")
    writer.writerow(headers)
    for row in table:
        writer.writerow([_csv_cell(row[h]) for h in headers])
    return write_text_atomic(path, buf.getvalue(), encoding="utf-8-sig", newline="")


def write_schedule_xlsx(path: str | os.PathLike[str], outcomes: Sequence[CircuitOutcome],
                        extra_sheets: Sequence[tuple[str, Sequence[str], Sequence[Sequence[Any]]]] = (),
                        unit: LengthUnit | None = None) -> Path:
    """Write the schedule as an Excel workbook; returns the path.

    One sheet ``schedule``: bold header, frozen below the header, an auto-filter,
    numbers stored as numbers shown with their unit, failed rows filled, columns wide
    enough for their contents, printed landscape one page wide with the header
    repeated (:mod:`.xlsx_style`).  Lengths are in ``unit`` (as :func:`write_schedule_csv`).
    """
    from openpyxl import Workbook
    from openpyxl.cell import WriteOnlyCell
    from openpyxl.styles import Alignment, Font
    from openpyxl.utils import get_column_letter

    # openpyxl makes the workbook (styles, sheet settings, print setup), saved with
    # empty sheets; the rows are written as XML text (annotate/xlsx_rows.py, the
    # text openpyxl writes) and put into the sheets as the zip is written
    wb = Workbook(write_only=True)
    ws = wb.create_sheet("schedule")
    headers, rows = _value_rows(outcomes, unit)
    for i, header in enumerate(headers):
        longest = max([len(header)] + [len(_csv_cell(r[i])) for r in rows])
        ws.column_dimensions[get_column_letter(i + 1)].width = min(60, max(8, longest + 2))
    ws.freeze_panes = "B2"
    setup_print(ws)  # landscape, fit to width, header row repeated (annotate/xlsx_style.py)
    ws.auto_filter.ref = f"A1:{get_column_letter(len(headers))}{len(rows) + 1}"
    head = WriteOnlyCell(ws)
    head.font = Font(bold=True)
    head.alignment = Alignment(wrap_text=False, vertical="center")
    sheets = [SheetRows(ws)]
    sheets[0].append(headers, [head._style] * len(headers))  # type: ignore[attr-defined]
    # unit number formats, failed rows filled, formula-like text kept as text
    # (annotate/xlsx_style.py RowCells: each style built once, none where none is needed)
    row_cells = RowCells(ws, headers, as_text=is_formula_like)
    status = headers.index("status")
    for row in rows:
        sheets[0].append(row, row_cells.styles(row, row[status]))
    quote: list[Any] = []  # the style of formula-like text on the other sheets, made on first use
    for title, sheet_headers, sheet_rows in extra_sheets:  # e.g. BOQ, segments (annotate/takeoff.py xlsx_sheets)
        extra = wb.create_sheet(title)
        setup_print(extra)
        sheets.append(SheetRows(extra))
        sheets[-1].append(list(sheet_headers))  # plain values: written as unstyled cells
        for sheet_row in sheet_rows:
            sheets[-1].append(sheet_row, _text_styles(extra, sheet_row, quote))
    data = _saved_uncompressed(wb)  # the sheets' parts are named (numbered) as they are saved
    sheet_rows_xml = {sheet.part: sheet.xml() for sheet in sheets}
    with atomic_path(path) as tmp:
        tmp.write_bytes(_reproducible_zip(data, sheet_rows_xml))
    return Path(path)


def _text_styles(ws: Any, values: Sequence[Any], quote: list[Any]) -> list[Any] | None:
    """The styles of a row of plain values: text that reads as a formula kept as text.

    openpyxl stores a ``str`` beginning with ``=`` as a formula; such text (and
    text beginning with any of :data:`FORMULA_LEADS`) is written as a string
    cell with ``quotePrefix`` set, so the spreadsheet keeps it as text [4]_.
    ``quote`` holds that style once made (``None`` returned: no cell needs a style).
    """
    if not any(isinstance(v, str) and is_formula_like(v) for v in values):
        return None
    if not quote:
        from openpyxl.cell import WriteOnlyCell

        proto = WriteOnlyCell(ws)
        proto.quotePrefix = True
        quote.append(proto._style)  # type: ignore[attr-defined]
    return [quote[0] if isinstance(v, str) and is_formula_like(v) else None for v in values]


def _saved_uncompressed(wb: Any) -> bytes:
    """The workbook as openpyxl saves it, its zip entries stored, not deflated.

    :func:`_reproducible_zip` rewrites every entry anyway (fixed dates) and
    deflates it then; openpyxl's own ``Workbook.save`` would deflate each entry a
    first time for nothing.  Same parts, same XML as ``Workbook.save`` writes
    (its ``ExcelWriter``); the save time it stamps is dropped either way.
    """
    from openpyxl.writer.excel import ExcelWriter

    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w", zipfile.ZIP_STORED, allowZip64=True) as archive:
        ExcelWriter(wb, archive).save()
    return buf.getvalue()


#: Date of every entry of the XLSX zip: the earliest a zip can hold (APPNOTE 4.4.6),
#: as reproducible-builds.org suggests for archives [5]_.
_ZIP_DATE = (1980, 1, 1, 0, 0, 0)


def _reproducible_zip(data: bytes, sheet_rows: dict[str, bytes] | None = None) -> bytes:
    """The workbook with fixed zip entry dates and no created/modified time.

    openpyxl stamps the save time into ``docProps/core.xml`` and on every zip
    entry; both are replaced so the file depends on its contents only [5]_.
    ``sheet_rows``: a sheet's part name -> its rows, put into the sheet saved
    without them (:func:`.xlsx_rows.splice_rows`).
    """
    import re

    rows_left = dict(sheet_rows or {})
    out = io.BytesIO()
    with zipfile.ZipFile(io.BytesIO(data)) as src, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as dst:
        for info in src.infolist():
            content = src.read(info.filename)
            if info.filename == "docProps/core.xml":
                content = re.sub(rb"<dcterms:(created|modified)[^>]*>[^<]*</dcterms:\1>", b"", content)
            elif info.filename in rows_left:
                content = splice_rows(content, rows_left.pop(info.filename))
            entry = zipfile.ZipInfo(info.filename, date_time=_ZIP_DATE)
            entry.compress_type = zipfile.ZIP_DEFLATED
            entry.external_attr = 0o644 << 16
            dst.writestr(entry, content)
    if rows_left:
        raise ValueError(f"rows for sheets the workbook does not have: {sorted(rows_left)}")
    return out.getvalue()


def write_schedule_json(path: str | os.PathLike[str], outcomes: Sequence[CircuitOutcome],
                        extra: dict[str, Any] | None = None) -> Path:
    """Write the contract's JSON document (``{"circuits": [...]}`` and ``extra``'s
    top-level keys); returns the path."""
    # written piece by piece: the 15 MB document of 2,000 circuits is never held whole
    return write_text_atomic(path, chain(dump_pieces(outcomes, "size", extra), ["\n"]), encoding="utf-8")
