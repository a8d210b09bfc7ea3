"""Correction of a buried cable's rating for its depth of laying.

The capacity tables of IEC 60364-5-52:2009 for methods D1 (ducts in the
ground) and D2 (direct in the ground) hold for a depth of 0.7 m.  Deeper
cables shed heat through more soil.  The factor here comes from the external
thermal resistance of a buried cable, IEC 60287-2-1:2015 4.2.3.2:

.. math::

    T_4 = \\frac{\\rho}{2\\pi} \\ln\\left(u + \\sqrt{u^2 - 1}\\right),
    \\qquad u = \\frac{2L}{D_e}

normalised to the tabulated condition.  With conductor losses fixed by the
allowed temperature rise, I² R (T_int + T_4) = Δθ, so

.. math::

    f = \\sqrt{\\frac{T_{int} + T_4(L_{ref})}{T_{int} + T_4(L)}}
      = \\sqrt{\\frac{k + 1}{k + T_4(L)/T_4(L_{ref})}},
    \\qquad k = \\frac{T_{int}}{T_4(L_{ref})}

ρ cancels.  Simplifying assumptions: dielectric losses and sheath/armour loss
factors are neglected (LV cables); the cable's own thermal resistances
(insulation, bedding, sheath) are lumped into k; the ground temperature is the
same at both depths (its own factor is Table B.52.15); one isolated cable or
group (grouping is its own factor).  For ducts (D1) the air gap and the duct
wall belong to the internal part (they do not change with depth) and the
external part is computed on the duct's outer diameter.

Typical k (common practice, from memory of IEC 60287 ratings of LV cables in
2.5 K·m/W soil): 0.25 for a cable direct in the ground; 0.5 for a cable in a
duct (the air gap adds to the internal part).

Valid for depths 0.3 m to 3.0 m (to the cable's or duct's axis), L/De >= 3.

References
----------
.. [1] IEC 60287-2-1:2015, Calculation of the current rating - Thermal
   resistance, 4.2.3.2 (single isolated buried cable) and 4.2.7 (cables in ducts).
.. [2] IEC 60364-5-52:2009, Table B.52.1 note and B.52.2 ff (0.7 m reference).
"""

from __future__ import annotations

import math

from cablewright.core.errors import OutOfRangeError, UnknownKeyError

from .model import Factor

__all__ = [
    "REFERENCE_DEPTH_M",
    "DEPTH_RANGE_M",
    "TYPICAL_INTERNAL_RATIO",
    "TYPICAL_DIAMETER_M",
    "DEPTH_SOURCE",
    "external_thermal_resistance_k_m_w",
    "depth_factor",
    "depth_factor_for_method",
]

#: Depth of the IEC 60364-5-52:2009 Annex B ratings for D1/D2 [m].
REFERENCE_DEPTH_M = 0.7
#: Range of depths this derivation is offered for [m] (to the axis).
DEPTH_RANGE_M = (0.3, 3.0)
#: k = T_int / T_4(reference), common practice (from memory), by method.
TYPICAL_INTERNAL_RATIO = {"D2": 0.25, "D1": 0.5}
#: Outer diameter used for u = 2L/De [m]: a typical LV multi-core cable (D2)
#: and a typical 100 mm duct (D1); common practice.  The result depends on it
#: only through a logarithm.
TYPICAL_DIAMETER_M = {"D2": 0.035, "D1": 0.11}
DEPTH_SOURCE = "IEC 60287-2-1:2015 4.2.3.2 (T4 of a buried cable), normalised to 0.7 m"


