"""The JSON document of contract.md ("JSON output"): one dict per circuit."""

from __future__ import annotations

import json
from collections.abc import Iterable, Mapping
from dataclasses import asdict
from typing import Any

from .model import CircuitOutcome

__all__ = ["outcome_to_dict", "document", "dumps"]

#: Results of the further checks (short circuit, earth fault, motor start), an
#: extension of the contract's JSON: new keys, nothing renamed.
_EXTRA_KEYS = (
    "protective_conductor_mm2",
    "max_length_m",
    "earth_fault_loop_ohm",
    "fault_current_ka_source",
    "fault_current_ka_load_end",
    "fault_current_ka_load_end_min",
    "fault_current_ka_load_end_earth_min",
    "motor_start_dip_pct",
    "motor_start_peak_a",
    "ze_assumed",
)


def _round(value: float | None, digits: int = 2) -> float | None:
    return None if value is None else round(float(value), digits)


def _route_dict(outcome: CircuitOutcome) -> dict[str, Any] | None:
    route = outcome.route
    if route is None:
        return None
    return {
        "routed_length_m": _round(route.routed_length_m),
        "design_length_m": _round(route.design_length_m),
        "segments": list(route.segment_ids),
        "source_tail_m": _round(route.source_tail_m),
        "load_tail_m": _round(route.load_tail_m),
    }


def _grouping_dict(outcome: CircuitOutcome) -> dict[str, Any] | None:
    group = outcome.group
    if group is None:
        return None
    sizing = outcome.sizing
    data: dict[str, Any] = {
        "circuits_in_group": group.circuits_in_group,
        "cables_in_group": group.cables_in_group,
        "governing_segment": None,
        "factor": None,
    }
    if sizing is not None and sizing.cable is not None:
        data["governing_segment"] = sizing.governing_segment or None
        data["cables_in_group"] = sizing.cables_in_group or group.cables_in_group
        data["factor"] = _round(sizing.grouping_factor, 3)
    elif group.segment_counts:
        # measuring only: the most crowded segment stands for the route
        busiest = max(group.segment_counts, key=lambda item: (item[2], item[1]))
        data["governing_segment"] = busiest[0]
    data["segments"] = [
        {"segment": seg, "circuits": circuits, "cables": cables}
        for seg, circuits, cables in group.segment_counts
    ]
    return data


def outcome_to_dict(outcome: CircuitOutcome, kind: str = "size") -> dict[str, Any]:
    """One circuit as the contract's JSON object.

    Parameters
    ----------
    outcome : CircuitOutcome
    kind : str
        ``"size"`` (everything), ``"routes"`` (id, from, to, status, messages,
        route, grouping only) or ``"calc"`` (no route, no grouping).
    """
    data: dict[str, Any] = {
        "id": outcome.circuit_id,
        "from": outcome.from_tag,
        "to": outcome.to_tag,
        "status": outcome.status,
        "messages": list(outcome.messages),
    }
    if kind in ("size", "routes"):
        data["route"] = _route_dict(outcome)
        data["grouping"] = _grouping_dict(outcome)
    if kind == "routes":
        return data
    sizing = outcome.sizing
    if sizing is None:
        return data
    data["load_current_a"] = _round(sizing.load_current_a)
    rating = sizing.device_rating_a
    data["device_rating_a"] = None if rating is None else (int(rating) if float(rating).is_integer() else rating)
    data["device_kind"] = sizing.device_kind or None
    data["method"] = sizing.method or None
    data["correction_factor"] = _round(sizing.correction_factor, 3)
    data["required_capacity_a"] = _round(sizing.required_capacity_a, 1)
    if sizing.cable is not None:
        cable = asdict(sizing.cable)
        csa = cable["csa_mm2"]
        cable["csa_mm2"] = int(csa) if float(csa).is_integer() else csa
        cable["size_label"] = sizing.cable.label  # contract.md Extensions: "95 mm²", "6 AWG"
        cable["capacity_a"] = _round(cable["capacity_a"], 1)
        data["cable"] = cable
    else:
        data["cable"] = None
    if sizing.voltage_drop is not None:
        vd = sizing.voltage_drop
        data["voltage_drop"] = {
            "volts": _round(vd.volts),
            "percent": _round(vd.percent),
            "limit_percent": _round(vd.limit_percent),
            "mv_per_a_m": _round(vd.mv_per_a_m, 3),
            "annex_g_percent": _round(vd.annex_g_percent),
            "cumulative_percent": _round(vd.cumulative_percent),
        }
    else:
        data["voltage_drop"] = None
    for key in _EXTRA_KEYS:
        value = getattr(sizing, key, None)
        data[key] = _round(value, 3) if isinstance(value, float) else value
    data["factors"] = [
        {"name": f.name, "value": _round(f.value, 3), "source": f.source, "detail": f.detail}
        for f in sizing.factors
    ]
    data["checks"] = [
        {
            "name": c.name,
            "result": c.result.value,
            "passed": c.passed,
            "value": _round(c.value, 3),
            "limit": _round(c.limit, 3),
            "unit": c.unit,
            "source": c.source,
            "message": c.message,
        }
        for c in sizing.checks
    ]
    return data


def document(outcomes: Iterable[CircuitOutcome], kind: str = "size") -> dict[str, Any]:
    """The whole JSON document: ``{"circuits": [...]}``."""
    return {"circuits": [outcome_to_dict(o, kind) for o in outcomes]}


def dumps(outcomes: Iterable[CircuitOutcome], kind: str = "size",
          extra: Mapping[str, Any] | None = None) -> str:
    """The JSON document as text, one circuit per line, UTF-8 safe.

    ``extra`` adds top-level keys after ``"circuits"`` (e.g. ``"drawing"``: the
    units and extents the drawing was read with), each written on one line.

    Each circuit's object is written on one line by the json module's C
    encoder (``indent`` would switch to its pure-Python encoder, several times
    slower on a big schedule); the lines are indented inside ``"circuits"``,
    so the file still reads and compares circuit by circuit.  ``extra`` adds
    top-level keys after ``"circuits"`` (``tool``, ``input``, ``quantities``, ...,
    see :func:`.takeoff.document_extras`), lists one entry per line.

    Examples
    --------
    >>> print(dumps([]))
    {
      "circuits": [
      ]
    }
    """
    # allow_nan=False: NaN and infinity are not JSON (RFC 8259, section 6); a value that
    # slipped through raises here instead of writing a document no reader accepts
    encode = json.JSONEncoder(ensure_ascii=False, separators=(", ", ": "), allow_nan=False).encode
    lines = [encode(outcome_to_dict(o, kind)) for o in outcomes]
    body = ",\n".join("    " + line for line in lines)
    text = '{\n  "circuits": [\n' + (body + "\n" if body else "") + "  ]"
    for key, value in (extra or {}).items():
        if isinstance(value, list):
            items = ",\n".join("    " + encode(v) for v in value)
            text += f',\n  {encode(key)}: [\n' + (items + "\n" if items else "") + "  ]"
        else:
            text += f",\n  {encode(key)}: {encode(value)}"
    return text + "\n}"
