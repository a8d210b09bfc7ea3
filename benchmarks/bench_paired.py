"""Paired runs: ``size`` and ``routes`` before/after against ezdxf read + save (the floor).

For each plant size and each repeat, one child process per variant runs in
turn (so a busy spell of the shared machine hits every variant of a repeat
alike); each child reports its own CPU seconds (``time.process_time`` at its
end: interpreter start, imports and the command) and peak RSS
(``ru_maxrss``).  Variants:

* ``floor``: ``import ezdxf``, ``ezdxf.readfile`` and ``doc.saveas`` of the drawing;
* ``read_full`` / ``read_stream``: the full reader (``read_dxf``) / the streaming
  reader (``stream_dxf``) alone;
* ``size:<reader>:<gc>`` and ``routes:<reader>:<gc>``: the command's function
  (``run_size`` / ``run_routes``, console output to ``/dev/null``) with
  ``reader`` = ``full`` (the document kept, ezdxf's save, as before) or
  ``append`` (``size``: streaming reader and appending writer, issue 13 item 2;
  ``routes``: ``stream``, the streaming reader) and ``gc`` = ``default``
  (CPython's thresholds, as before), ``tuned``
  (:data:`cablewright.collector.RUN_THRESHOLDS`, imports frozen) or ``off``;
* ``dxf:<reader>:<gc>``: what ``size`` does up to the annotated DXF only (read,
  network, routing, sizing, the annotated copy; no schedule files, preview or
  reports), ``reader`` = ``full`` or ``append`` as above.

* ``base:<variant>``: the variant run by another checkout (``--baseline DIR``: its own
  ``benchmarks/bench_paired.py`` with its own ``.venv``), e.g. main before a change, paired
  with the same variant of this checkout in every repeat.

Run: ``python benchmarks/bench_paired.py --sizes 2000 8000 --repeats 3 [--work DIR] [--json FILE]``;
before/after: ``git worktree add /tmp/before main``, ``make .venv/.installed-stamp`` there, then
``--baseline /tmp/before --variants floor base:size:append:tuned size:append:tuned``.
Prints min / median / max per variant and the ratio of the minima to the floor.
"""

from __future__ import annotations

import argparse
import contextlib
import json
import os
import resource
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

__all__ = ["main"]

GC_MODES = {"default": None, "tuned": "tuned", "off": (0, 10, 10)}
DEFAULT_VARIANTS = ("floor", "read_full", "read_stream", "dxf:full:tuned", "dxf:append:tuned",
                    "size:full:tuned", "size:append:tuned")


def _dxf_only(drawing: Path, schedule: Path, out: Path, reader: str) -> dict:
    """Read, measure, size and write the annotated DXF, as ``size`` does them."""
    from cablewright.annotate.drawing import AnnotationInput, write_annotated_dxf
    from cablewright.annotate.drawing.append_writer import AppendRequest
    from cablewright.extract.model import UNIT_TO_M

    from cablewright.config import load_settings
    from cablewright.pipeline import measure_drawing, size_measurement

    settings = load_settings(None)
    append = reader == "append"
    m = measure_drawing(drawing, schedule, settings, keep_document=not append,
                        marks_appid=settings.annotate.appid if append else None)
    job = size_measurement(m, settings)
    marks = AnnotationInput(job.outcomes, m.segments, job.per_segment, m.equipment,
                            1.0 / UNIT_TO_M.get(m.units, 1.0))
    kwargs = {"stream": AppendRequest(m.source_document)} if append else {"document": m.source_document}
    summary = write_annotated_dxf(drawing, out / "annotated.dxf", marks, settings.annotate, **kwargs)
    return {"labels": summary.labels, "appended": summary.appended}


def _child(variant: str, drawing: Path, schedule: Path) -> dict:
    t0 = time.perf_counter()
    out = Path(tempfile.mkdtemp(prefix="cw-paired-"))
    result: dict = {}
    if variant == "floor":
        import ezdxf

        doc = ezdxf.readfile(drawing)
        doc.saveas(out / "copy.dxf")
    elif variant in ("read_full", "read_stream"):
        from cablewright.extract.dxf_reader import read_dxf
        from cablewright.extract.dxf_stream import stream_dxf

        content = (read_dxf if variant == "read_full" else stream_dxf)(drawing)
        result["pieces"] = len(content.polylines)
    else:
        command, reader, gc_mode = variant.split(":")
        from cablewright import collector, commands_drawing, size_run

        keep = reader == "full"
        size_run.SIZE_STREAMS = not keep
        commands_drawing.ROUTES_KEEPS_DOCUMENT = keep
        thresholds = GC_MODES[gc_mode]
        if thresholds == "tuned":
            thresholds = collector.RUN_THRESHOLDS
    if variant.startswith("dxf:"):
        with collector.tuned_collector(thresholds):
            result.update(_dxf_only(drawing, schedule, out, reader))
    elif variant not in ("floor", "read_full", "read_stream"):
        args = argparse.Namespace(drawing=str(drawing), circuits=str(schedule), config=None,
                                  out=str(out), json=False, debug=False, recover=False, units=None)
        run = commands_drawing.run_size if command == "size" else commands_drawing.run_routes
        with open(os.devnull, "w") as devnull, contextlib.redirect_stdout(devnull), \
                contextlib.redirect_stderr(devnull), collector.tuned_collector(thresholds):
            result["exit_code"] = run(args)
    for p in out.iterdir():
        p.unlink()
    out.rmdir()
    result.update(cpu_s=time.process_time(), wall_s=time.perf_counter() - t0,
                  maxrss_mib=resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0)
    return result


