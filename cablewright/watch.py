"""``cablewright size --watch``: run again whenever the drawing or the schedule is saved.

Polls the files' modification times and sizes (no extra dependency, and it
works the same on network drives, where file-system events often do not
arrive).  A change is acted on once the files have stayed the same for one
poll, so a program still saving is not read half-way.  Each run after the
first is compared with the outputs of the last good run (the change report
is printed and written as ``changes.json``); a run whose drawing cannot be
read prints one line and leaves the last good outputs in place (the writers
only rename complete files into the folder, contract.md).
"""

from __future__ import annotations

import argparse
import logging
import sys
import time
from collections.abc import Callable, Sequence
from pathlib import Path

from cablewright.core.errors import CableRouteError

__all__ = ["snapshot", "wait_for_change", "run_watch"]

log = logging.getLogger(__name__)

Snapshot = dict[Path, tuple[int, int] | None]


def snapshot(paths: Sequence[Path]) -> Snapshot:
    """Modification time [ns] and size [bytes] of each file; ``None`` for a missing one."""
    out: Snapshot = {}
    for path in paths:
        try:
            st = path.stat()
        except OSError:
            out[path] = None
        else:
            out[path] = (st.st_mtime_ns, st.st_size)
    return out


def wait_for_change(paths: Sequence[Path], last: Snapshot, poll_s: float = 0.5,
                    timeout_s: float | None = None, sleep: Callable[[float], None] = time.sleep
                    ) -> Snapshot | None:
    """Block until a file differs from ``last`` and then holds still for one poll.

    Returns the new snapshot, or ``None`` when ``timeout_s`` passed first.
    """
    deadline = None if timeout_s is None else time.monotonic() + timeout_s
    while True:
        sleep(poll_s)
        now = snapshot(paths)
        if now != last:
            sleep(poll_s)
            settled = snapshot(paths)
            if settled == now:
                return now
        if deadline is not None and time.monotonic() > deadline:
            return None


def _run_once(args: argparse.Namespace, previous: str | None,
              run_size: Callable[[argparse.Namespace], int]) -> int | None:
    from .collector import collect_between

    run_args = argparse.Namespace(**{**vars(args), "watch": False, "previous": previous})
    try:
        return run_size(run_args)
    except CableRouteError as exc:
        print(f"cablewright: error: {exc}", file=sys.stderr)
        print("cablewright: the last good outputs are kept; save the file again to retry", file=sys.stderr)
        return None
    finally:
        collect_between()  # this run's cyclic garbage, while waiting for the next save


def run_watch(args: argparse.Namespace, run_size: Callable[[argparse.Namespace], int],
              default_out: Callable[[Path], Path]) -> int:
    """Run ``size``, then again on every save of the drawing, schedule or config.

    ``run_size`` and ``default_out`` are ``commands_drawing``'s (passed in, so
    this module imports no command module and there is no import cycle).
    """
    drawing = Path(args.drawing)
    if not args.out:
        args.out = str(default_out(drawing))
    paths = [drawing] + [Path(p) for p in (args.circuits, args.config) if p]
    out_dir = Path(args.out)
    runs, code = 0, 0
    last = snapshot(paths)
    previous = args.previous
    limit = getattr(args, "watch_runs", 0) or 0
    try:
        while True:
            result = _run_once(args, previous, run_size)
            runs += 1
            if result is not None:
                code = result
                previous = str(out_dir)  # the next run is compared with this one
            if limit and runs >= limit:
                return code
            print(f"cablewright: watching {', '.join(p.name for p in paths)} (Ctrl+C ends)", file=sys.stderr)
            sys.stdout.flush()
            changed = wait_for_change(paths, last, args.watch_poll)
            if changed is not None:
                last = changed
    except KeyboardInterrupt:
        print("cablewright: stopped watching", file=sys.stderr)
        return code
