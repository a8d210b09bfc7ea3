"""Defaults of the sizing stage (contract.md "Sizing defaults"); all overridable."""

from __future__ import annotations

from dataclasses import dataclass, field

from .device import DEVICE_MARGIN, STANDARD_RATINGS_A

__all__ = ["SizingConfig"]


def _vd_limits() -> dict[str, float]:
    # 5 % for every load type: common practice (contract.md).  For reference,
    # IEC 60364-5-52:2009 Annex G Table G.52.1 gives 3 % lighting / 5 % other uses
    # for installations fed from a public LV network, 6 % / 8 % for a private supply.
    return {"general": 5.0, "lighting": 5.0, "motor": 5.0, "feeder": 5.0}


def _min_csa() -> dict[str, float]:
    # Copper 1.5 mm²: IEC 60364-5-52:2009 Table 52.2 (power circuits, cables).
    # Aluminium 16 mm²: common practice for terminations of aluminium cables.
    return {"Cu": 1.5, "Al": 16.0}


@dataclass(frozen=True)
class SizingConfig:
    """Settings of the sizing stage.

    Attributes
    ----------
    device_kind : str
        ``breaker`` or ``fuse`` (gG).
    device_margin : float
        In >= margin x Ib (1.25, common practice).
    standard_ratings_a : tuple of float
        Device ratings to choose from [A].
    voltage_3ph_v, voltage_1ph_v : float
        Default voltage, line-to-line (400 V) and line-to-neutral (230 V),
        IEC 60038:2009 Table 1.
    power_factor : float
        Default cos φ (0.85, contract.md).
    ambient_air_c, ground_c : float
        Air 30 °C and ground 20 °C, the reference conditions of the
        IEC 60364-5-52 Annex B tables.
    soil_resistivity_k_m_w : float
        2.5 K·m/W, the reference of IEC 60364-5-52 Annex B tables for D1/D2.
    depth_m : float
        Depth of laying for D1/D2, 0.7 m, IEC 60364-5-52:2009 B.52.2 note.
    vd_limits_pct : dict
        Voltage-drop limit per load type [%].
    min_csa_mm2 : dict
        Smallest cross-section allowed per conductor material [mm²].
    max_parallel : int
        Most cables in parallel per circuit (common practice: 8).
    max_single_csa_mm2 : float or None
        Largest cross-section of one cable before going parallel; ``None`` takes
        the largest the table lists.
    conductor_temp_for_vd : str
        ``"max"``: voltage drop at the insulation's maximum operating
        temperature (IEC 60364-5-52 Table 52.1), the conservative reading.
    """

    device_kind: str = "breaker"
    device_margin: float = DEVICE_MARGIN
    standard_ratings_a: tuple[float, ...] = STANDARD_RATINGS_A
    voltage_3ph_v: float = 400.0
    voltage_1ph_v: float = 230.0
    power_factor: float = 0.85
    ambient_air_c: float = 30.0
    ground_c: float = 20.0
    soil_resistivity_k_m_w: float = 2.5
    depth_m: float = 0.7
    vd_limits_pct: dict[str, float] = field(default_factory=_vd_limits)
    min_csa_mm2: dict[str, float] = field(default_factory=_min_csa)
    max_parallel: int = 8
    max_single_csa_mm2: float | None = None
    conductor_temp_for_vd: str = "max"

    def __hash__(self) -> int:  # dict fields: identity is enough for caching
        return id(self)

    def vd_limit_pct(self, load_type: str) -> float:
        """Voltage-drop limit for a load type [%] (``general`` when unknown)."""
        return self.vd_limits_pct.get(load_type, self.vd_limits_pct.get("general", 5.0))
