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

import logging
import math
import os
from dataclasses import dataclass, field
from pathlib import Path
from typing import NamedTuple

from .dxf_flatten import FLATTEN_TYPES
from .dxf_reader import DxfContent, _arc_points, _bulged_chain, read_dxf
from .dxf_units import resolve_units, summarise
from .errors import Issue
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
    """A model-space TEXT, MTEXT or ATTRIB as written (drawing units, degrees)."""

    kind: str
    text: str
    insert: Point3
    height: float
    rotation_deg: float
    handle: str


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


def _pairs(data: bytes) -> tuple[list[int], list[str], str]:
    """Group codes (int) and values of a DXF file's line pairs, and the text's check notes."""
    if data.startswith(b"AutoCAD Binary DXF"):
        raise StreamDeclined("binary DXF")
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise StreamDeclined(f"text is not UTF-8 ({exc.reason} at byte {exc.start})") from exc
    if text.startswith("\ufeff"):
        text = text[1:]
    if "\r" in text:
        text = text.replace("\r\n", "\n").replace("\r", "\n")
    lines = text.split("\n")
    if len(lines) % 2:
        lines.pop()  # the empty string after the final newline
    try:
        codes = list(map(int, lines[0::2]))
    except ValueError as exc:
        raise StreamDeclined(f"a group code is not a number ({exc})") from exc
    return codes, lines[1::2], text


def _finite(*values: float) -> None:
    for v in values:
        if not math.isfinite(v):
            raise StreamDeclined("a coordinate is not a finite number")


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
    """The tags of one entity (codes < 1000, outside 102 groups), first value of each code kept."""

    kind: str
    first: dict[int, str]
    tags: list[tuple[int, str]]

    def get(self, code: int, default: str = "") -> str:
        return self.first.get(code, default)

    def num(self, code: int, default: float = 0.0) -> float:
        v = self.first.get(code)
        return default if v is None else _float(v)


