"""report.html and report.pdf: every circuit followed from the load to the cable.

External references: the design-current equation of IEC 60050-131:2002 131-11-42 /
131-11-41 computed here by hand from the sample schedule (read with the csv module);
tabulated capacities of IEC 60364-5-52:2009 Table B.52.12 (XLPE, copper, multi-core in
free air, method E, three loaded conductors: 70 mm² 246 A, 120 mm² 346 A, 240 mm² 538 A,
from the published table; values from memory of it); the standard device ratings of
contract.md; and pypdf (a general-purpose PDF reader) reading report.pdf back.
"""

from __future__ import annotations

import csv
import html
import math
import re
from pathlib import Path
from types import SimpleNamespace

import pytest
from cablewright.annotate.report import render_report_html
from cablewright.annotate.report_pdf import render_report_pdf
from cablewright.annotate.report_trace import ReportConfig, check_result
from cablewright.sizing.model import Check, CheckResult

from cablewright import pipeline
from cablewright.config import load_settings

ROOT = Path(__file__).resolve().parents[1]
DXF = ROOT / "sample_drawings" / "pumping_station.dxf"
CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"
CONFIG = ReportConfig(project="Test pumping station", revision="C")


@pytest.fixture(scope="module")
def job():
    settings = load_settings(None)
    measurement = pipeline.measure_drawing(DXF, CSV, settings)
    return pipeline.size_measurement(measurement, settings)


@pytest.fixture(scope="module")
def report_html(job):
    return render_report_html(job.outcomes, title="t", drawing_name=DXF.name, preview_png=None,
                              cautions="design aid", config=CONFIG, tool_version="9.9")


@pytest.fixture(scope="module")
def pdf_pages(job):
    import io

    pypdf = pytest.importorskip("pypdf")
    data = render_report_pdf(job.outcomes, title="t", drawing_name=DXF.name, cautions="design aid",
                             config=CONFIG, tool_version="9.9")
    reader = pypdf.PdfReader(io.BytesIO(data))
    return [page.extract_text() for page in reader.pages]


def _section(text: str, cid: str) -> str:
    start = text.index(f'<section class="circuit" id="c-{cid}">')
    return html.unescape(text[start:text.index("</section>", start)])


def _squash(text: str) -> str:
    return "".join(text.split())


def test_every_circuit_names_its_capacity_table_and_value(job, report_html):
    sized = [o for o in job.outcomes if o.sizing is not None and o.sizing.cable is not None]
    assert len(sized) == 19  # the sample schedule's 19 circuits, all sized
    for o in sized:
        s = o.sizing
        section = _section(report_html, o.circuit_id)
        assert re.search(r"IEC 60364-5-52:2009 Table B\.52\.\d+, column [A-G]", s.capacity_table)
        assert s.capacity_table in section, o.circuit_id
        assert f"tabulated It, one cable</td><td>{s.tabulated_capacity_a:.0f} A" in section, o.circuit_id
        # Iz = n x It x k, recomputed from the printed parts
        assert s.cable.capacity_a == pytest.approx(
            s.cable.parallel * s.tabulated_capacity_a * s.correction_factor, rel=1e-9)


# (circuit, cable size mm², It [A] of IEC 60364-5-52:2009 Table B.52.12 column E,
#  3 loaded conductors, Cu/XLPE, standard device rating In [A] of contract.md,
#  and the grouping table read: B.52.20 for a ladder, B.52.17 for a perforated tray)
THREE = [("F-MCC1", 240, 538, 800, "B.52.20"), ("F-DB2", 120, 346, 80, "B.52.17"),
         ("P-101", 25, 127, 160, "B.52.17")]  # star-delta: two cables at Ib/√3 each


@pytest.mark.parametrize("cid, csa, it_a, in_a, grouping_table", THREE)
def test_three_circuits_followed_from_the_load_to_the_cable(job, report_html, cid, csa, it_a, in_a,
                                                            grouping_table):
    row = next(r for r in csv.DictReader(CSV.open(encoding="utf-8")) if r["circuit"] == cid)
    value, unit = row["load"].split()
    u = float(row["voltage"])
    pf = float(row["power_factor"])
    eta = float(row["efficiency"] or 1.0)
    if unit == "kVA":  # IEC 60050-131 131-11-41: S = √3 U I
        ib = float(value) * 1000 / (math.sqrt(3) * u)
    else:  # 131-11-42: P = √3 U I cos φ, input power P/η
        ib = float(value) * 1000 / eta / (math.sqrt(3) * u * pf)
    section = _section(report_html, cid)
    assert f"<td>{value} {unit}</td>" in section  # the load as written in the schedule
    assert f"{ib:.1f} A; IEC 60050-131:2002 131-11-4" in section  # Ib, formula and its clause
    assert f"device In (breaker)</td><td>{in_a} A" in section
    assert "IEC 60364-4-43:2008 433.1 (Ib ≤ In)" in section
    assert "IEC 60364-5-52:2009 Table B.52.14" in section  # ambient factor, its table and row
    assert "row 30 °C</td><td>1.000" in section  # the reference temperature: factor 1
    assert f"grouping</td><td>IEC 60364-5-52:2009 Table {grouping_table}</td>" in section
    assert f"IEC 60364-5-52:2009 Table B.52.12, column E: {csa} mm² Cu/XLPE" in section
    assert f"tabulated It, one cable</td><td>{it_a} A" in section
    s = next(o.sizing for o in job.outcomes if o.circuit_id == cid)
    assert s.load_current_a == pytest.approx(ib, rel=1e-9)
    assert f"Iz = n × It × k</td><td>{s.cable.capacity_a:.1f} A</td><td>{s.cable.parallel} × {it_a} A" in section
    assert s.cable.csa_mm2 == csa


