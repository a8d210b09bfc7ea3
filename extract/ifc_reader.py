"""Read an IFC model: cable carriers as route polylines, equipment, circuit groups.

contract.md, "IFC input":

* route pieces are ``IfcCableCarrierSegment``, ``IfcCableCarrierFitting`` and
  ``IfcCableSegment`` (and ``IfcDuctSegment``/``IfcPipeSegment`` used as cable ducts,
  see :class:`IfcConfig`); a piece's path is its 'Axis' curve, else its body's
  extrusion; a fitting without an axis joins its ports through its placement origin;
* connectivity comes from ports (``IfcDistributionPort`` joined by
  ``IfcRelConnectsPorts``, taken as undirected, duplicates ignored); connected ports
  farther apart than the snap tolerance get a short joining piece between them, so
  the network builder joins them; pieces with no connected port rely on the drawing
  rules (snap, tee) and are reported;
* methods: tray and ladder segments E, trunking and conduit segments B2, our property
  set ``CW_Routing`` overrides; carriers wholly below ground are ducts in the ground (D1);
* equipment is matched by ``Tag``, then ``Name``; its insertion point is the origin
  of its ObjectPlacement.

Everything leaves this module in metres, as the same types the DXF reader produces,
so network building, routing and grouping are shared.

References
----------
.. [1] contract.md, "IFC input", "Drawing conventions".
.. [2] ISO 16739-1:2018 (IFC4 ADD2 TC1): IfcCableCarrierSegmentTypeEnum,
   IfcDistributionPort, IfcRelConnectsPorts, IfcRelNests, IfcDistributionCircuit.
.. [3] IEC 60364-5-52:2009, Table B.52.1 (reference methods E, B2, C, D1, D2).
"""

from __future__ import annotations

import logging
import os
from collections import Counter, defaultdict
from collections.abc import Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np
from cablewright.core.errors import CableRouteError, DrawingReadError, Issue, IssueCode

from .model import (
    CONTAINMENTS,
    DEFAULT_ROUTE_LAYERS,
    UNIT_TO_M,
    CarrierSize,
    DrawingConfig,
    Equipment,
    Measurement,
    RoutePolyline,
    ScheduleRow,
)

__all__ = [
    "SUPPORTED_SCHEMAS",
    "CARRIER_KINDS",
    "REFERENCE_METHODS",
    "ROUTING_PSET",
    "EQUIPMENT_PSET",
    "CIRCUIT_PSET",
    "SIZING_PSET",
    "ESTIMATED_NOTE",
    "ESTIMATED_PREFIX",
    "IfcConfig",
    "IfcContent",
    "estimated_routes",
    "open_model",
    "read_ifc",
    "route_layer",
    "measure_ifc",
]

if TYPE_CHECKING:  # pragma: no cover
    from . import ReaderResult

logger = logging.getLogger(__name__)

#: IFC schemas read (``ifcopenshell.file.schema``).
SUPPORTED_SCHEMAS = ("IFC2X3", "IFC4", "IFC4X3")

#: ``IfcCableCarrierSegment.PredefinedType`` -> (containment, reference method), per
#: contract.md "IFC input" (methods per IEC 60364-5-52:2009, Table B.52.1).
CARRIER_KINDS: Mapping[str, tuple[str, str]] = {
    "CABLETRAYSEGMENT": ("tray", "E"),
    "CABLELADDERSEGMENT": ("ladder", "E"),
    "CABLETRUNKINGSEGMENT": ("conduit", "B2"),
    "CONDUITSEGMENT": ("conduit", "B2"),
}

#: Reference methods of IEC 60364-5-52:2009, Table B.52.1, accepted in ``CW_Routing``.
REFERENCE_METHODS = ("A1", "A2", "B1", "B2", "C", "D1", "D2", "E", "F", "F_FLAT", "G", "G_VERTICAL")

#: Our property set on a route piece: ``Containment`` (one of CONTAINMENTS) and/or
#: ``ReferenceMethod`` (IEC 60364-5-52 letter) override the class's default.
ROUTING_PSET = "CW_Routing"
#: Our property set on equipment: properties named like schedule columns.
EQUIPMENT_PSET = "CW_Equipment"
#: Our property set on an IfcDistributionCircuit / IfcElectricalCircuit: schedule
#: columns (``load``, ``power_factor``, ...; ``from``/``to`` optional).
CIRCUIT_PSET = "CW_Circuit"
#: Property set our IFC writer puts on the cables it adds; such cables are results,
#: not routes, and the reader skips them.
SIZING_PSET = "CW_CableSizing"

_ROUTE_CLASSES = ("IfcCableCarrierSegment", "IfcCableCarrierFitting", "IfcCableSegment")
#: Occurrence class (IFC4) or type class (IFC2X3, where the occurrence is a plain
#: IfcFlowSegment / IfcFlowFitting) -> role of the piece.
_ROLES = (
    ("IfcCableCarrierFitting", "fitting"),
    ("IfcCableCarrierSegment", "carrier"),
    ("IfcCableSegment", "cable"),
    ("IfcDuctSegment", "duct"),
    ("IfcPipeSegment", "duct"),
)


def _route_role(element: Any) -> str | None:
    """``carrier``, ``fitting``, ``cable``, ``duct`` or None for a flow segment/fitting."""
    for cls, role in _ROLES:
        try:
            if element.is_a(cls):
                return role
        except RuntimeError:
            continue
    import ifcopenshell.util.element as ue

    tp = ue.get_type(element)
    if tp is not None:
        for cls, role in _ROLES:
            if tp.is_a(cls + "Type"):
                return role
    return None

_LAYER_OF = {kind[0]: layer for layer, kind in DEFAULT_ROUTE_LAYERS.items()}


def route_layer(containment: str) -> str:
    """The contract's route layer for a containment kind (``"tray"`` -> ``"ROUTE-TRAY"``)."""
    return _LAYER_OF.get(containment, "ROUTE-" + containment.upper())


