"""Records on demand: the engine's :class:`~cablewright.sizing.model.SizingResult` of one
circuit at the cable the batch core chose, and the batch entry point over specs."""

from __future__ import annotations

from collections.abc import Sequence

from cablewright.core.errors import CableRouteError

from ..config import SizingConfig
from ..model import CircuitSpec, SizingResult
from ..select import _size, size_circuit
from .columns import columns_from_specs
from .core import BatchResult, size_columns

__all__ = ["record_for", "size_specs"]


def record_for(spec: CircuitSpec, result: BatchResult, i: int,
               config: SizingConfig | None = None) -> SizingResult:
    """The engine's record of circuit ``i``: built at the batch's choice, or by the
    engine itself (:func:`.select.size_circuit`) where the batch declined it.

    The record's texts, factors and extras are made by the engine's own code
    (:func:`.select._size` given the choice), so a writer sees exactly what the
    per-circuit engine would have given it.
    """
    config = config or SizingConfig()
    if result.declined[i]:
        return size_circuit(spec, config)
    try:
        return _size(spec, config, result.choice(i))
    except CableRouteError as exc:
        return SizingResult(spec.circuit_id, "error", (str(exc),), spec=spec)


def size_specs(specs: Sequence[CircuitSpec], config: SizingConfig | None = None
               ) -> tuple[BatchResult, list[int]]:
    """Size ``specs`` with the batch core: the compact result and the indices declined
    to the per-circuit engine (:data:`.columns.DECLINE_REASONS`)."""
    config = config or SizingConfig()
    result = size_columns(columns_from_specs(specs, config), config)
    return result, [int(i) for i in result.declined.nonzero()[0]]
