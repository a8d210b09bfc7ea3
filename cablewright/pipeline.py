"""The pipeline joining extract -> sizing -> annotate.

:func:`measure_drawing` reads the drawing and routes every circuit;
:func:`size_measurement` sizes them, iterating the grouping until the
parallel-cable counts are stable (each parallel cable counts in the group,
IEC 60364-5-52:2009 523.7 and contract.md "Lengths and grouping").
"""

from __future__ import annotations

import logging
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field, replace
from pathlib import Path

from cablewright.annotate.model import CircuitOutcome
from cablewright.extract import grouping as extract_grouping
from cablewright.extract.errors import CableRouteError
from cablewright.extract.model import DrawingConfig, Measurement, ScheduleRow
from cablewright.sizing.chain import SupplyCycleError, cumulative_drop_percent
from cablewright.sizing.fields import spec_from_fields
from cablewright.sizing.model import SizingResult, Stretch
from cablewright.sizing.select import size_circuit

from .config import Settings

__all__ = [
    "JobResult",
    "drawing_config",
    "ifc_config",
    "measure_drawing",
    "route_outcomes",
    "size_measurement",
    "MAX_GROUPING_ROUNDS",
]

log = logging.getLogger(__name__)

#: Rounds of re-sizing while parallel counts change the grouping.
MAX_GROUPING_ROUNDS = 10


@dataclass
class JobResult:
    """Everything one ``size`` run produced."""

    measurement: Measurement
    outcomes: list[CircuitOutcome]
    per_segment: dict[str, tuple[str, ...]] = field(default_factory=dict)
    parallel: dict[str, int] = field(default_factory=dict)
    rounds: int = 0


def drawing_config(settings: Settings, recover: bool = False) -> DrawingConfig:
    """The extract stage's config from the ``[drawing]`` and ``[routes]`` sections."""
    from cablewright.extract.errors import ConfigError

    base = DrawingConfig()
    values = dict(settings.drawing)
    layers = dict(base.route_layers)
    for name, kind in dict(values.pop("route_layers", {})).items():
        layers[name.upper()] = _layer_kind(name, kind, settings.source)
    patterns = {p: _layer_kind(p, k, settings.source) for p, k in dict(values.pop("layer_patterns", {})).items()}
    tiers = dict(values.pop("route_tiers", {}))
    for name, count in tiers.items():
        if isinstance(count, bool) or not isinstance(count, int) or count < 1:
            raise ConfigError(f"{settings.source}: [drawing.route_tiers] {name!r} = {count!r} must be "
                              "a whole number of tiers >= 1")
    known = {"units", "snap_tolerance_m", "max_tail_m", "tag_attribute", "near_miss_factor",
             "tags_from_text", "tag_text_max_m", "tag_symbol_layers", "flatten_tolerance_m"}
    for key in values:
        if key not in known:
            raise ConfigError(f"{settings.source}: unknown key {key!r} in [drawing]; known: {', '.join(sorted(known))}")
    if "tags_from_text" in values and not isinstance(values["tags_from_text"], bool):
        raise ConfigError(f"{settings.source}: [drawing] tags_from_text must be true or false")
    for key in ("tag_text_max_m", "flatten_tolerance_m"):
        value = values.get(key, 1.0)
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not value > 0:
            raise ConfigError(f"{settings.source}: [drawing] {key} = {value!r} must be a length > 0 in metres")
    if "tag_symbol_layers" in values:
        layers_given = values["tag_symbol_layers"]
        if not (isinstance(layers_given, list) and all(isinstance(n, str) for n in layers_given)):
            raise ConfigError(f"{settings.source}: [drawing] tag_symbol_layers must be a list of layer names")
        values["tag_symbol_layers"] = tuple(layers_given)
    route_values = dict(settings.routes)
    for key in route_values:
        if key not in ("slack_fraction", "end_allowance_m"):
            raise ConfigError(f"{settings.source}: unknown key {key!r} in [routes]; known: slack_fraction, end_allowance_m")
    return replace(base, route_layers=layers, extra_layer_patterns=patterns, recover=recover,
                   route_tiers=tiers,
                   **values, **route_values)


def _layer_kind(name: str, kind, source: str) -> tuple[str, str]:
    from cablewright.extract.errors import ConfigError
    from cablewright.extract.model import CONTAINMENTS

    if not (isinstance(kind, (list, tuple)) and len(kind) == 2 and kind[0] in CONTAINMENTS):
        raise ConfigError(
            f"{source}: route layer {name!r} must be [containment, method] with containment one of "
            f"{', '.join(CONTAINMENTS)}"
        )
    from cablewright.sizing.capacity_tables import canonical_method

    return str(kind[0]), canonical_method(str(kind[1]))