@dataclass(frozen=True)
class IfcConfig:
    """How to read an IFC model (defaults from contract.md, "IFC input").

    Attributes
    ----------
    tag_sources : tuple of str
        Element attributes tried in turn for the equipment tag.
    below_ground_z_m : float
        A carrier whose highest point lies below this world z is in the ground, [m]
        (-0.3 m, common practice: below a floor slab / finished ground).
    below_ground_kind : (containment, method)
        Carriers in the ground: ducts in the ground, D1 (IEC 60364-5-52:2009, B.52.1).
    buried_cable_kind : (containment, method)
        A bare ``IfcCableSegment`` in the ground: direct in the ground, D2.
    cable_segment_kind : (containment, method)
        A bare ``IfcCableSegment`` above ground: clipped direct, C.
    default_kind : (containment, method)
        A carrier of no known type, and a fitting with no carrier next to it: tray, E.
    equipment_classes : tuple of str
        IFC classes (subtypes included) read as equipment.
    source_classes : tuple of str
        Equipment classes that feed circuits (used to tell a circuit group's source).
    estimate_routes : bool
        A model without cable carriers (the usual export of an electrical model): estimate
        each circuit group's route as a right-angle path in plan (along x, then y) at the
        source's level with a vertical rise at the load (:func:`estimated_routes`); every
        circuit on such a route says "estimated".  Off (default): such a model is refused,
        naming the equipment and circuits found.
    containment_from_model : bool
        On (default): a carrier whose model states its width or inner diameter (profile of
        its body or the standard property sets, :mod:`.ifc_carrier_size`) uses it for the
        tray and duct fill, and ``[sizing.containment_mm]`` covers only the carriers that
        state none; off: the project's ``[sizing.containment_mm]`` per route layer for all.
    """

    tag_sources: tuple[str, ...] = ("Tag", "Name")
    below_ground_z_m: float = -0.3
    below_ground_kind: tuple[str, str] = ("duct", "D1")
    buried_cable_kind: tuple[str, str] = ("buried", "D2")
    cable_segment_kind: tuple[str, str] = ("clipped", "C")
    default_kind: tuple[str, str] = ("tray", "E")
    equipment_classes: tuple[str, ...] = (
        "IfcElectricDistributionBoard",
        "IfcElectricDistributionPoint",
        "IfcElectricMotor",
        "IfcElectricAppliance",
        "IfcElectricFlowStorageDevice",
        "IfcElectricGenerator",
        "IfcTransformer",
        "IfcLightFixture",
        "IfcLamp",
        "IfcOutlet",
        "IfcAudioVisualAppliance",
        "IfcCommunicationsAppliance",
        "IfcMotorConnection",
        "IfcSwitchingDevice",
        "IfcProtectiveDevice",
        "IfcPump",
        "IfcFan",
        "IfcCompressor",
        "IfcUnitaryEquipment",
    )
    source_classes: tuple[str, ...] = (
        "IfcElectricDistributionBoard",
        "IfcElectricDistributionPoint",
        "IfcElectricGenerator",
        "IfcTransformer",
    )
    estimate_routes: bool = False
    containment_from_model: bool = True


#: Source id prefix of a route piece estimated without carriers (``[ifc] estimate_routes``).
ESTIMATED_PREFIX = "estimated:"

#: The message on every circuit routed over an estimated piece.
ESTIMATED_NOTE = (
    "route estimated: the model has no cable carriers; a right-angle path in plan with a "
    "vertical rise was taken ([ifc] estimate_routes), each circuit on its own run, so the "
    "grouping with other cables is not known - check the length and grouping against the real route"
)


def estimated_routes(rows: list[ScheduleRow], equipment: list[Equipment], kind: tuple[str, str]) -> list[RoutePolyline]:
    """One right-angle (Manhattan) route per circuit, from its source to its load, [m].

    Along x, then along y, at the source's height, then straight up or down to the load:
    the length is |dx| + |dy| + |dz|, the usual estimate for services run parallel to the
    walls with a riser at each level change (common practice).  Circuits from one source
    share its start point, so they join there and nowhere else.

    Parameters
    ----------
    rows : list of ScheduleRow
        The model's circuits (from and to tags).
    equipment : list of Equipment
        Positions in world metres.
    kind : (containment, method)
        Containment taken for the estimated routes (``IfcConfig.default_kind``).

    Returns
    -------
    list of RoutePolyline
        Source id ``"estimated:<circuit>"``.

    Examples
    --------
    >>> eq = [Equipment("DB", "g1", (0.0, 0.0, 0.0), "IfcElectricDistributionBoard"),
    ...       Equipment("M", "g2", (3.0, 4.0, 3.5), "IfcOutlet")]
    >>> row = ScheduleRow("m.ifc", 1, "C1", "DB", "M")
    >>> [pl.points_m for pl in estimated_routes([row], eq, ("tray", "E"))]
    [((0.0, 0.0, 0.0), (3.0, 0.0, 0.0), (3.0, 4.0, 0.0), (3.0, 4.0, 3.5))]
    """
    pos = {e.tag: e.position_m for e in equipment}
    out: list[RoutePolyline] = []
    containment, method = kind
    for row in rows:
        a, b = pos.get(row.from_tag), pos.get(row.to_tag)
        if a is None or b is None:
            continue
        pts: list[tuple[float, float, float]] = [tuple(map(float, a))]  # type: ignore[list-item]
        for q in ((b[0], a[1], a[2]), (b[0], b[1], a[2]), tuple(b)):
            q = tuple(map(float, q))
            if max(abs(q[k] - pts[-1][k]) for k in range(3)) > 1e-9:
                pts.append(q)  # type: ignore[arg-type]
        if len(pts) >= 2:
            out.append(RoutePolyline(tuple(pts), route_layer(containment), containment, method,
                                     ESTIMATED_PREFIX + row.circuit_id))
    return out


def _equipment_summary(equipment: list[Equipment], rows: list[ScheduleRow], failures: Mapping[str, str]) -> str:
    """"N equipment (DB-1: C1, C2; DB-2: C3) and M circuit groups": what the model holds."""
    by_source: dict[str, list[str]] = defaultdict(list)
    for r in rows:
        by_source[r.from_tag].append(r.circuit_id)
    feeds = "; ".join(f"{src}: {', '.join(cids[:6])}{' ...' if len(cids) > 6 else ''}"
                      for src, cids in sorted(by_source.items())[:6])
    more = f" and {len(by_source) - 6} more sources" if len(by_source) > 6 else ""
    text = f"{len(equipment)} tagged equipment and {len(rows) + len(failures)} circuit group(s)"
    return text + (f" ({feeds}{more})" if feeds else "")


