"""Records on demand: the engine's :class:`~cablewright.sizing.model.SizingResult` of one
circuit at the cable the batch core chose, and the batch entry point over specs."""

from __future__ import annotations

from collections.abc import Mapping, Sequence

from cablewright.core.errors import CableRouteError

from .. import select as engine_select
from ..config import SizingConfig
from ..model import CircuitSpec, SizingResult
from ..select import size_circuit
from .columns import columns_from_specs
from .core import BatchResult, size_columns

__all__ = ["BatchRound", "record_for", "size_specs"]


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
        return engine_select._size(spec, config, result.choice(i))
    except CableRouteError as exc:
        return SizingResult(spec.circuit_id, "error", (str(exc),), spec=spec)


def size_specs(specs: Sequence[CircuitSpec], config: SizingConfig | None = None
               ) -> tuple[BatchResult, list[int]]:
    """Size ``specs`` with the batch core: the compact result and the indices declined
    to the per-circuit engine (:data:`.columns.DECLINE_REASONS`)."""
    config = config or SizingConfig()
    result = size_columns(columns_from_specs(specs, config), config)
    return result, [int(i) for i in result.declined.nonzero()[0]]


class BatchRound:
    """One grouping round of the pipeline sized by the batch core.

    The rounds need only each circuit's parallel count and whether it is lightly
    loaded (Ib against Iz); the full records are built once, for the last round
    (:meth:`records`), by the engine's own code at the batch's choice.  Circuits the
    core declines are sized by the engine (:func:`.select.size_circuit`) at once.
    """

    def __init__(self, specs: Mapping[str, CircuitSpec], config: SizingConfig) -> None:
        self.config = config
        self.ids = list(specs)
        self.specs = list(specs.values())
        self.result, declined = size_specs(self.specs, config)
        self.engine = {i: size_circuit(self.specs[i], config) for i in declined}

    def parallel_counts(self, before: Mapping[str, int]) -> dict[str, int]:
        """Parallel cables per circuit; ``before``'s count where no cable was chosen."""
        counts = self.result.parallel.tolist()
        out = {}
        for i, cid in enumerate(self.ids):
            record = self.engine.get(i)
            if record is None:
                out[cid] = counts[i]
            else:
                out[cid] = record.cable.parallel if record.cable else before[cid]
        return out

    def lightly_loaded(self, fraction: float) -> set[str]:
        """Circuits with Ib <= ``fraction`` x Iz (the pipeline's 30 % rule, 523.5)."""
        light = (self.result.arrays.ib <= fraction * self.result.iz_a).tolist()
        out = set()
        for i, cid in enumerate(self.ids):
            record = self.engine.get(i)
            if record is None:
                if light[i]:
                    out.add(cid)
            elif (record.cable is not None and record.load_current_a is not None
                  and record.load_current_a <= fraction * record.cable.capacity_a):
                out.add(cid)
        return out

    def records(self) -> dict[str, SizingResult]:
        """Every circuit's :class:`~cablewright.sizing.model.SizingResult`, the engine's."""
        return {cid: self.engine.get(i) or record_for(self.specs[i], self.result, i, self.config)
                for i, cid in enumerate(self.ids)}
