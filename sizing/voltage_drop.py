"""Voltage drop of a radial circuit at its design current.

Two formulas: the impedance form used for selection (conductor resistance
from IEC 60228 at the operating temperature, plus a reactance), and the
simplified formula of IEC 60364-5-52 Annex G, reported as a check.
"""

from __future__ import annotations

import math

from cablewright.core.errors import UnknownKeyError

from .conductor_resistance import resistance_ohm_per_km

__all__ = [
    "REACTANCE_MOHM_PER_M",
    "ANNEX_G_RESISTIVITY_OHM_MM2_PER_M",
    "MAX_CONDUCTOR_TEMPERATURE_C",
    "operating_temperature_c",
    "voltage_drop_v",
    "annex_g_drop_percent",
    "drop_percent",
]

#: Reactance per unit length of a cable, λ = 0.08 mΩ/m "in the absence of other
#: details", IEC 60364-5-52:2009 Annex G, G.52.1.
REACTANCE_MOHM_PER_M = 0.08

#: ρ1 of IEC 60364-5-52:2009 Annex G: resistivity in normal service, 1.25 x the
#: value at 20 °C: 0.0225 Ω·mm²/m copper, 0.036 Ω·mm²/m aluminium.
ANNEX_G_RESISTIVITY_OHM_MM2_PER_M = {"Cu": 0.0225, "Al": 0.036}

#: Maximum conductor operating temperature [°C], IEC 60364-5-52:2009 Table 52.1:
#: PVC 70 °C, XLPE/EPR 90 °C.  Voltage drop is computed at this temperature,
#: the conservative reading (common practice).
MAX_CONDUCTOR_TEMPERATURE_C = {"PVC": 70.0, "XLPE": 90.0}


def operating_temperature_c(ambient_c: float, max_temperature_c: float, current_a: float,
                            capacity_a: float) -> float:
    """Conductor temperature estimated from the load.

    .. math::

        \\theta = \\theta_a + (\\theta_{max} - \\theta_a)\\left(\\frac{I_b}{I_z}\\right)^2

    The temperature rise above the surroundings is proportional to the Joule
    losses, I²R (the steady-state heat balance of IEC 60287-1-1:2006, the
    rating equation of its clause 1.4 (clause number from memory):
    Δθ = I²R T for the thermal resistance T); at Iz the conductor reaches its
    maximum temperature θmax, so at Ib the rise is (Ib/Iz)² of that.  The rise
    of R itself with temperature is neglected (at Ib = Iz it gives θmax
    exactly; below, the error is a few tenths of a kelvin).  IEC 60364-5-52:2009
    Annex G works the drop with the resistivity "in normal service" and takes
    it as 1.25 x the value at 20 °C; this estimate gives the temperature in
    normal service for the circuit's own load instead (an approach, not a
    formula printed in Annex G).

    Parameters
    ----------
    ambient_c : float
        Ambient (air or ground) temperature of the governing stretch [°C].
    max_temperature_c : float
        Maximum conductor temperature of the insulation, Table 52.1 [°C].
    current_a : float
        Design current Ib [A].
    capacity_a : float
        Corrected capacity Iz at that ambient and grouping [A], > 0.

    Returns
    -------
    float
        θ [°C], between θa and θmax for Ib <= Iz (capped at θmax above).

    Examples
    --------
    XLPE at half its rating in 30 °C air: 30 + 60 x 0.25 = 45 °C.

    >>> operating_temperature_c(30.0, 90.0, 50.0, 100.0)
    45.0

    References
    ----------
    .. [1] IEC 60287-1-1:2006, clause 1.4 (heat balance, losses I²R).
    .. [2] IEC 60364-5-52:2009, Table 52.1 (θmax) and Annex G.
    """
    ratio = min(1.0, current_a / capacity_a) if capacity_a > 0 else 1.0
    return ambient_c + (max_temperature_c - ambient_c) * ratio * ratio


