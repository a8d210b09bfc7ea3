"""Cable selection: device, cross-section, parallel cables, checks.

The procedure of IEC 60364-4-43 433.1 and IEC 60364-5-52 clause 523:

1. Ib from the load (:mod:`.load`), In from Ib (:mod:`.device`);
2. on every stretch of the route, Iz = n x It x (temperature, soil, grouping
   factors); the stretch with the lowest Iz governs;
3. the smallest cross-section with Iz >= max(In, I2/1.45) (433.1);
4. raised until every upsizing check passes, in this order (the first that
   fails names ``governed_by``): voltage drop, short circuit, motor start,
   and disconnection when the config asks (:mod:`.checks`);
5. parallel cables (equal sizes, each counted in the grouping,
   IEC 60364-5-52:2009 523.7) only where no single cable will do.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, replace
from functools import lru_cache
from typing import Any

from cablewright.core.errors import CableRouteError, CircuitInputError, UnknownKeyError

from .capacity_tables import canonical_method, sizes_for, tabulated_capacity
from .checks import ZE_ASSUMED_MESSAGE, PreparedChecks, _resistance_ohm_per_km, star_delta_cables
from .conductor_resistance import resistance_ohm_per_km
from .config import SizingConfig
from .correction_tables import (
    ambient_air_factor,
    ground_temperature_factor,
    route_grouping_factor,
    soil_resistivity_factor,
)
from .depth import REFERENCE_DEPTH_M, depth_factor_for_method
from .device import (
    DEVICE_KINDS,
    DeviceSelection,
    conventional_operating_current_a,
    required_iz_a,
    select_device,
)
from .harmonics import HarmonicSizing, harmonic_sizing
from .load import design_current_a
from .model import (
    CableSelection,
    Check,
    CircuitSpec,
    Factor,
    SizingResult,
    Stretch,
    VoltageDrop,
)
from .motor_start import (
    STAR_DELTA_CABLES,
    STAR_DELTA_RUN_DROP_FACTOR,
    star_delta_winding_current_a,
)
from .voltage_drop import (
    MAX_CONDUCTOR_TEMPERATURE_C,
    REACTANCE_MOHM_PER_M,
    annex_g_drop_percent,
    drop_percent,
    operating_temperature_c,
    voltage_drop_v,
)

__all__ = [
    "GROUND_METHODS",
    "AIR_METHODS",
    "Candidate",
    "SizingContext",
    "loaded_conductors",
    "stretch_rating",
    "size_circuit",
]

#: Reference methods in the ground (IEC 60364-5-52:2009 Table B.52.1): rated
#: at 20 °C ground, 2.5 K·m/W soil, 0.7 m deep.
GROUND_METHODS = frozenset({"D1", "D2"})
#: Reference methods in air, rated at 30 °C (IEC 60364-5-52:2009 B.52.2 ff).
AIR_METHODS = frozenset({"A1", "A2", "B1", "B2", "C", "E", "F", "F_flat", "G", "G_vertical"})
CONDUCTORS = ("Cu", "Al")
INSULATIONS = ("XLPE", "PVC")


def loaded_conductors(phases: int) -> int:
    """Loaded conductors of a circuit: 3 for 3 phases, 2 for 1 phase.

    The neutral of a balanced 3-phase circuit carries no load
    (IEC 60364-5-52:2009 523.6.3; harmonics per Annex E are not considered).
    """
    return 3 if phases == 3 else 2


@dataclass(frozen=True)
class Candidate:
    """A cable under test: size, parallel count, its Iz and governing stretch."""

    csa_mm2: float
    parallel: int
    capacity_a: float
    stretch_index: int


@dataclass(frozen=True)
class SizingContext:
    """What the checks need besides the spec and the candidate."""

    design_current_a: float
    device: DeviceSelection
    required_iz_a: float
    voltage_v: float
    cores: int
    vd_limit_pct: float
    conductor_temp_c: float
    harmonics: HarmonicSizing | None = None
    #: The device protecting the cable against overload when it is not ``device``
    #: (star-delta: the overload relay in the delta windings); ``None``: ``device``.
    cable_device: DeviceSelection | None = None
    #: Voltage drop over the three-phase formula (star-delta running: 4/3).
    vd_factor: float = 1.0

    @property
    def overload_device(self) -> DeviceSelection:
        """The device the checks of 433.1 are made with."""
        return self.cable_device or self.device
    device_margin: float | None = None


def _voltage_drop(spec: CircuitSpec, cand: Candidate, ctx: SizingContext,
                  conductor_temp_c: float) -> VoltageDrop:
    volts = voltage_drop_v(
        ctx.design_current_a, spec.design_length_m, cand.csa_mm2, spec.conductor, spec.phases,
        spec.power_factor, cand.parallel, conductor_temp_c,
    )
    volts *= ctx.vd_factor
    percent = drop_percent(volts, ctx.voltage_v)
    per_a_m = 1000.0 * volts / (ctx.design_current_a * spec.design_length_m) if spec.design_length_m > 0 else 0.0
    annex_g = annex_g_drop_percent(
        ctx.design_current_a, spec.design_length_m, cand.csa_mm2, spec.conductor, spec.phases,
        spec.power_factor, ctx.voltage_v, cand.parallel,
    ) * ctx.vd_factor
    return VoltageDrop(volts, percent, ctx.vd_limit_pct, per_a_m, annex_g)


def _voltage_drop_check(vd: VoltageDrop, temp_c: float, temp_rule: str, limit_source: str) -> Check:
    passed = vd.percent <= vd.limit_percent + 1e-9
    message = "" if passed else (
        f"voltage drop {vd.percent:.2f} % exceeds the {vd.limit_percent:g} % limit"
    )
    how = ("estimated from the load, θa + (θmax - θa)(Ib/Iz)², IEC 60287-1-1:2006 1.4"
           if temp_rule == "operating" else "maximum, IEC 60364-5-52:2009 Table 52.1")
    return Check("voltage_drop", passed, vd.percent, vd.limit_percent, "%",
                 f"IEC 60364-5-52:2009 525 and Annex G; conductor at {temp_c:.1f} °C ({how}); "
                 f"limit {limit_source}", message)


def circuit_vd_limit(spec: CircuitSpec, config: SizingConfig) -> tuple[float, str]:
    """The voltage-drop limit of a circuit [%] and where it comes from.

    The circuit's ``vd_limit_pct`` wins, then ``[sizing.vd_limits_pct]`` for
    its load type, then IEC 60364-5-52:2009 Table G.52.1 for the config's
    ``supply`` with the allowance of its note for runs beyond 100 m
    (:meth:`.config.SizingConfig.vd_limit_pct`).
    """
    if spec.vd_limit_pct is not None:
        return spec.vd_limit_pct, "schedule vd_limit_pct"
    if spec.load_type in config.vd_limits_pct:
        return config.vd_limit_pct(spec.load_type), f"config vd_limits_pct.{spec.load_type}"
    use = "lighting" if spec.load_type == "lighting" else "other uses"
    return (config.vd_limit_pct(spec.load_type, spec.design_length_m),
            f"IEC 60364-5-52:2009 Table G.52.1, {config.supply} supply, {use}")


def third_harmonic_pct(spec: CircuitSpec, config: SizingConfig) -> float:
    """Third-harmonic content of a circuit [%]: schedule ``third_harmonic_pct``,
    else the config's default for its load type (IEC 60364-5-52:2009 Annex E)."""
    text = spec.extra_value("third_harmonic_pct")
    if text is None:
        return config.third_harmonic_pct(spec.load_type)
    try:
        value = float(text.rstrip("%").strip().replace(",", "."))
    except ValueError:
        raise CircuitInputError(
            f"circuit {spec.circuit_id}: third_harmonic_pct {text!r} is not a number") from None
    if not 0.0 <= value <= 100.0:
        raise CircuitInputError(
            f"circuit {spec.circuit_id}: third_harmonic_pct {text!r} must be 0 to 100")
    return value


