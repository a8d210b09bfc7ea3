"""Geometry of the extract stage: lengths of arcs, risers, tees, gaps; joins; units; blocks.

Expected lengths are worked out by hand from the coordinates drawn in each test
(straight lines by Pythagoras, arcs as r * angle), or by shapely's
``LineString.length`` on the same geometry; tolerance 0.5 % or tighter.
"""

from __future__ import annotations

import math
import random

import pytest
import shapely
from cablewright.extract import (
    DrawingConfig,
    RoutePolyline,
    ScheduleRow,
    build_network,
    read_dxf,
    route_circuits,
)


def route(path, pairs, config=None):
    config = config or DrawingConfig()
    content = read_dxf(path, config)
    net = build_network(content.polylines, content.equipment, config)
    rows = [ScheduleRow("t.csv", i + 2, f"C{i + 1}", a, b) for i, (a, b) in enumerate(pairs)]
    routes, failures = route_circuits(net, rows, config)
    return content, net, routes, failures


def test_lwpolyline_bulge_is_a_true_arc(dxf):
    d = dxf()
    # bulge 1 = semicircle (included angle 4*atan(1) = 180 deg), radius 5 -> 5*pi m
    d.msp.add_lwpolyline([(0, 0, 1.0), (10, 0, 0), (10, -4, 0)], format="xyb",
                         dxfattribs={"layer": "ROUTE-TRAY"})
    d.equipment("A", (-1, 0, 0))
    d.equipment("B", (10, -5, 0))
    content, _, routes, failures = route(d.save(), [("A", "B")])
    assert not failures
    assert routes["C1"].routed_length_m == pytest.approx(1 + 5 * math.pi + 4 + 1, rel=1e-4)
    # positive bulge turns counter-clockwise: from (0,0) to (10,0) the arc dips to y = -5
    ys = [p[1] for p in content.polylines[0].points_m]
    assert min(ys) == pytest.approx(-5.0, abs=1e-3)


def test_arc_entity_length(dxf):
    d = dxf()
    d.msp.add_arc((0, 0), 2.0, 0, 90, dxfattribs={"layer": "ROUTE-TRAY"})
    d.equipment("A", (2.5, 0, 0))
    d.equipment("B", (0, 2.5, 0))
    _, _, routes, _ = route(d.save(), [("A", "B")])
    # quarter circle r = 2: pi/2 * 2 = pi; tails 0.5 each
    assert routes["C1"].routed_length_m == pytest.approx(math.pi + 1.0, rel=1e-4)


def test_vertical_riser_joins_levels_and_upper_level_equipment(dxf):
    d = dxf()
    d.line((0, 0, 0), (10, 0, 0))  # lower level
    d.line((10, 0, 0), (10, 0, 4), "ROUTE-LADDER")  # riser
    d.line((5, 0, 4), (20, 0, 4))  # upper level, above the lower tray in plan
    d.equipment("A", (0, -1, 0))
    d.equipment("B", (20, 1, 4))  # on the upper level
    content, net, routes, failures = route(d.save(), [("A", "B")])
    assert not failures
    assert [e.position_m[2] for e in content.equipment if e.tag == "B"] == [4.0]
    # 1 (tail) + 10 + 4 (riser) + 10 (from the riser top at x=10 to x=20) + 1 (tail)
    assert routes["C1"].routed_length_m == pytest.approx(26.0, rel=1e-9)
    assert net.tails["B"].length_m == pytest.approx(1.0)
    # lower run, riser, upper run split at the riser top; the trays overlapping in plan
    # at different z did not join
    assert len(net.segments) == 4


def test_tee_splits_the_run(dxf):
    d = dxf()
    d.line((0, 0), (20, 0))
    d.line((8, 0), (8, 6))  # end on the interior of the first
    d.equipment("A", (0, -1))
    d.equipment("B", (8, 7))
    d.equipment("C", (21, 0))
    _, net, routes, failures = route(d.save(), [("A", "B"), ("B", "C")])
    assert not failures
    assert routes["C1"].routed_length_m == pytest.approx(1 + 8 + 6 + 1)
    assert routes["C2"].routed_length_m == pytest.approx(1 + 6 + 12 + 1)
    assert sorted(round(s.length_m, 9) for s in net.segments.values()) == [6.0, 8.0, 12.0]


def test_crossing_without_shared_vertex_does_not_join(dxf):
    d = dxf()
    d.line((0, 5), (20, 5))
    d.line((10, 0), (10, 10))  # crosses at (10, 5), same level
    d.equipment("A", (0, 4))
    d.equipment("B", (10, -1))
    _, net, routes, failures = route(d.save(), [("A", "B")])
    assert routes == {}
    assert "C1" in failures and "A" in failures["C1"] and "B" in failures["C1"]
    assert len(net.segments) == 2


