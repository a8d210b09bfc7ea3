"""Boxes on the drawing: oriented rectangles, their overlap test and the index of placed marks."""

from __future__ import annotations

import math
from collections.abc import Iterable
from typing import Any, NamedTuple

import shapely
from shapely.geometry import Polygon
from shapely.geometry.base import BaseGeometry

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


class LabelIndex:
    """Placed label boxes in a uniform grid, plus fixed obstacles.

    Boxes are oriented rectangles; the overlap test is a separating axis test
    (:func:`boxes_overlap`) against the boxes in the grid cells a candidate
    covers, so each test looks at a few neighbours only.

    There are two kinds of fixed obstacle:

    * ``obstacles`` (route lines, in a shapely ``STRtree``): a label should
      rather not cross them, but may when nothing else is free;
    * ``blocked`` boxes (the drawing's own text and equipment symbols, in a
      second grid): a label never goes on them; they count like placed labels
      in :meth:`is_free` but not in :attr:`boxes`, :meth:`bounds` or ``len``.

    Parameters
    ----------
    cell : float
        Grid cell size [drawing units]; about a label's length works well.
    obstacles : iterable of shapely geometries, optional
        Fixed lines (other routes) a label should rather not cross.
    blocked : iterable of Box, optional
        Fixed boxes (see :func:`oriented_box`, :func:`bounds_box`) a label
        must not overlap.
    lines : shapely.STRtree, optional
        The drawing's linework (walls, routes, symbols; :mod:`.linework`) and
        our own leaders: a box that crosses one is never free.
    """

    def __init__(
        self, cell: float, obstacles: Iterable[BaseGeometry | None] = (), blocked: Iterable[Box] = (),
        lines: shapely.STRtree | None = None,
    ) -> None:
        if not cell > 0.0:
            raise ValueError(f"grid cell must be > 0, got {cell!r}")
        self.cell = float(cell)
        self._grid: dict[tuple[int, int], list[int]] = {}
        self._boxes: list[Box] = []
        self._fixed_grid: dict[tuple[int, int], list[int]] = {}
        self._fixed: list[Box] = []
        geoms = [g for g in obstacles if g is not None and not g.is_empty]
        self._obstacles = shapely.STRtree(geoms) if geoms else None
        self._eps = 1e-9 * self.cell
        self._lines = lines
        self._own_lines: list[tuple[tuple[float, float, float, float], Any]] = []
        for box in blocked:
            self.block(box)

    @property
    def blocked(self) -> tuple[Polygon, ...]:
        """Every fixed box (drawing text, symbols), as shapely polygons."""
        return tuple(_polygon(b) for b in self._fixed)

    def block(self, box: Box) -> None:
        """Record a fixed box no label may overlap (see :func:`oriented_box`)."""
        idx = len(self._fixed)
        self._fixed.append(box)
        for key in self._cells(box):
            self._fixed_grid.setdefault(key, []).append(idx)

    def __len__(self) -> int:
        return len(self._boxes)

    @property
    def boxes(self) -> tuple[Polygon, ...]:
        """Every box placed so far, as shapely polygons."""
        return tuple(_polygon(b) for b in self._boxes)

    def bounds(self) -> tuple[float, float, float, float] | None:
        """(xmin, ymin, xmax, ymax) of every box placed, ``None`` when empty."""
        if not self._boxes:
            return None
        return (
            min(b.xmin for b in self._boxes),
            min(b.ymin for b in self._boxes),
            max(b.xmax for b in self._boxes),
            max(b.ymax for b in self._boxes),
        )

    def _cells(self, box: Box) -> Iterable[tuple[int, int]]:
        c = self.cell
        for i in range(math.floor(box.xmin / c), math.floor(box.xmax / c) + 1):
            for j in range(math.floor(box.ymin / c), math.floor(box.ymax / c) + 1):
                yield (i, j)

    def add_line(self, line: object) -> None:
        """Record one of our own lines (a leader) that later boxes must not cross."""
        self._own_lines.append((line.bounds, line))  # type: ignore[attr-defined]

    def crosses_line(self, box: Box) -> bool:
        """True when ``box`` crosses the drawing's linework or one of our leaders."""
        poly = None
        if self._lines is not None:
            poly = _polygon(box)
            if len(self._lines.query(poly, predicate="intersects")) > 0:
                return True
        if self._own_lines:
            for (x0, y0, x1, y1), line in self._own_lines:
                if x1 < box.xmin or x0 > box.xmax or y1 < box.ymin or y0 > box.ymax:
                    continue
                poly = _polygon(box) if poly is None else poly
                if poly.intersects(line):
                    return True
        return False

    def is_free(self, box: Box) -> bool:
        """True when ``box`` (a :class:`Box`) shares area with no placed or fixed box
        and crosses no line of the drawing (see ``lines``)."""
        if not self._box_free(box):
            return False
        return not self.crosses_line(box)

    def _box_free(self, box: Box) -> bool:
        cells = list(self._cells(box))
        for grid, boxes in ((self._grid, self._boxes), (self._fixed_grid, self._fixed)):
            if not grid:
                continue
            seen: set[int] = set()
            for key in cells:
                for idx in grid.get(key, ()):
                    if idx in seen:
                        continue
                    seen.add(idx)
                    if boxes_overlap(box, boxes[idx], self._eps):
                        return False
        return True

    def crosses_obstacle(self, box: Box) -> bool:
        """True when ``box`` touches one of the fixed obstacles."""
        if self._obstacles is None:
            return False
        return len(self._obstacles.query(_polygon(box), predicate="intersects")) > 0

    def add(self, box: Box) -> None:
        """Record a placed box."""
        idx = len(self._boxes)
        self._boxes.append(box)
        for key in self._cells(box):
            self._grid.setdefault(key, []).append(idx)


def _polygon(box: Box) -> Polygon:
    return label_polygon(
        box.cx, box.cy, 2.0 * box.hw, 2.0 * box.hh, math.degrees(math.atan2(box.uy, box.ux))
    )


