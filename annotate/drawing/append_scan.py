"""The drawing as the appending writer sees it: a scratch document of what marks avoid.

The streaming reader keeps, on its one pass, the layer table, the other tables'
names, the extents of the plain linework and the tags of the drawing's text,
block references, dimensions and curved hatches with the block definitions they
use (:class:`~cablewright.extract.dxf_stream_scan.StreamObstacles`).  Here those
entities are rebuilt by ezdxf's own entity loader into a new document of the
same DXF version, and the drawing writer's scan
(:func:`.obstacles.scan_modelspace`) measures them there exactly as it measures
them on the parsed drawing: the same text boxes, symbol boxes and extents, in
the same structure (:class:`.obstacles.DrawingScan`).  With ``avoid_linework``
the drawing's other linework is put in after the scan: the LWPOLYLINE, POLYLINE,
CIRCLE and ARC entities rebuilt the same way (so :func:`.linework.drawing_linework`
reads them, and the blocks and dimensions, as on the parsed drawing), the LINEs
as shapely lines straight from their end points (what ``drawing_linework`` makes
of a LINE; 35,000 of them on a 2,000-circuit plant, rebuilt they would cost
0.7 s).  Our marks are then added to that document (:func:`.mark_pass.add_marks`)
and copied into the original bytes (:mod:`.append_writer`).

References
----------
.. [1] ezdxf documentation: ``ezdxf.new``, ``ezdxf.entities.factory`` (``load``,
   ``bind``), ``ezdxf.lldxf.tagger.tag_compiler``, ``ExtendedTags``.
.. [2] shapely 2 manual, ``shapely.linestrings``.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import ezdxf
import numpy as np
import shapely
from cablewright.extract.dxf_stream_scan import Record, StreamObstacles
from ezdxf.entities import factory
from ezdxf.lldxf.extendedtags import ExtendedTags
from ezdxf.lldxf.tagger import tag_compiler
from ezdxf.lldxf.tags import Tags
from ezdxf.lldxf.types import BINARY_DATA, POINT_CODES, TYPE_TABLE, DXFTag, DXFVertex

from .obstacles import DrawingScan, scan_modelspace
from .style import AnnotateConfig

__all__ = ["ScratchDrawing", "scratch_drawing", "TABLE_NAMES"]

#: The tables our marks may add entries to: document attribute -> DXF table name.
TABLE_NAMES = {"layers": "LAYER", "linetypes": "LTYPE", "styles": "STYLE", "appids": "APPID"}


class ScratchDrawing:
    """A scratch document holding the drawing's tables and obstacles, and the scan of it.

    Attributes
    ----------
    doc : ezdxf.document.Drawing
    scan : DrawingScan
    first_handle : int
        Every entity and table entry with a handle from here on is ours (added
        after the scan): the appending writer copies exactly those.
    lines : sequence of shapely geometries
        The drawing's LINEs, for the marks to avoid (empty unless ``avoid_linework``).
    """

    def __init__(self, doc: Any, scan: DrawingScan, first_handle: int,
                 lines: Any = ()) -> None:
        self.doc = doc
        self.scan = scan
        self.first_handle = first_handle
        self.lines = lines

    def ours(self, entity: Any) -> bool:
        handle = entity.dxf.handle  # None: a rebuilt obstacle, never bound
        return handle is not None and int(handle, 16) >= self.first_handle


def _kept(tags: list[tuple[int, str]]) -> list[tuple[int, str]]:
    """The tags :func:`_clean` keeps, as they are."""
    kept = []
    group = subclass = False
    for c, v in tags:
        if c == 102:
            group = v.startswith("{")
            continue
        if group or c >= 1000 or c in (5, 105):
            continue
        if c == 100:
            subclass = True
        elif c == 330 and not subclass:  # the owner; a hatch's boundary objects follow later
            continue
        kept.append((c, v))
    return kept


def _clean(kind: str, tags: list[tuple[int, str]]) -> list[DXFTag]:
    """Tags to rebuild from: no handle, owner, application groups or extended data."""
    return [DXFTag(0, kind), *(DXFTag(c, v) for c, v in _kept(tags))]


#: Ends the tags given to ``tag_compiler``: it reads one tag past a 2D point (for a z
#: value), so a record ending in a point (an LWPOLYLINE's last vertex) needs one more.
_END = DXFTag(0, "EOF")


def _compiled(kind: str, tags: list[tuple[int, str]]) -> list[DXFTag] | None:
    """:func:`_clean` and ``tag_compiler`` in one pass over plain tuples, or None.

    The same tags as ``tag_compiler`` gives (points as ``DXFVertex`` of x, y[, z],
    values typed by ``TYPE_TABLE``), built without a ``DXFTag`` per raw tag and
    without the generator; None for anything it would treat otherwise (binary
    data, a point without its y, a value that does not convert), which is then
    compiled by ``tag_compiler`` itself.
    """
    kept = _kept(tags)
    out = [DXFTag(0, kind.strip())]
    append = out.append
    typed = TYPE_TABLE.get
    i, n = 0, len(kept)
    try:
        while i < n:
            c, v = kept[i]
            if c in POINT_CODES:
                if i + 1 >= n or kept[i + 1][0] != c + 10:
                    return None
                if i + 2 < n and kept[i + 2][0] == c + 20:
                    append(DXFVertex(c, (float(v), float(kept[i + 1][1]), float(kept[i + 2][1]))))
                    i += 3
                else:
                    append(DXFVertex(c, (float(v), float(kept[i + 1][1]))))
                    i += 2
            elif c in BINARY_DATA:
                return None
            else:
                append(DXFTag(c, typed(c, str)(v)))
                i += 1
    except ValueError:
        return None
    return out


def _load(doc: Any, kind: str, tags: list[tuple[int, str]], bind: bool) -> Any:
    compiled = _compiled(kind, tags)
    if compiled is None:
        compiled = list(tag_compiler(iter([*_clean(kind, tags), _END])))[:-1]
    entity = factory.load(ExtendedTags(Tags(compiled)), doc)
    if bind:
        factory.bind(entity, doc)
    return entity


def _invisible(tags: list[tuple[int, str]]) -> bool:
    """An ATTRIB with flag 1 (invisible, DXF reference ATTRIB group 70): not measured."""
    return any(c == 70 and int(v) & 1 for c, v in tags)


def _rebuild(doc: Any, record: Record, bind: bool = True) -> Any:
    """One entity with its visible attributes or its vertices, not yet in a layout.

    Model-space entities are not bound to the document's entity database
    (``bind=False``, but dimensions): the scan only reads them, and nothing of them
    is written (bound ones get handles below :attr:`ScratchDrawing.first_handle`).
    """
    kind, tags, children = record
    entity = _load(doc, kind, tags, bind)
    for child_kind, child_tags in children:
        if child_kind == "ATTRIB" and not _invisible(child_tags):
            entity.attribs.append(_load(doc, child_kind, child_tags, bind))
        elif child_kind == "VERTEX":
            entity.vertices.append(_load(doc, child_kind, child_tags, bind))
    return entity


def _blocks_used(records: list[Record]) -> set[str]:
    names = set()
    for kind, tags, _ in records:
        if kind in ("INSERT", "DIMENSION"):
            name = next((v for c, v in tags if c == 2), "")
            if name:
                names.add(name.upper())
    return names


def _add_blocks(doc: Any, obstacles: StreamObstacles, wanted: set[str]) -> None:
    """The block definitions the rebuilt entities use (and those they use in turn)."""
    done: set[str] = set()
    while wanted - done:
        name = sorted(wanted - done)[0]
        done.add(name)
        found = obstacles.blocks.get(name)
        if found is None or doc.blocks.get(name) is not None:
            continue
        block_name, base, records = found
        block = doc.blocks.new(block_name, base_point=base)
        for record in records:
            if record[0] != "ATTDEF":
                block.add_entity(_rebuild(doc, record))
        wanted |= _blocks_used(records)


def _tables(doc: Any, obstacles: StreamObstacles) -> None:
    for name, color, ours in obstacles.layers:
        layer = doc.layers.get(name) if doc.layers.has_entry(name) else doc.layers.add(name)
        layer.dxf.color = color
        if ours:
            layer.set_xdata(obstacles.appid, [(1000, "cablewright layer")])
    for name in obstacles.linetypes:
        if not doc.linetypes.has_entry(name):
            doc.linetypes.add(name, pattern=[0.0])
    for name in obstacles.styles:  # with their fonts: the drawing's texts are measured by them
        font = obstacles.style_fonts.get(name) or "txt"
        if doc.styles.has_entry(name):  # STANDARD, made by ezdxf.new
            doc.styles.get(name).dxf.font = font
        else:
            doc.styles.add(name, font=font)
    for name in obstacles.appids:
        if not doc.appids.has_entry(name):
            doc.appids.add(name)


def _linework(doc: Any, obstacles: StreamObstacles) -> Any:
    """The drawing's linework put in the scratch modelspace (after its scan); its LINEs as shapely lines."""
    space = doc.modelspace().entity_space
    for record in obstacles.linework:
        space.add(_rebuild(doc, record, bind=False))
    ends = np.frombuffer(obstacles.lines, dtype=float).reshape(-1, 2, 2)
    return shapely.linestrings(ends)


