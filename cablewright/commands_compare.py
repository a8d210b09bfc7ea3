"""``cablewright compare OLD NEW``: what changed between two runs of ``size``."""

from __future__ import annotations

import argparse

from cablewright.annotate.changes import ChangeReport, compare_documents, load_document

from .console import format_table
from .outputs import changes_json

__all__ = ["run_compare", "changes_table"]


def changes_table(report: ChangeReport) -> str:
    """The change report for the terminal: circuits that changed, cable order deltas, segments."""
    rows = [[c.circuit_id, c.change, c.summary()] for c in report.circuits if c.change != "unchanged"]
    counts = ", ".join(f"{report.count(k)} {k}" for k in ("new", "removed", "changed", "unchanged"))
    out = [format_table(["circuit", "change", "what changed"], rows) if rows else "no circuit changed"]
    orders = [[o.cable, f"{o.old_m:.1f}", f"{o.new_m:.1f}", f"{o.delta_m:+.1f}"]
              for o in report.orders if abs(o.delta_m) >= 0.05]
    if orders:
        out.append("\ncable to order:")
        out.append(format_table(["cable", "before [m]", "now [m]", "change [m]"], orders))
    segs = [[s.segment_id, s.layer, s.change, "; ".join(f"{n} {a} -> {b}" for n, a, b in s.fields)]
            for s in report.segments if s.change == "changed"]
    if segs:
        out.append("\nsegments:")
        out.append(format_table(["segment", "layer", "change", "what changed"], segs))
    out.append(f"\n{counts}")
    return "\n".join(out)


def run_compare(args: argparse.Namespace) -> int:
    """Compare two output folders (or their schedule.json); 0 when compared, 2 when unusable."""
    old = load_document(args.old)
    new = load_document(args.new)
    report = compare_documents(old, new)
    if args.json:
        print(changes_json(report, str(args.old)), end="")
    else:
        print(changes_table(report))
    return 0
