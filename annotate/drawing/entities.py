"""The pen: adds our entities to modelspace with our style, layers and XDATA."""

from __future__ import annotations

import logging
import math
from collections.abc import Sequence
from typing import Any, NamedTuple

from cablewright.core.errors import DrawingReadError
from ezdxf.enums import TextEntityAlignment
from ezdxf.fonts import fonts
from ezdxf.tools.text import estimate_mtext_content_extents
from shapely.geometry import LineString, Point
from shapely.ops import nearest_points

from ..text_limits import dxf_string_limit, fit_text
from .mark_style import choose_colors, ensure_leader_linetype, route_colors
from .old_marks import is_ours
from .placement import Placement
from .style import (
    DEFAULT_CONFIG,
    LABEL_BOX_H,
    LABEL_MARGIN_H,
    NOTE_INSET_H,
    NOTE_MARGIN_H,
    NOTE_TOP_INSET_H,
    R12_LINE_PITCH_H,
    AnnotateConfig,
)
from .text import clean, dxf_escape, mtext_escape

__all__ = ["EntityWriter", "Mark"]

log = logging.getLogger(__name__)


class Mark(NamedTuple):
    """What an entity we add is: its layer role, its kind and what it refers to.

    Attributes
    ----------
    role : str
        Layer role (``label``, ``group``, ``device``, ``schedule``, ``notes``).
    kind : str
        Kind of mark, written in our XDATA (``cable-label``, ``group-tag`` ...).
    ref : str
        What it refers to (circuit id, segment ids, equipment tag), in our XDATA.
    """

    role: str
    kind: str
    ref: str


def our_layer(doc: Any, wanted: str, color: int, appid: str) -> str:
    """Our layer named ``wanted`` (or ``wanted-2``...), created and marked if missing."""
    for n in range(1, 100):
        name = wanted if n == 1 else f"{wanted}-{n}"
        if not doc.layers.has_entry(name):
            layer = doc.layers.add(name, color=color)
            layer.set_xdata(appid, [(1000, "cablewright layer")])
            return name
        if is_ours(doc.layers.get(name), appid):
            return name
        if n == 1:
            log.warning(
                "the drawing already has a layer %s; using %s-2 or next free", wanted, wanted
            )
    raise DrawingReadError(
        f"no free layer name like {wanted!r} in the drawing; set another name in the config"
    )



