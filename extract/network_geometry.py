"""The route pieces as arrays and the proximity searches of the network build (:mod:`.network`).

Step 1 of the build (clean the pieces) and the arrays every later step reads: all vertices
in one array, the distance along each piece, the sub-segments and their STRtree on the plan
(x, y) projection; the chunked, capped box search of a tree; the point-to-segment
projection in 3D; the union-find that merges cut points into nodes.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass

import numpy as np
import shapely
from cablewright.core.errors import Issue, IssueCode
from shapely import STRtree

from .model import Point3, RoutePolyline
from .network_arrays import cumulative_lengths, flat_vertices, plain_vertices

__all__ = [
    "COINCIDENT_M",
    "MAX_CANDIDATES_PER_POINT",
    "QUERY_CHUNK",
    "Crowded",
    "Geometry",
    "UnionFind",
    "build_geometry",
    "clean_input",
    "plan_boxes",
    "project",
    "query_boxes",
    "query_boxes_many",
]

#: Points closer than this are the same point, [m] (1 micrometre: far below
#: drawing precision, far above float rounding at site coordinates).
COINCIDENT_M = 1e-6


class UnionFind:
    """Disjoint sets of cut points; a union hangs the higher root below the lower, so the
    root of a set is its lowest element (node names follow from it)."""

    def __init__(self) -> None:
        self.parent: list[int] = []

    def add(self) -> int:
        self.parent.append(len(self.parent))
        return len(self.parent) - 1

    def find(self, a: int) -> int:
        p = self.parent
        root = a
        while p[root] != root:
            root = p[root]
        while p[a] != root:
            p[a], a = root, p[a]
        return root

    def union_many(self, a: list[int], b: list[int]) -> None:
        """:meth:`union` of every pair (one call: a big drawing joins millions of ends)."""
        p, find = self.parent, self.find
        for x, y in zip(a, b, strict=True):
            ra, rb = find(x), find(y)
            if ra < rb:
                p[rb] = ra
            elif rb < ra:
                p[ra] = rb

    def union(self, a: int, b: int) -> None:
        ra, rb = self.find(a), self.find(b)
        if ra != rb:
            if ra < rb:
                self.parent[rb] = ra
            else:
                self.parent[ra] = rb


def project(p: np.ndarray, a: np.ndarray, b: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Parameter t in [0, 1] and 3D distance of points p to segments a-b (row-wise)."""
    ab = b - a
    l2 = np.einsum("ij,ij->i", ab, ab)
    with np.errstate(invalid="ignore", divide="ignore"):
        t = np.where(l2 > 0, np.einsum("ij,ij->i", p - a, ab) / np.where(l2 > 0, l2, 1), 0.0)
    t = np.clip(t, 0.0, 1.0)
    q = a + t[:, None] * ab
    return t, np.linalg.norm(p - q, axis=1)


def plan_boxes(xy: np.ndarray, r: float | np.ndarray) -> np.ndarray:
    """Square boxes of half-side r around the plan points xy (shapely polygons)."""
    r = np.broadcast_to(np.asarray(r, dtype=float), (len(xy),))
    return shapely.box(xy[:, 0] - r, xy[:, 1] - r, xy[:, 0] + r, xy[:, 1] + r)


def clean_vertices(points: Iterable[Sequence[float]]) -> list[Point3]:
    """Vertices as (x, y, z) floats (z = 0 for 2D), each within COINCIDENT_M of the last kept dropped."""
    out: list[Point3] = []
    for p in points:
        q = (float(p[0]), float(p[1]), float(p[2]) if len(p) > 2 else 0.0)
        if not out or math.dist(out[-1], q) > COINCIDENT_M:
            out.append(q)
    return out


#: Query geometries built per STRtree call; bounds the temporary boxes of a big drawing
#: (2 million route pieces make 4 million ends) without changing any result.
QUERY_CHUNK = 200_000


#: Most candidate pairs a proximity search may hold per query point (plus a fixed 10,000).
#: An end on an ordinary drawing meets a handful of other pieces within the snap tolerance;
#: hundreds each mean the tolerance covers much of the plan, and the pairs, cut points and
#: segments would grow with the square of the drawing (issue 16: 2.7 million segments and
#: 5.8 GB from 1,063 pieces).  The build stops instead, with memory bounded by this cap.
MAX_CANDIDATES_PER_POINT = 64


class Crowded(Exception):
    """A proximity search found more candidate pairs than :data:`MAX_CANDIDATES_PER_POINT` allows."""

    def __init__(self, pairs: int, points: int) -> None:
        super().__init__(pairs, points)
        self.pairs, self.points = pairs, points


def query_boxes(
    tree: STRtree, xy: np.ndarray, r: float | np.ndarray, bounded: bool = False
) -> tuple[np.ndarray, np.ndarray]:
    """(input index, tree index) pairs of tree items meeting the box of half-side r around xy.

    The same pairs, in the same order, as one ``tree.query(plan_boxes(xy, r))``, built chunk by
    chunk so that only ``QUERY_CHUNK`` boxes exist at a time.  With ``bounded``, raises
    :class:`Crowded` as soon as the pairs exceed ``MAX_CANDIDATES_PER_POINT`` per point.
    """
    return query_boxes_many([tree], xy, r, bounded)[0]