def measure_drawing(drawing: str | Path, circuits: str | Path | None, settings: Settings,
                    recover: bool = False, keep_document: bool = True) -> Measurement:
    """Extract the network and equipment and route every circuit of the schedule.

    ``keep_document=False`` (``routes``, which writes no drawing) reads a DXF with
    the streaming reader and keeps no parsed document.
    """
    from cablewright.extract import measure

    ifc = ifc_config(settings) if str(drawing).lower().endswith(".ifc") else None
    return measure(drawing, circuits, drawing_config(settings, recover), ifc, keep_document)


def ifc_config(settings: Settings):
    """The IFC reader's config from the ``[ifc]`` section (lists become tuples)."""
    from dataclasses import fields

    from cablewright.extract.errors import ConfigError
    from cablewright.extract.ifc_reader import IfcConfig

    known = {f.name: f for f in fields(IfcConfig)}
    values = {}
    for key, value in settings.ifc.items():
        if key not in known:
            raise ConfigError(f"{settings.source}: unknown key {key!r} in [ifc]; known: {', '.join(sorted(known))}")
        values[key] = tuple(value) if isinstance(value, list) else value
    try:
        return IfcConfig(**values)
    except (TypeError, ValueError) as exc:
        raise ConfigError(f"{settings.source}: [ifc] {exc}") from exc


def route_outcomes(measurement: Measurement, parallel: Mapping[str, int] | None = None
                   ) -> tuple[list[CircuitOutcome], dict[str, tuple[str, ...]]]:
    """Outcomes of ``routes``: lengths and grouping only, schedule order kept."""
    per_segment = extract_grouping.circuits_per_segment(measurement.routes, parallel)
    groups = extract_grouping.group_summary(measurement.routes, per_segment, parallel)
    outcomes = []
    for row in measurement.rows:
        cid = row.circuit_id
        route = measurement.routes.get(cid)
        if route is None:
            message = measurement.failures.get(cid, "circuit could not be routed")
            outcomes.append(CircuitOutcome(cid, row.from_tag, row.to_tag, "error", (message,)))
            continue
        outcomes.append(CircuitOutcome(cid, row.from_tag, row.to_tag, "ok", (), route, groups.get(cid)))
    return outcomes, per_segment


def _fields(row: ScheduleRow) -> dict[str, str | None]:
    return {key: (value if value.strip() else None) for key, value in row.fields}


def _stretches(measurement: Measurement, route, own: int, cables_on: Mapping[str, int],
               tiers_of: Callable[[str], int] | None = None) -> tuple[Stretch, ...]:
    """One stretch per installation (method, containment, tiers): the most crowded segment of each.

    The grouping factor falls as the count rises, so for one installation only the
    segment with the most cables can govern; the first such segment is kept.
    """
    best: dict[tuple[str, str, int], Stretch] = {}
    for seg_id in route.segment_ids:
        segment = measurement.segments.get(seg_id)
        if segment is None:
            continue
        others = cables_on.get(seg_id, own) - own
        tiers = tiers_of(segment.layer) if tiers_of is not None else 1
        key = (segment.method, segment.containment, tiers)
        current = best.get(key)
        if current is None or others > current.other_cables:
            best[key] = Stretch(seg_id, segment.method, others, length_m=segment.length_m,
                                trays=tiers, containment=segment.containment)
    if not best:  # a route made of tails only: clipped direct, alone (common practice)
        return (Stretch("", "C", 0),)
    return tuple(best.values())


