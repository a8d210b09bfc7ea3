"""A mark on its own route: beside a straight stretch, else tied to it by a short leader.

The rule (issue 12): a cable label sits along a straight stretch of the circuit's own
route, within one text height of it, crossing none of the drawing's linework, text,
symbols or our other marks.  Where no such spot is free, it goes further out (the
box edge at most :data:`MAX_LEADER_H` text heights from the route) and a leader ties it
to the route.  Group tags and segment ids are placed the same way on their stretches.

The search, tier by tier; within a tier every spot of one stretch is built at once and
tested against the drawing's fixed obstacles in one bulk query (:mod:`.mark_index`):

1. beside: along each stretch (best first), both sides, at :data:`BESIDE_GAPS_H`;
2. leader: further out, at :data:`LEADER_GAPS_H`, the leader clear of every text,
   symbol, mark and line; then the same with the leader allowed over a line;
3. rings: a horizontal spot around points of each stretch, box edge within the bound;
4. last resorts, counted in ``index.stats`` and reported: a spot clear of every text
   and mark but crossing a line; else beside the best stretch, overlapping.
"""

from __future__ import annotations

import dataclasses
import itertools
import logging
import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np
from shapely.geometry import LineString

from .boxes import Box, _polygon
from .leader_screen import spots_crossing_marks
from .mark_index import LabelIndex, row_box
from .placement import Placement
from .spot_arrays import ring_spots, stretch_spots
from .stretches import Point2, Stretch

__all__ = ["MAX_LEADER_H", "BESIDE_GAPS_H", "LEADER_GAPS_H", "RouteSpot", "Spot",
           "place_on_route", "stretch_spots", "ring_spots", "pick", "record"]

log = logging.getLogger(__name__)

#: Longest leader from a label to its route, in text heights: beyond about five the
#: reader can no longer see at a glance which line the label belongs to (issue 12:
#: "at most ~5 text heights"; our own choice of the exact figure).
MAX_LEADER_H = 5.0
#: Gaps between the route line and the box edge tried beside a stretch [text heights].
#: A label box has 0.35 h clear above the cap line and 0.07 h below the descender
#: (ezdxf's text box in a 1.7 h box), so with a gap of at most 0.6 h the text itself is
#: within 1 h of the route on either side: 0.25 h first (reads as belonging to the
#: line without touching it), then 0.05 h and 0.55 h to step round a neighbour.
BESIDE_GAPS_H = (0.25, 0.05, 0.55)
#: Gaps tried further out, with a leader [text heights]: half-height steps up to
#: 4.5 h, so the leader to the text stays within :data:`MAX_LEADER_H`.
LEADER_GAPS_H = (0.9, 1.4, 1.9, 2.4, 2.9, 3.4, 3.9, 4.5)
#: Stretches of the own route tried (a route of more has its best ones tried).
MAX_STRETCHES = 24
#: A leader starts this far off the route (it leaves the route line there) [text heights].
LEADER_START_H = 0.05
#: How far a leader may run into the box of a text or symbol of the drawing [text heights]:
#: the boxes carry a margin of about 0.35 h round the letters (ezdxf's text box), so a
#: leader along a tag's edge touches no letter (our own choice).
LEADER_GRAZE_H = 0.1


@dataclass(frozen=True)
class Spot:
    """One candidate: the box, the point on the route it refers to, its gap from it."""

    box: Box
    anchor: Point2
    gap: float
    z: float


#: A key's box (width, height), or a function giving it when it is needed.
KeySize = tuple[float, float] | Callable[[], tuple[float, float]]


@dataclass(frozen=True)
class RouteSpot:
    """Where the mark went and whether it needs a leader (from ``anchor`` to the box)."""

    place: Placement
    leader: LineString | None
    keyed: bool = False


def _spot(rows: np.ndarray, i: int) -> Spot:
    r = rows[i]
    return Spot(row_box(rows, i), (float(r[6]), float(r[7])), float(r[8]), float(r[9]))


def pick(index: LabelIndex, spots: np.ndarray, text_height: float, *, lines: bool = True,
         leader_lines: bool | None = True, leader_from_symbol: bool = False,
         fixed: bool = True) -> Spot | None:
    """The first spot clear of everything; with ``leader_lines`` not None, its leader
    (from the anchor to the box) clear too (of lines as well when True)."""
    if len(spots) == 0:
        return None
    accept: Callable[[int], bool] | None = None
    refused: Callable[[np.ndarray], np.ndarray] | None = None
    if leader_lines is not None:
        start = LEADER_START_H * text_height
        graze = LEADER_GRAZE_H * text_height

        def accept(i: int) -> bool:
            sp = _spot(spots, i)
            if sp.gap <= 0.0:
                return True
            near = _nearest_on_box(sp.box, sp.anchor)
            return index.leader_free(sp.anchor, near, shorten_a=start, lines=leader_lines,
                                     from_symbol=leader_from_symbol, graze=graze)

        def refused(rows: np.ndarray) -> np.ndarray:  # beside the route needs no leader
            return spots_crossing_marks(index, spots[rows], start) & (spots[rows, 8] > 0.0)

    i = index.first_free(spots, lines=lines, fixed=fixed, accept=accept, refused=refused)
    return None if i is None else _spot(spots, i)


