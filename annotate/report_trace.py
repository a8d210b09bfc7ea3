"""One circuit followed from the load as given to the chosen cable: the rows both reports print.

:func:`circuit_trace` turns a :class:`.model.CircuitOutcome` into plain-text
tables (load, design current with its formula, device, correction factors,
capacity table and tabulated value, Iz, checks), each number beside the clause
or table it comes from.  ``report.html`` (:mod:`.report`) and ``report.pdf``
(:mod:`.report_pdf`) render the same rows, so the two never disagree.

A check's outcome is one of pass / fail / not checked / not applicable
(:func:`check_result`): a check that could not be made is never shown as a pass.

References
----------
.. [1] IEC 60364-4-43:2008, 433.1 (Ib <= In <= Iz, I2 <= 1.45 Iz: the order of the steps).
.. [2] IEC 60050-131:2002, 131-11-42 (P = √3 U I cos φ of a balanced three-phase load).
.. [3] IEC 60364-5-52:2009, Annex B (tabulated capacities, correction factors).
"""

from __future__ import annotations

import math
import os
from collections import Counter
from collections.abc import Sequence
from dataclasses import dataclass, field
from datetime import datetime, timezone
from typing import Any

from .model import CircuitOutcome
from .rows import METRE, LengthUnit, length_unit

__all__ = [
    "ReportConfig",
    "TraceTable",
    "CircuitTrace",
    "RESULT_TEXT",
    "check_result",
    "circuit_trace",
    "failures_first",
    "check_counts",
    "report_date",
]

#: How each check outcome is written in the reports.
RESULT_TEXT = {"pass": "pass", "fail": "FAIL", "not_checked": "not checked",
               "not_applicable": "not applicable"}


@dataclass(frozen=True)
class ReportConfig:
    """The ``[annotate]`` keys the report reads (beside the drawing's own keys).

    Attributes
    ----------
    project : str
        Project name in the header of every page; "" writes the drawing's name.
    revision : str
        Revision of the submittal in the header; "" writes "-".
    date : str
        Date in the header; "" takes ``SOURCE_DATE_EPOCH`` when set, else none
        (so that re-runs give byte-identical files).
    """

    project: str = ""
    revision: str = ""
    date: str = ""


def report_date(config: ReportConfig) -> str:
    """The header's date: the config's, else ``SOURCE_DATE_EPOCH`` (UTC, ISO 8601), else ""."""
    if config.date:
        return config.date
    epoch = os.environ.get("SOURCE_DATE_EPOCH", "").strip()
    if epoch.isdigit():
        return datetime.fromtimestamp(int(epoch), tz=timezone.utc).strftime("%Y-%m-%d")
    return ""


@dataclass(frozen=True)
class TraceTable:
    """A small table of plain text: a caption, headers and rows."""

    caption: str
    headers: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]
    #: Per row, the check outcome (``pass``/``fail``/``not_checked``/``not_applicable``) or "".
    results: tuple[str, ...] = ()


@dataclass(frozen=True)
class CircuitTrace:
    """What the reports print for one circuit."""

    circuit_id: str
    title: str
    status: str
    messages: tuple[str, ...]
    lines: tuple[str, ...]
    tables: tuple[TraceTable, ...] = field(default_factory=tuple)
    #: The capacity table and its tabulated value, e.g. ("IEC 60364-5-52:2009 Table B.52.12, column E", "246 A").
    capacity: tuple[str, str] | None = None

    @property
    def not_checked(self) -> int:
        """Checks of this circuit that could not be made (shown beside its status)."""
        return sum(r == "not_checked" for t in self.tables for r in t.results)


def check_result(check: Any) -> str:
    """The outcome of a check: ``pass``, ``fail``, ``not_checked`` or ``not_applicable``.

    Reads the check's ``result`` when it carries one; otherwise a check whose
    source is "not applicable" is not applicable, one whose message starts
    "not checked" was not made (it passes only for want of data), the rest pass
    or fail by ``passed``.
    """
    result = getattr(check, "result", None)
    result = getattr(result, "value", result)
    if isinstance(result, str) and result:
        return result.replace(" ", "_")
    if getattr(check, "source", "") == "not applicable":
        return "not_applicable"
    if str(getattr(check, "message", "")).lower().startswith("not checked"):
        return "not_checked"
    return "pass" if check.passed else "fail"


def _n(value: float | None, digits: int = 2, unit: str = "") -> str:
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return "-"
    return f"{float(value):.{digits}f} {unit}".strip()


def _g(value: float) -> str:
    return f"{value:g}"


