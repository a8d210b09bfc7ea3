"""Conductor selection to NFPA 70 (NEC): the NEC rule set's ``size_circuit_nec``.

The procedure, each step with its clause (NFPA 70:2023):

1. Load current: motors given in hp from Table 430.250 (3 phases) or 430.248
   (1 phase), 430.6(A)(1); other loads from their power (:mod:`..load`).
2. Conductor ampacity needed before correction: 125 % of a continuous load
   (210.19(A)(1)(a) branch circuits, 215.2(A)(1)(a) feeders) or 125 % of the
   motor full-load current (430.22).  Every non-motor load is taken as
   continuous unless the schedule's ``continuous`` says ``no``.
3. Overcurrent device: the standard rating of Table 240.6(A) at or above that
   current (210.20(A), 215.3); for motors 250 % (inverse time breaker) or 175 %
   (dual-element fuse) of the full-load current, next size up
   (430.52(C)(1) and Table 430.52, Exception No. 1).
4. On every stretch, the ampacity of Table 310.16 (raceway, cable, earth) in the
   insulation's 90 °C column times the ambient correction of 310.15(B)(1) and the
   adjustment of 310.15(C)(1) for the current-carrying conductors of the
   stretch's group (cables in the group x current-carrying conductors per cable;
   each parallel set of the circuit counted in its own raceway, 310.10(G)(4),
   the other circuits' cables of the stretch taken to share it: our reading).
   Cable tray and ladder (392.80(A)): multiconductor cables take Table 310.16
   with the adjustment for the cable's own conductors only (392.80(A)(1)(a));
   single conductors 1/0 AWG and larger take 65 % (1/0 to 500 kcmil) or 75 %
   (600 kcmil and larger) of Table 310.17 (392.80(A)(2)(a)).
5. The conductor passes when the termination column (60 °C for circuits of
   100 A or less, 75 °C above, 110.14(C)(1); 75 °C for motors, 110.14(C)(1)(a)(4),
   design B, C or D assumed) gives at least the current of step 2, the corrected
   ampacity at least the load (210.19(A)(1)(b)) and the device protects it
   (240.4, with the next-size-up rule 240.4(B) up to 800 A and the small-conductor
   limits of 240.4(D); motor circuits per 240.4(G) and 430.52 instead).
6. Raised until the voltage drop (Chapter 9 Table 9, Ze = R cos θ + X sin θ)
   is within the informational 3 % (210.19(A) Informational Note No. 4,
   215.2(A)(2) Informational Note No. 2); sets in parallel (310.10(G), 1/0 AWG
   and larger) only where no single conductor will do.
7. Equipment grounding conductor from Table 250.122, increased in proportion to
   the circular-mil area when the phase conductors are increased (250.122(B)),
   full size in every parallel raceway (250.122(F)); raceway fill of Chapter 9
   Table 1 in EMT where the route is conduit (areas of Chapter 9 Tables 4 and 5).
8. Faults (:mod:`.faults`): the conductors raised until they withstand the fault current
   at the origin for the device's clearing time (ICEA P-32-382); the EGC raised to
   withstand it too (250.4(A)(5)); the ground fault at the load end, through the phase
   conductor and the EGC, cleared on the breaker's instantaneous pickup (common
   practice), the EGC and then (config ``disconnection_upsize``) the phase conductors
   raised where it is not.

Clause numbers are those of the 2023 edition as recalled, from memory (no public copy of
the clause text was read); the informational-note numbers in particular have moved
between editions.  The tables themselves were checked (see :mod:`.tables`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from cablewright.core.errors import (
    CableRouteError,
    CircuitInputError,
    OutOfRangeError,
    UnknownKeyError,
)

from ..config import SizingConfig
from ..load import design_current_a
from ..model import CableSelection, Check, CircuitSpec, Factor, SizingResult, Stretch, VoltageDrop
from ..select import third_harmonic_pct
from .faults import NecFaults
from .motors import full_load_current_a
from .tables import (
    ADJUSTMENT_310_15_C_1,
    AMBIENT_310_15_B_1,
    AREA_CH9_T5,
    EGC_250_122,
    EMT_AREA_CH9_T4,
    FT_M,
    IMPEDANCE_CH9_T9,
    SIZES,
    adjustment_factor,
    ambient_factor,
    ampacity_a,
    area_cmil,
    area_mm2,
    egc_size,
    fill_limit_pct,
    impedance_ohm_per_m,
    next_standard_rating_a,
    size_label,
    small_conductor_limit_a,
)

__all__ = ["AHJ_CAUTION", "NecStretchRating", "size_circuit_nec", "stretch_ampacity_a",
           "conductor_type", "voltage_drop_nec"]

#: The caution every NEC result carries.
AHJ_CAUTION = ("NEC rule set (NFPA 70:2023): a design aid; the authority having jurisdiction "
               "and the local amendments govern")
#: Insulation of the schedule -> the building-wire type sized here (both 90 °C, NFPA 70:2023
#: Table 310.4(A)); XLPE is read as XHHW-2, PVC as THHN/THWN-2.
_TYPES = {"XLPE": ("XHHW-2", "XHHW"), "PVC": ("THHN/THWN-2", "THHN")}
INSULATION_TEMP_C = 90
#: Informational voltage-drop guidance [%]: 3 % for a branch circuit or a feeder,
#: 5 % for both together (210.19(A) Informational Note No. 4, 215.2(A)(2) Note No. 2;
#: note numbers from memory).
VD_BRANCH_PCT = 3.0
VD_TOTAL_PCT = 5.0
#: Table 430.52: inverse time breaker 250 %, dual-element (time-delay) fuse 175 % of FLC.
MOTOR_DEVICE_PCT = {"breaker": 250.0, "fuse": 175.0}
#: 240.4(B)(3): the next-size-up rule holds up to 800 A.
NEXT_SIZE_UP_MAX_A = 800.0
#: 310.10(G)(1): conductors in parallel 1/0 AWG and larger.
PARALLEL_MIN = "1/0"
#: 392.80(A)(2)(a): single conductors in uncovered tray, share of Table 310.17.
TRAY_SINGLE_SHARE = (("500", 0.65), ("2000", 0.75))
GROUND = frozenset({"duct", "buried"})


def conductor_type(insulation: str) -> str:
    """The NEC building-wire type standing for the schedule's insulation."""
    try:
        return _TYPES[insulation][0]
    except KeyError:
        raise UnknownKeyError(f"insulation {insulation!r} is unknown: use XLPE or PVC") from None


