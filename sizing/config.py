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


def _starters() -> dict[str, tuple[float, float]]:
    # Starting current multiple of In and starting cos φ per starter kind:
    # common practice (typical motor and starter data), see motor_start.py.
    return {"dol": (7.0, 0.3), "star_delta": (2.5, 0.35), "soft": (3.5, 0.4), "drive": (1.2, 0.9)}


@dataclass(frozen=True)
class SizingConfig:
    """Settings of the sizing stage.

    Attributes
    ----------
    device_kind : str
        ``breaker`` or ``fuse`` (gG).
    standard : str
        Rule set: ``iec`` (IEC 60364, the only one written so far); ``nec`` is
        refused at start-up as not available yet.
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
    default_fault_ka : float or None
        Prospective three-phase fault current at a circuit's source when the
        schedule's ``fault_ka`` is blank [kA]; ``None`` (default): the
        short-circuit check is made only where a fault level is given.
    clearing_time_s : float or None
        Clearing time of the device for the adiabatic check [s] (IEC 60364-4-43:2008
        434.5.2); ``None`` (default): the check is made only for circuits whose
        schedule gives ``clearing_time_s`` or ``let_through_ka2s`` (maker's I²t
        of a current-limiting device).
    c_max, c_min : float
        Voltage factors for LV, IEC 60909-0:2016 Table 1 (1.05 for +6 %
        tolerance systems, 1.10 for +10 %; cmin 0.95).
    pe_rule : str
        Protective conductor: ``table`` (IEC 60364-5-54:2011 Table 54.2) or
        ``adiabatic`` (543.1.2).
    earthing : str
        ``TN`` (default) or ``TT``/``IT``; schedule column ``earthing`` wins.
        Disconnection is checked for TN only.
    ze_ohm : float or None
        Earth-fault loop impedance upstream of every circuit [Ω]; schedule
        column ``ze_ohm`` wins; ``None`` derives 2 x ZQ from the fault level
        (common practice), or, with no fault level either, takes 0 (the
        circuit's own loop only: an optimistic bound, said in the check).
    breaker_curve : str
        ``B``/``C``/``D`` (IEC 60898-1); schedule column ``curve`` wins.
    magnetic_a : float or None
        Instantaneous setting of adjustable breakers [A]; schedule column
        ``magnetic_a`` wins; ``None`` uses the curve.
    disconnection_voltage_factor : float
        c in Zs Ia <= c U0: 1.0 as IEC 60364-4-41:2005 411.4.4 is written.
    disconnection_upsize : bool
        True (default): a circuit that does not disconnect in time gets a
        larger cross-section (``governed_by`` ``disconnection``), up to
        ``disconnection_upsize_max_steps`` standard sizes; False: it fails with
        advice at once.
    disconnection_upsize_max_steps : int
        Most standard sizes the cross-section is raised for disconnection
        above the size the other checks need (3, common practice: beyond
        that a residual-current device, IEC 60364-4-41:2005 411.4.5, is the
        usual remedy); past it the circuit keeps the smaller size and fails
        with that advice.
    motor_start_dip_pct : float
        Limit of the voltage dip at a motor's terminals while starting [%];
        15 % (common practice: 10 % to 15 %).
    default_starter : str
        Starter when the schedule's ``starter`` is blank: ``dol``.
    starters : dict
        Starter kind -> (starting current multiple of In, starting cos φ);
        common practice, see :data:`.motor_start.DEFAULT_STARTERS`.
    motor_start_include_source : bool
        Add the source impedance (from the fault level) to the dip.
    """

    device_kind: str = "breaker"
    standard: str = "iec"
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
    default_fault_ka: float | None = None
    clearing_time_s: float | None = None
    c_max: float = 1.05
    c_min: float = 0.95
    pe_rule: str = "table"
    earthing: str = "TN"
    ze_ohm: float | None = None
    breaker_curve: str = "C"
    magnetic_a: float | None = None
    disconnection_voltage_factor: float = 1.0
    disconnection_upsize: bool = True
    disconnection_upsize_max_steps: int = 3
    motor_start_dip_pct: float = 15.0
    default_starter: str = "dol"
    starters: dict[str, tuple[float, float]] = field(default_factory=_starters)
    motor_start_include_source: bool = True

    def __hash__(self) -> int:  # dict fields: identity is enough for caching
        return id(self)

    def vd_limit_pct(self, load_type: str) -> float:
        """Voltage-drop limit for a load type [%] (``general`` when unknown)."""
        return self.vd_limits_pct.get(load_type, self.vd_limits_pct.get("general", 5.0))
