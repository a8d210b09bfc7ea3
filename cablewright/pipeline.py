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
from cablewright.core.errors import CableRouteError
from cablewright.extract import grouping as extract_grouping
from cablewright.extract.model import DrawingConfig, Measurement, ScheduleRow
from cablewright.sizing.batch import BatchRound
from cablewright.sizing.chain import (
    ChainCable,
    chain_drops,
    cheapest_drop_fix,
    origin_drop_check,
    origin_drop_not_checked,
    origin_limit,
    upstream_chain,
    with_origin_check,
)
from cablewright.sizing.fields import spec_from_fields
from cablewright.sizing.model import CircuitSpec, SizingResult, Stretch
from cablewright.sizing.standards import size_for_standard

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
    """The extract stage's config (``[drawing]`` and ``[routes]``, validated at start-up)."""
    return replace(settings.drawing, recover=recover)


def measure_drawing(drawing: str | Path, circuits: str | Path | None, settings: Settings,
                    recover: bool = False, keep_document: bool = True,
                    marks_appid: str | None = None) -> Measurement:
    """Extract the network and equipment and route every circuit of the schedule.

    ``keep_document=False`` (``routes``, which writes no drawing) reads a DXF with
    the streaming reader and keeps no parsed document; with ``marks_appid`` as
    well (``size``) it keeps what the appending DXF writer needs instead.
    """
    from cablewright.extract import measure

    ifc = ifc_config(settings) if str(drawing).lower().endswith(".ifc") else None
    return measure(drawing, circuits, drawing_config(settings, recover), ifc, keep_document, marks_appid)


def ifc_config(settings: Settings):
    """The IFC reader's config (``[ifc]``, validated at start-up)."""
    return settings.ifc


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
        notes = (_estimated_note(),) if _is_estimated(route, measurement) else ()
        outcomes.append(CircuitOutcome(cid, row.from_tag, row.to_tag, "ok", notes, route, groups.get(cid)))
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
    specs: dict[str, CircuitSpec] = {}
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
    # IEC: the batch core sizes each round (sizing.batch); the records are the engine's,
    # built once for the last round.  NEC: the per-circuit engine.
    batch = None
    for rounds in range(1, MAX_GROUPING_ROUNDS + 1):
        per_segment = extract_grouping.circuits_per_segment(routed, parallel)
        counted = {c: (0 if c in light else n) for c, n in parallel.items()}
        cables_on = {seg: sum(counted[c] for c in cids) for seg, cids in per_segment.items()}
        sized = {cid: replace(spec, stretches=_stretches(measurement, routed[cid], counted[cid],
                                                         cables_on, tiers_of))
                 for cid, spec in specs.items()}
        if config.standard == "iec":
            batch = BatchRound(sized, config)
            new = batch.parallel_counts(parallel)
            lightly = (batch.lightly_loaded(LIGHT_LOAD_FRACTION) if config.ignore_lightly_loaded
                       else set())
        else:
            results = {cid: size_for_standard(spec, config) for cid, spec in sized.items()}
            new = {cid: (r.cable.parallel if r.cable else parallel[cid])
                   for cid, r in results.items()}
            lightly = _lightly_loaded(results) if config.ignore_lightly_loaded else set()
        if progress is not None and rounds == 1:
            for _ in sized:
                progress(1)
        new_light = light | lightly
        if new == parallel and new_light == light:
            break
        parallel = {cid: max(parallel[cid], new[cid]) for cid in parallel}
        light = new_light  # only grows, so the rounds settle
    else:
        log.warning("grouping did not settle after %d rounds; results use the last round", rounds)
    if batch is not None:
        results = batch.records()

    for cid in sorted(light & set(results)):
        results[cid] = replace(results[cid], messages=results[cid].messages + (LIGHT_LOAD_NOTE,))
    results = _with_estimated_note(results, routed, measurement)
    results = _with_chain_drops(results, rows, specs)
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


def _estimated_note() -> str:
    from cablewright.extract.ifc_reader import ESTIMATED_NOTE

    return ESTIMATED_NOTE


def _is_estimated(route, measurement: Measurement) -> bool:
    """The route runs over a piece estimated without carriers ([ifc] estimate_routes)."""
    from cablewright.extract.ifc_reader import ESTIMATED_PREFIX

    segments = measurement.segments
    return any(
        src.startswith(ESTIMATED_PREFIX)
        for sid in route.segment_ids if sid in segments
        for src in segments[sid].source_ids
    )


def _with_estimated_note(results: dict, routed: dict, measurement: Measurement) -> dict:
    """Each circuit routed over a piece estimated without carriers says so (a message)."""
    for cid, route in routed.items():
        if cid in results and _is_estimated(route, measurement):
            results[cid] = replace(results[cid], messages=results[cid].messages + (_estimated_note(),))
    return results


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


