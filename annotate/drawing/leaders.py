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

import math
import re
from collections.abc import Sequence
from typing import Any

import shapely
from ezdxf import disassemble
from ezdxf.tools import text_size
from ezdxf.tools.text import estimate_mtext_extents
from shapely.geometry import LineString, Point, Polygon
from shapely.ops import nearest_points

from .entities import EntityWriter, Mark
from .placement import Placement

#: How far a drawn leader may part from the tested one where it meets the mark's box [text
#: heights]: the margin our boxes keep above and below a note (0.35 h,
#: :data:`.style.NOTE_MARGIN_H`), as a leader to a text's corner parts from one to its box's
#: corner; a group tag's cut hull parts by metres (our own choice).
LEADER_PLAY_H = 0.35
#: How far the tested line may be carried on into the mark's box to meet its text [text
#: heights]: through a corner's margins at a slant (our own choice; further, and the
#: leader ends at the box, short of the text).
LEADER_INSIDE_H = 2.0

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
    hull = shapely.multipoints(pts).convex_hull  # as MultiPoint(pts), built in one call
    return hull if isinstance(hull, Polygon) and hull.area > 0.0 else None


def leader_end(place: Placement, outline: Polygon | None, tolerance: float,
               inside: float) -> tuple[float, float]:
    """Where a leader from ``place.anchor`` ends, on the written text's ``outline``.

    The search tested the leader from the anchor to the nearest point of the mark's box
    (:func:`.label_spots.record`); outside the box the drawn leader keeps to that line, or
    it could cross a mark the search saw clear of it (a group tag over a wider fill block:
    the hull's corner is cut, far from the box's).  So the leader ends at the outline's
    point nearest to the anchor when that line meets the box within ``tolerance`` of the
    tested one (straight lines from one point part the most where they meet the box);
    else where the tested line, carried on into the box at most ``inside``, meets the
    outline; else at the tested line's own end on the box.
    """
    anchor = Point(place.anchor)
    box = place.polygon
    _, searched = nearest_points(anchor, box.exterior)
    if outline is None:
        return (searched.x, searched.y)
    ax, ay = place.anchor
    tested = LineString([(ax, ay), (searched.x, searched.y)])
    _, end = nearest_points(anchor, outline.exterior)
    meets = LineString([(ax, ay), (end.x, end.y)]).intersection(box.exterior)
    met = end if meets.is_empty else nearest_points(anchor, meets)[1]
    if met.distance(tested) <= tolerance:
        return (end.x, end.y)
    length = tested.length
    if length > 0.0:
        reach = 1.0 + 2.0 * box.length / length  # past the far side of the box
        ray = LineString([(ax, ay), (ax + (searched.x - ax) * reach, ay + (searched.y - ay) * reach)])
        hits = ray.intersection(outline.exterior)
        if not hits.is_empty:
            _, first = nearest_points(anchor, hits)
            if first.distance(searched) <= inside:
                return (first.x, first.y)
    return (searched.x, searched.y)


def draw_leader(w: EntityWriter, place: Placement, entities: Sequence[Any], mark: Mark) -> LineString:
    """A leader from ``place.anchor`` to the written text's box, along the leader the search
    tested (:func:`leader_end`)."""
    outline = text_outline(entities, w.mtext_heights)
    end = leader_end(place, outline, LEADER_PLAY_H * w.height, LEADER_INSIDE_H * w.height)
    return w.leader(place, place.z, mark, end=end)
