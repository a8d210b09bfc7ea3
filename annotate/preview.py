"""A PNG preview of a DXF drawing's modelspace, for the report.

Rendered with ezdxf's drawing add-on (``Frontend``, ``RenderContext``) and a
matplotlib backend on matplotlib's Agg canvas (no pyplot, no window), on a white
background.  The drawing may be given as a path or, to avoid parsing it again,
as the document in memory (the annotated drawing the annotate stage just saved).

Speed.  ezdxf's stock ``MatplotlibBackend`` adds one matplotlib artist per line,
path or glyph outline, and matplotlib's per-artist overhead (``Axes.add_patch``
computes the Bezier extrema of every patch) made a 50,000-entity preview take
minutes.  :class:`BatchingBackend` is that backend with the output batched: every
line, outline and filled shape is collected per colour and line width and
handed to matplotlib as one path or one collection per style when the frontend
finishes, in the order the styles first appeared.  What is drawn is the same.

Large drawings.  Above ``detail_limit`` modelspace entities only what a preview
needs is drawn: the route layers, our own layers (prefix ``CW-``) and the block
references with attributes (equipment symbols carry their tag), without the drawing's own text, attributes,
hatches and dimensions, and without our schedule table; above ``max_texts`` texts (ours included) text is
left out too, since each text costs about half a millisecond in the add-on's
text engine and at that size of drawing it is a few pixels high in the
picture.  Small drawings (the demo) are drawn in full.

The figure follows the aspect of the drawing's extents (``width_px`` wide, height
clamped to ``[min_aspect, max_aspect]`` of the width), so a very wide drawing is
not squeezed into a thin strip of an A4 page.

References
----------
.. [1] ezdxf documentation, "Drawing Add-on" (``Frontend``, ``RenderContext``,
   ``MatplotlibBackend``, ``Configuration``, ``TextPolicy``, ``HatchPolicy``).
.. [2] matplotlib documentation, ``matplotlib.backends.backend_agg.FigureCanvasAgg``,
   ``matplotlib.collections`` and ``matplotlib.path.Path`` (compound paths).
"""

from __future__ import annotations

import io
import logging
import os
from collections.abc import Iterable
from typing import Any

import ezdxf
from cablewright.core.errors import DrawingReadError
from cablewright.extract.dxf_reader import block_problems
from cablewright.extract.model import DEFAULT_ROUTE_LAYERS
from ezdxf.addons.drawing.matplotlib import MatplotlibBackend

__all__ = ["render_preview_png", "BatchingBackend"]

log = logging.getLogger(__name__)

#: Entity types left out of the preview of a large drawing (see the module notes).
_CLUTTER = frozenset({"HATCH", "DIMENSION", "SOLID", "POINT", "TEXT", "MTEXT", "ATTRIB", "WIPEOUT"})
_TEXTS = frozenset({"TEXT", "MTEXT", "ATTRIB"})


