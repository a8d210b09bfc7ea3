"""Batch mode of ``size``: several drawings (or folders), in parallel worker processes.

Each drawing's outputs go to a folder of their own; one drawing that fails
never stops the others.  A drawing's schedule is ``--circuits`` when given,
else ``<stem>_circuits.csv`` / ``.xlsx`` beside it, else its block attributes.

The drawings run one after the other (``--jobs 1``), in worker processes of this
machine (``--jobs N``) or on a Dask cluster (``--scheduler ADDRESS``: the
optional extra ``cablewright[dask]``): the same per-drawing function in every
case, each drawing's lines for standard error returned with its result and
printed here in the order the drawings were given.  On a cluster the paths must
be the same on every worker (a shared folder).  Each drawing runs with the
collector's thresholds raised and a full collection after it
(:mod:`.collector`), in whichever process it runs.

References
----------
.. [1] Dask.distributed documentation, ``Client`` (``submit``, ``gather``),
   ``LocalCluster``.
"""

from __future__ import annotations

import argparse
import json
import re
import sys
from concurrent.futures import ProcessPoolExecutor
from dataclasses import dataclass
from pathlib import Path
from types import SimpleNamespace

from cablewright.annotate.jsonout import document as outcomes_document
from cablewright.core.errors import CableRouteError, ConfigError, DrawingReadError

from .exits import EXIT_INPUT, exit_code_for, internal_error_line
from .outputs import make_parents
from .size_run import error_lines, issue_lines, settings_from, size_drawing

__all__ = ["expand_drawings", "run_batch", "BatchItem", "BatchSchedulerError", "output_folders"]

SUFFIXES = (".dxf", ".ifc")
#: How long the client waits for the Dask scheduler before giving up [s] (our choice:
#: a scheduler on the network answers in well under a second).
SCHEDULER_TIMEOUT_S = 10.0


class BatchSchedulerError(ConfigError):
    """The Dask scheduler of ``--scheduler`` cannot be used (a setting unusable: exit code 2)."""


@dataclass(frozen=True)
class BatchItem:
    """What one drawing of a batch gave: exit code, a summary line, its JSON document."""

    drawing: str
    exit_code: int
    summary: str
    document: dict | None = None
    lines: tuple[str, ...] = ()


def expand_drawings(paths: list[str]) -> list[Path]:
    """Drawings named, with folders expanded to their ``.dxf``/``.ifc`` files (sorted)."""
    drawings: list[Path] = []
    for text in paths:
        path = Path(text)
        if path.is_dir():
            drawings.extend(sorted(p for p in path.iterdir()
                                   if p.suffix.lower() in SUFFIXES and not p.stem.endswith("_annotated")))
        else:
            drawings.append(path)
    if not drawings:
        raise DrawingReadError(file=', '.join(paths), problem="no .dxf or .ifc drawings found",
                               fix="name a drawing or a folder holding some")
    return drawings


def _schedule_beside(drawing: Path) -> str | None:
    for suffix in (".csv", ".xlsx"):
        candidate = drawing.with_name(f"{drawing.stem}_circuits{suffix}")
        if candidate.exists():
            return str(candidate)
    return None


def _folder_name(drawing: Path) -> str:
    """A folder name from the drawing's stem that stays inside its parent.

    Anything but letters, digits, ``.``, ``_``, ``-`` and spaces becomes ``_``;
    leading dots are dropped (``...dxf`` has the stem ``..``), an empty name
    becomes ``drawing``.

    Examples
    --------
    >>> _folder_name(Path("...dxf")), _folder_name(Path("a/hall b.dxf")), _folder_name(Path(".x.dxf"))
    ('drawing', 'hall b', 'x')
    """
    name = re.sub(r"[^\w. -]", "_", drawing.stem).lstrip(". ").rstrip(". ")
    return name or "drawing"


def output_folders(drawings: list[Path], out: str | None) -> tuple[list[Path], list[str]]:
    """One output folder per drawing, all different, inside ``out`` when given.

    With ``out`` each drawing's folder is ``out/<name>``; without it,
    ``<stem>_cablewright`` beside the drawing.  Where two drawings would share a
    folder (same name in different folders, ``plant.dxf`` and ``plant.ifc``), the
    later ones (in the order given) get ``-2``, ``-3``, ...; each such choice is
    returned as a line for standard error.

    Returns
    -------
    (list of Path, list of str)
        The folders, in the order of ``drawings``, and the lines naming collisions.
    """
    base = Path(out).resolve() if out else None
    taken: dict[str, Path] = {}
    folders, notes = [], []
    for drawing in drawings:
        name = _folder_name(drawing)
        parent = base if base is not None else drawing.resolve().parent
        stem = name if base is not None else f"{name}_cablewright"
        candidate, n = parent / stem, 1
        while str(candidate).casefold() in taken:
            n += 1
            candidate = parent / f"{stem}-{n}"
        if base is not None and candidate.parent != base:  # pragma: no cover - guarded by _folder_name
            raise DrawingReadError(file=drawing, problem=f"its output folder {candidate} would lie outside {base}")
        if n > 1:
            first = taken[str(parent / stem).casefold()]
            notes.append(f"{drawing}: outputs in {candidate}, since {parent / stem} holds those of {first}")
        taken[str(candidate).casefold()] = drawing
        folders.append(candidate)
    return folders, notes