def _nearest_on_box(box: Box, p: Point2) -> Point2:
    """The point of ``box`` nearest to ``p`` (``p`` outside the box)."""
    dx, dy = p[0] - box.cx, p[1] - box.cy
    lx = max(-box.hw, min(box.hw, dx * box.ux + dy * box.uy))
    ly = max(-box.hh, min(box.hh, -dx * box.uy + dy * box.ux))
    return (box.cx + lx * box.ux - ly * box.uy, box.cy + lx * box.uy + ly * box.ux)


def _placement(spot: Spot, overlaps: bool = False) -> Placement:
    b = spot.box
    return Placement(b.cx, b.cy, spot.z, math.degrees(math.atan2(b.uy, b.ux)), 2.0 * b.hw,
                     2.0 * b.hh, _polygon(b), overlaps, spot.anchor)


def record(index: LabelIndex, spot: Spot, text_height: float, *, leader: bool,
            how: str) -> RouteSpot:
    """Record the spot in the index (box, leader) and in the counts; the result."""
    place = _placement(spot, overlaps=how == "overlapping")
    index.add(spot.box, place.polygon)  # the same polygon, made once
    line = None
    if leader:
        near = _nearest_on_box(spot.box, spot.anchor)
        line = LineString([spot.anchor, near])
        index.add_line(line)
        index.stats.leader(line.length, text_height)
    stats = index.stats
    if how == "beside":
        stats.beside += 1
    elif how == "leader":
        stats.with_leader += 1
    elif how == "far":
        stats.beyond_reach += 1
        log.debug("mark at (%.0f, %.0f): no spot within reach; further out", spot.box.cx,
                  spot.box.cy)
    elif how == "crossing":
        stats.crossing_linework += 1
        log.debug("mark at (%.0f, %.0f): no spot clear of the drawing's lines; crossing one",
                  spot.box.cx, spot.box.cy)
    else:
        stats.overlapping += 1
        log.debug("mark at (%.0f, %.0f): no free spot; overlapping", spot.box.cx, spot.box.cy)
    return RouteSpot(place, line)


def place_on_route(index: LabelIndex, stretches: Sequence[Stretch], width: float,
                   height: float, text_height: float, *,
                   max_leader_h: float = MAX_LEADER_H, ends_first: bool = False,
                   key_size: KeySize | None = None) -> RouteSpot:
    """Place one mark (box ``width`` x ``height``) on ``stretches`` (best first).

    Parameters
    ----------
    index : LabelIndex
        Placed marks and the drawing's obstacles (updated with the mark and its leader).
    stretches : sequence of Stretch
        The route (or run, or segment), best stretches first.
    width, height : float
        The mark's box [drawing units].
    text_height : float
        Text height [drawing units]; gaps and the leader bound are counted in it.
    max_leader_h : float
        Farthest the box edge may go from the route [text heights].
    ends_first : bool
        Spots along a stretch from its ends inwards (a short mark: :func:`.spot_arrays._along`).
    key_size : (float, float) or a function giving it, optional
        The box of the mark's key (:mod:`.note_keys`), tried the same way before the
        last resorts (the function called only then).

    Returns
    -------
    RouteSpot
        ``leader`` is the line from the route to the box, or None beside the route;
        ``keyed`` True when the key was placed.

    Raises
    ------
    ValueError
        When ``stretches`` is empty.
    """
    if not stretches:
        raise ValueError("no stretch to place a label on")
    h = text_height
    tried = list(stretches[:MAX_STRETCHES])
    found = _clear_on_route(index, tried, width, height, h, max_leader_h, ends_first)
    if found is None and key_size is not None:
        key_w, key_h = key_size() if callable(key_size) else key_size
        found = _clear_on_route(index, tried, key_w, key_h, h, max_leader_h, ends_first)
        found = None if found is None else dataclasses.replace(found, keyed=True)
    if found is not None:
        return found
    out = [g * h for g in _leader_gaps(max_leader_h)]
    rings = ring_spots(_ring_points(tried, h), width, height, out)
    return _last_resort(index, tried, rings, width, height, h)


