"""IFC models without cable carriers, as electrical exports usually are (issue 16, item 6).

The models are written here by the sample's ``IfcModelBuilder`` (ifcopenshell.api): a
distribution board, two loads on two levels and circuit groups, no carriers.  Expected
lengths are the right-angle (Manhattan) distance |dx| + |dy| + |dz| of the placements,
computed here by plain arithmetic.
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

import pytest

pytest.importorskip("ifcopenshell")

from test_hostile_input import run_cli  # noqa: E402

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT / "sample_drawings"))
from generate_pumping_station_ifc import IfcModelBuilder  # noqa: E402

DB = (1.0, 2.0, 0.0)
PUMP = (11.0, 7.0, 0.0)
SOCKET = (4.0, 10.0, 3.5)  # on the first floor


def no_carrier_model(path: Path, schema: str = "IFC4") -> Path:
    """A board DB-1 feeding a pump P-1 and a socket S-1 through two circuit groups."""
    b = IfcModelBuilder(schema, "mm", seed="no-carriers")
    b.storey("Ground", 0.0)
    b.storey("Level 1", 3.5)
    db = b.equipment("IfcElectricDistributionBoard", "DB-1", DB, predefined="DISTRIBUTIONBOARD")
    pump = b.equipment("IfcElectricMotor", "P-1", PUMP)
    socket = b.equipment("IfcOutlet", "S-1", SOCKET, storey="Level 1")
    b.circuit("C1", [db, pump], {"load": "5.5 kW", "voltage": "400", "phases": "3"})
    # the socket's data as an authoring tool exports it: the standard device property set
    b.pset(socket, "Pset_ElectricalDeviceCommon", {"RatedCurrent": 16.0, "RatedVoltage": 230.0})
    b.circuit("C2", [db, socket], {"phases": "1"})
    return b.write(path)


def _config(tmp_path: Path) -> Path:
    cfg = tmp_path / "cfg.toml"
    cfg.write_text("[ifc]\nestimate_routes = true\n", encoding="utf-8")
    return cfg


@pytest.mark.parametrize("schema", ["IFC4", "IFC2X3"])
def test_refused_with_the_equipment_and_circuits_found(tmp_path, schema):
    model = no_carrier_model(tmp_path / "m.ifc", schema)
    code, out, err = run_cli(["routes", str(model), "--json"])
    assert code == 2, err  # contract.md, "Commands": the input could not be used
    assert len(err) == 1, err
    line = err[0]
    assert "no cable carriers" in line and "3 tagged equipment and 2 circuit group(s)" in line, line
    assert "DB-1: C1, C2" in line and "estimate_routes = true" in line, line


def test_estimated_routes_are_right_angle_paths(tmp_path):
    model = no_carrier_model(tmp_path / "m.ifc")
    code, out, err = run_cli(["routes", str(model), "--config", str(_config(tmp_path)), "--json"])
    assert code == 0, err
    circuits = json.loads(out)["circuits"]
    routes = {c["id"]: c["route"]["routed_length_m"] for c in circuits}
    assert all(any(m.startswith("route estimated") for m in c["messages"]) for c in circuits), circuits

    def manhattan(a, b):
        return sum(abs(p - q) for p, q in zip(a, b, strict=True))

    assert routes["C1"] == pytest.approx(manhattan(DB, PUMP), abs=1e-6)  # 10 + 5 = 15 m
    assert routes["C2"] == pytest.approx(manhattan(DB, SOCKET), abs=1e-6)  # 3 + 8 + 3.5 = 14.5 m
    assert any("route(s) estimated as right-angle paths" in line for line in err), err


def test_every_sized_circuit_says_estimated(tmp_path, monkeypatch):
    import cablewright.annotate.report_pdf as report_pdf

    monkeypatch.setattr(report_pdf, "write_report_pdf", lambda path, *a, **k: Path(path).write_bytes(b"%PDF"))
    model = no_carrier_model(tmp_path / "m.ifc")
    out_dir = tmp_path / "out"
    code, out, err = run_cli(["size", str(model), "--config", str(_config(tmp_path)), "--out", str(out_dir),
                              "--json"])
    assert code in (0, 1), err
    circuits = json.loads(out)["circuits"]
    assert len(circuits) == 2
    for c in circuits:
        assert any(m.startswith("route estimated") for m in c["messages"]), c
    # C2's load is the socket's RatedCurrent of Pset_ElectricalDeviceCommon: Ib = 16 A as given
    c2 = next(c for c in circuits if c["id"] == "C2")
    assert c2["load_current_a"] == pytest.approx(16.0)
    report = (out_dir / "report.html").read_text(encoding="utf-8")
    assert "route estimated" in report


def test_cable_segment_without_geometry_is_named_as_such(tmp_path):
    b = IfcModelBuilder("IFC4", "mm", seed="no-geometry")
    b.segment([(0, 0, 0), (5, 0, 0)], predefined="CABLESEGMENT", ifc_class="IfcCableSegment",
              name="CAB-1", ports=False, geometry="none")
    b.equipment("IfcElectricDistributionBoard", "DB-1", DB, predefined="DISTRIBUTIONBOARD")
    model = b.write(tmp_path / "g.ifc")
    code, out, err = run_cli(["routes", str(model), "--json"])
    assert code == 2 and len(err) == 1, err
    assert "route element(s)" in err[0] and "have no usable geometry" in err[0], err[0]
    assert "no cable carriers" not in err[0]


def test_one_piece_without_geometry_is_reported_the_others_used(tmp_path):
    b = IfcModelBuilder("IFC4", "mm", seed="one-without")
    b.segment([(0, 0, 0), (10, 0, 0)], ports=False)
    b.segment([(0, 3, 0), (5, 3, 0)], predefined="CABLESEGMENT", ifc_class="IfcCableSegment",
              name="CAB-2", ports=False, geometry="none")
    b.equipment("IfcElectricDistributionBoard", "DB-1", (0, 0, 0), predefined="DISTRIBUTIONBOARD")
    b.equipment("IfcElectricMotor", "M-1", (10, 0, 0))
    model = b.write(tmp_path / "h.ifc")
    csv = tmp_path / "c.csv"
    csv.write_text("circuit,from,to,load\nC1,DB-1,M-1,5 kW\n", encoding="utf-8")
    code, out, err = run_cli(["routes", str(model), "--circuits", str(csv), "--json"])
    assert code == 0, err
    assert json.loads(out)["circuits"][0]["route"]["routed_length_m"] == pytest.approx(10.0, abs=1e-6)
    assert any("CAB-2" in line and "neither an 'Axis' curve nor an extruded 'Body'" in line for line in err), err
