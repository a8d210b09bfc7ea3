"""The whole-drawing array steps of the network build against the per-piece code they replace.

Issue 13 item 6: each helper in ``extract/network_arrays.py`` must give exactly what the
one-piece-at-a-time code gave (same floats, not merely close), so the references here are
the Python standard library (``bisect``, ``math.dist``) and numpy called on one piece at
a time, on random pieces made here (seeded).
"""

from __future__ import annotations

import math
import random
from bisect import bisect_left, bisect_right

import numpy as np
from cablewright.extract.network_arrays import (
    count_at_most,
    cumulative_lengths,
    flat_vertices,
    piece_lengths,
    plain_vertices,
    roots_of,
)
from cablewright.extract.network_geometry import COINCIDENT_M, UnionFind, clean_vertices


def _pieces(seed: int, n: int, max_vertices: int) -> list[list[tuple[float, float, float]]]:
    rng = random.Random(seed)
    out = []
    for _ in range(n):
        scale = rng.choice([1.0, 1e3, 1e5])  # site coordinates up to 100 km
        k = rng.randint(2, max_vertices)
        out.append([(rng.uniform(0, scale), rng.uniform(0, scale), rng.uniform(0, 10)) for _ in range(k)])
    return out


def test_cumulative_lengths_equal_per_piece_numpy() -> None:
    # reference: np.linalg.norm(np.diff(...)) and np.cumsum on each piece alone
    pieces = _pieces(1, 300, 90)
    flat, start = flat_vertices(pieces)
    seglen, cum = cumulative_lengths(flat, start)
    for i, p in enumerate(pieces):
        v = np.asarray(p)
        sl = np.linalg.norm(np.diff(v, axis=0), axis=1)
        assert np.array_equal(seglen[start[i] - i : start[i + 1] - i - 1], sl)
        assert np.array_equal(cum[start[i] : start[i + 1]], np.concatenate(([0.0], np.cumsum(sl))))


def test_piece_lengths_equal_per_piece_sum() -> None:
    # reference: the sum of one piece's step norms (numpy's pairwise sum of that piece);
    # close to math.dist summed (a different rounding, so only within 1e-9 relative)
    pieces = _pieces(2, 400, 40)
    lengths = piece_lengths(pieces)
    for p, length in zip(pieces, lengths, strict=True):
        assert length == float(np.linalg.norm(np.diff(np.asarray(p), axis=0), axis=1).sum())
        assert math.isclose(length, sum(math.dist(a, b) for a, b in zip(p, p[1:], strict=False)), rel_tol=1e-9)


def test_count_at_most_is_bisect() -> None:
    # reference: bisect_right (<= x) and bisect_left (< x) on the piece's own distances,
    # short pieces (a comparison table) and one long one (> 64 vertices: searchsorted)
    pieces = _pieces(3, 50, 12) + _pieces(4, 1, 200)
    flat, start = flat_vertices(pieces)
    _, cum = cumulative_lengths(flat, start)
    rng = np.random.default_rng(5)
    poly = rng.integers(0, len(pieces), 2000)
    poly[:40] = len(pieces) - 1
    total = cum[start[poly + 1] - 1]
    x = rng.uniform(-0.1, 1.1, len(poly)) * total
    x[::7] = cum[start[poly[::7]] + 1]  # exactly on a vertex: where right and left differ
    right = count_at_most(cum, start, poly, x, strict=False)
    left = count_at_most(cum, start, poly, x, strict=True)
    for n, i in enumerate(poly.tolist()):
        c = cum[start[i] : start[i + 1]].tolist()
        assert right[n] == bisect_right(c, x[n])
        assert left[n] == bisect_left(c, x[n])


def test_roots_of_equal_union_find() -> None:
    # reference: UnionFind.find after random unions (the root is each set's lowest element)
    rng = random.Random(6)
    uf = UnionFind()
    for _ in range(3000):
        uf.add()
    for _ in range(2500):
        uf.union(rng.randrange(3000), rng.randrange(3000))
    parent = list(uf.parent)
    roots = roots_of(parent)
    assert roots.tolist() == [uf.find(a) for a in range(3000)]
    assert all(r <= a for a, r in enumerate(roots.tolist()))


