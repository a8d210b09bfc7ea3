"""Correction and reduction factors of IEC 60364-5-52:2009 Annex B as data.

Tables B.52.14 (ambient air temperature), B.52.15 (ground temperature),
B.52.16 (soil thermal resistivity), B.52.17 (groups in air, on surfaces,
enclosed), B.52.18 (direct in ground), B.52.19 (multi-core cables in
single-way ducts in ground), B.52.20 (multi-core cables on trays and ladders,
method E) and B.52.21 (single-core cables, method F), with lookups returning
:class:`~cablewright.sizing.model.Factor`.

Reading rule
------------
The standard allows no interpolation in these tables, so none is done: a value
between two rows reads the next more onerous row (42 °C reads 45 °C,
1.2 K·m/W reads 1.5 K·m/W, 10 cables read 12, 4 trays read 6).  A value below
the first row of a temperature or resistivity table reads the first row (more
onerous than the true factor, so safe).  A value beyond the last row raises
:class:`OutOfRangeError` naming the value, the limit and the table, except where
a note of the table says that no further reduction applies (B.52.17 rows 2 to 5
beyond nine circuits), which is applied and cited.

Where the values come from
--------------------------
No copy of the standard itself was available; see each constant's
``provenance``.  In short: B.52.14, B.52.16, B.52.17 and B.52.20 were compared
cell by cell in at least two independent public copies; B.52.15 in two copies;
B.52.18 2 to 20 circuits in two copies for the "touching" and "one diameter"
columns, the other columns for 7 to 20 circuits in one copy; B.52.19
"touching" 2 to 20 cables in two copies, the spaced columns 2 to 12 in one copy
(13 to 20 for spaced ducts are not stored); B.52.21 in two copies except the
"vertical perforated tray, touching" rows, which are from memory.

References
----------
.. [1] IEC 60364-5-52:2009, Low-voltage electrical installations - Part 5-52:
   Selection and erection of electrical equipment - Wiring systems, Annex B,
   Tables B.52.14 to B.52.21.
"""

from __future__ import annotations

import difflib
from collections.abc import Iterable
from dataclasses import dataclass
from typing import Any

from cablewright.core.errors import OutOfRangeError, UnknownKeyError

from .model import Factor

__all__ = [
    "FactorGrid",
    "B_52_14",
    "B_52_15",
    "B_52_16",
    "B_52_17",
    "B_52_18",
    "B_52_19",
    "B_52_20",
    "B_52_21",
    "ambient_air_factor",
    "ground_temperature_factor",
    "soil_resistivity_factor",
    "b52_17_factor",
    "grouping_factor",
    "CONTAINMENT_SUPPORT",
    "route_grouping_factor",
]


@dataclass(frozen=True)
class FactorGrid:
    """A table of factors: rows by ``row_keys``, columns by ``column_keys``.

    Attributes
    ----------
    table : str
        Table number, e.g. ``"B.52.14"``.
    arrangement : str
        Part of the table held here ("" for a whole table), e.g.
        ``"perforated_tray/touching"``.
    row_label, column_label : str
        What the row and column keys mean, with units.
    row_keys : tuple
        Row keys as printed (numbers ascending, or names).
    column_keys : tuple
        Column keys as printed.
    values : tuple of tuple of float or None
        ``values[i][j]`` is the factor of row i, column j; ``None`` where the
        table prints no value.
    notes : tuple of str
        Notes of the table that change how it is read.
    provenance : str
        Public copies the values were read from and how they were checked.
    standard, edition, unit : str
        ``"IEC 60364-5-52"``, ``"2009"``, ``"1"`` (dimensionless).
    """

    table: str
    arrangement: str
    row_label: str
    column_label: str
    row_keys: tuple[Any, ...]  # numbers or words, as the table prints its rows
    column_keys: tuple[Any, ...]
    values: tuple[tuple[float | None, ...], ...]
    notes: tuple[str, ...]
    provenance: str
    standard: str = "IEC 60364-5-52"
    edition: str = "2009"
    unit: str = "1"

    @property
    def source(self) -> str:
        """Citation, e.g. ``"IEC 60364-5-52:2009 Table B.52.14"``."""
        return f"{self.standard}:{self.edition} Table {self.table}"

    def cell(self, row_key: Any, column_key: Any) -> float | None:
        """Printed value at a row and column key (``None`` if blank)."""
        return self.values[self.row_keys.index(row_key)][self.column_keys.index(column_key)]

    def column(self, column_key: Any) -> dict[Any, float]:
        """Row key -> value of one column, blanks left out."""
        j = self.column_keys.index(column_key)
        return {k: v for k, row in zip(self.row_keys, self.values, strict=True)
                if (v := row[j]) is not None}

    def row(self, row_key: Any) -> dict[Any, float]:
        """Column key -> value of one row, blanks left out."""
        i = self.row_keys.index(row_key)
        return {k: v for k, v in zip(self.column_keys, self.values[i], strict=True)
                if v is not None}


