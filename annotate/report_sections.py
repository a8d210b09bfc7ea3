"""Sections of report.html for the take-off (cables, drums, devices, fill) and the changes."""

from __future__ import annotations

from .changes import ChangeReport
from .report import _e, _num, _table
from .rows import METRE, LengthUnit
from .takeoff import Takeoff

__all__ = ["takeoff_sections", "changes_section"]


def takeoff_sections(takeoff: Takeoff, unit: LengthUnit = METRE) -> list[str]:
    """``Cable to order``, ``Protective devices`` and ``Tray and duct fill`` sections,
    lengths in ``unit`` (:func:`.rows.length_unit`)."""
    rows = []
    u = unit.symbol
    for q in takeoff.quantities:
        plan = q.plan
        drums = "<br>".join(
            _e(f"{unit.of(d.length_m):g} {u} drum: " + ", ".join(f"{c.circuit_id} {unit.text(c.length_m)}"
                                                               for c in d.cuts)
               + f" (waste {unit.text(d.waste_m)})") for d in plan.drums)
        if plan.too_long:
            drums += "<br>" + _e("longer than any drum (order a special length or joint): "
                                 + ", ".join(f"{c.circuit_id} {unit.text(c.length_m)}" for c in plan.too_long))
        rows.append((_e(q.cable.text()), str(q.circuits), str(q.runs), unit.text(q.length_to_order_m, 1, "–"),
                     str(len(plan.drums)), unit.text(plan.waste_m, 1, "–"), drums))
    out = ["<h2>Cable to order</h2>",
           "<p class='muted'>Design length (routed length with the allowances) times parallel cables, "
           "per cable type; drums packed longest cut first (first-fit decreasing), each drum the "
           "shortest listed length that holds its cuts.</p>",
           _table(("cable", "circuits", "runs", "length to order", "drums", "waste", "drum plan"), rows,
                  {1, 2, 3, 4, 5})]
    out += ["<h2>Protective devices</h2>",
            _table(("kind", "rating", "count"),
                   [(_e(d.kind), _num(d.rating_a, 0, "A"), str(d.count)) for d in takeoff.devices], {1, 2})]
    fill_rows = []
    for r in takeoff.segments:
        f = r.fill
        if f.result == "not_applicable":
            continue
        fill_rows.append((_e(r.segment.segment_id), _e(r.segment.layer), unit.text(r.segment.length_m, 1, "–"),
                          str(len(r.circuits)), str(r.cables), _num(f.size_mm, 0, "mm"),
                          _num(f.percent, 1, "%"), _num(f.limit_percent, 0, "%"), _e(f.result), _e(f.message)))
    out += ["<h2>Tray and duct fill</h2>",
            "<p class='muted'>Trays and ladders: one layer, sum of outer diameters against the usable "
            "width; conduits and ducts: cable area against inner area (both common practice). Outer "
            "diameters: typical maker data, from memory unless the config gives them; check against "
            "the chosen cable's data sheet.</p>",
            _table(("segment", "layer", "length", "circuits", "cables", "size", "fill", "limit", "result",
                    "message"), fill_rows, {2, 3, 4, 5, 6, 7})]
    return out


def changes_section(report: ChangeReport, previous: str, unit: LengthUnit = METRE) -> str:
    """``Changes since the previous run`` section: changed, new and removed circuits, order deltas
    (in ``unit``)."""
    counts = ", ".join(f"{report.count(k)} {k}" for k in ("new", "removed", "changed", "unchanged"))
    rows = [(_e(c.circuit_id), _e(c.change), _e(c.summary())) for c in report.circuits if c.change != "unchanged"]
    orders = [(_e(o.cable), unit.text(o.old_m, 1, "–"), unit.text(o.new_m, 1, "–"), unit.text(o.delta_m, 1, "–"))
              for o in report.orders if abs(o.delta_m) >= 0.05]
    segs = [(_e(s.segment_id), _e(s.layer), _e(s.change),
             _e("; ".join(f"{n} {a} -> {b}" for n, a, b in s.fields))) for s in report.segments]
    out = [f"<h2>Changes since the previous run</h2><p class='muted'>Compared with {_e(previous)}: {counts}.</p>",
           _table(("circuit", "change", "what changed"), rows)]
    if orders:
        out.append(_table(("cable", "to order before", "to order now", "change"), orders, {1, 2, 3}))
    if segs:
        out.append(_table(("segment", "layer", "change", "what changed"), segs))
    return "".join(out)
