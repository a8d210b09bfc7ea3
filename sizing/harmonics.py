"""Third-harmonic currents in four- and five-core cables, IEC 60364-5-52:2009 Annex E.

In a balanced three-phase circuit the third harmonics of the three phases add
in the neutral: the neutral carries ``3 x h x Ib`` (h the third-harmonic
content of the phase current).  Table E.52.1 gives a reduction factor on the
tabulated capacity of a cable with four or five cores (neutral of the same
material and cross-section as the phases) and says whether the cable is chosen
on the phase or on the neutral current.

==============================  ==================  ==================
third harmonic in the phase, %  size on             reduction factor
==============================  ==================  ==================
0 to 15                         phase current       1.0
> 15 to 33                      phase current       0.86
> 33 to 45                      neutral current     0.86
> 45                            neutral current     1.0
==============================  ==================  ==================

References
----------
.. [1] IEC 60364-5-52:2009, Annex E (informative), Table E.52.1 and the worked
   example that follows it (39 A, four-core PVC cable, method C).
"""

from __future__ import annotations

from dataclasses import dataclass

from cablewright.core.errors import OutOfRangeError

__all__ = [
    "E_52_1",
    "HarmonicRow",
    "HarmonicSizing",
    "neutral_current_a",
    "table_e52_1",
    "harmonic_sizing",
]

E_52_1_SOURCE = "IEC 60364-5-52:2009 Annex E, Table E.52.1"
_NO_HARMONICS = "third harmonic 0 %: row 0 to 15 %, on the phase current, factor 1"


@dataclass(frozen=True)
class HarmonicRow:
    """One row of Table E.52.1: ``low_pct < h <= high_pct`` (the first row from 0 %)."""

    low_pct: float
    high_pct: float
    basis: str  # "phase" or "neutral": the current the cable is chosen on
    factor: float


#: IEC 60364-5-52:2009 Annex E Table E.52.1, values as printed (unit: 1).
E_52_1: tuple[HarmonicRow, ...] = (
    HarmonicRow(0.0, 15.0, "phase", 1.0),
    HarmonicRow(15.0, 33.0, "phase", 0.86),
    HarmonicRow(33.0, 45.0, "neutral", 0.86),
    HarmonicRow(45.0, 100.0, "neutral", 1.0),
)


@dataclass(frozen=True)
class HarmonicSizing:
    """What the third harmonics ask of a cable.

    Attributes
    ----------
    factor : float
        Reduction factor on the capacity (Table E.52.1).
    basis : str
        ``"phase"``, ``"neutral"`` or ``"not_applicable"``.
    current_a : float
        The current the reduced capacity must carry [A]: the phase current, or
        the neutral current (never less than the phase current).
    neutral_current_a : float
        3 h Ib [A] (0 where not applicable).
    detail : str
        The row read, or why the table does not apply.
    """

    factor: float
    basis: str
    current_a: float
    neutral_current_a: float
    detail: str


def neutral_current_a(phase_current_a: float, third_harmonic_pct: float) -> float:
    """Neutral current of a balanced three-phase circuit from its third harmonics [A].

    .. math:: I_N = 3\\,\\frac{h}{100}\\,I_b

    Parameters
    ----------
    phase_current_a : float
        Design (phase) current Ib [A].
    third_harmonic_pct : float
        Third-harmonic content of the phase current, h [%].

    Returns
    -------
    float
        I_N [A].

    Examples
    --------
    The Annex E example, 39 A with 40 % third harmonic:

    >>> round(neutral_current_a(39.0, 40.0), 1)
    46.8

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex E, E.1 and the example.
    """
    return 3.0 * third_harmonic_pct / 100.0 * phase_current_a


def table_e52_1(third_harmonic_pct: float) -> HarmonicRow:
    """The row of Table E.52.1 for a third-harmonic content [%].

    Parameters
    ----------
    third_harmonic_pct : float
        h [%], 0 to 100.

    Returns
    -------
    HarmonicRow
        Basis (phase or neutral) and reduction factor.

    Raises
    ------
    OutOfRangeError
        h below 0 % or above 100 %.

    Examples
    --------
    >>> table_e52_1(20).factor, table_e52_1(40).basis
    (0.86, 'neutral')

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex E, Table E.52.1.
    """
    h = float(third_harmonic_pct)
    if not 0.0 <= h <= 100.0:
        raise OutOfRangeError(
            f"third-harmonic content {h:g} % is outside 0 to 100 % ({E_52_1_SOURCE})")
    for row in E_52_1:
        if h <= row.high_pct:
            return row
    return E_52_1[-1]


def harmonic_sizing(phase_current_a: float, third_harmonic_pct: float, phases: int = 3,
                    cores: int = 4, envelope: bool = True) -> HarmonicSizing:
    """The reduction factor and the current to size a cable on, Table E.52.1.

    The capacity after all other corrections, times ``factor``, must carry
    ``current_a``: the phase current up to 33 %, above it the neutral current
    3 h Ib (Annex E).  The table applies to three-phase circuits in cables of
    four or five cores (or single-core cables with a neutral); a three-core
    cable has no neutral and a single-phase neutral carries the phase current,
    so there it does not apply (factor 1).

    Parameters
    ----------
    phase_current_a : float
        Ib [A].
    third_harmonic_pct : float
        h [%].
    phases : int
        1 or 3.
    cores : int
        Cores of one cable (1 for single-core cables).
    envelope : bool
        Table E.52.1 read literally asks less of the cable just above 45 %
        (3 x 0.46 / 1.0 = 1.38 Ib) than at 45 % (3 x 0.45 / 0.86 = 1.57 Ib).
        With ``envelope`` (default) the current above 45 % is never taken below
        the 45 % requirement, so more harmonics never give a smaller cable (our
        conservative reading; it changes nothing at 52.3 % and above).

    Returns
    -------
    HarmonicSizing

    Examples
    --------
    >>> s = harmonic_sizing(39.0, 20.0)
    >>> s.factor, s.basis, s.current_a
    (0.86, 'phase', 39.0)

    References
    ----------
    .. [1] IEC 60364-5-52:2009, Annex E, Table E.52.1 and its example.
    """
    if phases != 3 or cores not in (1, 4, 5):
        why = "single phase" if phases != 3 else f"{cores}-core cable, no neutral in the cable"
        return HarmonicSizing(1.0, "not_applicable", phase_current_a, 0.0,
                              f"Table E.52.1 not applicable: {why}")
    if third_harmonic_pct == 0:
        return HarmonicSizing(1.0, "phase", phase_current_a, 0.0, _NO_HARMONICS)
    row = table_e52_1(third_harmonic_pct)
    i_n = neutral_current_a(phase_current_a, third_harmonic_pct)
    detail = (f"third harmonic {third_harmonic_pct:g} %: row {row.low_pct:g} to "
              f"{row.high_pct:g} %, on the {row.basis} current, factor {row.factor:g}")
    if row.basis == "phase":
        return HarmonicSizing(row.factor, "phase", phase_current_a, i_n, detail)
    current = max(phase_current_a, i_n)
    if envelope and row.factor == 1.0:
        top = E_52_1[2]
        at_45 = neutral_current_a(phase_current_a, top.high_pct) / top.factor
        if at_45 > current:
            current = at_45
            detail += (f"; not less than the 45 % requirement {at_45:.1f} A "
                       "(conservative reading, see harmonic_sizing)")
    return HarmonicSizing(row.factor, "neutral", current, i_n, detail)