_: None = None

# fmt: off
#: IEC 60364-5-52:2009 Table B.52.14: correction factors for ambient air
#: temperatures other than 30 °C, to be applied to capacities for cables in air.
B_52_14 = FactorGrid(
    table="B.52.14", arrangement="", row_label="ambient air temperature [°C]",
    column_label="insulation",
    row_keys=(10, 15, 20, 25, 30, 35, 40, 45, 50, 55, 60, 65, 70, 75, 80),
    column_keys=("PVC", "XLPE"),
    values=(
        (1.22, 1.15), (1.17, 1.12), (1.12, 1.08), (1.06, 1.04), (1.00, 1.00),
        (0.94, 0.96), (0.87, 0.91), (0.79, 0.87), (0.71, 0.82), (0.61, 0.76),
        (0.50, 0.71), (_, 0.65), (_, 0.58), (_, 0.50), (_, 0.41),
    ),
    notes=("XLPE column also holds EPR.",),
    provenance="Three public copies compared cell by cell, all agree.",
)

#: IEC 60364-5-52:2009 Table B.52.15: correction factors for ground
#: temperatures other than 20 °C (reference methods D1, D2).
B_52_15 = FactorGrid(
    table="B.52.15", arrangement="", row_label="ground temperature [°C]",
    column_label="insulation",
    row_keys=(10, 15, 20, 25, 30, 35, 40, 45, 50, 55, 60, 65, 70, 75, 80),
    column_keys=("PVC", "XLPE"),
    values=(
        (1.10, 1.07), (1.05, 1.04), (1.00, 1.00), (0.95, 0.96), (0.89, 0.93),
        (0.84, 0.89), (0.77, 0.85), (0.71, 0.80), (0.63, 0.76), (0.55, 0.71),
        (0.45, 0.65), (_, 0.60), (_, 0.53), (_, 0.46), (_, 0.38),
    ),
    notes=("XLPE column also holds EPR.",),
    provenance=("Two public copies for 10 to 80 °C and two more for 10 to 60 °C, "
                "compared cell by cell, all agree."),
)

#: IEC 60364-5-52:2009 Table B.52.16: correction factors for soil thermal
#: resistivities other than 2.5 K·m/W (D1 cables in buried ducts, D2 direct buried).
B_52_16 = FactorGrid(
    table="B.52.16", arrangement="", row_label="soil thermal resistivity [K·m/W]",
    column_label="reference method",
    row_keys=(0.5, 0.7, 1.0, 1.5, 2.0, 2.5, 3.0),
    column_keys=("D1", "D2"),
    values=((1.28, 1.88), (1.20, 1.62), (1.18, 1.50), (1.10, 1.28), (1.05, 1.12),
            (1.00, 1.00), (0.96, 0.90)),
    notes=("The correction factors are averaged over the range of conductor sizes and "
           "types of installation of Tables B.52.2 to B.52.5; overall accuracy within 5 %.",
           "The factors for ducts apply to ducts buried at depths up to 0.8 m."),
    provenance="Four public copies compared cell by cell, all agree.",
)

_NINE = ("No further reduction factor for more than nine circuits or multi-core cables "
         "(Table B.52.17, rows 2 to 5).")

#: IEC 60364-5-52:2009 Table B.52.17: reduction factors for groups of more than
#: one circuit or of more than one multi-core cable (methods A to F).
B_52_17 = FactorGrid(
    table="B.52.17", arrangement="", row_label="arrangement (cables touching)",
    column_label="number of circuits or multi-core cables",
    row_keys=("bunched", "wall", "ceiling", "perforated_tray", "ladder"),
    column_keys=(1, 2, 3, 4, 5, 6, 7, 8, 9, 12, 16, 20),
    values=(
        (1.00, 0.80, 0.70, 0.65, 0.60, 0.57, 0.54, 0.52, 0.50, 0.45, 0.41, 0.38),
        (1.00, 0.85, 0.79, 0.75, 0.73, 0.72, 0.72, 0.71, 0.70, _, _, _),
        (0.95, 0.81, 0.72, 0.68, 0.66, 0.64, 0.63, 0.62, 0.61, _, _, _),
        (1.00, 0.88, 0.82, 0.77, 0.75, 0.73, 0.73, 0.72, 0.72, _, _, _),
        (1.00, 0.87, 0.82, 0.80, 0.80, 0.79, 0.79, 0.78, 0.78, _, _, _),
    ),
    notes=(
        "Row 1 bunched in air, on a surface, embedded or enclosed (methods A to F); "
        "row 2 single layer on wall, floor or unperforated cable tray (C); row 3 single "
        "layer fixed directly under a wooden ceiling (C); row 4 single layer on a "
        "perforated horizontal or vertical cable tray (E, F); row 5 single layer on "
        "cable ladder support or cleats etc. (E, F).",
        _NINE,
        "These factors are applicable to uniform groups of cables, equally loaded.",
    ),
    provenance=("Three public copies compared cell by cell (one of them itself checked "
                "against two reproductions of the standard), all agree."),
)

