"""Generator of broken and hostile schedules (issue 18), made in the test, not checked in.

Each case is a function writing one file into a folder and returning its path;
:data:`REFUSED` lists the cases a run must refuse with exit code 2 and one line
on standard error, with the words the line must hold.  Tags and loads are those
of the sample drawing (``sample_drawings/pumping_station.dxf``), so a case fails
for the reason it was made for only.
"""

from __future__ import annotations

import io
import zipfile
from collections.abc import Callable
from pathlib import Path

HEADER = "circuit,from,to,load"
ROW = "F-MCC1,MSB-1,MCC-1,45 kW"
ROW2 = "F-DB2,MSB-1,DB-2,20 kW"


def _text(folder: Path, name: str, text: str, encoding: str = "utf-8") -> Path:
    path = folder / name
    path.write_bytes(text.encode(encoding))
    return path


def _workbook_bytes(rows: list[list[object]]) -> bytes:
    import openpyxl

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "circuits"
    for row in rows:
        ws.append(row)
    buffer = io.BytesIO()
    wb.save(buffer)
    return buffer.getvalue()


def _rezip(data: bytes, replace: dict[str, bytes], extra: dict[str, bytes] | None = None) -> bytes:
    out = io.BytesIO()
    with zipfile.ZipFile(io.BytesIO(data)) as src, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as dst:
        for info in src.infolist():
            dst.writestr(info.filename, replace.get(info.filename, src.read(info.filename)))
        for name, content in (extra or {}).items():
            dst.writestr(name, content)
    return out.getvalue()


def _sheet_xml(data: bytes) -> bytes:
    with zipfile.ZipFile(io.BytesIO(data)) as archive:
        return archive.read("xl/worksheets/sheet1.xml")


def header_only(folder: Path) -> Path:
    return _text(folder, "header_only.csv", HEADER + "\n")


def duplicate_ids_trim_case(folder: Path) -> Path:
    return _text(folder, "dup_ids.csv", f"{HEADER}\nC-1,MSB-1,MCC-1,45 kW\n\" c-1 \",MSB-1,DB-2,20 kW\n")


def newline_in_circuit(folder: Path) -> Path:
    return _text(folder, "newline_id.csv", f'{HEADER}\n"F-MC\nC1",MSB-1,MCC-1,45 kW\n')


def misspelt_power_factor(folder: Path) -> Path:
    return _text(folder, "powerfactor.csv", f"{HEADER},powerfactor\n{ROW},0.9\n")


def misspelt_load_type(folder: Path) -> Path:
    return _text(folder, "load_type.csv", f"{HEADER},load type\n{ROW},motor\n")


def binary_csv(folder: Path) -> Path:
    path = folder / "binary.csv"
    path.write_bytes(bytes(range(256)) * 8)
    return path


def not_a_zip_xlsx(folder: Path) -> Path:
    return _text(folder, "not_zip.xlsx", HEADER + "\n" + ROW + "\n")


def xlsx_formula_without_value(folder: Path) -> Path:
    path = folder / "formula.xlsx"  # openpyxl saves formulas with no cached value
    path.write_bytes(_workbook_bytes([["circuit", "from", "to", "load", "power_factor"],
                                      ["F-MCC1", "MSB-1", "MCC-1", "45 kW", "=0.8+0.1"]]))
    return path


def xlsx_zip_bomb(folder: Path) -> Path:
    data = _workbook_bytes([HEADER.split(","), ROW.split(",")])
    sheet = _sheet_xml(data)
    padding = b" " * (24 * 2**20)  # 24 MiB of spaces pack to about 24 KiB
    bomb = sheet.replace(b"</worksheet>", b"") + padding + b"</worksheet>"
    path = folder / "bomb.xlsx"
    path.write_bytes(_rezip(data, {"xl/worksheets/sheet1.xml": bomb}))
    return path


