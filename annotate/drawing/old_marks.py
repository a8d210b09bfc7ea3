"""What is ours on the drawing (our XDATA, our layers) and the removal of an earlier run's marks."""

from __future__ import annotations

from typing import Any

import ezdxf

from .style import DEFAULT_CONFIG, AnnotateConfig

__all__ = ["is_ours", "remove_old_marks"]


def is_ours(entity: Any, appid: str) -> bool:
    try:
        return bool(entity.has_xdata(appid))
    except (AttributeError, ezdxf.DXFValueError):
        return False


def remove_old_marks(doc: Any, config: AnnotateConfig = DEFAULT_CONFIG) -> int:
    """Delete what an earlier run added: entities with our XDATA or on our layers.

    Parameters
    ----------
    doc : ezdxf.document.Drawing
    config : AnnotateConfig

    Returns
    -------
    int
        Entities deleted.
    """
    appid = config.appid
    if not doc.appids.has_entry(appid):
        return 0
    our_layers = {layer.dxf.name.upper() for layer in doc.layers if is_ours(layer, appid)}
    removed = 0
    for layout in doc.layouts:
        doomed = [
            e for e in layout if is_ours(e, appid) or e.dxf.get("layer", "0").upper() in our_layers
        ]
        for entity in doomed:
            layout.delete_entity(entity)
            removed += 1
    return removed

