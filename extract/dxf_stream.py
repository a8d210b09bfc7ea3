"""A one-pass streaming reader of the DXF drawings the pipeline measures.

The full reader (:mod:`.dxf_reader`) parses the whole drawing into ezdxf entity
objects and walks model space.  Most of that work is for entities the
measurement never looks at (walls, hatches, text, dimensions).  This reader
goes once over the file's tag/value line pairs and builds nothing but what the
measurement needs:

* route entities on route layers: LINE, LWPOLYLINE (bulges), POLYLINE 2D/3D
  (with its VERTEX entities) and ARC, flattened exactly as the full reader
  flattens them (the same functions, the same order);
* equipment: model-space INSERTs with their ATTRIBs;
* ``$INSUNITS``, ``$HANDSEED`` and ``$ACADVER`` from the HEADER;
* the insertion points and text records of the drawing's own texts and block
  references and the extents of the model-space geometry read on the way
  (:class:`StreamContent`), for a writer that places marks without a parsed
  document.

It declines (raises :class:`StreamDeclined`, and :func:`read_dxf_fast` then
reads the drawing with the full reader, saying why in the log) whatever it does
not handle exactly as the full reader does: binary DXF, text that is not UTF-8
(or not ASCII in a drawing older than R2007), ``\\U+`` escapes, route
geometry, layer-0 geometry on a route-layer insert or block references inside
a block that is inserted, MINSERT, a non-default extrusion on a route entity or
an insert, SPLINE/ELLIPSE/MLINE or CIRCLE on a route layer, a polygon or
polyface mesh, entities without a handle, non-finite coordinates, ``tags_from_text``
or ``tag_symbol_layers``,
and anything damaged or unexpected in the tag structure.  The result is then
exactly what the full reader gives (``tests/test_dxf_stream.py`` compares both
on every drawing of the tests, the sample and the benchmark plants).

References
----------
.. [1] Autodesk, DXF Reference (AutoCAD 2012): "DXF Format" (group code/value
   line pairs), HEADER ($INSUNITS, $HANDSEED, $ACADVER, $DWGCODEPAGE), TABLES
   (BLOCK_RECORD), BLOCKS, ENTITIES (LINE, LWPOLYLINE group 42 bulge,
   POLYLINE/VERTEX/SEQEND, ARC, INSERT/ATTRIB), group code 67 (paper space) and
   330 (owner).
"""

from __future__ import annotations

import io
import logging
import math
import os
from collections.abc import Iterator
from dataclasses import dataclass, field
from pathlib import Path
from typing import NamedTuple

from cablewright.core.errors import Issue

from .dxf_flatten import FLATTEN_TYPES
from .dxf_reader import DxfContent, _arc_points, _bulged_chain, read_dxf
from .dxf_stream_scan import Declined, ObstacleCollector, StreamObstacles, first_value
from .dxf_units import resolve_units, summarise
from .model import UNIT_TO_M, DrawingConfig, Equipment, Point3, RoutePolyline

__all__ = ["StreamContent", "StreamDeclined", "TextRecord", "InsertRecord", "stream_dxf",
           "read_dxf_fast"]

logger = logging.getLogger(__name__)

_ROUTE_TYPES = frozenset({"LINE", "LWPOLYLINE", "POLYLINE", "ARC"})
#: POLYLINE flags (group 70): 3D polyline, 3D polygon mesh, polyface mesh (DXF reference, POLYLINE).
_POLY_3D, _POLY_MESH, _POLY_FACE = 8, 16, 64


class StreamDeclined(Exception):
    """The streaming reader does not handle this drawing; ``reason`` says why."""

    def __init__(self, reason: str) -> None:
        super().__init__(reason)
        self.reason = reason


class TextRecord(NamedTuple):
    """A model-space TEXT, MTEXT or visible ATTRIB as written (drawing units, degrees).

    What a text box is measured from (as ``annotate.dxf_writer`` measures it from
    the entity): ``halign``/``valign`` are TEXT/ATTRIB groups 72 and 73 (74 for
    ATTRIB), ``align_point`` group 11; ``width`` is the width factor (group 41)
    of a TEXT/ATTRIB or the column width (group 41) of an MTEXT, ``attachment``
    the MTEXT attachment point (group 71; 0 for TEXT/ATTRIB).
    """

    kind: str
    text: str
    insert: Point3
    height: float
    rotation_deg: float
    handle: str
    halign: int = 0
    valign: int = 0
    align_point: Point3 | None = None
    width: float = 0.0
    attachment: int = 0


