"""What the preview draws, as plain data: polylines and texts per layer, colours resolved.

The preview (:mod:`.preview`) needs no parsed drawing: it draws the route network
from the measurement, and two sketches handed to it, each a :class:`Sketch`:

* our marks, as the drawing writer placed them (``AnnotationSummary.sketch``,
  built by :func:`sketch_entities` from the entities the writer added);
* optionally the drawing's own linework and texts as a background
  (:func:`background_sketch`, from the document where the reader parsed one).

Colours are ACI numbers resolved to RGB once here (an entity's own colour, else its
layer's), with ACI 7 (white on a dark screen) drawn black on the white picture, as
ezdxf's drawing add-on does on a white background.

References
----------
.. [1] Autodesk, DXF Reference: TEXT (groups 72, 73), MTEXT (group 71), ACI colours.
.. [2] ezdxf documentation, ``ezdxf.colors.aci2rgb``, ``ezdxf.disassemble``,
   ``Text.get_placement``, ``MText.plain_text``.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from typing import Any, NamedTuple

__all__ = ["PreviewText", "Sketch", "aci_hex", "sketch_entities", "background_sketch",
           "layer_colors"]

#: ACI "by layer" (256) and "by block" (0), DXF Reference "Color".
_BYLAYER, _BYBLOCK = 256, 0
#: ACI 7 is white or black by background; drawn black on our white picture.
_BLACK_ACI = 7
#: TEXT horizontal alignment (group 72) -> matplotlib ``ha``; 3 aligned, 5 fit: from the
#: insert point, left (DXF Reference, TEXT); 4 "middle" centres both ways.
_TEXT_HA = {0: "left", 1: "center", 2: "right", 4: "center"}
#: TEXT vertical alignment (group 73) -> matplotlib ``va`` (0 baseline, 1 bottom, 2 middle, 3 top).
_TEXT_VA = {0: "baseline", 1: "bottom", 2: "center", 3: "top"}
#: MTEXT attachment point (group 71, 1-9: rows top/middle/bottom, columns left/centre/right).
_MTEXT_VA = ("top", "center", "bottom")
_MTEXT_HA = ("left", "center", "right")
#: Curves flattened to this fraction of the picture's smallest feature: an arc of a
#: symbol is drawn with chords at most this far from the curve [drawing units].
FLATTEN_DU = 0.01
#: Entity types taken as text; every other type is drawn by its flattened outline.
_TEXTS = frozenset({"TEXT", "ATTRIB", "MTEXT"})
#: Linetypes drawn solid (an entity's own; a layer's linetype is not looked up).
_SOLID = frozenset({"BYLAYER", "BYBLOCK", "CONTINUOUS"})
#: Types not drawn in a background: fills and dimensions clutter a preview (as the
#: earlier preview left them out of a large drawing).
_NOT_DRAWN = frozenset({"HATCH", "DIMENSION", "SOLID", "POINT", "WIPEOUT", "VIEWPORT",
                        "IMAGE", "MESH", "3DSOLID", "REGION", "BODY"})


class PreviewText(NamedTuple):
    """One text to draw: position and cap height in drawing units, matplotlib alignment."""

    layer: str
    text: str
    x: float
    y: float
    height: float
    rotation_deg: float
    ha: str
    va: str
    color: str


@dataclass
class Sketch:
    """Polylines and texts in drawing units: ``lines[(layer, colour, dashed)]`` is a list of polylines.

    ``dashed`` is True for a linetype other than continuous (our leaders).
    ``layer_aci`` is the ACI colour of the drawing's layers by upper-case name
    (the writer's, so the preview draws route layers in their colours).

    Filled while sketching (:meth:`add_line`, :meth:`add_text`), then only read.
    Layers are kept upper-case so a preview can leave one out (our schedule table).
    """

    lines: dict[tuple[str, str, bool], list[list[tuple[float, float]]]] = field(default_factory=dict)
    texts: list[PreviewText] = field(default_factory=list)
    layer_aci: dict[str, int] = field(default_factory=dict)

    def add_line(self, layer: str, color: str, points: Iterable[tuple[float, float]],
                 dashed: bool = False) -> None:
        pts = [(float(p[0]), float(p[1])) for p in points]
        if len(pts) >= 2:
            self.lines.setdefault((layer.upper(), color, dashed), []).append(pts)

    def add_text(self, text: PreviewText) -> None:
        if text.text.strip():
            self.texts.append(text)

    def __len__(self) -> int:
        return sum(len(v) for v in self.lines.values()) + len(self.texts)


def aci_hex(aci: int) -> str:
    """An ACI colour number as ``#rrggbb`` on a white picture (ACI 7 black).

    Examples
    --------
    >>> aci_hex(1), aci_hex(5), aci_hex(7)
    ('#ff0000', '#0000ff', '#000000')
    """
    from ezdxf.colors import aci2rgb

    aci = abs(int(aci))
    if aci == _BLACK_ACI or not 0 < aci < _BYLAYER:
        return "#000000"
    r, g, b = aci2rgb(aci)
    return f"#{r:02x}{g:02x}{b:02x}"


def layer_colors(doc: Any) -> dict[str, int]:
    """ACI colour of every layer of a document, by upper-case name."""
    return {layer.dxf.name.upper(): abs(int(layer.dxf.get("color", _BLACK_ACI))) for layer in doc.layers}


def _color(entity: Any, layers: Mapping[str, int]) -> str:
    aci = int(entity.dxf.get("color", _BYLAYER))
    if aci in (_BYLAYER, _BYBLOCK):
        aci = layers.get(str(entity.dxf.get("layer", "0")).upper(), _BLACK_ACI)
    return aci_hex(aci)


def _text(entity: Any, color: str) -> PreviewText:
    layer = str(entity.dxf.get("layer", "0"))
    if entity.dxftype() == "MTEXT":
        at = entity.dxf.get("attachment_point", 1) - 1
        x, y = entity.dxf.insert[0], entity.dxf.insert[1]
        return PreviewText(layer.upper(), entity.plain_text(), x, y, entity.dxf.get("char_height", 2.5),
                           entity.get_rotation(), _MTEXT_HA[at % 3], _MTEXT_VA[at // 3], color)
    halign, valign = entity.dxf.get("halign", 0), entity.dxf.get("valign", 0)
    point = entity.dxf.insert
    if (halign, valign) != (0, 0) and halign not in (3, 5) and entity.dxf.hasattr("align_point"):
        point = entity.dxf.align_point
    ha = _TEXT_HA.get(halign, "left")
    va = "center" if halign == 4 else _TEXT_VA.get(valign, "baseline")
    return PreviewText(layer.upper(), entity.plain_text(), point[0], point[1],
                       entity.dxf.get("height", 2.5), entity.dxf.get("rotation", 0.0), ha, va, color)


def _outline(entity: Any) -> list[tuple[float, float]]:
    from ezdxf import disassemble

    if entity.dxftype() == "LINE":
        s, e = entity.dxf.start, entity.dxf.end
        return [(s[0], s[1]), (e[0], e[1])]
    prim = disassemble.make_primitive(entity, max_flattening_distance=FLATTEN_DU)
    return [(v.x, v.y) for v in prim.vertices()]


def sketch_entities(entities: Iterable[Any], layers: Mapping[str, int],
                    sketch: Sketch | None = None) -> Sketch:
    """Entities (ours as the writer added them, or a drawing's) into a :class:`Sketch`.

    Parameters
    ----------
    entities : iterable of ezdxf entities
        TEXT, ATTRIB and MTEXT become texts; any other type but fills and
        dimensions its outline (curves flattened to :data:`FLATTEN_DU`).
    layers : mapping
        ACI colour by upper-case layer name (:func:`layer_colors`), for
        entities coloured "by layer".
    sketch : Sketch, optional
        Added to (a new one when not given).
    """
    out = Sketch() if sketch is None else sketch
    for e in entities:
        kind = e.dxftype()
        if kind in _NOT_DRAWN:
            continue
        color = _color(e, layers)
        if kind in _TEXTS:
            out.add_text(_text(e, color))
        else:
            dashed = str(e.dxf.get("linetype", "BYLAYER")).upper() not in _SOLID
            out.add_line(str(e.dxf.get("layer", "0")), color, _outline(e), dashed)
    return out


def background_sketch(doc: Any, skip_layers: Iterable[str], *, max_entities: int = 8000,
                      max_depth: int = 4) -> Sketch | None:
    """The drawing's own linework and texts, outside ``skip_layers``; None on a large drawing.

    Block references are drawn by their contents (nested up to ``max_depth``) and
    visible attributes.  Above ``max_entities`` modelspace entities no background
    is drawn (a preview shows the routes, the equipment and our marks; the rest
    would be a grey fog at that scale, as the earlier preview left it out).
    """
    msp = doc.modelspace()
    if len(msp) > max_entities:
        return None
    skip = {layer.upper() for layer in skip_layers}
    layers = layer_colors(doc)
    out = Sketch()

    def take(entities: Iterable[Any], depth: int) -> None:
        for e in entities:
            if str(e.dxf.get("layer", "0")).upper() in skip:
                continue
            if e.dxftype() != "INSERT":
                sketch_entities((e,), layers, out)
                continue
            sketch_entities((a for a in e.attribs if not a.is_invisible), layers, out)
            if depth < max_depth and doc.blocks.get(e.dxf.name) is not None:
                try:
                    take(e.virtual_entities(), depth + 1)
                except (ValueError, RecursionError, ArithmeticError):  # a damaged block
                    continue

    take(msp, 0)
    return out
