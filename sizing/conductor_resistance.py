"""Conductor resistance of IEC 60228:2004 Table 2 (class 2 stranded conductors).

Maximum DC resistance at 20 °C of plain annealed copper and of aluminium
conductors, its temperature correction, and the standard cross-section series
used by the sizing (derived from the table, not retyped).

Where the values come from: copper 0.5 to 630 mm² and aluminium 10 to 1200 mm²
were compared cell by cell in public reproductions of IEC 60228:2004 (two to
three copies per cell, all agree).  Copper 800 to 2500 mm² and aluminium 1400 to
2500 mm² are from memory (no public copy found); see :data:`FROM_MEMORY_CSA_MM2`.

References
----------
.. [1] IEC 60228:2004, Conductors of insulated cables, Table 2 (class 2) and
   Annex B (temperature correction).
.. [2] IEC 60287-1-1:2006, Electric cables - Calculation of the current rating,
   Table 1 (temperature coefficients at 20 °C).
.. [3] IEC 60364-5-52:2009, Annex B (range of tabulated cross-sections).
"""

from __future__ import annotations

import difflib
import logging
from dataclasses import dataclass

from cablewright.core.errors import OutOfRangeError, UnknownKeyError

__all__ = [
    "ResistanceTable",
    "IEC_60228_TABLE_2",
    "FROM_MEMORY_CSA_MM2",
    "ALPHA_20_PER_K",
    "STANDARD_CSA_MM2",
    "dc_resistance_20c_ohm_per_km",
    "resistance_ohm_per_km",
    "next_standard_csa",
]

_log = logging.getLogger(__name__)


@dataclass(frozen=True)
class ResistanceTable:
    """Maximum DC resistance of conductors at 20 °C.

    Attributes
    ----------
    copper_ohm_per_km : tuple of (float, float)
        (nominal cross-section [mm²], plain annealed copper [Ω/km]).
    aluminium_ohm_per_km : tuple of (float, float)
        (nominal cross-section [mm²], aluminium [Ω/km]).
    standard, edition, table, unit : str
    """

    copper_ohm_per_km: tuple[tuple[float, float], ...]
    aluminium_ohm_per_km: tuple[tuple[float, float], ...]
    standard: str = "IEC 60228"
    edition: str = "2004"
    table: str = "2"
    unit: str = "ohm/km"

    @property
    def source(self) -> str:
        """Citation ``"IEC 60228:2004 Table 2"``."""
        return f"{self.standard}:{self.edition} Table {self.table}"


#: IEC 60228:2004 Table 2, class 2 stranded conductors, maximum resistance at
#: 20 °C: plain annealed copper, and aluminium (or aluminium alloy) conductors.
IEC_60228_TABLE_2 = ResistanceTable(
    copper_ohm_per_km=(
        (0.5, 36.0), (0.75, 24.5), (1, 18.1), (1.5, 12.1), (2.5, 7.41), (4, 4.61),
        (6, 3.08), (10, 1.83), (16, 1.15), (25, 0.727), (35, 0.524), (50, 0.387),
        (70, 0.268), (95, 0.193), (120, 0.153), (150, 0.124), (185, 0.0991),
        (240, 0.0754), (300, 0.0601), (400, 0.0470), (500, 0.0366), (630, 0.0283),
        # 800 to 2500 mm²: from memory
        (800, 0.0221), (1000, 0.0176), (1200, 0.0151), (1400, 0.0129), (1600, 0.0113),
        (1800, 0.0101), (2000, 0.0090), (2500, 0.0072),
    ),
    aluminium_ohm_per_km=(
        (10, 3.08), (16, 1.91), (25, 1.20), (35, 0.868), (50, 0.641), (70, 0.443),
        (95, 0.320), (120, 0.253), (150, 0.206), (185, 0.164), (240, 0.125),
        (300, 0.100), (400, 0.0778), (500, 0.0605), (630, 0.0469), (800, 0.0367),
        (1000, 0.0291), (1200, 0.0247),
        # 1400 to 2500 mm²: from memory
        (1400, 0.0212), (1600, 0.0186), (1800, 0.0165), (2000, 0.0149), (2500, 0.0127),
    ),
)

#: Rows of :data:`IEC_60228_TABLE_2` taken from memory, by conductor.
FROM_MEMORY_CSA_MM2: dict[str, tuple[float, ...]] = {
    "Cu": (800, 1000, 1200, 1400, 1600, 1800, 2000, 2500),
    "Al": (1400, 1600, 1800, 2000, 2500),
}

#: Temperature coefficient of resistance at 20 °C [1/K]: IEC 60287-1-1:2006
#: Table 1 (copper 3.93e-3, aluminium 4.03e-3; from memory), the same as the
#: coefficients behind IEC 60228:2004 Annex B (1/254.5 and 1/248).
ALPHA_20_PER_K: dict[str, float] = {"Cu": 0.00393, "Al": 0.00403}

_R20: dict[str, dict[float, float]] = {
    "Cu": {float(a): r for a, r in IEC_60228_TABLE_2.copper_ohm_per_km},
    "Al": {float(a): r for a, r in IEC_60228_TABLE_2.aluminium_ohm_per_km},
}

