"""The engineering checks beyond ampacity, in the form the selection runs them.

Each check is prepared once per circuit (everything that does not depend on the
cable size), then evaluated per candidate size by the selection of
:mod:`.select`; each wraps one pure module:

=====================  ========================================  =====================
check                  module                                    on failure
=====================  ========================================  =====================
``short_circuit``      :mod:`.short_circuit` (434.5.2)           raise the size
``motor_start``        :mod:`.motor_start`                       raise the size
``disconnection``      :mod:`.disconnection` (411.4.4)           fail with advice, or
                                                                 raise the size when
                                                                 ``disconnection_upsize``
``protective_conductor``  :mod:`.protective_conductor` (543.1)   reported
``motor_start_trip``   :mod:`.disconnection` instantaneous       fail with advice
                       release vs the starting peak
=====================  ========================================  =====================

A check that does not apply to a circuit (a non-motor for ``motor_start``)
returns :func:`not_applicable`; the selection leaves it out of the result.  A
check that cannot be made (no data) has the result ``not_checked`` and a
message starting "not checked" saying why; it is never a pass.

Per-circuit inputs come from the schedule's further columns
(``CircuitSpec.extra``): ``starter``, ``curve``, ``ze_ohm``, ``magnetic_a``,
``earthing``, ``clearing_time_s``; defaults from :class:`.config.SizingConfig`.
"""

from __future__ import annotations

import math
from functools import lru_cache
from typing import TYPE_CHECKING, Any

from cablewright.core.errors import CableRouteError, CircuitInputError

from .conductor_resistance import resistance_ohm_per_km
from .disconnection import (
    INDUSTRIAL_INSTANTANEOUS_MULTIPLE,
    INSTANTANEOUS_TOLERANCE,
    DisconnectionResult,
    check_disconnection_tn,
    device_ia_a,
    fault_loop_temperature_c,
    instantaneous_trip,
    max_disconnection_time_s,
)
from .model import Check, CheckResult, CircuitSpec
from .motor_start import STAR_DELTA_START_DROP_FACTOR, is_star_delta, starter_data, starter_kind
from .protective_conductor import ProtectiveConductor, protective_conductor
from .short_circuit import (
    FAULT_TEMPERATURE_C,
    SOURCE_R_OVER_X,
    SOURCE_Z0_OVER_Z1,
    TABLE_43A_SOURCE,
    adiabatic_min_csa_mm2,
    fault_current_ka,
    fault_current_line_neutral_ka,
    k_value,
    peak_factor,
    source_impedance_ohm,
)
from .voltage_drop import REACTANCE_MOHM_PER_M

if TYPE_CHECKING:  # select.py imports this module; no import cycle at run time
    from .config import SizingConfig
    from .device import DeviceSelection

__all__ = [
    "NOT_APPLICABLE",
    "not_applicable",
    "is_applicable",
    "DISCONNECTION_ADVICE",
    "PreparedShortCircuit",
    "PreparedMotorStart",
    "PreparedProtectiveConductor",
    "PreparedDisconnection",
    "PreparedMotorTrip",
    "PreparedChecks",
    "ZE_ASSUMED_MESSAGE",
    "load_end_fault_ka",
    "not_checked",
    "star_delta_cables",
]

NOT_APPLICABLE = "not applicable"
DISCONNECTION_ADVICE = (
    "use a larger conductor, a lower magnetic setting or a residual-current device "
    "(IEC 60364-4-41:2005 411.5 / 411.4.5)"
)


@lru_cache(maxsize=256)
def not_applicable(name: str, why: str) -> Check:
    """A ``not_applicable`` :class:`Check` that the selection leaves out of the result."""
    return Check(name, CheckResult.NOT_APPLICABLE, 0.0, 0.0, "", NOT_APPLICABLE, why)


def not_checked(name: str, unit: str, source: str, why: str, limit: float = 0.0) -> Check:
    """A ``not_checked`` :class:`Check`: ``why`` starts with "not checked"."""
    return Check(name, CheckResult.NOT_CHECKED, 0.0, limit, unit, source, why)


def is_applicable(check: Check) -> bool:
    """False for :func:`not_applicable` checks."""
    return check.result is not CheckResult.NOT_APPLICABLE


def _cfg(config: Any, name: str, default: Any) -> Any:
    return getattr(config, name, default)