#: IEC 60364-5-52:2009 Table B.52.18: reduction factors for more than one
#: circuit, cables laid directly in the ground (method D2), single-core or
#: multi-core; columns are the cable-to-cable clearance.
B_52_18 = FactorGrid(
    table="B.52.18", arrangement="", row_label="number of circuits",
    column_label="cable-to-cable clearance",
    row_keys=(2, 3, 4, 5, 6, 7, 8, 9, 12, 16, 20),
    column_keys=("touching", "one_diameter", "0.125m", "0.25m", "0.5m"),
    values=(
        (0.75, 0.80, 0.85, 0.90, 0.90),
        (0.65, 0.70, 0.75, 0.80, 0.85),
        (0.60, 0.60, 0.70, 0.75, 0.80),
        (0.55, 0.55, 0.65, 0.70, 0.80),
        (0.50, 0.55, 0.60, 0.70, 0.80),
        (0.45, 0.51, 0.59, 0.67, 0.76),
        (0.43, 0.48, 0.57, 0.65, 0.75),
        (0.41, 0.46, 0.55, 0.63, 0.74),
        (0.36, 0.42, 0.51, 0.59, 0.71),
        (0.32, 0.38, 0.47, 0.56, 0.68),
        (0.29, 0.35, 0.44, 0.53, 0.66),
    ),
    notes=("Values apply to a depth of 0.7 m and a soil thermal resistivity of "
           "2.5 K·m/W; averaging and rounding can give errors up to ±10 %.",
           "A circuit of m parallel conductors per phase counts as m circuits."),
    provenance=("2 to 6 circuits: three public copies agree. 7 to 20 circuits: columns "
                "touching and one_diameter in two copies; the other columns in one copy "
                "(7 to 12 also in a third, national copy)."),
)

#: IEC 60364-5-52:2009 Table B.52.19 part A: reduction factors for more than
#: one circuit, multi-core cables in single-way ducts in the ground (method D1);
#: columns are the duct-to-duct clearance.
B_52_19 = FactorGrid(
    table="B.52.19", arrangement="multi-core cables in single-way ducts",
    row_label="number of cables", column_label="duct-to-duct clearance",
    row_keys=tuple(range(2, 21)),
    column_keys=("touching", "0.25m", "0.5m", "1.0m"),
    values=(
        (0.85, 0.90, 0.95, 0.95),
        (0.75, 0.85, 0.90, 0.95),
        (0.70, 0.80, 0.85, 0.90),
        (0.65, 0.80, 0.85, 0.90),
        (0.60, 0.80, 0.80, 0.90),
        (0.57, 0.76, 0.80, 0.88),
        (0.54, 0.74, 0.78, 0.88),
        (0.52, 0.73, 0.77, 0.87),
        (0.49, 0.72, 0.76, 0.86),
        (0.47, 0.70, 0.75, 0.86),
        (0.45, 0.69, 0.74, 0.85),
        (0.44, _, _, _),
        (0.42, _, _, _),
        (0.41, _, _, _),
        (0.39, _, _, _),
        (0.38, _, _, _),
        (0.37, _, _, _),
        (0.35, _, _, _),
        (0.34, _, _, _),
    ),
    notes=("Values apply to a depth of 0.7 m and a soil thermal resistivity of "
           "2.5 K·m/W; averaging and rounding can give errors up to ±10 %.",
           "A circuit of n parallel conductors per phase counts as n circuits.",
           "Spaced columns for 13 to 20 cables are printed in the standard but not stored "
           "here (no public copy found); those lookups raise."),
    provenance=("2 to 6 cables: three public copies agree. Column touching 7 to 20: two "
                "copies agree. Spaced columns 7 to 12: one public copy."),
)