def test_not_checked_is_never_shown_as_a_pass(report_html):
    rows = re.findall(r"<tr class='([a-z_]+)'><td>[a-z_]+</td><td><span class='res ([a-z_]+)'>([^<]*)<",
                      report_html)
    assert rows
    not_checked = [r for r in rows if r[0] == "not_checked"]
    assert not_checked  # the sample gives no clearing time for most circuits' short-circuit check
    for row_class, span_class, text in rows:
        assert row_class == span_class
        if row_class == "not_checked":
            assert text.startswith("not checked (") and "pass" not in text
        if row_class == "pass":
            assert text.startswith("pass")


def test_check_result_reads_a_result_field_first():
    base = Check("short_circuit", CheckResult.NOT_CHECKED, 0.0, 0.0, "", "x", "not checked: no fault level")
    assert check_result(base) == "not_checked"
    assert check_result(Check("capacity", False, 1.0, 0.5, "A", "433.1")) == "fail"
    assert check_result(Check("motor_start", CheckResult.NOT_APPLICABLE, 0.0, 0.0, "", "not applicable", "no motor")) == "not_applicable"
    tri = SimpleNamespace(name="x", passed=True, value=0.0, limit=0.0, unit="", source="s",
                          message="", result="not_applicable")
    assert check_result(tri) == "not_applicable"


def test_summary_lists_failures_first_with_their_reason(job, report_html):
    failing = [o for o in job.outcomes if o.status in ("fail", "error")]
    assert failing
    summary = report_html[report_html.index("<h2>Summary</h2>"):report_html.index("<h2>Schedule</h2>")]
    for o in failing:
        assert f"#c-{o.circuit_id}" in summary
        assert html.escape(o.messages[0], quote=True) in summary
    assert "@bottom-right{content:\"page \" counter(page) \" of \" counter(pages)" in report_html
    assert "break-inside:avoid" in report_html
    assert "Project: Test pumping station | revision C" in report_html


def test_pdf_has_page_numbers_and_the_header_on_every_page(pdf_pages):
    n = len(pdf_pages)
    assert n >= 20  # a summary page, the schedule, one page per circuit (19)
    for i, text in enumerate(pdf_pages, start=1):
        assert f"page {i} of {n}" in text
        assert "Project: Test pumping station | revision C" in text
        assert "cablewright 9.9" in text


def test_pdf_keeps_each_circuit_block_whole_on_one_page(job, pdf_pages):
    squashed = [_squash(t) for t in pdf_pages]
    for o in job.outcomes:
        s = o.sizing
        title = _squash(f"{o.circuit_id}: {o.from_tag} → {o.to_tag}")
        pages = [i for i, t in enumerate(squashed) if title in t]
        assert len(pages) == 1, (o.circuit_id, pages)
        page = squashed[pages[0]]
        start = page.index(title)
        block = page[start:]
        # everything of the block, to the last check, is on this page
        for needle in ("1.Loadasgiven", "4.Capacity", "5.Checks", _squash(s.capacity_table),
                       f"tabulatedIt,onecable{s.tabulated_capacity_a:.0f}A"):
            assert needle in block, (o.circuit_id, needle)
        for ch in s.checks:
            assert _squash(ch.name) in block, (o.circuit_id, ch.name)


def test_pdf_is_the_same_bytes_on_a_re_run(job, monkeypatch):
    monkeypatch.delenv("SOURCE_DATE_EPOCH", raising=False)
    kwargs = dict(title="t", drawing_name=DXF.name, cautions="design aid", config=CONFIG)
    first = render_report_pdf(job.outcomes[:3], **kwargs)
    assert first.startswith(b"%PDF-") and render_report_pdf(job.outcomes[:3], **kwargs) == first