@lru_cache(maxsize=4096)
def _environment_factors(
    method: str, insulation: str, ambient_c: float, soil_k_m_w: float,
    depth_m: float = REFERENCE_DEPTH_M,
) -> tuple[Factor, ...]:
    if method in GROUND_METHODS:
        factors: tuple[Factor, ...] = (
            ground_temperature_factor(ambient_c, insulation),
            soil_resistivity_factor(soil_k_m_w, method),
        )
        if abs(depth_m - REFERENCE_DEPTH_M) > 1e-9:
            factors += (depth_factor_for_method(method, depth_m),)
        return factors
    return (ambient_air_factor(ambient_c, insulation),)


@lru_cache(maxsize=4096)
def _grouping(method: str, cables: int, trays: int, containment: str = "") -> Factor:
    return route_grouping_factor(method, cables, tiers=trays, containment=containment or "tray")


def stretch_factors(
    stretch: Stretch, spec: CircuitSpec, parallel: int, config: SizingConfig
) -> tuple[Factor, ...]:
    """Correction factors on one stretch for ``parallel`` cables of this circuit.

    Temperature (Table B.52.14 in air, B.52.15 in the ground), soil
    resistivity (B.52.16, ground only) and grouping (B.52.17 to B.52.21) of
    IEC 60364-5-52:2009, counting ``stretch.other_cables + parallel`` cables
    over ``stretch.trays`` tiers of the stretch's containment;
    in the ground also the depth of laying when it differs from the 0.7 m of
    the tables (:mod:`.depth`, from IEC 60287-2-1:2015).
    """
    method = _method_for(stretch.method, spec)
    env = _environment_factors(*_stretch_key(stretch, method, spec.insulation, config))
    cables = stretch.other_cables + parallel
    return env + (_grouping(method, cables, stretch.trays, stretch.containment),)


