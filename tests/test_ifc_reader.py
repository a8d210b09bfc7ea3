"""IFC input: small models written in the test, lengths known by construction.

Expected lengths are computed here with ``math.dist`` / ``math.pi`` from the points
placed (geometry, not our code); tolerance 0.5 %.  The models are written with
ifcopenshell.api through the sample generator's builder.
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import pytest

pytest.importorskip("ifcopenshell")

from cablewright.core.errors import DrawingReadError, ScheduleError  # noqa: E402
from cablewright.extract.ifc_reader import measure_ifc, read_ifc  # noqa: E402

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT / "sample_drawings"))
from generate_pumping_station_ifc import IfcModelBuilder  # noqa: E402

REL = 0.005  # 0.5 %

DB = (0.0, -1.0, 0.0)
MOTOR = (7.0, 4.0, 0.0)


def _schedule(tmp_path: Path, rows: list[tuple[str, str, str]]) -> Path:
    p = tmp_path / "circuits.csv"
    p.write_text("circuit,from,to,load\n" + "".join(f"{c},{a},{b},5 kW\n" for c, a, b in rows))
    return p


def _l_model(unit: str = "mm", schema: str = "IFC4", ports: bool = True, fitting: bool = True,
             geometry: str = "axis"):
    """Tray A (0,0,3)-(6,0,3), bend at (6,0,3), tray B (6,0,3)-(6,4,3); DB and motor."""
    b = IfcModelBuilder(schema, unit)
    _, pa = b.segment([(0, 0, 3), (6, 0, 3)], ports=ports, geometry=geometry)
    _, pb = b.segment([(6, 0, 3), (6, 4, 3)], ports=ports, geometry=geometry)
    if ports and fitting:
        _, pf = b.fitting((6, 0, 3), 2, predefined="BEND")
        b.connect(pa[1], pf[0])
        b.connect(pf[1], pb[0], both_ways=True)  # two relations: must count once
    elif ports:
        b.connect(pa[1], pb[0])
    b.equipment("IfcElectricDistributionBoard", "DB", DB, predefined="DISTRIBUTIONBOARD")
    b.equipment("IfcElectricMotor", "M1", MOTOR, predefined="INDUCTION")
    return b


def _l_expected() -> float:
    return math.dist(DB, (0, 0, 3)) + 6.0 + 4.0 + math.dist(MOTOR, (6, 4, 3))


@pytest.mark.parametrize("unit", ["mm", "m"])
@pytest.mark.parametrize("geometry", ["axis", "polyline", "body", "axis2d"])
def test_bend_route_length_in_mm_and_m(tmp_path, unit, geometry):
    path = _l_model(unit, geometry=geometry).write(tmp_path / "l.ifc")
    m = measure_ifc(path, _schedule(tmp_path, [("C1", "DB", "M1")]))
    assert m.units == "m"
    assert m.routes["C1"].routed_length_m == pytest.approx(_l_expected(), rel=REL)
    assert not [i for i in m.issues if i.code == "no-ports"]


def test_ifc2x3_and_ifc4x3_read_the_same(tmp_path):
    for schema in ("IFC2X3", "IFC4X3"):
        path = _l_model("mm", schema=schema, geometry="polyline").write(tmp_path / f"{schema}.ifc")
        content = read_ifc(path)
        assert content.schema == schema
        assert content.port_links == 2
        m = measure_ifc(path, _schedule(tmp_path, [("C1", "DB", "M1")]))
        assert m.routes["C1"].routed_length_m == pytest.approx(_l_expected(), rel=REL)


def test_no_ports_falls_back_to_geometry_with_a_warning(tmp_path):
    path = _l_model(ports=False).write(tmp_path / "np.ifc")
    m = measure_ifc(path, _schedule(tmp_path, [("C1", "DB", "M1")]))
    assert m.routes["C1"].routed_length_m == pytest.approx(_l_expected(), rel=REL)
    warn = [i for i in m.issues if i.code == "no-ports"]
    assert len(warn) == 1 and "drawing rules" in warn[0].message


def test_connected_ports_join_beyond_snap_tolerance(tmp_path):
    # 0.3 m between the two trays' ends (> 50 mm snap): joined only by the port relation
    def build(connect: bool) -> Path:
        b = IfcModelBuilder("IFC4", "mm")
        _, pa = b.segment([(0, 0, 3), (6, 0, 3)])
        _, pb = b.segment([(6.3, 0, 3), (10, 0, 3)])
        if connect:
            b.connect(pa[1], pb[0])
        b.equipment("IfcElectricDistributionBoard", "DB", (0, -1, 3))
        b.equipment("IfcElectricMotor", "M1", (10, 1, 3))
        return b.write(tmp_path / f"gap{connect}.ifc")

    sched = _schedule(tmp_path, [("C1", "DB", "M1")])
    m = measure_ifc(build(True), sched)
    assert m.routes["C1"].routed_length_m == pytest.approx(1 + 6 + 0.3 + 3.7 + 1, rel=REL)
    m = measure_ifc(build(False), sched)
    assert "C1" in m.failures and "no route joins DB to M1" in m.failures["C1"]


def test_tee_fitting_and_riser_between_storeys(tmp_path):
    b = IfcModelBuilder("IFC4", "mm")
    b.storey("Level 1", 4.0)
    _, m1 = b.segment([(0, 0, 3), (5, 0, 3)])
    _, m2 = b.segment([(5, 0, 3), (10, 0, 3)])
    _, br = b.segment([(5, 0, 3), (5, 6, 3)], predefined="CABLELADDERSEGMENT")
    _, tee = b.fitting((5, 0, 3), [(5, 0, 3), (5, 0, 3), (5, 0, 3)], predefined="TEE")
    for fp, other in zip(tee, (m1[1], m2[0], br[0]), strict=True):
        b.connect(other, fp)
    _, riser = b.segment([(10, 0, 3), (10, 0, 6.5)], predefined="CABLELADDERSEGMENT")
    b.connect(m2[1], riser[0])
    _, up = b.segment([(10, 0, 6.5), (10, 8, 6.5)], storey="Level 1")
    b.connect(riser[1], up[0])
    b.equipment("IfcElectricDistributionBoard", "DB", (0, -1, 3))
    b.equipment("IfcElectricMotor", "M1", (5, 7, 3))
    b.equipment("IfcLightFixture", "L1", (10, 8.5, 6.5), storey="Level 1")
    path = b.write(tmp_path / "tee.ifc")
    m = measure_ifc(path, _schedule(tmp_path, [("C1", "DB", "M1"), ("C2", "DB", "L1")]))
    assert m.routes["C1"].routed_length_m == pytest.approx(1 + 5 + 6 + 1, rel=REL)
    assert m.routes["C2"].routed_length_m == pytest.approx(1 + 10 + 3.5 + 8 + 0.5, rel=REL)
    # the branch is ladder, the tee takes the tray of its neighbours (2 of 3)
    kinds = {s.containment for s in m.segments.values()}
    assert kinds == {"tray", "ladder"}


def test_arc_axis_length_is_the_arc(tmp_path):
    b = IfcModelBuilder("IFC4", "mm")
    r = 3.0
    # quarter circle centred (0, r): from (0, 0) to (r, r) through 45 degrees
    mid = (r * math.sin(math.pi / 4), r - r * math.cos(math.pi / 4), 3.0)
    b.segment([(0, 0, 3), mid, (r, r, 3)], predefined="CONDUITSEGMENT", arc=True)
    b.equipment("IfcElectricDistributionBoard", "DB", (0, 0, 3))
    b.equipment("IfcElectricMotor", "M1", (r, r, 3))
    m = measure_ifc(b.write(tmp_path / "arc.ifc"), _schedule(tmp_path, [("C1", "DB", "M1")]))
    assert m.routes["C1"].routed_length_m == pytest.approx(math.pi / 2 * r, rel=REL)  # quarter circle


def test_methods_from_classes_override_and_ground(tmp_path):
    b = IfcModelBuilder("IFC4", "m")
    b.segment([(0, 0, 3), (1, 0, 3)], predefined="CABLETRAYSEGMENT")
    b.segment([(0, 1, 3), (1, 1, 3)], predefined="CABLELADDERSEGMENT")
    b.segment([(0, 2, 3), (1, 2, 3)], predefined="CABLETRUNKINGSEGMENT")
    b.segment([(0, 3, 3), (1, 3, 3)], predefined="CONDUITSEGMENT")
    b.segment([(0, 4, -0.8), (1, 4, -0.8)], predefined="CONDUITSEGMENT")
    b.segment([(0, 5, 3), (1, 5, 3)], predefined="CABLETRAYSEGMENT", routing={"ReferenceMethod": "F"})
    b.segment([(0, 6, 3), (1, 6, 3)], predefined="CONDUITSEGMENT", routing={"Containment": "clipped"})
    b.segment([(0, 7, 3), (1, 7, 3)], predefined="CABLESEGMENT", ifc_class="IfcCableSegment")
    b.segment([(0, 8, -1), (1, 8, -1)], predefined="CABLESEGMENT", ifc_class="IfcCableSegment")
    got = {round(p.points_m[0][1]): (p.containment, p.method, p.layer)
           for p in read_ifc(b.write(tmp_path / "k.ifc")).polylines}
    # contract.md "IFC input" and "Drawing conventions" (IEC 60364-5-52:2009 Table B.52.1)
    assert got == {
        0: ("tray", "E", "ROUTE-TRAY"), 1: ("ladder", "E", "ROUTE-LADDER"),
        2: ("conduit", "B2", "ROUTE-CONDUIT"), 3: ("conduit", "B2", "ROUTE-CONDUIT"),
        4: ("duct", "D1", "ROUTE-DUCT"), 5: ("tray", "F", "ROUTE-TRAY"),
        6: ("clipped", "C", "ROUTE-CLIPPED"), 7: ("clipped", "C", "ROUTE-CLIPPED"),
        8: ("buried", "D2", "ROUTE-BURIED"),
    }


def test_circuit_groups_give_the_rows_exactly(tmp_path):
    b = _l_model()
    db = [e for e in b.f.by_type("IfcElectricDistributionBoard")][0]
    mo = [e for e in b.f.by_type("IfcElectricMotor")][0]
    b.circuit("C-7", [db, mo], {"load": "7.5 kW", "power_factor": "0.85", "phases": "3"})
    b.circuit("C-8", [mo], {"load": "1 kW"})  # no source: cannot be told
    m = measure_ifc(b.write(tmp_path / "g.ifc"))
    row = next(r for r in m.rows if r.circuit_id == "C-7")
    assert (row.from_tag, row.to_tag, row.get("load"), row.get("power_factor")) == ("DB", "M1", "7.5 kW", "0.85")
    assert m.routes["C-7"].routed_length_m == pytest.approx(_l_expected(), rel=REL)
    assert "C-8" in m.failures and "CW_Circuit" in m.failures["C-8"]
    assert "\n" not in m.failures["C-8"]


def test_no_schedule_and_no_groups_asks_for_circuits(tmp_path):
    with pytest.raises(ScheduleError, match="--circuits"):
        measure_ifc(_l_model().write(tmp_path / "n.ifc"))


def test_missing_equipment_tag_fails_that_circuit_only(tmp_path):
    path = _l_model().write(tmp_path / "t.ifc")
    m = measure_ifc(path, _schedule(tmp_path, [("C1", "DB", "M1"), ("C2", "DB", "M9")]))
    assert "C1" in m.routes
    msg = m.failures["C2"]
    assert "M9" in msg and "not in the drawing" in msg and "\n" not in msg


def test_not_an_ifc_file(tmp_path):
    p = tmp_path / "bad.ifc"
    p.write_text("this is not a STEP file\n")
    with pytest.raises(DrawingReadError, match="bad.ifc"):
        read_ifc(p)
    with pytest.raises(DrawingReadError, match="empty"):
        (tmp_path / "empty.ifc").write_text("")
        read_ifc(tmp_path / "empty.ifc")


def test_unsupported_schema_is_named(tmp_path):
    path = _l_model().write(tmp_path / "x.ifc")
    text = path.read_text().replace("FILE_SCHEMA(('IFC4'))", "FILE_SCHEMA(('IFC4X1'))")
    path.write_text(text)
    with pytest.raises(DrawingReadError, match="IFC4X1 is not supported"):
        read_ifc(path)


def test_model_without_carriers_is_refused(tmp_path):
    b = IfcModelBuilder("IFC4", "mm")
    b.equipment("IfcElectricMotor", "M1", MOTOR)
    with pytest.raises(DrawingReadError, match="no cable carriers"):
        read_ifc(b.write(tmp_path / "none.ifc"))