def _extra_float(spec: CircuitSpec, name: str, default: float | None) -> float | None:
    text = spec.extra_value(name)
    if text is None:
        return default
    try:
        value = float(text.replace(",", "."))
    except ValueError:
        raise CircuitInputError(f"circuit {spec.circuit_id}: {name} {text!r} is not a number") from None
    if not math.isfinite(value) or value < 0:
        raise CircuitInputError(f"circuit {spec.circuit_id}: {name} {text!r} must be zero or more")
    return value


def _fault_ka(spec: CircuitSpec, config: SizingConfig) -> float | None:
    return spec.fault_ka if spec.fault_ka is not None else _cfg(config, "default_fault_ka", None)


def _u0(spec: CircuitSpec) -> float:
    return spec.voltage_v / math.sqrt(3.0) if spec.phases == 3 else spec.voltage_v


def _line_voltage(spec: CircuitSpec) -> float:
    return spec.voltage_v if spec.phases == 3 else spec.voltage_v * math.sqrt(3.0)


def star_delta_cables(spec: CircuitSpec, config: SizingConfig) -> bool:
    """A 3-phase motor on a star-delta starter at the board, wired with two cables
    (config ``star_delta_two_cables``, :mod:`.motor_start`)."""
    return (spec.load_type == "motor" and spec.phases == 3
            and bool(_cfg(config, "star_delta_two_cables", False))
            and is_star_delta(spec.extra_value("starter", _cfg(config, "default_starter", "dol"))))


def _clearing_time_s(spec: CircuitSpec, config: SizingConfig) -> float | None:
    return _extra_float(spec, "clearing_time_s", _cfg(config, "clearing_time_s", None))


# ---------------------------------------------------------------- preparation
# A check is prepared once per circuit (everything that does not depend on the
# cross-section: schedule fields, config values, starter data, fault level,
# Ze, Ia, U0, times), then evaluated per candidate size with a few float
# operations.  An input error met while preparing is kept and raised at the
# first evaluation, where the unprepared check would have raised it.  The
# public ``check_*`` functions below are the prepared checks evaluated once,
# so the selection and a direct call give the same Check.

#: IEC 60228:2004 Table 2 with the Annex B correction, memoised (pure function).
_resistance_ohm_per_km = lru_cache(maxsize=4096)(resistance_ohm_per_km)
#: IEC 60364-4-43:2008 Table 43A, memoised (pure function).
_k_value = lru_cache(maxsize=256)(k_value)
#: IEC 60364-5-54:2011 543.1, memoised (pure function of hashable arguments).
_protective_conductor = lru_cache(maxsize=4096)(protective_conductor)

_X_OHM_PER_M = REACTANCE_MOHM_PER_M / 1000.0