def test_plain_vertices_only_where_cleaning_keeps_all() -> None:
    # reference: clean_vertices (math.dist against the last kept vertex) on each piece
    rng = random.Random(7)
    pieces: list[list[tuple[float, ...]]] = []
    for _ in range(500):
        pts: list[tuple[float, ...]] = []
        for _ in range(rng.choice([0, 1, 2, 3, 5])):
            if pts and rng.random() < 0.4:  # a step near the coincidence distance
                x, y, z = pts[-1][0], pts[-1][1], 0.0
                d = rng.choice([0.0, COINCIDENT_M, COINCIDENT_M * (1 + 1e-12), 0.6 * COINCIDENT_M, 2 * COINCIDENT_M])
                pts.append((x + 0.6 * d, y + 0.8 * d, z))
            else:
                pts.append((1e5 + rng.uniform(0, 5), rng.uniform(0, 5), 0.0))
            if rng.random() < 0.05:
                pts[-1] = pts[-1][:2]  # a 2D vertex: left to the cleaning
        pieces.append(pts)
    plain = plain_vertices(pieces, COINCIDENT_M)
    assert plain is not None
    kinds = set()
    for p, kept in zip(pieces, plain, strict=True):
        if kept is not None:
            assert list(kept) == clean_vertices(p)
        kinds.add(kept is None)
    assert kinds == {True, False}  # both cases met
    assert plain_vertices([[(1.0, "a", 0.0)]], COINCIDENT_M) is None  # not numbers: all left to the cleaning


def test_query_boxes_many_equal_one_query_per_tree(monkeypatch) -> None:
    # reference: shapely's own STRtree.query of all the boxes at once, per tree; chunks of
    # 7 points here so that several chunks share their boxes
    import shapely
    from cablewright.extract import network_geometry as ng

    monkeypatch.setattr(ng, "QUERY_CHUNK", 7)
    rng = np.random.default_rng(8)
    xy = rng.uniform(0, 10, (50, 2))
    points = shapely.STRtree(shapely.points(rng.uniform(0, 10, (80, 2))))
    lines = shapely.STRtree(shapely.linestrings(rng.uniform(0, 10, (30, 2, 2))))
    got = ng.query_boxes_many([points, lines], xy, 0.7)
    for tree, (qi, qj) in zip([points, lines], got, strict=True):
        want = tree.query(ng.plan_boxes(xy, 0.7))
        assert np.array_equal(qi, want[0]) and np.array_equal(qj, want[1])


def test_query_boxes_many_raises_as_searches_in_turn(monkeypatch) -> None:
    # a later tree over its cap raises (after the first finished) with the count where it
    # went over; the first tree over its cap raises at once with its own (issue 16 cap);
    # reference: the cap's arithmetic, 64 x 0 per point + 10,000, over at 3 pairs per point
    import pytest
    import shapely
    from cablewright.extract import network_geometry as ng

    monkeypatch.setattr(ng, "QUERY_CHUNK", 5)
    monkeypatch.setattr(ng, "MAX_CANDIDATES_PER_POINT", 0)
    xy = np.zeros((20_000, 2))  # 20,000 points at one place: cap 10,000 pairs
    few = shapely.STRtree(shapely.points(np.array([[50.0, 50.0]])))  # never met
    many = shapely.STRtree(shapely.points(np.zeros((3, 2))))  # 3 pairs per point
    with pytest.raises(ng.Crowded) as one:
        ng.query_boxes_many([few, many], xy, 1.0, bounded=True)
    assert (one.value.pairs, one.value.points) == (10_005, 20_000)  # 3 per point: over at 3,335 points
    with pytest.raises(ng.Crowded) as two:
        ng.query_boxes_many([many, many], xy, 1.0, bounded=True)
    assert two.value.pairs == 10_005