def _method_for(method: str, spec: CircuitSpec | None = None, cores: int | None = None) -> str:
    # Method names are read case-insensitively (F_FLAT is F_flat).  Single-core
    # cables on trays in free air are method F, multi-core E
    # (IEC 60364-5-52:2009 Table B.52.1, items 31 to 34).
    method = canonical_method(method)
    if cores is None and spec is not None:
        cores = spec.cores
    if method == "E" and cores == 1:
        return "F"
    return method


def stretch_rating(
    stretch: Stretch, spec: CircuitSpec, csa_mm2: float, parallel: int, config: SizingConfig
) -> tuple[float, float, tuple[Factor, ...]]:
    """Iz of ``parallel`` cables on one stretch: (Iz [A], product of factors, factors)."""
    method = _method_for(stretch.method, spec)
    tab = tabulated_capacity(method, spec.conductor, spec.insulation,
                             loaded_conductors(spec.phases), csa_mm2)
    factors = stretch_factors(stretch, spec, parallel, config)
    total = math.prod(f.value for f in factors)
    return parallel * tab.current_a * total, total, factors


def _validate(spec: CircuitSpec) -> None:
    if spec.conductor not in CONDUCTORS:
        raise UnknownKeyError(f"conductor {spec.conductor!r} is unknown: use Cu or Al", value=spec.conductor)
    if spec.insulation not in INSULATIONS:
        raise UnknownKeyError(f"insulation {spec.insulation!r} is unknown: use XLPE or PVC", value=spec.insulation)
    if spec.phases not in (1, 3):
        raise CircuitInputError(f"phases must be 1 or 3, not {spec.phases}")
    if spec.design_length_m < 0 or not math.isfinite(spec.design_length_m):
        raise CircuitInputError(f"length {spec.design_length_m} m must be zero or more")
    if not spec.stretches:
        raise CircuitInputError("no installation method given")


def size_circuit(spec: CircuitSpec, config: SizingConfig | None = None) -> SizingResult:
    """Size one circuit: device, cable, parallel count, checks.

    Parameters
    ----------
    spec : CircuitSpec
        The load, the supply and the installation stretches.
    config : SizingConfig, optional
        Defaults of contract.md when omitted.

    Returns
    -------
    SizingResult
        ``status`` ``ok`` when every check passes, ``fail`` when a cable was
        chosen but a check fails, ``error`` (with a message) when the circuit
        cannot be sized.  Never raises for a bad circuit.

    Examples
    --------
    >>> from cablewright.sizing.model import Load, CircuitSpec, Stretch
    >>> spec = CircuitSpec("P-1", Load(55, "kW"), 400, design_length_m=60,
    ...                    stretches=(Stretch(method="E", other_cables=0),))
    >>> r = size_circuit(spec)
    >>> r.device_rating_a, r.cable.csa_mm2, r.status
    (100, 16.0, 'fail')
    >>> r.ze_assumed, [c.name for c in r.checks if c.failed]
    (True, ['disconnection'])

    No Ze nor fault level: the config's assumed 0.8 Ω (a public TN-S supply)
    leaves no room for a 100 A type C breaker's 1000 A (IEC 60364-4-41 411.4.4).

    References
    ----------
    .. [1] IEC 60364-4-43:2008, 433.1.
    .. [2] IEC 60364-5-52:2009, 523 and Annex B.
    """
    config = config or SizingConfig()
    try:
        return _size(spec, config)
    except CableRouteError as exc:
        return SizingResult(spec.circuit_id, "error", (str(exc),), spec=spec)


