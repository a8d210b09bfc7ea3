"""Segment ids on the route network: every segment named once, on the segment itself.

The ids are those of ``schedule.json`` (``segments[].id``, each circuit's
``route.segments``) and of the segment schedule, so a reader of the drawing finds
the row of any stretch of tray.  A shared segment is named once, however many
circuits run on it.  Each id is a mark like a cable label: along a straight stretch
of its segment within one text height of it, else tied to it by a short leader
(:func:`.label_spots.place_on_route`), tried from the segment's ends inwards so that
the middle of a short drop is left to the cable labels placed before.

On a drawing too large for repair rounds (:data:`.mark_rounds.REPAIR_MAX_PLACED`), the
ids of short segments (:data:`BOUND_SEGMENT_H`) are placed before the cable labels: an
id can go only on its own segment, a label anywhere along its route, so the least free
mark goes first (on the 2,000-circuit plant two labels took both sides of a 6 m tray
stretch and left its id no place; benchmarks/RESULTS.md).  On a smaller drawing the
rounds place such an id first when it needs it, and the usual order is kept.
"""

from __future__ import annotations

from .entities import EntityWriter, Mark
from .inputs import AnnotationInput
from .label_spots import place_on_route
from .leaders import draw_leader
from .mark_index import LabelIndex
from .mark_rounds import MarkRound
from .stretches import Stretch, rank_stretches, scaled, straight_stretches
from .text import clean

__all__ = ["BOUND_SEGMENT_H", "id_stretches", "place_segment_ids", "segment_order"]

#: A segment shorter than this [text heights] is "short": two cable labels (12-18 h each,
#: :data:`.style.INDEX_CELL_H`) fill both its sides (our own choice).
BOUND_SEGMENT_H = 30.0


def segment_order(segment_id: str) -> tuple[int, str]:
    """Sort key: ``S2`` before ``S10`` (shorter ids first, then by text).

    Examples
    --------
    >>> sorted(["S10", "S2", "S1"], key=segment_order)
    ['S1', 'S2', 'S10']
    """
    return (len(segment_id), segment_id)


def id_stretches(marks: AnnotationInput) -> list[tuple[str, list[Stretch]]]:
    """Each segment with a plan length and its straight stretches, in id order."""
    k = float(marks.units_per_m)
    out = []
    for seg_id in sorted(marks.segments, key=segment_order):
        pts = scaled(getattr(marks.segments[seg_id], "points_m", ()) or (), k)
        stretches = straight_stretches(pts, crowd=len(marks.per_segment.get(seg_id, ())),
                                       key=seg_id) if len(pts) >= 2 else []
        if stretches:  # a vertical riser has no plan length to write its id along
            out.append((seg_id, stretches))
    return out


def place_segment_ids(w: EntityWriter, index: LabelIndex, marks: AnnotationInput,
                      select: MarkRound | None = None, short: bool | None = None,
                      todo: list[tuple[str, list[Stretch]]] | None = None) -> int:
    """One id per segment with a plan length, on the group-tag layer; the number written;
    ``select`` as in :func:`.labels.place_cable_labels`; ``short`` True or False: only the
    ids of segments shorter than :data:`BOUND_SEGMENT_H`, or only the others; ``todo``:
    :func:`id_stretches` of ``marks``, when worked out already."""
    written = 0
    todo = id_stretches(marks) if todo is None else todo
    sel = select or MarkRound()
    bound = BOUND_SEGMENT_H * w.height
    for seg_id, stretches in todo:
        if short is not None and (sum(s.length for s in stretches) < bound) != short:
            continue
        if not sel.wants("segment-id", seg_id):
            continue
        text = clean(seg_id)
        bw, bh = w.line_box(text)
        before = sel.begin(index)
        spot = place_on_route(index, rank_stretches(stretches, bw), bw, bh, w.height,
                              ends_first=True)
        sel.done(index, "segment-id", seg_id, before)
        place = spot.place
        entity = w.text(text, (place.x, place.y, place.z), Mark("group", "segment-id", seg_id),
                        rotation=place.rotation_deg)
        if spot.leader is not None:
            draw_leader(w, place, [entity], Mark("group", "segment-leader", seg_id))
        written += 1
    return written
