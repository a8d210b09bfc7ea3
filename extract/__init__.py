"""Extract stage: drawing + schedule -> route network, equipment, routed circuits.

The usual entry point is :func:`measure`; the pieces (:func:`read_dxf`,
:func:`build_network`, :func:`read_schedule`, :func:`route_circuits`,
:func:`circuits_per_segment`, :func:`group_summary`) may be used on their own.
"""

from __future__ import annotations

import logging
import os
from pathlib import Path
from typing import TYPE_CHECKING, Any

from .dxf_reader import DxfContent, read_dxf
from .errors import DrawingReadError, Issue
from .model import (
    UNIT_TO_M,
    CircuitRoute,
    DrawingConfig,
    Equipment,
    Measurement,
    RoutePolyline,
    RouteSegment,
    ScheduleRow,
)

if TYPE_CHECKING:  # pragma: no cover
    from .grouping import GroupInfo, circuits_per_segment, group_summary
    from .network import Network, Tail, build_network
    from .routing import design_length_m, route_circuits
    from .schedule import read_schedule, rows_from_equipment

#: Names imported on first use (PEP 562), so that importing the package (the
#: errors, the model - as ``calc`` does) does not import networkx and shapely.
_LAZY = {
    "GroupInfo": "grouping", "circuits_per_segment": "grouping", "group_summary": "grouping",
    "Network": "network", "Tail": "network", "build_network": "network",
    "design_length_m": "routing", "route_circuits": "routing",
    "read_schedule": "schedule", "rows_from_equipment": "schedule",
}


def __getattr__(name: str) -> Any:
    module = _LAZY.get(name)
    if module is None:
        raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
    import importlib

    value = getattr(importlib.import_module(f".{module}", __name__), name)
    globals()[name] = value
    return value


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
    keep_document: bool = True,
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
    keep_document : bool
        Keep the parsed ezdxf document (``Measurement.source_document``) for a
        later stage.  When False, a DXF drawing is read by the streaming reader
        (:func:`~cablewright.extract.dxf_stream.read_dxf_fast`: no document, the
        full reader only for drawings it declines) - the same measurement.

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
    from .network import build_network
    from .routing import route_circuits
    from .schedule import POSITION_COLUMNS, read_schedule, rows_from_equipment

    config = config or DrawingConfig()
    p = Path(drawing_path)
    suffix = p.suffix.lower()
    if suffix == ".dxf":
        if keep_document:
            content = read_dxf(p, config)
        else:
            from .dxf_stream import read_dxf_fast

            content = read_dxf_fast(p, config)
        polylines, equipment, issues, units = (
            content.polylines, content.equipment, list(content.issues), content.units,
        )
    elif suffix == ".ifc":
        from .ifc_reader import measure_ifc  # ifcopenshell only when an IFC model is given

        measurement = measure_ifc(p, schedule_path, config, ifc_config)
        if any(row.get(c) for row in measurement.rows for c in POSITION_COLUMNS):
            measurement.issues.append(Issue(
                "schedule-position", f"{p}: to_x/to_y/to_z in the schedule place loads in DXF drawings "
                "only; ignored for this IFC model - give the loads' tags"))
        return measurement
    else:
        raise DrawingReadError(f"{p}: drawing must be .dxf (or .ifc), not {suffix or 'no suffix'}")
    rows = (read_schedule(schedule_path) if schedule_path is not None
            else rows_from_equipment(equipment, str(p)))
    rows, equipment, position_errors = _positioned_loads(rows, equipment, UNIT_TO_M[units], issues)
    network = build_network(polylines, equipment, config)
    issues.extend(network.issues)
    routes, failures = route_circuits(network, rows, config)
    for cid, message in position_errors.items():
        routes.pop(cid, None)
        failures[cid] = message
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
        drawing_summary=content.summary,
    )


def _positioned_loads(rows: list[ScheduleRow], equipment: list[Equipment], metres_per_unit: float,
                      issues: list[Issue]) -> tuple[list[ScheduleRow], list[Equipment], dict[str, str]]:
    """Loads placed by the schedule's ``to_x``/``to_y``/``to_z`` (contract.md, Extensions).

    Each such row's load becomes an equipment at that point (drawing units ->
    metres), tagged with the row's ``to`` (``<circuit>-load`` when blank).  The
    schedule's position wins over a block with the same tag in the drawing.
    """
    from dataclasses import replace

    from .schedule import load_positions

    positions, errors = load_positions(rows)
    if not positions:
        return rows, equipment, errors
    placed: dict[str, tuple[float, float, float]] = {}
    out_rows = []
    for row in rows:
        xyz = positions.get(row.circuit_id)
        if xyz is None:
            out_rows.append(row)
            continue
        tag = row.to_tag or f"{row.circuit_id}-load"
        point = (xyz[0] * metres_per_unit, xyz[1] * metres_per_unit, xyz[2] * metres_per_unit)
        if tag in placed and placed[tag] != point:
            errors[row.circuit_id] = (f"{row.where}: load {tag} is given two positions in the schedule; "
                                      "give one position per load tag")
        placed.setdefault(tag, point)
        out_rows.append(replace(row, to_tag=tag) if tag != row.to_tag else row)
    drawn = {eq.tag for eq in equipment} & set(placed)
    if drawn:
        issues.append(Issue("schedule-position",
                            f"{rows[0].source}: load(s) {', '.join(sorted(drawn))} are in the drawing and given a position in the "
                            "schedule (to_x, to_y); the schedule's position is used"))
    kept = [eq for eq in equipment if eq.tag not in placed]
    kept += [Equipment(tag, f"schedule:{tag}", point, "schedule position") for tag, point in placed.items()]
    return out_rows, kept, errors
