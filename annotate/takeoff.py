"""Take-off for purchasing and installers: what to order, and whether it fits the containment.

Builds, from the sized outcomes and the route segments, the top-level keys of
``schedule.json`` that contract.md ("Extensions") adds: ``tool``, ``input``,
``standard``, ``quantities``; and ours: ``drums`` (inside each quantity),
``devices`` and ``segments`` (circuits, cables and fill per route segment).
The numbers come from :mod:`cablewright.sizing.quantities` and
:mod:`cablewright.sizing.fill`; this module only joins and formats them.
"""

from __future__ import annotations

import hashlib
import os
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from cablewright.sizing.fill import SegmentFill, od_key, outer_diameter_mm, segment_fill
from cablewright.sizing.quantities import (
    CableRun,
    CableType,
    DeviceCount,
    QuantityRow,
    bill_of_quantities,
    device_counts,
)

from .model import CircuitOutcome
from .rows import METRE, LengthUnit

__all__ = [
    "Takeoff",
    "build_takeoff",
    "containment_size",
    "xlsx_sheets",
    "SegmentRow",
    "cable_runs",
    "quantities",
    "segment_rows",
    "quantities_dicts",
    "devices_dicts",
    "segments_dicts",
    "document_extras",
    "tool_info",
    "input_info",
]



@dataclass(frozen=True)
class SegmentRow:
    """One route segment: where it is, who runs on it, how full it is."""

    segment: Any  # cablewright.extract.model.RouteSegment
    circuits: tuple[str, ...]
    cables: int
    fill: SegmentFill
    #: Where the containment size came from: the carrier in the model (IFC profile or
    #: property set, the narrowest piece of the segment) or ``[sizing.containment_mm]``.
    size_source: str = ""


def cable_runs(outcomes: Iterable[CircuitOutcome]) -> list[CableRun]:
    """One :class:`CableRun` per circuit that has a cable and a route."""
    runs = []
    for o in outcomes:
        s = o.sizing
        if s is None or s.cable is None or o.route is None:
            continue
        c = s.cable
        cable = CableType(int(c.cores), float(c.csa_mm2), c.conductor, c.insulation, c.size_label)
        runs.append(CableRun(o.circuit_id, cable, float(o.route.design_length_m), int(c.parallel)))
    return runs


def quantities(outcomes: Iterable[CircuitOutcome], config) -> tuple[QuantityRow, ...]:
    """The bill of quantities of the job (drum lengths from ``config.drum_lengths_m``)."""
    return bill_of_quantities(cable_runs(outcomes), config.drum_lengths_m)


def containment_size(segment: Any, layer_mm: Mapping[str, float],
                     carrier_sizes: Mapping[str, Any] | None = None) -> tuple[float | None, str]:
    """The width or inner diameter of a segment [mm] and where it comes from.

    The carriers of the segment that state a size in the model (IFC, ``carrier_sizes``
    by source id): the narrowest governs, since the fill is highest there.  Otherwise
    the size of the segment's route layer in ``[sizing.containment_mm]``.
    """
    stated = [carrier_sizes[sid] for sid in segment.source_ids if carrier_sizes and sid in carrier_sizes]
    if stated:
        narrowest = min(stated, key=lambda c: c.size_mm)
        return narrowest.size_mm, narrowest.source
    size = layer_mm.get(segment.layer.upper())
    return size, ("" if size is None else f"[sizing.containment_mm] {segment.layer}")


