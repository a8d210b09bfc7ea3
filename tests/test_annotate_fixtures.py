"""Shared test data for the annotate tests: a small drawing and circuit outcomes.

The scenario is invented for these tests (a pump room: one MCC, two pumps, a
tray).  The sizing values are made to look like real results and are not checked
here; the tests check what the annotate stage does with them.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from pathlib import Path

import ezdxf
from cablewright.annotate.model import CircuitOutcome
from cablewright.sizing.model import CableSelection, Check, Factor, SizingResult, VoltageDrop

try:  # the real types when extract/ has them, stand-ins otherwise
    from cablewright.extract.model import CircuitRoute, Equipment, RouteSegment
except ImportError:  # pragma: no cover
    CircuitRoute = Equipment = RouteSegment = None  # type: ignore[assignment]


@dataclass(frozen=True)
class GroupStandIn:
    """Shape of extract's GroupInfo (circuits_in_group, cables_in_group, segment_counts)."""

    circuits_in_group: int
    cables_in_group: int
    segment_counts: tuple[tuple[str, int, int], ...]


MM_PER_M = 1000.0

# the tray in metres: S1 from the MCC end to the tee, S2 on to pump 1 around a corner
S1_M = ((0.0, 0.0, 0.0), (20.0, 0.0, 0.0))
S2_M = ((20.0, 0.0, 0.0), (40.0, 0.0, 0.0), (40.0, 20.0, 0.0))
MCC_M = (0.0, 2.0, 0.0)
PUMP1_M = (42.0, 20.0, 0.0)
PUMP2_M = (20.0, -3.0, 0.0)


def make_drawing(path: Path, units: int = 4, upm: float = MM_PER_M) -> Path:
    """Write the test drawing: tray as a LINE and an LWPOLYLINE, three equipment INSERTs."""
    doc = ezdxf.new("R2010", setup=True)
    doc.units = units
    doc.layers.add("ROUTE-TRAY", color=8)
    doc.layers.add("EQUIPMENT", color=2)
    doc.layers.add("WALLS", color=7)
    msp = doc.modelspace()
    k = upm
    msp.add_line(
        (S1_M[0][0] * k, S1_M[0][1] * k),
        (S1_M[1][0] * k, S1_M[1][1] * k),
        dxfattribs={"layer": "ROUTE-TRAY"},
    )
    msp.add_lwpolyline([(x * k, y * k) for x, y, _ in S2_M], dxfattribs={"layer": "ROUTE-TRAY"})
    blk = doc.blocks.new("EQ")
    blk.add_circle((0, 0), 0.5 * k)
    blk.add_attdef("TAG", (0, -0.8 * k), dxfattribs={"height": 0.3 * k})
    for tag, pos in (("MCC-1", MCC_M), ("PUMP-1", PUMP1_M), ("PUMP-2", PUMP2_M)):
        ref = msp.add_blockref("EQ", (pos[0] * k, pos[1] * k), dxfattribs={"layer": "EQUIPMENT"})
        ref.add_auto_attribs({"TAG": tag})
    msp.add_lwpolyline(
        [(-5 * k, -8 * k), (50 * k, -8 * k), (50 * k, 28 * k), (-5 * k, 28 * k)],
        close=True,
        dxfattribs={"layer": "WALLS"},
    )
    doc.saveas(path)
    return path


def segments():
    return {
        "S1": RouteSegment("S1", ("1A",), "ROUTE-TRAY", "tray", "E", 20.0, S1_M),
        "S2": RouteSegment("S2", ("1B",), "ROUTE-TRAY", "tray", "E", 40.0, S2_M),
    }


def equipment():
    return {
        "MCC-1": Equipment("MCC-1", "2A", MCC_M, "EQ", (("TAG", "MCC-1"),)),
        "PUMP-1": Equipment("PUMP-1", "2B", PUMP1_M, "EQ", (("TAG", "PUMP-1"),)),
        "PUMP-2": Equipment("PUMP-2", "2C", PUMP2_M, "EQ", (("TAG", "PUMP-2"),)),
    }


