"""The drawing's own linework (walls, routes, symbols' lines) as lines our text never crosses.

One pass over modelspace; curves flattened with ezdxf's ``disassemble``; every line
that is not ours becomes a shapely geometry, for one ``STRtree``.  Block references
count with their block's lines (each block's lines are flattened once, in block
coordinates, then moved into place by each insert's matrix), dimensions with the lines
and texts ezdxf draws them with.  A polyline drawn with a constant width (a wall drawn
as a thick line) counts with its width.

References
----------
.. [1] ezdxf documentation, ``ezdxf.disassemble`` (``make_primitive``), ``Insert.matrix44``,
   ``Dimension.virtual_entities``.
.. [2] shapely 2 manual, ``STRtree``, ``shapely.transform``.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from typing import Any

import numpy as np
import shapely
from cablewright.extract.dxf_reader import block_problems
from ezdxf import disassemble
from shapely.geometry import LineString, Polygon

from .old_marks import is_ours

__all__ = ["LINE_TYPES", "drawing_linework", "linework_geometries"]

#: Entity types drawn as lines (text, hatches and points are not linework here; text
#: and symbols are keep-clear boxes, see :mod:`.obstacles`).
LINE_TYPES = frozenset({"LINE", "LWPOLYLINE", "POLYLINE", "ARC", "CIRCLE", "ELLIPSE", "SPLINE"})
#: Text drawn by a dimension: its box is an obstacle like a line.
DIM_TEXT_TYPES = frozenset({"TEXT", "MTEXT"})
#: Nested block references followed at most this deep (a deeper symbol is rare; its
#: outer box is kept clear by :mod:`.obstacles` anyway).
MAX_NESTING = 4


def _geometry(entity: Any, flatten: float) -> Any:
    """The entity in plan as a shapely line (buffered by half a constant width), or None."""
    if entity.dxftype() == "LINE":
        s, e = entity.dxf.start, entity.dxf.end
        pts = [(s[0], s[1]), (e[0], e[1])]
    else:
        prim = disassemble.make_primitive(entity, max_flattening_distance=flatten)
        pts = [(v.x, v.y) for v in prim.vertices()]
    if len(pts) < 2:
        return None
    line = LineString(pts)
    width = 0.0
    if entity.dxftype() == "LWPOLYLINE":
        width = float(entity.dxf.get("const_width", 0.0) or 0.0)
    return line.buffer(width / 2.0) if width > 0.0 else line


def _safe_geometry(entity: Any, flatten: float) -> Any:
    try:
        geom = _geometry(entity, flatten)
    except (ValueError, TypeError, ZeroDivisionError, AttributeError):  # degenerate curve
        return None
    if geom is None or geom.is_empty or not all(map(math.isfinite, geom.bounds)):
        return None
    return geom


def _text_polygon(entity: Any) -> Any:
    """A dimension's text as its box (ezdxf's text geometry), or None."""
    try:
        pts = [(v.x, v.y) for v in disassemble.make_primitive(entity).vertices()]
    except (ValueError, TypeError, AttributeError):
        return None
    if len(pts) < 3:
        return None
    poly = Polygon(pts).convex_hull
    return poly if poly.area > 0.0 else None


class _Blocks:
    """Each block's lines in block coordinates, flattened once; moved into place per insert."""

    def __init__(self, doc: Any, appid: str, flatten: float) -> None:
        self.doc = doc
        self.appid = appid
        self.flatten = flatten
        self.bad = set(block_problems(doc))
        self.cache: dict[str, list[Any]] = {}

    def local(self, name: str, depth: int) -> list[Any]:
        """The block's lines in its own coordinates (nested inserts moved into place)."""
        if name in self.cache:
            return self.cache[name]
        out: list[Any] = []
        block = self.doc.blocks.get(name)
        if block is not None and name not in self.bad:
            for e in block:
                kind = e.dxftype()
                if kind in LINE_TYPES:
                    geom = _safe_geometry(e, self.flatten)
                    if geom is not None:
                        out.append(geom)
                elif kind == "INSERT" and depth < MAX_NESTING:
                    out += self.placed(e, depth + 1)
        self.cache[name] = out
        return out

    def placed(self, insert: Any, depth: int = 0) -> list[Any]:
        """The insert's block lines in the insert's coordinates."""
        name = insert.dxf.name
        if name in self.bad:
            return []
        local = self.local(name, depth)
        if not local:
            return []
        m = np.array([list(row) for row in insert.matrix44().rows()], dtype=float)

        def move(xy: np.ndarray) -> np.ndarray:
            ones = np.zeros((len(xy), 1))
            pts = np.hstack([xy, ones, np.ones((len(xy), 1))]) @ m
            return pts[:, :2]

        return [g for g in (shapely.transform(geom, move) for geom in local)
                if all(map(math.isfinite, g.bounds))]


def linework_geometries(doc: Any, appid: str, height: float) -> list[Any]:
    """Every line of the drawing's modelspace that is not ours, as shapely geometries.

    Parameters
    ----------
    doc : ezdxf document
    appid : str
        Our XDATA application id; entities carrying it are skipped.
    height : float
        Text height [drawing units]; curves are flattened to a tenth of it.
    """
    flatten = max(height * 0.1, 1e-9)
    blocks = _Blocks(doc, appid, flatten)
    geoms: list[Any] = []
    for entity in doc.modelspace():
        kind = entity.dxftype()
        if is_ours(entity, appid):
            continue
        if kind in LINE_TYPES:
            geom = _safe_geometry(entity, flatten)
            if geom is not None:
                geoms.append(geom)
        elif kind == "INSERT":
            geoms += blocks.placed(entity)
        elif kind == "DIMENSION":
            geoms += _dimension(entity, flatten)
    return geoms


def _dimension(entity: Any, flatten: float) -> list[Any]:
    """The lines and text boxes ezdxf draws a dimension with."""
    out: list[Any] = []
    try:
        parts = list(entity.virtual_entities())
    except (ValueError, TypeError, AttributeError):  # a dimension ezdxf cannot render
        return out
    for part in parts:
        kind = part.dxftype()
        geom = (_safe_geometry(part, flatten) if kind in LINE_TYPES
                else _text_polygon(part) if kind in DIM_TEXT_TYPES else None)
        if geom is not None:
            out.append(geom)
    return out


def drawing_linework(doc: Any, appid: str, height: float,
                     extra: Iterable[Any] = ()) -> shapely.STRtree | None:
    """Every line of the drawing that is not ours, and ``extra`` geometries, in one tree.

    Parameters
    ----------
    doc : ezdxf document
    appid : str
        Our XDATA application id; entities carrying it are skipped.
    height : float
        Text height [drawing units]; curves are flattened to a tenth of it.
    extra : iterable of shapely geometries
        Further lines (the route network as measured).

    Returns
    -------
    shapely.STRtree or None
        ``None`` when there is nothing to avoid.
    """
    geoms = [g for g in extra if g is not None and not g.is_empty]
    geoms += linework_geometries(doc, appid, height)
    return shapely.STRtree(geoms) if geoms else None
