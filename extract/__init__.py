"""Extract stage: drawing + schedule -> route network, equipment, routed circuits.

The usual entry point is :func:`measure`; the pieces (:func:`read_dxf`,
:func:`build_network`, :func:`read_schedule`, :func:`route_circuits`,
:func:`circuits_per_segment`, :func:`group_summary`) may be used on their own.
"""

from __future__ import annotations

import logging
import os
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any

from cablewright.core.errors import DrawingReadError, Issue, IssueCode, ScheduleError

from .dxf_reader import DxfContent, read_dxf
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
    "measure_content",
    "read_drawing",
    "ReaderResult",
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


@dataclass(frozen=True)
class ReaderResult:
    """What every reader hands to :func:`measure`: the same shape for DXF and IFC.

    Attributes
    ----------
    path : str
        The drawing or model read.
    units : str
        Units reported for the drawing (the DXF's units; ``"m"`` for IFC, converted on reading).
    polylines : sequence of RoutePolyline
        Route pieces, [m].
    equipment : sequence of Equipment
        Tagged equipment, [m].
    issues : sequence of Issue
        Problems the reader found.
    circuit_rows : sequence of ScheduleRow
        Circuits the model itself holds (IFC circuit groups); empty for DXF.
    circuit_failures : mapping
        Circuit id -> message, for circuits of the model that cannot be told.
    no_circuits_hint : str or None
        The message when no schedule is given and the input holds no circuits.
    document : object or None
        The parsed DXF document (kept for the annotated copy and the preview).
    summary : object or None
        Units, where they came from, extents and scale check of a DXF drawing.
    carrier_sizes : mapping
        Source id -> :class:`~cablewright.extract.model.CarrierSize` the model states (IFC).
    """

    path: str
    units: str
    polylines: Sequence[RoutePolyline]
    equipment: Sequence[Equipment]
    issues: Sequence[Issue] = ()
    circuit_rows: Sequence[ScheduleRow] = ()
    circuit_failures: Mapping[str, str] = field(default_factory=dict)
    no_circuits_hint: str | None = None
    document: object | None = field(default=None, repr=False, compare=False)
    summary: Any = None
    carrier_sizes: Mapping[str, Any] = field(default_factory=dict)


def read_drawing(
    drawing_path: str | os.PathLike[str],
    config: DrawingConfig | None = None,
    ifc_config: Any = None,
    keep_document: bool = True,
    marks_appid: str | None = None,
) -> ReaderResult:
    """Read a ``.dxf`` drawing or an ``.ifc`` model into a :class:`ReaderResult`.

    Parameters
    ----------
    drawing_path : str or path-like
        The drawing or model.
    config : DrawingConfig, optional
        Drawing conventions.
    ifc_config : IfcConfig, optional
        How an IFC model is read.
    keep_document : bool
        True: the full ezdxf reader, keeping the parsed document for the
        annotated copy; False (measuring only): the streaming reader
        (:mod:`.dxf_stream`), which hands over to the full reader for what it
        does not handle.

    Returns
    -------
    ReaderResult

    Raises
    ------
    DrawingReadError
        The drawing cannot be used at all, or its suffix is neither .dxf nor .ifc.
    """
    config = config or DrawingConfig()
    p = Path(drawing_path)
    suffix = p.suffix.lower()
    if suffix == ".dxf":
        if keep_document:
            content = read_dxf(p, config)
        else:
            from .dxf_stream import read_dxf_fast

            content = read_dxf_fast(p, config, marks_appid=marks_appid)
        # streamed for a writer appending to the drawing: what it needs, in place of the document
        document = content.document if content.document is not None else getattr(content, "obstacles", None)
        return ReaderResult(str(p), content.units, content.polylines, content.equipment,
                            tuple(content.issues), document=document, summary=content.summary)
    if suffix == ".ifc":
        from .ifc_reader import reader_result  # ifcopenshell only when an IFC model is given

        return reader_result(p, config, ifc_config)
    raise DrawingReadError(file=p, problem=f"drawing must be .dxf (or .ifc), not {suffix or 'no suffix'}")


