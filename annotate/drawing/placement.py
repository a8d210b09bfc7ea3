"""Label placement geometry: where a label goes so that it reads well and overlaps nothing.

Pure geometry in drawing units (no ezdxf here).  A label is a rotated rectangle
(a shapely polygon) centred on a point.  Placed labels are kept in a uniform grid
so that each overlap test looks at a few neighbours only; route lines, which do
not change while placing, sit in a shapely ``STRtree``.

Placement of a label along a route:

1. the route is cut into straight stretches (consecutive pieces within a small
   angle of each other are merged, so a flattened arc counts as a few stretches);
2. stretches are ranked: those long enough for the label first, then the least
   crowded (fewest circuits on that stretch), then the longest;
3. on each stretch the label is tried at its middle, then nudged along the
   stretch, then offset sideways, level by level, alternating sides;
4. a first pass also keeps the label off other route lines; a second pass only
   keeps it off other labels; if still nothing is free, the label is put beside
   its best stretch as far out as the last level allowed and flagged.

References
----------
.. [1] shapely 2 manual, ``STRtree.query`` and ``box``/affinity (general-purpose
   geometry library).
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass

from shapely.geometry import Polygon

from .boxes import Box, LabelIndex, _box, _polygon
from .stretches import Point2, Stretch

__all__ = ["Placement", "SearchLimits", "readable_angle_deg", "place_along", "place_near_point"]


@dataclass(frozen=True)
class Placement:
    """Where a label went.

    Attributes
    ----------
    x, y, z : float
        Centre of the label [drawing units].
    rotation_deg : float
        Text rotation, counter-clockwise from +x [degrees], in (-90, 90].
    width, height : float
        Size of the label box [drawing units].
    polygon : shapely.Polygon
        The label box as placed.
    overlaps : bool
        True when no free spot was found and the label overlaps another.
    anchor : (x, y)
        The point it labels (a route point or an equipment point).
    """

    x: float
    y: float
    z: float
    rotation_deg: float
    width: float
    height: float
    polygon: Polygon
    overlaps: bool = False
    anchor: Point2 = (0.0, 0.0)


def readable_angle_deg(dx: float, dy: float) -> float:
    """Direction of ``(dx, dy)`` folded so that text along it is never upside down.

    Parameters
    ----------
    dx, dy : float
        A direction [any unit].

    Returns
    -------
    float
        Angle in (-90, 90] [degrees]; a vertical direction gives 90 (read from
        below, the usual drawing convention).

    Examples
    --------
    >>> readable_angle_deg(-1.0, 0.0)
    0.0
    >>> readable_angle_deg(0.0, -1.0)
    90.0
    >>> round(readable_angle_deg(-1.0, -1.0), 6)
    45.0
    """
    angle = math.degrees(math.atan2(dy, dx))
    if angle > 90.0 + 1e-9:
        angle -= 180.0
    elif angle <= -90.0 + 1e-9:
        angle += 180.0
    return 0.0 if abs(angle) < 1e-12 else angle



def _along_offsets(length: float, width: float, step: float, max_steps: int) -> list[float]:
    """Centre positions from the stretch middle, nudged both ways, kept on the stretch."""
    room = max(0.0, (length - width) / 2.0)
    offs = [0.0]
    k = 1
    while k <= max_steps and k * step <= room + 1e-9:
        offs.extend((k * step, -k * step))
        k += 1
    return offs


@dataclass(frozen=True)
class SearchLimits:
    """How far :func:`place_along` searches for a free spot (our own choices).

    Attributes
    ----------
    gap_h : float
        Clear space between the route line and the label, in label heights
        (a quarter: the label reads as belonging to the line without touching it).
    level_step_h : float
        Sideways step from one level to the next, in label heights (1.25: a
        quarter height clear between two labels stacked beside one route).
    max_levels : int
        Sideways levels tried per side in the normal passes.
    max_stretches : int
        How many of the best stretches to try.
    along_steps : int
        Nudges along the stretch per direction.
    fallback_levels : int
        Sideways levels tried on the best stretch when the normal passes fail.
    max_candidates : int
        Spots tested in the normal passes before going to the fallback; on a
        crowded drawing this bounds the time per label.
    """

    gap_h: float = 0.25
    level_step_h: float = 1.25
    max_levels: int = 5
    max_stretches: int = 4
    along_steps: int = 3
    fallback_levels: int = 10
    max_candidates: int = 160


DEFAULT_LIMITS = SearchLimits()


def place_along(
    index: LabelIndex,
    stretches: Sequence[Stretch],
    width: float,
    height: float,
    limits: SearchLimits = DEFAULT_LIMITS,
) -> Placement:
    """Place a label along the best free spot of ``stretches`` and record it.

    Parameters
    ----------
    index : LabelIndex
        Placed labels (updated) and obstacles.
    stretches : sequence of Stretch
        Candidate stretches, best first (see :func:`rank_stretches`).
    width, height : float
        Label box [drawing units].
    limits : SearchLimits
        Gap, level step and how many spots to try.

    Returns
    -------
    Placement

    Raises
    ------
    ValueError
        When ``stretches`` is empty.
    """
    if not stretches:
        raise ValueError("no stretch to place a label on")
    search = _Search(index, width, height, limits)
    tried = list(stretches[: limits.max_stretches])
    found = search.normal_passes(tried)
    if found is not None:
        return search.done(*found)
    return search.fallback(tried[0])


class _Search:
    """One label's search along stretches: the spots, the passes and the record."""

    def __init__(self, index: LabelIndex, width: float, height: float, limits: SearchLimits):
        self.index = index
        self.width = width
        self.height = height
        self.limits = limits
        gap = height * limits.gap_h
        self.level_step = height * limits.level_step_h
        self.base = height / 2.0 + gap

    def candidate(self, s: Stretch, t: float, off: float) -> tuple[Box, Placement]:
        """The spot ``t`` along the stretch from its middle, ``off`` beside it."""
        width, height = self.width, self.height
        dx, dy = s.end[0] - s.start[0], s.end[1] - s.start[1]
        n = math.hypot(dx, dy)
        ux, uy = dx / n, dy / n
        rot = readable_angle_deg(dx, dy)
        # "up" as the text reads it: the text's own y axis
        a = math.radians(rot)
        vx, vy = -math.sin(a), math.cos(a)
        mx, my = (s.start[0] + s.end[0]) / 2.0 + ux * t, (s.start[1] + s.end[1]) / 2.0 + uy * t
        cx, cy = mx + vx * off, my + vy * off
        return _box(cx, cy, width, height, rot), Placement(
            cx,
            cy,
            s.z,
            rot,
            width,
            height,
            None,  # type: ignore[arg-type]  # a candidate: done() gives it its polygon
            False,
            (mx, my),
        )

    def offsets(self, levels: int) -> Iterable[float]:
        """Sideways offsets, level by level, alternating sides."""
        for level in range(levels):
            d = self.base + level * self.level_step
            yield d
            yield -d

    def done(self, box: Box, place: Placement, overlaps: bool = False) -> Placement:
        """Record the box in the index; the placement with its polygon."""
        self.index.add(box)
        return Placement(
            place.x,
            place.y,
            place.z,
            place.rotation_deg,
            self.width,
            self.height,
            _polygon(box),
            overlaps,
            place.anchor,
        )

    def normal_passes(self, tried: Sequence[Stretch]) -> tuple[Box, Placement] | None:
        """The first free spot off route lines, else the first free one crossing a route."""
        index, limits = self.index, self.limits
        crossing: tuple[Box, Placement] | None = None  # first free spot that crosses a route
        budget = max(1, limits.max_candidates)
        for s in tried:
            along = _along_offsets(
                s.length, self.width, max(self.width * 0.5, self.height), limits.along_steps
            )
            for off in self.offsets(limits.max_levels):
                for t in along:
                    budget -= 1
                    if budget < 0:
                        break
                    box, place = self.candidate(s, t, off)
                    if not index.is_free(box):
                        continue
                    if index.crosses_obstacle(box):
                        if crossing is None:
                            crossing = (box, place)
                        continue
                    return box, place
        return crossing

    def fallback(self, best: Stretch) -> Placement:
        """Further out beside the best stretch; if nothing is free, beside it, flagged."""
        limits = self.limits
        for off in self.offsets(limits.max_levels + limits.fallback_levels):
            if abs(off) < self.base + limits.max_levels * self.level_step - 1e-9:
                continue  # tried above
            box, place = self.candidate(best, 0.0, off)
            if self.index.is_free(box):
                return self.done(box, place)
        # nothing free: beside the best stretch, flagged
        return self.done(*self.candidate(best, 0.0, self.base), overlaps=True)