# ------------------------------------------------------------- prepared path
# The built-in checks are prepared once per circuit (:class:`.checks.PreparedChecks`)
# and the capacity of a circuit for a size index is read from arrays built once
# per (methods, conductor, insulation, loaded conductors); the steps, their order
# and every float operation are those of the general path, so the result is the same.

#: :func:`tabulated_capacity` memoised: the cell (value, table, row) a result reports.
_tabulated = lru_cache(maxsize=4096)(tabulated_capacity)


@lru_cache(maxsize=256)
def _column(method: str, conductor: str, insulation: str, loaded: int) -> dict[float, float]:
    """Size -> It of one column of IEC 60364-5-52:2009 Annex B (:func:`tabulated_capacity`)."""
    return {s: tabulated_capacity(method, conductor, insulation, loaded, s).current_a
            for s in sizes_for(method, conductor, insulation, loaded)}


@lru_cache(maxsize=65536)
def _layout(methods: tuple[str, ...], conductor: str, insulation: str, loaded: int,
            upper: float, minimum: float) -> tuple[
                tuple[float, ...], tuple[float, ...], tuple[tuple[float, ...], ...], tuple[float, ...], bool]:
    """Sizes, allowed sizes and tabulated currents of every stretch's column.

    Returns ``(sizes, allowed, amps, amps_smallest, monotone)``: ``amps[s][i]``
    is It of stretch ``s`` at ``allowed[i]`` (IEC 60364-5-52:2009 Annex B),
    ``amps_smallest[s]`` It at ``sizes[0]``; ``monotone`` tells whether every
    column rises with the size (then the least passing size is found by bisection).
    """
    columns = [_column(m, conductor, insulation, loaded) for m in methods]
    common: set[float] | None = None
    for column in columns:
        common = set(column) if common is None else common & set(column)
    sizes = tuple(sorted(s for s in (common or ()) if s <= upper))
    allowed = tuple(s for s in sizes if s >= minimum - 1e-9)
    amps = tuple(tuple(column[s] for s in allowed) for column in columns)
    smallest = tuple(column[sizes[0]] for column in columns) if sizes else ()
    monotone = all(a[i] <= a[i + 1] for a in amps for i in range(len(a) - 1))
    return sizes, allowed, amps, smallest, monotone


@lru_cache(maxsize=16384)
def _stretch_total(method: str, insulation: str, ambient_c: float, soil_k_m_w: float,
                   depth_m: float, cables: int, trays: int, containment: str = ""
                   ) -> tuple[float, tuple[Factor, ...]]:
    """(product of the factors, factors) of one stretch: :func:`stretch_factors` memoised."""
    factors = (_environment_factors(method, insulation, ambient_c, soil_k_m_w, depth_m)
               + (_grouping(method, cables, trays, containment),))
    return math.prod(f.value for f in factors), factors


def _stretch_key(stretch: Stretch, method: str, insulation: str, config: SizingConfig
                 ) -> tuple[str, str, float, float, float]:
    """The environment of a stretch with the config's defaults filled in:
    (method, insulation, ambient or ground °C, soil K·m/W, depth m)."""
    depth = REFERENCE_DEPTH_M
    if method in GROUND_METHODS:
        depth = config.depth_m if stretch.depth_m is None else stretch.depth_m
        ambient = config.ground_c if stretch.ambient_c is None else stretch.ambient_c
        soil = (config.soil_resistivity_k_m_w if stretch.soil_resistivity_k_m_w is None
                else stretch.soil_resistivity_k_m_w)
    else:
        ambient = config.ambient_air_c if stretch.ambient_c is None else stretch.ambient_c
        soil = config.soil_resistivity_k_m_w
    return method, insulation, float(ambient), float(soil), float(depth)


