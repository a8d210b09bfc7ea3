"""Write a copy of an IFC model carrying the sized cables.

Each circuit that has a chosen cable gets an ``IfcCableSegment`` (predefined type
``CABLESEGMENT``; ``Name`` and ``Tag`` the circuit id) whose 'Axis' is the routed path,
contained in the storey of its source equipment, assigned to the model's circuit group
of the same name when there is one, and carrying two property sets of ours:

``CW_CableSizing``
    circuit, from, to, status, cable description, conductor, insulation, cores,
    cross-section [mm²], parallel cables, capacity [A], what governed the size, device
    rating [A], design current [A], reference method, correction factor, cables in
    group, routed and design length [m], voltage drop [%] and its limit [%].
``CW_CableChecks``
    per check: ``<Name>Passed``, ``<Name>Result`` (pass / fail / not_checked /
    not_applicable), ``<Name>Value``, ``<Name>Limit``, ``<Name>Unit``.

Values are typed (IfcElectricCurrentMeasure, IfcAreaMeasure, IfcPositiveLengthMeasure,
IfcLabel ..., with the unit on the property) and the standard sets
Pset_CableSegmentOccurrence and Pset_CableSegmentTypeCableSegment (on an
IfcCableSegmentType per cable kind) are filled where they fit (:mod:`.ifc_props`).

Where the model already has an ``IfcCableSegment`` tagged with the circuit id (ours
from an earlier run, or one the designer modelled), the property sets are put on it
instead (replacing earlier values), so running again adds nothing twice.  The reader
skips cables carrying ``CW_CableSizing``: they are results, not routes.

The input is never written to; the copy goes to a temporary name and is renamed.

References
----------
.. [1] ISO 16739-1:2018 (IFC4 ADD2 TC1): IfcCableSegment, IfcPropertySet,
   IfcRelDefinesByProperties, IfcRelAssignsToGroup.
.. [2] contract.md, "Commands" (outputs written to a temporary name and renamed).
"""

from __future__ import annotations

import logging
import os
import re
from collections.abc import Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from cablewright.core.errors import DrawingReadError
from cablewright.extract.ifc_reader import SIZING_PSET, open_model

from .atomic import atomic_path
from .ifc_props import WriteState, finish_cable
from .model import CircuitOutcome
from .reproducible import stable_relation_order

__all__ = ["CHECKS_PSET", "SIZING_PSET", "IfcWriteSummary", "write_ifc_copy"]

logger = logging.getLogger(__name__)

#: Property set of ours with the checks of the chosen cable.
CHECKS_PSET = "CW_CableChecks"


@dataclass(frozen=True)
class IfcWriteSummary:
    """What :func:`write_ifc_copy` did.

    Attributes
    ----------
    path : str
        The copy written.
    added : tuple of str
        Circuits that got a new IfcCableSegment.
    updated : tuple of str
        Circuits whose existing IfcCableSegment got the property sets.
    skipped : tuple of str
        Circuits with no cable (not sized).
    """

    path: str
    added: tuple[str, ...]
    updated: tuple[str, ...]
    skipped: tuple[str, ...]


def _word(name: str) -> str:
    parts = re.split(r"[^0-9A-Za-z]+", name)
    return "".join(p[:1].upper() + p[1:] for p in parts if p) or "Check"


def _sizing_props(outcome: CircuitOutcome) -> dict[str, Any]:
    s = outcome.sizing
    assert s is not None and s.cable is not None
    c = s.cable
    props: dict[str, Any] = {
        "CircuitId": outcome.circuit_id,
        "From": outcome.from_tag,
        "To": outcome.to_tag,
        "Status": outcome.status,
        "Cable": c.describe(),
        "Conductor": c.conductor,
        "Insulation": c.insulation,
        "Cores": int(c.cores),
        "CrossSection_mm2": float(c.csa_mm2),
        "Parallel": int(c.parallel),
        "Capacity_A": float(c.capacity_a),
        "GovernedBy": c.governed_by,
        "Method": s.method,
        "CablesInGroup": int(s.cables_in_group),
        "GroupingFactor": float(s.grouping_factor),
    }
    optional = {
        "DeviceRating_A": s.device_rating_a,
        "DesignCurrent_A": s.load_current_a,
        "CorrectionFactor": s.correction_factor,
        "RequiredCapacity_A": s.required_capacity_a,
    }
    props.update({k: float(v) for k, v in optional.items() if v is not None})
    if s.device_kind:
        props["DeviceKind"] = s.device_kind
    if s.voltage_drop is not None:
        props["VoltageDrop_pct"] = float(s.voltage_drop.percent)
        props["VoltageDropLimit_pct"] = float(s.voltage_drop.limit_percent)
    route = outcome.route
    if route is not None:
        props["RoutedLength_m"] = float(route.routed_length_m)
        props["DesignLength_m"] = float(route.design_length_m)
    if outcome.messages:
        props["Messages"] = "; ".join(outcome.messages)[:250]
    return props


