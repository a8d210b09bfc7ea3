"""Group tags: shared segments joined into runs, and the lines of each run's tag."""

from __future__ import annotations

import dataclasses
import math
from collections import defaultdict
from collections.abc import Mapping, Sequence
from typing import Any

from ..model import CircuitOutcome
from .boxes import LabelIndex
from .entities import EntityWriter, Mark
from .group_fill import fill_lines, fill_segment_ids, fills_by_run
from .inputs import AnnotationInput
from .label_spots import place_on_route
from .leaders import draw_leader
from .mark_rounds import MarkRound
from .note_keys import key_box, write_key
from .placement import Placement
from .stretches import rank_stretches, scaled, straight_stretches
from .text import clean

#: Farthest a group tag's box may sit from its run [text heights]: a tag is a block of
#: several lines, so it gets twice a label's reach (:data:`.label_spots.MAX_LEADER_H`),
#: still near enough to read as the run's (our own choice).
GROUP_MAX_LEADER_H = 10.0

__all__ = ["GROUP_MAX_LEADER_H", "TaggedRun", "group_runs", "group_tag_lines", "segment_cables", "tagged_runs",
           "fills_under_tags", "place_group_tags"]


def group_runs(
    segments: Mapping[str, Any],
    per_segment: Mapping[str, Sequence[str]],
    *,
    min_circuits: int = 2,
) -> list[tuple[str, ...]]:
    """Shared segments joined into runs along the route, one group tag each.

    Two shared segments (``min_circuits`` or more circuits) are in one run when
    they meet end to end (to 1 mm) at a point where no third shared segment
    ends: a run continues along a tray while circuits peel off or join it at
    tees, and stops where shared routes branch.  Joined transitively
    (union-find).  The tag then names the run's segments grouped by equal
    circuit counts (see :func:`group_tag_lines`), so the grouping of each
    segment stays readable while a long tray gets one tag, not one per tee.

    Parameters
    ----------
    segments : mapping
        Segment id -> RouteSegment (``points_m`` [m]).
    per_segment : mapping
        Segment id -> circuit ids routed through it.
    min_circuits : int
        Segments with fewer circuits are not tagged.

    Returns
    -------
    list of tuple of str
        Runs, most crowded first; segment ids of a run in natural order.

    Examples
    --------
    S1 and S2 continue one another (the count drops from 3 to 2 where C
    leaves); S3 and S4 both end at (9, 0) with S2, a branch of shared routes:

    >>> from types import SimpleNamespace as S
    >>> segs = {"S1": S(points_m=((0, 0), (5, 0))), "S2": S(points_m=((5, 0), (9, 0))),
    ...         "S3": S(points_m=((9, 0), (9, 4))), "S4": S(points_m=((9, 0), (14, 0)))}
    >>> group_runs(segs, {"S1": ("A", "B", "C"), "S2": ("B", "A"), "S3": ("A", "B"),
    ...                   "S4": ("A", "B")})
    [('S1', 'S2'), ('S3',), ('S4',)]
    """
    shared = [
        sid
        for sid, cids in per_segment.items()
        if len(set(cids)) >= min_circuits
        and sid in segments
        and len(getattr(segments[sid], "points_m", ()) or ()) >= 2
    ]
    parent = {sid: sid for sid in shared}

    def find(a: str) -> str:
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    at_point: dict[tuple, list[str]] = defaultdict(list)
    for sid in shared:
        pts = segments[sid].points_m
        for end in (pts[0], pts[-1]):
            at_point[(round(float(end[0]), 3), round(float(end[1]), 3))].append(sid)
    for sids in at_point.values():
        if len(sids) == 2 and sids[0] != sids[1]:
            ra, rb = find(sids[0]), find(sids[1])
            if ra != rb:
                parent[rb] = ra
    runs: dict[str, list[str]] = defaultdict(list)
    for sid in shared:
        runs[find(sid)].append(sid)
    out = [tuple(sorted(r, key=lambda x: (len(x), x))) for r in runs.values()]
    out.sort(key=lambda r: (-max(len(set(per_segment[x])) for x in r), len(r[0]), r[0]))
    return out


