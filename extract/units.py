"""Drawing units: every length code of ``$INSUNITS``, and a check that the scale is plausible.

The unit table follows the DXF reference's list of ``$INSUNITS`` codes, as ezdxf
carries it (``ezdxf.units.METER_FACTOR`` and ``ezdxf.units.unit_name``); where a
unit has an exact definition it is used (1 in = 25.4 mm, 1 ft = 0.3048 m,
1 yd = 0.9144 m, 1 mi = 1609.344 m by the international yard and pound agreement,
1959; 1 US survey foot = 1200/3937 m by the US Metric Law of 1866, as NIST
Handbook 44 Appendix C gives it).  ``tests/test_units_scale.py`` checks the table
against ezdxf's.

The plausibility check is common practice, not a standard: the plan of a building
or plant served by LV cables spans metres to a few kilometres, and one drawn route
piece (a LINE or polyline between two bends) is centimetres to some hundred metres
long.  A drawing whose route extents or median piece length fall outside these
bands is most likely drawn in other units than its header says.
"""

from __future__ import annotations

import math
import statistics
from collections.abc import Iterable, Mapping, Sequence
from dataclasses import dataclass

__all__ = [
    "INSUNITS",
    "UNIT_TO_M",
    "UNIT_ALIASES",
    "COMMON_UNITS",
    "EXTENT_BAND_M",
    "MEDIAN_PIECE_BAND_M",
    "ScaleCheck",
    "Extents",
    "DrawingSummary",
    "unit_name",
    "extents",
    "check_scale",
    "rank_units",
]

_SURVEY_FT_M = 1200.0 / 3937.0  # US survey foot, NIST Handbook 44 Appendix C

#: ``$INSUNITS`` code -> (unit name, metres per unit), every code that is a length
#: (DXF reference, HEADER section, $INSUNITS; 0 is "unitless", not a length).
INSUNITS: Mapping[int, tuple[str, float]] = {
    1: ("in", 0.0254),
    2: ("ft", 0.3048),
    3: ("mi", 1609.344),
    4: ("mm", 0.001),
    5: ("cm", 0.01),
    6: ("m", 1.0),
    7: ("km", 1000.0),
    8: ("µin", 0.0254e-6),
    9: ("mil", 0.0254e-3),
    10: ("yd", 0.9144),
    11: ("Å", 1e-10),
    12: ("nm", 1e-9),
    13: ("µm", 1e-6),
    14: ("dm", 0.1),
    15: ("dam", 10.0),
    16: ("hm", 100.0),
    17: ("Gm", 1e9),
    18: ("au", 149597870700.0),  # IAU 2012 Resolution B2
    19: ("ly", 9.46e15),  # as ezdxf.units gives it
    20: ("pc", 3.09e16),  # as ezdxf.units gives it
    21: ("us_ft", _SURVEY_FT_M),
    22: ("us_in", _SURVEY_FT_M / 12.0),
    23: ("us_yd", _SURVEY_FT_M * 3.0),
    24: ("us_mi", _SURVEY_FT_M * 5280.0),
}

#: Metres per drawing unit, by unit name (every name of :data:`INSUNITS`).
UNIT_TO_M: Mapping[str, float] = {name: factor for name, factor in INSUNITS.values()}

#: Other spellings accepted in the config (ASCII for the micro sign and Ångström).
UNIT_ALIASES: Mapping[str, str] = {"um": "µm", "uin": "µin", "angstrom": "Å", "A": "Å"}

#: Units a drawing of a building is commonly drawn in; the likely units are chosen
#: among these (common practice).
COMMON_UNITS = ("mm", "cm", "dm", "m", "in", "ft")

_IMPERIAL = {"in", "ft", "mi", "µin", "mil", "yd", "us_ft", "us_in", "us_yd", "us_mi"}

#: Decades added to the score of units seldom used for building plans, so that a
#: tie between cm and dm goes to cm (common practice).
RARE_UNIT_PENALTY: Mapping[str, float] = {"dm": 0.5}

#: Plausible largest plan extent of the routes, [m] (common practice).
EXTENT_BAND_M = (2.0, 5000.0)
#: Plausible median length of one route piece, [m] (common practice).
MEDIAN_PIECE_BAND_M = (0.05, 200.0)


