"""Repair rounds: the marks that needed a last resort are placed first in a new round.

Placement is greedy: each mark takes the best spot left by the marks before it, so a
segment id or a note placed late can find every spot near it taken by a cable label that
had other places to go (issue 12: the switchroom tray's ids under a feeder's label).
After a round, every mark placed by a last resort (crossing a line, beyond reach,
overlapping), written as its key (:mod:`.note_keys`) or with a leader longer than
:data:`LONG_LEADER_H` is put on a list; a new
round on a fresh index places the listed marks first, each kind in the usual order, then
every other mark as before; a group tag listed so is written without the fill lines it
carried (:mod:`.group_fill`), which get notes of their own.  The round with the fewest
cable labels left to a last resort, then the fewest such marks, then keys, is kept (the earlier
one on a tie) and the other round's entities are deleted, so a round never makes the
drawing worse.  Our own rule (no standard covers where a drawing's notes go).
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:  # the index imports the placing modules' helpers; only its type here
    from .mark_index import LabelIndex

__all__ = ["LONG_LEADER_H", "REPAIR_ROUNDS", "MarkRound", "no_repair_rounds", "place_in_rounds"]

#: A leader longer than this [text heights] sends its mark to the next round: 10 h is
#: 25 mm at a 2.5 mm lettering, about as far as a reader follows a leader on a plot
#: (our own choice).
LONG_LEADER_H = 10.0
#: New rounds at most after the first (each places every mark again; our own choice:
#: on the sample the list stops growing after the fourth).
REPAIR_ROUNDS = 4
#: Rounds are run only while at most this many marks are on the list, and only on a
#: drawing of at most :data:`REPAIR_MAX_PLACED` marks: each round costs a whole placement,
#: so a large or crowded drawing keeps its first round (our own choice, by counts so that
#: a re-run gives the same drawing; the last resorts are reported either way).
REPAIR_MAX_MARKS = 40
REPAIR_MAX_PLACED = 1000


def no_repair_rounds(marks: Any) -> bool:
    """True when a drawing surely gets no repair rounds: its circuits and segments alone
    (``marks.outcomes``, ``marks.segments``: a label and an id each, about) are more than
    :data:`REPAIR_MAX_PLACED` marks, so the order of the first round is all it gets
    (:mod:`.segment_ids`)."""
    return len(marks.outcomes) + len(marks.segments) > REPAIR_MAX_PLACED


#: The marks under the strict rule (issue 12): a round that leaves one of them to a last
#: resort is never kept over one that does not.
LABEL_KIND = "cable-label"

MarkKey = tuple[str, str]  # (kind, ref), as the marks' XDATA: ("segment-id", "S29")


@dataclass
class MarkRound:
    """Which marks a placing call places, and which of them needed a last resort.

    ``early`` True: only the marks on ``first``; False: only those not on it.  ``number``
    counts the rounds from 0; warnings are given in round 0's main pass only.
    """

    first: frozenset[MarkKey] = frozenset()
    early: bool = False
    failed: list[MarkKey] = field(default_factory=list)
    number: int = 0

    @property
    def reports(self) -> bool:
        """True for the one pass whose warnings are given (round 0, after the early marks)."""
        return self.number == 0 and not self.early

    def wants(self, kind: str, ref: str) -> bool:
        """True when the mark ``(kind, ref)`` is placed by this call."""
        return ((kind, ref) in self.first) == self.early

    def split(self, kind: str, ref: str) -> bool:
        """True when a mark that carries others' lines (a group tag and its fill lines) needed
        a last resort in an earlier round: this round writes those lines apart."""
        return (kind, ref) in self.first

    def begin(self, index: LabelIndex) -> tuple[int, int]:
        """Before one mark: the counts of last resorts and keyed notes so far (for
        :meth:`done`)."""
        index.stats.last_leader_h = 0.0
        return index.stats.fallbacks, len(index.stats.keyed_notes)

    def done(self, index: LabelIndex, kind: str, ref: str, before: tuple[int, int]) -> None:
        """After one mark: list it when it needed a last resort, its key (:mod:`.note_keys`)
        or a long leader."""
        stats = index.stats
        last_resort = stats.fallbacks > before[0]
        if last_resort:
            stats.last_resort_marks.append(f"{kind} {ref}")
        if (last_resort or len(stats.keyed_notes) > before[1]
                or stats.last_leader_h > LONG_LEADER_H):
            self.failed.append((kind, ref))


@dataclass
class _Round:
    score: tuple[int, int, int, int]
    result: Any
    index: LabelIndex
    added: list[Any]


#: ``place_all(index, select, first_round)``: one pass placing the marks ``select`` wants,
#: a tuple of counts and lists (two passes' tuples are added item by item).
PlaceAll = Callable[["LabelIndex", MarkRound, bool], tuple[Any, ...]]


def place_in_rounds(w: Any, make_index: Callable[[], LabelIndex], place_all: PlaceAll
                    ) -> tuple[Any, LabelIndex]:
    """Run ``place_all(index, select, first_round)`` in rounds (module docstring); the kept
    round's result and index.  ``w`` is the recording pen: ``w.added`` holds the
    entities each round added, and the rounds not kept are deleted from its modelspace."""
    first: frozenset[MarkKey] = frozenset()
    best: _Round | None = None
    for n in range(REPAIR_ROUNDS + 1):
        w.added = []
        index = make_index()
        failed: list[MarkKey] = []
        result = None
        for early in (True, False) if first else (False,):
            select = MarkRound(first, early, failed, n)
            part = place_all(index, select, n == 0)
            result = part if result is None else tuple(a + b for a, b in zip(result, part, strict=True))
        this = _Round(_score(index, failed), result, index, w.added)
        if best is None or this.score < best.score:
            if best is not None:
                _delete(w, best.added)
            best = this
        else:
            _delete(w, this.added)
        grown = first | frozenset(failed)
        if (not failed or len(grown) > REPAIR_MAX_MARKS or grown == first
                or len(index) > REPAIR_MAX_PLACED):
            break
        first = grown
    assert best is not None
    w.added = best.added
    return best.result, best.index


def _score(index: LabelIndex, failed: Sequence[MarkKey]) -> tuple[int, int, int, int]:
    """A round's score, lower is better: cable labels left to a last resort (the strict rule
    of issue 12 comes first), then all last resorts, then notes written as keys, then long
    leaders."""
    stats = index.stats
    labels = sum(1 for name in stats.last_resort_marks if name.startswith(LABEL_KIND + " "))
    keyed = len(stats.keyed_notes)
    return (labels, stats.fallbacks, keyed, len(failed) - stats.fallbacks - keyed)


def _delete(w: Any, entities: Sequence[Any]) -> None:
    """Delete a round's entities from the document (one purge of the modelspace)."""
    db = w.doc.entitydb
    for e in entities:
        db.delete_entity(e)
    w.msp.purge()
