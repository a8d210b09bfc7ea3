"""CPU time of report.pdf on the sample drawing: a baseline renderer against the current one.

The sample job is measured and sized once; then, in each repeat, the baseline
``render_report_pdf`` and the current one run one after the other (paired, so a
busy spell of the shared machine hits both of that repeat).  Each render's CPU
time is ``time.process_time``.  Both PDFs are read back with pypdf and their text
per page compared.

Usage::

    git show 9b8785a:annotate/report_pdf.py > /tmp/report_pdf_before.py
    .venv/bin/python benchmarks/bench_report_pdf.py --baseline /tmp/report_pdf_before.py --repeats 7
"""

from __future__ import annotations

import argparse
import importlib.util
import io
import os
import statistics
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
DXF = ROOT / "sample_drawings" / "pumping_station.dxf"
CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"


def _load_baseline(path: Path):
    """The baseline module, imported inside ``cablewright.annotate`` so its relative imports work."""
    spec = importlib.util.spec_from_file_location("cablewright.annotate._report_pdf_baseline", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def _pages(data: bytes) -> list[str]:
    import pypdf

    return [page.extract_text() for page in pypdf.PdfReader(io.BytesIO(data)).pages]


def _cpu(render, outcomes) -> tuple[float, bytes]:
    start = time.process_time()
    data = render(outcomes, title="Cable sizing report", drawing_name=DXF.name, cautions="design aid")
    return time.process_time() - start, data


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--baseline", type=Path, help="a copy of an earlier annotate/report_pdf.py")
    parser.add_argument("--repeats", type=int, default=5)
    args = parser.parse_args()

    from cablewright.annotate import report_pdf

    from cablewright import pipeline
    from cablewright.config import load_settings

    settings = load_settings(None)
    job = pipeline.size_measurement(pipeline.measure_drawing(DXF, CSV, settings), settings)
    variants = {"current": report_pdf.render_report_pdf}
    if args.baseline is not None:
        variants = {"baseline": _load_baseline(args.baseline).render_report_pdf, **variants}
    times: dict[str, list[float]] = {name: [] for name in variants}
    last: dict[str, bytes] = {}
    for _ in range(args.repeats):
        for name, render in variants.items():
            cpu, last[name] = _cpu(render, job.outcomes)
            times[name].append(cpu)
    print(f"load average {os.getloadavg()[0]:.2f} {os.getloadavg()[1]:.2f} {os.getloadavg()[2]:.2f}; "
          f"{args.repeats} repeats; CPU s min / median / max")
    for name, values in times.items():
        print(f"{name:9s} {min(values):.3f} / {statistics.median(values):.3f} / {max(values):.3f}"
              f"   pages {len(_pages(last[name]))}")
    if "baseline" in times:
        ratios = [b / c for b, c in zip(times["baseline"], times["current"], strict=True)]
        print(f"paired baseline / current: median {statistics.median(ratios):.1f} x")
        same = _pages(last["baseline"]) == _pages(last["current"])
        print(f"same text on every page: {same}")


if __name__ == "__main__":
    main()
