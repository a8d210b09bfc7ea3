"""``cablewright compare OLD NEW``: what changed between two runs of ``size``."""

from __future__ import annotations

import argparse
from pathlib import Path

from cablewright.annotate.changes import ChangeReport, compare_documents, load_document

from .console import format_table
from .outputs import changes_json

__all__ = ["run_compare", "changes_table", "register"]


def changes_table(report: ChangeReport) -> str:
    """The change report for the terminal: circuits that changed, cable order deltas, segments."""
    rows = [[c.circuit_id, c.change, c.summary()] for c in report.circuits if c.change != "unchanged"]
    counts = ", ".join(f"{report.count(k)} {k}" for k in ("new", "removed", "changed", "unchanged"))
    out = [format_table(["circuit", "change", "what changed"], rows) if rows else "no circuit changed"]
    orders = [[o.cable, f"{o.old_m:.1f}", f"{o.new_m:.1f}", f"{o.delta_m:+.1f}"]
              for o in report.orders if abs(o.delta_m) >= 0.05]
    if orders:
        out.append("\ncable to order:")
        out.append(format_table(["cable", "before [m]", "now [m]", "change [m]"], orders))
    segs = [[s.segment_id, s.layer, s.change, "; ".join(f"{n} {a} -> {b}" for n, a, b in s.fields)]
            for s in report.segments if s.change == "changed"]
    if segs:
        out.append("\nsegments:")
        out.append(format_table(["segment", "layer", "change", "what changed"], segs))
    out.append(f"\n{counts}")
    return "\n".join(out)


DRAWING_SUFFIXES = (".dxf", ".ifc")


def _is_drawing(path: str) -> bool:
    return Path(path).suffix.lower() in DRAWING_SUFFIXES and Path(path).is_file()


def sized_document(drawing: str, circuits: str | None, config: str | None) -> dict:
    """``schedule.json`` of a drawing, as ``size`` would write it, without writing anything."""
    from .outputs import job_document, job_takeoff
    from .pipeline import measure_drawing, size_measurement
    from .size_run import settings_from

    settings = settings_from(config)
    measurement = measure_drawing(drawing, circuits, settings)
    job = size_measurement(measurement, settings)
    _, extras = job_takeoff(job, Path(drawing), settings)
    return job_document(job, extras)


def run_compare(args: argparse.Namespace) -> int:
    """Compare two output folders (or their schedule.json), or two revisions of a drawing
    sized with one schedule (``--circuits``); 0 when compared, 2 when unusable."""
    circuits, config = getattr(args, "circuits", None), getattr(args, "config", None)
    old = (sized_document(args.old, circuits, config) if _is_drawing(args.old)
           else load_document(args.old))
    new = (sized_document(args.new, circuits, config) if _is_drawing(args.new)
           else load_document(args.new))
    report = compare_documents(old, new)
    if args.json:
        print(changes_json(report, str(args.old)), end="")
    else:
        print(changes_table(report))
    return 0


def register(subparsers: argparse._SubParsersAction) -> None:
    """The ``compare`` parser: what changed between two runs of ``size``."""
    compare = subparsers.add_parser("compare", help="what changed between two runs of 'size'")
    compare.add_argument("old", help="the earlier output folder of 'size', its schedule.json, or a drawing")
    compare.add_argument("new", help="the later output folder of 'size', or its schedule.json")
    compare.add_argument("--circuits", metavar="FILE",
                         help="schedule for OLD and NEW when they are drawings (.dxf or .ifc)")
    compare.add_argument("--config", metavar="FILE", help="TOML config for sizing drawings")
    compare.add_argument("--json", action="store_true", help="print the change document on stdout")
    compare.add_argument("--debug", action="store_true", help="show Python tracebacks")
    compare.set_defaults(handler=run_compare)