#: A stretch without a containment (``calc``) read from its IEC 60364-5-52 method letter.
_METHOD_CONTAINMENT = {"A1": "conduit", "A2": "conduit", "B1": "conduit", "B2": "conduit",
                       "C": "clipped", "D1": "duct", "D2": "buried", "E": "tray", "F": "tray",
                       "G": "tray"}


def _containment(stretch: Stretch) -> str:
    return stretch.containment or _METHOD_CONTAINMENT.get(stretch.method.upper()[:2], "")


def _is_tray(stretch: Stretch) -> bool:
    return _containment(stretch) in ("tray", "ladder")


@dataclass(frozen=True)
class NecStretchRating:
    """Ampacity of one set of conductors on one stretch, and how it was read."""

    ampacity_a: float
    tabulated_a: float
    factors: tuple[Factor, ...]
    table: str


def stretch_ampacity_a(stretch: Stretch, size: str, conductor: str, ccc_per_cable: int,
                       cables: int, single_core: bool, ambient_c: float) -> NecStretchRating:
    """Corrected ampacity of one set on a stretch [A] (310.15, 310.16/310.17, 392.80(A)).

    Parameters
    ----------
    stretch : Stretch
        Its ``containment`` picks the rule (tray/ladder: 392.80(A); otherwise 310.16).
    size : str
        Conductor size (:data:`.tables.SIZES`).
    conductor : str
        ``Cu`` or ``Al``.
    ccc_per_cable : int
        Current-carrying conductors of one cable or set (310.15(E)).
    cables : int
        Cables sharing the raceway or bundle: one set of this circuit (each
        parallel set runs in its own raceway, 310.10(G)(4)) plus the other
        circuits' cables of the stretch's group.
    single_core : bool
        Single conductors (cores 1) rather than a multiconductor cable.
    ambient_c : float
        Ambient temperature [°C].

    Returns
    -------
    NecStretchRating

    Examples
    --------
    >>> r = stretch_ampacity_a(Stretch(containment="conduit"), "3/0", "Cu", 3, 3, False, 30)
    >>> r.tabulated_a, r.ampacity_a
    (225.0, 157.5)
    """
    ambient = Factor("ambient", ambient_factor(ambient_c, INSULATION_TEMP_C),
                     AMBIENT_310_15_B_1.source, f"{INSULATION_TEMP_C} °C column, {ambient_c:g} °C")
    if _is_tray(stretch) and single_core:
        if area_cmil(size) < area_cmil(PARALLEL_MIN):
            raise OutOfRangeError(f"single conductors in cable tray must be {size_label(PARALLEL_MIN)} "
                                  "or larger (NFPA 70:2023 392.10(B)(1))")
        share = next(s for most, s in TRAY_SINGLE_SHARE if area_cmil(size) <= area_cmil(most))
        tab = ampacity_a(size, conductor, INSULATION_TEMP_C, free_air=True)
        tray = Factor("grouping", share, "NFPA 70:2023 392.80(A)(2)(a)",
                      f"single conductors in uncovered tray, {share:.0%} of Table 310.17")
        return NecStretchRating(tab * ambient.value * share, tab, (ambient, tray), "Table 310.17")
    counted = ccc_per_cable if _is_tray(stretch) else ccc_per_cable * max(cables, 1)
    rule = ("the cable's own conductors, NFPA 70:2023 392.80(A)(1)(a)" if _is_tray(stretch)
            else f"{max(cables, 1)} cables x {ccc_per_cable}")
    adjust = Factor("grouping", adjustment_factor(counted), ADJUSTMENT_310_15_C_1.source,
                    f"{counted} current-carrying conductors ({rule})")
    tab = ampacity_a(size, conductor, INSULATION_TEMP_C)
    return NecStretchRating(tab * ambient.value * adjust.value, tab, (ambient, adjust), "Table 310.16")


