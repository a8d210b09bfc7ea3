"""Build the route network from plain polylines in metres (no CAD library here).

Connectivity rules (contract.md, "Drawing conventions"):

* route ends closer than the snap tolerance join, the gap counting as route length;
* a route end lying on another route's interior (a tee) splits that route and joins it there;
* vertices shared by two routes (within the tolerance) join them;
* routes that only cross (no shared vertex, no end on the other) do not join, and each
  crossing at the same level is reported; ``join_crossings`` joins them at the crossing;
* all distances are 3D, so a vertical riser joins the levels its ends touch.

Each equipment joins by a straight 3D tail from its insertion point to the nearest
point of any route, up to ``max_tail_m``.  Segments end where the network branches
or ends, where a tail attaches and where the layer changes.

Spatial look-ups use shapely's STRtree on the plan (x, y) projection as a coarse
filter; exact 3D distances are then computed with numpy on the candidates only.
The cleaning, the pieces as arrays and the searches are in :mod:`.network_geometry`,
the whole-drawing array steps (lengths, bisection, union-find roots) in
:mod:`.network_arrays`.
"""

from __future__ import annotations

import logging
import math
from collections import defaultdict
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field
from typing import cast

import networkx as nx
import numpy as np
import shapely
from cablewright.core.errors import ConfigError, Issue, IssueCode
from shapely import STRtree

from .guard import (
    check_equipment,
    check_polylines,
    check_snap_tolerance,
    near_miss_reach_m,
)
from .model import DrawingConfig, Equipment, Point3, RoutePolyline, RouteSegment
from .network_arrays import count_at_most, piece_lengths, roots_of
from .network_geometry import (
    COINCIDENT_M,
    MAX_CANDIDATES_PER_POINT,
    QUERY_CHUNK,
    Crowded,
    Geometry,
    UnionFind,
    build_geometry,
    clean_input,
    plan_boxes,
    project,
    query_boxes,
    query_boxes_many,
)

__all__ = ["Network", "Tail", "build_network", "equipment_node", "COINCIDENT_M"]

logger = logging.getLogger(__name__)



def equipment_node(tag: str) -> str:
    """Graph node of an equipment: ``"EQ:<tag>"``."""
    return "EQ:" + tag


@dataclass(frozen=True)
class Tail:
    """The straight tail joining an equipment to the route network.

    Attributes
    ----------
    tag : str
        Equipment tag.
    node : str
        Route node the tail attaches to.
    length_m : float
        3D length of the tail, [m].
    start_m, end_m : (x, y, z)
        Insertion point and attachment point, [m].
    """

    tag: str
    node: str
    length_m: float
    start_m: Point3
    end_m: Point3


@dataclass
class Network:
    """The route network.

    Attributes
    ----------
    graph : networkx.Graph
        Route nodes ``"N<i>"`` (attribute ``pos_m``) and equipment nodes ``"EQ:<tag>"``.
        Route edges are segments (``kind`` = containment, ``segment_id``), tail edges have
        ``kind="tail"``; all carry ``length_m``, ``containment``, ``method``, ``source_id``.
    segments : dict
        Segment id -> :class:`RouteSegment`, every segment (also parallel or looped ones
        that the graph does not need).
    equipment : dict
        Tag -> :class:`Equipment` (first one where a tag repeats).
    tails : dict
        Tag -> :class:`Tail` for equipment joined to the network.
    tag_failures : dict
        Tag -> message, for equipment that cannot be used (tail too long, duplicate tag).
    issues : list of Issue
        Drawing mistakes found: near-misses, isolated pieces, zero-length pieces.
    source_segments : dict
        Source id of a route piece -> ids of the segments made from it.
    segment_ends : dict
        Segment id -> (node, node) at its first and last point.
    segment_nodes : dict
        Segment id -> graph nodes it runs through: ``(u, v)``, or ``(u, "M<id>", v)`` for a
        segment parallel to a shorter one between the same nodes (split in two halves,
        edge attribute ``half=True``, since a Graph holds one edge per node pair).
        Loops (a segment back to its own node) are not in the graph.
    crossings : list
        Crossings at the same level that were not joined: (graph node of one run, graph
        node of the other, crossing point [m]), for the advice on an unroutable circuit.
    gaps : list
        Near-misses: (graph node of the free end's run, graph node of the other run,
        gap [m], the end [m], source id of the end's piece, source id of the other).
    """

    graph: nx.Graph
    segments: dict[str, RouteSegment] = field(default_factory=dict)
    equipment: dict[str, Equipment] = field(default_factory=dict)
    tails: dict[str, Tail] = field(default_factory=dict)
    tag_failures: dict[str, str] = field(default_factory=dict)
    issues: list[Issue] = field(default_factory=list)
    source_segments: dict[str, tuple[str, ...]] = field(default_factory=dict)
    segment_ends: dict[str, tuple[str, str]] = field(default_factory=dict)
    segment_nodes: dict[str, tuple[str, ...]] = field(default_factory=dict)
    crossings: list[tuple[str, str, Point3]] = field(default_factory=list)
    gaps: list[tuple[str, str, float, Point3, str, str]] = field(default_factory=list)


