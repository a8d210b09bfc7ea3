"""What the streaming reader keeps for a writer that appends to the drawing's bytes.

The annotated copy places our marks clear of the drawing's own text and symbols,
inside its extents, and adds our layers beside the drawing's (``annotate.drawing``).
A writer that copies the original bytes instead of saving a parsed document
still needs that much of the drawing; :class:`ObstacleCollector` gathers it on
the streaming reader's one pass (:func:`~.dxf_stream.stream_dxf` with
``marks_appid``):

* the layer table (name, colour, whether the layer is ours), and the names of
  the linetypes, text styles and application ids;
* the extents of the model-space LINE, LWPOLYLINE, POLYLINE, CIRCLE and ARC
  entities and of HATCH polyline paths, measured from their points the way the
  drawing writer's scan measures them (vertices; circles and arcs as their
  full circle);
* that linework itself, for the marks to keep off it (``avoid_linework``): the
  end points of every LINE (plan x, y as written), the tags of the others;
* the tags of every other model-space entity (text, block references with their
  attributes, hatches with curved edges, dimensions ...) and of the block
  definitions, for the writer to rebuild as ezdxf entities and measure exactly
  as on the parsed drawing;
* the explicit colours of the entities on route layers (our colours avoid them).

Entities of an earlier run (our XDATA application id, or on a layer carrying
it) are left out: the writer drops them from the copy.  What cannot be rebuilt
faithfully without the rest of the document (images, viewports, tables,
multileaders, proxies, ACIS bodies) makes the reader decline the drawing.

References
----------
.. [1] Autodesk, DXF Reference (AutoCAD 2012): TABLES (LAYER group 62 colour,
   LTYPE, STYLE, APPID), BLOCKS (BLOCK group 10 base point), HATCH (groups 91
   path count, 92 path type flag bit 2 = polyline, 72 has-bulge, 73 closed, 93
   vertex count, 97 source objects), extended data (group 1001 application name).
"""

from __future__ import annotations

import math
from array import array
from dataclasses import dataclass, field

__all__ = ["StreamObstacles", "ObstacleCollector", "REBUILT_TYPES", "Declined", "first_value"]

Tags = list[tuple[int, str]]
#: One entity as written: its type, its tags and (INSERT, POLYLINE) its sub-entities.
Record = tuple[str, Tags, list[tuple[str, Tags]]]

#: Entity types rebuilt from their tags for the writer's scan (ezdxf loads them
#: without other objects of the document; a DIMENSION needs its block, kept too).
REBUILT_TYPES = frozenset({
    "TEXT", "MTEXT", "INSERT", "HATCH", "POINT", "SOLID", "TRACE", "3DFACE", "SPLINE",
    "ELLIPSE", "DIMENSION", "LINE", "LWPOLYLINE", "POLYLINE", "CIRCLE", "ARC", "ATTDEF",
})
#: Model-space types measured from their points on the pass.
_POINT_TYPES = frozenset({"LINE", "LWPOLYLINE", "POLYLINE", "CIRCLE", "ARC"})
_TABLES = {"LAYER", "LTYPE", "STYLE", "APPID"}


@dataclass
class StreamObstacles:
    """What the appending writer needs of the drawing besides its bytes.

    Attributes
    ----------
    appid : str
        Our XDATA application id the marks of an earlier run carry.
    dxfversion : str
        ``$ACADVER``.
    handseed : str
        ``$HANDSEED`` (hex).
    codepage : str
        ``$DWGCODEPAGE`` ("" when absent).
    msp_owner : str
        Handle of the model-space BLOCK_RECORD.
    layers : list of (name, colour, ours)
        The layer table as written.
    linetypes, styles, appids : list of str
        Names in those tables.
    style_fonts : dict of str
        Text style name -> its primary font file (STYLE group 3), where it names one.
    box : (xmin, ymin, xmax, ymax) or None
        Extents of the entities measured from their points [drawing units].
    entities : list of Record
        The other model-space entities (not ours), to rebuild.
    lines : array of float
        x0, y0, x1, y1 of every model-space LINE (not ours), four numbers a line
        [drawing units]: the linework the marks avoid, with :attr:`linework`.
    linework : list of Record
        The model-space LWPOLYLINE, POLYLINE, CIRCLE and ARC entities (not ours),
        rebuilt only for the marks to avoid them (their extents are in :attr:`box`).
    blocks : dict
        Block name (upper case) -> (name, base point, records) of every block definition.
    route_colors : set of int
        Explicit ACI colours of entities on route layers.
    """

    appid: str
    dxfversion: str = ""
    handseed: str = ""
    codepage: str = ""
    msp_owner: str = ""
    layers: list[tuple[str, int, bool]] = field(default_factory=list)
    linetypes: list[str] = field(default_factory=list)
    styles: list[str] = field(default_factory=list)
    appids: list[str] = field(default_factory=list)
    style_fonts: dict[str, str] = field(default_factory=dict)
    box: tuple[float, float, float, float] | None = None
    entities: list[Record] = field(default_factory=list)
    lines: array[float] = field(default_factory=lambda: array("d"))
    linework: list[Record] = field(default_factory=list)
    blocks: dict[str, tuple[str, tuple[float, float, float], list[Record]]] = field(default_factory=dict)
    route_colors: set[int] = field(default_factory=set)


