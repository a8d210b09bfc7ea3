"""Benchmark: read + network + routing + grouping of an IFC model with ~5,000 carrier pieces.

Generates a grid of tray runs (segments joined through tee/bend fittings by ports, with
a board and loads along the runs), writes it, then times each stage.  Target: < 30 s
for the four stages together.  Run: ``python benchmarks/bench_ifc.py [pieces]``.
"""

from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT / "sample_drawings"))

from cablewright.extract.grouping import circuits_per_segment, group_summary  # noqa: E402
from cablewright.extract.ifc_reader import read_ifc  # noqa: E402
from cablewright.extract.model import DrawingConfig, ScheduleRow  # noqa: E402
from cablewright.extract.network import build_network  # noqa: E402
from cablewright.extract.routing import route_circuits  # noqa: E402
from generate_pumping_station_ifc import IfcModelBuilder  # noqa: E402


def build(pieces: int, path: Path) -> tuple[int, int]:
    """A spine along x with branches along y, every 2 m; returns (circuits, carrier pieces)."""
    b = IfcModelBuilder("IFC4", "mm", seed="bench")
    step = 2.0
    per_branch = 8  # segments per branch
    # per branch: 1 spine segment, 1 tee, per_branch segments, per_branch - 1 bends
    n_branch = max(1, pieces // (2 * per_branch + 1))
    prev_end = None
    loads = []
    for k in range(n_branch):
        x0, x1 = k * step, (k + 1) * step
        _, sp = b.segment([(x0, 0, 3), (x1, 0, 3)], name=f"spine {k}")
        _, tee = b.fitting((x1, 0, 3), 3, predefined="TEE")
        if prev_end is not None:
            b.connect(prev_end, sp[0])
        b.connect(sp[1], tee[0])
        prev = tee[2]
        for j in range(per_branch):
            _, br = b.segment([(x1, j * step, 3), (x1, (j + 1) * step, 3)], name=f"branch {k}/{j}")
            b.connect(prev, br[0])
            if j < per_branch - 1:
                _, bend = b.fitting((x1, (j + 1) * step, 3), 2, predefined="BEND")
                b.connect(br[1], bend[0])
                prev = bend[1]
        prev_end = tee[1]
        tag = f"M{k}"
        b.equipment("IfcElectricMotor", tag, (x1 + 0.5, per_branch * step, 0.5))
        loads.append(tag)
    b.equipment("IfcElectricDistributionBoard", "DB", (0, -1, 0))
    b.write(path)
    carriers = len(b.f.by_type("IfcCableCarrierSegment")) + len(b.f.by_type("IfcCableCarrierFitting"))
    return len(loads), carriers


def main(pieces: int = 5000) -> None:
    with tempfile.TemporaryDirectory() as tmp:
        path = Path(tmp) / "bench.ifc"
        t0 = time.perf_counter()
        n_loads, n_pieces = build(pieces, path)
        t_build = time.perf_counter() - t0
        config = DrawingConfig()
        t0 = time.perf_counter()
        content = read_ifc(path, config)
        t_read = time.perf_counter() - t0
        t0 = time.perf_counter()
        net = build_network(content.polylines, content.equipment, config)
        t_net = time.perf_counter() - t0
        rows = [ScheduleRow("bench", k + 1, f"C{k}", "DB", f"M{k}", (("load", "5 kW"),)) for k in range(n_loads)]
        t0 = time.perf_counter()
        routes, failures = route_circuits(net, rows, config)
        t_route = time.perf_counter() - t0
        t0 = time.perf_counter()
        per = circuits_per_segment(routes)
        group_summary(routes, per)
        t_group = time.perf_counter() - t0
    total = t_read + t_net + t_route + t_group
    print(f"model: {n_pieces} carrier pieces (segments and fittings; {content.port_links} port links), "
          f"{len(content.equipment)} equipment, {n_loads} circuits; written in {t_build:.1f} s")
    print(f"read {t_read:.2f} s | network {t_net:.2f} s | routing {t_route:.2f} s | "
          f"grouping {t_group:.2f} s | total {total:.2f} s (target < 30 s)")
    print(f"routed {len(routes)}, failed {len(failures)}")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 5000)
