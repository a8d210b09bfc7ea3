"""Build the route network from plain polylines in metres (no CAD library here).

Connectivity rules (contract.md, "Drawing conventions"):

* route ends closer than the snap tolerance join, the gap counting as route length;
* a route end lying on another route's interior (a tee) splits that route and joins it there;
* vertices shared by two routes (within the tolerance) join them;
* routes that only cross (no shared vertex, no end on the other) do not join;
* all distances are 3D, so a vertical riser joins the levels its ends touch.

Each equipment joins by a straight 3D tail from its insertion point to the nearest
point of any route, up to ``max_tail_m``.  Segments end where the network branches
or ends, where a tail attaches and where the layer changes.

Spatial look-ups use shapely's STRtree on the plan (x, y) projection as a coarse
filter; exact 3D distances are then computed with numpy on the candidates only.
"""

from __future__ import annotations

import logging
import math
from bisect import bisect_left, bisect_right
from collections import defaultdict
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field

import networkx as nx
import numpy as np
import shapely
from cablewright.core.errors import Issue
from shapely import STRtree

from .guard import check_equipment, check_polylines, check_snap_tolerance
from .model import DrawingConfig, Equipment, Point3, RoutePolyline, RouteSegment

__all__ = ["Network", "Tail", "build_network", "equipment_node", "COINCIDENT_M"]

logger = logging.getLogger(__name__)

#: Points closer than this are the same point, [m] (1 micrometre: far below
#: drawing precision, far above float rounding at site coordinates).
COINCIDENT_M = 1e-6


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


class _UnionFind:
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

    def union(self, a: int, b: int) -> None:
        ra, rb = self.find(a), self.find(b)
        if ra != rb:
            if ra < rb:
                self.parent[rb] = ra
            else:
                self.parent[ra] = rb


