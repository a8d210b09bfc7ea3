"""Routing, grouping and schedules of the extract stage.

Shortest paths are checked against networkx on a graph built independently here;
grouping counts are worked out by hand from the small network drawn; the sample
drawing against the lengths its generator computed from the coordinates it placed.
"""

from __future__ import annotations

import json
import math
import random

import networkx as nx
import pytest
from cablewright.core.errors import ScheduleError
from cablewright.extract import (
    CircuitRoute,
    DrawingConfig,
    Equipment,
    RoutePolyline,
    ScheduleRow,
    build_network,
    circuits_per_segment,
    group_summary,
    measure,
    read_schedule,
    route_circuits,
    rows_from_equipment,
)
from conftest import SAMPLES


def _tray(a, b, sid):
    return RoutePolyline((a, b), "ROUTE-TRAY", "tray", "E", sid)


def test_one_tree_per_source_matches_networkx_shortest_path(monkeypatch):
    rng = random.Random(3)
    n = 8
    pos = {(i, j): (i * 10 + rng.uniform(-2, 2), j * 10 + rng.uniform(-2, 2), 0.0)
           for i in range(n) for j in range(n)}
    ref = nx.Graph()  # independent reference graph: grid nodes, Euclidean weights
    pieces = []
    for (i, j), p in pos.items():
        for q in ((i + 1, j), (i, j + 1)):
            if q in pos and rng.random() > 0.15:
                ref.add_edge((i, j), q, w=math.dist(p, pos[q]))
                pieces.append(_tray(p, pos[q], f"H{len(pieces)}"))
    # equipment 1 m above grid nodes: its nearest route point is the node itself
    nodes = sorted(ref.nodes)
    chosen = rng.sample(nodes, 12)
    equipment = [Equipment(f"E{k}", f"Q{k}", (pos[c][0], pos[c][1], 1.0), "EQ") for k, c in enumerate(chosen)]
    rows = []
    for k in range(2, 12):
        for src in (0, 1):
            rows.append(ScheduleRow("t.csv", len(rows) + 2, f"C{src}-{k}", f"E{src}", f"E{k}"))
    calls = []
    import cablewright.extract.routing as routing

    real = routing.shortest_path_tree
    monkeypatch.setattr(routing, "shortest_path_tree", lambda *a, **k: calls.append(a[1]) or real(*a, **k))
    net = build_network(pieces, equipment)
    routes, failures = route_circuits(net, rows)
    assert len(calls) == 2  # one shortest-path tree per source
    assert all(c.startswith("EQ:") for c in calls)
    for row in rows:
        a, b = chosen[int(row.from_tag[1:])], chosen[int(row.to_tag[1:])]
        if not nx.has_path(ref, a, b):
            assert row.circuit_id in failures
            continue
        expected = nx.shortest_path_length(ref, a, b, weight="w") + 2.0  # two 1 m tails
        got = routes[row.circuit_id]
        assert got.routed_length_m == pytest.approx(expected, rel=1e-9)
        path = nx.shortest_path(ref, a, b, weight="w")
        got_xy = [v for p in got.points_m[1:-1] for v in p[:2]]
        assert got_xy == pytest.approx([v for c in path for v in pos[c][:2]])


def _y_network():
    # trunk (0,0)-(10,0) with a tail attaching at (5,0); branches to (20,0) and (10,10)
    pieces = [_tray((0, 0, 0), (10, 0, 0), "T"), _tray((10, 0, 0), (20, 0, 0), "B1"),
              _tray((10, 0, 0), (10, 10, 0), "B2")]
    eq = [Equipment("S", "1", (0, 0, 1), "EQ"), Equipment("M", "2", (5, 0, 1), "EQ"),
          Equipment("L1", "3", (20, 0, 1), "EQ"), Equipment("L2", "4", (10, 10, 1), "EQ")]
    return build_network(pieces, eq)


