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
from collections import defaultdict
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field

import networkx as nx
import numpy as np
import shapely
from shapely import STRtree

from .errors import Issue
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


def build_network(
    polylines: Iterable[RoutePolyline | tuple],
    equipment: Iterable[Equipment],
    config: DrawingConfig | None = None,
) -> Network:
    """Build the route network and join the equipment to it.

    Parameters
    ----------
    polylines : iterable of RoutePolyline or (points_m, layer, containment, method, source_id)
        Route pieces in world coordinates, [m].
    equipment : iterable of Equipment
        Equipment with world insertion points, [m].
    config : DrawingConfig, optional
        ``snap_tolerance_m``, ``max_tail_m``, ``near_miss_factor``.

    Returns
    -------
    Network
        Graph, segments, tails, per-tag failures and drawing issues.

    Notes
    -----
    Cost is O(n log n) in the number of route vertices: every proximity search goes
    through an STRtree; there is no pairwise loop.

    References
    ----------
    .. [1] contract.md, "Drawing conventions" and "Lengths and grouping".
    """
    config = config or DrawingConfig()
    tol = float(config.snap_tolerance_m)
    issues: list[Issue] = []

    # ---------------------------------------------------------------- clean input
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

    n_poly = len(polys)
    verts = [np.asarray(p.points_m, dtype=float) for p in polys]
    seglen = [np.linalg.norm(np.diff(v, axis=0), axis=1) for v in verts]
    cum = [np.concatenate(([0.0], np.cumsum(sl))) for sl in seglen]
    total = [float(c[-1]) for c in cum]

    # sub-segment arrays
    if n_poly:
        sa = np.concatenate([v[:-1] for v in verts])
        sb = np.concatenate([v[1:] for v in verts])
        s_owner = np.concatenate([np.full(len(v) - 1, i) for i, v in enumerate(verts)])
        s_k = np.concatenate([np.arange(len(v) - 1) for v in verts])
    else:
        sa = sb = np.zeros((0, 3))
        s_owner = s_k = np.zeros(0, dtype=int)
    seg_tree = STRtree(shapely.linestrings(np.stack([sa[:, :2], sb[:, :2]], axis=1))) if n_poly else None

    # ---------------------------------------------------------------- cut points
    uf = _UnionFind()
    pid_poly: list[int] = []
    pid_s: list[float] = []
    pid_xyz: list[Point3] = []

    def new_pid(i: int, s: float, xyz: Sequence[float]) -> int:
        pid = uf.add()
        pid_poly.append(i)
        pid_s.append(s)
        pid_xyz.append((float(xyz[0]), float(xyz[1]), float(xyz[2])))
        return pid

    for i in range(n_poly):
        new_pid(i, 0.0, verts[i][0])  # pid 2i
        new_pid(i, total[i], verts[i][-1])  # pid 2i+1
    ends = np.asarray(pid_xyz, dtype=float).reshape(-1, 3)

    joins: list[tuple[int, int, float]] = []  # (pid, pid, gap length)

    def join(a: int, b: int, d: float) -> None:
        if d <= COINCIDENT_M:
            uf.union(a, b)
        else:
            joins.append((a, b, d))

    # end - end within tolerance
    if n_poly:
        end_tree = STRtree(shapely.points(ends[:, :2]))
        qi, qj = end_tree.query(_boxes(ends[:, :2], tol))
        keep = qi < qj
        qi, qj = qi[keep], qj[keep]
        d = np.linalg.norm(ends[qi] - ends[qj], axis=1)
        for a, b, dd in zip(qi[d <= tol], qj[d <= tol], d[d <= tol], strict=False):
            join(int(a), int(b), float(dd))

    # end on another route's interior (tee)
    if n_poly:
        qe, qs = seg_tree.query(_boxes(ends[:, :2], tol))
        own = qe // 2
        keep = s_owner[qs] != own
        qe, qs = qe[keep], qs[keep]
        t, d = _project(ends[qe], sa[qs], sb[qs])
        # an end of the target within tolerance is an end-end join, already made
        tj = s_owner[qs]
        near_end = np.minimum(
            np.linalg.norm(ends[qe] - ends[2 * tj], axis=1),
            np.linalg.norm(ends[qe] - ends[2 * tj + 1], axis=1),
        )
        keep = (d <= tol) & (near_end > tol)
        best: dict[tuple[int, int], tuple[float, int, float]] = {}
        for e, s, tt, dd in zip(qe[keep], qs[keep], t[keep], d[keep], strict=False):
            j = int(s_owner[s])
            key = (int(e), j)
            if key not in best or dd < best[key][0]:
                best[key] = (float(dd), int(s), float(tt))
        for (e, j), (dd, s, tt) in sorted(best.items()):
            k = int(s_k[s])
            pos = cum[j][k] + tt * seglen[j][k]
            xyz = sa[s] + tt * (sb[s] - sa[s])
            join(e, new_pid(j, float(pos), xyz), dd)

    # interior vertex shared by two routes
    inner = [(i, k) for i in range(n_poly) for k in range(1, len(verts[i]) - 1)]
    if inner:
        iv = np.asarray([verts[i][k] for i, k in inner])
        iown = np.asarray([i for i, _ in inner])
        itree = STRtree(shapely.points(iv[:, :2]))
        qi, qj = itree.query(_boxes(iv[:, :2], tol))
        keep = (qi < qj) & (iown[qi] != iown[qj])
        qi, qj = qi[keep], qj[keep]
        d = np.linalg.norm(iv[qi] - iv[qj], axis=1)
        for a, b, dd in zip(qi[d <= tol], qj[d <= tol], d[d <= tol], strict=False):
            (i1, k1), (i2, k2) = inner[a], inner[b]
            p1 = new_pid(i1, float(cum[i1][k1]), verts[i1][k1])
            p2 = new_pid(i2, float(cum[i2][k2]), verts[i2][k2])
            join(p1, p2, float(dd))

    # ---------------------------------------------------------------- equipment tails
    by_tag: dict[str, list[Equipment]] = defaultdict(list)
    for eq in equipment:
        by_tag[eq.tag].append(eq)
    eq_map: dict[str, Equipment] = {}
    tag_failures: dict[str, str] = {}
    for tag, items in by_tag.items():
        eq_map[tag] = items[0]
        if len(items) > 1:
            handles = ", ".join(f"{e.source_id} (block {e.block_name})" for e in items)
            msg = (
                f"tag {tag} is on {len(items)} equipment: {handles}; give each block "
                "its own tag"
            )
            tag_failures[tag] = msg
            issues.append(Issue("duplicate-tag", msg, items[1].source_id))

    tail_pid: dict[str, tuple[int, float, Point3, Point3]] = {}
    usable = [t for t in eq_map if t not in tag_failures]
    if usable and n_poly:
        pos = np.asarray([eq_map[t].position_m for t in usable], dtype=float)
        qe, qs = seg_tree.query_nearest(
            shapely.points(pos[:, :2]), max_distance=config.max_tail_m, all_matches=True
        )
        first: dict[int, list[int]] = defaultdict(list)
        for e, s in zip(qe, qs, strict=False):
            first[int(e)].append(int(s))
        for n, tag in enumerate(usable):
            eq = eq_map[tag]
            cand = first.get(n)
            if cand:
                c = np.asarray(cand)
                _, d = _project(np.repeat(pos[n : n + 1], len(c), 0), sa[c], sb[c])
                r = float(d.min())
                # every route nearer in 3D is nearer in plan: search the plan box of r
                c = seg_tree.query(_boxes(pos[n : n + 1, :2], r + 1e-9)[0])
                c = np.sort(c)
                t, d = _project(np.repeat(pos[n : n + 1], len(c), 0), sa[c], sb[c])
                m = int(np.argmin(d))
                dist = float(d[m])
            else:
                dist = math.inf
            if dist > config.max_tail_m:
                # the nearest route at any distance, for the message
                far = int(seg_tree.query_nearest(shapely.points(pos[n, :2]))[0])
                _, d_far = _project(pos[n : n + 1], sa[far : far + 1], sb[far : far + 1])
                c = seg_tree.query(_boxes(pos[n : n + 1, :2], float(d_far[0]) + 1e-9)[0])
                _, d = _project(np.repeat(pos[n : n + 1], len(c), 0), sa[c], sb[c])
                where = f"the nearest route is {float(d.min()):.2f} m away"
                tag_failures[tag] = (
                    f"equipment {tag} ({eq.source_id}, block {eq.block_name}) at "
                    f"{_fmt(eq.position_m)}: {where}, more than the {config.max_tail_m:g} m "
                    "maximum tail; draw a route to it or raise max_tail_m"
                )
                continue
            s = int(c[m])
            j = int(s_owner[s])
            k = int(s_k[s])
            tt = float(t[m])
            xyz = sa[s] + tt * (sb[s] - sa[s])
            pid = new_pid(j, float(cum[j][k] + tt * seglen[j][k]), xyz)
            tail_pid[tag] = (pid, dist, eq.position_m, pid_xyz[pid])
    elif usable:
        for tag in usable:
            tag_failures[tag] = f"equipment {tag}: the drawing has no routes"

    # ---------------------------------------------------------------- pieces
    cuts: dict[int, list[int]] = defaultdict(list)
    for pid, i in enumerate(pid_poly):
        cuts[i].append(pid)
    raw_pieces: list[tuple[int, int, list[Point3], int]] = []  # pid_a, pid_b, points, poly
    for i in range(n_poly):
        plist = sorted(cuts[i], key=lambda p: (pid_s[p], p))
        groups: list[list[int]] = []
        for p in plist:
            if groups and pid_s[p] - pid_s[groups[-1][0]] <= COINCIDENT_M:
                uf.union(groups[-1][0], p)
                groups[-1].append(p)
            else:
                groups.append([p])
        for ga, gb in zip(groups[:-1], groups[1:], strict=False):
            a, b = ga[0], gb[0]
            s0, s1 = pid_s[a], pid_s[b]
            ks = np.nonzero((cum[i] > s0 + COINCIDENT_M) & (cum[i] < s1 - COINCIDENT_M))[0]
            pts = [pid_xyz[a]] + [tuple(map(float, verts[i][k])) for k in ks] + [pid_xyz[b]]
            raw_pieces.append((a, b, pts, i))  # type: ignore[arg-type]

    # node names, deterministic: by smallest cut-point id of each cluster
    node_of_root: dict[int, str] = {}
    for pid in range(len(pid_poly)):
        r = uf.find(pid)
        if r not in node_of_root:
            node_of_root[r] = f"N{len(node_of_root)}"

    def node(pid: int) -> str:
        return node_of_root[uf.find(pid)]

    node_pos: dict[str, Point3] = {}
    for pid in range(len(pid_poly)):
        node_pos.setdefault(node(pid), pid_xyz[pid])

    # piece: (u, v, points, length, poly index or -1, source ids)
    pieces: list[tuple[str, str, list[Point3], float, int]] = []
    for a, b, pts, i in raw_pieces:
        length = float(np.linalg.norm(np.diff(np.asarray(pts), axis=0), axis=1).sum())
        if length <= COINCIDENT_M:
            continue
        pieces.append((node(a), node(b), pts, length, i))
    gap_pieces_start = len(pieces)
    for a, b, d in joins:
        u, v = node(a), node(b)
        if u == v:
            continue
        # the gap takes the layer of the lower-numbered piece it joins
        pieces.append((u, v, [pid_xyz[a], pid_xyz[b]], d, min(pid_poly[a], pid_poly[b])))

    tail_nodes = {node(v[0]) for v in tail_pid.values()}

    # ---------------------------------------------------------------- segments (chains)
    adj: dict[str, list[int]] = defaultdict(list)
    for n, (u, v, _, _, _) in enumerate(pieces):
        adj[u].append(n)
        adj[v].append(n)

    def kind(n: int) -> tuple[str, str, str]:
        p = polys[pieces[n][4]]
        return (p.layer, p.containment, p.method)

    def is_boundary(nd: str) -> bool:
        a = adj[nd]
        if len(a) != 2 or nd in tail_nodes or a[0] == a[1]:
            return True
        return kind(a[0]) != kind(a[1])

    def node_key(nd: str) -> int:
        return int(nd[1:])

    visited = [False] * len(pieces)
    segments: dict[str, RouteSegment] = {}
    segment_ends: dict[str, tuple[str, str]] = {}
    source_segments: dict[str, list[str]] = defaultdict(list)

    def walk(start: str, first_piece: int) -> None:
        cur = start
        pts: list[Point3] = []
        length = 0.0
        sources: list[str] = []
        n = first_piece
        while True:
            visited[n] = True
            u, v, ppts, plen, i = pieces[n]
            if u == cur:
                seq, nxt = ppts, v
            else:
                seq, nxt = ppts[::-1], u
            pts.extend(seq if not pts else seq[1:])
            length += plen
            if n < gap_pieces_start and polys[i].source_id not in sources:
                sources.append(polys[i].source_id)
            cur = nxt
            if is_boundary(cur):
                break
            a = adj[cur]
            n2 = a[0] if a[1] == n else a[1]
            if visited[n2]:
                break
            n = n2
        sid = f"S{len(segments) + 1}"
        layer, containment, method = kind(first_piece)
        segments[sid] = RouteSegment(
            sid, tuple(sources), layer, containment, method, length, tuple(pts)
        )
        segment_ends[sid] = (start, cur)
        for s in sources:
            source_segments[s].append(sid)

    nodes_sorted = sorted(adj, key=node_key)
    for nd in nodes_sorted:
        if is_boundary(nd):
            for n in adj[nd]:
                if not visited[n]:
                    walk(nd, n)
    for nd in nodes_sorted:  # closed loops with no boundary node
        for n in adj[nd]:
            if not visited[n]:
                walk(nd, n)

    # ---------------------------------------------------------------- graph
    g = nx.Graph()
    for nd in sorted({nd for ends_ in segment_ends.values() for nd in ends_}, key=node_key):
        g.add_node(nd, pos_m=node_pos[nd])
    segment_nodes: dict[str, tuple[str, ...]] = {}
    for sid, seg in segments.items():
        u, v = segment_ends[sid]
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
        nd = node(pid)
        g.add_node(equipment_node(tag), pos_m=eq.position_m, tag=tag)
        g.add_edge(
            equipment_node(tag),
            nd,
            length_m=dist,
            kind="tail",
            half=False,
            containment="tail",
            method="",
            segment_id="",
            source_id=eq.source_id,
        )
        tails[tag] = Tail(tag, nd, dist, start, end)

    # ---------------------------------------------------------------- drawing issues
    issues.extend(_near_misses(polys, ends, adj, node, tail_nodes, seg_tree, sa, sb, s_owner, verts, config))
    piece_graph = nx.Graph()
    piece_graph.add_nodes_from(nodes_sorted)
    piece_graph.add_edges_from((u, v) for u, v, _, _, _ in pieces)
    for comp in nx.connected_components(piece_graph):
        if comp & tail_nodes:
            continue
        srcs = sorted({s for nd in comp for n in adj[nd] for s in _piece_sources(pieces, n, polys, gap_pieces_start)})
        shown = ", ".join(srcs[:5]) + (f" and {len(srcs) - 5} more" if len(srcs) > 5 else "")
        issues.append(
            Issue(
                "isolated",
                f"route piece(s) {shown} join no equipment and no other route; "
                "check the joints in the drawing",
                srcs[0] if srcs else "",
            )
        )
    logger.info(
        "network: %d pieces -> %d segments, %d nodes, %d tails, %d issues",
        n_poly, len(segments), g.number_of_nodes(), len(tails), len(issues),
    )
    return Network(
        graph=g,
        segments=segments,
        equipment=eq_map,
        tails=tails,
        tag_failures=tag_failures,
        issues=issues,
        source_segments={k: tuple(v) for k, v in source_segments.items()},
        segment_ends=segment_ends,
        segment_nodes=segment_nodes,
    )


