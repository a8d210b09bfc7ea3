"""Domain types of the sizing stage: what goes in, what comes out.

All values carry their unit in the name.  Nothing here does I/O.
"""

from __future__ import annotations

from dataclasses import dataclass
from enum import Enum
from typing import TYPE_CHECKING, overload

from .cable_text import cable_text, size_text

__all__ = [
    "CheckResult",
    "Load",
    "Stretch",
    "CircuitSpec",
    "Factor",
    "CableSelection",
    "VoltageDrop",
    "Check",
    "SizingResult",
    "STATUS_ORDER",
]

#: Severity order of a circuit's status, best first (contract.md, JSON output).
STATUS_ORDER = ("ok", "warning", "fail", "error")


@dataclass(frozen=True)
class Load:
    """A load as written in the schedule: a number and its unit.

    Attributes
    ----------
    value : float
        The number, > 0.
    unit : str
        One of ``"kW"`` (input power), ``"hp"`` (shaft power), ``"kVA"``, ``"A"``.
    """

    value: float
    unit: str

    def __str__(self) -> str:
        return f"{self.value:g} {self.unit}"


@dataclass(frozen=True)
class Stretch:
    """One stretch of the route with uniform installation conditions.

    A circuit's rating is the lowest over its stretches (contract.md,
    "Lengths and grouping").  For ``calc`` there is one stretch.

    Attributes
    ----------
    segment_id : str
        Id of the route segment ("" for ``calc``).
    method : str
        IEC 60364-5-52 reference installation method letter (A1 ... G).
    other_cables : int
        Cables of *other* circuits sharing this stretch; this circuit's own
        parallel cables are added by the sizing itself.
    ambient_c : float or None
        Air temperature for in-air methods, ground temperature for D1/D2
        [°C]; ``None`` takes the config default.
    soil_resistivity_k_m_w : float or None
        Soil thermal resistivity for D1/D2 [K·m/W]; ``None`` takes the default.
    depth_m : float or None
        Depth of laying for D1/D2 [m]; ``None`` takes the tabulated 0.7 m.
    length_m : float
        Length of the stretch [m] (informative).
    trays : int
        Number of tiers: trays or ladders stacked in the group (methods E/F/G),
        >= 1; from the route layer (``[drawing.route_tiers]``), default 1.
    containment : str
        Containment of the route layer (``tray``, ``ladder``, ...): picks the
        perforated-tray or ladder rows of Tables B.52.20/B.52.21; "" reads
        the perforated-tray rows.
    """

    segment_id: str = ""
    method: str = "E"
    other_cables: int = 0
    ambient_c: float | None = None
    soil_resistivity_k_m_w: float | None = None
    depth_m: float | None = None
    length_m: float = 0.0
    trays: int = 1
    containment: str = ""

    @property
    def tiers(self) -> int:
        """Tiers of trays or ladders on the stretch (the same as ``trays``)."""
        return self.trays


@dataclass(frozen=True)
class CircuitSpec:
    """Everything the sizing needs to know about one circuit.

    Attributes
    ----------
    circuit_id : str
    load : Load
    voltage_v : float
        Line-to-line for 3 phases, line-to-neutral for 1 phase [V].
    phases : int
        3 or 1.
    power_factor : float
        Running power factor, in (0, 1].
    efficiency : float
        Motor efficiency in (0, 1]; kW and hp are divided by it.
    load_type : str
        ``motor``, ``lighting``, ``general`` or ``feeder``.
    conductor, insulation : str
        ``Cu``/``Al`` and ``XLPE``/``PVC``.
    cores : int or None
        Cores of one multi-core cable; ``None``: 4 for 3 phases, 3 for 1.
    vd_limit_pct : float or None
        Voltage-drop limit [%]; ``None`` takes the config value for the load type.
    fault_ka : float or None
        Prospective short-circuit current at the source [kA].
    design_length_m : float
        Length for voltage drop and impedance [m].
    stretches : tuple of Stretch
        Installation conditions along the route; at least one.
    extra : tuple of (str, str)
        Further schedule fields (starter kind, device kind, ...) for later checks.
    """

    circuit_id: str
    load: Load
    voltage_v: float
    phases: int = 3
    power_factor: float = 0.85
    efficiency: float = 1.0
    load_type: str = "general"
    conductor: str = "Cu"
    insulation: str = "XLPE"
    cores: int | None = None
    vd_limit_pct: float | None = None
    fault_ka: float | None = None
    design_length_m: float = 0.0
    stretches: tuple[Stretch, ...] = (Stretch(),)
    extra: tuple[tuple[str, str], ...] = ()

    @overload
    def extra_value(self, name: str, default: str) -> str: ...
    @overload
    def extra_value(self, name: str, default: None = None) -> str | None: ...

    def extra_value(self, name: str, default: str | None = None) -> str | None:
        """Value of a further schedule field, ``default`` when blank or absent."""
        for key, value in self.extra:
            if key == name and value.strip():
                return value.strip()
        return default


