"""The NFPA 70 (NEC) rule set: AWG/kcmil conductors, chosen by ``[sizing] standard = "nec"``."""

from __future__ import annotations

from .select import size_circuit_nec

__all__ = ["size_circuit_nec"]
