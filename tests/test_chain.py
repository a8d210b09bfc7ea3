"""Voltage drop from the origin of the installation (IEC 60364-5-52:2009 Annex G)."""

from __future__ import annotations

import networkx as nx
import pytest
from cablewright.sizing.chain import SupplyCycleError, cumulative_drop_percent, exceeding_limit
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
