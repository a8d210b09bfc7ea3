"""Time the whole pipeline, stage by stage, on synthetic plants of several sizes.

For each size (circuits) the plant is generated once (``generate_plant.py``,
cached in the work folder), then two child processes run on it, so that each
one's peak memory is its own:

* ``stages``: the floor (``ezdxf.readfile`` + ``doc.saveas`` of the same drawing),
  then every stage called one by one through the library: read, network,
  schedule, routing, grouping, sizing (``size_measurement``, grouping rounds
  included), the sizing engine alone (``size_circuit`` over prepared specs),
  and each output (annotated DXF, schedule csv / xlsx / json, preview PNG,
  HTML report), the way ``size`` runs them: the document parsed by ``read_dxf``
  is annotated in memory and the preview is drawn from the measurement and the marks the
  writer placed (no second parse);
* ``whole``: the ``cablewright size`` command's own function
  (``commands_drawing.run_size``, console output to ``/dev/null``), once.

Memory is ``resource.getrusage(RUSAGE_SELF).ru_maxrss`` of each child (peak
resident set, KiB on Linux), not tracemalloc (which would slow the run).

Times are CPU seconds of the process (``time.process_time``) beside wall seconds:
the machine may be shared, and this code is single-threaded.

``bench_paired.py`` runs whole commands (``size``, ``routes``) before and after
against the floor in paired child processes, several repeats.

Run: ``python benchmarks/bench_pipeline.py [--sizes 200 500 2000 8000] [--work DIR]
[--json FILE]``.
"""

from __future__ import annotations

import argparse
import contextlib
import gc
import json
import logging
import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

__all__ = ["main"]

DEFAULT_SIZES = (200, 500, 2000, 8000)


def _maxrss_mib() -> float:
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0


class _Clock:
    """Wall time and CPU time of this process (the machine may be shared) per stage."""

    def __init__(self) -> None:
        self.times: dict[str, float] = {}
        self.cpu: dict[str, float] = {}

    @contextlib.contextmanager
    def __call__(self, name: str):
        gc.collect()
        t0, c0 = time.perf_counter(), time.process_time()
        yield
        self.times[name] = time.perf_counter() - t0
        self.cpu[name] = time.process_time() - c0


