"""The schedule rows every writer reads: one typed row per circuit, built once from the outcomes.

:func:`rows` turns each :class:`.model.CircuitOutcome` into a frozen
:class:`ScheduleRow`: the circuit, its route, grouping, device, cable and voltage
drop, with the numbers rounded as the machine-readable schedule writes them
(``schedule.json``, ``schedule.csv`` and ``schedule.xlsx`` agree value by value)
and the texts the human outputs print (cable, protective conductor, device).
The JSON document (:mod:`.jsonout`), the schedule files (:mod:`.schedule_files`),
the circuit lists of ``report.html`` and ``report.pdf`` and the schedule table on
the drawing (:mod:`.drawing.schedule_table`) all read these rows; the cable text
has one implementation (:mod:`cablewright.sizing.cable_text`).

Lengths stay in metres in the row, unrounded (JSON keeps metres: its keys end
in ``_m``); every other writer shows them in the row's :class:`LengthUnit`,
metres for the IEC rule set and feet for NEC unless ``[annotate] length_unit``
says otherwise (:func:`length_unit`).

References
----------
.. [1] International yard and pound agreement (1959): 1 ft = 0.3048 m exactly.
.. [2] contract.md, "JSON output" and "Extensions" (the keys and their rounding
   are the JSON document's).
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass, replace
from typing import TYPE_CHECKING, Any

from cablewright.sizing.cable_text import cable_text, reduced_pe_mm2
from cablewright.sizing.model import CableSelection, SizingResult, VoltageDrop

from .model import CircuitOutcome

if TYPE_CHECKING:
    from cablewright.extract.model import CircuitRoute

__all__ = [
    "LengthUnit",
    "METRE",
    "FOOT",
    "LENGTH_UNITS",
    "RULE_SET_UNITS",
    "length_unit",
    "rule_set_cautions",
    "unit_of_outcomes",
    "GroupCells",
    "CableCells",
    "ScheduleRow",
    "EXTRA_KEYS",
    "circuit_row",
    "rows",
    "rounded",
    "whole",
]


@dataclass(frozen=True)
class LengthUnit:
    """The unit lengths are shown in, and how many metres one of it is.

    Attributes
    ----------
    symbol : str
        ``"m"`` or ``"ft"``, as printed after a number and in column headers.
    metres_per_unit : float
        Metres in one unit [m].
    """

    symbol: str
    metres_per_unit: float

    def of(self, length_m: float) -> float:
        """``length_m`` in this unit.

        Examples
        --------
        >>> FOOT.of(0.3048), METRE.of(12.5)
        (1.0, 12.5)
        """
        return float(length_m) / self.metres_per_unit

    def rounded(self, length_m: float | None, digits: int = 2) -> float | None:
        """``length_m`` in this unit, rounded to ``digits`` (``None`` stays ``None``).

        Examples
        --------
        >>> FOOT.rounded(100.0), METRE.rounded(12.345, 1), FOOT.rounded(None)
        (328.08, 12.3, None)
        """
        return None if length_m is None else round(self.of(length_m), digits)

    def text(self, length_m: float | None, digits: int = 1, missing: str = "-") -> str:
        """``"41.7 ft"``: the length with ``digits`` decimals and the symbol.

        Examples
        --------
        >>> FOOT.text(12.71), METRE.text(12.71, 2), METRE.text(None)
        ('41.7 ft', '12.71 m', '-')
        """
        if length_m is None or not math.isfinite(float(length_m)):
            return missing
        return f"{self.of(length_m):.{digits}f} {self.symbol}"


#: The metre (SI base unit).
METRE = LengthUnit("m", 1.0)
#: The international foot: 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959).
FOOT = LengthUnit("ft", 0.3048)
#: ``[annotate] length_unit`` -> unit.
LENGTH_UNITS = {"m": METRE, "ft": FOOT}
#: The unit each rule set writes lengths in: IEC 60364 in metres (SI, IEC 80000-3),
#: NFPA 70 in feet (as its tables and the US trade write lengths).
RULE_SET_UNITS = {"iec": METRE, "nec": FOOT}


def length_unit(standard: str = "iec", override: str = "") -> LengthUnit:
    """The unit of the outputs: ``override`` ("m", "ft") when given, else the rule set's.

    Parameters
    ----------
    standard : str
        ``[sizing] standard``: ``"iec"`` or ``"nec"``.
    override : str
        ``[annotate] length_unit``; "" follows the rule set.

    Examples
    --------
    >>> length_unit("nec").symbol, length_unit("nec", "m").symbol, length_unit().symbol
    ('ft', 'm', 'm')
    """
    if override:
        return LENGTH_UNITS[override]
    return RULE_SET_UNITS.get(standard, METRE)


def rule_set_cautions(cautions: str, standard: str = "iec") -> str:
    """The cautions note with the rule set's own caution added (NEC: the authority
    having jurisdiction and the local amendments govern, NFPA 70:2023 90.4).

    Examples
    --------
    >>> rule_set_cautions("Design aid only.") == "Design aid only."
    True
    >>> "authority having jurisdiction" in rule_set_cautions("Design aid only.", "nec")
    True
    """
    if standard != "nec":
        return cautions
    from cablewright.sizing.nec.select import AHJ_CAUTION

    return f"{cautions.rstrip()} {AHJ_CAUTION}."


def unit_of_outcomes(outcomes: Iterable[CircuitOutcome], override: str = "") -> LengthUnit:
    """:func:`length_unit` of the rule set the outcomes were sized with (IEC when none was)."""
    standard = next((o.sizing.standard for o in outcomes if o.sizing is not None), "iec")
    return length_unit(standard, override)


def rounded(value: float | None, digits: int = 2) -> float | None:
    """``value`` rounded as the schedule writes it; ``None`` stays ``None``."""
    return None if value is None else round(float(value), digits)


def whole(value: float) -> float | int:
    """A whole number as an ``int`` (``70`` not ``70.0``), any other unchanged."""
    return int(value) if float(value).is_integer() else value


@dataclass(frozen=True)
class GroupCells:
    """The grouping along the route (contract.md, "Lengths and grouping").

    ``governing_segment`` is the segment whose rating governs (for a circuit only
    measured, the most crowded one); ``factor`` the grouping factor, rounded to 3.
    ``segments`` holds (segment, circuits, cables) for every segment of the route.
    """

    circuits_in_group: int
    cables_in_group: int
    governing_segment: str | None
    factor: float | None
    segments: tuple[tuple[str, int, int], ...]


@dataclass(frozen=True)
class CableCells:
    """The chosen cable: its selection, the numbers as written, its text and a reduced PE."""

    selection: CableSelection
    #: Area [mm²], a whole number as an int.
    csa_mm2: float | int
    #: Corrected capacity of all parallel cables [A], rounded to 0.1 A.
    capacity_a: float
    #: ``"2x 4C 240 mm² Cu/XLPE"`` (:func:`cablewright.sizing.cable_text.cable_text`).
    text: str
    #: The protective conductor [mm²] when smaller than the phases, else ``None``.
    reduced_pe_mm2: float | None

    @property
    def parallel(self) -> int:
        return self.selection.parallel


#: Results of the further checks (short circuit, earth fault, motor start): keys of
#: the JSON document beside the contract's, read from the sizing result.
EXTRA_KEYS = (
    "protective_conductor_mm2",
    "max_length_m",
    "earth_fault_loop_ohm",
    "fault_current_ka_source",
    "fault_current_ka_load_end",
    "fault_current_ka_load_end_min",
    "fault_current_ka_load_end_earth_min",
    "motor_start_dip_pct",
    "motor_start_peak_a",
    "ze_assumed",
)


def _extra(sizing: SizingResult, key: str) -> Any:
    value = getattr(sizing, key, None)
    return round(value, 3) if isinstance(value, float) else value


@dataclass(frozen=True)
class ScheduleRow:
    """One circuit as every writer shows it.

    Numbers are rounded as ``schedule.json`` writes them (Ib and voltage drop to
    0.01, factors to 0.001, capacities to 0.1 A, a whole device rating or area as
    an int); lengths are metres, unrounded, for each writer to show in
    :attr:`unit`.  ``sizing`` is the typed result the reports' step-by-step
    sections and the JSON's factors and checks are read from.
    """

    circuit_id: str
    from_tag: str
    to_tag: str
    status: str
    messages: tuple[str, ...]
    unit: LengthUnit = METRE
    route: CircuitRoute | None = None
    grouping: GroupCells | None = None
    sizing: SizingResult | None = None
    load_current_a: float | None = None
    device_rating_a: float | int | None = None
    device_kind: str = ""
    method: str = ""
    correction_factor: float | None = None
    required_capacity_a: float | None = None
    cable: CableCells | None = None
    #: The voltage drop, its values rounded as written ([V], [%] to 0.01, mV/A/m to 0.001).
    drop: VoltageDrop | None = None
    protective_conductor_mm2: float | None = None
    #: Longest run the disconnection check allows [m, unrounded].
    max_length_m: float | None = None

    @property
    def routed_length_m(self) -> float | None:
        return None if self.route is None else self.route.routed_length_m

    @property
    def design_length_m(self) -> float | None:
        return None if self.route is None else self.route.design_length_m

    @property
    def order_length_m(self) -> float | None:
        """Cable to order [m]: design length times the cables in parallel (issue 12)."""
        if self.route is None:
            return None
        return self.route.design_length_m * (self.cable.parallel if self.cable is not None else 1)

    @property
    def device_text(self) -> str:
        """``"MCB 16 A"``: kind and rating of the device, "" when none was chosen."""
        if self.device_rating_a is None:
            return ""
        return f"{self.device_kind.strip()} {self.device_rating_a:g} A".strip()

    def extras(self) -> list[tuple[str, Any]]:
        """(key, value) of :data:`EXTRA_KEYS`, floats rounded to 3 decimals."""
        if self.sizing is None:
            return []
        return [(key, _extra(self.sizing, key)) for key in EXTRA_KEYS]


def _group_cells(outcome: CircuitOutcome) -> GroupCells | None:
    group = outcome.group
    if group is None:
        return None
    sizing = outcome.sizing
    cables = group.cables_in_group
    governing = factor = None
    if sizing is not None and sizing.cable is not None:
        governing = sizing.governing_segment or None
        cables = sizing.cables_in_group or group.cables_in_group
        factor = rounded(sizing.grouping_factor, 3)
    elif group.segment_counts:
        # measuring only: the most crowded segment stands for the route
        governing = max(group.segment_counts, key=lambda item: (item[2], item[1]))[0]
    return GroupCells(group.circuits_in_group, cables, governing, factor,
                      tuple((seg, n, k) for seg, n, k in group.segment_counts))


def _cable_cells(sizing: SizingResult) -> CableCells | None:
    c = sizing.cable
    if c is None:
        return None
    text = cable_text(c.cores, c.csa_mm2, c.conductor, c.insulation, c.parallel, c.size_label)
    return CableCells(c, whole(c.csa_mm2), round(c.capacity_a, 1), text,
                      reduced_pe_mm2(sizing.protective_conductor_mm2, c.csa_mm2))


def _drop_cells(sizing: SizingResult) -> VoltageDrop | None:
    vd = sizing.voltage_drop
    if vd is None:
        return None
    return replace(vd, volts=round(float(vd.volts), 2), percent=round(float(vd.percent), 2),
                   limit_percent=round(float(vd.limit_percent), 2),
                   mv_per_a_m=round(float(vd.mv_per_a_m), 3),
                   annex_g_percent=round(float(vd.annex_g_percent), 2),
                   cumulative_percent=rounded(vd.cumulative_percent))


def circuit_row(outcome: CircuitOutcome, unit: LengthUnit = METRE) -> ScheduleRow:
    """The :class:`ScheduleRow` of one circuit, lengths shown in ``unit``."""
    head: dict[str, Any] = dict(circuit_id=outcome.circuit_id, from_tag=outcome.from_tag, to_tag=outcome.to_tag,
                status=outcome.status, messages=tuple(outcome.messages), unit=unit,
                route=outcome.route, grouping=_group_cells(outcome))
    s = outcome.sizing
    if s is None:
        return ScheduleRow(**head)
    rating = s.device_rating_a
    return ScheduleRow(
        **head,
        sizing=s,
        load_current_a=rounded(s.load_current_a),
        device_rating_a=None if rating is None else whole(rating),
        device_kind=s.device_kind or "",
        method=s.method or "",
        correction_factor=rounded(s.correction_factor, 3),
        required_capacity_a=rounded(s.required_capacity_a, 1),
        cable=_cable_cells(s),
        drop=_drop_cells(s),
        protective_conductor_mm2=_extra(s, "protective_conductor_mm2"),
        max_length_m=getattr(s, "max_length_m", None),
    )


def rows(outcomes: Iterable[CircuitOutcome], unit: LengthUnit | None = None,
         override: str = "") -> list[ScheduleRow]:
    """One :class:`ScheduleRow` per circuit, in schedule order.

    Parameters
    ----------
    outcomes : iterable of CircuitOutcome
    unit : LengthUnit, optional
        Unit of the lengths; ``None`` follows the rule set the circuits were
        sized with, or ``override`` (see :func:`unit_of_outcomes`).
    override : str
        ``[annotate] length_unit`` ("", "m" or "ft"), when ``unit`` is not given.
    """
    outcomes = list(outcomes)
    if unit is None:
        unit = unit_of_outcomes(outcomes, override)
    return [circuit_row(o, unit) for o in outcomes]