_B20_NOTES = (
    "Values are averages for the cable types and conductor sizes of Tables B.52.8 to "
    "B.52.13; spread generally less than 5 %.",
    "Factors apply to single-layer groups and do not apply to cables in more than one "
    "layer touching each other.",
    "Values for vertical spacing between trays of 300 mm (horizontal trays) or horizontal "
    "spacing of 225 mm back to back (vertical trays); for closer spacing reduce them.",
)
_B20_PROV = ("Three public copies (two of them national adoptions) compared cell by cell; "
             "spaced perforated 3 trays: the copies split 2 to 1 at 2 and 6 cables, the "
             "majority value is stored.")
_B20_COLS = (1, 2, 3, 4, 6, 9)


def _b20(arr: str, trays: tuple[int, ...], values: tuple[tuple[float | None, ...], ...]) -> FactorGrid:
    return FactorGrid(
        table="B.52.20", arrangement=arr, row_label="number of trays or ladders",
        column_label="number of multi-core cables per tray", row_keys=trays,
        column_keys=_B20_COLS, values=values, notes=_B20_NOTES, provenance=_B20_PROV)


#: IEC 60364-5-52:2009 Table B.52.20: reduction factors for groups of more than
#: one multi-core cable (method E), by support and spacing; rows = trays.
B_52_20: dict[tuple[str, str], FactorGrid] = {
    ("perforated_tray", "touching"): _b20("perforated_tray/touching", (1, 2, 3, 6), (
        (1.00, 0.88, 0.82, 0.79, 0.76, 0.73),
        (1.00, 0.87, 0.80, 0.77, 0.73, 0.68),
        (1.00, 0.86, 0.79, 0.76, 0.71, 0.66),
        (1.00, 0.84, 0.77, 0.73, 0.68, 0.64))),
    ("perforated_tray", "spaced"): _b20("perforated_tray/spaced", (1, 2, 3), (
        (1.00, 1.00, 0.98, 0.95, 0.91, _),
        (1.00, 0.99, 0.96, 0.92, 0.87, _),
        (1.00, 0.98, 0.95, 0.91, 0.85, _))),
    ("vertical_tray", "touching"): _b20("vertical_tray/touching", (1, 2), (
        (1.00, 0.88, 0.82, 0.78, 0.73, 0.72),
        (1.00, 0.88, 0.81, 0.76, 0.71, 0.70))),
    ("vertical_tray", "spaced"): _b20("vertical_tray/spaced", (1, 2), (
        (1.00, 0.91, 0.89, 0.88, 0.87, _),
        (1.00, 0.91, 0.88, 0.87, 0.85, _))),
    ("unperforated_tray", "touching"): _b20("unperforated_tray/touching", (1, 2, 3, 6), (
        (0.97, 0.84, 0.78, 0.75, 0.71, 0.68),
        (0.97, 0.83, 0.76, 0.72, 0.68, 0.63),
        (0.97, 0.82, 0.75, 0.71, 0.66, 0.61),
        (0.97, 0.81, 0.73, 0.69, 0.63, 0.58))),
    ("ladder", "touching"): _b20("ladder/touching", (1, 2, 3, 6), (
        (1.00, 0.87, 0.82, 0.80, 0.79, 0.78),
        (1.00, 0.86, 0.80, 0.78, 0.76, 0.73),
        (1.00, 0.85, 0.79, 0.76, 0.73, 0.70),
        (1.00, 0.84, 0.77, 0.73, 0.68, 0.64))),
    ("ladder", "spaced"): _b20("ladder/spaced", (1, 2, 3), (
        (1.00, 1.00, 1.00, 1.00, 1.00, _),
        (1.00, 0.99, 0.98, 0.97, 0.96, _),
        (1.00, 0.98, 0.97, 0.96, 0.93, _))),
}

_B21_NOTES = (
    "Touching rows: use as a multiplier to the rating for three cables in horizontal "
    "(flat) formation; trefoil rows: for three cables in trefoil formation, groups "
    "spaced 2 De.",
    "A circuit with more than one cable in parallel per phase: each three-phase set of "
    "conductors counts as a circuit.",
)
_B21_PROV = ("Two public copies (a manufacturer's reproduction and a national wiring "
             "rules table with the same values) agree cell by cell, except the rows "
             "vertical_tray/touching, which are from memory.")


def _b21(arr: str, trays: tuple[int, ...], values: tuple[tuple[float | None, ...], ...],
         prov: str = _B21_PROV) -> FactorGrid:
    return FactorGrid(
        table="B.52.21", arrangement=arr, row_label="number of trays or ladders",
        column_label="number of three-phase circuits per tray", row_keys=trays,
        column_keys=(1, 2, 3), values=values, notes=_B21_NOTES, provenance=prov)