def _text_record(kind: str, e: _Entity, text: str) -> TextRecord:
    align = (e.num(11), e.num(21), e.num(31)) if 11 in e.first and kind != "MTEXT" else None
    mtext = kind == "MTEXT"
    return TextRecord(kind, text, (e.num(10), e.num(20), e.num(30)), e.num(40, 2.5), e.num(50, 0.0),
                      e.get(5), 0 if mtext else _int(e.get(72, "0")),
                      0 if mtext else _int(e.get(74 if kind == "ATTRIB" else 73, "0")), align,
                      e.num(41, 0.0 if mtext else 1.0), _int(e.get(71, "1")) if mtext else 0)


class InsertRecord(NamedTuple):
    """A model-space block reference as written (drawing units, degrees)."""

    block_name: str
    insert: Point3
    scale: Point3
    rotation_deg: float
    layer: str
    handle: str


@dataclass
class StreamContent(DxfContent):
    """:class:`~.dxf_reader.DxfContent` as the streaming reader gives it.

    ``document`` is None: nothing was parsed into entity objects.  A stage that
    needs the ezdxf document (the annotated copy) reads the file itself.

    Attributes
    ----------
    handseed : str
        ``$HANDSEED``, the next free handle (hex), or "" when absent.
    dxfversion : str
        ``$ACADVER`` (``"AC1032"`` ...), or "" when absent.
    texts : list of TextRecord
        Model-space texts and the visible attributes of block references.
    inserts : list of InsertRecord
        Model-space block references (equipment and symbols).
    extents : (xmin, ymin, xmax, ymax) or None
        Of the points read on the way (route vertices, arc boxes, text and insert
        points, the vertices of LINE/LWPOLYLINE/POLYLINE/CIRCLE on any layer), [drawing units].
    """

    handseed: str = ""
    dxfversion: str = ""
    texts: list[TextRecord] = field(default_factory=list)
    inserts: list[InsertRecord] = field(default_factory=list)
    extents: tuple[float, float, float, float] | None = None
    obstacles: StreamObstacles | None = None


class _Header:
    """Just enough of ``ezdxf``'s document for :mod:`.dxf_units` (``doc.header.get``)."""

    def __init__(self, values: dict[str, object]) -> None:
        self.header = values


@dataclass
class _Box:
    xmin: float = math.inf
    ymin: float = math.inf
    xmax: float = -math.inf
    ymax: float = -math.inf

    def take(self, x: float, y: float) -> None:
        if x < self.xmin:
            self.xmin = x
        if x > self.xmax:
            self.xmax = x
        if y < self.ymin:
            self.ymin = y
        if y > self.ymax:
            self.ymax = y

    def value(self) -> tuple[float, float, float, float] | None:
        return (self.xmin, self.ymin, self.xmax, self.ymax) if self.xmin <= self.xmax else None


Tags = list[tuple[int, str]]
#: At most this many distinct code lines are remembered (a damaged file could hold many).
_CODE_CACHE = 4096


def _entities(lines: Iterator[str], saw_eof: list[bool]) -> Iterator[tuple[str, Tags]]:
    """(type, tags) of every ``0``-started record of a DXF text, one at a time (no whole-file lists).

    Values lose their line end only, as ezdxf reads them; comments (999) are skipped;
    reading stops at ``0 EOF`` (``saw_eof[0]`` set), as ezdxf does.
    """
    kind: str | None = None
    tags: Tags = []
    append = tags.append
    # a drawing writes few distinct code lines ("  8\n", " 10\n" ...): each is read as a
    # number once (int() on every line cost a fifth of the pass on the 2,000-circuit plant)
    codes: dict[str, int] = {}
    known = codes.get
    for code_line, value in zip(lines, lines, strict=False):  # an unpaired last line: no EOF follows
        code = known(code_line)
        if code is None:
            try:
                code = int(code_line)
            except ValueError as exc:
                raise StreamDeclined(f"group code {code_line.strip()!r} is not a number") from exc
            if len(codes) < _CODE_CACHE:
                codes[code_line] = code
        if code == 0:
            value = value.rstrip("\n")
            if kind is not None:
                yield kind, tags
            if value == "EOF":
                saw_eof[0] = True
                return
            kind, tags = value, []
            append = tags.append
        elif code != 999:
            append((code, value[:-1] if value[-1:] == "\n" else value))
    if kind is not None:
        yield kind, tags