def _piece_sources(pieces, n: int, polys: list[RoutePolyline], gap_start: int) -> list[str]:
    return [] if n >= gap_start else [polys[pieces[n][4]].source_id]


def _near_misses(polys, ends, adj, node, tail_nodes, seg_tree, sa, sb, s_owner, verts, config):
    """Free route ends that come within near_miss_factor x tolerance of another route."""
    out: list[Issue] = []
    if not len(ends):
        return out
    tol = config.snap_tolerance_m
    reach = tol * config.near_miss_factor
    free = [e for e in range(len(ends)) if len(adj[node(e)]) == 1 and node(e) not in tail_nodes]
    if not free:
        return out
    fe = np.asarray(free)
    qe, qs = seg_tree.query(_boxes(ends[fe, :2], reach))
    own = fe[qe] // 2
    keep = s_owner[qs] != own
    qe, qs = qe[keep], qs[keep]
    _, d = _project(ends[fe[qe]], sa[qs], sb[qs])
    best: dict[int, tuple[float, int]] = {}
    for e, s, dd in zip(qe, qs, d, strict=False):
        if tol < dd <= reach and (e not in best or dd < best[e][0]):
            best[int(e)] = (float(dd), int(s_owner[s]))
    reported: set[frozenset[int]] = set()
    for e in sorted(best):
        dd, j = best[e]
        i = int(fe[e]) // 2
        pair = frozenset((i, j))
        if pair in reported:
            continue
        reported.add(pair)
        p = polys[i]
        out.append(
            Issue(
                "near-miss",
                f"route end of {p.source_id} ({p.layer}) at {_fmt(ends[fe[e]])} is {dd * 1000:.0f} mm "
                f"from route {polys[j].source_id}, beyond the {tol * 1000:.0f} mm snap tolerance: "
                "not joined; join them in the drawing if they meet",
                p.source_id,
            )
        )
    return out