class PreparedShortCircuit:
    """Adiabatic withstand of the line conductors at the source's fault level, one circuit.

    The fault current is the source's (a fault at the cable's origin gives the
    most), the full current on each of parallel cables (conservative), for the
    device's clearing time (schedule ``clearing_time_s`` or the config); for a
    current-limiting device give its let-through I²t (``let_through_ka2s``,
    maker's data) instead.  With neither, the check is reported as not made:
    a current-limiting breaker or fuse lets through far less than the
    prospective current for a fixed time would suggest.  In the :class:`Check`,
    ``value`` is the least cross-section, ``limit`` the chosen one.
    """

    __slots__ = ("conductor", "insulation", "fault", "t", "let_through", "error")

    def __init__(self, spec: CircuitSpec, config: SizingConfig) -> None:
        self.conductor, self.insulation = spec.conductor, spec.insulation
        self.fault = _fault_ka(spec, config)
        self.t = self.let_through = None
        self.error: CableRouteError | None = None
        if self.fault is None:
            return
        try:
            self.t = _clearing_time_s(spec, config)
            self.let_through = _extra_float(spec, "let_through_ka2s", None)
        except CableRouteError as exc:
            self.error = exc

    def passes(self, csa_mm2: float) -> bool:
        """The outcome of the check for a cross-section [mm²]."""
        if self.fault is None:
            return True
        if self.error is not None:
            raise self.error
        k = _k_value(self.conductor, self.insulation, csa_mm2)
        if self.let_through is not None:
            return math.sqrt(self.let_through * 1e6) / k <= csa_mm2 + 1e-9
        if self.t is None:
            return True
        return adiabatic_min_csa_mm2(self.fault * 1000.0, self.t, k) <= csa_mm2 + 1e-9

    def check(self, csa_mm2: float) -> Check:
        """The full :class:`Check` for a cross-section [mm²]."""
        fault = self.fault
        if fault is None:
            return not_checked("short_circuit", "mm²", TABLE_43A_SOURCE,
                               "not checked: no fault level (schedule fault_ka or config "
                               "default_fault_ka)", csa_mm2)
        if self.error is not None:
            raise self.error
        t = self.t
        k = _k_value(self.conductor, self.insulation, csa_mm2)
        let_through = self.let_through
        if let_through is not None:
            # t < 0.1 s or current-limiting device: k²S² >= I²t let through by the
            # device (maker's data), IEC 60364-4-43:2008 434.5.2.
            need = math.sqrt(let_through * 1e6) / k
            passed = need <= csa_mm2 + 1e-9
            message = "" if passed else (
                f"{csa_mm2:g} mm² does not withstand the device's let-through "
                f"{let_through:g} kA²s: needs {need:.1f} mm² (k²S² >= I²t, k = {k:g})")
            return Check("short_circuit", passed, need, csa_mm2, "mm²",
                         f"{TABLE_43A_SOURCE}; I²t {let_through:g} kA²s (schedule), k {k:g}", message)
        if t is None:
            return not_checked("short_circuit", "mm²", TABLE_43A_SOURCE,
                               "not checked: give the device's clearing time (clearing_time_s) or "
                               "its let-through I²t (let_through_ka2s, maker's data)", csa_mm2)
        need = adiabatic_min_csa_mm2(fault * 1000.0, t, k)
        passed = need <= csa_mm2 + 1e-9
        message = "" if passed else (
            f"{csa_mm2:g} mm² does not withstand {fault:g} kA for {t:g} s: needs "
            f"{need:.1f} mm² (S = I√t/k, k = {k:g})")
        return Check("short_circuit", passed, need, csa_mm2, "mm²",
                     f"{TABLE_43A_SOURCE}; I {fault:g} kA, t {t:g} s (device clearing time), k {k:g}", message)


