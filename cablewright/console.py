"""Terminal output: step-by-step calculation of one circuit, and summary tables."""

from __future__ import annotations

from collections.abc import Iterable

from cablewright.sizing.model import SizingResult

__all__ = ["CAUTION", "calc_steps", "format_table"]

CAUTION = (
    "Design aid only: check every result with a qualified person against local wiring rules, "
    "the cable maker's data and the installation as built."
)


def format_table(headers: list[str], rows: Iterable[list[str]]) -> str:
    """A plain text table with aligned columns."""
    rows = [list(map(str, r)) for r in rows]
    widths = [len(h) for h in headers]
    for row in rows:
        for i, cell in enumerate(row):
            widths[i] = max(widths[i], len(cell))
    line = "  ".join(h.ljust(w) for h, w in zip(headers, widths, strict=False))
    rule = "  ".join("-" * w for w in widths)
    body = ["  ".join(c.ljust(w) for c, w in zip(row, widths, strict=False)) for row in rows]
    return "\n".join([line, rule, *body])


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


def calc_steps(result: SizingResult, length_m: float | None = None) -> str:
    """The calculation of one circuit, step by step, with the source of each value."""
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
        where = f" over {length_m:g} m" if length_m else ""
        rows.append(["voltage drop", f"{vd.volts:.2f} V = {vd.percent:.2f} %{where} (limit {vd.limit_percent:g} %)",
                     src["vd"]])
        if result.standard == "iec":
            rows.append(["  Annex G simplified", f"{vd.annex_g_percent:.2f} %", "IEC 60364-5-52:2009 Annex G"])
    for check in result.checks:
        mark = "pass" if check.passed else "FAIL"
        rows.append([f"check: {check.name}", f"{mark}  {check.value:.3g} vs {check.limit:.3g} {check.unit}",
                     check.source])
    text = [f"circuit {result.circuit_id}: {result.status.upper()}", format_table(["step", "value", "source"], rows)]
    for message in result.messages:
        text.append(f"  - {message}")
    text.append("")
    text.append(CAUTION)
    return "\n".join(text)
