"""Paired runs of the preview: drawn from the parsed document (before) and from the measurement (after).

For a drawing (the sample, or a benchmark plant generated into ``--work``) the
job is measured, sized and annotated once (the annotated document kept in memory
and the writer's :class:`~cablewright.annotate.sketch.Sketch` of our marks); then,
in each repeat, the two previews are drawn one after the other in this process and
their CPU seconds taken (``time.process_time``, a full collection before each):

* ``before``: the preview of commit ``--before`` (default ``9b8785a``, read with
  ``git show`` into a module of its own), ezdxf's drawing add-on over the annotated
  document, called as ``outputs`` called it (schedule left out of a large drawing,
  our layers kept);
* ``after``: ``outputs._preview``: the routes of the measurement and the marks the
  writer placed as matplotlib line collections, the drawing's own linework as a
  background from the document on a small drawing;
* ``sketch``: the part of ``after`` spent in the writer (the :class:`Sketch` of the
  entities it added; timed here again over our entities of the annotated document).

Run: ``python benchmarks/bench_preview.py --drawing sample`` or
``python benchmarks/bench_preview.py --circuits 2000 --work /tmp/cw-bench --repeats 5``.
Prints min / median / max CPU seconds of each and the ratio of the medians.
"""

from __future__ import annotations

import argparse
import gc
import importlib.util
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
sys.path.insert(0, str(HERE))

__all__ = ["main"]


def _old_preview(rev: str):
    """The preview module of commit ``rev``, loaded under a name of its own."""
    text = subprocess.run(["git", "show", f"{rev}:annotate/preview.py"], cwd=ROOT, check=True,
                          capture_output=True, text=True).stdout
    path = Path(tempfile.mkdtemp(prefix="cw-old-preview-")) / "old_preview.py"
    path.write_text(text, encoding="utf-8")
    spec = importlib.util.spec_from_file_location("old_preview", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def _job(drawing: Path, circuits: Path):
    from cablewright.annotate.drawing import AnnotationInput, write_annotated_dxf
    from cablewright.extract.model import UNIT_TO_M

    from cablewright.config import load_settings
    from cablewright.outputs import _annotate_config
    from cablewright.pipeline import measure_drawing, size_measurement

    settings = load_settings(None)
    measurement = measure_drawing(drawing, circuits, settings)
    job = size_measurement(measurement, settings)
    upm = 1.0 / UNIT_TO_M.get(measurement.units, 1.0)
    marks = AnnotationInput(job.outcomes, measurement.segments, job.per_segment,
                            measurement.equipment, upm)
    out = Path(tempfile.mkdtemp(prefix="cw-bench-preview-")) / "annotated.dxf"
    summary = write_annotated_dxf(drawing, out, marks, _annotate_config(settings),
                                  document=measurement.source_document)
    return measurement, summary, upm


def _cpu(call) -> tuple[float, int]:
    gc.collect()
    c0 = time.process_time()
    png = call()
    return time.process_time() - c0, len(png)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--drawing", help="'sample' or a DXF path (with --schedule)")
    parser.add_argument("--schedule")
    parser.add_argument("--circuits", type=int, default=2000, help="benchmark plant size")
    parser.add_argument("--work", default="/tmp/cw-bench-preview")
    parser.add_argument("--repeats", type=int, default=5)
    parser.add_argument("--before", default="9b8785a")
    args = parser.parse_args(argv)
    if args.drawing == "sample":
        drawing = ROOT / "sample_drawings" / "pumping_station.dxf"
        schedule = ROOT / "sample_drawings" / "pumping_station_circuits.csv"
    elif args.drawing:
        drawing, schedule = Path(args.drawing), Path(args.schedule)
    else:
        from generate_plant import generate_plant

        work = Path(args.work)
        drawing = work / f"plant_{args.circuits}.dxf"
        schedule = work / f"plant_{args.circuits}_circuits.csv"
        if not drawing.exists():
            generate_plant(work, args.circuits)
    from cablewright.outputs import _preview

    old = _old_preview(args.before)
    measurement, summary, upm = _job(drawing, schedule)
    doc = measurement.source_document
    ours = dict(summary.layers)
    schedule_layer = ours.pop("schedule")
    from cablewright.annotate.sketch import layer_colors, sketch_entities

    mine = {name.upper() for name in summary.layers.values()}
    added = [e for e in doc.modelspace() if str(e.dxf.layer).upper() in mine]
    figures: dict[str, list[float]] = {"before": [], "after": [], "sketch": []}
    sizes = {}
    for _ in range(args.repeats):
        t, sizes["before"] = _cpu(lambda: old.render_preview_png(
            doc, lean_skip_layers=(schedule_layer,), keep_layers=tuple(ours.values())))
        figures["before"].append(t)
        t, sizes["after"] = _cpu(lambda: _preview(measurement, summary, doc, upm))
        figures["after"].append(t)
        gc.collect()
        c0 = time.process_time()
        sizes["sketch"] = len(sketch_entities(added, layer_colors(doc)))
        figures["sketch"].append(time.process_time() - c0)
    with open("/proc/loadavg", encoding="ascii") as f:
        load = f.read().split()[:3]
    print(f"{drawing.name}: {len(doc.modelspace())} entities, {len(measurement.rows)} circuits, "
          f"{args.repeats} paired repeats, load average {' '.join(load)}")
    for name, values in figures.items():
        print(f"  {name:6s} CPU s min {min(values):.3f} median {statistics.median(values):.3f} "
              f"max {max(values):.3f}  ({sizes[name]} {'items' if name == 'sketch' else 'bytes'})")
    ratio = statistics.median(a / b for a, b in zip(figures["after"], figures["before"], strict=True))
    print(f"  after / before, median of the paired ratios: {ratio:.3f}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