def group_tag_lines(
    run: Sequence[str],
    circuits: Sequence[str],
    n_cables: int,
    *,
    ids_per_line: int = 3,
    max_ids: int = 6,
    counts: Sequence[tuple[Sequence[str], int, int]] | None = None,
    max_count_lines: int = 4,
) -> list[str]:
    """Lines of a group tag: segments with counts, then a few circuit ids.

    Parameters
    ----------
    run : sequence of str
        Segment ids of the run.
    circuits : sequence of str
        Circuit ids listed (those of the run's most crowded segment).
    n_cables : int
        Cables on the run's segments when ``counts`` is not given.
    ids_per_line, max_ids : int
        Circuit ids per line and in all.
    counts : sequence of (segment ids, circuits, cables), optional
        The run's segments grouped by equal counts, most crowded first: one
        head line each.  Default: the whole run with ``len(circuits)`` and
        ``n_cables``.
    max_count_lines : int
        Head lines at most; further groups are summed up in one line.

    Examples
    --------
    >>> group_tag_lines(["S4", "S5"], [f"C{i}" for i in range(8)], 9)
    ['S4, S5: 8 circuits, 9 cables', 'C0, C1, C2', 'C3, C4, C5 +2 more']
    >>> group_tag_lines(["S1"], ["A", "B"], 2)
    ['S1: 2 circuits, 2 cables', 'A, B']
    >>> group_tag_lines(["S1", "S2"], ["A", "B", "C"], 3,
    ...                 counts=[(["S1"], 3, 3), (["S2"], 2, 2)])
    ['S1: 3 circuits, 3 cables', 'S2: 2 circuits, 2 cables', 'A, B, C']
    """
    per = max(1, ids_per_line)
    if counts is None:
        counts = [(list(run), len(circuits), n_cables)]
    head = []
    shown_counts = list(counts)
    rest_counts = []
    if len(shown_counts) > max(1, max_count_lines):
        cut = max(1, max_count_lines) - 1
        shown_counts, rest_counts = shown_counts[:cut], shown_counts[cut:]
    for sids, n_circuits, cables in shown_counts:
        ids = list(sids)
        lines = [", ".join(ids[i : i + 2 * per]) for i in range(0, len(ids), 2 * per)]
        lines[-1] += f": {n_circuits} circuits, {cables} cables"
        head += lines
    if rest_counts:
        n_segs = sum(len(sids) for sids, _, _ in rest_counts)
        low = min(c for _, c, _ in rest_counts)
        high = max(c for _, c, _ in rest_counts)
        span = f"{low}" if low == high else f"{low}-{high}"
        head.append(f"+{n_segs} segments: {span} circuits")
    shown = list(circuits[: max(0, max_ids)])
    lines = [", ".join(shown[i : i + per]) for i in range(0, len(shown), per)]
    rest = len(circuits) - len(shown)
    if rest > 0:
        more = f"+{rest} more"
        if lines:
            lines[-1] += " " + more
        else:
            lines = [more]
    return [clean(line) for line in head + lines]


def segment_cables(
    outcomes: Sequence[CircuitOutcome], per_segment: Mapping[str, Sequence[str]]
) -> dict[str, int]:
    """Cables per segment: from the grouping where given, else one per circuit (parallel counted)."""
    parallel = {
        o.circuit_id: (o.sizing.cable.parallel if o.sizing and o.sizing.cable else 1)
        for o in outcomes
    }
    cables: dict[str, int] = {
        seg: sum(parallel.get(c, 1) for c in circuits) for seg, circuits in per_segment.items()
    }
    for o in outcomes:
        for seg, _circuits, n_cables in getattr(o.group, "segment_counts", ()) or ():
            if seg in cables:
                cables[seg] = max(cables[seg], int(n_cables))
    return cables


def _run_stretches(run: Sequence[str], marks: AnnotationInput) -> list[Any]:
    """The straight stretches of a run's segments, in drawing units."""
    k = float(marks.units_per_m)
    return [
        st
        for seg_id in run
        for st in straight_stretches(
            scaled(marks.segments[seg_id].points_m, k),
            crowd=len(marks.per_segment[seg_id]),
            key=seg_id,
        )
    ]


#: A run that gets a group tag and the stretches its tag may sit by.
TaggedRun = tuple[tuple[str, ...], list[Any]]


def tagged_runs(marks: AnnotationInput) -> list[TaggedRun]:
    """The runs that get a group tag: shared (:func:`group_runs`) and with a stretch to sit
    by, each with its stretches; worked out once per drawing (:func:`.mark_pass.add_marks`)."""
    runs = group_runs(marks.segments, marks.per_segment, min_circuits=2)
    with_stretches = ((tuple(run), _run_stretches(run, marks)) for run in runs)
    return [(run, stretches) for run, stretches in with_stretches if stretches]


