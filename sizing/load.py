"""Design current Ib of a circuit from its load.

The load is written as a number and a unit (``"55 kW"``, ``"75 hp"``,
``"40 kVA"``, ``"32 A"``); :func:`parse_load` reads it and
:func:`design_current_a` turns it into the line current.
"""

from __future__ import annotations

import math
import re

from cablewright.core.errors import CircuitInputError, UnknownKeyError

from .model import Load

__all__ = ["HP_TO_KW", "LOAD_UNITS", "parse_load", "design_current_a"]

#: Shaft power of one horsepower [kW]; contract.md fixes 1 hp = 0.746 kW
#: (mechanical horsepower, 745.7 W, rounded).
HP_TO_KW = 0.746

#: Units a load may be written in, keyed by their lower-case spelling.
LOAD_UNITS = {"kw": "kW", "hp": "hp", "kva": "kVA", "a": "A", "w": "W", "va": "VA", "mw": "MW"}

_LOAD_RE = re.compile(r"^\s*([-+]?\d+(?:[.,]\d+)?(?:[eE][-+]?\d+)?)\s*([A-Za-z]+)\s*$")


def parse_load(text: str) -> Load:
    """Read a load written as ``"<number> <unit>"``.

    Parameters
    ----------
    text : str
        E.g. ``"55 kW"``, ``"75hp"``, ``"40 kVA"``, ``"32 A"``; a decimal comma
        is accepted.  ``W``, ``VA`` and ``MW`` are converted to kW / kVA.

    Returns
    -------
    Load
        Value > 0 in one of ``kW``, ``hp``, ``kVA``, ``A``.

    Raises
    ------
    CircuitInputError
        When the text does not parse or the value is zero or negative.
    UnknownKeyError
        When the unit is not one of ``kW``, ``hp``, ``kVA``, ``A``.

    Examples
    --------
    >>> parse_load("55 kW")
    Load(value=55.0, unit='kW')
    >>> parse_load("7,5hp")
    Load(value=7.5, unit='hp')
    >>> parse_load("2500 W")
    Load(value=2.5, unit='kW')
    """
    match = _LOAD_RE.match(str(text))
    if not match:
        raise CircuitInputError(
            f"load {text!r} does not parse: write a number and a unit, e.g. '55 kW', '75 hp', "
            "'40 kVA' or '32 A'"
        )
    value = float(match.group(1).replace(",", "."))
    unit_key = match.group(2).lower()
    if unit_key not in LOAD_UNITS:
        raise UnknownKeyError(f"load unit {match.group(2)!r} is unknown: use kW, hp, kVA or A")
    if value <= 0:
        raise CircuitInputError(f"load {text!r} must be greater than zero")
    unit = LOAD_UNITS[unit_key]
    if unit == "W":
        value, unit = value / 1000.0, "kW"
    elif unit == "MW":
        value, unit = value * 1000.0, "kW"
    elif unit == "VA":
        value, unit = value / 1000.0, "kVA"
    return Load(value, unit)


def design_current_a(
    load: Load,
    voltage_v: float,
    phases: int = 3,
    power_factor: float = 0.85,
    efficiency: float = 1.0,
) -> float:
    """Design current Ib of a balanced load.

    .. math::

        I_b = \\frac{P / \\eta}{k\\,U\\cos\\varphi},\\qquad
        I_b = \\frac{S}{k\\,U},\\qquad k = \\sqrt{3}\\ (3\\ \\text{phases}),\\ 1\\ (1\\ \\text{phase})

    with P in W (hp converted at 0.746 kW) and U the line-to-line voltage for
    3 phases, line-to-neutral for 1 phase.

    Parameters
    ----------
    load : Load
        kW (electrical input when ``efficiency`` is 1), hp (shaft power), kVA or A.
    voltage_v : float
        Nominal voltage [V], > 0.
    phases : int
        3 or 1.
    power_factor : float
        cos φ in (0, 1] (not used for kVA or A).
    efficiency : float
        η in (0, 1]; kW and hp are divided by it.

    Returns
    -------
    float
        Ib [A].

    Raises
    ------
    CircuitInputError
        Power factor or efficiency outside (0, 1], voltage not positive, phases not 1 or 3.

    Examples
    --------
    55 kW at 400 V, cos φ 0.85, 3 phases:

    >>> round(design_current_a(Load(55, "kW"), 400, 3, 0.85), 1)
    93.4
    >>> round(design_current_a(Load(10, "kVA"), 230, 1), 1)
    43.5

    References
    ----------
    .. [1] IEC 60050-131:2002, 131-11-42 (active power) and 131-11-41 (apparent
       power) of a balanced three-phase system, P = √3·U·I·cos φ.
    .. [2] contract.md: 1 hp = 0.746 kW shaft power.
    """
    if phases not in (1, 3):
        raise CircuitInputError(f"phases must be 1 or 3, not {phases}")
    if not voltage_v > 0:
        raise CircuitInputError(f"voltage {voltage_v} V must be greater than zero")
    if not 0 < power_factor <= 1:
        raise CircuitInputError(f"power factor {power_factor} is outside (0, 1]")
    if not 0 < efficiency <= 1:
        raise CircuitInputError(f"efficiency {efficiency} is outside (0, 1]")
    k = math.sqrt(3.0) if phases == 3 else 1.0
    if load.unit == "A":
        return float(load.value)
    if load.unit == "kVA":
        return load.value * 1000.0 / (k * voltage_v)
    if load.unit == "kW":
        power_w = load.value * 1000.0
    elif load.unit == "hp":
        power_w = load.value * HP_TO_KW * 1000.0
    else:
        raise UnknownKeyError(f"load unit {load.unit!r} is unknown: use kW, hp, kVA or A", value=load.unit)
    return power_w / efficiency / (k * voltage_v * power_factor)