def _float(value: str) -> float:
    try:
        v = float(value)
    except ValueError as exc:
        raise StreamDeclined(f"a number cannot be read ({value!r})") from exc
    if not math.isfinite(v):
        raise StreamDeclined("a coordinate is not a finite number")
    return v


def _int(value: str) -> int:
    try:
        return int(value)
    except ValueError:
        try:
            return int(float(value))
        except ValueError as exc:
            raise StreamDeclined(f"an integer cannot be read ({value!r})") from exc


@dataclass
class _Entity:
    """The tags of one entity: the first value of each code (< 1000, outside 102 groups), all tags."""

    kind: str
    first: dict[int, str]
    tags: Tags

    def get(self, code: int, default: str = "") -> str:
        return self.first.get(code, default)

    def num(self, code: int, default: float = 0.0) -> float:
        v = self.first.get(code)
        if v is None:
            return default
        try:
            x = float(v)
        except ValueError:
            return _float(v)  # declines, naming the value
        if x - x != 0.0:  # inf or nan (as _float: not finite)
            return _float(v)
        return x


def _entity(kind: str, tags: Tags) -> _Entity:
    first: dict[int, str] = {}
    group = False
    for c, v in tags:
        if c == 102:
            group = v.startswith("{")
            continue
        if group or c >= 1000:
            continue
        if c not in first:
            first[c] = v
    return _Entity(kind, first, tags)


def _default_extrusion(e: _Entity) -> bool:
    if 210 not in e.first and 220 not in e.first and 230 not in e.first:
        return True
    x, y, z = e.num(210, 0.0), e.num(220, 0.0), e.num(230, 1.0)
    return abs(x) < 1e-12 and abs(y) < 1e-12 and abs(z - 1.0) < 1e-12


