"""The network build against the drawing's scale, and its messages (issue 16, items 2 and 3).

Drawings are made here by generators (ezdxf, plain polylines), never by hand.  Expected
values come from arithmetic on the generated geometry (a median of known lengths, a
distance set by construction) and from the contract's exit codes.
"""

from __future__ import annotations

import time
from pathlib import Path

import ezdxf
import pytest
from cablewright.core.errors import ConfigError
from cablewright.extract.model import DrawingConfig, Equipment, RoutePolyline
from cablewright.extract.network import MAX_CANDIDATES_PER_POINT, build_network
from test_hostile_input import run_cli

ROOT = Path(__file__).resolve().parents[1]
CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"


def misscaled_plan(path: Path, n_side: int = 24) -> Path:
    """A plan drawn in metres but with $INSUNITS = 4 (mm): a grid of n_side x n_side cells.

    Each cell side is 0.025 drawing units, read as 0.025 mm; about 1,150 pieces for
    n_side = 24, as many as the real drawing of issue 16 (1,063 pieces).
    """
    doc = ezdxf.new()
    doc.header["$INSUNITS"] = 4
    msp = doc.modelspace()
    step = 0.025
    for i in range(n_side + 1):
        for k in range(n_side):
            msp.add_line((k * step, i * step), ((k + 1) * step, i * step), dxfattribs={"layer": "ROUTE-TRAY"})
            msp.add_line((i * step, k * step), (i * step, (k + 1) * step), dxfattribs={"layer": "ROUTE-TRAY"})
    doc.saveas(path)
    return path


def test_snap_tolerance_covering_the_plan_stops_within_seconds(tmp_path):
    # 50 mm default tolerance on pieces 0.025 mm long: 2,000 times the median piece length
    plan = misscaled_plan(tmp_path / "misscaled.dxf")
    t0 = time.perf_counter()
    code, out, err = run_cli(["routes", str(plan), "--circuits", str(CSV), "--json"])
    elapsed = time.perf_counter() - t0
    assert code == 2  # contract.md, "Commands": the input could not be used
    assert len(err) == 1, err
    assert "median route piece length" in err[0] and "units" in err[0], err[0]
    assert "Traceback" not in err[0]
    assert elapsed < 10.0, elapsed


def test_scale_guard_passes_the_right_scale():
    # the same grid at 25 m cells: 0.05 m is 0.2 % of a piece, far below half of it
    pieces = [RoutePolyline(((k * 25.0, 0.0, 0.0), ((k + 1) * 25.0, 0.0, 0.0)), "T", "tray", "E", str(k))
              for k in range(4)]
    net = build_network(pieces, [], DrawingConfig())
    assert len(net.segments) == 1  # four collinear pieces end to end: one run


def test_crowded_search_is_bounded():
    # 300 pieces of 1 m stacked within 10 mm of each other: every end meets 600 others,
    # far more than the cap per point; the build stops instead of making 90,000 joins
    n = 300
    pieces = [RoutePolyline(((0.0, k * 0.01 / n, 0.0), (1.0, k * 0.01 / n, 0.0)), "T", "tray", "E", str(k))
              for k in range(n)]
    assert 2 * n > MAX_CANDIDATES_PER_POINT
    with pytest.raises(ConfigError, match="pairs of nearby routes"):
        build_network(pieces, [], DrawingConfig())


def test_near_miss_message_tells_distance_from_tolerance():
    # a free end 50.4 mm from the other route (by construction), tolerance 50 mm
    a = RoutePolyline(((0.0, 0.0, 0.0), (10.0, 0.0, 0.0)), "T", "tray", "E", "A")
    b = RoutePolyline(((5.0, 0.0504, 0.0), (5.0, 10.0, 0.0)), "T", "tray", "E", "B")
    eq = [Equipment("X", "e1", (0.0, 0.0, 0.0), "BLK"), Equipment("Y", "e2", (5.0, 10.0, 0.0), "BLK")]
    net = build_network([a, b], eq, DrawingConfig())
    msgs = [i.message for i in net.issues if i.code == "near-miss"]
    assert len(msgs) == 1
    assert "is 50.4 mm from route A, beyond the 50 mm snap tolerance" in msgs[0], msgs[0]


def test_isolated_messages_say_what_is_true():
    main = RoutePolyline(((0.0, 0.0, 0.0), (10.0, 0.0, 0.0)), "T", "tray", "E", "MAIN")
    # two pieces joined end to end, 20 m away from the rest, no equipment on them
    c1 = RoutePolyline(((0.0, 20.0, 0.0), (5.0, 20.0, 0.0)), "T", "tray", "E", "C1")
    c2 = RoutePolyline(((5.0, 20.0, 0.0), (5.0, 25.0, 0.0)), "T", "tray", "E", "C2")
    lone = RoutePolyline(((30.0, 30.0, 0.0), (35.0, 30.0, 0.0)), "T", "tray", "E", "LONE")
    eq = [Equipment("X", "e1", (0.0, 0.0, 0.0), "BLK"), Equipment("Y", "e2", (10.0, 0.0, 0.0), "BLK")]
    net = build_network([main, c1, c2, lone], eq, DrawingConfig())
    msgs = sorted(i.message for i in net.issues if i.code == "isolated")
    assert len(msgs) == 2, msgs
    assert msgs[0].startswith("route piece LONE joins no other route and no equipment")
    assert msgs[1].startswith("route pieces C1, C2 join each other (2 pieces) but no equipment")


# --------------------------------------------------------------------------- crossings