def _fmt(p: Sequence[float]) -> str:
    return "(" + ", ".join(f"{v:.3f}" for v in p) + ") m"


# --------------------------------------------------------------------------- step 2: cut points


@dataclass
class _Cuts:
    """Cut points on the pieces (ends, tees, shared vertices, tails) and their joins.

    Cut point ``pid`` lies on piece ``poly[pid]`` at ``s[pid]`` metres along it; cut points
    that are one place share a union-find root; ``joins`` are gaps (pid, pid, length [m]).
    Pids ``2i`` and ``2i + 1`` are the two ends of piece i.
    """

    uf: UnionFind = field(default_factory=UnionFind)
    poly: list[int] = field(default_factory=list)
    s: list[float] = field(default_factory=list)
    xyz: list[Point3] = field(default_factory=list)
    joins: list[tuple[int, int, float]] = field(default_factory=list)

    def new(self, i: int, s: float, xyz: Sequence[float] | np.ndarray) -> int:
        pid = self.uf.add()
        self.poly.append(i)
        self.s.append(s)
        self.xyz.append((float(xyz[0]), float(xyz[1]), float(xyz[2])))
        return pid

    def add_many(self, poly: list[int], s: list[float], xyz: list[Point3]) -> None:
        """New cut points in bulk, as :meth:`new` one after the other would add them."""
        n = len(self.poly)
        self.uf.parent.extend(range(n, n + len(poly)))
        self.poly.extend(poly)
        self.s.extend(s)
        self.xyz.extend(xyz)

    def join_many(self, a: np.ndarray, b: np.ndarray, d: np.ndarray) -> None:
        """:meth:`join` for every pair, in order (the unions in any order: a root is its set's lowest)."""
        same = d <= COINCIDENT_M
        self.uf.union_many(a[same].tolist(), b[same].tolist())
        self.joins.extend(zip(a[~same].tolist(), b[~same].tolist(), d[~same].tolist(), strict=True))

    def join(self, a: int, b: int, d: float) -> None:
        if d <= COINCIDENT_M:
            self.uf.union(a, b)
        else:
            self.joins.append((a, b, d))


def _cut_points(geo: Geometry, tol: float, crossings: list | None = None) -> tuple[_Cuts, np.ndarray]:
    """Ends of every piece, joined end to end, as tees, at shared vertices (and crossings)."""
    cuts = _Cuts()
    ends = np.empty((2 * len(geo.polys), 3))
    ends[0::2] = geo.flat[geo.start[:-1]]  # pid 2i
    ends[1::2] = geo.flat[geo.start[1:] - 1]  # pid 2i+1
    cuts.add_many(np.repeat(np.arange(len(geo.polys)), 2).tolist(),
                  np.column_stack([np.zeros(len(geo.polys)), geo.total]).ravel().tolist(),
                  [q for p in geo.polys for q in (p.points_m[0], p.points_m[-1])])  # the rows of ends
    if geo.polys:
        assert geo.seg_tree is not None  # the drawing has routes here (the tree is None only without)
        end_tree = STRtree(shapely.points(ends[:, :2]))  # type: ignore[arg-type]  # types-shapely: an array in, an array out
        end_pairs, tee_pairs = query_boxes_many([end_tree, geo.seg_tree], ends[:, :2], tol, bounded=True)
        _join_ends(cuts, ends, tol, end_pairs)
        _join_tees(cuts, geo, ends, tol, tee_pairs)
        _join_shared_vertices(cuts, geo, tol)
        if crossings:
            _join_crossings(cuts, geo, crossings)
    return cuts, ends


def _join_ends(cuts: _Cuts, ends: np.ndarray, tol: float, pairs: tuple[np.ndarray, np.ndarray]) -> None:
    """End - end within the tolerance (3D); ``pairs`` from the box search of the ends' tree."""
    qi, qj = pairs
    keep = qi < qj
    qi, qj = qi[keep], qj[keep]
    d = np.linalg.norm(ends[qi] - ends[qj], axis=1)
    cuts.join_many(qi[d <= tol], qj[d <= tol], d[d <= tol])


def _join_tees(
    cuts: _Cuts, geo: Geometry, ends: np.ndarray, tol: float, pairs: tuple[np.ndarray, np.ndarray]
) -> None:
    """An end on another route's interior: a new cut point there, joined to the end.

    ``pairs`` come from the box search of the sub-segments' tree around the ends.
    """
    qe, qs = pairs
    own = qe // 2
    keep = geo.s_owner[qs] != own
    qe, qs = qe[keep], qs[keep]
    t, d = project(ends[qe], geo.sa[qs], geo.sb[qs])
    # an end of the target within tolerance is an end-end join, already made
    tj = geo.s_owner[qs]
    near_end = np.minimum(
        np.linalg.norm(ends[qe] - ends[2 * tj], axis=1),
        np.linalg.norm(ends[qe] - ends[2 * tj + 1], axis=1),
    )
    keep = (d <= tol) & (near_end > tol)
    best: dict[tuple[int, int], tuple[float, int, float]] = {}
    for e, s, tt, dd in zip(qe[keep], qs[keep], t[keep], d[keep], strict=False):
        key = (int(e), int(geo.s_owner[s]))
        if key not in best or dd < best[key][0]:
            best[key] = (float(dd), int(s), float(tt))
    for (e, _j), (dd, s, tt) in sorted(best.items()):
        j, pos, xyz = geo.point_at(s, tt)
        cuts.join(e, cuts.new(j, pos, xyz), dd)