def _check_props(outcome: CircuitOutcome) -> dict[str, Any]:
    props: dict[str, Any] = {}
    for check in outcome.sizing.checks if outcome.sizing else ():
        w = _word(check.name)
        props[f"{w}Passed"] = bool(check.passed)
        props[f"{w}Result"] = check.result.value
        props[f"{w}Value"] = float(check.value)
        props[f"{w}Limit"] = float(check.limit)
        props[f"{w}Unit"] = check.unit
    return props


def _set_pset(f: Any, element: Any, name: str, props: dict[str, Any]) -> None:
    import ifcopenshell.api.pset
    import ifcopenshell.util.element as ue

    existing = ue.get_pset(element, name, should_inherit=False)
    if existing:
        pset = f.by_id(existing["id"])
        old = [k for k in existing if k != "id" and k not in props]
        if old:  # drop properties of an earlier run that no longer apply
            ifcopenshell.api.pset.edit_pset(f, pset=pset, properties={k: None for k in old})
    else:
        pset = ifcopenshell.api.pset.add_pset(f, product=element, name=name)
    if props:
        ifcopenshell.api.pset.edit_pset(f, pset=pset, properties=props)


def _axis_context(f: Any) -> Any:
    import ifcopenshell.api.context
    import ifcopenshell.util.representation as ur

    ctx = ur.get_context(f, "Model", "Axis", "GRAPH_VIEW")
    if ctx is not None:
        return ctx
    model = ur.get_context(f, "Model")
    if model is None:
        model = ifcopenshell.api.context.add_context(f, context_type="Model")
    return ifcopenshell.api.context.add_context(
        f, context_type="Model", context_identifier="Axis", target_view="GRAPH_VIEW", parent=model)


def _storey_of(f: Any, tag: str) -> Any:
    import ifcopenshell.util.element as ue

    for el in f.by_type("IfcElement"):
        if el.Tag == tag or (not el.Tag and el.Name == tag):
            container = ue.get_container(el)
            if container is not None:
                return container
    storeys = f.by_type("IfcBuildingStorey")
    if storeys:
        return storeys[0]
    buildings = f.by_type("IfcBuilding")
    return buildings[0] if buildings else None


#: Name of the one cable type our IFC2X3 cables share.
CABLE_TYPE_NAME = "cablewright sized cable"


def _cable_type(f: Any) -> Any:
    """The IfcCableSegmentType our IFC2X3 cables are typed by (made once per model).

    IFC2X3 has no IfcCableSegment occurrence: a cable is an IfcFlowSegment whose type,
    an IfcCableSegmentType, says what it is (ISO/PAS 16739:2005, IFC2x Edition 3,
    IfcElectricalDomain: IfcCableSegmentType, IfcCableSegmentTypeEnum CABLESEGMENT).
    """
    import ifcopenshell.api.root

    for tp in f.by_type("IfcCableSegmentType"):
        if tp.Name == CABLE_TYPE_NAME:
            return tp
    return ifcopenshell.api.root.create_entity(
        f, ifc_class="IfcCableSegmentType", name=CABLE_TYPE_NAME, predefined_type="CABLESEGMENT"
    )


def _create_cable_element(f: Any, name: str) -> Any:
    """An IfcCableSegment (IFC4, IFC4X3), or an IfcFlowSegment typed as a cable (IFC2X3)."""
    import ifcopenshell.api.root
    import ifcopenshell.api.type

    if str(f.schema).upper() == "IFC2X3":
        cable = ifcopenshell.api.root.create_entity(f, ifc_class="IfcFlowSegment", name=name)
        ifcopenshell.api.type.assign_type(f, related_objects=[cable], relating_type=_cable_type(f))
        return cable
    return ifcopenshell.api.root.create_entity(
        f, ifc_class="IfcCableSegment", name=name, predefined_type="CABLESEGMENT"
    )


def _existing_cables(f: Any) -> list[Any]:
    """Cable occurrences of the model: IfcCableSegment, or in IFC2X3 segments typed as cables."""
    import ifcopenshell.util.element as ue

    if str(f.schema).upper() != "IFC2X3":
        return list(f.by_type("IfcCableSegment"))
    return [el for el in f.by_type("IfcFlowSegment")
            if (tp := ue.get_type(el)) is not None and tp.is_a("IfcCableSegmentType")]