def voltage_drop_v(
    current_a: float,
    length_m: float,
    csa_mm2: float,
    conductor: str = "Cu",
    phases: int = 3,
    power_factor: float = 0.85,
    parallel: int = 1,
    conductor_temp_c: float = 90.0,
    reactance_mohm_per_m: float = REACTANCE_MOHM_PER_M,
) -> float:
    """Voltage drop of a radial circuit [V].

    .. math::

        \\Delta U = b\\, I_b\\, L\\, \\frac{R_\\theta\\cos\\varphi + X\\sin\\varphi}{n}

    with b = √3 for 3 phases (line-to-line drop), b = 2 for 1 phase (out and
    back), R_θ the IEC 60228 maximum DC resistance at 20 °C corrected to the
    conductor temperature, X the reactance per metre and n parallel cables.

    Parameters
    ----------
    current_a : float
        Design current Ib [A].
    length_m : float
        Route length (one way) [m].
    csa_mm2 : float
        Phase conductor cross-section [mm²].
    conductor : str
        ``Cu`` or ``Al``.
    phases : int
        3 or 1.
    power_factor : float
        cos φ in (0, 1].
    parallel : int
        Cables in parallel, >= 1.
    conductor_temp_c : float
        Conductor temperature for R [°C].
    reactance_mohm_per_m : float
        Reactance per metre of one cable [mΩ/m].

    Returns
    -------
    float
        ΔU [V]; line-to-line for 3 phases, line-to-neutral for 1 phase.

    Examples
    --------
    100 A over 100 m of 4C 35 mm² copper, 3 phases, cos φ 0.85, at 90 °C:

    >>> round(voltage_drop_v(100, 100, 35, "Cu", 3, 0.85), 2)
    10.57

    References
    ----------
    .. [1] IEC 60364-5-52:2009 Annex G, formula (G.1) (structure of the formula).
    .. [2] IEC 60228:2004 Table 2 and Annex B (resistance and its temperature
       correction).
    """
    b = math.sqrt(3.0) if phases == 3 else 2.0
    r_ohm_per_m = resistance_ohm_per_km(csa_mm2, conductor, conductor_temp_c) / 1000.0
    x_ohm_per_m = reactance_mohm_per_m / 1000.0
    sin_phi = math.sqrt(max(0.0, 1.0 - power_factor * power_factor))
    return b * current_a * length_m * (r_ohm_per_m * power_factor + x_ohm_per_m * sin_phi) / parallel


def drop_percent(drop_v: float, voltage_v: float) -> float:
    """ΔU as a percentage of the nominal voltage (same kind of voltage)."""
    return 100.0 * drop_v / voltage_v


def annex_g_drop_percent(
    current_a: float,
    length_m: float,
    csa_mm2: float,
    conductor: str,
    phases: int,
    power_factor: float,
    voltage_v: float,
    parallel: int = 1,
) -> float:
    """Voltage drop by the simplified formula of IEC 60364-5-52 Annex G [%].

    .. math::

        u = b\\left(\\rho_1 \\frac{L}{S}\\cos\\varphi + \\lambda L \\sin\\varphi\\right) I_B,
        \\qquad \\Delta u = 100\\,\\frac{u}{U_0}

    with b = 1 for 3 phases, 2 for 1 phase, U0 the line-to-neutral voltage.

    Parameters
    ----------
    current_a, length_m, csa_mm2 : float
        Ib [A], L [m], S [mm²].
    conductor : str
        ``Cu`` or ``Al`` (ρ1 from Annex G).
    phases : int
        3 or 1.
    power_factor : float
        cos φ.
    voltage_v : float
        Line-to-line for 3 phases, line-to-neutral for 1 [V].
    parallel : int
        Cables in parallel.

    Examples
    --------
    >>> round(annex_g_drop_percent(100, 100, 35, "Cu", 3, 0.85, 400), 2)
    2.55

    References
    ----------
    .. [1] IEC 60364-5-52:2009 Annex G, G.52.1 (formula and ρ1, λ).
    """
    try:
        rho1 = ANNEX_G_RESISTIVITY_OHM_MM2_PER_M[conductor]
    except KeyError:
        raise UnknownKeyError(f"conductor {conductor!r} is unknown: use Cu or Al", value=conductor) from None
    b = 1.0 if phases == 3 else 2.0
    u0 = voltage_v / math.sqrt(3.0) if phases == 3 else voltage_v
    lam = REACTANCE_MOHM_PER_M / 1000.0
    sin_phi = math.sqrt(max(0.0, 1.0 - power_factor * power_factor))
    u = b * (rho1 * length_m / (csa_mm2 * parallel) * power_factor + lam * length_m / parallel * sin_phi) * current_a
    return 100.0 * u / u0
