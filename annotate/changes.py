"""What a layout change did to the cables: two ``schedule.json`` documents compared.

Per circuit: ``new``, ``removed``, ``changed`` or ``unchanged``, with the fields
that changed as ``[old, new]`` (contract.md, "Extensions": ``changes.json``).
Per segment (where both documents list their segments): circuits, cables and
fill changed.  Totals: circuits per kind of change and the cable to order per
cable type, before and after.

Segment ids are numbered afresh on every run, so nothing here compares them:
a segment is known by its layer and its two end points, a route by the line
it follows.  A route split at a new tee or tail keeps its line and is not
re-routed.
"""

from __future__ import annotations

import json
from collections import defaultdict
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any, cast

from cablewright.core.errors import ScheduleError

__all__ = [
    "LENGTH_TOLERANCE_M",
    "CircuitChange",
    "SegmentChange",
    "OrderChange",
    "ChangeReport",
    "compare_documents",
    "load_document",
    "cable_text",
]

#: Length changes below this are not reported [m]: above the 0.01 m rounding of
#: schedule.json, below any length anyone orders or cuts by.
LENGTH_TOLERANCE_M = 0.05
#: Voltage-drop changes below this are not reported [%] (schedule.json rounds to 0.01 %).
PERCENT_TOLERANCE = 0.05
#: Factor changes below this are not reported (schedule.json rounds to 0.001).
FACTOR_TOLERANCE = 0.0015
#: Fill changes below this are not reported [%] (rounded to 0.1 %).
FILL_TOLERANCE_PCT = 0.15
#: Paths that lie no farther apart than this are the same route [m]: well under a
#: tray's width, above the drawing's snap tolerance (0.05 m, contract.md).
REROUTE_TOLERANCE_M = 0.1
#: Points closer than 10 mm are the same point (decimals of a metre).
POINT_DECIMALS = 2

_TOLERANCES = {
    "routed_length_m": LENGTH_TOLERANCE_M,
    "design_length_m": LENGTH_TOLERANCE_M,
    "voltage_drop_percent": PERCENT_TOLERANCE,
    "correction_factor": FACTOR_TOLERANCE,
    "load_current_a": 0.05,
    "required_capacity_a": 0.15,
}


@dataclass(frozen=True)
class CircuitChange:
    """One circuit's change; ``fields`` holds ``(name, old, new)``."""

    circuit_id: str
    change: str
    fields: tuple[tuple[str, Any, Any], ...] = ()

    def field(self, name: str) -> tuple[Any, Any] | None:
        for key, old, new in self.fields:
            if key == name:
                return old, new
        return None

    def summary(self) -> str:
        """One line for people: what changed and by how much."""
        if self.change != "changed":
            return self.change
        parts = []
        names = {name for name, _, _ in self.fields}
        if "route" in names:
            parts.append("re-routed")
        length = self.field("routed_length_m")
        if length and None not in length:
            delta = length[1] - length[0]
            parts.append(f"{'longer' if delta > 0 else 'shorter'} by {abs(delta):.1f} m")
        cable = self.field("cable")
        if cable:
            why = self.field("governed_by")
            reason = f" (set by {why[1]})" if why else ""
            parts.append(f"cable {cable[0] or '-'} -> {cable[1] or '-'}{reason}")
        for name, label in (("device_rating_a", "device"), ("circuits_in_group", "group"),
                            ("status", "status")):
            pair = self.field(name)
            if pair:
                parts.append(f"{label} {pair[0]} -> {pair[1]}")
        rest = names - {"route", "routed_length_m", "cable", "governed_by", "device_rating_a",
                        "circuits_in_group", "status"}
        if rest:
            parts.append(", ".join(sorted(rest)))
        return "; ".join(parts)


@dataclass(frozen=True)
class SegmentChange:
    """One segment's change (``new``, ``removed``, ``changed``); ids of the new run, or the old one."""

    segment_id: str
    layer: str
    change: str
    fields: tuple[tuple[str, Any, Any], ...] = ()