def unit_name(text: str) -> str | None:
    """The unit name of :data:`UNIT_TO_M` that ``text`` spells, or None.

    Examples
    --------
    >>> unit_name("dm"), unit_name("um"), unit_name("furlong")
    ('dm', 'µm', None)
    """
    if text in UNIT_TO_M:
        return text
    alias = UNIT_ALIASES.get(text)
    if alias is not None:
        return alias
    lower = text.lower()
    for name in UNIT_TO_M:
        if name.lower() == lower:
            return name
    return None


@dataclass(frozen=True)
class Extents:
    """Bounding box of the routes, [m].

    Attributes
    ----------
    min_m, max_m : (x, y, z)
        Lowest and highest corner, [m].
    median_piece_m : float
        Median true length of one route piece, [m].
    pieces : int
        Route pieces measured.
    """

    min_m: tuple[float, float, float]
    max_m: tuple[float, float, float]
    median_piece_m: float
    pieces: int

    @property
    def size_m(self) -> tuple[float, float, float]:
        """Width, depth and height of the box, [m]."""
        return tuple(b - a for a, b in zip(self.min_m, self.max_m, strict=True))  # type: ignore[return-value]

    @property
    def largest_plan_m(self) -> float:
        """The larger of the plan width and depth, [m]."""
        return max(self.size_m[0], self.size_m[1])


def extents(pieces: Iterable[Sequence[Sequence[float]]]) -> Extents | None:
    """Bounding box and median piece length of route pieces (points in metres).

    Parameters
    ----------
    pieces : iterable of point sequences
        Each piece's vertices ``(x, y, z)``, [m].

    Returns
    -------
    Extents or None
        None when there are no points.

    Examples
    --------
    >>> e = extents([[(0, 0, 0), (3, 4, 0)], [(0, 0, 0), (0, 0, 1)], [(0, 0, 0), (10, 0, 0)]])
    >>> e.size_m, e.median_piece_m
    ((10.0, 4.0, 1.0), 5.0)
    """
    lo = [math.inf] * 3
    hi = [-math.inf] * 3
    lengths = []
    for pts in pieces:
        length = 0.0
        prev = None
        for p in pts:
            q = (float(p[0]), float(p[1]), float(p[2]) if len(p) > 2 else 0.0)
            if not all(math.isfinite(v) for v in q):
                continue
            for k in range(3):
                lo[k] = min(lo[k], q[k])
                hi[k] = max(hi[k], q[k])
            if prev is not None:
                length += math.dist(prev, q)
            prev = q
        if prev is not None:
            lengths.append(length)
    if not lengths or lo[0] == math.inf:
        return None
    return Extents(tuple(lo), tuple(hi), float(statistics.median(lengths)), len(lengths))  # type: ignore[arg-type]


@dataclass(frozen=True)
class ScaleCheck:
    """Is the drawing's scale plausible?

    Attributes
    ----------
    plausible : bool
        Extents and median piece both inside their bands.
    reason : str
        What is out of band, empty when plausible.
    likely_units : tuple of str
        Units of :data:`COMMON_UNITS` under which the geometry would be plausible,
        the most likely first; empty when plausible or when none fits.
    """

    plausible: bool
    reason: str
    likely_units: tuple[str, ...] = ()


def _inside(value: float, band: tuple[float, float]) -> bool:
    return band[0] <= value <= band[1]


def _band_centre(band: tuple[float, float]) -> float:
    return math.sqrt(band[0] * band[1])  # geometric middle: the bands span decades