def xlsx_huge_extent(folder: Path) -> Path:
    data = _workbook_bytes([HEADER.split(","), ROW.split(",")])
    sheet = _sheet_xml(data)
    start = sheet.index(b'<dimension ref="')
    end = sheet.index(b'"', start + 16)
    sparse = sheet[:start] + b'<dimension ref="A1:XFD1048576' + sheet[end:]
    sparse = sparse.replace(b"</sheetData>", b'<row r="1048576"><c r="XFD1048576" t="n"><v>1</v></c></row></sheetData>')
    path = folder / "sparse.xlsx"
    path.write_bytes(_rezip(data, {"xl/worksheets/sheet1.xml": sparse}))
    return path


def xlsx_billion_laughs(folder: Path) -> Path:
    data = _workbook_bytes([HEADER.split(","), ROW.split(",")])
    sheet = _sheet_xml(data)
    entities = ['<!ENTITY lol0 "lol">'] + [
        f'<!ENTITY lol{i} "{("&lol" + str(i - 1) + ";") * 10}">' for i in range(1, 10)
    ]
    dtd = ("<!DOCTYPE worksheet [" + "".join(entities) + "]>").encode()
    body = sheet.split(b"?>", 1)[-1] if sheet.startswith(b"<?xml") else sheet
    laughs = b'<?xml version="1.0"?>' + dtd + body.replace(b"<v>", b"<v>&lol9;", 1)
    path = folder / "laughs.xlsx"
    path.write_bytes(_rezip(data, {"xl/worksheets/sheet1.xml": laughs}))
    return path


#: case -> words the one stderr line must hold (exit code 2 for each).
REFUSED: dict[Callable[[Path], Path], tuple[str, ...]] = {
    header_only: ("no circuit rows",),
    duplicate_ids_trim_case: ("'C-1' (row 2)", "'c-1' (row 3)"),
    newline_in_circuit: ("line break", "row 2"),
    misspelt_power_factor: ("powerfactor", "power_factor"),
    misspelt_load_type: ("load type", "load_type"),
    binary_csv: ("binary.csv",),
    not_a_zip_xlsx: ("not_zip.xlsx", "cannot read"),
    xlsx_formula_without_value: ("E2", "formula with no saved value"),
    xlsx_zip_bomb: ("zip bomb",),
    xlsx_huge_extent: ("1048576 rows", "16384 columns"),
    xlsx_billion_laughs: ("document type",),
}


def utf16_schedule(folder: Path, bom: bool) -> Path:
    """A good schedule in UTF-16 (with or without its byte-order mark)."""
    text = f"{HEADER}\n{ROW}\n{ROW2}\n"
    return _text(folder, f"utf16{'_bom' if bom else ''}.csv", text, "utf-16" if bom else "utf-16-le")


def xlsx_far_row_without_dimension(folder: Path) -> Path:
    """One cell in the last row a sheet can have, and no ``dimension`` element."""
    import re

    data = _workbook_bytes([HEADER.split(","), ROW.split(",")])
    sheet = re.sub(rb"<dimension [^>]*/>", b"", _sheet_xml(data))
    sheet = sheet.replace(b"</sheetData>", b'<row r="1048576"><c r="A1048576" t="n"><v>1</v></c></row></sheetData>')
    path = folder / "far_row.xlsx"
    path.write_bytes(_rezip(data, {"xl/worksheets/sheet1.xml": sheet}))
    return path


REFUSED[xlsx_far_row_without_dimension] = ("row 1048576",)


def xlsx_far_column_without_dimension(folder: Path) -> Path:
    """A cell in the last column a sheet can have (XFD), and no ``dimension`` element."""
    import re

    data = _workbook_bytes([HEADER.split(","), ROW.split(",")])
    sheet = re.sub(rb"<dimension [^>]*/>", b"", _sheet_xml(data))
    sheet = sheet.replace(b"</row></sheetData>", b'<c r="XFD2" t="n"><v>1</v></c></row></sheetData>')
    path = folder / "far_column.xlsx"
    path.write_bytes(_rezip(data, {"xl/worksheets/sheet1.xml": sheet}))
    return path


REFUSED[xlsx_far_column_without_dimension] = ("column XFD",)
