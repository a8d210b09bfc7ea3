"""The rows of a worksheet (its ``<sheetData>``) written as XML text, as openpyxl writes them.

openpyxl keeps the workbook's structure (styles, sheet settings, print setup,
defined names); only the cells are written here, one string per row, because
openpyxl's cell writer (an element tree per cell, serialised one by one) took
nearly all the time of ``schedule.xlsx`` (issue 13).  The text is the one
openpyxl's write-only mode writes for the same values, byte for byte
(``tests/test_xlsx_rows.py`` checks it against openpyxl itself):

- a string is an inline string (``t="inlineStr"``), cut to 32,767 characters,
  ``&``, ``<`` and ``>`` escaped, ``xml:space="preserve"`` when it begins or ends
  with white space; a string holding a character XML 1.0 does not allow raises
  openpyxl's ``IllegalCharacterError``, as openpyxl does;
- a number is ``t="n"`` written ``%.16g``, a bool ``t="b"`` 1 or 0;
- a blank is left out unless it is styled (a filled row);
- anything else (a formula-like or error text not kept as text, a date, a
  non-finite number, ...) is handed to openpyxl's own cell writer.

The workbook is saved by openpyxl with an empty ``<sheetData>`` and the rows
are put in it as the zip is written (:func:`splice_rows`).

References
----------
.. [1] ECMA-376-1:2016, Part 1, 18.3.1.73 ``row``, 18.3.1.4 ``c`` (attributes
   ``r``, ``s``, ``t``), 18.3.1.53 ``is`` (inline string), 18.3.1.96 ``v``.
.. [2] W3C, "Extensible Markup Language (XML) 1.0 (Fifth Edition)", 2.2 Characters
   (``Char``: no C0 control characters other than tab, line feed, carriage return),
   2.4 Character Data (``&`` and ``<`` escaped), 2.10 White Space Handling (``xml:space``).
.. [3] openpyxl 3.1 source: ``openpyxl/cell/_writer.py`` (``etree_write_cell``),
   ``openpyxl/cell/cell.py`` (``check_string``, ``ILLEGAL_CHARACTERS_RE``,
   ``ERROR_CODES``), ``openpyxl/compat/strings.py`` (``safe_string``).
"""

from __future__ import annotations

import math
import re
from collections.abc import Sequence
from typing import Any

__all__ = ["ILLEGAL_CHARACTERS", "MAX_TEXT", "SheetRows", "EMPTY_SHEET_DATA", "splice_rows"]

#: Characters openpyxl refuses in a cell (its ``ILLEGAL_CHARACTERS_RE``): the C0
#: controls XML 1.0 does not allow [2]_ [3]_.
ILLEGAL_CHARACTERS = re.compile(r"[\000-\010]|[\013-\014]|[\016-\037]")
#: Longest text openpyxl keeps in a cell (its ``check_string`` cuts the rest) [3]_.
MAX_TEXT = 32767
#: Texts openpyxl writes as error cells (``t="e"``) [3]_.
_ERROR_CODES = frozenset(("#NULL!", "#DIV/0!", "#VALUE!", "#REF!", "#NAME?", "#NUM!", "#N/A"))
#: The ``<sheetData>`` of a write-only sheet saved with no rows appended.
EMPTY_SHEET_DATA = b"<sheetData></sheetData>"


def _escape(text: str) -> str:
    """Character data as ElementTree escapes it (``&``, ``<``, ``>``) [2]_."""
    if "&" in text:
        text = text.replace("&", "&amp;")
    if "<" in text:
        text = text.replace("<", "&lt;")
    if ">" in text:
        text = text.replace(">", "&gt;")
    return text


