"""Tray and duct fill per route segment.

Two rules, both common practice (no IEC 60364 clause fixes a fill):

* tray and ladder, cables laid in a single layer: the sum of the cables' outer
  diameters against the tray's usable width (``tray_width``);
* conduit, trunking and duct: the sum of the cables' cross-sectional areas
  (pi d²/4) against the inner area of the conduit or duct (``duct_area``).

A segment above its limit is a warning; above 100 % (the cables do not fit in a
single layer, or need more area than the duct has) it is a fail.  Clipped-direct
and buried runs have no containment to fill: ``not_applicable``.

The outer diameters by cable type are typical values for 0.6/1 kV
XLPE-insulated, PVC-sheathed multi-core cables with stranded copper
conductors, as makers' data sheets give them: from memory, to be replaced by
the chosen maker's data (``[sizing.cable_od_mm]`` in the config).
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass

from cablewright.core.errors import OutOfRangeError

__all__ = [
    "DEFAULT_CABLE_OD_MM",
    "OD_SOURCE",
    "FILL_RULES",
    "SegmentFill",
    "od_key",
    "outer_diameter_mm",
    "tray_fill_pct",
    "duct_fill_pct",
    "segment_fill",
]

OD_SOURCE = ("typical outer diameters of 0.6/1 kV XLPE/PVC multi-core copper cables "
             "from makers' data sheets, from memory; override with [sizing.cable_od_mm]")

#: Outer diameter [mm] per ``"<cores>x<csa_mm2>"``: from memory (see :data:`OD_SOURCE`).
DEFAULT_CABLE_OD_MM: dict[str, float] = {
    "2x1.5": 11.0, "2x2.5": 12.0, "2x4": 14.0, "2x6": 15.0, "2x10": 17.0, "2x16": 19.0,
    "3x1.5": 12.0, "3x2.5": 13.0, "3x4": 15.0, "3x6": 16.0, "3x10": 18.0, "3x16": 20.0,
    "3x25": 24.0, "3x35": 26.0, "3x50": 30.0, "3x70": 34.0, "3x95": 38.0, "3x120": 42.0,
    "3x150": 46.0, "3x185": 51.0, "3x240": 57.0, "3x300": 63.0,
    "4x1.5": 13.0, "4x2.5": 14.0, "4x4": 16.0, "4x6": 17.0, "4x10": 20.0, "4x16": 22.0,
    "4x25": 26.0, "4x35": 29.0, "4x50": 33.0, "4x70": 37.0, "4x95": 42.0, "4x120": 46.0,
    "4x150": 51.0, "4x185": 57.0, "4x240": 64.0, "4x300": 70.0,
    "5x1.5": 14.0, "5x2.5": 15.0, "5x4": 17.0, "5x6": 19.0, "5x10": 22.0, "5x16": 24.0,
}

#: Containment -> fill rule ("tray_width", "duct_area" or None: nothing to fill).
FILL_RULES: dict[str, str | None] = {
    "tray": "tray_width", "ladder": "tray_width",  # single layer, common practice
    "conduit": "duct_area", "duct": "duct_area",  # area ratio, common practice
    "clipped": None, "buried": None,
}


@dataclass(frozen=True)
class SegmentFill:
    """Fill of one segment.

    Attributes
    ----------
    segment_id : str
    rule : str or None
        ``"tray_width"``, ``"duct_area"`` or ``None`` (clipped, buried).
    size_mm : float or None
        Usable tray width or duct inner diameter [mm]; ``None`` when not configured.
    percent : float or None
        Fill [%]; ``None`` when it could not be computed.
    limit_percent : float or None
    result : str
        ``"pass"``, ``"warning"`` (above the limit), ``"fail"`` (above 100 %),
        ``"not_checked"`` (a size or a diameter missing) or ``"not_applicable"``.
    message : str
    """

    segment_id: str
    rule: str | None
    size_mm: float | None
    percent: float | None
    limit_percent: float | None
    result: str
    message: str = ""


def od_key(cores: int, csa_mm2: float) -> str:
    """The table key of a cable: ``"4x95"``.

    Examples
    --------
    >>> od_key(4, 95.0), od_key(3, 1.5)
    ('4x95', '3x1.5')
    """
    return f"{int(cores)}x{csa_mm2:g}"


def outer_diameter_mm(cores: int, csa_mm2: float, table: Mapping[str, float] | None = None) -> float | None:
    """Outer diameter of a cable [mm] from ``table`` over the defaults; ``None`` if unknown.

    Parameters
    ----------
    cores : int
        Cores of one cable.
    csa_mm2 : float
        Cross-section of one core [mm²].
    table : mapping, optional
        Project values ``"<cores>x<csa>" -> mm``; they win over
        :data:`DEFAULT_CABLE_OD_MM` (from memory).

    Examples
    --------
    >>> outer_diameter_mm(4, 95), outer_diameter_mm(4, 95, {"4x95": 40.5}), outer_diameter_mm(7, 1.5)
    (42.0, 40.5, None)
    """
    key = od_key(cores, csa_mm2)
    if table and key in table:
        return float(table[key])
    value = DEFAULT_CABLE_OD_MM.get(key)
    return None if value is None else float(value)


def tray_fill_pct(diameters_mm: Sequence[float], width_mm: float) -> float:
    """Single-layer fill of a tray: sum of outer diameters over the usable width [%].

    fill = 100 x sum(d_i) / W  (common practice for cables laid touching in one layer)

    Parameters
    ----------
    diameters_mm : sequence of float
        Outer diameter of every cable on the tray [mm].
    width_mm : float
        Usable width of the tray [mm], > 0.

    Raises
    ------
    OutOfRangeError
        ``width_mm`` <= 0.

    Examples
    --------
    >>> tray_fill_pct([42.0, 42.0, 20.0], 300.0)
    34.666666666666664
    """
    if width_mm <= 0:
        raise OutOfRangeError(f"tray width {width_mm} mm must be > 0", value=width_mm)
    return 100.0 * sum(diameters_mm) / width_mm


def duct_fill_pct(diameters_mm: Sequence[float], inner_diameter_mm: float) -> float:
    """Area fill of a conduit or duct: sum of cable areas over the inner area [%].

    fill = 100 x sum(pi d_i² / 4) / (pi D² / 4)  (common practice)

    Parameters
    ----------
    diameters_mm : sequence of float
        Outer diameter of every cable in the duct [mm].
    inner_diameter_mm : float
        Inner diameter of the duct or conduit [mm], > 0.

    Raises
    ------
    OutOfRangeError
        ``inner_diameter_mm`` <= 0.

    Examples
    --------
    >>> round(duct_fill_pct([20.0, 20.0], 100.0), 1)
    8.0
    """
    if inner_diameter_mm <= 0:
        raise OutOfRangeError(f"duct inner diameter {inner_diameter_mm} mm must be > 0", value=inner_diameter_mm)
    return 100.0 * sum(math.pi * d * d / 4.0 for d in diameters_mm) / (math.pi * inner_diameter_mm ** 2 / 4.0)


def segment_fill(
    segment_id: str,
    containment: str,
    size_mm: float | None,
    diameters_mm: Sequence[float],
    limit_percent: float,
    missing: Sequence[str] = (),
) -> SegmentFill:
    """The fill of one segment against its limit.

    Parameters
    ----------
    segment_id : str
        The route segment.
    containment : str
        ``tray``, ``ladder``, ``conduit``, ``duct``, ``clipped`` or ``buried``.
    size_mm : float or None
        Usable width (tray, ladder) or inner diameter (conduit, duct) [mm].
    diameters_mm : sequence of float
        Outer diameter of every cable on the segment (parallel cables each) [mm].
    limit_percent : float
        Warning above this fill [%]; a fill above 100 % fails.
    missing : sequence of str
        Cables on the segment whose diameter is unknown; the fill is then not checked.

    Returns
    -------
    SegmentFill
    """
    rule = FILL_RULES.get(containment)
    if rule is None:
        return SegmentFill(segment_id, None, None, None, None, "not_applicable")
    if size_mm is None:
        return SegmentFill(segment_id, rule, None, None, limit_percent, "not_checked",
                           f"no size for this {containment}; set [sizing.containment_mm] for its layer")
    if missing:
        return SegmentFill(segment_id, rule, size_mm, None, limit_percent, "not_checked",
                           f"no outer diameter for {', '.join(sorted(set(missing)))}; "
                           "add it to [sizing.cable_od_mm]")
    pct = tray_fill_pct(diameters_mm, size_mm) if rule == "tray_width" else duct_fill_pct(diameters_mm, size_mm)
    what = "sum of diameters over the usable width" if rule == "tray_width" else "cable area over the inner area"
    if pct > 100.0 + 1e-9:
        return SegmentFill(segment_id, rule, size_mm, pct, limit_percent, "fail",
                           f"{containment} full: {pct:.0f} % ({what}); use a larger {containment} or another route")
    if pct > limit_percent + 1e-9:
        return SegmentFill(segment_id, rule, size_mm, pct, limit_percent, "warning",
                           f"{containment} fill {pct:.0f} % above the {limit_percent:g} % limit ({what})")
    return SegmentFill(segment_id, rule, size_mm, pct, limit_percent, "pass")
