"""Revision marks beside changed labels and fill marks at over-full segments, on layers of ours.

The geometry is :mod:`cablewright.annotate.revision`'s (a diamond holding the
revision beside the label's end); here it is turned with the label and written.
The label's box is widened by :func:`revision_room` before it is placed, so the
mark takes part in the search for a free spot like the label itself.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from ..revision import GAP_HEIGHTS, HALF_DIAGONAL_HEIGHTS, revision_mark
from .boxes import LabelIndex
from .entities import EntityWriter, Mark
from .group_tags import TaggedRun, fills_under_tags
from .inputs import AnnotationInput
from .leaders import draw_leader
from .mark_rounds import MarkRound
from .note_keys import key_box, write_key
from .note_spots import note_variants, place_note
from .stretches import scaled
from .style import LABEL_MARGIN_H

__all__ = ["revision_room", "draw_revision_mark", "place_fill_marks", "DEFAULT_REVISION"]

#: Written in the diamond when the config names no drawing revision.
DEFAULT_REVISION = "R"


def revision_room(text_height: float) -> float:
    """Width a revision mark adds to a label's box [drawing units]: the gap and the diamond."""
    return (GAP_HEIGHTS + 2.0 * HALF_DIAGONAL_HEIGHTS) * text_height


def draw_revision_mark(w: EntityWriter, circuit_id: str, text_at: Sequence[float],
                       box_width: float, rotation_deg: float, revision: str = "") -> None:
    """The diamond beside the label centred at ``text_at`` (box ``box_width`` wide)."""
    h = w.height
    end = (box_width - LABEL_MARGIN_H * h) / 2.0  # the text's right end, in the text's frame
    mark = revision_mark(circuit_id, (end, 0.0), h, revision or DEFAULT_REVISION)
    a = math.radians(rotation_deg)
    ca, sa = math.cos(a), math.sin(a)

    def world(p: Sequence[float]) -> tuple[float, float]:
        return (text_at[0] + ca * p[0] - sa * p[1], text_at[1] + sa * p[0] + ca * p[1])

    z = float(text_at[2]) if len(text_at) > 2 else 0.0
    w.polygon([world(p) for p in mark.outline], z, Mark("revision", "revision-mark", circuit_id))
    cx, cy = world(mark.text_at)
    w.text(mark.text, (cx, cy, z), Mark("revision", "revision-number", circuit_id),
           rotation=rotation_deg, height=mark.text_height)


def place_fill_marks(w: EntityWriter, index: LabelIndex, marks: AnnotationInput,
                     select: MarkRound | None = None,
                     runs: Sequence[TaggedRun] | None = None) -> int:
    """One note with a leader at each over-full segment's mid-point, but for those written
    under their run's group tag (:func:`.group_tags.fills_under_tags`; ``runs`` the tagged
    runs, worked out here when not given); the number written; ``select`` as in
    :func:`.labels.place_cable_labels`."""
    k = float(marks.units_per_m)
    written = 0
    sel = select or MarkRound()
    under_tags = fills_under_tags(marks, w.config.group_tags, sel, runs)
    for fill in marks.fill_marks:
        if fill.segment_id in under_tags or not sel.wants("fill-mark", fill.segment_id):
            continue
        x, y, z = scaled([fill.at_m], k)[0]
        lines = [f"{fill.segment_id}: {fill.text} ({fill.result.upper()})"]
        variants = note_variants(lines)
        before = sel.begin(index)
        spot, i = place_note(index, (x, y, z), [w.block_box(v) for v in variants], w.height,
                             key_size=lambda: key_box(w, index))
        place, mark = spot.place, Mark("fill", "fill-mark", fill.segment_id)
        if i == len(variants):  # only its key fitted: the note goes to the keyed notes list
            entities = write_key(w, index, place, [(mark, lines)])
        else:
            entities = w.block(variants[i], place, mark)
        sel.done(index, "fill-mark", fill.segment_id, before)
        draw_leader(w, place, entities, Mark("fill", "fill-leader", fill.segment_id))
        written += 1
    return written

