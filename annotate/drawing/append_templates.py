"""Our marks as DXF text straight from templates: the tags ezdxf's export writes, without it.

The appending writer copies the entities our marks are made of (TEXT, MTEXT,
LINE, LWPOLYLINE with our XDATA) into the original bytes.  Exporting each one
through ezdxf (``export_dxf`` into a ``TagCollector``, then ``dxfstr`` tag by
tag) cost most of the splice: about 12,500 entities at 2,000 circuits.  Here
each of those types is written from a string template holding the same group
codes in the same order as ezdxf 1.4's ``export_entity`` of that type writes
them for DXF R2000 and later, with the same rule for optional attributes
(written only when set and different from the default, non-optional ones always,
their default when unset), handle, owner, layer and XDATA.

An entity is templated only when everything it holds is covered: its DXF
attributes are all among those its template knows (``_KNOWN``), it has no
application data, reactors, extension dictionary or proxy graphic, its XDATA
groups are plain strings and numbers, an MTEXT has no columns, and the version
is R2000 or later.  Anything else returns ``None`` and the caller exports it
with ezdxf as before; ``tests/test_append_templates.py`` holds every template
equal to ezdxf's export tag by tag.

References
----------
.. [1] Autodesk, DXF Reference (AutoCAD 2012): "Common Group Codes for
   Entities" (0, 5, 330, 100 AcDbEntity, 8, 6, 62), TEXT (AcDbText: 10/20/30,
   40, 1, 50, 7, 72, 11/21/31, 73), MTEXT (AcDbMText: 10/20/30, 40, 41, 71, 3,
   1, 7, 50, 73, 44), LINE (AcDbLine: 10, 11), LWPOLYLINE (AcDbPolyline: 90,
   70, 38, 10/20, 40, 41, 42), extended data (1001, 1000-1071).
.. [2] ezdxf 1.4 source: ``DXFEntity.export_base_class``,
   ``DXFGraphic.export_acdb_entity``, ``Text.export_acdb_text``,
   ``MText.export_entity`` (``export_mtext_content``: chunks of 250
   characters, never split after ``^``), ``Line.export_entity``,
   ``LWPolyline.export_entity``, ``DXFNamespace._export_dxf_attribute_optional``,
   ``lldxf.types.TAG_STRING_FORMAT`` (``"%3d\\n%s\\n"``).
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from ezdxf.tools.text import escape_dxf_line_endings, split_mtext_string

__all__ = ["TEMPLATED_TYPES", "entity_text"]

#: The first DXF version the templates write: R2000 (handles and owners on
#: every entity, subclass markers); older versions are exported by ezdxf.
_FIRST_VERSION = "AC1015"
#: MTEXT content is cut into chunks of this many characters (ezdxf
#: ``export_mtext_content``; DXF reference, MTEXT group 3 "additional text
#: (always in 250-character chunks)").
_MTEXT_CHUNK = 250
#: XDATA group codes written as they are: strings, control string, layer name,
#: reals and integers (DXF reference, "Group Codes in Extended Data"); a
#: handle (1005), points (1010-1033) or binary data (1004) make the entity exported.
_XDATA_PLAIN = frozenset({1000, 1001, 1002, 1003, 1040, 1041, 1042, 1070, 1071})
#: Attributes of the base class and of AcDbEntity the templates write (others: exported).
_BASE = frozenset({"handle", "owner", "layer", "linetype", "color"})
#: Per templated type, the DXF attributes its template writes.
_KNOWN = {
    "TEXT": _BASE | {"insert", "height", "text", "rotation", "style", "halign",
                     "align_point", "valign"},
    "MTEXT": _BASE | {"insert", "char_height", "width", "attachment_point", "style",
                      "rotation", "line_spacing_style", "line_spacing_factor"},
    "LINE": _BASE | {"start", "end"},
    "LWPOLYLINE": _BASE | {"flags", "elevation"},
}
TEMPLATED_TYPES = frozenset(_KNOWN)
#: The same with ezdxf's back-link of a namespace to its entity (not a DXF attribute).
_KNOWN_NS = {kind: names | {"_entity"} for kind, names in _KNOWN.items()}
#: ezdxf's defaults of the optional attributes (written only when different).
_DEFAULT_LINETYPE = "BYLAYER"
_DEFAULT_COLOR = 256  # BYLAYER
_DEFAULT_STYLE = "Standard"
#: MTEXT ``line_spacing_style`` and ``line_spacing_factor`` default to 1 (at least, 1.0).
_DEFAULT_SPACING = 1


def _optional(d: dict[str, Any], key: str, code: int, default: Any, cast: Callable[[Any], Any]) -> str:
    """One optional tag, written (``cast`` of its value) only when set and not ezdxf's default."""
    value = d.get(key)
    if value is None or value == default:
        return ""
    text = repr(float(value)) if cast is float else str(cast(value))  # reals as ezdxf: repr
    return f"{code:3d}\n{text}\n"


def _head(kind: str, d: dict[str, Any], owner: str) -> str:
    """Handle, owner and AcDbEntity (layer, linetype, colour) of one entity."""
    out = f"  0\n{kind}\n  5\n{d['handle']}\n330\n{owner}\n100\nAcDbEntity\n  8\n{d.get('layer', '0')}\n"
    out += _optional(d, "linetype", 6, _DEFAULT_LINETYPE, str)
    out += _optional(d, "color", 62, _DEFAULT_COLOR, int)
    return out


def _point(code: int, p: Any) -> str:
    x, y, z = p
    return f"{code:3d}\n{float(x)!r}\n{code + 10:3d}\n{float(y)!r}\n{code + 20:3d}\n{float(z)!r}\n"


