"""report.pdf: our memoised line breaking equals fpdf2's own (the reference).

The fast form (:class:`cablewright.annotate.pdf_lines.CellLines`) must break every text
exactly where fpdf2's ``multi_cell(dry_run=True, output="LINES")`` breaks it, or row
heights and so the page breaks of report.pdf would change.  The reference is fpdf2
(a general-purpose PDF library) itself: the sample's texts at the widths the report
uses, and seeded random texts at random widths.
"""

from __future__ import annotations

import random
from pathlib import Path

import pytest
from cablewright.annotate import report_pdf
from cablewright.annotate.report_trace import circuit_trace
from fpdf.errors import FPDFException

from cablewright import pipeline
from cablewright.config import load_settings

ROOT = Path(__file__).resolve().parents[1]
DXF = ROOT / "sample_drawings" / "pumping_station.dxf"
CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"


@pytest.fixture(scope="module")
def pdf():
    doc = report_pdf._make_pdf("header")
    doc.add_page()
    return doc


def _fpdf_lines(pdf, text: str, width_mm: float, style: str, pt: float, padded: bool) -> tuple[str, ...]:
    pdf.set_font(report_pdf.FONT_FAMILY, style, pt)
    if padded:
        got = pdf.multi_cell(width_mm, report_pdf.LINE_MM, text, dry_run=True, output="LINES",
                             padding=report_pdf.PAD_MM, align="L")
    else:
        got = pdf.multi_cell(width_mm, report_pdf.LINE_MM, text, dry_run=True, output="LINES")
    return tuple(got)


def test_sample_texts_break_as_fpdf_breaks_them(pdf):
    settings = load_settings(None)
    job = pipeline.size_measurement(pipeline.measure_drawing(DXF, CSV, settings), settings)
    ours = report_pdf._lines(pdf)
    cases = 0
    for o in job.outcomes:
        trace = circuit_trace(o)
        for table in trace.tables:
            widths = report_pdf._widths(pdf, len(table.headers), table.headers)
            for style, row in [("B", table.headers)] + [("", r) for r in table.rows]:
                for w, text in zip(widths, row, strict=False):
                    assert ours(text, w, style, report_pdf.BODY_PT) == _fpdf_lines(pdf, text, w, style, report_pdf.BODY_PT, True)
                    cases += 1
        for text in (*trace.lines, *("- " + m for m in trace.messages)):
            assert ours(text, pdf.epw, "", report_pdf.BODY_PT, padded=False) == _fpdf_lines(
                pdf, text, pdf.epw, "", report_pdf.BODY_PT, False)
            cases += 1
    assert cases > 500  # every cell of the 19 sample circuits


WORDS = ("IEC", "60364-5-52:2009", "Table", "B.52.12", "Ib", "≤", "In", "×", "1.45", "Iz", "θa",
         "(θmax", "-", "θa)(Ib/Iz)²", "Ω", "mm²", "a", "", "Annex-G-simplified-formula-written-long",
         "ÄÖÜ", "kVA", "cos", "φ", "→", "0.08", "mΩ/m;", "\n")


def test_random_texts_break_as_fpdf_breaks_them(pdf):
    rng = random.Random(20261202)
    ours = report_pdf._lines(pdf)
    for _ in range(600):
        words = [rng.choice(WORDS) for _ in range(rng.randint(0, 40))]
        text = "".join(w + (" " * rng.choice((0, 1, 1, 1, 2))) for w in words)
        width = rng.uniform(6.0, 120.0)
        style = rng.choice(("", "B"))
        pt = rng.choice((report_pdf.BODY_PT, 10.0))
        padded = rng.random() < 0.7
        assert ours(text, width, style, pt, padded) == _fpdf_lines(pdf, text, width, style, pt, padded), \
            (text, width, style, pt, padded)


def test_special_characters_are_left_to_fpdf(pdf):
    ours = report_pdf._lines(pdf)
    for text in ("16\u00a0A no-break space " * 6, "soft\u00adhyphen " * 9, "thin\u2009space " * 9):
        assert ours(text, 30.0, "", report_pdf.BODY_PT) == _fpdf_lines(pdf, text, 30.0, "", report_pdf.BODY_PT, True)


def test_widths_on_a_glyph_boundary_break_as_fpdf_breaks_them(pdf):
    """Cells exactly as wide as a prefix of the text (and a hair either side of fpdf2's
    tolerance): the skip to the first character that may pass (a bisection of the run's
    width) must land where fpdf2's walk breaks."""
    rng = random.Random(20261204)
    ours = report_pdf._lines(pdf)
    pad = report_pdf.PAD_MM
    cases = 0
    for _ in range(300):
        words = [rng.choice(WORDS) for _ in range(rng.randint(1, 30))]
        text = " ".join(words)
        style = rng.choice(("", "B"))
        pdf.set_font(report_pdf.FONT_FAMILY, style, report_pdf.BODY_PT)
        cut = rng.randint(1, len(text))
        prefix = text[:cut].split("\n")[-1] or text[:1]
        units = sum(pdf.current_font.cw[ord(c)] for c in prefix)
        exact = units * report_pdf.BODY_PT * 0.001 / pdf.k
        for delta in (0.0, 1e-10, -1e-10, 1e-9, -1e-9, 2e-9, -2e-9, 1e-7, -1e-7, 2e-6, -2e-6):
            width = exact + 2 * pad + delta
            assert _or_error(ours, text, width, style, report_pdf.BODY_PT) == _or_error(
                _fpdf_lines, pdf, text, width, style, report_pdf.BODY_PT, True), (text, width, style)
            cases += 1
    assert cases == 3300


def _or_error(split, *args):
    """The lines, or the error's type (fpdf2 refuses a cell narrower than one character)."""
    try:
        return split(*args)
    except FPDFException as exc:
        return type(exc)
