"""One drawing sized end to end: the call behind ``size`` and batch mode.

:func:`size_drawing` measures, sizes and writes the outputs of one drawing and
returns what it did (:class:`SizeRun`); the commands print from it.  The
stderr lines (warnings of the reader, circuits in error) are written here so
the single and batch runs say the same.
"""

from __future__ import annotations

import argparse
import sys
from contextlib import contextmanager
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from cablewright.annotate.model import CircuitOutcome

from .collector import settle
from .config import Settings, load_settings
from .outputs import job_document, job_takeoff, output_session, write_outputs
from .pipeline import JobResult, measure_drawing, size_measurement

if TYPE_CHECKING:
    from cablewright.annotate.changes import ChangeReport
    from cablewright.extract.model import Measurement

__all__ = ["SizeRun", "settings_from", "size_drawing"]

#: ``size`` reads a DXF with the streaming reader and writes the annotated copy
#: with the appending writer (no parsed document); a drawing either declines is
#: parsed and saved by ezdxf as before (benchmarks/RESULTS.md, issue 13).
SIZE_STREAMS = True


@dataclass(frozen=True)
class SizeRun:
    """What :func:`size_drawing` did: the measurement, the sized job and the files written."""

    measurement: Measurement
    job: JobResult
    extras: dict
    written: list
    changes: ChangeReport | None

    @property
    def exit_code(self) -> int:
        """0 when every circuit is ok or warning, else 1 (contract.md "Exit codes")."""
        return 0 if all(o.status in ("ok", "warning") for o in self.job.outcomes) else 1


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


def error_lines(outcomes: list[CircuitOutcome]) -> list[str]:
    """The stderr lines (without the program name) of the circuits in error."""
    return [f"circuit {o.circuit_id}: {message}" for o in outcomes if o.status == "error"
            for message in o.messages]


def issue_lines(measurement) -> list[str]:
    """The stderr lines (without the program name) of the reader's warnings."""
    return [f"warning: {issue.message}" + (f" [{issue.source_id}]" if issue.source_id else "")
            for issue in measurement.issues]


def _report_errors(outcomes: list[CircuitOutcome]) -> None:
    for line in error_lines(outcomes):
        print(f"cablewright: {line}", file=sys.stderr)


def _issues(measurement) -> None:
    for line in issue_lines(measurement):
        print(f"cablewright: {line}", file=sys.stderr)


def _circuits_from_attributes(args: argparse.Namespace, measurement) -> None:
    """Say on stderr when the circuits come from the drawing, not from a schedule."""
    if args.circuits is None:
        _attributes_note(Path(args.drawing), measurement)


def _attributes_note(drawing: Path, measurement) -> None:
    print(f"cablewright: no --circuits schedule given: {len(measurement.rows)} circuits read "
          f"from the equipment attributes of {drawing.name}", file=sys.stderr)


def settings_from(config: str | None, units: str | None = None) -> Settings:
    """The config file's settings, with ``units`` (when given) as ``[drawing] units``."""
    from dataclasses import replace

    settings = load_settings(config)
    if units:
        settings = replace(settings, drawing=replace(settings.drawing, units=units))
    return settings


def size_drawing(drawing: str | Path, circuits: str | None, config: str | None, settings: Settings,
                 out_dir: Path, *, recover: bool = False, quiet: bool = False,
                 previous: str | None = None) -> SizeRun:
    """Measure, size and write the outputs of one drawing into ``out_dir``."""
    previous_doc = None
    if previous:
        from cablewright.annotate.changes import load_document

        previous_doc = load_document(previous)  # a bad earlier folder stops the run before any work
    drawing = Path(drawing)
    inputs = [("drawing", drawing), ("schedule", circuits), ("config", config)]
    # the output folder is checked against the inputs and locked before anything is read
    with output_session(out_dir, inputs), _stages(quiet) as stage:
        stage(f"reading and routing {drawing.name}")
        measurement = measure_drawing(drawing, circuits, settings, recover,
                                      keep_document=not SIZE_STREAMS,
                                      marks_appid=settings.annotate.appid if SIZE_STREAMS else None)
        if circuits is None:
            _attributes_note(drawing, measurement)
        settle()  # the measurement lives to the end: never walked by the collector again
        stage("sizing")
        with _progress(len(measurement.rows), quiet, "sizing") as tick:
            job = size_measurement(measurement, settings, tick)
        stage("writing the annotated drawing, schedule and report")
        takeoff, extras = job_takeoff(job, drawing, settings)
        settle()  # the sized job and the quantities, likewise
        changes = None
        if previous_doc is not None:
            from cablewright.annotate.changes import compare_documents

            changes = compare_documents(previous_doc, job_document(job, extras))
        written = write_outputs(job, drawing, out_dir, settings, quiet=quiet, takeoff=takeoff,
                                extras=extras, changes=changes, previous_name=str(previous or ""))
    return SizeRun(measurement, job, extras, written, changes)