def crossing_plan(path: Path, *, second: tuple[tuple[float, float], tuple[float, float]] | None = None) -> Path:
    """Two trays drawn as crossing lines (no shared vertex), in metres ($INSUNITS = 6).

    East-west tray from (0, 0) to (10, 0) with board DB-1 at its west end; north-south tray
    from (5, -5) to (5, 5) with load M-1 at its north end.  They cross at (5, 0).
    ``second`` replaces the north-south tray (to draw a gap or a separate network).
    """
    doc = ezdxf.new()
    doc.header["$INSUNITS"] = 6
    msp = doc.modelspace()
    blk = doc.blocks.new("EQ")
    blk.add_circle((0, 0), 0.2)
    blk.add_attdef("TAG", (0, 0))
    msp.add_line((0, 0), (10, 0), dxfattribs={"layer": "ROUTE-TRAY"})
    a, b = second or ((5, -5), (5, 5))
    msp.add_line(a, b, dxfattribs={"layer": "ROUTE-TRAY"})
    msp.add_blockref("EQ", (0, 0)).add_auto_attribs({"TAG": "DB-1"})
    msp.add_blockref("EQ", b).add_auto_attribs({"TAG": "M-1"})
    doc.saveas(path)
    return path


def _schedule(path: Path) -> Path:
    path.write_text("circuit,from,to,load,voltage,phases\nC1,DB-1,M-1,5 kW,400,3\n", encoding="utf-8")
    return path


def _routes(tmp_path: Path, plan: Path, join: bool | None = None) -> tuple[int, dict | None, list[str]]:
    argv = ["routes", str(plan), "--circuits", str(_schedule(tmp_path / "c.csv")), "--json"]
    if join is not None:
        cfg = tmp_path / "cfg.toml"
        cfg.write_text(f"[routes]\njoin_crossings = {str(join).lower()}\n", encoding="utf-8")
        argv += ["--config", str(cfg)]
    code, out, err = run_cli(argv)
    import json

    return code, (json.loads(out) if out.strip() else None), err


def test_crossing_without_joint_is_reported_and_named_in_the_advice(tmp_path):
    code, doc, err = _routes(tmp_path, crossing_plan(tmp_path / "x.dxf"))
    text = "\n".join(err) + json_text(doc)
    assert "cross at (5.000, 0.000) m at the same level without a joint" in text, text
    assert "their routes cross at (5.000, 0.000) m without a joint" in text, text
    assert "check the drawing for a gap" not in text


def test_join_crossings_joins_at_the_crossing(tmp_path):
    code, doc, err = _routes(tmp_path, crossing_plan(tmp_path / "x.dxf"), join=True)
    assert code == 0, err
    (circuit,) = doc["circuits"]
    # DB-1 at (0, 0) along the tray to (5, 0), then north to M-1 at (5, 5): 5 + 5 m (geometry)
    assert circuit["route"]["routed_length_m"] == pytest.approx(10.0, abs=1e-6), circuit
    assert "cross" not in "\n".join(err)


def test_gap_is_named_with_its_size(tmp_path):
    # the north tray stops 0.2 m short of the east-west tray: a gap of 200 mm, 4 x the tolerance
    code, doc, err = _routes(tmp_path, crossing_plan(tmp_path / "g.dxf", second=((5, 0.2), (5, 5))))
    text = "\n".join(err) + json_text(doc)
    assert "a gap of 200.0 mm between the end of route" in text, text


def test_separate_network_is_named(tmp_path):
    # the second tray 20 m away from the first: nothing joins them, nothing near
    code, doc, err = _routes(tmp_path, crossing_plan(tmp_path / "s.dxf", second=((30, 20), (30, 30))))
    text = "\n".join(err) + json_text(doc)
    assert "separate networks (no route connects the two)" in text, text


def test_many_crossings_make_one_summary_line():
    # a grid of 15 east-west and 15 north-south runs: 225 crossings, none joined
    pieces = [RoutePolyline(((0.0, 2.0 * k + 1, 0.0), (30.0, 2.0 * k + 1, 0.0)), "T", "tray", "E", f"H{k}")
              for k in range(15)]
    pieces += [RoutePolyline(((2.0 * k + 1, 0.0, 0.0), (2.0 * k + 1, 30.0, 0.0)), "T", "tray", "E", f"V{k}")
               for k in range(15)]
    msgs = [i.message for i in build_network(pieces, [], DrawingConfig()).issues if i.code == "crossing"]
    assert len(msgs) == 1 and msgs[0].startswith("225 crossings"), msgs
    joined = build_network(pieces, [], DrawingConfig(join_crossings=True))
    assert not [i for i in joined.issues if i.code == "crossing"]
    # joined: each run cut at its 15 crossings gives 16 segments; 30 runs -> 480 segments
    assert len(joined.segments) == 30 * 16


def test_crossing_at_different_levels_is_not_reported():
    a = RoutePolyline(((0.0, 0.0, 3.0), (10.0, 0.0, 3.0)), "T", "tray", "E", "HIGH")
    b = RoutePolyline(((5.0, -5.0, 0.0), (5.0, 5.0, 0.0)), "T", "tray", "E", "LOW")
    net = build_network([a, b], [], DrawingConfig(join_crossings=True))
    assert not [i for i in net.issues if i.code == "crossing"]
    assert len(net.segments) == 2  # a tray passing 3 m over another does not join it


def json_text(doc: dict | None) -> str:
    import json

    return json.dumps(doc) if doc else ""