def _run_child(variant: str, drawing: Path, schedule: Path, baseline: Path | None = None) -> dict:
    python, script = sys.executable, str(Path(__file__).resolve())
    if variant.startswith("base:"):
        if baseline is None:
            raise SystemExit(f"{variant}: give the other checkout with --baseline DIR")
        variant = variant.removeprefix("base:")
        python = str(baseline / ".venv" / "bin" / "python")
        script = str(baseline / "benchmarks" / "bench_paired.py")
    cmd = [python, script, "--child", variant, "--drawing", str(drawing), "--schedule", str(schedule)]
    proc = subprocess.run(cmd, capture_output=True, text=True, check=False)
    if proc.returncode != 0:
        raise RuntimeError(f"{variant} child failed on {drawing}:\n{proc.stderr[-4000:]}")
    return json.loads(proc.stdout.strip().splitlines()[-1])


def _stats(values: list[float]) -> tuple[float, float, float]:
    return min(values), statistics.median(values), max(values)


def main(argv: list[str] | None = None) -> int:
    """Command line, see the module docstring."""
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--sizes", type=int, nargs="+", default=[2000, 8000])
    parser.add_argument("--repeats", type=int, default=3)
    parser.add_argument("--variants", nargs="+", default=list(DEFAULT_VARIANTS))
    parser.add_argument("--work", default=str(Path(tempfile.gettempdir()) / "cablewright-bench"))
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--json", dest="json_out", default=None)
    parser.add_argument("--baseline", type=Path, default=None,
                        help="another checkout (with its .venv) for the base:<variant> variants")
    parser.add_argument("--child", help=argparse.SUPPRESS)
    parser.add_argument("--drawing", help=argparse.SUPPRESS)
    parser.add_argument("--schedule", help=argparse.SUPPRESS)
    args = parser.parse_args(argv)
    if args.child:
        print(json.dumps(_child(args.child, Path(args.drawing), Path(args.schedule))))
        return 0

    from generate_plant import generate_plant

    work = Path(args.work)
    results: dict[str, dict[str, list[dict]]] = {}
    for n in args.sizes:
        drawing, schedule = work / f"plant_{n}.dxf", work / f"plant_{n}_circuits.csv"
        if not (drawing.exists() and schedule.exists()):
            generate_plant(work, circuits=n, seed=args.seed)
        runs: dict[str, list[dict]] = {v: [] for v in args.variants}
        for r in range(args.repeats):
            for v in args.variants:
                runs[v].append(_run_child(v, drawing, schedule, args.baseline))
                print(f"{n} repeat {r + 1} {v}: {runs[v][-1]['cpu_s']:.2f} s cpu, "
                      f"{runs[v][-1]['maxrss_mib']:.0f} MiB", file=sys.stderr, flush=True)
        results[str(n)] = runs
        if args.json_out:
            Path(args.json_out).write_text(json.dumps(results, indent=1))
        floor = min(x["cpu_s"] for x in runs["floor"]) if "floor" in runs else None
        floor_mem = min(x["maxrss_mib"] for x in runs["floor"]) if "floor" in runs else None
        print(f"\n== {n} circuits, {args.repeats} repeats: CPU s min / median / max; peak RSS MiB min / median / max")
        for v, xs in runs.items():
            c = _stats([x["cpu_s"] for x in xs])
            m = _stats([x["maxrss_mib"] for x in xs])
            ratio = f"{c[0] / floor:5.2f} x floor" if floor else ""
            mem = f"{m[0] / floor_mem:4.2f} x floor" if floor_mem else ""
            print(f"  {v:<22} {c[0]:7.2f} {c[1]:7.2f} {c[2]:7.2f}  {ratio}   "
                  f"{m[0]:6.0f} {m[1]:6.0f} {m[2]:6.0f}  {mem}")
        sys.stdout.flush()
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