class BatchingBackend(MatplotlibBackend):
    """ezdxf's matplotlib backend with every primitive batched per style.

    Lines and unfilled paths of one (colour, line width) become one compound
    ``matplotlib.path.Path`` drawn by one ``PathPatch``; filled paths and
    polygons of one colour one ``PathCollection`` / ``PolyCollection``; points
    of one colour one ``scatter``.  The batches are added to the axes in
    :meth:`finalize`, each with the z-order of its style's first primitive.

    Parameters
    ----------
    ax : matplotlib.axes.Axes
        The axes to draw on.
    """

    def __init__(self, ax: Any) -> None:
        super().__init__(ax, adjust_figure=False)
        self._batches: dict[tuple, list] = {}
        self._in_text = 0

    def enter_entity(self, entity: Any, properties: Any) -> None:
        self._in_text += entity.dxftype() in _TEXTS

    def exit_entity(self, entity: Any) -> None:
        self._in_text -= entity.dxftype() in _TEXTS

    def _batch(self, kind: str, *style: object) -> list:
        key = (kind, *style)
        batch = self._batches.get(key)
        if batch is None:
            batch = self._batches[key] = []
        return batch

    def draw_point(self, pos: Any, properties: Any) -> None:
        self._batch("point", properties.color).append((pos.x, pos.y))

    def draw_line(self, start: Any, end: Any, properties: Any) -> None:
        if start.isclose(end):
            self.draw_point(start, properties)
            return
        self._batch("line", properties.color, self.get_lineweight(properties)).append(
            (start.x, start.y, end.x, end.y)
        )

    def draw_solid_lines(self, lines: Iterable[tuple[Any, Any]], properties: Any) -> None:
        batch = self._batch("line", properties.color, self.get_lineweight(properties))
        for s, e in lines:
            if s.isclose(e):
                self.draw_point(s, properties)
            else:
                batch.append((s.x, s.y, e.x, e.y))

    def draw_path(self, path: Any, properties: Any) -> None:
        from ezdxf.npshapes import to_matplotlib_path

        self._batch("path", properties.color, self.get_lineweight(properties)).append(
            to_matplotlib_path([path])
        )

    def draw_filled_paths(self, paths: Iterable[Any], properties: Any) -> None:
        from ezdxf.npshapes import to_matplotlib_path

        # glyph outlines keep the font's contour directions (TrueType: outer and
        # inner contours turn opposite ways), which matplotlib's non-zero winding
        # fill needs for holes; only other shapes (hatches) are sorted into outer
        # paths and holes, which costs more than the rest of a text
        try:
            mpl_path = to_matplotlib_path(paths, detect_holes=self._in_text <= 0)
        except ValueError as exc:  # an empty or degenerate outline
            log.debug("filled path not drawn: %s", exc)
            return
        self._batch("fill", properties.color).append(mpl_path)

    def draw_filled_polygon(self, points: Any, properties: Any) -> None:
        self._batch("polygon", properties.color).append([(p.x, p.y) for p in points.vertices()])

    def finalize(self) -> None:
        import numpy as np
        from matplotlib.collections import PathCollection, PolyCollection
        from matplotlib.patches import PathPatch
        from matplotlib.path import Path

        ax = self.ax
        corners = []
        for z, (key, items) in enumerate(self._batches.items()):
            kind, color = key[0], key[1]
            if kind in ("line", "path"):
                if kind == "line":
                    ends = np.asarray(items, dtype=float).reshape(-1, 2)
                    codes = np.tile(np.array([Path.MOVETO, Path.LINETO], dtype=np.uint8), len(items))
                    path = Path(ends, codes)
                else:
                    path = Path.make_compound_path(*items)
                # added as an artist, not with ``add_patch``: that walks every Bezier
                # piece in Python for the data limits; the vertices bound the curves
                ax.add_artist(PathPatch(path, fill=False, edgecolor=color, linewidth=key[2],
                                        capstyle="butt", zorder=z))
                if len(path.vertices):  # type: ignore[arg-type]  # matplotlib types it ArrayLike; an (n, 2) ndarray
                    corners += [path.vertices.min(axis=0), path.vertices.max(axis=0)]  # type: ignore[union-attr]
            elif kind == "fill":
                ax.add_collection(PathCollection(items, facecolors=color, edgecolors="none",
                                                 linewidths=0.0, zorder=z))
            elif kind == "polygon":
                ax.add_collection(PolyCollection(items, facecolors=color, edgecolors="none",
                                                 linewidths=0.0, zorder=z))
            elif kind == "point":
                pts = np.asarray(items, dtype=float)
                ax.scatter(pts[:, 0], pts[:, 1], s=0.1, c=color, zorder=z)
        if corners:
            ax.update_datalim(np.asarray(corners))
        self._batches = {}
        super().finalize()