def _new_cable(f: Any, outcome: CircuitOutcome, scale: float) -> Any:
    import ifcopenshell.api.geometry
    import ifcopenshell.api.spatial
    import numpy as np

    cable = _create_cable_element(f, outcome.circuit_id)
    cable.Tag = outcome.circuit_id
    cable.Description = f"{outcome.from_tag} -> {outcome.to_tag}"
    container = _storey_of(f, outcome.from_tag)
    if container is not None:
        ifcopenshell.api.spatial.assign_container(f, products=[cable], relating_structure=container)
    ifcopenshell.api.geometry.edit_object_placement(f, product=cable, matrix=np.eye(4))
    route = outcome.route
    pts = list(route.points_m) if route is not None else []
    if len(pts) >= 2:
        # the placement sits at the world origin, so local = world coordinates
        from cablewright.extract.ifc_geometry import world_matrix

        inv = np.linalg.inv(world_matrix(cable))
        local = [tuple(float(v) for v in (inv @ np.array([x / scale, y / scale, z / scale, 1.0]))[:3])
                 for x, y, z in pts]
        curve = f.createIfcPolyline([f.createIfcCartesianPoint(p) for p in local])
        rep = f.createIfcShapeRepresentation(_axis_context(f), "Axis", "Curve3D", [curve])
        ifcopenshell.api.geometry.assign_representation(f, product=cable, representation=rep)
    return cable


def write_ifc_copy(
    input_path: str | os.PathLike[str],
    output_path: str | os.PathLike[str],
    outcomes: Sequence[CircuitOutcome],
) -> IfcWriteSummary:
    """Write a copy of the model with one sized IfcCableSegment per circuit.

    Parameters
    ----------
    input_path : path-like
        The IFC model (only read).
    output_path : path-like
        The copy; written to a temporary name in its folder, then renamed.
    outcomes : sequence of CircuitOutcome
        Every circuit; those with ``sizing.cable`` are written.

    Returns
    -------
    IfcWriteSummary
        Circuits added, updated and skipped.

    Raises
    ------
    DrawingReadError
        The input cannot be read, the output is the input, or the folder cannot be written.

    References
    ----------
    .. [1] ISO 16739-1:2018: IfcCableSegment, IfcPropertySet.
    """
    import ifcopenshell.api.group
    import ifcopenshell.util.unit as uu

    src, dst = Path(input_path), Path(output_path)
    if dst.exists() and src.exists() and os.path.samefile(src, dst):
        raise DrawingReadError(file=dst, problem="is the input model", fix="write the copy elsewhere")
    f = open_model(src)
    scale = float(uu.calculate_unit_scale(f))
    existing: dict[str, Any] = {}
    for cable in _existing_cables(f):
        key = cable.Tag or cable.Name
        if key and key not in existing:
            existing[key] = cable
    groups: dict[str, Any] = {}
    for cls in ("IfcDistributionCircuit", "IfcElectricalCircuit"):
        try:
            for g in f.by_type(cls):
                if g.Name:
                    groups.setdefault(g.Name, g)
        except RuntimeError:
            continue
    added, updated, skipped = [], [], []
    state = WriteState(f)
    for outcome in outcomes:
        if outcome.sizing is None or outcome.sizing.cable is None:
            skipped.append(outcome.circuit_id)
            continue
        cable = existing.get(outcome.circuit_id)
        if cable is None:
            cable = _new_cable(f, outcome, scale)
            added.append(outcome.circuit_id)
            group = groups.get(outcome.circuit_id)
            if group is not None:
                ifcopenshell.api.group.assign_group(f, products=[cable], group=group)
        else:
            updated.append(outcome.circuit_id)
        _set_pset(f, cable, SIZING_PSET, _sizing_props(outcome))
        _set_pset(f, cable, CHECKS_PSET, _check_props(outcome))
        finish_cable(f, cable, outcome, state)  # typed values, standard psets (ifc_props.py)
    stable_relation_order(f, [c for c in _existing_cables(f) if (c.Tag or c.Name) in added])
    try:
        dst.parent.mkdir(parents=True, exist_ok=True)
        with atomic_path(dst) as tmp:
            f.write(str(tmp), format=".ifc")
    except OSError as exc:
        raise DrawingReadError(file=dst, problem=f"cannot write the IFC copy ({exc.strerror})", fix="choose another --out") from exc
    logger.info("IFC copy %s: %d cables added, %d updated, %d circuits not sized",
                dst, len(added), len(updated), len(skipped))
    return IfcWriteSummary(str(dst), tuple(added), tuple(updated), tuple(skipped))