def test_grouping_counts_on_a_hand_made_network():
    net = _y_network()
    rows = [ScheduleRow("t.csv", i + 2, cid, a, b) for i, (cid, a, b) in enumerate(
        [("C1", "S", "L1"), ("C2", "S", "L2"), ("C3", "S", "L1"), ("C4", "S", "M"),
         ("C5", "S", "NOPE"), ("C6", "L1", "L2")])]
    routes, failures = route_circuits(net, rows)
    assert set(failures) == {"C5"}
    parallel = {"C1": 2}
    per = circuits_per_segment(routes, parallel)

    def seg(a, b):  # segment id by its end points, found from the geometry
        for sid, s in net.segments.items():
            ends = {s.points_m[0][:2], s.points_m[-1][:2]}
            if ends == {a, b}:
                return sid
        raise AssertionError((a, b))

    t1, t2 = seg((0, 0), (5, 0)), seg((5, 0), (10, 0))
    b1, b2 = seg((10, 0), (20, 0)), seg((10, 0), (10, 10))
    assert len(net.segments) == 4  # the trunk is split where M's tail attaches
    assert per[t1] == ("C1", "C2", "C3", "C4")
    assert per[t2] == ("C1", "C2", "C3")
    assert per[b1] == ("C1", "C3", "C6")
    assert per[b2] == ("C2", "C6")
    info = group_summary(routes, per, parallel)
    assert "C5" not in info
    # by hand: cables on t1 = 2 + 1 + 1 + 1 = 5, t2 = 4, b1 = 2 + 1 + 1 = 4, b2 = 2
    assert info["C6"].segment_counts == ((b1, 3, 4), (b2, 2, 2))
    assert (info["C6"].circuits_in_group, info["C6"].cables_in_group) == (3, 4)
    assert (info["C2"].circuits_in_group, info["C2"].cables_in_group) == (4, 5)
    assert (info["C1"].circuits_in_group, info["C1"].cables_in_group) == (4, 5)


def test_alone_and_tail_only_circuits():
    r1 = CircuitRoute("A", "X", "Y", 10, 12, 1, 1, ("S1",), ())
    r2 = CircuitRoute("B", "X", "Z", 2, 3, 1, 1, (), ())  # tails only: not grouped
    info = group_summary({"A": r1, "B": r2}, parallel={"A": 3, "B": 2})
    assert (info["A"].circuits_in_group, info["A"].cables_in_group) == (1, 3)
    assert (info["B"].circuits_in_group, info["B"].cables_in_group, info["B"].segment_counts) == (1, 2, ())


def test_via_forces_the_route_through_a_piece():
    # a square loop: the short way from S to L is the bottom side; via the top side goes round
    pieces = [_tray((0, 0, 0), (10, 0, 0), "BOT"), _tray((10, 0, 0), (10, 10, 0), "R"),
              _tray((10, 10, 0), (0, 10, 0), "TOP"), _tray((0, 10, 0), (0, 0, 0), "L")]
    eq = [Equipment("S", "1", (0, 0, 1), "EQ"), Equipment("L", "2", (10, 0, 1), "EQ")]
    net = build_network(pieces, eq)
    rows = [ScheduleRow("t.csv", 2, "C1", "S", "L"),
            ScheduleRow("t.csv", 3, "C2", "S", "L", (("via", "TOP"),)),
            ScheduleRow("t.csv", 4, "C3", "S", "L", (("via", "T0P"),))]
    routes, failures = route_circuits(net, rows)
    assert routes["C1"].routed_length_m == pytest.approx(10 + 2)
    assert routes["C2"].routed_length_m == pytest.approx(30 + 2)
    assert "T0P" in failures["C3"] and "TOP" in failures["C3"]  # suggestion


def test_design_length_adds_slack_and_end_allowances():
    net = _y_network()
    routes, _ = route_circuits(net, [ScheduleRow("t.csv", 2, "C1", "S", "L1")],
                               DrawingConfig(slack_fraction=0.1, end_allowance_m=2.0))
    r = routes["C1"]
    assert r.routed_length_m == pytest.approx(22.0)  # 1 + 20 + 1
    assert r.design_length_m == pytest.approx(22.0 * 1.1 + 4.0)
    assert (r.source_tail_m, r.load_tail_m) == pytest.approx((1.0, 1.0))


# --------------------------------------------------------------------------- sample drawing


@pytest.fixture(scope="module")
def expected():
    return json.loads((SAMPLES / "pumping_station_expected.json").read_text())["circuits"]