def measure(
    drawing_path: str | os.PathLike[str],
    schedule_path: str | os.PathLike[str] | None = None,
    config: DrawingConfig | None = None,
    ifc_config: Any = None,
    keep_document: bool = True,
    marks_appid: str | None = None,
) -> Measurement:
    """Read a drawing and a schedule, build the network and route every circuit.

    Parameters
    ----------
    drawing_path : str or path-like
        ``.dxf`` drawing or ``.ifc`` model (IFC2X3, IFC4, IFC4X3; see
        :func:`~cablewright.extract.ifc_reader.read_ifc`).
    schedule_path : str or path-like, optional
        ``.csv`` or ``.xlsx`` schedule; without it the schedule is built from the
        equipment blocks' attributes (contract.md, ``--circuits``), or for IFC from the
        model's circuit groups.
    config : DrawingConfig, optional
        Drawing conventions; defaults from contract.md.
    ifc_config : IfcConfig, optional
        How an IFC model is read (:class:`~cablewright.extract.ifc_reader.IfcConfig`).
    keep_document : bool
        Keep the parsed DXF document (for the annotated copy); False lets the
        streaming reader measure (``routes``), see :func:`read_drawing`.
    marks_appid : str, optional
        With ``keep_document=False``: our XDATA application id; the streaming
        reader then also keeps what the appending DXF writer needs
        (``Measurement.source_document`` is that
        :class:`~.dxf_stream_scan.StreamObstacles`, or the parsed document
        where the stream declined the drawing).

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
    return measure_content(read_drawing(drawing_path, config, ifc_config, keep_document, marks_appid),
                           schedule_path, config)


def measure_content(
    content: ReaderResult,
    schedule_path: str | os.PathLike[str] | None = None,
    config: DrawingConfig | None = None,
) -> Measurement:
    """The one measuring path after reading: network, schedule rows, routes.

    Parameters
    ----------
    content : ReaderResult
        What the reader found.
    schedule_path : str or path-like, optional
        ``.csv`` or ``.xlsx`` schedule.
    config : DrawingConfig, optional
        Drawing conventions.

    Returns
    -------
    Measurement

    Raises
    ------
    ScheduleError
        The schedule cannot be used, or there is none and the input holds no circuits.
    """
    from .network import build_network
    from .routing import route_circuits
    from .schedule import POSITION_COLUMNS, read_schedule, rows_from_equipment

    config = config or DrawingConfig()
    issues = list(content.issues)
    failures: dict[str, str] = {}
    if schedule_path is not None:
        rows = read_schedule(schedule_path)
    elif content.circuit_rows or content.circuit_failures:
        rows = list(content.circuit_rows)
        failures.update(content.circuit_failures)
    else:
        try:
            rows = rows_from_equipment(content.equipment, content.path)
        except ScheduleError as exc:
            if content.no_circuits_hint is None:
                raise
            raise ScheduleError(content.no_circuits_hint) from exc
    equipment = list(content.equipment)
    position_errors: dict[str, str] = {}
    if Path(content.path).suffix.lower() == ".dxf":  # a DXF drawing: the schedule may place loads
        rows, equipment, position_errors = _positioned_loads(rows, equipment, UNIT_TO_M[content.units], issues)
    elif any(row.get(c) for row in rows for c in POSITION_COLUMNS):
        issues.append(Issue(
            IssueCode.SCHEDULE_POSITION, f"{content.path}: to_x/to_y/to_z in the schedule place loads in DXF "
            "drawings only; ignored for this IFC model - give the loads' tags"))
    network = build_network(content.polylines, equipment, config, source=content.path)
    issues.extend(network.issues)
    routes, route_failures = route_circuits(network, rows, config)
    failures.update(route_failures)
    for cid, message in position_errors.items():
        routes.pop(cid, None)
        failures[cid] = message
    known = {r.circuit_id for r in rows}
    # circuits that come only from failed groups of the model, in a stable order
    for n, cid in enumerate(sorted(c for c in failures if c not in known), start=len(rows) + 1):
        rows.append(ScheduleRow(content.path, n, cid, "", ""))
    return Measurement(
        drawing=content.path,
        units=content.units,
        segments=network.segments,
        equipment=network.equipment,
        rows=rows,
        routes=routes,
        failures=failures,
        issues=issues,
        graph=network.graph,
        source_document=content.document,
        drawing_summary=content.summary,
        carrier_sizes=dict(content.carrier_sizes),
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
        issues.append(Issue(IssueCode.SCHEDULE_POSITION,
                            f"{rows[0].source}: load(s) {', '.join(sorted(drawn))} are in the drawing and given a position in the "
                            "schedule (to_x, to_y); the schedule's position is used"))
    kept = [eq for eq in equipment if eq.tag not in placed]
    kept += [Equipment(tag, f"schedule:{tag}", point, "schedule position") for tag, point in placed.items()]
    return out_rows, kept, errors
