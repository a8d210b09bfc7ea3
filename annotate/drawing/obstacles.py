"""What is already on the drawing: its extents, its text and its equipment symbols.

One pass over modelspace measures the extents and the boxes our marks keep off.
"""

from __future__ import annotations

import logging
import math
from collections.abc import Callable, Iterable
from dataclasses import dataclass, field
from typing import Any

import ezdxf
from cablewright.extract.dxf_reader import block_problems
from ezdxf import bbox as ezbbox

from .boxes import Box, bounds_box, oriented_box
from .style import BOX_SIDES_PER_HALF, LINE_PITCH, AnnotateConfig
from .style_fonts import StyleMeasures

__all__ = ["DrawingScan", "scan_modelspace", "extents", "keep_clear_boxes"]

log = logging.getLogger(__name__)


#: The drawing's own texts are measured with our font, or their style's where it is here and
#: wider (:mod:`.style_fonts`): their boxes are widened by 5 % so a mark keeps clear of the
#: text as CAD programs draw it (ezdxf's own MTEXT measure ran 1 % wider than the font's
#: advance on the benchmark plant's title; our own choice).
FOREIGN_TEXT_WIDTH = 1.05


def _text_box(entity: Any, measure: Callable[[str], float]) -> Box | None:
    """Oriented box of a TEXT or ATTRIB in plan, from its alignment [drawing units].

    The width is the font's advance width of the plain text (``measure`` at
    height 1) times height and width factor; the box spans descender (0.2 h)
    to cap height, whatever the vertical alignment.  Mirrored text and extrusions are ignored (plan drawings).
    """
    text = entity.plain_text()
    if not text.strip():
        return None
    dxf = entity.dxf
    h = float(dxf.get("height", 2.5))
    w = measure(text) * h * float(dxf.get("width", 1.0) or 1.0) * FOREIGN_TEXT_WIDTH
    halign, valign = int(dxf.get("halign", 0)), int(dxf.get("valign", 0))
    rot = float(dxf.get("rotation", 0.0))
    ins = dxf.get("insert", (0.0, 0.0, 0.0))
    ref = ins
    if halign in (3, 5):  # aligned / fit: the text runs from insert to align point
        end = dxf.get("align_point", None)
        if end is not None:
            dx, dy = end[0] - ins[0], end[1] - ins[1]
            if math.hypot(dx, dy) > 0.0:
                w = math.hypot(dx, dy)
                rot = math.degrees(math.atan2(dy, dx))
        x0 = 0.0
        valign = 0
    else:
        if halign or valign:
            ref = dxf.get("align_point", ins) or ins
        x0 = {0: 0.0, 1: -w / 2.0, 2: -w, 4: -w / 2.0}.get(halign, 0.0)
    if halign == 4:
        y0, y1 = -0.5 * h, 0.5 * h
    else:
        # descender (0.2 h) to cap height in every alignment: DXF's middle and top
        # place the cap height's middle or top at the point, the descender hangs below
        y0, y1 = {0: (-0.2 * h, h), 1: (0.0, 1.2 * h), 2: (-0.7 * h, 0.5 * h), 3: (-1.2 * h, 0.0)}.get(
            valign, (-0.2 * h, h)
        )
    a = math.radians(rot)
    ux, uy = math.cos(a), math.sin(a)
    lx, ly = x0 + w / 2.0, (y0 + y1) / 2.0
    return oriented_box(
        ref[0] + ux * lx - uy * ly, ref[1] + uy * lx + ux * ly, w, y1 - y0, rot
    )


def _mtext_box(entity: Any, measure: Callable[[str], float]) -> Box | None:
    """Oriented box of an MTEXT from its attachment point, column width and lines."""
    text = entity.plain_text(split=False)
    lines = [line for line in text.split("\n")]
    if not text.strip():
        return None
    dxf = entity.dxf
    ch = float(dxf.get("char_height", 2.5))
    widths = [measure(line) * ch * FOREIGN_TEXT_WIDTH for line in lines]
    column = float(dxf.get("width", 0.0) or 0.0)
    if column > 0.0:
        n_lines = sum(max(1, math.ceil(lw / column)) for lw in widths)
        w = min(column, max(widths))
    else:
        n_lines, w = len(lines), max(widths)
    spacing = float(dxf.get("line_spacing_factor", 1.0) or 1.0)
    height = ch + (n_lines - 1) * ch * LINE_PITCH * spacing
    ap = int(dxf.get("attachment_point", 1))
    col, row = (ap - 1) % 3, (ap - 1) // 3
    x0 = -w * col / 2.0
    y1 = height * row / 2.0
    rot = float(entity.get_rotation())
    a = math.radians(rot)
    ux, uy = math.cos(a), math.sin(a)
    lx, ly = x0 + w / 2.0, y1 - height / 2.0
    ins = dxf.get("insert", (0.0, 0.0, 0.0))
    return oriented_box(ins[0] + ux * lx - uy * ly, ins[1] + uy * lx + ux * ly, w, height, rot)


