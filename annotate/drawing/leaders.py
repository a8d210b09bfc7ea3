"""Leaders drawn to the text itself: from the route (or equipment point) to the text's box.

Our mark boxes hold a margin round the text; a leader that stopped at the box edge would
end short of the text.  The text's own box is what ezdxf gives for the written entity
(``ezdxf.disassemble.make_primitive``; an MTEXT's from ``ezdxf.tools.text_size``), so the
leader meets the letters' box.

An MTEXT of plain lines (no inline codes) is measured without ezdxf's full layout: its
width is the column width the layout is given (ezdxf's ``estimate_mtext_extents``, the same
call), and its height depends only on the number of lines, so it is measured by the layout
once per line count, style and height (``EntityWriter.mtext_heights``) - the same numbers,
``tests/test_leader_outline.py``.

References
----------
.. [1] ezdxf documentation, ``ezdxf.disassemble.make_primitive``.
"""

from __future__ import annotations

import dataclasses
import math
import re
from collections.abc import Sequence
from typing import Any

from ezdxf import disassemble
from ezdxf.tools import text_size
from ezdxf.tools.text import estimate_mtext_extents
from shapely.geometry import LineString, MultiPoint, Polygon

from .entities import EntityWriter, Mark
from .placement import Placement

__all__ = ["text_outline", "draw_leader"]

#: Characters that start an inline code, a special character or a caret code in MTEXT
#: content (DXF reference, MTEXT inline codes); a note holding one is measured by ezdxf.
_CODES = re.compile(r"\\(?!P)|[{}^\t\n\r\u00a0]|%%|  |^ | $|^\\P|\\P |  ?\\P|\\P\\P|\\P$")


def _mtext_size(entity: Any, heights: dict[tuple, float] | None) -> tuple[float, float]:
    """(total width, total height) of an MTEXT as ``text_size.mtext_size`` gives them.

    ``heights`` holds the heights of plain notes measured by ezdxf's layout, by (style, char
    height, line spacing, line count): a plain note's lines are never wrapped (its column
    is as wide as its widest line, with ezdxf's 1 % to spare) and every line is one text
    height high, so its height does not depend on its words; its width is the column's."""
    content = entity.text
    dxf = entity.dxf
    plain = (content and not _CODES.search(content) and dxf.get("width", 0.0) < 1e-6
             and not entity.has_columns)
    if heights is None or not plain:
        size = text_size.mtext_size(entity)
        return size.total_width, size.total_height
    key = (dxf.get_default("style"), dxf.get_default("char_height"),
           dxf.get_default("line_spacing_factor"), dxf.get_default("line_spacing_style"),
           content.count("\\P"))
    h = heights.get(key)
    if h is None:
        size = text_size.mtext_size(entity)
        heights[key] = h = size.total_height
        return size.total_width, h
    return estimate_mtext_extents(entity)[0], h  # the layout's column width


def _mtext_corners(entity: Any, heights: dict[tuple, float] | None = None) -> list[tuple[float, float]]:
    """An MTEXT's box corners from ezdxf's measure (``text_size.mtext_size``, or for a plain
    note through ``heights``), placed by its attachment point and rotation
    (``make_primitive`` wraps a column width of 0 at every word, where the DXF reference
    means no wrapping)."""
    w, h = _mtext_size(entity, heights)
    ap = int(entity.dxf.get("attachment_point", 1))
    x0, y1 = -w * ((ap - 1) % 3) / 2.0, h * ((ap - 1) // 3) / 2.0
    a = math.radians(entity.get_rotation())
    c, s = math.cos(a), math.sin(a)
    ins = entity.dxf.insert
    return [(ins[0] + c * x - s * y, ins[1] + s * x + c * y)
            for x, y in ((x0, y1 - h), (x0 + w, y1 - h), (x0 + w, y1), (x0, y1))]


def text_outline(entities: Sequence[Any], heights: dict[tuple, float] | None = None) -> Polygon | None:
    """The convex hull of the written texts' boxes in plan, None when there is none
    (``heights``: the plain notes' heights measured so far, filled as they are measured)."""
    pts = []
    for entity in entities:
        if entity.dxftype() == "MTEXT":
            pts += _mtext_corners(entity, heights)
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
    outline = text_outline(entities, w.mtext_heights)
    target = place if outline is None else dataclasses.replace(place, polygon=outline)
    return w.leader(target, place.z, mark)
