"""Voltage drop from the origin of the installation (IEC 60364-5-52:2009 Annex G)."""

from __future__ import annotations

import networkx as nx
import pytest
from cablewright.sizing.chain import (
    SupplyCycleError,
    chain_drops,
    cumulative_drop_percent,
    exceeding_limit,
)
from hypothesis import given, settings
from hypothesis import strategies as st


def test_two_levels():
    own = {"F1": 1.2, "F2": 0.8, "L1": 2.5, "L2": 3.1, "L3": 1.0}
    src = {"F1": "MSB", "F2": "DB1", "L1": "DB2", "L2": "DB1", "L3": "MSB"}
    feeder = {"DB1": "F1", "DB2": "F2"}
    cum = cumulative_drop_percent(own, src, feeder)
    assert cum == pytest.approx({"F1": 1.2, "F2": 2.0, "L1": 4.5, "L2": 4.3, "L3": 1.0})
    assert exceeding_limit(cum, 4.4) == ["L1"]
    assert exceeding_limit(cum, {"L2": 4.0}) == ["L2"]


def test_cycle_names_the_circuits():
    own = {"A": 1.0, "B": 1.0, "C": 1.0}
    src = {"A": "DB-B", "B": "DB-A", "C": "MSB"}
    with pytest.raises(SupplyCycleError, match=r"A -> B -> A|B -> A -> B"):
        cumulative_drop_percent(own, src, {"DB-A": "A", "DB-B": "B"})


def test_self_feed_is_a_cycle():
    with pytest.raises(SupplyCycleError, match="X"):
        cumulative_drop_percent({"X": 1.0}, {"X": "DB"}, {"DB": "X"})


@settings(max_examples=50, deadline=None)
@given(st.lists(st.integers(0, 1000), min_size=1, max_size=25), st.data())
def test_matches_networkx_path_sums(drops, data):
    # A random radial supply tree: circuit i is fed from the board of a circuit
    # j < i (or the origin).  The cumulative drop is the sum of own drops on the
    # networkx shortest path from the origin (checked against networkx).
    n = len(drops)
    own = {f"C{i}": drops[i] / 100 for i in range(n)}
    src, feeder = {}, {}
    tree = nx.DiGraph()
    tree.add_node("ORIGIN")
    for i in range(n):
        parent = data.draw(st.integers(-1, i - 1))
        src[f"C{i}"] = "ORIGIN" if parent < 0 else f"DB{parent}"
        feeder[f"DB{i}"] = f"C{i}"
        tree.add_edge("ORIGIN" if parent < 0 else f"C{parent}", f"C{i}")
    cum = cumulative_drop_percent(own, src, feeder)
    for cid in own:
        path = nx.shortest_path(tree, "ORIGIN", cid)[1:]
        assert cum[cid] == pytest.approx(sum(own[c] for c in path))


def test_loop_is_reported_apart_and_the_rest_computed():
    # P-10 and P-11 feed each other; P-12 is fed through the loop; P-1 and P-2
    # (fed from P-1's board) have an origin.  The drop from the origin is the
    # sum of the own drops up the chain (IEC 60364-5-52:2009 Annex G, G.52.1).
    own = {"P-1": 1.25, "P-2": 2.5, "P-10": 1.0, "P-11": 1.5, "P-12": 0.5}
    src = {"P-1": "MSB", "P-2": "DB1", "P-10": "DB11", "P-11": "DB10", "P-12": "DB11"}
    feeder = {"DB1": "P-1", "DB10": "P-10", "DB11": "P-11"}
    drops = chain_drops(own, src, feeder)
    assert drops.cumulative_pct == pytest.approx({"P-1": 1.25, "P-2": 1.25 + 2.5})
    assert [set(e.circuit_ids) for e in drops.loops] == [{"P-10", "P-11"}]
    assert drops.loop_of("P-1") is None and drops.loop_of("P-11") is drops.loops[0]
    assert list(drops.fed_through_loop) == ["P-12"]
    with pytest.raises(SupplyCycleError) as info:
        cumulative_drop_percent(own, src, feeder)
    assert set(info.value.circuit_ids) == {"P-10", "P-11"}


def _spec(cid: str, length_m: float):
    from cablewright.sizing.model import CircuitSpec, Load, Stretch

    return CircuitSpec(circuit_id=cid, load=Load(20.0, "kW"), voltage_v=400.0, phases=3,
                       power_factor=0.9, load_type="general", conductor="Cu", insulation="XLPE",
                       design_length_m=length_m, stretches=(Stretch(method="E"),))


def test_pipeline_keeps_p1_beside_a_p10_p11_loop():
    # Regression: the loop used to be found by `cid in str(exc)`, so P-1 was
    # marked error beside a P-10/P-11 loop and every circuit lost its drop
    # from the origin.  The expected totals are the Annex G sums of the own
    # drops (IEC 60364-5-52:2009 G.52.1), read from each circuit's result.
    from cablewright.extract.model import ScheduleRow
    from cablewright.sizing.config import SizingConfig
    from cablewright.sizing.select import size_circuit

    from cablewright.pipeline import _with_chain_drops

    tags = {"P-1": ("MSB", "DB1"), "P-2": ("DB1", "M2"), "P-3": ("MSB", "M3"),
            "P-10": ("DB11", "DB10"), "P-11": ("DB10", "DB11"), "P-12": ("DB11", "M12")}
    rows = {cid: ScheduleRow("test.csv", i + 2, cid, a, b) for i, (cid, (a, b)) in enumerate(tags.items())}
    results = {cid: size_circuit(_spec(cid, 40.0 + 10 * i), SizingConfig())
               for i, cid in enumerate(tags)}
    assert all(r.voltage_drop is not None for r in results.values())
    out = _with_chain_drops(results, rows)
    own = {cid: r.voltage_drop.percent for cid, r in results.items()}
    for cid in ("P-1", "P-3"):
        assert out[cid].status == results[cid].status
        assert out[cid].voltage_drop.cumulative_percent == pytest.approx(own[cid])
    assert out["P-2"].voltage_drop.cumulative_percent == pytest.approx(own["P-1"] + own["P-2"])
    for cid in ("P-10", "P-11"):
        assert out[cid].status == "error"
        assert any("feed each other in a loop" in m for m in out[cid].messages)
    assert out["P-12"].voltage_drop.cumulative_percent is None
    assert any("passes through the loop" in m for m in out["P-12"].messages)
    assert not any("in a loop" in m or "through the loop" in m for cid in ("P-1", "P-2", "P-3") for m in out[cid].messages)