class PreparedMotorStart:
    """Voltage dip at the motor terminals while starting, within the config limit, one circuit.

    The dip is :func:`.motor_start.starting_dip_percent` with its
    size-independent terms computed once (same operations, same order).
    """

    __slots__ = ("applicable", "error", "circuit_id", "starter", "limit", "fault", "conductor",
                 "temp", "voltage_v", "pf", "a_v", "x_sin", "source_v", "source_error")

    def __init__(self, spec: CircuitSpec, config: SizingConfig, design_current_a: float,
                 voltage_v: float, conductor_temp_c: float) -> None:
        self.applicable = spec.load_type == "motor"
        self.error: CableRouteError | None = None
        if not self.applicable:
            return
        kind = spec.extra_value("starter", _cfg(config, "default_starter", "dol"))
        try:
            starter = starter_data(kind, _cfg(config, "starters", None))
        except CableRouteError as exc:
            self.error = CircuitInputError(f"circuit {spec.circuit_id}: {exc}")
            return
        self.starter = starter
        self.limit: float = _cfg(config, "motor_start_dip_pct", 15.0)
        fault = _fault_ka(spec, config) if _cfg(config, "motor_start_include_source", True) else None
        self.fault = fault
        self.conductor, self.temp, self.voltage_v = spec.conductor, conductor_temp_c, voltage_v
        phases = spec.phases
        i_st = starter.current_multiple * design_current_a
        pf = starter.power_factor
        b = math.sqrt(3.0) if phases == 3 else 2.0
        self.pf = pf
        # voltage_drop_v(i_st, L, S, ...) = b I L (r cos + x sin) / n; star-delta with
        # two cables: the star current goes out in one cable and back in the other
        self.a_v = b * i_st * spec.design_length_m
        if star_delta_cables(spec, config):
            self.a_v *= STAR_DELTA_START_DROP_FACTOR
        self.x_sin = _X_OHM_PER_M * math.sqrt(max(0.0, 1.0 - pf * pf))
        self.source_v = 0.0
        self.source_error: CableRouteError | None = None
        if fault:
            try:
                line_voltage = voltage_v if phases == 3 else voltage_v * math.sqrt(3.0)
                zq = source_impedance_ohm(fault, line_voltage)
            except CableRouteError as exc:
                self.source_error = exc
            else:
                xq = zq / math.sqrt(1.0 + SOURCE_R_OVER_X**2)
                rq = SOURCE_R_OVER_X * xq
                sin_phi = math.sqrt(max(0.0, 1.0 - pf**2))
                self.source_v = b * i_st * (rq * pf + xq * sin_phi)

    def dip_percent(self, csa_mm2: float, parallel: int) -> float:
        """Starting dip [%] for a cross-section [mm²] and parallel count."""
        if self.error is not None:
            raise self.error
        r = _resistance_ohm_per_km(csa_mm2, self.conductor, self.temp) / 1000.0
        dip_v = self.a_v * (r * self.pf + self.x_sin) / parallel
        if self.fault:
            if self.source_error is not None:
                raise self.source_error
            dip_v += self.source_v
        return 100.0 * dip_v / self.voltage_v

    def passes(self, csa_mm2: float, parallel: int) -> bool:
        """The outcome of the check (True when not applicable)."""
        if not self.applicable:
            return True
        return self.dip_percent(csa_mm2, parallel) <= self.limit + 1e-9

    def check(self, csa_mm2: float, parallel: int) -> Check:
        """The full :class:`Check` (or :func:`not_applicable`)."""
        if not self.applicable:
            return not_applicable("motor_start", "not a motor")
        dip = self.dip_percent(csa_mm2, parallel)
        limit, starter, fault = self.limit, self.starter, self.fault
        passed = dip <= limit + 1e-9
        message = "" if passed else (
            f"starting dip {dip:.1f} % exceeds the {limit:g} % limit ({starter.source}); "
            "a larger cable, a reduced-current starter or a stiffer supply is needed")
        src = (f"IEC 60364-5-52:2009 525 and Annex G formula at the starting current; "
               f"{starter.source}; limit {limit:g} % (common practice)")
        if fault:
            src += f"; source impedance from {fault:g} kA (IEC 60909-0:2016 6.2)"
        return Check("motor_start", passed, dip, limit, "%", src, message)


class PreparedProtectiveConductor:
    """The protective-conductor rule of a circuit (:func:`.protective_conductor.protective_conductor`)."""

    __slots__ = ("args", "error")

    def __init__(self, spec: CircuitSpec, config: SizingConfig) -> None:
        self.error: CableRouteError | None = None
        self.args: tuple[str | float | None, ...] = (spec.conductor, spec.insulation, "table")
        if _cfg(config, "pe_rule", "table") == "adiabatic":
            fault = _fault_ka(spec, config)
            if fault:
                try:
                    self.args = (spec.conductor, spec.insulation, "adiabatic", fault * 1000.0,
                                 _clearing_time_s(spec, config))
                except CableRouteError as exc:
                    self.error = exc

    def pe(self, csa_mm2: float) -> ProtectiveConductor:
        """The PE of a line conductor of ``csa_mm2`` [mm²]."""
        if self.error is not None:
            raise self.error
        return _protective_conductor(csa_mm2, *self.args)

    def check(self, csa_mm2: float) -> Check:
        """The reported :class:`Check`: ``value`` required, ``limit`` chosen [mm²]."""
        pe = self.pe(csa_mm2)
        return Check("protective_conductor", True, pe.required_mm2, pe.csa_mm2, "mm²",
                     f"{pe.source} ({pe.rule})", "")