@dataclass(frozen=True)
class Factor:
    """A correction factor and where it was read.

    Attributes
    ----------
    name : str
        ``ambient``, ``ground_temperature``, ``soil``, ``grouping``, ``depth``.
    value : float
        The factor (dimensionless).
    source : str
        Standard, edition and table, e.g. ``"IEC 60364-5-52:2009 Table B.52.14"``.
    detail : str
        The row and column read, e.g. ``"XLPE, 40 °C"``.
    """

    name: str
    value: float
    source: str
    detail: str = ""


@dataclass(frozen=True)
class CableSelection:
    """The chosen cable.  ``capacity_a`` is for all parallel cables together."""

    conductor: str
    insulation: str
    cores: int
    csa_mm2: float
    parallel: int
    capacity_a: float
    governed_by: str
    #: The size as the rule set writes it ("6 AWG", "250 kcmil"); "" for the IEC
    #: rule set, whose label is the area (:attr:`label`, contract.md Extensions).
    size_label: str = ""

    @property
    def label(self) -> str:
        """``size_label``, or ``"95 mm²"`` from the area when the rule set gave none."""
        return size_text(self.csa_mm2, self.size_label)

    def describe(self) -> str:
        """The cable in one line, e.g. ``"2x 4C 240 mm² Cu/XLPE"`` (:func:`.cable_text.cable_text`)."""
        return cable_text(self.cores, self.csa_mm2, self.conductor, self.insulation, self.parallel,
                          self.size_label)


@dataclass(frozen=True)
class VoltageDrop:
    """Voltage drop at the design current over the design length."""

    volts: float
    percent: float
    limit_percent: float
    mv_per_a_m: float
    annex_g_percent: float
    #: Drop from the origin of the installation: this circuit's own plus every
    #: feeder's upstream (IEC 60364-5-52:2009 Annex G); ``None`` until known.
    cumulative_percent: float | None = None
    #: Limit of the drop from the origin [%] when the rule set gives one of its own
    #: (NEC: 5 %, 215.2(A)(2) Informational Note No. 2), and its source; ``None``:
    #: ``limit_percent`` applies to the total (IEC 60364-5-52:2009 Annex G).
    total_limit_percent: float | None = None
    total_limit_source: str = "IEC 60364-5-52:2009 Annex G"
    #: Where ``limit_percent`` comes from (schedule, config or the standard's table),
    #: named by the origin check (:func:`.chain.origin_drop_check`); ``""`` unknown.
    limit_source: str = ""


class CheckResult(str, Enum):
    """Outcome of one check: pass, fail, not checked (with why) or not applicable.

    A check that was not made is never a pass (contract.md, Extensions:
    ``checks[].result``).
    """

    PASS = "pass"
    FAIL = "fail"
    NOT_CHECKED = "not_checked"
    NOT_APPLICABLE = "not_applicable"


