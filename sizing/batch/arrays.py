"""The array types of the batch core: one row per circuit (numpy's own annotations)."""

from __future__ import annotations

from typing import TypeAlias

import numpy as np
import numpy.typing as npt

__all__ = ["BoolArray", "FloatArray", "IndexArray", "IntArray"]

#: Quantities with units (A, V, m, Ω, mm², °C) and factors.
FloatArray: TypeAlias = npt.NDArray[np.float64]
#: Codes (indices into the name tuples of :class:`.columns.CircuitColumns`) and counts.
IntArray: TypeAlias = npt.NDArray[np.int64]
#: Row numbers and indices as numpy's index functions give them (``flatnonzero``).
IndexArray: TypeAlias = npt.NDArray[np.intp]
#: Flags and masks.
BoolArray: TypeAlias = npt.NDArray[np.bool_]
