"""Leaders drawn to the text itself: from the route (or equipment point) to the text's box.

Our mark boxes hold a margin round the text; a leader that stopped at the box edge would
end short of the text.  The text's own box is what ezdxf gives for the written entity
(``ezdxf.disassemble.make_primitive``; an MTEXT's from ``ezdxf.tools.text_size``), so the
leader meets the letters' box.

References
----------
.. [1] ezdxf documentation, ``ezdxf.disassemble.make_primitive``.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Sequence
from typing import Any

from ezdxf import disassemble
from ezdxf.tools import text_size
from shapely.geometry import LineString, MultiPoint, Polygon

from .entities import EntityWriter, Mark
from .placement import Placement

__all__ = ["text_outline", "draw_leader"]


def _mtext_corners(entity: Any) -> list[tuple[float, float]]:
    """An MTEXT's box corners from ezdxf's measure (``text_size.mtext_size``), placed by its
    attachment point and rotation (``make_primitive`` wraps a column width of 0 at every
    word, where the DXF reference means no wrapping)."""
    size = text_size.mtext_size(entity)
    w, h = size.total_width, size.total_height
    ap = int(entity.dxf.get("attachment_point", 1))
    x0, y1 = -w * ((ap - 1) % 3) / 2.0, h * ((ap - 1) // 3) / 2.0
    a = math.radians(entity.get_rotation())
    c, s = math.cos(a), math.sin(a)
    ins = entity.dxf.insert
    return [(ins[0] + c * x - s * y, ins[1] + s * x + c * y)
            for x, y in ((x0, y1 - h), (x0 + w, y1 - h), (x0 + w, y1), (x0, y1))]


def text_outline(entities: Sequence[Any]) -> Polygon | None:
    """The convex hull of the written texts' boxes in plan, None when there is none."""
    pts = []
    for entity in entities:
        if entity.dxftype() == "MTEXT":
            pts += _mtext_corners(entity)
            continue
        try:
            prim = disassemble.make_primitive(entity)
        except (ValueError, TypeError, AttributeError):  # pragma: no cover - text without a box
            continue
        pts += [(v.x, v.y) for v in prim.vertices()]
    if len(pts) < 3:
        return None
    hull = MultiPoint(pts).convex_hull
    return hull if isinstance(hull, Polygon) and hull.area > 0.0 else None


def draw_leader(w: EntityWriter, place: Placement, entities: Sequence[Any], mark: Mark) -> LineString:
    """A leader from ``place.anchor`` to the nearest point of the written text's box."""
    outline = text_outline(entities)
    target = place if outline is None else dataclasses.replace(place, polygon=outline)
    return w.leader(target, place.z, mark)
