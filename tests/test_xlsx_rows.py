"""Rows written as XML text (annotate/xlsx_rows.py) are the rows openpyxl writes, byte for byte.

The reference is openpyxl's own write-only mode: the same values and styles
appended with ``ws.append`` (styled cells as ``Cell`` objects with the style
array, as ``RowCells.cells`` makes them).  The sheet parts and ``xl/styles.xml``
of both workbooks are compared byte by byte, and a written ``schedule.xlsx`` is
read back with openpyxl for real values (ECMA-376-1:2016, 18.3.1.4 ``c``;
XML 1.0 (Fifth Edition) 2.4 for the escaped characters).
"""

from __future__ import annotations

import datetime
import io
import zipfile

import pytest

openpyxl = pytest.importorskip("openpyxl")

from cablewright.annotate.schedule_files import _reproducible_zip, _saved_uncompressed  # noqa: E402
from cablewright.annotate.xlsx_rows import SheetRows, splice_rows  # noqa: E402
from cablewright.annotate.xlsx_style import STATUS_FILLS  # noqa: E402
from openpyxl.utils.exceptions import IllegalCharacterError  # noqa: E402

#: Texts that need escaping or care: markup characters, quotes, non-ASCII, white
#: space at either end (xml:space), the control characters XML 1.0 allows, a text
#: openpyxl reads as an error code or a formula, one longer than a cell holds.
TEXTS = ["a & b", "<tag>", 'say "x"', "it's", "70 mm²", "Ω µ € 😀", " lead", "trail ", "  ", "\xa0nbsp",
         "tab\there", "line\nbreak", "cr\rx", "\r", "", "#N/A", "#DIV/0!", "=SUM(A1)", "=", "+1", "x" * 40000,
         "\x7f del", "\u2028 sep", "\ufffe"]
NUMBERS = [0, 1, -5, 2**60, 0.1 + 0.2, -0.0, 1e-7, 1e20, 12.71, float("nan"), float("inf"), True, False]
OTHERS = [None, datetime.date(2024, 5, 1), datetime.datetime(2024, 5, 1, 12, 30)]


def _styles(wb):
    """A few style arrays as RowCells makes them: a unit format, a fill, a quote prefix, all three."""
    from openpyxl.cell import WriteOnlyCell
    from openpyxl.styles import PatternFill

    ws = wb.worksheets[0]
    out = []
    for fmt, colour, quote in [('0.0" m"', None, False), (None, STATUS_FILLS["fail"], False),
                               (None, None, True), ('General" mm²"', STATUS_FILLS["warning"], True)]:
        proto = WriteOnlyCell(ws)
        if fmt:
            proto.number_format = fmt
        if colour:
            proto.fill = PatternFill("solid", start_color=colour, end_color=colour)
        if quote:
            proto.quotePrefix = True
        out.append(proto._style)
    return out


def _table():
    values = TEXTS + NUMBERS + OTHERS
    # each value plain and under each style, in rows of 7 (a blank row too)
    rows = [values[i:i + 7] for i in range(0, len(values), 7)] + [[]]
    return rows


def _reference(rows) -> bytes:
    from openpyxl.cell import Cell

    wb = openpyxl.Workbook(write_only=True)
    ws = wb.create_sheet("s")
    styles = _styles(wb)
    for style in [None, *styles]:
        for row in rows:
            cells = []
            for v in row:
                if style is None:
                    cells.append(v)
                    continue
                cell = Cell(ws, row=1, column=1, value=v, style_array=style)
                if style.quotePrefix and isinstance(v, str):  # as RowCells: quote prefix on text only
                    cell.data_type = "s"
                cells.append(cell)
            ws.append(cells)
    buf = io.BytesIO()
    wb.save(buf)
    return buf.getvalue()


def _ours(rows) -> bytes:
    wb = openpyxl.Workbook(write_only=True)
    ws = wb.create_sheet("s")
    styles = _styles(wb)
    sheet = SheetRows(ws)
    for style in [None, *styles]:
        for row in rows:
            sheet.append(row, None if style is None else [style] * len(row))
    buf = io.BytesIO()
    wb.save(buf)
    with zipfile.ZipFile(buf) as z:
        parts = {n: z.read(n) for n in z.namelist()}
    parts[sheet.part] = splice_rows(parts[sheet.part], sheet.xml())
    out = io.BytesIO()
    with zipfile.ZipFile(out, "w") as z:
        for name, data in parts.items():
            z.writestr(name, data)
    return out.getvalue()


def _part(data: bytes, name: str) -> bytes:
    with zipfile.ZipFile(io.BytesIO(data)) as z:
        return z.read(name)


