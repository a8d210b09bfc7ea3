"""Compare two copies of extract/network.py on the same drawings: routes and grouping identical.

Reads each drawing once, builds the network with the installed code and with another
copy (``--before``, e.g. ``git show <commit>:extract/network.py > /tmp/network_before.py``, or a
copy of the whole ``extract/`` folder for a build split over modules: ``network_copy.py``),
routes every circuit of the schedule and compares: segments (ids, sources, layer,
lengths, points), segment ends and graph nodes, tails, tag failures, issues, the graph's
edges with their attributes, every circuit's route and the circuits on every segment.
Exit 0 when everything is identical, 1 with the first differences listed.

Run: ``python benchmarks/compare_network.py --before /tmp/network_before.py DRAWING [SCHEDULE] ...``
(drawing and schedule as pairs ``plant.dxf:plant_circuits.csv``; ``chain:N`` is the chained
lines of ``bench_network.py`` with N pieces, routed from its source to its load).
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path


def _load(path: str):
    sys.path.insert(0, str(Path(__file__).resolve().parent))
    from network_copy import load_network

    return load_network(path)


def _content(drawing: Path, config):
    if str(drawing).startswith("chain:"):
        sys.path.insert(0, str(Path(__file__).resolve().parent))
        from bench_network import chained_lines

        return chained_lines(int(str(drawing)[len("chain:"):]))
    if drawing.suffix.lower() == ".ifc":
        from cablewright.extract.ifc_reader import read_ifc

        c = read_ifc(drawing, config)
    else:
        from cablewright.extract.dxf_reader import read_dxf

        c = read_dxf(drawing, config)
    return c.polylines, c.equipment


def _snapshot(net, rows, config) -> dict:
    from cablewright.extract.grouping import circuits_per_segment
    from cablewright.extract.routing import route_circuits

    routes, failures = route_circuits(net, rows, config)
    g = net.graph
    return {
        "segments": net.segments,
        "segment_ends": net.segment_ends,
        "segment_nodes": net.segment_nodes,
        "source_segments": net.source_segments,
        "tails": {k: (t.tag, t.node, t.length_m, t.start_m, t.end_m) for k, t in net.tails.items()},
        "tag_failures": net.tag_failures,
        "issues": [i for i in net.issues if i.code != "bad-coordinate"],
        "nodes": sorted((n, repr(d)) for n, d in g.nodes(data=True)),
        "edges": sorted((min(u, v), max(u, v), repr(sorted(d.items()))) for u, v, d in g.edges(data=True)),
        "routes": routes,
        "failures": failures,
        "per_segment": circuits_per_segment(routes),
    }


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--before", required=True,
                    help="the other copy of extract/network.py, or of the extract/ folder (network_copy.py)")
    ap.add_argument("drawings", nargs="+", help="DRAWING or DRAWING:SCHEDULE")
    args = ap.parse_args()
    from cablewright.extract.model import DrawingConfig
    from cablewright.extract.network import build_network
    from cablewright.extract.schedule import read_schedule, rows_from_equipment

    before = _load(args.before)
    config = DrawingConfig()
    bad = 0
    for item in args.drawings:
        drawing, _, schedule = (item, "", "") if item.startswith("chain:") else item.partition(":")
        polylines, equipment = _content(Path(drawing), config)
        if drawing.startswith("chain:"):
            from cablewright.extract.model import ScheduleRow

            rows = [ScheduleRow("chain", 2, "C-1", "SRC", "LOAD")]
        else:
            rows = read_schedule(schedule) if schedule else rows_from_equipment(equipment)
        a = _snapshot(before.build_network(polylines, equipment, config), rows, config)
        b = _snapshot(build_network(polylines, equipment, config), rows, config)
        diff = [k for k in a if a[k] != b[k]]
        print(f"{drawing}: {len(polylines)} pieces, {len(b['segments'])} segments, "
              f"{len(b['routes'])} routes: {'identical' if not diff else 'DIFFERENT in ' + ', '.join(diff)}")
        bad += bool(diff)
    return 1 if bad else 0


if __name__ == "__main__":
    raise SystemExit(main())
