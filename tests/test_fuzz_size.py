"""Fuzz ``size`` with random bytes and mutated sample inputs (issue 18).

Property: whatever the bytes of the drawing, the model or the schedule,
``cablewright size DRAWING --circuits SCHEDULE --out DIR --json`` ends with a contract exit
code (0, 1 or 2), never an internal error or a traceback, and whatever it prints on stdout
is JSON without NaN or infinity (RFC 8259, section 6).  The mutations are those of
``test_fuzz_routes`` (a byte flipped, a slice cut out, the file cut short, a number made
hostile, a line duplicated), applied to ``sample_drawings/pumping_station.dxf``, ``.ifc``
and ``pumping_station_circuits.csv``.

Time-bounded (about 25 s): few examples per kind, derandomized so every run is the same.
The PDF report is replaced by a stub while fuzzing: it is drawn from the same validated rows
as the HTML report, which is written, and its layout engine alone takes about 5 s of the
6 s a sized sample costs (cProfile of one run), which would leave room for only four
examples.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from test_fuzz_routes import CSV, DXF, FUZZ, SAMPLES, mutated
from test_hostile_input import assert_clean, run_cli

SIZE_FUZZ = settings(FUZZ, max_examples=12)


@pytest.fixture(autouse=True)
def _no_pdf(monkeypatch):
    import cablewright.annotate.report_pdf as report_pdf

    def stub(path, *args, **kwargs):
        Path(path).write_bytes(b"%PDF-1.4\n%stub for the fuzz test\n")

    monkeypatch.setattr(report_pdf, "write_report_pdf", stub)


def _size(tmp: Path, drawing: Path, schedule: Path) -> None:
    out = tmp / "out"
    code, stdout, err = run_cli(["size", str(drawing), "--circuits", str(schedule), "--out", str(out), "--json"])
    doc = assert_clean(code, stdout, err)
    if doc is not None:
        assert isinstance(doc.get("circuits"), list)
    if code == 2:  # the input could not be used: nothing half-written is left behind
        assert not out.exists() or not any(out.iterdir()), sorted(p.name for p in out.iterdir())
    else:  # every file written is whole: the JSON schedule parses
        json.loads((out / "schedule.json").read_text(encoding="utf-8"))


@settings(SIZE_FUZZ, max_examples=15)
@given(data=st.binary(max_size=2000))
def test_random_bytes(tmp_path_factory, data):
    d = tmp_path_factory.mktemp("bytes")
    for name in ("random.dxf", "random.ifc"):
        (d / name).write_bytes(data)
        _size(d, d / name, CSV)
    (d / "random.csv").write_bytes(data)
    _size(d, SAMPLES / "pumping_station.dxf", d / "random.csv")


@SIZE_FUZZ
@given(data=mutated(DXF))
def test_mutated_dxf(tmp_path_factory, data):
    d = tmp_path_factory.mktemp("dxf")
    (d / "mutated.dxf").write_bytes(data)
    _size(d, d / "mutated.dxf", CSV)


@pytest.mark.skipif(pytest.importorskip("ifcopenshell") is None, reason="ifcopenshell")
@SIZE_FUZZ
@given(data=mutated((SAMPLES / "pumping_station.ifc").read_bytes()))
def test_mutated_ifc(tmp_path_factory, data):
    d = tmp_path_factory.mktemp("ifc")
    (d / "mutated.ifc").write_bytes(data)
    _size(d, d / "mutated.ifc", CSV)


@SIZE_FUZZ
@given(data=mutated(CSV.read_bytes()))
def test_mutated_schedule(tmp_path_factory, data):
    d = tmp_path_factory.mktemp("csv")
    (d / "mutated.csv").write_bytes(data)
    _size(d, SAMPLES / "pumping_station.dxf", d / "mutated.csv")
