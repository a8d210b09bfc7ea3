"""A DXF plan view of a measured route network, for models that are not DXF (IFC).

The annotated DXF is written on a drawing; an IFC model has none, so this module
draws one from the :class:`~cablewright.extract.model.Measurement`: every route
segment as a 3D ``POLYLINE`` (seen from above it is the plan; its z is kept so that
reading the plan view again gives the same true 3D lengths) on the contract's route
layer of its containment (``ROUTE-TRAY``, ``ROUTE-DUCT`` ...), and every equipment as
an ``INSERT`` of our block ``CW-EQUIPMENT`` with a ``TAG`` attribute (and the
equipment's other attributes).  Drawing units are metres (``$INSUNITS`` = 6).

References
----------
.. [1] contract.md, "Drawing conventions" (route layers, equipment blocks with TAG).
.. [2] Autodesk DXF Reference, HEADER section: ``$INSUNITS`` 6 = metres.
"""

from __future__ import annotations

import logging
import os
from pathlib import Path
from typing import TYPE_CHECKING, Any

from cablewright.core.errors import DrawingReadError
from cablewright.extract.model import DEFAULT_ROUTE_LAYERS

from .atomic import atomic_path
from .reproducible import keep_classes_stable

if TYPE_CHECKING:  # pragma: no cover
    from cablewright.extract.model import Measurement

__all__ = ["EQUIPMENT_BLOCK", "EQUIPMENT_LAYER", "plan_view_document", "write_plan_view", "INSUNITS_METRES"]

logger = logging.getLogger(__name__)

#: Our block for equipment on the plan view.
EQUIPMENT_BLOCK = "CW-EQUIPMENT"
#: Layer of the equipment inserts.
EQUIPMENT_LAYER = "CW-EQUIPMENT"
#: ``$INSUNITS`` code of metres (Autodesk DXF Reference, HEADER section).
INSUNITS_METRES = 6
#: Symbol radius and tag text height on the plan, [m] (drawing choice).
_SYMBOL_R_M = 0.3
_TEXT_H_M = 0.25

#: ACI colour per containment (drawing choice, only for legibility).
_COLOURS = {"tray": 1, "ladder": 6, "conduit": 3, "clipped": 4, "duct": 30, "buried": 34}
_LAYER_OF = {kind[0]: layer for layer, kind in DEFAULT_ROUTE_LAYERS.items()}


def _layer_for(containment: str, layer: str) -> str:
    if layer.upper() in {k.upper() for k in DEFAULT_ROUTE_LAYERS}:
        return layer.upper()
    return _LAYER_OF.get(containment, "ROUTE-" + containment.upper())


def plan_view_document(measurement: Measurement) -> Any:
    """A plan-view DXF document (in memory) of the measured routes and equipment, in metres.

    What :func:`write_plan_view` saves; the pipeline annotates it directly (no file
    round trip).  Reading it back with the contract's default route layers gives the
    same segments and tails: segments are written with their true z, snap gaps included.

    References
    ----------
    .. [1] contract.md, "Drawing conventions".
    """
    import ezdxf

    doc = ezdxf.new("R2018", setup=True)
    doc.header["$INSUNITS"] = INSUNITS_METRES
    doc.header["$MEASUREMENT"] = 1  # metric
    msp = doc.modelspace()
    used: set[str] = set()
    for sid in sorted(measurement.segments, key=lambda s: (len(s), s)):
        seg = measurement.segments[sid]
        layer = _layer_for(seg.containment, seg.layer)
        if layer not in used:
            if layer not in doc.layers:
                doc.layers.add(layer, color=_COLOURS.get(seg.containment, 7))
            used.add(layer)
        msp.add_polyline3d(list(seg.points_m), dxfattribs={"layer": layer})
    doc.layers.add(EQUIPMENT_LAYER, color=5)
    blk = doc.blocks.new(EQUIPMENT_BLOCK)
    blk.add_circle((0, 0), _SYMBOL_R_M, dxfattribs={"layer": "0"})
    blk.add_attdef("TAG", (_SYMBOL_R_M * 1.2, 0), dxfattribs={"height": _TEXT_H_M, "layer": "0"})
    for tag in sorted(measurement.equipment):
        eq = measurement.equipment[tag]
        ref = msp.add_blockref(EQUIPMENT_BLOCK, eq.position_m, dxfattribs={"layer": EQUIPMENT_LAYER})
        values = {"TAG": tag}
        for name, value in eq.attributes:
            if name != "TAG":
                values[name] = value
        for k, (name, value) in enumerate(values.items()):
            attrib = ref.add_attrib(name, value, (eq.position_m[0] + _SYMBOL_R_M * 1.2,
                                                  eq.position_m[1] - k * _TEXT_H_M * 1.5, eq.position_m[2]),
                                    dxfattribs={"height": _TEXT_H_M, "layer": EQUIPMENT_LAYER})
            attrib.is_invisible = k > 0
    keep_classes_stable(doc)  # the same bytes whatever PYTHONHASHSEED (annotate.reproducible)
    return doc


def write_plan_view(measurement: Measurement, path: str | os.PathLike[str]) -> Path:
    """Write a plan-view DXF of the measured routes and equipment, in metres.

    Parameters
    ----------
    measurement : Measurement
        Segments (``points_m``, containment) and equipment (``position_m``), [m].
    path : path-like
        The DXF to write; written to a temporary name in the same folder and renamed.

    Returns
    -------
    pathlib.Path
        ``path``.

    Raises
    ------
    DrawingReadError
        The folder cannot be written.

    Notes
    -----
    Reading the plan view back with the contract's default route layers gives the same
    segments and tails: segments are written with their true z, snap gaps included.

    References
    ----------
    .. [1] contract.md, "Drawing conventions".
    """
    target = Path(path)
    doc = plan_view_document(measurement)
    try:
        with atomic_path(target) as tmp:
            doc.saveas(tmp)
    except OSError as exc:
        raise DrawingReadError(file=target, problem=f"cannot write the plan view ({exc.strerror})", fix="choose another --out") from exc
    logger.info("plan view: %d segments, %d equipment -> %s", len(measurement.segments),
                len(measurement.equipment), target)
    return target
