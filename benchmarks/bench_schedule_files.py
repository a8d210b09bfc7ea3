"""CPU time of the schedule files (schedule.xlsx, schedule.json, report.html): before and after (issue 13).

Each side is a Python environment with cablewright installed (``--before`` and
``--after``, e.g. the main checkout's ``.venv/bin/python`` and this worktree's).
In every repeat one child process of each side (the order alternating, so a
busy spell of the shared machine hits both) measures and sizes the plant once,
untimed, then calls each writer as ``cablewright size`` does
(``cablewright/outputs.py`` ``_write_all``: the take-off sheets, the document's
top-level keys, the take-off sections of the report) and takes its CPU time
(``time.process_time``, this code is single-threaded).  The sha256 of every file
written is printed per side: the same on both sides means the same bytes.

Usage::

    python benchmarks/generate_plant.py --circuits 2000 --out /tmp/plant
    .venv/bin/python benchmarks/bench_schedule_files.py /tmp/plant/plant_2000.dxf \\
        /tmp/plant/plant_2000_circuits.csv --before /work/main/.venv/bin/python \\
        --after .venv/bin/python --repeats 5
"""

from __future__ import annotations

import argparse
import gc
import hashlib
import json
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

__all__ = ["main"]

WRITERS = ("xlsx", "json", "html")
#: A stand-in for preview.png (about the size of the 2,000-circuit plant's, 96 kB): the
#: report inlines it as base64, so its size is what counts.
PREVIEW = bytes(range(256)) * 375


def _child(drawing: Path, circuits: Path, inner: int) -> dict:
    """Measure and size once; then each writer ``inner`` times, CPU seconds of each."""
    import logging

    logging.disable(logging.WARNING)
    from cablewright.annotate.report import write_report_html
    from cablewright.annotate.report_sections import takeoff_sections
    from cablewright.annotate.rows import length_unit
    from cablewright.annotate.schedule_files import write_schedule_json, write_schedule_xlsx
    from cablewright.annotate.takeoff import xlsx_sheets

    from cablewright import pipeline
    from cablewright.config import load_settings
    from cablewright.console import CAUTION
    from cablewright.outputs import drawing_facts, job_takeoff, report_config

    settings = load_settings(None)
    job = pipeline.size_measurement(pipeline.measure_drawing(drawing, circuits, settings), settings)
    takeoff, extras = job_takeoff(job, drawing, settings)
    unit = length_unit(settings.sizing.standard, settings.annotate.length_unit)
    out = Path(tempfile.mkdtemp(prefix="cw-bench-files-"))

    def xlsx() -> Path:
        return write_schedule_xlsx(out / "schedule.xlsx", job.outcomes, extra_sheets=xlsx_sheets(takeoff, unit),
                                   unit=unit)

    def json_() -> Path:
        return write_schedule_json(out / "schedule.json", job.outcomes, extras)

    def html() -> Path:
        return write_report_html(out / "report.html", job.outcomes, title=f"Cable sizing: {drawing.name}",
                                 drawing_name=drawing.name, preview_png=PREVIEW, cautions=CAUTION,
                                 extra_sections=takeoff_sections(takeoff, unit),
                                 drawing_facts=drawing_facts(job.measurement), config=report_config(settings),
                                 unit=unit)

    cpu: dict[str, list[float]] = {name: [] for name in WRITERS}
    digests: dict[str, str] = {}
    for _ in range(inner):
        for name, write in zip(WRITERS, (xlsx, json_, html), strict=True):
            gc.collect()
            start = time.process_time()
            path = write()
            cpu[name].append(time.process_time() - start)
            digests[name] = hashlib.sha256(path.read_bytes()).hexdigest()[:16]
            path.unlink()
    out.rmdir()
    return {"cpu": cpu, "sha256": digests, "circuits": len(job.outcomes)}


def _run_child(python: str, drawing: Path, circuits: Path, inner: int) -> dict:
    cmd = [python, str(Path(__file__).resolve()), "--child", str(drawing), str(circuits), "--inner", str(inner)]
    done = subprocess.run(cmd, capture_output=True, text=True, check=True)
    return json.loads(done.stdout.strip().splitlines()[-1])


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("drawing", type=Path)
    parser.add_argument("circuits", type=Path)
    parser.add_argument("--before", default="", help="python of the earlier code's environment")
    parser.add_argument("--after", default=sys.executable, help="python of this code's environment")
    parser.add_argument("--repeats", type=int, default=5)
    parser.add_argument("--inner", type=int, default=1, help="calls of each writer per child")
    parser.add_argument("--child", action="store_true", help=argparse.SUPPRESS)
    args = parser.parse_args(argv)
    if args.child:
        print(json.dumps(_child(args.drawing, args.circuits, args.inner)))
        return 0
    sides = {"before": args.before, "after": args.after} if args.before else {"after": args.after}
    cpu: dict[str, dict[str, list[float]]] = {s: {w: [] for w in WRITERS} for s in sides}
    digests: dict[str, dict[str, str]] = {}
    for rep in range(args.repeats):
        order = list(sides) if rep % 2 == 0 else list(reversed(sides))
        for side in order:
            result = _run_child(sides[side], args.drawing, args.circuits, args.inner)
            for w in WRITERS:
                cpu[side][w] += result["cpu"][w]
            digests[side] = result["sha256"]
            print(f"repeat {rep + 1} {side:6s} " + "  ".join(f"{w} {min(result['cpu'][w]):.3f}" for w in WRITERS),
                  flush=True)
    load = os.getloadavg()
    print(f"\n{args.drawing.name}: {args.repeats} repeats x {args.inner}; CPU s min / median / max; "
          f"load average {load[0]:.2f} {load[1]:.2f} {load[2]:.2f}")
    for w in WRITERS:
        for side in sides:
            v = cpu[side][w]
            print(f"  {w:5s} {side:6s} {min(v):.3f} / {statistics.median(v):.3f} / {max(v):.3f}"
                  f"   sha256 {digests[side][w]}")
        if "before" in sides:
            ratios = [b / a for b, a in zip(cpu["before"][w], cpu["after"][w], strict=True)]
            print(f"  {w:5s} paired before / after: min {min(ratios):.2f} median {statistics.median(ratios):.2f} "
                  f"max {max(ratios):.2f}")
    if "before" in sides:
        same = digests["before"] == digests["after"]
        print("same bytes on both sides" if same else "BYTES DIFFER between the sides")
        return 0 if same else 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