@dataclass(frozen=True)
class IfcContent:
    """What :func:`read_ifc` found.

    Attributes
    ----------
    path : str
    schema : str
        ``"IFC2X3"``, ``"IFC4"`` or ``"IFC4X3"``.
    model_units : str
        The model's length unit (``"mm"``, ``"m"`` ...); everything here is in metres.
    units : str
        Units of the polylines and positions: always ``"m"``.
    polylines : tuple of RoutePolyline
        Route pieces (fitting legs and port joins included), [m].
    equipment : tuple of Equipment
        Tagged equipment, positions in world metres.
    issues : tuple of Issue
        Problems found (unreadable geometry, pieces without ports, ...).
    port_links : int
        Port-to-port connections between route pieces (undirected, each once).
    port_joins : int
        Joining pieces added between connected ports that did not touch.
    circuit_rows : tuple of ScheduleRow
        Circuits from IfcDistributionCircuit / IfcElectricalCircuit groups.
    circuit_failures : mapping
        Circuit id -> message, for groups whose source or load cannot be told.
    carrier_sizes : mapping
        GlobalId -> :class:`~cablewright.extract.model.CarrierSize` of every carrier that
        states its width or inner diameter (``[ifc] containment_from_model``).
    """

    path: str
    schema: str
    model_units: str
    polylines: tuple[RoutePolyline, ...]
    equipment: tuple[Equipment, ...]
    issues: tuple[Issue, ...] = ()
    port_links: int = 0
    port_joins: int = 0
    circuit_rows: tuple[ScheduleRow, ...] = ()
    circuit_failures: Mapping[str, str] = field(default_factory=dict)
    units: str = "m"
    carrier_sizes: Mapping[str, CarrierSize] = field(default_factory=dict)


def open_model(path: str | os.PathLike[str]) -> Any:
    """Open an IFC file and check its schema.

    Raises
    ------
    DrawingReadError
        Missing, empty or unreadable file; a schema other than :data:`SUPPORTED_SCHEMAS`.
    """
    p = Path(path)
    if not p.exists():
        raise DrawingReadError(file=p, problem="file not found", fix="check the model path")
    if p.is_dir():
        raise DrawingReadError(file=p, problem="is a folder, not an IFC file", fix="give the model file")
    if p.stat().st_size == 0:
        raise DrawingReadError(file=p, problem="file is empty", fix="export the model again as IFC")
    declared = _declared_schema(p)
    if declared is not None and not _schema_ok(declared):
        raise DrawingReadError(file=p, problem=f'IFC schema {declared} is not supported',
                               fix=f"export as {', '.join(SUPPORTED_SCHEMAS)}")
    try:
        import ifcopenshell
    except ImportError as exc:  # pragma: no cover - depends on the environment
        raise DrawingReadError(file=p, problem="reading IFC needs ifcopenshell",
                               fix="install cablewright[ifc]") from exc
    try:
        model = ifcopenshell.open(str(p))
    except (ifcopenshell.Error, OSError, RuntimeError, ValueError) as exc:
        raise DrawingReadError(file=p, problem=f'not a readable IFC (STEP) file ({(str(exc).splitlines()[0] if str(exc) else type(exc).__name__)})',
                               fix="export the model again as IFC2X3, IFC4 or IFC4X3") from exc
    schema = str(model.schema).upper()
    if not _schema_ok(schema):
        raise DrawingReadError(file=p, problem=f'IFC schema {model.schema} is not supported',
                               fix=f"export as {', '.join(SUPPORTED_SCHEMAS)}")
    return model


#: The last line of a complete STEP exchange structure (ISO 10303-21:2016, clause 5.3).
STEP_END = b"END-ISO-10303-21;"

#: Bytes read from the end of a file to check that it is complete.
_TAIL_BYTES = 65536


def step_damage(path: str | os.PathLike[str]) -> str | None:
    """What is wrong with the end of a STEP (IFC) file, or None when it ends as it must.

    A complete file ends with the DATA section's ``ENDSEC;`` and ``END-ISO-10303-21;``
    (ISO 10303-21:2016, clause 5.3).  A file cut short (an interrupted copy or export)
    parses in part: whatever came after the cut, routes included, would be missing
    without a word, so the reader refuses it unless recover mode is asked for.

    Parameters
    ----------
    path : path-like
        The IFC file.

    Returns
    -------
    str or None
        One line: where the file ends, naming the entity it ends in.
    """
    import re

    p = Path(path)
    size = p.stat().st_size
    with p.open("rb") as fh:
        head = fh.read(_TAIL_BYTES)
        if b"DATA;" not in head:  # not a STEP file with data: the parser says what it is
            return None
        fh.seek(max(0, size - _TAIL_BYTES))
        tail = fh.read()
    end = tail.rstrip()
    if end.endswith(STEP_END) and end[: -len(STEP_END)].rstrip().endswith(b"ENDSEC;"):
        return None
    lines = end.split(b"\n")
    last_line = lines[-1].strip()
    done = list(re.finditer(rb"(?m)^\s*#(\d+)\s*=", b"\n".join(lines[:-1])))
    after = f", after entity #{done[-1].group(1).decode()}" if done else ""
    if last_line.endswith(b";"):
        return f"the file ends without its closing 'ENDSEC;' and 'END-ISO-10303-21;'{after}"
    shown = last_line[:60].decode("latin-1")
    return f"the file ends inside an entity ('{shown}...'{after})"


def lost_entities(path: str | os.PathLike[str]) -> list[str]:
    """Entities a truncated STEP file refers to but no longer holds, as ``"#id"``, in order.

    Parameters
    ----------
    path : path-like
        The IFC file.

    Returns
    -------
    list of str
        Ids referenced by some entity and defined by none (cut off by the end of the file).
    """
    import re

    text = Path(path).read_bytes()
    data = text[text.find(b"DATA;"):] if b"DATA;" in text else text
    defined = {int(m) for m in re.findall(rb"(?m)^\s*#(\d+)\s*=", data)}
    referenced = {int(m) for m in re.findall(rb"#(\d+)", data)}
    return [f"#{k}" for k in sorted(referenced - defined)]