def voltage_drop_nec(current_a: float, length_m: float, size: str, conductor: str, phases: int,
                     power_factor: float, parallel: int = 1, raceway: str = "steel") -> float:
    """Voltage drop [V] with the effective impedance of Chapter 9 Table 9.

    .. math:: V_d = k\\,I\\,L\\,(R\\cos\\theta + X\\sin\\theta)/n,\\quad k = \\sqrt{3}\\ (3\\ \\text{phases}),\\ 2\\ (1)

    Parameters
    ----------
    current_a : float
        Load current [A].
    length_m : float
        One-way length [m].
    size, conductor : str
        Conductor size and material.
    phases : int
        3 or 1.
    power_factor : float
        cos θ.
    parallel : int
        Sets in parallel.
    raceway : str
        ``pvc``, ``aluminum`` or ``steel`` conduit (Table 9 columns).

    Examples
    --------
    >>> round(voltage_drop_nec(100, 30.48, "1/0", "Cu", 3, 0.85), 2)  # 100 ft
    2.27

    References
    ----------
    .. [1] NFPA 70:2023 Chapter 9 Table 9, Note 2 (Ze = R cos θ + X sin θ).
    """
    r, x = impedance_ohm_per_m(size, conductor, raceway)
    ze = r * power_factor + x * math.sqrt(max(0.0, 1.0 - power_factor ** 2))
    k = math.sqrt(3.0) if phases == 3 else 2.0
    return k * current_a * length_m * ze / parallel


def _is_yes(text: str | None, default: bool) -> bool:
    if text is None:
        return default
    value = text.strip().lower()
    if value in ("yes", "y", "true", "1"):
        return True
    if value in ("no", "n", "false", "0"):
        return False
    raise CircuitInputError(f"continuous {text!r} must be yes or no")


@dataclass(frozen=True)
class _Demand:
    load_a: float
    conductor_min_a: float
    device_a: float
    termination_c: int
    motor: bool
    notes: tuple[str, ...]


