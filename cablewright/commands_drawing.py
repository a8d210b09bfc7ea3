"""``cablewright size``, ``routes`` and ``demo``: the drawing commands."""

from __future__ import annotations

import argparse
import sys
import textwrap
from collections.abc import Iterable
from pathlib import Path

from cablewright.annotate.jsonout import dump_pieces
from cablewright.annotate.model import CircuitOutcome
from cablewright.annotate.rows import length_unit, rows, rule_set_cautions

from .arguments import drawing_arguments
from .config import Settings
from .console import CAUTION, TABLE_WIDTH, format_table
from .outputs import drawing_entry
from .pipeline import measure_drawing, route_outcomes
from .size_run import (
    _circuits_from_attributes,
    _issues,
    _report_errors,
    settings_from,
    size_drawing,
)

__all__ = ["run_size", "run_routes", "run_demo", "settings_for", "SAMPLE_DIR",
           "register_size", "register_routes", "register_demo"]

SAMPLE_DIR = Path(__file__).resolve().parents[1] / "sample_drawings"

#: ``routes`` writes no drawing: it reads with the streaming reader, no document.
ROUTES_KEEPS_DOCUMENT = False
SAMPLE_DRAWING = "pumping_station.dxf"
SAMPLE_CIRCUITS = "pumping_station_circuits.csv"


def settings_for(args: argparse.Namespace) -> Settings:
    """The config file's settings, with ``--units`` (when given) as ``[drawing] units``."""
    return settings_from(args.config, getattr(args, "units", None))


def _extra(measurement) -> dict | None:
    entry = drawing_entry(measurement)
    return {"drawing": entry} if entry else None


def _exit_code(outcomes: list[CircuitOutcome], passing: tuple[str, ...]) -> int:
    return 0 if all(o.status in passing for o in outcomes) else 1


def _failed(check) -> bool:
    result = getattr(check, "result", None)
    if result is not None:
        return str(getattr(result, "value", result)).lower() == "fail"
    return not check.passed


def _reason(outcome: CircuitOutcome) -> str:
    """Why a circuit fails or is in error: the failing checks, else its first message."""
    if outcome.status not in ("fail", "error"):
        return ""
    sizing = outcome.sizing
    failing = [c.name for c in sizing.checks if _failed(c)] if sizing is not None else []
    if failing:
        return ", ".join(failing)
    if not outcome.messages:
        return outcome.status
    first = outcome.messages[0]  # its opening words; the whole message is in the report
    short = first.split(" (")[0].split(": ")[0]
    return short if len(short) <= 40 else short[:39] + "\u2026"


def _unit(settings):
    """Lengths of the terminal tables: the rule set's unit or ``[annotate] length_unit``."""
    return length_unit(settings.sizing.standard, settings.annotate.length_unit)


def _in(unit, length_m: float | None) -> float | None:
    return None if length_m is None else unit.of(length_m)


def _fmt(value, digits: int = 1) -> str:
    return "-" if value is None else f"{value:.{digits}f}"


def run_routes(args: argparse.Namespace) -> int:
    """Measure only: routed length and group count per circuit."""
    settings = settings_for(args)
    measurement = measure_drawing(args.drawing, args.circuits, settings, args.recover,
                                  keep_document=ROUTES_KEEPS_DOCUMENT)
    _circuits_from_attributes(args, measurement)
    outcomes, _ = route_outcomes(measurement)
    _issues(measurement)
    _report_errors(outcomes)
    if args.json:
        _print_json(dump_pieces(outcomes, kind="routes", extra=_extra(measurement)))
    else:
        unit = _unit(settings)
        table = [
            [r.circuit_id, r.from_tag, r.to_tag, _fmt(_in(unit, r.routed_length_m)),
             _fmt(_in(unit, r.design_length_m)),
             str(r.grouping.circuits_in_group) if r.grouping else "-",
             (r.grouping.governing_segment or "-") if r.grouping else "-", r.status]
            for r in rows(outcomes, unit)
        ]
        print(format_table(["circuit", "from", "to", f"routed [{unit.symbol}]", f"design [{unit.symbol}]",
                            "group", "busiest segment", "status"], table))
    return _exit_code(outcomes, ("ok", "warning"))


def _default_out(drawing: Path) -> Path:
    return drawing.with_name(f"{drawing.stem}_cablewright")


def default_out(drawing: Path) -> Path:
    """The output folder when ``--out`` is not given: beside the drawing."""
    return _default_out(drawing)


def _print_json(pieces: Iterable[str]) -> None:
    """The JSON document on stdout piece by piece (a circuit's line at a time), the same
    text as ``print(dumps(...))``: the 15 MB document of 2,000 circuits is never held whole."""
    write = sys.stdout.write
    for piece in pieces:
        write(piece)
    write("\n")