@dataclass
class DrawingScan:
    """What one pass over modelspace found: extents and the boxes labels must avoid."""

    xmin: float = math.inf
    ymin: float = math.inf
    xmax: float = -math.inf
    ymax: float = -math.inf
    texts: list[Box] = field(default_factory=list)
    symbols: list[Box] = field(default_factory=list)

    def take(self, x: float, y: float) -> None:
        if math.isfinite(x) and math.isfinite(y):
            self.xmin = min(self.xmin, x)
            self.xmax = max(self.xmax, x)
            self.ymin = min(self.ymin, y)
            self.ymax = max(self.ymax, y)

    def take_box(self, box: Box) -> None:
        self.take(box.xmin, box.ymin)
        self.take(box.xmax, box.ymax)


def scan_modelspace(doc: Any, measure: Callable[[str], float]) -> DrawingScan:
    """One pass over modelspace: extents, text boxes and equipment symbol boxes.

    ``measure`` is our font's advance width at height 1; a text whose style's font is
    here and wider is measured by that font (:class:`.style_fonts.StyleMeasures`).

    Cheap cases are measured directly (LINE, LWPOLYLINE and POLYLINE vertices,
    CIRCLE/ARC circles, HATCH polyline paths, TEXT/MTEXT/ATTRIB boxes from the
    font's advance widths, INSERT as its block's box - measured once per block
    with ``ezdxf.bbox`` - turned by the insert's matrix); anything else falls
    back to ``ezdxf.bbox.extents(fast=True)``.
    """
    scan = DrawingScan()
    measures = StyleMeasures(doc, measure)
    # blocks that insert themselves, nest too deep or are undefined get no box (ezdxf's
    # bounding box would recurse without end); the reader reports them
    block_boxes: dict[str, Any] = dict.fromkeys(block_problems(doc))
    fallback = []
    for e in doc.modelspace():
        if e.dxftype() == "INSERT" and e.dxf.name in block_boxes and block_boxes[e.dxf.name] is None:
            continue
        try:
            if not _scan_entity(doc, e, measures, scan, block_boxes):
                fallback.append(e)
        except (AttributeError, ValueError, ArithmeticError, ezdxf.DXFError) as exc:
            log.debug("entity %s (%s) not measured: %s", e.dxf.get("handle", "?"), e.dxftype(), exc)
    if fallback:
        try:
            box = ezbbox.extents(fallback, fast=True)
            if box.has_data:
                scan.take(box.extmin.x, box.extmin.y)
                scan.take(box.extmax.x, box.extmax.y)
        except (ezdxf.DXFError, ValueError, ArithmeticError) as exc:  # pragma: no cover
            log.warning("could not measure %d entities of the drawing (%s)", len(fallback), exc)
    scan.texts = [b for b in scan.texts if _usable_box(b)]
    scan.symbols = [b for b in scan.symbols if _usable_box(b)]
    return scan


def _usable_box(box: tuple) -> bool:
    """A box whose numbers are finite (an entity at NaN or infinity, refused by the reader)."""
    return all(math.isfinite(v) for v in box)


def _take_line(e: Any, scan: DrawingScan) -> None:
    scan.take(e.dxf.start[0], e.dxf.start[1])
    scan.take(e.dxf.end[0], e.dxf.end[1])


def _take_lwpolyline(e: Any, scan: DrawingScan) -> None:
    for x, y in e.get_points("xy"):
        scan.take(x, y)


def _take_circle(e: Any, scan: DrawingScan) -> None:
    c, r = e.dxf.center, float(e.dxf.radius)
    scan.take(c[0] - r, c[1] - r)
    scan.take(c[0] + r, c[1] + r)


def _take_polyline(e: Any, scan: DrawingScan) -> None:
    for v in e.points():
        scan.take(v[0], v[1])


def _take_hatch(e: Any, scan: DrawingScan) -> None:
    for path in e.paths:
        for v in path.vertices:
            scan.take(v[0], v[1])


#: Entity types measured from their own points (circles and arcs as their full circle).
_TAKE_POINTS: dict[str, Callable[[Any, DrawingScan], None]] = {
    "LINE": _take_line,
    "LWPOLYLINE": _take_lwpolyline,
    "CIRCLE": _take_circle,
    "ARC": _take_circle,
    "POLYLINE": _take_polyline,
}