def _demand(spec: CircuitSpec, config: SizingConfig) -> _Demand:
    notes: list[str] = []
    motor = spec.load_type == "motor"
    load_a = None
    if motor and spec.load.unit == "hp":
        try:
            load_a = full_load_current_a(spec.load.value, spec.voltage_v, spec.phases)
            table = "Table 430.250" if spec.phases == 3 else "Table 430.248"
            notes.append(f"motor full-load current {load_a:g} A from NFPA 70:2023 {table} (430.6(A)(1))")
        except OutOfRangeError as exc:
            notes.append(f"{exc}; current computed from the load instead")
    if load_a is None:
        load_a = design_current_a(spec.load, spec.voltage_v, spec.phases, spec.power_factor,
                                  spec.efficiency)
    if motor:
        need = 1.25 * load_a  # 430.22
        pct = MOTOR_DEVICE_PCT.get(config.device_kind, 250.0)
        # 430.52(C)(1) Exception No. 1: the next higher standard rating
        device = next_standard_rating_a(pct / 100.0 * load_a, fuse=config.device_kind == "fuse")
        return _Demand(load_a, need, device, 75, True, tuple(notes))
    continuous = _is_yes(spec.extra_value("continuous"), True)
    need = (1.25 if continuous else 1.0) * load_a  # 210.19(A)(1)(a), 215.2(A)(1)(a)
    device = next_standard_rating_a(need, fuse=config.device_kind == "fuse")  # 210.20(A), 215.3
    termination = spec.extra_value("termination_c")
    if termination is not None:
        if termination not in ("60", "75", "90"):
            raise CircuitInputError(f"termination_c {termination!r} must be 60, 75 or 90")
        term_c = int(termination)
    else:
        term_c = 60 if device <= 100 else 75  # 110.14(C)(1)(a) and (b)
    return _Demand(load_a, need, device, term_c, False, tuple(notes))


def _protected(ampacity: float, device_a: float, size: str, conductor: str, motor: bool) -> bool:
    limit = small_conductor_limit_a(size, conductor)
    if limit is not None and device_a > limit + 1e-9 and not motor:
        return False  # 240.4(D) (motor circuits: 240.4(G), 430.52)
    if motor or ampacity >= device_a - 1e-9:
        return True
    standard = abs(next_standard_rating_a(ampacity) - ampacity) < 1e-9
    return (device_a <= NEXT_SIZE_UP_MAX_A and not standard
            and next_standard_rating_a(ampacity) >= device_a - 1e-9)  # 240.4(B)


def size_circuit_nec(spec: CircuitSpec, config: SizingConfig | None = None) -> SizingResult:
    """Size one circuit to NFPA 70:2023 (see the module text for the steps).

    Parameters
    ----------
    spec : CircuitSpec
        The load, the supply and the installation stretches.
    config : SizingConfig, optional
        ``device_kind``, ``ambient_air_c``, ``ground_c``, ``max_parallel`` and
        ``vd_limits_pct`` are read; defaults when omitted.

    Returns
    -------
    SizingResult
        The same type as the IEC rule set; ``cable.size_label`` in AWG or kcmil,
        ``cable.csa_mm2`` the conductor area in mm².  Never raises for a bad circuit.

    Examples
    --------
    >>> from cablewright.sizing.model import Load, CircuitSpec, Stretch
    >>> spec = CircuitSpec("M-1", Load(25, "hp"), 460, load_type="motor",
    ...                    stretches=(Stretch(containment="conduit"),))
    >>> r = size_circuit_nec(spec)
    >>> r.load_current_a, r.cable.size_label, r.device_rating_a
    (34.0, '8 AWG', 90.0)

    References
    ----------
    .. [1] NFPA 70:2023, 110.14(C), 210.19(A), 215.2(A), 240.4, 240.6(A), 250.122,
       310.10(G), 310.15, 310.16, 310.17, 392.80(A), 430.22, 430.52, 430.250,
       Chapter 9 Tables 1, 4, 5, 9.
    """
    config = config or SizingConfig()
    try:
        return _size(spec, config)
    except CableRouteError as exc:
        return SizingResult(spec.circuit_id, "error", (str(exc), AHJ_CAUTION), standard="nec")


def _ambient(stretch: Stretch, config: SizingConfig) -> float:
    if stretch.ambient_c is not None:
        return float(stretch.ambient_c)
    return config.ground_c if _containment(stretch) in GROUND else config.ambient_air_c


