"""Voltage dip at a motor's terminals while it starts.

The starting current (a multiple of the full-load current) at the starting
power factor flows through the source and the cable; the dip is the voltage
drop at that current.  Starting data per starter kind are common practice
(typical values of motor and starter data sheets), all in the config.

References
----------
.. [1] IEC 60364-5-52:2009, 525 and Annex G (voltage-drop formula; the note
   to 525 allows greater drops during motor starting).
.. [2] IEC 60909-0:2016, 6.2 (source impedance from the fault level).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any, TypeVar

import numpy as np
import numpy.typing as npt
from cablewright.core.errors import UnknownKeyError

from .short_circuit import SOURCE_R_OVER_X, source_impedance_ohm
from .voltage_drop import voltage_drop_v

__all__ = [
    "StarterData",
    "STARTERS",
    "DEFAULT_STARTERS",
    "starter_data",
    "starting_dip_percent",
    "STAR_DELTA_CABLES",
    "STAR_DELTA_RUN_DROP_FACTOR",
    "STAR_DELTA_START_DROP_FACTOR",
    "is_star_delta",
    "starter_kind",
    "star_delta_winding_current_a",
]

#: A current [A]: one circuit's, or one per circuit (the batch core, sizing/batch).
_Current = TypeVar("_Current", float, npt.NDArray[np.float64])

STARTERS = ("dol", "star_delta", "soft", "drive")


@dataclass(frozen=True)
class StarterData:
    """Starting current multiple of In and starting cos φ of one starter kind.

    Attributes
    ----------
    current_multiple : float
        Starting current / full-load current.
    power_factor : float
        cos φ while starting.
    source : str
    """

    current_multiple: float
    power_factor: float
    source: str


#: Typical starting data, common practice (from memory of motor and starter
#: data sheets): direct-on-line 6-7 In (7 taken) at cos φ 0.3; star-delta about
#: a third of DOL (2.5 In taken) at 0.35; soft starter set to about 3.5 In at
#: 0.4; variable-speed drive about 1.2 In at the drive's input cos φ 0.9.
DEFAULT_STARTERS: dict[str, StarterData] = {
    "dol": StarterData(7.0, 0.3, "direct-on-line 7 In, cos φ 0.3 (common practice)"),
    "star_delta": StarterData(2.5, 0.35, "star-delta 2.5 In, cos φ 0.35 (common practice)"),
    "soft": StarterData(3.5, 0.4, "soft starter 3.5 In, cos φ 0.4 (common practice)"),
    "drive": StarterData(1.2, 0.9, "variable-speed drive 1.2 In, cos φ 0.9 (common practice)"),
}

_ALIASES = {
    "dol": "dol", "direct": "dol", "direct-on-line": "dol", "direct_on_line": "dol",
    "star_delta": "star_delta", "star-delta": "star_delta", "stardelta": "star_delta",
    "y-d": "star_delta", "soft": "soft", "soft_starter": "soft", "softstarter": "soft",
    "drive": "drive", "vsd": "drive", "vfd": "drive",
}


def starter_data(kind: str, table: Mapping[str, Any] | None = None) -> StarterData:
    """Starting data of a starter kind (schedule column ``starter``).

    Parameters
    ----------
    kind : str
        ``dol``, ``star_delta``, ``soft`` or ``drive`` (a few spellings accepted).
    table : mapping, optional
        Kind -> :class:`StarterData` or (current multiple, cos φ) from the
        config; kinds missing fall back to :data:`DEFAULT_STARTERS`.

    Examples
    --------
    >>> starter_data("DOL").current_multiple
    7.0
    >>> starter_data("soft", {"soft": (3.0, 0.45)}).current_multiple
    3.0
    """
    key = _ALIASES.get(str(kind).strip().lower())
    if key is None:
        raise UnknownKeyError(f"starter {kind!r} is unknown: use one of {', '.join(STARTERS)}", value=kind)
    value = (table or {}).get(key)
    if value is None:
        return DEFAULT_STARTERS[key]
    if isinstance(value, StarterData):
        return value
    multiple, pf = (float(v) for v in value)
    default = DEFAULT_STARTERS[key]
    if (multiple, pf) == (default.current_multiple, default.power_factor):
        return default
    return StarterData(multiple, pf, f"{key} {multiple:g} In, cos φ {pf:g} (config)")


def starting_dip_percent(
    full_load_current_a: float,
    starter: StarterData,
    length_m: float,
    csa_mm2: float,
    conductor: str,
    voltage_v: float,
    phases: int = 3,
    parallel: int = 1,
    conductor_temp_c: float = 90.0,
    source_fault_ka: float | None = None,
    cable_drop_factor: float = 1.0,
) -> float:
    """Voltage dip at the motor terminals while starting [%].

    .. math::

        \\Delta u = 100\\,\\frac{b\\,I_{st}\\,(R\\cos\\varphi_{st} + X\\sin\\varphi_{st})}{U}

    with b = √3 (3 phases) or 2 (1 phase), R and X of the cable (and, when the
    source fault level is given, of the source, R/X 0.1), I_st the starting
    current.

    Parameters
    ----------
    full_load_current_a : float
        Motor full-load current [A].
    starter : StarterData
        Starting current multiple and power factor.
    length_m : float
        Cable length [m].
    csa_mm2 : float
        Cross-section [mm²].
    conductor : str
        ``Cu`` or ``Al``.
    voltage_v : float
        Line-to-line (3 phases) or line-to-neutral (1 phase) [V].
    phases : int
        3 or 1.
    parallel : int
        Cables in parallel.
    conductor_temp_c : float
        Conductor temperature [°C] (the running temperature, conservative).
    source_fault_ka : float, optional
        Fault level at the source [kA]; adds the source impedance.
    cable_drop_factor : float
        Multiplies the cable's part: 1, or :data:`STAR_DELTA_START_DROP_FACTOR`
        for a star-delta motor with two cables counted as ``parallel`` = 2.

    Returns
    -------
    float
        Dip [%] of the nominal voltage.

    Examples
    --------
    A 30 kW DOL motor (about 55 A) on 100 m of 16 mm² copper at 400 V,
    7 x 55 A at cos φ 0.3, R at 90 °C:

    >>> round(starting_dip_percent(55, starter_data("dol"), 100, 16, "Cu", 400), 1)
    8.6

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex G (formula G.1).
    """
    i_st = starter.current_multiple * full_load_current_a
    dip_v = cable_drop_factor * voltage_drop_v(i_st, length_m, csa_mm2, conductor, phases,
                                               starter.power_factor, parallel, conductor_temp_c)
    if source_fault_ka:
        line_voltage = voltage_v if phases == 3 else voltage_v * math.sqrt(3.0)
        zq = source_impedance_ohm(source_fault_ka, line_voltage)
        xq = zq / math.sqrt(1.0 + SOURCE_R_OVER_X**2)
        rq = SOURCE_R_OVER_X * xq
        sin_phi = math.sqrt(max(0.0, 1.0 - starter.power_factor**2))
        b = math.sqrt(3.0) if phases == 3 else 2.0
        dip_v += b * i_st * (rq * starter.power_factor + xq * sin_phi)
    return 100.0 * dip_v / voltage_v


#: Cables of a star-delta motor circuit with the starter at the switchboard: two,
#: one to U1-V1-W1 and one to U2-V2-W2 (common practice).
STAR_DELTA_CABLES = 2

#: Running (delta): each winding is fed through one conductor of each cable, both
#: carrying the winding current I = Ib/√3, so the winding sees U - 2 I z L:
#: Δu = 2 (Ib/√3) z L / U, which is 4/3 of the three-phase formula √3 Ib z L / (2 U)
#: with the two cables counted in parallel (circuit theory of the delta connection).
STAR_DELTA_RUN_DROP_FACTOR = 4.0 / 3.0

#: Starting (star, star point at the starter): the line current flows out in one
#: cable and back in the other, Δu = 2 I z L / (U/√3) = 2√3 I z L / U, 4 x the
#: three-phase formula with the two cables counted in parallel.
STAR_DELTA_START_DROP_FACTOR = 4.0


def starter_kind(kind: str | None) -> str | None:
    """The canonical starter kind of a schedule ``starter`` (one of :data:`STARTERS`), or None.

    Examples
    --------
    >>> starter_kind("VFD"), starter_kind("Direct-on-line"), starter_kind("relay")
    ('drive', 'dol', None)
    """
    return None if kind is None else _ALIASES.get(str(kind).strip().lower())


def is_star_delta(kind: str | None) -> bool:
    """True when a schedule ``starter`` names a star-delta starter.

    Examples
    --------
    >>> is_star_delta("Y-D"), is_star_delta("dol"), is_star_delta(None)
    (True, False, False)
    """
    return starter_kind(kind) == "star_delta"


def star_delta_winding_current_a(line_current_a: _Current) -> _Current:
    """Current in each winding (and in each conductor of the two cables) in delta [A].

    .. math:: I_{ph} = I_L / \\sqrt{3}

    Examples
    --------
    >>> round(star_delta_winding_current_a(132.5), 1)
    76.5

    References
    ----------
    .. [1] IEC 60050-141:2004, polyphase circuits, delta connection (entry number
       from memory): the line current of a balanced delta is √3 x the phase current.
    """
    return line_current_a / math.sqrt(3.0)
