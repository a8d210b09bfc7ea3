"""``cablewright size``, ``routes`` and ``demo``: the drawing commands."""

from __future__ import annotations

import argparse
import sys
import textwrap
from collections.abc import Callable
from contextlib import contextmanager
from pathlib import Path

from cablewright.annotate.jsonout import dumps
from cablewright.annotate.model import CircuitOutcome

from .config import load_settings
from .console import CAUTION, TABLE_WIDTH, format_table
from .outputs import drawing_entry, job_document, job_takeoff, output_session, write_outputs
from .pipeline import measure_drawing, route_outcomes, size_measurement

__all__ = ["run_size", "run_routes", "run_demo", "settings_for", "SAMPLE_DIR"]

SAMPLE_DIR = Path(__file__).resolve().parents[1] / "sample_drawings"
SAMPLE_DRAWING = "pumping_station.dxf"
SAMPLE_CIRCUITS = "pumping_station_circuits.csv"


@contextmanager
def _progress(total: int, quiet: bool, label: str):
    """A tqdm bar on a terminal (stderr), nothing when quiet or not a terminal."""
    if quiet or total < 1 or not sys.stderr.isatty():
        yield None
        return
    from tqdm import tqdm

    with tqdm(total=total, desc=label, unit="circuit", file=sys.stderr, leave=False) as bar:
        yield bar.update


@contextmanager
def _stages(quiet: bool):
    """A stage bar on a terminal (stderr): which step of the job is running."""
    if quiet or not sys.stderr.isatty():
        yield lambda label: None
        return
    from tqdm import tqdm

    with tqdm(total=3, file=sys.stderr, leave=False, bar_format="{desc} [{n_fmt}/{total_fmt}, {elapsed}]") as bar:
        started = False

        def stage(label: str) -> None:
            nonlocal started
            if started:
                bar.update(1)
            started = True
            bar.set_description_str(label)

        yield stage


def settings_for(args: argparse.Namespace):
    """The config file's settings, with ``--units`` (when given) as ``[drawing] units``."""
    from dataclasses import replace

    settings = load_settings(args.config)
    units = getattr(args, "units", None)
    if units:
        settings = replace(settings, drawing=replace(settings.drawing, units=units))
    return settings


def _extra(measurement) -> dict | None:
    entry = drawing_entry(measurement)
    return {"drawing": entry} if entry else None


def _exit_code(outcomes: list[CircuitOutcome], passing: tuple[str, ...]) -> int:
    return 0 if all(o.status in passing for o in outcomes) else 1


def _report_errors(outcomes: list[CircuitOutcome]) -> None:
    for outcome in outcomes:
        if outcome.status == "error":
            for message in outcome.messages:
                print(f"cablewright: circuit {outcome.circuit_id}: {message}", file=sys.stderr)


def _issues(measurement) -> None:
    for issue in measurement.issues:
        where = f" [{issue.source_id}]" if issue.source_id else ""
        print(f"cablewright: warning: {issue.message}{where}", file=sys.stderr)


def _circuits_from_attributes(args: argparse.Namespace, measurement) -> None:
    """Say on stderr when the circuits come from the drawing, not from a schedule."""
    if args.circuits is None:
        print(f"cablewright: no --circuits schedule given: {len(measurement.rows)} circuits read "
              f"from the equipment attributes of {Path(args.drawing).name}", file=sys.stderr)


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


def _fmt(value, digits: int = 1) -> str:
    return "-" if value is None else f"{value:.{digits}f}"


def run_routes(args: argparse.Namespace) -> int:
    """Measure only: routed length and group count per circuit."""
    settings = settings_for(args)
    measurement = measure_drawing(args.drawing, args.circuits, settings, args.recover)
    _circuits_from_attributes(args, measurement)
    outcomes, _ = route_outcomes(measurement)
    _issues(measurement)
    _report_errors(outcomes)
    if args.json:
        print(dumps(outcomes, kind="routes", extra=_extra(measurement)))
    else:
        rows = []
        for o in outcomes:
            route, group = o.route, o.group
            busiest = max(group.segment_counts, key=lambda s: (s[2], s[1]))[0] if group and group.segment_counts else "-"
            rows.append([
                o.circuit_id, o.from_tag, o.to_tag,
                _fmt(route.routed_length_m if route else None),
                _fmt(route.design_length_m if route else None),
                str(group.circuits_in_group) if group else "-",
                busiest, o.status,
            ])
        print(format_table(["circuit", "from", "to", "routed [m]", "design [m]", "group", "busiest segment", "status"], rows))
    return _exit_code(outcomes, ("ok", "warning"))