def _size(spec: CircuitSpec, config: SizingConfig) -> SizingResult:
    if spec.conductor not in ("Cu", "Al"):
        raise UnknownKeyError(f"conductor {spec.conductor!r} is unknown: use Cu or Al")
    if spec.phases not in (1, 3):
        raise CircuitInputError(f"phases must be 1 or 3, not {spec.phases}")
    if spec.design_length_m < 0 or not math.isfinite(spec.design_length_m):
        raise CircuitInputError(f"length {spec.design_length_m} m must be zero or more")
    if not spec.stretches:
        raise CircuitInputError("no installation given")
    wire = conductor_type(spec.insulation)
    demand = _demand(spec, config)
    faults = NecFaults(spec, config)
    cores = spec.cores or (4 if spec.phases == 3 else 3)
    ccc = 3 if spec.phases == 3 else 2  # 310.15(E)(1): a balanced neutral is not counted
    notes: list[str] = []
    if spec.phases == 3 and cores >= 4 and third_harmonic_pct(spec, config) > 0:
        # 310.15(E)(3): the neutral of a 4-wire wye circuit feeding mainly nonlinear loads is
        # counted; any third-harmonic content given is read so (our conservative reading)
        ccc = 4
        notes.append("neutral counted as a current-carrying conductor: third harmonics given "
                     "(NFPA 70:2023 310.15(E)(3))")
    single = cores == 1
    sizes = [s for s in SIZES if s in IMPEDANCE_CH9_T9.rows
             and IMPEDANCE_CH9_T9.rows[s][1 if spec.conductor == "Cu" else 2] is not None]
    limit = spec.vd_limit_pct
    if limit is None:
        limit = float(config.vd_limits_pct.get(spec.load_type, VD_BRANCH_PCT))
    raceway = (spec.extra_value("raceway") or "steel").lower()
    ambients = [_ambient(s, config) for s in spec.stretches]
    for ambient in ambients:  # outside Table 310.15(B)(1)(1): the circuit's error, said once
        ambient_factor(ambient, INSULATION_TEMP_C)

    def rate(size: str, parallel: int) -> tuple[NecStretchRating, int]:
        ratings = []
        for stretch, amb in zip(spec.stretches, ambients, strict=True):
            # each parallel set in its own raceway (310.10(G)(4)); the other circuits'
            # cables of the stretch are taken to share it (the route's derived grouping)
            cables = stretch.other_cables + 1
            ratings.append(stretch_ampacity_a(stretch, size, spec.conductor, ccc, cables, single, amb))
        index = min(range(len(ratings)), key=lambda i: ratings[i].ampacity_a)
        return ratings[index], index

    def capacity_ok(size: str, parallel: int) -> tuple[bool, float, NecStretchRating, int, float] | None:
        try:
            rating, index = rate(size, parallel)
            term = ampacity_a(size, spec.conductor, demand.termination_c)
        except OutOfRangeError:
            return None
        ampacity = parallel * min(rating.ampacity_a, term)
        ok = (parallel * term >= demand.conductor_min_a - 1e-9
              and parallel * rating.ampacity_a >= (demand.conductor_min_a if demand.motor
                                                   else demand.load_a) - 1e-9
              and _protected(ampacity, demand.device_a, size, spec.conductor, demand.motor))
        return ok, ampacity, rating, index, term

    def vd_of(size: str, parallel: int) -> float:
        volts = voltage_drop_nec(demand.load_a, spec.design_length_m, size, spec.conductor,
                                 spec.phases, spec.power_factor, parallel, raceway)
        return volts

    chosen = last = None
    for parallel in range(1, config.max_parallel + 1):
        allowed = [s for s in sizes if parallel == 1 or area_cmil(s) >= area_cmil(PARALLEL_MIN)]
        first = next((i for i, s in enumerate(allowed) if (c := capacity_ok(s, parallel)) and c[0]), None)
        if first is None:
            continue
        governed = "capacity"
        for size in allowed[first:]:
            cap = capacity_ok(size, parallel)
            if not (cap and cap[0]):
                continue
            if not faults.withstands(size):  # ICEA P-32-382 (see .faults)
                governed = "short_circuit"
                continue
            if 100.0 * vd_of(size, parallel) / spec.voltage_v <= limit + 1e-9:
                chosen = (size, parallel, governed, allowed[first])
                break
            governed = "voltage_drop"
        if chosen is not None:
            break
        last = (allowed[-1], parallel, "voltage_drop", allowed[first])
    if chosen is None:
        if last is not None:
            chosen = last
        else:
            raise CircuitInputError(
                f"load {demand.load_a:.1f} A needs {demand.conductor_min_a:.1f} A: beyond "
                f"{config.max_parallel} parallel sets of {size_label(sizes[-1])} under these "
                "conditions; split the load, change the route or raise max_parallel in the config")
    size, parallel, governed, minimum_size = chosen
    if config.disconnection_upsize and not faults.clears(size, size, demand.device_a, parallel,
                                                         raceway):
        # as the IEC path (config disconnection_upsize): a few standard sizes larger where
        # even an EGC of the phase size does not clear the ground fault (see .faults)
        larger = [s for s in sizes if area_cmil(s) > area_cmil(size)]
        for step in larger[:config.disconnection_upsize_max_steps]:
            cap = capacity_ok(step, parallel)
            if cap and cap[0] and faults.clears(step, step, demand.device_a, parallel, raceway):
                size, governed = step, "disconnection"
                break
    checked = capacity_ok(size, parallel)
    assert checked is not None  # the chosen size was rated in the search above
    _, ampacity, rating, index, term = checked
    if notes:
        demand = replace(demand, notes=demand.notes + tuple(notes))
    return _result(spec, config, demand, wire, cores, size, parallel, governed, minimum_size,
                   ampacity, rating, index, term, vd_of(size, parallel), limit, raceway, faults)


