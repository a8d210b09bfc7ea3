"""Candidate spots of a mark as arrays: boxes along a stretch, and rings round a point.

Each row is one candidate box (centre, unit x axis, half sizes), the point it refers to
(where a leader leaves the route), its gap from it and its elevation (:data:`COLUMNS`);
an array is tested in bulk by :mod:`.mark_index` and picked from in order by
:mod:`.label_spots`.  Plain numpy geometry, our own rules (issue 12).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from .placement import readable_angle_deg
from .stretches import Stretch

__all__ = ["COLUMNS", "MAX_ALONG", "OVERHANG", "ring_spots", "stretch_spots"]

#: Positions along one stretch at most, spread evenly from its middle outwards.
MAX_ALONG = 24
#: Share of a box's width that may hang over a stretch's end, or for a box longer than
#: its stretch, share of the stretch it may leave uncovered (0.3: at least 70 % of the
#: label, or of the stretch, run beside each other; our own choice).
OVERHANG = 0.3
#: Columns of a candidate array: box (centre, unit x axis, half sizes), anchor, gap, z.
COLUMNS = ("cx", "cy", "ux", "uy", "hw", "hh", "ax", "ay", "gap", "z")


def _along(length: float, width: float, height: float, ends_first: bool = False) -> list[float]:
    """Centre positions from the stretch middle outwards, hanging over its ends by up to
    :data:`OVERHANG` of the width (a free route end, a label longer than the stretch);
    ``ends_first``: from the two ends inwards, the box kept within the stretch."""
    # a box longer than its stretch keeps 1 - OVERHANG of the stretch beside it (a label
    # hanging far over a short stretch's end reads as belonging to the next line)
    reach = abs(length - width) / 2.0 + OVERHANG * min(width, length)
    step = max(height, 2.0 * reach / MAX_ALONG)
    out = [0.0]
    k = 1
    while k * step <= reach + 1e-9:
        out += [k * step, -k * step]
        k += 1
    if out[-1] < reach - 1e-9:  # the two ends, so a label reaches a free end of the stretch
        out += [reach, -reach]
    if ends_first:  # a short mark (a segment id) leaves the middle to the long labels
        inner = max(0.0, length - width) / 2.0
        return sorted({math.copysign(min(abs(t), inner), t) for t in out}, key=lambda t: (-abs(t), -t))
    return out


def stretch_spots(s: Stretch, width: float, height: float, gaps: Sequence[float], ends_first: bool = False) -> np.ndarray:
    """Boxes along ``s`` on both sides at each gap (drawing units), best first: gap by gap,
    along as :func:`_along` orders, the side above the text first.

    Returns an array of rows ``cx, cy, ux, uy, hw, hh, ax, ay, gap, z`` (:data:`COLUMNS`).
    """
    dx, dy = s.end[0] - s.start[0], s.end[1] - s.start[1]
    n = math.hypot(dx, dy)
    if n <= 0.0 or not gaps:
        return np.empty((0, len(COLUMNS)))
    ux, uy = dx / n, dy / n
    a = math.radians(readable_angle_deg(dx, dy))
    vx, vy = -math.sin(a), math.cos(a)
    mx, my = (s.start[0] + s.end[0]) / 2.0, (s.start[1] + s.end[1]) / 2.0
    t = np.asarray(_along(n, width, height, ends_first))
    g = np.asarray(gaps, dtype=float)
    off = (height / 2.0 + g)[:, None, None] * np.array([1.0, -1.0])[None, None, :]  # (G, 1, 2)
    px = (mx + ux * t)[None, :, None]
    py = (my + uy * t)[None, :, None]
    # the anchor (where a leader leaves the route) on the stretch itself, also for a box
    # hanging over the stretch's end
    ta = np.clip(t, -n / 2.0, n / 2.0)
    # each column assigned by broadcasting (no broadcast copies made first)
    rows = np.empty((len(g), len(t), 2, len(COLUMNS)))
    rows[..., 0] = px + vx * off
    rows[..., 1] = py + vy * off
    rows[..., 2] = math.cos(a)
    rows[..., 3] = math.sin(a)
    rows[..., 4] = width / 2.0
    rows[..., 5] = height / 2.0
    rows[..., 6] = (mx + ux * ta)[None, :, None]
    rows[..., 7] = (my + uy * ta)[None, :, None]
    rows[..., 8] = g[:, None, None]
    rows[..., 9] = s.z
    return rows.reshape(-1, len(COLUMNS))


def ring_spots(points: Sequence[tuple[float, float, float]], width: float, height: float,
               gaps: Sequence[float], directions: int = 16) -> np.ndarray:
    """Horizontal boxes round each point, the nearest box edge ``gap`` from it, ring by ring
    (rows as :func:`stretch_spots`)."""
    if not points or not gaps:
        return np.empty((0, len(COLUMNS)))
    ang = 2.0 * np.pi * np.arange(directions) / directions
    c, sn = np.cos(ang), np.sin(ang)
    with np.errstate(divide="ignore"):
        reach = np.minimum(np.where(np.abs(c) > 1e-9, width / 2.0 / np.abs(c), np.inf),
                           np.where(np.abs(sn) > 1e-9, height / 2.0 / np.abs(sn), np.inf))
    pts = np.asarray(points, dtype=float)  # (P, 3)
    g = np.asarray(gaps, dtype=float)
    d = g[:, None, None] + reach[None, None, :]  # (G, 1, D)
    rows = np.empty((len(g), len(pts), directions, len(COLUMNS)))
    rows[..., 0] = pts[None, :, 0, None] + c * d
    rows[..., 1] = pts[None, :, 1, None] + sn * d
    rows[..., 2] = 1.0
    rows[..., 3] = 0.0
    rows[..., 4] = width / 2.0
    rows[..., 5] = height / 2.0
    rows[..., 6] = pts[None, :, 0, None]
    rows[..., 7] = pts[None, :, 1, None]
    rows[..., 8] = g[:, None, None]
    rows[..., 9] = pts[None, :, 2, None]
    return rows.reshape(-1, len(COLUMNS))
