"""Defaults of the sizing stage (contract.md "Sizing defaults"); all overridable."""

from __future__ import annotations

from dataclasses import dataclass, field

from cablewright.core.errors import UnknownKeyError

from .device import DEVICE_MARGIN, STANDARD_RATINGS_A
from .fill import DEFAULT_CABLE_OD_MM

__all__ = ["SizingConfig", "VD_LIMITS_G52_1_PCT"]


def _vd_limits() -> dict[str, float]:
    # Empty: the limits come from IEC 60364-5-52:2009 Table G.52.1 for the
    # config's ``supply`` (:data:`VD_LIMITS_G52_1_PCT`); a load type given here wins.
    return {}


#: IEC 60364-5-52:2009 Annex G, Table G.52.1: voltage drop from the origin of
#: the installation to the equipment [%], by supply and use: (lighting, other uses).
#: Type A: supplied directly from a public LV distribution system; type B:
#: supplied from a private LV supply (own transformer or generator).
VD_LIMITS_G52_1_PCT: dict[str, tuple[float, float]] = {"public": (3.0, 5.0), "private": (6.0, 8.0)}
#: Table G.52.1 note: beyond 100 m the limits may be raised by 0.005 % per metre,
#: at most by 0.5 %.
VD_LONG_RUN_FROM_M = 100.0
VD_LONG_RUN_PCT_PER_M = 0.005
VD_LONG_RUN_MAX_PCT = 0.5


def _min_csa() -> dict[str, float]:
    # Copper 1.5 mm²: IEC 60364-5-52:2009 Table 52.2 (power circuits, cables).
    # Aluminium 16 mm²: common practice for terminations of aluminium cables.
    return {"Cu": 1.5, "Al": 16.0}


def _drum_lengths() -> tuple[float, ...]:
    # Drum lengths offered for LV power cables: common practice (250, 500 and
    # 1000 m are the usual standard lengths; large sizes come on shorter drums).
    return (250.0, 500.0, 1000.0)


