"""Circuits as columns: the batch core's inputs as numpy arrays, one row per circuit.

:func:`columns_from_specs` reads a list of :class:`~cablewright.sizing.model.CircuitSpec`
(what the pipeline builds) into :class:`CircuitColumns`.  The schedule's further
fields (starter, device kind, curve, Ze, ...) are resolved with the engine's own
readers (:mod:`cablewright.sizing.select`, :mod:`cablewright.sizing.checks`), once
per distinct combination; whatever the core does not cover is declined with a
reason (:data:`DECLINE_REASONS`) and left to the per-circuit engine.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any, NamedTuple, TypedDict

import numpy as np
import numpy.typing as npt
from cablewright.core.errors import CableRouteError

from ..checks import (
    _clearing_time_s,
    _earthing,
    _extra_float,
    _fault_ka,
    _ze_ohm,
    star_delta_cables,
)
from ..config import SizingConfig
from ..device import DEVICE_KINDS
from ..model import CircuitSpec
from ..motor_start import starter_data, starter_kind
from ..select import (
    CONDUCTORS,
    INSULATIONS,
    _method_for,
    _stretch_key,
    circuit_vd_limit,
    device_kind_for,
    loaded_conductors,
    third_harmonic_pct,
)
from .arrays import BoolArray, FloatArray, IntArray

__all__ = ["DECLINE_REASONS", "MAX_STRETCHES", "CircuitColumns", "columns_from_specs"]

#: Why a circuit is left to the per-circuit engine (index = code; 0: not declined).
DECLINE_REASONS = (
    "",
    "rule set not IEC or a config branch the core does not cover (pe_rule adiabatic)",
    "input the engine refuses (its error record says why)",
    "more stretches than MAX_STRETCHES",
    "no table column for the installation method(s)",
    "device or release outside its tables",
    "no cable within max_parallel",
)
#: Stretches per circuit the core holds as columns (the pipeline keeps one per installation).
MAX_STRETCHES = 8
#: Load units in the order of :func:`cablewright.sizing.load.design_current_a`'s branches.
LOAD_UNITS = ("A", "kVA", "kW", "hp")
#: A layout: sorted installation methods, conductor, insulation, loaded conductors.
_Layout = tuple[tuple[str, ...], str, str, int]


class CircuitContext(NamedTuple):
    """What a circuit's further schedule fields and the config decide, resolved once."""

    kind: int
    third_harmonic_pct: float
    star: bool
    starter_multiple: float
    starter_pf: float
    drive: bool
    curve: str
    magnetic_a: float
    tn: bool
    ze_ohm: float
    ze_assumed: bool
    clearing_time_s: float
    let_through_ka2s: float


@dataclass(frozen=True)
class CircuitColumns:
    """The batch core's inputs; ``nan`` stands for "not given".

    Per circuit (shape ``(n,)``): the load (``load_value`` in ``LOAD_UNITS[load_unit]``),
    ``voltage_v``, ``phases``, ``power_factor``, ``efficiency``, ``length_m``,
    ``cores``, ``fault_ka``, ``conductor``/``insulation`` (indices of
    ``CONDUCTORS``/``INSULATIONS``), ``load_type`` (index of ``load_types``), the
    resolved further fields (``kind`` index of ``DEVICE_KINDS``, ``margin``, ...),
    ``vd_limit_pct``, ``layout`` (index of ``layouts``: sorted methods, conductor,
    insulation, loaded conductors) and ``declined`` (index of
    :data:`DECLINE_REASONS`).  Per stretch (shape ``(n, MAX_STRETCHES)``, ``slot``
    -1 where a circuit has fewer): ``slot`` (index of the method in its layout),
    ``method`` (index of ``method_names``), ``ambient_c``, ``soil_k_m_w``,
    ``depth_m``, ``other_cables``, ``trays``, ``containment`` (index of
    ``containments``).
    """

    n: int
    load_value: FloatArray
    load_unit: IntArray
    voltage_v: FloatArray
    phases: IntArray
    power_factor: FloatArray
    efficiency: FloatArray
    length_m: FloatArray
    cores: IntArray
    fault_ka: FloatArray
    conductor: IntArray
    insulation: IntArray
    load_type: IntArray
    load_types: tuple[str, ...]
    kind: IntArray
    margin: FloatArray
    third_harmonic_pct: FloatArray
    star: BoolArray
    motor: BoolArray
    starter_multiple: FloatArray
    starter_pf: FloatArray
    drive: BoolArray
    curve: IntArray
    curves: tuple[str, ...]
    magnetic_a: FloatArray
    tn: BoolArray
    ze_ohm: FloatArray
    ze_assumed: BoolArray
    clearing_time_s: FloatArray
    let_through_ka2s: FloatArray
    vd_limit_pct: FloatArray
    layout: IntArray
    layouts: tuple[_Layout, ...]
    slot: IntArray
    method: IntArray
    method_names: tuple[str, ...]
    ambient_c: FloatArray
    soil_k_m_w: FloatArray
    depth_m: FloatArray
    other_cables: IntArray
    trays: IntArray
    containment: IntArray
    containments: tuple[str, ...]
    declined: IntArray