def _egc(device_a: float, conductor: str, size: str, minimum_size: str) -> tuple[str, str]:
    base = egc_size(device_a, conductor)
    ratio = area_cmil(size) / area_cmil(minimum_size)
    if ratio <= 1.0 + 1e-9:
        return base, f"Table 250.122 for a {device_a:g} A device"
    need = area_cmil(base) * ratio  # 250.122(B)
    egc = next((s for s in SIZES if area_cmil(s) >= need - 1e-6), SIZES[-1])
    if area_cmil(egc) > area_cmil(size):
        egc = size  # never larger than the phase conductors
    return egc, (f"Table 250.122 ({size_label(base)}) increased {ratio:.2f} x in circular mils "
                 "with the phase conductors, 250.122(B)")


def _fill(spec: CircuitSpec, wire_key: str, size: str, egc: str, cores: int) -> Check:
    conductors = max(cores, 2) + 1  # phases (+ neutral) and the EGC of one set
    area = (max(cores, 2)) * AREA_CH9_T5.rows[wire_key].get(size, math.nan) + \
        AREA_CH9_T5.rows[wire_key].get(egc, math.nan)
    limit_pct = fill_limit_pct(conductors)
    trade = next((t for t, a in EMT_AREA_CH9_T4.rows.items() if area <= a * limit_pct / 100.0), None)
    source = (f"NFPA 70:2023 Chapter 9 Table 1 ({limit_pct:g} % for {conductors} conductors), "
              f"Table 4 (EMT), Table 5 ({wire_key})")
    if trade is None or math.isnan(area):
        return Check("raceway_fill", False, area, EMT_AREA_CH9_T4.rows["4"] * limit_pct / 100, "in²",
                     source, "no EMT up to trade size 4 holds one set: split the sets")
    return Check("raceway_fill", True, area, EMT_AREA_CH9_T4.rows[trade] * limit_pct / 100.0, "in²",
                 source, f"EMT trade size {trade} per set ({area:.3f} in² of conductors)")


