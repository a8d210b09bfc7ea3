"""Route every circuit over the network: shortest path by length.

One shortest-path tree is grown per source tag (Dijkstra in networkx's order,
stopped once the source's loads are reached) and every circuit from that source
reads its path from the tree; circuits with a
``via`` are routed leg by leg.  A circuit that cannot be routed gets a one-line
message and never stops the others.
"""

from __future__ import annotations

import difflib
import logging
from collections import defaultdict
from collections.abc import Iterable, Sequence
from heapq import heappop, heappush
from itertools import count

import networkx as nx

from .model import CircuitRoute, DrawingConfig, Point3, ScheduleRow
from .network import Network, equipment_node

__all__ = ["route_circuits", "design_length_m", "shortest_path_tree", "path_from_tree", "WEIGHT"]

logger = logging.getLogger(__name__)

#: Edge attribute used as the path weight.
WEIGHT = "length_m"


def design_length_m(routed_length_m: float, config: DrawingConfig) -> float:
    """Length used for voltage drop and impedance.

    ``L_design = L_routed * (1 + slack_fraction) + 2 * end_allowance_m``

    Parameters
    ----------
    routed_length_m : float
        Tails plus path along the routes, [m].
    config : DrawingConfig
        ``slack_fraction`` [-] and ``end_allowance_m`` [m] (5 % and 1.5 m, common practice).

    Returns
    -------
    float
        Design length, [m].

    Examples
    --------
    >>> round(design_length_m(100.0, DrawingConfig()), 6)
    108.0

    References
    ----------
    .. [1] contract.md, "Lengths and grouping" (allowances are common practice).
    """
    return routed_length_m * (1.0 + config.slack_fraction) + 2.0 * config.end_allowance_m


def _suggest(tag: str, known: Iterable[str]) -> str:
    close = difflib.get_close_matches(tag, list(known), n=3, cutoff=0.6)
    if not close:
        close = [k for k in known if k.upper() == tag.upper()]
    return f" (did you mean {', '.join(close)}?)" if close else ""


class _Fail(Exception):
    pass


def _path_points(network: Network, path: Sequence[str]) -> tuple[list[Point3], list[str], float, float]:
    """Points, segment ids, source tail and load tail of a node path."""
    g = network.graph
    pts: list[Point3] = []
    segs: list[str] = []
    for u, v in zip(path[:-1], path[1:], strict=False):
        data = g.edges[u, v]
        if data["kind"] == "tail":
            a = g.nodes[u]["pos_m"]
            b = g.nodes[v]["pos_m"]
            seq: Sequence[Point3] = [a, b]
        else:
            sid = data["segment_id"]
            if data.get("half") and u.startswith("M"):
                continue  # second half of a split parallel segment: already added
            segs.append(sid)
            seg_pts = network.segments[sid].points_m
            seq = seg_pts if network.segment_ends[sid][0] == u else seg_pts[::-1]
        pts.extend(seq if not pts else seq[1:])
    first = g.edges[path[0], path[1]]["length_m"] if len(path) > 1 else 0.0
    last = g.edges[path[-2], path[-1]]["length_m"] if len(path) > 1 else 0.0
    return pts, segs, first, last


def _via_nodes(network: Network, via: str, where: str) -> list[tuple[str, ...]]:
    """Ways to pass a via: [(node,)] for equipment, node runs of segments for route pieces."""
    if via in network.tails:
        return [(network.tails[via].node,)]
    if via in network.tag_failures:
        raise _Fail(f"{where}: via {via}: {network.tag_failures[via]}")
    seg_ids: Sequence[str] = ()
    if via in network.segments:
        seg_ids = (via,)
    elif via in network.source_segments:
        seg_ids = network.source_segments[via]
    options = [network.segment_nodes[sid] for sid in seg_ids if sid in network.segment_nodes]
    if not options:
        known = list(network.tails) + list(network.segments) + list(network.source_segments)
        raise _Fail(
            f"{where}: via {via} is neither an equipment tag nor a route piece of the "
            f"drawing{_suggest(via, known)}; correct the via column"
        )
    return options


