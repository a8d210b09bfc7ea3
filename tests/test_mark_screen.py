"""The bulk forms of the mark index (issue 13, speed) against the plain ones they replace.

* ``box_polygons`` (flat coordinates, ``shapely.from_ragged_array``) against the plain
  construction ``centre + s * u * hw + t * v * hh`` handed to ``shapely.polygons``;
* the leader screen (``LabelIndex.leaders_crossing_marks``): every leader it names fails
  the exact one-by-one test (``thin_box`` against the placed boxes, separating axes), and
  it names the plain cases;
* ``first_free`` with the chunks and the screen gives the spot the one-by-one search
  gives (every box tested in turn with ``is_free`` and the leader test).

Seeded inputs; shapely (general-purpose geometry library) for the polygons.
"""

import math

import numpy as np
import shapely
from cablewright.annotate.drawing.boxes import oriented_box
from cablewright.annotate.drawing.label_spots import _nearest_on_box, _spot, pick
from cablewright.annotate.drawing.mark_index import LabelIndex, box_polygons, thin_box


def _plain_polygons(rows: np.ndarray) -> np.ndarray:
    cx, cy, ux, uy, hw, hh = rows[:, :6].T
    vx, vy = -uy, ux
    sx = np.array([-1.0, 1.0, 1.0, -1.0])[:, None]
    sy = np.array([-1.0, -1.0, 1.0, 1.0])[:, None]
    xs = cx + sx * ux * hw + sy * vx * hh
    ys = cy + sx * uy * hw + sy * vy * hh
    return shapely.polygons(np.stack([xs.T, ys.T], axis=-1))


