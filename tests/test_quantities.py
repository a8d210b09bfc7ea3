"""Bill of quantities and drum plan (sizing/quantities.py), checked by hand and against
published bin-packing results."""

from __future__ import annotations

import itertools
import math
import random

import pytest
from cablewright.core.errors import OutOfRangeError
from cablewright.sizing.quantities import (
    CableRun,
    CableType,
    Cut,
    bill_of_quantities,
    device_counts,
    plan_drums,
)

T95 = CableType(4, 95.0, "Cu", "XLPE")
T16 = CableType(4, 16.0, "Cu", "XLPE")


def test_length_to_order_is_design_length_times_parallel_by_hand():
    # by hand: 4C 95: 40 m x 2 + 30 m x 1 = 110 m in 3 runs (2 circuits); 4C 16: 12.5 m
    rows = bill_of_quantities([CableRun("P1", T95, 40.0, 2), CableRun("P2", T95, 30.0, 1),
                               CableRun("L1", T16, 12.5, 1)], [500.0])
    by = {r.cable.text(): r for r in rows}
    assert by["4C 95 mm² Cu/XLPE"].length_to_order_m == pytest.approx(110.0)
    assert (by["4C 95 mm² Cu/XLPE"].runs, by["4C 95 mm² Cu/XLPE"].circuits) == (3, 2)
    assert by["4C 16 mm² Cu/XLPE"].length_to_order_m == pytest.approx(12.5)


def test_drums_are_shrunk_to_the_shortest_length_that_holds_the_cuts():
    # by hand: 180 + 60 = 240 m fit one 250 m drum (10 m waste) rather than a 1000 m drum
    plan = plan_drums([Cut("A", 180.0), Cut("B", 60.0)], [250.0, 500.0, 1000.0])
    assert [d.length_m for d in plan.drums] == [250.0]
    assert plan.waste_m == pytest.approx(10.0)


def test_a_cut_longer_than_every_drum_is_said_so_and_put_on_no_drum():
    plan = plan_drums([Cut("SP-1", 1200.0), Cut("P1", 100.0)], [500.0, 1000.0])
    assert [c.circuit_id for c in plan.too_long] == ["SP-1"]
    assert all(c.circuit_id != "SP-1" for d in plan.drums for c in d.cuts)


def test_no_drum_lengths_is_refused():
    with pytest.raises(OutOfRangeError, match="drum_lengths_m"):
        plan_drums([Cut("A", 1.0)], [])


def _optimal_bins(sizes, capacity):
    """Fewest bins by brute force over all assignments (small inputs only)."""
    n = len(sizes)
    for k in range(1, n + 1):
        for assign in itertools.product(range(k), repeat=n):
            loads = [0.0] * k
            for s, b in zip(sizes, assign, strict=True):
                loads[b] += s
            if max(loads) <= capacity + 1e-9:
                return k
    return n


@pytest.mark.parametrize("seed", range(12))
def test_first_fit_decreasing_keeps_the_published_bound(seed):
    # Dósa (2007), "The tight bound of First Fit Decreasing bin-packing algorithm is
    # FFD(I) <= 11/9 OPT(I) + 6/9"; OPT by brute force.  Every cut is on exactly one
    # drum and no drum holds more than its length.
    rng = random.Random(seed)
    sizes = [round(rng.uniform(20.0, 600.0), 1) for _ in range(7)]
    plan = plan_drums([Cut(f"C{i}", s) for i, s in enumerate(sizes)], [1000.0])
    opt = _optimal_bins(sizes, 1000.0)
    assert len(plan.drums) <= 11 / 9 * opt + 6 / 9 + 1e-9
    placed = sorted(c.length_m for d in plan.drums for c in d.cuts)
    assert placed == sorted(sizes)
    assert all(d.used_m <= d.length_m + 1e-9 for d in plan.drums)


def test_device_counts_per_kind_and_rating():
    counts = device_counts([("breaker", 16.0), ("fuse", 63.0), ("breaker", 16.0), ("breaker", 20.0)])
    assert [(d.kind, d.rating_a, d.count) for d in counts] == [
        ("breaker", 16.0, 2), ("breaker", 20.0, 1), ("fuse", 63.0, 1)]
    assert math.fsum(d.count for d in counts) == 4
