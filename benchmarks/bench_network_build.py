"""CPU time of ``build_network`` on a drawing, paired before/after (issue 13 item 6).

The drawing is read once (``read_dxf``, as ``compare_network.py`` reads it) and its
route pieces and equipment are pickled to ``--cache``; each repeat then runs one child
process per variant, in turn (``after``, the installed ``extract/network.py``, and
``before``, another copy given by ``--before``), so that a busy spell of the shared
machine hits both variants of a repeat alike.  Each child imports everything first and
reports the CPU seconds (``time.process_time``) of one ``build_network`` call alone.

Run: ``python benchmarks/bench_network_build.py --before /tmp/network_before.py
--repeats 5 DRAWING`` (without ``--before``: the installed copy only).
Prints each run, then min / median / max per variant and the load average (1, 5, 15 min)
before and after the runs.
"""

from __future__ import annotations

import argparse
import json
import os
import pickle
import statistics
import subprocess
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))


def _child(cache: str, network_file: str | None) -> dict:
    from bench_network import _load_network
    from cablewright.extract.model import DrawingConfig

    network = _load_network(network_file)
    with open(cache, "rb") as fh:
        polylines, equipment = pickle.load(fh)
    config = DrawingConfig()
    t0 = time.process_time()
    net = network.build_network(polylines, equipment, config, source="bench")
    t1 = time.process_time()
    return {"build_s": round(t1 - t0, 3), "segments": len(net.segments), "nodes": net.graph.number_of_nodes()}


def _cache(drawing: Path, cache: Path) -> None:
    from cablewright.extract.model import DrawingConfig
    from compare_network import _content

    polylines, equipment = _content(drawing, DrawingConfig())
    with open(cache, "wb") as fh:
        pickle.dump((list(polylines), list(equipment)), fh)


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("drawing")
    ap.add_argument("--before", default=None, help="another copy of extract/network.py")
    ap.add_argument("--repeats", type=int, default=5)
    ap.add_argument("--cache", default=None, help="pickle of the drawing's pieces (default: beside it)")
    ap.add_argument("--child", default=None, help=argparse.SUPPRESS)
    args = ap.parse_args()
    cache = Path(args.cache or str(args.drawing) + ".pieces.pickle")
    if args.child is not None:
        print(json.dumps(_child(str(cache), args.child or None)))
        return 0
    if not cache.exists():
        _cache(Path(args.drawing), cache)
    variants = {"after": ""} | ({"before": args.before} if args.before else {})
    times: dict[str, list[float]] = {k: [] for k in variants}
    print(f"load average before: {os.getloadavg()}")
    for rep in range(args.repeats):
        for name, path in variants.items():
            cmd = [sys.executable, __file__, args.drawing, "--cache", str(cache), "--child", path]
            r = subprocess.run(cmd, capture_output=True, text=True, check=True)
            out = json.loads(r.stdout.strip().splitlines()[-1])
            times[name].append(out["build_s"])
            print(f"repeat {rep + 1} {name}: {json.dumps(out)}", flush=True)
    print(f"load average after: {os.getloadavg()}")
    for name, ts in times.items():
        print(f"{name}: build CPU min {min(ts):.3f} / median {statistics.median(ts):.3f} / max {max(ts):.3f} s")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
