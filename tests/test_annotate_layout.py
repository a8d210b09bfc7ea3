"""Label placement geometry, checked against shapely (general-purpose geometry library)."""

from __future__ import annotations

import math
import random

import pytest
from cablewright.annotate.drawing.boxes import (
    LabelIndex,
    _box,
    boxes_overlap,
    label_polygon,
    oriented_box,
)
from cablewright.annotate.drawing.placement import (
    place_along,
    place_near_point,
    readable_angle_deg,
)
from cablewright.annotate.drawing.stretches import Stretch, rank_stretches, straight_stretches
from shapely.geometry import LineString


def test_box_overlap_agrees_with_shapely():
    """Separating-axis test against shapely's polygon intersection area, 2000 random pairs."""
    rnd = random.Random(7)
    agree = 0
    for _ in range(2000):
        a = (
            rnd.uniform(-5, 5),
            rnd.uniform(-5, 5),
            rnd.uniform(0.5, 8),
            rnd.uniform(0.2, 2),
            rnd.uniform(-90, 90),
        )
        b = (
            rnd.uniform(-5, 5),
            rnd.uniform(-5, 5),
            rnd.uniform(0.5, 8),
            rnd.uniform(0.2, 2),
            rnd.uniform(-90, 90),
        )
        area = label_polygon(*a).intersection(label_polygon(*b)).area
        if 1e-9 < area or area == 0.0:  # skip grazing contacts within rounding
            assert boxes_overlap(_box(*a), _box(*b)) == (area > 1e-9), (a, b, area)
            agree += 1
    assert agree > 1900


@pytest.mark.parametrize(
    ("dx", "dy"),
    [(1, 0), (-1, 0), (0, 1), (0, -1), (1, 1), (-1, -1), (-1, 1), (1, -1), (-3, 0.2)],
)
def test_readable_angle_is_the_line_direction_folded_upright(dx, dy):
    rot = readable_angle_deg(dx, dy)
    assert -90.0 < rot <= 90.0
    # same line: the direction differs from atan2 by 0 or 180 degrees
    diff = (math.degrees(math.atan2(dy, dx)) - rot) % 180.0
    assert min(diff, 180.0 - diff) == pytest.approx(0.0, abs=1e-9)


def test_straight_stretches_lengths_match_shapely():
    pts = [(0, 0), (10, 0), (10.001, 0), (20, 0.05), (20, 15), (5, 15)]
    parts = straight_stretches(pts)
    # merged pieces are measured by their chord: never longer than the path (shapely),
    # shorter only by the cosine of the small kinks merged (here < 0.3 degrees)
    total = sum(s.length for s in parts)
    assert total <= LineString(pts).length
    assert total == pytest.approx(LineString(pts).length, rel=1e-5)
    assert len(parts) == 3


def test_flattened_arc_is_cut_into_short_stretches():
    arc = [
        (10 * math.cos(math.radians(a)), 10 * math.sin(math.radians(a))) for a in range(0, 91, 2)
    ]
    parts = straight_stretches(arc, angle_tol_deg=4.0)
    # 45 pieces turning 2 degrees each: a stretch holds at most 3 (0, 2, 4 degrees)
    assert 15 <= len(parts) <= 45
    # each chord stays within the tolerance of the arc: shorter by at most 1 - cos(4 deg)
    assert sum(s.length for s in parts) == pytest.approx(
        LineString(arc).length, rel=1 - math.cos(math.radians(4.0))
    )


def test_labels_on_a_shared_stretch_stack_without_overlap():
    index = LabelIndex(cell=10.0, obstacles=[LineString([(0, 0), (50, 0)])])
    stretch = [Stretch((0.0, 0.0), (50.0, 0.0), crowd=12)]
    places = [place_along(index, stretch, 12.0, 1.7) for _ in range(12)]
    polys = [p.polygon for p in places]
    for i, a in enumerate(polys):
        for b in polys[i + 1 :]:
            assert a.intersection(b).area == pytest.approx(0.0, abs=1e-9)
    line = LineString([(0, 0), (50, 0)])
    assert all(not p.polygon.intersects(line) for p in places)  # kept off the route line
    assert all(p.polygon.distance(line) < 6 * 1.7 for p in places)
    assert not any(p.overlaps for p in places)


def test_rank_prefers_own_stretch_that_fits():
    own = Stretch((0, 0), (15, 0), crowd=1)
    shared = Stretch((0, 0), (80, 0), crowd=5)
    tiny = Stretch((0, 0), (2, 0), crowd=1)
    assert rank_stretches([shared, tiny, own], 12.0)[0] is own


def test_note_near_point_does_not_cover_it():
    index = LabelIndex(cell=5.0)
    notes = [place_near_point(index, 0.0, 0.0, 0.0, 6.0, 1.7) for _ in range(5)]
    from shapely.geometry import Point

    for n in notes:
        assert not n.polygon.contains(Point(0, 0))
        assert not n.overlaps


def test_box_bounds_are_shapely_bounds():
    """A Box's axis-aligned bounds equal shapely's bounds of the same rotated rectangle."""
    rnd = random.Random(11)
    for _ in range(500):
        cx, cy = rnd.uniform(-50, 50), rnd.uniform(-50, 50)
        w, h, rot = rnd.uniform(0.1, 20), rnd.uniform(0.1, 5), rnd.uniform(-180, 180)
        box = oriented_box(cx, cy, w, h, rot)
        ref = label_polygon(cx, cy, w, h, rot).bounds  # shapely (xmin, ymin, xmax, ymax)
        assert (box.xmin, box.ymin, box.xmax, box.ymax) == pytest.approx(ref, abs=1e-9)
        assert (box.cx, box.cy, 2 * box.hw, 2 * box.hh) == pytest.approx((cx, cy, w, h))