def test_rows_are_the_bytes_openpyxl_writes():
    rows = _table()
    ref, ours = _reference(rows), _ours(rows)
    sheet = _part(ref, "xl/worksheets/sheet1.xml")
    assert _part(ours, "xl/worksheets/sheet1.xml") == sheet
    assert _part(ours, "xl/styles.xml") == _part(ref, "xl/styles.xml")  # styles numbered alike
    # the reference holds what the cases are for
    assert b"<t>a &amp; b</t>" in sheet and b"&lt;tag&gt;" in sheet and b'say "x"' in sheet
    assert '70 mm²'.encode() in sheet and b'<t xml:space="preserve"> lead</t>' in sheet
    assert b't="e"><v>#N/A</v>' in sheet and b"<f>SUM(A1)</f>" in sheet  # plain: as openpyxl reads them
    assert b'<t>=SUM(A1)</t>' in sheet  # quote-prefixed: kept as text
    assert b"x" * 32767 + b"</t>" in sheet and b"x" * 32768 not in sheet


@pytest.mark.parametrize("text", ["bell\x07", "nul\x00", "esc\x1b", "\x0b"])
def test_a_character_xml_forbids_is_refused_as_openpyxl_refuses_it(text):
    wb = openpyxl.Workbook(write_only=True)
    ws = wb.create_sheet("s")
    with pytest.raises(IllegalCharacterError):
        openpyxl.cell.WriteOnlyCell(ws, value=text)  # openpyxl's own refusal
    with pytest.raises(IllegalCharacterError):
        SheetRows(ws).append(["ok", text])


def test_splice_needs_one_empty_sheet_data():
    assert splice_rows(b"<w><sheetData></sheetData><x/></w>", b"<row r=\"1\"></row>") == \
        b'<w><sheetData><row r="1"></row></sheetData><x/></w>'
    with pytest.raises(ValueError, match="sheetData"):
        splice_rows(b"<w><sheetData><row/></sheetData></w>", b"")


def test_rows_for_a_sheet_not_in_the_workbook_are_refused():
    wb = openpyxl.Workbook(write_only=True)
    wb.create_sheet("s")
    with pytest.raises(ValueError, match="sheet9"):
        _reproducible_zip(_saved_uncompressed(wb), {"xl/worksheets/sheet9.xml": b""})


def test_written_schedule_reads_back_with_real_values(tmp_path):
    """A schedule whose texts need escaping, a failed row, formula-like text, read back with openpyxl."""
    from dataclasses import replace

    from cablewright.annotate.schedule_files import write_schedule_xlsx
    from test_annotate_fixtures import outcomes

    outs = outcomes()
    outs[1] = replace(outs[1], to_tag='PUMP "A" & <B>', status="fail", messages=("cable 70 mm² too small",))
    outs[2] = replace(outs[2], circuit_id="=HYPERLINK(1)")
    extra = [("BOQ", ["item", "note"], [["cable 3C 70 mm²", "R&D <lab> it's"], ["@SUM(A1)", None],
                                        ["drum", 250.0]])]
    path = write_schedule_xlsx(tmp_path / "s.xlsx", outs, extra_sheets=extra)
    wb = openpyxl.load_workbook(path)
    assert wb.sheetnames == ["schedule", "BOQ"]
    ws = wb["schedule"]
    head = [c.value for c in ws[1]]
    assert head[:4] == ["circuit", "from", "to", "status"] and ws["A1"].font.b and ws.freeze_panes == "B2"
    assert ws.max_row == 4 and ws.auto_filter.ref == f"A1:{ws.cell(1, len(head)).column_letter}4"
    # the failed row: its escaped text whole, every cell filled red, numbers with their unit format
    row = ws[3]
    assert [c.value for c in row[:4]] == ["P-102", "MCC-1", 'PUMP "A" & <B>', "fail"]
    assert row[-1].value == "cable 70 mm² too small"
    assert {(c.fill.fill_type, c.fill.fgColor.rgb) for c in row} == {("solid", STATUS_FILLS["fail"])}
    load = row[head.index("load current [A]")]
    assert load.value == 93.4 and load.data_type == "n" and load.number_format == '0.0" A"'
    assert row[head.index("csa [mm²]")].value == 50
    # a row not filled has no fill; the formula-like id is text with a quote prefix
    assert ws["A2"].fill.fill_type is None and ws["A2"].value == "P-101"
    assert ws["A4"].value == "=HYPERLINK(1)" and ws["A4"].data_type == "s" and ws["A4"].quotePrefix
    boq = wb["BOQ"]
    assert boq["A2"].value == "cable 3C 70 mm²" and boq["B2"].value == "R&D <lab> it's"
    assert boq["A3"].value == "@SUM(A1)" and boq["A3"].quotePrefix and not boq["A2"].quotePrefix
    assert boq["B3"].value is None and boq["B4"].value == 250.0 and boq["B4"].data_type == "n"