def shortest_path_tree(
    g: nx.Graph, source: str, targets: Iterable[str] | None = None, weight: str = WEIGHT
) -> tuple[dict[str, float], dict[str, list[str]]]:
    """Dijkstra from ``source``, stopping once every target is settled.

    The search visits nodes in exactly the order of networkx's
    ``single_source_dijkstra`` (same heap keys, same tie-breaking counter, same
    adjacency order), so the path read back through the first predecessor of
    each node is the path networkx returns; it only stops early, which keeps
    one tree per source local to the part of the plant the source feeds.

    Parameters
    ----------
    g : networkx.Graph
        Route network; ``weight`` is the edge attribute holding the length [m].
    source : str
        Start node.
    targets : iterable of str, optional
        Nodes whose distances are wanted; ``None`` settles every reachable node.
    weight : str
        Edge attribute used as the length.

    Returns
    -------
    dist : dict
        Node -> shortest distance, for every settled node.
    pred : dict
        Node -> predecessors on shortest paths; the first one gives networkx's path.

    References
    ----------
    .. [1] networkx ``algorithms/shortest_paths/weighted.py``, ``_dijkstra_multisource``
       (the search order reproduced here).
    """
    adj = g._adj  # type: ignore[attr-defined]  # networkx's adjacency dict, read as its dijkstra reads it (not in the stubs)
    remaining = None if targets is None else set(targets) - {source}
    dist: dict[str, float] = {}
    seen: dict[str, float] = {source: 0}
    pred: dict[str, list[str]] = {source: []}
    counter = count()
    fringe: list[tuple[float, int, str]] = [(0, next(counter), source)]
    while fringe:
        d, _, v = heappop(fringe)
        if v in dist:
            continue
        dist[v] = d
        if remaining is not None:
            remaining.discard(v)
            if not remaining:
                break
        for u, data in adj[v].items():
            vu = d + data.get(weight, 1)
            if u in dist:
                if vu == dist[u]:
                    pred[u].append(v)
            elif u not in seen or vu < seen[u]:
                seen[u] = vu
                heappush(fringe, (vu, next(counter), u))
                pred[u] = [v]
            elif vu == seen[u]:
                pred[u].append(v)
    return dist, pred


def path_from_tree(pred: dict[str, list[str]], node: str, source: str) -> list[str]:
    """Node path from ``source`` to ``node`` through first predecessors.

    The walk ends at ``source``: a zero-length edge back to the source adds
    an equal-distance predecessor to it, which the path must not follow.
    """
    path = [node]
    while node != source:
        node = pred[node][0]
        path.append(node)
    path.reverse()
    return path


def _leg(g: nx.Graph, a: str, b: str, cache: dict) -> tuple[float, list[str]]:
    """Shortest path a -> b, reusing a cached shortest-path tree from a when it reached b."""
    if a in cache:
        dist, pred = cache[a]
        if b in dist:
            return dist[b], path_from_tree(pred, b, a)
    return nx.single_source_dijkstra(g, a, b, weight=WEIGHT)  # type: ignore[return-value]  # a target given: (length, path); the stubs' union covers none given


def _route_via(
    network: Network, src: str, dst: str, vias: list[str], where: str, cache: dict
) -> list[str]:
    """Node path src -> via1 -> ... -> dst (each via passed by its best option)."""
    g = network.graph
    # dynamic programming over the options of each via, legs by Dijkstra
    states: dict[str, tuple[float, list[str]]] = {src: (0.0, [src])}
    for via in vias:
        new: dict[str, tuple[float, list[str]]] = {}
        for run in _via_nodes(network, via, where):
            for through in [run] if len(run) == 1 else [run, run[::-1]]:
                end = through[-1]
                extra = sum(
                    g.edges[a, b][WEIGHT] for a, b in zip(through[:-1], through[1:], strict=False)
                )
                for node, (d0, p0) in states.items():
                    try:
                        d1, p1 = _leg(g, node, through[0], cache)
                    except nx.NetworkXNoPath:
                        continue
                    total = d0 + d1 + extra
                    if end not in new or total < new[end][0]:
                        new[end] = (total, p0 + p1[1:] + list(through[1:]))
        if not new:
            raise _Fail(f"{where}: no route passes via {via}; check the drawing joints")
        states = new
    best: tuple[float, list[str]] | None = None
    for node, (d0, p0) in states.items():
        try:
            d1, p1 = _leg(g, node, dst, cache)
        except nx.NetworkXNoPath:
            continue
        if best is None or d0 + d1 < best[0]:
            best = (d0 + d1, p0 + p1[1:])
    if best is None:
        raise nx.NetworkXNoPath(where)
    return best[1]


def _component(g: nx.Graph, node: str, components: dict[str, frozenset[str]]) -> frozenset[str]:
    """The connected part of the graph holding ``node`` (memoised per node of it)."""
    if node not in components:
        comp = frozenset(nx.node_connected_component(g, node)) if node in g else frozenset((node,))
        for nd in comp:
            components[nd] = comp
    return components[node]


def _no_path_advice(network: Network, src: str, dst: str, components: dict[str, frozenset[str]]) -> str:
    """What really separates the two ends: a crossing without a joint, a gap, or separate networks.

    The crossings and near-miss gaps are those the network build found
    (:attr:`Network.crossings`, :attr:`Network.gaps`); one between the part of the network
    holding the source and the part holding the load is named with its place.
    """
    g = network.graph
    a, b = _component(g, src, components), _component(g, dst, components)

    def between(u: str, v: str) -> bool:
        return (u in a and v in b) or (u in b and v in a)

    for u, v, xyz in network.crossings:
        if between(u, v):
            return (
                f"their routes cross at ({xyz[0]:.3f}, {xyz[1]:.3f}) m without a joint; draw a joint "
                "there or set [routes] join_crossings = true"
            )
    for u, v, gap_m, xyz, end_src, other_src in sorted(network.gaps, key=lambda t: t[2]):
        if between(u, v):
            return (
                f"a gap of {gap_m * 1000:.1f} mm between the end of route {end_src} at "
                f"({xyz[0]:.3f}, {xyz[1]:.3f}, {xyz[2]:.3f}) m and route {other_src}; join them in "
                "the drawing or raise snap_tolerance_m"
            )
    return "they are on separate networks (no route connects the two); draw the route between them"


