"""The size-independent steps of the engine as array formulas, one row per circuit.

Each function repeats one step of :func:`cablewright.sizing.select._size` or of the
prepared checks of :mod:`cablewright.sizing.checks` over numpy arrays, with the
same floating-point operations in the same order; tables and constants are the
engine's (imported).  Where a value comes from a scalar function of a few inputs
that take few distinct values (a device's I2, a release's Ia), the engine's own
function is evaluated once per distinct input (:func:`per_distinct`).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

import numpy as np
import numpy.typing as npt
from cablewright.core.errors import CableRouteError

from ..checks import _X_OHM_PER_M
from ..config import SizingConfig
from ..device import DEVICE_KINDS, conventional_operating_current_a
from ..disconnection import (
    INDUSTRIAL_INSTANTANEOUS_MULTIPLE,
    INSTANTANEOUS_TOLERANCE,
    device_ia_a,
    fault_loop_temperature_c,
    instantaneous_trip,
    max_disconnection_time_s,
)
from ..harmonics import E_52_1
from ..load import HP_TO_KW
from ..motor_start import (
    STAR_DELTA_CABLES,
    STAR_DELTA_RUN_DROP_FACTOR,
    STAR_DELTA_START_DROP_FACTOR,
    star_delta_winding_current_a,
)
from ..select import INSULATIONS
from ..short_circuit import SOURCE_R_OVER_X, peak_factor, source_impedance_ohm
from ..voltage_drop import MAX_CONDUCTOR_TEMPERATURE_C, REACTANCE_MOHM_PER_M
from .arrays import BoolArray, FloatArray, IntArray
from .columns import CircuitColumns

__all__ = ["per_distinct", "CircuitArrays", "circuit_arrays"]

SQRT3 = math.sqrt(3.0)
_NAN_STAND_IN = -1.7976931348623157e308  # the most negative float: no input takes it
#: (curve names, voltage factor c, industrial instantaneous multiple, tolerance) of _zs_max.
_DisconnectionSetting = tuple[tuple[str, ...], float, float, float]


def per_distinct(fn: Callable[..., float], *columns: npt.NDArray[Any]) -> FloatArray:
    """``fn`` evaluated once per distinct row of ``columns``, spread back to every row.

    ``fn`` returns a float, or ``nan`` where the engine's function raises.
    """
    n = len(columns[0])
    if n == 0:
        return np.zeros(0)
    # each column to small codes, the codes to one mixed-radix key, the key's distinct values
    key = np.zeros(n, dtype=np.int64)
    firsts = []
    radix = 1
    for column in columns:
        column = np.asarray(column)
        if column.dtype.kind in "iub" and column.min() >= 0 and column.max() < 4096:
            codes, count = column.astype(np.int64), int(column.max()) + 1  # codes already
        else:
            column = column.astype(float)
            column = np.where(np.isnan(column), _NAN_STAND_IN, column)  # nan never equals itself
            values = np.unique(column)
            codes, count = np.searchsorted(values, column), len(values)
        if radix * count >= 2**62:  # too many combinations for one key: fold them
            folded = np.unique(key)
            key, radix = np.searchsorted(folded, key), len(folded)
        key = key + radix * codes.reshape(-1)
        radix *= count
        firsts.append(column.astype(float))
    distinct = np.unique(key)
    inverse = np.searchsorted(distinct, key)
    first = np.empty(len(distinct), dtype=np.int64)
    first[inverse] = np.arange(n)  # a row of each distinct key (any: they are equal)
    rows = np.column_stack([f[first] for f in firsts])
    rows = np.where(rows == _NAN_STAND_IN, np.nan, rows)
    values = np.array([fn(*row) for row in rows.tolist()], dtype=float)
    return values[inverse.reshape(-1)]


@dataclass
class CircuitArrays:
    """What :func:`.select._size` and :class:`.checks.PreparedChecks` compute before sizes."""

    ib: FloatArray
    rating: FloatArray
    i2: FloatArray
    ol_rating: FloatArray
    ol_i2: FloatArray
    need: FloatArray
    hf: FloatArray
    neutral: BoolArray
    neutral_current: FloatArray
    vd_a: FloatArray
    vd_x_sin: FloatArray
    vd_factor: FloatArray
    temp: FloatArray
    ms_a_v: FloatArray
    ms_x_sin: FloatArray
    ms_source_v: FloatArray
    disc_mode: IntArray
    zs_max: FloatArray
    disc_temp: FloatArray
    trip_applicable: BoolArray
    trip_peak: FloatArray
    trip_limit: FloatArray
    declined: IntArray


def design_current_a(c: CircuitColumns) -> FloatArray:
    """Ib [A], :func:`cablewright.sizing.load.design_current_a` over arrays.

    I = P / η / (k U cos φ), I = S / (k U), k = √3 for 3 phases, 1 for one
    (IEC 60050-131:2002, 131-11-41/42; 1 hp = 0.746 kW, contract.md).
    """
    k = np.where(c.phases == 3, SQRT3, 1.0)
    kv = k * c.voltage_v
    power_w = np.where(c.load_unit == 3, c.load_value * HP_TO_KW * 1000.0, c.load_value * 1000.0)
    by_power = power_w / c.efficiency / (kv * c.power_factor)
    return np.select([c.load_unit == 0, c.load_unit == 1],
                     [c.load_value.astype(float), c.load_value * 1000.0 / kv], by_power)


def _i2(kind: float, rating: float) -> float:
    return conventional_operating_current_a(DEVICE_KINDS[int(kind)], rating)[0]


def device(c: CircuitColumns, ib: FloatArray, config: SizingConfig, declined: IntArray
           ) -> tuple[FloatArray, FloatArray]:
    """In: the smallest standard rating >= margin x Ib - 1e-9 (IEC 60364-4-43:2008 433.1,
    :func:`.device.select_device`); I2 of the device (:func:`.device.conventional_operating_current_a`)."""
    ratings = np.asarray(config.standard_ratings_a, dtype=float)
    at = np.searchsorted(ratings, ib * c.margin - 1e-9, side="left")
    declined[(at >= len(ratings)) & (declined == 0)] = 5
    rating = ratings[np.minimum(at, len(ratings) - 1)]
    return rating, per_distinct(_i2, c.kind, rating)


def harmonics(c: CircuitColumns, ib: FloatArray, envelope: bool
              ) -> tuple[FloatArray, BoolArray, FloatArray, FloatArray]:
    """Table E.52.1 of IEC 60364-5-52:2009 Annex E (:func:`.harmonics.harmonic_sizing`):
    reduction factor, whether the neutral current governs, the current to carry."""
    h = c.third_harmonic_pct
    applies = (c.phases == 3) & np.isin(c.cores, (1, 4, 5)) & (h != 0)
    highs = np.array([r.high_pct for r in E_52_1])
    row = np.minimum(np.searchsorted(highs, h, side="left"), len(E_52_1) - 1)
    factors = np.array([r.factor for r in E_52_1])
    on_neutral = np.array([r.basis == "neutral" for r in E_52_1])
    hf = np.where(applies, factors[row], 1.0)
    neutral = applies & on_neutral[row]
    i_n = 3.0 * h / 100.0 * ib  # 3 h Ib, Annex E E.1
    current = np.maximum(ib, i_n)
    if envelope:
        top = E_52_1[2]
        at_45 = 3.0 * top.high_pct / 100.0 * ib / top.factor
        current = np.where(factors[row] == 1.0, np.maximum(current, at_45), current)
    return hf, neutral, np.where(neutral, current, ib), np.where(applies, i_n, 0.0)


def _zs_max(u0: float, rating: float, final: float, kind: float, curve: float, magnetic: float,
            setting: _DisconnectionSetting) -> float:
    """Zs max = c U0 / Ia, Ia within Table 41.1's time (IEC 60364-4-41:2005 411.4.4)."""
    curves, vf, multiple, tolerance = setting
    try:
        time_s = max_disconnection_time_s(u0, rating, bool(final))
        ia, _ = device_ia_a(DEVICE_KINDS[int(kind)], rating, time_s, curves[int(curve)],
                            None if math.isnan(magnetic) else magnetic, multiple, tolerance)
    except CableRouteError:
        return math.nan
    return vf * u0 / ia


