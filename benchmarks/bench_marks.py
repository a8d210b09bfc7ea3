"""CPU time of the annotated-DXF writer and the audit of its marks (issue 12 item 1).

For the sample drawing and for benchmark plants (``generate_plant.py``) the drawing is
measured and sized once (untimed); then, per repeat, a fresh parse of the drawing is
annotated by ``write_annotated_dxf(..., document=)`` and its CPU time taken
(``time.process_time``, parse and save excluded, the save timed apart), the variants one
after the other in each repeat.  The last output of each variant is then audited with
``tests/drawing_audit.py`` (ezdxf + shapely, independent of the writer) and the counts
printed: added texts, crossings, overlaps, cable labels off their route, leaders.

Run::

    python benchmarks/bench_marks.py --plants 0 200 2000 --repeats 3 \
        --variant default --variant "avoid_linework=true"

``0`` is the sample drawing.  A variant is ``default`` or ``key=value`` pairs of
``[annotate]`` joined by commas (TOML values).
"""

from __future__ import annotations

import argparse
import json
import os
import statistics
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT / "tests"))
sys.path.insert(0, str(ROOT / "benchmarks"))

SAMPLE = ROOT / "sample_drawings" / "pumping_station.dxf"
SAMPLE_CIRCUITS = ROOT / "sample_drawings" / "pumping_station_circuits.csv"


def _drawing(n: int, work: Path) -> tuple[Path, Path]:
    """The sample (``n == 0``) or a generated plant of ``n`` circuits."""
    if n == 0:
        return SAMPLE, SAMPLE_CIRCUITS
    from generate_plant import generate_plant

    files = generate_plant(work / f"plant{n}", n)
    return Path(files.dxf_path), Path(files.csv_path)


def _config_file(variant: str, work: Path) -> Path | None:
    if variant == "default":
        return None
    path = work / f"variant_{abs(hash(variant))}.toml"
    body = "\n".join(part.strip() for part in variant.split(","))
    path.write_text(f"[annotate]\n{body}\n", encoding="utf-8")
    return path


def _routes(job, k: float) -> tuple[dict, dict]:
    """Each circuit's route segments as one line (drawing units), and each segment's."""
    from shapely.geometry import LineString, MultiLineString

    segs = {sid: LineString([(p[0] * k, p[1] * k) for p in s.points_m])
            for sid, s in job.measurement.segments.items() if len(s.points_m) >= 2}
    out = {}
    for o in job.outcomes:
        lines = [segs[sid] for sid in (getattr(o.route, "segment_ids", ()) or ()) if sid in segs]
        if lines:
            out[o.circuit_id] = MultiLineString(lines)
    return out, segs


def _one(job, drawing: Path, settings, dst: Path) -> tuple[float, float, object]:
    """One annotation of a fresh parse: (writer CPU s without save, save CPU s, summary)."""
    import ezdxf
    from cablewright.annotate.drawing import AnnotationInput, write_annotated_dxf
    from cablewright.extract.model import UNIT_TO_M

    m = job.measurement
    doc = ezdxf.readfile(drawing)
    marks = AnnotationInput(job.outcomes, m.segments, job.per_segment, m.equipment,
                            1.0 / UNIT_TO_M.get(m.units, 1.0))
    saves: list[float] = []
    real_saveas = doc.saveas

    def timed_saveas(*args, **kwargs):
        t = time.process_time()
        real_saveas(*args, **kwargs)
        saves.append(time.process_time() - t)

    doc.saveas = timed_saveas
    t0 = time.process_time()
    summary = write_annotated_dxf(drawing, dst, marks, settings.annotate, document=doc)
    total = time.process_time() - t0
    return total - sum(saves), sum(saves), summary


def _stats(values: list[float]) -> str:
    return f"{min(values):.2f} / {statistics.median(values):.2f} / {max(values):.2f}"


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--plants", type=int, nargs="+", default=[0, 200])
    parser.add_argument("--repeats", type=int, default=3)
    parser.add_argument("--variant", action="append", default=None)
    parser.add_argument("--no-audit", action="store_true")
    parser.add_argument("--work", type=Path, default=None)
    parser.add_argument("--json", type=Path, default=None, help="write the figures here")
    args = parser.parse_args(argv)
    variants = args.variant or ["default"]

    from cablewright.extract.model import UNIT_TO_M

    import cablewright

    work = args.work or Path(tempfile.mkdtemp(prefix="cw-marks-"))
    work.mkdir(parents=True, exist_ok=True)
    print(f"load average {os.getloadavg()}; work {work}")
    figures: dict = {}
    for n in args.plants:
        drawing, circuits = _drawing(n, work)
        for variant in variants:
            settings = cablewright.settings(_config_file(variant, work))
            job = cablewright.size(cablewright.measure(drawing, circuits, settings), config=settings)
            figures[(n, variant)] = {"job": job, "settings": settings, "cpu": [], "save": []}
        for r in range(args.repeats):
            for variant in variants:
                f = figures[(n, variant)]
                dst = work / f"out_{n}_{variants.index(variant)}.dxf"
                cpu, save, summary = _one(f["job"], drawing, f["settings"], dst)
                f["cpu"].append(cpu)
                f["save"].append(save)
                f["summary"], f["dst"] = summary, dst
                print(f"  plant {n or 'sample'} [{variant}] repeat {r + 1}: writer {cpu:.2f} s CPU "
                      f"(save {save:.2f} s), load {os.getloadavg()[0]:.2f}", flush=True)
        for variant in variants:
            f = figures[(n, variant)]
            s = f["summary"]
            line = (f"plant {n or 'sample'} [{variant}]: writer CPU min/median/max "
                    f"{_stats(f['cpu'])} s, save {_stats(f['save'])} s; labels {s.labels}, "
                    f"group tags {s.group_tags}, fallbacks {getattr(s, 'overlapping', '?')}")
            extra = getattr(s, "placement", None)
            if extra is not None:
                line += f"; placement {extra}"
            print(line)
            if not args.no_audit:
                from drawing_audit import audit

                t = time.process_time()
                k = 1.0 / UNIT_TO_M.get(f["job"].measurement.units, 1.0)
                routes, segs = _routes(f["job"], k)
                result = audit(f["dst"], routes, segments=segs)
                print(f"  audit ({time.process_time() - t:.1f} s): {result.summary()}")
                f["audit"] = result.summary()
    if args.json is not None:
        args.json.write_text(json.dumps({f"{n}:{v}": {"cpu_s": f["cpu"], "save_s": f["save"],
                                                      "audit": f.get("audit")}
                                         for (n, v), f in figures.items()}, indent=1))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