def _default_out(drawing: Path) -> Path:
    return drawing.with_name(f"{drawing.stem}_cablewright")


def default_out(drawing: Path) -> Path:
    """The output folder when ``--out`` is not given: beside the drawing."""
    return _default_out(drawing)


def run_size(args: argparse.Namespace, announce: Callable[[str], None] | None = None) -> int:
    """The whole job: measure, size, write the annotated DXF, schedule and report."""
    settings = settings_for(args)  # validated before any drawing is read, batch too
    if getattr(args, "more_drawings", None) or Path(args.drawing).is_dir():
        from .batch import run_batch

        return run_batch(args)
    drawing = Path(args.drawing)
    previous = getattr(args, "previous", None)
    previous_doc = None
    if previous:
        from cablewright.annotate.changes import load_document

        previous_doc = load_document(previous)  # a bad earlier folder stops the run before any work
    out_dir = Path(args.out) if args.out else _default_out(drawing)
    inputs = [("drawing", drawing), ("schedule", args.circuits), ("config", args.config)]
    # the output folder is checked against the inputs and locked before anything is read
    with output_session(out_dir, inputs), _stages(args.json) as stage:
        stage(f"reading and routing {drawing.name}")
        measurement = measure_drawing(drawing, args.circuits, settings, getattr(args, "recover", False))
        _circuits_from_attributes(args, measurement)
        stage("sizing")
        with _progress(len(measurement.rows), args.json, "sizing") as tick:
            job = size_measurement(measurement, settings, tick)
        stage("writing the annotated drawing, schedule and report")
        takeoff, extras = job_takeoff(job, drawing, settings)
        changes = None
        if previous_doc is not None:
            from cablewright.annotate.changes import compare_documents

            changes = compare_documents(previous_doc, job_document(job, extras))
        written = write_outputs(job, drawing, out_dir, settings, quiet=args.json, takeoff=takeoff,
                                extras=extras, changes=changes, previous_name=str(previous or ""))
    _issues(measurement)
    _report_errors(job.outcomes)
    if args.json:
        print(dumps(job.outcomes, kind="size", extra=extras))
    else:
        rows = []
        for o in job.outcomes:
            s = o.sizing
            rows.append([
                o.circuit_id, o.from_tag, o.to_tag,
                _fmt(o.route.routed_length_m if o.route else None),
                _fmt(s.load_current_a if s else None),
                f"{s.device_rating_a:g}" if s and s.device_rating_a else "-",
                s.cable.describe() if s and s.cable else "-",
                _fmt(s.voltage_drop.percent if s and s.voltage_drop else None, 2),
                o.status, _reason(o),
            ])
        print(format_table(["circuit", "from", "to", "route m", "Ib A", "In A", "cable", "VD %", "status",
                            "reason"], rows, min_last=16, keep=(6,)))
        counts = {k: sum(1 for o in job.outcomes if o.status == k) for k in ("ok", "warning", "fail", "error")}
        print(f"\n{len(job.outcomes)} circuits: " + ", ".join(f"{v} {k}" for k, v in counts.items()))
        if changes is not None:
            from .commands_compare import changes_table

            print(f"\nchanges since {previous}:")
            print(changes_table(changes))
        print("outputs:")
        for path in written:
            print(f"  {path}")
        print("\n".join(textwrap.wrap(CAUTION, TABLE_WIDTH)))
    return _exit_code(job.outcomes, ("ok", "warning"))


def run_demo(args: argparse.Namespace) -> int:
    """``size`` on the bundled sample drawing."""
    drawing = SAMPLE_DIR / SAMPLE_DRAWING
    circuits = SAMPLE_DIR / SAMPLE_CIRCUITS
    if not drawing.exists():
        from cablewright.core.errors import DrawingReadError

        raise DrawingReadError(
            f"{drawing}: the sample drawing is missing; run "
            "'python sample_drawings/generate_pumping_station.py' from the repository"
        )
    out = Path(args.out) if args.out else Path.cwd() / "cablewright-demo"
    size_args = argparse.Namespace(drawing=str(drawing), circuits=str(circuits), config=None,
                                   out=str(out), json=False, debug=args.debug, recover=False)
    code = run_size(size_args)
    print(f"\ndemo outputs are in {out}")
    # A sample with failing circuits on purpose still counts as a successful demo run.
    return 0 if code in (0, 1) else code
