"""Our marks spliced into the original DXF bytes: no parse, no save of the whole drawing.

The original file is copied as it is, except:

* ``$HANDSEED`` moved past our new handles (and ``$VERSIONGUID`` / ``$INSUNITS``
  set when the caller gives them);
* our new layers, leader linetype, text style and application id appended to
  their tables, each table's entry count (group 70 of its TABLE) raised to match;
* in the ENTITIES section, the marks of an earlier run (our XDATA application
  id, or on a layer of ours) cut out with their ATTRIB/VERTEX/SEQEND sub-entities,
  and our new entities appended before ``ENDSEC``, owned by the model-space
  BLOCK_RECORD: written from templates (:mod:`.append_templates`), the types
  without one exported by ezdxf.

The tag structure is found with regular expressions anchored on whole lines: a
group code line is a number, so a line ``0`` followed by a line that is a name
(``TEXT``, ``ENDSEC``) is always a code/value pair, never a value followed by a
code; the same holds for ``9``/``$HANDSEED``, ``1001``/application id and
``8``/layer name.  Whatever does not fit (a table or section missing, a table
without a handle, a pointer of our entities to something not ours) raises
:class:`AppendDeclined` and the full writer takes the drawing.

References
----------
.. [1] Autodesk, DXF Reference (AutoCAD 2012): "DXF Format" (group code/value
   lines), HEADER ($HANDSEED "next available handle", $VERSIONGUID, $INSUNITS),
   TABLES (TABLE group 5 handle, group 70 maximum number of entries), "Common
   Group Codes for Entities" (5 handle, 330 owner, 8 layer), extended data
   (1001 application name), group codes 320-369 and 390-399 (handles and pointers).
"""

from __future__ import annotations

import bisect
import re
from collections.abc import Iterable, Mapping
from collections.abc import Set as AbstractSet
from typing import Any

from ezdxf.lldxf.tagwriter import TagCollector
from ezdxf.lldxf.types import DXFTag
from ezdxf.tools.codepage import toencoding

from .append_scan import TABLE_NAMES, ScratchDrawing
from .append_templates import entity_text

__all__ = ["AppendDeclined", "splice_marks"]

_SECTION = re.compile(rb"(?m)^ *0\r?\nSECTION\r?\n *2\r?\n([A-Za-z_]+)\r?$")
_ENDSEC = re.compile(rb"(?m)^ *0\r?\nENDSEC\r?$")
#: a record start: code 0 and a name with a letter in it (a group code line is digits only)
_START = re.compile(rb"(?m)^ *0\r?\n([A-Za-z0-9_]*[A-Za-z_][A-Za-z0-9_]*)\r?$")
_ENDTAB = re.compile(rb"(?m)^ *0\r?\nENDTAB\r?$")
_SUB_ENTITIES = {b"ATTRIB", b"VERTEX", b"SEQEND"}
#: Pointer and handle group codes (DXF reference, "Group Code Value Types").
_POINTERS = set(range(320, 370)) | set(range(390, 400)) | {480, 481, 1005}
#: Layer attributes pointing into the scratch document's OBJECTS (plot style, material):
#: left out, a layer without them is valid and takes the defaults.
_LAYER_DROPPED = {390, 347}


class AppendDeclined(Exception):
    """The appending writer does not handle this drawing; ``reason`` says why."""

    def __init__(self, reason: str) -> None:
        super().__init__(reason)
        self.reason = reason


def _sections(data: bytes) -> dict[bytes, tuple[int, int]]:
    """Section name -> (end of its ``2 NAME`` line, start of its ``0 ENDSEC`` line)."""
    out = {}
    for m in _SECTION.finditer(data):
        end = _ENDSEC.search(data, m.end())
        if end is None:
            raise AppendDeclined(f"section {m.group(1).decode()} has no ENDSEC")
        out[m.group(1).upper()] = (m.end() + 1, end.start())
    return out