def _child_stages(drawing: Path, circuits: Path) -> dict:
    """Floor and every stage, timed one by one in this process."""
    import ezdxf
    from cablewright.annotate.drawing import AnnotationInput, write_annotated_dxf
    from cablewright.annotate.report import write_report_html
    from cablewright.annotate.schedule_files import (
        write_schedule_csv,
        write_schedule_json,
        write_schedule_xlsx,
    )
    from cablewright.extract import (
        build_network,
        circuits_per_segment,
        group_summary,
        read_dxf,
        read_schedule,
        route_circuits,
    )
    from cablewright.extract.model import UNIT_TO_M, Measurement
    from cablewright.sizing.fields import spec_from_fields
    from cablewright.sizing.select import size_circuit

    from cablewright.config import load_settings
    from cablewright.console import CAUTION
    from cablewright.outputs import _annotate_config, _preview
    from cablewright.pipeline import _fields, _stretches, drawing_config, size_measurement

    clock = _Clock()
    out = Path(tempfile.mkdtemp(prefix="cw-bench-"))
    info: dict = {}

    with clock("floor_read"):
        doc = ezdxf.readfile(drawing)
    info["entities"] = len(doc.modelspace())
    with clock("floor_save"):
        doc.saveas(out / "floor_copy.dxf")
    del doc
    (out / "floor_copy.dxf").unlink()

    settings = load_settings(None)
    config = drawing_config(settings)
    with clock("read"):
        content = read_dxf(drawing, config)
    from cablewright.extract.dxf_stream import stream_dxf

    with clock("read_stream"):  # the streaming reader (routes), same pieces; not a stage of size
        streamed = stream_dxf(drawing, config)
    info["stream_same"] = (streamed.polylines == content.polylines
                           and streamed.equipment == content.equipment)
    del streamed
    with clock("network"):
        network = build_network(content.polylines, content.equipment, config)
    with clock("schedule"):
        rows = read_schedule(circuits)
    with clock("routing"):
        routes, failures = route_circuits(network, rows, config)
    with clock("grouping"):
        per_segment = circuits_per_segment(routes)
        group_summary(routes, per_segment)
    info.update(route_pieces=len(content.polylines), segments=len(network.segments),
                graph_nodes=network.graph.number_of_nodes(), circuits=len(rows),
                routed=len(routes), failed=len(failures),
                sources=len({r.from_tag for r in rows}))
    measurement = Measurement(str(drawing), content.units, network.segments, network.equipment,
                              rows, routes, failures, list(content.issues) + network.issues,
                              network.graph, source_document=content.document)
    with clock("sizing"):
        job = size_measurement(measurement, settings)
    statuses: dict[str, int] = {}
    for o in job.outcomes:
        statuses[o.status] = statuses.get(o.status, 0) + 1
    info.update(rounds=job.rounds, statuses=statuses)

    # the sizing engine alone: size_circuit over specs prepared beforehand (one core)
    from dataclasses import replace

    cables_on = {seg: sum(job.parallel[c] for c in cids) for seg, cids in job.per_segment.items()}
    specs = []
    for row in rows:
        route = routes.get(row.circuit_id)
        if route is None:
            continue
        try:
            spec = spec_from_fields(row.circuit_id, _fields(row), settings.sizing, route.design_length_m)
        except Exception:  # noqa: BLE001 - a bad row is simply left out of the engine timing
            continue
        stretches = _stretches(measurement, route, job.parallel[row.circuit_id], cables_on)
        specs.append(replace(spec, stretches=stretches))
    with clock("sizing_engine"):
        for spec in specs:
            size_circuit(spec, settings.sizing)
    info["engine_circuits"] = len(specs)

    units_per_m = 1.0 / UNIT_TO_M.get(measurement.units, 1.0)
    dxf_out = out / "annotated.dxf"
    config = _annotate_config(settings)
    with clock("out_dxf"):
        marks = AnnotationInput(job.outcomes, measurement.segments, job.per_segment,
                                measurement.equipment, units_per_m)
        summary = write_annotated_dxf(drawing, dxf_out, marks, config,
                                      document=measurement.source_document)
    info.update(labels=summary.labels, group_tags=summary.group_tags,
                overlapping=summary.overlapping, text_height=summary.text_height)
    with clock("out_csv"):
        write_schedule_csv(out / "schedule.csv", job.outcomes)
    with clock("out_xlsx"):
        write_schedule_xlsx(out / "schedule.xlsx", job.outcomes)
    with clock("out_json"):
        write_schedule_json(out / "schedule.json", job.outcomes)
    with clock("out_preview"):
        png = _preview(measurement, summary, measurement.source_document, units_per_m)
    with clock("out_report"):
        write_report_html(out / "report.html", job.outcomes, title=f"Cable sizing: {drawing.name}",
                          drawing_name=drawing.name, preview_png=png, cautions=CAUTION)
    info["output_bytes"] = {p.name: p.stat().st_size for p in out.iterdir()}
    for p in out.iterdir():
        p.unlink()
    out.rmdir()
    info["times_s"] = clock.times
    info["cpu_s"] = clock.cpu
    info["maxrss_mib"] = _maxrss_mib()
    return info


def _child_whole(drawing: Path, circuits: Path) -> dict:
    """The ``size`` command's function, once, console output discarded."""
    import argparse as ap

    from cablewright.commands_drawing import run_size

    out = Path(tempfile.mkdtemp(prefix="cw-bench-whole-"))
    args = ap.Namespace(drawing=str(drawing), circuits=str(circuits), config=None, out=str(out),
                        json=False, debug=False, recover=False)
    t0, c0 = time.perf_counter(), time.process_time()
    with open(os.devnull, "w") as devnull, contextlib.redirect_stdout(devnull):
        code = run_size(args)
    elapsed = time.perf_counter() - t0
    cpu = time.process_time() - c0
    written = sorted(p.name for p in out.iterdir())
    for p in out.iterdir():
        p.unlink()
    out.rmdir()
    return {"whole_s": elapsed, "whole_cpu_s": cpu, "exit_code": code, "written": written, "maxrss_mib": _maxrss_mib()}


def _run_child(kind: str, drawing: Path, circuits: Path) -> dict:
    cmd = [sys.executable, str(Path(__file__).resolve()), "--child", kind,
           "--drawing", str(drawing), "--schedule", str(circuits)]
    proc = subprocess.run(cmd, capture_output=True, text=True, check=False)
    if proc.returncode != 0:
        raise RuntimeError(f"{kind} child failed on {drawing}:\n{proc.stderr[-4000:]}")
    return json.loads(proc.stdout.strip().splitlines()[-1])


STAGES = ("read", "network", "schedule", "routing", "grouping", "sizing", "out_dxf", "out_csv",
          "out_xlsx", "out_json", "out_preview", "out_report")