def _project(p: np.ndarray, a: np.ndarray, b: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Parameter t in [0, 1] and 3D distance of points p to segments a-b (row-wise)."""
    ab = b - a
    l2 = np.einsum("ij,ij->i", ab, ab)
    with np.errstate(invalid="ignore", divide="ignore"):
        t = np.where(l2 > 0, np.einsum("ij,ij->i", p - a, ab) / np.where(l2 > 0, l2, 1), 0.0)
    t = np.clip(t, 0.0, 1.0)
    q = a + t[:, None] * ab
    return t, np.linalg.norm(p - q, axis=1)


def _boxes(xy: np.ndarray, r: float | np.ndarray) -> np.ndarray:
    r = np.broadcast_to(np.asarray(r, dtype=float), (len(xy),))
    return shapely.box(xy[:, 0] - r, xy[:, 1] - r, xy[:, 0] + r, xy[:, 1] + r)


def _fmt(p: Sequence[float]) -> str:
    return "(" + ", ".join(f"{v:.3f}" for v in p) + ") m"


def _clean(points: Iterable[Sequence[float]]) -> list[Point3]:
    out: list[Point3] = []
    for p in points:
        q = (float(p[0]), float(p[1]), float(p[2]) if len(p) > 2 else 0.0)
        if not out or math.dist(out[-1], q) > COINCIDENT_M:
            out.append(q)
    return out


#: Query geometries built per STRtree call; bounds the temporary boxes of a big drawing
#: (2 million route pieces make 4 million ends) without changing any result.
_QUERY_CHUNK = 200_000


def _query_boxes(tree: STRtree, xy: np.ndarray, r: float | np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """(input index, tree index) pairs of tree items meeting the box of half-side r around xy.

    The same pairs, in the same order, as one ``tree.query(_boxes(xy, r))``, built chunk by
    chunk so that only ``_QUERY_CHUNK`` boxes exist at a time.
    """
    r = np.broadcast_to(np.asarray(r, dtype=float), (len(xy),))
    out_i, out_j = [], []
    for lo in range(0, len(xy), _QUERY_CHUNK):
        hi = min(lo + _QUERY_CHUNK, len(xy))
        qi, qj = tree.query(_boxes(xy[lo:hi], r[lo:hi]))
        out_i.append(qi + lo)
        out_j.append(qj)
    if not out_i:
        return np.zeros(0, dtype=np.intp), np.zeros(0, dtype=np.intp)
    return np.concatenate(out_i), np.concatenate(out_j)


# --------------------------------------------------------------------------- step 1: clean


def _clean_input(polylines: Iterable[RoutePolyline | tuple], issues: list[Issue]) -> list[RoutePolyline]:
    """Route pieces with coincident vertices merged; pieces without length reported and dropped."""
    polys: list[RoutePolyline] = []
    for item in polylines:
        pl = item if isinstance(item, RoutePolyline) else RoutePolyline(*item)
        pts = _clean(pl.points_m)
        if len(pts) < 2:
            issues.append(
                Issue(
                    "zero-length",
                    f"route piece {pl.source_id} on layer {pl.layer} has no length; ignored - "
                    "delete it from the drawing",
                    pl.source_id,
                )
            )
            continue
        polys.append(RoutePolyline(tuple(pts), pl.layer, pl.containment, pl.method, pl.source_id))
    return polys


@dataclass
class _Geometry:
    """The cleaned pieces as arrays: vertices, sub-segments (a-b) and their STRtree."""

    polys: list[RoutePolyline]
    verts: list[np.ndarray]
    seglen: list[np.ndarray]
    cum: list[np.ndarray]
    total: list[float]
    sa: np.ndarray
    sb: np.ndarray
    s_owner: np.ndarray
    s_k: np.ndarray
    seg_tree: STRtree | None

    def point_at(self, s: int, tt: float) -> tuple[int, float, np.ndarray]:
        """(piece, distance along it [m], xyz) of parameter tt on sub-segment s."""
        j = int(self.s_owner[s])
        k = int(self.s_k[s])
        return j, float(self.cum[j][k] + tt * self.seglen[j][k]), self.sa[s] + tt * (self.sb[s] - self.sa[s])


def _geometry(polys: list[RoutePolyline]) -> _Geometry:
    verts = [np.asarray(p.points_m, dtype=float) for p in polys]
    seglen = [np.linalg.norm(np.diff(v, axis=0), axis=1) for v in verts]
    cum = [np.concatenate(([0.0], np.cumsum(sl))) for sl in seglen]
    total = [float(c[-1]) for c in cum]
    if polys:
        sa = np.concatenate([v[:-1] for v in verts])
        sb = np.concatenate([v[1:] for v in verts])
        counts = np.fromiter((len(v) - 1 for v in verts), dtype=np.intp, count=len(verts))
        s_owner = np.repeat(np.arange(len(verts)), counts)
        s_k = np.arange(len(sa)) - np.repeat(np.cumsum(counts) - counts, counts)
        seg_tree = STRtree(shapely.linestrings(np.stack([sa[:, :2], sb[:, :2]], axis=1)))
    else:
        sa = sb = np.zeros((0, 3))
        s_owner = s_k = np.zeros(0, dtype=int)
        seg_tree = None
    return _Geometry(polys, verts, seglen, cum, total, sa, sb, s_owner, s_k, seg_tree)


# --------------------------------------------------------------------------- step 2: cut points


@dataclass
class _Cuts:
    """Cut points on the pieces (ends, tees, shared vertices, tails) and their joins.

    Cut point ``pid`` lies on piece ``poly[pid]`` at ``s[pid]`` metres along it; cut points
    that are one place share a union-find root; ``joins`` are gaps (pid, pid, length [m]).
    Pids ``2i`` and ``2i + 1`` are the two ends of piece i.
    """

    uf: _UnionFind = field(default_factory=_UnionFind)
    poly: list[int] = field(default_factory=list)
    s: list[float] = field(default_factory=list)
    xyz: list[Point3] = field(default_factory=list)
    joins: list[tuple[int, int, float]] = field(default_factory=list)

    def new(self, i: int, s: float, xyz: Sequence[float]) -> int:
        pid = self.uf.add()
        self.poly.append(i)
        self.s.append(s)
        self.xyz.append((float(xyz[0]), float(xyz[1]), float(xyz[2])))
        return pid

    def join(self, a: int, b: int, d: float) -> None:
        if d <= COINCIDENT_M:
            self.uf.union(a, b)
        else:
            self.joins.append((a, b, d))


def _cut_points(geo: _Geometry, tol: float) -> tuple[_Cuts, np.ndarray]:
    """Ends of every piece, joined end to end, as tees and at shared vertices."""
    cuts = _Cuts()
    for i in range(len(geo.polys)):
        cuts.new(i, 0.0, geo.verts[i][0])  # pid 2i
        cuts.new(i, geo.total[i], geo.verts[i][-1])  # pid 2i+1
    ends = np.asarray(cuts.xyz, dtype=float).reshape(-1, 3)
    if geo.polys:
        _join_ends(cuts, ends, tol)
        _join_tees(cuts, geo, ends, tol)
        _join_shared_vertices(cuts, geo, tol)
    return cuts, ends


def _join_ends(cuts: _Cuts, ends: np.ndarray, tol: float) -> None:
    """End - end within the tolerance (3D)."""
    end_tree = STRtree(shapely.points(ends[:, :2]))
    qi, qj = _query_boxes(end_tree, ends[:, :2], tol)
    keep = qi < qj
    qi, qj = qi[keep], qj[keep]
    d = np.linalg.norm(ends[qi] - ends[qj], axis=1)
    for a, b, dd in zip(qi[d <= tol], qj[d <= tol], d[d <= tol], strict=False):
        cuts.join(int(a), int(b), float(dd))


def _join_tees(cuts: _Cuts, geo: _Geometry, ends: np.ndarray, tol: float) -> None:
    """An end on another route's interior: a new cut point there, joined to the end."""
    qe, qs = _query_boxes(geo.seg_tree, ends[:, :2], tol)
    own = qe // 2
    keep = geo.s_owner[qs] != own
    qe, qs = qe[keep], qs[keep]
    t, d = _project(ends[qe], geo.sa[qs], geo.sb[qs])
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


def _join_shared_vertices(cuts: _Cuts, geo: _Geometry, tol: float) -> None:
    """Interior vertices of two different routes within the tolerance."""
    inner = [(i, k) for i in range(len(geo.polys)) for k in range(1, len(geo.verts[i]) - 1)]
    if not inner:
        return
    iv = np.asarray([geo.verts[i][k] for i, k in inner])
    iown = np.asarray([i for i, _ in inner])
    itree = STRtree(shapely.points(iv[:, :2]))
    qi, qj = _query_boxes(itree, iv[:, :2], tol)
    keep = (qi < qj) & (iown[qi] != iown[qj])
    qi, qj = qi[keep], qj[keep]
    d = np.linalg.norm(iv[qi] - iv[qj], axis=1)
    for a, b, dd in zip(qi[d <= tol], qj[d <= tol], d[d <= tol], strict=False):
        (i1, k1), (i2, k2) = inner[a], inner[b]
        p1 = cuts.new(i1, float(geo.cum[i1][k1]), geo.verts[i1][k1])
        p2 = cuts.new(i2, float(geo.cum[i2][k2]), geo.verts[i2][k2])
        cuts.join(p1, p2, float(dd))


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
            issues.append(Issue("duplicate-tag", msg, items[1].source_id))
    return eq_map, tag_failures


def _nearest_3d(geo: _Geometry, p: np.ndarray, r: float) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Sub-segments meeting the plan box of half-side r around p, with t and 3D distance."""
    c = np.sort(geo.seg_tree.query(_boxes(p[None, :2], r + 1e-9)[0]))
    t, d = _project(np.repeat(p[None, :], len(c), 0), geo.sa[c], geo.sb[c])
    return c, t, d


def _tails(
    geo: _Geometry,
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
    qe, qs = geo.seg_tree.query_nearest(shapely.points(pos[:, :2]), max_distance=max_tail_m, all_matches=True)
    first: dict[int, list[int]] = defaultdict(list)
    for e, s in zip(qe, qs, strict=False):
        first[int(e)].append(int(s))
    for n, tag in enumerate(usable):
        eq = eq_map[tag]
        cand = first.get(n)
        dist = math.inf
        if cand:
            c = np.asarray(cand)
            _, d = _project(np.repeat(pos[n : n + 1], len(c), 0), geo.sa[c], geo.sb[c])
            # every route nearer in 3D is nearer in plan: search the plan box of r
            c, t, d = _nearest_3d(geo, pos[n], float(d.min()))
            m = int(np.argmin(d))
            dist = float(d[m])
        if dist > max_tail_m:
            tag_failures[tag] = _too_far(geo, eq, pos[n], max_tail_m)
            continue
        j, s_along, xyz = geo.point_at(int(c[m]), float(t[m]))
        pid = cuts.new(j, s_along, xyz)
        tail_pid[tag] = (pid, dist, eq.position_m, cuts.xyz[pid])
    return tail_pid


def _too_far(geo: _Geometry, eq: Equipment, p: np.ndarray, max_tail_m: float) -> str:
    """The message for an equipment farther than the maximum tail from every route."""
    far = int(geo.seg_tree.query_nearest(shapely.points(p[:2]))[0])
    _, d_far = _project(p[None, :], geo.sa[far : far + 1], geo.sb[far : far + 1])
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
    uf: _UnionFind

    def node(self, pid: int) -> str:
        return self.node_of_root[self.uf.find(pid)]


def _pieces(geo: _Geometry, cuts: _Cuts) -> _Pieces:
    """Cut every route piece at its cut points; name the nodes; add the snap gaps."""
    on_poly: dict[int, list[int]] = defaultdict(list)
    for pid, i in enumerate(cuts.poly):
        on_poly[i].append(pid)
    raw: list[tuple[int, int, list[Point3], int]] = []  # pid_a, pid_b, points, poly
    for i in range(len(geo.polys)):
        groups = _cut_groups(cuts, on_poly[i])
        cum = geo.cum[i]
        for ga, gb in zip(groups[:-1], groups[1:], strict=False):
            a, b = ga[0], gb[0]
            # vertices strictly between the two cuts (cum is increasing)
            lo = bisect_right(cum, cuts.s[a] + COINCIDENT_M)
            hi = bisect_left(cum, cuts.s[b] - COINCIDENT_M)
            inner = [tuple(map(float, geo.verts[i][k])) for k in range(lo, hi)]
            raw.append((a, b, [cuts.xyz[a], *inner, cuts.xyz[b]], i))  # type: ignore[list-item]
    # node names, deterministic: by smallest cut-point id of each cluster
    node_of_root: dict[int, str] = {}
    node_pos: dict[str, Point3] = {}
    for pid in range(len(cuts.poly)):
        r = cuts.uf.find(pid)
        if r not in node_of_root:
            node_of_root[r] = f"N{len(node_of_root)}"
        node_pos.setdefault(node_of_root[r], cuts.xyz[pid])
    out = _Pieces([], 0, node_of_root, node_pos, cuts.uf)
    for a, b, pts, i in raw:
        length = float(np.linalg.norm(np.diff(np.asarray(pts), axis=0), axis=1).sum())
        if length > COINCIDENT_M:
            out.pieces.append((out.node(a), out.node(b), pts, length, i))
    out.gap_start = len(out.pieces)
    for a, b, d in cuts.joins:
        u, v = out.node(a), out.node(b)
        if u != v:  # the gap takes the layer of the lower-numbered piece it joins
            out.pieces.append((u, v, [cuts.xyz[a], cuts.xyz[b]], d, min(cuts.poly[a], cuts.poly[b])))
    return out


def _cut_groups(cuts: _Cuts, pids: list[int]) -> list[list[int]]:
    """The cut points of one piece in order along it, coincident ones grouped (and united)."""
    groups: list[list[int]] = []
    for p in sorted(pids, key=lambda q: (cuts.s[q], q)):
        if groups and cuts.s[p] - cuts.s[groups[-1][0]] <= COINCIDENT_M:
            cuts.uf.union(groups[-1][0], p)
            groups[-1].append(p)
        else:
            groups.append([p])
    return groups


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

    def kind(self, n: int) -> tuple[str, str, str]:
        p = self.polys[self.pieces.pieces[n][4]]
        return (p.layer, p.containment, p.method)

    def is_boundary(self, nd: str) -> bool:
        a = self.adj[nd]
        if len(a) != 2 or nd in self.tail_nodes or a[0] == a[1]:
            return True
        return self.kind(a[0]) != self.kind(a[1])

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
    g = nx.Graph()
    for nd in sorted({nd for ends_ in ch.segment_ends.values() for nd in ends_}, key=_node_key):
        g.add_node(nd, pos_m=ch.pieces.node_pos[nd])
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

    polys = _clean_input(guarded, issues)
    geo = _geometry(polys)
    cuts, ends = _cut_points(geo, tol)
    eq_map, tag_failures = _equipment_by_tag(equipment, issues)
    tail_pid = _tails(geo, cuts, eq_map, tag_failures, config.max_tail_m)
    pieces = _pieces(geo, cuts)
    tail_nodes = {pieces.node(v[0]) for v in tail_pid.values()}
    ch, nodes_sorted = _chains(polys, pieces, tail_nodes)
    g, segment_nodes, tails = _graph(ch, tail_pid, eq_map)

    issues.extend(_near_misses(geo, ends, ch, config))
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
    )


# --------------------------------------------------------------------------- drawing issues


def _isolated(ch: _Chains, nodes_sorted: list[str]) -> list[Issue]:
    """Connected groups of pieces that reach no equipment tail.

    Components are found with a union-find over the nodes (a graph of every piece would
    hold millions of nodes on a big drawing) and listed by their lowest node, as a
    breadth-first search over the nodes in order would list them.
    """
    index = {nd: k for k, nd in enumerate(nodes_sorted)}
    uf = _UnionFind()
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
        out.append(
            Issue(
                "isolated",
                f"route piece(s) {shown} join no equipment and no other route; "
                "check the joints in the drawing",
                srcs[0] if srcs else "",
            )
        )
    return out


def _near_misses(geo: _Geometry, ends: np.ndarray, ch: _Chains, config: DrawingConfig) -> list[Issue]:
    """Free route ends that come within near_miss_factor x tolerance of another route."""
    out: list[Issue] = []
    if not len(ends):
        return out
    tol = config.snap_tolerance_m
    reach = tol * config.near_miss_factor
    node = ch.pieces.node
    free = [e for e in range(len(ends)) if len(ch.adj[node(e)]) == 1 and node(e) not in ch.tail_nodes]
    if not free:
        return out
    fe = np.asarray(free)
    qe, qs = _query_boxes(geo.seg_tree, ends[fe, :2], reach)
    own = fe[qe] // 2
    keep = geo.s_owner[qs] != own
    qe, qs = qe[keep], qs[keep]
    _, d = _project(ends[fe[qe]], geo.sa[qs], geo.sb[qs])
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
        out.append(
            Issue(
                "near-miss",
                f"route end of {p.source_id} ({p.layer}) at {_fmt(ends[fe[e]])} is {dd * 1000:.0f} mm "
                f"from route {geo.polys[j].source_id}, beyond the {tol * 1000:.0f} mm snap tolerance: "
                "not joined; join them in the drawing if they meet",
                p.source_id,
            )
        )
    return out
