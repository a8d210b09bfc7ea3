"""Terminal output: step-by-step calculation of one circuit, and summary tables."""

from __future__ import annotations

import textwrap
from collections.abc import Iterable

from cablewright.sizing.model import SizingResult

__all__ = ["CAUTION", "calc_steps", "format_table"]

CAUTION = (
    "Design aid only: check every result with a qualified person against local wiring rules, "
    "the cable maker's data and the installation as built."
)


#: Width of the terminal the tables are fitted to (issue 10: a 100-column terminal).
TABLE_WIDTH = 100
#: The last column (reason, source) is wrapped, never narrower than this.
MIN_LAST_WIDTH = 24


def _cut(text: str, width: int) -> str:
    return text if len(text) <= width else text[: max(0, width - 1)] + "\u2026"


def format_table(headers: list[str], rows: Iterable[list[str]], width: int = TABLE_WIDTH,
                 min_last: int = MIN_LAST_WIDTH, keep: tuple[int, ...] = ()) -> str:
    """A plain text table with aligned columns, fitted to ``width`` characters.

    The last column is wrapped onto further lines; when that is not enough,
    the widest other columns (except those in ``keep``) are cut, ending in an
    ellipsis.

    Examples
    --------
    >>> print(format_table(["a", "note"], [["1", "one two three"]], width=10, min_last=7))
    a  note
    -  -------
    1  one two
       three
    """
    rows = [list(map(str, r)) for r in rows]
    widths = [len(h) for h in headers]
    for row in rows:
        for i, cell in enumerate(row):
            widths[i] = max(widths[i], len(cell))
    budget = width - 2 * (len(widths) - 1)
    last_min = min(widths[-1], max(min_last, len(headers[-1])))
    while sum(widths) > budget and widths[-1] > last_min:
        widths[-1] -= 1
    while sum(widths) > budget:
        cuttable = [k for k in range(len(widths) - 1) if k not in keep]
        if not cuttable:
            break
        i = max(cuttable, key=lambda k: widths[k] - len(headers[k]))
        if widths[i] <= max(len(headers[i]), 4):
            break
        widths[i] -= 1
    indent = sum(widths[:-1]) + 2 * (len(widths) - 1)

    def render(cells: list[str]) -> list[str]:
        head = "  ".join(_cut(c, w).ljust(w) for c, w in zip(cells[:-1], widths, strict=False))
        last = textwrap.wrap(cells[-1], widths[-1]) if len(cells) == len(widths) else []
        first = (head + "  " if len(widths) > 1 else "") + (last[0] if last else "")
        return [first.rstrip()] + [(" " * indent + more).rstrip() for more in last[1:]]

    out = render(headers)
    out.append("  ".join("-" * w for w in widths))
    for row in rows:
        out.extend(render(row))
    return "\n".join(out)


#: Sources of the calc steps under each rule set ([sizing] standard).
_STEP_SOURCES = {
    "iec": {"ib": "IEC 60050-131, P = k U I cos phi",
            "in": "smallest standard rating >= margin x Ib ([sizing] device_margin, 1.0: IEC 60364-4-43 433.1)",
            "method": "IEC 60364-5-52:2009 Table B.52.1",
            "need": "max(In, I2/1.45) / correction, IEC 60364-4-43 433.1",
            "iz": "IEC 60364-5-52:2009 Annex B",
            "vd": "IEC 60228 R at the temperature of check voltage_drop + 0.08 mOhm/m (IEC 60364-5-52 Annex G)"},
    "nec": {"ib": "NFPA 70:2023 Table 430.248/430.250 for motors in hp, else P = k U I cos phi",
            "in": "NFPA 70:2023 Table 240.6(A): 210.20(A), 215.3; motors 430.52",
            "method": "route's installation (NFPA 70:2023 310.16, 310.17, 392.80(A))",
            "need": "load (or In) / correction, NFPA 70:2023 310.15, 240.4",
            "iz": "NFPA 70:2023 Table 310.16/310.17 x 310.15(B)(1), 310.15(C)(1); 110.14(C)",
            "vd": "NFPA 70:2023 Chapter 9 Table 9, Ze = R cos θ + X sin θ"},
}


def calc_steps(result: SizingResult, length_m: float | None = None, length_unit: str = "") -> str:
    """The calculation of one circuit, step by step, with the source of each value.

    The length is shown in the rule set's unit (feet for NEC) or ``length_unit``
    ("m", "ft": ``[annotate] length_unit``); the NEC caution is added for NEC.
    """
    from cablewright.annotate.rows import length_unit as unit_for
    from cablewright.annotate.rows import rule_set_cautions

    unit = unit_for(result.standard, length_unit)
    rows: list[list[str]] = []
    src = _STEP_SOURCES.get(result.standard, _STEP_SOURCES["iec"])
    if result.load_current_a is not None:
        rows.append(["design current Ib", f"{result.load_current_a:.1f} A", src["ib"]])
    if result.device_rating_a is not None:
        rows.append(["device rating In", f"{result.device_rating_a:g} A ({result.device_kind})", src["in"]])
    if result.method:
        rows.append(["reference method", result.method, src["method"]])
    for factor in result.factors:
        rows.append([f"factor: {factor.name}", f"{factor.value:.3f}", f"{factor.source} ({factor.detail})"])
    if result.correction_factor is not None:
        rows.append(["correction (product)", f"{result.correction_factor:.3f}", ""])
    if result.required_capacity_a is not None:
        rows.append(["required tabulated capacity", f"{result.required_capacity_a:.1f} A", src["need"]])
    if result.cable is not None:
        cable = result.cable
        rows.append(["cable", cable.describe(), f"governed by {cable.governed_by}"])
        rows.append(["corrected capacity Iz", f"{cable.capacity_a:.1f} A", src["iz"]])
    if result.voltage_drop is not None:
        vd = result.voltage_drop
        where = f" over {unit.of(length_m):g} {unit.symbol}" if length_m else ""
        rows.append(["voltage drop", f"{vd.volts:.2f} V = {vd.percent:.2f} %{where} (limit {vd.limit_percent:g} %)",
                     src["vd"]])
        if result.standard == "iec":
            rows.append(["  Annex G simplified", f"{vd.annex_g_percent:.2f} %", "IEC 60364-5-52:2009 Annex G"])
    for check in result.checks:
        mark = {"pass": "pass", "fail": "FAIL"}.get(check.result.value, check.result.value.replace("_", " "))
        rows.append([f"check: {check.name}", f"{mark}  {check.value:.3g} vs {check.limit:.3g} {check.unit}",
                     check.source])
    text = [f"circuit {result.circuit_id}: {result.status.upper()}", format_table(["step", "value", "source"], rows)]
    for message in result.messages:
        text.extend(textwrap.wrap(message, TABLE_WIDTH, initial_indent="  - ", subsequent_indent="    "))
    text.append("")
    text.extend(textwrap.wrap(rule_set_cautions(CAUTION, result.standard), TABLE_WIDTH))
    return "\n".join(text)
