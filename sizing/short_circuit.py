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

from cablewright.extract.errors import OutOfRangeError, UnknownKeyError

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
        raise UnknownKeyError(f"conductor {conductor!r} is unknown for {TABLE_43A_SOURCE}: use Cu or Al")
    if insulation == "EPR":
        insulation = "XLPE"
    band = "all"
    if insulation == "PVC":
        band = "<=300" if csa_mm2 <= 300 else ">300"
    for row in TABLE_43A:
        if row.insulation == insulation and row.band == band:
            return row.k_cu if conductor == "Cu" else row.k_al
    raise UnknownKeyError(f"insulation {insulation!r} is unknown for {TABLE_43A_SOURCE}: use PVC or XLPE")


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
            "equation (IEC 60364-4-43:2008 434.5.2)")
    if current_a < 0 or k <= 0:
        raise OutOfRangeError(f"fault current {current_a:g} A and k {k:g} must be positive")
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
        raise OutOfRangeError(f"fault level {fault_ka:g} kA must be greater than zero")
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