#: IEC 60364-5-52:2009 Table B.52.21: reduction factors for groups of more than
#: one circuit of single-core cables (method F), by support and formation.
B_52_21: dict[tuple[str, str], FactorGrid] = {
    ("perforated_tray", "touching"): _b21("perforated_tray/touching", (1, 2, 3), (
        (0.98, 0.91, 0.87), (0.96, 0.87, 0.81), (0.95, 0.85, 0.78))),
    ("vertical_tray", "touching"): _b21("vertical_tray/touching", (1, 2), (
        (0.96, 0.86, _), (0.95, 0.84, _)), prov="From memory (no public copy found)."),
    ("ladder", "touching"): _b21("ladder/touching", (1, 2, 3), (
        (1.00, 0.97, 0.96), (0.98, 0.93, 0.89), (0.97, 0.90, 0.86))),
    ("perforated_tray", "trefoil"): _b21("perforated_tray/trefoil", (1, 2, 3), (
        (1.00, 0.98, 0.96), (0.97, 0.93, 0.89), (0.96, 0.92, 0.86))),
    ("vertical_tray", "trefoil"): _b21("vertical_tray/trefoil", (1, 2), (
        (1.00, 0.91, 0.89), (1.00, 0.90, 0.86))),
    ("ladder", "trefoil"): _b21("ladder/trefoil", (1, 2, 3), (
        (1.00, 1.00, 1.00), (0.97, 0.95, 0.93), (0.96, 0.94, 0.90))),
}
# fmt: on

_INSULATION_ALIAS = {"PVC": "PVC", "XLPE": "XLPE", "EPR": "XLPE"}


def _unknown(kind: str, value: object, known: Iterable[object], where: str) -> UnknownKeyError:
    names = [str(k) for k in known]
    lower = {k.lower(): k for k in names}
    close = [lower[c] for c in difflib.get_close_matches(str(value).lower(), lower, n=3)]
    hint = f"; did you mean {', '.join(repr(c) for c in close)}?" if close else ""
    return UnknownKeyError(value=value, known=tuple(names), problem=f"unknown {kind} {value!r} for {where}",
                           fix=f"known: {', '.join(names)}{hint}")


def _insulation(insulation: str, grid: FactorGrid) -> str:
    if insulation not in _INSULATION_ALIAS:
        raise _unknown("insulation", insulation, tuple(_INSULATION_ALIAS), grid.source)
    return _INSULATION_ALIAS[insulation]


def _step_up(value: float, keys: Iterable[float], what: str, unit: str, source: str) -> tuple[float, str]:
    """Smallest key >= value (the next more onerous row); raise beyond the last."""
    keys = sorted(keys)
    if value > keys[-1]:
        raise OutOfRangeError(
            value=value, limit=keys[-1], source=source,
            problem=f"{what} {value:g}{unit} is beyond the last row of {source} ({keys[-1]:g}{unit})",
            fix="the table gives no factor there and none is extrapolated")
    for k in keys:
        if value <= k:
            if value == k:
                return k, f"row {k:g}{unit}"
            if value < keys[0]:
                return k, f"{value:g}{unit} below the first row, read row {k:g}{unit} (more onerous)"
            return k, f"{value:g}{unit} between rows, read next more onerous row {k:g}{unit}"
    raise AssertionError("unreachable")  # pragma: no cover


def _temperature_factor(name: str, grid: FactorGrid, temp_c: float,
                        insulation: str) -> Factor:
    ins = _insulation(insulation, grid)
    column = grid.column(ins)
    key, how = _step_up(float(temp_c), column, grid.row_label.split(" [")[0], " °C", grid.source)
    return Factor(name=name, value=column[key], source=grid.source,
                  detail=f"{insulation}, {how}")


def ambient_air_factor(ambient_c: float, insulation: str) -> Factor:
    """Correction factor for an ambient air temperature other than 30 °C.

    Parameters
    ----------
    ambient_c : float
        Ambient air temperature [°C]; at most 60 (PVC) or 80 (XLPE/EPR).
    insulation : str
        ``"PVC"``, ``"XLPE"`` or ``"EPR"``.

    Returns
    -------
    Factor
        ``name="ambient"``; between rows the next hotter row is read.

    Raises
    ------
    OutOfRangeError
        Above the hottest row of the insulation's column.
    UnknownKeyError
        Unknown insulation.

    Examples
    --------
    >>> f = ambient_air_factor(42, "XLPE")
    >>> f.value, f.source
    (0.87, 'IEC 60364-5-52:2009 Table B.52.14')

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex B, Table B.52.14.
    """
    return _temperature_factor("ambient", B_52_14, ambient_c, insulation)


