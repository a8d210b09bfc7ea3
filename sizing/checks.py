"""The engineering checks beyond ampacity, in the form the selection runs them.

Each check has the ``UpsizeCheck`` signature of :mod:`.select`,
``(spec, cand, ctx, config) -> Check``, and wraps one pure module:

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
from dataclasses import replace
from typing import TYPE_CHECKING, Any

from cablewright.extract.errors import CableRouteError, CircuitInputError

from .disconnection import DisconnectionResult, check_disconnection_tn
from .model import Check, CircuitSpec
from .motor_start import starter_data, starting_dip_percent
from .protective_conductor import ProtectiveConductor, protective_conductor
from .short_circuit import (
    FAULT_TEMPERATURE_C,
    TABLE_43A_SOURCE,
    adiabatic_min_csa_mm2,
    fault_current_ka,
    k_value,
    source_impedance_ohm,
)

if TYPE_CHECKING:  # select.py imports this module; no import cycle at run time
    from .config import SizingConfig
    from .select import Candidate, SizingContext

__all__ = [
    "NOT_APPLICABLE",
    "not_applicable",
    "is_applicable",
    "DISCONNECTION_ADVICE",
    "check_short_circuit",
    "check_motor_start",
    "check_disconnection",
    "check_disconnection_upsize",
    "check_protective_conductor",
    "UPSIZE_EXTRA_CHECKS",
    "REPORT_CHECKS",
    "result_extras",
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


# --------------------------------------------------------------- short circuit
def check_short_circuit(spec: CircuitSpec, cand: Candidate, ctx: SizingContext,
                        config: SizingConfig) -> Check:
    """Adiabatic withstand of the line conductors at the source's fault level.

    The fault current is the source's (a fault at the cable's origin gives the
    most), the full current on each of parallel cables (conservative), for the
    device's clearing time (schedule ``clearing_time_s`` or the config); for a
    current-limiting device give its let-through I²t (``let_through_ka2s``,
    maker's data) instead.  With neither, the check is reported as not made:
    a current-limiting breaker or fuse lets through far less than the
    prospective current for a fixed time would suggest.  ``value`` is the least cross-section, ``limit`` the chosen one.
    """
    fault = _fault_ka(spec, config)
    if fault is None:
        return Check("short_circuit", True, 0.0, cand.csa_mm2, "mm²", TABLE_43A_SOURCE,
                     "not checked: no fault level (schedule fault_ka or config default_fault_ka)")
    t = _clearing_time_s(spec, config)
    k = k_value(spec.conductor, spec.insulation, cand.csa_mm2)
    let_through = _extra_float(spec, "let_through_ka2s", None)
    if let_through is not None:
        # t < 0.1 s or current-limiting device: k²S² >= I²t let through by the
        # device (maker's data), IEC 60364-4-43:2008 434.5.2.
        need = math.sqrt(let_through * 1e6) / k
        passed = need <= cand.csa_mm2 + 1e-9
        message = "" if passed else (
            f"{cand.csa_mm2:g} mm² does not withstand the device's let-through "
            f"{let_through:g} kA²s: needs {need:.1f} mm² (k²S² >= I²t, k = {k:g})")
        return Check("short_circuit", passed, need, cand.csa_mm2, "mm²",
                     f"{TABLE_43A_SOURCE}; I²t {let_through:g} kA²s (schedule), k {k:g}", message)
    if t is None:
        return Check("short_circuit", True, 0.0, cand.csa_mm2, "mm²", TABLE_43A_SOURCE,
                     "not checked: give the device's clearing time (clearing_time_s) or its "
                     "let-through I²t (let_through_ka2s, maker's data)")
    need = adiabatic_min_csa_mm2(fault * 1000.0, t, k)
    passed = need <= cand.csa_mm2 + 1e-9
    message = "" if passed else (
        f"{cand.csa_mm2:g} mm² does not withstand {fault:g} kA for {t:g} s: needs "
        f"{need:.1f} mm² (S = I√t/k, k = {k:g})")
    return Check("short_circuit", passed, need, cand.csa_mm2, "mm²",
                 f"{TABLE_43A_SOURCE}; I {fault:g} kA, t {t:g} s (config), k {k:g}", message)


# ----------------------------------------------------------------- motor start
def check_motor_start(spec: CircuitSpec, cand: Candidate, ctx: SizingContext,
                      config: SizingConfig) -> Check:
    """Voltage dip at the motor terminals while starting, within the config limit."""
    if spec.load_type != "motor":
        return not_applicable("motor_start", "not a motor")
    kind = spec.extra_value("starter", _cfg(config, "default_starter", "dol"))
    try:
        starter = starter_data(kind, _cfg(config, "starters", None))
    except CableRouteError as exc:
        raise CircuitInputError(f"circuit {spec.circuit_id}: {exc}") from None
    limit = _cfg(config, "motor_start_dip_pct", 15.0)
    fault = _fault_ka(spec, config) if _cfg(config, "motor_start_include_source", True) else None
    dip = starting_dip_percent(
        ctx.design_current_a, starter, spec.design_length_m, cand.csa_mm2, spec.conductor,
        ctx.voltage_v, spec.phases, cand.parallel, ctx.conductor_temp_c, fault)
    passed = dip <= limit + 1e-9
    message = "" if passed else (
        f"starting dip {dip:.1f} % exceeds the {limit:g} % limit ({starter.source}); "
        "a larger cable, a reduced-current starter or a stiffer supply is needed")
    src = (f"IEC 60364-5-52:2009 525 and Annex G formula at the starting current; "
           f"{starter.source}; limit {limit:g} % (common practice)")
    if fault:
        src += f"; source impedance from {fault:g} kA (IEC 60909-0:2016 6.2)"
    return Check("motor_start", passed, dip, limit, "%", src, message)


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


def _pe(spec: CircuitSpec, cand: Candidate, config: SizingConfig) -> ProtectiveConductor:
    rule = _cfg(config, "pe_rule", "table")
    if rule == "adiabatic":
        fault = _fault_ka(spec, config)
        if fault:
            return protective_conductor(cand.csa_mm2, spec.conductor, spec.insulation, "adiabatic",
                                        fault * 1000.0, _clearing_time_s(spec, config))
    return protective_conductor(cand.csa_mm2, spec.conductor, spec.insulation, "table")


def _disconnection(spec: CircuitSpec, cand: Candidate, ctx: SizingContext,
                   config: SizingConfig) -> DisconnectionResult | str:
    earthing = _earthing(spec, config)
    if not earthing.startswith("TN"):
        return f"not checked: earthing {earthing} (only TN systems are handled)"
    ze, ze_source = _ze_ohm(spec, config)
    curve = spec.extra_value("curve", _cfg(config, "breaker_curve", "C"))
    magnetic = _extra_float(spec, "magnetic_a", _cfg(config, "magnetic_a", None))
    pe = _pe(spec, cand, config)
    try:
        res = check_disconnection_tn(
            _u0(spec), spec.design_length_m, cand.csa_mm2, pe.csa_mm2, spec.conductor,
            spec.insulation, ctx.device.kind, ctx.device.rating_a, ze, cand.parallel,
            curve=curve, magnetic_a=magnetic, final_circuit=spec.load_type != "feeder",
            voltage_factor=_cfg(config, "disconnection_voltage_factor", 1.0),
        )
    except CableRouteError as exc:
        return f"not checked: {exc}"
    return replace(res, source=f"{res.source}; Ze {ze:.3f} Ω ({ze_source}); PE {pe.csa_mm2:g} mm²")


def check_disconnection(spec: CircuitSpec, cand: Candidate, ctx: SizingContext,
                        config: SizingConfig) -> Check:
    """Earth-fault disconnection in TN systems: Zs x Ia <= U0 (411.4.4).

    ``value`` is Zs, ``limit`` U0/Ia [Ω]; the message of a failure gives the
    longest length that still disconnects and the advice.
    """
    res = _disconnection(spec, cand, ctx, config)
    if isinstance(res, str):
        return Check("disconnection", True, 0.0, 0.0, "Ω", "IEC 60364-4-41:2005 411.4.4", res)
    message = "" if res.passed else (
        f"earth-fault loop {res.zs_ohm:.3f} Ω exceeds {res.zs_max_ohm:.3f} Ω "
        f"(Ia {res.ia_a:g} A within {res.time_s:g} s): the circuit disconnects only up to "
        f"{res.max_length_m:.0f} m; {DISCONNECTION_ADVICE}")
    return Check("disconnection", res.passed, res.zs_ohm, res.zs_max_ohm, "Ω", res.source, message)


def check_disconnection_upsize(spec: CircuitSpec, cand: Candidate, ctx: SizingContext,
                               config: SizingConfig) -> Check:
    """The disconnection check in the upsizing loop: only when the config asks."""
    if not _cfg(config, "disconnection_upsize", False):
        return not_applicable("disconnection", "reported, not upsized (config disconnection_upsize)")
    return check_disconnection(spec, cand, ctx, config)


# -------------------------------------------------------- protective conductor
def check_protective_conductor(spec: CircuitSpec, cand: Candidate, ctx: SizingContext,
                               config: SizingConfig) -> Check:
    """The protective conductor chosen (reported): ``value`` required, ``limit`` chosen [mm²]."""
    pe = _pe(spec, cand, config)
    return Check("protective_conductor", True, pe.required_mm2, pe.csa_mm2, "mm²",
                 f"{pe.source} ({pe.rule})", "")


#: Checks that raise the size, in order, for :data:`.select.UPSIZE_CHECKS`.
UPSIZE_EXTRA_CHECKS = {
    "short_circuit": check_short_circuit,
    "motor_start": check_motor_start,
    "disconnection": check_disconnection_upsize,
}
#: Checks run on the chosen cable only (same names replace the upsize entries).
REPORT_CHECKS = {
    "disconnection": check_disconnection,
    "protective_conductor": check_protective_conductor,
}


def result_extras(spec: CircuitSpec, cand: Candidate, ctx: SizingContext,
                  config: SizingConfig) -> dict[str, float | None]:
    """Further numbers of the result (new :class:`.model.SizingResult` fields).

    Returns
    -------
    dict
        ``protective_conductor_mm2``, ``max_length_m`` (earth-fault
        disconnection), ``earth_fault_loop_ohm``, ``fault_current_ka_source``,
        ``fault_current_ka_load_end`` (maximum, conductors at 20 °C, cmax),
        ``fault_current_ka_load_end_min`` (cmin, conductors at the end-of-fault
        temperature), ``motor_start_dip_pct``; ``None`` where not computed.
    """
    out: dict[str, float | None] = {
        "protective_conductor_mm2": None, "max_length_m": None, "earth_fault_loop_ohm": None,
        "fault_current_ka_source": None, "fault_current_ka_load_end": None,
        "fault_current_ka_load_end_min": None, "motor_start_dip_pct": None,
    }
    try:
        out["protective_conductor_mm2"] = _pe(spec, cand, config).csa_mm2
        res = _disconnection(spec, cand, ctx, config)
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
                fault, line_v, spec.design_length_m, cand.csa_mm2, spec.conductor, cand.parallel,
                20.0, c_max, c_max)
            out["fault_current_ka_load_end_min"] = fault_current_ka(
                fault, line_v, spec.design_length_m, cand.csa_mm2, spec.conductor, cand.parallel,
                FAULT_TEMPERATURE_C[spec.insulation], c_min, c_max)
        motor = check_motor_start(spec, cand, ctx, config)
        if is_applicable(motor):
            out["motor_start_dip_pct"] = motor.value
    except CableRouteError:
        pass  # the checks themselves report what could not be computed
    return out