@dataclass
class _Reader:
    path: Path
    config: DrawingConfig
    header: dict[str, object] = field(default_factory=dict)
    msp_owner: str = ""
    psp_owner: str = ""
    #: block name (upper) -> (explicit route-layer geometry, layer-0 geometry, inserts)
    blocks: dict[str, tuple[bool, bool, bool]] = field(default_factory=dict)
    box: _Box = field(default_factory=_Box)
    raw_routes: list[tuple[str, list[Point3], str]] = field(default_factory=list)
    equipment_raw: list[tuple[str, str, Point3, str, tuple[tuple[str, str], ...]]] = field(
        default_factory=list)
    texts: list[TextRecord] = field(default_factory=list)
    inserts: list[InsertRecord] = field(default_factory=list)
    _kind_cache: dict[str, tuple[str, str] | None] = field(default_factory=dict)
    _block: str | None = None
    _block_flags: list[bool] = field(default_factory=lambda: [False, False, False])
    #: a POLYLINE or INSERT waiting for its VERTEX / ATTRIB entities and SEQEND
    _parent: _Entity | None = None
    _children: list[_Entity] = field(default_factory=list)
    #: what an appending writer needs (``stream_dxf(..., marks_appid=...)``), else None
    collector: ObstacleCollector | None = None

    def kind(self, layer: str) -> tuple[str, str] | None:
        if layer not in self._kind_cache:
            self._kind_cache[layer] = self.config.layer_kind(layer)
        return self._kind_cache[layer]

    # ------------------------------------------------------------------ structure

    def run(self, records: Iterator[tuple[str, Tags]]) -> None:
        section: str | None = None
        handlers = {"TABLES": self.table_record, "BLOCKS": self.block_record,
                    "ENTITIES": self.entity_record}
        handler = None
        for kind, tags in records:
            if kind == "SECTION":
                if section is not None or not tags or tags[0][0] != 2:
                    raise StreamDeclined("a SECTION inside a section, or without a name")
                section = tags[0][1]
                if section == "HEADER":
                    self.read_header(tags)
                handler = handlers.get(section)
            elif kind == "ENDSEC":
                if section is None:
                    raise StreamDeclined("ENDSEC outside a section")
                if self._parent is not None or self._block is not None:
                    raise StreamDeclined(f"section {section} ends inside an entity or block")
                section, handler = None, None
            elif section is None:
                raise StreamDeclined(f"{kind} outside a section")
            elif handler is not None:
                handler(kind, tags)
        if section is not None:
            raise StreamDeclined(f"section {section} has no ENDSEC")

    def read_header(self, tags: Tags) -> None:
        wanted = {"$INSUNITS", "$HANDSEED", "$ACADVER", "$DWGCODEPAGE"}
        for k, (c, v) in enumerate(tags):
            if c == 9 and v in wanted and k + 1 < len(tags):
                self.header[v] = tags[k + 1][1]

    def table_record(self, kind: str, tags: Tags) -> None:
        if self.collector is not None:
            self.collector.table(kind, tags)
        if kind != "BLOCK_RECORD":
            return
        e = _entity(kind, tags)
        name = e.get(2).upper()
        if name == "*MODEL_SPACE":
            self.msp_owner = e.get(5)
        elif name == "*PAPER_SPACE":
            self.psp_owner = e.get(5)

    def block_record(self, kind: str, tags: Tags) -> None:
        """Per block: route-layer geometry, layer-0 geometry, block references (as the full reader's ``block_info``)."""
        if self.collector is not None:
            self.collector.block(kind, tags)
        if kind == "BLOCK":
            if self._block is not None:
                raise StreamDeclined("BLOCK inside a block definition")
            self._block = _entity(kind, tags).get(2).upper()
            self._block_flags = [False, False, False]
        elif kind == "ENDBLK":
            if self._block is None:
                raise StreamDeclined("ENDBLK without BLOCK")
            self.blocks[self._block] = (self._block_flags[0], self._block_flags[1], self._block_flags[2])
            self._block = None
        elif self._block is None:
            raise StreamDeclined(f"{kind} outside a block definition")
        elif kind in _ROUTE_TYPES or kind in FLATTEN_TYPES:
            layer = _entity(kind, tags).get(8, "0")
            if layer == "0":
                self._block_flags[1] = True
            elif self.kind(layer) is not None:
                self._block_flags[0] = True
        elif kind in ("INSERT", "MINSERT"):
            self._block_flags[2] = True

    # ------------------------------------------------------------------ entities

    def in_paper_space(self, e: _Entity) -> bool:
        owner = e.get(330)
        if owner and owner == self.msp_owner:
            return False
        if owner and owner == self.psp_owner:
            return True
        return e.get(67, "0").strip() == "1"

    def entity_record(self, t: str, tags: Tags) -> None:
        parent = self._parent
        if parent is not None:
            if t == "SEQEND":
                self._parent = None
                children, self._children = self._children, []
                if parent.kind == "POLYLINE":
                    self.polyline(parent, children)
                else:
                    self.insert(parent, children)
                if self.collector is not None:
                    self.collect(parent.kind, parent.tags, [(c.kind, c.tags) for c in children])
            elif t == ("VERTEX" if parent.kind == "POLYLINE" else "ATTRIB"):
                self._children.append(_entity(t, tags))
            else:
                raise StreamDeclined(f"{parent.kind} followed by {t}, not its sub-entities or SEQEND")
            return
        if t in ("VERTEX", "ATTRIB", "SEQEND"):
            raise StreamDeclined(f"{t} without its POLYLINE or INSERT")
        if t == "INSERT" or t == "POLYLINE":
            e = _entity(t, tags)
            if t == "POLYLINE" or _int(e.get(66, "0")):
                self._parent = e
            else:
                self.insert(e, [])
                if self.collector is not None:
                    self.collect(t, tags, [])
            return
        if self.collector is not None and t not in _ROUTE_TYPES and t != "CIRCLE":
            self.collect(t, tags, [])
        if t in _ROUTE_TYPES or t in FLATTEN_TYPES or t == "CIRCLE":
            e = _entity(t, tags)
            if self.in_paper_space(e):
                return
            if self.collector is not None and t not in FLATTEN_TYPES:
                self.collector.entity(t, tags, [], e.first)
            layer = e.get(8, "0")
            on_route = self.kind(layer) is not None
            if t in FLATTEN_TYPES:
                if on_route:
                    raise StreamDeclined(f"{t} on route layer {layer}")
                return
            if t == "CIRCLE":
                if on_route:
                    raise StreamDeclined(f"CIRCLE on route layer {layer}")
                cx, cy, r = e.num(10), e.num(20), e.num(40)
                self.box.take(cx - r, cy - r)
                self.box.take(cx + r, cy + r)
                return
            self.route(e, layer, on_route)
        elif t in ("TEXT", "MTEXT"):
            e = _entity(t, tags)
            if self.in_paper_space(e):
                return
            self.box.take(e.num(10), e.num(20))
            text = e.get(1) if t == "TEXT" else "".join(v for c, v in tags if c in (3, 1))
            self.texts.append(_text_record(t, e, text))
        elif t == "MINSERT":
            raise StreamDeclined("MINSERT")

    def collect(self, t: str, tags: Tags, children: list[tuple[str, Tags]]) -> None:
        """One model-space entity for the appending writer (paper space left out)."""
        assert self.collector is not None
        owner = first_value(tags, 330)
        if owner and owner == self.psp_owner:
            return
        if not (owner and owner == self.msp_owner) and first_value(tags, 67, "0").strip() == "1":
            return
        self.collector.entity(t, tags, children)

    def route(self, e: _Entity, layer: str, on_route: bool) -> None:
        """LINE, LWPOLYLINE or ARC: its points, flattened as :mod:`.dxf_reader` does."""
        t = e.kind
        sid = self.handle(e) if on_route else e.get(5)
        if t == "LINE":
            pts = [(e.num(10), e.num(20), e.num(30)), (e.num(11), e.num(21), e.num(31))]
        elif t == "LWPOLYLINE":
            if not _default_extrusion(e):
                if not on_route:
                    return
                raise StreamDeclined(f"LWPOLYLINE {sid} on {layer} has a non-default extrusion")
            verts = _lw_vertices(e.tags)
            if not on_route:
                for x, y, _ in verts:
                    self.box.take(x, y)
                return
            closed = bool(_int(e.get(70, "0")) & 1)
            pts = [(float(x), float(y), float(z))
                   for x, y, z in _bulged_chain(verts, closed, e.num(38, 0.0))]
        else:  # ARC
            if not _default_extrusion(e):
                if not on_route:
                    return
                raise StreamDeclined(f"ARC {sid} on {layer} has a non-default extrusion")
            cx, cy, cz, r = e.num(10), e.num(20), e.num(30), e.num(40)
            if not on_route:
                self.box.take(cx - r, cy - r)
                self.box.take(cx + r, cy + r)
                return
            a0 = math.radians(e.num(50))
            a1 = math.radians(e.num(51))
            sweep = (a1 - a0) % (2 * math.pi) or 2 * math.pi
            pts = _arc_points(cx, cy, r, a0, sweep, cz)
        for p in pts:
            self.box.take(p[0], p[1])
        if on_route:
            self.raw_routes.append((layer, pts, sid))

    def handle(self, e: _Entity) -> str:
        h = e.get(5)
        if not h:
            raise StreamDeclined(f"a {e.kind} has no handle")
        return h

    def polyline(self, e: _Entity, vertices: list[_Entity]) -> None:
        if self.in_paper_space(e):
            return
        layer = e.get(8, "0")
        on_route = self.kind(layer) is not None
        flags = _int(e.get(70, "0"))
        sid = self.handle(e) if on_route else e.get(5)
        if flags & (_POLY_MESH | _POLY_FACE):
            if on_route:
                raise StreamDeclined(f"POLYLINE {sid} on route layer {layer} is a mesh")
            return
        closed = bool(flags & 1)
        if flags & _POLY_3D:
            pts: list[Point3] = [(v.num(10), v.num(20), v.num(30)) for v in vertices]
            if closed and pts:
                pts.append(pts[0])
        else:
            if not _default_extrusion(e):
                if not on_route:
                    return
                raise StreamDeclined(f"POLYLINE {sid} on {layer} has a non-default extrusion")
            elevation = e.num(30, 0.0) if 10 in e.first else 0.0
            verts = [(v.num(10), v.num(20), v.num(42, 0.0)) for v in vertices]
            pts = [(float(x), float(y), float(z)) for x, y, z in _bulged_chain(verts, closed, elevation)]
        for p in pts:
            self.box.take(p[0], p[1])
        if on_route:
            self.raw_routes.append((layer, pts, sid))

    def insert(self, e: _Entity, attribs: list[_Entity]) -> None:
        if self.in_paper_space(e):
            return
        if _int(e.get(70, "1") or "1") * _int(e.get(71, "1") or "1") > 1:
            raise StreamDeclined("MINSERT (an INSERT with rows or columns)")
        name = e.get(2)
        layer = e.get(8, "0")
        sid = self.handle(e)
        if not _default_extrusion(e):
            raise StreamDeclined(f"INSERT {sid} has a non-default extrusion")
        if name is None or name.upper() not in self.blocks:  # the full reader reports it
            raise StreamDeclined(f"INSERT {sid} of block {name}, which is not defined")
        explicit, layer0, nested = self.blocks.get(name.upper(), (False, False, False))
        if explicit or nested or (layer0 and self.kind(layer) is not None):
            raise StreamDeclined(f"block {name} (INSERT {sid}) holds route geometry or block references")
        p = (e.num(10), e.num(20), e.num(30))
        self.box.take(p[0], p[1])
        pairs = {}
        for a in attribs:
            pairs[a.get(2).upper()] = a.get(1)
            if not _int(a.get(70, "0")) & 1:  # not invisible (ATTRIB flag 1)
                self.box.take(a.num(10), a.num(20))
                self.texts.append(_text_record("ATTRIB", a, a.get(1)))
        self.inserts.append(InsertRecord(name, p, (e.num(41, 1.0), e.num(42, 1.0), e.num(43, 1.0)),
                                         e.num(50, 0.0), layer, sid))
        tag = pairs.get(self.config.tag_attribute.upper(), "").strip()
        if tag:
            self.equipment_raw.append((tag, sid, p, name, tuple(sorted(pairs.items()))))