def _check_complete(p: Path, config: DrawingConfig, issues: list[Issue]) -> None:
    """Refuse a truncated file; in recover mode list what was lost instead."""
    damage = step_damage(p)
    if damage is None:
        return
    if not config.recover:
        raise DrawingReadError(file=p, problem=f'the IFC file is damaged: {damage}',
                               fix="missing elements would give wrong lengths. Export the model again, or use --recover to measure what can be read")
    lost = lost_entities(p)
    shown = ", ".join(lost[:20]) + (f" and {len(lost) - 20} more" if len(lost) > 20 else "")
    issues.append(Issue(IssueCode.RECOVERED, f"{p}: damaged file read in recover mode: {damage}"))
    issues.append(Issue(
        IssueCode.RECOVER_LOST,
        f"{p}: lost with the end of the file: the entity cut off"
        + (f" and {len(lost)} entities referred to: {shown}" if lost else "")
        + " - check the routes against the model",
    ))


def _schema_ok(name: str) -> bool:
    n = name.upper()
    return n in ("IFC2X3", "IFC4") or n.startswith("IFC4X3")


def _declared_schema(p: Path) -> str | None:
    """The schema named in a STEP header's FILE_SCHEMA, or None when not found."""
    import re

    try:
        with p.open("rb") as fh:
            head = fh.read(16384).decode("latin-1")
    except OSError as exc:
        raise DrawingReadError(file=p, problem=f"cannot be opened ({exc.strerror})", fix="check the path and permissions") from exc
    m = re.search(r"FILE_SCHEMA\s*\(\s*\(\s*'([^']*)'", head, re.IGNORECASE)
    return m.group(1).strip() if m else None


def _by_type(model: Any, cls: str) -> list[Any]:
    try:
        return list(model.by_type(cls))
    except RuntimeError:  # class not in this schema
        return []


def _unit_scale(model: Any, path: Path, config: DrawingConfig) -> tuple[float, str]:
    import ifcopenshell.util.unit as uu

    has_length = False
    for project in _by_type(model, "IfcProject"):
        ctx = project.UnitsInContext
        if ctx is not None:
            has_length = any(getattr(u, "UnitType", None) == "LENGTHUNIT" for u in ctx.Units)
    if not has_length:
        if config.units is not None and config.units in UNIT_TO_M:
            return UNIT_TO_M[config.units], config.units
        raise DrawingReadError(file=path, problem="the model states no length unit (IfcProject.UnitsInContext)",
                               fix='give the units in the config (units = "mm")')
    scale = float(uu.calculate_unit_scale(model))
    name = next((k for k, v in UNIT_TO_M.items() if abs(v - scale) <= 1e-12 * v), f"{scale:g} m")
    return scale, name


def _pset(element: Any, name: str) -> dict[str, Any]:
    import ifcopenshell.util.element as ue

    found = ue.get_pset(element, name)
    return dict(found) if found else {}


def _predefined(element: Any) -> str:
    import ifcopenshell.util.element as ue

    value = ue.get_predefined_type(element)
    return str(value).upper() if value else ""


def _gid(element: Any) -> str:
    return str(getattr(element, "GlobalId", "") or f"#{element.id()}")


def _label(element: Any) -> str:
    name = getattr(element, "Name", None)
    return f"{element.is_a()} {_gid(element)}" + (f" ({name})" if name else "")


@dataclass
class _Piece:
    element: Any
    gid: str
    is_fitting: bool
    polys: list[np.ndarray]  # world metres
    origin: np.ndarray
    kind: tuple[str, str] | None = None  # (containment, method) once known
    override: bool = False


def _override(element: Any, issues: list[Issue]) -> tuple[str, str] | None:
    props = _pset(element, ROUTING_PSET)
    if not props:
        return None
    containment = str(props.get("Containment") or "").strip().lower()
    method = str(props.get("ReferenceMethod") or "").strip().upper()
    if containment and containment not in CONTAINMENTS:
        issues.append(Issue(
            IssueCode.BAD_OVERRIDE,
            f"{_label(element)}: {ROUTING_PSET}.Containment {containment!r} is not one of "
            f"{', '.join(CONTAINMENTS)}; ignored",
            _gid(element),
        ))
        containment = ""
    if method and method not in REFERENCE_METHODS:
        issues.append(Issue(
            IssueCode.BAD_OVERRIDE,
            f"{_label(element)}: {ROUTING_PSET}.ReferenceMethod {method!r} is not one of "
            f"{', '.join(REFERENCE_METHODS)}; ignored",
            _gid(element),
        ))
        method = ""
    if not containment and not method:
        return None
    if not containment:
        return ("", method)
    if not method:
        method = DEFAULT_ROUTE_LAYERS[route_layer(containment)][1]
    return (containment, method)


def _is_cable_duct(element: Any) -> bool:
    """An IfcDuctSegment / IfcPipeSegment counts as a cable duct when it carries our
    routing property set or has a port of an electrical system or cable type."""
    import ifcopenshell.util.system as us

    if _pset(element, ROUTING_PSET):
        return True
    for port in us.get_ports(element):
        if getattr(port, "SystemType", None) in ("ELECTRICAL", "LIGHTNINGPROTECTION"):
            return True
        if getattr(port, "PredefinedType", None) in ("CABLE", "CABLECARRIER"):
            return True
    return False


def _nearest_on(polys: list[np.ndarray], p: np.ndarray) -> np.ndarray:
    best, best_d = polys[0][0], np.inf
    for v in polys:
        a, b = v[:-1], v[1:]
        ab = b - a
        l2 = np.einsum("ij,ij->i", ab, ab)
        t = np.where(l2 > 0, np.einsum("ij,ij->i", p - a, ab) / np.where(l2 > 0, l2, 1.0), 0.0)
        q = a + np.clip(t, 0.0, 1.0)[:, None] * ab
        d = np.linalg.norm(q - p, axis=1)
        k = int(np.argmin(d))
        if d[k] < best_d:
            best, best_d = q[k], float(d[k])
    return best


