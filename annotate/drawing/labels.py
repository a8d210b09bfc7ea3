"""Cable labels: the label text of a sized circuit and the stretches it may go on."""

from __future__ import annotations

import logging
import math
from collections import defaultdict
from collections.abc import Callable, Mapping, Sequence
from typing import Any

from cablewright.sizing.cable_text import cable_text, parallel_text, pe_text
from cablewright.sizing.device import device_words

from ..model import CircuitOutcome
from ..rows import length_unit
from .boxes import LabelIndex
from .entities import EntityWriter, Mark
from .inputs import AnnotationInput
from .label_spots import place_on_route
from .leaders import draw_leader
from .mark_rounds import MarkRound
from .revision_marks import draw_revision_mark, revision_room
from .stretches import Stretch, rank_stretches, scaled, straight_stretches
from .style import FAIL_COLOR
from .text import clean

__all__ = ["label_fields", "label_text", "route_stretches", "place_cable_labels"]

log = logging.getLogger(__name__)


def label_fields(outcome: CircuitOutcome, override: str = "") -> dict[str, str]:
    """Every field a cable label may show (see ``AnnotateConfig.label_fields``); the
    length to order in the rule set's unit, or ``override`` ("m", "ft")."""
    sizing = outcome.sizing
    if sizing is None or sizing.cable is None:
        raise ValueError(f"circuit {outcome.circuit_id} has no cable to label")
    c = sizing.cable
    route = outcome.route
    length = getattr(route, "design_length_m", None) if route is not None else None
    rating = getattr(sizing, "device_rating_a", None)
    kind = device_words(getattr(sizing, "device_kind", "") or "")
    unit = length_unit(sizing.standard, override)
    return {  # cable and PE texts: cablewright.sizing.cable_text, as the schedules write them
        "circuit": outcome.circuit_id,
        "cable": cable_text(c.cores, c.csa_mm2, c.conductor, c.insulation, size_label=c.size_label,
                            form="label"),
        "pe": pe_text(sizing.protective_conductor_mm2, c.csa_mm2, form="label"),
        "parallel": parallel_text(c.parallel),
        "length": f"order {unit.text(float(length) * c.parallel, 0)}" if length else "",
        "device": f"{kind} {rating:g} A".strip() if rating is not None else "",
    }


def label_text(outcome: CircuitOutcome,
               fields: Sequence[str] = ("circuit", "parallel", "cable", "pe"), override: str = "") -> str:
    """The cable label of a sized circuit, e.g. ``"P-101: 2x 4x70 mm² Cu/XLPE PE35"``.

    The trade's short form: parallel count, cores x size, conductor/insulation,
    then a reduced protective conductor; the fields and their order are
    ``AnnotateConfig.label_fields``.
    """
    values = label_fields(outcome, override)
    parts = [values[f] for f in fields if f != "circuit" and values.get(f)]
    head = values["circuit"] if "circuit" in fields else ""
    text = f"{head}: {' '.join(parts)}" if head and parts else head or " ".join(parts)
    if outcome.status == "fail":
        text += " [FAIL]"
    return clean(text)


def route_stretches(
    outcome: CircuitOutcome,
    segments: Mapping[str, Any],
    per_segment: Mapping[str, Sequence[str]],
    k: float,
    from_count: Mapping[str, int],
    to_count: Mapping[str, int],
    cache: dict[str, list[Stretch]] | None = None,
) -> list[Stretch]:
    """Stretches a circuit's label may go on; ``cache`` keeps each segment's (shared ones
    are cut once, not once per circuit on them)."""
    route = outcome.route
    stretches: list[Stretch] = []
    cache = {} if cache is None else cache
    for seg_id in getattr(route, "segment_ids", ()) or ():
        cut = cache.get(seg_id)
        if cut is None:
            seg = segments.get(seg_id)
            if seg is None or len(seg.points_m) < 2:
                cut = []
            else:
                crowd = max(1, len(per_segment.get(seg_id, ())))
                cut = straight_stretches(scaled(seg.points_m, k), crowd=crowd, key=seg_id)
            cache[seg_id] = cut
        stretches += cut
    pts = scaled(getattr(route, "points_m", ()) or (), k)
    if not stretches and len(pts) >= 2:
        return straight_stretches(pts, crowd=1, key="route")
    # a route with a drawn stretch keeps its label on the drawn lines (with a leader where
    # need be): its straight tails to the equipment are no line the reader can see
    return stretches
    return stretches


