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

from collections.abc import Callable, Sequence
from typing import Any

__all__ = ["number_format", "STATUS_FILLS", "styled_row", "RowCells", "setup_print"]

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
    """One row as write-only cells: unit formats on numbers, the row filled by its status.

    Every cell is a styled cell object; the schedule writer uses :class:`RowCells`,
    which gives the same cells, style by style, built once per sheet.
    """
    return RowCells(ws, headers).cells(values, status, every_cell=True)


#: The style of one cell: (number format or ``None``, fill colour or ``None``, quote prefix).
StyleKey = tuple[str | None, str | None, bool]


class RowCells:
    """The styles of the rows of one write-only sheet, each distinct style built once.

    A cell that needs no style (a blank or text of a row not filled, a number of a
    column with no unit format) is handed over as its plain value, which write-only
    mode writes exactly as an unstyled cell [2]_; every other cell is made with the
    style array of a prototype cell, one per (number format, fill, quote prefix),
    instead of setting its format and fill one by one (each of those looks the
    style up in the workbook's lists).  The prototypes are made when a cell first
    needs them, format before fill as one cell was styled, so the workbook's number
    formats, fills and cell styles are numbered as before.

    Parameters
    ----------
    ws : openpyxl write-only worksheet
    headers : sequence of str
        Column headers (:func:`number_format` reads their units).
    as_text : callable, optional
        True for a text that must be stored as text with a quote prefix (text that
        would read as a formula, :func:`.schedule_files.is_formula_like`).
    """

    def __init__(self, ws: Any, headers: Sequence[str], as_text: Callable[[str], bool] | None = None) -> None:
        self._ws = ws
        self._formats = tuple(number_format(h) for h in headers)
        self._as_text = as_text
        self._styles: dict[StyleKey, Any] = {}

    def _style(self, key: StyleKey) -> Any:
        """The style array of ``key``, its prototype made on first use."""
        style = self._styles.get(key)
        if style is None:
            from openpyxl.cell import WriteOnlyCell
            from openpyxl.styles import PatternFill

            fmt, colour, quote = key
            proto = WriteOnlyCell(self._ws)
            if fmt is not None:
                proto.number_format = fmt
            if colour is not None:
                proto.fill = PatternFill("solid", start_color=colour, end_color=colour)
            if quote:
                proto.quotePrefix = True
            # the cell's style array, as openpyxl's own WorksheetCopy copies styles
            style = self._styles[key] = proto._style  # type: ignore[attr-defined]
        return style

    def styles(self, values: Sequence[Any], status: str | None) -> list[Any]:
        """One row's style arrays, ``None`` where a cell needs no style (as :meth:`cells`),
        for :class:`.xlsx_rows.SheetRows`."""
        colour = STATUS_FILLS.get(status or "")
        as_text = self._as_text
        out: list[Any] = []
        for fmt, value in zip(self._formats, values, strict=True):
            if fmt is not None and (isinstance(value, bool) or not isinstance(value, (int, float))):
                fmt = None
            quote = as_text is not None and isinstance(value, str) and as_text(value)
            out.append(self._style((fmt, colour, quote)) if fmt or colour or quote else None)
        return out

    def cells(self, values: Sequence[Any], status: str | None, every_cell: bool = False) -> list[Any]:
        """One row: plain values where no style is needed (``every_cell``: cells throughout)."""
        from openpyxl.cell import Cell

        out: list[Any] = []
        for value, style in zip(values, self.styles(values, status), strict=True):
            if style is None and not every_cell:
                out.append(value)
                continue
            cell = Cell(self._ws, row=1, column=1, value=value, style_array=style)
            if style is not None and style.quotePrefix:
                cell.data_type = "s"  # a string cell, not a formula (ECMA-376 18.8.45 quotePrefix)
            out.append(cell)
        return out


def setup_print(ws: Any) -> None:
    """Landscape, one page wide (as many tall as needed), header row on every page."""
    ws.page_setup.orientation = "landscape"
    ws.page_setup.fitToWidth = 1
    ws.page_setup.fitToHeight = 0
    ws.sheet_properties.pageSetUpPr.fitToPage = True
    ws.print_title_rows = "1:1"