def _entity(kind: str, codes: list[int], values: list[str], a: int, b: int, keep: bool) -> _Entity:
    first: dict[int, str] = {}
    tags: list[tuple[int, str]] = []
    group = False
    for k in range(a, b):
        c = codes[k]
        if c == 102:
            group = values[k].startswith("{")
            continue
        if group or c >= 1000:
            continue
        if c not in first:
            first[c] = values[k]
        if keep:
            tags.append((c, values[k]))
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
    codes: list[int]
    values: list[str]
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

    def kind(self, layer: str) -> tuple[str, str] | None:
        if layer not in self._kind_cache:
            self._kind_cache[layer] = self.config.layer_kind(layer)
        return self._kind_cache[layer]

    # ------------------------------------------------------------------ structure

    def run(self) -> None:
        codes, values = self.codes, self.values
        starts = [i for i, c in enumerate(codes) if c == 0]
        if not starts or values[starts[-1]] != "EOF":
            raise StreamDeclined("no EOF at the end (truncated or damaged)")
        if any(c == 999 for c in codes):
            raise StreamDeclined("comment tags (999)")
        j = 0
        end = len(starts) - 1
        while j < end:
            s = starts[j]
            if values[s] != "SECTION" or codes[s + 1] != 2:
                raise StreamDeclined(f"{values[s]!r} outside a section at line {2 * s + 1}")
            name = values[s + 1]
            k = j + 1
            while k < end and values[starts[k]] != "ENDSEC":
                k += 1
            if k >= end:
                raise StreamDeclined(f"section {name} has no ENDSEC")
            if name == "HEADER":
                self.read_header(s + 2, starts[k])
            elif name == "TABLES":
                self.read_tables(starts[j + 1:k + 1])
            elif name == "BLOCKS":
                self.read_blocks(starts[j + 1:k + 1])
            elif name == "ENTITIES":
                self.read_entities(starts[j + 1:k + 1])
            j = k + 1

    def read_header(self, a: int, b: int) -> None:
        codes, values = self.codes, self.values
        wanted = {"$INSUNITS", "$HANDSEED", "$ACADVER", "$DWGCODEPAGE"}
        for k in range(a, b):
            if codes[k] == 9 and values[k] in wanted and k + 1 < b:
                self.header[values[k]] = values[k + 1]

    def read_tables(self, starts: list[int]) -> None:
        codes, values = self.codes, self.values
        for s, nxt in zip(starts, starts[1:], strict=False):
            if values[s] != "BLOCK_RECORD":
                continue
            e = _entity("BLOCK_RECORD", codes, values, s + 1, nxt, False)
            name = e.get(2).upper()
            if name == "*MODEL_SPACE":
                self.msp_owner = e.get(5)
            elif name == "*PAPER_SPACE":
                self.psp_owner = e.get(5)

    def read_blocks(self, starts: list[int]) -> None:
        """Per block: route-layer geometry, layer-0 geometry, block references (as the full reader's ``block_info``)."""
        codes, values = self.codes, self.values
        current: str | None = None
        explicit = layer0 = inserts = False
        for s, nxt in zip(starts, starts[1:], strict=False):
            t = values[s]
            if t == "BLOCK":
                current = _entity("BLOCK", codes, values, s + 1, nxt, False).get(2).upper()
                explicit = layer0 = inserts = False
            elif t == "ENDBLK":
                if current is None:
                    raise StreamDeclined("ENDBLK without BLOCK")
                self.blocks[current] = (explicit, layer0, inserts)
                current = None
            elif current is None:
                raise StreamDeclined(f"{t} outside a block definition")
            elif t in _ROUTE_TYPES or t in FLATTEN_TYPES:
                layer = _entity(t, codes, values, s + 1, nxt, False).get(8, "0")
                if layer == "0":
                    layer0 = True
                elif self.kind(layer) is not None:
                    explicit = True
            elif t in ("INSERT", "MINSERT"):
                inserts = True
        if current is not None:
            raise StreamDeclined(f"block {current} has no ENDBLK")

    # ------------------------------------------------------------------ entities

    def in_paper_space(self, e: _Entity) -> bool:
        owner = e.get(330)
        if owner and owner == self.msp_owner:
            return False
        if owner and owner == self.psp_owner:
            return True
        return e.get(67, "0").strip() == "1"

    def read_entities(self, starts: list[int]) -> None:
        codes, values = self.codes, self.values
        n = len(starts) - 1  # the last start is ENDSEC
        j = 0
        route_kinds = _ROUTE_TYPES
        while j < n:
            s, nxt = starts[j], starts[j + 1]
            t = values[s]
            j += 1
            if t in ("VERTEX", "ATTRIB", "SEQEND"):
                raise StreamDeclined(f"{t} without its POLYLINE or INSERT at line {2 * s + 1}")
            if t == "INSERT":
                j = self.insert(starts, j - 1)
                continue
            if t == "POLYLINE":
                j = self.polyline(starts, j - 1)
                continue
            if t in route_kinds or t in FLATTEN_TYPES or t == "CIRCLE":
                e = _entity(t, codes, values, s + 1, nxt, False)
                if self.in_paper_space(e):
                    continue
                layer = e.get(8, "0")
                on_route = self.kind(layer) is not None
                if t in FLATTEN_TYPES:
                    if on_route:
                        raise StreamDeclined(f"{t} on route layer {layer}")
                    continue
                if t == "CIRCLE":
                    if on_route:
                        raise StreamDeclined(f"CIRCLE on route layer {layer}")
                    cx, cy, r = e.num(10), e.num(20), e.num(40)
                    self.box.take(cx - r, cy - r)
                    self.box.take(cx + r, cy + r)
                    continue
                self.route(e, layer, on_route, s + 1, nxt)
            elif t in ("TEXT", "MTEXT"):
                e = _entity(t, codes, values, s + 1, nxt, False)
                if self.in_paper_space(e):
                    continue
                height = e.num(40, 2.5)
                rot = e.num(50, 0.0)
                x, y, z = e.num(10), e.num(20), e.num(30)
                self.box.take(x, y)
                text = e.get(1) if t == "TEXT" else "".join(
                    v for c, v in _entity(t, codes, values, s + 1, nxt, True).tags if c in (1, 3))
                self.texts.append(TextRecord(t, text, (x, y, z), height, rot, e.get(5)))
            elif t == "MINSERT":
                raise StreamDeclined("MINSERT")

    def route(self, e: _Entity, layer: str, on_route: bool, a: int, b: int) -> None:
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
            verts = self.lw_vertices(a, b)
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

    def lw_vertices(self, a: int, b: int) -> list[tuple[float, float, float]]:
        """(x, y, bulge) vertices of an LWPOLYLINE whose tags are ``a:b``, in order."""
        codes, values = self.codes, self.values
        verts: list[list[float]] = []
        for k in range(a, b):
            c = codes[k]
            if c == 10:
                verts.append([_float(values[k]), 0.0, 0.0])
            elif c == 20 and verts:
                verts[-1][1] = _float(values[k])
            elif c == 42 and verts:
                verts[-1][2] = _float(values[k])
            elif c >= 1000:
                break
        return [(x, y, bz) for x, y, bz in verts]

    def handle(self, e: _Entity) -> str:
        h = e.get(5)
        if not h:
            raise StreamDeclined(f"a {e.kind} has no handle")
        return h

    def polyline(self, starts: list[int], j: int) -> int:
        codes, values = self.codes, self.values
        s, nxt = starts[j], starts[j + 1]
        e = _entity("POLYLINE", codes, values, s + 1, nxt, False)
        j += 1
        vertices: list[_Entity] = []
        while True:
            if j >= len(starts) - 1:
                raise StreamDeclined("POLYLINE without SEQEND")
            vs, vn = starts[j], starts[j + 1]
            t = values[vs]
            j += 1
            if t == "SEQEND":
                break
            if t != "VERTEX":
                raise StreamDeclined(f"POLYLINE followed by {t}, not VERTEX or SEQEND")
            vertices.append(_entity("VERTEX", codes, values, vs + 1, vn, False))
        if self.in_paper_space(e):
            return j
        layer = e.get(8, "0")
        on_route = self.kind(layer) is not None
        flags = _int(e.get(70, "0"))
        sid = self.handle(e) if on_route else e.get(5)
        if flags & (_POLY_MESH | _POLY_FACE):
            if on_route:
                raise StreamDeclined(f"POLYLINE {sid} on route layer {layer} is a mesh")
            return j
        closed = bool(flags & 1)
        if flags & _POLY_3D:
            pts: list[Point3] = [(v.num(10), v.num(20), v.num(30)) for v in vertices]
            if closed and pts:
                pts.append(pts[0])
        else:
            if not _default_extrusion(e):
                if not on_route:
                    return j
                raise StreamDeclined(f"POLYLINE {sid} on {layer} has a non-default extrusion")
            elevation = e.num(30, 0.0) if 10 in e.first else 0.0
            verts = [(v.num(10), v.num(20), v.num(42, 0.0)) for v in vertices]
            pts = [(float(x), float(y), float(z)) for x, y, z in _bulged_chain(verts, closed, elevation)]
        for p in pts:
            self.box.take(p[0], p[1])
        if on_route:
            self.raw_routes.append((layer, pts, sid))
        return j

    def insert(self, starts: list[int], j: int) -> int:
        codes, values = self.codes, self.values
        s, nxt = starts[j], starts[j + 1]
        e = _entity("INSERT", codes, values, s + 1, nxt, False)
        j += 1
        attribs: list[_Entity] = []
        if _int(e.get(66, "0")):
            while True:
                if j >= len(starts) - 1:
                    raise StreamDeclined("INSERT without SEQEND")
                a, an = starts[j], starts[j + 1]
                t = values[a]
                j += 1
                if t == "SEQEND":
                    break
                if t != "ATTRIB":
                    raise StreamDeclined(f"INSERT followed by {t}, not ATTRIB or SEQEND")
                attribs.append(_entity("ATTRIB", codes, values, a + 1, an, False))
        if self.in_paper_space(e):
            return j
        if _int(e.get(70, "1") or "1") * _int(e.get(71, "1") or "1") > 1:
            raise StreamDeclined("MINSERT (an INSERT with rows or columns)")
        name = e.get(2)
        layer = e.get(8, "0")
        sid = self.handle(e)
        if not _default_extrusion(e):
            raise StreamDeclined(f"INSERT {sid} has a non-default extrusion")
        explicit, layer0, nested = self.blocks.get(name.upper(), (False, False, False))
        if explicit or nested or (layer0 and self.kind(layer) is not None):
            raise StreamDeclined(f"block {name} (INSERT {sid}) holds route geometry or block references")
        p = (e.num(10), e.num(20), e.num(30))
        self.box.take(p[0], p[1])
        pairs = {}
        for a in attribs:
            pairs[a.get(2).upper()] = a.get(1)
            if not _int(a.get(70, "0")) & 1:  # not invisible (ATTRIB flag 1)
                ax, ay, az = a.num(10), a.num(20), a.num(30)
                self.box.take(ax, ay)
                self.texts.append(TextRecord("ATTRIB", a.get(1), (ax, ay, az), a.num(40, 2.5),
                                             a.num(50, 0.0), a.get(5)))
        self.inserts.append(InsertRecord(name, p, (e.num(41, 1.0), e.num(42, 1.0), e.num(43, 1.0)),
                                         e.num(50, 0.0), layer, sid))
        tag = pairs.get(self.config.tag_attribute.upper(), "").strip()
        if tag:
            self.equipment_raw.append((tag, sid, p, name, tuple(sorted(pairs.items()))))
        return j


