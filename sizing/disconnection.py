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
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from cablewright.extract.errors import OutOfRangeError, UnknownKeyError

from .conductor_resistance import resistance_ohm_per_km
from .short_circuit import FAULT_TEMPERATURE_C
from .voltage_drop import MAX_CONDUCTOR_TEMPERATURE_C, REACTANCE_MOHM_PER_M

__all__ = [
    "TABLE_41_1",
    "TABLE_41_1_SOURCE",
    "DISTRIBUTION_TIME_S",
    "BREAKER_INSTANTANEOUS_MULTIPLE",
    "GG_GATES",
    "FuseGate",
    "max_disconnection_time_s",
    "breaker_ia_a",
    "fuse_ia_a",
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
        raise UnknownKeyError(f"earthing {earthing!r} is not handled: use TN or TT")
    if not final_circuit or rating_a > 32:
        return DISTRIBUTION_TIME_S[earthing]
    # Table 41.1 is read with the nominal U0: 400 V / sqrt(3) = 230.9 V is the
    # nominal 230 V of IEC 60038, so U0 is rounded to 10 V before the lookup.
    u0_nominal = round(u0_v / 10.0) * 10.0
    for low, high, times in TABLE_41_1:
        if low < u0_nominal <= high:
            return times[earthing]
    raise OutOfRangeError(f"U0 {u0_v:g} V is outside Table 41.1 (above 50 V a.c.) ({TABLE_41_1_SOURCE})")


def breaker_ia_a(rating_a: float, curve: str = "C", magnetic_a: float | None = None) -> tuple[float, str]:
    """Current that surely trips a circuit-breaker instantaneously, and its source.

    Parameters
    ----------
    rating_a : float
        In [A].
    curve : str
        ``B``, ``C`` or ``D`` (IEC 60898-1).
    magnetic_a : float, optional
        Adjustable instantaneous (magnetic) setting [A] of an IEC 60947-2
        breaker; takes precedence over ``curve``.

    Examples
    --------
    >>> breaker_ia_a(16, "B")[0], breaker_ia_a(16, "C")[0], breaker_ia_a(16, "D")[0]
    (80.0, 160.0, 320.0)

    References
    ----------
    .. [1] IEC 60898-1:2015, Table 7.
    """
    if magnetic_a is not None:
        if magnetic_a <= 0:
            raise OutOfRangeError(f"magnetic setting {magnetic_a:g} A must be > 0")
        return float(magnetic_a), "magnetic setting (schedule or config); tolerance per maker"
    key = curve.strip().upper()
    if key not in BREAKER_INSTANTANEOUS_MULTIPLE:
        raise UnknownKeyError(f"breaker curve {curve!r} is unknown: use B, C or D (IEC 60898-1)")
    mult = BREAKER_INSTANTANEOUS_MULTIPLE[key]
    return mult * rating_a, f"IEC 60898-1:2015 Table 7, type {key}: {mult:g} In"


def fuse_ia_a(rating_a: float, time_s: float) -> tuple[float, str]:
    """Current that surely melts a gG fuse-link within ``time_s``.

    5 s and longer: the ``Imax(5 s)`` gate; shorter: the ``Imax(0.1 s)`` gate,
    which is conservative for 0.2 s to 0.4 s (IEC 60269-1 has no 0.4 s gate).

    Examples
    --------
    >>> fuse_ia_a(63, 5.0)[0], fuse_ia_a(63, 0.4)[0]
    (320.0, 820.0)

    References
    ----------
    .. [1] IEC 60269-1:2006, Table 3.
    """
    for gate in GG_GATES:
        if abs(gate.rating_a - rating_a) < 1e-9:
            if time_s >= 5.0:
                return float(gate.imax_5s_a), f"{GG_GATES_SOURCE}: Imax(5 s)"
            return float(gate.imax_0_1s_a), f"{GG_GATES_SOURCE}: Imax(0.1 s), conservative for {time_s:g} s"
    raise OutOfRangeError(
        f"no gG gate value for a {rating_a:g} A fuse ({GG_GATES_SOURCE} lists 16 A to 1250 A); "
        "check the fuse maker's time-current curve")


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
        raise UnknownKeyError(f"insulation {insulation!r} is unknown: use PVC or XLPE") from None


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
        raise OutOfRangeError(f"operating current Ia {ia_a:g} A must be > 0")
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
        ``breaker`` or ``fuse`` (gG).
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
    if device_kind == "breaker":
        ia, ia_source = breaker_ia_a(rating_a, curve, magnetic_a)
    elif device_kind == "fuse":
        ia, ia_source = fuse_ia_a(rating_a, time_s)
    else:
        raise UnknownKeyError(f"device kind {device_kind!r} is unknown: use breaker or fuse")
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
