"""Audit of an annotated drawing, independent of the writer: what our texts cross and where.

Reads the DXF back with ezdxf, takes every text we added (our XDATA application id)
as the box ezdxf's own text geometry gives (``ezdxf.disassemble``), the drawing's own
linework, walls, symbols and text the same way (block references exploded by
``disassemble.recursive_decompose``), and checks with shapely (general-purpose
geometry library): crossings, overlaps, distance of each cable label from its own
route and the leaders tying labels to routes.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass, field

import ezdxf
from ezdxf import disassemble
from ezdxf.tools import text_size
from shapely import STRtree
from shapely.geometry import LineString, Polygon

APPID = "CABLEWRIGHT"
TEXT_TYPES = {"TEXT", "MTEXT", "ATTRIB"}
#: an overlap or crossing shorter or smaller than this share of a text height is a touch
TOUCH_H = 0.02
#: kinds placed as part of another mark's block, named as that mark (a group tag's fill
#: lines are written under it on the fill layer, one placed box: annotate/drawing/group_fill.py)
PLACED_WITH = {"group-fill": "group-tag"}


def _ours(entity) -> tuple[str, str] | None:
    if not entity.has_xdata(APPID):
        return None
    tags = [v for _, v in entity.get_xdata(APPID)]
    return (PLACED_WITH.get(tags[0], tags[0]), tags[1] if len(tags) > 1 else "")


def _mtext_polygon(entity):
    """An MTEXT's box from ezdxf's own measure of it (``ezdxf.tools.text_size.mtext_size``),
    placed by its attachment point and rotation.  (ezdxf's ``make_primitive`` box of an
    MTEXT with column width 0, "no wrapping" in the DXF reference, wraps at every word.)"""
    size = text_size.mtext_size(entity)
    w, h = size.total_width, size.total_height
    if not (w > 0 and h > 0):
        return None
    ap = int(entity.dxf.get("attachment_point", 1))
    col, row = (ap - 1) % 3, (ap - 1) // 3
    x0 = -w * col / 2.0
    y1 = h * row / 2.0
    a = math.radians(entity.get_rotation())
    c, s = math.cos(a), math.sin(a)
    ins = entity.dxf.insert
    pts = [(x, y) for x in (x0, x0 + w) for y in (y1 - h, y1)]
    pts = [pts[0], pts[2], pts[3], pts[1]]
    return Polygon([(ins[0] + c * x - s * y, ins[1] + s * x + c * y) for x, y in pts])


def _polygon(entity):
    if entity.dxftype() == "MTEXT":
        return _mtext_polygon(entity)
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
    #: every overlap as (our text, what it overlaps: another of ours, or "drawing text")
    overlap_pairs: list[tuple[str, str]] = field(default_factory=list)
    labels_off_route: list[tuple[str, float]] = field(default_factory=list)
    leaders: list[tuple[str, float]] = field(default_factory=list)
    text_height: float = 0.0
    segment_ids: int = 0
    segment_ids_off: list[tuple[str, float]] = field(default_factory=list)
    #: leader kind -> (count, longest) [drawing units]
    leader_kinds: dict[str, tuple[int, float]] = field(default_factory=dict)

    def longest(self, kind: str) -> float:
        """Longest leader of ``kind`` (``label-leader``, ``group-leader``...) [drawing units]."""
        return self.leader_kinds.get(kind, (0, 0.0))[1]

    def summary(self) -> str:
        far = max((d for _, d in self.labels_off_route), default=0.0)
        longest = max((d for _, d in self.leaders), default=0.0)
        h = self.text_height or 1.0
        kinds = ", ".join(f"{k} {n} (longest {d / h:.1f} h)"
                          for k, (n, d) in sorted(self.leader_kinds.items()))
        return (f"{self.texts} added texts, {len(self.crossing_linework)} crossing linework, "
                f"{len(self.overlapping_text)} overlapping text; {self.labels} cable labels, "
                f"{len(self.labels_off_route)} off their route without a leader "
                f"(farthest {far / h:.1f} h); {self.segment_ids} segment ids, "
                f"{len(self.segment_ids_off)} off their segment; "
                f"{len(self.leaders)} leaders, longest {longest / h:.1f} h: {kinds}")


def _collect(doc):
    """(our texts, our lines, their texts, their lines) of the modelspace, blocks exploded."""
    ours_text, ours_lines, theirs_text, theirs_lines = [], [], [], []
    for entity in disassemble.recursive_decompose(doc.modelspace()):
        mark = _ours(entity)
        kind = entity.dxftype()
        if kind in TEXT_TYPES:
            if kind == "ATTRIB" and entity.is_invisible:
                continue  # attribute flag 1, invisible: not drawn (DXF reference, ATTRIB group 70)
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


def audit(path, routes: Mapping[str, object], *, segments: Mapping[str, object] | None = None,
          ignore_kinds=("schedule-cell", "schedule-title", "schedule-note")) -> Audit:
    """Audit the annotated drawing at ``path``; ``routes`` maps circuit id -> its route line
    (drawing units), ``segments`` segment id -> its line (segment ids are checked against
    their segment as labels against their route).  The schedule table's own cells sit
    inside our table rules and are checked only against the drawing, not against the rules
    that frame them."""
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
        pairs = [(name, "drawing text")] * int(len(text_tree.query(inner, predicate="intersects")) > 0)
        pairs += [(name, f"{ours_text[j][0]} {ours_text[j][1]}")
                  for j in ours_tree.query(inner, predicate="intersects")
                  if j != i and polys[j].intersection(poly).area > touch * touch]
        if pairs:
            out.overlapping_text.append(name)
            out.overlap_pairs += pairs
        if kind == "cable-label":
            out.labels += 1
            if not _on_route(ref, poly, routes.get(ref), leaders, "label-leader", h, touch):
                out.labels_off_route.append((ref, poly.distance(routes[ref])))
        elif kind == "segment-id" and segments is not None:
            out.segment_ids += 1
            if not _on_route(ref, poly, segments.get(ref), leaders, "segment-leader", h, touch):
                out.segment_ids_off.append((ref, poly.distance(segments[ref])))
    out.leaders = [(m[1], g.length) for m, g in leaders]
    for m, g in leaders:
        n, d = out.leader_kinds.get(m[0], (0, 0.0))
        out.leader_kinds[m[0]] = (n + 1, max(d, g.length))
    return out


def _on_route(ref: str, poly, route, leaders, leader_kind: str, h: float, touch: float) -> bool:
    """A mark within 1 text height of its route, or tied to it by one of its leaders."""
    if route is None or poly.distance(route) <= h:
        return True
    return any(m[0] == leader_kind and m[1] == ref and g.distance(poly) <= touch
               and g.distance(route) <= touch for m, g in leaders)