def device_kind_for(spec: CircuitSpec, config: SizingConfig) -> str:
    """The kind of protective device of a circuit.

    The schedule's ``device_kind`` wins; a direct-on-line motor with no curve and
    no instantaneous setting given gets ``config.dol_motor_device_kind`` (a
    motor-protection circuit-breaker, IEC 60947-2 / IEC 60947-4-1, common
    practice: its high instantaneous release lets the motor start, where a type C
    breaker would trip on the starting peak); otherwise ``config.device_kind``.

    Examples
    --------
    >>> from cablewright.sizing.model import Load
    >>> motor = CircuitSpec("M-1", Load(11, "kW"), 400, load_type="motor")
    >>> device_kind_for(motor, SizingConfig()), device_kind_for(motor, SizingConfig(dol_motor_device_kind=""))
    ('motor_breaker', 'breaker')
    """
    given = spec.extra_value("device_kind")
    if given:
        return given
    dol = spec.extra_value("starter", config.default_starter) == "dol"
    if (config.dol_motor_device_kind and spec.load_type == "motor" and dol
            and not spec.extra_value("curve") and not spec.extra_value("magnetic_a")):
        return config.dol_motor_device_kind
    return config.device_kind


def _size(spec: CircuitSpec, config: SizingConfig,
          choice: tuple[int, int, str, bool] | None = None) -> SizingResult:
    # ``choice`` (size index, parallel, governed_by, upsize limited), as the batch core
    # (:mod:`.batch`) chose it: the record is built at that cable without the search.
    _validate(spec)
    cores = spec.cores or (4 if spec.phases == 3 else 3)
    ib = design_current_a(spec.load, spec.voltage_v, spec.phases, spec.power_factor, spec.efficiency)
    kind = device_kind_for(spec, config)
    if kind not in DEVICE_KINDS:
        raise UnknownKeyError(f"device_kind {kind!r} is unknown: use one of {', '.join(DEVICE_KINDS)}", value=kind)
    device = select_device(ib, kind, config.margin_for(spec.load_type), config.standard_ratings_a)
    need = required_iz_a(device)
    # Third harmonics, IEC 60364-5-52:2009 Annex E: a reduction factor on every
    # stretch's capacity, and above 33 % the cable carries the neutral current.
    harmonics = harmonic_sizing(ib, third_harmonic_pct(spec, config), spec.phases, cores,
                                config.harmonics_envelope)
    if harmonics.basis == "neutral":
        need = max(need, harmonics.current_a)
    limit, limit_source = circuit_vd_limit(spec, config)
    temp = MAX_CONDUCTOR_TEMPERATURE_C[spec.insulation]
    temp_rule = config.conductor_temp_for_vd
    if temp_rule not in ("operating", "max"):
        raise UnknownKeyError(
            f"[sizing] conductor_temp_for_vd {temp_rule!r} is unknown: use 'operating' or 'max'", value=temp_rule)
    operating = temp_rule == "operating"
    star = star_delta_cables(spec, config)
    relay = None
    if star:
        # Each of the two cables carries the winding current Ib/√3 and is protected by
        # the overload relay in the delta windings, set at that current (IEC 60947-4-1,
        # common practice); the cables count as parallel pairs.
        setting = STAR_DELTA_CABLES * star_delta_winding_current_a(ib)
        i2, i2_source = conventional_operating_current_a("overload_relay", setting)
        relay = DeviceSelection("overload_relay", setting, i2,
                                f"overload relay in the delta windings at Ib/√3 per cable; {i2_source}")
        need = required_iz_a(relay)
    ctx = SizingContext(ib, device, need, spec.voltage_v, cores, limit, temp, harmonics=harmonics,
                        cable_device=relay, vd_factor=STAR_DELTA_RUN_DROP_FACTOR if star else 1.0,
                        device_margin=config.margin_for(spec.load_type))

    conductor, insulation = spec.conductor, spec.insulation
    stretches = spec.stretches
    methods = tuple(_method_for(s.method, cores=cores) for s in stretches)
    sizes, allowed, amps, smallest, monotone = _layout(
        methods, conductor, insulation, loaded_conductors(spec.phases),
        config.max_single_csa_mm2 or math.inf, config.min_csa_mm2.get(conductor, 0.0))
    if not allowed:
        raise CircuitInputError(
            f"no cross-section of the tables for method(s) "
            f"{', '.join(sorted({s.method for s in stretches}))} is allowed by the config"
        )
    keys = [_stretch_key(s, m, insulation, config) for s, m in zip(stretches, methods, strict=True)]
    n_sizes, n_stretches = len(allowed), len(stretches)
    ambients = [k[2] for k in keys]

    # Voltage drop (voltage_drop_v, drop_percent) with its size-independent terms once.
    pf = spec.power_factor
    vd_a = (math.sqrt(3.0) if spec.phases == 3 else 2.0) * ib * spec.design_length_m * ctx.vd_factor
    vd_x_sin = REACTANCE_MOHM_PER_M / 1000.0 * math.sqrt(max(0.0, 1.0 - pf * pf))
    voltage = spec.voltage_v
    vd_limit = limit + 1e-9
    prep = PreparedChecks(spec, config, ib, device, voltage, temp)
    short_circuit, motor, disconnection = prep.short_circuit, prep.motor_start, prep.disconnection
    disconnection_upsize = prep.disconnection_upsize
    max_steps = int(getattr(config, "disconnection_upsize_max_steps", 3))

    def vd_temperature(index: int, parallel: int, totals: list[float]) -> float:
        # operating_temperature_c on every stretch, the hottest taken for the whole run
        if not operating:
            return temp
        if n_stretches == 1:
            return operating_temperature_c(ambients[0], temp, ib, parallel * amps[0][index] * totals[0])
        return max(operating_temperature_c(ambients[s], temp, ib, parallel * amps[s][index] * totals[s])
                   for s in range(n_stretches))

    def first_failing(index: int, parallel: int, totals: list[float]) -> str | None:
        # the upsize checks in order: voltage_drop, short_circuit, motor_start, disconnection.
        csa = allowed[index]
        if operating:
            r = resistance_ohm_per_km(csa, conductor, vd_temperature(index, parallel, totals)) / 1000.0
        else:
            r = _resistance_ohm_per_km(csa, conductor, temp) / 1000.0
        if not 100.0 * (vd_a * (r * pf + vd_x_sin) / parallel) / voltage <= vd_limit:
            return "voltage_drop"
        if not short_circuit.passes(csa):
            return "short_circuit"
        if not motor.passes(csa, parallel):
            return "motor_start"
        return None

    def disconnection_index(index: int, parallel: int) -> int:
        # Earth-fault disconnection (IEC 60364-4-41:2005 411.4.4): raise the size by at
        # most max_steps standard sizes above the one the other checks need; past that
        # the smaller size is kept and the check fails with the advice of an RCD.
        if not disconnection_upsize or disconnection.passes(allowed[index], parallel):
            return index
        for step in range(index + 1, min(n_sizes, index + max_steps + 1)):
            if disconnection.passes(allowed[step], parallel):
                return step
        disconnection.upsize_limited = max_steps
        return index

    def capacity(index: int, parallel: int, totals: list[float]) -> tuple[float, int]:
        best, best_s = parallel * amps[0][index] * totals[0], 0
        for s in range(1, n_stretches):
            iz = parallel * amps[s][index] * totals[s]
            if iz < best:
                best, best_s = iz, s
        return best, best_s

    if choice is not None:
        return _chosen_result(spec, ctx, prep, allowed, amps, methods, keys, choice, capacity,
                              vd_temperature, temp_rule, limit_source, max_steps)
    threshold = need - 1e-9
    first_ok = None
    last_tried = None
    step = STAR_DELTA_CABLES if star else 1
    for parallel in range(step, config.max_parallel + 1, step):
        rated = [_stretch_total(*k, stretches[s].other_cables + parallel, stretches[s].trays,
                                stretches[s].containment)
                 for s, k in enumerate(keys)]
        if harmonics.factor != 1.0:
            hf = Factor("harmonics", harmonics.factor, "IEC 60364-5-52:2009 Annex E, Table E.52.1",
                        harmonics.detail)
            rated = [(t * hf.value, f + (hf,)) for t, f in rated]
        totals = [t for t, _ in rated]
        if monotone:
            lo, hi = 0, n_sizes
            while lo < hi:
                mid = (lo + hi) // 2
                if capacity(mid, parallel, totals)[0] >= threshold:
                    hi = mid
                else:
                    lo = mid + 1
            index = lo if lo < n_sizes else None
        else:
            index = next((i for i in range(n_sizes)
                          if capacity(i, parallel, totals)[0] >= threshold), None)
        if index is None:
            continue
        governed = "capacity"
        if index == 0 and allowed[0] > sizes[0]:
            below = min(parallel * smallest[s] * totals[s] for s in range(n_stretches))
            if below >= need:
                governed = "minimum"
        if first_ok is None:
            first_ok = (index, parallel, governed, rated, totals)
        while True:
            failing = first_failing(index, parallel, totals)
            if failing is None:
                upsized = disconnection_index(index, parallel)
                if upsized != index:
                    index, governed = upsized, "disconnection"
                return _prepared_result(spec, ctx, prep, allowed, amps, methods, index, parallel,
                                        governed, rated, capacity(index, parallel, totals),
                                        vd_temperature(index, parallel, totals), temp_rule,
                                        limit_source)
            index += 1
            if index >= n_sizes:
                # nothing at this count passes: remember the largest tried, so that a
                # harder case never shows a smaller cable than an easier one
                last_tried = (n_sizes - 1, parallel, failing, rated, totals)
                break
            governed = failing
    if last_tried is not None:
        first_ok = last_tried
    if first_ok is None:
        raise CircuitInputError(
            f"design current {ib:.1f} A needs Iz >= {need:.1f} A: beyond {config.max_parallel} "
            f"parallel cables of {allowed[-1]:g} mm² under these conditions; split the load, "
            "change the route or raise max_parallel in the config"
        ) from None
    index, parallel, governed, rated, totals = first_ok
    return _prepared_result(spec, ctx, prep, allowed, amps, methods, index, parallel, governed,
                            rated, capacity(index, parallel, totals),
                            vd_temperature(index, parallel, totals), temp_rule, limit_source)


