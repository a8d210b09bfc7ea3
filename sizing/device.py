"""Protective devices: rating selection and the overload conditions.

Device kinds (IEC 60364-4-43 433.1 applies to both):

``breaker``
    Circuit-breaker, IEC 60898-1 up to 125 A, IEC 60947-2 above.
``fuse``
    gG fuse-link, IEC 60269-1 / IEC 60269-2.
``motor_breaker``
    Motor-protection circuit-breaker (IEC 60947-2 with an IEC 60947-4-1
    overload release): In is its current setting, the instantaneous release
    about 13 x that setting (:mod:`.disconnection`).
``overload_relay``
    Contactor with a thermal overload relay (IEC 60947-4-1): it protects the
    cable against overload only; short circuits and earth faults are cleared
    by the device backing it (give its ``magnetic_a``).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from cablewright.core.errors import NoCableLargeEnoughError, UnknownKeyError

__all__ = [
    "DEVICE_WORDS",
    "device_words",
    "STANDARD_RATINGS_A",
    "DEVICE_MARGIN",
    "DEVICE_KINDS",
    "DeviceSelection",
    "select_device",
    "conventional_operating_current_a",
    "required_iz_a",
]

#: Standard device ratings [A], contract.md "Sizing defaults" (the R10 series
#: of IEC 60059 / IEC 60898-1 preferred values, continued by IEC 60947-2).
STANDARD_RATINGS_A: tuple[float, ...] = (
    6, 10, 16, 20, 25, 32, 40, 50, 63, 80, 100, 125, 160, 200, 250, 315, 400, 500,
    630, 800, 1000, 1250, 1600,
)

#: In >= DEVICE_MARGIN x Ib: no margin by default, as IEC 60364-4-43:2008 433.1
#: asks Ib <= In <= Iz (contract.md, Extensions); 1.25 stays an option of the config.
DEVICE_MARGIN = 1.0

DEVICE_KINDS = ("breaker", "fuse", "motor_breaker", "overload_relay")
#: The device kinds in words, as the drawing's notes write them for the installer (the
#: config tokens above stay in the schedules; the words are the trade's usual names).
DEVICE_WORDS = {"breaker": "breaker", "fuse": "gG fuse", "motor_breaker": "motor breaker",
                "overload_relay": "overload relay"}


def device_words(kind: str) -> str:
    """A device kind in words (``"motor_breaker"`` -> ``"motor breaker"``); an unknown
    token with its underscores as spaces."""
    token = (kind or "").strip()
    return DEVICE_WORDS.get(token, token.replace("_", " "))


@dataclass(frozen=True)
class DeviceSelection:
    """A chosen device: kind, rating In and conventional operating current I2."""

    kind: str
    rating_a: float
    i2_a: float
    source: str


def conventional_operating_current_a(kind: str, rating_a: float) -> tuple[float, str]:
    """Conventional operating current I2 of a device, and its source.

    Parameters
    ----------
    kind : str
        ``"breaker"`` or ``"fuse"`` (gG).
    rating_a : float
        Rated current In [A].

    Returns
    -------
    (float, str)
        I2 [A] and the clause it is taken from.

    Notes
    -----
    - breaker up to 125 A: 1.45 In, IEC 60898-1:2015 Table 7 (conventional
      tripping current, from memory);
    - breaker above 125 A: 1.30 In, IEC 60947-2:2016 8.3.3.4 (from memory);
    - gG fuse: 1.6 In for In >= 16 A, 1.9 In for 4 A < In < 16 A, 2.1 In up to
      4 A, IEC 60269-1:2006 Table 2 conventional fusing current (from memory);
    - motor-protection breaker and overload relay: 1.20 x the current setting,
      the tripping limit of IEC 60947-4-1:2018 Table 3 for thermal overload
      relays (trip within 2 h at 1.20 Ie, from memory).

    Examples
    --------
    >>> conventional_operating_current_a("breaker", 100)[0]
    145.0
    >>> conventional_operating_current_a("fuse", 100)[0]
    160.0
    """
    if kind == "breaker":
        if rating_a <= 125:
            return 1.45 * rating_a, "IEC 60898-1:2015 Table 7, I2 = 1.45 In"
        return 1.30 * rating_a, "IEC 60947-2:2016 8.3.3.4, I2 = 1.30 In"
    if kind == "fuse":
        if rating_a >= 16:
            factor = 1.6
        elif rating_a > 4:
            factor = 1.9
        else:
            factor = 2.1
        return factor * rating_a, f"IEC 60269-1:2006 Table 2, gG, I2 = {factor} In"
    if kind in ("motor_breaker", "overload_relay"):
        return 1.20 * rating_a, "IEC 60947-4-1:2018 Table 3, overload release, I2 = 1.20 In (from memory)"
    raise UnknownKeyError(f"device kind {kind!r} is unknown: use one of {', '.join(DEVICE_KINDS)}", value=kind)


def select_device(
    design_current_a: float,
    kind: str = "breaker",
    margin: float = DEVICE_MARGIN,
    ratings_a: Sequence[float] = STANDARD_RATINGS_A,
) -> DeviceSelection:
    """The smallest standard rating In >= margin x Ib.

    Parameters
    ----------
    design_current_a : float
        Ib [A], > 0.
    kind : str
        ``"breaker"`` or ``"fuse"``.
    margin : float
        In >= margin x Ib, >= 1 (1.0 by default, IEC 60364-4-43:2008 433.1; 1.25 an option).
    ratings_a : sequence of float
        Standard ratings, ascending [A].

    Raises
    ------
    NoCableLargeEnoughError
        When Ib x margin exceeds the largest rating.

    Examples
    --------
    >>> select_device(93.4).rating_a, select_device(93.4, margin=1.25).rating_a
    (100, 125)
    >>> select_device(12.0, "fuse").rating_a
    16
    """
    if margin < 1:
        raise ValueError(f"device margin {margin} must be >= 1 (IEC 60364-4-43 433.1: Ib <= In)")
    needed = design_current_a * margin
    for rating in ratings_a:
        if rating >= needed - 1e-9:
            i2, source = conventional_operating_current_a(kind, rating)
            return DeviceSelection(kind, rating, i2, source)
    raise NoCableLargeEnoughError(
        f"design current {design_current_a:.1f} A x {margin} = {needed:.1f} A exceeds the largest "
        f"standard device rating {max(ratings_a):g} A: split the load or add larger ratings "
        "to the config"
    )


def required_iz_a(device: DeviceSelection) -> float:
    """The least Iz that satisfies IEC 60364-4-43 433.1 for ``device``.

    .. math:: I_z \\ge I_n \\quad\\text{and}\\quad I_2 \\le 1.45\\,I_z

    Examples
    --------
    >>> required_iz_a(select_device(80, "breaker", margin=1.0))
    80
    >>> round(required_iz_a(select_device(80, "fuse", margin=1.0)), 1)
    88.3

    References
    ----------
    .. [1] IEC 60364-4-43:2008, 433.1, conditions (433.1) and (433.2).
    """
    return max(device.rating_a, device.i2_a / 1.45)
