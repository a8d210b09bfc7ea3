"""Schedule files: CSV, XLSX and JSON agree row by row and hold the circuits' values.

Read back with the standard library ``csv`` and ``json`` modules and openpyxl.
"""

from __future__ import annotations

import csv
import json

import openpyxl
import pytest
from cablewright.annotate.schedule_files import (
    HEADERS,
    write_schedule_csv,
    write_schedule_json,
    write_schedule_xlsx,
)
from test_annotate_fixtures import outcomes

NUMERIC = {
    "load current [A]",
    "device [A]",
    "routed length [m]",
    "design length [m]",
    "circuits in group",
    "cables in group",
    "correction factor",
    "required capacity [A]",
    "cores",
    "csa [mm²]",
    "parallel",
    "capacity [A]",
    "voltage drop [%]",
    "vd limit [%]",
    "protective conductor [mm²]",
    "cable to order [m]",
    "vd from origin [%]",
    "max length for disconnection [m]",
}


def _read_all(tmp_path):
    outs = outcomes()
    write_schedule_csv(tmp_path / "s.csv", outs)
    write_schedule_xlsx(tmp_path / "s.xlsx", outs)
    write_schedule_json(tmp_path / "s.json", outs)
    with open(tmp_path / "s.csv", encoding="utf-8-sig", newline="") as fh:
        csv_rows = list(csv.DictReader(fh))
    ws = openpyxl.load_workbook(tmp_path / "s.xlsx").active
    values = list(ws.iter_rows(values_only=True))
    xlsx_rows = [dict(zip(values[0], row, strict=True)) for row in values[1:]]
    doc = json.loads((tmp_path / "s.json").read_text(encoding="utf-8"))
    return csv_rows, xlsx_rows, doc, ws


def test_three_forms_agree_row_by_row(tmp_path):
    csv_rows, xlsx_rows, doc, _ = _read_all(tmp_path)
    circuits = doc["circuits"]
    assert (
        [r["circuit"] for r in csv_rows]
        == [r["circuit"] for r in xlsx_rows]
        == [c["id"] for c in circuits]
        == ["P-101", "P-102", "P-103"]
    )
    for c_row, x_row, j in zip(csv_rows, xlsx_rows, circuits, strict=True):
        assert list(c_row) == list(HEADERS) == list(x_row)
        for header in HEADERS:
            c_val, x_val = c_row[header], x_row[header]
            if header in NUMERIC:
                assert (c_val == "") == (x_val is None), header
                if c_val != "":
                    assert float(c_val) == pytest.approx(x_val, abs=1e-12), header
            else:
                assert c_val == (x_val or ""), header
        cable = j.get("cable") or {}
        route = j.get("route") or {}
        assert (c_row["csa [mm²]"] or None) == (str(cable["csa_mm2"]) if cable else None)
        assert float(c_row["routed length [m]"] or "nan") == pytest.approx(
            route.get("routed_length_m", float("nan")), nan_ok=True
        )
        assert c_row["device [A]"] == (
            "" if j.get("device_rating_a") is None else str(j["device_rating_a"])
        )


def test_values_are_the_circuits_values(tmp_path):
    """The values given to the writer (fixtures) come out unchanged."""
    csv_rows, xlsx_rows, _, _ = _read_all(tmp_path)
    p101 = xlsx_rows[0]
    assert p101["csa [mm²]"] == 150 and p101["parallel"] == 2 and p101["cores"] == 4
    assert p101["device [A]"] == 400
    assert p101["routed length [m]"] == 64.0 and p101["design length [m]"] == 72.2
    assert p101["method"] == "E" and p101["governed by"] == "capacity"
    # 400 A / (1.0 x 0.82) = 487.8 A required (IEC 60364-4-43 433.1: Iz >= In)
    assert p101["required capacity [A]"] == pytest.approx(400 / 0.82, abs=0.05)
    assert csv_rows[1]["messages"] == "motor start not checked"
    # what the installer orders: 2 parallel cables over the 72.2 m design length
    assert p101["cable"] == "2x 4C 150 mm² Cu/XLPE"
    assert p101["cable to order [m]"] == pytest.approx(2 * 72.2)
    err = xlsx_rows[2]
    assert err["status"] == "error" and err["csa [mm²]"] is None
    assert "unknown tag PUMP-9" in err["messages"]


def test_xlsx_layout(tmp_path):
    _, _, _, ws = _read_all(tmp_path)
    assert ws.freeze_panes == "B2"
    assert all(cell.font.bold for cell in ws[1])
    assert ws["A1"].value == "circuit" and "routed length [m]" in HEADERS
    assert ws.column_dimensions["D"].width >= len("status")


def test_schedule_write_is_atomic(tmp_path, monkeypatch):
    import openpyxl.writer.excel as excel

    # openpyxl's ExcelWriter writes the parts (Workbook.save and our uncompressed save both
    # go through it): half a workbook written, then the disk is full
    def broken(self):
        self._archive.writestr("[Content_Types].xml", b"half")
        raise OSError("disk full")

    monkeypatch.setattr(excel.ExcelWriter, "write_data", broken)
    with pytest.raises(OSError):
        write_schedule_xlsx(tmp_path / "s.xlsx", outcomes())
    assert list(tmp_path.iterdir()) == []


def test_schedule_json_written_in_pieces_is_the_document_and_all_or_nothing(tmp_path):
    """schedule.json is written piece by piece (never held whole): the same bytes as the
    document made at once, read back by the json module; a value JSON cannot hold (NaN,
    RFC 8259 section 6) stops the write before a file appears."""
    from cablewright.annotate.jsonout import dumps

    extra = {"drawing": {"units": "mm"}, "devices": [{"kind": "breaker", "count": 2}]}
    path = write_schedule_json(tmp_path / "s.json", outcomes(), extra)
    text = path.read_text(encoding="utf-8")
    assert text == dumps(outcomes(), "size", extra) + "\n"
    doc = json.loads(text)
    assert [c["id"] for c in doc["circuits"]] == [o.circuit_id for o in outcomes()]
    assert doc["devices"] == extra["devices"]
    with pytest.raises(ValueError):
        write_schedule_json(tmp_path / "bad.json", outcomes(), {"drawing": {"scale": float("nan")}})
    assert sorted(p.name for p in tmp_path.iterdir()) == ["s.json"]