def _read_ifc(
    path: str | os.PathLike[str],
    config: DrawingConfig | None = None,
    ifc_config: IfcConfig | None = None,
) -> IfcContent:
    """The reading itself, step by step; :func:`read_ifc` turns a damaged entity into one line."""
    config = config or DrawingConfig()
    ic = ifc_config or IfcConfig()
    p = Path(path)
    issues: list[Issue] = []
    if p.is_file() and p.stat().st_size:
        _check_complete(p, config, issues)
    model = open_model(p)
    scale, unit_name = _unit_scale(model, p, config)
    cache: dict[int, np.ndarray] = {}
    roles, elements = _route_elements(model)
    seen = set(roles)
    pieces, port_owner, port_pos = _route_pieces(elements, roles, p, scale, cache, issues)
    links, neighbours, link_ports = _port_links(model, port_owner)
    _assign_kinds(pieces, roles, p, ic, issues)
    _fitting_kinds(pieces, neighbours, ic, config.snap_tolerance_m)
    polylines, joins = _polylines(pieces, link_ports, port_pos, config.snap_tolerance_m)
    _unlinked_issue(pieces, neighbours, links, p, config.snap_tolerance_m, issues)
    equipment = _read_equipment(model, p, ic, scale, cache, seen, issues)
    rows, failures = _read_circuits(model, p, ic, equipment)
    if not pieces:
        summary = _equipment_summary(equipment, rows, failures)
        if not ic.estimate_routes:
            raise DrawingReadError(
                file=p, problem=f"the model has no cable carriers ({', '.join(_ROUTE_CLASSES)}); it holds {summary}",
                fix="set [ifc] estimate_routes = true for estimated right-angle routes, "
                "or model the trays, ladders and conduits, or export the routes to DXF"
            )
        polylines = estimated_routes(rows, equipment, ic.default_kind)
        issues.append(Issue(
            IssueCode.ESTIMATED_ROUTES,
            f"{p}: no cable carriers; {len(polylines)} route(s) estimated as right-angle paths "
            f"([ifc] estimate_routes) for {summary}",
            "",
        ))
    logger.info(
        "%s: %s, %s; %d route pieces, %d port links (%d joins added), %d equipment, %d circuit groups",
        p, model.schema, unit_name, len(pieces), len(links), joins, len(equipment), len(rows) + len(failures),
    )
    return IfcContent(
        path=str(p),
        schema=str(model.schema).upper(),
        model_units=unit_name,
        polylines=tuple(polylines),
        equipment=tuple(equipment),
        issues=tuple(issues),
        port_links=len(links),
        port_joins=joins,
        circuit_rows=tuple(rows),
        circuit_failures=failures,
        carrier_sizes=_carrier_sizes(pieces, scale) if ic.containment_from_model else {},
    )


def _carrier_sizes(pieces: list[_Piece], scale_m: float) -> dict[str, CarrierSize]:
    """GlobalId -> the width or inner diameter each carrier segment's model states [mm]."""
    from .ifc_carrier_size import carrier_size

    out: dict[str, CarrierSize] = {}
    for piece in pieces:
        if piece.is_fitting or piece.kind is None:
            continue
        size = carrier_size(piece.element, piece.kind[0], 1000.0 * scale_m)
        if size is not None:
            out[piece.gid] = size
    return out




def _route_elements(model: Any) -> tuple[dict[int, str], list[Any]]:
    """The route elements of the model (by step id) and their roles, in id order."""
    roles: dict[int, str] = {}
    elements: list[Any] = []
    for el in _by_type(model, "IfcFlowSegment") + _by_type(model, "IfcFlowFitting"):
        role = _route_role(el)
        if role is None or el.id() in roles:
            continue
        if role == "duct" and not _is_cable_duct(el):
            continue
        if role == "cable" and _pset(el, SIZING_PSET):
            continue  # a cable our writer added: a result, not a route
        roles[el.id()] = role
        elements.append(el)
    elements.sort(key=lambda e: e.id())

    return roles, elements


def _route_pieces(
    elements: list[Any], roles: dict[int, str], p: Path, scale: float, cache: dict[int, np.ndarray],
    issues: list[Issue],
) -> tuple[list[_Piece], dict[int, int], dict[int, np.ndarray | None]]:
    """Each element's world polylines [m] and its ports (owner piece, world position [m])."""
    import ifcopenshell.util.system as us

    from .ifc_geometry import (
        UnsupportedGeometry,
        axis_points,
        body_axis_points,
        transform,
        world_matrix,
    )

    pieces: list[_Piece] = []
    port_owner: dict[int, int] = {}
    port_pos: dict[int, np.ndarray | None] = {}
    for el in elements:
        m = world_matrix(el, cache)
        origin = m[:3, 3] * scale
        ports = us.get_ports(el)
        is_fitting = roles[el.id()] == "fitting"
        polys: list[np.ndarray] = []
        try:
            local = axis_points(el)
            if local is None and not is_fitting:
                local = body_axis_points(el)
        except UnsupportedGeometry as exc:
            issues.append(Issue(
                IssueCode.GEOMETRY,
                f"{p}: {_label(el)}: {exc} is not read"
                + ("" if is_fitting else "; piece ignored")
                + " - give it an 'Axis' polyline",
                _gid(el),
            ))
            if not is_fitting:
                continue
            local = None
        if local is not None:
            polys.append(transform(m, local) * scale)
        elif is_fitting:
            for port in ports:
                if port.ObjectPlacement is None:
                    continue
                pp = world_matrix(port, cache)[:3, 3] * scale
                if float(np.linalg.norm(pp - origin)) > 1e-6:
                    polys.append(np.asarray([pp, origin]))
        else:
            issues.append(Issue(
                IssueCode.NO_GEOMETRY,
                f"{p}: {_label(el)} has neither an 'Axis' curve nor an extruded 'Body'; "
                "ignored - give it an axis",
                _gid(el),
            ))
            continue
        idx = len(pieces)
        pieces.append(_Piece(el, _gid(el), is_fitting, polys, origin))
        for port in ports:
            port_owner[port.id()] = idx
            port_pos[port.id()] = (
                world_matrix(port, cache)[:3, 3] * scale if port.ObjectPlacement is not None else None
            )

    if not pieces and elements:
        shown = ", ".join(_label(el) for el in elements[:3]) + (
            f" and {len(elements) - 3} more" if len(elements) > 3 else ""
        )
        raise DrawingReadError(file=p, problem=f"the model's {len(elements)} route element(s) ({shown}) have no usable geometry",
                               fix="give each an 'Axis' polyline or an extruded 'Body', or export the routes to DXF")
    return pieces, port_owner, port_pos


