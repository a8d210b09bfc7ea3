"""Cable labels: the label text of a sized circuit and the stretches it may go on."""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from typing import Any

from ..model import CircuitOutcome
from .placement import Stretch, scaled, straight_stretches
from .text import clean

__all__ = ["label_text"]


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


