"""report.pdf's table cells, text lines and page numbers written straight into the page.

fpdf2's ``FPDF.text``, ``rect`` and ``cell`` each check and coerce their arguments,
encode the text character by character and append one line to the page; a
2,000-circuit report calls them a third of a million times.  :class:`Ink` writes
the same content-stream lines fpdf2 writes for our few cases (a left-aligned
line of text, a rectangle, a colour change) from cached strings, and hands a
whole table row to the page in one append.  fpdf2's own state (colours, font,
"font set on this page") is kept as fpdf2 keeps it, so what fpdf2 draws after
(headers, page breaks) is unchanged; the pages' content is byte for byte what
fpdf2's calls give (``benchmarks/bench_report_pdf.py`` compares the text of
every page read back).

References
----------
.. [1] fpdf2 2.8 ``FPDF.text``, ``FPDF.rect``, ``FPDF._render_styled_text_line``
   (the strings written), ``TTFFont.encode_text`` (a character's code in the subset).
.. [2] ISO 32000-1:2008, 8.4.2 (``q``/``Q``), 9.4 (``BT``, ``Td``, ``Tj``), 8.5.2 (``re``).
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import NamedTuple

__all__ = ["Ink", "InkCell", "number_pages"]


class InkCell(NamedTuple):
    """One cell of a table row: width [mm], its lines, font style, fill and text colour (RGB).

    ``fill`` None: the cell is only outlined; ``text`` None: the current text colour.
    """

    width: float
    lines: Sequence[str]
    style: str = ""
    fill: tuple[int, int, int] | None = None
    text: tuple[int, int, int] | None = None


class _Codes(dict):
    """A font's escaped two-byte code of each character (``str.translate`` table).

    A character not seen yet is encoded by the font itself (which adds its glyph
    to the subset, as drawing it with fpdf2 would).
    """

    def __init__(self, font) -> None:
        super().__init__()
        self.font = font

    def __missing__(self, code: int) -> str:
        got = self[code] = self.font.encode_text(chr(code))[1:-len(") Tj")]
        return got


class Ink:
    """Text lines, rectangles and colours of one document, collected and written per row.

    Call :meth:`flush` before any fpdf2 call that writes to the page (``add_page``,
    ``cell``, ``line``): the collected lines must come first.
    """

    def __init__(self, pdf, family: str, line_mm: float, pad_mm: float) -> None:
        from fpdf.drawing_primitives import convert_to_device_color

        self.pdf = pdf
        self.family, self.line_mm, self.pad_mm = family, line_mm, pad_mm
        self._convert = convert_to_device_color
        self._colors: dict[tuple[int, int, int], tuple[object, str, str]] = {}
        self._codes: dict[int, _Codes] = {}
        self._text_ops: dict[object, str] = {}
        self._out: list[str] = []

    def _color(self, rgb: tuple[int, int, int]) -> tuple[object, str, str]:
        got = self._colors.get(rgb)
        if got is None:
            device = self._convert(*rgb)
            got = self._colors[rgb] = (device, device.serialize().upper(), device.serialize().lower())
        return got

    def draw_color(self, rgb: tuple[int, int, int]) -> None:
        """``FPDF.set_draw_color``: the stroke colour, written when it changes."""
        device, stroke, _ = self._color(rgb)
        if device != self.pdf.draw_color:
            self.pdf.draw_color = device
            self._out.append(stroke)

    def text_color(self, rgb: tuple[int, int, int]) -> None:
        """``FPDF.set_text_color`` (written with each text, as fpdf2 does)."""
        self.pdf.text_color = self._color(rgb)[0]

    def font(self, family: str, style: str, pt: float) -> None:
        """``FPDF.set_font``, called only when the font changes (it writes nothing)."""
        pdf = self.pdf
        # fpdf2 keeps the family in lower case; style "" or "B" as given
        if pdf.font_style != style or pdf.font_size_pt != pt or pdf.font_family != family.lower():
            pdf.set_font(family, style, pt)

    def row(self, x: float, y: float, height: float, pt: float, cells: Sequence[InkCell]) -> None:
        """A table row from (x, y) [mm], ``height`` high: each cell outlined (and filled), its lines.

        As ``rect(x, y, w, height, "DF" or "D")``, ``set_font`` and ``text`` for each
        line, ``line_mm`` apart, ``pad_mm`` in from the cell's top left (the text as
        ``multi_cell(padding=pad_mm)`` places it: baseline at top + line/2 + 0.3 x
        font size).  fpdf2's colours and font are read once and followed here (this
        is the loop of the whole report).
        """
        pdf = self.pdf
        k, page_h, pad, step = pdf.k, pdf.h, self.pad_mm, self.line_mm
        at_y = f" {(page_h - y) * k:.2f} "
        high = f" {-height * k:.2f} re "
        top = y + pad
        out = self._out.append
        fill, text_color = pdf.fill_color, pdf.text_color
        style = None  # the font is checked against fpdf2's at the first cell
        for cell in cells:
            if cell.fill is None:
                op = "S"
            else:
                device, _, fill_op = self._color(cell.fill)
                if device != fill:
                    fill = pdf.fill_color = device
                    out(fill_op)
                op = "B"
            out(f"{x * k:.2f}{at_y}{cell.width * k:.2f}{high}{op}")
            if cell.style != style:
                self.font(self.family, cell.style, pt)
                style, codes = cell.style, self._font_codes()
                drop = 0.5 * step + 0.3 * pdf.font_size
            if any(cell.lines):
                if not pdf.current_font_is_set_on_page:
                    out(pdf._set_font_for_page(pdf.current_font, pdf.font_size_pt))
                color = text_color if cell.text is None else self._color(cell.text)[0]
                before, after = "BT ", " ET"
                if fill != color:
                    before, after = f"q {self._text_op(color)} BT ", " ET Q"
                xk = f"{(x + pad) * k:.2f}"
                for i, line in enumerate(cell.lines):
                    if line:
                        out(f"{before}{xk} {(page_h - (top + i * step + drop)) * k:.2f} Td "
                            f"({line.translate(codes)}) Tj{after}")
            x += cell.width

    def line(self, x1: float, y1: float, x2: float, y2: float) -> None:
        """``FPDF.line``: a straight line from (x1, y1) to (x2, y2) [mm]."""
        k, page_h = self.pdf.k, self.pdf.h
        self._out.append(f"{x1 * k:.2f} {(page_h - y1) * k:.2f} m {x2 * k:.2f} {(page_h - y2) * k:.2f} l S")

    def _font_codes(self) -> _Codes:
        font = self.pdf.current_font
        codes = self._codes.get(font.i)
        if codes is None:
            codes = self._codes[font.i] = _Codes(font)
        return codes

    def _encoded(self, text: str) -> str:
        return f"({text.translate(self._font_codes())}) Tj"

    def _font_on_page(self) -> None:
        pdf = self.pdf
        if not pdf.current_font_is_set_on_page:
            self._out.append(pdf._set_font_for_page(pdf.current_font, pdf.font_size_pt))

    def _text_op(self, color) -> str:
        """A text colour's operator (fpdf2 writes it with each text unless it is the fill's)."""
        got = self._text_ops.get(color)
        if got is None:
            got = self._text_ops[color] = color.serialize().lower()
        return got

    def _color_text(self) -> str:
        return self._text_op(self.pdf.text_color)

    def text(self, x: float, y: float, text: str) -> None:
        """``FPDF.text``: ``text`` with its baseline starting at (x, y) [mm]."""
        pdf = self.pdf
        self._font_on_page()
        k = pdf.k
        line = f"BT {x * k:.2f} {(pdf.h - y) * k:.2f} Td {self._encoded(text)} ET"
        if pdf.fill_color != pdf.text_color:
            line = f"q {self._color_text()} {line} Q"
        self._out.append(line)

    def cell_line(self, h: float, text: str) -> None:
        """``FPDF.cell(0, h, text, new_x="LMARGIN", new_y="NEXT")`` for a line that fits.

        The text starts ``c_margin`` in, its baseline at top + h/2 + 0.3 x font
        size; no page break is made here (the caller has made room).
        """
        pdf = self.pdf
        if text:
            self._font_on_page()
            k = pdf.k
            line = (f"BT {(pdf.x + pdf.c_margin) * k:.2f} "
                    f"{(pdf.h - pdf.y - 0.5 * h - 0.3 * pdf.font_size) * k:.2f} Td")
            if pdf.text_color != pdf.fill_color:
                line = f"q {line} {self._color_text()} {self._encoded(text)} ET Q"
            else:
                line = f"{line} {self._encoded(text)} ET"
            self._out.append(line)
        pdf.set_xy(pdf.l_margin, pdf.y + h)

    def flush(self) -> None:
        """Write what was collected to the current page, in one append."""
        if self._out:
            self.pdf._out("\n".join(self._out))
            self._out.clear()


def number_pages(pdf, family: str, pt: float, bottom_mm: float, h: float, template: str) -> None:
    """Write ``template.format(n=page, total=pages)`` at the foot of every page, right-aligned.

    Run once all pages exist, so the total is known and each footer is aligned on
    its own width (fpdf2's ``{nb}`` alias reserves the width of three digits and
    runs past the margin from page 1,000 on).  Each footer is placed as
    ``set_y(-bottom_mm); cell(0, h, text, align="R")`` places it, at the end of its
    page's content, with its own font and black text inside ``q``/``Q`` (the page's
    last colour and font are unknown here).

    Parameters
    ----------
    pdf : fpdf.FPDF
        The document, every page added.
    family, pt : str, float
        Font family and size [pt].
    bottom_mm : float
        Distance of the footer cell's top from the page foot [mm].
    h : float
        Footer cell height [mm].
    template : str
        The footer text, with ``{n}`` and ``{total}``.
    """
    last = pdf.page
    pdf.set_font(family, "", pt)
    k, font = pdf.k, pdf.current_font
    codes = _Codes(font)
    for n in range(1, last + 1):
        pdf.page = n
        text = template.format(n=n, total=last)
        tf = pdf._set_font_for_page(font, pdf.font_size_pt, wrap_in_text_object=False)
        y = pdf.h - bottom_mm
        x = pdf.w - pdf.r_margin - pdf.c_margin - pdf.get_string_width(text)
        pdf._out(f"q 0 g BT {tf} {x * k:.2f} {(pdf.h - y - 0.5 * h - 0.3 * pdf.font_size) * k:.2f} Td "
                 f"({text.translate(codes)}) Tj ET Q")
    pdf.page = last