def route_circuits(
    network: Network,
    rows: Sequence[ScheduleRow],
    config: DrawingConfig | None = None,
) -> tuple[dict[str, CircuitRoute], dict[str, str]]:
    """Route every circuit of the schedule over the network.

    Parameters
    ----------
    network : Network
        From :func:`~cablewright.extract.network.build_network`.
    rows : sequence of ScheduleRow
        The schedule; optional column ``via`` (an equipment tag, segment id or
        route-piece handle the route must pass; several separated by ``;``).
    config : DrawingConfig, optional
        Allowances for the design length.

    Returns
    -------
    routes : dict
        Circuit id -> :class:`CircuitRoute`.
    failures : dict
        Circuit id -> one-line message (unknown tag, tail too long, no path).

    Notes
    -----
    One shortest-path tree per distinct source tag, grown only until the source's
    loads are settled: at most O(S (E + V log V)), in practice the part of the
    plant each source feeds.

    References
    ----------
    .. [1] contract.md, "Lengths and grouping": shortest path between the two tails.
    """
    config = config or DrawingConfig()
    g = network.graph
    routes: dict[str, CircuitRoute] = {}
    failures: dict[str, str] = {}
    known_tags = list(network.equipment)

    def tag_problem(tag: str, role: str, row: ScheduleRow) -> str | None:
        if not tag:
            return f"{row.where}: circuit {row.circuit_id}: the '{role}' cell is blank; give the {role} tag"
        if tag in network.tag_failures:
            return f"{row.where}: circuit {row.circuit_id}: {network.tag_failures[tag]}"
        if tag not in network.tails:
            return (
                f"{row.where}: circuit {row.circuit_id}: {role} tag {tag} is not in the drawing"
                f"{_suggest(tag, known_tags)}; correct the schedule or tag the block"
            )
        return None

    by_source: dict[str, list[ScheduleRow]] = defaultdict(list)
    for row in rows:
        problem = tag_problem(row.from_tag, "from", row) or tag_problem(row.to_tag, "to", row)
        if problem is None and row.from_tag == row.to_tag:
            problem = f"{row.where}: circuit {row.circuit_id}: from and to are both {row.from_tag}"
        if problem:
            failures[row.circuit_id] = problem
            continue
        by_source[row.from_tag].append(row)

    cache: dict[str, tuple[dict, dict]] = {}
    components: dict[str, frozenset[str]] = {}
    for src_tag in sorted(by_source):
        src = equipment_node(src_tag)
        wanted = {equipment_node(r.to_tag) for r in by_source[src_tag] if not r.get("via")}
        has_via = any(r.get("via") for r in by_source[src_tag])
        dist, pred = shortest_path_tree(g, src, None if has_via else wanted)
        cache = {src: (dist, pred)}
        for row in by_source[src_tag]:
            dst = equipment_node(row.to_tag)
            where = f"{row.where}: circuit {row.circuit_id}"
            via_text = row.get("via")
            try:
                if via_text:
                    vias = [v.strip() for v in via_text.replace(",", ";").split(";") if v.strip()]
                    path = _route_via(network, src, dst, vias, where, cache)
                else:
                    if dst not in dist:
                        raise nx.NetworkXNoPath(where)
                    path = path_from_tree(pred, dst, src)
            except nx.NetworkXNoPath:
                failures[row.circuit_id] = (
                    f"{where}: no route joins {row.from_tag} to {row.to_tag}; "
                    + _no_path_advice(network, src, dst, components)
                )
                continue
            except _Fail as exc:
                failures[row.circuit_id] = str(exc)
                continue
            pts, segs, src_tail, dst_tail = _path_points(network, path)
            routed = float(sum(g.edges[u, v][WEIGHT] for u, v in zip(path[:-1], path[1:], strict=False)))
            routes[row.circuit_id] = CircuitRoute(
                circuit_id=row.circuit_id,
                from_tag=row.from_tag,
                to_tag=row.to_tag,
                routed_length_m=routed,
                design_length_m=design_length_m(routed, config),
                source_tail_m=float(src_tail),
                load_tail_m=float(dst_tail),
                segment_ids=tuple(segs),
                points_m=tuple(pts),
            )
    logger.info("routed %d circuits, %d failed", len(routes), len(failures))
    return routes, failures