def _port_links(
    model: Any, port_owner: dict[int, int]
) -> tuple[set[tuple[int, int]], dict[int, set[int]], dict[tuple[int, int], tuple[int, int]]]:
    """Connected port pairs between two different pieces, and the pieces' neighbours."""
    links: set[tuple[int, int]] = set()
    link_ports: dict[tuple[int, int], tuple[int, int]] = {}
    for rel in _by_type(model, "IfcRelConnectsPorts"):
        a, b = rel.RelatingPort, rel.RelatedPort
        if a is None or b is None:
            continue
        ia, ib = port_owner.get(a.id()), port_owner.get(b.id())
        if ia is None or ib is None or ia == ib:
            continue
        key = (a.id(), b.id()) if a.id() < b.id() else (b.id(), a.id())
        if key not in links:
            links.add(key)
    neighbours: dict[int, set[int]] = defaultdict(set)
    for pa, pb in links:
        ia, ib = port_owner[pa], port_owner[pb]
        neighbours[ia].add(ib)
        neighbours[ib].add(ia)
        link_ports[(pa, pb)] = (ia, ib)

    return links, neighbours, link_ports


def _assign_kinds(pieces: list[_Piece], roles: dict[int, str], p: Path, ic: IfcConfig, issues: list[Issue]) -> None:
    """Containment and method of every carrier, cable and duct (fittings after, from them)."""
    for piece in pieces:
        el = piece.element
        ov = _override(el, issues)
        top_z = max((float(v[:, 2].max()) for v in piece.polys), default=float(piece.origin[2]))
        below = top_z < ic.below_ground_z_m
        base: tuple[str, str] | None
        if piece.is_fitting:
            base = None
        elif roles[el.id()] == "carrier":
            pre = _predefined(el)
            base = CARRIER_KINDS.get(pre)
            if base is None:
                base = ic.default_kind
                issues.append(Issue(
                    IssueCode.CARRIER_TYPE,
                    f"{p}: {_label(el)} has PredefinedType {pre or 'none'}; taken as "
                    f"{base[0]} (method {base[1]}) - set {ROUTING_PSET}.Containment to say otherwise",
                    piece.gid,
                ))
            if below:
                base = ic.below_ground_kind
        elif roles[el.id()] == "cable":
            base = ic.buried_cable_kind if below else ic.cable_segment_kind
        else:  # a duct or pipe used for cables
            base = ic.below_ground_kind
        if ov is not None:
            if ov[0]:
                piece.kind, piece.override = ov, True
            else:
                piece.kind, piece.override = ((base or ic.default_kind)[0], ov[1]), True
        else:
            piece.kind = base



def _fitting_kinds(
    pieces: list[_Piece], neighbours: dict[int, set[int]], ic: IfcConfig, snap_tolerance_m: float
) -> None:
    """Fittings take the kind of their carriers, through port links, then by touching ends."""
    for i, piece in enumerate(pieces):
        if piece.kind is not None:
            continue
        found: Counter[tuple[str, str]] = Counter()
        frontier, visited = [i], {i}
        for _ in range(4):  # through at most a few fittings in a row
            nxt = []
            for j in frontier:
                for k in sorted(neighbours.get(j, ())):
                    if k in visited:
                        continue
                    visited.add(k)
                    if pieces[k].is_fitting and not pieces[k].override:
                        nxt.append(k)
                    elif (kind := pieces[k].kind) is not None:
                        found[kind] += 1
            if found or not nxt:
                break
            frontier = nxt
        if not found:
            found.update(_touching_kinds(pieces, i, snap_tolerance_m))
        if found:
            piece.kind = max(found.items(), key=lambda kv: (kv[1], kv[0] == ic.default_kind))[0]
        else:
            top_z = max((float(v[:, 2].max()) for v in piece.polys), default=float(piece.origin[2]))
            piece.kind = ic.below_ground_kind if top_z < ic.below_ground_z_m else ic.default_kind



def _polylines(
    pieces: list[_Piece],
    link_ports: dict[tuple[int, int], tuple[int, int]],
    port_pos: dict[int, np.ndarray | None],
    snap_tolerance_m: float,
) -> tuple[list[RoutePolyline], int]:
    """Route polylines of the pieces, plus a join for each port link the drawing rules miss."""
    polylines: list[RoutePolyline] = []
    for piece in pieces:
        containment, method = piece.kind  # type: ignore[misc]
        layer = route_layer(containment)
        for v in piece.polys:
            polylines.append(RoutePolyline(
                tuple((float(x), float(y), float(z)) for x, y, z in v),
                layer, containment, method, piece.gid,
            ))

    joins = 0
    tol = float(snap_tolerance_m)
    for (pa, pb), (ia, ib) in sorted(link_ports.items()):
        a_pt = _attach(pieces[ia], port_pos[pa], port_pos[pb])
        b_pt = _attach(pieces[ib], port_pos[pb], a_pt)
        gap = float(np.linalg.norm(a_pt - b_pt))
        ends_a = _is_end(pieces[ia], a_pt)
        ends_b = _is_end(pieces[ib], b_pt)
        if gap <= 1e-6 or (gap <= tol and (ends_a or ends_b)):
            continue  # the network builder's snap / tee rule joins them
        containment, method = pieces[ia].kind  # type: ignore[misc]
        polylines.append(RoutePolyline(
            (tuple(map(float, a_pt)), tuple(map(float, b_pt))),  # type: ignore[arg-type]
            route_layer(containment), containment, method,
            f"{pieces[ia].gid}/{pieces[ib].gid}",
        ))
        joins += 1

    return polylines, joins


