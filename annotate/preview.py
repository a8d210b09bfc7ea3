"""A PNG preview of the annotated drawing, drawn from the measurement and our marks.

No parsed drawing is needed: the route network comes from the measurement (the
pieces of every route layer, in metres, drawn in drawing units), the equipment
from its positions, our marks from what the drawing writer placed
(:class:`~.sketch.Sketch`, ``AnnotationSummary.sketch``) and, where the reader
parsed the drawing, its own linework and texts as a background
(:func:`~.sketch.background_sketch`).  Each kind is handed to matplotlib as a few
``LineCollection`` objects (one per layer colour), so the cost grows with the
points drawn, not with one artist per entity.  Drawn bottom to top: the
background, the routes in their layer colours, the equipment, our marks.

The figure follows the aspect of the extents (``width_px`` wide, height clamped to
``[min_aspect, max_aspect]`` of the width).  Above ``max_texts`` texts no text is
drawn (at that size of drawing a text is a few pixels high in the picture and each
costs a matplotlib text layout); our leaders, boxes and every line still are.

References
----------
.. [1] matplotlib documentation, ``matplotlib.collections.LineCollection``,
   ``matplotlib.backends.backend_agg.FigureCanvasAgg``, ``Axes.text``
   (``rotation_mode="anchor"``).
"""

from __future__ import annotations

import io
import logging
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass
from typing import Any

from .sketch import PreviewText, Sketch, aci_hex

__all__ = ["PreviewStyle", "render_preview_png", "route_lines"]

log = logging.getLogger(__name__)

#: Cap height / em size of the sans-serif font matplotlib ships (DejaVu Sans: cap
#: height 1493 of 2048 units, from the font's OS/2 table, from memory): DXF heights are
#: cap heights, matplotlib sizes are em sizes.
CAP_PER_EM = 0.73
#: The face texts are drawn in: the one ezdxf's font manager gives for our style's
#: ``arial.ttf`` where Arial is not installed, and which the writer measured our
#: labels with; matplotlib ships it.
FONT_FAMILY = "DejaVu Sans"
#: ... in its condensed width (DejaVu Sans where the condensed face is not installed).
FONT_STRETCH = "condensed"
#: Advance of an average character / cap height of that face (our estimate for the
#: extents only: a text must not run off the picture).
CHAR_PER_CAP = 0.75
#: Points per inch (PostScript point, matplotlib's unit of font size and line width).
PT_PER_IN = 72.0
#: Margin around the extents, as a fraction of each side (matplotlib's default axes
#: margin, which the earlier preview had: keeps the outermost line off the edge).
MARGIN_FRACTION = 0.05
#: Dashes of a line in a linetype of its own (our leaders: a long dash and two dots,
#: as ``drawing.mark_style.LEADER_PATTERN_H``), in line widths.
LEADER_DASHES = (0, (8.0, 2.0, 1.0, 2.0, 1.0, 2.0))
#: Equipment marker side in text heights (our choice: about a symbol's size).
EQUIPMENT_H = 1.5


@dataclass(frozen=True)
class PreviewStyle:
    """How the preview is drawn.

    Attributes
    ----------
    dpi : int
        Resolution [dots per inch].
    width_px : int
        Picture width [px].
    min_aspect, max_aspect : float
        Clamp of height / width [-].
    max_texts : int
        Texts are drawn only when at most this many (ours and the background's).
    route_lw, mark_lw, background_lw : float
        Line widths [pt]: routes, our marks, the drawing's own linework.
    background_alpha : float
        Opacity of the background [-], so routes and marks read above it.
    """

    dpi: int = 150
    width_px: int = 2400
    min_aspect: float = 0.25
    max_aspect: float = 1.0
    max_texts: int = 1500
    route_lw: float = 0.7
    mark_lw: float = 0.5
    background_lw: float = 0.5
    background_alpha: float = 1.0