def _size_for_extents(
    entities: Iterable[Any], width_in: float, min_aspect: float, max_aspect: float
) -> tuple[float, float]:
    """Figure size [in] following the extents of the entities (points of a cheap pass)."""
    xmin = ymin = float("inf")
    xmax = ymax = float("-inf")
    for e in entities:
        t = e.dxftype()
        if t == "LINE":
            s, f = e.dxf.start, e.dxf.end
            pts: Iterable[Any] = ((s[0], s[1]), (f[0], f[1]))
        elif t == "LWPOLYLINE":
            pts = e.get_points("xy")
        elif t in ("CIRCLE", "ARC"):
            c, r = e.dxf.center, e.dxf.radius
            pts = ((c[0] - r, c[1] - r), (c[0] + r, c[1] + r))
        elif t in ("INSERT", "TEXT", "MTEXT"):
            pts = (e.dxf.insert,)
        else:
            continue
        for q in pts:
            x, y = float(q[0]), float(q[1])
            xmin, xmax = min(xmin, x), max(xmax, x)
            ymin, ymax = min(ymin, y), max(ymax, y)
    aspect = 0.7
    if xmax > xmin:
        aspect = (ymax - ymin) / (xmax - xmin)
    aspect = min(max(aspect, min_aspect), max_aspect)
    return (width_in, width_in * aspect)


def _open(drawing: Any) -> tuple[Any, str]:
    """The document and a name for messages: a path is read, a document used as it is."""
    if hasattr(drawing, "modelspace"):
        return drawing, str(getattr(drawing, "filename", None) or "drawing in memory")
    try:
        return ezdxf.readfile(drawing), str(drawing)
    except (OSError, ezdxf.DXFStructureError) as exc:
        raise DrawingReadError(f"{drawing}: cannot read the drawing for a preview ({exc})") from exc