def _unlinked_issue(
    pieces: list[_Piece], neighbours: dict[int, set[int]], links: set[tuple[int, int]], p: Path,
    tol: float, issues: list[Issue],
) -> None:
    """One issue for the pieces without connected ports (joined by the drawing rules)."""
    unlinked = [pc.gid for i, pc in enumerate(pieces) if i not in neighbours]
    if unlinked and not links:
        issues.append(Issue(
            IssueCode.NO_PORTS,
            f"{p}: no connected ports on the {len(pieces)} route pieces; joined by the drawing "
            f"rules instead (ends within {tol * 1000:.0f} mm, tees) - check the routes",
            unlinked[0],
        ))
    elif unlinked:
        shown = ", ".join(unlinked[:5]) + (f" and {len(unlinked) - 5} more" if len(unlinked) > 5 else "")
        issues.append(Issue(
            IssueCode.NO_PORTS,
            f"{p}: {len(unlinked)} route piece(s) without connected ports ({shown}); joined by "
            f"the drawing rules instead (ends within {tol * 1000:.0f} mm, tees)",
            unlinked[0],
        ))



def read_ifc(
    path: str | os.PathLike[str],
    config: DrawingConfig | None = None,
    ifc_config: IfcConfig | None = None,
) -> IfcContent:
    """Read route pieces, equipment and circuit groups from an IFC model.

    Parameters
    ----------
    path : str or path-like
        The ``.ifc`` file (IFC2X3, IFC4 or IFC4X3).
    config : DrawingConfig, optional
        ``snap_tolerance_m`` decides which connected ports need a joining piece;
        ``units`` is used only when the model states no length unit.
    ifc_config : IfcConfig, optional
        Tag attributes, below-ground level, classes read as equipment.

    Returns
    -------
    IfcContent
        Polylines and equipment in world metres, issues, circuits from groups.

    Raises
    ------
    DrawingReadError
        Unreadable file, unsupported schema, no length unit, no cable carriers.

    References
    ----------
    .. [1] contract.md, "IFC input".
    """
    try:
        return _read_ifc(path, config, ifc_config)
    except (ValueError, TypeError, AttributeError, IndexError, KeyError, RuntimeError) as exc:
        if isinstance(exc, CableRouteError):
            raise
        # a damaged entity (a malformed number, a reference of the wrong type, a list of the
        # wrong length) surfaces from ifcopenshell or numpy while the geometry is read
        first = (str(exc).splitlines() or [""])[0][:160]
        raise DrawingReadError(file=path, problem=f'the model holds an entity that cannot be read ({type(exc).__name__}: {first})',
                               fix="check the file with an IFC validator or export the model again") from exc


def _attach(piece: _Piece, port_at: np.ndarray | None, other: np.ndarray | None) -> np.ndarray:
    """Where a port joins its piece: the nearest point of the piece's path to the port."""
    target = port_at if port_at is not None else other
    if not piece.polys:
        return port_at if port_at is not None else piece.origin
    if target is None:
        return piece.polys[0][0]
    return _nearest_on(piece.polys, target)


def _is_end(piece: _Piece, pt: np.ndarray) -> bool:
    if not piece.polys:
        return True
    return any(
        float(np.linalg.norm(v[0] - pt)) <= 1e-6 or float(np.linalg.norm(v[-1] - pt)) <= 1e-6
        for v in piece.polys
    )


def _touching_kinds(pieces: list[_Piece], i: int, tol: float) -> Counter[tuple[str, str]]:
    """Kinds of non-fitting pieces with an end within ``tol`` of fitting ``i``'s path ends."""
    out: Counter[tuple[str, str]] = Counter()
    fit = pieces[i]
    pts = [v[0] for v in fit.polys] + [v[-1] for v in fit.polys] or [fit.origin]
    pts_a = np.asarray(pts)
    for other in pieces:
        if other.is_fitting or other.kind is None:
            continue
        for v in other.polys:
            ends = np.asarray([v[0], v[-1]])
            d = np.linalg.norm(pts_a[:, None, :] - ends[None, :, :], axis=2)
            if float(d.min()) <= tol:
                out[other.kind] += 1
                break
    return out


def _tag(element: Any, ic: IfcConfig) -> str:
    for attr in ic.tag_sources:
        value = getattr(element, attr, None)
        if value is not None and str(value).strip():
            return str(value).strip()
    return ""


def _read_equipment(
    model: Any, p: Path, ic: IfcConfig, scale: float, cache: dict, route_ids: set[int], issues: list[Issue]
) -> list[Equipment]:
    from .ifc_geometry import world_matrix

    out: list[Equipment] = []
    seen: set[int] = set()
    untagged = 0
    candidates = [el for cls in ic.equipment_classes for el in _by_type(model, cls)]
    if str(model.schema).upper() == "IFC2X3":  # occurrences are generic, the type tells
        import ifcopenshell.util.element as ue

        type_names = tuple(c + "Type" for c in ic.equipment_classes)
        for el in _by_type(model, "IfcDistributionFlowElement"):
            tp = ue.get_type(el)
            if tp is not None and any(_is_a(tp, t) for t in type_names):
                candidates.append(el)
    for el in candidates:
        if el.id() in seen or el.id() in route_ids:
            continue
        seen.add(el.id())
        tag = _tag(el, ic)
        if not tag:
            untagged += 1
            continue
        pos = world_matrix(el, cache)[:3, 3] * scale
        attrs = tuple(
            sorted((str(k).upper(), "" if v is None else str(v)) for k, v in _pset(el, EQUIPMENT_PSET).items()
                   if k != "id")
        )
        out.append(Equipment(tag, _gid(el), (float(pos[0]), float(pos[1]), float(pos[2])), el.is_a(), attrs))
    if untagged:
        logger.info("%s: %d equipment element(s) have no %s; not usable in circuits", p, untagged,
                    " or ".join(ic.tag_sources))
    out.sort(key=lambda e: (e.tag, e.source_id))
    return out


