"""What the annotate stage receives: one outcome per circuit, joined by the pipeline."""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from cablewright.sizing.model import STATUS_ORDER, SizingResult

if TYPE_CHECKING:
    from cablewright.extract.grouping import GroupInfo
    from cablewright.extract.model import CircuitRoute

__all__ = ["CircuitOutcome", "worst_status"]


@dataclass(frozen=True)
class CircuitOutcome:
    """A circuit's route, grouping and sizing, as the outputs show it.

    Attributes
    ----------
    circuit_id, from_tag, to_tag : str
    status : str
        ``ok``, ``warning``, ``fail`` or ``error`` (contract.md).
    messages : tuple of str
        One line each, for the user.
    route : cablewright.extract.model.CircuitRoute or None
        ``None`` for ``calc`` and for a circuit that could not be routed.
    group : cablewright.extract.grouping.GroupInfo or None
        Circuits and cables per segment along the route.
    sizing : SizingResult or None
        ``None`` for ``routes`` and when the circuit never reached sizing.
    """

    circuit_id: str
    from_tag: str
    to_tag: str
    status: str
    messages: tuple[str, ...] = ()
    route: CircuitRoute | None = None
    group: GroupInfo | None = None
    sizing: SizingResult | None = None


def worst_status(statuses: list[str] | tuple[str, ...]) -> str:
    """The most severe of ``statuses`` (``ok`` for none)."""
    worst = 0
    for status in statuses:
        worst = max(worst, STATUS_ORDER.index(status))
    return STATUS_ORDER[worst]