class PreparedDisconnection:
    """Earth-fault disconnection in TN systems, Zs x Ia <= U0 (411.4.4), one circuit.

    In the :class:`Check`, ``value`` is Zs and ``limit`` U0/Ia [Ω]; the message of
    a failure gives the longest length that still disconnects and the advice.
    """

    __slots__ = ("text", "error", "pe", "u0", "length_m", "conductor", "insulation", "kind",
                 "rating_a", "ze", "ze_source", "ze_assumed", "curve", "magnetic", "final", "vf",
                 "tn_error", "zs_max", "temp", "last", "multiple", "tolerance", "one_line",
                 "upsize_limited")

    def __init__(self, spec: CircuitSpec, config: SizingConfig, device: DeviceSelection,
                 pe: PreparedProtectiveConductor) -> None:
        self.pe = pe
        self.last: tuple[float, int, DisconnectionResult | str] | tuple[()] = ()
        self.upsize_limited: int | None = None  # set by the selection when upsizing stopped
        self.text: str | None = None
        self.error: CableRouteError | None = None
        self.ze_assumed = False
        # star-delta pair: the faulted winding conductor is in one cable only (conservative)
        self.one_line = star_delta_cables(spec, config)
        earthing = _earthing(spec, config)
        if not earthing.startswith("TN"):
            self.text = f"not checked: earthing {earthing} (only TN systems are handled)"
            return
        try:
            self.ze, self.ze_source, self.ze_assumed = _ze_ohm(spec, config)
            self.curve = spec.extra_value("curve", _cfg(config, "breaker_curve", "C"))
            self.magnetic = _extra_float(spec, "magnetic_a", _cfg(config, "magnetic_a", None))
        except CableRouteError as exc:
            self.error = exc
            return
        self.u0 = _u0(spec)
        self.length_m, self.conductor, self.insulation = (
            spec.design_length_m, spec.conductor, spec.insulation)
        self.kind, self.rating_a = device.kind, device.rating_a
        self.final = spec.load_type != "feeder"
        self.vf = _cfg(config, "disconnection_voltage_factor", 1.0)
        self.multiple = _cfg(config, "industrial_instantaneous_multiple",
                             INDUSTRIAL_INSTANTANEOUS_MULTIPLE)
        self.tolerance = _cfg(config, "instantaneous_tolerance", INSTANTANEOUS_TOLERANCE)
        # The size-independent steps of check_disconnection_tn, in its order.
        self.tn_error: CableRouteError | None = None
        try:
            time_s = max_disconnection_time_s(self.u0, self.rating_a, self.final)
            ia, _ = device_ia_a(self.kind, self.rating_a, time_s, self.curve, self.magnetic,
                                self.multiple, self.tolerance)
            self.temp = fault_loop_temperature_c(self.insulation)
            self.zs_max: float = self.vf * self.u0 / ia
        except CableRouteError as exc:
            self.tn_error = exc

    def passes(self, csa_mm2: float, parallel: int) -> bool:
        """The outcome of the check (True when it cannot be made)."""
        if self.text is not None:
            return True
        if self.error is not None:
            raise self.error
        if self.one_line:
            parallel = 1
        pe = self.pe.pe(csa_mm2)
        if self.tn_error is not None:
            return True
        try:
            r_line = _resistance_ohm_per_km(csa_mm2, self.conductor, self.temp)
            r_pe = _resistance_ohm_per_km(pe.csa_mm2, self.conductor, self.temp)
        except CableRouteError:
            return True
        # loop_resistance_ohm_per_m, loop_impedance_ohm (same operations)
        r = (r_line + r_pe) / 1000.0 / parallel
        x = 2 * REACTANCE_MOHM_PER_M / 1000.0 / parallel
        zs = self.ze + self.length_m * math.hypot(r, x)
        return zs <= self.zs_max + 1e-12

    def result(self, csa_mm2: float, parallel: int) -> DisconnectionResult | str:
        """The :class:`.disconnection.DisconnectionResult`, or why it was not checked."""
        if self.text is not None:
            return self.text
        if self.error is not None:
            raise self.error
        if self.one_line:
            parallel = 1
        if self.last and self.last[0] == csa_mm2 and self.last[1] == parallel:
            return self.last[2]
        pe = self.pe.pe(csa_mm2)
        try:
            res = check_disconnection_tn(
                self.u0, self.length_m, csa_mm2, pe.csa_mm2, self.conductor,
                self.insulation, self.kind, self.rating_a, self.ze, parallel,
                curve=self.curve, magnetic_a=self.magnetic, final_circuit=self.final,
                voltage_factor=self.vf, industrial_multiple=self.multiple,
                tolerance=self.tolerance,
            )
        except CableRouteError as exc:
            out: DisconnectionResult | str = f"not checked: {exc}"
        else:
            out = DisconnectionResult(
                res.passed, res.zs_ohm, res.zs_max_ohm, res.ia_a, res.time_s, res.max_length_m,
                res.earth_fault_a,
                f"{res.source}; Ze {self.ze:.3f} Ω ({self.ze_source}); PE {pe.csa_mm2:g} mm²")
        self.last = (csa_mm2, parallel, out)
        return out

    def check(self, csa_mm2: float, parallel: int) -> Check:
        """The full :class:`Check`."""
        return _disconnection_check(self.result(csa_mm2, parallel), self.upsize_limited)


