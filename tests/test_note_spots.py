"""Device and fill notes near their point (issue 12): the spots are ordered nearest first,
straight-above/below shifts included, and a wrapped variant is taken when one line finds
no clear spot.  Geometry checked with shapely (general-purpose geometry library)."""

import numpy as np
from cablewright.annotate.drawing.boxes import _polygon
from cablewright.annotate.drawing.label_spots import _spot
from cablewright.annotate.drawing.mark_index import LabelIndex
from cablewright.annotate.drawing.note_spots import (
    NEAR_GAPS_H,
    note_spots,
    note_variants,
    place_note,
    two_lines,
)
from shapely.geometry import LineString, Point


def test_spots_nearest_first_and_no_box_edge_beyond_its_gap():
    h = 1.0
    gaps = [g * h for g in NEAR_GAPS_H]
    spots = note_spots((0.0, 0.0, 0.0), 6.0, 1.5, gaps)
    assert np.all(np.diff(spots[:, 8]) >= 0)
    for i in range(0, len(spots), 17):
        sp = _spot(spots, i)
        # the box leaves the point clear and its nearest edge is no further than the gap
        # along the spot's ray (shapely distance)
        d = _polygon(sp.box).distance(Point(0.0, 0.0))
        assert 0.0 < d <= sp.gap + 1e-9


def test_wrapped_variant_taken_between_two_walls():
    """Vertical walls at x = -9, -2.5, 2.5 and 9 round the point: a 7-wide one-line note
    fits between no two of them (it would sit beyond 9, further than the near rings);
    wrapped onto two lines (3.5 wide) it fits above the point."""
    h = 1.0
    walls = [LineString([(x, -40), (x, 40)]) for x in (-9.0, -2.5, 2.5, 9.0)]
    index = LabelIndex(cell=4.0, lines=walls)
    sizes = [(7.0, 1.5), (3.5, 2.8)]
    spot, variant = place_note(index, (0.0, 0.0, 0.0), sizes, h)
    assert variant == 1
    assert not any(spot.place.polygon.intersects(w) for w in walls)
    assert index.stats.with_leader == 1 and index.stats.crossing_linework == 0


def test_variants():
    assert two_lines("P-101: breaker 160 A") == ["P-101:", "breaker 160 A"]
    assert note_variants(["S6"]) == [["S6"]]
    assert note_variants(["A: b c", "D: e"]) == [["A: b c", "D: e"], ["A:", "b c", "D:", "e"]]