def size_measurement(
    measurement: Measurement,
    settings: Settings,
    progress: Callable[[int], None] | None = None,
) -> JobResult:
    """Size every routed circuit; unrouted or bad circuits become ``error`` outcomes."""
    config = settings.sizing
    tiers_of = drawing_config(settings).layer_tiers
    specs: dict[str, object] = {}
    errors: dict[str, str] = {}
    rows = {row.circuit_id: row for row in measurement.rows}
    for row in measurement.rows:
        cid = row.circuit_id
        route = measurement.routes.get(cid)
        if route is None:
            errors[cid] = measurement.failures.get(cid, "circuit could not be routed")
            continue
        try:
            specs[cid] = spec_from_fields(cid, _fields(row), config, route.design_length_m)
        except CableRouteError as exc:
            errors[cid] = f"{row.where}: {exc}"

    routed = {cid: measurement.routes[cid] for cid in specs}
    parallel = {cid: 1 for cid in specs}
    results: dict[str, SizingResult] = {}
    rounds = 0
    light: set[str] = set()  # left out of the others' group count (30 % rule), when on
    for rounds in range(1, MAX_GROUPING_ROUNDS + 1):
        per_segment = extract_grouping.circuits_per_segment(routed, parallel)
        counted = {c: (0 if c in light else n) for c, n in parallel.items()}
        cables_on = {seg: sum(counted[c] for c in cids) for seg, cids in per_segment.items()}
        for cid, spec in specs.items():
            stretches = _stretches(measurement, routed[cid], counted[cid], cables_on, tiers_of)
            results[cid] = size_circuit(replace(spec, stretches=stretches), config)
            if progress is not None and rounds == 1:
                progress(1)
        new = {cid: (r.cable.parallel if r.cable else parallel[cid]) for cid, r in results.items()}
        new_light = light | (_lightly_loaded(results) if config.ignore_lightly_loaded else set())
        if new == parallel and new_light == light:
            break
        parallel = {cid: max(parallel[cid], new[cid]) for cid in parallel}
        light = new_light  # only grows, so the rounds settle
    else:
        log.warning("grouping did not settle after %d rounds; results use the last round", rounds)

    for cid in sorted(light & set(results)):
        results[cid] = replace(results[cid], messages=results[cid].messages + (LIGHT_LOAD_NOTE,))
    results = _with_chain_drops(results, rows)
    per_segment = extract_grouping.circuits_per_segment(routed, parallel)
    groups = extract_grouping.group_summary(routed, per_segment, parallel)
    outcomes: list[CircuitOutcome] = []
    for cid, row in rows.items():
        if cid in errors:
            outcomes.append(CircuitOutcome(cid, row.from_tag, row.to_tag, "error", (errors[cid],),
                                           measurement.routes.get(cid), None, None))
            if progress is not None:
                progress(1)
            continue
        result = results[cid]
        outcomes.append(CircuitOutcome(cid, row.from_tag, row.to_tag, result.status, result.messages,
                                       routed[cid], groups.get(cid), result))
    return JobResult(measurement, outcomes, per_segment, parallel, rounds)


#: The 30 % rule of IEC 60364-5-52:2009: a cable expected to carry no more than 30 % of
#: its grouped rating may be ignored when the group's factor is read for the others
#: (523.5 and the notes to the grouping tables; clause number from memory).
LIGHT_LOAD_FRACTION = 0.30
LIGHT_LOAD_NOTE = (
    "30 % rule applied (config ignore_lightly_loaded): this circuit carries no more than 30 % "
    "of its grouped rating and is left out of the group count of the others "
    "(IEC 60364-5-52:2009 523.5)")


def _lightly_loaded(results: Mapping[str, SizingResult]) -> set[str]:
    """Circuits whose Ib is at most 30 % of their grouped rating Iz (IEC 60364-5-52:2009 523.5)."""
    return {cid for cid, r in results.items()
            if r.cable is not None and r.load_current_a is not None
            and r.load_current_a <= LIGHT_LOAD_FRACTION * r.cable.capacity_a}


def _with_chain_drops(results: dict[str, SizingResult], rows: Mapping[str, ScheduleRow]
                      ) -> dict[str, SizingResult]:
    """Add the drop from the origin (IEC 60364-5-52:2009 Annex G) to every result.

    A circuit whose source is the load end of another circuit (a sub-board
    fed from the schedule) adds that feeder's drop, and so on up the chain;
    the circuit's own limit then applies to the total.
    """
    own = {cid: r.voltage_drop.percent for cid, r in results.items() if r.voltage_drop is not None}
    source_of = {cid: rows[cid].from_tag for cid in own}
    feeder_of = {rows[cid].to_tag: cid for cid in own}
    try:
        cumulative = cumulative_drop_percent(own, source_of, feeder_of)
    except SupplyCycleError as exc:
        log.warning("%s", exc)
        return {cid: (replace(r, status="error", messages=r.messages + (str(exc),))
                      if cid in str(exc) else r) for cid, r in results.items()}
    out = dict(results)
    for cid, total in cumulative.items():
        result = results[cid]
        vd = replace(result.voltage_drop, cumulative_percent=total)
        if total > vd.limit_percent + 1e-9 and total > vd.percent + 1e-9:
            message = (f"voltage drop from the origin {total:.2f} % (own {vd.percent:.2f} % plus "
                       f"feeders upstream) exceeds the {vd.limit_percent:g} % limit "
                       "(IEC 60364-5-52:2009 Annex G): enlarge this circuit or its feeder")
            status = "error" if result.status == "error" else "fail"
            out[cid] = replace(result, voltage_drop=vd, status=status, messages=result.messages + (message,))
        else:
            out[cid] = replace(result, voltage_drop=vd)
    return out