def query_boxes_many(
    trees: Sequence[STRtree], xy: np.ndarray, r: float | np.ndarray, bounded: bool = False
) -> list[tuple[np.ndarray, np.ndarray]]:
    """:func:`query_boxes` of each tree in turn, each chunk's boxes built once for all of them.

    Raises what the searches one after the other would: the first tree whose pairs exceed
    the cap, with the count at the chunk where it did (a later tree stops being searched
    once over its cap, and its :class:`Crowded` is raised if no earlier tree's is).
    """
    r = np.broadcast_to(np.asarray(r, dtype=float), (len(xy),))
    limit = MAX_CANDIDATES_PER_POINT * len(xy) + 10_000
    out: list[tuple[list[np.ndarray], list[np.ndarray]]] = [([], []) for _ in trees]
    found = [0] * len(trees)
    crowded: list[Crowded | None] = [None] * len(trees)
    for lo in range(0, len(xy), QUERY_CHUNK):
        hi = min(lo + QUERY_CHUNK, len(xy))
        boxes = plan_boxes(xy[lo:hi], r[lo:hi])
        for k, tree in enumerate(trees):
            if crowded[k] is not None:
                continue
            qi, qj = tree.query(boxes)
            found[k] += len(qi)
            if bounded and found[k] > limit:
                exc = Crowded(found[k], len(xy))
                if k == 0:  # the first search would have stopped here
                    raise exc
                crowded[k] = exc
                continue
            out[k][0].append(qi + lo)
            out[k][1].append(qj)
    for c in crowded:
        if c is not None:
            raise c
    empty = np.zeros(0, dtype=np.intp)
    return [(np.concatenate(i), np.concatenate(j)) if i else (empty, empty) for i, j in out]


# --------------------------------------------------------------------------- step 1: clean


def clean_input(polylines: Iterable[RoutePolyline | tuple], issues: list[Issue]) -> list[RoutePolyline]:
    """Route pieces with coincident vertices merged; pieces without length reported and dropped."""
    polys: list[RoutePolyline] = []
    pieces = [item if isinstance(item, RoutePolyline) else RoutePolyline(*item) for item in polylines]
    plain = plain_vertices([pl.points_m for pl in pieces], COINCIDENT_M)
    for n, pl in enumerate(pieces):
        kept = plain[n] if plain is not None else None
        pts = clean_vertices(pl.points_m) if kept is None else kept
        if len(pts) < 2:
            issues.append(
                Issue(
                    IssueCode.ZERO_LENGTH,
                    f"route piece {pl.source_id} on layer {pl.layer} has no length; ignored - "
                    "delete it from the drawing",
                    pl.source_id,
                )
            )
            continue
        polys.append(RoutePolyline(tuple(pts), pl.layer, pl.containment, pl.method, pl.source_id))
    return polys


@dataclass
class Geometry:
    """The cleaned pieces as arrays: vertices, sub-segments (a-b) and their STRtree.

    ``flat`` holds every vertex, piece i's at rows ``start[i]:start[i + 1]``, and
    ``cum`` the distance along its piece at each; sub-segment ``s`` (piece ``s_owner[s]``,
    its ``s_k[s]``-th) runs from vertex ``s + s_owner[s]`` to the next, ``seglen[s]`` long.
    """

    polys: list[RoutePolyline]
    flat: np.ndarray
    start: np.ndarray
    cum: np.ndarray
    seglen: np.ndarray
    total: list[float]
    sa: np.ndarray
    sb: np.ndarray
    s_owner: np.ndarray
    s_k: np.ndarray
    seg_tree: STRtree | None

    def point_at(self, s: int, tt: float) -> tuple[int, float, np.ndarray]:
        """(piece, distance along it [m], xyz) of parameter tt on sub-segment s."""
        j = int(self.s_owner[s])
        return j, float(self.cum[s + j] + tt * self.seglen[s]), self.sa[s] + tt * (self.sb[s] - self.sa[s])


def build_geometry(polys: list[RoutePolyline]) -> Geometry:
    """The pieces' vertices, lengths and sub-segments as whole-drawing arrays (one pass)."""
    if not polys:
        e3, e1, ei = np.zeros((0, 3)), np.zeros(0), np.zeros(0, dtype=int)
        return Geometry(polys, e3, np.zeros(1, dtype=np.intp), e1, e1, [], e3, e3, ei, ei, None)
    flat, start = flat_vertices([p.points_m for p in polys])
    seglen, cum = cumulative_lengths(flat, start)
    counts = np.diff(start) - 1
    last = np.zeros(len(flat), dtype=bool)
    last[start[1:] - 1] = True
    first = np.zeros(len(flat), dtype=bool)
    first[start[:-1]] = True
    sa, sb = flat[~last], flat[~first]
    s_owner = np.repeat(np.arange(len(polys)), counts)
    s_k = np.arange(len(sa)) - np.repeat(np.cumsum(counts) - counts, counts)
    seg_tree = STRtree(shapely.linestrings(np.stack([sa[:, :2], sb[:, :2]], axis=1)))  # type: ignore[arg-type]  # types-shapely: an array in, an array out
    return Geometry(polys, flat, start, cum, seglen, cum[start[1:] - 1].tolist(), sa, sb, s_owner, s_k, seg_tree)
