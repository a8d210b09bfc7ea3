"""A PNG preview of a DXF drawing's modelspace, for the report.

Rendered with ezdxf's drawing add-on and matplotlib's Agg canvas (no pyplot, no
window), on a white background.  Large drawings: pass ``skip_layers`` (clutter
such as hatches or furniture) or ``max_entities`` to draw only part of them.

Drawings with more than ``detail_limit`` entities are drawn without their
clutter: HATCH, DIMENSION, SOLID, POINT and the drawing's own TEXT, MTEXT and
block attributes are skipped (lines, arcs, polylines, symbols and every mark on
our layers are kept), which is what a preview needs and what keeps matplotlib
fast.  The figure follows the aspect of the drawing's extents (``width_px``
wide, height clamped to ``[min_aspect, max_aspect]`` of the width), so a very
wide drawing is not squeezed into a thin strip of an A4 page.

References
----------
.. [1] ezdxf documentation, "Drawing Add-on" (``Frontend``, ``RenderContext``,
   ``MatplotlibBackend``, ``Configuration``).
.. [2] matplotlib documentation, ``matplotlib.backends.backend_agg.FigureCanvasAgg``.
"""

from __future__ import annotations

import io
import logging
import os
from collections.abc import Iterable

import ezdxf
from cablewright.extract.errors import DrawingReadError

__all__ = ["render_preview_png"]

log = logging.getLogger(__name__)

#: Entity types left out of the preview of a large drawing (see the module notes).
_CLUTTER = frozenset({"HATCH", "DIMENSION", "SOLID", "POINT", "TEXT", "MTEXT", "ATTRIB", "WIPEOUT"})


def _size_for_extents(
    msp: object, width_in: float, min_aspect: float, max_aspect: float
) -> tuple[float, float]:
    """Figure size [in] following the extents of modelspace (points of a cheap pass)."""
    xs: list[float] = []
    ys: list[float] = []
    for e in msp:  # type: ignore[attr-defined]
        t = e.dxftype()
        if t == "LINE":
            pts = [e.dxf.start, e.dxf.end]
        elif t == "LWPOLYLINE":
            pts = list(e.get_points("xy"))
        elif t in ("CIRCLE", "ARC"):
            c, r = e.dxf.center, e.dxf.radius
            pts = [(c[0] - r, c[1] - r), (c[0] + r, c[1] + r)]
        elif t in ("INSERT", "TEXT", "MTEXT"):
            pts = [e.dxf.insert]
        else:
            continue
        for q in pts:
            xs.append(float(q[0]))
            ys.append(float(q[1]))
    aspect = 0.7
    if xs and max(xs) > min(xs):
        aspect = (max(ys) - min(ys)) / (max(xs) - min(xs))
    aspect = min(max(aspect, min_aspect), max_aspect)
    return (width_in, width_in * aspect)


def render_preview_png(
    dxf_path: str | os.PathLike[str],
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
    our_layer_prefix: str = "CW-",
) -> bytes:
    """Render the modelspace of a DXF file to PNG bytes.

    Parameters
    ----------
    dxf_path : path-like
        The drawing to render.
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
        Above this many modelspace entities the clutter types are skipped
        (see the module notes).
    our_layer_prefix : str
        Layers starting with this (case-insensitive) are always drawn.

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
    from ezdxf.addons.drawing.config import BackgroundPolicy, ColorPolicy, Configuration
    from ezdxf.addons.drawing.matplotlib import MatplotlibBackend
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    try:
        doc = ezdxf.readfile(dxf_path)
    except (OSError, ezdxf.DXFStructureError) as exc:
        raise DrawingReadError(
            f"{dxf_path}: cannot read the drawing for a preview ({exc})"
        ) from exc
    msp = doc.modelspace()
    skip = {name.upper() for name in skip_layers}
    only = None if only_layers is None else {name.upper() for name in only_layers}
    ours = our_layer_prefix.upper()
    lean = len(msp) > detail_limit
    if lean:
        log.info(
            "%s: %d entities; preview without hatches, dimensions and the drawing's own text",
            dxf_path,
            len(msp),
        )
    count = 0

    def keep(entity: object) -> bool:
        nonlocal count
        layer = entity.dxf.get("layer", "0").upper()  # type: ignore[attr-defined]
        if layer in skip or (only is not None and layer not in only):
            return False
        if lean and not layer.startswith(ours) and entity.dxftype() in _CLUTTER:  # type: ignore[attr-defined]
            return False
        if max_entities is not None:
            if count >= max_entities:
                return False
            count += 1
        return True

    if lean:
        for insert in msp.query("INSERT"):
            if insert.attribs and not insert.dxf.layer.upper().startswith(ours):
                for attrib in insert.attribs:  # not saved: the document is ours, in memory
                    attrib.dxf.flags = attrib.dxf.get("flags", 0) | 1  # invisible
    if size_in is None:
        size_in = _size_for_extents(msp, width_px / dpi, min_aspect, max_aspect)
    fig = Figure(figsize=size_in, dpi=dpi)
    FigureCanvasAgg(fig)
    ax = fig.add_axes((0, 0, 1, 1))
    ctx = RenderContext(doc)
    config = Configuration(
        background_policy=BackgroundPolicy.WHITE,
        color_policy=ColorPolicy.COLOR,
        lineweight_scaling=lineweight_scaling,
    )
    backend = MatplotlibBackend(ax)
    Frontend(ctx, backend, config=config).draw_layout(msp, finalize=True, filter_func=keep)
    buf = io.BytesIO()
    fig.savefig(buf, format="png", dpi=dpi, facecolor="white")
    log.debug("preview of %s: %d bytes", dxf_path, buf.tell())
    return buf.getvalue()