def check_scale(ext: Extents, units: str) -> ScaleCheck:
    """Check the route extents and median piece length against plausible bands.

    Parameters
    ----------
    ext : Extents
        Measured with the drawing read in ``units``, [m].
    units : str
        The units the drawing was read in (a name of :data:`UNIT_TO_M`).

    Returns
    -------
    ScaleCheck
        With the units under which the same numbers would be plausible: those of
        the same system as ``units`` (metric or imperial) first, since an export
        fault seldom changes the system (common practice), then nearest (in
        decades) to the middle of both bands.

    Notes
    -----
    The bands :data:`EXTENT_BAND_M` and :data:`MEDIAN_PIECE_BAND_M` are common
    practice for buildings and plants served by LV cables.

    Examples
    --------
    A building read as 0.38 x 0.60 m with pieces of 4 mm, its header saying mm,
    was drawn in metres:

    >>> e = Extents((0, 0, 0), (0.38, 0.60, 0), 0.004, 40)
    >>> c = check_scale(e, "mm")
    >>> c.plausible, c.likely_units[0]
    (False, 'm')
    """
    extent_m = ext.largest_plan_m
    median_m = ext.median_piece_m
    problems = []
    if not _inside(extent_m, EXTENT_BAND_M):
        problems.append(
            f"the routes span {extent_m:.3g} m, outside the {EXTENT_BAND_M[0]:g}-{EXTENT_BAND_M[1]:g} m "
            "of a building or plant"
        )
    if not _inside(median_m, MEDIAN_PIECE_BAND_M):
        problems.append(
            f"the median route piece is {median_m:.3g} m, outside "
            f"{MEDIAN_PIECE_BAND_M[0]:g}-{MEDIAN_PIECE_BAND_M[1]:g} m"
        )
    if not problems:
        return ScaleCheck(True, "")
    likely = tuple(n for n in rank_units(extent_m / UNIT_TO_M[units], median_m / UNIT_TO_M[units], units)
                   if n != units)
    return ScaleCheck(False, "; ".join(problems), likely)


def rank_units(extent_units: float, median_units: float, system_of: str | None = None) -> tuple[str, ...]:
    """Units of :data:`COMMON_UNITS` under which a drawing's numbers are plausible, likeliest first.

    Parameters
    ----------
    extent_units : float
        Largest plan extent of the routes, [drawing units].
    median_units : float
        Median route piece length, [drawing units].
    system_of : str, optional
        Units whose system (metric or imperial) is preferred; none preferred when None.

    Returns
    -------
    tuple of str
        Plausible units, the same system first, then nearest (in decades) to
        the middle of both bands, units seldom used for plans
        (:data:`RARE_UNIT_PENALTY`) later (common practice).

    Examples
    --------
    >>> rank_units(60000.0, 3000.0)[0]
    'mm'
    """
    scored = []
    for name in COMMON_UNITS:
        k = UNIT_TO_M[name]
        e, m = extent_units * k, median_units * k
        if _inside(e, EXTENT_BAND_M) and _inside(m, MEDIAN_PIECE_BAND_M):
            off = abs(math.log10(e / _band_centre(EXTENT_BAND_M))) + abs(
                math.log10(m / _band_centre(MEDIAN_PIECE_BAND_M)))
            other_system = system_of is not None and (name in _IMPERIAL) != (system_of in _IMPERIAL)
            scored.append((other_system, off + RARE_UNIT_PENALTY.get(name, 0.0), name))
    return tuple(name for _, _, name in sorted(scored))


@dataclass(frozen=True)
class DrawingSummary:
    """Which units a drawing was read in, and how large it came out.

    Attributes
    ----------
    units : str
        Units used (a name of :data:`UNIT_TO_M`).
    units_source : str
        ``"header"`` ($INSUNITS) or ``"config"`` (the config or ``--units``).
    header_code : int
        The drawing's ``$INSUNITS`` code as written (0 unitless).
    extents : Extents or None
        Route extents and median piece length, [m].
    scale : ScaleCheck or None
        The plausibility check of :func:`check_scale`.
    """

    units: str
    units_source: str
    header_code: int
    extents: Extents | None
    scale: ScaleCheck | None

    def as_dict(self) -> dict[str, object]:
        """The ``"drawing"`` entry of ``schedule.json``, rounded to millimetres."""

        def mm(values: Sequence[float]) -> list[float]:
            return [round(float(v), 3) for v in values]

        out: dict[str, object] = {
            "units": self.units,
            "units_source": self.units_source,
            "insunits": self.header_code,
        }
        if self.extents is not None:
            out["extents_m"] = {"min": mm(self.extents.min_m), "max": mm(self.extents.max_m),
                                "size": mm(self.extents.size_m)}
            out["median_piece_m"] = round(self.extents.median_piece_m, 3)
        if self.scale is not None:
            out["scale_plausible"] = self.scale.plausible
            if not self.scale.plausible:
                out["scale_note"] = self.scale.reason
                out["likely_units"] = list(self.scale.likely_units)
        return out