@dataclass(frozen=True)
class OrderChange:
    """Cable to order of one type, before and after [m]."""

    cable: str
    old_m: float
    new_m: float

    @property
    def delta_m(self) -> float:
        return self.new_m - self.old_m


@dataclass(frozen=True)
class ChangeReport:
    """Everything that changed between two runs."""

    circuits: tuple[CircuitChange, ...]
    segments: tuple[SegmentChange, ...]
    orders: tuple[OrderChange, ...]
    segments_unchanged: int = 0
    segments_compared: bool = False

    def count(self, change: str) -> int:
        return sum(1 for c in self.circuits if c.change == change)

    def to_dict(self) -> dict[str, Any]:
        """``changes.json``: the contract's shape, ``segments`` added."""
        return {
            "circuits": [{"id": c.circuit_id, "change": c.change,
                          "fields": {name: [old, new] for name, old, new in c.fields}}
                         for c in self.circuits],
            "totals": {
                "circuits": {k: self.count(k) for k in ("new", "removed", "changed", "unchanged")},
                "cable_to_order": [{"cable": o.cable, "old_m": round(o.old_m, 1), "new_m": round(o.new_m, 1),
                                    "delta_m": round(o.delta_m, 1)} for o in self.orders],
                "cable_to_order_delta_m": round(sum(o.delta_m for o in self.orders), 1),
                "segments": ({k: sum(1 for s in self.segments if s.change == k) for k in ("new", "removed", "changed")}
                             | {"unchanged": self.segments_unchanged}) if self.segments_compared else None,
            },
            "segments": [{"id": s.segment_id, "layer": s.layer, "change": s.change,
                          "fields": {name: [old, new] for name, old, new in s.fields}}
                         for s in self.segments],
        }


def cable_text(cable: Mapping[str, Any] | None) -> str | None:
    """One cable of a circuit as ordered, without the parallel count: ``"4C 95 mm² Cu/XLPE"``."""
    if not cable:
        return None
    return f"{cable['cores']}C {float(cable['csa_mm2']):g} mm² {cable['conductor']}/{cable['insulation']}"


def load_document(path: str | Path) -> dict[str, Any]:
    """Read ``schedule.json`` from an output folder of ``size`` or from the file itself.

    Raises
    ------
    ScheduleError
        Missing, unreadable or not a schedule document (one line naming the path).
    """
    path = Path(path)
    file = path / "schedule.json" if path.is_dir() else path
    try:
        data = json.loads(file.read_text(encoding="utf-8"))
    except FileNotFoundError as exc:
        raise ScheduleError(file=file, problem="not found",
                            fix="give an output folder of 'cablewright size' or its schedule.json") from exc
    except OSError as exc:
        raise ScheduleError(file=file, problem=f"cannot read it ({exc.strerror})") from exc
    except (json.JSONDecodeError, UnicodeDecodeError) as exc:
        raise ScheduleError(file=file, problem=f'not valid JSON ({exc})',
                            fix="give the schedule.json that 'cablewright size' wrote") from exc
    circuits = data.get("circuits") if isinstance(data, dict) else None
    if not isinstance(circuits, list) or not all(isinstance(c, dict) and "id" in c for c in circuits):
        raise ScheduleError(file=file, problem='no "circuits" list with an "id" in each',
                            fix="give the schedule.json that 'cablewright size' wrote")
    return data


def _point(p) -> tuple[float, ...]:
    return tuple(round(float(v), POINT_DECIMALS) for v in p)


def _segment_points(doc: Mapping[str, Any]) -> dict[str, list[tuple[float, ...]]] | None:
    segments = doc.get("segments")
    if not isinstance(segments, list):
        return None
    return {s["id"]: [_point(p) for p in s.get("points_m") or ()] for s in segments}