def segment_rows(segments: Mapping[str, Any], per_segment: Mapping[str, Sequence[str]],
                 outcomes: Iterable[CircuitOutcome], config,
                 carrier_sizes: Mapping[str, Any] | None = None) -> list[SegmentRow]:
    """Circuits, cables and fill of every route segment that carries a circuit.

    ``carrier_sizes``: source id -> ``CarrierSize`` the model states (IFC); see
    :func:`containment_size`.
    """
    cables = {o.circuit_id: o.sizing.cable for o in outcomes if o.sizing is not None and o.sizing.cable}
    sizes = {k.upper(): float(v) for k, v in config.containment_mm.items()}
    rows = []
    order = sorted(per_segment, key=lambda sid: (len(sid), sid))  # S2 before S10
    for sid in order:
        cids = per_segment[sid]
        seg = segments.get(sid)
        if seg is None:
            continue
        diameters, missing, count = [], [], 0
        for cid in cids:
            cable = cables.get(cid)
            if cable is None:  # not sized: no cable to lay, counted as one unknown
                count += 1
                missing.append(f"{cid} (not sized)")
                continue
            count += cable.parallel
            od = outer_diameter_mm(cable.cores, cable.csa_mm2, config.cable_od_mm)
            if od is None:
                missing.append(od_key(cable.cores, cable.csa_mm2))
            else:
                diameters += [od] * cable.parallel
        limit = (config.duct_fill_limit_pct if _rule(seg.containment) == "duct_area"
                 else config.tray_fill_limit_pct)
        size_mm, size_source = containment_size(seg, sizes, carrier_sizes)
        fill = segment_fill(sid, seg.containment, size_mm, diameters, limit, missing)
        rows.append(SegmentRow(seg, tuple(cids), count, fill, size_source if fill.rule else ""))
    return rows


def _rule(containment: str) -> str:
    from cablewright.sizing.fill import FILL_RULES

    return FILL_RULES.get(containment) or ""


def _r(value: float | None, digits: int = 2) -> float | None:
    return None if value is None else round(float(value), digits)


def quantities_dicts(rows: Sequence[QuantityRow]) -> list[dict[str, Any]]:
    """``quantities`` of ``schedule.json``: the contract's keys first, then the drum plan."""
    out = []
    for row in rows:
        plan = row.plan
        out.append({
            "cable": row.cable.text(),
            "runs": row.runs,
            "length_to_order_m": _r(row.length_to_order_m, 1),
            "circuits": row.circuits,
            "cores": row.cable.cores,
            "csa_mm2": int(row.cable.csa_mm2) if row.cable.csa_mm2.is_integer() else row.cable.csa_mm2,
            "conductor": row.cable.conductor,
            "insulation": row.cable.insulation,
            "drums": [{"length_m": d.length_m, "waste_m": _r(d.waste_m, 1),
                       "cuts": [{"circuit": c.circuit_id, "length_m": _r(c.length_m, 1)} for c in d.cuts]}
                      for d in plan.drums],
            "waste_m": _r(plan.waste_m, 1),
            "longer_than_a_drum": [{"circuit": c.circuit_id, "length_m": _r(c.length_m, 1)} for c in plan.too_long],
        })
    return out


def devices_dicts(devices: Sequence[DeviceCount]) -> list[dict[str, Any]]:
    """``devices`` of ``schedule.json``: protective devices per kind and rating."""
    return [{"kind": d.kind, "rating_a": int(d.rating_a) if float(d.rating_a).is_integer() else d.rating_a,
             "count": d.count} for d in devices]


def segments_dicts(rows: Sequence[SegmentRow]) -> list[dict[str, Any]]:
    """``segments`` of ``schedule.json``: one per segment carrying a circuit."""
    out = []
    for row in rows:
        seg, fill = row.segment, row.fill
        out.append({
            "id": seg.segment_id,
            "layer": seg.layer,
            "containment": seg.containment,
            "method": seg.method,
            "length_m": _r(seg.length_m),
            "points_m": [[round(float(v), 3) for v in p] for p in seg.points_m],
            "circuits": list(row.circuits),
            "cables": row.cables,
            "fill": {"rule": fill.rule, "size_mm": fill.size_mm, "percent": _r(fill.percent, 1),
                     "limit_percent": fill.limit_percent, "result": fill.result, "message": fill.message,
                     "size_source": row.size_source},
        })
    return out


def tool_info() -> dict[str, str]:
    """``tool``: our name and the installed version."""
    from importlib import metadata

    try:
        version = metadata.version("cablewright")
    except metadata.PackageNotFoundError:  # running from a source tree that is not installed
        version = "unknown"
    return {"name": "cablewright", "version": version}