def test_crossing_with_shared_vertex_joins(dxf):
    d = dxf()
    d.msp.add_lwpolyline([(0, 5), (10, 5), (20, 5)], dxfattribs={"layer": "ROUTE-TRAY"})
    d.msp.add_lwpolyline([(10, 0), (10, 5), (10, 10)], dxfattribs={"layer": "ROUTE-TRAY"})
    d.equipment("A", (0, 4))
    d.equipment("B", (10, -1))
    _, _, routes, failures = route(d.save(), [("A", "B")])
    assert not failures
    assert routes["C1"].routed_length_m == pytest.approx(1 + 10 + 5 + 1)


def test_near_miss_not_joined_and_reported(dxf):
    d = dxf()
    h1 = d.line((0, 0), (10, 0)).dxf.handle
    h2 = d.line((10.2, 0), (20, 0)).dxf.handle  # 200 mm gap: beyond 50 mm, within 10 x 50 mm
    d.equipment("A", (0, -1))
    d.equipment("B", (20, -1))
    _, net, routes, failures = route(d.save(), [("A", "B")])
    assert "C1" in failures
    near = [i for i in net.issues if i.code == "near-miss"]
    assert len(near) == 1
    assert h1 in near[0].message and h2 in near[0].message and "200 mm" in near[0].message


def test_snap_gap_joins_and_counts_as_length(dxf):
    d = dxf()
    d.line((0, 0), (10, 0))
    d.line((10.03, 0), (20, 0))  # 30 mm gap, within the 50 mm tolerance
    d.equipment("A", (0, -1))
    d.equipment("B", (20, -1))
    _, net, routes, failures = route(d.save(), [("A", "B")])
    assert not failures
    assert routes["C1"].routed_length_m == pytest.approx(1 + 10 + 0.03 + 9.97 + 1, rel=1e-12)
    assert not [i for i in net.issues if i.code == "near-miss"]


@pytest.mark.parametrize(("insunits", "per_m"), [(4, 1000.0), (6, 1.0), (2, 1 / 0.3048), (5, 100.0)])
def test_units_give_the_same_metres(dxf, insunits, per_m):
    # $INSUNITS 4 mm, 6 m, 2 ft, 5 cm (DXF reference, HEADER); 1 ft = 0.3048 m exactly
    d = dxf(units=insunits)
    s = per_m
    d.msp.add_lwpolyline([(0, 0), (30 * s, 0), (30 * s, 40 * s)], dxfattribs={"layer": "ROUTE-TRAY"})
    d.equipment("A", (0, -2 * s, 0))
    d.equipment("B", (30 * s, 42 * s, 0))
    _, _, routes, _ = route(d.save(), [("A", "B")])
    assert routes["C1"].routed_length_m == pytest.approx(2 + 30 + 40 + 2, rel=1e-9)


def test_nested_blocks_equipment_and_route(dxf):
    d = dxf()
    frame = d.doc.blocks.new("FRAME")
    d.equipment("P-1", (1, 0, 0), layout=frame)
    skid = d.doc.blocks.new("SKID")
    skid.add_blockref("FRAME", (0, 0, 0.5))
    skid.add_line((0, 0), (0, 5), dxfattribs={"layer": "0"})  # takes the reference's layer
    d.msp.add_blockref("SKID", (10, 0, 0), dxfattribs={"layer": "ROUTE-TRAY", "rotation": 90})
    d.line((0, 0), (5, 0))
    d.equipment("A", (0, -1))
    content, _, routes, failures = route(d.save(), [("A", "P-1")])
    # rotation 90 deg maps local (x, y) to (-y, x): P-1 local (1, 0, 0) + (0, 0, 0.5) -> (10, 1, 0.5)
    p1 = next(e for e in content.equipment if e.tag == "P-1")
    assert p1.position_m == pytest.approx((10, 1, 0.5))
    assert p1.source_id.count("/") == 2  # skid handle / frame handle / pump handle
    # block line local (0,0)-(0,5) -> world (10,0)-(5,0), joined to the model-space line at (5,0)
    assert not failures
    assert routes["C1"].routed_length_m == pytest.approx(1 + 5 + 5 + math.hypot(1, 0.5))


def test_network_length_equals_shapely_length():
    # a random tree of flat polylines, each starting on a vertex of an earlier one (joins)
    rng = random.Random(7)
    pieces = []
    starts = [(0.0, 0.0)]
    for n in range(40):
        x, y = rng.choice(starts)
        pts = [(x, y)]
        for _ in range(rng.randint(1, 4)):
            x += rng.uniform(-20, 20)
            y += rng.uniform(-20, 20)
            pts.append((round(x, 3), round(y, 3)))
        starts.append(pts[-1])
        pieces.append(RoutePolyline(tuple((px, py, 2.5) for px, py in pts), "ROUTE-TRAY", "tray", "E", f"H{n}"))
    net = build_network(pieces, [], DrawingConfig(snap_tolerance_m=1e-4))
    expected = sum(shapely.LineString([p[:2] for p in pl.points_m]).length for pl in pieces)
    assert sum(s.length_m for s in net.segments.values()) == pytest.approx(expected, rel=1e-9)