def _join_shared_vertices(cuts: _Cuts, geo: Geometry, tol: float) -> None:
    """Interior vertices of two different routes within the tolerance."""
    inner = np.ones(len(geo.flat), dtype=bool)
    inner[geo.start[:-1]] = inner[geo.start[1:] - 1] = False
    vid = np.flatnonzero(inner)  # flat index of every interior vertex
    if not len(vid):
        return
    iv = geo.flat[vid]
    iown = np.repeat(np.arange(len(geo.polys)), np.diff(geo.start))[vid]
    itree = STRtree(shapely.points(iv[:, :2]))  # type: ignore[arg-type]  # types-shapely: an array in, an array out
    qi, qj = query_boxes(itree, iv[:, :2], tol, bounded=True)
    keep = (qi < qj) & (iown[qi] != iown[qj])
    qi, qj = qi[keep], qj[keep]
    d = np.linalg.norm(iv[qi] - iv[qj], axis=1)
    for a, b, dd in zip(qi[d <= tol], qj[d <= tol], d[d <= tol], strict=False):
        v1, v2 = int(vid[a]), int(vid[b])
        p1 = cuts.new(int(iown[a]), float(geo.cum[v1]), geo.flat[v1])
        p2 = cuts.new(int(iown[b]), float(geo.cum[v2]), geo.flat[v2])
        cuts.join(p1, p2, float(dd))


def _crossings(geo: Geometry, tol: float) -> list[tuple[int, int, np.ndarray, float, float, float]]:
    """Sub-segments of different pieces crossing in plan at the same level, away from their ends.

    Candidates from one STRtree query of the sub-segments against themselves (predicate
    ``intersects``), chunked; the crossing point by the usual two-line parameters (t, u).
    A meeting within the tolerance of an end or vertex of either sub-segment is a tee or a
    shared vertex, joined elsewhere, and is left out.

    Returns
    -------
    list of (s_a, s_b, xyz, t_a, t_b, dz)
        Sub-segment pair, crossing point on ``s_a`` [m], parameters along each, height difference [m].
    """
    if geo.seg_tree is None or not len(geo.sa):
        return []
    lines = geo.seg_tree.geometries
    out_a, out_b = [], []
    for lo in range(0, len(lines), QUERY_CHUNK):
        qa, qb = geo.seg_tree.query(lines[lo : lo + QUERY_CHUNK], predicate="intersects")
        qa = qa + lo
        keep = (qa < qb) & (geo.s_owner[qa] != geo.s_owner[qb])
        out_a.append(qa[keep])
        out_b.append(qb[keep])
    qa, qb = np.concatenate(out_a), np.concatenate(out_b)
    if not len(qa):
        return []
    p, r = geo.sa[qa], geo.sb[qa] - geo.sa[qa]
    q, sv = geo.sa[qb], geo.sb[qb] - geo.sa[qb]
    den = r[:, 0] * sv[:, 1] - r[:, 1] * sv[:, 0]
    qp = q - p
    with np.errstate(invalid="ignore", divide="ignore"):
        t = (qp[:, 0] * sv[:, 1] - qp[:, 1] * sv[:, 0]) / den
        u = (qp[:, 0] * r[:, 1] - qp[:, 1] * r[:, 0]) / den
    la = np.linalg.norm(r[:, :2], axis=1)
    lb = np.linalg.norm(sv[:, :2], axis=1)
    ok = (np.abs(den) > 1e-12) & np.isfinite(t) & np.isfinite(u)
    ok &= (t * la > tol) & ((1 - t) * la > tol) & (u * lb > tol) & ((1 - u) * lb > tol)
    za = p[:, 2] + t * r[:, 2]
    zb = q[:, 2] + u * sv[:, 2]
    ok &= np.abs(za - zb) <= tol
    out = []
    for k in np.flatnonzero(ok):
        xyz = p[k] + t[k] * r[k]
        out.append((int(qa[k]), int(qb[k]), xyz, float(t[k]), float(u[k]), float(abs(za[k] - zb[k]))))
    return out


def _join_crossings(cuts: _Cuts, geo: Geometry, found: list) -> None:
    """A cut point on each run at the crossing, joined (the height difference as a gap)."""
    for sa_, sb_, _xyz, ta, tb, dz in found:
        ja, pos_a, xyz_a = geo.point_at(sa_, ta)
        jb, pos_b, xyz_b = geo.point_at(sb_, tb)
        cuts.join(cuts.new(ja, pos_a, xyz_a), cuts.new(jb, pos_b, xyz_b), dz)


#: Crossings listed one per line up to this count; beyond it one summary line.
MAX_CROSSINGS_LISTED = 20