def _rows(rng: np.random.Generator, n: int, scale: float) -> np.ndarray:
    rows = np.zeros((n, 10))
    rows[:, :2] = rng.uniform(-scale, scale, (n, 2))
    ang = rng.uniform(-math.pi, math.pi, n)
    ang[: n // 3] = 0.0
    rows[:, 2], rows[:, 3] = np.cos(ang), np.sin(ang)
    rows[:, 4] = rng.uniform(0.5, 8.0, n)
    rows[:, 5] = rng.uniform(0.3, 2.0, n)
    return rows


def test_box_polygons_equal_the_plain_construction():
    rng = np.random.default_rng(13)
    for scale in (1.0, 1e3, 1e6):
        rows = _rows(rng, 400, scale)
        fast, plain = box_polygons(rows), _plain_polygons(rows)
        assert np.array_equal(shapely.get_coordinates(fast), shapely.get_coordinates(plain))
        assert shapely.equals_exact(fast, plain, tolerance=0.0).all()
        assert np.allclose(shapely.area(fast), 4.0 * rows[:, 4] * rows[:, 5])


def _crowded_index(rng: np.random.Generator, boxes: int = 300, side: float = 200.0) -> LabelIndex:
    index = LabelIndex(cell=12.0)
    for cx, cy in rng.uniform(0.0, side, (boxes, 2)):
        index.add(oriented_box(float(cx), float(cy), rng.uniform(2.0, 12.0), 1.7,
                               rng.choice([0.0, 30.0, 90.0, -45.0])))
    return index


def test_leader_screen_names_only_leaders_that_fail_the_exact_test():
    rng = np.random.default_rng(7)
    index = _crowded_index(rng)
    a = rng.uniform(0.0, 200.0, (3000, 2))
    b = a + rng.uniform(-30.0, 30.0, (3000, 2))
    named = index.leaders_crossing_marks(a, b, 0.05)
    assert 0.3 < named.mean() < 0.95  # the crowded index crosses most leaders
    for i in range(len(a)):
        thin = thin_box(tuple(a[i]), tuple(b[i]), 0.05)
        exact_free = thin is None or index.free_of_boxes(thin)
        if named[i]:
            assert not exact_free
            assert not index.leader_free(tuple(a[i]), tuple(b[i]), shorten_a=0.05, lines=False)


def test_leader_screen_plain_cases():
    index = LabelIndex(cell=12.0)
    index.add(oriented_box(10.0, 0.0, 4.0, 2.0, 0.0))
    edge = 1.0 - 1e-8  # 1e-8 inside the box's top edge: within the screen's margin
    a = np.array([[0.0, 0.0], [0.0, 5.0], [9.0, 0.0], [0.0, 0.99], [0.0, edge]])
    b = np.array([[20.0, 0.0], [20.0, 5.0], [9.0, 0.5], [20.0, 0.99], [20.0, edge]])
    # straight through; clear above; a short leader inside the box; 0.01 inside its top
    # edge; along the edge, left to the exact test (which finds the crossing)
    assert index.leaders_crossing_marks(a, b, 0.0).tolist() == [True, False, True, True, False]
    assert index.leader_free((0.0, edge), (20.0, edge), shorten_a=0.0) is False
    assert index.leader_free((0.0, 5.0), (20.0, 5.0), shorten_a=0.0) is True


def _one_by_one(index: LabelIndex, spots: np.ndarray, start: float) -> int | None:
    for i in range(len(spots)):
        sp = _spot(spots, i)
        if not index.is_free(sp.box):
            continue
        near = _nearest_on_box(sp.box, sp.anchor)
        if sp.gap <= 0.0 or index.leader_free(sp.anchor, near, shorten_a=start,
                                                       lines=True, graze=0.1):
            return i
    return None


def test_first_free_with_chunks_and_screen_equals_one_by_one_search():
    rng = np.random.default_rng(3)
    index = _crowded_index(rng, boxes=190, side=100.0)  # fewer than a tree rebuild
    found = 0
    for _ in range(40):
        spots = _rows(rng, int(rng.integers(20, 300)), 1.0)
        spots[:, :2] = rng.uniform(0.0, 100.0, (1, 2)) + rng.uniform(-25.0, 25.0, (len(spots), 2))
        spots[:, 6:8] = spots[0, :2] + rng.uniform(-3.0, 3.0, 2)
        spots[:, 8] = rng.uniform(0.0, 3.0, len(spots))
        want = _one_by_one(index, spots, 0.05)
        got = pick(index, spots, 1.0, leader_lines=True)
        assert (None if got is None else got) == (None if want is None else _spot(spots, want))
        found += want is not None
    assert 0 < found < 40


def test_first_free_equals_one_by_one_search_as_the_trees_of_marks_grow():
    """Marks added one at a time past many rebuilds (REBUILD_AFTER) and merges of the small
    tree into the large one (MERGE_SHARE): the trees hold exactly the marks up to the last
    rebuild, in order, and every search gives the one-by-one spot."""
    from cablewright.annotate.drawing import mark_index
    from shapely.geometry import LineString

    rng = np.random.default_rng(11)
    index = LabelIndex(cell=12.0)
    side = 400.0
    shapes_seen = set()
    found = 0
    for step in range(1600):
        cx, cy = rng.uniform(0.0, side, 2)
        index.add(oriented_box(float(cx), float(cy), rng.uniform(2.0, 12.0), 1.7,
                               rng.choice([0.0, 30.0, 90.0, -45.0])))
        if step % 3 == 0:  # a leader of ours now and then
            index.add_line(LineString([(cx, cy), (cx + rng.uniform(-20, 20), cy + rng.uniform(-20, 20))]))
        if step % 40 == 39:
            spots = _rows(rng, int(rng.integers(50, 300)), 1.0)
            spots[:, :2] = rng.uniform(0.0, side, (1, 2)) + rng.uniform(-30.0, 30.0, (len(spots), 2))
            spots[:, 6:8] = spots[0, :2] + rng.uniform(-3.0, 3.0, 2)
            spots[:, 8] = rng.uniform(0.0, 3.0, len(spots))
            want = _one_by_one(index, spots, 0.05)
            got = pick(index, spots, 1.0, leader_lines=True)
            assert (None if got is None else got) == (None if want is None else _spot(spots, want))
            found += want is not None
            levels = index.mark_levels()
            shapes_seen.add(len(levels))
            if not levels:  # fewer marks than a rebuild: all of them in the grid
                assert len(index._marks) < mark_index.REBUILD_AFTER
                continue
            # contiguous from the first mark, ending where the grid of the marks since begins
            assert [lv.start for lv in levels] == [0, *[lv.stop for lv in levels[:-1]]]
            assert levels[-1].stop == sum(index._in_tree)
            assert 0 <= len(index._marks) - levels[-1].stop < mark_index.REBUILD_AFTER
            for lv in levels:
                assert len(lv.tree) == lv.stop - lv.start
    assert shapes_seen == {0, 1, 2}  # both a lone large tree and a large one with a small one
    assert 0 < found < 40