#: Entity types that are text: their box is kept clear of our marks.
_TEXT_BOXES: dict[str, Callable[[Any, Callable[[str], float]], Box | None]] = {
    "TEXT": _text_box,
    "MTEXT": _mtext_box,
}


def _scan_entity(
    doc: Any,
    e: Any,
    measures: StyleMeasures,
    scan: DrawingScan,
    block_boxes: dict[str, Any],
) -> bool:
    """Measure one entity into ``scan``; False when it needs the general fallback."""
    t = e.dxftype()
    take = _TAKE_POINTS.get(t)
    if take is not None:
        take(e, scan)
        return True
    box_of = _TEXT_BOXES.get(t)
    if box_of is not None:
        box = box_of(e, measures.of(e))
        if box is not None:
            scan.texts.append(box)
            scan.take_box(box)
        return True
    if t == "INSERT":
        _scan_insert(doc, e, measures, scan, block_boxes)
        return True
    if t == "HATCH" and all(hasattr(p, "vertices") for p in e.paths):
        _take_hatch(e, scan)
        return True
    return False


def _scan_insert(
    doc: Any,
    insert: Any,
    measures: StyleMeasures,
    scan: DrawingScan,
    block_boxes: dict[str, Any],
) -> None:
    """A block reference: its block's box turned into place, and its visible attributes."""
    name = insert.dxf.name
    if name not in block_boxes:
        block = doc.blocks.get(name)
        box: tuple[float, float, float, float] | Box | None = None
        if block is not None:
            parts = [b for b in block if b.dxftype() != "ATTDEF"]
            bb = ezbbox.extents(parts, fast=True) if parts else None
            if bb is not None and bb.has_data:
                box = (bb.extmin.x, bb.extmin.y, bb.extmax.x, bb.extmax.y)
        block_boxes[name] = box
    local = block_boxes[name]
    if local is not None:
        m = insert.matrix44()
        c0, c1, c3 = m.transform_vertices(
            [(local[0], local[1], 0.0), (local[2], local[1], 0.0), (local[0], local[3], 0.0)]
        )
        w, h = math.hypot(c1.x - c0.x, c1.y - c0.y), math.hypot(c3.x - c0.x, c3.y - c0.y)
        rot = math.degrees(math.atan2(c1.y - c0.y, c1.x - c0.x)) if w > 0.0 else 0.0
        box = oriented_box((c1.x + c3.x) / 2.0, (c1.y + c3.y) / 2.0, w, h, rot)
        scan.symbols.append(box)
        scan.take_box(box)
    parts = [scan.symbols[-1]] if local is not None else []
    for attrib in insert.attribs:
        if attrib.is_invisible:
            continue
        box = _text_box(attrib, measures.of(attrib))
        if box is not None:
            scan.texts.append(box)
            scan.take_box(box)
            parts.append(box)
    if len(parts) > 1:
        # the symbol with its tag as one box (as ``ezdxf.bbox`` measures a block reference):
        # a note squeezed into the corner between a symbol and its tag reads as neither's
        scan.symbols.append(bounds_box(min(b.xmin for b in parts), min(b.ymin for b in parts),
                                       max(b.xmax for b in parts), max(b.ymax for b in parts)))


def extents(
    scan: DrawingScan, extra: Iterable[tuple[float, float, float]]
) -> tuple[float, float, float, float]:
    """(xmin, ymin, xmax, ymax) of the modelspace entities and ``extra`` points."""
    box = DrawingScan(scan.xmin, scan.ymin, scan.xmax, scan.ymax)
    for p in extra:
        box.take(p[0], p[1])
    if not (math.isfinite(box.xmin) and math.isfinite(box.ymin)):
        return (0.0, 0.0, 1.0, 1.0)
    return (box.xmin, box.ymin, box.xmax, box.ymax)


def keep_clear_boxes(scan: DrawingScan, config: AnnotateConfig, height: float) -> list[Box]:
    """The drawing's own text and its equipment symbols: no mark goes on them.

    A symbol bigger than ``symbol_max_text_heights`` text heights (a frame, a room
    block) is not an obstacle, or nothing could be placed inside it.

    Parameters
    ----------
    scan : DrawingScan
    config : AnnotateConfig
        ``avoid_drawing_text``, ``avoid_symbols``, ``symbol_max_text_heights``.
    height : float
        Text height [drawing units].
    """
    big = config.symbol_max_text_heights * height
    blocked = list(scan.texts) if config.avoid_drawing_text else []
    if config.avoid_symbols:
        blocked += [b for b in scan.symbols if BOX_SIDES_PER_HALF * max(b.hw, b.hh) <= big]
    return blocked