def _disconnection_check(res: DisconnectionResult | str, upsize_limited: int | None = None) -> Check:
    if isinstance(res, str):
        return not_checked("disconnection", "Ω", "IEC 60364-4-41:2005 411.4.4", res)
    advice = DISCONNECTION_ADVICE if upsize_limited is None else (
        f"a cable up to {upsize_limited} standard sizes larger would not do either "
        "([sizing] disconnection_upsize_max_steps): protect the circuit with a residual-current "
        "device (IEC 60364-4-41:2005 411.4.5) or lower the magnetic setting")
    message = "" if res.passed else (
        f"earth-fault loop {res.zs_ohm:.3f} Ω exceeds {res.zs_max_ohm:.3f} Ω "
        f"(Ia {res.ia_a:g} A within {res.time_s:g} s): the circuit disconnects only up to "
        f"{res.max_length_m:.0f} m; {advice}")
    return Check("disconnection", res.passed, res.zs_ohm, res.zs_max_ohm, "Ω", res.source, message)


class PreparedMotorTrip:
    """A motor's start against the instantaneous release of its breaker, one circuit.

    A start draws I_st = m Ib (the starter's multiple) with an asymmetrical
    first peak ip = κ √2 I_st, κ = 1.02 + 0.98 e^(-3 R/X) with R/X of the
    starting cos φ (the peak factor of IEC 60909-0 applied to the motor's
    inrush: common practice).  The release holds below its no-trip current
    I_nt (IEC 60898-1:2015 Table 7 lower limit, or (1 - tolerance) x Ii of an
    IEC 60947-2 release), so the start passes when ip <= √2 I_nt.  In the
    :class:`Check`, ``value`` is ip and ``limit`` √2 I_nt [A peak].  Not
    applicable to non-motors, drives (the drive limits the current) and fuse
    or overload-relay protection (no instantaneous release).
    """

    __slots__ = ("applicable", "why", "error", "peak_a", "limit_a", "source", "advice")

    def __init__(self, spec: CircuitSpec, config: SizingConfig, design_current_a: float,
                 device: DeviceSelection) -> None:
        self.error: CableRouteError | None = None
        self.why = ""
        self.applicable = False
        if spec.load_type != "motor":
            self.why = "not a motor"
            return
        if device.kind not in ("breaker", "motor_breaker"):
            self.why = f"{device.kind}: no instantaneous release"
            return
        kind = spec.extra_value("starter", _cfg(config, "default_starter", "dol"))
        try:
            starter = starter_data(kind, _cfg(config, "starters", None))
            curve = spec.extra_value("curve", _cfg(config, "breaker_curve", "C"))
            magnetic = _extra_float(spec, "magnetic_a", _cfg(config, "magnetic_a", None))
            trip = instantaneous_trip(
                device.rating_a, curve, magnetic, device.kind,
                _cfg(config, "industrial_instantaneous_multiple", INDUSTRIAL_INSTANTANEOUS_MULTIPLE),
                _cfg(config, "instantaneous_tolerance", INSTANTANEOUS_TOLERANCE))
        except CableRouteError as exc:
            self.error = CircuitInputError(f"circuit {spec.circuit_id}: {exc}")
            self.applicable = True
            return
        if starter_kind(kind) == "drive":
            self.why = "variable-speed drive: the drive limits the starting current"
            return
        self.applicable = True
        pf = starter.power_factor
        sin_phi = math.sqrt(max(0.0, 1.0 - pf * pf))
        kappa = peak_factor(pf / sin_phi if sin_phi > 0 else math.inf)
        i_st = starter.current_multiple * design_current_a
        self.peak_a = kappa * math.sqrt(2.0) * i_st
        self.limit_a = math.sqrt(2.0) * trip.no_trip_a
        self.source = (f"starting peak κ √2 I_st, κ = 1.02 + 0.98 e^(-3R/X) = {kappa:.2f} "
                       f"(IEC 60909-0:2016 peak factor, applied to the inrush: common practice), "
                       f"I_st {i_st:.0f} A ({starter.source}); release: {trip.description}")
        self.advice = ("use a motor-protection breaker (device_kind motor_breaker), a higher "
                       "instantaneous setting (magnetic_a, curve D) or a reduced-current starter")

    def check(self) -> Check:
        """The :class:`Check` (or :func:`not_applicable`)."""
        if not self.applicable:
            return not_applicable("motor_start_trip", self.why)
        if self.error is not None:
            raise self.error
        passed = self.peak_a <= self.limit_a + 1e-9
        message = "" if passed else (
            f"the starting peak {self.peak_a:.0f} A reaches the instantaneous release "
            f"(holds up to {self.limit_a:.0f} A peak): the breaker trips when the motor "
            f"starts; {self.advice}")
        return Check("motor_start_trip", passed, self.peak_a, self.limit_a, "A", self.source, message)