def scratch_drawing(obstacles: StreamObstacles, config: AnnotateConfig,
                    measure: Callable[[str], float], route_layers: list[str]) -> ScratchDrawing:
    """The scratch document of a streamed drawing and the scan of its obstacles.

    Parameters
    ----------
    obstacles : StreamObstacles
        From ``stream_dxf(..., marks_appid=config.appid)``.
    config : AnnotateConfig
    measure : callable
        Advance width at height 1 (as the full writer measures text).
    route_layers : list of str
        The route layers of the measurement: the explicit colours of their
        entities are put on them, so our colours avoid them as on the drawing.
    """
    doc = ezdxf.new(obstacles.dxfversion)
    _tables(doc, obstacles)
    _add_blocks(doc, obstacles, _blocks_used(obstacles.entities))
    msp = doc.modelspace()
    space = msp.entity_space
    for record in obstacles.entities:
        # a DIMENSION is drawn from its block only when bound (ezdxf takes an unbound
        # entity for a virtual one, without block content): measured and its lines read
        space.add(_rebuild(doc, record, bind=record[0] == "DIMENSION"))
    scan = scan_modelspace(doc, measure)
    if obstacles.box is not None:
        scan.take(obstacles.box[0], obstacles.box[1])
        scan.take(obstacles.box[2], obstacles.box[3])
    lines = _linework(doc, obstacles) if config.avoid_linework else ()
    # after the scan: the explicit colours on route layers, for mark_style.route_colors
    if route_layers:
        for color in sorted(obstacles.route_colors):
            msp.add_point((0.0, 0.0), dxfattribs={"layer": route_layers[0], "color": color})
    handles = doc.entitydb.handles
    seed = max(int(obstacles.handseed, 16), int(str(handles), 16))
    handles.reset(f"{seed:X}")
    return ScratchDrawing(doc, scan, seed, lines)
