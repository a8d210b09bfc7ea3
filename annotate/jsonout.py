"""The JSON document of contract.md ("JSON output"): one dict per circuit, from its schedule row.

Every value is read from the circuit's :class:`.rows.ScheduleRow` (the rows all
writers share); lengths stay in metres, as the keys say (``_m``).
"""

from __future__ import annotations

import json
from collections.abc import Iterable, Iterator, Mapping
from dataclasses import fields
from typing import Any

from .model import CircuitOutcome
from .rows import METRE, ScheduleRow, circuit_row, rounded, rows

__all__ = ["row_to_dict", "outcome_to_dict", "document", "dumps"]


def _route_dict(row: ScheduleRow) -> dict[str, Any] | None:
    route = row.route
    if route is None:
        return None
    return {
        "routed_length_m": rounded(route.routed_length_m),
        "design_length_m": rounded(route.design_length_m),
        "segments": list(route.segment_ids),
        "source_tail_m": rounded(route.source_tail_m),
        "load_tail_m": rounded(route.load_tail_m),
    }


def _grouping_dict(row: ScheduleRow) -> dict[str, Any] | None:
    group = row.grouping
    if group is None:
        return None
    return {
        "circuits_in_group": group.circuits_in_group,
        "cables_in_group": group.cables_in_group,
        "governing_segment": group.governing_segment,
        "factor": group.factor,
        "segments": [
            {"segment": seg, "circuits": circuits, "cables": cables}
            for seg, circuits, cables in group.segments
        ],
    }


#: Field names per dataclass type, in declaration order (looked up once per type).
_FIELD_NAMES: dict[type, tuple[str, ...]] = {}


def _fields_dict(obj: Any) -> dict[str, Any]:
    """A dataclass of plain values as a dict, as ``dataclasses.asdict`` gives it.

    ``asdict`` copies every value recursively (``copy.deepcopy`` for a leaf); a
    cable selection holds only numbers and texts, which need no copy.
    """
    names = _FIELD_NAMES.get(type(obj))
    if names is None:
        names = _FIELD_NAMES[type(obj)] = tuple(f.name for f in fields(obj))
    return {name: getattr(obj, name) for name in names}


def _cable_dict(row: ScheduleRow) -> dict[str, Any] | None:
    cells = row.cable
    if cells is None:
        return None
    cable = _fields_dict(cells.selection)
    cable["csa_mm2"] = cells.csa_mm2
    cable["size_label"] = cells.selection.label  # contract.md Extensions: "95 mm²", "6 AWG"
    cable["capacity_a"] = cells.capacity_a
    return cable


#: Keys of ``voltage_drop``, in the document's order: the row's rounded :class:`VoltageDrop` fields.
DROP_KEYS = ("volts", "percent", "limit_percent", "mv_per_a_m", "annex_g_percent", "cumulative_percent")


def _drop_dict(row: ScheduleRow) -> dict[str, Any] | None:
    vd = row.drop
    return None if vd is None else {key: getattr(vd, key) for key in DROP_KEYS}


def row_to_dict(row: ScheduleRow, kind: str = "size") -> dict[str, Any]:
    """One circuit's :class:`.rows.ScheduleRow` as the contract's JSON object.

    Parameters
    ----------
    row : ScheduleRow
    kind : str
        ``"size"`` (everything), ``"routes"`` (id, from, to, status, messages,
        route, grouping only) or ``"calc"`` (no route, no grouping).
    """
    data: dict[str, Any] = {
        "id": row.circuit_id,
        "from": row.from_tag,
        "to": row.to_tag,
        "status": row.status,
        "messages": list(row.messages),
    }
    if kind in ("size", "routes"):
        data["route"] = _route_dict(row)
        data["grouping"] = _grouping_dict(row)
    sizing = row.sizing
    if kind == "routes" or sizing is None:
        return data
    data["load_current_a"] = row.load_current_a
    data["device_rating_a"] = row.device_rating_a
    data["device_kind"] = row.device_kind or None
    data["method"] = row.method or None
    data["correction_factor"] = row.correction_factor
    data["required_capacity_a"] = row.required_capacity_a
    data["cable"] = _cable_dict(row)
    data["voltage_drop"] = _drop_dict(row)
    data.update(row.extras())
    data["factors"] = [
        {"name": f.name, "value": rounded(f.value, 3), "source": f.source, "detail": f.detail}
        for f in sizing.factors
    ]
    data["checks"] = [
        {
            "name": c.name,
            "result": c.result.value,
            "passed": c.passed,
            "value": rounded(c.value, 3),
            "limit": rounded(c.limit, 3),
            "unit": c.unit,
            "source": c.source,
            "message": c.message,
        }
        for c in sizing.checks
    ]
    return data


def outcome_to_dict(outcome: CircuitOutcome, kind: str = "size") -> dict[str, Any]:
    """One circuit as the contract's JSON object (:func:`row_to_dict` of its row)."""
    return row_to_dict(circuit_row(outcome), kind)


def document(outcomes: Iterable[CircuitOutcome], kind: str = "size") -> dict[str, Any]:
    """The whole JSON document: ``{"circuits": [...]}``."""
    return {"circuits": [row_to_dict(r, kind) for r in rows(outcomes, METRE)]}


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
    return "".join(dump_pieces(outcomes, kind, extra))


def dump_pieces(outcomes: Iterable[CircuitOutcome], kind: str = "size",
                extra: Mapping[str, Any] | None = None) -> Iterator[str]:
    r"""The text of :func:`dumps` in pieces (a circuit's line, a key), made as they are
    written: a file writer never holds the whole document (15 MB at 2,000 circuits).

    Examples
    --------
    >>> "".join(dump_pieces([], extra={"drawing": {"units": "mm"}, "devices": [1, 2]}))
    '{\n  "circuits": [\n  ],\n  "drawing": {"units": "mm"},\n  "devices": [\n    1,\n    2\n  ]\n}'
    """
    # allow_nan=False: NaN and infinity are not JSON (RFC 8259, section 6); a value that
    # slipped through raises here instead of writing a document no reader accepts
    encode = json.JSONEncoder(ensure_ascii=False, separators=(", ", ": "), allow_nan=False).encode
    yield '{\n  "circuits": [\n'
    sep = "    "
    for r in rows(outcomes, METRE):  # JSON keeps metres
        yield sep + encode(row_to_dict(r, kind))
        sep = ",\n    "
    yield "  ]" if sep == "    " else "\n  ]"
    for key, value in (extra or {}).items():
        if isinstance(value, list):
            items = ",\n".join("    " + encode(v) for v in value)
            yield f',\n  {encode(key)}: [\n' + (items + "\n" if items else "") + "  ]"
        else:
            yield f",\n  {encode(key)}: {encode(value)}"
    yield "\n}"
