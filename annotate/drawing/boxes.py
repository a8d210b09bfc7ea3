"""Boxes on the drawing: oriented rectangles, their overlap test and the index of placed marks."""

from __future__ import annotations

import math
from typing import TYPE_CHECKING, NamedTuple

from shapely.geometry import Polygon

__all__ = ["Box", "LabelIndex", "label_polygon", "oriented_box", "bounds_box", "boxes_overlap"]


class Box(NamedTuple):
    """An oriented rectangle in plan: centre, unit x axis, half sizes, axis-aligned bounds.

    All lengths in drawing units.  The axis-aligned bounds are kept beside the
    oriented form so that the grid of :class:`LabelIndex` and the first test of
    :func:`boxes_overlap` need no trigonometry.
    """

    cx: float
    cy: float
    ux: float
    uy: float
    hw: float
    hh: float
    xmin: float
    ymin: float
    xmax: float
    ymax: float


def label_polygon(
    cx: float, cy: float, width: float, height: float, rotation_deg: float
) -> Polygon:
    """The box of a label centred on ``(cx, cy)``, turned by ``rotation_deg``.

    Examples
    --------
    >>> round(label_polygon(0, 0, 4, 2, 90).bounds[2], 9)
    1.0
    """
    a = math.radians(rotation_deg)
    ux, uy = math.cos(a), math.sin(a)
    vx, vy = -uy, ux
    hw, hh = width / 2.0, height / 2.0
    return Polygon(
        [
            (cx - ux * hw - vx * hh, cy - uy * hw - vy * hh),
            (cx + ux * hw - vx * hh, cy + uy * hw - vy * hh),
            (cx + ux * hw + vx * hh, cy + uy * hw + vy * hh),
            (cx - ux * hw + vx * hh, cy - uy * hw + vy * hh),
        ]
    )


def oriented_box(
    cx: float, cy: float, width: float, height: float, rotation_deg: float
) -> Box:
    """An oriented box: centre, unit x axis, half sizes, axis-aligned bounds (:class:`Box`).

    Examples
    --------
    >>> b = oriented_box(0, 0, 4, 2, 90)
    >>> [round(v, 9) for v in (b.xmin, b.ymin, b.xmax, b.ymax)]
    [-1.0, -2.0, 1.0, 2.0]
    """
    return _box(cx, cy, width, height, rotation_deg)


def bounds_box(xmin: float, ymin: float, xmax: float, ymax: float) -> Box:
    """The axis-aligned box ``(xmin, ymin)-(xmax, ymax)`` as an oriented :class:`Box`.

    Examples
    --------
    >>> bounds_box(0, 0, 4, 2)[:6]  # cx, cy, ux, uy, hw, hh
    (2.0, 1.0, 1.0, 0.0, 2.0, 1.0)
    """
    return _box(
        (xmin + xmax) / 2.0, (ymin + ymax) / 2.0, abs(xmax - xmin), abs(ymax - ymin), 0.0
    )


def _box(cx: float, cy: float, width: float, height: float, rotation_deg: float) -> Box:
    """An oriented box: centre, unit x axis, half sizes, axis-aligned bounds."""
    a = math.radians(rotation_deg)
    ux, uy = math.cos(a), math.sin(a)
    hw, hh = width / 2.0, height / 2.0
    ex = hw * abs(ux) + hh * abs(uy)
    ey = hw * abs(uy) + hh * abs(ux)
    return Box(cx, cy, ux, uy, hw, hh, cx - ex, cy - ey, cx + ex, cy + ey)


def boxes_overlap(a: Box, b: Box, eps: float = 0.0) -> bool:
    """True when two oriented boxes share area (touching does not count).

    Separating axis test: two convex polygons are disjoint exactly when their
    projections on some edge normal do not overlap; for rectangles the four edge
    directions suffice (Gottschalk, Lin & Manocha 1996).

    Examples
    --------
    >>> boxes_overlap(_box(0, 0, 2, 2, 0), _box(1.9, 0, 2, 2, 0))
    True
    >>> boxes_overlap(_box(0, 0, 2, 2, 0), _box(2.0, 0, 2, 2, 0))
    False
    >>> boxes_overlap(_box(0, 0, 2, 2, 45), _box(1.9, 1.9, 2, 2, 45))
    False

    References
    ----------
    .. [1] Gottschalk, S., Lin, M. C., Manocha, D. "OBBTree: a hierarchical
       structure for rapid interference detection", SIGGRAPH 1996, section 4.
    """
    if (
        a.xmax <= b.xmin + eps
        or b.xmax <= a.xmin + eps
        or a.ymax <= b.ymin + eps
        or b.ymax <= a.ymin + eps
    ):
        return False
    dx, dy = b.cx - a.cx, b.cy - a.cy
    for lx, ly in ((a.ux, a.uy), (-a.uy, a.ux), (b.ux, b.uy), (-b.uy, b.ux)):
        ra = a.hw * abs(a.ux * lx + a.uy * ly) + a.hh * abs(-a.uy * lx + a.ux * ly)
        rb = b.hw * abs(b.ux * lx + b.uy * ly) + b.hh * abs(-b.uy * lx + b.ux * ly)
        if abs(dx * lx + dy * ly) >= ra + rb - eps:
            return False
    return True


def _polygon(box: Box) -> Polygon:
    return label_polygon(
        box.cx, box.cy, 2.0 * box.hw, 2.0 * box.hh, math.degrees(math.atan2(box.uy, box.ux))
    )




if TYPE_CHECKING:
    from .mark_index import LabelIndex


def __getattr__(name: str) -> object:
    """``LabelIndex``, the index of placed marks, lives in :mod:`.mark_index` (it needs the
    boxes above); taken from there when asked for, so either module may be imported first."""
    if name == "LabelIndex":
        from .mark_index import LabelIndex

        return LabelIndex
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
