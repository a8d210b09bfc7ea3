"""A batch sizing core for the IEC rule set: circuits as columns, every step an array formula.

The per-circuit engine (:func:`cablewright.sizing.select.size_circuit`) stays the
reference.  :func:`size_columns` sizes many circuits at once with the same tables
(imported from the engine's modules, never copied) and the same formulas, each
written over numpy arrays: one row per circuit, one column per standard
cross-section (IEC 60364-5-52:2009 Annex B).  Circuits whose inputs the core
does not cover (:data:`.columns.DECLINE_REASONS`) are declined, counted, and
sized by the engine; :func:`.records.record_for` builds the engine's full
:class:`~cablewright.sizing.model.SizingResult` of one circuit on demand from
the batch's choice.
"""

from __future__ import annotations

from .columns import DECLINE_REASONS, CircuitColumns, columns_from_specs
from .core import BatchResult, size_columns
from .records import BatchRound, record_for, size_specs

__all__ = [
    "DECLINE_REASONS",
    "CircuitColumns",
    "columns_from_specs",
    "BatchResult",
    "size_columns",
    "BatchRound",
    "record_for",
    "size_specs",
]