def _clear_on_route(index: LabelIndex, tried: Sequence[Stretch], width: float, height: float,
                    h: float, max_leader_h: float, ends_first: bool) -> RouteSpot | None:
    """Tiers 1-3 of :func:`place_on_route` (module docstring); None when none is free."""
    beside = [g * h for g in BESIDE_GAPS_H]
    out = [g * h for g in _leader_gaps(max_leader_h)]
    for s in tried:
        spot = pick(index, stretch_spots(s, width, height, beside, ends_first), h, leader_lines=None)
        if spot is not None:
            return record(index, spot, h, leader=False, how="beside")
    loose: Spot | None = None  # the first spot whose leader crosses a line of the drawing
    # each stretch's spots, then the rings, built only when the ones before found nothing
    arrays = itertools.chain((stretch_spots(s, width, height, out) for s in tried),
                             (ring_spots(_ring_points(tried, h), width, height, out) for _ in (0,)))
    for spots in arrays:
        spot, over_line = _pick_leader(index, spots, h, max_leader_h * h)
        if spot is not None:
            return record(index, spot, h, leader=True, how="leader")
        loose = loose or over_line
    if loose is not None:
        return record(index, loose, h, leader=True, how="leader")
    return None


def _pick_leader(index: LabelIndex, spots: np.ndarray, h: float,
                 longest: float) -> tuple[Spot | None, Spot | None]:
    """The first spot clear of everything whose leader (at most ``longest``) crosses
    nothing, and (when there is none) the first whose leader crosses a line of the drawing
    but no text or mark."""
    loose: list[Spot] = []
    start = LEADER_START_H * h

    def accept(i: int) -> bool:
        sp = _spot(spots, i)
        near = _nearest_on_box(sp.box, sp.anchor)
        if math.dist(sp.anchor, near) > longest:  # a box hanging over its stretch's end
            return False
        if index.leader_free(sp.anchor, near, shorten_a=start, lines=True):
            return True
        if not loose and index.leader_free(sp.anchor, near, shorten_a=start, lines=False):
            loose.append(sp)
        return False

    def refused(rows: np.ndarray) -> np.ndarray:  # its leader fails with lines or without
        return spots_crossing_marks(index, spots[rows], start)

    i = index.first_free(spots, accept=accept, refused=refused)
    return (None if i is None else _spot(spots, i)), (loose[0] if loose else None)


def _leader_gaps(max_leader_h: float) -> list[float]:
    """:data:`LEADER_GAPS_H`, continued in steps of one height up to ``max_leader_h`` less
    the last step's half height (the leader reaches into the box's margin)."""
    gaps = [g for g in LEADER_GAPS_H if g <= max_leader_h - 0.5]
    g = LEADER_GAPS_H[-1] + 1.0
    while g <= max_leader_h - 0.5:
        gaps.append(g)
        g += 1.0
    return gaps


def _ring_points(tried: Sequence[Stretch], h: float) -> list[tuple[float, float, float]]:
    """Ring centres: points along the stretches, about :data:`RING_STEP_H` apart, at most
    :data:`MAX_RING_POINTS`, the best stretches first."""
    pts: list[tuple[float, float, float]] = []
    for s in tried:
        n = max(1, min(8, int(s.length / (RING_STEP_H * h))))
        for k in range(n):
            f = (k + 0.5) / n
            pts.append((s.start[0] + f * (s.end[0] - s.start[0]),
                        s.start[1] + f * (s.end[1] - s.start[1]), s.z))
            if len(pts) >= MAX_RING_POINTS:
                return pts
    return pts


#: Last resort before an overlap: rings beyond the leader bound [text heights] (counted).
FAR_GAPS_H = (5.5, 7.0, 8.5, 10.0, 12.0)
#: Spacing of ring centres along a stretch [text heights] and their number at most.
RING_STEP_H = 4.0
MAX_RING_POINTS = 24


def _last_resort(index: LabelIndex, tried: Sequence[Stretch], rings: np.ndarray,
                 width: float, height: float, h: float) -> RouteSpot:
    """No spot clear of everything: one clear of text and marks (crossing a line), else
    beside the best stretch, overlapping; both counted."""
    gaps = [g * h for g in (*BESIDE_GAPS_H, *LEADER_GAPS_H)]
    for s in tried:
        spot = pick(index, stretch_spots(s, width, height, gaps), h, lines=False,
                    leader_lines=False)
        if spot is not None:
            return record(index, spot, h, leader=spot.gap > BESIDE_GAPS_H[-1] * h,
                           how="crossing")
    spot = pick(index, rings, h, lines=False, leader_lines=False)
    if spot is not None:
        return record(index, spot, h, leader=True, how="crossing")
    far = ring_spots(_ring_points(tried, h), width, height, [g * h for g in FAR_GAPS_H])
    spot = pick(index, far, h, leader_lines=False)
    if spot is not None:
        return record(index, spot, h, leader=True, how="far")
    spot = _spot(stretch_spots(tried[0], width, height, [BESIDE_GAPS_H[0] * h]), 0)
    return record(index, spot, h, leader=False, how="overlapping")