def test_pdf_block_taller_than_a_page_breaks_between_rows_never_inside_one(job):
    import io

    from cablewright.annotate.model import CircuitOutcome

    pypdf = pytest.importorskip("pypdf")
    base = next(o for o in job.outcomes if o.circuit_id == "P-101")
    clause = "IEC 60364-4-43:2008 433.1, a clause written long enough to wrap onto a second line " * 2
    many = tuple(Check(f"chk{i:02d}", i % 7 != 0, 100.0 + i, 200.0 + i, "A", f"{clause}end{i:02d}")
                 for i in range(60))
    from dataclasses import replace

    tall = CircuitOutcome("T-1", "MCC-1", "T-1", "fail", (), base.route, base.group,
                          replace(base.sizing, checks=many))
    data = render_report_pdf([tall], title="t", drawing_name="x.dxf", cautions="c", config=CONFIG)
    pages = [_squash(p.extract_text()) for p in pypdf.PdfReader(io.BytesIO(data)).pages]
    body = [i for i, t in enumerate(pages) if "chk" in t]
    assert len(body) >= 2  # the block does not fit one page
    for i in range(60):
        where = [p for p, t in enumerate(pages) if f"chk{i:02d}" in t]
        assert len(where) == 1
        page = pages[where[0]]
        # the whole row is on that page: its value, its limit and the end of its wrapped clause
        assert f"{100.0 + i:.3f}" in page and f"{200.0 + i:.3f}" in page and f"end{i:02d}" in page


def test_printed_html_keeps_each_circuit_on_one_page(job, report_html, tmp_path):
    """Headless Chromium prints report.html; pypdf reads the pages back (skipped without Chromium)."""
    import io
    import shutil
    import subprocess

    pypdf = pytest.importorskip("pypdf")
    browser = shutil.which("chromium") or shutil.which("chromium-browser")
    if browser is None:
        pytest.skip("no Chromium to print with")
    page = tmp_path / "report.html"
    page.write_text(report_html, encoding="utf-8")
    out = tmp_path / "printed.pdf"
    cmd = [browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
           "--disable-component-update", "--no-first-run", f"--user-data-dir={tmp_path / 'profile'}",
           "--no-pdf-header-footer", f"--print-to-pdf={out}", page.as_uri()]
    subprocess.run(cmd, capture_output=True, timeout=120, check=False)
    if not out.exists():
        pytest.skip("Chromium did not print")
    pages = [_squash(p.extract_text()) for p in pypdf.PdfReader(io.BytesIO(out.read_bytes())).pages]
    for i, text in enumerate(pages, start=1):
        assert f"page{i}of{len(pages)}" in text  # @page margin box
        assert _squash("Project: Test pumping station | revision C") in text
    for o in job.outcomes:
        title = _squash(f"{o.circuit_id}: {o.from_tag} → {o.to_tag}")
        where = [i for i, t in enumerate(pages) if title in t]
        assert len(where) == 1, o.circuit_id
        block = pages[where[0]][pages[where[0]].index(title):]
        assert "5.Checks" in block and _squash(o.sizing.checks[-1].source) in block, o.circuit_id


@pytest.mark.parametrize("load, phases, pf, eta, volts, expected", [
    # 10 hp shaft power: P = 10 x 0.746 kW (contract.md); Ib = P / (η √3 U cos φ), 131-11-42
    (("10", "hp"), 3, 0.85, 0.9, 400.0, 7460.0 / 0.9 / (math.sqrt(3) * 400.0 * 0.85)),
    # one phase, 2.3 kW at 230 V, cos φ 1: Ib = P / (U cos φ) = 10 A
    (("2.3", "kW"), 1, 1.0, 1.0, 230.0, 10.0),
    # one phase, 4.6 kVA at 230 V: Ib = S / U = 20 A, 131-11-41
    (("4.6", "kVA"), 1, 0.8, 1.0, 230.0, 20.0),
])
def test_design_current_formula_shows_the_numbers_put_in(load, phases, pf, eta, volts, expected):
    from cablewright.annotate.report_trace import design_current_formula
    from cablewright.sizing.load import design_current_a
    from cablewright.sizing.model import CircuitSpec, Load

    spec = CircuitSpec("X", Load(float(load[0]), load[1]), volts, phases=phases, power_factor=pf,
                       efficiency=eta)
    ib = design_current_a(spec.load, volts, phases, pf, eta)
    assert ib == pytest.approx(expected, rel=1e-12)
    text = design_current_formula(spec, ib)
    assert f"= {expected:.1f} A; IEC 60050-131:2002" in text
    assert ("√3" in text) == (phases == 3)
    if load[1] == "hp":
        assert "10 hp × 0.746 kW/hp = 7.46 kW" in text