def input_info(path: str | os.PathLike[str]) -> dict[str, str | None]:
    """``input``: the drawing's file name and SHA-256 (FIPS 180-4) of its bytes."""
    path = Path(path)
    digest = hashlib.sha256()
    try:
        with path.open("rb") as f:
            for block in iter(lambda: f.read(1 << 20), b""):
                digest.update(block)
    except OSError:
        return {"file": path.name, "sha256": None}
    return {"file": path.name, "sha256": digest.hexdigest()}


@dataclass(frozen=True)
class Takeoff:
    """What one job needs bought and whether it fits: the typed rows every writer reads."""

    quantities: tuple[QuantityRow, ...]
    devices: tuple[DeviceCount, ...]
    segments: tuple[SegmentRow, ...]


def build_takeoff(outcomes: Sequence[CircuitOutcome], segments: Mapping[str, Any],
                  per_segment: Mapping[str, Sequence[str]], config,
                  carrier_sizes: Mapping[str, Any] | None = None) -> Takeoff:
    """Bill of quantities, device counts and segment fill of one job (sizes: :func:`containment_size`)."""
    devices = [(o.sizing.device_kind or "device", float(o.sizing.device_rating_a))
               for o in outcomes if o.sizing is not None and o.sizing.device_rating_a]
    return Takeoff(quantities(outcomes, config), device_counts(devices),
                   tuple(segment_rows(segments, per_segment, outcomes, config, carrier_sizes)))


def document_extras(takeoff: Takeoff, drawing: str | Path, config) -> dict[str, Any]:
    """The top-level keys ``schedule.json`` carries beside ``circuits``."""
    return {
        "tool": tool_info(),
        "input": input_info(drawing),
        "standard": getattr(config, "standard", "iec"),
        "quantities": quantities_dicts(takeoff.quantities),
        "devices": devices_dicts(takeoff.devices),
        "segments": segments_dicts(takeoff.segments),
    }


def xlsx_sheets(takeoff: Takeoff, unit: LengthUnit = METRE) -> list[tuple[str, list[str], list[list[Any]]]]:
    """Sheets ``BOQ`` (cables, drums, devices) and ``segments`` of ``schedule.xlsx``, lengths
    in ``unit`` (:func:`.rows.length_unit`)."""
    boq: list[list[Any]] = []
    u = unit.symbol
    for row in takeoff.quantities:
        drums = "; ".join(f"{unit.of(d.length_m):g} {u}: "
                          + ", ".join(f"{c.circuit_id} {unit.of(c.length_m):.1f}" for c in d.cuts)
                          + f" (waste {unit.of(d.waste_m):.1f})" for d in row.plan.drums)
        too_long = ", ".join(f"{c.circuit_id} {unit.text(c.length_m)}" for c in row.plan.too_long)
        boq.append(["cable", row.cable.text(), row.circuits, row.runs, unit.rounded(row.length_to_order_m, 1),
                    len(row.plan.drums), unit.rounded(row.plan.waste_m, 1), drums, too_long or None])
    for d in takeoff.devices:
        boq.append(["device", f"{d.kind} {d.rating_a:g} A", d.count, None, None, None, None, None, None])
    boq_headers = ["item", "type", "circuits / count", "runs", f"length to order [{u}]", "drums",
                   f"waste [{u}]", f"drum plan (drum: cuts [{u}])", "longer than a drum"]
    seg_headers = ["segment", "layer", "containment", "method", f"length [{u}]", "circuits", "cables",
                   "fill rule", "size [mm]", "fill [%]", "limit [%]", "fill result", "message",
                   "size from"]
    segs = [[r.segment.segment_id, r.segment.layer, r.segment.containment, r.segment.method,
             unit.rounded(r.segment.length_m), ", ".join(r.circuits), r.cables, r.fill.rule, r.fill.size_mm,
             _r(r.fill.percent, 1), r.fill.limit_percent, r.fill.result, r.fill.message or None,
             r.size_source or None]
            for r in takeoff.segments]
    return [("BOQ", boq_headers, boq), ("segments", seg_headers, segs)]