def _label_todo(marks: AnnotationInput, select: MarkRound | None
                ) -> tuple[list[tuple[float, CircuitOutcome, list[Stretch]]], list[str]]:
    """The sized circuits with their stretches, the shortest routes first (they have the
    fewest spots to choose from), and those with no route geometry (named)."""
    k = float(marks.units_per_m)
    from_count: dict[str, int] = defaultdict(int)
    to_count: dict[str, int] = defaultdict(int)
    for o in marks.outcomes:
        if o.route is not None:
            from_count[o.from_tag] += 1
            to_count[o.to_tag] += 1
    unlabelled: list[str] = []
    cut_cache: dict[str, list[Stretch]] = {}
    todo = []
    for o in marks.outcomes:
        if o.status == "error" or o.sizing is None or o.sizing.cable is None:
            continue
        stretches = route_stretches(
            o, marks.segments, marks.per_segment, k, from_count, to_count, cut_cache
        )
        if not stretches:
            if select is None or not select.early:
                unlabelled.append(f"{o.circuit_id}: no route geometry to put a label on")
            if select is None or select.reports:
                log.warning("circuit %s: sized but has no route geometry; no label on the drawing",
                            o.circuit_id)
            continue
        todo.append((sum(s.length for s in stretches), o, stretches))
    todo.sort(key=lambda item: item[0])
    return todo, unlabelled


def place_cable_labels(
    w: EntityWriter,
    index: LabelIndex,
    marks: AnnotationInput,
    progress: Callable[[int], None] | None = None,
    select: MarkRound | None = None,
) -> tuple[int, int, list[str]]:
    """One label per sized circuit along its route; (labels, overlapping, unlabelled).

    ``select`` (the repair rounds, :mod:`.mark_rounds`): the listed labels first, and
    the labels that needed a last resort listed."""
    todo, unlabelled = _label_todo(marks, select)
    labels = overlapping = 0
    sel = select or MarkRound()
    for _, o, stretches in todo:
        if not sel.wants("cable-label", o.circuit_id):
            continue
        before = sel.begin(index)
        overlapping += _place_label(w, index, marks, o, stretches)
        sel.done(index, "cable-label", o.circuit_id, before)
        labels += 1
        if progress is not None:
            progress(1)
    return labels, overlapping, unlabelled


def _place_label(w: EntityWriter, index: LabelIndex, marks: AnnotationInput, o: CircuitOutcome,
                 stretches: list[Stretch]) -> int:
    """One circuit's label (and its leader, revision mark); 1 when it overlaps, else 0."""
    text = label_text(o, w.config.label_fields, w.config.length_unit)
    bw, bh = w.line_box(text)
    changed = o.circuit_id in marks.changed
    extra = revision_room(w.height) if changed else 0.0
    spot = place_on_route(index, rank_stretches(stretches, bw + extra), bw + extra, bh, w.height)
    place = spot.place
    a = math.radians(place.rotation_deg)
    at = (place.x - math.cos(a) * extra / 2.0, place.y - math.sin(a) * extra / 2.0, place.z)
    entity = w.text(
        text,
        at,
        Mark("label", "cable-label", o.circuit_id),
        rotation=place.rotation_deg,
        color=FAIL_COLOR if o.status == "fail" else None,
    )
    if spot.leader is not None:
        draw_leader(w, place, [entity], Mark("label", "label-leader", o.circuit_id))
    if changed:
        draw_revision_mark(w, o.circuit_id, at, bw, place.rotation_deg, marks.revision)
    return int(place.overlaps)
