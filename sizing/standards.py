"""The rule set of ``[sizing] standard``: one entry point for every caller.

``"iec"`` sizes to IEC 60364 (:func:`.select.size_circuit`), ``"nec"`` to
NFPA 70:2023 (:func:`.nec.select.size_circuit_nec`); both return a
:class:`.model.SizingResult` (contract.md Extensions, ``[sizing] standard``).
"""

from __future__ import annotations

from cablewright.core.errors import UnknownKeyError

from .config import SizingConfig
from .model import CircuitSpec, SizingResult
from .nec.select import size_circuit_nec
from .select import size_circuit

__all__ = ["STANDARDS", "size_for_standard"]

#: ``[sizing] standard`` -> the function that sizes one circuit.
STANDARDS = {"iec": size_circuit, "nec": size_circuit_nec}


def size_for_standard(spec: CircuitSpec, config: SizingConfig | None = None) -> SizingResult:
    """Size one circuit with the rule set the config names.

    Raises
    ------
    UnknownKeyError
        ``standard`` is neither ``"iec"`` nor ``"nec"``.

    Examples
    --------
    >>> from cablewright.sizing.model import Load, CircuitSpec
    >>> spec = CircuitSpec("P-1", Load(55, "kW"), 400, design_length_m=60)
    >>> size_for_standard(spec).cable.label
    '16 mm²'
    """
    config = config or SizingConfig()
    try:
        sizer = STANDARDS[config.standard]
    except KeyError:
        raise UnknownKeyError(f"[sizing] standard {config.standard!r} is unknown: use 'iec' or 'nec'", value=config.standard
                              ) from None
    return sizer(spec, config)
