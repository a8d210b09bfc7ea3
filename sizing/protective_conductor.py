"""Cross-section of the protective conductor (PE) of a circuit.

Two ways of IEC 60364-5-54:2011 543.1: the simple rule of Table 54.2 by the
line conductor's size, or the adiabatic equation of 543.1.2 with the
earth-fault current and the device's operating time.

References
----------
.. [1] IEC 60364-5-54:2011, Earthing arrangements and protective conductors,
   543.1.1, 543.1.2, Table 54.2, Annex A Table A.54.3.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from cablewright.core.errors import OutOfRangeError, UnknownKeyError

from .conductor_resistance import next_standard_csa
from .short_circuit import adiabatic_min_csa_mm2, k_value

__all__ = [
    "TABLE_54_2_SOURCE",
    "ADIABATIC_SOURCE",
    "PE_RULES",
    "ProtectiveConductor",
    "table_54_2_min_csa_mm2",
    "pe_k_value",
    "protective_conductor",
]

TABLE_54_2_SOURCE = "IEC 60364-5-54:2011 543.1.1 and Table 54.2"
ADIABATIC_SOURCE = "IEC 60364-5-54:2011 543.1.2 and Table A.54.3"
PE_RULES = ("table", "adiabatic")


@dataclass(frozen=True)
class ProtectiveConductor:
    """The protective conductor chosen for a circuit.

    Attributes
    ----------
    csa_mm2 : float
        Standard cross-section chosen [mm²].
    required_mm2 : float
        The minimum the rule asks [mm²] (before rounding up to a standard size).
    rule : str
        ``table`` or ``adiabatic``.
    source : str
        Standard, edition and clause.
    """

    csa_mm2: float
    required_mm2: float
    rule: str
    source: str


def table_54_2_min_csa_mm2(line_csa_mm2: float) -> float:
    """Minimum PE cross-section of the same material by Table 54.2.

    ====================  ===========
    line conductor S      PE
    ====================  ===========
    S <= 16               S
    16 < S <= 35          16
    S > 35                S / 2
    ====================  ===========

    Parameters
    ----------
    line_csa_mm2 : float
        Line conductor cross-section S [mm²], > 0.

    Returns
    -------
    float
        Minimum PE cross-section [mm²], same material as the line conductor.

    Examples
    --------
    >>> table_54_2_min_csa_mm2(10), table_54_2_min_csa_mm2(25), table_54_2_min_csa_mm2(95)
    (10, 16, 47.5)

    References
    ----------
    .. [1] IEC 60364-5-54:2011, Table 54.2.
    """
    if not line_csa_mm2 > 0:
        raise OutOfRangeError(f"line conductor {line_csa_mm2!r} mm² must be > 0 ({TABLE_54_2_SOURCE})", value=line_csa_mm2)
    if line_csa_mm2 <= 16:
        return line_csa_mm2
    if line_csa_mm2 <= 35:
        return 16
    return line_csa_mm2 / 2


def pe_k_value(conductor: str, insulation: str, csa_mm2: float) -> float:
    """k of a protective conductor that is a core of a multi-core cable.

    The values of IEC 60364-5-54:2011 Table A.54.3 (from memory) equal those of
    IEC 60364-4-43:2008 Table 43A for the same insulation (the core starts at
    the operating temperature of the cable): PVC 115/76 (Cu/Al), 90 °C
    thermosetting 143/94.

    Examples
    --------
    >>> pe_k_value("Cu", "XLPE", 16)
    143.0
    """
    return k_value(conductor, insulation, csa_mm2)


def protective_conductor(
    line_csa_mm2: float,
    conductor: str = "Cu",
    insulation: str = "XLPE",
    rule: str = "table",
    fault_current_a: float | None = None,
    time_s: float | None = None,
) -> ProtectiveConductor:
    """Choose the PE cross-section of a circuit.

    Parameters
    ----------
    line_csa_mm2 : float
        Line conductor cross-section [mm²].
    conductor, insulation : str
        Material and insulation of the cable (PE a core of the same cable).
    rule : str
        ``table`` (Table 54.2) or ``adiabatic`` (543.1.2; needs the fault
        current and time).  The adiabatic result is never taken above the
        Table 54.2 value, which always satisfies 543.1.
    fault_current_a : float, optional
        Earth-fault current through the PE [A] (adiabatic rule).
    time_s : float, optional
        Operating time of the device at that current [s] (adiabatic rule).

    Returns
    -------
    ProtectiveConductor

    Raises
    ------
    UnknownKeyError
        Unknown rule.
    OutOfRangeError
        Adiabatic rule without current and time, or time outside (0, 5] s.

    Examples
    --------
    >>> protective_conductor(95).csa_mm2
    50.0
    >>> protective_conductor(95, rule="adiabatic", fault_current_a=4000, time_s=0.4).csa_mm2
    25.0

    References
    ----------
    .. [1] IEC 60364-5-54:2011, 543.1.1, 543.1.2 and Table 54.2.
    """
    table_min = table_54_2_min_csa_mm2(line_csa_mm2)
    table_csa = min(next_standard_csa(table_min), line_csa_mm2)
    if rule == "table":
        return ProtectiveConductor(table_csa, table_min, "table", TABLE_54_2_SOURCE)
    if rule != "adiabatic":
        raise UnknownKeyError(f"protective conductor rule {rule!r} is unknown: use one of {', '.join(PE_RULES)}", value=rule)
    if fault_current_a is None or time_s is None:
        raise OutOfRangeError(
            "the adiabatic rule for the protective conductor needs the earth-fault current "
            f"and the operating time ({ADIABATIC_SOURCE})")
    k = pe_k_value(conductor, insulation, line_csa_mm2)
    need = adiabatic_min_csa_mm2(fault_current_a, time_s, k)
    if not math.isfinite(need) or need <= 0:
        need = 0.0
    # 543.1.3 minimum for a separate PE is 2.5/4 mm²; a core of the cable needs none,
    # but never less than the smallest standard size.
    csa = min(next_standard_csa(max(need, 1.5)), table_csa)
    return ProtectiveConductor(csa, need, "adiabatic", ADIABATIC_SOURCE)
