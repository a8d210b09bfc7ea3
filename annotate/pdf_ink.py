"""report.pdf's table cells, text lines and page numbers written straight into the page.

fpdf2's ``FPDF.text``, ``rect`` and ``cell`` each check and coerce their arguments,
encode the text character by character and append one line to the page; a
2,000-circuit report calls them a third of a million times.  :class:`Ink` writes
the same content-stream lines fpdf2 writes for our few cases (a left-aligned
line of text, a rectangle, a colour change) from cached strings.  A table row's
lines are made once as a format string holding all but its y positions
(:meth:`Ink.row`): equal rows (the same texts, widths and look, from the same
state) are drawn again by formatting those few numbers; a table goes to the
page in one append.  fpdf2's own state (colours, font,
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

__all__ = ["Ink", "InkLook", "InkRow", "number_pages"]


class InkLook(NamedTuple):
    """How a table cell is drawn: font style, fill and text colour (RGB).

    ``fill`` None: the cell is only outlined; ``text`` None: the current text colour.
    """

    style: str = ""
    fill: tuple[int, int, int] | None = None
    text: tuple[int, int, int] | None = None


class InkRow(NamedTuple):
    """A table row as drawn: its height [mm], each cell's width [mm], lines and look.

    ``key`` names the row in its document (equal rows, one key): :meth:`Ink.row`
    keeps the row's content-stream lines under it.
    """

    key: int
    height: float
    widths: tuple[float, ...]
    lines: tuple[tuple[str, ...], ...]
    looks: tuple[InkLook, ...]


class _Template(NamedTuple):
    """A row's lines as a format string (:meth:`Ink._template`), and what drawing it did.

    ``events``: the font changes (a style) and fonts set on the page (None), in order;
    ``fill``: the fill colour it left, None when unchanged.
    """

    text: str
    slots: tuple[tuple[int, float], ...]
    events: tuple[str | None, ...]
    fill: object


class _Slots:
    """The y fields of a template: each (line index, drop) its field number, from 1."""

    def __init__(self) -> None:
        self.order: list[tuple[int, float]] = []
        self._of: dict[tuple[int, float], int] = {}

    def field(self, i: int, drop: float) -> int:
        n = self._of.get((i, drop))
        if n is None:
            self.order.append((i, drop))
            n = self._of[(i, drop)] = len(self.order)
        return n


def _braces(text: str) -> str:
    """``text`` as literal text of a format string."""
    return text.replace("{", "{{").replace("}", "}}") if "{" in text or "}" in text else text


class _Codes(dict):
    """A font's escaped two-byte code of each character (``str.translate`` table).

    A character not seen yet is encoded by the font itself (which adds its glyph
    to the subset, as drawing it with fpdf2 would).
    """

    def __init__(self, font) -> None:
        super().__init__()
        self.font = font
        #: lines of table cells already encoded, braces doubled (:meth:`Ink._template`)
        self.lines: dict[str, str] = {}

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
        self._text_ops: dict[int, tuple[object, str]] = {}
        self._out: list[str] = []
        self._templates: dict[tuple, _Template] = {}
        self._seen: set[int] = set()

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
        """``FPDF.set_font`` when the font changes (it writes nothing).

        A change to a font added with ``add_font`` in style "" or "B" is made as
        ``set_font`` makes it (the font, family, style and size selected, "set on
        the page" cleared, no underline or strikethrough); any other through it.
        """
        pdf = self.pdf
        family = family.lower()  # fpdf2 keeps the family in lower case; style "" or "B" as given
        if pdf.font_style != style or pdf.font_family != family:
            font = pdf.fonts.get(family + style) if style in ("", "B") else None
            if font is None:
                pdf.set_font(family, style, pt)
                return
            pdf.underline = pdf.strikethrough = False
            pdf.font_family, pdf.font_style, pdf.font_size_pt = family, style, pt
            pdf.current_font = font
            pdf.current_font_is_set_on_page = False
        elif pdf.font_size_pt != pt:
            pdf.set_font(family, style, pt)

    def row(self, x: float, y: float, pt: float, row: InkRow) -> None:
        """A table row from (x, y) [mm]: each cell outlined (and filled), its lines.

        As ``rect(x, y, w, height, "DF" or "D")``, ``set_font`` and ``text`` for each
        line, ``line_mm`` apart, ``pad_mm`` in from the cell's top left (the text as
        ``multi_cell(padding=pad_mm)`` places it: baseline at top + line/2 + 0.3 x
        font size).  The row's lines are made once per row and the state fpdf2 is in
        (fill and text colour, font, font set on the page) as a format string holding
        everything but the row's heights on the page (:meth:`_template`), kept once the
        row is drawn a second time in that state (a hash seen before; a collision only
        keeps one early); drawing it again formats those few numbers and repeats the
        font calls it made.
        """
        pdf = self.pdf
        state = (row.key, x, pt, pdf.h, pdf.fill_color, pdf.text_color, pdf.font_family,
                 pdf.font_style, pdf.font_size_pt, pdf.current_font_is_set_on_page)
        got = self._templates.get(state)
        if got is None:
            got = self._template(x, pt, row)
            seen = hash(state)  # kept from the second time on: most rows are drawn once
            if seen in self._seen:
                self._templates[state] = got
            else:
                self._seen.add(seen)
        else:
            for event in got.events:  # the font calls the row made, in order
                if event is None:
                    pdf._set_font_for_page(pdf.current_font, pdf.font_size_pt)
                else:
                    self.font(self.family, event, pt)
            if got.fill is not None:
                pdf.fill_color = got.fill
        if got.text:
            k, page_h, step, top = pdf.k, pdf.h, self.line_mm, y + self.pad_mm
            self._out.append(got.text.format((page_h - y) * k, *[(page_h - (top + i * step + drop)) * k
                                                                  for i, drop in got.slots]))

    def _template(self, x: float, pt: float, row: InkRow) -> _Template:
        """The row's content-stream lines with its y positions as ``{n:.2f}`` fields.

        Field 0 is the rows's top, ``(page_h - y) * k``; field n the baseline of line
        ``slots[n - 1] = (i, drop)``, ``(page_h - (y + pad + i * line_mm + drop)) * k``:
        the expressions fpdf2's ``rect`` and ``text`` format, so the numbers written
        are the same.  fpdf2's state changes as drawing the row changes it; the
        font calls are kept to be made again.
        """
        pdf = self.pdf
        k, step = pdf.k, self.line_mm
        high = f" {-row.height * k:.2f} re "
        parts: list[str] = []
        slots = _Slots()
        events: list[str | None] = []
        fill = pdf_fill = pdf.fill_color
        style = None  # the font is checked against fpdf2's at the first cell
        drop = 0.0
        for width, lines, look in zip(row.widths, row.lines, row.looks, strict=False):
            if look.fill is None:
                op = "S"
            else:
                device, _, fill_op = self._color(look.fill)
                if device != fill:
                    fill = pdf.fill_color = device
                    parts.append(fill_op)
                op = "B"
            parts.append(f"{x * k:.2f} {{0:.2f}} {width * k:.2f}{high}{op}")
            if look.style != style:
                before_font = (pdf.font_family, pdf.font_style, pdf.font_size_pt)
                self.font(self.family, look.style, pt)
                if (pdf.font_family, pdf.font_style, pdf.font_size_pt) != before_font:
                    events.append(look.style)  # a change: made again when the row is drawn again
                style, codes = look.style, self._font_codes()
                drop = 0.5 * step + 0.3 * pdf.font_size
            if any(lines):
                if not pdf.current_font_is_set_on_page:
                    events.append(None)
                    parts.append(pdf._set_font_for_page(pdf.current_font, pdf.font_size_pt))
                self._cell_text(parts, x, lines, fill, look.text, codes, drop, slots)
            x += width
        return _Template("\n".join(parts), tuple(slots.order), tuple(events),
                         fill if fill != pdf_fill else None)

    def _cell_text(self, parts: list[str], x: float, lines: Sequence[str], fill, text,
                   codes: _Codes, drop: float, slots: _Slots) -> None:
        """A cell's text lines (as ``text`` writes them, in the text colour ``text`` or the
        current one) with their y positions as template fields."""
        pdf = self.pdf
        color = pdf.text_color if text is None else self._color(text)[0]
        before, after = "BT ", " ET"
        if fill != color:
            before, after = f"q {self._text_op(color)} BT ", " ET Q"
        xk = f"{(x + self.pad_mm) * pdf.k:.2f}"
        encoded_lines = codes.lines
        for i, line in enumerate(lines):
            if line:
                encoded = encoded_lines.get(line)
                if encoded is None:
                    encoded = encoded_lines[line] = _braces(line.translate(codes))
                parts.append(f"{before}{xk} {{{slots.field(i, drop)}:.2f}} Td ({encoded}) Tj{after}")

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
        # by the object's id (its hash is computed in Python), the object kept beside it
        got = self._text_ops.get(id(color))
        if got is None or got[0] is not color:
            got = self._text_ops[id(color)] = (color, color.serialize().lower())
        return got[1]

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