def ground_temperature_factor(ground_c: float, insulation: str) -> Factor:
    """Correction factor for a ground temperature other than 20 °C (methods D1, D2).

    Parameters
    ----------
    ground_c : float
        Ground temperature [°C]; at most 60 (PVC) or 80 (XLPE/EPR).
    insulation : str
        ``"PVC"``, ``"XLPE"`` or ``"EPR"``.

    Returns
    -------
    Factor
        ``name="ground_temperature"``; between rows the next hotter row is read.

    Raises
    ------
    OutOfRangeError
        Above the hottest row of the insulation's column.
    UnknownKeyError
        Unknown insulation.

    Examples
    --------
    >>> ground_temperature_factor(25, "PVC").value
    0.95

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex B, Table B.52.15.
    """
    return _temperature_factor("ground_temperature", B_52_15, ground_c, insulation)


def soil_resistivity_factor(resistivity_k_m_w: float, method: str) -> Factor:
    """Correction factor for a soil thermal resistivity other than 2.5 K·m/W.

    Parameters
    ----------
    resistivity_k_m_w : float
        Soil thermal resistivity [K·m/W], > 0 and at most 3.0.
    method : str
        ``"D1"`` (cables in buried ducts) or ``"D2"`` (direct buried).

    Returns
    -------
    Factor
        ``name="soil"``; between rows the next higher resistivity is read.

    Raises
    ------
    OutOfRangeError
        Resistivity not positive or above 3.0 K·m/W.
    UnknownKeyError
        Method other than D1 or D2.

    Examples
    --------
    >>> soil_resistivity_factor(1.0, "D2").value
    1.5

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex B, Table B.52.16.
    """
    grid = B_52_16
    if method not in grid.column_keys:
        raise _unknown("method", method, grid.column_keys, grid.source)
    if not resistivity_k_m_w > 0:
        raise OutOfRangeError(
            f"soil thermal resistivity {resistivity_k_m_w!r} K·m/W must be > 0 ({grid.source})", value=resistivity_k_m_w)
    column = grid.column(method)
    key, how = _step_up(float(resistivity_k_m_w), column, "soil thermal resistivity",
                        " K·m/W", grid.source)
    kind = "cables in buried ducts" if method == "D1" else "direct buried cables"
    return Factor(name="soil", value=column[key], source=grid.source,
                  detail=f"{method} ({kind}), {how}")


def _check_count(cables: int, what: str, source: str) -> int:
    if isinstance(cables, bool) or int(cables) != cables or cables < 1:
        raise OutOfRangeError(f"{what} {cables!r} must be a whole number >= 1 ({source})", value=cables)
    return int(cables)


def b52_17_factor(arrangement: str, circuits: int) -> Factor:
    """Reduction factor of Table B.52.17 for one arrangement row.

    Parameters
    ----------
    arrangement : str
        ``"bunched"`` (row 1), ``"wall"`` (row 2, also floor or unperforated
        tray), ``"ceiling"`` (row 3), ``"perforated_tray"`` (row 4) or
        ``"ladder"`` (row 5).
    circuits : int
        Number of circuits or multi-core cables, >= 1.

    Returns
    -------
    Factor
        ``name="grouping"``; the printed value (the ceiling row prints 0.95 for
        one circuit); rows 2 to 5 beyond nine circuits read the nine-circuit
        value, citing the table's note.

    Raises
    ------
    OutOfRangeError
        ``circuits`` < 1, or more than 20 bunched.
    UnknownKeyError
        Unknown arrangement.

    Examples
    --------
    >>> b52_17_factor("wall", 14).value
    0.7

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex B, Table B.52.17.
    """
    grid = B_52_17
    if arrangement not in grid.row_keys:
        raise _unknown("arrangement", arrangement, grid.row_keys, grid.source)
    n = _check_count(circuits, "number of circuits", grid.source)
    row = grid.row(arrangement)
    if arrangement != "bunched" and n > 9:
        return Factor(name="grouping", value=row[9], source=grid.source,
                      detail=f"{arrangement}, {n} circuits: {_NINE}")
    key, how = _step_up(n, row, "number of circuits", "", grid.source)
    return Factor(name="grouping", value=row[key], source=grid.source,
                  detail=f"{arrangement}, {how.replace('row', 'column')} circuits")


def _grid_factor(grid: FactorGrid, n: int, trays: int, count_word: str) -> Factor:
    tray_key, tray_how = _step_up(trays, grid.row_keys, "number of trays", "", grid.source)
    row = grid.row(tray_key)
    if n > max(row):
        raise OutOfRangeError(
            f"{n} {count_word} per tray is beyond the last column of {grid.source}, "
            f"{grid.arrangement} ({max(row)}); the table gives no factor there")
    key, how = _step_up(n, row, f"number of {count_word}", "", grid.source)
    return Factor(
        name="grouping", value=row[key], source=grid.source,
        detail=(f"{grid.arrangement}, trays: {tray_how.replace('row ', '')}; "
                f"{count_word}: {how.replace('row ', '').replace('rows', 'columns')}"))