class Declined(Exception):
    """The drawing holds something the collector does not keep faithfully."""


def _num(value: str) -> float:
    v = float(value)
    if not math.isfinite(v):
        raise Declined("a coordinate is not a finite number")
    return v


def first_value(tags: Tags, code: int, default: str = "") -> str:
    """The first value of ``code`` outside 102 groups and extended data."""
    group = False
    for c, v in tags:
        if c == 102:
            group = v.startswith("{")
        elif c >= 1000:
            break
        elif c == code and not group:
            return v
    return default


def _polyline_path(codes: list[int], tags: Tags, i: int) -> tuple[int, int, int] | None:
    """(first, end) of a HATCH polyline path's vertex tags starting at ``i``, and the next path's index.

    None for an edge path (group 92 without bit 2) or an unexpected layout.
    """
    if codes[i] != 92 or not int(tags[i][1]) & 2:
        return None
    i += 1
    while codes[i] in (72, 73):
        i += 1
    if codes[i] != 93:
        return None
    n_vertices = int(tags[i][1])
    start = i = i + 1
    seen = 0
    while seen < n_vertices:
        if codes[i] == 20:
            seen += 1
        i += 1
    if i < len(codes) and codes[i] == 42:
        i += 1
    stop = i
    if i < len(codes) and codes[i] == 97:
        i += 1 + int(tags[i][1])
    return start, stop, i