def _drop_advice(cid: str, total: float, limit: float, results: Mapping[str, SizingResult],
                 source_of: Mapping[str, str], feeder_of: Mapping[str, str],
                 specs: Mapping[str, CircuitSpec]) -> str:
    """"; cheapest: ..." naming the one cable to enlarge (sizing.chain.cheapest_drop_fix)."""
    cables = {}
    for c in upstream_chain(cid, source_of, feeder_of):
        r, spec = results.get(c), specs.get(c)
        if r is None or r.cable is None or r.voltage_drop is None or spec is None:
            continue
        cables[c] = ChainCable(r.cable.csa_mm2, r.cable.parallel, spec.design_length_m,
                               r.cable.conductor, r.cable.insulation, spec.power_factor,
                               r.voltage_drop.percent)
    chain = list(cables)
    feeder = cheapest_drop_fix(cid, total, limit, [c for c in chain if c != cid], cables)
    own = cheapest_drop_fix(cid, total, limit, [cid], cables)
    parts = []
    if feeder is not None:
        parts.append(f"enlarging feeder {feeder.circuit_id} from {feeder.from_csa_mm2:g} to "
                     f"{feeder.to_csa_mm2:g} mm² fixes it most cheaply upstream "
                     f"(+{feeder.added_copper_mm2_m:.0f} mm²·m of conductor, "
                     f"{feeder.total_pct:.2f} % from the origin)")
    if own is not None:
        parts.append(f"this circuit from {own.from_csa_mm2:g} to {own.to_csa_mm2:g} mm² "
                     f"(+{own.added_copper_mm2_m:.0f} mm²·m, {own.total_pct:.2f} %)")
    return ("; advice: " + "; or ".join(parts)) if parts else ""


def _with_chain_drops(results: dict[str, SizingResult], rows: Mapping[str, ScheduleRow],
                      specs: Mapping[str, CircuitSpec] | None = None) -> dict[str, SizingResult]:
    """Add the drop from the origin (IEC 60364-5-52:2009 Annex G) to every result.

    A circuit whose source is the load end of another circuit (a sub-board
    fed from the schedule) adds that feeder's drop, and so on up the chain;
    the circuit's own limit then applies to the total.  Every circuit with a
    voltage drop gets the check ``voltage_drop_origin`` (sizing.chain): pass or
    fail through feeders, not applicable when fed at the origin, not checked in
    or through a supply loop or below a feeder that could not be sized.
    """
    own = {cid: r.voltage_drop.percent for cid, r in results.items() if r.voltage_drop is not None}
    source_of = {cid: rows[cid].from_tag for cid in own}
    feeder_of = {rows[cid].to_tag: cid for cid in own}
    drops = chain_drops(own, source_of, feeder_of)
    out = dict(results)
    for loop in drops.loops:
        log.warning("%s", loop)
        for cid in loop.circuit_ids:
            result = results[cid]
            out[cid] = with_origin_check(
                replace(result, status="error", messages=result.messages + (str(loop),)),
                origin_drop_not_checked(result.voltage_drop, "this circuit is in a supply loop"))
    for cid, loop in drops.fed_through_loop.items():
        result = results[cid]
        why = (f"voltage drop from the origin not computed: the supply passes through the loop "
               f"{' -> '.join(loop.circuit_ids)}; fix the 'from' and 'to' tags of the loop")
        out[cid] = with_origin_check(replace(result, messages=result.messages + (why,)),
                                     origin_drop_not_checked(result.voltage_drop, why))
    unsized = _below_unsized_feeder(drops.cumulative_pct, rows, own)
    for cid, total in drops.cumulative_pct.items():
        result = results[cid]
        if cid in unsized:
            out[cid] = with_origin_check(result, origin_drop_not_checked(
                result.voltage_drop, f"feeder {unsized[cid]} upstream could not be sized"))
            continue
        assert result.voltage_drop is not None  # chain_drops sums only circuits with a drop
        vd = replace(result.voltage_drop, cumulative_percent=total)
        feeders = [(c, own[c]) for c in upstream_chain(cid, source_of, feeder_of)[1:]]
        check = origin_drop_check(vd, feeders, total)
        result = with_origin_check(replace(result, voltage_drop=vd), check)
        if check.failed:
            message = (f"{check.message} ({origin_limit(vd)[1]}): "
                       "enlarge this circuit or its feeder")
            message += _drop_advice(cid, total, check.limit, results, source_of, feeder_of, specs or {})
            status = "error" if result.status == "error" else "fail"
            result = replace(result, status=status, messages=result.messages + (message,))
        out[cid] = result
    return out


def _below_unsized_feeder(cumulative: Mapping[str, float], rows: Mapping[str, ScheduleRow],
                          own: Mapping[str, float]) -> dict[str, str]:
    """Circuits fed (at any depth) through a schedule circuit that has no voltage drop: that feeder.

    Such a circuit's drop from the origin is not known; summing only the feeders
    that were sized would understate it.
    """
    feeder_of_all = {row.to_tag: cid for cid, row in rows.items()}
    source_of_all = {cid: row.from_tag for cid, row in rows.items()}
    out = {}
    for cid in cumulative:
        missing = next((c for c in upstream_chain(cid, source_of_all, feeder_of_all)[1:]
                        if c not in own), None)
        if missing is not None:
            out[cid] = missing
    return out