PER_SEGMENT = {"S1": ("P-101", "P-102"), "S2": ("P-101",)}


def _sizing(cid, ib, device, csa, parallel, capacity, grouping, vd_pct, status="ok"):
    factors = (
        Factor("ambient", 1.0, "IEC 60364-5-52:2009 Table B.52.14", "XLPE, 30 °C"),
        Factor(
            "grouping",
            grouping,
            "IEC 60364-5-52:2009 Table B.52.20",
            "perforated tray, 1 tray, 2 cables",
        ),
    )
    cf = 1.0 * grouping
    return SizingResult(
        circuit_id=cid,
        status=status,
        load_current_a=ib,
        device_rating_a=device,
        device_kind="gG fuse",
        method="E",
        governing_segment="S1",
        cables_in_group=2,
        grouping_factor=grouping,
        correction_factor=cf,
        factors=factors,
        required_capacity_a=device / cf,
        cable=CableSelection("Cu", "XLPE", 4, csa, parallel, capacity, "capacity"),
        voltage_drop=VoltageDrop(vd_pct * 4.0, vd_pct, 5.0, 0.86, vd_pct * 0.98),
        checks=(
            Check("capacity", True, capacity, device, "A", "IEC 60364-4-43:2008 433.1", "Iz >= In"),
            Check(
                "voltage_drop",
                vd_pct <= 5.0,
                vd_pct,
                5.0,
                "%",
                "IEC 60364-5-52:2009 Annex G, G.52.1",
                "",
            ),
        ),
    )


def outcomes():
    r1_pts = (
        MCC_M,
        (0.0, 0.0, 0.0),
        (20.0, 0.0, 0.0),
        (40.0, 0.0, 0.0),
        (40.0, 20.0, 0.0),
        PUMP1_M,
    )
    r2_pts = (MCC_M, (0.0, 0.0, 0.0), (20.0, 0.0, 0.0), PUMP2_M)
    r1 = CircuitRoute("P-101", "MCC-1", "PUMP-1", 64.0, 72.2, 2.0, 2.0, ("S1", "S2"), r1_pts)
    r2 = CircuitRoute("P-102", "MCC-1", "PUMP-2", 25.0, 29.25, 2.0, 3.0, ("S1",), r2_pts)
    g1 = GroupStandIn(2, 3, (("S1", 2, 3), ("S2", 1, 2)))
    g2 = GroupStandIn(2, 3, (("S1", 2, 3),))
    return [
        CircuitOutcome(
            "P-101",
            "MCC-1",
            "PUMP-1",
            "ok",
            (),
            r1,
            g1,
            _sizing("P-101", 300.5, 400, 150, 2, 2 * 359 * 0.88 * 0.82, 0.82, 2.1),
        ),
        CircuitOutcome(
            "P-102",
            "MCC-1",
            "PUMP-2",
            "warning",
            ("motor start not checked",),
            r2,
            g2,
            _sizing("P-102", 93.4, 125, 50, 1, 192 * 0.82, 0.82, 0.9, "warning"),
        ),
        CircuitOutcome(
            "P-103",
            "MCC-1",
            "PUMP-9",
            "error",
            ("unknown tag PUMP-9: add it to the drawing or fix the schedule",),
        ),
    ]


def route_polyline_m(outcome):
    return outcome.route.points_m


def angle_deg(dx, dy):
    return math.degrees(math.atan2(dy, dx))


def test_fixture_drawing_is_valid(tmp_path):
    """The test drawing itself audits clean (ezdxf's own auditor)."""
    path = make_drawing(tmp_path / "in.dxf")
    doc = ezdxf.readfile(path)
    assert not doc.audit().has_errors
    assert len(doc.modelspace().query("INSERT")) == 3