def _circuit_values(c: Mapping[str, Any]) -> dict[str, Any]:
    route = c.get("route") or {}
    group = c.get("grouping") or {}
    cable = c.get("cable") or None
    vd = c.get("voltage_drop") or {}
    return {
        "from": c.get("from"),
        "to": c.get("to"),
        "status": c.get("status"),
        "routed_length_m": route.get("routed_length_m"),
        "design_length_m": route.get("design_length_m"),
        "circuits_in_group": group.get("circuits_in_group"),
        "cables_in_group": group.get("cables_in_group"),
        "method": c.get("method"),
        "correction_factor": c.get("correction_factor"),
        "load_current_a": c.get("load_current_a"),
        "required_capacity_a": c.get("required_capacity_a"),
        "device_kind": c.get("device_kind"),
        "device_rating_a": c.get("device_rating_a"),
        "cable": cable_text(cable),
        "parallel": cable.get("parallel") if cable else None,
        "governed_by": cable.get("governed_by") if cable else None,
        "voltage_drop_percent": vd.get("percent"),
    }


def _differs(name: str, old: Any, new: Any) -> bool:
    tol = _TOLERANCES.get(name)
    if tol is not None and isinstance(old, (int, float)) and isinstance(new, (int, float)):
        return abs(float(new) - float(old)) > tol + 1e-9
    return old != new


def _route_lines(c: Mapping[str, Any], points: Mapping[str, list] | None) -> list[list] | None:
    route = c.get("route")
    if points is None or not route:
        return None
    lines = []
    for sid in route.get("segments") or ():
        if sid not in points:
            return None
        lines.append(points[sid])
    return lines


def _rerouted(old: Mapping[str, Any], new: Mapping[str, Any], old_pts, new_pts) -> tuple[list, list] | None:
    """Points only on the old route and only on the new one, when the circuit was re-routed.

    Re-routed means the paths along the routes lie apart somewhere: their
    Hausdorff distance (shapely, densified so it is measured along the lines,
    not only at vertices) is above :data:`REROUTE_TOLERANCE_M`.  A path split at
    a new tee or tail keeps its line and is not re-routed.
    """
    import shapely

    a, b = _route_lines(old, old_pts), _route_lines(new, new_pts)
    if a is None or b is None:
        return None
    if not a and not b:
        return None
    if not a or not b:
        return [list(p) for line in a for p in line], [list(p) for line in b for p in line]
    ga = shapely.MultiLineString([line for line in a if len(line) >= 2])
    gb = shapely.MultiLineString([line for line in b if len(line) >= 2])
    if shapely.hausdorff_distance(ga, gb, densify=0.1) <= REROUTE_TOLERANCE_M:
        return None
    pa = {p for line in a for p in line}
    pb = {p for line in b for p in line}
    return [list(p) for p in sorted(pa - pb)], [list(p) for p in sorted(pb - pa)]


def _compare_circuit(old: Mapping[str, Any], new: Mapping[str, Any], old_pts, new_pts) -> CircuitChange:
    fields = []
    rerouted = _rerouted(old, new, old_pts, new_pts)
    if rerouted is not None:
        fields.append(("route", rerouted[0], rerouted[1]))
    a, b = _circuit_values(old), _circuit_values(new)
    for name in a:
        if _differs(name, a[name], b[name]):
            fields.append((name, a[name], b[name]))
    return CircuitChange(str(new["id"]), "changed" if fields else "unchanged", tuple(fields))


def _orders(doc: Mapping[str, Any]) -> dict[str, float]:
    """Cable to order per type: design length x parallel, summed (contract.md, ``quantities``)."""
    out: dict[str, float] = defaultdict(float)
    for c in doc["circuits"]:
        cable, route = c.get("cable"), c.get("route") or {}
        if cable and route.get("design_length_m") is not None:
            out[cast(str, cable_text(cable))] += float(route["design_length_m"]) * int(cable.get("parallel") or 1)
    return out


