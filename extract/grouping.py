"""Grouping: which circuits share each route segment.

contract.md, "Lengths and grouping": a segment's group is the set of circuits
routed through it; tails are not grouped; an unrouted circuit is in no group.
``circuits_in_group`` is the largest count along the circuit's route (1 when
alone), ``cables_in_group`` the same count of cables (n parallel cables count n).
"""

from __future__ import annotations

from collections import defaultdict
from collections.abc import Mapping
from dataclasses import dataclass

from .model import CircuitRoute

__all__ = ["GroupInfo", "circuits_per_segment", "group_summary"]


@dataclass(frozen=True)
class GroupInfo:
    """Grouping of one circuit.

    Attributes
    ----------
    circuits_in_group : int
        Largest number of circuits on one segment of the route (>= 1).
    cables_in_group : int
        Largest number of cables on one segment of the route, parallel cables counted.
    segment_counts : tuple of (segment_id, circuits, cables)
        Per segment on the route, in route order, each segment once.
    """

    circuits_in_group: int
    cables_in_group: int
    segment_counts: tuple[tuple[str, int, int], ...]


def circuits_per_segment(
    routes: Mapping[str, CircuitRoute], parallel: Mapping[str, int] | None = None
) -> dict[str, tuple[str, ...]]:
    """Circuits routed through each segment.

    Parameters
    ----------
    routes : mapping
        Circuit id -> :class:`CircuitRoute` (routed circuits only).
    parallel : mapping, optional
        Circuit id -> parallel cables; not needed for the sets, accepted for symmetry
        with :func:`group_summary`.

    Returns
    -------
    dict
        Segment id -> sorted tuple of circuit ids (each circuit once).

    Examples
    --------
    >>> r = CircuitRoute("C1", "A", "B", 1.0, 1.0, 0.0, 0.0, ("S1", "S2"), ())
    >>> circuits_per_segment({"C1": r})
    {'S1': ('C1',), 'S2': ('C1',)}

    References
    ----------
    .. [1] contract.md, "Lengths and grouping".
    """
    acc: dict[str, set[str]] = defaultdict(set)
    for cid, route in routes.items():
        for sid in route.segment_ids:
            acc[sid].add(cid)
    return {sid: tuple(sorted(c)) for sid, c in sorted(acc.items())}


def group_summary(
    routes: Mapping[str, CircuitRoute],
    per_segment: Mapping[str, tuple[str, ...]] | None = None,
    parallel: Mapping[str, int] | None = None,
) -> dict[str, GroupInfo]:
    """Grouping counts of every routed circuit.

    Parameters
    ----------
    routes : mapping
        Circuit id -> :class:`CircuitRoute`.
    per_segment : mapping, optional
        From :func:`circuits_per_segment`; computed when omitted.
    parallel : mapping, optional
        Circuit id -> number of parallel cables (default 1).

    Returns
    -------
    dict
        Circuit id -> :class:`GroupInfo`.

    References
    ----------
    .. [1] contract.md, "Lengths and grouping".
    """
    parallel = parallel or {}
    if per_segment is None:
        per_segment = circuits_per_segment(routes)
    cables_on: dict[str, int] = {
        sid: sum(max(1, int(parallel.get(c, 1))) for c in cids) for sid, cids in per_segment.items()
    }
    out: dict[str, GroupInfo] = {}
    for cid, route in routes.items():
        own = max(1, int(parallel.get(cid, 1)))
        counts = []
        seen: set[str] = set()
        for sid in route.segment_ids:
            if sid in seen:
                continue
            seen.add(sid)
            counts.append((sid, len(per_segment.get(sid, (cid,))), cables_on.get(sid, own)))
        circuits = max((c for _, c, _ in counts), default=1)
        cables = max((k for _, _, k in counts), default=own)
        out[cid] = GroupInfo(circuits, cables, tuple(counts))
    return out