def render_preview_png(
    drawing: str | os.PathLike[str] | Any,
    *,
    max_entities: int | None = None,
    dpi: int = 150,
    size_in: tuple[float, float] | None = None,
    skip_layers: Iterable[str] = (),
    only_layers: Iterable[str] | None = None,
    lineweight_scaling: float = 0.6,
    width_px: int = 2400,
    min_aspect: float = 0.25,
    max_aspect: float = 1.0,
    detail_limit: int = 8000,
    max_texts: int = 1500,
    route_layers: Iterable[str] = tuple(DEFAULT_ROUTE_LAYERS),
    our_layer_prefix: str = "CW-",
    lean_skip_layers: Iterable[str] = ("CW-SCHEDULE",),
    keep_layers: Iterable[str] = (),
) -> bytes:
    """Render the modelspace of a DXF drawing to PNG bytes.

    Parameters
    ----------
    drawing : path-like or ezdxf.document.Drawing
        The drawing to render: a file, or a document already in memory (not
        changed here).
    max_entities : int, optional
        Draw at most this many top-level entities (in drawing order).
    dpi : int
        Resolution [dots per inch].
    size_in : (float, float), optional
        Figure size [in]; default ``width_px`` / ``dpi`` wide and as high as
        the drawing's extents ask (see ``min_aspect``, ``max_aspect``).
    skip_layers : iterable of str
        Layers not drawn (case-insensitive).
    only_layers : iterable of str, optional
        When given, draw only these layers (case-insensitive).
    lineweight_scaling : float
        Factor on DXF lineweights; thin lines keep a large drawing readable.
    width_px : int
        Picture width when ``size_in`` is not given [px].
    min_aspect, max_aspect : float
        Clamp of height / width when the size follows the extents [-].
    detail_limit : int
        Above this many modelspace entities only route layers, our layers and
        block references with attributes (equipment) are drawn, without the drawing's own text, attributes
        and clutter (see the module notes).
    max_texts : int
        On a drawing above ``detail_limit``, text (ours included) is drawn only
        when at most this many texts remain to be drawn.
    route_layers : iterable of str
        Route layer names kept on a large drawing (default: contract.md's).
    our_layer_prefix : str
        Layers starting with this (case-insensitive) are drawn on a large
        drawing too.
    lean_skip_layers : iterable of str
        Layers left out of a large drawing's preview although ours: by default
        the schedule table, which on a big job is far larger than the plant
        (it is in ``schedule.csv`` / ``.xlsx`` and the report).
    keep_layers : iterable of str
        More layers drawn on a large drawing like ours (the layers the
        annotated drawing really used, when they were renamed in the config).

    Returns
    -------
    bytes
        The PNG file.

    Raises
    ------
    DrawingReadError
        The drawing cannot be read.
    """
    from ezdxf.addons.drawing import Frontend, RenderContext
    from ezdxf.addons.drawing.config import (
        BackgroundPolicy,
        ColorPolicy,
        Configuration,
        HatchPolicy,
        TextPolicy,
    )
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    doc, name = _open(drawing)
    msp = doc.modelspace()
    skip = {layer.upper() for layer in skip_layers}
    only = None if only_layers is None else {layer.upper() for layer in only_layers}
    ours = our_layer_prefix.upper()
    routes = {layer.upper() for layer in route_layers}
    kept = {layer.upper() for layer in keep_layers}
    lean = len(msp) > detail_limit
    if lean:
        skip |= {layer.upper() for layer in lean_skip_layers}

    # a reference to a block that is undefined, inserts itself or nests too deep is not
    # drawn (ezdxf's drawing add-on would raise or recurse without end); the reader reports it
    bad_blocks = set(block_problems(doc))

    def wanted(entity: Any) -> bool:
        if entity.dxftype() == "INSERT" and (
            entity.dxf.name in bad_blocks or doc.blocks.get(entity.dxf.name) is None
        ):
            return False
        layer = entity.dxf.get("layer", "0").upper()
        if layer in skip or (only is not None and layer not in only):
            return False
        if not lean or layer.startswith(ours) or layer in kept:
            return True
        t = entity.dxftype()
        if t == "INSERT":  # an equipment symbol carries attributes (its tag)
            return bool(entity.attribs)
        return layer in routes and t not in _CLUTTER

    chosen = [e for e in msp if wanted(e)]
    if max_entities is not None:
        chosen = chosen[: max(0, max_entities)]
    text_policy = TextPolicy.FILLING
    hatch_policy = HatchPolicy.NORMAL
    if lean:
        hatch_policy = HatchPolicy.IGNORE
        texts = sum(1 for e in chosen if e.dxftype() in _TEXTS)
        if texts > max_texts:
            text_policy = TextPolicy.IGNORE
        log.info(
            "%s: %d entities; preview of %d (routes, symbols and our marks)%s",
            name, len(msp), len(chosen),
            f", without the {texts} texts" if text_policy is TextPolicy.IGNORE else "",
        )
    if size_in is None:
        size_in = _size_for_extents(chosen, width_px / dpi, min_aspect, max_aspect)
    fig = Figure(figsize=size_in, dpi=dpi)
    FigureCanvasAgg(fig)
    ax = fig.add_axes((0, 0, 1, 1))
    config = Configuration(
        background_policy=BackgroundPolicy.WHITE,
        color_policy=ColorPolicy.COLOR,
        lineweight_scaling=lineweight_scaling,
        text_policy=text_policy,
        hatch_policy=hatch_policy,
    )
    frontend = Frontend(RenderContext(doc), BatchingBackend(ax), config=config)
    if lean:
        # the drawing's own attributes (inside the symbols) are not drawn; the
        # document is not changed (a property override, not the attribute flags)
        def hide_their_text(entity: Any, properties: Any) -> None:
            if entity.dxftype() in _TEXTS:
                layer = properties.layer.upper()
                if not (layer.startswith(ours) or layer in kept):
                    properties.is_visible = False

        frontend.push_property_override_function(hide_their_text)
    keep = {id(e) for e in chosen}
    frontend.draw_layout(msp, finalize=True, filter_func=lambda e: id(e) in keep)
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=dpi, facecolor="white")
    log.debug("preview of %s: %d bytes", name, buf.tell())
    return buf.getvalue()