def _header_var(data: bytes, span: tuple[int, int], name: str) -> re.Match[bytes] | None:
    pattern = rb"(?m)^ *9\r?\n" + re.escape(name.encode()) + rb"\r?\n *(\d+)\r?\n([^\r\n]*)(\r?)$"
    return re.compile(pattern).search(data, span[0], span[1])


def _tag_text(tags: Iterable[DXFTag], owner: str, first_handle: int,
              drop: AbstractSet[int] = frozenset()) -> str:
    """An exported entity as DXF text, owned by ``owner``; other pointers must be to ours."""
    out = []
    owned = False
    for tag in tags:
        code = tag.code
        if code in drop:
            continue
        if code == 330 and not owned:
            tag, owned = DXFTag(330, owner), True
        elif code in _POINTERS:
            value = str(tag.value)
            if not _is_ours(value, first_handle):
                raise AppendDeclined(f"a mark points to {value} (group {code}), not ours")
        out.append(tag.dxfstr())
    return "".join(out)


def _is_ours(handle: str, first_handle: int) -> bool:
    try:
        return int(handle, 16) >= first_handle
    except ValueError:
        return False


def _export(entity: Any, version: str) -> list[DXFTag]:
    collector = TagCollector(dxfversion=version, optional=False)  # as ezdxf's own save writes
    entity.export_dxf(collector)
    return collector.tags


def _mark_text(entity: Any, owner: str, first_handle: int, version: str) -> str:
    """One of our entities as DXF text: from its template, else exported by ezdxf."""
    text = entity_text(entity, owner, version)
    if text is not None:
        return text
    return _tag_text(_export(entity, version), owner, first_handle)


def _table_edits(data: bytes, span: tuple[int, int], scratch: ScratchDrawing,
                 encode) -> list[tuple[int, int, bytes]]:
    """Our new table entries at the end of their tables; the tables' counts raised."""
    doc = scratch.doc
    edits = []
    for attr, dxf_name in TABLE_NAMES.items():
        table = getattr(doc, attr)
        new = [e for e in table if scratch.ours(e)]
        if not new:
            continue
        head = re.compile(rb"(?m)^ *0\r?\nTABLE\r?\n *2\r?\n" + dxf_name.encode() + rb"\r?$")
        m = head.search(data, span[0], span[1])
        end = _ENDTAB.search(data, m.end(), span[1]) if m else None
        if m is None or end is None:
            raise AppendDeclined(f"no {dxf_name} table")
        start = _START.search(data, m.end(), end.end())
        if start is None:
            raise AppendDeclined(f"the {dxf_name} table has no entries section")
        head_end = start.start()
        handle = re.search(rb"(?m)^ *5\r?\n *([0-9A-Fa-f]+)\r?$", data[m.end():head_end])
        count = re.search(rb"(?m)^ *70\r?\n *(-?\d+)(\r?)$", data[m.end():head_end])
        if handle is None or count is None:
            raise AppendDeclined(f"the {dxf_name} table has no handle or no entry count")
        owner = handle.group(1).decode()
        drop = _LAYER_DROPPED if dxf_name == "LAYER" else set()
        text = "".join(_tag_text(_export(e, doc.dxfversion), owner, scratch.first_handle, drop)
                       for e in new)
        edits.append((end.start(), end.start(), encode(text)))
        at = m.end() + count.start(1)
        edits.append((at, m.end() + count.end(1), str(int(count.group(1)) + len(new)).encode()))
    return edits