def _lw_vertices(tags: Tags) -> list[tuple[float, float, float]]:
    """(x, y, bulge) vertices of an LWPOLYLINE, in order."""
    verts: list[list[float]] = []
    for c, v in tags:
        if c == 10:
            verts.append([_float(v), 0.0, 0.0])
        elif c == 20 and verts:
            verts[-1][1] = _float(v)
        elif c == 42 and verts:
            verts[-1][2] = _float(v)
        elif c >= 1000:
            break
    return [(x, y, bz) for x, y, bz in verts]


def stream_dxf(path: str | os.PathLike[str], config: DrawingConfig | None = None, *,
               marks_appid: str | None = None) -> StreamContent:
    """Read route pieces and equipment in one pass over the file's tag/value pairs.

    Parameters
    ----------
    path : str or path-like
        The DXF file; only read.
    config : DrawingConfig, optional
        Layers, units override, tag attribute.
    marks_appid : str, optional
        Our XDATA application id: also keep what a writer appending to the
        drawing's bytes needs (``StreamContent.obstacles``,
        :mod:`.dxf_stream_scan`), leaving out the marks of an earlier run.

    Returns
    -------
    StreamContent
        What :func:`~.dxf_reader.read_dxf` returns for the same drawing (route
        pieces, equipment, units, issues, summary), without the document, plus
        ``$HANDSEED``, the version, text and insert records and extents.

    Raises
    ------
    StreamDeclined
        The drawing holds something this reader does not handle exactly (see
        the module docstring); read it with :func:`~.dxf_reader.read_dxf`.
    DrawingReadError
        Units the config names are unknown, or the drawing is unitless without
        them (as the full reader raises).
    """
    config = config or DrawingConfig()
    p = Path(path)
    if config.tags_from_text or config.tag_symbol_layers:
        raise StreamDeclined("tags_from_text or tag_symbol_layers is set")
    try:
        if not p.is_file() or p.stat().st_size == 0:
            raise StreamDeclined("not a non-empty file")
        data = p.read_bytes()
    except OSError as exc:
        raise StreamDeclined(f"cannot be read ({exc})") from exc
    if data.startswith(b"AutoCAD Binary DXF"):
        raise StreamDeclined("binary DXF")
    if b"\\U+" in data or b"\\u+" in data:
        raise StreamDeclined("\\U+ escapes in text")
    ascii_only = data.isascii()
    reader = _Reader(p, config)
    if marks_appid is not None:
        reader.collector = ObstacleCollector(marks_appid, lambda layer: reader.kind(layer) is not None)
    saw_eof = [False]
    text = io.TextIOWrapper(io.BytesIO(data), encoding="utf-8-sig", errors="strict")
    del data
    try:
        reader.run(_entities(iter(text), saw_eof))
    except UnicodeDecodeError as exc:
        raise StreamDeclined(f"text is not UTF-8 ({exc.reason})") from exc
    except (IndexError, KeyError) as exc:
        raise StreamDeclined(f"unexpected tag structure ({type(exc).__name__})") from exc
    except Declined as exc:
        raise StreamDeclined(str(exc)) from exc
    except ValueError as exc:  # a number in a table, block or hatch the collector reads
        raise StreamDeclined(f"a number cannot be read ({exc})") from exc
    if not saw_eof[0]:
        raise StreamDeclined("no EOF at the end (truncated or damaged)")
    version = str(reader.header.get("$ACADVER", "")).strip()
    if version < "AC1021" and not ascii_only:
        raise StreamDeclined(f"{version or 'no $ACADVER'} drawing with non-ASCII text (code page)")
    if not reader.raw_routes:
        raise StreamDeclined("no route entities (the full reader reports the layers used)")
    raw_units = reader.header.get("$INSUNITS", "0")
    try:
        code = int(str(raw_units).strip() or 0)
    except ValueError as exc:
        raise StreamDeclined(f"$INSUNITS {raw_units!r} is not a whole number") from exc
    doc = _Header({"$INSUNITS": code})
    issues: list[Issue] = []
    units = resolve_units(doc, p, config, issues)[0]  # type: ignore[arg-type]
    s = UNIT_TO_M[units]
    content = StreamContent(path=str(p), units=units, issues=issues, document=None,
                            handseed=str(reader.header.get("$HANDSEED", "")).strip(),
                            dxfversion=version, texts=reader.texts, inserts=reader.inserts,
                            extents=reader.box.value())
    if reader.collector is not None:
        content.obstacles = reader.collector.finish(
            version, content.handseed, str(reader.header.get("$DWGCODEPAGE", "")).strip(), reader.msp_owner)
    kinds = reader.kind
    for layer, pts, sid in reader.raw_routes:
        kind = kinds(layer)
        assert kind is not None
        pts_m = tuple((float(x) * s, float(y) * s, float(z) * s) for x, y, z in pts)
        content.polylines.append(RoutePolyline(pts_m, layer.upper(), kind[0], kind[1], sid))
    for tag, sid, (x, y, z), name, attributes in reader.equipment_raw:
        content.equipment.append(Equipment(tag=tag, source_id=sid, position_m=(x * s, y * s, z * s),
                                           block_name=name, attributes=attributes))
    content.summary = summarise(doc, p, config, content)  # type: ignore[arg-type]
    logger.info("%s: %d route pieces, %d equipment, units %s (streaming reader)",
                p, len(content.polylines), len(content.equipment), units)
    return content


def read_dxf_fast(path: str | os.PathLike[str], config: DrawingConfig | None = None, *,
                  marks_appid: str | None = None) -> DxfContent:
    """The streaming reader, or the full reader where the stream declines the drawing.

    Parameters
    ----------
    path : str or path-like
        The DXF file; only read.
    config : DrawingConfig, optional
        As for :func:`~.dxf_reader.read_dxf`.
    marks_appid : str, optional
        As for :func:`stream_dxf`.

    Returns
    -------
    DxfContent
        A :class:`StreamContent` (``document`` None) when streamed, else what
        :func:`~.dxf_reader.read_dxf` returns (the document kept).

    Raises
    ------
    DrawingReadError
        As :func:`~.dxf_reader.read_dxf`.
    """
    try:
        return stream_dxf(path, config, marks_appid=marks_appid)
    except StreamDeclined as exc:
        logger.info("%s: read with the full DXF reader: the streaming reader declined it (%s)",
                    path, exc.reason)
    return read_dxf(path, config)
