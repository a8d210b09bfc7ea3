"""CPU time of report.pdf: a baseline renderer against the current one, on the sample or a plant.

The job (the sample drawing, or a generated plant of ``--plant N`` circuits,
``generate_plant.py``) is measured and sized once; then, in each repeat, the
baseline ``render_report_pdf`` and the current one run one after the other
(paired, so a busy spell of the shared machine hits both of that repeat).  Each
render's CPU time is ``time.process_time`` (each renderer run once on two
circuits before, untimed, for its imports).  Both PDFs are read back with pypdf:
the page count and the text of every page are compared, and each page's content
stream is compared apart from its last lines (the footer, "page n of N").

The baseline is a copy of ``annotate/report_pdf.py``, a folder holding
``report_pdf.py`` and optionally ``pdf_lines.py`` and ``pdf_ink.py``, or a git
revision (those files taken from it with ``git show``, where it has them).  Its
``pdf_lines`` and ``pdf_ink`` (when given) are the ones its ``report_pdf``
imports; its other imports are the current modules.

Usage::

    .venv/bin/python benchmarks/bench_report_pdf.py --baseline main --repeats 7
    .venv/bin/python benchmarks/bench_report_pdf.py --baseline main --plant 2000 --repeats 5
    git show 9b8785a:annotate/report_pdf.py > /tmp/report_pdf_before.py
    .venv/bin/python benchmarks/bench_report_pdf.py --baseline /tmp/report_pdf_before.py
"""

from __future__ import annotations

import argparse
import importlib.util
import io
import os
import statistics
import subprocess
import sys
import tempfile
import time
import warnings
from pathlib import Path

from cablewright.collector import RUN_THRESHOLDS, tuned_collector

ROOT = Path(__file__).resolve().parents[1]
DXF = ROOT / "sample_drawings" / "pumping_station.dxf"
CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"
#: The modules of ``annotate/`` a baseline may bring, in import order (``report_pdf`` last).
BASELINE_FILES = ("pdf_lines.py", "pdf_ink.py", "report_pdf.py")
#: Footer lines at the end of a page's content stream (fpdf2's {nb} footer took up to two).
FOOTER_LINES = 3


def _baseline_dir(spec: str, scratch: Path) -> Path:
    """A folder holding the baseline's files: ``spec`` as a file, a folder or a git revision."""
    path = Path(spec)
    if path.is_dir():
        return path
    if path.is_file():
        (scratch / "report_pdf.py").write_bytes(path.read_bytes())
        return scratch
    for name in BASELINE_FILES:
        got = subprocess.run(["git", "-C", str(ROOT), "show", f"{spec}:annotate/{name}"],
                             capture_output=True, check=False)
        if got.returncode == 0:
            (scratch / name).write_bytes(got.stdout)
        elif name == "report_pdf.py":
            raise SystemExit(f"--baseline {spec}: not a file, a folder or a git revision with "
                             f"annotate/report_pdf.py ({got.stderr.decode().strip()})")
    return scratch


def _load_baseline(folder: Path):
    """The baseline ``report_pdf``, imported inside ``cablewright.annotate`` (relative imports work).

    While it is imported, ``.pdf_lines`` and ``.pdf_ink`` are the baseline's when the
    folder has them.
    """
    def load(name: str, path: Path):
        spec = importlib.util.spec_from_file_location(f"cablewright.annotate._baseline_{name}", path)
        module = importlib.util.module_from_spec(spec)
        spec.loader.exec_module(module)
        return module

    current = {}
    try:
        for name in BASELINE_FILES[:-1]:
            if (folder / name).is_file():
                key = f"cablewright.annotate.{name[:-3]}"
                current[key] = sys.modules.get(key)
                sys.modules[key] = load(name[:-3], folder / name)
        return load("report_pdf", folder / "report_pdf.py")
    finally:
        for key, module in current.items():
            if module is not None:
                sys.modules[key] = module
            else:
                sys.modules.pop(key, None)


def _job(plant: int | None, work: Path):
    from cablewright import pipeline
    from cablewright.config import load_settings

    drawing, schedule = DXF, CSV
    if plant:
        sys.path.insert(0, str(ROOT / "benchmarks"))
        from generate_plant import generate_plant

        drawing, schedule = work / f"plant_{plant}.dxf", work / f"plant_{plant}_circuits.csv"
        if not (drawing.exists() and schedule.exists()):
            generate_plant(work, circuits=plant)
    settings = load_settings(None)
    return drawing, pipeline.size_measurement(pipeline.measure_drawing(drawing, schedule, settings), settings)