_SUPPORT_TO_B52_17 = {"perforated_tray": "perforated_tray", "vertical_tray": "perforated_tray",
                      "ladder": "ladder", "unperforated_tray": "wall"}
_METHODS = ("A1", "A2", "B1", "B2", "C", "D1", "D2", "E", "F", "F_flat", "G", "G_vertical")
#: Spacing read by default per method: trefoil rows for method F (three
#: single-core cables in trefoil, the capacity column of F), the flat-touching
#: rows for F_flat (IEC 60364-5-52:2009 Table B.52.21 note 1).
_DEFAULT_SPACING = {"F": "trefoil", "F_flat": "touching"}
#: Methods G: single-core cables spaced one diameter apart, IEC 60364-5-52:2009
#: Table B.52.1 items 32/33 and Tables B.52.12/B.52.13 columns 7 and 8.
_SPACED_SINGLE_CORE = ("G", "G_vertical")


def grouping_factor(method: str, cables: int, *, trays: int = 1, spacing: str | None = None,
                    support: str | None = None) -> Factor:
    """Reduction factor for a group, from the table that fits the method.

    A1, A2, B1, B2: Table B.52.17 row 1 (bunched or enclosed).  C: B.52.17 row 2
    (single layer on a wall; ``support="ceiling"`` reads row 3).  D1: B.52.19
    (spacing ``touching``, ``0.25m``, ``0.5m``, ``1.0m``).  D2: B.52.18
    (``touching``, ``one_diameter``, ``0.125m``, ``0.25m``, ``0.5m``).  E:
    B.52.20 (support ``perforated_tray`` by default, ``ladder``,
    ``vertical_tray``, ``unperforated_tray``; spacing ``touching`` or
    ``spaced``).  F (trefoil) and F_flat: B.52.21 (support as for E but no
    unperforated tray); F reads the ``trefoil`` rows by default (1.00 for one
    circuit on one tray), F_flat the ``touching`` (flat) rows (0.98 for one
    circuit on a perforated tray).  G and G_vertical (spaced single-core
    cables): one circuit 1.0; B.52.21 gives no rows for groups of spaced
    single-core circuits, so a group raises.

    One cable gives 1.0 unless the table prints a lower value for a single
    cable or circuit (unperforated tray 0.97, ceiling 0.95, B.52.21 flat
    formation).  Counts between columns read the next larger column.  On one
    tray, more cables than B.52.20 or B.52.21 tabulate read the single-layer
    row of B.52.17 (rows 4, 5 or 2), whose note stops the reduction beyond
    nine circuits.

    Parameters
    ----------
    method : str
        Reference installation method: A1, A2, B1, B2, C, D1, D2, E, F.
    cables : int
        Circuits or multi-core cables in the group, >= 1.
    trays : int, optional
        Trays or ladders in the stack (E, F), >= 1; between rows the next
        larger row is read.
    spacing : str or None, optional
        See above; ``None`` reads ``"trefoil"`` for F and ``"touching"`` otherwise.
    support : str or None, optional
        See above.

    Returns
    -------
    Factor
        ``name="grouping"`` with the table and the row and column read.

    Raises
    ------
    OutOfRangeError
        Counts < 1, or beyond a table with no note that stops the reduction.
    UnknownKeyError
        Unknown method, spacing or support.

    Examples
    --------
    >>> f = grouping_factor("E", 5, trays=2)
    >>> f.value, f.source
    (0.73, 'IEC 60364-5-52:2009 Table B.52.20')

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex B, Tables B.52.17 to B.52.21.
    """
    if method not in _METHODS:
        raise _unknown("method", method, _METHODS, "grouping factors, "
                       "IEC 60364-5-52:2009 Tables B.52.17 to B.52.21")
    n = _check_count(cables, "number of cables", "IEC 60364-5-52:2009 grouping tables")
    t = _check_count(trays, "number of trays", "IEC 60364-5-52:2009 grouping tables")
    if spacing is None:
        spacing = _DEFAULT_SPACING.get(method, "touching")
    if method in _SPACED_SINGLE_CORE:
        source = "IEC 60364-5-52:2009 Table B.52.21"
        if n == 1 and t == 1:
            return Factor(name="grouping", value=1.0, source=source,
                          detail=f"method {method}, one circuit of spaced single-core cables")
        raise OutOfRangeError(
            f"{n} circuits of spaced single-core cables (method {method}) on {t} tray(s): "
            f"{source} gives no factor for groups of method G; use method F (trefoil) or "
            "F_flat for grouped single-core circuits")
    if method in ("A1", "A2", "B1", "B2"):
        return b52_17_factor("bunched", n)
    if method == "C":
        arrangement = {None: "wall", "wall": "wall", "ceiling": "ceiling"}.get(support)
        if arrangement is None:
            raise _unknown("support for method C", support, ("wall", "ceiling"),
                           "IEC 60364-5-52:2009 Table B.52.17")
        return b52_17_factor(arrangement, n)
    grid: FactorGrid | None
    if method in ("D1", "D2"):
        grid = B_52_19 if method == "D1" else B_52_18
        if spacing not in grid.column_keys:
            raise _unknown(f"spacing for method {method}", spacing, grid.column_keys,
                           grid.source)
        if n == 1:
            return Factor(name="grouping", value=1.0, source=grid.source,
                          detail="single circuit, no reduction")
        column = grid.column(spacing)
        if n > max(column):
            raise OutOfRangeError(
                f"{n} {'cables' if method == 'D1' else 'circuits'} is beyond the last row "
                f"of {grid.source}, spacing {spacing} ({max(column)}); no factor is "
                "extrapolated")
        key, how = _step_up(n, column, "number of circuits", "", grid.source)
        return Factor(name="grouping", value=column[key], source=grid.source,
                      detail=f"spacing {spacing}, {how}")
    tables = B_52_20 if method == "E" else B_52_21
    method = "F" if method == "F_flat" else method
    sup = support or "perforated_tray"
    grid = tables.get((sup, spacing))
    if grid is None:
        known = [f"support={s!r}, spacing={p!r}" for s, p in tables]
        raise UnknownKeyError(
            f"no part of IEC 60364-5-52:2009 Table {'B.52.20' if method == 'E' else 'B.52.21'} "
            f"for method {method} with support={sup!r}, spacing={spacing!r}; known: "
            f"{'; '.join(known)}")
    if t == 1 and n > max(grid.column_keys) and spacing in ("touching", "trefoil"):
        # More trefoil groups than B.52.21 tabulates: each read as one cable of a
        # single touching layer, B.52.17 rows 4/5 (more onerous than the spaced
        # trefoil rows; common practice).
        return b52_17_factor(_SUPPORT_TO_B52_17[sup], n)
    return _grid_factor(grid, n, t, "cables" if method == "E" else "circuits")