class ObstacleCollector:
    """Fed by the streaming reader record by record; :attr:`result` is the outcome."""

    def __init__(self, appid: str, is_route_layer) -> None:
        self.result = StreamObstacles(appid)
        self._xdata = (1001, appid)
        self._ours: set[str] = set()
        self._is_route = is_route_layer
        self._x0 = self._y0 = math.inf
        self._x1 = self._y1 = -math.inf
        self._block: tuple[str, tuple[float, float, float], list[Record]] | None = None
        self._pending: list[tuple[str, Tags]] | None = None  # POLYLINE + VERTEX in a block

    # ------------------------------------------------------------------ tables, blocks

    def table(self, kind: str, tags: Tags) -> None:
        if kind not in _TABLES:
            return
        name = first_value(tags, 2)
        r = self.result
        if kind == "LAYER":
            ours = self._xdata in tags
            if ours:
                self._ours.add(name.upper())
            r.layers.append((name, int(float(first_value(tags, 62, "7"))), ours))
        else:
            {"LTYPE": r.linetypes, "STYLE": r.styles, "APPID": r.appids}[kind].append(name)
            font = first_value(tags, 3) if kind == "STYLE" else ""
            if font:
                r.style_fonts[name] = font

    def block(self, kind: str, tags: Tags) -> None:
        """A record of the BLOCKS section, in order."""
        if kind == "BLOCK":
            base = (_num(first_value(tags, 10, "0")), _num(first_value(tags, 20, "0")), _num(first_value(tags, 30, "0")))
            self._block = (first_value(tags, 2), base, [])
            return
        if self._block is None:
            return
        if kind == "ENDBLK":
            name, base, records = self._block
            self.result.blocks[name.upper()] = (name, base, records)
            self._block = None
            return
        if self._xdata in tags:
            raise Declined(f"a block definition holds an entity with our {self.result.appid} data")
        records = self._block[2]
        if kind in ("VERTEX", "SEQEND", "ATTRIB") and records:
            records[-1][2].append((kind, tags))
        elif kind in REBUILT_TYPES:
            records.append((kind, tags, []))
        else:
            raise Declined(f"{kind} in a block definition")

    # ------------------------------------------------------------------ model space

    def is_ours(self, tags: Tags, layer: str) -> bool:
        return layer.upper() in self._ours or self._xdata in tags

    def entity(self, kind: str, tags: Tags, children: list[tuple[str, Tags]],
               first: dict[int, str] | None = None) -> None:
        """One model-space entity (with its VERTEX/ATTRIB sub-entities), paper space already left out.

        ``first`` is the first value of each group code outside 102 groups and
        extended data, when the reader has it already.
        """
        layer = first.get(8, "0") if first is not None else first_value(tags, 8, "0")
        if self.is_ours(tags, layer):
            return
        if self._is_route(layer):
            color = int(float(first.get(62, "256") if first is not None else first_value(tags, 62, "256")))
            if 0 < color < 256:
                self.result.route_colors.add(color)
        if kind in _POINT_TYPES:
            if first is not None and kind != "LWPOLYLINE" and kind != "POLYLINE":
                self._circle_or_line(kind, first)
            else:
                self._points(kind, tags, children)
            if kind != "LINE":  # LINEs kept as their end points (_line)
                self.result.linework.append((kind, tags, children))
        elif kind == "HATCH" and self._hatch(tags):
            return
        elif kind in REBUILT_TYPES:
            self.result.entities.append((kind, tags, children))
        else:
            raise Declined(f"{kind} in model space")

    def _take(self, x: float, y: float) -> None:
        if x < self._x0:
            self._x0 = x
        if x > self._x1:
            self._x1 = x
        if y < self._y0:
            self._y0 = y
        if y > self._y1:
            self._y1 = y

    def _line(self, x0: float, y0: float, x1: float, y1: float) -> None:
        self._take(x0, y0)
        self._take(x1, y1)
        self.result.lines.extend((x0, y0, x1, y1))

    def _circle_or_line(self, kind: str, first: dict[int, str]) -> None:
        if kind == "LINE":
            self._line(_num(first.get(10, "0")), _num(first.get(20, "0")),
                       _num(first.get(11, "0")), _num(first.get(21, "0")))
        else:
            cx, cy, r = (_num(first.get(c, "0")) for c in (10, 20, 40))
            self._take(cx - r, cy - r)
            self._take(cx + r, cy + r)

    def _points(self, kind: str, tags: Tags, children: list[tuple[str, Tags]]) -> None:
        if kind in ("CIRCLE", "ARC"):
            cx, cy, r = (_num(first_value(tags, c, "0")) for c in (10, 20, 40))
            self._take(cx - r, cy - r)
            self._take(cx + r, cy + r)
        elif kind == "POLYLINE":  # every vertex, as ezdxf's Polyline.points() gives them
            for vkind, vtags in children:
                if vkind == "VERTEX":
                    self._take(_num(first_value(vtags, 10, "0")), _num(first_value(vtags, 20, "0")))
        elif kind == "LINE":
            self._line(_num(first_value(tags, 10, "0")), _num(first_value(tags, 20, "0")),
                       _num(first_value(tags, 11, "0")), _num(first_value(tags, 21, "0")))
        else:  # LWPOLYLINE: its vertices (bulges leave the box of the vertices)
            self._xy_pairs(tags, 0, len(tags))

    def _xy_pairs(self, tags: Tags, start: int, stop: int) -> None:
        x = None
        for c, v in tags[start:stop]:
            if c == 10:
                x = _num(v)
            elif c == 20 and x is not None:
                self._take(x, _num(v))
                x = None
            elif c >= 1000:
                break

    def _hatch(self, tags: Tags) -> bool:
        """Take the vertices of a hatch whose paths are all polylines; False for edge paths."""
        codes = [c for c, _ in tags]
        try:
            k = codes.index(91)
        except ValueError:
            return False
        spans = []
        i = k + 1
        for _ in range(int(tags[k][1])):
            span = _polyline_path(codes, tags, i)
            if span is None:
                return False  # an edge path: measured by the rebuilt entity
            spans.append(span[:2])
            i = span[2]
        for start, stop in spans:
            self._xy_pairs(tags, start, stop)
        return True

    def finish(self, dxfversion: str, handseed: str, codepage: str, msp_owner: str) -> StreamObstacles:
        r = self.result
        r.dxfversion, r.handseed, r.codepage, r.msp_owner = dxfversion, handseed, codepage, msp_owner
        if self._x0 <= self._x1:
            r.box = (self._x0, self._y0, self._x1, self._y1)
        return r