def _crossing_issues(geo: Geometry, found: list) -> list[Issue]:
    """One warning per crossing without a joint, or a count and the first few for many."""
    def name(s: int) -> str:
        pl = geo.polys[int(geo.s_owner[s])]
        return f"{pl.source_id} ({pl.layer})"

    def at(xyz: np.ndarray) -> str:
        return f"({xyz[0]:.3f}, {xyz[1]:.3f}) m"

    advice = "draw a joint there if they meet, or set [routes] join_crossings = true"
    if len(found) <= MAX_CROSSINGS_LISTED:
        return [
            Issue(
                IssueCode.CROSSING,
                f"routes {name(a)} and {name(b)} cross at {at(xyz)} at the same level without a "
                f"joint: not joined; {advice}",
                geo.polys[int(geo.s_owner[a])].source_id,
            )
            for a, b, xyz, _, _, _ in found
        ]
    first = "; ".join(f"{name(a)} x {name(b)} at {at(xyz)}" for a, b, xyz, _, _, _ in found[:5])
    return [
        Issue(
            IssueCode.CROSSING,
            f"{len(found)} crossings of routes at the same level without a joint, not joined; first: "
            f"{first}; {advice}",
            geo.polys[int(geo.s_owner[found[0][0]])].source_id,
        )
    ]


# --------------------------------------------------------------------------- step 3: tails


def _equipment_by_tag(
    equipment: Iterable[Equipment], issues: list[Issue]
) -> tuple[dict[str, Equipment], dict[str, str]]:
    """Tag -> first equipment, and a failure for every tag on more than one equipment."""
    by_tag: dict[str, list[Equipment]] = defaultdict(list)
    for eq in equipment:
        by_tag[eq.tag].append(eq)
    eq_map: dict[str, Equipment] = {}
    tag_failures: dict[str, str] = {}
    for tag, items in by_tag.items():
        eq_map[tag] = items[0]
        if len(items) > 1:
            handles = ", ".join(f"{e.source_id} (block {e.block_name})" for e in items)
            msg = f"tag {tag} is on {len(items)} equipment: {handles}; give each block its own tag"
            tag_failures[tag] = msg
            issues.append(Issue(IssueCode.DUPLICATE_TAG, msg, items[1].source_id))
    return eq_map, tag_failures


def _nearest_3d(geo: Geometry, p: np.ndarray, r: float) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Sub-segments meeting the plan box of half-side r around p, with t and 3D distance."""
    assert geo.seg_tree is not None  # the drawing has routes here (the tree is None only without)
    c = np.sort(geo.seg_tree.query(plan_boxes(p[None, :2], r + 1e-9)[0]))
    t, d = project(np.repeat(p[None, :], len(c), 0), geo.sa[c], geo.sb[c])
    return c, t, d


def _tails(
    geo: Geometry,
    cuts: _Cuts,
    eq_map: dict[str, Equipment],
    tag_failures: dict[str, str],
    max_tail_m: float,
) -> dict[str, tuple[int, float, Point3, Point3]]:
    """Tag -> (cut point, tail length [m], start, end): each usable equipment to its nearest route."""
    tail_pid: dict[str, tuple[int, float, Point3, Point3]] = {}
    usable = [t for t in eq_map if t not in tag_failures]
    if usable and not geo.polys:
        for tag in usable:
            tag_failures[tag] = f"equipment {tag}: the drawing has no routes"
        return tail_pid
    if not usable:
        return tail_pid
    pos = np.asarray([eq_map[t].position_m for t in usable], dtype=float)
    best, t, dist = _nearest_routes(geo, pos, max_tail_m)
    for n, tag in enumerate(usable):
        eq = eq_map[tag]
        if not dist[n] <= max_tail_m:
            tag_failures[tag] = _too_far(geo, eq, pos[n], max_tail_m)
            continue
        j, s_along, xyz = geo.point_at(int(best[n]), float(t[n]))
        pid = cuts.new(j, s_along, xyz)
        tail_pid[tag] = (pid, float(dist[n]), eq.position_m, cuts.xyz[pid])
    return tail_pid


def _nearest_routes(geo: Geometry, pos: np.ndarray, max_tail_m: float) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Nearest sub-segment in 3D of every point, its parameter and distance (inf beyond ``max_tail_m``).

    The nearest in plan (STRtree ``query_nearest``) gives a first 3D distance r; every route
    nearer in 3D is nearer in plan, so the plan boxes of half-side r (+ 1 nm) hold the
    nearest; of equal distances the lowest sub-segment wins.
    """
    assert geo.seg_tree is not None  # the drawing has routes here (the tree is None only without)
    n = len(pos)
    best, t_best, dist = np.zeros(n, dtype=np.intp), np.zeros(n), np.full(n, math.inf)
    qe, qs = geo.seg_tree.query_nearest(shapely.points(pos[:, :2]), max_distance=max_tail_m, all_matches=True)
    if not len(qe):
        return best, t_best, dist
    _, d = project(pos[qe], geo.sa[qs], geo.sb[qs])
    r = np.full(n, math.inf)
    np.minimum.at(r, qe, d)
    has = np.flatnonzero(np.isfinite(r))
    be, bs = query_boxes(geo.seg_tree, pos[has, :2], r[has] + 1e-9)
    be = has[be]
    t, d = project(pos[be], geo.sa[bs], geo.sb[bs])
    order = np.lexsort((bs, d, be))  # by point, then distance, then sub-segment
    first = order[np.flatnonzero(np.r_[True, be[order][1:] != be[order][:-1]])]
    best[be[first]], t_best[be[first]], dist[be[first]] = bs[first], t[first], d[first]
    return best, t_best, dist