def stream_dxf(path: str | os.PathLike[str], config: DrawingConfig | None = None) -> StreamContent:
    """Read route pieces and equipment in one pass over the file's tag/value pairs.

    Parameters
    ----------
    path : str or path-like
        The DXF file; only read.
    config : DrawingConfig, optional
        Layers, units override, tag attribute.

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
    codes, values, text = _pairs(data)
    if "\\U+" in text or "\\u+" in text:
        raise StreamDeclined("\\U+ escapes in text")
    reader = _Reader(p, config, codes, values)
    try:
        reader.run()
    except (IndexError, KeyError) as exc:
        raise StreamDeclined(f"unexpected tag structure ({type(exc).__name__})") from exc
    version = str(reader.header.get("$ACADVER", "")).strip()
    if version < "AC1021" and not data.isascii():
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


def read_dxf_fast(path: str | os.PathLike[str], config: DrawingConfig | None = None) -> DxfContent:
    """The streaming reader, or the full reader where the stream declines the drawing.

    Parameters
    ----------
    path : str or path-like
        The DXF file; only read.
    config : DrawingConfig, optional
        As for :func:`~.dxf_reader.read_dxf`.

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
        return stream_dxf(path, config)
    except StreamDeclined as exc:
        logger.info("%s: read with the full DXF reader: the streaming reader declined it (%s)",
                    path, exc.reason)
    return read_dxf(path, config)