class PreparedChecks:
    """Every check of :mod:`.checks` prepared for one circuit.

    Parameters
    ----------
    spec : CircuitSpec
    config : SizingConfig
    design_current_a : float
        Ib [A].
    device : DeviceSelection
    voltage_v : float
        Nominal voltage of the circuit [V].
    conductor_temp_c : float
        Conductor temperature for the voltage drop and motor dip [°C].
    """

    __slots__ = ("spec", "config", "short_circuit", "motor_start", "pe", "disconnection",
                 "disconnection_upsize", "motor_trip")

    def __init__(self, spec: CircuitSpec, config: SizingConfig, design_current_a: float,
                 device: DeviceSelection, voltage_v: float, conductor_temp_c: float) -> None:
        self.spec, self.config = spec, config
        self.short_circuit = PreparedShortCircuit(spec, config)
        self.motor_start = PreparedMotorStart(spec, config, design_current_a, voltage_v,
                                              conductor_temp_c)
        self.pe = PreparedProtectiveConductor(spec, config)
        self.disconnection = PreparedDisconnection(spec, config, device, self.pe)
        self.motor_trip = PreparedMotorTrip(spec, config, design_current_a, device)
        self.disconnection_upsize = bool(_cfg(config, "disconnection_upsize", True))

    def report(self, csa_mm2: float, parallel: int) -> list[Check]:
        """The applicable checks of the chosen cable after voltage drop: short circuit,
        motor start (motors only), disconnection, protective conductor."""
        out = [self.short_circuit.check(csa_mm2)]
        motor = self.motor_start.check(csa_mm2, parallel)
        if is_applicable(motor):
            out.append(motor)
        trip = self.motor_trip.check()
        if is_applicable(trip):
            out.append(trip)
        out.append(self.disconnection.check(csa_mm2, parallel))
        out.append(self.pe.check(csa_mm2))
        return out

    def extras(self, csa_mm2: float, parallel: int) -> dict[str, Any]:
        """Further numbers of the result (:class:`.model.SizingResult` fields).

        ``protective_conductor_mm2``, ``max_length_m`` (earth-fault disconnection),
        ``earth_fault_loop_ohm``, ``fault_current_ka_source``,
        ``fault_current_ka_load_end`` (maximum, conductors at 20 °C, cmax),
        ``fault_current_ka_load_end_min`` (cmin, conductors at the end-of-fault
        temperature), both three-phase for a 3-phase circuit and line-to-neutral
        (:func:`.short_circuit.fault_current_line_neutral_ka`) for a 1-phase one;
        ``fault_current_ka_load_end_earth_min`` (U0 / Zs of the disconnection
        check, line-to-earth in TN), ``motor_start_dip_pct``,
        ``motor_start_peak_a``, ``ze_assumed``; ``None`` where not computed.
        """
        spec, config = self.spec, self.config
        out: dict[str, Any] = {
            "protective_conductor_mm2": None, "max_length_m": None, "earth_fault_loop_ohm": None,
            "fault_current_ka_source": None, "fault_current_ka_load_end": None,
            "fault_current_ka_load_end_min": None, "fault_current_ka_load_end_earth_min": None,
            "motor_start_dip_pct": None, "motor_start_peak_a": None,
            "ze_assumed": self.disconnection.ze_assumed,
        }
        try:
            out["protective_conductor_mm2"] = self.pe.pe(csa_mm2).csa_mm2
            res = self.disconnection.result(csa_mm2, parallel)
            if not isinstance(res, str):
                out["max_length_m"] = res.max_length_m
                out["earth_fault_loop_ohm"] = res.zs_ohm
                out["fault_current_ka_load_end_earth_min"] = res.earth_fault_a / 1000.0
            fault = _fault_ka(spec, config)
            if fault:
                out["fault_current_ka_source"] = fault
                out.update(load_end_fault_ka(spec, config, fault, csa_mm2, parallel))
            if self.motor_start.applicable:
                out["motor_start_dip_pct"] = self.motor_start.dip_percent(csa_mm2, parallel)
            if self.motor_trip.applicable and self.motor_trip.error is None:
                out["motor_start_peak_a"] = self.motor_trip.peak_a
        except CableRouteError:
            pass  # the checks themselves report what could not be computed
        return out