class EntityWriter:
    """Adds our entities to one modelspace; keeps the style, layers and xdata in one place."""

    def __init__(self, doc: Any, config: AnnotateConfig, height: float,
                 route_layers: Sequence[str] = ()) -> None:
        self.doc = doc
        self.msp = doc.modelspace()
        self.config = config
        self.height = height
        self.r12 = doc.dxfversion <= "AC1009"
        if not doc.appids.has_entry(config.appid):
            doc.appids.new(config.appid)
        font = "txt" if self.r12 else config.font
        if not doc.styles.has_entry(config.text_style):
            doc.styles.new(config.text_style, dxfattribs={"font": font})
        self.font = fonts.make_font(font, height)
        #: plain notes' heights measured by ezdxf's layout (:func:`.leaders.text_outline`)
        self.mtext_heights: dict[tuple, float] = {}
        colors = dict(DEFAULT_CONFIG.colors)
        colors.update(config.colors)
        # no layer of ours in a colour a route layer uses (a leader would read as a run)
        colors = choose_colors(colors, route_colors(doc, route_layers))
        self.colors = colors
        self.leader_linetype = ensure_leader_linetype(doc, height)
        self.layers = {
            "label": our_layer(doc, config.label_layer, colors["label"], config.appid),
            "group": our_layer(doc, config.group_layer, colors["group"], config.appid),
            "device": our_layer(doc, config.device_layer, colors["device"], config.appid),
            "schedule": our_layer(doc, config.schedule_layer, colors["schedule"], config.appid),
            "notes": our_layer(doc, config.notes_layer, colors["notes"], config.appid),
            "revision": our_layer(doc, config.revision_layer, colors["revision"], config.appid),
            "fill": our_layer(doc, config.fill_layer, colors["fill"], config.appid),
        }

    # measuring -------------------------------------------------------------
    def text_width(self, text: str, height: float | None = None) -> float:
        h = self.height if height is None else height
        return self.font.text_width(text) * h / self.height

    def line_box(self, text: str) -> tuple[float, float]:
        """Box of a one-line TEXT label with a margin: (width, height)."""
        h = self.height
        return self.text_width(text) + LABEL_MARGIN_H * h, LABEL_BOX_H * h

    def block_box(self, lines: Sequence[str]) -> tuple[float, float]:
        """Box of a multi-line note with a margin: (width, height)."""
        h = self.height
        width = max(self.text_width(line) for line in lines)
        if self.r12:
            return (
                width + LABEL_MARGIN_H * h,
                (len(lines) - 1) * R12_LINE_PITCH_H * h + LABEL_BOX_H * h,
            )
        content = "\\P".join(mtext_escape(line) for line in lines)
        w, hh = estimate_mtext_content_extents(content, self.font, 0.0, 1.0)
        return max(w, width) + LABEL_MARGIN_H * h, hh + NOTE_MARGIN_H * h

    # writing ---------------------------------------------------------------
    def tag(self, entity: Any, kind: str, ref: str) -> Any:
        """Mark an entity as ours: XDATA with its kind and what it refers to."""
        entity.set_xdata(self.config.appid, [(1000, kind), (1000, fit_text(ref, 255, self.doc.dxfversion))])
        return entity

    def text(
        self,
        content: str,
        at: Sequence[float],
        mark: Mark,
        *,
        rotation: float = 0.0,
        align: TextEntityAlignment = TextEntityAlignment.MIDDLE_CENTER,
        color: int | None = None,
        height: float | None = None,
    ) -> Any:
        """One line of TEXT at ``at`` (x, y, z), aligned there by ``align``."""
        attribs: dict[str, Any] = {
            "layer": self.layers[mark.role],
            "style": self.config.text_style,
            "rotation": rotation,
        }
        if color is not None:
            attribs["color"] = color
        version = self.doc.dxfversion  # a label longer than DXF allows is cut with an ellipsis
        stored = fit_text(clean(content), dxf_string_limit(version), version, dxf_escape)
        entity = self.msp.add_text(stored, height=self.height if height is None else height, dxfattribs=attribs)
        entity.set_placement(tuple(at), align=align)
        return self.tag(entity, mark.kind, mark.ref)

    def block(
        self,
        lines: Sequence[str],
        place: Placement,
        mark: Mark,
        *,
        color: int | None = None,
        left: bool = False,
    ) -> list[Any]:
        """A multi-line note centred on the placement: MTEXT, or TEXT lines for R12.

        ``left`` aligns the lines on the left edge of the box instead of centring them.
        """
        if not self.r12:
            attribs: dict[str, Any] = {
                "layer": self.layers[mark.role],
                "style": self.config.text_style,
                "char_height": self.height,
                "attachment_point": 1 if left else 5,  # top left / middle centre
                "insert": (
                    (
                        place.x - place.width / 2.0 + NOTE_INSET_H * self.height,
                        place.y + place.height / 2.0 - NOTE_TOP_INSET_H * self.height,
                        place.z,
                    )
                    if left
                    else (place.x, place.y, place.z)
                ),
                "rotation": place.rotation_deg,
                "width": 0.0,
            }
            if color is not None:
                attribs["color"] = color
            content = "\\P".join(mtext_escape(line) for line in lines)
            return [self.tag(self.msp.add_mtext(content, dxfattribs=attribs), mark.kind, mark.ref)]
        a = math.radians(place.rotation_deg)
        vx, vy = -math.sin(a), math.cos(a)
        pitch = R12_LINE_PITCH_H * self.height
        top = (len(lines) - 1) * pitch / 2.0
        ux, uy = math.cos(a), math.sin(a)
        shift = -place.width / 2.0 + NOTE_INSET_H * self.height if left else 0.0
        out = []
        for i, line in enumerate(lines):
            d = top - i * pitch
            out.append(
                self.text(
                    line,
                    (place.x + vx * d + ux * shift, place.y + vy * d + uy * shift, place.z),
                    mark,
                    rotation=place.rotation_deg,
                    color=color,
                    align=TextEntityAlignment.MIDDLE_LEFT
                    if left
                    else TextEntityAlignment.MIDDLE_CENTER,
                )
            )
        return out

    def line(
        self,
        a: Sequence[float],
        b: Sequence[float],
        mark: Mark,
        *,
        color: int | None = None,
        linetype: str | None = None,
    ) -> Any:
        """A LINE from ``a`` to ``b``."""
        attribs: dict[str, Any] = {"layer": self.layers[mark.role]}
        if linetype is not None:
            attribs["linetype"] = linetype
        if color is not None:
            attribs["color"] = color
        entity = self.msp.add_line(tuple(a), tuple(b), dxfattribs=attribs)
        return self.tag(entity, mark.kind, mark.ref)

    def leader(
        self,
        place: Placement,
        z: float,
        mark: Mark,
        *,
        color: int | None = None,
        end: tuple[float, float] | None = None,
    ) -> LineString:
        """A straight leader from the anchor point to ``end``, by default the nearest edge
        of the note, in our leader linetype; returns it in plan (for the index of placed
        marks)."""
        if end is None:
            _, near = nearest_points(Point(place.anchor), place.polygon.exterior)
        else:
            near = Point(end)
        self.line(
            (place.anchor[0], place.anchor[1], z),
            (near.x, near.y, z),
            mark,
            color=color,
            linetype=self.leader_linetype,
        )
        return LineString([place.anchor, (near.x, near.y)])

    def polygon(self, points: Sequence[Sequence[float]], z: float, mark: Mark) -> Any:
        """A closed outline through ``points`` (x, y) at elevation ``z``."""
        attribs: dict[str, Any] = {"layer": self.layers[mark.role]}
        if self.r12:
            entity = self.msp.add_polyline3d([(p[0], p[1], z) for p in points], close=True,
                                             dxfattribs=attribs)
        else:
            attribs["elevation"] = z
            entity = self.msp.add_lwpolyline([(p[0], p[1]) for p in points], close=True,
                                             dxfattribs=attribs)
        return self.tag(entity, mark.kind, mark.ref)


