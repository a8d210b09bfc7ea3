"""schedule.xlsx as it prints and schedule.json's header.

External references: openpyxl (a general-purpose reader) reading the workbook back,
the number-format codes of ECMA-376-1 18.8.31, hashlib's SHA-256 (FIPS 180-4) of the
input drawing's bytes, and the contract's top-level keys (none renamed).
"""

from __future__ import annotations

import hashlib
import json
from pathlib import Path

import pytest

from cablewright import pipeline
from cablewright.config import load_settings
from cablewright.outputs import job_takeoff, write_outputs

ROOT = Path(__file__).resolve().parents[1]
DXF = ROOT / "sample_drawings" / "pumping_station.dxf"
CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"


@pytest.fixture(scope="module")
def outputs(tmp_path_factory):
    settings = load_settings(None)
    job = pipeline.size_measurement(pipeline.measure_drawing(DXF, CSV, settings), settings)
    out = tmp_path_factory.mktemp("out")
    paths = write_outputs(job, DXF, out, settings, quiet=True)
    return job, out, paths


def test_xlsx_units_in_number_formats_failed_rows_filled_and_print_setup(outputs):
    from openpyxl import load_workbook

    job, out, _ = outputs
    ws = load_workbook(out / "schedule.xlsx")["schedule"]
    headers = [c.value for c in ws[1]]
    col = {h: i for i, h in enumerate(headers)}
    statuses = {}
    for row in ws.iter_rows(min_row=2):
        cid, status = row[col["circuit"]].value, row[col["status"]].value
        statuses[cid] = status
        assert row[col["routed length [m]"]].number_format == '0.0" m"'
        assert row[col["load current [A]"]].number_format == '0.0" A"'
        assert row[col["csa [mm²]"]].number_format == 'General" mm²"'
        assert isinstance(row[col["routed length [m]"]].value, float)  # still a number
        colour = row[0].fill.start_color.rgb if row[0].fill.fill_type == "solid" else None
        if status in ("fail", "error"):
            assert colour in ("FFF4C7C3", "FFE1BEE7"), (cid, colour)  # red (fail), violet (error)
        elif status == "ok":
            assert colour is None
    assert "fail" in statuses.values()  # the sample has failing circuits (F-AC1, MOV-1, L-01)
    assert statuses == {o.circuit_id: o.status for o in job.outcomes}
    for sheet in load_workbook(out / "schedule.xlsx").worksheets:
        assert sheet.page_setup.orientation == "landscape"
        assert sheet.page_setup.fitToWidth == 1 and sheet.page_setup.fitToHeight == 0
        assert sheet.sheet_properties.pageSetUpPr.fitToPage is True
        assert sheet.print_title_rows == "$1:$1"


def test_json_header_names_tool_input_hash_config_hash_and_editions(outputs, monkeypatch):
    job, out, paths = outputs
    data = json.loads((out / "schedule.json").read_text(encoding="utf-8"))
    for key in ("circuits", "tool", "input", "standard", "quantities", "drawing"):
        assert key in data  # nothing renamed
    header = data["header"]
    assert header["tool"] == data["tool"]
    assert header["input"]["file"] == DXF.name
    assert header["input"]["sha256"] == hashlib.sha256(DXF.read_bytes()).hexdigest()
    assert header["config"]["file"] is None and len(header["config"]["settings_sha256"]) == 64
    assert header["date"] is None  # no wall clock: re-runs are byte-identical
    assert "IEC 60364-5-52:2009" in header["standards"] and "IEC 60364-4-43:2008" in header["standards"]
    assert (out / "report.pdf") in paths and (out / "report.pdf").read_bytes().startswith(b"%PDF-")
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "1700000000")  # 2023-11-14T22:13:20Z
    _, extras = job_takeoff(job, DXF, load_settings(None))
    assert extras["header"]["date"] == "2023-11-14T22:13:20Z"


def test_config_changes_the_settings_hash(outputs, tmp_path):
    job, _, _ = outputs
    cfg = tmp_path / "c.toml"
    cfg.write_text('[annotate]\nproject = "Plant 7"\nrevision = "B"\n', encoding="utf-8")
    settings = load_settings(cfg)
    _, a = job_takeoff(job, DXF, load_settings(None))
    _, b = job_takeoff(job, DXF, settings)
    assert b["header"]["config"]["file"] == "c.toml"
    assert b["header"]["config"]["sha256"] == hashlib.sha256(cfg.read_bytes()).hexdigest()
    assert a["header"]["config"]["settings_sha256"] != b["header"]["config"]["settings_sha256"]


def test_report_header_reads_project_and_revision_from_annotate(outputs, tmp_path):
    job, _, _ = outputs
    cfg = tmp_path / "c.toml"
    cfg.write_text('[annotate]\nproject = "Plant 7"\nrevision = "B"\n', encoding="utf-8")
    out = tmp_path / "o"
    write_outputs(job, DXF, out, load_settings(cfg), quiet=True)
    assert "Project: Plant 7 | revision B" in (out / "report.html").read_text(encoding="utf-8")
    bad = tmp_path / "bad.toml"
    bad.write_text('[annotate]\nrevison = "B"\n', encoding="utf-8")
    from cablewright.core.errors import ConfigError

    with pytest.raises(ConfigError, match="revison"):
        write_outputs(job, DXF, tmp_path / "o2", load_settings(bad), quiet=True)