def external_thermal_resistance_k_m_w(depth_m: float, diameter_m: float, soil_k_m_w: float = 2.5) -> float:
    """External thermal resistance of one buried cable or duct [K·m/W].

    .. math:: T_4 = \\frac{\\rho}{2\\pi}\\ln\\left(u + \\sqrt{u^2-1}\\right), \\quad u = 2L/D_e

    Parameters
    ----------
    depth_m : float
        Depth L from the surface to the axis [m].
    diameter_m : float
        Outer diameter De [m], with 2L > De.
    soil_k_m_w : float
        Soil thermal resistivity ρ [K·m/W].

    Examples
    --------
    >>> round(external_thermal_resistance_k_m_w(0.7, 0.035, 2.5), 3)
    1.743

    References
    ----------
    .. [1] IEC 60287-2-1:2015, 4.2.3.2.
    """
    u = 2.0 * depth_m / diameter_m
    if u <= 1.0:
        raise OutOfRangeError(
            f"depth {depth_m:g} m is not more than half the diameter {diameter_m:g} m "
            "(IEC 60287-2-1:2015 4.2.3.2 needs u = 2L/De > 1)", value=depth_m)
    return soil_k_m_w / (2.0 * math.pi) * math.log(u + math.sqrt(u * u - 1.0))


def depth_factor(
    depth_m: float,
    reference_depth_m: float = REFERENCE_DEPTH_M,
    diameter_m: float = TYPICAL_DIAMETER_M["D2"],
    internal_ratio: float = TYPICAL_INTERNAL_RATIO["D2"],
) -> float:
    """Rating factor for a depth of laying other than the reference.

    .. math:: f = \\sqrt{\\frac{k + 1}{k + T_4(L)/T_4(L_{ref})}}

    Parameters
    ----------
    depth_m : float
        Depth to the cable's (or duct's) axis [m], within :data:`DEPTH_RANGE_M`.
    reference_depth_m : float
        Depth of the tabulated ratings [m].
    diameter_m : float
        Cable (D2) or duct (D1) outer diameter [m].
    internal_ratio : float
        k = T_int / T_4(reference) (dimensionless), >= 0.

    Returns
    -------
    float
        f (1 at the reference depth, < 1 deeper).

    Raises
    ------
    OutOfRangeError
        Depth outside 0.3 m to 3.0 m, or L/De < 3.

    Examples
    --------
    >>> depth_factor(0.7)
    1.0
    >>> round(depth_factor(1.5), 3)
    0.937

    References
    ----------
    .. [1] IEC 60287-2-1:2015, 4.2.3.2; IEC 60287-1-1:2006, 1.4.1.1 (rating
       equation, dielectric and metal-cover losses neglected).
    """
    low, high = DEPTH_RANGE_M
    for name, value in (("depth", depth_m), ("reference depth", reference_depth_m)):
        if not low <= value <= high:
            raise OutOfRangeError(
                f"{name} {value:g} m is outside {low:g} m to {high:g} m, the range of the "
                f"depth correction derived from {DEPTH_SOURCE}")
        if value / diameter_m < 3.0:
            raise OutOfRangeError(f"{name} {value:g} m is less than 3 diameters ({diameter_m:g} m)", value=value)
    if internal_ratio < 0:
        raise OutOfRangeError(f"internal thermal resistance ratio {internal_ratio:g} must be >= 0")
    ratio = (external_thermal_resistance_k_m_w(depth_m, diameter_m, 1.0)
             / external_thermal_resistance_k_m_w(reference_depth_m, diameter_m, 1.0))
    return math.sqrt((internal_ratio + 1.0) / (internal_ratio + ratio))


def depth_factor_for_method(method: str, depth_m: float,
                            reference_depth_m: float = REFERENCE_DEPTH_M) -> Factor:
    """The ``depth`` :class:`Factor` of a D1/D2 stretch.

    Examples
    --------
    >>> f = depth_factor_for_method("D1", 1.2)
    >>> f.name, round(f.value, 3)
    ('depth', 0.949)
    """
    if method not in TYPICAL_INTERNAL_RATIO:
        raise UnknownKeyError(f"depth correction is for methods D1 and D2, not {method!r}", value=method)
    value = depth_factor(depth_m, reference_depth_m, TYPICAL_DIAMETER_M[method],
                         TYPICAL_INTERNAL_RATIO[method])
    detail = (f"{method}, {depth_m:g} m (reference {reference_depth_m:g} m), "
              f"k = {TYPICAL_INTERNAL_RATIO[method]:g}, De = {TYPICAL_DIAMETER_M[method]:g} m "
              "(common practice)")
    return Factor("depth", value, DEPTH_SOURCE, detail)
