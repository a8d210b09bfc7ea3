"""The drawing's own linework (walls, routes, symbols' lines) as lines our text never crosses.

One pass over modelspace with ezdxf's ``disassemble`` (curves flattened); every line that is not ours becomes a shapely geometry in one
``STRtree``, so a candidate spot for a label is tested against its neighbours only.
A polyline drawn with a constant width (a wall drawn as a thick line) counts with its
width.

References
----------
.. [1] ezdxf documentation, ``ezdxf.disassemble`` (``make_primitive``).
.. [2] shapely 2 manual, ``STRtree.query(..., predicate="intersects")``.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from typing import Any

import shapely
from ezdxf import disassemble
from shapely.geometry import LineString

from .old_marks import is_ours

__all__ = ["LINE_TYPES", "drawing_linework"]

#: Entity types drawn as lines (text, hatches, points and dimensions are not linework here;
#: text and symbols are keep-clear boxes, see :mod:`.obstacles`).
LINE_TYPES = frozenset({"LINE", "LWPOLYLINE", "POLYLINE", "ARC", "CIRCLE", "ELLIPSE", "SPLINE"})


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
    flatten = max(height * 0.1, 1e-9)
    # modelspace only: block references (symbols) are keep-clear boxes (:mod:`.obstacles`),
    # and a damaged block (one inserting itself) must not be walked here
    for entity in doc.modelspace():
        if entity.dxftype() not in LINE_TYPES or is_ours(entity, appid):
            continue
        try:
            geom = _geometry(entity, flatten)
        except (ValueError, TypeError, ZeroDivisionError):  # degenerate curve: nothing to avoid
            continue
        if geom is not None and not geom.is_empty and all(map(math.isfinite, geom.bounds)):
            geoms.append(geom)
    return shapely.STRtree(geoms) if geoms else None