#: The cross-section series of IEC 60364-5-52:2009 Annex B, 1.5 to 630 mm²,
#: taken from the copper column of IEC 60228:2004 Table 2 (derived, not retyped).
STANDARD_CSA_MM2: tuple[float, ...] = tuple(
    a for a in sorted(_R20["Cu"]) if 1.5 <= a <= 630
)


def _check_conductor(conductor: str) -> None:
    if conductor not in _R20:
        close = difflib.get_close_matches(str(conductor), list(_R20), n=2)
        hint = f"; did you mean {', '.join(repr(c) for c in close)}?" if close else ""
        raise UnknownKeyError(
            f"unknown conductor {conductor!r} for {IEC_60228_TABLE_2.source}; "
            f"known: Cu, Al{hint}", value=conductor)


def dc_resistance_20c_ohm_per_km(csa_mm2: float, conductor: str) -> float:
    """Maximum DC resistance at 20 °C of a class 2 conductor.

    Parameters
    ----------
    csa_mm2 : float
        Nominal cross-section [mm²], a size of IEC 60228 Table 2.
    conductor : str
        ``"Cu"`` (plain annealed copper) or ``"Al"`` (aluminium).

    Returns
    -------
    float
        Resistance [Ω/km].

    Raises
    ------
    OutOfRangeError
        The size is not in the table for that conductor.
    UnknownKeyError
        Unknown conductor.

    Notes
    -----
    IEC 60228 lists aluminium class 2 conductors from 10 mm²; IEC 60364-5-52
    Annex B tabulates aluminium capacities from 2.5 mm², but sizes below 16 mm²
    in aluminium are unusual in practice and a lookup of 10 mm² logs a note.

    Examples
    --------
    >>> dc_resistance_20c_ohm_per_km(95, "Al")
    0.32

    References
    ----------
    .. [1] IEC 60228:2004, Table 2.
    """
    _check_conductor(conductor)
    table = _R20[conductor]
    r = table.get(float(csa_mm2))
    if r is None:
        sizes = sorted(table)
        raise OutOfRangeError(
            f"cross-section {csa_mm2:g} mm² {conductor} is not in {IEC_60228_TABLE_2.source} "
            f"(class 2); sizes run {sizes[0]:g} to {sizes[-1]:g} mm². Use a standard size.", value=csa_mm2)
    if conductor == "Al" and csa_mm2 < 16:
        _log.info("aluminium %g mm²: listed by IEC 60228 but unusual below 16 mm²", csa_mm2)
    return r


def resistance_ohm_per_km(csa_mm2: float, conductor: str, temperature_c: float) -> float:
    """DC resistance at a conductor temperature.

    ``R = R20 * (1 + alpha20 * (theta - 20))``

    Parameters
    ----------
    csa_mm2 : float
        Nominal cross-section [mm²].
    conductor : str
        ``"Cu"`` or ``"Al"``.
    temperature_c : float
        Conductor temperature [°C], from -50 to 250.

    Returns
    -------
    float
        Resistance [Ω/km].

    Raises
    ------
    OutOfRangeError
        Temperature outside -50 to 250 °C, or size not in the table.

    Examples
    --------
    >>> round(resistance_ohm_per_km(2.5, "Cu", 70), 3)
    8.866

    References
    ----------
    .. [1] IEC 60228:2004, Annex B (linear temperature correction).
    .. [2] IEC 60287-1-1:2006, 2.1.1 and Table 1 (alpha20).
    """
    if not -50.0 <= temperature_c <= 250.0:
        raise OutOfRangeError(
            f"conductor temperature {temperature_c:g} °C is outside -50 to 250 °C "
            "(IEC 60228:2004 Annex B linear correction)", value=temperature_c)
    r20 = dc_resistance_20c_ohm_per_km(csa_mm2, conductor)
    return r20 * (1.0 + ALPHA_20_PER_K[conductor] * (temperature_c - 20.0))


def next_standard_csa(csa_mm2: float) -> float:
    """Smallest standard cross-section at least ``csa_mm2``.

    Parameters
    ----------
    csa_mm2 : float
        Required cross-section [mm²], > 0.

    Returns
    -------
    float
        A member of :data:`STANDARD_CSA_MM2` [mm²].

    Raises
    ------
    OutOfRangeError
        Not positive, or larger than 630 mm².

    Examples
    --------
    >>> next_standard_csa(20)
    25.0

    References
    ----------
    .. [1] IEC 60228:2004, Table 2; IEC 60364-5-52:2009, Annex B.
    """
    if not csa_mm2 > 0:
        raise OutOfRangeError(f"cross-section {csa_mm2!r} mm² must be > 0", value=csa_mm2)
    for a in STANDARD_CSA_MM2:
        if a >= csa_mm2 - 1e-9:
            return a
    raise OutOfRangeError(
        f"no standard cross-section is at least {csa_mm2:g} mm²: the largest is "
        f"{STANDARD_CSA_MM2[-1]:g} mm² (IEC 60228:2004 Table 2 within the range of "
        "IEC 60364-5-52:2009 Annex B); use cables in parallel.", value=csa_mm2)