#: Containment of a route layer (contract.md, "Drawing conventions") -> the
#: support of Tables B.52.20 / B.52.21.
CONTAINMENT_SUPPORT = {"tray": "perforated_tray", "ladder": "ladder"}
_TRAY_METHODS = ("E", "F", "F_flat", "G", "G_vertical")


def route_grouping_factor(method: str, cables: int, tiers: int = 1,
                          containment: str = "tray") -> Factor:
    """Grouping factor on a stretch of route with ``tiers`` trays or ladders.

    For the tray methods (E, F, F_flat, G, G_vertical) the containment picks
    the support of Tables B.52.20/B.52.21 (``tray``: perforated tray,
    ``ladder``: ladder) and the row is the number of tiers; the cables of the
    stretch are taken as shared evenly over the tiers, so the column is
    ceil(cables / tiers) cables (or circuits) per tier (our reading: the
    drawing gives the stretch, not the tier of each cable).  Other methods
    read :func:`grouping_factor` with the cable count alone.

    Parameters
    ----------
    method : str
        Reference method.
    cables : int
        Cables (multi-core) or circuits (single-core) on the stretch, >= 1.
    tiers : int
        Trays or ladders stacked on the stretch, >= 1 (B.52.20 note: 300 mm apart).
    containment : str
        ``tray`` or ``ladder``; any other reads the perforated-tray rows.

    Returns
    -------
    Factor

    Raises
    ------
    OutOfRangeError
        More cables per tier than the table gives on several tiers.

    Examples
    --------
    12 multi-core cables on 2 perforated trays: 6 per tray, B.52.20 row 2:

    >>> route_grouping_factor("E", 12, tiers=2).value
    0.73
    >>> route_grouping_factor("E", 12, tiers=2, containment="ladder").value
    0.76

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex B, Tables B.52.20 and B.52.21.
    """
    t = _check_count(tiers, "number of tiers", "IEC 60364-5-52:2009 Tables B.52.20/B.52.21")
    if method not in _TRAY_METHODS:
        return grouping_factor(method, cables)
    n = _check_count(cables, "number of cables", "IEC 60364-5-52:2009 grouping tables")
    per_tier = -(-n // t)
    support = CONTAINMENT_SUPPORT.get(containment, "perforated_tray")
    return grouping_factor(method, per_tier, trays=t, support=support)