def _one(drawing: str, circuits: str | None, config: str | None, out_dir: str, recover: bool,
         units: str | None = None) -> BatchItem:
    """One drawing of the batch, with the collector tuned, collected after (any process)."""
    from .collector import collect_between, tuned_collector

    try:
        with tuned_collector():
            return _size_one(drawing, circuits, config, out_dir, recover, units)
    finally:
        collect_between()  # this drawing's cyclic garbage, before the next one is read


def _size_one(drawing: str, circuits: str | None, config: str | None, out_dir: str, recover: bool,
              units: str | None) -> BatchItem:
    path = Path(drawing)
    circuits = circuits or _schedule_beside(path)
    try:
        settings = settings_from(config, units)
        run = size_drawing(path, circuits, config, settings, Path(out_dir), recover=recover, quiet=True)
    except CableRouteError as exc:
        return BatchItem(drawing, exit_code_for(exc), f"{drawing}: error: {exc}")
    except Exception as exc:  # a bug in one drawing must not stop the batch
        where = SimpleNamespace(drawing=drawing, circuits=circuits, config=config)
        return BatchItem(drawing, EXIT_INPUT, internal_error_line(exc, where))
    lines = (*issue_lines(run.measurement), *error_lines(run.job.outcomes))
    document = {**outcomes_document(run.job.outcomes, kind="size"), **run.extras}
    statuses = [o.status for o in run.job.outcomes]
    counts = ", ".join(f"{statuses.count(k)} {k}" for k in ("ok", "warning", "fail", "error"))
    return BatchItem(drawing, run.exit_code, f"{drawing}: {len(statuses)} circuits ({counts})", document,
                     lines)


def _on_cluster(address: str, call: list[tuple]) -> list[BatchItem]:
    """``_one`` for every drawing on the Dask cluster at ``address``, results in order.

    Raises :class:`BatchSchedulerError` when ``distributed`` is missing or the
    scheduler cannot be reached.
    """
    try:
        from distributed import Client
    except ImportError as exc:
        raise BatchSchedulerError(f"--scheduler {address}: Dask distributed is not installed; "
                                  "install cablewright[dask] or run without --scheduler") from exc
    try:
        client = Client(address, timeout=SCHEDULER_TIMEOUT_S)
    except (OSError, TimeoutError, ValueError) as exc:
        raise BatchSchedulerError(f"--scheduler {address}: cannot reach the Dask scheduler ({exc}); "
                                  "check the address, or run without --scheduler") from exc
    with client:
        futures = [client.submit(_one, *c, pure=False) for c in call]
        return list(client.gather(futures))


def run_batch(args: argparse.Namespace) -> int:
    """Size every drawing; return the worst exit code of the batch."""
    drawings = expand_drawings([args.drawing, *args.more_drawings])
    jobs = max(1, int(args.jobs or 1))
    folders, notes = output_folders(drawings, args.out)
    for note in notes:
        print(f"cablewright: {note}", file=sys.stderr)
    call = [(str(d), args.circuits, args.config, str(f), args.recover, getattr(args, "units", None))
            for d, f in zip(drawings, folders, strict=True)]
    # the common --out folder made here, before the drawings run side by side: a drawing's run
    # removes the folders it made when it wrote nothing (outputs.output_session), and would
    # take this one from under a neighbour that is about to write into it
    made = make_parents(Path(args.out).resolve()) if args.out else []
    try:
        if getattr(args, "scheduler", None):
            items = _on_cluster(args.scheduler, call)
        elif jobs == 1 or len(drawings) == 1:
            items = [_one(*c) for c in call]
        else:
            with ProcessPoolExecutor(max_workers=min(jobs, len(drawings))) as pool:
                items = list(pool.map(_one, *zip(*call, strict=False)))
    finally:
        for folder in reversed(made):
            try:
                folder.rmdir()  # only when empty: no drawing wrote anything
            except OSError:
                break
    for item in items:
        for line in item.lines:
            print(f"cablewright: {line}", file=sys.stderr)
        print(f"cablewright: {item.summary}", file=sys.stderr)
    if args.json:
        print(json.dumps({"drawings": [{"drawing": i.drawing, "exit_code": i.exit_code,
                                        **(i.document or {"circuits": []})} for i in items]},
                         indent=2, ensure_ascii=False))
    else:
        print(f"{len(items)} drawings; outputs beside each drawing" if not args.out else
              f"{len(items)} drawings; outputs in {args.out}/<drawing name>/")
    return max(item.exit_code for item in items)