def _chosen_result(spec: CircuitSpec, ctx: SizingContext, prep: PreparedChecks,
                   allowed: tuple[float, ...], amps: tuple[tuple[float, ...], ...],
                   methods: tuple[str, ...], keys: list[tuple[str, str, float, float, float]],
                   choice: tuple[int, int, str, bool],
                   capacity: Callable[[int, int, list[float]], tuple[float, int]],
                   vd_temperature: Callable[[int, int, list[float]], float], temp_rule: str,
                   limit_source: str, max_steps: int) -> SizingResult:
    # The record of a cable chosen elsewhere (the batch core), with the loop's factors.
    index, parallel, governed, limited = choice
    stretches = spec.stretches
    rated = [_stretch_total(*k, stretches[s].other_cables + parallel, stretches[s].trays,
                            stretches[s].containment) for s, k in enumerate(keys)]
    h = ctx.harmonics
    if h is not None and h.factor != 1.0:
        hf = Factor("harmonics", h.factor, "IEC 60364-5-52:2009 Annex E, Table E.52.1", h.detail)
        rated = [(t * hf.value, f + (hf,)) for t, f in rated]
    totals = [t for t, _ in rated]
    if limited:
        prep.disconnection.upsize_limited = max_steps
    return _prepared_result(spec, ctx, prep, allowed, amps, methods, index, parallel, governed,
                            rated, capacity(index, parallel, totals),
                            vd_temperature(index, parallel, totals), temp_rule, limit_source)


