"""Keyed notes: a note that finds no clear spot in full is written as a short key there.

Drafting practice (common practice on drawings, no standard of ours): where a note will
not fit beside what it describes, a short key is written there and the note itself in a
list of keyed notes beside the drawing.  Here a group tag, a device note or a fill note
that finds no spot clear of the drawing's lines, texts and our marks within reach is
tried again as its key (``[3]``, a box of a few letters, with the same leader rules);
when the key fits, the full note goes to the list, written with the schedule (its lines
on the note's own layer and with its own kind and reference in XDATA, so a script
reading device notes finds it there).  Only when the key does not fit either is the note
placed by a last resort (counted and reported, :mod:`.placement_stats`).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from ezdxf.enums import TextEntityAlignment

from .entities import EntityWriter, Mark
from .placement import Placement
from .style import LINE_PITCH, TITLE_GAP_H

if TYPE_CHECKING:  # the index imports the placing modules' helpers; only its type here
    from .mark_index import LabelIndex

__all__ = ["KEYED_TITLE", "KeyedNote", "key_box", "key_text", "keyed_notes_list", "write_key"]

#: Heading of the list of keyed notes on the drawing.
KEYED_TITLE = "KEYED NOTES (see [n] on the drawing)"


def key_text(number: int) -> str:
    """The key written on the drawing for keyed note ``number``.

    >>> key_text(3)
    '[3]'
    """
    return f"[{number}]"


@dataclass(frozen=True)
class KeyedNote:
    """A note written as a key on the drawing: its number and its blocks of lines, each
    with the mark it carries (a group tag's lines, then its fill lines on the fill layer)."""

    number: int
    blocks: tuple[tuple[Mark, tuple[str, ...]], ...]

    @property
    def name(self) -> str:
        """``"kind ref"`` of the note (as the last resorts are named)."""
        mark = self.blocks[0][0]
        return f"{mark.kind} {mark.ref}"


def key_box(w: EntityWriter, index: LabelIndex) -> tuple[float, float]:
    """The box of the next key to be placed (its number: the keyed notes so far + 1)."""
    return w.block_box([key_text(len(index.stats.keyed_notes) + 1)])


def write_key(w: EntityWriter, index: LabelIndex, place: Placement,
              blocks: Sequence[tuple[Mark, Sequence[str]]]) -> list[Any]:
    """Write the next key at ``place`` (kind ``<note kind>-key``, the note's reference) and
    keep the note's blocks for the list; the key's entities."""
    note = KeyedNote(len(index.stats.keyed_notes) + 1,
                     tuple((mark, tuple(lines)) for mark, lines in blocks))
    index.stats.keyed_notes.append(note)
    mark = note.blocks[0][0]
    return w.block([key_text(note.number)], place, Mark(mark.role, f"{mark.kind}-key", mark.ref))


def keyed_notes_list(w: EntityWriter, notes: Sequence[KeyedNote], x0: float, y_top: float,
                     z: float) -> float:
    """The heading and every keyed note, top left at (x0, y_top): the key in a column of
    its own, the note's lines beside it; returns the y below the list [drawing units]."""
    h = w.height
    if not notes:
        return y_top
    w.text(KEYED_TITLE, (x0, y_top - h, z), Mark("schedule", "schedule", "keyed notes"),
           align=TextEntityAlignment.BOTTOM_LEFT)
    key_w = max(w.text_width(key_text(n.number)) for n in notes) + h
    y = y_top - h - TITLE_GAP_H * h
    for note in notes:
        w.text(key_text(note.number), (x0, y - 0.5 * LINE_PITCH * h, z),
               Mark("schedule", "schedule", f"key {note.number}"),
               align=TextEntityAlignment.MIDDLE_LEFT)
        for mark, lines in note.blocks:
            if not lines:
                continue
            bw, bh = w.block_box(lines)
            place = Placement(x0 + key_w + bw / 2.0, y - bh / 2.0, z, 0.0, bw, bh,
                              None, False)  # type: ignore[arg-type]
            w.block(lines, place, mark, left=True)
            y -= bh
        y -= 0.25 * h
    return y
