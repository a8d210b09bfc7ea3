"""What the drawing is annotated with: the circuits, the route network and the equipment."""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import Any

from ..model import CircuitOutcome

__all__ = ["AnnotationInput"]


@dataclass(frozen=True)
class AnnotationInput:
    """The results and the network the marks are written for (all in metres, world).

    Attributes
    ----------
    outcomes : sequence of CircuitOutcome
        Every circuit; those with a cable get a label, ``error`` ones a note.
    segments : mapping
        Segment id -> RouteSegment (``points_m`` in metres, world).
    per_segment : mapping
        Segment id -> circuit ids routed through it.
    equipment : mapping
        Tag -> Equipment (``position_m`` in metres, world).
    units_per_m : float
        Drawing units per metre (1000 for a drawing in mm) [1/m].
    changed : frozenset of str
        Circuits new or changed since the run compared with (``size --previous``,
        :func:`cablewright.annotate.revision.changed_circuit_ids`): their labels
        get a revision mark.
    revision : str
        Written in each revision mark ("" writes ``R``).
    fill_marks : tuple of FillMark
        Segments whose fill is above its limit
        (:func:`cablewright.annotate.revision.fill_marks`): a note at each.

    Raises
    ------
    ValueError
        When ``units_per_m`` is not > 0.
    """

    outcomes: Sequence[CircuitOutcome]
    segments: Mapping[str, Any]
    per_segment: Mapping[str, Sequence[str]]
    equipment: Mapping[str, Any]
    units_per_m: float
    changed: frozenset[str] = frozenset()
    revision: str = ""
    fill_marks: tuple[Any, ...] = ()

    def __post_init__(self) -> None:
        if not self.units_per_m > 0.0:
            raise ValueError(f"units_per_m must be > 0, got {self.units_per_m!r}")