def place_near_point(
    index: LabelIndex,
    x: float,
    y: float,
    z: float,
    width: float,
    height: float,
    *,
    first_radius: float | None = None,
    rings: int = 8,
) -> Placement:
    """Place a horizontal note near a point (for a leader), clear of other labels.

    Spots are tried on rings of growing radius, eight directions each, the
    upper right first.

    Parameters
    ----------
    index : LabelIndex
    x, y, z : float
        The point the note refers to [drawing units].
    width, height : float
        Note box [drawing units].
    first_radius : float, optional
        Distance from the point to the nearest box edge on the first ring
        [drawing units]; default 1.5 x ``height``.
    rings : int
        Rings tried before giving up (the note is then flagged as overlapping).

    Returns
    -------
    Placement
        ``anchor`` is the point; the note's box does not contain it.
    """
    r0 = height * 1.5 if first_radius is None else first_radius
    directions = [(1, 1), (1, -1), (-1, 1), (-1, -1), (0, 1), (0, -1), (1, 0), (-1, 0)]
    for ring in range(rings):
        r = r0 + ring * height * 1.5
        for sx, sy in directions:
            cx = x + sx * (r + width / 2.0 if sx else 0.0)
            cy = y + sy * (r + height / 2.0 if sy else 0.0)
            box = _box(cx, cy, width, height, 0.0)
            if index.is_free(box):
                index.add(box)
                return Placement(cx, cy, z, 0.0, width, height, _polygon(box), False, (x, y))
    cx, cy = x + r0 + width / 2.0, y + r0 + height / 2.0
    box = _box(cx, cy, width, height, 0.0)
    index.add(box)
    return Placement(cx, cy, z, 0.0, width, height, _polygon(box), True, (x, y))