def _nan(value: float | None) -> float:
    return math.nan if value is None else float(value)


def _context(spec: CircuitSpec, config: SizingConfig) -> CircuitContext | None:
    """The further fields of one circuit read as the engine reads them; None: declined."""
    try:
        kind = device_kind_for(spec, config)
        if kind not in DEVICE_KINDS:
            return None
        harmonic = third_harmonic_pct(spec, config)
        multiple = pf = math.nan
        drive = False
        starter = spec.extra_value("starter", config.default_starter)
        if spec.load_type == "motor":
            data = starter_data(starter, config.starters)
            multiple, pf = data.current_multiple, data.power_factor
            drive = starter_kind(starter) == "drive"
        curve = spec.extra_value("curve", config.breaker_curve)
        magnetic = _extra_float(spec, "magnetic_a", config.magnetic_a)
        tn = _earthing(spec, config).startswith("TN")
        ze, _, assumed = _ze_ohm(spec, config) if tn else (math.nan, "", False)
        clearing = let_through = None
        if _fault_ka(spec, config) is not None:
            clearing = _clearing_time_s(spec, config)
            let_through = _extra_float(spec, "let_through_ka2s", None)
            if let_through is None and clearing is not None and not 0 < clearing <= 5.0:
                return None  # the adiabatic equation raises (434.5.2 range): engine error
    except CableRouteError:
        return None
    return CircuitContext(DEVICE_KINDS.index(kind), harmonic, star_delta_cables(spec, config),
                          multiple, pf, drive, str(curve), _nan(magnetic), tn, float(ze), assumed,
                          _nan(clearing), _nan(let_through))


def _valid(spec: CircuitSpec) -> bool:
    # the checks of select._validate and load.design_current_a: the engine's error records
    return (spec.conductor in CONDUCTORS and spec.insulation in INSULATIONS
            and spec.phases in (1, 3) and math.isfinite(spec.design_length_m)
            and spec.design_length_m >= 0 and bool(spec.stretches)
            and spec.voltage_v > 0 and 0 < spec.power_factor <= 1 and 0 < spec.efficiency <= 1
            and spec.load.unit in LOAD_UNITS and len(spec.stretches) <= MAX_STRETCHES)


def _codes(values: Sequence[str], names: dict[str, int]) -> IntArray:
    return np.array([names.setdefault(v, len(names)) for v in values], dtype=np.int64)


