"""Arrays of oriented boxes: rows as :class:`.boxes.Box`, shapely polygons built in bulk,
a leader as a hair-thin box (the mark index's geometry, :mod:`.mark_index`).

References
----------
.. [1] shapely 2 manual, ``shapely.from_ragged_array`` (vectorised constructors).
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from typing import Any

import numpy as np
import shapely

from .boxes import Box, _box

__all__ = ["box_polygons", "row_box", "thin_box", "tree_of"]


def row_box(rows: np.ndarray, i: int) -> Box:
    """Row ``i`` of an array of boxes (columns cx, cy, ux, uy, hw, hh, ...) as a :class:`Box`."""
    cx, cy, ux, uy, hw, hh = (float(v) for v in rows[i, :6])
    ex = hw * abs(ux) + hh * abs(uy)
    ey = hw * abs(uy) + hh * abs(ux)
    return Box(cx, cy, ux, uy, hw, hh, cx - ex, cy - ey, cx + ex, cy + ey)


def box_polygons(boxes: Sequence[Box] | np.ndarray) -> np.ndarray:
    """The boxes (a sequence of :class:`Box`, or an array whose first six columns are
    cx, cy, ux, uy, hw, hh) as shapely polygons, in one vectorised construction."""
    if len(boxes) == 0:
        return np.empty(0, dtype=object)
    a = boxes if isinstance(boxes, np.ndarray) else np.asarray([b[:6] for b in boxes], dtype=float)
    cx, cy, ux, uy, hw, hh = a[:, :6].T
    # corners centre -/+ the half axes (ux, uy) hw and (-uy, ux) hh, counter-clockwise from
    # the lower left; each product formed once (a sign flip is exact, so the corners are
    # the same floats as centre + s * u * hw + t * v * hh with s, t = +-1)
    uxw, uyw, uxh, uyh = ux * hw, uy * hw, ux * hh, uy * hh
    n = len(a)
    coords = np.empty((n, 5, 2))
    coords[:, 0, 0] = cx - uxw + uyh
    coords[:, 0, 1] = cy - uyw - uxh
    coords[:, 1, 0] = cx + uxw + uyh
    coords[:, 1, 1] = cy + uyw - uxh
    coords[:, 2, 0] = cx + uxw - uyh
    coords[:, 2, 1] = cy + uyw + uxh
    coords[:, 3, 0] = cx - uxw - uyh
    coords[:, 3, 1] = cy - uyw + uxh
    coords[:, 4] = coords[:, 0]  # each ring closed, as shapely.polygons closes it
    # one ring of five points per polygon, built from flat arrays (cheaper than
    # shapely.polygons of (n, 4, 2) corners; the same coordinates)
    ring = np.arange(n + 1)
    return shapely.from_ragged_array(
        shapely.GeometryType.POLYGON, coords.reshape(-1, 2), (5 * ring, ring))


def thin_box(a: Sequence[float], b: Sequence[float], shorten_a: float = 0.0) -> Box | None:
    """A leader from ``a`` to ``b`` as a hair-thin box, ``shorten_a`` cut off at ``a`` and a
    hair cut off at ``b`` (it touches the box it leads to); None when nothing is left."""
    dx, dy = b[0] - a[0], b[1] - a[1]
    length = math.hypot(dx, dy)
    keep = length - shorten_a - 1e-3 * length
    if keep <= 0.0:
        return None
    ux, uy = dx / length, dy / length
    s0 = shorten_a
    mx, my = a[0] + ux * (s0 + keep / 2.0), a[1] + uy * (s0 + keep / 2.0)
    return _box(mx, my, keep, 1e-6 * length, math.degrees(math.atan2(dy, dx)))


def tree_of(geoms: Iterable[Any]) -> shapely.STRtree | None:
    """An STRtree of the non-empty geometries, None when there are none."""
    items = [g for g in geoms if g is not None and not g.is_empty]
    return shapely.STRtree(items) if items else None
