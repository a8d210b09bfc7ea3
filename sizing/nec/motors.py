"""Motor full-load currents, NFPA 70:2023 Tables 430.248 and 430.250.

430.6(A)(1): conductor ampacities and ratings are taken from these tables, not
the nameplate; the tabulated voltages stand for the system ranges 110-120,
220-240, 440-480 and 550-600 V.  Values entered from memory, then checked cell by
cell against public reproductions: Table 430.250 against the 2017 edition's values
in Schneider Electric's motor control data (8536DB0901, Table 74) and the 1999
edition's Table 430-150 (paigewire.com); Table 430.248 against the 1999 edition's
Table 430-148 (paigewire.com).  The values have not changed between those editions.
"""

from __future__ import annotations

from cablewright.core.errors import OutOfRangeError

from .tables import EDITION, NEC, NecTable

__all__ = ["FLC_430_248", "FLC_430_250", "table_voltage_v", "full_load_current_a"]

# Single-phase AC motors [A]: hp -> (115, 200, 208, 230 V).
FLC_430_248 = NecTable(NEC, EDITION, "Table 430.248", "A", {
    "voltages": (115, 200, 208, 230),
    1 / 6: (4.4, 2.5, 2.4, 2.2), 0.25: (5.8, 3.3, 3.2, 2.9), 1 / 3: (7.2, 4.1, 4.0, 3.6),
    0.5: (9.8, 5.6, 5.4, 4.9), 0.75: (13.8, 7.9, 7.6, 6.9), 1: (16, 9.2, 8.8, 8),
    1.5: (20, 11.5, 11.0, 10), 2: (24, 13.8, 13.2, 12), 3: (34, 19.6, 18.7, 17),
    5: (56, 32.2, 30.8, 28), 7.5: (80, 46, 44, 40), 10: (100, 57.5, 55, 50),
})

# Three-phase induction motors, squirrel cage and wound rotor [A]:
# hp -> (200, 208, 230, 460, 575 V); None where the table leaves the cell blank.
FLC_430_250 = NecTable(NEC, EDITION, "Table 430.250", "A", {
    "voltages": (200, 208, 230, 460, 575),
    0.5: (2.5, 2.4, 2.2, 1.1, 0.9), 0.75: (3.7, 3.5, 3.2, 1.6, 1.3),
    1: (4.8, 4.6, 4.2, 2.1, 1.7), 1.5: (6.9, 6.6, 6.0, 3.0, 2.4),
    2: (7.8, 7.5, 6.8, 3.4, 2.7), 3: (11.0, 10.6, 9.6, 4.8, 3.9),
    5: (17.5, 16.7, 15.2, 7.6, 6.1), 7.5: (25.3, 24.2, 22, 11, 9),
    10: (32.2, 30.8, 28, 14, 11), 15: (48.3, 46.2, 42, 21, 17),
    20: (62.1, 59.4, 54, 27, 22), 25: (78.2, 74.8, 68, 34, 27),
    30: (92, 88, 80, 40, 32), 40: (120, 114, 104, 52, 41),
    50: (150, 143, 130, 65, 52), 60: (177, 169, 154, 77, 62),
    75: (221, 211, 192, 96, 77), 100: (285, 273, 248, 124, 99),
    125: (359, 343, 312, 156, 125), 150: (414, 396, 360, 180, 144),
    200: (552, 528, 480, 240, 192), 250: (None, None, None, 302, 242),
    300: (None, None, None, 361, 289), 350: (None, None, None, 414, 336),
    400: (None, None, None, 477, 382), 450: (None, None, None, 515, 412),
    500: (None, None, None, 590, 472),
})

#: 430.6(A)(1): system voltage ranges read in each tabulated column [V].
_RANGES = ((110, 120, 115), (199, 201, 200), (207, 209, 208), (220, 240, 230), (440, 480, 460),
           (550, 600, 575))


def table_voltage_v(system_v: float) -> float | None:
    """The tabulated motor voltage for a system voltage (430.6(A)(1)), ``None`` if none.

    Examples
    --------
    >>> table_voltage_v(480), table_voltage_v(240), table_voltage_v(400) is None
    (460, 230, True)
    """
    for low, high, column in _RANGES:
        if low - 1e-9 <= system_v <= high + 1e-9:
            return column
    return None


def full_load_current_a(hp: float, system_v: float, phases: int) -> float:
    """Full-load current of a motor from Table 430.248 (1 phase) or 430.250 (3 phases).

    Raises
    ------
    OutOfRangeError
        A voltage outside the ranges of 430.6(A)(1), or a horsepower the table does not list.

    Examples
    --------
    >>> full_load_current_a(25, 460, 3), full_load_current_a(25, 480, 3), full_load_current_a(5, 230, 1)
    (34.0, 34.0, 28.0)

    References
    ----------
    .. [1] NFPA 70:2023, 430.6(A)(1), Tables 430.248 and 430.250.
    """
    table = FLC_430_250 if phases == 3 else FLC_430_248
    column_v = table_voltage_v(system_v)
    voltages = table.rows["voltages"]
    if column_v not in voltages:
        raise OutOfRangeError(f"{system_v:g} V is not a voltage of {table.source} "
                              f"(columns {', '.join(str(v) for v in voltages)} V, 430.6(A)(1) ranges)")
    row = next((v for k, v in table.rows.items() if k != "voltages" and abs(k - hp) < 1e-6), None)
    if row is None or row[voltages.index(column_v)] is None:
        raise OutOfRangeError(f"{hp:g} hp at {column_v} V is not listed in {table.source}")
    return float(row[voltages.index(column_v)])