@dataclass(frozen=True)
class Check:
    """One check on the chosen cable (capacity, overload, voltage drop, ...).

    ``value`` and ``limit`` are in ``unit``; ``result`` tells the outcome (a
    bool given there is read as pass / fail); ``message`` says why for a
    failure or a check not made.

    Examples
    --------
    >>> Check("capacity", True, 63.0, 80.0, "A", "IEC 60364-4-43:2008 433.1").result.value
    'pass'
    >>> Check("short_circuit", CheckResult.NOT_CHECKED, 0.0, 0.0, "mm²", "", "no data").passed
    False
    """

    name: str
    result: CheckResult
    value: float
    limit: float
    unit: str
    source: str
    message: str = ""

    if TYPE_CHECKING:  # the constructor also takes a bool or the result's text (read below)
        def __init__(self, name: str, result: CheckResult | bool | str, value: float,
                     limit: float, unit: str, source: str, message: str = "") -> None: ...

    def __post_init__(self) -> None:
        result = self.result
        if result.__class__ is CheckResult:
            return
        if isinstance(result, str):
            result = CheckResult(result)
        else:  # a bool (numpy's too) reads as pass / fail
            result = CheckResult.PASS if result else CheckResult.FAIL
        object.__setattr__(self, "result", result)

    @property
    def passed(self) -> bool:
        """True only for a check made and passed."""
        return self.result is CheckResult.PASS

    @property
    def failed(self) -> bool:
        """True only for a check made and failed."""
        return self.result is CheckResult.FAIL


@dataclass(frozen=True)
class SizingResult:
    """The outcome of sizing one circuit.

    ``status`` is one of :data:`STATUS_ORDER`; ``cable`` is ``None`` only for
    ``"error"``.

    The further numbers of :meth:`.checks.PreparedChecks.extras` (``None`` where not
    computed): ``protective_conductor_mm2`` (IEC 60364-5-54 543.1),
    ``max_length_m`` (longest length that still disconnects on an earth
    fault, IEC 60364-4-41 411.4.4), ``earth_fault_loop_ohm`` (Zs at the load
    end), ``fault_current_ka_source``, ``fault_current_ka_load_end`` (maximum,
    IEC 60909-0 cmax, 20 °C), ``fault_current_ka_load_end_min`` (cmin,
    end-of-fault temperature; three-phase for 3-phase circuits, line-to-neutral
    for 1-phase circuits), ``fault_current_ka_load_end_earth_min`` (line-to-earth
    in a TN system: U0 / Zs of the disconnection check), ``motor_start_dip_pct``,
    ``motor_start_peak_a`` (peak of the starting current that the
    instantaneous release sees); ``ze_assumed`` is True when neither ``ze_ohm``
    nor a fault level was given and the config's assumed Ze was used.

    For the report's trace (added fields, empty where not sized): ``spec`` the
    circuit as given (load, power factor, efficiency, voltage, phases);
    ``device_margin`` the factor In >= margin x Ib was chosen with and
    ``device_source`` where I2 comes from; ``tabulated_capacity_a`` It of one
    cable on the governing stretch, read in ``capacity_table`` (standard,
    edition, table, column) at ``capacity_detail`` (row and column in words).
    """

    circuit_id: str
    status: str
    messages: tuple[str, ...] = ()
    load_current_a: float | None = None
    device_rating_a: float | None = None
    device_kind: str = ""
    method: str = ""
    governing_segment: str = ""
    cables_in_group: int = 0
    grouping_factor: float = 1.0
    correction_factor: float | None = None
    factors: tuple[Factor, ...] = ()
    required_capacity_a: float | None = None
    cable: CableSelection | None = None
    voltage_drop: VoltageDrop | None = None
    checks: tuple[Check, ...] = ()
    protective_conductor_mm2: float | None = None
    max_length_m: float | None = None
    earth_fault_loop_ohm: float | None = None
    fault_current_ka_source: float | None = None
    fault_current_ka_load_end: float | None = None
    fault_current_ka_load_end_min: float | None = None
    fault_current_ka_load_end_earth_min: float | None = None
    motor_start_dip_pct: float | None = None
    motor_start_peak_a: float | None = None
    ze_assumed: bool = False
    #: The rule set that sized it: ``"iec"`` or ``"nec"`` (``[sizing] standard``).
    standard: str = "iec"
    spec: CircuitSpec | None = None
    device_margin: float | None = None
    device_source: str = ""
    tabulated_capacity_a: float | None = None
    capacity_table: str = ""
    capacity_detail: str = ""