def _old_marks(data: bytes, span: tuple[int, int], appid: str,
               our_layers: list[str]) -> tuple[list[tuple[int, int, bytes]], int]:
    """Cuts removing an earlier run's marks from the ENTITIES section; how many."""
    patterns = [rb"^ *1001\r?\n" + re.escape(appid.encode()) + rb"\r?$"]
    if our_layers:
        names = b"|".join(re.escape(n.encode()) for n in our_layers)
        patterns.append(rb"^ *8\r?\n(?i:" + names + rb")\r?$")
    hits = [m.start() for p in patterns for m in re.finditer(b"(?m)" + p, data[span[0]:span[1]])]
    if not hits:
        return [], 0
    starts, kinds = [], []
    for m in _START.finditer(data, span[0], span[1]):
        starts.append(m.start() - span[0])
        kinds.append(m.group(1).upper())
    starts.append(span[1] - span[0])
    doomed: set[int] = set()
    for pos in hits:
        i = bisect.bisect_right(starts, pos) - 1
        if i < 0 or i >= len(kinds) or kinds[i] in _SUB_ENTITIES or i in doomed:
            continue
        doomed.add(i)
        j = i + 1
        while j < len(kinds) and kinds[j] in _SUB_ENTITIES and kinds[i] in (b"INSERT", b"POLYLINE"):
            doomed.add(j)
            j += 1
            if kinds[j - 1] == b"SEQEND":
                break
    cuts = [(span[0] + starts[i], span[0] + starts[i + 1], b"") for i in sorted(doomed)]
    return cuts, sum(1 for i in doomed if kinds[i] not in _SUB_ENTITIES)


def splice_marks(data: bytes, scratch: ScratchDrawing, obstacles: Any,
                 header: Mapping[str, tuple[int, str]] | None = None) -> tuple[bytes, int]:
    """The original bytes with our marks in place of an earlier run's.

    Parameters
    ----------
    data : bytes
        The original DXF file.
    scratch : ScratchDrawing
        Our marks (entities and table entries from ``scratch.first_handle`` on).
    obstacles : StreamObstacles
        Application id, our layers, model-space block record, code page.
    header : mapping, optional
        Header variables to set: name -> (group code, value), e.g.
        ``{"$INSUNITS": (70, "6")}``; added at the end of the HEADER when missing.

    Returns
    -------
    (bytes, int)
        The annotated drawing and the number of old marks removed.
    """
    eol = "\r\n" if b"\r\n" in data[:256] else "\n"
    version = obstacles.dxfversion
    encoding = "utf8" if version >= "AC1021" else toencoding(obstacles.codepage or "ANSI_1252")

    def encode(text: str) -> bytes:
        return (text.replace("\n", eol) if eol != "\n" else text).encode(encoding, errors="dxfreplace")

    sections = _sections(data)
    for section in (b"HEADER", b"TABLES", b"ENTITIES"):
        if section not in sections:
            raise AppendDeclined(f"no {section.decode()} section")
    if not obstacles.msp_owner:
        raise AppendDeclined("no model-space BLOCK_RECORD handle")
    doc = scratch.doc
    msp = doc.modelspace()
    ours = [e for e in msp if scratch.ours(e)]
    marks_text = "".join(_mark_text(e, obstacles.msp_owner, scratch.first_handle, doc.dxfversion)
                         for e in ours)
    edits = _table_edits(data, sections[b"TABLES"], scratch, encode)
    removed = 0
    if obstacles.appid.upper() in {a.upper() for a in obstacles.appids}:
        cuts, removed = _old_marks(data, sections[b"ENTITIES"], obstacles.appid,
                                   [n for n, _, mine in obstacles.layers if mine])
        edits += cuts
    end = sections[b"ENTITIES"][1]
    edits.append((end, end, encode(marks_text)))
    values = {"$HANDSEED": (5, str(doc.entitydb.handles)), **(header or {})}
    head = sections[b"HEADER"]
    for name, (code, value) in values.items():
        m = _header_var(data, head, name)
        if m is not None:
            edits.append((m.start(2), m.end(2), encode(str(value))))
        elif name == "$HANDSEED":
            raise AppendDeclined("no $HANDSEED")
        else:
            edits.append((head[1], head[1], encode(f"  9\n{name}\n{code:>3}\n{value}\n")))
    return _apply(data, edits), removed


def _apply(data: bytes, edits: list[tuple[int, int, bytes]]) -> bytes:
    out, at = [], 0
    for start, stop, text in sorted(edits, key=lambda e: (e[0], e[1])):
        if start < at:
            raise AppendDeclined("overlapping edits (damaged structure)")
        out += [data[at:start], text]
        at = stop
    out.append(data[at:])
    return b"".join(out)