def route_lines(segments: Iterable[Any], units_per_m: float, layer_aci: Mapping[str, int],
                default_aci: int = 7) -> dict[str, list[list[tuple[float, float]]]]:
    """Route segments (``points_m``, ``layer``) as polylines in drawing units, by colour.

    ``layer_aci`` gives each layer's ACI colour (upper-case names); a layer not
    in it is drawn in ``default_aci``.
    """
    k = float(units_per_m)
    out: dict[str, list[list[tuple[float, float]]]] = {}
    for seg in segments:
        color = aci_hex(layer_aci.get(str(seg.layer).upper(), default_aci))
        pts = [(p[0] * k, p[1] * k) for p in seg.points_m]
        if len(pts) >= 2:
            out.setdefault(color, []).append(pts)
    return out


def _text_corners(texts: Iterable[PreviewText]) -> list[tuple[float, float]]:
    """Two corners around each text, from its alignment (a turned text: its length either way)."""
    out = []
    for t in texts:
        lines = t.text.split("\n")
        w = t.height * CHAR_PER_CAP * max(map(len, lines))
        h = t.height * 1.7 * len(lines)
        if t.rotation_deg % 360.0:
            w = h = max(w, h)
            out += [(t.x - w, t.y - h), (t.x + w, t.y + h)]
            continue
        left = {"left": 0.0, "center": 0.5, "right": 1.0}[t.ha] * w
        out += [(t.x - left, t.y - h), (t.x - left + w, t.y + h)]
    return out


def _extents(groups: Iterable[Iterable[Iterable[Sequence[tuple[float, float]]]]],
             points: Iterable[tuple[float, float]]) -> tuple[float, float, float, float]:
    import numpy as np

    flat: list[tuple[float, float]] = [q for g in groups for lines in g for line in lines for q in line]
    flat.extend(points)
    allp = np.asarray(flat, dtype=float).reshape(-1, 2)
    allp = allp[np.isfinite(allp).all(axis=1)]  # a damaged entity's NaN is not drawn
    if not len(allp):
        return (0.0, 0.0, 1.0, 1.0)
    (x0, y0), (x1, y1) = allp.min(axis=0), allp.max(axis=0)
    return (float(x0), float(y0), float(x1), float(y1))