def _text(entity: Any, d: dict[str, Any], owner: str) -> str:
    out = _head("TEXT", d, owner) + "100\nAcDbText\n" + _point(10, d.get("insert", (0.0, 0.0, 0.0)))
    out += f" 40\n{float(d.get('height', 2.5))!r}\n  1\n{d.get('text', '')}\n"
    out += _optional(d, "rotation", 50, 0, float)
    out += _optional(d, "style", 7, _DEFAULT_STYLE, str)
    out += _optional(d, "halign", 72, 0, int)
    align = d.get("align_point")
    if align is not None:
        out += _point(11, align)
    out += "100\nAcDbText\n"
    out += _optional(d, "valign", 73, 0, int)
    return out


def _mtext(entity: Any, d: dict[str, Any], owner: str) -> str:
    out = _head("MTEXT", d, owner) + "100\nAcDbMText\n" + _point(10, d.get("insert", (0.0, 0.0, 0.0)))
    out += f" 40\n{float(d.get('char_height', 2.5))!r}\n"
    width = d.get("width")
    if width is not None:
        out += f" 41\n{float(width)!r}\n"
    out += f" 71\n{int(d.get('attachment_point', 1))}\n"
    chunks = split_mtext_string(escape_dxf_line_endings(entity.text), size=_MTEXT_CHUNK) or [""]
    out += "".join(f"  3\n{chunk}\n" for chunk in chunks[:-1]) + f"  1\n{chunks[-1]}\n"
    out += _optional(d, "style", 7, _DEFAULT_STYLE, str)
    out += _optional(d, "rotation", 50, 0, float)
    out += _optional(d, "line_spacing_style", 73, _DEFAULT_SPACING, int)
    out += _optional(d, "line_spacing_factor", 44, _DEFAULT_SPACING, float)
    return out


def _line(entity: Any, d: dict[str, Any], owner: str) -> str:
    origin = (0.0, 0.0, 0.0)
    return (_head("LINE", d, owner) + "100\nAcDbLine\n" + _point(10, d.get("start", origin))
            + _point(11, d.get("end", origin)))


def _lwpolyline(entity: Any, d: dict[str, Any], owner: str) -> str:
    points = entity.lwpoints
    out = _head("LWPOLYLINE", d, owner) + "100\nAcDbPolyline\n"
    out += f" 90\n{len(points)}\n 70\n{int(d.get('flags', 0))}\n"
    out += _optional(d, "elevation", 38, 0, float)
    parts = [out]
    for x, y, start_width, end_width, bulge in points:
        parts.append(f" 10\n{float(x)!r}\n 20\n{float(y)!r}\n")
        if start_width or end_width:
            parts.append(f" 40\n{float(start_width)!r}\n 41\n{float(end_width)!r}\n")
        if bulge:
            parts.append(f" 42\n{float(bulge)!r}\n")
    return "".join(parts)


_TEMPLATES: dict[str, Callable[[Any, dict[str, Any], str], str]] = {
    "TEXT": _text, "MTEXT": _mtext, "LINE": _line, "LWPOLYLINE": _lwpolyline,
}


def _xdata_text(entity: Any) -> str | None:
    """The entity's XDATA as ezdxf writes it, or ``None`` if a group is not plain."""
    xdata = entity.xdata
    if not xdata:
        return ""
    out = []
    for tags in xdata.data.values():
        for tag in tags:
            code = tag.code
            if code not in _XDATA_PLAIN:
                return None
            out.append(f"{code:3d}\n{tag.value}\n")
    return "".join(out)


def _plain(entity: Any, kind: str) -> bool:
    """Nothing on the entity beyond what its template writes."""
    if entity.appdata or entity.reactors or entity.has_extension_dict:
        return False
    if getattr(entity, "proxy_graphic", None):
        return False
    if kind == "MTEXT" and entity._columns is not None:  # noqa: SLF001 (ezdxf keeps columns there)
        return False
    if kind == "LWPOLYLINE" and len(entity.lwpoints) == 0:  # ezdxf writes nothing for it
        return False
    return _KNOWN_NS[kind].issuperset(entity.dxf.__dict__)


def entity_text(entity: Any, owner: str, dxfversion: str) -> str | None:
    """One of our entities as DXF text, owned by ``owner``; ``None``: export it with ezdxf.

    Parameters
    ----------
    entity : ezdxf.entities.DXFGraphic
        A bound entity of the scratch document (it has a handle).
    owner : str
        Handle of the model-space BLOCK_RECORD of the drawing it goes into.
    dxfversion : str
        The drawing's DXF version (``AC1015`` ...).

    Returns
    -------
    str or None
        Group code/value lines (``\\n`` line ends), equal to ezdxf's export of
        the entity with its owner replaced; ``None`` when the entity's type or
        content is not one the templates cover.

    Examples
    --------
    >>> import ezdxf
    >>> doc = ezdxf.new("R2010")
    >>> line = doc.modelspace().add_line((0, 0), (1, 2), dxfattribs={"layer": "CW"})
    >>> print(entity_text(line, "1F", doc.dxfversion).replace(line.dxf.handle, "H"))
      0
    LINE
      5
    H
    330
    1F
    100
    AcDbEntity
      8
    CW
    100
    AcDbLine
     10
    0.0
     20
    0.0
     30
    0.0
     11
    1.0
     21
    2.0
     31
    0.0
    <BLANKLINE>
    """
    kind = entity.dxftype()
    template = _TEMPLATES.get(kind)
    if template is None or dxfversion < _FIRST_VERSION or not _plain(entity, kind):
        return None
    xdata = _xdata_text(entity)
    if xdata is None:
        return None
    return template(entity, entity.dxf.__dict__, owner) + xdata