def columns_from_specs(specs: Sequence[CircuitSpec], config: SizingConfig | None = None
                       ) -> CircuitColumns:
    """Read circuits into columns for :func:`.core.size_columns`.

    Parameters
    ----------
    specs : sequence of CircuitSpec
    config : SizingConfig, optional

    Returns
    -------
    CircuitColumns
        ``declined`` > 0 for each circuit left to the engine (:data:`DECLINE_REASONS`).
    """
    config = config or SizingConfig()
    n = len(specs)
    whole = (config.standard != "iec" or config.pe_rule != "table"
             or config.conductor_temp_for_vd not in ("operating", "max"))
    memo: dict[tuple[object, ...], CircuitContext | None] = {}
    contexts: list[CircuitContext | None] = []
    declined = np.zeros(n, dtype=np.int64)
    for i, spec in enumerate(specs):
        key = (spec.extra, spec.load_type, spec.phases, spec.voltage_v, spec.fault_ka)
        ctx = memo.get(key, ...)
        if ctx is ...:
            ctx = memo[key] = _context(spec, config)
        if whole:
            declined[i] = 1
        elif ctx is None or not _valid(spec):
            declined[i] = 3 if len(spec.stretches) > MAX_STRETCHES else 2
            ctx = None
        contexts.append(ctx)
    blank = CircuitContext(0, 0.0, False, math.nan, math.nan, False, "C", math.nan, False,
                           math.nan, False, math.nan, math.nan)
    ctxs = [c or blank for c in contexts]

    def col(values: Sequence[object], dtype: npt.DTypeLike = float) -> npt.NDArray[Any]:
        return np.array(values, dtype=dtype)

    cores = col([s.cores or (4 if s.phases == 3 else 3) for s in specs], np.int64)
    load_types: dict[str, int] = {}
    curves: dict[str, int] = {}
    lt_codes = _codes([s.load_type for s in specs], load_types)
    stretch = _stretch_columns(specs, cores, declined, config)
    return CircuitColumns(
        n=n,
        load_value=col([s.load.value for s in specs]),
        load_unit=col([LOAD_UNITS.index(s.load.unit) if s.load.unit in LOAD_UNITS else 0
                       for s in specs], np.int64),
        voltage_v=col([s.voltage_v for s in specs]),
        phases=col([s.phases for s in specs], np.int64),
        power_factor=col([s.power_factor for s in specs]),
        efficiency=col([s.efficiency for s in specs]),
        length_m=col([s.design_length_m for s in specs]),
        cores=cores,
        fault_ka=col([_nan(_fault_ka(s, config)) for s in specs]),
        conductor=col([CONDUCTORS.index(s.conductor) if s.conductor in CONDUCTORS else 0
                       for s in specs], np.int64),
        insulation=col([INSULATIONS.index(s.insulation) if s.insulation in INSULATIONS else 0
                        for s in specs], np.int64),
        load_type=lt_codes,
        load_types=tuple(load_types),
        kind=col([c.kind for c in ctxs], np.int64),
        margin=col([config.margin_for(s.load_type) for s in specs]),
        third_harmonic_pct=col([c.third_harmonic_pct for c in ctxs]),
        star=col([c.star for c in ctxs], bool),
        motor=col([s.load_type == "motor" for s in specs], bool),
        starter_multiple=col([c.starter_multiple for c in ctxs]),
        starter_pf=col([c.starter_pf for c in ctxs]),
        drive=col([c.drive for c in ctxs], bool),
        curve=_codes([c.curve for c in ctxs], curves),
        curves=tuple(curves),
        magnetic_a=col([c.magnetic_a for c in ctxs]),
        tn=col([c.tn for c in ctxs], bool),
        ze_ohm=col([c.ze_ohm for c in ctxs]),
        ze_assumed=col([c.ze_assumed for c in ctxs], bool),
        clearing_time_s=col([c.clearing_time_s for c in ctxs]),
        let_through_ka2s=col([c.let_through_ka2s for c in ctxs]),
        vd_limit_pct=col([circuit_vd_limit(s, config)[0] if not declined[i] else math.nan
                          for i, s in enumerate(specs)]),
        declined=declined,
        **stretch,
    )


class _StretchColumns(TypedDict):
    """The per-stretch fields of :class:`CircuitColumns` (:func:`_stretch_columns`)."""

    layout: IntArray
    layouts: tuple[_Layout, ...]
    slot: IntArray
    method: IntArray
    method_names: tuple[str, ...]
    ambient_c: FloatArray
    soil_k_m_w: FloatArray
    depth_m: FloatArray
    other_cables: IntArray
    trays: IntArray
    containment: IntArray
    containments: tuple[str, ...]


def _stretch_columns(specs: Sequence[CircuitSpec], cores: IntArray, declined: IntArray,
                     config: SizingConfig) -> _StretchColumns:
    """The (n, MAX_STRETCHES) stretch columns and each circuit's layout."""
    n, k = len(specs), MAX_STRETCHES
    slot = np.full((n, k), -1, dtype=np.int64)
    method = np.zeros((n, k), dtype=np.int64)
    ambient = np.zeros((n, k))
    soil = np.zeros((n, k))
    depth = np.zeros((n, k))
    other = np.zeros((n, k), dtype=np.int64)
    trays = np.ones((n, k), dtype=np.int64)
    containment = np.zeros((n, k), dtype=np.int64)
    layout = np.full(n, -1, dtype=np.int64)
    method_names: dict[str, int] = {}
    containments: dict[str, int] = {}
    layouts: dict[_Layout, int] = {}
    for i, spec in enumerate(specs):
        if declined[i]:
            continue
        names = []
        for j, s in enumerate(spec.stretches):
            m = _method_for(s.method, cores=int(cores[i]))
            _, _, ambient[i, j], soil[i, j], depth[i, j] = _stretch_key(s, m, spec.insulation, config)
            method[i, j] = method_names.setdefault(m, len(method_names))
            other[i, j], trays[i, j] = s.other_cables, s.trays
            containment[i, j] = containments.setdefault(s.containment, len(containments))
            names.append(m)
        methods = tuple(sorted(set(names)))
        slot[i, :len(names)] = [methods.index(m) for m in names]
        key = (methods, spec.conductor, spec.insulation, loaded_conductors(spec.phases))
        layout[i] = layouts.setdefault(key, len(layouts))
    return _StretchColumns(layout=layout, layouts=tuple(layouts), slot=slot, method=method,
                           method_names=tuple(method_names), ambient_c=ambient,
                           soil_k_m_w=soil, depth_m=depth, other_cables=other, trays=trays,
                           containment=containment, containments=tuple(containments))
