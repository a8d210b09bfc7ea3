"""RowCells (annotate/xlsx_style.py) writes the cells that styling every cell one by one writes.

The reference is the plain way: one ``WriteOnlyCell`` per value, its number
format, fill and quote prefix set on it (openpyxl "Write-only mode",
``WriteOnlyCell``).  Both workbooks are read back with openpyxl and compared cell
by cell, and their ``xl/styles.xml`` (number formats, fills, cell styles and
their numbering) byte by byte.
"""

from __future__ import annotations

import io
import zipfile

import pytest

openpyxl = pytest.importorskip("openpyxl")

from cablewright.annotate.schedule_files import is_formula_like  # noqa: E402
from cablewright.annotate.xlsx_style import STATUS_FILLS, RowCells, number_format, styled_row  # noqa: E402

HEADERS = ("circuit", "status", "load current [A]", "device [A]", "routed length [m]", "correction factor",
           "csa [mm²]", "voltage drop [%]", "messages")
ROWS = [
    ["C1", "ok", 12.5, 16, 41.25, 0.8, 2.5, 1.2, ""],
    ["C2", "fail", 130.0, 160, None, 0.707, 70, 5.5, "=HYPERLINK(1)"],
    ["C3", "warning", None, None, 3.0, None, None, None, "-5 text"],
    ["C4", "error", True, "x", 0, 1, 95, 0.0, None],
    ["-C5", "ok", -1.5, 10, 2.0, 0.5, 1.5, 2.0, "@SUM(A1)"],
]


def _reference_row(ws, values, status):
    """Every cell styled one by one, as the writer did before RowCells."""
    from openpyxl.cell import WriteOnlyCell
    from openpyxl.styles import PatternFill

    colour = STATUS_FILLS.get(status or "")
    cells = []
    for header, value in zip(HEADERS, values, strict=True):
        cell = WriteOnlyCell(ws, value=value)
        fmt = number_format(header)
        if fmt and isinstance(value, (int, float)) and not isinstance(value, bool):
            cell.number_format = fmt
        if colour:
            cell.fill = PatternFill("solid", start_color=colour, end_color=colour)
        if isinstance(value, str) and is_formula_like(value):
            cell.data_type = "s"
            cell.quotePrefix = True
        cells.append(cell)
    return cells


def _workbook(make_row) -> bytes:
    wb = openpyxl.Workbook(write_only=True)
    ws = wb.create_sheet("schedule")
    ws.append(list(HEADERS))
    for row in ROWS:
        ws.append(make_row(ws, row, row[1]))
    buf = io.BytesIO()
    wb.save(buf)
    return buf.getvalue()


def _read(data: bytes) -> list[list[tuple]]:
    ws = openpyxl.load_workbook(io.BytesIO(data))["schedule"]
    return [[(c.value, c.data_type, c.number_format, c.fill.fill_type, c.fill.fgColor.rgb, bool(c.quotePrefix))
             for c in row] for row in ws.iter_rows()]


def _styles_xml(data: bytes) -> bytes:
    with zipfile.ZipFile(io.BytesIO(data)) as z:
        return z.read("xl/styles.xml")


def test_row_cells_equal_every_cell_styled():
    reference = _workbook(_reference_row)

    def fast(ws, values, status, _cells={}):  # noqa: B006 - one RowCells per sheet
        cells = _cells.setdefault(id(ws), RowCells(ws, HEADERS, as_text=is_formula_like))
        return cells.cells(values, status)

    faster = _workbook(fast)
    assert _read(faster) == _read(reference)
    assert _styles_xml(faster) == _styles_xml(reference)
    cells = _read(faster)
    # the values the reference stands for: a failed row filled red, its formula-like text kept as text
    assert cells[2][0][3:5] == ("solid", STATUS_FILLS["fail"])
    assert cells[2][8] == ("=HYPERLINK(1)", "s", "General", "solid", STATUS_FILLS["fail"], True)
    assert cells[1][2][2] == '0.0" A"' and cells[1][6][2] == 'General" mm²"'
    assert cells[4][2][:3] == (True, "b", "General")  # a bool gets no unit format


def test_plain_values_where_no_style_is_needed():
    wb = openpyxl.Workbook(write_only=True)
    ws = wb.create_sheet("schedule")
    out = RowCells(ws, HEADERS, as_text=is_formula_like).cells(ROWS[0], "ok")
    # text and blanks of a row not filled stay plain values; numbers with a unit format are cells
    assert out[0] == "C1" and out[1] == "ok" and out[8] == ""
    assert all(hasattr(c, "number_format") for c in out[2:8])
    ws.close()


def test_styled_row_gives_cells_throughout():
    wb = openpyxl.Workbook(write_only=True)
    ws = wb.create_sheet("schedule")
    out = styled_row(ws, HEADERS, ROWS[0], "ok")
    assert [c.value for c in out] == ROWS[0]
    assert out[2].number_format == '0.0" A"' and out[0].number_format == "General"
    ws.close()
