"""report.pdf: "page n of N" read back right past 999 pages, right-aligned at the margin.

fpdf2's ``{nb}`` alias reserves the width of three digits: from 1,000 pages on the
total ran past the right margin (and fpdf2 warned).  The footer is now written once
the total is known.  pypdf (a general-purpose PDF reader) reads each footer's text
and where it starts; its end is that start plus the string's width in the footer's
font (DejaVu Sans 7 pt, widths from fpdf2's font metrics), and must sit where
``cell(0, h, text, align="R")`` puts a right-aligned text: ``c_margin`` inside the
right margin.
"""

from __future__ import annotations

import io
import warnings
from pathlib import Path

import pytest
from cablewright.annotate import report_pdf

from cablewright import pipeline
from cablewright.config import load_settings

pypdf = pytest.importorskip("pypdf")

ROOT = Path(__file__).resolve().parents[1]
DXF = ROOT / "sample_drawings" / "pumping_station.dxf"
CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"
PAGES = 1234
#: Tolerance of a footer's right end [mm]: positions are written to 0.01 pt (0.0035 mm).
END_TOLERANCE_MM = 0.01


def _footers(data: bytes, numbers) -> dict[int, tuple[str, float, str]]:
    """Page number -> (footer text, its start x [pt], the page's whole text)."""
    reader = pypdf.PdfReader(io.BytesIO(data))
    got = {}
    for n in numbers:
        found = []

        def visit(text, cm, tm, font_dict, font_size, found=found):
            if text.startswith("page "):
                found.append((text, tm[4] * cm[0] + cm[4]))

        page = reader.pages[n - 1]
        whole = page.extract_text(visitor_text=visit)
        assert len(found) == 1, (n, found)
        got[n] = (*found[0], whole)
    return got


def _measure():
    """A document in the report's footer font, to measure strings with."""
    pdf = report_pdf._make_pdf("header")
    pdf.add_page()
    pdf.set_font(report_pdf.FONT_FAMILY, "", report_pdf.FOOTER_PT)
    return pdf


def _assert_right_aligned(footers, total: int) -> None:
    ruler = _measure()
    right = ruler.w - ruler.r_margin - ruler.c_margin
    for n, (text, start_pt, whole) in footers.items():
        assert text == f"page {n} of {total}"
        assert f"page {n} of {total}" in whole
        end = start_pt / ruler.k + ruler.get_string_width(text)
        assert end == pytest.approx(right, abs=END_TOLERANCE_MM), (n, end, right)


def test_page_numbers_past_999_pages_read_back_and_stay_right_aligned():
    pdf = report_pdf._make_pdf("Project: big | revision A")
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # fpdf2 warned when the total was wider than its alias
        for _ in range(PAGES):
            pdf.add_page()
        report_pdf._number_pages(pdf)
        data = bytes(pdf.output())
    assert len(pypdf.PdfReader(io.BytesIO(data)).pages) == PAGES
    footers = _footers(data, (1, 9, 10, 99, 100, 999, 1000, 1001, PAGES))
    _assert_right_aligned(footers, PAGES)
    assert "Project: big | revision A" in footers[1000][2]


def test_a_report_footer_is_right_aligned_on_every_page():
    settings = load_settings(None)
    job = pipeline.size_measurement(pipeline.measure_drawing(DXF, CSV, settings), settings)
    data = report_pdf.render_report_pdf(job.outcomes[:4], title="t", drawing_name=DXF.name,
                                        cautions="design aid")
    total = len(pypdf.PdfReader(io.BytesIO(data)).pages)
    assert total >= 5  # first pages, the schedule, one page per circuit
    _assert_right_aligned(_footers(data, range(1, total + 1)), total)