def _prepared_result(spec: CircuitSpec, ctx: SizingContext, prep: PreparedChecks,
                     allowed: tuple[float, ...], amps: tuple[tuple[float, ...], ...],
                     methods: tuple[str, ...], index: int, parallel: int, governed: str,
                     rated: list[tuple[float, tuple[Factor, ...]]], rating: tuple[float, int],
                     vd_temp_c: float, temp_rule: str, limit_source: str) -> SizingResult:
    _, stretch_index = rating
    csa = allowed[index]
    total, factors = rated[stretch_index]
    iz = parallel * amps[stretch_index][index] * total
    cand = Candidate(csa, parallel, iz, stretch_index)
    checks = _base_checks(ctx, iz)
    vd = replace(_voltage_drop(spec, cand, ctx, vd_temp_c), limit_source=limit_source)
    checks.append(_voltage_drop_check(vd, vd_temp_c, temp_rule, limit_source))
    checks.extend(prep.report(csa, parallel))
    return _assemble(spec, cand, governed, ctx, spec.stretches[stretch_index],
                     methods[stretch_index], iz, total, factors, checks, vd,
                     prep.extras(csa, parallel), getattr(prep.disconnection, "ze", 0.0))


def _base_checks(ctx: SizingContext, iz: float) -> list[Check]:
    out = [
        Check("design_current", ctx.design_current_a <= ctx.device.rating_a, ctx.design_current_a,
              ctx.device.rating_a, "A", "IEC 60364-4-43:2008 433.1 (433.1): Ib <= In"),
        Check("capacity", ctx.overload_device.rating_a <= iz + 1e-9, ctx.overload_device.rating_a,
              iz, "A", "IEC 60364-4-43:2008 433.1 (433.1): In <= Iz"
              + ("" if ctx.cable_device is None else f"; {ctx.cable_device.source}")),
        Check("overload", ctx.overload_device.i2_a <= 1.45 * iz + 1e-9, ctx.overload_device.i2_a,
              1.45 * iz, "A",
              f"IEC 60364-4-43:2008 433.1 (433.2): I2 <= 1.45 Iz; {ctx.overload_device.source}"),
    ]
    h = ctx.harmonics
    if h is not None and h.basis == "neutral":
        out.append(Check("neutral_current", h.current_a <= iz + 1e-9, h.current_a, iz, "A",
                         f"IEC 60364-5-52:2009 Annex E, Table E.52.1: {h.detail}; "
                         f"neutral 3 h Ib = {h.neutral_current_a:.1f} A"))
    return out