def _too_far(geo: Geometry, eq: Equipment, p: np.ndarray, max_tail_m: float) -> str:
    """The message for an equipment farther than the maximum tail from every route."""
    assert geo.seg_tree is not None  # the drawing has routes here (the tree is None only without)
    far = int(geo.seg_tree.query_nearest(shapely.points(p[:2]))[0])
    _, d_far = project(p[None, :], geo.sa[far : far + 1], geo.sb[far : far + 1])
    _, _, d = _nearest_3d(geo, p, float(d_far[0]))
    return (
        f"equipment {eq.tag} ({eq.source_id}, block {eq.block_name}) at "
        f"{_fmt(eq.position_m)}: the nearest route is {float(d.min()):.2f} m away, more than the "
        f"{max_tail_m:g} m maximum tail; draw a route to it or raise max_tail_m"
    )


# --------------------------------------------------------------------------- step 4: pieces

#: A piece between two nodes: (u, v, points, length [m], piece index).
_Piece = tuple[str, str, list[Point3], float, int]


@dataclass
class _Pieces:
    """The pieces between nodes (``gap_start`` on: snap gaps) and the node of each cut point."""

    pieces: list[_Piece]
    gap_start: int
    node_of_root: dict[int, str]
    node_pos: dict[str, Point3]
    uf: UnionFind
    pid_node: list[str] = field(default_factory=list)

    def node(self, pid: int) -> str:
        return self.pid_node[pid]


def _pieces(geo: Geometry, cuts: _Cuts) -> _Pieces:
    """Cut every route piece at its cut points; name the nodes; add the snap gaps."""
    pa, pb = _cut_pairs(cuts)
    poly = np.asarray(cuts.poly, dtype=np.intp)[pa]
    s = np.asarray(cuts.s, dtype=float)
    # vertices strictly between the two cuts (cum is increasing): bisect_right / bisect_left
    lo = count_at_most(geo.cum, geo.start, poly, s[pa] + COINCIDENT_M, strict=False)
    hi = count_at_most(geo.cum, geo.start, poly, s[pb] - COINCIDENT_M, strict=True)
    xyz = cuts.xyz
    pts_of: list[list[Point3]] = [[xyz[a], xyz[b]] for a, b in zip(pa.tolist(), pb.tolist(), strict=True)]
    for n in np.flatnonzero(hi > lo).tolist():
        first = int(geo.start[poly[n]])
        inner = map(tuple, geo.flat[first + lo[n] : first + hi[n]].tolist())
        pts_of[n] = [pts_of[n][0], *inner, pts_of[n][1]]
    # node names, deterministic: by smallest cut-point id of each cluster (its root)
    roots = roots_of(cuts.uf.parent)
    cuts.uf.parent[:] = roots.tolist()
    names_root = np.unique(roots)
    names = [f"N{k}" for k in range(len(names_root))]
    node_of_root = dict(zip(names_root.tolist(), names, strict=True))
    node_pos = {nm: xyz[r] for nm, r in zip(names, names_root.tolist(), strict=True)}
    pid_node = [names[k] for k in np.searchsorted(names_root, roots).tolist()]
    out = _Pieces([], 0, node_of_root, node_pos, cuts.uf, pid_node)
    lengths = piece_lengths(pts_of)
    for n in np.flatnonzero(lengths > COINCIDENT_M).tolist():
        out.pieces.append((pid_node[pa[n]], pid_node[pb[n]], pts_of[n], float(lengths[n]), int(poly[n])))
    out.gap_start = len(out.pieces)
    for a, b, d in cuts.joins:
        u, v = pid_node[a], pid_node[b]
        if u != v:  # the gap takes the layer of the lower-numbered piece it joins
            out.pieces.append((u, v, [xyz[a], xyz[b]], d, min(cuts.poly[a], cuts.poly[b])))
    return out


def _cut_pairs(cuts: _Cuts) -> tuple[np.ndarray, np.ndarray]:
    """(first cut, next cut) of every piece between cut points, by piece and along it.

    The cut points of each piece in order along it (then by id); a cut point within
    :data:`COINCIDENT_M` of its group's first joins that group (and is united with it).
    """
    poly = np.asarray(cuts.poly, dtype=np.intp)
    s = np.asarray(cuts.s, dtype=float)
    order = np.lexsort((np.arange(len(poly)), s, poly))
    po, so = poly[order], s[order]
    near = np.zeros(len(order), dtype=bool)
    near[1:] = (po[1:] == po[:-1]) & (so[1:] - so[:-1] <= COINCIDENT_M)
    start = ~near
    group_first = order.copy()
    for n in np.flatnonzero(near).tolist():  # a group's members are near its first, not only the last
        f = int(group_first[n - 1])
        if s[order[n]] - s[f] <= COINCIDENT_M:
            group_first[n] = f
            cuts.uf.union(f, int(order[n]))
        else:
            start[n] = True
    firsts = np.flatnonzero(start)
    same = po[firsts[1:]] == po[firsts[:-1]]
    return order[firsts[:-1][same]], order[firsts[1:][same]]