def run_size(args: argparse.Namespace) -> int:
    """The whole job: measure, size, write the annotated DXF, schedule and report."""
    settings = settings_for(args)  # validated before any drawing is read, batch too
    if getattr(args, "more_drawings", None) or Path(args.drawing).is_dir() or getattr(args, "scheduler", None):
        from .batch import run_batch

        return run_batch(args)
    previous = getattr(args, "previous", None)
    out_dir = Path(args.out) if args.out else _default_out(Path(args.drawing))
    run = size_drawing(args.drawing, args.circuits, args.config, settings, out_dir,
                       recover=getattr(args, "recover", False), quiet=args.json, previous=previous)
    job, extras, written, changes = run.job, run.extras, run.written, run.changes
    _issues(run.measurement)
    _report_errors(job.outcomes)
    if args.json:
        _print_json(dump_pieces(job.outcomes, kind="size", extra=extras))
    else:
        unit = _unit(settings)
        table = [
            [r.circuit_id, r.from_tag, r.to_tag, _fmt(_in(unit, r.routed_length_m)),
             _fmt(r.sizing.load_current_a if r.sizing else None),
             f"{r.device_rating_a:g}" if r.device_rating_a else "-",
             r.cable.text if r.cable else "-",
             _fmt(r.sizing.voltage_drop.percent if r.sizing and r.sizing.voltage_drop else None, 2),
             r.status, _reason(o)]
            for r, o in zip(rows(job.outcomes, unit), job.outcomes, strict=True)
        ]
        print(format_table(["circuit", "from", "to", f"route {unit.symbol}", "Ib A", "In A", "cable", "VD %",
                            "status", "reason"], table, min_last=16, keep=(6,)))
        counts = {k: sum(1 for o in job.outcomes if o.status == k) for k in ("ok", "warning", "fail", "error")}
        print(f"\n{len(job.outcomes)} circuits: " + ", ".join(f"{v} {k}" for k, v in counts.items()))
        if changes is not None:
            from .commands_compare import changes_table

            print(f"\nchanges since {previous}:")
            print(changes_table(changes))
        print("outputs:")
        for path in written:
            print(f"  {path}")
        print("\n".join(textwrap.wrap(rule_set_cautions(CAUTION, settings.sizing.standard), TABLE_WIDTH)))
    return run.exit_code


def run_demo(args: argparse.Namespace) -> int:
    """``size`` on the bundled sample drawing."""
    drawing = SAMPLE_DIR / SAMPLE_DRAWING
    circuits = SAMPLE_DIR / SAMPLE_CIRCUITS
    if not drawing.exists():
        from cablewright.core.errors import DrawingReadError

        raise DrawingReadError(file=drawing, problem="the sample drawing is missing",
                               fix="run 'python sample_drawings/generate_pumping_station.py' from the repository")
    out = Path(args.out) if args.out else Path.cwd() / "cablewright-demo"
    size_args = argparse.Namespace(drawing=str(drawing), circuits=str(circuits), config=None,
                                   out=str(out), json=False, debug=args.debug, recover=False)
    code = run_size(size_args)
    print(f"\ndemo outputs are in {out}")
    # A sample with failing circuits on purpose still counts as a successful demo run.
    return 0 if code in (0, 1) else code


def register_size(subparsers: argparse._SubParsersAction) -> None:
    """The ``size`` parser (contract.md, "Commands"); ``--watch`` runs :func:`watch.run_watch`."""
    size = subparsers.add_parser(
        "size", help="the whole job: routes, grouping, sizing, annotated DXF, schedule, report")
    drawing_arguments(size)
    size.add_argument("more_drawings", nargs="*", metavar="DRAWING",
                      help="further drawings or folders: batch mode, each drawing's outputs in its own folder")
    size.add_argument("--out", metavar="DIR", help="output folder (default: beside the drawing)")
    size.add_argument("--jobs", type=int, default=1, metavar="N",
                      help="batch mode: drawings processed in parallel worker processes (default 1)")
    size.add_argument("--scheduler", metavar="ADDRESS",
                      help="batch mode on a Dask cluster: the scheduler's address (e.g. tcp://host:8786); "
                           "needs cablewright[dask] and the paths shared by every worker")
    size.add_argument("--previous", metavar="DIR",
                      help="an earlier output folder: report what changed and write changes.json")
    size.add_argument("--watch", action="store_true",
                      help="run again whenever the drawing or the schedule is saved (Ctrl+C ends)")
    size.add_argument("--watch-poll", type=float, default=0.5, help=argparse.SUPPRESS)
    size.add_argument("--watch-runs", type=int, default=0, help=argparse.SUPPRESS)  # tests: stop after N runs
    size.set_defaults(handler=_size_or_watch)


def _size_or_watch(args: argparse.Namespace) -> int:
    if getattr(args, "watch", False):
        from .watch import run_watch

        return run_watch(args, run_size, default_out)
    return run_size(args)


def register_routes(subparsers: argparse._SubParsersAction) -> None:
    """The ``routes`` parser: measure routed lengths and grouping only."""
    routes = subparsers.add_parser("routes", help="measure routed lengths and grouping only")
    drawing_arguments(routes)
    routes.set_defaults(handler=run_routes)


def register_demo(subparsers: argparse._SubParsersAction) -> None:
    """The ``demo`` parser: ``size`` on the bundled sample drawing."""
    demo = subparsers.add_parser("demo", help="run 'size' on the bundled sample drawing")
    demo.add_argument("--out", metavar="DIR", help="output folder (default: ./cablewright-demo)")
    demo.add_argument("--json", action="store_true", help=argparse.SUPPRESS)
    demo.add_argument("--debug", action="store_true", help="show Python tracebacks")
    demo.set_defaults(handler=run_demo)
