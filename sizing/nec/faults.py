"""Short-circuit withstand and ground-fault clearing on the NEC path (NFPA 70:2023).

Three checks, each pass / fail / not checked (with why), in the keys the IEC path uses:

``short_circuit``
    The phase conductors withstand the fault current at the circuit's origin (the
    schedule's ``fault_ka`` or the config's ``default_fault_ka``) for the device's
    clearing time (``clearing_time_s``), or the device's let-through I²t
    (``let_through_ka2s``, maker's data), by the insulated-conductor formula of
    ICEA P-32-382 (:func:`withstand_current_a`).  The NEC asks conductors to be
    protected so that a fault does not damage them (110.10); 240.4 Informational
    Note points to ICEA P-32-382 for the allowable short-circuit currents.
``protective_conductor``
    The equipment grounding conductor of Table 250.122 withstands the same fault
    current for the same time (250.4(A)(5): the effective ground-fault current
    path carries the maximum ground-fault current safely; 250.122(A): the EGC may
    need to be larger than the table); where it does not, it is raised to the
    smallest size that does (never above the phase conductors).
``disconnection``
    Ground-fault clearing: the current of a bolted line-to-ground fault at the load
    end, through the phase conductor and the EGC (Chapter 9 Table 9 impedances) and
    the source, reaches the breaker's instantaneous pickup with its tolerance
    (250.4(A)(5): the path "facilitates the operation of the overcurrent device";
    clearing on the instantaneous element is the design criterion of common
    practice, not a number the Code prints).

Clause numbers are those of NFPA 70:2023 as recalled, from memory (no public copy of the
clause text was read).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

from cablewright.core.errors import CableRouteError, CircuitInputError, OutOfRangeError

from ..checks import _extra_float, not_checked
from ..config import SizingConfig
from ..model import Check, CheckResult, CircuitSpec
from .tables import SIZES, area_cmil, impedance_ohm_per_m, size_label

__all__ = [
    "ICEA_P32_382",
    "IceaConstants",
    "NecFaultChecks",
    "NecFaults",
    "SHORT_CIRCUIT_TEMP_C",
    "INITIAL_TEMP_C",
    "INSTANTANEOUS_MULTIPLE",
    "ground_fault_loop",
    "instantaneous_pickup_a",
    "min_area_cmil",
    "withstand_current_a",
]

#: Publication and edition of the short-circuit formula.  The formula and its constants
#: are as reprinted from ICEA P-32-382-2007 in a cable maker's public specification sheet
#: (the constant 0.0297 for copper and the 90 °C -> 250 °C results 0.07195 and 0.0470 A per
#: cmil per √s are printed there); the aluminium constant 0.0125 is from memory (the 4th
#: edition, 1999, names the same formula; no public copy of the publication was read).
ICEA_SOURCE = "ICEA P-32-382-2007 (Short Circuit Characteristics of Insulated Cable)"


@dataclass(frozen=True)
class IceaConstants:
    """Material constants of (I/A)² t = K log10((T2 + λ)/(T1 + λ)), A in cmil."""

    k: float
    """K [A² s / cmil²]."""
    inferred_zero_c: float
    """λ: the inferred temperature of zero resistance, sign changed [°C]."""


#: ICEA P-32-382-2007: copper K 0.0297, λ 234; aluminium K 0.0125, λ 228 (from memory).
ICEA_P32_382 = {"Cu": IceaConstants(0.0297, 234.0), "Al": IceaConstants(0.0125, 228.0)}

#: Conductor temperature when the fault begins [°C]: the insulation's 90 °C rating
#: (NFPA 70:2023 Table 310.4(A), THHN/THWN-2 and XHHW-2), the conservative reading.
INITIAL_TEMP_C = 90.0

#: Highest conductor temperature during a short circuit [°C], by the schedule's insulation:
#: XLPE (XHHW-2, thermoset) 250 °C, PVC (THHN/THWN-2, thermoplastic) 150 °C; the
#: limits ICEA P-32-382 tabulates for those insulations (from memory).
SHORT_CIRCUIT_TEMP_C = {"XLPE": 250.0, "PVC": 150.0}

#: Instantaneous pickup of a thermal-magnetic molded-case breaker with no setting given:
#: 10 x its rating (common practice, from memory: fixed magnetic trips of molded-case
#: breakers sit at about 10 x In; adjustable ones span about 5-10 x).
INSTANTANEOUS_MULTIPLE = 10.0


def _constants(conductor: str) -> IceaConstants:
    try:
        return ICEA_P32_382[conductor]
    except KeyError:
        raise CircuitInputError(f"conductor {conductor!r} is unknown: use Cu or Al") from None


def _log_term(conductor: str, initial_c: float, final_c: float) -> float:
    """K log10((T2 + λ)/(T1 + λ)) [A² s / cmil²]."""
    c = _constants(conductor)
    if not final_c > initial_c:
        raise OutOfRangeError(f"short-circuit temperature {final_c:g} °C must exceed the "
                              f"initial {initial_c:g} °C ({ICEA_SOURCE})")
    return c.k * math.log10((final_c + c.inferred_zero_c) / (initial_c + c.inferred_zero_c))


def withstand_current_a(area_cmil: float, time_s: float, conductor: str,
                        initial_c: float = INITIAL_TEMP_C, final_c: float = 250.0) -> float:
    """Short-circuit current an insulated conductor withstands [A] (ICEA P-32-382).

    .. math:: \\left(\\frac{I}{A}\\right)^2 t = K \\log_{10}\\frac{T_2 + \\lambda}{T_1 + \\lambda}

    with K = 0.0297, λ = 234 for copper and K = 0.0125, λ = 228 for aluminium.

    Parameters
    ----------
    area_cmil : float
        Conductor area [cmil].
    time_s : float
        Duration of the fault, the device's clearing time [s].
    conductor : str
        ``Cu`` or ``Al``.
    initial_c : float
        Conductor temperature when the fault begins [°C].
    final_c : float
        Highest temperature the insulation allows during the fault [°C].

    Returns
    -------
    float
        The current [A].

    Raises
    ------
    OutOfRangeError
        ``time_s`` not above zero, or ``final_c`` not above ``initial_c``.

    Notes
    -----
    Adiabatic: the heat stays in the conductor, which holds for faults of a few
    seconds at most (ICEA P-32-382's own assumption).

    Examples
    --------
    >>> round(withstand_current_a(1.0, 1.0, "Cu", 90, 250), 5)  # A/cmil in 1 s, MV-90
    0.07195

    References
    ----------
    .. [1] ICEA P-32-382-2007, Short Circuit Characteristics of Insulated Cable,
       Insulated Cable Engineers Association (formula as reprinted in a maker's
       public specification sheet; aluminium constant from memory).
    """
    if not time_s > 0:
        raise OutOfRangeError(f"clearing time {time_s:g} s must be above zero ({ICEA_SOURCE})")
    return area_cmil * math.sqrt(_log_term(conductor, initial_c, final_c) / time_s)


def min_area_cmil(current_a: float, time_s: float, conductor: str,
                  initial_c: float = INITIAL_TEMP_C, final_c: float = 250.0) -> float:
    """Least conductor area withstanding ``current_a`` for ``time_s`` [cmil] (ICEA P-32-382).

    .. math:: A = I \\sqrt{t / (K \\log_{10}((T_2 + \\lambda)/(T_1 + \\lambda)))}

    Parameters
    ----------
    current_a : float
        Fault current [A].
    time_s : float
        Clearing time [s].
    conductor : str
        ``Cu`` or ``Al``.
    initial_c, final_c : float
        Temperatures at the start and the end of the fault [°C].

    Returns
    -------
    float

    Examples
    --------
    >>> round(min_area_cmil(10_000, 0.1, "Cu", 90, 250))  # 10 kA, 6 cycles at 60 Hz
    43951
    """
    return current_a / withstand_current_a(1.0, time_s, conductor, initial_c, final_c)


def _min_area_let_through_cmil(i2t_a2s: float, conductor: str, initial_c: float,
                               final_c: float) -> float:
    """A = √(I²t / (K log10(...))) [cmil]: the let-through I²t of a current-limiting device."""
    return math.sqrt(i2t_a2s / _log_term(conductor, initial_c, final_c))


def instantaneous_pickup_a(device_a: float, magnetic_a: float | None = None,
                           multiple: float = INSTANTANEOUS_MULTIPLE) -> float:
    """Instantaneous pickup of a breaker [A]: its setting, else ``multiple`` x its rating.

    Parameters
    ----------
    device_a : float
        Breaker rating [A].
    magnetic_a : float, optional
        The setting given (schedule or config ``magnetic_a``) [A].
    multiple : float
        Pickup / rating with no setting given: 10 (common practice, from memory).

    Examples
    --------
    >>> instantaneous_pickup_a(100), instantaneous_pickup_a(100, 600)
    (1000.0, 600.0)
    """
    return float(magnetic_a) if magnetic_a is not None else multiple * device_a


@dataclass(frozen=True)
class GroundFaultLoop:
    """Impedances and current of a line-to-ground fault at the load end."""

    source_ohm: float
    cable_ohm: float
    current_a: float

    @property
    def loop_ohm(self) -> float:
        """Source plus cable [Ω]."""
        return self.source_ohm + self.cable_ohm


def ground_fault_loop(voltage_to_ground_v: float, source_fault_a: float, length_m: float,
                      size: str, egc: str, conductor: str, parallel: int = 1,
                      raceway: str = "steel") -> GroundFaultLoop:
    """Bolted line-to-ground fault at the load end, through the phase conductor and the EGC.

    .. math:: I_{gf} = \\frac{V_{LG}}{Z_S + L\\,|(R_p + R_e) + j(X_p + X_e)|/n},
       \\quad Z_S = V_{LG} / I_{sc}

    Parameters
    ----------
    voltage_to_ground_v : float
        Line-to-ground voltage [V].
    source_fault_a : float
        Fault current available at the circuit's origin [A].
    length_m : float
        One-way length [m].
    size, egc : str
        Phase conductor and equipment grounding conductor sizes.
    conductor : str
        ``Cu`` or ``Al`` (both conductors).
    parallel : int
        Sets in parallel, each with its full-size EGC (250.122(F)).
    raceway : str
        Chapter 9 Table 9 column: ``pvc``, ``aluminum`` or ``steel``.

    Returns
    -------
    GroundFaultLoop

    Notes
    -----
    R and X of both conductors from NFPA 70:2023 Chapter 9 Table 9 (75 °C, the EGC
    taken in the same raceway with the same reactance as a phase conductor).  The
    source's share is V_LG / I_sc, the line-to-ground fault at the origin taken equal
    to the three-phase one (zero- and positive-sequence impedances of the supply
    transformer alike: common practice), and added to the cable's in magnitude
    (conservative: less current than the phasor sum).  A steel raceway that is
    itself an EGC (250.118) is not counted.

    Examples
    --------
    >>> loop = ground_fault_loop(277, 10_000, 30.48, "10", "10", "Cu")  # 100 ft
    >>> round(loop.cable_ohm, 4), round(loop.current_a)
    (0.2403, 1033)
    """
    r_p, x_p = impedance_ohm_per_m(size, conductor, raceway)
    r_e, x_e = impedance_ohm_per_m(egc, conductor, raceway)
    cable = length_m * math.hypot(r_p + r_e, x_p + x_e) / parallel
    source = voltage_to_ground_v / source_fault_a
    return GroundFaultLoop(source, cable, voltage_to_ground_v / (source + cable))


def _outcome(passed: bool) -> CheckResult:
    return CheckResult.PASS if passed else CheckResult.FAIL


@dataclass(frozen=True)
class NecFaultChecks:
    """The three checks of one chosen conductor, the EGC after withstand, and the numbers."""

    short_circuit: Check
    protective_conductor: Check
    disconnection: Check
    egc: str
    egc_notes: tuple[str, ...] = ()
    earth_fault_loop_ohm: float | None = None
    ground_fault_ka: float | None = None
    max_length_m: float | None = None


class NecFaults:
    """The fault data of one circuit, read once; evaluated per candidate conductor.

    Parameters
    ----------
    spec : CircuitSpec
        Schedule fields read: ``fault_ka``, ``clearing_time_s``, ``let_through_ka2s``,
        ``magnetic_a``, ``earthing``.
    config : SizingConfig
        ``default_fault_ka``, ``clearing_time_s``, ``magnetic_a``, ``earthing``,
        ``instantaneous_tolerance``, ``device_kind`` where the schedule is silent;
        ``disconnection_upsize`` (raise the EGC, then the phase conductors, to clear).

    Raises
    ------
    CircuitInputError
        A schedule number that is not a number, or negative.
    """

    def __init__(self, spec: CircuitSpec, config: SizingConfig) -> None:
        self.conductor = spec.conductor
        self.final_c = SHORT_CIRCUIT_TEMP_C.get(spec.insulation, 150.0)
        fault_ka = spec.fault_ka if spec.fault_ka is not None else config.default_fault_ka
        self.fault_a = None if not fault_ka else 1000.0 * float(fault_ka)
        self.time_s = _extra_float(spec, "clearing_time_s", config.clearing_time_s)
        let_through = _extra_float(spec, "let_through_ka2s", None)
        self.i2t_a2s = None if let_through is None else let_through * 1e6
        self.magnetic_a = _extra_float(spec, "magnetic_a", config.magnetic_a)
        self.earthing = str(spec.extra_value("earthing", config.earthing)).upper()
        self.tolerance = config.instantaneous_tolerance
        self.kind = config.device_kind
        self.upsize = config.disconnection_upsize
        self.v_lg = spec.voltage_v / math.sqrt(3.0) if spec.phases == 3 else spec.voltage_v
        self.length_m = spec.design_length_m
        self.source = (f"{ICEA_SOURCE}: (I/A)² t = {_constants(spec.conductor).k:g} "
                       f"log10((T2 + {_constants(spec.conductor).inferred_zero_c:g})/(T1 + "
                       f"{_constants(spec.conductor).inferred_zero_c:g})), T1 {INITIAL_TEMP_C:g} °C, "
                       f"T2 {self.final_c:g} °C (from memory); NFPA 70:2023 110.10, 240.4")

    # ------------------------------------------------------------ withstand
    def _need_cmil(self) -> float | None:
        """Least area withstanding the fault [cmil]; None when the check cannot be made."""
        if self.fault_a is None:
            return None
        if self.i2t_a2s is not None:
            return _min_area_let_through_cmil(self.i2t_a2s, self.conductor, INITIAL_TEMP_C,
                                              self.final_c)
        if self.time_s is None or self.time_s <= 0:
            return None
        return min_area_cmil(self.fault_a, self.time_s, self.conductor, INITIAL_TEMP_C,
                             self.final_c)

    def withstands(self, size: str) -> bool:
        """True when ``size`` withstands the fault, or when the check cannot be made."""
        need = self._need_cmil()
        return need is None or area_cmil(size) >= need - 1e-6

    def _why_not(self) -> str:
        if self.fault_a is None:
            return "not checked: no fault level (schedule fault_ka or config default_fault_ka)"
        return ("not checked: give the device's clearing time (clearing_time_s) or its "
                "let-through I²t (let_through_ka2s, maker's data)")

    def _duty(self) -> str:
        if self.i2t_a2s is not None:
            return f"let-through I²t {self.i2t_a2s / 1e6:g} kA²s (schedule)"
        return f"{(self.fault_a or 0.0) / 1000.0:g} kA for {self.time_s:g} s (device clearing time)"

    def short_circuit(self, size: str) -> Check:
        """``short_circuit``: ``value`` the least area, ``limit`` the chosen one [kcmil]."""
        need = self._need_cmil()
        have = area_cmil(size) / 1000.0
        if need is None:
            return not_checked("short_circuit", "kcmil", self.source, self._why_not(), have)
        passed = need / 1000.0 <= have + 1e-9
        message = "" if passed else (
            f"{size_label(size)} does not withstand {self._duty()}: needs {need / 1000.0:.1f} kcmil "
            f"({ICEA_SOURCE}); a larger conductor or a faster, current-limiting device")
        return Check("short_circuit", _outcome(passed), need / 1000.0, have, "kcmil",
                     f"{self.source}; {self._duty()}", message)

    def egc_for_withstand(self, egc: str, size: str) -> tuple[str, Check, str]:
        """The EGC raised to withstand the fault (never above ``size``), its check [kcmil]
        and the note saying so ("" when not raised); the check's message says why a
        withstand could not be checked, or why it fails."""
        need = self._need_cmil()
        source = f"NFPA 70:2023 Table 250.122, 250.4(A)(5), 250.122(A); {self.source}"
        if need is None:
            return egc, Check("protective_conductor", CheckResult.PASS, area_cmil(egc) / 1000.0,
                              area_cmil(egc) / 1000.0, "kcmil", source,
                              "withstand " + self._why_not()), ""
        raised = egc
        if area_cmil(egc) < need - 1e-6:
            raised = next((s for s in SIZES if area_cmil(s) >= need - 1e-6
                           and area_cmil(s) <= area_cmil(size)), size)
        passed = area_cmil(raised) >= need - 1e-6
        note = (f"EGC raised from {size_label(egc)} to {size_label(raised)} to withstand "
                f"{self._duty()} (250.4(A)(5), 250.122(A))" if raised != egc else "")
        message = "" if passed else (
            f"the EGC, even at the phase size {size_label(raised)}, does not withstand "
            f"{self._duty()}: needs {need / 1000.0:.1f} kcmil")
        return raised, Check("protective_conductor", _outcome(passed), need / 1000.0,
                             area_cmil(raised) / 1000.0, "kcmil", f"{source}; {self._duty()}",
                             message), note

    # ------------------------------------------------------- ground fault
    def disconnection(self, size: str, egc: str, device_a: float, parallel: int,
                      raceway: str) -> tuple[Check, GroundFaultLoop | None, float | None]:
        """``disconnection``: ``value`` the loop impedance, ``limit`` V_LG / pickup [Ω]."""
        source = ("NFPA 70:2023 250.4(A)(5), Chapter 9 Table 9; clearing on the breaker's "
                  "instantaneous element (common practice)")
        if not self.earthing.startswith("TN"):
            return not_checked("disconnection", "Ω", source,
                               f"not checked: earthing {self.earthing} (solidly grounded "
                               "systems only)"), None, None
        if self.kind not in ("breaker", "motor_breaker"):
            return not_checked("disconnection", "Ω", source,
                               f"not checked: a {self.kind} clears by its time-current curve; "
                               "compare the ground-fault current with the maker's curve"), None, None
        if self.fault_a is None:
            return not_checked("disconnection", "Ω", source,
                               "not checked: no fault level (schedule fault_ka or config "
                               "default_fault_ka)"), None, None
        try:
            loop = ground_fault_loop(self.v_lg, self.fault_a, self.length_m, size, egc,
                                     self.conductor, parallel, raceway)
        except CableRouteError as exc:
            return not_checked("disconnection", "Ω", source, f"not checked: {exc}"), None, None
        pickup = instantaneous_pickup_a(device_a, self.magnetic_a)
        need_a = pickup * (1.0 + self.tolerance)
        zmax = self.v_lg / need_a
        per_m = (loop.cable_ohm / self.length_m) if self.length_m > 0 else 0.0
        max_length = (zmax - loop.source_ohm) / per_m if per_m > 0 else None
        if max_length is not None:
            max_length = max(0.0, max_length)
        setting = ("setting given" if self.magnetic_a is not None
                   else f"{INSTANTANEOUS_MULTIPLE:g} x {device_a:g} A, thermal-magnetic "
                   "(common practice, from memory)")
        detail = (f"{source}; pickup {pickup:g} A ({setting}) + {self.tolerance:.0%} tolerance; "
                  f"source {loop.source_ohm:.4f} Ω from {self.fault_a / 1000.0:g} kA "
                  "(line-to-ground = three-phase, common practice)")
        passed = loop.loop_ohm <= zmax + 1e-12
        message = "" if passed else (
            f"ground-fault current {loop.current_a:.0f} A at the load end is below "
            f"{need_a:.0f} A (instantaneous pickup {pickup:g} A + {self.tolerance:.0%}): "
            f"it clears instantaneously only up to {max_length or 0.0:.0f} m; use a larger EGC "
            "(250.122(B)), a lower instantaneous setting or ground-fault protection of equipment")
        return (Check("disconnection", _outcome(passed),
                      loop.loop_ohm, zmax, "Ω", detail, message), loop, max_length)

    def clears(self, size: str, egc: str, device_a: float, parallel: int, raceway: str) -> bool:
        """False only when the ground-fault check is made and fails."""
        return self.disconnection(size, egc, device_a, parallel, raceway)[0].result \
            is not CheckResult.FAIL

    def evaluate(self, size: str, egc: str, device_a: float, parallel: int,
                 raceway: str) -> NecFaultChecks:
        """The three checks of the chosen conductor (see the module text).

        Where the ground fault does not clear, the EGC is raised a size at a time up to the
        phase size until it does (250.4(A)(5); 250.122 sizes are minimums), unless the
        config's ``disconnection_upsize`` is off.
        """
        short = self.short_circuit(size)
        raised, pe, note = self.egc_for_withstand(egc, size)
        notes = [note] if note else []
        if self.upsize and not self.clears(size, raised, device_a, parallel, raceway):
            bigger = [s for s in SIZES if area_cmil(raised) < area_cmil(s) <= area_cmil(size)]
            better = next((s for s in bigger
                           if self.clears(size, s, device_a, parallel, raceway)), None)
            if better is not None:
                notes.append(f"EGC raised from {size_label(raised)} to {size_label(better)} so "
                             "that the ground fault clears on the instantaneous element "
                             "(250.4(A)(5))")
                raised = better
                pe = replace(pe, limit=area_cmil(better) / 1000.0)
        ground, loop, max_length = self.disconnection(size, raised, device_a, parallel, raceway)
        return NecFaultChecks(short, pe, ground, raised, tuple(notes),
                              None if loop is None else loop.loop_ohm,
                              None if loop is None else loop.current_a / 1000.0, max_length)
