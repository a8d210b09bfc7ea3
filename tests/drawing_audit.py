"""Audit of an annotated drawing, independent of the writer: what our texts cross and where.

Reads the DXF back with ezdxf, takes every text we added (our XDATA application id)
as the box ezdxf's own text geometry gives (``ezdxf.disassemble``), the drawing's own
linework, walls, symbols and text the same way (block references exploded by
``disassemble.recursive_decompose``), and checks with shapely (general-purpose
geometry library): crossings, overlaps, distance of each cable label from its own
route and the leaders tying labels to routes.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, field

import ezdxf
from ezdxf import disassemble
from shapely import STRtree
from shapely.geometry import LineString, Polygon

APPID = "CABLEWRIGHT"
TEXT_TYPES = {"TEXT", "MTEXT", "ATTRIB"}
#: an overlap or crossing shorter or smaller than this share of a text height is a touch
TOUCH_H = 0.02


def _ours(entity) -> tuple[str, str] | None:
    if not entity.has_xdata(APPID):
        return None
    tags = [v for _, v in entity.get_xdata(APPID)]
    return (tags[0], tags[1] if len(tags) > 1 else "")


def _polygon(entity):
    prim = disassemble.make_primitive(entity)
    pts = [(v.x, v.y) for v in prim.vertices()]
    if len(pts) < 3:
        return None
    poly = Polygon(pts).convex_hull
    return poly if poly.area > 0 else None


def _lines(entity):
    prim = disassemble.make_primitive(entity, max_flattening_distance=1.0)
    pts = [(v.x, v.y) for v in prim.vertices()]
    if len(pts) < 2:
        return None
    line = LineString(pts)
    width = float(entity.dxf.get("const_width", 0.0) or 0.0) if entity.dxftype() == "LWPOLYLINE" else 0.0
    return line.buffer(width / 2.0) if width > 0 else line


@dataclass
class Audit:
    """Counts and worst figures of one annotated drawing."""

    texts: int = 0
    labels: int = 0
    crossing_linework: list[str] = field(default_factory=list)
    overlapping_text: list[str] = field(default_factory=list)
    labels_off_route: list[tuple[str, float]] = field(default_factory=list)
    leaders: list[tuple[str, float]] = field(default_factory=list)
    text_height: float = 0.0

    def summary(self) -> str:
        far = max((d for _, d in self.labels_off_route), default=0.0)
        longest = max((d for _, d in self.leaders), default=0.0)
        h = self.text_height or 1.0
        return (f"{self.texts} added texts, {len(self.crossing_linework)} crossing linework, "
                f"{len(self.overlapping_text)} overlapping text; {self.labels} cable labels, "
                f"{len(self.labels_off_route)} off their route without a leader "
                f"(farthest {far / h:.1f} h); {len(self.leaders)} leaders, longest {longest / h:.1f} h")


def _collect(doc):
    """(our texts, our lines, their texts, their lines) of the modelspace, blocks exploded."""
    ours_text, ours_lines, theirs_text, theirs_lines = [], [], [], []
    for entity in disassemble.recursive_decompose(doc.modelspace()):
        mark = _ours(entity)
        kind = entity.dxftype()
        if kind in TEXT_TYPES:
            poly = _polygon(entity)
            if poly is not None and mark is None:
                theirs_text.append(poly)
            elif poly is not None:
                ours_text.append((mark[0], mark[1], poly, entity))
        elif kind not in ("INSERT", "ATTDEF", "POINT", "HATCH", "DIMENSION"):
            geom = _lines(entity)
            if geom is not None:
                (theirs_lines if mark is None else ours_lines).append((mark, geom))
    return ours_text, ours_lines, theirs_text, theirs_lines


def audit(path, routes: Mapping[str, object], *, ignore_kinds=("schedule-cell", "schedule-title",
                                                               "schedule-note")) -> Audit:
    """Audit the annotated drawing at ``path``; ``routes`` maps circuit id -> its route line
    (drawing units).  The schedule table's own cells sit inside our table rules and are
    checked only against the drawing, not against the rules that frame them."""
    ours_text, ours_lines, theirs_text, theirs_lines = _collect(ezdxf.readfile(path))
    out = Audit()
    heights = [e.dxf.height for k, _, _, e in ours_text if k == "cable-label"]
    h = out.text_height = max(heights) if heights else 1.0
    touch = TOUCH_H * h
    line_tree = STRtree([g for _, g in theirs_lines])
    mark_lines = [(m, g) for m, g in ours_lines if not m[0].startswith("schedule")]
    leaders = [(m, g) for m, g in ours_lines if m[0].endswith("leader")]
    text_tree = STRtree(theirs_text)
    polys = [p for _, _, p, _ in ours_text]
    ours_tree = STRtree(polys)
    for i, (kind, ref, poly, _) in enumerate(ours_text):
        out.texts += 1
        name = f"{kind} {ref}"
        inner = poly.buffer(-touch)
        crossing = len(line_tree.query(inner, predicate="intersects")) > 0
        if kind not in ignore_kinds:
            crossing = crossing or any(g.intersects(inner) for _, g in mark_lines)
        if crossing:
            out.crossing_linework.append(name)
        hit = len(text_tree.query(inner, predicate="intersects")) > 0
        hit = hit or any(j != i and polys[j].intersection(poly).area > touch * touch
                         for j in ours_tree.query(inner, predicate="intersects"))
        if hit:
            out.overlapping_text.append(name)
        if kind == "cable-label":
            out.labels += 1
            _check_on_route(out, ref, poly, routes.get(ref), leaders, h, touch)
    out.leaders = [(m[1], g.length) for m, g in leaders]
    return out


def _check_on_route(out: Audit, ref: str, poly, route, leaders, h: float, touch: float) -> None:
    """A cable label within 1 text height of its route, or tied to it by one of its leaders."""
    if route is None or poly.distance(route) <= h:
        return
    tied = [g for m, g in leaders if m[1] == ref and g.distance(poly) <= touch
            and g.distance(route) <= touch]
    if not tied:
        out.labels_off_route.append((ref, poly.distance(route)))
