"""Two revisions of the sample drawing: every change found and classified, and the
take-off (bill of quantities, fill) of the sample checked by hand.

The revisions come from sample_drawings/generate_pumping_station.py (revision 2:
the P-102 branch tray moved 2 m east, S-01 deleted, UV-1 and L-04 added), generated
into a temporary folder; the generator computes every routed length from the
coordinates it placed, independently of the extraction code.
"""

from __future__ import annotations

import importlib.util
import json
import math
from pathlib import Path

import pytest
from cablewright.annotate.changes import compare_documents, load_document
from cablewright.annotate.revision import changed_circuit_ids, revision_mark
from cablewright.sizing.fill import DEFAULT_CABLE_OD_MM, od_key

from cablewright.cli import main

ROOT = Path(__file__).resolve().parents[1]


def _generator():
    spec = importlib.util.spec_from_file_location("gen_ps", ROOT / "sample_drawings" / "generate_pumping_station.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


@pytest.fixture(scope="module")
def runs(tmp_path_factory):
    gen = _generator()
    base = tmp_path_factory.mktemp("revisions")
    out = {}
    for rev in (1, 2):
        src = base / f"rev{rev}"
        gen.main(src, rev)
        code = main(["size", str(src / "pumping_station.dxf"), "--circuits",
                     str(src / "pumping_station_circuits.csv"), "--out", str(base / f"out{rev}"), "--json"]
                    + (["--previous", str(base / "out1")] if rev == 2 else []))
        assert code in (0, 1)
        out[rev] = (src, base / f"out{rev}")
    return out


def _expected(src):
    return json.loads((src / "pumping_station_expected.json").read_text())["circuits"]


def test_every_change_is_found_and_classified(runs):
    (src1, out1), (src2, out2) = runs[1], runs[2]
    report = compare_documents(load_document(out1), load_document(out2))
    kinds = {c.circuit_id: c.change for c in report.circuits}
    assert {k for k, v in kinds.items() if v == "new"} == {"UV-1", "L-04"}
    assert {k for k, v in kinds.items() if v == "removed"} == {"S-01"}
    # the moved branch: P-102 re-routed, longer by what the generator's coordinates give
    # (2 m more tray, the tail from (28.2, 14, 0.5) to the branch end 2.773 m -> 2.625 m)
    e1, e2 = _expected(src1), _expected(src2)
    p102 = next(c for c in report.circuits if c.circuit_id == "P-102")
    old, new = p102.field("routed_length_m")
    assert new - old == pytest.approx(e2["P-102"]["routed_length_m"] - e1["P-102"]["routed_length_m"], abs=0.02)
    assert new - old == pytest.approx(2.0 - (math.hypot(1.2, 2.5) - math.hypot(0.8, 2.5)), abs=0.02)
    assert p102.field("route") is not None
    # nobody else was re-routed or got longer: the branch move re-splits the main tray
    # and UV-1's tail splits the east branch four circuits run along, but their lines stay
    for c in report.circuits:
        if c.circuit_id != "P-102" and c.change == "changed":
            assert c.field("route") is None, c
            assert c.field("routed_length_m") is None, c
    # group counts: UV-1 (fed from MCC-1) adds one circuit to the switchroom ladder
    # between MCC-1 and the riser, which carried F-DB2, F-CP1, F-AC1 and the ten MCC-1
    # circuits going east: 13 -> 14 (counted from the generator's circuit list)
    east = [c for c in gen_circuits(1) if c[1] == "MCC-1" and c[0] != "F-MCC1"]
    assert len(east) + 3 == 13
    assert next(c for c in report.circuits if c.circuit_id == "F-CP1").field("circuits_in_group") == (13, 14)


def gen_circuits(rev):
    gen = _generator()
    with gen.revision(rev):
        return list(gen.CIRCUITS)


def test_nothing_is_reported_for_circuits_that_did_not_change(runs):
    a, b = load_document(runs[1][1]), load_document(runs[2][1])
    report = compare_documents(a, b)
    old = {c["id"]: c for c in a["circuits"]}
    new = {c["id"]: c for c in b["circuits"]}
    keys = ("status", "device_rating_a", "cable", "method", "correction_factor")
    for c in report.circuits:
        if c.change == "unchanged":
            o, n = old[c.circuit_id], new[c.circuit_id]
            assert all(o.get(k) == n.get(k) for k in keys), c.circuit_id
            assert o["route"]["routed_length_m"] == n["route"]["routed_length_m"]
            assert o["grouping"]["circuits_in_group"] == n["grouping"]["circuits_in_group"]
        if c.change == "changed":
            assert c.fields, c.circuit_id
    # the same run compared with itself: nothing changed, no segment either
    same = compare_documents(b, b)
    assert {c.change for c in same.circuits} == {"unchanged"}
    assert same.segments == () and all(abs(o.delta_m) < 1e-9 for o in same.orders)


def test_changes_json_has_the_contract_shape_and_the_report_a_section(runs):
    out2 = runs[2][1]
    data = json.loads((out2 / "changes.json").read_text(encoding="utf-8"))
    assert {"circuits", "totals"} <= set(data)
    for entry in data["circuits"]:
        assert set(entry) == {"id", "change", "fields"}
        assert entry["change"] in ("new", "removed", "changed", "unchanged")
        assert all(isinstance(v, list) and len(v) == 2 for v in entry["fields"].values())
    assert data["totals"]["circuits"]["new"] == 2 and data["totals"]["circuits"]["removed"] == 1
    html = (out2 / "report.html").read_text(encoding="utf-8")
    assert "Changes since the previous run" in html and "UV-1" in html


def test_compare_command_exit_codes(runs, tmp_path, capsys):
    out1, out2 = runs[1][1], runs[2][1]
    assert main(["compare", str(out1), str(out2 / "schedule.json"), "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert any(c["id"] == "S-01" and c["change"] == "removed" for c in data["circuits"])
    assert main(["compare", str(out1), str(out2)]) == 0
    assert "UV-1" in capsys.readouterr().out
    bad = tmp_path / "schedule.json"
    bad.write_text("{not json", encoding="utf-8")
    assert main(["compare", str(out1), str(bad)]) == 2
    assert main(["compare", str(tmp_path / "missing"), str(out2)]) == 2
    err = capsys.readouterr().err
    assert "Traceback" not in err and "missing" in err


def test_revision_marks_go_on_exactly_the_new_and_changed_circuits(runs):
    report = compare_documents(load_document(runs[1][1]), load_document(runs[2][1]))
    marked = changed_circuit_ids(report)
    assert marked == {c.circuit_id for c in report.circuits if c.change in ("new", "changed")}
    assert "S-01" not in marked and "UV-1" in marked
    # the mark is a square on its corner: four equal sides, diagonals at right angles
    m = revision_mark("P-102", (0.0, 0.0), 2.5)
    pts = m.outline
    sides = [math.dist(pts[i], pts[(i + 1) % 4]) for i in range(4)]
    assert max(sides) - min(sides) < 1e-9
    assert math.isclose(math.dist(pts[0], pts[2]), math.dist(pts[1], pts[3]))
    assert pts[0][0] > 0.0  # beside the label's end, not over it


def test_bill_of_quantities_of_the_sample_by_hand(runs):
    src, out = runs[1]
    doc = load_document(out)
    expected = _expected(src)
    # design length by hand: routed length (the generator's, from its coordinates) plus
    # 5 % slack and 1.5 m at each end (contract.md defaults); times parallel, per type
    totals, runs_by = {}, {}
    for c in doc["circuits"]:
        cable = c.get("cable")
        if not cable:
            continue
        text = f"{cable['cores']}C {cable['csa_mm2']:g} mm² {cable['conductor']}/{cable['insulation']}"
        design = expected[c["id"]]["routed_length_m"] * 1.05 + 2 * 1.5
        totals[text] = totals.get(text, 0.0) + design * cable["parallel"]
        runs_by[text] = runs_by.get(text, 0) + cable["parallel"]
    rows = {q["cable"]: q for q in doc["quantities"]}
    assert set(rows) == set(totals)
    for text, total in totals.items():
        assert rows[text]["length_to_order_m"] == pytest.approx(total, abs=0.1), text
        assert rows[text]["runs"] == runs_by[text]
        longest_drum = 1000.0  # [sizing] drum_lengths_m default
        for drum in rows[text]["drums"]:
            assert sum(cut["length_m"] for cut in drum["cuts"]) <= drum["length_m"] + 0.05
            assert all(cut["length_m"] <= longest_drum for cut in drum["cuts"])
        cut_total = sum(cut["length_m"] for d in rows[text]["drums"] for cut in d["cuts"])
        cut_total += sum(cut["length_m"] for cut in rows[text]["longer_than_a_drum"])
        assert cut_total == pytest.approx(total, abs=0.1 * runs_by[text])
    assert doc["tool"]["name"] == "cablewright" and doc["standard"] == "iec"
    import hashlib

    assert doc["input"]["sha256"] == hashlib.sha256((src / "pumping_station.dxf").read_bytes()).hexdigest()


def test_duct_fill_of_the_sample_by_hand(runs):
    # the duct bank (ROUTE-DUCT, 100 mm duct by default) carries MOV-1, SP-1, L-02, S-02;
    # fill = sum d² / D² with the outer diameters of DEFAULT_CABLE_OD_MM (typical maker
    # data, from memory), e.g. 4C 1.5 13 mm, 4C 35 29 mm, 3C 16 20 mm, 3C 6 16 mm
    doc = load_document(runs[1][1])
    cables = {c["id"]: c["cable"] for c in doc["circuits"] if c.get("cable")}
    duct = max((s for s in doc["segments"] if s["layer"] == "ROUTE-DUCT"), key=lambda s: s["length_m"])
    assert set(duct["circuits"]) == {"MOV-1", "SP-1", "L-02", "S-02"}
    d = [DEFAULT_CABLE_OD_MM[od_key(cables[c]["cores"], cables[c]["csa_mm2"])] for c in duct["circuits"]]
    by_hand = 100.0 * sum(x * x for x in d) / 100.0 ** 2
    assert duct["fill"]["percent"] == pytest.approx(by_hand, abs=0.051)  # printed to 0.1 %
    assert duct["fill"]["rule"] == "duct_area" and duct["fill"]["result"] == "pass"


def test_schedule_xlsx_has_the_boq_and_segment_sheets(runs):
    from openpyxl import load_workbook

    wb = load_workbook(runs[1][1] / "schedule.xlsx", read_only=True)
    assert {"schedule", "BOQ", "segments"} <= set(wb.sheetnames)
    boq = list(wb["BOQ"].iter_rows(values_only=True))
    doc = load_document(runs[1][1])
    cables = {r[1]: r[4] for r in boq[1:] if r[0] == "cable"}
    assert cables == {q["cable"]: q["length_to_order_m"] for q in doc["quantities"]}
    assert sum(r[2] for r in boq[1:] if r[0] == "device") == sum(1 for c in doc["circuits"] if c.get("device_rating_a"))


def test_project_diameters_and_containment_sizes_from_the_config(tmp_path):
    from cablewright.annotate.model import CircuitOutcome
    from cablewright.annotate.takeoff import segment_rows
    from cablewright.extract.model import RouteSegment
    from cablewright.sizing.model import CableSelection, SizingResult

    from cablewright.config import load_settings

    cfg = tmp_path / "c.toml"
    cfg.write_text('[sizing]\ntray_fill_limit_pct = 50.0\n[sizing.containment_mm]\n"E-TRAY" = 200.0\n'
                   '[sizing.cable_od_mm]\n"4x95" = 40.0\n', encoding="utf-8")
    config = load_settings(cfg).sizing
    seg = RouteSegment("S1", ("h",), "E-TRAY", "tray", "E", 5.0, ((0, 0, 0), (5, 0, 0)))
    cable = CableSelection("Cu", "XLPE", 4, 95.0, 2, 300.0, "capacity")
    outcome = CircuitOutcome("P1", "A", "B", "ok", sizing=SizingResult("P1", "ok", cable=cable))
    (row,) = segment_rows({"S1": seg}, {"S1": ("P1",)}, [outcome], config)
    # by hand: two cables of the project's 40 mm on the project's 200 mm tray: 80 / 200 = 40 %
    assert row.cables == 2 and row.fill.percent == pytest.approx(40.0)
    assert row.fill.limit_percent == 50.0 and row.fill.result == "pass"


def test_fill_marks_sit_half_way_along_the_full_segments():
    from cablewright.annotate.revision import fill_marks
    from cablewright.annotate.takeoff import SegmentRow
    from cablewright.extract.model import RouteSegment
    from cablewright.sizing.fill import segment_fill

    seg = RouteSegment("S9", ("h",), "ROUTE-TRAY", "tray", "E", 6.0, ((0, 0, 3), (6, 0, 3)))
    full = SegmentRow(seg, ("A", "B"), 2, segment_fill("S9", "tray", 100.0, [42.0, 42.0], 80.0))
    fine = SegmentRow(seg, ("A",), 1, segment_fill("S9", "tray", 100.0, [42.0], 80.0))
    (mark,) = fill_marks([full, fine])
    # by hand: 84 mm of 100 mm is above the 80 % limit; half-way along 6 m is x = 3 m
    assert mark.at_m == (3.0, 0.0, 3.0) and mark.result == "warning" and "84 %" in mark.text


def test_size_with_an_unusable_previous_folder_stops_before_any_work(tmp_path, capsys):
    drawing = ROOT / "sample_drawings" / "pumping_station.dxf"
    out = tmp_path / "out"
    code = main(["size", str(drawing), "--circuits", str(ROOT / "sample_drawings" / "pumping_station_circuits.csv"),
                 "--out", str(out), "--previous", str(tmp_path / "nothing-here")])
    assert code == 2 and not out.exists()
    err = capsys.readouterr().err
    assert "nothing-here" in err and "Traceback" not in err


def test_compare_two_drawings_with_one_schedule(runs, capsys):
    # issue 14: OLD and NEW may be two revisions of a drawing sized with one schedule; the
    # moved tray lengthens P-102 by what the generator's coordinates give (as above)
    (src1, _), (src2, _) = runs[1], runs[2]
    code = main(["compare", str(src1 / "pumping_station.dxf"), str(src2 / "pumping_station.dxf"),
                 "--circuits", str(src1 / "pumping_station_circuits.csv"), "--json"])
    assert code == 0
    data = json.loads(capsys.readouterr().out)
    p102 = next(c for c in data["circuits"] if c["id"] == "P-102")
    e1, e2 = _expected(src1), _expected(src2)
    old, new = p102["fields"]["routed_length_m"]
    assert p102["change"] == "changed"
    assert new - old == pytest.approx(e2["P-102"]["routed_length_m"] - e1["P-102"]["routed_length_m"], abs=0.02)
    assert not any(c["change"] in ("new", "removed") for c in data["circuits"])  # one schedule