def _read_circuits(
    model: Any, p: Path, ic: IfcConfig, equipment: list[Equipment]
) -> tuple[list[ScheduleRow], dict[str, str]]:
    """Circuits from IfcDistributionCircuit (IFC4) / IfcElectricalCircuit (IFC2X3) groups."""
    by_gid = {e.source_id: e for e in equipment}
    by_tag_gid = {e.tag: e.source_id for e in equipment}
    groups = _by_type(model, "IfcDistributionCircuit") + _by_type(model, "IfcElectricalCircuit")
    rows: list[ScheduleRow] = []
    failures: dict[str, str] = {}
    for n, group in enumerate(sorted(groups, key=lambda g: g.id()), start=1):
        cid = str(group.Name or "").strip() or _gid(group)
        where = f"{p.name} {group.is_a()} {cid}"
        props = {str(k).strip().lower(): v for k, v in _pset(group, CIRCUIT_PSET).items() if k != "id"}
        members = [
            o for rel in (getattr(group, "IsGroupedBy", None) or []) for o in rel.RelatedObjects
        ]
        eqs = [by_gid[_gid(o)] for o in members if _gid(o) in by_gid]
        src = str(props.get("from") or "").strip()
        dst = str(props.get("to") or "").strip()
        if not src:
            cands = [e for e in eqs if any(_is_class(model, e.source_id, c) for c in ic.source_classes)]
            src = cands[0].tag if len(cands) == 1 else ""
        if not dst:
            cands = [e for e in eqs if e.tag != src and not any(
                _is_class(model, e.source_id, c) for c in ic.source_classes)]
            dst = cands[0].tag if len(cands) == 1 else ""
        if not src or not dst:
            tags = ", ".join(e.tag for e in eqs) or "no tagged equipment"
            failures[cid] = (
                f"{where}: cannot tell the circuit's source and load from its members ({tags}); "
                f"set 'from' and 'to' in its {CIRCUIT_PSET} property set or give --circuits"
            )
            continue
        fields = {k: "" if v is None else str(v) for k, v in props.items()}
        for k, v in _device_fields(model, by_tag_gid.get(dst)).items():
            if not fields.get(k):
                fields[k] = v
        fields.update({"circuit": cid, "from": src, "to": dst})
        rows.append(ScheduleRow(where, n, cid, src, dst, tuple(sorted(fields.items()))))
    return rows, failures


#: The standard property set an authoring tool fills on electrical devices, and the
#: schedule columns its properties give (ISO 16739-1:2018, Pset_ElectricalDeviceCommon:
#: RatedCurrent [A], RatedVoltage [V], PowerFactor [-]).
DEVICE_PSET = "Pset_ElectricalDeviceCommon"


def _device_fields(model: Any, gid: str | None) -> dict[str, str]:
    """Schedule fields from the load's :data:`DEVICE_PSET` (occurrence or type), where given.

    ``RatedCurrent`` gives the load as a current (``"16 A"``), ``RatedVoltage`` the
    voltage, ``PowerFactor`` the power factor; our ``CW_Circuit`` values win.
    """
    if not gid:
        return {}
    try:
        el = model.by_guid(gid)
    except RuntimeError:
        return {}
    props = _pset(el, DEVICE_PSET)
    out: dict[str, str] = {}

    def number(name: str) -> float | None:
        v = props.get(name)
        v = getattr(v, "wrappedValue", v)
        try:
            x = float(v)  # type: ignore[arg-type]  # None is caught below (TypeError)
        except (TypeError, ValueError):
            return None
        return x if np.isfinite(x) and x > 0 else None

    if (i := number("RatedCurrent")) is not None:
        out["load"] = f"{i:g} A"
    if (u := number("RatedVoltage")) is not None:
        out["voltage"] = f"{u:g}"
    if (pf := number("PowerFactor")) is not None and pf <= 1.0:
        out["power_factor"] = f"{pf:g}"
    return out


def _is_a(inst: Any, cls: str) -> bool:
    try:
        return bool(inst.is_a(cls))
    except RuntimeError:
        return False


def _is_class(model: Any, gid: str, cls: str) -> bool:
    import ifcopenshell.util.element as ue

    try:
        el = model.by_guid(gid)
    except RuntimeError:
        return False
    if _is_a(el, cls):
        return True
    tp = ue.get_type(el)
    return tp is not None and _is_a(tp, cls + "Type")


def measure_ifc(
    model_path: str | os.PathLike[str],
    schedule_path: str | os.PathLike[str] | None = None,
    config: DrawingConfig | None = None,
    ifc_config: IfcConfig | None = None,
) -> Measurement:
    """Read an IFC model and a schedule, build the network and route every circuit.

    Without a schedule, the circuits come from the model's circuit groups
    (``IfcDistributionCircuit`` / ``IfcElectricalCircuit`` with our ``CW_Circuit``
    property set), else from equipment carrying ``CW_Equipment`` properties named like
    the schedule's columns.

    Parameters
    ----------
    model_path : str or path-like
        The ``.ifc`` model.
    schedule_path : str or path-like, optional
        ``.csv`` or ``.xlsx`` schedule.
    config : DrawingConfig, optional
        Snap tolerance, maximum tail, allowances.
    ifc_config : IfcConfig, optional
        IFC reading options.

    Returns
    -------
    Measurement
        As for a DXF drawing; ``units`` is ``"m"`` (everything was converted on reading).

    Raises
    ------
    DrawingReadError
        The model cannot be used.
    ScheduleError
        No schedule given and the model holds no circuits.

    References
    ----------
    .. [1] contract.md, "IFC input", "Lengths and grouping".
    """
    from . import measure_content

    config = config or DrawingConfig()
    return measure_content(reader_result(model_path, config, ifc_config), schedule_path, config)


def reader_result(
    model_path: str | os.PathLike[str],
    config: DrawingConfig | None = None,
    ifc_config: IfcConfig | None = None,
) -> ReaderResult:
    """:func:`read_ifc` as the common :class:`~cablewright.extract.ReaderResult`.

    Parameters
    ----------
    model_path : str or path-like
        The ``.ifc`` model.
    config : DrawingConfig, optional
        Snap tolerance, recover mode.
    ifc_config : IfcConfig, optional
        IFC reading options.

    Returns
    -------
    ReaderResult
        Polylines, equipment, issues and the model's own circuits; units ``"m"``.
    """
    from . import ReaderResult

    content = read_ifc(model_path, config, ifc_config)
    hint = (
        f"{content.path}: no --circuits schedule given and the model has no circuit "
        f"groups (IfcDistributionCircuit with a {CIRCUIT_PSET} property set) nor equipment "
        f"with {EQUIPMENT_PSET} circuit properties; give the schedule with --circuits FILE"
    )
    return ReaderResult(
        content.path, content.units, content.polylines, content.equipment, content.issues,
        content.circuit_rows, content.circuit_failures, hint, carrier_sizes=content.carrier_sizes,
    )
