"""Cable labels: the label text of a sized circuit and the stretches it may go on."""

from __future__ import annotations

import logging
from collections import defaultdict
from collections.abc import Callable, Mapping, Sequence
from typing import Any

from ..model import CircuitOutcome
from .boxes import LabelIndex
from .entities import EntityWriter, Mark
from .inputs import AnnotationInput
from .placement import place_along
from .stretches import Stretch, rank_stretches, scaled, straight_stretches
from .style import FAIL_COLOR
from .text import clean

__all__ = ["label_text", "route_stretches", "place_cable_labels"]

log = logging.getLogger(__name__)


def label_text(outcome: CircuitOutcome) -> str:
    """The cable label of a sized circuit, e.g. ``"P-101: 4C 70 mm² Cu/XLPE"``."""
    sizing = outcome.sizing
    if sizing is None or sizing.cable is None:
        raise ValueError(f"circuit {outcome.circuit_id} has no cable to label")
    text = f"{outcome.circuit_id}: {sizing.cable.describe()}"
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
    if len(pts) >= 2:
        # tails: a source tail is shared by every circuit from that source
        if (getattr(route, "source_tail_m", 0.0) or 0.0) > 0.0:
            stretches += straight_stretches(
                pts[:2], crowd=max(1, from_count.get(outcome.from_tag, 1)), key="source-tail"
            )
        if (getattr(route, "load_tail_m", 0.0) or 0.0) > 0.0:
            stretches += straight_stretches(
                pts[-2:], crowd=max(1, to_count.get(outcome.to_tag, 1)), key="load-tail"
            )
    return stretches


def place_cable_labels(
    w: EntityWriter,
    index: LabelIndex,
    marks: AnnotationInput,
    progress: Callable[[int], None] | None = None,
) -> tuple[int, int, list[str]]:
    """One label per sized circuit along its route; (labels, overlapping, unlabelled)."""
    k = float(marks.units_per_m)
    from_count: dict[str, int] = defaultdict(int)
    to_count: dict[str, int] = defaultdict(int)
    for o in marks.outcomes:
        if o.route is not None:
            from_count[o.from_tag] += 1
            to_count[o.to_tag] += 1

    labels = overlapping = 0
    unlabelled: list[str] = []
    cut_cache: dict[str, list[Stretch]] = {}
    for o in marks.outcomes:
        if o.status == "error" or o.sizing is None or o.sizing.cable is None:
            continue
        stretches = route_stretches(
            o, marks.segments, marks.per_segment, k, from_count, to_count, cut_cache
        )
        if not stretches:
            unlabelled.append(f"{o.circuit_id}: no route geometry to put a label on")
            log.warning(
                "circuit %s: sized but has no route geometry; no label on the drawing", o.circuit_id
            )
            continue
        text = label_text(o)
        bw, bh = w.line_box(text)
        place = place_along(index, rank_stretches(stretches, bw), bw, bh)
        overlapping += place.overlaps
        w.text(
            text,
            (place.x, place.y, place.z),
            Mark("label", "cable-label", o.circuit_id),
            rotation=place.rotation_deg,
            color=FAIL_COLOR if o.status == "fail" else None,
        )
        labels += 1
        if progress is not None:
            progress(1)
    return labels, overlapping, unlabelled