class SheetRows:
    """The ``<row>`` elements of one write-only sheet, appended one row at a time.

    Parameters
    ----------
    ws : openpyxl write-only worksheet
        The sheet the rows belong to; its workbook numbers the cell styles
        (in the order cells first use them, as openpyxl's own writer does).
    """

    def __init__(self, ws: Any) -> None:
        self._ws = ws
        self._cell_styles = ws.parent._cell_styles
        self._styles: dict[int, tuple[Any, str, bool]] = {}  # id -> (style array, ' s="n"', kept as text)
        self._letters: list[str] = []
        self._parts: list[str] = []
        self.rows = 0

    def _style(self, style: Any) -> tuple[Any, str, bool]:
        """``style``'s attribute text and whether its cells are kept as text (quote prefix)."""
        known = self._styles.get(id(style))
        if known is None:
            attr = f' s="{self._cell_styles.add(style)}"' if any(style) else ""
            known = self._styles[id(style)] = (style, attr, bool(style.quotePrefix))
        return known

    def _column(self, index: int) -> str:
        from openpyxl.utils import get_column_letter

        while len(self._letters) <= index:
            self._letters.append(get_column_letter(len(self._letters) + 1))
        return self._letters[index]

    def append(self, values: Sequence[Any], styles: Sequence[Any] | None = None) -> None:
        """One row: ``values``, each with its style array in ``styles`` (``None``: unstyled).

        A text whose style has a quote prefix is a string cell whatever it begins
        with (``=`` included), as :class:`.xlsx_style.RowCells` sets it.
        """
        self.rows += 1
        r = str(self.rows)
        out = [f'<row r="{r}">']
        if len(self._letters) < len(values):
            self._column(len(values) - 1)
        letters = self._letters
        for i, value in enumerate(values):
            style = styles[i] if styles is not None else None
            if style is None:
                s, as_text = "", False
            else:
                style, s, as_text = self._style(style)
            if value is None:
                if s:  # a styled blank (a filled row); an unstyled one is left out
                    out.append(f'<c r="{letters[i]}{r}"{s} t="n" />')
                continue
            t = type(value)
            if t is str:
                out.append(self._text(i, f'<c r="{letters[i]}{r}"{s}', value, style, as_text))
            elif t is int or (t is float and math.isfinite(value)):
                out.append(f'<c r="{letters[i]}{r}"{s} t="n"><v>{value:.16g}</v></c>')  # openpyxl safe_string
            elif t is bool:
                out.append(f'<c r="{letters[i]}{r}"{s} t="b"><v>{1 if value else 0}</v></c>')
            else:
                out.append(self._openpyxl_cell(i, value, style))
        out.append("</row>")
        self._parts.append("".join(out))

    def _text(self, index: int, start: str, value: str, style: Any, as_text: bool) -> str:
        """A text cell beginning ``start`` (``<c r=".." s=".."``): cut, checked, escaped [2]_ [3]_."""
        text = value[:MAX_TEXT]
        if ILLEGAL_CHARACTERS.search(text):
            from openpyxl.utils.exceptions import IllegalCharacterError

            raise IllegalCharacterError(f"{text} cannot be used in worksheets.")
        if not text:
            return f'{start} t="inlineStr" />'
        if not as_text and ((len(text) > 1 and text[0] == "=") or text in _ERROR_CODES):
            return self._openpyxl_cell(index, value, style)  # a formula or an error cell, as openpyxl has it
        stripped = text.strip()
        space = ' xml:space="preserve"' if stripped and stripped != text else ""
        return f'{start} t="inlineStr"><is><t{space}>{_escape(text)}</t></is></c>'

    def _openpyxl_cell(self, index: int, value: Any, style: Any) -> str:
        """One cell as openpyxl's own cell writer writes it (values this module does not write)."""
        import io

        from openpyxl.cell import WriteOnlyCell
        from openpyxl.cell._writer import write_cell
        from openpyxl.xml.constants import SHEET_MAIN_NS
        from openpyxl.xml.functions import xmlfile

        cell = WriteOnlyCell(self._ws)
        cell.row, cell.column = self.rows, index + 1
        if style is not None:
            cell._style = style.__copy__()  # type: ignore[attr-defined]
        cell.value = value  # after the style: a date sets its number format on it, as in openpyxl
        if style is not None and style.quotePrefix and isinstance(value, str):
            cell.data_type = "s"
        if cell._value is None and not cell.has_style:  # type: ignore[attr-defined]
            return ""
        buf = io.BytesIO()
        # the elements around the cell as in a saved sheet, so it is written in the same context
        with xmlfile(buf) as xf, xf.element("worksheet", xmlns=SHEET_MAIN_NS), xf.element("row"):
            write_cell(xf, self._ws, cell, cell.has_style)
        text = buf.getvalue().decode("utf-8")
        return text[text.index("<row>") + len("<row>"):text.rindex("</row>")]

    @property
    def part(self) -> str:
        """The sheet's part in the zip (``xl/worksheets/sheetN.xml``), known once the workbook is saved."""
        return str(self._ws.path)[1:]

    def xml(self) -> bytes:
        """The rows as UTF-8, unencodable characters as character references (as openpyxl's writer)."""
        return "".join(self._parts).encode("utf-8", "xmlcharrefreplace")


def splice_rows(sheet_xml: bytes, rows_xml: bytes) -> bytes:
    """``sheet_xml`` (a sheet saved with no rows) with ``rows_xml`` in its ``<sheetData>``."""
    if sheet_xml.count(EMPTY_SHEET_DATA) != 1:
        raise ValueError("the saved sheet has no empty <sheetData> to put the rows in")
    head, tail = sheet_xml.split(EMPTY_SHEET_DATA)
    return b"".join((head, b"<sheetData>", rows_xml, b"</sheetData>", tail))