def _print_size(n: int, res: dict) -> None:
    t, c = res["times_s"], res["cpu_s"]
    floor = t["floor_read"] + t["floor_save"]
    floor_cpu = c["floor_read"] + c["floor_save"]
    print(f"\n== {n} circuits: {res['entities']} entities, {res['route_pieces']} route pieces, "
          f"{res['sources']} sources, {res['segments']} segments; routed {res['routed']}, "
          f"failed {res['failed']}; statuses {res['statuses']}; grouping rounds {res['rounds']}")
    print(f"  {'stage':<14} {'wall [s]':>9} {'cpu [s]':>9} {'share':>7}")
    print(f"  {'floor read':<14} {t['floor_read']:9.2f} {c['floor_read']:9.2f}")
    print(f"  {'floor save':<14} {t['floor_save']:9.2f} {c['floor_save']:9.2f}")
    print(f"  {'floor':<14} {floor:9.2f} {floor_cpu:9.2f}")
    print(f"  {'read_stream':<14} {t['read_stream']:9.2f} {c['read_stream']:9.2f}  (streaming reader, "
          f"same pieces and equipment: {res['stream_same']}; used by routes, not by size)")
    staged = sum(c[s] for s in STAGES)
    for s in STAGES:
        print(f"  {s:<14} {t[s]:9.2f} {c[s]:9.2f} {100 * c[s] / staged:6.1f}%")
    print(f"  {'sum of stages':<14} {sum(t[s] for s in STAGES):9.2f} {staged:9.2f}"
          f"  ({staged / floor_cpu:.2f} x floor, cpu)")
    eng = res["engine_circuits"] / c["sizing_engine"] if c["sizing_engine"] > 0 else float("inf")
    print(f"  sizing engine alone: {res['engine_circuits']} circuits in {c['sizing_engine']:.3f} s cpu "
          f"= {eng:,.0f} circuits/s")
    net = sum(c[s] for s in ("network", "schedule", "routing", "grouping"))
    print(f"  network + schedule + routing + grouping: {net:.2f} s cpu")
    print(f"  whole size run: {res['whole_s']:.2f} s wall, {res['whole_cpu_s']:.2f} s cpu = "
          f"{res['whole_cpu_s'] / floor_cpu:.2f} x floor (cpu); exit {res['exit_code']}; "
          f"wrote {', '.join(res['written'])}")
    print(f"  labels {res['labels']}, group tags {res['group_tags']}, overlapping {res['overlapping']}, "
          f"text height {res['text_height']:g} drawing units")
    print(f"  peak RSS (ru_maxrss): size run {res['whole_maxrss_mib']:.0f} MiB, "
          f"staged child {res['maxrss_mib']:.0f} MiB")


def main(argv: list[str] | None = None) -> int:
    """Command line, see the module docstring."""
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--sizes", type=int, nargs="+", default=list(DEFAULT_SIZES))
    parser.add_argument("--work", default=str(Path(tempfile.gettempdir()) / "cablewright-bench"))
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--json", dest="json_out", default=None, help="also write the figures here")
    parser.add_argument("--child", choices=("stages", "whole"), help=argparse.SUPPRESS)
    parser.add_argument("--drawing", help=argparse.SUPPRESS)
    parser.add_argument("--schedule", help=argparse.SUPPRESS)
    args = parser.parse_args(argv)
    logging.basicConfig(level=logging.ERROR)

    if args.child:
        fn = _child_stages if args.child == "stages" else _child_whole
        print(json.dumps(fn(Path(args.drawing), Path(args.schedule))))
        return 0

    from generate_plant import generate_plant

    work = Path(args.work)
    results: dict[str, dict] = {}
    for n in args.sizes:
        drawing = work / f"plant_{n}.dxf"
        schedule = work / f"plant_{n}_circuits.csv"
        if not (drawing.exists() and schedule.exists()):
            t0 = time.perf_counter()
            generate_plant(work, circuits=n, seed=args.seed)
            print(f"generated {drawing} in {time.perf_counter() - t0:.1f} s", file=sys.stderr)
        res = _run_child("stages", drawing, schedule)
        whole = _run_child("whole", drawing, schedule)
        res.update(whole_s=whole["whole_s"], whole_cpu_s=whole["whole_cpu_s"],
                   exit_code=whole["exit_code"], written=whole["written"],
                   whole_maxrss_mib=whole["maxrss_mib"])
        results[str(n)] = res
        _print_size(n, res)
        sys.stdout.flush()
        if args.json_out:
            Path(args.json_out).write_text(json.dumps(results, indent=2))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
