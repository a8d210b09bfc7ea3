"""NFPA 70 (National Electrical Code) tables used by the NEC rule set.

Every table is a frozen dataclass constant carrying ``standard``, ``edition``,
``table`` and ``unit`` beside the values as printed.  The values were entered
from memory of the printed tables, then checked cell by cell against the public
reproductions named beside each table (tests/test_nec_tables.py names the same
copies); where no public copy was found the table says "from memory" and the
tests check it against relations that hold outside the code (the temperature
formula of 310.15(B), AWG geometry of ASTM B258, Table 9's Note 2).

Sizes are written as the code writes them: ``"14"`` ... ``"1"`` (AWG),
``"1/0"`` ... ``"4/0"`` (AWG), ``"250"`` ... ``"2000"`` (kcmil).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from cablewright.core.errors import OutOfRangeError, UnknownKeyError

__all__ = [
    "NEC",
    "EDITION",
    "SIZES",
    "size_label",
    "area_cmil",
    "area_mm2",
    "NecTable",
    "AMPACITY_310_16",
    "AMPACITY_310_17",
    "AMBIENT_310_15_B_1",
    "ADJUSTMENT_310_15_C_1",
    "SMALL_CONDUCTOR_240_4_D",
    "STANDARD_RATINGS_240_6_A",
    "EGC_250_122",
    "IMPEDANCE_CH9_T9",
    "AREA_CH9_T5",
    "EMT_AREA_CH9_T4",
    "FILL_CH9_T1",
    "ampacity_a",
    "ambient_factor",
    "adjustment_factor",
    "small_conductor_limit_a",
    "next_standard_rating_a",
    "egc_size",
]

NEC = "NFPA 70"
EDITION = "2023"

#: Conductor sizes of Table 310.16, smallest first (AWG, then kcmil).
SIZES: tuple[str, ...] = (
    "14", "12", "10", "8", "6", "4", "3", "2", "1", "1/0", "2/0", "3/0", "4/0",
    "250", "300", "350", "400", "500", "600", "700", "750", "800", "900", "1000",
    "1250", "1500", "1750", "2000",
)

#: NFPA 70:2023 Chapter 9 Table 8, "Area, circular mils" of the AWG sizes
#: (kcmil sizes are their name x 1000 cmil).
_AWG_CMIL = {
    "14": 4110, "12": 6530, "10": 10380, "8": 16510, "6": 26240, "4": 41740,
    "3": 52620, "2": 66360, "1": 83690, "1/0": 105600, "2/0": 133100,
    "3/0": 167800, "4/0": 211600,
}
#: 1 circular mil = pi/4 x (0.0254 mm)^2 [mm²]: definition of the circular mil.
MM2_PER_CMIL = math.pi / 4.0 * 0.0254 ** 2


def _check_size(size: str) -> str:
    size = str(size).strip()
    if size not in SIZES:
        raise UnknownKeyError(f"conductor size {size!r} is not in NFPA 70 Table 310.16: use one of "
                              f"{', '.join(SIZES)}")
    return size


def size_label(size: str) -> str:
    """The size as the code writes it: ``"6 AWG"``, ``"4/0 AWG"``, ``"250 kcmil"``.

    Examples
    --------
    >>> size_label("6"), size_label("4/0"), size_label("250")
    ('6 AWG', '4/0 AWG', '250 kcmil')
    """
    size = _check_size(size)
    return f"{size} AWG" if size in _AWG_CMIL else f"{size} kcmil"


def area_cmil(size: str) -> float:
    """Conductor area [cmil], NFPA 70:2023 Chapter 9 Table 8 (AWG) or the kcmil name.

    Examples
    --------
    >>> area_cmil("1/0"), area_cmil("500")
    (105600.0, 500000.0)
    """
    size = _check_size(size)
    return float(_AWG_CMIL[size]) if size in _AWG_CMIL else 1000.0 * float(size)


def area_mm2(size: str) -> float:
    """Conductor area [mm²] from :func:`area_cmil` (1 cmil = 5.067e-4 mm²).

    Examples
    --------
    >>> round(area_mm2("4/0"), 1), round(area_mm2("250"), 1)
    (107.2, 126.7)
    """
    return area_cmil(size) * MM2_PER_CMIL


@dataclass(frozen=True)
class NecTable:
    """One printed table: its source and its rows, keyed as printed."""

    standard: str
    edition: str
    table: str
    unit: str
    rows: dict[Any, Any]  # each table's own keys and cells (sizes, amperes, tuples)

    @property
    def source(self) -> str:
        """``"NFPA 70:2023 Table 310.16"``."""
        return f"{self.standard}:{self.edition} {self.table}"


# Allowable ampacities [A]: (Cu 60, Cu 75, Cu 90, Al 60, Al 75, Al 90); None where not listed.
# Checked against a public reproduction of the 2023 table (a web reproduction, "NEC Table 310.16,
# 2023 Edition": 14 AWG to 1000 kcmil less 700/800/900); 700, 800, 900 and 1250-2000 kcmil
# from memory (the 2017 edition's Table 310.15(B)(16) prints the same values).
AMPACITY_310_16 = NecTable(NEC, EDITION, "Table 310.16", "A", {
    "14": (15, 20, 25, None, None, None),
    "12": (20, 25, 30, 15, 20, 25),
    "10": (30, 35, 40, 25, 30, 35),
    "8": (40, 50, 55, 35, 40, 45),
    "6": (55, 65, 75, 40, 50, 55),
    "4": (70, 85, 95, 55, 65, 75),
    "3": (85, 100, 115, 65, 75, 85),
    "2": (95, 115, 130, 75, 90, 100),
    "1": (110, 130, 145, 85, 100, 115),
    "1/0": (125, 150, 170, 100, 120, 135),
    "2/0": (145, 175, 195, 115, 135, 150),
    "3/0": (165, 200, 225, 130, 155, 175),
    "4/0": (195, 230, 260, 150, 180, 205),
    "250": (215, 255, 290, 170, 205, 230),
    "300": (240, 285, 320, 195, 230, 260),
    "350": (260, 310, 350, 210, 250, 280),
    "400": (280, 335, 380, 225, 270, 305),
    "500": (320, 380, 430, 260, 310, 350),
    "600": (350, 420, 475, 285, 340, 385),
    "700": (385, 460, 520, 315, 375, 425),
    "750": (400, 475, 535, 320, 385, 435),
    "800": (410, 490, 555, 330, 395, 445),
    "900": (435, 520, 585, 355, 425, 480),
    "1000": (455, 545, 615, 375, 445, 500),
    "1250": (495, 590, 665, 405, 485, 545),
    "1500": (525, 625, 705, 435, 520, 585),
    "1750": (545, 650, 735, 455, 545, 615),
    "2000": (555, 665, 750, 470, 560, 630),
})

# Single-insulated conductors in free air [A], same columns; from memory of the printed table
# (8 AWG to 4/0 AWG Cu agree with the one-conductor column of Table 400.5(B) as reproduced in
# the Set Lighting Technician's Handbook, 4th ed., Appendix D Table D.1).
AMPACITY_310_17 = NecTable(NEC, EDITION, "Table 310.17", "A", {
    "14": (25, 30, 35, None, None, None),
    "12": (30, 35, 40, 25, 30, 35),
    "10": (40, 50, 55, 35, 40, 45),
    "8": (60, 70, 80, 45, 55, 60),
    "6": (80, 95, 105, 60, 75, 85),
    "4": (105, 125, 140, 80, 100, 115),
    "3": (120, 145, 165, 95, 115, 130),
    "2": (140, 170, 190, 110, 135, 150),
    "1": (165, 195, 220, 130, 155, 175),
    "1/0": (195, 230, 260, 150, 180, 205),
    "2/0": (225, 265, 300, 175, 210, 235),
    "3/0": (260, 310, 350, 200, 240, 270),
    "4/0": (300, 360, 405, 235, 280, 315),
    "250": (340, 405, 455, 265, 315, 355),
    "300": (375, 445, 500, 290, 350, 395),
    "350": (420, 505, 570, 330, 395, 445),
    "400": (455, 545, 615, 355, 425, 480),
    "500": (515, 620, 700, 405, 485, 545),
    "600": (575, 690, 780, 455, 545, 615),
    "700": (630, 755, 850, 500, 595, 670),
    "750": (655, 785, 885, 515, 620, 700),
    "800": (680, 815, 920, 535, 645, 725),
    "900": (730, 870, 980, 580, 700, 790),
    "1000": (780, 935, 1055, 625, 750, 845),
    "1250": (890, 1065, 1200, 710, 855, 965),
    "1500": (980, 1175, 1325, 795, 950, 1070),
    "1750": (1070, 1280, 1445, 875, 1050, 1185),
    "2000": (1155, 1385, 1560, 960, 1150, 1295),
})

_COLUMN = {("Cu", 60): 0, ("Cu", 75): 1, ("Cu", 90): 2, ("Al", 60): 3, ("Al", 75): 4, ("Al", 90): 5}


def ampacity_a(size: str, conductor: str, temp_c: int, free_air: bool = False) -> float:
    """Allowable ampacity [A] of one conductor, NFPA 70:2023 Table 310.16 or 310.17.

    Parameters
    ----------
    size : str
        ``"14"`` ... ``"2000"`` (see :data:`SIZES`).
    conductor : str
        ``"Cu"`` or ``"Al"``.
    temp_c : int
        Temperature column, 60, 75 or 90 [°C].
    free_air : bool
        Table 310.17 (single insulated conductors in free air) instead of 310.16.

    Returns
    -------
    float

    Raises
    ------
    OutOfRangeError
        For a cell the table leaves blank (14 AWG aluminium).

    Examples
    --------
    >>> ampacity_a("8", "Cu", 75), ampacity_a("500", "Al", 90), ampacity_a("4/0", "Cu", 75, True)
    (50.0, 350.0, 360.0)

    References
    ----------
    .. [1] NFPA 70:2023, Tables 310.16 and 310.17.
    """
    table = AMPACITY_310_17 if free_air else AMPACITY_310_16
    key = (conductor, int(temp_c))
    if key not in _COLUMN:
        raise UnknownKeyError(f"{table.source} has no column {conductor} {temp_c} °C: use Cu or Al "
                              "at 60, 75 or 90 °C")
    value = table.rows[_check_size(size)][_COLUMN[key]]
    if value is None:
        raise OutOfRangeError(f"{table.source} lists no {size_label(size)} {conductor} conductor")
    return float(value)


# Ambient temperature correction, based on 30 °C: rows (upper end of the range [°C],
# factor at 60, 75, 90 °C).  NFPA 70:2023 Table 310.15(B)(1)(1) (Table 310.15(B)(1)
# in the 2020 edition); checked against a public web reproduction of the 2023 table
# (10 to 60 °C); every cell also follows 310.15(B)'s formula (tests).
AMBIENT_310_15_B_1 = NecTable(NEC, EDITION, "Table 310.15(B)(1)(1)", "1", {
    10: (1.29, 1.20, 1.15),
    15: (1.22, 1.15, 1.12),
    20: (1.15, 1.11, 1.08),
    25: (1.08, 1.05, 1.04),
    30: (1.00, 1.00, 1.00),
    35: (0.91, 0.94, 0.96),
    40: (0.82, 0.88, 0.91),
    45: (0.71, 0.82, 0.87),
    50: (0.58, 0.75, 0.82),
    55: (0.41, 0.67, 0.76),
    60: (None, 0.58, 0.71),
    65: (None, 0.47, 0.65),
    70: (None, 0.33, 0.58),
    75: (None, None, 0.50),
    80: (None, None, 0.41),
    85: (None, None, 0.29),
})


def ambient_factor(ambient_c: float, temp_c: int) -> float:
    """Ambient correction factor, NFPA 70:2023 Table 310.15(B)(1)(1) (based on 30 °C).

    The table's rows are ranges of whole degrees (26-30, 31-35, ...); an ambient
    between two whole degrees is read in the warmer row (rounded up).

    Raises
    ------
    OutOfRangeError
        Above the last row of the column.

    Examples
    --------
    >>> ambient_factor(40, 90), ambient_factor(30.2, 75), ambient_factor(5, 60)
    (0.91, 0.94, 1.29)

    References
    ----------
    .. [1] NFPA 70:2023, 310.15(B)(1) and Table 310.15(B)(1)(1).
    """
    column = {60: 0, 75: 1, 90: 2}[int(temp_c)]
    whole = math.ceil(ambient_c - 1e-9)
    for upper, factors in AMBIENT_310_15_B_1.rows.items():
        if whole <= upper:
            if factors[column] is None:
                break
            return float(factors[column])
    raise OutOfRangeError(f"ambient {ambient_c:g} °C is beyond {AMBIENT_310_15_B_1.source} for "
                          f"{temp_c} °C conductors")


# Adjustment factors for more than three current-carrying conductors: (most conductors,
# percent of the values of Table 310.16).  NFPA 70:2023 Table 310.15(C)(1); checked against
# a public web reproduction (2023 edition).
ADJUSTMENT_310_15_C_1 = NecTable(NEC, EDITION, "Table 310.15(C)(1)", "%", {
    3: 100, 6: 80, 9: 70, 20: 50, 30: 45, 40: 40, 10 ** 9: 35,
})


def adjustment_factor(current_carrying: int) -> float:
    """Adjustment factor for ``current_carrying`` conductors in a raceway or cable.

    Examples
    --------
    >>> adjustment_factor(3), adjustment_factor(4), adjustment_factor(9), adjustment_factor(41)
    (1.0, 0.8, 0.7, 0.35)

    References
    ----------
    .. [1] NFPA 70:2023, 310.15(C)(1) and Table 310.15(C)(1).
    """
    if current_carrying < 1:
        raise OutOfRangeError(f"{current_carrying} current-carrying conductors: at least 1")
    for most, percent in ADJUSTMENT_310_15_C_1.rows.items():
        if current_carrying <= most:
            return float(percent) / 100.0
    raise AssertionError("unreachable: the last row is open-ended")


# Small conductors: overcurrent protection not to exceed [A].  NFPA 70:2023 240.4(D)
# (14 to 10 AWG; 18 and 16 AWG copper are not sized here).
SMALL_CONDUCTOR_240_4_D = NecTable(NEC, EDITION, "240.4(D)", "A", {
    ("Cu", "14"): 15, ("Cu", "12"): 20, ("Cu", "10"): 30, ("Al", "12"): 15, ("Al", "10"): 25,
})


def small_conductor_limit_a(size: str, conductor: str) -> float | None:
    """Largest overcurrent device on a small conductor [A] (240.4(D)), ``None`` if unlimited.

    Examples
    --------
    >>> small_conductor_limit_a("12", "Cu"), small_conductor_limit_a("8", "Cu")
    (20.0, None)
    """
    value = SMALL_CONDUCTOR_240_4_D.rows.get((conductor, size))
    return None if value is None else float(value)


# Standard ampere ratings of fuses and inverse time circuit breakers, and the further
# standard ratings of fuses.  NFPA 70:2023 240.6(A), Table 240.6(A); checked against the
# 2023 text as reproduced on two public web pages ("NEC 2023 240.6").
STANDARD_RATINGS_240_6_A = NecTable(NEC, EDITION, "Table 240.6(A)", "A", {"ratings": (
    15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200, 225,
    250, 300, 350, 400, 450, 500, 600, 700, 800, 1000, 1200, 1600, 2000, 2500, 3000, 4000,
    5000, 6000,
), "fuses_only": (1, 3, 6, 10)})


def next_standard_rating_a(current_a: float, strictly_above: bool = False, fuse: bool = False) -> float:
    """Smallest standard rating of Table 240.6(A) >= ``current_a`` (> with ``strictly_above``).

    ``fuse`` adds the further fuse ratings 1, 3, 6 and 10 A.

    Raises
    ------
    OutOfRangeError
        Above 6000 A.

    Examples
    --------
    >>> next_standard_rating_a(42.5), next_standard_rating_a(50), next_standard_rating_a(50, True)
    (45.0, 50.0, 60.0)
    >>> next_standard_rating_a(4.3), next_standard_rating_a(4.3, fuse=True)
    (15.0, 6.0)
    """
    rows = STANDARD_RATINGS_240_6_A.rows
    ratings = sorted(rows["ratings"] + (rows["fuses_only"] if fuse else ()))
    for rating in ratings:
        if rating > current_a + 1e-9 or (not strictly_above and rating >= current_a - 1e-9):
            return float(rating)
    raise OutOfRangeError(f"{current_a:.0f} A is above the largest rating of "
                          f"{STANDARD_RATINGS_240_6_A.source} (6000 A)")


# Minimum equipment grounding conductor: (rating of the overcurrent device not exceeding [A],
# Cu size, Al size).  NFPA 70:2023 Table 250.122; checked against public reproductions
# (two public web reproductions: "NEC Table 250.122" and an EGC chart).
EGC_250_122 = NecTable(NEC, EDITION, "Table 250.122", "A", {
    15: ("14", "12"), 20: ("12", "10"), 60: ("10", "8"), 100: ("8", "6"), 200: ("6", "4"),
    300: ("4", "2"), 400: ("3", "1"), 500: ("2", "1/0"), 600: ("1", "2/0"), 800: ("1/0", "3/0"),
    1000: ("2/0", "4/0"), 1200: ("3/0", "250"), 1600: ("4/0", "350"), 2000: ("250", "400"),
    2500: ("350", "600"), 3000: ("400", "600"), 4000: ("500", "750"), 5000: ("700", "1250"),
    6000: ("800", "1250"),
})


def egc_size(device_a: float, conductor: str) -> str:
    """Minimum equipment grounding conductor for a device rating (Table 250.122).

    Examples
    --------
    >>> egc_size(20, "Cu"), egc_size(100, "Cu"), egc_size(400, "Al")
    ('12', '8', '1')
    """
    column = {"Cu": 0, "Al": 1}[conductor]
    for most, sizes in EGC_250_122.rows.items():
        if device_a <= most + 1e-9:
            return str(sizes[column])
    raise OutOfRangeError(f"device {device_a:g} A is above {EGC_250_122.source} (6000 A)")


# AC resistance and reactance, 600 V cables, 3 phase, 60 Hz, 75 °C, three single
# conductors in conduit [ohm per 1000 ft]: XL (PVC or aluminium conduit, steel conduit),
# R copper (PVC, aluminium, steel conduit), R aluminium (PVC, aluminium, steel).
# NFPA 70:2023 Chapter 9 Table 9 (sizes 700, 800, 900 and above 1000 kcmil are not listed
# in it); checked against a public web reproduction ("A.C. for 600 Volt", every cell) and
# studylib.net's "AC Resistance and Reactance" engineering data sheet.
IMPEDANCE_CH9_T9 = NecTable(NEC, EDITION, "Chapter 9 Table 9", "ohm/1000 ft", {
    "14": ((0.058, 0.073), (3.1, 3.1, 3.1), None),
    "12": ((0.054, 0.068), (2.0, 2.0, 2.0), (3.2, 3.2, 3.2)),
    "10": ((0.050, 0.063), (1.2, 1.2, 1.2), (2.0, 2.0, 2.0)),
    "8": ((0.052, 0.065), (0.78, 0.78, 0.78), (1.3, 1.3, 1.3)),
    "6": ((0.051, 0.064), (0.49, 0.49, 0.49), (0.81, 0.81, 0.81)),
    "4": ((0.048, 0.060), (0.31, 0.31, 0.31), (0.51, 0.51, 0.51)),
    "3": ((0.047, 0.059), (0.25, 0.25, 0.25), (0.40, 0.41, 0.40)),
    "2": ((0.045, 0.057), (0.19, 0.20, 0.20), (0.32, 0.32, 0.32)),
    "1": ((0.046, 0.057), (0.15, 0.16, 0.16), (0.25, 0.26, 0.25)),
    "1/0": ((0.044, 0.055), (0.12, 0.13, 0.12), (0.20, 0.21, 0.20)),
    "2/0": ((0.043, 0.054), (0.10, 0.10, 0.10), (0.16, 0.16, 0.16)),
    "3/0": ((0.042, 0.052), (0.077, 0.082, 0.079), (0.13, 0.13, 0.13)),
    "4/0": ((0.041, 0.051), (0.062, 0.067, 0.063), (0.10, 0.11, 0.10)),
    "250": ((0.041, 0.052), (0.052, 0.057, 0.054), (0.085, 0.090, 0.086)),
    "300": ((0.041, 0.051), (0.044, 0.049, 0.045), (0.071, 0.076, 0.072)),
    "350": ((0.040, 0.050), (0.038, 0.043, 0.039), (0.061, 0.066, 0.063)),
    "400": ((0.040, 0.049), (0.033, 0.038, 0.035), (0.054, 0.059, 0.055)),
    "500": ((0.039, 0.048), (0.027, 0.032, 0.029), (0.043, 0.048, 0.045)),
    "600": ((0.039, 0.048), (0.023, 0.028, 0.025), (0.036, 0.041, 0.038)),
    "750": ((0.038, 0.048), (0.019, 0.024, 0.021), (0.029, 0.034, 0.031)),
    "1000": ((0.037, 0.046), (0.015, 0.019, 0.018), (0.023, 0.027, 0.025)),
})
#: Effective Z at 0.85 power factor, copper in steel conduit, printed in the same table
#: (public web reproduction); the tests check Note 2's Ze = R cos θ + X sin θ against it.
EFFECTIVE_Z_CU_STEEL_085 = {"12": 1.7, "8": 0.70, "4": 0.30, "1/0": 0.13, "4/0": 0.080,
                            "250": 0.073, "500": 0.050, "1000": 0.040}

_RACEWAY = {"pvc": 0, "aluminum": 1, "steel": 2}
#: One foot [m] (international foot, exact).
FT_M = 0.3048


def impedance_ohm_per_m(size: str, conductor: str, raceway: str = "steel") -> tuple[float, float]:
    """(R, XL) of one conductor [ohm/m] from NFPA 70:2023 Chapter 9 Table 9 (75 °C).

    Raises
    ------
    OutOfRangeError
        For a size the table does not list (700, 800, 900, above 1000 kcmil; 14 AWG Al).

    Examples
    --------
    >>> r, x = impedance_ohm_per_m("1/0", "Cu", "steel")
    >>> round(r * 304.8, 3), round(x * 304.8, 3)
    (0.12, 0.055)
    """
    row = IMPEDANCE_CH9_T9.rows.get(_check_size(size))
    if raceway not in _RACEWAY:
        raise UnknownKeyError(f"raceway {raceway!r} is unknown: use pvc, aluminum or steel")
    resistances = None if row is None else row[1 if conductor == "Cu" else 2]
    if row is None or resistances is None:
        raise OutOfRangeError(f"{IMPEDANCE_CH9_T9.source} lists no {size_label(size)} {conductor}")
    xl = row[0][1 if raceway == "steel" else 0]
    per_m = 1.0 / (1000.0 * FT_M)
    return resistances[_RACEWAY[raceway]] * per_m, xl * per_m


# Dimensions of insulated conductors: approximate area [in²], types THHN/THWN-2 and
# XHHW/XHHW-2.  NFPA 70:2023 Chapter 9 Table 5; checked against a public reproduction of
# the 2008 edition's table (buildmyowncabin.com "NEC 2008: Chapter 9 Table 5", same values).
AREA_CH9_T5 = NecTable(NEC, EDITION, "Chapter 9 Table 5", "in²", {
    "THHN": {"14": 0.0097, "12": 0.0133, "10": 0.0211, "8": 0.0366, "6": 0.0507, "4": 0.0824,
             "3": 0.0973, "2": 0.1158, "1": 0.1562, "1/0": 0.1855, "2/0": 0.2223, "3/0": 0.2679,
             "4/0": 0.3237, "250": 0.3970, "300": 0.4608, "350": 0.5242, "400": 0.5863,
             "500": 0.7073, "600": 0.8676, "700": 0.9887, "750": 1.0496, "800": 1.1085,
             "900": 1.2311, "1000": 1.3478},
    "XHHW": {"14": 0.0139, "12": 0.0181, "10": 0.0243, "8": 0.0437, "6": 0.0590, "4": 0.0814,
             "3": 0.0962, "2": 0.1146, "1": 0.1534, "1/0": 0.1825, "2/0": 0.2190, "3/0": 0.2642,
             "4/0": 0.3197, "250": 0.3904, "300": 0.4536, "350": 0.5166, "400": 0.5782,
             "500": 0.6984, "600": 0.8709, "700": 0.9923, "750": 1.0532, "800": 1.1122,
             "900": 1.2351, "1000": 1.3519},
})

# Electrical metallic tubing (EMT), total internal area [in²] by trade size.
# NFPA 70:2023 Chapter 9 Table 4 ("Article 358"); checked against the 2011 NEC Handbook's
# table as reproduced on vdocument.in ("Chapter 9 Tables.pdf"), 1/2 to 2 trade size;
# 2-1/2 to 4 from memory.
EMT_AREA_CH9_T4 = NecTable(NEC, EDITION, "Chapter 9 Table 4 (EMT)", "in²", {
    "1/2": 0.304, "3/4": 0.533, "1": 0.864, "1-1/4": 1.496, "1-1/2": 2.036, "2": 3.356,
    "2-1/2": 5.858, "3": 8.846, "3-1/2": 11.545, "4": 14.753,
})

# Percent of cross section of conduit and tubing for conductors and cables:
# (conductors, fill %).  NFPA 70:2023 Chapter 9 Table 1 (thenecwiki.com reproduction).
FILL_CH9_T1 = NecTable(NEC, EDITION, "Chapter 9 Table 1", "%", {1: 53, 2: 31, 3: 40})


def fill_limit_pct(conductors: int) -> float:
    """Allowed fill of a conduit [%]: 53 % (1), 31 % (2), 40 % (over 2), Chapter 9 Table 1.

    Examples
    --------
    >>> fill_limit_pct(1), fill_limit_pct(2), fill_limit_pct(5)
    (53.0, 31.0, 40.0)
    """
    return float(FILL_CH9_T1.rows[min(max(conductors, 1), 3)])