def _segment_key(s: Mapping[str, Any]) -> tuple:
    pts = s.get("points_m") or ()
    ends = frozenset((_point(pts[0]), _point(pts[-1]))) if pts else frozenset()
    return (str(s.get("layer", "")).upper(), ends, round(float(s.get("length_m") or 0.0), 1))


def _compare_segments(old: list, new: list) -> tuple[list[SegmentChange], int]:
    old_by = {_segment_key(s): s for s in old}
    new_by = {_segment_key(s): s for s in new}
    changes, unchanged = [], 0
    for key, s in new_by.items():
        o = old_by.get(key)
        if o is None:
            changes.append(SegmentChange(s["id"], s.get("layer", ""), "new",
                                         (("circuits", None, len(s.get("circuits") or ())),)))
            continue
        fields: list[tuple[str, Any, Any]] = []
        if len(o.get("circuits") or ()) != len(s.get("circuits") or ()):
            fields.append(("circuits", len(o.get("circuits") or ()), len(s.get("circuits") or ())))
        if o.get("cables") != s.get("cables"):
            fields.append(("cables", o.get("cables"), s.get("cables")))
        fo, fn = (o.get("fill") or {}), (s.get("fill") or {})
        po, pn = fo.get("percent"), fn.get("percent")
        if (po is None) != (pn is None) or (po is not None and abs(pn - po) > FILL_TOLERANCE_PCT):
            fields.append(("fill_percent", po, pn))
        if fo.get("result") != fn.get("result"):
            fields.append(("fill_result", fo.get("result"), fn.get("result")))
        if fields:
            changes.append(SegmentChange(s["id"], s.get("layer", ""), "changed", tuple(fields)))
        else:
            unchanged += 1
    for key, o in old_by.items():
        if key not in new_by:
            changes.append(SegmentChange(o["id"], o.get("layer", ""), "removed",
                                         (("circuits", len(o.get("circuits") or ()), None),)))
    return changes, unchanged


def compare_documents(old: Mapping[str, Any], new: Mapping[str, Any]) -> ChangeReport:
    """Compare two ``schedule.json`` documents, circuit by circuit and segment by segment.

    Parameters
    ----------
    old, new : mapping
        The documents as read by :func:`load_document` (earlier run first).

    Returns
    -------
    ChangeReport
        Circuits in the new run's order, then the removed ones in the old order.

    Examples
    --------
    >>> old = {"circuits": [{"id": "A", "status": "ok"}, {"id": "B", "status": "ok"}]}
    >>> new = {"circuits": [{"id": "A", "status": "fail"}, {"id": "C", "status": "ok"}]}
    >>> [(c.circuit_id, c.change) for c in compare_documents(old, new).circuits]
    [('A', 'changed'), ('C', 'new'), ('B', 'removed')]
    """
    old_by = {str(c["id"]): c for c in old["circuits"]}
    new_ids = {str(c["id"]) for c in new["circuits"]}
    old_pts, new_pts = _segment_points(old), _segment_points(new)
    circuits = []
    for c in new["circuits"]:
        cid = str(c["id"])
        if cid not in old_by:
            circuits.append(CircuitChange(cid, "new"))
        else:
            circuits.append(_compare_circuit(old_by[cid], c, old_pts, new_pts))
    circuits += [CircuitChange(cid, "removed") for cid in old_by if cid not in new_ids]
    before, after = _orders(old), _orders(new)
    orders = tuple(OrderChange(t, before.get(t, 0.0), after.get(t, 0.0))
                   for t in sorted(set(before) | set(after)))
    compared = isinstance(old.get("segments"), list) and isinstance(new.get("segments"), list)
    segments, unchanged = _compare_segments(old["segments"], new["segments"]) if compared else ([], 0)
    return ChangeReport(tuple(circuits), tuple(segments), orders, unchanged, compared)