def _load_rows(spec: Any, unit: LengthUnit = METRE) -> tuple[tuple[str, ...], ...]:
    """The load as written in the schedule (or the config default it took): (name, value, from)."""
    load = spec.load
    u_kind = "line-to-line" if spec.phases == 3 else "line-to-neutral"
    rows = [
        ("load", f"{_g(load.value)} {load.unit}", "schedule load"),
        ("load type", spec.load_type, "schedule load_type"),
        ("voltage U", f"{_g(spec.voltage_v)} V {u_kind}", "schedule voltage or config"),
        ("phases", str(spec.phases), "schedule phases"),
    ]
    if load.unit in ("kW", "hp"):
        rows.append(("power factor cos φ", f"{spec.power_factor:g}", "schedule or config"))
        rows.append(("efficiency η", f"{spec.efficiency:g}", "schedule (default 1)"))
    rows.append(("design length", unit.text(spec.design_length_m, 1),
                 "routed + allowances"))
    return tuple(rows)


def design_current_formula(spec: Any, ib_a: float) -> str:
    """Ib with its formula and the numbers put in (the same equation as :func:`.sizing.load.design_current_a`)."""
    load, u = spec.load, spec.voltage_v
    k_text = "√3 × " if spec.phases == 3 else ""
    k = math.sqrt(3.0) if spec.phases == 3 else 1.0
    source = "IEC 60050-131:2002 131-11-42 (P = √3 U I cos φ)" if spec.phases == 3 else \
        "IEC 60050-131:2002 131-11-42 (P = U I cos φ, one phase)"
    if load.unit == "A":
        return f"Ib = {_g(load.value)} A, as given in the schedule"
    if load.unit == "kVA":
        s_source = "IEC 60050-131:2002 131-11-41 (S = √3 U I)" if spec.phases == 3 else \
            "IEC 60050-131:2002 131-11-41 (S = U I, one phase)"
        return (f"Ib = S / ({k_text}U) = {_g(load.value * 1000)} VA / ({k_text}{_g(u)} V) "
                f"= {ib_a:.1f} A; {s_source}")
    power_w = load.value * 1000.0
    lead = ""
    if load.unit == "hp":
        power_w = load.value * 746.0
        lead = f"P = {_g(load.value)} hp × 0.746 kW/hp = {power_w / 1000:.2f} kW (contract: 1 hp = 0.746 kW); "
    check = power_w / spec.efficiency / (k * u * spec.power_factor)
    text = (f"{lead}Ib = P / (η × {k_text}U × cos φ) = {power_w:.0f} W / "
            f"({spec.efficiency:g} × {k_text}{_g(u)} V × {spec.power_factor:g}) = {check:.1f} A; {source}")
    return text


def _factor_rows(s: Any) -> tuple[tuple[str, ...], ...]:
    return tuple((f.name, f.source, f.detail or "-", _n(f.value, 3)) for f in s.factors)


