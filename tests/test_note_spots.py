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


def _grid_of_walls(pitch: float, reach: float) -> list[LineString]:
    """Walls every ``pitch`` both ways out to ``reach``, the point in the middle of a cell."""
    n = int(reach / pitch)
    ks = [(k + 0.5) * pitch for k in range(-n, n)]
    return ([LineString([(x, -reach), (x, reach)]) for x in ks]
            + [LineString([(-reach, y), (reach, y)]) for y in ks])


def test_key_taken_where_no_variant_of_the_note_fits():
    """Walls every 3 h both ways round the point (a room full of small cells, out beyond
    the far rings): neither the 7-wide note nor its 3.5-wide wrapped variant fits in a cell,
    its 2-wide key does; it is the variant after the note's own (note_keys.py), placed
    clear of every wall, and counted as placed with a leader, not as a last resort."""
    h = 1.0
    walls = _grid_of_walls(3.0, 40.0)
    index = LabelIndex(cell=4.0, lines=walls)
    sizes = [(7.0, 1.5), (3.5, 2.8)]
    spot, variant = place_note(index, (0.0, 0.0, 0.0), sizes, h, key_size=(2.0, 1.5))
    assert variant == len(sizes)
    assert not any(spot.place.polygon.intersects(w) for w in walls)
    assert spot.place.width == 2.0
    assert index.stats.fallbacks == 0 and index.stats.with_leader == 1


def test_without_a_key_the_same_note_is_a_last_resort():
    """The same room without a key: the note crosses a wall, counted as a last resort."""
    walls = _grid_of_walls(3.0, 40.0)
    index = LabelIndex(cell=4.0, lines=walls)
    spot, variant = place_note(index, (0.0, 0.0, 0.0), [(7.0, 1.5), (3.5, 2.8)], 1.0)
    assert variant in (0, 1)
    assert any(spot.place.polygon.intersects(w) for w in walls)
    assert index.stats.crossing_linework == 1
