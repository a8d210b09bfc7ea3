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
=====================  ========================================  =====================

A check that does not apply to a circuit (a non-motor for ``motor_start``)
returns :func:`not_applicable`; the selection leaves it out of the result.  A
check that cannot be made (no data) passes with a message starting
"not checked", which the result reports as a warning.

Per-circuit inputs come from the schedule's further columns
(``CircuitSpec.extra``): ``starter``, ``curve``, ``ze_ohm``, ``magnetic_a``,
``earthing``, ``clearing_time_s``; defaults from :class:`.config.SizingConfig`.
"""

from __future__ import annotations

import math
from functools import lru_cache
from typing import TYPE_CHECKING, Any

from cablewright.extract.errors import CableRouteError, CircuitInputError, UnknownKeyError

from .conductor_resistance import resistance_ohm_per_km
from .disconnection import (
    DisconnectionResult,
    breaker_ia_a,
    check_disconnection_tn,
    fault_loop_temperature_c,
    fuse_ia_a,
    max_disconnection_time_s,
)
from .model import Check, CircuitSpec
from .motor_start import starter_data
from .protective_conductor import ProtectiveConductor, protective_conductor
from .short_circuit import (
    FAULT_TEMPERATURE_C,
    SOURCE_R_OVER_X,
    TABLE_43A_SOURCE,
    adiabatic_min_csa_mm2,
    fault_current_ka,
    k_value,
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
    "PreparedChecks",
]

NOT_APPLICABLE = "not applicable"
DISCONNECTION_ADVICE = (
    "use a larger conductor, a lower magnetic setting or a residual-current device "
    "(IEC 60364-4-41:2005 411.5 / 411.4.5)"
)


def not_applicable(name: str, why: str) -> Check:
    """A passing :class:`Check` that the selection leaves out of the result."""
    return Check(name, True, 0.0, 0.0, "", NOT_APPLICABLE, why)


def is_applicable(check: Check) -> bool:
    """False for :func:`not_applicable` checks."""
    return check.source != NOT_APPLICABLE


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
            return Check("short_circuit", True, 0.0, csa_mm2, "mm²", TABLE_43A_SOURCE,
                         "not checked: no fault level (schedule fault_ka or config default_fault_ka)")
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
            return Check("short_circuit", True, 0.0, csa_mm2, "mm²", TABLE_43A_SOURCE,
                         "not checked: give the device's clearing time (clearing_time_s) or its "
                         "let-through I²t (let_through_ka2s, maker's data)")
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
        self.limit = _cfg(config, "motor_start_dip_pct", 15.0)
        fault = _fault_ka(spec, config) if _cfg(config, "motor_start_include_source", True) else None
        self.fault = fault
        self.conductor, self.temp, self.voltage_v = spec.conductor, conductor_temp_c, voltage_v
        phases = spec.phases
        i_st = starter.current_multiple * design_current_a
        pf = starter.power_factor
        b = math.sqrt(3.0) if phases == 3 else 2.0
        self.pf = pf
        # voltage_drop_v(i_st, L, S, ...) = b I L (r cos + x sin) / n
        self.a_v = b * i_st * spec.design_length_m
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
        self.args: tuple = (spec.conductor, spec.insulation, "table")
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
                 "rating_a", "ze", "ze_source", "curve", "magnetic", "final", "vf", "tn_error",
                 "zs_max", "temp", "last", "upsize_limited")

    def __init__(self, spec: CircuitSpec, config: SizingConfig, device: DeviceSelection,
                 pe: PreparedProtectiveConductor) -> None:
        self.pe = pe
        self.last: tuple = ()
        self.upsize_limited: int | None = None  # set by the selection when upsizing stopped
        self.text: str | None = None
        self.error: CableRouteError | None = None
        earthing = _earthing(spec, config)
        if not earthing.startswith("TN"):
            self.text = f"not checked: earthing {earthing} (only TN systems are handled)"
            return
        try:
            self.ze, self.ze_source = _ze_ohm(spec, config)
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
        # The size-independent steps of check_disconnection_tn, in its order.
        self.tn_error: CableRouteError | None = None
        try:
            time_s = max_disconnection_time_s(self.u0, self.rating_a, self.final)
            if self.kind == "breaker":
                ia, _ = breaker_ia_a(self.rating_a, self.curve, self.magnetic)
            elif self.kind == "fuse":
                ia, _ = fuse_ia_a(self.rating_a, time_s)
            else:
                raise UnknownKeyError(f"device kind {self.kind!r} is unknown: use breaker or fuse")
            self.temp = fault_loop_temperature_c(self.insulation)
            self.zs_max = self.vf * self.u0 / ia
        except CableRouteError as exc:
            self.tn_error = exc

    def passes(self, csa_mm2: float, parallel: int) -> bool:
        """The outcome of the check (True when it cannot be made)."""
        if self.text is not None:
            return True
        if self.error is not None:
            raise self.error
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
        if self.last and self.last[0] == csa_mm2 and self.last[1] == parallel:
            return self.last[2]
        pe = self.pe.pe(csa_mm2)
        try:
            res = check_disconnection_tn(
                self.u0, self.length_m, csa_mm2, pe.csa_mm2, self.conductor,
                self.insulation, self.kind, self.rating_a, self.ze, parallel,
                curve=self.curve, magnetic_a=self.magnetic, final_circuit=self.final,
                voltage_factor=self.vf,
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
        return Check("disconnection", True, 0.0, 0.0, "Ω", "IEC 60364-4-41:2005 411.4.4", res)
    advice = DISCONNECTION_ADVICE if upsize_limited is None else (
        f"a cable up to {upsize_limited} standard sizes larger would not do either "
        "([sizing] disconnection_upsize_max_steps): protect the circuit with a residual-current "
        "device (IEC 60364-4-41:2005 411.4.5) or lower the magnetic setting")
    message = "" if res.passed else (
        f"earth-fault loop {res.zs_ohm:.3f} Ω exceeds {res.zs_max_ohm:.3f} Ω "
        f"(Ia {res.ia_a:g} A within {res.time_s:g} s): the circuit disconnects only up to "
        f"{res.max_length_m:.0f} m; {advice}")
    return Check("disconnection", res.passed, res.zs_ohm, res.zs_max_ohm, "Ω", res.source, message)


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
                 "disconnection_upsize")

    def __init__(self, spec: CircuitSpec, config: SizingConfig, design_current_a: float,
                 device: DeviceSelection, voltage_v: float, conductor_temp_c: float) -> None:
        self.spec, self.config = spec, config
        self.short_circuit = PreparedShortCircuit(spec, config)
        self.motor_start = PreparedMotorStart(spec, config, design_current_a, voltage_v,
                                              conductor_temp_c)
        self.pe = PreparedProtectiveConductor(spec, config)
        self.disconnection = PreparedDisconnection(spec, config, device, self.pe)
        self.disconnection_upsize = bool(_cfg(config, "disconnection_upsize", True))

    def upsize_passes(self, name: str, csa_mm2: float, parallel: int) -> bool:
        """The outcome of the upsize check ``name``: short_circuit, motor_start, disconnection."""
        if name == "short_circuit":
            return self.short_circuit.passes(csa_mm2)
        if name == "motor_start":
            return self.motor_start.passes(csa_mm2, parallel)
        if name == "disconnection":
            return not self.disconnection_upsize or self.disconnection.passes(csa_mm2, parallel)
        raise KeyError(name)

    def report(self, csa_mm2: float, parallel: int) -> list[Check]:
        """The applicable checks of the chosen cable after voltage drop: short circuit,
        motor start (motors only), disconnection, protective conductor."""
        out = [self.short_circuit.check(csa_mm2)]
        motor = self.motor_start.check(csa_mm2, parallel)
        if is_applicable(motor):
            out.append(motor)
        out.append(self.disconnection.check(csa_mm2, parallel))
        out.append(self.pe.check(csa_mm2))
        return out

    def extras(self, csa_mm2: float, parallel: int) -> dict[str, float | None]:
        """Further numbers of the result (:class:`.model.SizingResult` fields).

        ``protective_conductor_mm2``, ``max_length_m`` (earth-fault disconnection),
        ``earth_fault_loop_ohm``, ``fault_current_ka_source``,
        ``fault_current_ka_load_end`` (maximum, conductors at 20 °C, cmax),
        ``fault_current_ka_load_end_min`` (cmin, conductors at the end-of-fault
        temperature), ``motor_start_dip_pct``; ``None`` where not computed.
        """
        spec, config = self.spec, self.config
        out: dict[str, float | None] = {
            "protective_conductor_mm2": None, "max_length_m": None, "earth_fault_loop_ohm": None,
            "fault_current_ka_source": None, "fault_current_ka_load_end": None,
            "fault_current_ka_load_end_min": None, "motor_start_dip_pct": None,
        }
        try:
            out["protective_conductor_mm2"] = self.pe.pe(csa_mm2).csa_mm2
            res = self.disconnection.result(csa_mm2, parallel)
            if not isinstance(res, str):
                out["max_length_m"] = res.max_length_m
                out["earth_fault_loop_ohm"] = res.zs_ohm
            fault = _fault_ka(spec, config)
            if fault:
                c_max = _cfg(config, "c_max", 1.05)
                c_min = _cfg(config, "c_min", 0.95)
                line_v = _line_voltage(spec)
                out["fault_current_ka_source"] = fault
                out["fault_current_ka_load_end"] = fault_current_ka(
                    fault, line_v, spec.design_length_m, csa_mm2, spec.conductor, parallel,
                    20.0, c_max, c_max)
                out["fault_current_ka_load_end_min"] = fault_current_ka(
                    fault, line_v, spec.design_length_m, csa_mm2, spec.conductor, parallel,
                    FAULT_TEMPERATURE_C[spec.insulation], c_min, c_max)
            if self.motor_start.applicable:
                out["motor_start_dip_pct"] = self.motor_start.dip_percent(csa_mm2, parallel)
        except CableRouteError:
            pass  # the checks themselves report what could not be computed
        return out


# --------------------------------------------------------------- disconnection
def _earthing(spec: CircuitSpec, config: SizingConfig) -> str:
    return str(spec.extra_value("earthing", _cfg(config, "earthing", "TN"))).upper().replace("_", "-")


def _ze_ohm(spec: CircuitSpec, config: SizingConfig) -> tuple[float | None, str]:
    ze = _extra_float(spec, "ze_ohm", None)
    if ze is not None:
        return ze, "schedule ze_ohm"
    ze = _cfg(config, "ze_ohm", None)
    if ze is not None:
        return float(ze), "config ze_ohm"
    fault = _fault_ka(spec, config)
    if fault:
        # Loop = line + return path upstream, each taken as the source's phase
        # impedance (common practice when only the three-phase level is known).
        zq = source_impedance_ohm(fault, _line_voltage(spec), _cfg(config, "c_max", 1.05))
        return 2.0 * zq, f"2 x ZQ from {fault:g} kA (common practice)"
    return 0.0, "Ze not given, 0 taken: optimistic, give ze_ohm or fault_ka"
