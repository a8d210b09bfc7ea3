"""Device notes at each load (``"P-101: 125 A"``) and error notes for circuits not sized."""

from __future__ import annotations

from collections import defaultdict
from collections.abc import Mapping

from cablewright.sizing.device import device_words

from .boxes import LabelIndex
from .entities import EntityWriter, Mark
from .inputs import AnnotationInput
from .leaders import draw_leader
from .mark_rounds import MarkRound
from .note_keys import key_box, write_key
from .note_spots import note_variants, place_note
from .stretches import scaled
from .text import rating_text

__all__ = ["equipment_notes", "place_equipment_notes"]


def equipment_notes(
    marks: AnnotationInput, fields: tuple[str, ...] = ("device",),
) -> tuple[dict[str, list[str]], dict[str, list[str]]]:
    """Note lines per equipment tag: (device ratings per load, errors per load or source).

    An error note goes to the load when it is on the drawing, else to the source.
    A device note reads ``"P-101: breaker 125 A"``: the device kind (when ``fields``
    holds ``device``) and rating.
    """
    notes_by_load: dict[str, list[str]] = defaultdict(list)
    errors_by_tag: dict[str, list[str]] = defaultdict(list)
    for o in marks.outcomes:
        s = o.sizing
        if o.status != "error" and s is not None and s.device_rating_a is not None:
            assumed = ", Ze assumed" if getattr(s, "ze_assumed", False) else ""  # no Ze nor fault level given
            kind = device_words(s.device_kind or "") if "device" in fields else ""
            device = f"{kind} {rating_text(s.device_rating_a)} A".strip()
            notes_by_load[o.to_tag].append(f"{o.circuit_id}: {device}{assumed}")
        elif o.status == "error":
            tag = o.to_tag if o.to_tag in marks.equipment else o.from_tag
            errors_by_tag[tag].append(f"{o.circuit_id}: NOT SIZED, see report")
    return notes_by_load, errors_by_tag


def _notes_at_equipment(
    w: EntityWriter,
    index: LabelIndex,
    marks: AnnotationInput,
    by_tag: Mapping[str, list[str]],
    role: str,
    select: MarkRound | None = None,
) -> tuple[int, int]:
    """Place one note with a leader at each equipment; (notes placed, overlaps)."""
    kind = "device" if role == "device" else "error"
    k = float(marks.units_per_m)
    placed = overlaps = 0
    sel = select or MarkRound()
    for tag, lines in by_tag.items():
        eq = marks.equipment.get(tag)
        if eq is None or not sel.wants(f"{kind}-note", tag):
            continue
        x, y, z = scaled([eq.position_m], k)[0]
        variants = note_variants(lines)
        before = sel.begin(index)
        spot, i = place_note(index, (x, y, z), [w.block_box(v) for v in variants], w.height,
                             key_size=lambda: key_box(w, index))
        place = spot.place
        mark = Mark(role, f"{kind}-note", tag)
        if i == len(variants):  # only its key fitted: the note goes to the keyed notes list
            written = write_key(w, index, place, [(mark, lines)])
        else:
            written = w.block(variants[i], place, mark)
        sel.done(index, f"{kind}-note", tag, before)
        overlaps += place.overlaps
        draw_leader(w, place, written, Mark(role, f"{kind}-leader", tag))
        placed += 1
    return placed, overlaps


def place_equipment_notes(
    w: EntityWriter, index: LabelIndex, marks: AnnotationInput, select: MarkRound | None = None
) -> tuple[int, int, int]:
    """Device notes, then error notes, as the config asks; (device, error, overlapping);
    ``select`` as in :func:`.labels.place_cable_labels`."""
    notes_by_load, errors_by_tag = equipment_notes(marks, tuple(w.config.device_fields))
    device_notes = error_notes = overlapping = 0
    if w.config.device_notes:
        device_notes, extra = _notes_at_equipment(w, index, marks, notes_by_load, "device", select)
        overlapping += extra
    if w.config.error_notes:
        error_notes, extra = _notes_at_equipment(w, index, marks, errors_by_tag, "notes", select)
        overlapping += extra
    return device_notes, error_notes, overlapping
