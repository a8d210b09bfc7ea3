"""How ``schedule.xlsx`` looks and prints: number formats with units, failed rows, page setup.

Kept apart from the cell values (:mod:`.schedule_files`): the writer hands each
row here to be styled, and each sheet to be set up for printing.

- Number formats carry the unit of the column header (``12.7 m``, ``132.5 A``,
  ``0.52 %``, ``70 mm²``), so a printed or copied cell still says what it is;
  the cell keeps the plain number; lengths in feet (NEC) read ``41.7 ft``.
- Rows whose status is ``fail`` or ``error`` are filled red, ``warning`` amber.
- Every sheet prints landscape, fitted to one page wide, with the header row
  repeated on every page.

References
----------
.. [1] ECMA-376-1:2016, Part 1, 18.8.31 (numFmt: number format codes, quoted
   literal text) and 18.3.1.63 (pageSetup: orientation, fitToWidth, fitToHeight).
.. [2] openpyxl documentation: "Print Settings" (``print_title_rows``,
   ``page_setup``, ``sheet_properties.pageSetUpPr.fitToPage``), ``WriteOnlyCell``.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

__all__ = ["number_format", "STATUS_FILLS", "styled_row", "setup_print"]

#: Number format per unit in a column header "[...]" (ECMA-376 numFmt codes).
UNIT_FORMATS = {
    "[m]": '0.0" m"',
    "[ft]": '0.0" ft"',
    "[A]": '0.0" A"',
    "[%]": '0.00" %"',
    "[mm²]": 'General" mm²"',
}
#: Columns whose values are whole numbers or a few standard steps: no forced decimals.
EXACT_FORMATS = {
    "device [A]": 'General" A"',
    "correction factor": "0.000",
}
#: Fill colour (ARGB) of a row by its status: red for fail/error, amber for warning.
STATUS_FILLS = {"fail": "FFF4C7C3", "error": "FFE1BEE7", "warning": "FFFFE0B2"}


def number_format(header: str) -> str | None:
    """The number format of a column from its header's unit, or ``None`` (General)."""
    if header in EXACT_FORMATS:
        return EXACT_FORMATS[header]
    for unit, fmt in UNIT_FORMATS.items():
        if header.endswith(unit):
            return fmt
    return None


def styled_row(ws: Any, headers: Sequence[str], values: Sequence[Any], status: str | None) -> list[Any]:
    """One row as write-only cells: unit formats on numbers, the row filled by its status."""
    from openpyxl.cell import WriteOnlyCell
    from openpyxl.styles import PatternFill

    colour = STATUS_FILLS.get(status or "")
    fill = PatternFill("solid", start_color=colour, end_color=colour) if colour else None
    cells = []
    for header, value in zip(headers, values, strict=True):
        cell = WriteOnlyCell(ws, value=value)
        fmt = number_format(header)
        if fmt and isinstance(value, (int, float)) and not isinstance(value, bool):
            cell.number_format = fmt
        if fill is not None:
            cell.fill = fill
        cells.append(cell)
    return cells


def setup_print(ws: Any) -> None:
    """Landscape, one page wide (as many tall as needed), header row on every page."""
    ws.page_setup.orientation = "landscape"
    ws.page_setup.fitToWidth = 1
    ws.page_setup.fitToHeight = 0
    ws.sheet_properties.pageSetUpPr.fitToPage = True
    ws.print_title_rows = "1:1"
