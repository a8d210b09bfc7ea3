"""Our marks placed so far in shapely trees: a large tree rebuilt seldom, a small one often.

The mark index (:mod:`.mark_index`) tests candidate spots against the marks placed up to
its last rebuild in bulk (``STRtree.query``), and against the few placed since through a
grid.  One tree of every mark, rebuilt every :data:`.mark_index.REBUILD_AFTER` marks,
costs a time growing with the square of the marks (about 4 s of the 8,000-circuit
plant's marks, benchmarks/RESULTS.md).  Here the same marks are held by two trees: the
large one, and a small one of the marks since the large one was built, rebuilt at every
rebuild; the small one is merged into the large one when it would hold more than
:data:`MERGE_SHARE` of it.  Each mark is then put in a large tree a few times in all and
in a small one a few dozen.  The two hold exactly the marks the one tree held, at the
same moments, so a query of both refuses the same spots.

References
----------
.. [1] shapely 2 manual, ``STRtree`` (built once, queried in bulk).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np
import shapely

__all__ = ["MERGE_SHARE", "MarkLevel", "MarkTrees"]

#: The small tree is merged into the large one when it would hold more than this share of
#: it (our own choice: each mark then goes into a large tree about 1 / MERGE_SHARE + 1
#: times, and the small tree stays a few times smaller than the large one).
MERGE_SHARE = 0.25


@dataclass(frozen=True)
class MarkLevel:
    """A tree of our marks number ``start:stop`` (boxes and leaders in the order placed),
    and each one's box number (-1 for a leader)."""

    tree: shapely.STRtree
    box_of: np.ndarray
    start: int
    stop: int


class _Grown:
    """An array appended to one item at a time (its capacity doubled when full), so a
    tree is built from a slice of it without converting a list."""

    def __init__(self, dtype: Any) -> None:
        self._data = np.empty(64, dtype=dtype)
        self.n = 0

    def append(self, item: Any) -> None:
        if self.n == len(self._data):
            self._data = np.concatenate([self._data, np.empty_like(self._data)])
        self._data[self.n] = item
        self.n += 1

    def view(self, start: int, stop: int) -> np.ndarray:
        return self._data[start:stop]


class MarkTrees:
    """Our marks as geometries in the order placed, and the trees of those up to the last
    rebuild (:attr:`levels`: the large tree, then the small one when there is one).

    Parameters
    ----------
    rebuild_after : int
        Marks added since the last rebuild before the next one.
    """

    def __init__(self, rebuild_after: int) -> None:
        self.rebuild_after = rebuild_after
        self._geoms = _Grown(object)
        self._box_of = _Grown(np.int64)
        self.levels: list[MarkLevel] = []

    def __len__(self) -> int:
        return self._geoms.n

    def add(self, geom: Any, box: int) -> None:
        """Record a mark's geometry and its box number (-1 for a leader)."""
        self._geoms.append(geom)
        self._box_of.append(box)

    def rebuild(self) -> bool:
        """Rebuild when :attr:`rebuild_after` marks were added since the last rebuild: the
        small tree, or both merged into the large one; True when it rebuilt."""
        n = self._geoms.n
        if n - (self.levels[-1].stop if self.levels else 0) < self.rebuild_after:
            return False
        large = self.levels[0] if self.levels else None
        if large is None or n - large.stop > MERGE_SHARE * large.stop:
            self.levels = [self._level(0, n)]
        else:
            self.levels = [large, self._level(large.stop, n)]
        return True

    def _level(self, start: int, stop: int) -> MarkLevel:
        return MarkLevel(shapely.STRtree(self._geoms.view(start, stop)),
                         self._box_of.view(start, stop).copy(), start, stop)
