"""IFC outputs: the sample model against the DXF sample, the plan view, the IFC copy.

External references: the DXF sample generator's own coordinate sums
(``pumping_station_expected.json``, computed from the points it places, independent of
the extraction code), ezdxf reading the plan view back, and ``ifcopenshell.validate``
checking the written model against its schema.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

pytest.importorskip("ifcopenshell")

import ifcopenshell  # noqa: E402
import ifcopenshell.util.element as ue  # noqa: E402
import ifcopenshell.validate  # noqa: E402
from cablewright.annotate.ifc_writer import CHECKS_PSET, SIZING_PSET, write_ifc_copy  # noqa: E402
from cablewright.annotate.model import CircuitOutcome  # noqa: E402
from cablewright.annotate.plan_view import write_plan_view  # noqa: E402
from cablewright.extract.ifc_reader import measure_ifc  # noqa: E402
from cablewright.sizing.model import CableSelection, Check, SizingResult, VoltageDrop  # noqa: E402

ROOT = Path(__file__).resolve().parents[1]
SAMPLES = ROOT / "sample_drawings"
IFC = SAMPLES / "pumping_station.ifc"
DXF = SAMPLES / "pumping_station.dxf"
CSV = SAMPLES / "pumping_station_circuits.csv"
EXPECTED = SAMPLES / "pumping_station_expected.json"


@pytest.fixture(scope="module")
def measured():
    return measure_ifc(IFC, CSV)


def test_sample_ifc_lengths_match_the_dxf_scenario(measured):
    expected = json.loads(EXPECTED.read_text())["circuits"]
    assert set(measured.routes) == set(expected)
    for cid, exp in expected.items():
        assert measured.routes[cid].routed_length_m == pytest.approx(exp["routed_length_m"], rel=0.01), cid


def test_sample_ifc_and_dxf_route_the_same(measured):
    from cablewright.extract import measure

    dxf = measure(DXF, CSV)
    for cid, route in dxf.routes.items():
        assert measured.routes[cid].routed_length_m == pytest.approx(route.routed_length_m, rel=0.01), cid


def test_sample_ifc_circuit_groups_equal_the_schedule(measured):
    from_groups = measure_ifc(IFC)
    assert {r.circuit_id: (r.from_tag, r.to_tag) for r in from_groups.rows} == {
        r.circuit_id: (r.from_tag, r.to_tag) for r in measured.rows}
    for cid, route in measured.routes.items():
        assert from_groups.routes[cid].routed_length_m == pytest.approx(route.routed_length_m, rel=1e-9)


def test_plan_view_reads_back_with_the_same_lengths(measured, tmp_path):
    import ezdxf
    from cablewright.extract import measure

    out = write_plan_view(measured, tmp_path / "plan.dxf")
    doc = ezdxf.readfile(out)
    assert doc.header["$INSUNITS"] == 6
    auditor = doc.audit()
    assert not auditor.has_errors
    again = measure(out, CSV)
    for cid, route in measured.routes.items():
        assert again.routes[cid].routed_length_m == pytest.approx(route.routed_length_m, rel=1e-6), cid
    assert {s.containment for s in again.segments.values()} == {s.containment for s in measured.segments.values()}


def _outcome(cid: str, src: str, dst: str, route) -> CircuitOutcome:
    cable = CableSelection("Cu", "XLPE", 4, 16.0, 1, 80.0, "capacity")
    checks = (Check("capacity", True, 63.0, 80.0, "A", "IEC 60364-4-43 433.1"),
              Check("voltage drop", True, 1.2, 5.0, "%", "common practice"))
    sizing = SizingResult(cid, "ok", load_current_a=50.0, device_rating_a=63.0, method="E",
                          cable=cable, voltage_drop=VoltageDrop(4.8, 1.2, 5.0, 2.5, 1.2), checks=checks)
    return CircuitOutcome(cid, src, dst, "ok", (), route, None, sizing)


def test_ifc_copy_opens_validates_and_does_not_duplicate(measured, tmp_path):
    outcomes = [_outcome(c, r.from_tag, r.to_tag, r) for c, r in sorted(measured.routes.items())]
    outcomes.append(CircuitOutcome("X-1", "MSB-1", "NOPE", "error", ("no route",)))
    first = write_ifc_copy(IFC, tmp_path / "a.ifc", outcomes)
    assert len(first.added) == len(measured.routes) and first.skipped == ("X-1",)
    f = ifcopenshell.open(str(tmp_path / "a.ifc"))
    log = ifcopenshell.validate.json_logger()
    ifcopenshell.validate.validate(f, log)
    assert log.statements == []
    cables = {c.Tag: c for c in f.by_type("IfcCableSegment") if ue.get_pset(c, SIZING_PSET)}
    assert set(cables) == set(measured.routes)
    p = ue.get_pset(cables["P-101"], SIZING_PSET)
    assert (p["CrossSection_mm2"], p["Cores"], p["DeviceRating_A"], p["From"]) == (16.0, 4, 63.0, "MCC-1")
    assert p["RoutedLength_m"] == pytest.approx(measured.routes["P-101"].routed_length_m)
    checks = ue.get_pset(cables["P-101"], CHECKS_PSET)
    assert checks["CapacityPassed"] is True and checks["VoltageDropLimit"] == 5.0
    assert any(g.is_a("IfcDistributionCircuit") and g.Name == "P-101"
               for rel in cables["P-101"].HasAssignments for g in [rel.RelatingGroup])
    # written again from its own output: updated in place, nothing added; routes unchanged
    second = write_ifc_copy(tmp_path / "a.ifc", tmp_path / "b.ifc", outcomes)
    assert second.added == () and len(second.updated) == len(measured.routes)
    again = measure_ifc(tmp_path / "b.ifc", CSV)
    assert len(again.segments) == len(measured.segments)
    assert IFC.read_bytes() != (tmp_path / "a.ifc").read_bytes()  # input untouched, copy differs


def test_ifc_copy_refuses_to_overwrite_its_input(tmp_path):
    from cablewright.core.errors import DrawingReadError

    p = tmp_path / "in.ifc"
    p.write_bytes(IFC.read_bytes())
    with pytest.raises(DrawingReadError, match="input"):
        write_ifc_copy(p, p, [])