def circuit_trace(o: CircuitOutcome, unit: LengthUnit | None = None) -> CircuitTrace:
    """The circuit followed from its inputs to its result (see the module docstring).

    Lengths are shown in ``unit`` (``None``: the unit of the circuit's rule set,
    :func:`.rows.length_unit`).
    """
    unit = unit or length_unit(o.sizing.standard if o.sizing is not None else "iec")
    title = f"{o.circuit_id}: {o.from_tag} → {o.to_tag}"
    lines: list[str] = []
    tables: list[TraceTable] = []
    route = o.route
    if route is not None:
        segs = ", ".join(getattr(route, "segment_ids", ()) or ()) or "-"
        lines.append(
            f"Route: routed length {unit.text(route.routed_length_m)} (tails "
            f"{unit.text(route.source_tail_m)} + {unit.text(route.load_tail_m)}), "
            f"design length {unit.text(route.design_length_m)}; segments {segs}.")
    s = o.sizing
    spec = getattr(s, "spec", None) if s is not None else None
    if spec is not None:
        rows = _load_rows(spec, unit)
        tables.append(TraceTable("1. Load as given", tuple(r[0] for r in rows),
                                 (tuple(r[1] for r in rows), tuple(r[2] for r in rows))))
    if s is None or s.load_current_a is None:
        lines.append("Not sized.")
        return CircuitTrace(o.circuit_id, title, o.status, o.messages, tuple(lines), tuple(tables))
    steps: list[tuple[str, ...]] = []
    ib_text = (design_current_formula(spec, s.load_current_a) if spec is not None
               else f"Ib = {s.load_current_a:.1f} A")
    steps.append(("design current Ib", _n(s.load_current_a, 1, "A"), ib_text))
    margin = getattr(s, "device_margin", None)
    rule = (f"smallest standard rating ≥ {margin:g} × Ib = {margin * s.load_current_a:.1f} A; "
            "IEC 60364-4-43:2008 433.1 (Ib ≤ In)" if margin is not None
            else "IEC 60364-4-43:2008 433.1 (Ib ≤ In)")
    steps.append((f"device In ({s.device_kind or 'device'})", _n(s.device_rating_a, 0, "A"), rule))
    i2 = next((c for c in s.checks if c.name == "overload"), None)
    if i2 is not None:
        steps.append(("conventional operating current I2", _n(i2.value, 1, "A"),
                      getattr(s, "device_source", "") or i2.source))
    steps.append(("installation method", s.method or "-",
                  "IEC 60364-5-52:2009 Table B.52.1 (reference methods); governing segment "
                  f"{s.governing_segment or '-'}, {s.cables_in_group} cables in the group"))
    tables.append(TraceTable("2. Design current and device", ("quantity", "value", "rule and source"),
                             tuple(steps)))
    if s.factors:
        rows = _factor_rows(s) + (("k (product)", "", "", _n(s.correction_factor, 3)),)
        tables.append(TraceTable("3. Correction factors", ("factor", "table", "row read", "value"), rows))
    capacity = None
    cap_rows: list[tuple[str, ...]] = [
        ("required n × It ≥ max(In, I2/1.45) / k", _n(s.required_capacity_a, 1, "A"),
         "IEC 60364-4-43:2008 433.1 (In ≤ Iz, I2 ≤ 1.45 Iz)"),
    ]
    c = s.cable
    tab = getattr(s, "tabulated_capacity_a", None)
    table_name = getattr(s, "capacity_table", "")
    if c is not None:
        if tab is not None:
            capacity = (table_name, _n(tab, 0, "A"))
            cap_rows.append(("tabulated It, one cable", _n(tab, 0, "A"),
                             f"{table_name}: {getattr(s, 'capacity_detail', '')}"))
            cap_rows.append(("Iz = n × It × k", _n(c.capacity_a, 1, "A"),
                             f"{c.parallel} × {tab:g} A × {_n(s.correction_factor, 3)}"))
        else:
            cap_rows.append(("Iz", _n(c.capacity_a, 1, "A"), "corrected capacity of all parallel cables"))
        cap_rows.append(("chosen cable", c.describe(), f"size set by {c.governed_by}"))
    else:
        cap_rows.append(("chosen cable", "none", ""))
    tables.append(TraceTable("4. Capacity", ("quantity", "value", "table / formula"), tuple(cap_rows)))
    vd = s.voltage_drop
    if vd is not None:
        extra = (f"; from the origin {vd.cumulative_percent:.2f} %" if vd.cumulative_percent is not None
                 and abs(vd.cumulative_percent - vd.percent) > 1e-9 else "")
        lines.append(f"Voltage drop at Ib over the design length: {vd.volts:.2f} V = {vd.percent:.2f} % "
                     f"(limit {vd.limit_percent:g} %), {vd.mv_per_a_m:.3f} mV/A/m; simplified formula of "
                     f"Annex G {vd.annex_g_percent:.2f} %{extra}.")
    if s.checks:
        check_rows: list[tuple[str, ...]] = []
        results: list[str] = []
        for ch in s.checks:
            result = check_result(ch)
            note = ch.message
            if result == "not_checked":
                why = note[len("not checked"):].lstrip(": ") if note.lower().startswith("not checked") else note
                shown = (ch.name, f"not checked ({why or 'no data'})", "-", "-", "", ch.source)
            elif result == "not_applicable":
                shown = (ch.name, f"not applicable ({note})" if note else "not applicable", "-", "-", "", "")
            else:
                shown = (ch.name, RESULT_TEXT.get(result, result) + (f" ({note})" if note else ""),
                         _n(ch.value, 3), _n(ch.limit, 3), ch.unit, ch.source)
            check_rows.append(shown)
            results.append(result)
        tables.append(TraceTable("5. Checks", ("check", "result", "value", "limit", "unit", "clause"),
                                 tuple(check_rows), tuple(results)))
    return CircuitTrace(o.circuit_id, title, o.status, o.messages, tuple(lines), tuple(tables), capacity)


_SEVERITY = {"error": 0, "fail": 1, "warning": 2, "ok": 3}


def failures_first(outcomes: Sequence[CircuitOutcome]) -> list[tuple[str, str, str]]:
    """(circuit, status, reason) of every circuit not ``ok``, errors then failures then warnings."""
    bad = [o for o in outcomes if o.status != "ok"]
    bad.sort(key=lambda o: _SEVERITY.get(o.status, 0))
    return [(o.circuit_id, o.status, "; ".join(o.messages) or "-") for o in bad]


def check_counts(outcomes: Sequence[CircuitOutcome]) -> Counter:
    """How many checks passed, failed, were not made or did not apply, over all circuits."""
    counts: Counter = Counter()
    for o in outcomes:
        for ch in (o.sizing.checks if o.sizing is not None else ()):
            counts[check_result(ch)] += 1
    return counts