def fills_under_tags(marks: AnnotationInput, group_tags: bool, select: MarkRound,
                     runs: Sequence[TaggedRun] | None = None) -> frozenset[str]:
    """Segments whose fill line goes under their run's group tag: none without group tags,
    none under a tag a repair round writes apart (:meth:`.mark_rounds.MarkRound.split`);
    ``runs`` from :func:`tagged_runs` (worked out here when not given)."""
    if not group_tags or not marks.fill_marks:
        return frozenset()
    runs = tagged_runs(marks) if runs is None else runs
    kept = [run for run, _ in runs if not select.split("group-tag", ",".join(run))]
    return fill_segment_ids(fills_by_run(kept, marks.fill_marks))


def _write_tag(w: EntityWriter, lines: Sequence[str], fills: Sequence[str], place: Placement,
               ref: str) -> list[Any]:
    """The tag's lines on the group layer and its fill lines under them on the fill layer,
    stacked in the one placed box (the fill block one line pitch below the tag's)."""
    if not fills:
        return w.block(lines, place, Mark("group", "group-tag", ref))
    pitch = w.block_box(["X", "X"])[1] - w.block_box(["X"])[1]
    a = math.radians(place.rotation_deg)
    ux, uy = -math.sin(a), math.cos(a)  # the text's up direction

    def part(shift: float, n: int) -> Placement:
        return dataclasses.replace(place, x=place.x + ux * shift, y=place.y + uy * shift,
                                   height=place.height - (len(lines) + len(fills) - n) * pitch)

    top = part(len(fills) * pitch / 2.0, len(lines))
    bottom = part(-len(lines) * pitch / 2.0, len(fills))
    return (w.block(lines, top, Mark("group", "group-tag", ref))
            + w.block(fills, bottom, Mark("fill", "group-fill", ref)))


def place_group_tags(
    w: EntityWriter, index: LabelIndex, marks: AnnotationInput, select: MarkRound | None = None,
    runs: Sequence[TaggedRun] | None = None,
) -> tuple[int, int, int]:
    """One tag per run of shared segments (see :func:`group_runs`), the fill of its over-full
    segments under it (:mod:`.group_fill`); (tags, overlapping, segments whose fill was
    written under a tag); ``select`` as in :func:`.labels.place_cable_labels`; ``runs``
    from :func:`tagged_runs` (worked out here when not given)."""
    per_segment = marks.per_segment
    h = w.height
    group_tags = overlapping = fills_written = 0
    cables = segment_cables(marks.outcomes, per_segment)
    runs = tagged_runs(marks) if runs is None else runs
    fills = fills_by_run((run for run, _ in runs), marks.fill_marks)
    sel = select or MarkRound()
    for run, stretches in runs:
        ref = ",".join(run)
        if not sel.wants("group-tag", ref):
            continue
        by_count: dict[tuple[int, int], list[str]] = defaultdict(list)
        for seg_id in run:
            n_circuits = len(set(per_segment[seg_id]))
            by_count[(n_circuits, cables.get(seg_id, n_circuits))].append(seg_id)
        counts = [(sids, nc, nk) for (nc, nk), sids in sorted(by_count.items(), reverse=True)]
        busiest = counts[0][0][0]
        circuits = list(per_segment[busiest])
        lines = group_tag_lines(
            run,
            circuits,
            counts[0][2],
            ids_per_line=w.config.ids_per_line,
            max_ids=w.config.group_tag_max_ids,
            counts=counts,
        )
        mine = () if sel.split("group-tag", ref) else fills.get(run, ())
        under = fill_lines(mine, ids_per_line=w.config.ids_per_line)
        bw, bh = w.block_box(lines + under)
        before = sel.begin(index)
        spot = place_on_route(index, rank_stretches(stretches, bw), bw, bh, h,
                              max_leader_h=GROUP_MAX_LEADER_H, key_size=lambda: key_box(w, index))
        place = spot.place
        overlapping += place.overlaps
        if spot.keyed:  # only its key fitted: the tag goes to the keyed notes list
            written = write_key(w, index, place, [(Mark("group", "group-tag", ref), lines),
                                                  (Mark("fill", "group-fill", ref), under)])
        else:
            written = _write_tag(w, lines, under, place, ref)
        sel.done(index, "group-tag", ref, before)
        if spot.leader is not None:
            draw_leader(w, place, written, Mark("group", "group-leader", run[0]))
        group_tags += 1
        fills_written += len(mine)
    return group_tags, overlapping, fills_written