def _figure(extents: tuple[float, float, float, float], style: PreviewStyle) -> tuple[Any, Any, float]:
    """Figure, axes and the scale [px per drawing unit] for the extents."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    x0, y0, x1, y1 = extents
    size = max(x1 - x0, y1 - y0, 1e-9)
    pad_x, pad_y = (MARGIN_FRACTION * max(d, 1e-3 * size) for d in (x1 - x0, y1 - y0))
    x0, y0, x1, y1 = x0 - pad_x, y0 - pad_y, x1 + pad_x, y1 + pad_y
    aspect = min(max((y1 - y0) / (x1 - x0), style.min_aspect), style.max_aspect)
    w_in = style.width_px / style.dpi
    fig = Figure(figsize=(w_in, w_in * aspect), dpi=style.dpi, facecolor="white")
    FigureCanvasAgg(fig)
    ax = fig.add_axes((0, 0, 1, 1))
    ax.set_axis_off()
    # equal scales: the tighter of the two directions sets px per unit, the other is centred
    scale = min(style.width_px / (x1 - x0), style.width_px * aspect / (y1 - y0))
    cx, cy = (x0 + x1) / 2.0, (y0 + y1) / 2.0
    half_w, half_h = style.width_px / scale / 2.0, style.width_px * aspect / scale / 2.0
    ax.set_xlim(cx - half_w, cx + half_w)
    ax.set_ylim(cy - half_h, cy + half_h)
    return fig, ax, scale


def _lines(ax: Any, by_style: Mapping[Any, list], lw: float, z: float, alpha: float = 1.0) -> None:
    """One LineCollection per colour (key ``colour`` or ``(colour, dashed)``)."""
    from matplotlib.collections import LineCollection

    for key, polylines in by_style.items():
        color, dashed = key if isinstance(key, tuple) else (key, False)
        ax.add_collection(LineCollection(polylines, colors=color, linewidths=lw, alpha=alpha,
                                         linestyles=LEADER_DASHES if dashed else "solid",
                                         capstyle="butt", zorder=z))


def _sketch_lines(sketch: Sketch, skip: set[str]) -> dict[tuple[str, bool], list]:
    out: dict[tuple[str, bool], list] = {}
    for (layer, color, dashed), polylines in sketch.lines.items():
        if layer not in skip:
            out.setdefault((color, dashed), []).extend(polylines)
    return out


#: MTEXT line pitch in cap heights at line spacing factor 1.0 (DXF Reference, MTEXT group 44:
#: "percentage of default (3-on-5) line spacing", i.e. 5/3 of the height).
MTEXT_PITCH_H = 5.0 / 3.0
#: Depth of the descenders below the baseline in cap heights ("bottom" alignment; our estimate).
DESCENT_H = 0.25
#: Horizontal shift by alignment, in text widths left of the anchor.
_HA_SHIFT = {"left": 0.0, "center": 0.5, "right": 1.0}


class _Glyphs:
    """Glyph outlines and advances of one face, each character laid out once.

    A text is its characters' cached outlines side by side (kerning left out: a
    preview is not a typeset page); matplotlib's ``TextToPath`` gives the outlines
    in font units, the advance of a character is the width it adds between two
    others.
    """

    def __init__(self) -> None:
        from matplotlib.font_manager import FontProperties
        from matplotlib.textpath import TextToPath

        self.prop = FontProperties(family=FONT_FAMILY, stretch=FONT_STRETCH)
        self.engine = TextToPath()
        self.cap = self.engine.FONT_SCALE * CAP_PER_EM  # font units of one cap height
        self.cache: dict[str, tuple[Any, Any, float]] = {}
        self._bar = self._width("||")

    def _width(self, s: str) -> float:
        """Width of ``s`` in font units (the engine gives it in points of the face's size)."""
        points = self.engine.get_text_width_height_descent(s, self.prop, ismath=False)[0]
        return points * self.engine.FONT_SCALE / self.prop.get_size_in_points()

    def glyph(self, ch: str) -> tuple[Any, Any, float]:
        hit = self.cache.get(ch)
        if hit is None:
            import numpy as np

            verts, codes = self.engine.get_text_path(self.prop, ch)
            advance = self._width(f"|{ch}|") - self._bar
            hit = self.cache[ch] = (np.asarray(verts, dtype=float).reshape(-1, 2),
                                    np.asarray(codes, dtype=np.uint8), advance)
        return hit

    def line(self, text: str) -> tuple[Any, Any, float]:
        """Outline of one line in font units, from x = 0 on the baseline, and its width."""
        import numpy as np

        parts, codes, x = [], [], 0.0
        for ch in text:
            v, c, advance = self.glyph(ch)
            if len(v):
                parts.append(v + (x, 0.0))
                codes.append(c)
            x += advance
        if not parts:
            return np.zeros((0, 2)), np.zeros(0, dtype=np.uint8), x
        return np.concatenate(parts), np.concatenate(codes), x


def _glyph_paths(texts: Iterable[PreviewText]) -> dict[str, list[Any]]:
    """Every text as glyph outlines in drawing units, by colour (:class:`_Glyphs`).

    One filled path per colour instead of one text artist per text.
    """
    import numpy as np
    from matplotlib.path import Path

    glyphs = _Glyphs()
    out: dict[str, list[Any]] = {}
    for t in texts:
        lines = t.text.split("\n")
        k = t.height / glyphs.cap
        a = np.radians(t.rotation_deg)
        turn = np.array([[np.cos(a), np.sin(a)], [-np.sin(a), np.cos(a)]])
        block = (len(lines) - 1) * MTEXT_PITCH_H
        # the first baseline, in cap heights below the anchor (lines go down from it)
        drop = {"top": 1.0, "baseline": 0.0, "center": 0.5 + block / 2.0,
                "bottom": -DESCENT_H - block}[t.va]
        for n, line in enumerate(lines):
            verts, codes, width = glyphs.line(line)
            if not len(verts):
                continue
            xy = verts * k
            xy[:, 0] -= _HA_SHIFT[t.ha] * width * k
            xy[:, 1] -= (drop + n * MTEXT_PITCH_H) * t.height
            out.setdefault(t.color, []).append(Path(xy @ turn + (t.x, t.y), codes))
    return out


def _texts(ax: Any, texts: Iterable[PreviewText], z: float) -> None:
    from matplotlib.patches import PathPatch
    from matplotlib.path import Path

    for color, paths in _glyph_paths(texts).items():
        # added as an artist, not with ``add_patch``: that walks every Bezier piece in
        # Python for the data limits, which are set from the extents anyway
        ax.add_artist(PathPatch(Path.make_compound_path(*paths), facecolor=color,
                                edgecolor="none", linewidth=0.0, zorder=z))


def _equipment(ax: Any, points: Sequence[tuple[float, float]], side: float, scale: float,
               style: PreviewStyle, z: float) -> None:
    if not points:
        return
    import numpy as np

    xy = np.asarray(points, dtype=float)
    side_pt = max(side * scale * PT_PER_IN / style.dpi, 2.0)
    ax.scatter(xy[:, 0], xy[:, 1], s=side_pt ** 2, marker="s", facecolors="none",
               edgecolors="#000000", linewidths=style.mark_lw, zorder=z)


def render_preview_png(
    routes: Mapping[str, list[list[tuple[float, float]]]],
    marks: Sketch | None = None,
    *,
    background: Sketch | None = None,
    equipment: Sequence[tuple[float, float]] = (),
    text_height: float = 0.0,
    skip_layers: Iterable[str] = (),
    style: PreviewStyle | None = None,
) -> bytes:
    """Draw the preview PNG: background, routes, equipment, our marks on top.

    Parameters
    ----------
    routes : mapping
        ``#rrggbb`` colour -> polylines ``[(x, y), ...]`` in drawing units
        (:func:`route_lines`).
    marks : Sketch, optional
        Our marks as the writer placed them (``AnnotationSummary.sketch``).
    background : Sketch, optional
        The drawing's own linework and texts (:func:`~.sketch.background_sketch`).
    equipment : sequence of (x, y)
        Equipment insertion points [drawing units], drawn as small squares of
        :data:`EQUIPMENT_H` text heights (where no background draws the symbols).
    text_height : float
        Our text height [drawing units] (the marker size); 0: 1 % of the extents.
    skip_layers : iterable of str
        Layers of the sketches not drawn (our schedule table on a large job).
    style : PreviewStyle, optional

    Returns
    -------
    bytes
        The PNG file.
    """
    style = style or PreviewStyle()
    skip = {layer.upper() for layer in skip_layers}
    marks = marks or Sketch()
    back = background or Sketch()
    mark_lines, back_lines = _sketch_lines(marks, skip), _sketch_lines(back, skip)
    texts = [t for t in (*back.texts, *marks.texts) if t.layer not in skip]
    drawn = texts if len(texts) <= style.max_texts else []
    ext = _extents((routes.values(), mark_lines.values(), back_lines.values()),
                   [*equipment, *_text_corners(drawn)])
    fig, ax, scale = _figure(ext, style)
    _lines(ax, back_lines, style.background_lw, 1, style.background_alpha)
    _lines(ax, routes, style.route_lw, 2)
    side = EQUIPMENT_H * (text_height or 0.01 * max(ext[2] - ext[0], ext[3] - ext[1]))
    _equipment(ax, equipment, side, scale, style, 3)
    _lines(ax, mark_lines, style.mark_lw, 4)
    if drawn:
        _texts(ax, [t for t in back.texts if t.layer not in skip], 1.5)
        _texts(ax, [t for t in marks.texts if t.layer not in skip], 5)
    else:
        log.info("preview: %d texts, more than %d: drawn without text", len(texts), style.max_texts)
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=style.dpi, facecolor="white")
    return buf.getvalue()