def _pages(data: bytes) -> tuple[list[str], list[bytes]]:
    """Text and content stream of every page."""
    import pypdf

    pages = pypdf.PdfReader(io.BytesIO(data)).pages
    return [p.extract_text() for p in pages], [p.get_contents().get_data() for p in pages]


def _same_body(a: bytes, b: bytes) -> bool:
    """Whether two content streams are equal but for their footers.

    Compared: the lines both have, less :data:`FOOTER_LINES` (the shorter stream's
    footer is at most that many lines); the longer may hold at most that many more.
    """
    la, lb = a.rstrip(b"\n").split(b"\n"), b.rstrip(b"\n").split(b"\n")
    common = min(len(la), len(lb)) - FOOTER_LINES
    return abs(len(la) - len(lb)) <= FOOTER_LINES and la[:common] == lb[:common]


def _cpu(render, outcomes, drawing_name: str) -> tuple[float, bytes, int]:
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        start = time.process_time()
        data = render(outcomes, title="Cable sizing report", drawing_name=drawing_name,
                      cautions="design aid", tool_version="9.9")
        cpu = time.process_time() - start
    return cpu, data, len(caught)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--baseline", help="a copy of an earlier annotate/report_pdf.py, a folder "
                                           "with report_pdf.py (and pdf_lines.py), or a git revision")
    parser.add_argument("--plant", type=int, help="circuits of a generated plant (default: the sample)")
    parser.add_argument("--work", type=Path, help="folder for the generated plant (kept; default: temporary)")
    parser.add_argument("--repeats", type=int, default=5)
    parser.add_argument("--run-collector", action="store_true",
                        help="time inside cablewright.collector.tuned_collector, as `size` runs "
                             "(default: CPython's collector thresholds)")
    args = parser.parse_args()

    import logging

    logging.basicConfig(level=logging.ERROR)
    from cablewright.annotate import report_pdf

    with tempfile.TemporaryDirectory() as tmp:
        scratch = Path(tmp)
        work = args.work or scratch / "plant"
        drawing, job = _job(args.plant, work)
        variants = {"current": report_pdf.render_report_pdf}
        if args.baseline is not None:
            (scratch / "baseline").mkdir()
            baseline = _load_baseline(_baseline_dir(args.baseline, scratch / "baseline"))
            variants = {"baseline": baseline.render_report_pdf, **variants}
        times: dict[str, list[float]] = {name: [] for name in variants}
        last: dict[str, bytes] = {}
        warned: dict[str, int] = {}
        for render in variants.values():  # imports and first-use caches out of the timing
            _cpu(render, job.outcomes[:2], drawing.name)
        with tuned_collector(None if not args.run_collector else RUN_THRESHOLDS):
            for _ in range(args.repeats):
                for name, render in variants.items():
                    cpu, last[name], warned[name] = _cpu(render, job.outcomes, drawing.name)
                    times[name].append(cpu)
    load = os.getloadavg()
    collector = "run collector (as size)" if args.run_collector else "default collector"
    print(f"{drawing.name}: {len(job.outcomes)} circuits; load average {load[0]:.2f} {load[1]:.2f} "
          f"{load[2]:.2f}; {args.repeats} repeats; {collector}; CPU s min / median / max")
    pages = {name: _pages(data) for name, data in last.items()}
    for name, values in times.items():
        print(f"{name:9s} {min(values):.3f} / {statistics.median(values):.3f} / {max(values):.3f}"
              f"   pages {len(pages[name][0])}, {len(last[name]) / 1e6:.2f} MB, fpdf2 warnings {warned[name]}")
    if "baseline" in times:
        ratios = [b / c for b, c in zip(times["baseline"], times["current"], strict=True)]
        print(f"paired baseline / current: min {min(ratios):.2f} x, median {statistics.median(ratios):.2f} x, "
              f"max {max(ratios):.2f} x")
        (text_a, body_a), (text_b, body_b) = pages["baseline"], pages["current"]
        print(f"same page count: {len(text_a) == len(text_b)}; same text on every page: {text_a == text_b}")
        same = sum(_same_body(a, b) for a, b in zip(body_a, body_b, strict=False))
        print(f"content streams equal apart from the footer: {same} of {len(body_b)} pages; "
              f"files byte for byte equal: {last['baseline'] == last['current']}")


if __name__ == "__main__":
    main()