@pytest.mark.parametrize("schedule", ["pumping_station_circuits.csv", "pumping_station_circuits.xlsx", None])
def test_sample_drawing_lengths_within_half_percent(expected, schedule):
    m = measure(SAMPLES / "pumping_station.dxf", SAMPLES / schedule if schedule else None)
    assert m.units == "mm"
    assert m.failures == {}
    assert set(m.routes) == set(expected)
    for cid, e in expected.items():
        assert m.routes[cid].routed_length_m == pytest.approx(e["routed_length_m"], rel=0.005), cid
        assert m.routes[cid].source_tail_m == pytest.approx(e["source_tail_m"], rel=0.005), cid
    assert not [i for i in m.issues if i.code in ("near-miss", "isolated", "duplicate-tag")]


# --------------------------------------------------------------------------- schedules


def test_csv_schedule_headers_any_case_and_order(tmp_path):
    p = tmp_path / "s.csv"
    p.write_text("To;LOAD;Circuit;From;Remarks;voltage\nP-1;55 kW;C1;MCC-1;pump;\n\nL-1;2 kW;C2;DB-1;;230\n")
    rows = read_schedule(p)
    assert [(r.circuit_id, r.from_tag, r.to_tag) for r in rows] == [("C1", "MCC-1", "P-1"), ("C2", "DB-1", "L-1")]
    assert rows[0].get("remarks") == "pump" and rows[0].get("VOLTAGE") is None
    assert rows[1].get("voltage") == "230" and rows[1].row == 4


def test_schedule_missing_column_and_duplicate_circuit(tmp_path):
    p = tmp_path / "bad.csv"
    p.write_text("circuit,from,to\nC1,A,B\n")
    with pytest.raises(ScheduleError, match=r"bad\.csv.*load"):
        read_schedule(p)
    p.write_text("circuit,from,to,load\nC1,A,B,1 kW\nC2,A,C,1 kW\nC1,A,D,2 kW\n")
    with pytest.raises(ScheduleError, match=r"C1.*rows 2 and 4"):
        read_schedule(p)
    junk = tmp_path / "junk.xlsx"
    junk.write_bytes(b"not a workbook at all")
    with pytest.raises(ScheduleError, match="junk.xlsx"):
        read_schedule(junk)


def test_rows_from_equipment_attributes():
    eq = [Equipment("P-1", "1", (0, 0, 0), "EQ", (("CIRCUIT", "C1"), ("FROM", "MCC-1"), ("LOAD", "5 kW"), ("TAG", "P-1"))),
          Equipment("MCC-1", "2", (0, 0, 0), "EQ", (("TAG", "MCC-1"),))]
    rows = rows_from_equipment(eq)
    assert [(r.circuit_id, r.from_tag, r.to_tag, r.get("load")) for r in rows] == [("C1", "MCC-1", "P-1", "5 kW")]
    with pytest.raises(ScheduleError):
        rows_from_equipment(eq[1:])


def test_early_stopped_tree_gives_networkx_paths_and_lengths():
    # The tree stops once its targets are settled; distances and paths to them must be
    # those of networkx's single_source_dijkstra on the same graph (ties included).
    from cablewright.extract.routing import path_from_tree, shortest_path_tree

    rng = random.Random(11)
    g = nx.grid_2d_graph(12, 12)
    g = nx.relabel_nodes(g, {n: f"N{n[0]}_{n[1]}" for n in g})
    for u, v in g.edges:
        g.edges[u, v]["length_m"] = rng.choice((1.0, 1.0, 2.0, 3.0))  # many equal-length ties
    dist_all, paths_all = nx.single_source_dijkstra(g, "N0_0", weight="length_m")
    targets = rng.sample(sorted(g.nodes), 10)
    dist, pred = shortest_path_tree(g, "N0_0", targets)
    assert len(dist) < len(dist_all)  # it did stop early
    for t in targets:
        assert dist[t] == dist_all[t]
        assert path_from_tree(pred, t, "N0_0") == paths_all[t]


def test_zero_length_edge_back_to_the_source_is_not_followed():
    from cablewright.extract.routing import path_from_tree, shortest_path_tree

    g = nx.Graph()
    g.add_edge("S", "A", length_m=0.0)  # a zero-length joint at the source
    g.add_edge("A", "B", length_m=5.0)
    dist, pred = shortest_path_tree(g, "S", ["B"])
    assert path_from_tree(pred, "B", "S") == nx.shortest_path(g, "S", "B", weight="length_m")
    assert dist["B"] == 5.0
