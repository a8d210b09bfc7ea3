"""Automatic disconnection on an earth fault in TN systems.

Condition of IEC 60364-4-41:2005 411.4.4: ``Zs x Ia <= U0``, with Ia the
current that operates the device within the time of Table 41.1 (final
circuits up to 32 A) or 5 s (distribution circuits and circuits above 32 A,
411.3.2.3).  The loop impedance Zs is the source loop impedance Ze plus the
line and protective conductors of the circuit at their temperature during the
fault.

References
----------
.. [1] IEC 60364-4-41:2005, Protection against electric shock, 411.3.2,
   411.4.4 and Table 41.1.
.. [2] IEC 60898-1:2015, Circuit-breakers for overcurrent protection for
   household and similar installations, Table 7 (instantaneous tripping).
.. [3] IEC 60269-1:2006, Low-voltage fuses, Table 3 (gates of gG fuse-links).
.. [4] IEC 60947-2:2016, Low-voltage switchgear, circuit-breakers, 8.3.3.1
   (instantaneous releases: adjustable settings, tolerance).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from cablewright.core.errors import OutOfRangeError, UnknownKeyError

from .conductor_resistance import resistance_ohm_per_km
from .short_circuit import FAULT_TEMPERATURE_C
from .voltage_drop import MAX_CONDUCTOR_TEMPERATURE_C, REACTANCE_MOHM_PER_M

__all__ = [
    "TABLE_41_1",
    "TABLE_41_1_SOURCE",
    "DISTRIBUTION_TIME_S",
    "BREAKER_INSTANTANEOUS_MULTIPLE",
    "BREAKER_NO_TRIP_MULTIPLE",
    "IEC_60898_MAX_RATING_A",
    "INDUSTRIAL_INSTANTANEOUS_MULTIPLE",
    "INSTANTANEOUS_TOLERANCE",
    "MOTOR_BREAKER_INSTANTANEOUS_MULTIPLE",
    "InstantaneousTrip",
    "instantaneous_trip",
    "GG_GATES",
    "FuseGate",
    "max_disconnection_time_s",
    "breaker_ia_a",
    "fuse_ia_a",
    "device_ia_a",
    "fault_loop_temperature_c",
    "loop_resistance_ohm_per_m",
    "loop_impedance_ohm",
    "max_length_m",
    "DisconnectionResult",
    "check_disconnection_tn",
]

TABLE_41_1_SOURCE = "IEC 60364-4-41:2005 411.3.2.2 and Table 41.1"

#: IEC 60364-4-41:2005 Table 41.1, maximum disconnection times [s] of final
#: circuits not exceeding 32 A, a.c.: rows (U0 lower bound exclusive, upper
#: bound inclusive [V]) -> {"TN": t, "TT": t}.
TABLE_41_1: tuple[tuple[float, float, dict[str, float]], ...] = (
    (50.0, 120.0, {"TN": 0.8, "TT": 0.3}),
    (120.0, 230.0, {"TN": 0.4, "TT": 0.2}),
    (230.0, 400.0, {"TN": 0.2, "TT": 0.07}),
    (400.0, math.inf, {"TN": 0.1, "TT": 0.04}),
)

#: Distribution circuits and circuits above 32 A: 5 s in TN systems
#: (IEC 60364-4-41:2005 411.3.2.3), 1 s in TT systems (411.3.2.4).
DISTRIBUTION_TIME_S = {"TN": 5.0, "TT": 1.0}

#: Upper limit of the instantaneous tripping range as a multiple of In,
#: IEC 60898-1:2015 Table 7: type B 3-5 In, C 5-10 In, D 10-20 In.  The upper
#: limit is the current that surely trips in < 0.1 s.
BREAKER_INSTANTANEOUS_MULTIPLE = {"B": 5.0, "C": 10.0, "D": 20.0}

#: Lower limit of the same ranges, IEC 60898-1:2015 Table 7: below this the
#: breaker does not trip instantaneously (it must not trip within 0.1 s).
BREAKER_NO_TRIP_MULTIPLE = {"B": 3.0, "C": 5.0, "D": 10.0}

#: IEC 60898-1:2015 clause 1 (scope): household-type breakers up to 125 A;
#: above that a circuit-breaker is an industrial one to IEC 60947-2.
IEC_60898_MAX_RATING_A = 125.0

#: Default instantaneous (magnetic) setting of an IEC 60947-2 breaker as a
#: multiple of In when the schedule gives no ``magnetic_a``: 10 In, the top of
#: the usual adjustable range (common practice, from memory: thermal-magnetic
#: releases about 5-10 In, electronic 1.5-12 In); the highest setting is the
#: conservative one for disconnection.  Config ``industrial_instantaneous_multiple``.
INDUSTRIAL_INSTANTANEOUS_MULTIPLE = 10.0

#: Tolerance of an instantaneous release about its setting: ±20 %,
#: IEC 60947-2:2016 8.3.3.1.2 (from memory: no public copy at hand).  The
#: breaker surely trips at 1.2 x the setting and surely holds below 0.8 x.
INSTANTANEOUS_TOLERANCE = 0.20

#: Instantaneous setting of a motor-protection circuit-breaker (IEC 60947-2 /
#: IEC 60947-4-1 with a fixed magnetic release) as a multiple of its current
#: setting: about 13 x (common practice, from memory of maker's data).
MOTOR_BREAKER_INSTANTANEOUS_MULTIPLE = 13.0


@dataclass(frozen=True)
class FuseGate:
    """Gates of a gG fuse-link, IEC 60269-1:2006 Table 3 [A].

    ``imax_5s_a``: the fuse surely melts within 5 s at this current;
    ``imax_0_1s_a``: within 0.1 s.
    """

    rating_a: float
    imin_10s_a: float
    imax_5s_a: float
    imin_0_1s_a: float
    imax_0_1s_a: float


#: IEC 60269-1:2006 Table 3, gates for specified pre-arcing times of gG
#: fuse-links, 16 A to 1250 A (from memory: no public copy was found to check).
GG_GATES: tuple[FuseGate, ...] = tuple(FuseGate(*row) for row in (
    (16, 33, 65, 85, 150),
    (20, 42, 85, 110, 200),
    (25, 52, 110, 150, 260),
    (32, 75, 150, 200, 350),
    (40, 95, 190, 260, 450),
    (50, 125, 250, 350, 610),
    (63, 160, 320, 450, 820),
    (80, 215, 425, 610, 1100),
    (100, 290, 580, 820, 1450),
    (125, 355, 715, 1100, 1910),
    (160, 460, 950, 1450, 2590),
    (200, 610, 1250, 1910, 3420),
    (250, 750, 1650, 2590, 4500),
    (315, 1050, 2200, 3420, 6000),
    (400, 1420, 2840, 4500, 8060),
    (500, 1780, 3800, 6000, 10600),
    (630, 2200, 5100, 8060, 14140),
    (800, 3060, 7000, 10600, 19000),
    (1000, 4000, 9500, 14140, 24000),
    (1250, 5000, 13000, 19000, 35000),
))
GG_GATES_SOURCE = "IEC 60269-1:2006 Table 3 (gG gates, from memory)"


def max_disconnection_time_s(
    u0_v: float, rating_a: float, final_circuit: bool = True, earthing: str = "TN"
) -> float:
    """Maximum disconnection time for fault protection [s].

    Parameters
    ----------
    u0_v : float
        Nominal a.c. voltage to earth U0 [V], > 50.
    rating_a : float
        Device rating In [A]; Table 41.1 holds for final circuits up to 32 A.
    final_circuit : bool
        False for a distribution circuit (feeder).
    earthing : str
        ``TN`` or ``TT``.

    Returns
    -------
    float
        t [s].

    Examples
    --------
    >>> max_disconnection_time_s(230, 20), max_disconnection_time_s(230, 63)
    (0.4, 5.0)
    >>> max_disconnection_time_s(230, 16, final_circuit=False)
    5.0
    >>> max_disconnection_time_s(400 / 3 ** 0.5, 16)  # 400 V system: nominal U0 230 V
    0.4

    References
    ----------
    .. [1] IEC 60364-4-41:2005, Table 41.1, 411.3.2.3 and 411.3.2.4.
    """
    if earthing not in DISTRIBUTION_TIME_S:
        raise UnknownKeyError(f"earthing {earthing!r} is not handled: use TN or TT", value=earthing)
    if not final_circuit or rating_a > 32:
        return DISTRIBUTION_TIME_S[earthing]
    # Table 41.1 is read with the nominal U0: 400 V / sqrt(3) = 230.9 V is the
    # nominal 230 V of IEC 60038, so U0 is rounded to 10 V before the lookup.
    u0_nominal = round(u0_v / 10.0) * 10.0
    for low, high, times in TABLE_41_1:
        if low < u0_nominal <= high:
            return times[earthing]
    raise OutOfRangeError(f"U0 {u0_v:g} V is outside Table 41.1 (above 50 V a.c.) ({TABLE_41_1_SOURCE})", value=u0_v)


@dataclass(frozen=True)
class InstantaneousTrip:
    """The instantaneous release of a circuit-breaker.

    Attributes
    ----------
    no_trip_a : float
        Below this current the breaker does not trip instantaneously [A].
    sure_trip_a : float
        At and above this current it surely trips instantaneously (< 0.1 s) [A].
    description : str
        What the device is and where the figures come from.
    """

    no_trip_a: float
    sure_trip_a: float
    description: str


def instantaneous_trip(
    rating_a: float,
    curve: str = "C",
    magnetic_a: float | None = None,
    kind: str = "breaker",
    industrial_multiple: float = INDUSTRIAL_INSTANTANEOUS_MULTIPLE,
    tolerance: float = INSTANTANEOUS_TOLERANCE,
) -> InstantaneousTrip:
    """The instantaneous tripping range of a circuit-breaker.

    - ``breaker`` up to 125 A with no ``magnetic_a``: IEC 60898-1 type B / C / D,
      the range of Table 7 (3-5, 5-10, 10-20 In);
    - ``breaker`` above 125 A (IEC 60947-2) or any breaker with a
      ``magnetic_a``: an adjustable setting Ii (``magnetic_a``, else
      ``industrial_multiple`` x In) with ±``tolerance``;
    - ``motor_breaker``: a motor-protection breaker, fixed setting
      :data:`MOTOR_BREAKER_INSTANTANEOUS_MULTIPLE` x In (unless ``magnetic_a``)
      with the same tolerance.

    Parameters
    ----------
    rating_a : float
        In (for a motor-protection breaker its current setting) [A].
    curve : str
        ``B``, ``C`` or ``D`` (IEC 60898-1); ignored above 125 A.
    magnetic_a : float, optional
        Instantaneous setting Ii [A].
    kind : str
        ``breaker`` or ``motor_breaker``.
    industrial_multiple : float
        Ii / In of an IEC 60947-2 breaker with no ``magnetic_a``.
    tolerance : float
        Relative tolerance of an adjustable release (0.2: IEC 60947-2 ±20 %).

    Returns
    -------
    InstantaneousTrip

    Examples
    --------
    IEC 60898-1 Table 7, type C 16 A: 80 A to 160 A.  A 250 A IEC 60947-2
    breaker at the default 10 In: 2000 A to 3000 A.

    >>> t = instantaneous_trip(16, "C"); t.no_trip_a, t.sure_trip_a
    (80.0, 160.0)
    >>> t = instantaneous_trip(250, "C"); t.no_trip_a, t.sure_trip_a
    (2000.0, 3000.0)

    References
    ----------
    .. [1] IEC 60898-1:2015, clause 1 and Table 7.
    .. [2] IEC 60947-2:2016, 8.3.3.1.2 (tolerance, from memory).
    """
    if magnetic_a is not None and magnetic_a <= 0:
        raise OutOfRangeError(f"magnetic setting {magnetic_a:g} A must be > 0", value=magnetic_a)
    if kind == "motor_breaker":
        setting = magnetic_a if magnetic_a is not None else MOTOR_BREAKER_INSTANTANEOUS_MULTIPLE * rating_a
        what = (f"motor-protection breaker (IEC 60947-2 / IEC 60947-4-1), Ii {setting:g} A"
                + ("" if magnetic_a is not None else
                   f" = {MOTOR_BREAKER_INSTANTANEOUS_MULTIPLE:g} x setting (common practice, from memory)"))
    elif magnetic_a is not None or rating_a > IEC_60898_MAX_RATING_A:
        setting = magnetic_a if magnetic_a is not None else industrial_multiple * rating_a
        what = (f"IEC 60947-2 breaker, adjustable instantaneous Ii {setting:g} A"
                + (" (schedule or config magnetic_a)" if magnetic_a is not None else
                   f" = {industrial_multiple:g} In (config industrial_instantaneous_multiple)"))
    else:
        key = curve.strip().upper()
        if key not in BREAKER_INSTANTANEOUS_MULTIPLE:
            raise UnknownKeyError(f"breaker curve {curve!r} is unknown: use B, C or D (IEC 60898-1)", value=curve)
        low, high = BREAKER_NO_TRIP_MULTIPLE[key], BREAKER_INSTANTANEOUS_MULTIPLE[key]
        return InstantaneousTrip(low * rating_a, high * rating_a,
                                 f"IEC 60898-1:2015 Table 7, type {key}: {low:g}-{high:g} In")
    return InstantaneousTrip(
        (1.0 - tolerance) * setting, (1.0 + tolerance) * setting,
        f"{what}, ±{100 * tolerance:g} % (IEC 60947-2:2016 8.3.3.1.2, from memory)")


def breaker_ia_a(
    rating_a: float, curve: str = "C", magnetic_a: float | None = None, kind: str = "breaker",
    industrial_multiple: float = INDUSTRIAL_INSTANTANEOUS_MULTIPLE,
    tolerance: float = INSTANTANEOUS_TOLERANCE,
) -> tuple[float, str]:
    """Current that surely trips a circuit-breaker instantaneously, and its source.

    The upper edge of :func:`instantaneous_trip` (same parameters).

    Examples
    --------
    >>> breaker_ia_a(16, "B")[0], breaker_ia_a(16, "C")[0], breaker_ia_a(16, "D")[0]
    (80.0, 160.0, 320.0)
    >>> breaker_ia_a(400, "C")[1].startswith("IEC 60947-2 breaker")
    True

    References
    ----------
    .. [1] IEC 60898-1:2015, Table 7.
    .. [2] IEC 60947-2:2016, 8.3.3.1.2.
    """
    trip = instantaneous_trip(rating_a, curve, magnetic_a, kind, industrial_multiple, tolerance)
    return trip.sure_trip_a, trip.description


def fuse_ia_a(rating_a: float, time_s: float) -> tuple[float, str]:
    """Current that surely melts a gG fuse-link within ``time_s``.

    IEC 60269-1 gives the upper gates ``Imax(5 s)`` and ``Imax(0.1 s)``: 5 s
    and longer reads the 5 s gate, 0.1 s and shorter the 0.1 s gate (below
    0.1 s the gate is the last figure the standard gives: check the maker's
    I²t); a time in between (0.4 s, 0.2 s of Table 41.1) is read on the
    straight line joining the two gates on log-log axes, the way fuse
    time-current curves are drawn (common practice; the maker's curve governs).

    .. math:: I(t) = I_{5s} \\left(\\frac{I_{0.1s}}{I_{5s}}\\right)^{\\ln(5/t) / \\ln(50)}

    Examples
    --------
    >>> fuse_ia_a(63, 5.0)[0], fuse_ia_a(63, 0.1)[0], round(fuse_ia_a(63, 0.4)[0])
    (320.0, 820.0, 587)

    References
    ----------
    .. [1] IEC 60269-1:2006, Table 3 (gates, from memory).
    .. [2] IEC 60364-4-41:2005, Table 41.1 (the times asked).
    """
    if time_s <= 0:
        raise OutOfRangeError(f"disconnection time {time_s:g} s must be > 0", value=time_s)
    for gate in GG_GATES:
        if abs(gate.rating_a - rating_a) < 1e-9:
            if time_s >= 5.0:
                return float(gate.imax_5s_a), f"{GG_GATES_SOURCE}: Imax(5 s) gate"
            if time_s <= 0.1:
                return float(gate.imax_0_1s_a), f"{GG_GATES_SOURCE}: Imax(0.1 s) gate"
            share = math.log(5.0 / time_s) / math.log(5.0 / 0.1)
            current = gate.imax_5s_a * (gate.imax_0_1s_a / gate.imax_5s_a) ** share
            return current, (f"{GG_GATES_SOURCE}: {time_s:g} s read log-log between the Imax(5 s) "
                             "and Imax(0.1 s) gates (common practice; the maker's curve governs)")
    raise OutOfRangeError(
        f"no gG gate value for a {rating_a:g} A fuse ({GG_GATES_SOURCE} lists 16 A to 1250 A); "
        "check the fuse maker's time-current curve", value=rating_a)


def device_ia_a(
    device_kind: str, rating_a: float, time_s: float, curve: str = "C",
    magnetic_a: float | None = None,
    industrial_multiple: float = INDUSTRIAL_INSTANTANEOUS_MULTIPLE,
    tolerance: float = INSTANTANEOUS_TOLERANCE,
) -> tuple[float, str]:
    """Ia of IEC 60364-4-41 411.4.4 for a device kind, and its source.

    ``breaker`` and ``motor_breaker``: the current that surely trips the
    instantaneous release (:func:`breaker_ia_a`); ``fuse``: the gG current for
    ``time_s`` (:func:`fuse_ia_a`).  An ``overload_relay`` (IEC 60947-4-1)
    does not clear faults: the short-circuit device backing it must be
    checked, so it raises.

    Examples
    --------
    >>> device_ia_a("fuse", 100, 5.0)[0], device_ia_a("breaker", 100, 5.0, "B")[0]
    (580.0, 500.0)

    References
    ----------
    .. [1] IEC 60364-4-41:2005, 411.4.4.
    """
    if device_kind in ("breaker", "motor_breaker"):
        return breaker_ia_a(rating_a, curve, magnetic_a, device_kind, industrial_multiple, tolerance)
    if device_kind == "fuse":
        return fuse_ia_a(rating_a, time_s)
    if device_kind == "overload_relay":
        raise UnknownKeyError(
            "an overload relay (IEC 60947-4-1) does not clear earth faults: give the magnetic "
            "setting (magnetic_a) of the short-circuit device backing it")
    raise UnknownKeyError(
        f"device kind {device_kind!r} is unknown: use breaker, motor_breaker, fuse or overload_relay", value=device_kind)


def fault_loop_temperature_c(insulation: str) -> float:
    """Conductor temperature for the loop resistance during an earth fault [°C].

    The mean of the maximum operating temperature (IEC 60364-5-52:2009 Table
    52.1) and the final short-circuit temperature (IEC 60364-4-43:2008 Table
    43A): 115 °C for PVC, 170 °C for XLPE.  Common practice: the conductor
    heats during the fault; the mean is a usual compromise.

    Examples
    --------
    >>> fault_loop_temperature_c("PVC"), fault_loop_temperature_c("XLPE")
    (115.0, 170.0)
    """
    try:
        return 0.5 * (MAX_CONDUCTOR_TEMPERATURE_C[insulation] + FAULT_TEMPERATURE_C[insulation])
    except KeyError:
        raise UnknownKeyError(f"insulation {insulation!r} is unknown: use PVC or XLPE", value=insulation) from None


def loop_resistance_ohm_per_m(
    line_csa_mm2: float, pe_csa_mm2: float, conductor: str, temperature_c: float, parallel: int = 1
) -> float:
    """Resistance of line + protective conductor per metre of route [Ω/m].

    Both conductors at ``temperature_c`` (IEC 60228:2004 Annex B correction);
    ``parallel`` cables each with its own PE core.

    Examples
    --------
    >>> round(loop_resistance_ohm_per_m(1.5, 1.5, "Cu", 20) * 1000, 1)
    24.2
    """
    r_line = resistance_ohm_per_km(line_csa_mm2, conductor, temperature_c)
    r_pe = resistance_ohm_per_km(pe_csa_mm2, conductor, temperature_c)
    return (r_line + r_pe) / 1000.0 / parallel


def loop_impedance_ohm(
    ze_ohm: float, length_m: float, r_loop_ohm_per_m: float,
    x_loop_ohm_per_m: float = 2 * REACTANCE_MOHM_PER_M / 1000.0,
) -> float:
    """Earth-fault loop impedance Zs = Ze + |L (r + jx)| [Ω].

    Ze added by magnitude (its angle is rarely known): conservative.

    Examples
    --------
    >>> round(loop_impedance_ohm(0.35, 20, 0.0242, 0.0), 3)
    0.834
    """
    return ze_ohm + length_m * math.hypot(r_loop_ohm_per_m, x_loop_ohm_per_m)


def max_length_m(
    u0_v: float, ia_a: float, ze_ohm: float, r_loop_ohm_per_m: float,
    x_loop_ohm_per_m: float = 0.0, voltage_factor: float = 1.0,
) -> float:
    """Longest circuit for which ``Zs x Ia <= c U0`` still holds [m].

    .. math:: L_{max} = \\frac{c\\,U_0 / I_a - Z_e}{|r + jx|}

    Parameters
    ----------
    u0_v : float
        Voltage to earth U0 [V].
    ia_a : float
        Current operating the device in the required time [A].
    ze_ohm : float
        Loop impedance upstream of the circuit [Ω].
    r_loop_ohm_per_m, x_loop_ohm_per_m : float
        Resistance and reactance of line + PE per metre of route [Ω/m].
    voltage_factor : float
        c: 1.0 for IEC 60364-4-41 411.4.4 as written; 0.95 (cmin of IEC 60909-0)
        or 0.8 (the "conventional method", which assumes 80 % of U0 at the
        circuit's origin and Ze = 0) where those conventions are wanted.

    Returns
    -------
    float
        L_max [m]; 0 when Ze alone is too high.

    Examples
    --------
    Type C 10 A breaker, 1.5 mm² copper line and PE, U0 220 V, conventional
    method (ρ = 22.5e-3 Ω·mm²/m, r = ρ (1 + m) / S): 58.6 m in a published
    TN design course example:

    >>> round(max_length_m(220, 100, 0.0, 0.0225 * 2 / 1.5, voltage_factor=0.8), 1)
    58.7

    References
    ----------
    .. [1] IEC 60364-4-41:2005, 411.4.4, equation (411.4.4).
    """
    if ia_a <= 0:
        raise OutOfRangeError(f"operating current Ia {ia_a:g} A must be > 0", value=ia_a)
    z_per_m = math.hypot(r_loop_ohm_per_m, x_loop_ohm_per_m)
    budget = voltage_factor * u0_v / ia_a - ze_ohm
    if budget <= 0:
        return 0.0
    if z_per_m <= 0:
        return math.inf
    return budget / z_per_m


@dataclass(frozen=True)
class DisconnectionResult:
    """Outcome of the TN earth-fault check for one circuit.

    Attributes
    ----------
    passed : bool
    zs_ohm : float
        Loop impedance at the load end [Ω].
    zs_max_ohm : float
        c U0 / Ia [Ω].
    ia_a : float
        Operating current of the device in ``time_s`` [A].
    time_s : float
        Maximum disconnection time applied [s].
    max_length_m : float
        Longest circuit that still disconnects [m].
    earth_fault_a : float
        c U0 / Zs: the earth-fault current at the load end [A].
    source : str
    """

    passed: bool
    zs_ohm: float
    zs_max_ohm: float
    ia_a: float
    time_s: float
    max_length_m: float
    earth_fault_a: float
    source: str


def check_disconnection_tn(
    u0_v: float,
    length_m: float,
    line_csa_mm2: float,
    pe_csa_mm2: float,
    conductor: str,
    insulation: str,
    device_kind: str,
    rating_a: float,
    ze_ohm: float,
    parallel: int = 1,
    curve: str = "C",
    magnetic_a: float | None = None,
    final_circuit: bool = True,
    voltage_factor: float = 1.0,
    conductor_temp_c: float | None = None,
    industrial_multiple: float = INDUSTRIAL_INSTANTANEOUS_MULTIPLE,
    tolerance: float = INSTANTANEOUS_TOLERANCE,
) -> DisconnectionResult:
    """Earth-fault disconnection of a circuit in a TN system.

    Parameters
    ----------
    u0_v : float
        U0 [V].
    length_m : float
        Circuit length [m].
    line_csa_mm2, pe_csa_mm2 : float
        Line and protective conductor cross-sections of one cable [mm²].
    conductor, insulation : str
        Cable material and insulation.
    device_kind : str
        ``breaker``, ``motor_breaker`` or ``fuse`` (gG), see :func:`device_ia_a`.
    rating_a : float
        In [A].
    ze_ohm : float
        Loop impedance upstream [Ω].
    parallel : int
        Cables in parallel.
    curve : str
        Breaker curve B/C/D.
    magnetic_a : float, optional
        Adjustable magnetic setting [A].
    final_circuit : bool
        False for distribution circuits (5 s).
    voltage_factor : float
        See :func:`max_length_m`.
    conductor_temp_c : float, optional
        Conductor temperature for the loop; default :func:`fault_loop_temperature_c`.
    industrial_multiple, tolerance : float
        Instantaneous setting of IEC 60947-2 breakers, see :func:`instantaneous_trip`.

    Returns
    -------
    DisconnectionResult

    Examples
    --------
    >>> r = check_disconnection_tn(230, 30, 2.5, 2.5, "Cu", "PVC", "breaker", 20, 0.35, curve="B")
    >>> r.passed, round(r.max_length_m)
    (True, 96)

    References
    ----------
    .. [1] IEC 60364-4-41:2005, 411.4.4 and Table 41.1.
    """
    time_s = max_disconnection_time_s(u0_v, rating_a, final_circuit)
    ia, ia_source = device_ia_a(device_kind, rating_a, time_s, curve, magnetic_a,
                                industrial_multiple, tolerance)
    temp = fault_loop_temperature_c(insulation) if conductor_temp_c is None else conductor_temp_c
    r = loop_resistance_ohm_per_m(line_csa_mm2, pe_csa_mm2, conductor, temp, parallel)
    x = 2 * REACTANCE_MOHM_PER_M / 1000.0 / parallel
    zs = loop_impedance_ohm(ze_ohm, length_m, r, x)
    zs_max = voltage_factor * u0_v / ia
    lmax = max_length_m(u0_v, ia, ze_ohm, r, x, voltage_factor)
    return DisconnectionResult(
        passed=zs <= zs_max + 1e-12,
        zs_ohm=zs,
        zs_max_ohm=zs_max,
        ia_a=ia,
        time_s=time_s,
        max_length_m=lmax,
        earth_fault_a=voltage_factor * u0_v / zs if zs > 0 else math.inf,
        source=f"IEC 60364-4-41:2005 411.4.4 (Zs Ia <= U0), t {time_s:g} s; {ia_source}",
    )