def _result(spec: CircuitSpec, config: SizingConfig, demand: _Demand, wire: str, cores: int,
            size: str, parallel: int, governed: str, minimum_size: str, ampacity: float,
            rating: NecStretchRating, index: int, term: float, volts: float, limit: float,
            raceway: str, faults: NecFaults) -> SizingResult:
    stretch = spec.stretches[index]
    total = math.prod(f.value for f in rating.factors)
    label = size_label(size)
    checks = [
        Check("design_current", demand.load_a <= demand.device_a + 1e-9, demand.load_a,
              demand.device_a, "A", "NFPA 70:2023 430.52 (motor)" if demand.motor
              else "NFPA 70:2023 210.20(A), 215.3 and Table 240.6(A)"),
        Check("termination", parallel * term >= demand.conductor_min_a - 1e-9, demand.conductor_min_a,
              parallel * term, "A",
              f"NFPA 70:2023 110.14(C)(1), {demand.termination_c} °C column of Table 310.16; "
              + ("430.22: 125 % of the full-load current" if demand.motor
                 else "210.19(A)(1)(a)/215.2(A)(1)(a): 125 % of the continuous load")),
        Check("capacity", _protected(ampacity, demand.device_a, size, spec.conductor, demand.motor),
              demand.device_a, ampacity, "A",
              f"NFPA 70:2023 {rating.table}, 310.15; "
              + ("240.4(G), 430.52: motor branch circuit" if demand.motor
                 else "240.4(B) next size up to 800 A, 240.4(D) small conductors")),
    ]
    vd_pct = 100.0 * volts / spec.voltage_v
    length_ft = spec.design_length_m / FT_M
    checks.append(Check(
        "voltage_drop", vd_pct <= limit + 1e-9, vd_pct, limit, "%",
        f"NFPA 70:2023 Chapter 9 Table 9 ({raceway} conduit, 75 °C), {length_ft:.0f} ft; "
        f"{limit:g} % of 210.19(A) Informational Note No. 4 / 215.2(A)(2) Note No. 2 "
        f"(informational: {VD_TOTAL_PCT:g} % feeder and branch together)",
        "" if vd_pct <= limit + 1e-9 else f"voltage drop {vd_pct:.2f} % exceeds the {limit:g} % guidance"))
    egc, egc_rule = _egc(demand.device_a, spec.conductor, size, minimum_size)
    fault = faults.evaluate(size, egc, demand.device_a, parallel, raceway)
    egc_rule += "".join(f"; {note}" for note in fault.egc_notes)
    egc = fault.egc
    egc_text = (f"EGC {size_label(egc)} {spec.conductor}: {egc_rule}"
                + ("; one full-size EGC in every parallel raceway, 250.122(F)" if parallel > 1 else ""))
    pe = fault.protective_conductor
    checks += [fault.short_circuit, fault.disconnection,
               replace(pe, source=f"NFPA 70:2023 {EGC_250_122.table}; {pe.source}",
                       message=pe.message if pe.failed else
                       "; ".join(m for m in (egc_text, pe.message) if m))]
    if _containment(stretch) == "conduit":
        checks.append(_fill(spec, _TYPES[spec.insulation][1], size, egc, cores))
    messages = [c.message or f"{c.name} check fails" for c in checks if c.failed]
    status = "fail" if messages else "ok"
    messages = list(demand.notes) + messages
    messages.append(f"{wire} conductors, {label} {spec.conductor}; {egc_text}")
    if spec.design_length_m <= 0:
        messages.append("no length given: voltage drop not checked")
        status = "warning" if status == "ok" else status
    if parallel > 1:
        messages.append(f"{parallel} sets in parallel: same length, material, size, insulation and "
                        "termination, each set in its own raceway (NFPA 70:2023 310.10(G))")
    messages.append(AHJ_CAUTION)
    cable = CableSelection(spec.conductor, spec.insulation, cores, round(area_mm2(size), 2),
                           parallel, ampacity, governed, label)
    grouping = next((f for f in rating.factors if f.name == "grouping"), None)
    need = demand.conductor_min_a if demand.motor else max(demand.load_a, demand.device_a)
    vd = VoltageDrop(volts, vd_pct, limit,
                     1000.0 * volts / (demand.load_a * spec.design_length_m) if spec.design_length_m > 0
                     else 0.0, vd_pct, total_limit_percent=VD_TOTAL_PCT,
                     total_limit_source="NFPA 70:2023 215.2(A)(2) Informational Note No. 2")
    return SizingResult(
        circuit_id=spec.circuit_id, status=status, messages=tuple(messages),
        load_current_a=demand.load_a, device_rating_a=demand.device_a,
        device_kind=config.device_kind, method=stretch.method,
        governing_segment=stretch.segment_id, cables_in_group=stretch.other_cables + parallel,
        grouping_factor=grouping.value if grouping else 1.0, correction_factor=total,
        factors=rating.factors, required_capacity_a=need / total,
        cable=cable, voltage_drop=vd, checks=tuple(checks),
        protective_conductor_mm2=round(area_mm2(egc), 2), standard="nec",
        max_length_m=fault.max_length_m, earth_fault_loop_ohm=fault.earth_fault_loop_ohm,
        fault_current_ka_source=None if faults.fault_a is None else faults.fault_a / 1000.0,
        fault_current_ka_load_end_earth_min=fault.ground_fault_ka,
    )
