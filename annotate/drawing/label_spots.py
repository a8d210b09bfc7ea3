"""A cable label on its own route: beside a straight stretch, else tied to it by a short leader.

The rule (issue 12): a label sits along a straight stretch of the circuit's own
route, within one text height of it, crossing none of the drawing's linework,
text, symbols or our other marks.  Where no such spot is free, the label goes a
little further out and a leader of at most :data:`MAX_LEADER_H` text heights ties it
to the route.  Only when neither exists is it put beside its best stretch and
flagged as overlapping.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from shapely.geometry import LineString, Point
from shapely.ops import nearest_points

from .boxes import Box, LabelIndex, _box, _polygon
from .placement import DEFAULT_LIMITS, Placement, _along_offsets, _Search
from .stretches import Stretch

__all__ = ["MAX_LEADER_H", "RouteSpot", "place_on_route"]

#: Longest leader from a label to its route, in text heights: beyond about five the
#: reader can no longer see at a glance which line the label belongs to (issue 12:
#: "at most ~5 text heights"; our own choice of the exact figure).
MAX_LEADER_H = 5.0
#: Stretches of the own route tried: every straight stretch of a typical route
#: (a route of more than 12 stretches is tried on its 12 best, see ``rank_stretches``).
MAX_STRETCHES = 12
#: Positions tried along a stretch either way from its middle, a quarter label apart.
ALONG_STEPS = 12
#: Spots tested per label before the fallback; bounds the time per label on a
#: crowded plant.
BUDGET = 600


@dataclass(frozen=True)
class RouteSpot:
    """Where the label went and whether it needs a leader (from ``anchor`` to the box)."""

    place: Placement
    leader: LineString | None


def _leader(place: Placement) -> LineString:
    _, near = nearest_points(Point(place.anchor), place.polygon.exterior)
    return LineString([place.anchor, (near.x, near.y)])


def _leader_free(index: LabelIndex, place: Placement, box: Box) -> bool:
    """True when the leader from the route to ``box`` crosses no placed or fixed box."""
    poly = _polygon(box)
    _, near = nearest_points(Point(place.anchor), poly.exterior)
    ax, ay = place.anchor
    length = math.hypot(near.x - ax, near.y - ay)
    if length <= 0.0:
        return True
    angle = math.degrees(math.atan2(near.y - ay, near.x - ax))
    # the leader as a thin box, a hair short of both ends (it touches the box and the route)
    thin = _box((ax + near.x) / 2.0, (ay + near.y) / 2.0, 0.9 * length, 1e-6 * length, angle)
    return index._box_free(thin)


def place_on_route(index: LabelIndex, stretches: Sequence[Stretch], width: float,
                   height: float, text_height: float) -> RouteSpot:
    """Place one label (box ``width`` x ``height``) on ``stretches`` (best first).

    Parameters
    ----------
    index : LabelIndex
        Placed marks and the drawing's linework (updated with the label and its leader).
    stretches : sequence of Stretch
        The circuit's own route, best stretches first.
    width, height : float
        The label's box [drawing units].
    text_height : float
        Text height [drawing units]; the leader bound is counted in it.

    Returns
    -------
    RouteSpot
    """
    if not stretches:
        raise ValueError("no stretch to place a label on")
    search = _Search(index, width, height, DEFAULT_LIMITS)
    tried = list(stretches[:MAX_STRETCHES])
    max_gap = MAX_LEADER_H * text_height
    levels = []
    off = search.base + search.level_step
    while off - height / 2.0 <= max_gap:
        levels.append(off)
        off += search.level_step
    spot = _beside(search, tried)
    if spot is None:
        spot = _with_leader(search, tried, levels)
    if spot is None:
        spot = _rings(search, tried)
    if spot is None:
        spot = _clear_of_marks(search, tried, text_height)
    if spot is not None:
        return spot
    placed = search.fallback(tried[0])
    far = placed.polygon.distance(Point(placed.anchor)) > text_height
    return RouteSpot(placed, _leader(placed) if far else None)


def _beside(search: _Search, tried: Sequence[Stretch]) -> RouteSpot | None:
    """Pass 1: right beside the route (box edge a quarter box height off the line)."""
    budget = BUDGET
    for s in tried:
        for t in _along_offsets(s.length, search.width, max(search.width * 0.25, search.height),
                                ALONG_STEPS):
            for off in (search.base, -search.base):
                budget -= 1
                box, place = search.candidate(s, t, off)
                if search.index.is_free(box):
                    return RouteSpot(search.done(box, place), None)
        if budget < 0:
            break
    return None


def _with_leader(search: _Search, tried: Sequence[Stretch],
                 levels: Sequence[float]) -> RouteSpot | None:
    """Pass 2: further out, tied to the route by a leader of bounded length."""
    budget = BUDGET
    index = search.index
    for level in levels:
        for s in tried:
            for t in _along_offsets(s.length, search.width, max(search.width * 0.5, search.height), 3):
                for side in (level, -level):
                    budget -= 1
                    box, place = search.candidate(s, t, side)
                    if index.is_free(box) and _leader_free(index, place, box):
                        placed = search.done(box, place)
                        leader = _leader(placed)
                        index.add_line(leader)
                        return RouteSpot(placed, leader)
            if budget < 0:
                return None
    return None


#: Rings of spots tried around a stretch's middle when nothing is free beside it,
#: each a box height further out (pass 2b): a longer leader, but no crossing.
RINGS = 12


def _rings(search: _Search, tried: Sequence[Stretch]) -> RouteSpot | None:
    """Pass 2b: a horizontal spot on rings around each stretch's middle, clear of
    everything, its leader clear of every text and mark."""
    index, h = search.index, search.height
    directions = ((1, 1), (1, -1), (-1, 1), (-1, -1), (0, 1), (0, -1), (1, 0), (-1, 0))
    for ring in range(RINGS):
        r = h * (1.0 + ring)
        for s in tried[:4]:
            x, y = (s.start[0] + s.end[0]) / 2.0, (s.start[1] + s.end[1]) / 2.0
            for sx, sy in directions:
                cx = x + sx * (r + search.width / 2.0 if sx else 0.0)
                cy = y + sy * (r + h / 2.0 if sy else 0.0)
                box = _box(cx, cy, search.width, h, 0.0)
                place = Placement(cx, cy, s.z, 0.0, search.width, h, None, False, (x, y))  # type: ignore[arg-type]
                if index.is_free(box) and _leader_free(index, place, box):
                    placed = search.done(box, place)
                    leader = _leader(placed)
                    index.add_line(leader)
                    return RouteSpot(placed, leader)
    return None


def _clear_of_marks(search: _Search, tried: Sequence[Stretch], text_height: float) -> RouteSpot | None:
    """Pass 3: no spot clear of the linework: one clear of every text and mark at least,
    level by level beside the stretches (a crowded tray stacks its labels)."""
    limits = search.limits
    for off in search.offsets(limits.max_levels + limits.fallback_levels):
        for s in tried[: limits.max_stretches]:
            for t in _along_offsets(s.length, search.width, max(search.width * 0.5, search.height),
                                    limits.along_steps):
                box, place = search.candidate(s, t, off)
                if search.index._box_free(box):
                    placed = search.done(box, place)
                    far = placed.polygon.distance(Point(placed.anchor)) > text_height
                    return RouteSpot(placed, _leader(placed) if far else None)
    return None
