"""The routes as straight stretches: where along a route a label may go.

Drawing units throughout; :func:`scaled` turns metres (world) into drawing units.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass

from shapely.geometry import LineString

__all__ = ["TAIL_KEYS", "Stretch", "scaled", "straight_stretches", "rank_stretches", "route_obstacles"]

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


#: Keys of stretches that are no drawn line (a circuit's straight tail from its equipment
#: to the route network): tried after every stretch of a drawn route, since a label
#: beside a line the reader cannot see reads as belonging to nothing.
TAIL_KEYS = frozenset({"source-tail", "load-tail"})


def rank_stretches(stretches: Iterable[Stretch], label_width: float) -> list[Stretch]:
    """Best stretches first: drawn routes before tails, long enough for the label, least
    crowded, longest.

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
        key=lambda s: (s.key in TAIL_KEYS, s.length < label_width, s.crowd, -s.length),
    )


def route_obstacles(polylines: Iterable[Sequence[Sequence[float]]]) -> list[LineString]:
    """Plan-view line strings of route polylines, for :class:`LabelIndex` obstacles."""
    out = []
    for pts in polylines:
        xy = [(float(p[0]), float(p[1])) for p in pts]
        if len(xy) >= 2:
            out.append(LineString(xy))
    return out
