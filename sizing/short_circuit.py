"""Short-circuit withstand of a cable: the adiabatic equation and fault levels.

The cable must carry the prospective fault current for the clearing time of
its protective device without its conductor exceeding the insulation's limit
temperature (IEC 60364-4-43:2008, 434.5.2).  The fault level at the source
comes from the schedule (``fault_ka``) or the config; at the load end it is
reduced by the cable's impedance (IEC 60909-0:2016 method of the equivalent
voltage source).

References
----------
.. [1] IEC 60364-4-43:2008, Protection against overcurrent, 434.5.2 and
   Table 43A.
.. [2] IEC 60909-0:2016, Short-circuit currents in three-phase a.c. systems,
   clause 5 and Table 1 (voltage factor c).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from cablewright.core.errors import OutOfRangeError, UnknownKeyError

from .conductor_resistance import resistance_ohm_per_km
from .voltage_drop import REACTANCE_MOHM_PER_M

__all__ = [
    "KValue",
    "TABLE_43A",
    "VOLTAGE_FACTOR_LV",
    "SOURCE_R_OVER_X",
    "FAULT_TEMPERATURE_C",
    "k_value",
    "adiabatic_min_csa_mm2",
    "adiabatic_withstand_time_s",
    "source_impedance_ohm",
    "fault_current_ka",
    "SOURCE_Z0_OVER_Z1",
    "fault_current_line_neutral_ka",
    "peak_factor",
]


@dataclass(frozen=True)
class KValue:
    """One cell of IEC 60364-4-43:2008 Table 43A.

    Attributes
    ----------
    insulation : str
        ``PVC`` or ``XLPE`` (thermosetting 90 °C, XLPE or EPR).
    band : str
        ``"<=300"`` or ``">300"`` (PVC only) or ``"all"``.
    initial_c, final_c : float
        Initial (operating) and final conductor temperatures [°C].
    k_cu, k_al : float
        k for copper and aluminium conductors [A·s^0.5/mm²].
    """

    insulation: str
    band: str
    initial_c: float
    final_c: float
    k_cu: float
    k_al: float


#: IEC 60364-4-43:2008 Table 43A, values of k for conductors (PVC and
#: thermosetting 90 °C columns), as printed [A·s^0.5/mm²].
TABLE_43A: tuple[KValue, ...] = (
    KValue("PVC", "<=300", 70.0, 160.0, 115.0, 76.0),
    KValue("PVC", ">300", 70.0, 140.0, 103.0, 68.0),
    KValue("XLPE", "all", 90.0, 250.0, 143.0, 94.0),
)
TABLE_43A_SOURCE = "IEC 60364-4-43:2008 434.5.2 and Table 43A"

#: Voltage factor c for low voltage (100 V to 1000 V), IEC 60909-0:2016 Table 1:
#: cmax 1.05 for systems with a tolerance of +6 %, 1.10 for +10 %; cmin 0.95.
VOLTAGE_FACTOR_LV = {"max_6pct": 1.05, "max_10pct": 1.10, "min": 0.95}

#: R/X of the source impedance seen from the switchboard: 0.1, the value
#: IEC 60909-0:2016 6.2 allows for network feeders when nothing is known
#: (applied here to the whole upstream network: an assumption).
SOURCE_R_OVER_X = 0.1

#: Z(0)/Z(1) of the source behind a board, for the line-to-neutral fault of a
#: single-phase circuit when only the three-phase level is known: 1.0, as for
#: a Dyn distribution transformer whose zero-sequence impedance about equals
#: its positive-sequence one (common practice, from memory).  With 1.0 the
#: line-to-neutral fault at the board equals the three-phase level.
SOURCE_Z0_OVER_Z1 = 1.0

#: Final conductor temperature at the end of a fault [°C], the ``final_c`` of
#: Table 43A by insulation (PVC up to 300 mm²).
FAULT_TEMPERATURE_C = {"PVC": 160.0, "XLPE": 250.0}


def k_value(conductor: str, insulation: str, csa_mm2: float) -> float:
    """k of the adiabatic equation for a line conductor.

    Parameters
    ----------
    conductor : str
        ``Cu`` or ``Al``.
    insulation : str
        ``PVC`` or ``XLPE`` (EPR reads as XLPE).
    csa_mm2 : float
        Conductor cross-section [mm²]; PVC above 300 mm² has its own column.

    Returns
    -------
    float
        k [A·s^0.5/mm²].

    Raises
    ------
    UnknownKeyError
        Unknown conductor or insulation.

    Examples
    --------
    >>> k_value("Cu", "PVC", 95), k_value("Al", "XLPE", 400), k_value("Cu", "PVC", 400)
    (115.0, 94.0, 103.0)

    References
    ----------
    .. [1] IEC 60364-4-43:2008, Table 43A.
    """
    if conductor not in ("Cu", "Al"):
        raise UnknownKeyError(f"conductor {conductor!r} is unknown for {TABLE_43A_SOURCE}: use Cu or Al", value=conductor)
    if insulation == "EPR":
        insulation = "XLPE"
    band = "all"
    if insulation == "PVC":
        band = "<=300" if csa_mm2 <= 300 else ">300"
    for row in TABLE_43A:
        if row.insulation == insulation and row.band == band:
            return row.k_cu if conductor == "Cu" else row.k_al
    raise UnknownKeyError(f"insulation {insulation!r} is unknown for {TABLE_43A_SOURCE}: use PVC or XLPE", value=insulation)


def adiabatic_min_csa_mm2(current_a: float, time_s: float, k: float) -> float:
    """Least cross-section that withstands a fault current for a time.

    .. math:: t = \\left(\\frac{k S}{I}\\right)^2 \\;\\Rightarrow\\; S = \\frac{I\\sqrt{t}}{k}

    Parameters
    ----------
    current_a : float
        Prospective fault current, r.m.s. [A], >= 0.
    time_s : float
        Clearing time of the device [s], 0 < t <= 5.
    k : float
        Table 43A factor [A·s^0.5/mm²].

    Returns
    -------
    float
        S [mm²].

    Raises
    ------
    OutOfRangeError
        t outside (0, 5] s: 434.5.2 holds for durations up to 5 s.

    Notes
    -----
    For t < 0.1 s with current-limiting devices IEC 60364-4-43 asks k²S² >= the
    device's let-through I²t (maker's data); the equation here is then only a
    first estimate.

    Examples
    --------
    3 kA for 0.1 s on copper/XLPE (k 143): 6.6 mm², so 10 mm² (worked example
    of a public cable-sizing page):

    >>> round(adiabatic_min_csa_mm2(3000, 0.1, 143), 1)
    6.6

    References
    ----------
    .. [1] IEC 60364-4-43:2008, 434.5.2, equation (434.5.2).
    """
    if not 0 < time_s <= 5.0:
        raise OutOfRangeError(
            f"clearing time {time_s:g} s is outside (0, 5] s, the range of the adiabatic "
            "equation (IEC 60364-4-43:2008 434.5.2)", value=time_s)
    if current_a < 0 or k <= 0:
        raise OutOfRangeError(f"fault current {current_a:g} A and k {k:g} must be positive", value=current_a)
    return current_a * math.sqrt(time_s) / k


def adiabatic_withstand_time_s(csa_mm2: float, current_a: float, k: float) -> float:
    """Time a conductor withstands a fault current: t = (k S / I)² [s].

    Examples
    --------
    >>> round(adiabatic_withstand_time_s(16, 5000, 115), 3)
    0.135

    References
    ----------
    .. [1] IEC 60364-4-43:2008, 434.5.2.
    """
    if current_a <= 0:
        return math.inf
    return (k * csa_mm2 / current_a) ** 2


def source_impedance_ohm(fault_ka: float, voltage_v: float, c: float = 1.05) -> float:
    """Source impedance behind a three-phase fault level.

    .. math:: Z_Q = \\frac{c\\,U_n}{\\sqrt{3}\\,I''_k}

    Parameters
    ----------
    fault_ka : float
        Three-phase initial symmetrical short-circuit current I''k [kA], > 0.
    voltage_v : float
        Nominal line-to-line voltage Un [V].
    c : float
        Voltage factor (IEC 60909-0:2016 Table 1); use the same c that produced
        ``fault_ka``, 1.05 by default.

    Returns
    -------
    float
        |ZQ| [Ω] per phase.

    Examples
    --------
    >>> round(source_impedance_ohm(25, 400), 5)
    0.0097

    References
    ----------
    .. [1] IEC 60909-0:2016, 6.2, equation (3) (network feeder).
    """
    if fault_ka <= 0:
        raise OutOfRangeError(f"fault level {fault_ka:g} kA must be greater than zero", value=fault_ka)
    return c * voltage_v / (math.sqrt(3.0) * fault_ka * 1000.0)


def fault_current_ka(
    source_fault_ka: float,
    voltage_v: float,
    length_m: float,
    csa_mm2: float,
    conductor: str,
    parallel: int = 1,
    conductor_temp_c: float = 20.0,
    c: float = 1.05,
    c_source: float = 1.05,
    reactance_mohm_per_m: float = REACTANCE_MOHM_PER_M,
) -> float:
    """Three-phase fault current at the far end of a cable.

    .. math::

        I''_k = \\frac{c\\,U_n}{\\sqrt{3}\\,|Z_Q + L(r_\\theta + j x)/n|}

    with Z_Q from the source fault level (R/X = :data:`SOURCE_R_OVER_X`) and
    the cable's resistance at ``conductor_temp_c``: 20 °C for the maximum
    current (c = cmax), the end-of-fault temperature for the minimum (c = cmin),
    IEC 60909-0:2016 clauses 7 and 8.

    Parameters
    ----------
    source_fault_ka : float
        I''k at the source [kA].
    voltage_v : float
        Nominal line-to-line voltage [V].
    length_m : float
        Cable length [m], >= 0.
    csa_mm2 : float
        Phase conductor cross-section [mm²].
    conductor : str
        ``Cu`` or ``Al``.
    parallel : int
        Cables in parallel.
    conductor_temp_c : float
        Conductor temperature for R [°C].
    c : float
        Voltage factor of this calculation.
    c_source : float
        Voltage factor behind ``source_fault_ka``.
    reactance_mohm_per_m : float
        Cable reactance [mΩ/m].

    Returns
    -------
    float
        I''k at the load end [kA].

    Examples
    --------
    25 kA at the board, 50 m of 95 mm² copper at 20 °C:

    >>> round(fault_current_ka(25, 400, 50, 95, "Cu"), 2)
    14.02

    References
    ----------
    .. [1] IEC 60909-0:2016, 6.2, 6.3 and Table 1.
    """
    zq = source_impedance_ohm(source_fault_ka, voltage_v, c_source)
    xq = zq / math.sqrt(1.0 + SOURCE_R_OVER_X**2)
    rq = SOURCE_R_OVER_X * xq
    r = resistance_ohm_per_km(csa_mm2, conductor, conductor_temp_c) / 1000.0 * length_m / parallel
    x = reactance_mohm_per_m / 1000.0 * length_m / parallel
    z = math.hypot(rq + r, xq + x)
    return c * voltage_v / (math.sqrt(3.0) * z) / 1000.0


def fault_current_line_neutral_ka(
    source_fault_ka: float,
    voltage_v: float,
    length_m: float,
    csa_mm2: float,
    conductor: str,
    parallel: int = 1,
    conductor_temp_c: float = 20.0,
    c: float = 1.05,
    c_source: float = 1.05,
    neutral_csa_mm2: float | None = None,
    z0_over_z1: float = SOURCE_Z0_OVER_Z1,
    reactance_mohm_per_m: float = REACTANCE_MOHM_PER_M,
) -> float:
    """Line-to-neutral fault current at the far end of a single-phase circuit.

    The single-phase (line-to-earth type) short circuit of IEC 60909-0: the
    current flows out in the line conductor and back in the neutral, so the
    loop holds both conductors of the cable and the source's
    (2 Z(1) + Z(0)) / 3:

    .. math::

        I''_{k1} = \\frac{\\sqrt{3}\\,c\\,U_n}{|Z_{(1)} + Z_{(2)} + Z_{(0)}|}
                 = \\frac{c\\,U_0}{|(2 Z_Q + Z_{0Q})/3 + L (r_L + r_N + 2 j x)/n|}

    with Z_Q from the three-phase level at the board (R/X
    :data:`SOURCE_R_OVER_X`), Z_0Q = ``z0_over_z1`` Z_Q, and the cable's
    zero-sequence impedance Z_L + 3 Z_N (return in the neutral only).

    Parameters
    ----------
    source_fault_ka : float
        Three-phase I''k at the board feeding the circuit [kA].
    voltage_v : float
        Nominal line-to-line voltage Un of the system [V] (U0 = Un / √3).
    length_m : float
        Cable length [m], >= 0.
    csa_mm2 : float
        Line conductor cross-section [mm²].
    conductor : str
        ``Cu`` or ``Al``.
    parallel : int
        Cables in parallel.
    conductor_temp_c : float
        Conductor temperature for R [°C]: 20 °C for the maximum, the
        end-of-fault temperature for the minimum (IEC 60909-0 clauses 7, 8).
    c : float
        Voltage factor of this calculation (cmax or cmin, Table 1).
    c_source : float
        Voltage factor behind ``source_fault_ka``.
    neutral_csa_mm2 : float, optional
        Neutral cross-section [mm²]; default the line's (IEC 60364-5-52:2009
        524.2.1: in a single-phase two-wire circuit the neutral has the
        cross-section of the line conductor).
    z0_over_z1 : float
        Z(0)/Z(1) of the source (:data:`SOURCE_Z0_OVER_Z1`).
    reactance_mohm_per_m : float
        Reactance of one conductor [mΩ/m].

    Returns
    -------
    float
        I''k1 at the load end [kA].

    Examples
    --------
    A strong source (1000 kA), 50 m of 2.5 mm² copper at 20 °C, c = 1, no
    reactance: U0 / (2 L R20) with R20 = 7.41 Ω/km of IEC 60228:2004 Table 2,
    230.9 V / 0.741 Ω = 312 A:

    >>> round(fault_current_line_neutral_ka(1000, 400, 50, 2.5, "Cu", c=1.0, c_source=1.0,
    ...                                      reactance_mohm_per_m=0.0) * 1000)
    312

    References
    ----------
    .. [1] IEC 60909-0:2016, line-to-earth short circuit (I''k1 from the
       sequence impedances), 6.2 (network feeder) and Table 1.
    .. [2] IEC 60364-5-52:2009, 524.2.1.
    """
    zq = source_impedance_ohm(source_fault_ka, voltage_v, c_source)
    xq = zq / math.sqrt(1.0 + SOURCE_R_OVER_X**2)
    rq = SOURCE_R_OVER_X * xq
    k_src = (2.0 + z0_over_z1) / 3.0
    neutral = csa_mm2 if neutral_csa_mm2 is None else neutral_csa_mm2
    r = (resistance_ohm_per_km(csa_mm2, conductor, conductor_temp_c)
         + resistance_ohm_per_km(neutral, conductor, conductor_temp_c)) / 1000.0 * length_m / parallel
    x = 2.0 * reactance_mohm_per_m / 1000.0 * length_m / parallel
    z = math.hypot(k_src * rq + r, k_src * xq + x)
    return c * voltage_v / (math.sqrt(3.0) * z) / 1000.0


def peak_factor(r_over_x: float) -> float:
    """Peak factor κ of an asymmetrical current: κ = 1.02 + 0.98 e^(-3 R/X).

    Parameters
    ----------
    r_over_x : float
        R/X of the circuit the current flows in, >= 0.

    Returns
    -------
    float
        κ, from 2.0 (R/X = 0) down towards 1.02; ip = κ √2 I.

    Examples
    --------
    IEC 60909-0 gives κ = 1.02 + 0.98 e^(-3 R/X); at R/X 0.1, 1.746:

    >>> round(peak_factor(0.1), 3), round(peak_factor(0.0), 2)
    (1.746, 2.0)

    References
    ----------
    .. [1] IEC 60909-0:2016, peak short-circuit current ip, the factor κ
       (equation number from memory).
    """
    if r_over_x < 0:
        raise OutOfRangeError(f"R/X {r_over_x:g} must be zero or more")
    return 1.02 + 0.98 * math.exp(-3.0 * r_over_x)