def _no_trip(rating: float, kind: float, curve: float, magnetic: float, curves: tuple[str, ...],
             multiple: float, tolerance: float) -> float:
    try:
        return instantaneous_trip(rating, curves[int(curve)], None if math.isnan(magnetic)
                                  else magnetic, DEVICE_KINDS[int(kind)], multiple,
                                  tolerance).no_trip_a
    except CableRouteError:
        return math.nan


def circuit_arrays(c: CircuitColumns, config: SizingConfig) -> CircuitArrays:
    """Every size-independent quantity of every circuit (see the module docstring)."""
    declined = c.declined.copy()
    ib = design_current_a(c)
    rating, i2 = device(c, ib, config, declined)
    need = np.maximum(rating, i2 / 1.45)  # IEC 60364-4-43 433.1: Iz >= In, I2 <= 1.45 Iz
    hf, neutral, h_current, _ = harmonics(c, ib, config.harmonics_envelope)
    need = np.where(neutral, np.maximum(need, h_current), need)
    # star-delta pair: the overload relay in the delta windings at Ib/√3 per cable
    setting = STAR_DELTA_CABLES * star_delta_winding_current_a(ib)
    relay_i2 = conventional_operating_current_a("overload_relay", 1.0)[0] * setting
    star = c.star
    ol_rating = np.where(star, setting, rating)
    ol_i2 = np.where(star, relay_i2, i2)
    need = np.where(star, np.maximum(setting, relay_i2 / 1.45), need)
    b = np.where(c.phases == 3, SQRT3, 2.0)
    vd_factor = np.where(star, STAR_DELTA_RUN_DROP_FACTOR, 1.0)
    pf = c.power_factor
    # IEC 60364-5-52:2009 Annex G: ΔU = b Ib L (R cos φ + X sin φ) / n
    vd_a = b * ib * c.length_m * vd_factor
    vd_x_sin = REACTANCE_MOHM_PER_M / 1000.0 * np.sqrt(np.maximum(0.0, 1.0 - pf * pf))
    temp = np.array([MAX_CONDUCTOR_TEMPERATURE_C[i] for i in INSULATIONS])[c.insulation]
    # motor start: the same drop at the starter's current, plus the source's (IEC 60909-0 6.2)
    i_st = c.starter_multiple * ib
    ms_a_v = b * i_st * c.length_m * np.where(star, STAR_DELTA_START_DROP_FACTOR, 1.0)
    spf = c.starter_pf
    ms_x_sin = _X_OHM_PER_M * np.sqrt(np.maximum(0.0, 1.0 - spf * spf))
    fault = np.nan_to_num(c.fault_ka, nan=0.0)
    with_source = c.motor & (fault != 0) & bool(config.motor_start_include_source)
    line_v = np.where(c.phases == 3, c.voltage_v, c.voltage_v * SQRT3)
    zq = np.zeros(c.n)
    if with_source.any():
        zq[with_source] = per_distinct(lambda f, v: source_impedance_ohm(f, v),
                                       fault[with_source], line_v[with_source])
    xq = zq / math.sqrt(1.0 + SOURCE_R_OVER_X**2)
    rq = SOURCE_R_OVER_X * xq
    ms_source_v = np.where(with_source, b * i_st * (rq * spf + xq * np.sqrt(
        np.maximum(0.0, 1.0 - spf**2))), 0.0)
    multiple = getattr(config, "industrial_instantaneous_multiple", INDUSTRIAL_INSTANTANEOUS_MULTIPLE)
    tolerance = getattr(config, "instantaneous_tolerance", INSTANTANEOUS_TOLERANCE)
    u0 = np.where(c.phases == 3, c.voltage_v / SQRT3, c.voltage_v)
    final = np.array([t != "feeder" for t in c.load_types], dtype=bool)[c.load_type] \
        if c.load_types else np.zeros(c.n, dtype=bool)
    zs_max = np.full(c.n, np.nan)
    tn = c.tn & (declined == 0)
    if tn.any():
        disc_setting = (c.curves, config.disconnection_voltage_factor, multiple, tolerance)
        zs_max[tn] = per_distinct(
            lambda u0_v, rating_a, final_, kind, curve, magnetic: _zs_max(
                u0_v, rating_a, final_, kind, curve, magnetic, disc_setting),
            u0[tn], rating[tn], final[tn], c.kind[tn], c.curve[tn], c.magnetic_a[tn])
    disc_mode = np.where(~c.tn, 0, np.where(np.isnan(zs_max), 1, 2))
    disc_temp = np.array([fault_loop_temperature_c(i) for i in INSULATIONS])[c.insulation]
    breaker = np.isin(c.kind, [DEVICE_KINDS.index("breaker"), DEVICE_KINDS.index("motor_breaker")])
    trip_rows = c.motor & breaker & (declined == 0)
    no_trip = np.full(c.n, np.nan)
    if trip_rows.any():
        no_trip[trip_rows] = per_distinct(
            lambda rating_a, kind, curve, magnetic: _no_trip(
                rating_a, kind, curve, magnetic, c.curves, multiple, tolerance),
            rating[trip_rows], c.kind[trip_rows], c.curve[trip_rows], c.magnetic_a[trip_rows])
    declined[trip_rows & np.isnan(no_trip) & (declined == 0)] = 5
    sin_phi = np.sqrt(np.maximum(0.0, 1.0 - spf * spf))
    kappa = np.zeros(c.n)
    motors = c.motor & (declined == 0)
    if motors.any():
        kappa[motors] = per_distinct(
            lambda p, s: peak_factor(p / s if s > 0 else math.inf), spf[motors], sin_phi[motors])
    return CircuitArrays(
        ib=ib, rating=rating, i2=i2, ol_rating=ol_rating, ol_i2=ol_i2, need=need, hf=hf,
        neutral=neutral, neutral_current=np.where(neutral, h_current, 0.0),
        vd_a=vd_a, vd_x_sin=vd_x_sin, vd_factor=vd_factor, temp=temp, ms_a_v=ms_a_v,
        ms_x_sin=ms_x_sin, ms_source_v=ms_source_v, disc_mode=disc_mode, zs_max=zs_max,
        disc_temp=disc_temp, trip_applicable=trip_rows & ~c.drive,
        trip_peak=kappa * math.sqrt(2.0) * i_st, trip_limit=math.sqrt(2.0) * no_trip,
        declined=declined)