def load_end_fault_ka(spec: CircuitSpec, config: SizingConfig, source_fault_ka: float,
                      csa_mm2: float, parallel: int) -> dict[str, float]:
    """Maximum and minimum fault current at the load end of a circuit [kA].

    3 phases: the three-phase fault (:func:`.short_circuit.fault_current_ka`);
    1 phase: the line-to-neutral fault through line and neutral
    (:func:`.short_circuit.fault_current_line_neutral_ka`).  Maximum: cmax,
    conductors at 20 °C; minimum: cmin, conductors at the end-of-fault
    temperature of Table 43A (IEC 60909-0:2016 clauses 7 and 8).
    """
    c_max = _cfg(config, "c_max", 1.05)
    c_min = _cfg(config, "c_min", 0.95)
    line_v = _line_voltage(spec)
    hot = FAULT_TEMPERATURE_C[spec.insulation]
    length = spec.design_length_m
    if spec.phases == 1:
        z0 = _cfg(config, "source_z0_over_z1", SOURCE_Z0_OVER_Z1)
        return {
            "fault_current_ka_load_end": fault_current_line_neutral_ka(
                source_fault_ka, line_v, length, csa_mm2, spec.conductor, parallel, 20.0,
                c_max, c_max, z0_over_z1=z0),
            "fault_current_ka_load_end_min": fault_current_line_neutral_ka(
                source_fault_ka, line_v, length, csa_mm2, spec.conductor, parallel, hot,
                c_min, c_max, z0_over_z1=z0),
        }
    return {
        "fault_current_ka_load_end": fault_current_ka(
            source_fault_ka, line_v, length, csa_mm2, spec.conductor, parallel, 20.0, c_max, c_max),
        "fault_current_ka_load_end_min": fault_current_ka(
            source_fault_ka, line_v, length, csa_mm2, spec.conductor, parallel, hot, c_min, c_max),
    }


# --------------------------------------------------------------- disconnection
def _earthing(spec: CircuitSpec, config: SizingConfig) -> str:
    return str(spec.extra_value("earthing", _cfg(config, "earthing", "TN"))).upper().replace("_", "-")


def _ze_ohm(spec: CircuitSpec, config: SizingConfig) -> tuple[float, str, bool]:
    """(Ze [Ω], where it comes from, whether it is the config's assumption)."""
    ze = _extra_float(spec, "ze_ohm", None)
    if ze is not None:
        return ze, "schedule ze_ohm", False
    ze = _cfg(config, "ze_ohm", None)
    if ze is not None:
        return float(ze), "config ze_ohm", False
    fault = _fault_ka(spec, config)
    if fault:
        # Loop = line + return path upstream, each taken as the source's phase
        # impedance (common practice when only the three-phase level is known).
        zq = source_impedance_ohm(fault, _line_voltage(spec), _cfg(config, "c_max", 1.05))
        return 2.0 * zq, f"2 x ZQ from {fault:g} kA (common practice)", False
    assumed = float(_cfg(config, "assumed_ze_ohm", 0.8))
    return (assumed, "assumed: neither ze_ohm nor fault_ka given, config assumed_ze_ohm "
            "(typical maximum of a public TN-S supply, from memory)", True)


#: Message of a result whose Ze is the config's assumption.
ZE_ASSUMED_MESSAGE = (
    "Ze assumed {ze:g} Ω (neither ze_ohm nor fault_ka given; config assumed_ze_ohm): "
    "give the measured or declared Ze")
