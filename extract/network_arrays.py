"""Array helpers of the route-network build (:mod:`.network`): whole-drawing numpy steps.

Each function gives exactly the numbers the per-piece Python code gave before (issue 13
item 6): a length is the same ``np.linalg.norm`` of the same differences, a sum or a
cumulative sum runs over one row at a time (numpy reduces each row of a C-ordered 2D
array as it reduces that row alone), and pieces are grouped by their number of points
so that every row has one length.  ``benchmarks/compare_network.py`` holds the network
equal to the code before.
"""

from __future__ import annotations

from collections.abc import Sequence
from itertools import chain
from typing import Literal

import numpy as np

__all__ = [
    "flat_vertices",
    "per_count",
    "cumulative_lengths",
    "piece_lengths",
    "plain_vertices",
    "count_at_most",
    "roots_of",
]


def flat_vertices(points: Sequence[Sequence[Sequence[float]]]) -> tuple[np.ndarray, np.ndarray]:
    """All vertices of all pieces as one (n, 3) array, and each piece's first row.

    Parameters
    ----------
    points : sequence of sequences of (x, y, z)
        The pieces' vertices (three floats each, as ``_clean`` makes them), [m].

    Returns
    -------
    verts : ndarray (n, 3)
    start : ndarray (pieces + 1,)
        Piece i is ``verts[start[i]:start[i + 1]]``.
    """
    counts = np.fromiter((len(p) for p in points), dtype=np.intp, count=len(points))
    start = np.concatenate(([0], np.cumsum(counts)))
    flat = np.fromiter(chain.from_iterable(chain.from_iterable(points)), dtype=float, count=3 * int(start[-1]))
    return flat.reshape(-1, 3), start


def per_count(counts: np.ndarray) -> list[tuple[int, np.ndarray]]:
    """(count, indices of the items with that count) for every count present, ascending."""
    order = np.argsort(counts, kind="stable")
    values, first = np.unique(counts[order], return_index=True)
    bounds = np.append(first, len(order))
    return [(int(k), order[bounds[n] : bounds[n + 1]]) for n, k in enumerate(values)]


def cumulative_lengths(verts: np.ndarray, start: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Sub-segment lengths and the distance along each piece at each vertex, [m].

    Returns
    -------
    seglen : ndarray (n - pieces,)
        Piece i's sub-segment k is ``seglen[start[i] - i + k]``.
    cum : ndarray (n,)
        Distance along piece i at its vertex k, ``cum[start[i] + k]`` (0 at its first).
    """
    step = np.linalg.norm(verts[1:] - verts[:-1], axis=1)
    inner = np.ones(len(step), dtype=bool)
    inner[start[1:-1] - 1] = False  # the step from one piece's last vertex to the next's first
    seglen = step[inner]
    cum = np.zeros(len(verts))
    counts = np.diff(start)
    for k, idx in per_count(counts):
        if k < 2:
            continue
        rows = (start[idx] - idx)[:, None] + np.arange(k - 1)
        cum[(start[idx] + 1)[:, None] + np.arange(k - 1)] = np.cumsum(seglen[rows], axis=1)
    return seglen, cum


def piece_lengths(points: list[list[tuple[float, float, float]]]) -> np.ndarray:
    """3D length of every polyline (a list of points), [m]: norm of the steps, summed."""
    out = np.zeros(len(points))
    counts = np.fromiter((len(p) for p in points), dtype=np.intp, count=len(points))
    for k, idx in per_count(counts):
        if k < 2:
            continue
        pts = np.array([points[n] for n in idx.tolist()], dtype=float).reshape(len(idx), k, 3)
        out[idx] = np.linalg.norm(np.diff(pts, axis=1), axis=2).sum(axis=1)
    return out


#: Pieces with more vertices than this are searched one by one (``np.searchsorted``) rather
#: than compared against a (queries x vertices) table, which would grow with their product.
_TABLE_VERTICES = 64


def count_at_most(cum: np.ndarray, start: np.ndarray, poly: np.ndarray, x: np.ndarray, strict: bool) -> np.ndarray:
    """For each query, the number of vertices of piece ``poly`` with ``cum <= x`` (``< x`` if strict).

    The same as :func:`bisect.bisect_right` (``bisect_left`` if strict) on that piece's
    increasing ``cum``; pieces are taken by their vertex count, one comparison table each.
    """
    out = np.zeros(len(x), dtype=np.intp)
    counts = np.diff(start)[poly]
    side: Literal["left", "right"] = "left" if strict else "right"
    for k, idx in per_count(counts):
        if k > _TABLE_VERTICES:  # a long polyline: a search in its own cum, per piece
            for i in np.unique(poly[idx]).tolist():
                q = idx[poly[idx] == i]
                out[q] = np.searchsorted(cum[start[i] : start[i + 1]], x[q], side=side)
            continue
        table = cum[start[poly[idx]][:, None] + np.arange(k)]
        hit = table < x[idx, None] if strict else table <= x[idx, None]
        out[idx] = hit.sum(axis=1)
    return out


def roots_of(parent: list[int]) -> np.ndarray:
    """The root of every element of a union-find whose parents are never above the child.

    ``_UnionFind.union`` hangs the higher root below the lower, so following parents
    only goes down; pointer jumping (``p = p[p]``) reaches every root in O(log n) rounds.
    """
    p = np.asarray(parent, dtype=np.intp)
    while True:
        q = p[p]
        if np.array_equal(q, p):
            return p
        p = q


def plain_vertices(
    points: Sequence[Sequence[Sequence[float]]], coincident_m: float
) -> list[tuple[tuple[float, float, float], ...] | None] | None:
    """Per piece, its vertices as float triples if it needs no cleaning, else None.

    A piece needs none when every vertex has three coordinates and every step is clearly
    longer than ``coincident_m`` (by more than a relative 1e-9, far above the last-bit
    difference between ``np.linalg.norm`` and ``math.dist``): the per-vertex cleaning
    then keeps every vertex.  The others are left to it.  None for all when a coordinate
    is not a plain number (the per-vertex cleaning raises as before).
    """
    try:
        n_pts = np.fromiter(map(len, points), dtype=np.intp, count=len(points))
        dims = np.fromiter(map(len, chain.from_iterable(points)), dtype=np.intp, count=int(n_pts.sum()))
        odd = np.zeros(len(points) + 1, dtype=np.intp)  # vertices without three coordinates, per piece
        np.add.at(odd, np.repeat(np.arange(len(points)), n_pts), dims != 3)
        sel = np.flatnonzero(odd[:-1] == 0).tolist()
        flat, start = flat_vertices([points[n] for n in sel])
    except (TypeError, ValueError):
        return None
    clear = np.linalg.norm(flat[1:] - flat[:-1], axis=1) > coincident_m * (1 + 1e-9)
    joint = start[1:-1]
    clear[joint[(joint > 0) & (joint < len(flat))] - 1] = True  # one piece's last vertex to the next's first
    ok = np.ones(len(sel), dtype=bool)
    ok[np.searchsorted(start, np.flatnonzero(~clear), side="right") - 1] = False
    rows = list(map(tuple, flat.tolist()))
    out: list[tuple[tuple[float, float, float], ...] | None] = [None] * len(points)
    bounds = start.tolist()
    for k in np.flatnonzero(ok).tolist():
        out[sel[k]] = tuple(rows[bounds[k] : bounds[k + 1]])
    return out
