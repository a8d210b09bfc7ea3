"""Each drawing of a batch runs with the collector's thresholds raised and is collected after,
in whichever process runs it (a worker started by spawn, forkserver or a Dask cluster starts
with CPython's default thresholds; Python docs, ``gc.get_threshold``)."""

from __future__ import annotations

import gc

from cablewright.core.errors import DrawingReadError

from cablewright import batch, collector
from cablewright.collector import RUN_THRESHOLDS


def test_one_drawing_runs_tuned_and_is_collected_after(monkeypatch, tmp_path):
    seen, collected = [], []

    def fake_size(*args, **kwargs):
        seen.append(gc.get_threshold())
        raise DrawingReadError("x.dxf: cannot read the drawing")

    monkeypatch.setattr(batch, "size_drawing", fake_size)
    monkeypatch.setattr(collector, "collect_between", lambda: collected.append(gc.collect()) or 0)
    before = gc.get_threshold()
    assert before != RUN_THRESHOLDS  # outside any run, as a fresh worker process
    item = batch._one(str(tmp_path / "x.dxf"), None, None, str(tmp_path / "out"), False)
    assert item.exit_code == 2 and "cannot read" in item.summary
    assert seen == [RUN_THRESHOLDS]
    assert len(collected) == 1
    assert gc.get_threshold() == before  # restored after the drawing


class _Node:
    def __init__(self) -> None:
        self.other: _Node | None = None


def _cycle():
    import weakref

    a, b = _Node(), _Node()
    a.other, b.other = b, a  # freed only by the cyclic collector (Python docs, ``gc``)
    return weakref.ref(a)


def test_release_frees_cyclic_garbage_inside_a_run_only():
    gc.disable()  # no automatic pass may free the cycle first
    try:
        outside = _cycle()
        assert collector.release() == 0 and outside() is not None  # not in a run: nothing done
        with collector.tuned_collector():
            gc.disable()
            inside = _cycle()
            assert inside() is not None
            assert collector.release() >= 2  # the two nodes of the cycle at least
            assert inside() is None
    finally:
        gc.enable()
        gc.collect()