def _assemble(spec: CircuitSpec, cand: Candidate, governed: str, ctx: SizingContext,
              stretch: Stretch, method: str, iz: float, total: float,
              factors: tuple[Factor, ...], checks: list[Check], vd: VoltageDrop | None,
              extras: dict[str, Any], ze_assumed_ohm: float = 0.0) -> SizingResult:
    messages = [c.message or f"{c.name} check fails" for c in checks if c.failed]
    status = "fail" if messages else "ok"
    if extras.get("ze_assumed"):
        messages.append(ZE_ASSUMED_MESSAGE.format(ze=ze_assumed_ohm))
        status = "warning" if status == "ok" else status
    if spec.design_length_m <= 0:
        messages.append("no length given: voltage drop not checked")
        status = "warning" if status == "ok" else status
    if ctx.cable_device is not None:
        messages.append(
            f"star-delta: {cand.parallel} cables to the motor, each carrying the winding current "
            f"Ib/√3 = {ctx.design_current_a / math.sqrt(3.0):.1f} A, protected by the overload "
            "relay in the delta windings")
    elif cand.parallel > 1:
        messages.append(
            f"{cand.parallel} cables in parallel: equal length, cross-section and route "
            "required (IEC 60364-5-52:2009 523.7)"
        )
    grouping = next((f for f in factors if f.name == "grouping"), None)
    tab = _tabulated(method, spec.conductor, spec.insulation, loaded_conductors(spec.phases),
                     cand.csa_mm2)
    cable = CableSelection(spec.conductor, spec.insulation, ctx.cores, cand.csa_mm2,
                           cand.parallel, iz, governed)
    return SizingResult(
        circuit_id=spec.circuit_id,
        status=status,
        messages=tuple(messages),
        load_current_a=ctx.design_current_a,
        device_rating_a=ctx.device.rating_a,
        device_kind=ctx.device.kind,
        method=method,
        governing_segment=stretch.segment_id,
        cables_in_group=stretch.other_cables + cand.parallel,
        grouping_factor=grouping.value if grouping else 1.0,
        correction_factor=total,
        factors=factors,
        required_capacity_a=ctx.required_iz_a / total,
        cable=cable,
        voltage_drop=vd,
        checks=tuple(checks),
        **extras,
        spec=spec,
        device_margin=ctx.device_margin,
        device_source=ctx.device.source,
        tabulated_capacity_a=tab.current_a,
        capacity_table=tab.source,
        capacity_detail=tab.detail,
    )
