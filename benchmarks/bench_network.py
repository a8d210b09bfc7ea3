"""Time and peak memory of the route-network build on chained lines (issue 18, item 6).

The drawing is generated here (invented data): ``n`` straight route pieces of 1 m,
end to end, laid as a serpentine of rows of 1,000 pieces 2 m apart (joined at the row
ends), with a source at the first end and a load at the last.  Every piece shares its
ends with its neighbours, so the whole chain is one segment between two tails: the
case where a pairwise scan or a per-piece list search grows as n squared.

Each size runs in a child process (``--child``) so that its peak RSS
(``resource.getrusage(RUSAGE_SELF).ru_maxrss``) is its own; ``--cap-gib`` sets an
address-space limit on the child (``RLIMIT_AS``).  ``--network-file`` measures another
copy of ``extract/network.py`` (the code before a change), or of the ``extract/`` folder
(``network_copy.py``), in place of the installed one.

Run: ``python benchmarks/bench_network.py --sizes 20000 200000 2000000``.
"""

from __future__ import annotations

import argparse
import json
import resource
import subprocess
import sys
import time
from pathlib import Path

ROW_PIECES = 1000  # pieces per serpentine row
ROW_STEP_M = 2.0  # distance between rows, [m]


def chained_lines(n: int):
    """``n`` route pieces of 1 m (plus the row joints among them) and two equipment."""
    from cablewright.extract.model import Equipment, RoutePolyline

    pieces = []
    x, y = 0.0, 0.0
    direction = 1.0
    k = 0
    while k < n:
        if k and k % ROW_PIECES == 0:  # a joint up to the next row
            pieces.append(RoutePolyline(((x, y, 0.0), (x, y + ROW_STEP_M, 0.0)), "ROUTE-TRAY", "tray", "E", f"J{k}"))
            y += ROW_STEP_M
            direction = -direction
            k += 1
            continue
        x2 = x + direction
        pieces.append(RoutePolyline(((x, y, 0.0), (x2, y, 0.0)), "ROUTE-TRAY", "tray", "E", f"L{k}"))
        x = x2
        k += 1
    equipment = [
        Equipment("SRC", "E1", (0.0, -0.5, 0.0), "MCC"),
        Equipment("LOAD", "E2", (x, y + 0.5, 0.0), "MOTOR"),
    ]
    return pieces, equipment


def _load_network(path: str | None):
    if path is None:
        from cablewright.extract import network

        return network
    sys.path.insert(0, str(Path(__file__).resolve().parent))
    from network_copy import load_network

    return load_network(path, "_network_measured")


def child(n: int, network_file: str | None) -> dict:
    from cablewright.extract.grouping import circuits_per_segment
    from cablewright.extract.model import DrawingConfig, ScheduleRow
    from cablewright.extract.routing import route_circuits

    network = _load_network(network_file)
    pieces, equipment = chained_lines(n)
    t0 = time.process_time()
    net = network.build_network(pieces, equipment, DrawingConfig())
    t1 = time.process_time()
    row = ScheduleRow("bench", 2, "C-1", "SRC", "LOAD")
    routes, failures = route_circuits(net, [row], DrawingConfig())
    per_segment = circuits_per_segment(routes)
    t2 = time.process_time()
    rss_mib = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    return {
        "pieces": len(pieces),
        "build_s": round(t1 - t0, 2),
        "route_group_s": round(t2 - t1, 2),
        "peak_rss_mib": round(rss_mib),
        "segments": len(net.segments),
        "routed_m": round(routes["C-1"].routed_length_m, 3) if "C-1" in routes else None,
        "failures": failures,
        "segments_grouped": len(per_segment),
    }


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", type=int, nargs="+", default=[20000, 200000, 2000000])
    ap.add_argument("--cap-gib", type=float, default=None, help="address-space cap of each child")
    ap.add_argument("--network-file", default=None, help="another copy of extract/network.py")
    ap.add_argument("--child", type=int, default=None, help=argparse.SUPPRESS)
    args = ap.parse_args()
    if args.child is not None:
        if args.cap_gib:
            cap = int(args.cap_gib * 2**30)
            resource.setrlimit(resource.RLIMIT_AS, (cap, cap))
        print(json.dumps(child(args.child, args.network_file)))
        return
    for n in args.sizes:
        cmd = [sys.executable, __file__, "--child", str(n)]
        if args.cap_gib:
            cmd += ["--cap-gib", str(args.cap_gib)]
        if args.network_file:
            cmd += ["--network-file", args.network_file]
        t0 = time.perf_counter()
        r = subprocess.run(cmd, capture_output=True, text=True)
        wall = time.perf_counter() - t0
        if r.returncode == 0:
            out = json.loads(r.stdout.strip().splitlines()[-1])
            out["wall_s"] = round(wall, 1)
            print(json.dumps(out), flush=True)
        else:
            last = (r.stderr.strip().splitlines() or ["?"])[-1]
            print(json.dumps({"pieces": n, "failed": last[:200], "exit": r.returncode,
                              "wall_s": round(wall, 1)}), flush=True)


if __name__ == "__main__":
    main()
