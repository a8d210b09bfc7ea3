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

from shapely.geometry import LineString, Polygon

from .boxes import LabelIndex, _box, _polygon

__all__ = [
    "Stretch",
    "Placement",
    "readable_angle_deg",
    "straight_stretches",
    "rank_stretches",
    "place_along",
    "place_near_point",
    "route_obstacles",
]

Point2 = tuple[float, float]


@dataclass(frozen=True)
class Stretch:
    """A straight stretch of a route, in drawing units.

    Attributes
    ----------
    start, end : (x, y)
        End points [drawing units].
    z : float
        Mean elevation [drawing units]; labels are placed at this z.
    crowd : int
        Circuits running on this stretch (1 for a circuit's own tail).
    key : str
        What it belongs to (a segment id, ``"tail"``), for the record.
    """

    start: Point2
    end: Point2
    z: float = 0.0
    crowd: int = 1
    key: str = ""

    @property
    def length(self) -> float:
        """Plan length [drawing units]."""
        return math.hypot(self.end[0] - self.start[0], self.end[1] - self.start[1])


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



def scaled(points: Iterable[Sequence[float]], k: float) -> list[tuple[float, float, float]]:
    return [
        (float(p[0]) * k, float(p[1]) * k, (float(p[2]) if len(p) > 2 else 0.0) * k) for p in points
    ]



def straight_stretches(
    points: Sequence[Sequence[float]],
    *,
    crowd: int = 1,
    key: str = "",
    angle_tol_deg: float = 4.0,
) -> list[Stretch]:
    """Cut a polyline into straight stretches (plan view).

    Consecutive pieces whose direction stays within ``angle_tol_deg`` of the
    stretch's first piece are merged; zero-length pieces are skipped.

    Parameters
    ----------
    points : sequence of (x, y[, z])
        The polyline [drawing units].
    crowd : int
        Circuits on this polyline, stored on every stretch.
    key : str
        Stored on every stretch.
    angle_tol_deg : float
        Largest turn still counted as straight [degrees].

    Returns
    -------
    list of Stretch

    Examples
    --------
    >>> [round(s.length, 3) for s in straight_stretches([(0, 0), (1, 0), (2, 0.01), (2, 5)])]
    [2.0, 4.99]
    """
    pts = [(float(p[0]), float(p[1]), float(p[2]) if len(p) > 2 else 0.0) for p in points]
    pieces = []
    for a, b in zip(pts, pts[1:], strict=False):
        if math.hypot(b[0] - a[0], b[1] - a[1]) > 1e-9:
            pieces.append((a, b))
    out: list[Stretch] = []
    cos_tol = math.cos(math.radians(angle_tol_deg))
    i = 0
    while i < len(pieces):
        a0, b0 = pieces[i]
        ux, uy = b0[0] - a0[0], b0[1] - a0[1]
        n = math.hypot(ux, uy)
        ux, uy = ux / n, uy / n
        j = i + 1
        while j < len(pieces):
            a, b = pieces[j]
            if math.hypot(a[0] - pieces[j - 1][1][0], a[1] - pieces[j - 1][1][1]) > 1e-9:
                break  # a gap: not one straight stretch
            vx, vy = b[0] - a[0], b[1] - a[1]
            m = math.hypot(vx, vy)
            if (ux * vx + uy * vy) / m < cos_tol:
                break
            j += 1
        start, end = pieces[i][0], pieces[j - 1][1]
        zs = [p[0][2] for p in pieces[i:j]] + [end[2]]
        out.append(
            Stretch((start[0], start[1]), (end[0], end[1]), sum(zs) / len(zs), crowd=crowd, key=key)
        )
        i = j
    return out


def rank_stretches(stretches: Iterable[Stretch], label_width: float) -> list[Stretch]:
    """Best stretches first: long enough for the label, least crowded, longest.

    Examples
    --------
    >>> a = Stretch((0, 0), (10, 0), crowd=3)
    >>> b = Stretch((0, 0), (6, 0), crowd=1)
    >>> c = Stretch((0, 0), (2, 0), crowd=1)
    >>> [s.length for s in rank_stretches([a, b, c], 5.0)]
    [6.0, 10.0, 2.0]
    """
    return sorted(
        stretches,
        key=lambda s: (s.length < label_width, s.crowd, -s.length),
    )


def _along_offsets(length: float, width: float, step: float, max_steps: int) -> list[float]:
    """Centre positions from the stretch middle, nudged both ways, kept on the stretch."""
    room = max(0.0, (length - width) / 2.0)
    offs = [0.0]
    k = 1
    while k <= max_steps and k * step <= room + 1e-9:
        offs.extend((k * step, -k * step))
        k += 1
    return offs


def place_along(
    index: LabelIndex,
    stretches: Sequence[Stretch],
    width: float,
    height: float,
    *,
    gap: float | None = None,
    level_step: float | None = None,
    max_levels: int = 5,
    max_stretches: int = 4,
    along_steps: int = 3,
    fallback_levels: int = 10,
    max_candidates: int = 160,
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
    gap : float, optional
        Clear space between the route line and the label [drawing units];
        default a quarter of ``height``.
    level_step : float, optional
        Sideways step from one level to the next [drawing units]; default
        1.25 x ``height``.
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
    gap = height * 0.25 if gap is None else gap
    level_step = height * 1.25 if level_step is None else level_step
    base = height / 2.0 + gap
    tried = list(stretches[:max_stretches])

    def candidate(s: Stretch, t: float, off: float) -> tuple[tuple, Placement]:
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
            None,
            False,
            (mx, my),  # type: ignore[arg-type]
        )

    def offsets(levels: int) -> Iterable[float]:
        for level in range(levels):
            d = base + level * level_step
            yield d
            yield -d

    def done(box: tuple, place: Placement, overlaps: bool = False) -> Placement:
        index.add(box)
        return Placement(
            place.x,
            place.y,
            place.z,
            place.rotation_deg,
            width,
            height,
            _polygon(box),
            overlaps,
            place.anchor,
        )

    crossing: tuple[tuple, Placement] | None = None  # first free spot that crosses a route
    budget = max(1, max_candidates)
    for s in tried:
        along = _along_offsets(s.length, width, max(width * 0.5, height), along_steps)
        for off in offsets(max_levels):
            for t in along:
                budget -= 1
                if budget < 0:
                    break
                box, place = candidate(s, t, off)
                if not index.is_free(box):
                    continue
                if index.crosses_obstacle(box):
                    if crossing is None:
                        crossing = (box, place)
                    continue
                return done(box, place)
    if crossing is not None:
        return done(*crossing)
    best = tried[0]
    for off in offsets(max_levels + fallback_levels):
        if abs(off) < base + max_levels * level_step - 1e-9:
            continue  # tried above
        box, place = candidate(best, 0.0, off)
        if index.is_free(box):
            return done(box, place)
    # nothing free: beside the best stretch, flagged
    return done(*candidate(best, 0.0, base), overlaps=True)


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


def route_obstacles(polylines: Iterable[Sequence[Sequence[float]]]) -> list[LineString]:
    """Plan-view line strings of route polylines, for :class:`LabelIndex` obstacles."""
    out = []
    for pts in polylines:
        xy = [(float(p[0]), float(p[1])) for p in pts]
        if len(xy) >= 2:
            out.append(LineString(xy))
    return out
