"""How the marks were placed: counts for the summary and ``schedule.json`` (issue 12)."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from .note_keys import KeyedNote

__all__ = ["PlacementStats"]


@dataclass
class PlacementStats:
    """How the marks were placed (counts), for the summary and ``schedule.json``.

    Attributes
    ----------
    beside : int
        Marks beside their own route or point, clear of everything, no leader.
    with_leader : int
        Marks clear of everything, tied to their route or point by a leader.
    crossing_linework : int
        Last resort 1: no spot clear of the drawing's lines within reach; placed clear
        of every text and mark but crossing a line.
    beyond_reach : int
        Last resort 2: clear of everything only beyond the leader bound; placed there
        with a longer leader.
    overlapping : int
        Last resort 3: not even that; placed beside the route, overlapping.
    longest_leader_h : float
        Longest leader drawn [text heights].
    last_leader_h : float
        The latest leader's length [text heights] (reset per mark by the repair rounds,
        :mod:`.mark_rounds`).
    last_resort_marks : list of str
        The marks placed by a last resort, as ``"kind ref"`` (``"fill-mark S5"``), so the
        reader knows which to look at on the drawing.
    keyed_notes : list of KeyedNote
        Notes written as a key on the drawing and in full in the keyed notes list
        (:mod:`.note_keys`), numbered in the order they were placed.
    """

    beside: int = 0
    with_leader: int = 0
    crossing_linework: int = 0
    beyond_reach: int = 0
    overlapping: int = 0
    longest_leader_h: float = 0.0
    last_leader_h: float = 0.0
    last_resort_marks: list[str] = field(default_factory=list)
    kinds: dict[str, int] = field(default_factory=dict)
    keyed_notes: list[KeyedNote] = field(default_factory=list)

    def leader(self, length: float, text_height: float) -> None:
        """Record a leader of ``length`` [drawing units]."""
        if text_height > 0.0:
            self.last_leader_h = length / text_height
            self.longest_leader_h = max(self.longest_leader_h, self.last_leader_h)

    @property
    def fallbacks(self) -> int:
        """Marks placed by a last resort (crossing a line, beyond reach, overlapping)."""
        return self.crossing_linework + self.beyond_reach + self.overlapping

    def as_dict(self) -> dict[str, float | int | list[str]]:
        """The counts as plain numbers, and the last-resort marks by name (JSON)."""
        return {
            "beside": self.beside,
            "with_leader": self.with_leader,
            "fallback_crossing_linework": self.crossing_linework,
            "fallback_beyond_reach": self.beyond_reach,
            "fallback_overlapping": self.overlapping,
            "longest_leader_h": round(self.longest_leader_h, 2),
            "last_resort_marks": sorted(self.last_resort_marks),
            "keyed_notes": len(self.keyed_notes),
            "keyed_marks": [n.name for n in self.keyed_notes],
        }
