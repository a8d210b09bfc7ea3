"""The cyclic garbage collector during a run: its thresholds raised, restored after.

A drawing read and written through ezdxf makes millions of small container
objects that live until the end of the run.  With CPython's default thresholds
(700, 10, 10) the collector walks them again and again as they pile up in the
older generations: measured at 22-25 % of the CPU of a ``size`` run and much
of its growth faster than the drawing (benchmarks/RESULTS.md).  During a run
the objects made by the imports are frozen (``gc.freeze``: never scanned) and
the first threshold is raised, so a collection runs after every
:data:`RUN_THRESHOLD0` new container objects instead of 700; the cyclic
garbage of a run is still collected, just less often.  Batch mode collects
between drawings (:func:`collect_between`).

References
----------
.. [1] Python documentation, ``gc`` module: ``set_threshold``, ``freeze``,
   ``unfreeze``, ``collect`` (Python 3.11).
"""

from __future__ import annotations

import gc
from collections.abc import Iterator
from contextlib import contextmanager

__all__ = ["RUN_THRESHOLDS", "tuned_collector", "collect_between", "release", "settle"]

#: Collector thresholds during a run (generation 0, 1, 2), set from the figures
#: in benchmarks/RESULTS.md (our own choice: large enough that the collector is
#: a few per cent of a run, small enough that cyclic garbage does not pile up).
RUN_THRESHOLDS = (100_000, 50, 100)

_depth = 0


@contextmanager
def tuned_collector(thresholds: tuple[int, int, int] | None = RUN_THRESHOLDS) -> Iterator[None]:
    """Freeze the objects alive now and raise the collector's thresholds; restore both after.

    Parameters
    ----------
    thresholds : (int, int, int) or None
        ``gc.set_threshold`` values during the block; ``None`` leaves the
        collector as it is (the "before" of the benchmarks).

    Notes
    -----
    Re-entrant: only the outermost block changes and restores the collector.
    """
    global _depth
    if thresholds is None or _depth:
        _depth += 1
        try:
            yield
        finally:
            _depth -= 1
        return
    old = gc.get_threshold()
    _depth += 1
    gc.freeze()
    gc.set_threshold(*thresholds)
    try:
        yield
    finally:
        _depth -= 1
        gc.set_threshold(*old)
        gc.unfreeze()


def collect_between() -> int:
    """A full collection (between the drawings of a batch); returns what it found unreachable."""
    return gc.collect()


def settle() -> bool:
    """Inside a tuned run, freeze what is alive now (after a stage whose results live to the
    end of the run: the measurement, the sized job), after collecting the young garbage, so
    the collector never walks those objects again; True when it froze.  Outside a run (a
    library call, a test) it does nothing.  The run's end unfreezes them
    (:func:`tuned_collector`); batch mode collects between drawings as before."""
    if not _depth:
        return False
    gc.collect(1)
    gc.freeze()
    return True


def release() -> int:
    """Inside a tuned run, a full collection now (a stage's large cyclic garbage, such as a
    drawing document no longer used, freed before the next stage's peak instead of at the
    collector's next oldest-generation pass, which the raised thresholds make rare);
    returns what it found unreachable, 0 outside a run (where it does nothing)."""
    if not _depth:
        return 0
    return gc.collect()