# --------------------------------------------------------------------------- step 5: chains


def _node_key(nd: str) -> int:
    return int(nd[1:])


@dataclass
class _Chains:
    """Segments: chains of pieces between boundary nodes, with their end nodes."""

    polys: list[RoutePolyline]
    pieces: _Pieces
    tail_nodes: set[str]
    adj: dict[str, list[int]] = field(default_factory=lambda: defaultdict(list))
    segments: dict[str, RouteSegment] = field(default_factory=dict)
    segment_ends: dict[str, tuple[str, str]] = field(default_factory=dict)
    source_segments: dict[str, list[str]] = field(default_factory=lambda: defaultdict(list))
    visited: list[bool] = field(default_factory=list)
    kinds: list[tuple[str, str, str]] = field(default_factory=list)
    boundary: dict[str, bool] = field(default_factory=dict)

    def kind(self, n: int) -> tuple[str, str, str]:
        return self.kinds[n]

    def is_boundary(self, nd: str) -> bool:
        b = self.boundary.get(nd)
        if b is None:
            a = self.adj[nd]
            b = len(a) != 2 or nd in self.tail_nodes or a[0] == a[1] or self.kinds[a[0]] != self.kinds[a[1]]
            self.boundary[nd] = b
        return b

    def walk(self, start: str, first_piece: int) -> None:
        """Follow pieces from ``start`` until a boundary node; record one segment."""
        pieces = self.pieces.pieces
        cur, n = start, first_piece
        pts: list[Point3] = []
        length = 0.0
        sources: dict[str, None] = {}  # an ordered set: membership in O(1)
        while True:
            self.visited[n] = True
            u, v, ppts, plen, i = pieces[n]
            seq, nxt = (ppts, v) if u == cur else (ppts[::-1], u)
            pts.extend(seq if not pts else seq[1:])
            length += plen
            if n < self.pieces.gap_start:
                sources.setdefault(self.polys[i].source_id, None)
            cur = nxt
            if self.is_boundary(cur):
                break
            a = self.adj[cur]
            n2 = a[0] if a[1] == n else a[1]
            if self.visited[n2]:
                break
            n = n2
        sid = f"S{len(self.segments) + 1}"
        layer, containment, method = self.kind(first_piece)
        self.segments[sid] = RouteSegment(sid, tuple(sources), layer, containment, method, length, tuple(pts))
        self.segment_ends[sid] = (start, cur)
        for s in sources:
            self.source_segments[s].append(sid)


def _chains(polys: list[RoutePolyline], pieces: _Pieces, tail_nodes: set[str]) -> tuple[_Chains, list[str]]:
    """Walk the pieces into segments: from boundary nodes first, then closed loops."""
    ch = _Chains(polys, pieces, tail_nodes)
    for n, (u, v, _, _, _) in enumerate(pieces.pieces):
        ch.adj[u].append(n)
        ch.adj[v].append(n)
    ch.visited = [False] * len(pieces.pieces)
    kind_of_poly = [(p.layer, p.containment, p.method) for p in polys]
    ch.kinds = [kind_of_poly[pc[4]] for pc in pieces.pieces]
    nodes_sorted = sorted(ch.adj, key=_node_key)
    for nd in nodes_sorted:
        if ch.is_boundary(nd):
            for n in ch.adj[nd]:
                if not ch.visited[n]:
                    ch.walk(nd, n)
    for nd in nodes_sorted:  # closed loops with no boundary node
        for n in ch.adj[nd]:
            if not ch.visited[n]:
                ch.walk(nd, n)
    return ch, nodes_sorted


# --------------------------------------------------------------------------- step 6: graph


