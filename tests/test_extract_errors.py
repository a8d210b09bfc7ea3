"""Bad input: the whole drawing refused with a clear DrawingReadError naming the file,
or one circuit failing with a message naming the entity while the others are measured
(contract.md, "Commands": what makes the whole input unusable vs one circuit)."""

from __future__ import annotations

import os

import pytest
from cablewright.core.errors import DrawingReadError
from cablewright.extract import (
    DrawingConfig,
    ScheduleRow,
    build_network,
    measure,
    read_dxf,
    route_circuits,
)
from conftest import SAMPLES


def _measure_rows(path, pairs, config=None):
    config = config or DrawingConfig()
    content = read_dxf(path, config)
    net = build_network(content.polylines, content.equipment, config)
    rows = [ScheduleRow("s.csv", i + 2, f"C{i + 1}", a, b) for i, (a, b) in enumerate(pairs)]
    return net, *route_circuits(net, rows, config)


def test_empty_file(tmp_path):
    p = tmp_path / "empty.dxf"
    p.write_bytes(b"")
    with pytest.raises(DrawingReadError, match=r"empty\.dxf.*empty"):
        read_dxf(p)


def test_random_bytes(tmp_path):
    p = tmp_path / "noise.dxf"
    p.write_bytes(os.urandom(4000))
    with pytest.raises(DrawingReadError, match=r"noise\.dxf.*not a readable DXF"):
        read_dxf(p)


def test_missing_file(tmp_path):
    with pytest.raises(DrawingReadError, match=r"nowhere\.dxf.*not found"):
        read_dxf(tmp_path / "nowhere.dxf")


def test_truncated_file_refused(tmp_path):
    data = (SAMPLES / "pumping_station.dxf").read_bytes()
    p = tmp_path / "half.dxf"
    p.write_bytes(data[: len(data) // 2])
    with pytest.raises(DrawingReadError, match=r"half\.dxf"):
        read_dxf(p)


def test_damaged_file_needs_recover(tmp_path):
    data = (SAMPLES / "pumping_station.dxf").read_bytes()
    p = tmp_path / "cut.dxf"
    p.write_bytes(data[: int(len(data) * 0.99)])  # loses the end of the OBJECTS section
    with pytest.raises(DrawingReadError, match=r"cut\.dxf.*damaged.*--recover"):
        read_dxf(p)
    content = read_dxf(p, DrawingConfig(recover=True))
    assert any(i.code == "recovered" for i in content.issues)
    assert content.polylines


def test_unitless_drawing_refused_unless_configured(dxf):
    d = dxf(units=0)
    d.line((0, 0), (10, 0))
    path = d.save()
    with pytest.raises(DrawingReadError, match=r"t\.dxf.*unitless.*units"):
        read_dxf(path)
    content = read_dxf(path, DrawingConfig(units="ft"))
    assert content.polylines[0].points_m[1][0] == pytest.approx(3.048)  # 10 ft, 1 ft = 0.3048 m


def test_no_route_layers(dxf):
    d = dxf()
    d.msp.add_line((0, 0), (10, 0), dxfattribs={"layer": "WALLS"})
    d.equipment("A", (0, 0))
    with pytest.raises(DrawingReadError, match=r"t\.dxf.*no route entities.*WALLS"):
        read_dxf(d.save())


def test_ifc_not_available_yet(tmp_path):
    p = tmp_path / "model.ifc"
    p.write_text("ISO-10303-21;")
    with pytest.raises(DrawingReadError, match="not a readable IFC"):
        measure(p)


def test_unknown_tag_suggests_and_others_are_measured(dxf):
    d = dxf()
    d.line((0, 0), (10, 0))
    d.equipment("MCC-1", (0, -1))
    d.equipment("P-101", (10, -1))
    _, routes, failures = _measure_rows(d.save(), [("MCC-1", "P-101"), ("MCC-1", "P-110")])
    assert routes["C1"].routed_length_m == pytest.approx(12.0)
    assert "P-110" in failures["C2"] and "did you mean P-101" in failures["C2"]
    assert "row 3" in failures["C2"]


def test_load_beyond_maximum_tail(dxf):
    d = dxf()
    d.line((0, 0), (10, 0))
    d.equipment("MCC-1", (0, -1))
    d.equipment("P-1", (10, -1))
    far = d.equipment("P-2", (10, -20))  # 20 m from the tray, beyond the 15 m maximum tail
    net, routes, failures = _measure_rows(d.save(), [("MCC-1", "P-1"), ("MCC-1", "P-2")])
    assert "C1" in routes
    msg = failures["C2"]
    assert "P-2" in msg and far.dxf.handle in msg and "20.00 m" in msg and "15 m" in msg
    # raising the maximum tail routes it: 1 + 10 + 20
    _, routes, failures = _measure_rows(d.path, [("MCC-1", "P-2")], DrawingConfig(max_tail_m=25))
    assert routes["C1"].routed_length_m == pytest.approx(31.0)


def test_two_equipment_with_one_tag(dxf):
    d = dxf()
    d.line((0, 0), (10, 0))
    d.equipment("MCC-1", (0, -1))
    h1 = d.equipment("P-1", (10, -1)).dxf.handle
    h2 = d.equipment("P-1", (5, -1)).dxf.handle
    d.equipment("P-2", (5, 1))
    net, routes, failures = _measure_rows(d.save(), [("MCC-1", "P-1"), ("MCC-1", "P-2")])
    assert routes["C2"].routed_length_m == pytest.approx(7.0)
    assert h1 in failures["C1"] and h2 in failures["C1"]
    assert [i.code for i in net.issues] == ["duplicate-tag"]
