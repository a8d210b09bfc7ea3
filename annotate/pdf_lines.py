"""Line breaking of report.pdf's cells and paragraphs, as fpdf2 breaks them, memoised.

References
----------
.. [1] fpdf2 2.8 ``line_break.MultiLineBreak.get_line`` and ``FPDF.multi_cell``.
"""

from __future__ import annotations

from bisect import bisect_right
from itertools import accumulate

__all__ = ["CellLines"]

#: Characters our line breaking leaves to fpdf2 (other breaking spaces, no-break and soft
#: hyphens, form feeds, carriage returns): their widths or break rules differ from a plain
#: space's, so :class:`CellLines` hands such a text to ``multi_cell(dry_run=True)``.
_SPECIAL_CHARS = frozenset("\u200b\u2000\u2001\u2002\u2003\u2004\u2005\u2006\u2007\u2008\u2009"
                           "\u200a\u205f\u3000\u00a0\u00ad\u000c\r")
#: The tolerance of fpdf2's width comparison (``fpdf.util.FloatTolerance``).
_WIDTH_TOLERANCE = 1e-9
#: A text whose whole width is this far inside the cell [mm] is one line without the walk
#: character by character: far above the rounding of the sums (about 1e-12 mm on a page), so
#: fpdf2's test at each character, on a part of that width, cannot pass.
_CLEARLY_INSIDE_MM = 1e-6


class CellLines:
    """The lines of a text in a cell, as fpdf2's ``multi_cell`` breaks them, memoised.

    fpdf2 breaks a line where the next character would pass the cell's width: at
    the last space before it (the space dropped), else inside the word; a newline
    ends a line.  The width of a run is the sum of the font's glyph widths
    (``cw``, 1/1000 em) x size / 1000 / k.  Re-measuring the same text each time a
    block, a table and a row is sized (and drawing it with ``multi_cell``, which
    breaks it again) took most of the report's time; here each text is broken once.
    A text with a special character (:data:`_SPECIAL_CHARS`) is broken by fpdf2
    itself.  ``tests/test_report_pdf_lines.py`` holds the two equal on the sample's
    texts and seeded random ones.

    References
    ----------
    .. [1] fpdf2 2.8 ``line_break.MultiLineBreak.get_line`` (word wrap, align left).
    """

    def __init__(self, pdf, family: str, line_mm: float, pad_mm: float) -> None:
        self.pdf = pdf
        self.family = family
        self.line_mm = line_mm
        self.pad_mm = pad_mm
        self._cache: dict[tuple[str, float, str, float, bool], tuple[str, ...]] = {}

    def __call__(self, text: str, width_mm: float, style: str, pt: float,
                 padded: bool = True) -> tuple[str, ...]:
        """Lines of ``text`` in a cell ``width_mm`` wide in ``style`` ("" or "B") at ``pt``.

        ``padded``: the cell has ``pad_mm`` padding (a table cell), else fpdf2's
        ``c_margin`` each side (a paragraph).
        """
        key = (text, width_mm, style, pt, padded)
        got = self._cache.get(key)
        if got is None:
            got = self._cache[key] = self._break(text, width_mm, style, pt, padded)
        return got

    def _break(self, text: str, width_mm: float, style: str, pt: float, padded: bool
               ) -> tuple[str, ...]:
        pdf = self.pdf
        if pdf.font_style != style or pdf.font_size_pt != pt or pdf.font_family != self.family.lower():
            pdf.set_font(self.family, style, pt)  # only on a change, as drawing does (no output)
        if not _SPECIAL_CHARS.isdisjoint(text):
            return self._fpdf(text, width_mm, padded)
        max_w = width_mm - 2 * self.pad_mm if padded else width_mm - 2 * pdf.c_margin
        fits = _Fits(pdf.current_font.cw, pt * 0.001, pdf.k, max_w)
        glyphs = list(map(fits.cw.__getitem__, map(ord, text)))
        if "\n" not in text:
            units = sum(glyphs)
            if units and units * fits.scale / fits.k - max_w < -_CLEARLY_INSIDE_MM:
                return (text,)
        run = [0, *accumulate(glyphs)]  # run[j]: units of text[:j]
        lines: list[str] = []
        i = 0
        while i < len(text):
            line, i = _next_line(text, i, glyphs, run, fits)
            if line is _NO_ROOM:  # not even one character fits: fpdf2 says so
                return self._fpdf(text, width_mm, padded)
            if line is not None:
                lines.append(line)
        return tuple(lines) or ("",)

    def _fpdf(self, text: str, width_mm: float, padded: bool) -> tuple[str, ...]:
        """The reference: fpdf2's own line breaking (a dry run of ``multi_cell``)."""
        if padded:
            got = self.pdf.multi_cell(width_mm, self.line_mm, text, dry_run=True, output="LINES",
                                      padding=self.pad_mm, align="L")
        else:
            got = self.pdf.multi_cell(width_mm, self.line_mm, text, dry_run=True, output="LINES")
        return tuple(got)


#: :func:`_next_line`'s answer when not one character fits the width.
_NO_ROOM = object()


class _Fits:
    """Whether a run of glyph width units plus one glyph passes the width (fpdf2's test)."""

    __slots__ = ("cw", "scale", "k", "max_w", "surely_inside")

    def __init__(self, cw, scale: float, k: float, max_w: float) -> None:
        self.cw, self.scale, self.k, self.max_w = cw, scale, k, max_w
        #: units at or below which fpdf2's test cannot pass: :data:`_CLEARLY_INSIDE_MM` inside
        #: the width plus its tolerance (the test's rounding is about 1e-12 mm)
        self.surely_inside = (max_w + _WIDTH_TOLERANCE - _CLEARLY_INSIDE_MM) * k / scale

    def passes(self, units: int, glyph: int) -> bool:
        # the expression of fpdf2: run width + character width, each sum(cw) x pt x 0.001 / k
        return (units * self.scale / self.k + glyph * self.scale / self.k) - self.max_w > _WIDTH_TOLERANCE


def _next_line(text: str, i: int, glyphs: list[int], run: list[int], fits: _Fits):
    """The line starting at ``text[i]`` and where the next begins.

    ``glyphs`` are the characters' width units, ``run[j]`` their sum over ``text[:j]``.
    fpdf2 walks the line character by character until one passes the width; the
    characters whose run is surely inside (:attr:`_Fits.surely_inside`) are skipped
    by a bisection of ``run`` and fpdf2's own test made from there on.  The last
    space before the break is ``rfind``'s.

    Returns ``(line, next_i)``; ``line`` is None when only zero-width text was
    left, :data:`_NO_ROOM` when the first character alone passes the width.
    """
    start = i
    end = text.find("\n", start)
    if end < 0:
        end = len(text)
    base = run[start]
    # the first character whose run (with it) may pass: run[j] > base + surely_inside at j = i + 1
    i = max(start, bisect_right(run, base + fits.surely_inside, start + 1, end + 1) - 1)
    while i < end:
        if fits.passes(run[i] - base, glyphs[i]):
            if text[i] == " ":  # the space at the break is dropped
                return text[start:i], i + 1
            space_at = text.rfind(" ", start, i)
            if space_at >= 0:  # back to the last space
                return text[start:space_at], space_at + 1
            if i > start:  # a word longer than the cell: cut inside it
                return text[start:i], i
            return _NO_ROOM, len(text)
        i += 1
    if end < len(text):  # a newline ends the line
        return text[start:end], end + 1
    return (text[start:end] if run[end] - base else None), end