def _graph(
    ch: _Chains,
    tail_pid: dict[str, tuple[int, float, Point3, Point3]],
    eq_map: dict[str, Equipment],
) -> tuple[nx.Graph, dict[str, tuple[str, ...]], dict[str, Tail]]:
    """The routing graph: segment end nodes, one edge per segment (parallel ones halved), tails."""
    g: nx.Graph = nx.Graph()
    ends_sorted = sorted({nd for ends_ in ch.segment_ends.values() for nd in ends_}, key=_node_key)
    g.add_nodes_from((nd, {"pos_m": ch.pieces.node_pos[nd]}) for nd in ends_sorted)
    segment_nodes: dict[str, tuple[str, ...]] = {}
    for sid, seg in ch.segments.items():
        u, v = ch.segment_ends[sid]
        if u == v:
            continue  # a loop back to its own node: never on a shortest path
        attrs = dict(
            kind=seg.containment,
            containment=seg.containment,
            method=seg.method,
            segment_id=sid,
            source_id=seg.source_ids[0] if seg.source_ids else "",
        )
        if not g.has_edge(u, v):
            g.add_edge(u, v, length_m=seg.length_m, half=False, **attrs)
            segment_nodes[sid] = (u, v)
        else:  # a parallel segment: keep it, through a middle node (a Graph has no multi-edges)
            mid = "M" + sid
            g.add_node(mid, pos_m=seg.points_m[len(seg.points_m) // 2])
            g.add_edge(u, mid, length_m=seg.length_m / 2, half=True, **attrs)
            g.add_edge(mid, v, length_m=seg.length_m / 2, half=True, **attrs)
            segment_nodes[sid] = (u, mid, v)
    tails: dict[str, Tail] = {}
    for tag, (pid, dist, start, end) in tail_pid.items():
        eq = eq_map[tag]
        nd = ch.pieces.node(pid)
        g.add_node(equipment_node(tag), pos_m=eq.position_m, tag=tag)
        g.add_edge(
            equipment_node(tag), nd, length_m=dist, kind="tail", half=False, containment="tail",
            method="", segment_id="", source_id=eq.source_id,
        )
        tails[tag] = Tail(tag, nd, dist, start, end)
    return g, segment_nodes, tails


# --------------------------------------------------------------------------- the build


def build_network(
    polylines: Iterable[RoutePolyline | tuple],
    equipment: Iterable[Equipment],
    config: DrawingConfig | None = None,
    source: str = "",
) -> Network:
    """Build the route network and join the equipment to it.

    The steps, each a function of its own: guard the numbers (:mod:`.guard`), clean the
    pieces, find the cut points (ends, tees, shared vertices), attach the equipment tails,
    cut the pieces, walk them into chains (segments), and build the graph.

    Parameters
    ----------
    polylines : iterable of RoutePolyline or (points_m, layer, containment, method, source_id)
        Route pieces in world coordinates, [m].
    equipment : iterable of Equipment
        Equipment with world insertion points, [m].
    config : DrawingConfig, optional
        ``snap_tolerance_m``, ``max_tail_m``, ``near_miss_factor``.
    source : str, optional
        The drawing or model, for messages.

    Returns
    -------
    Network
        Graph, segments, tails, per-tag failures and drawing issues.  A piece or equipment
        with a coordinate that is not finite or not physical is refused (issue
        ``"bad-coordinate"``) and left out.

    Raises
    ------
    ConfigError
        The snap tolerance is not positive, or large against the drawing's extent
        (:func:`~cablewright.extract.guard.check_snap_tolerance`).

    Notes
    -----
    Cost is O(n log n) in the number of route vertices: every proximity search goes
    through an STRtree; there is no pairwise loop.

    References
    ----------
    .. [1] contract.md, "Drawing conventions" and "Lengths and grouping".
    """
    config = config or DrawingConfig()
    issues: list[Issue] = []
    pieces_in = [p if isinstance(p, RoutePolyline) else RoutePolyline(*p) for p in polylines]
    guarded, refused = check_polylines(pieces_in, source)
    equipment, refused_eq = check_equipment(equipment, source)
    issues.extend(refused + refused_eq)
    check_snap_tolerance(config.snap_tolerance_m, guarded, source)
    tol = float(config.snap_tolerance_m)

    polys = clean_input(guarded, issues)
    geo = build_geometry(polys)
    crossings = _crossings(geo, tol)
    try:
        cuts, ends = _cut_points(geo, tol, crossings if config.join_crossings else None)
    except Crowded as exc:
        raise ConfigError(_crowded_message(exc, tol, "snap tolerance", source)) from None
    eq_map, tag_failures = _equipment_by_tag(equipment, issues)
    tail_pid = _tails(geo, cuts, eq_map, tag_failures, config.max_tail_m)
    pieces = _pieces(geo, cuts)
    tail_nodes = {pieces.node(v[0]) for v in tail_pid.values()}
    ch, nodes_sorted = _chains(polys, pieces, tail_nodes)
    g, segment_nodes, tails = _graph(ch, tail_pid, eq_map)

    reach = near_miss_reach_m(tol, config.near_miss_factor, float(np.median(geo.total)) if geo.total else 0.0)
    gaps: list[tuple[int, int, float, np.ndarray]] = []
    try:
        issues.extend(_near_misses(geo, ends, ch, tol, reach, gaps))
    except Crowded as exc:
        raise ConfigError(_crowded_message(exc, reach, "near-miss search", source)) from None
    if config.join_crossings:
        logger.info("network: %d crossings at the same level joined (join_crossings)", len(crossings))
    else:
        issues.extend(_crossing_issues(geo, crossings))
    issues.extend(_isolated(ch, nodes_sorted))
    logger.info(
        "network: %d pieces -> %d segments, %d nodes, %d tails, %d issues",
        len(polys), len(ch.segments), g.number_of_nodes(), len(tails), len(issues),
    )
    return Network(
        graph=g,
        segments=ch.segments,
        equipment=eq_map,
        tails=tails,
        tag_failures=tag_failures,
        issues=issues,
        source_segments={k: tuple(v) for k, v in ch.source_segments.items()},
        segment_ends=ch.segment_ends,
        segment_nodes=segment_nodes,
        crossings=[] if config.join_crossings else [
            (_run_node(ch, geo, int(geo.s_owner[a])), _run_node(ch, geo, int(geo.s_owner[b])), cast(Point3, tuple(map(float, xyz))))
            for a, b, xyz, _, _, _ in crossings
        ],
        gaps=[
            (_run_node(ch, geo, i), _run_node(ch, geo, j), d, cast(Point3, tuple(map(float, xyz))),
             geo.polys[i].source_id, geo.polys[j].source_id)
            for i, j, d, xyz in gaps
        ],
    )


def _run_node(ch: _Chains, geo: Geometry, i: int) -> str:
    """A graph node of the run that piece i belongs to (an end of its first segment), or ""."""
    sids = ch.source_segments.get(geo.polys[i].source_id)
    return ch.segment_ends[sids[0]][0] if sids else ""


# --------------------------------------------------------------------------- drawing issues


def _crowded_message(exc: Crowded, reach_m: float, what: str, source: str) -> str:
    where = f"{source}: " if source else ""
    return (
        f"{where}the {what} of {reach_m:g} m finds {exc.pairs} pairs of nearby routes for "
        f"{exc.points} route points (more than {MAX_CANDIDATES_PER_POINT} each); it would join most "
        "of the drawing - check the drawing units ([drawing] units or --units) or use a smaller "
        "snap_tolerance_m"
    )


def _mm_pair(d_m: float, tol_m: float) -> tuple[str, str]:
    """A distance and the tolerance in mm, with the decimals that tell them apart (up to 3).

    >>> _mm_pair(0.0504, 0.05)
    ('50.4', '50')
    >>> _mm_pair(0.08, 0.05)
    ('80', '50')
    """
    for nd in range(4):
        a, b = f"{d_m * 1000:.{nd}f}", f"{tol_m * 1000:.{nd}f}"
        if a != b or nd == 3:
            return a, f"{tol_m * 1000:g}"
    return a, b  # pragma: no cover


def _isolated(ch: _Chains, nodes_sorted: list[str]) -> list[Issue]:
    """Connected groups of pieces that reach no equipment tail.

    Components are found with a union-find over the nodes (a graph of every piece would
    hold millions of nodes on a big drawing) and listed by their lowest node, as a
    breadth-first search over the nodes in order would list them.
    """
    index = {nd: k for k, nd in enumerate(nodes_sorted)}
    uf = UnionFind()
    for _ in nodes_sorted:
        uf.add()
    for u, v, _, _, _ in ch.pieces.pieces:
        uf.union(index[u], index[v])
    comps: dict[int, list[str]] = {}
    for nd in nodes_sorted:
        comps.setdefault(uf.find(index[nd]), []).append(nd)
    out: list[Issue] = []
    gap_start = ch.pieces.gap_start
    for comp in comps.values():
        if any(nd in ch.tail_nodes for nd in comp):
            continue
        srcs = sorted(
            {ch.polys[ch.pieces.pieces[n][4]].source_id for nd in comp for n in ch.adj[nd] if n < gap_start}
        )
        shown = ", ".join(srcs[:5]) + (f" and {len(srcs) - 5} more" if len(srcs) > 5 else "")
        if len(srcs) > 1:
            text = (
                f"route pieces {shown} join each other ({len(srcs)} pieces) but no equipment, and no "
                "route joins them to the rest of the network; join them to it if they carry cables"
            )
        else:
            text = f"route piece {shown} joins no other route and no equipment; check its joints in the drawing"
        out.append(Issue(IssueCode.ISOLATED, text, srcs[0] if srcs else ""))
    return out


def _near_misses(
    geo: Geometry, ends: np.ndarray, ch: _Chains, tol: float, reach: float, gaps: list | None = None
) -> list[Issue]:
    """Free route ends that come within ``reach`` (near_miss_factor x tolerance) of another route."""
    out: list[Issue] = []
    if not len(ends):
        return out
    node = ch.pieces.node
    free = [e for e in range(len(ends)) if len(ch.adj[node(e)]) == 1 and node(e) not in ch.tail_nodes]
    if not free:
        return out
    fe = np.asarray(free)
    assert geo.seg_tree is not None  # the drawing has routes here (the tree is None only without)
    qe, qs = query_boxes(geo.seg_tree, ends[fe, :2], reach, bounded=True)
    own = fe[qe] // 2
    keep = geo.s_owner[qs] != own
    qe, qs = qe[keep], qs[keep]
    _, d = project(ends[fe[qe]], geo.sa[qs], geo.sb[qs])
    best: dict[int, tuple[float, int]] = {}
    for e, s, dd in zip(qe, qs, d, strict=False):
        if tol < dd <= reach and (e not in best or dd < best[e][0]):
            best[int(e)] = (float(dd), int(geo.s_owner[s]))
    reported: set[frozenset[int]] = set()
    for e in sorted(best):
        dd, j = best[e]
        i = int(fe[e]) // 2
        pair = frozenset((i, j))
        if pair in reported:
            continue
        reported.add(pair)
        p = geo.polys[i]
        if gaps is not None:
            gaps.append((i, j, dd, ends[fe[e]]))
        d_mm, tol_mm = _mm_pair(dd, tol)
        out.append(
            Issue(
                IssueCode.NEAR_MISS,
                f"route end of {p.source_id} ({p.layer}) at {_fmt(ends[fe[e]])} is {d_mm} mm "
                f"from route {geo.polys[j].source_id}, beyond the {tol_mm} mm snap tolerance: "
                "not joined; join them in the drawing if they meet",
                p.source_id,
            )
        )
    return out
