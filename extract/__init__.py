"""Extract stage: drawing + schedule -> route network, equipment, routed circuits.

The usual entry point is :func:`measure`; the pieces (:func:`read_dxf`,
:func:`build_network`, :func:`read_schedule`, :func:`route_circuits`,
:func:`circuits_per_segment`, :func:`group_summary`) may be used on their own.
"""

from __future__ import annotations

import logging
import os
from pathlib import Path
from typing import Any

from .dxf_reader import DxfContent, read_dxf
from .errors import DrawingReadError
from .grouping import GroupInfo, circuits_per_segment, group_summary
from .model import (
    CircuitRoute,
    DrawingConfig,
    Equipment,
    Measurement,
    RoutePolyline,
    RouteSegment,
    ScheduleRow,
)
from .network import Network, Tail, build_network
from .routing import design_length_m, route_circuits
from .schedule import read_schedule, rows_from_equipment

__all__ = [
    "measure",
    "read_dxf",
    "DxfContent",
    "build_network",
    "read_schedule",
    "rows_from_equipment",
    "route_circuits",
    "design_length_m",
    "circuits_per_segment",
    "group_summary",
    "GroupInfo",
    "CircuitRoute",
    "DrawingConfig",
    "Equipment",
    "Measurement",
    "Network",
    "RoutePolyline",
    "RouteSegment",
    "ScheduleRow",
    "Tail",
]

logger = logging.getLogger(__name__)


def measure(
    drawing_path: str | os.PathLike[str],
    schedule_path: str | os.PathLike[str] | None = None,
    config: DrawingConfig | None = None,
    ifc_config: Any = None,
) -> Measurement:
    """Read a drawing and a schedule, build the network and route every circuit.

    Parameters
    ----------
    drawing_path : str or path-like
        ``.dxf`` drawing or ``.ifc`` model (IFC2X3, IFC4, IFC4X3; see
        :func:`~cablewright.extract.ifc_reader.measure_ifc`).
    schedule_path : str or path-like, optional
        ``.csv`` or ``.xlsx`` schedule; without it the schedule is built from the
        equipment blocks' attributes (contract.md, ``--circuits``).
    config : DrawingConfig, optional
        Drawing conventions; defaults from contract.md.
    ifc_config : IfcConfig, optional
        How an IFC model is read (:class:`~cablewright.extract.ifc_reader.IfcConfig`).

    Returns
    -------
    Measurement
        Segments, equipment, rows, routes, per-circuit failures, issues, graph.

    Raises
    ------
    DrawingReadError
        The drawing cannot be used at all.
    ScheduleError
        The schedule cannot be used at all.

    References
    ----------
    .. [1] contract.md, "Drawing conventions", "Lengths and grouping".
    """
    config = config or DrawingConfig()
    p = Path(drawing_path)
    suffix = p.suffix.lower()
    if suffix == ".dxf":
        content = read_dxf(p, config)
        polylines, equipment, issues, units = (
            content.polylines, content.equipment, list(content.issues), content.units,
        )
    elif suffix == ".ifc":
        from .ifc_reader import measure_ifc  # ifcopenshell only when an IFC model is given

        return measure_ifc(p, schedule_path, config, ifc_config)
    else:
        raise DrawingReadError(f"{p}: drawing must be .dxf (or .ifc), not {suffix or 'no suffix'}")
    network = build_network(polylines, equipment, config, source=str(p))
    issues.extend(network.issues)
    rows = read_schedule(schedule_path) if schedule_path is not None else rows_from_equipment(equipment)
    routes, failures = route_circuits(network, rows, config)
    return Measurement(
        drawing=str(p),
        units=units,
        segments=network.segments,
        equipment=network.equipment,
        rows=rows,
        routes=routes,
        failures=failures,
        issues=issues,
        graph=network.graph,
        source_document=content.document,
    )
