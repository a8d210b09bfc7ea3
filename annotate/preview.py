"""A PNG preview of a DXF drawing's modelspace, for the report.

Rendered with ezdxf's drawing add-on and matplotlib's Agg canvas (no pyplot, no
window), on a white background.  Large drawings: pass ``skip_layers`` (clutter
such as hatches or furniture) or ``max_entities`` to draw only part of them.

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


def render_preview_png(
    dxf_path: str | os.PathLike[str],
    *,
    max_entities: int | None = None,
    dpi: int = 150,
    size_in: tuple[float, float] = (11.69, 8.27),
    skip_layers: Iterable[str] = (),
    only_layers: Iterable[str] | None = None,
    lineweight_scaling: float = 0.6,
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
    size_in : (float, float)
        Figure size [in] (default A4 landscape).
    skip_layers : iterable of str
        Layers not drawn (case-insensitive).
    only_layers : iterable of str, optional
        When given, draw only these layers (case-insensitive).
    lineweight_scaling : float
        Factor on DXF lineweights; thin lines keep a large drawing readable.

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
    count = 0

    def keep(entity: object) -> bool:
        nonlocal count
        layer = entity.dxf.get("layer", "0").upper()  # type: ignore[attr-defined]
        if layer in skip or (only is not None and layer not in only):
            return False
        if max_entities is not None:
            if count >= max_entities:
                return False
            count += 1
        return True

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