def _containment_mm() -> dict[str, float]:
    # Usable tray/ladder width or conduit/duct inner diameter per route layer [mm]:
    # common practice sizes (300 mm tray, 600 mm ladder, 50 mm conduit, 100 mm
    # duct); set the project's own sizes in [sizing.containment_mm].
    return {"ROUTE-TRAY": 300.0, "ROUTE-LADDER": 600.0, "ROUTE-CONDUIT": 50.0, "ROUTE-DUCT": 100.0}


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
        ``breaker`` or ``fuse`` (gG); the schedule column ``device_kind`` may
        also give ``motor_breaker`` (motor-protection circuit-breaker) or
        ``overload_relay`` (IEC 60947-4-1) per circuit.
    standard : str
        The rule set that sizes the circuits (contract.md Extensions):
        ``"iec"`` (default, IEC 60364, :func:`.select.size_circuit`) or ``"nec"``
        (NFPA 70:2023, AWG/kcmil, :func:`.nec.select.size_circuit_nec`).
    device_margin : float
        In >= margin x Ib; 1.0 (IEC 60364-4-43:2008 433.1: Ib <= In <= Iz, no
        margin).  1.25 (a continuous-load rule of some national codes) is an option.
    device_margin_by_load_type : dict
        Load type -> margin, overriding ``device_margin`` for that load type
        (empty by default).
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
        Voltage-drop limit per load type [%], overriding Table G.52.1 for that
        load type (empty by default); a circuit's ``vd_limit_pct`` wins over both.
    supply : str
        ``"public"`` (default: installation fed from a public LV network, Table
        G.52.1 type A: 3 % lighting, 5 % other uses) or ``"private"`` (own
        transformer or generator, type B: 6 % / 8 %).
    vd_long_run_allowance : bool
        Add the Table G.52.1 note's allowance to the limits from the table:
        0.005 % per metre of design length beyond 100 m, at most 0.5 % (True).
    min_csa_mm2 : dict
        Smallest cross-section allowed per conductor material [mm²].
    max_parallel : int
        Most cables in parallel per circuit (common practice: 8).
    max_single_csa_mm2 : float or None
        Largest cross-section of one cable before going parallel; ``None`` takes
        the largest the table lists.
    conductor_temp_for_vd : str
        ``"operating"`` (default): resistance at the temperature estimated from
        the load, θ = θa + (θmax - θa)(Ib/Iz)² (:func:`.voltage_drop.operating_temperature_c`);
        ``"max"``: at the insulation's maximum operating temperature
        (IEC 60364-5-52:2009 Table 52.1), the conservative reading.
    third_harmonic_pct_by_load_type : dict
        Third-harmonic content of the phase current per load type [%] when the
        schedule's ``third_harmonic_pct`` is blank (IEC 60364-5-52:2009 Annex E);
        empty by default (0 %: no harmonics assumed; give e.g. ``lighting = 20``
        for discharge lighting, a value of the installation's own survey).
    harmonics_envelope : bool
        Above 45 % never ask less than at 45 % (see :func:`.harmonics.harmonic_sizing`).
    ignore_lightly_loaded : bool
        IEC 60364-5-52:2009 523.5 / Table B.52.17 note: a cable expected to carry
        no more than 30 % of its grouped rating may be left out of the count for
        the rest of the group (clause number from memory).  Off by default; the
        report names it on every circuit it is applied to.
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
        (common practice), or, with no fault level either, takes
        ``assumed_ze_ohm`` and marks the result ``ze_assumed``.
    assumed_ze_ohm : float
        Ze taken when neither ``ze_ohm`` nor a fault level is known [Ω]:
        0.8 Ω, the typical maximum external loop impedance declared for
        TN-S public LV supplies (0.35 Ω for TN-C-S), values of UK
        distribution network operators as printed in BS 7671 guidance (from
        memory); the larger, conservative one is the default.
    industrial_instantaneous_multiple : float
        Instantaneous setting Ii / In of IEC 60947-2 breakers (above 125 A)
        with no ``magnetic_a``: 10 (common practice, the top of the usual
        range; conservative for disconnection).
    instantaneous_tolerance : float
        Tolerance of adjustable instantaneous releases about the setting:
        0.2, IEC 60947-2:2016 8.3.3.1.2 (from memory).
    source_z0_over_z1 : float
        Z(0)/Z(1) of the source for the line-to-neutral fault of 1-phase
        circuits: 1.0 (Dyn distribution transformer, common practice, from
        memory), IEC 60909-0:2016.
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
    drum_lengths_m : tuple of float
        Drum lengths for the drum plan of the bill of quantities [m]
        (common practice: 250, 500, 1000 m).
    cable_od_mm : dict
        Outer diameter per cable ``"<cores>x<csa>"`` [mm] for tray and duct fill;
        the project's values win over :data:`.fill.DEFAULT_CABLE_OD_MM`
        (typical maker data, from memory).
    containment_mm : dict
        Route layer -> usable tray/ladder width or conduit/duct inner diameter
        [mm] (common practice sizes by default).
    tray_fill_limit_pct : float
        Warning above this single-layer fill of a tray or ladder [%]; 80 %
        (common practice: a fifth of the width kept spare).
    duct_fill_limit_pct : float
        Warning above this area fill of a conduit or duct [%]; 40 % (common
        practice for three or more cables in a conduit).
    dol_motor_device_kind : str
        Device of a direct-on-line motor whose schedule row gives no
        ``device_kind``, ``curve`` or ``magnetic_a``: ``motor_breaker`` (common
        practice: a type C breaker trips on the starting peak); ``""`` uses
        ``device_kind``.
    star_delta_two_cables : bool
        True (default): a star-delta motor has its starter at the board and two
        cables to the motor, each carrying the winding current Ib/√3 and
        protected by the overload relay in the delta windings (common practice);
        False: one cable at Ib (starter at the motor).
    """

    device_kind: str = "breaker"
    standard: str = "iec"
    device_margin: float = DEVICE_MARGIN
    device_margin_by_load_type: dict[str, float] = field(default_factory=dict)
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
    conductor_temp_for_vd: str = "operating"
    supply: str = "public"
    vd_long_run_allowance: bool = True
    third_harmonic_pct_by_load_type: dict[str, float] = field(default_factory=dict)
    harmonics_envelope: bool = True
    ignore_lightly_loaded: bool = False
    default_fault_ka: float | None = None
    clearing_time_s: float | None = None
    c_max: float = 1.05
    c_min: float = 0.95
    pe_rule: str = "table"
    earthing: str = "TN"
    ze_ohm: float | None = None
    assumed_ze_ohm: float = 0.8
    industrial_instantaneous_multiple: float = 10.0
    instantaneous_tolerance: float = 0.2
    source_z0_over_z1: float = 1.0
    breaker_curve: str = "C"
    magnetic_a: float | None = None
    disconnection_voltage_factor: float = 1.0
    disconnection_upsize: bool = True
    disconnection_upsize_max_steps: int = 3
    motor_start_dip_pct: float = 15.0
    default_starter: str = "dol"
    starters: dict[str, tuple[float, float]] = field(default_factory=_starters)
    motor_start_include_source: bool = True
    drum_lengths_m: tuple[float, ...] = field(default_factory=_drum_lengths)
    cable_od_mm: dict[str, float] = field(default_factory=lambda: dict(DEFAULT_CABLE_OD_MM))
    containment_mm: dict[str, float] = field(default_factory=_containment_mm)
    tray_fill_limit_pct: float = 80.0
    duct_fill_limit_pct: float = 40.0
    star_delta_two_cables: bool = True
    dol_motor_device_kind: str = "motor_breaker"

    def __hash__(self) -> int:  # dict fields: identity is enough for caching
        return id(self)

    def vd_limit_pct(self, load_type: str, length_m: float = 0.0) -> float:
        """Voltage-drop limit for a load type and run length [%].

        ``vd_limits_pct[load_type]`` when given; otherwise IEC 60364-5-52:2009
        Table G.52.1 for ``supply`` (lighting, or other uses for every other
        load type), plus, with ``vd_long_run_allowance``, 0.005 % per metre
        beyond 100 m, at most 0.5 % (the table's note, which speaks of main
        wiring systems longer than 100 m; applied here to ``length_m``, the
        circuit's own design length).

        Examples
        --------
        >>> cfg = SizingConfig()
        >>> cfg.vd_limit_pct("lighting"), cfg.vd_limit_pct("motor"), cfg.vd_limit_pct("motor", 180.0)
        (3.0, 5.0, 5.4)
        """
        if load_type in self.vd_limits_pct:
            return float(self.vd_limits_pct[load_type])
        try:
            lighting, other = VD_LIMITS_G52_1_PCT[self.supply]
        except KeyError:
            raise UnknownKeyError(
                f"[sizing] supply {self.supply!r} is unknown: use 'public' or 'private' "
                "(IEC 60364-5-52:2009 Table G.52.1)", value=self.supply) from None
        limit = lighting if load_type == "lighting" else other
        if self.vd_long_run_allowance and length_m > VD_LONG_RUN_FROM_M:
            limit += min(VD_LONG_RUN_MAX_PCT, VD_LONG_RUN_PCT_PER_M * (length_m - VD_LONG_RUN_FROM_M))
        return limit

    def margin_for(self, load_type: str) -> float:
        """Device margin for a load type: ``device_margin_by_load_type`` or ``device_margin``."""
        return float(self.device_margin_by_load_type.get(load_type, self.device_margin))

    def third_harmonic_pct(self, load_type: str) -> float:
        """Default third-harmonic content for a load type [%] (0 when not given)."""
        return float(self.third_harmonic_pct_by_load_type.get(load_type, 0.0))
