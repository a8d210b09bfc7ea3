"""Selection over all sizes at once: one (circuits, sizes) array per step.

The steps of :func:`cablewright.sizing.select._size`, per group of circuits that
share a layout (installation methods, conductor, insulation, loaded conductors:
the same row of sizes of IEC 60364-5-52:2009 Annex B):

1. Iz = n x It x (temperature, soil, depth, grouping, harmonic factors) on every
   stretch, the lowest governing (523; grouping counts ``other_cables + n``);
2. the first size with Iz >= max(In, I2/1.45) - 1e-9 (IEC 60364-4-43:2008 433.1);
3. from there, the first size where voltage drop (Annex G, conductor at
   θa + (θmax - θa)(Ib/Iz)², IEC 60287-1-1:2006 1.4), short circuit (k²S² >= I²t,
   IEC 60364-4-43:2008 434.5.2) and motor start pass; the first failing names
   ``governed_by``;
4. earth-fault disconnection (Zs <= U0/Ia, IEC 60364-4-41:2005 411.4.4, Table 41.1):
   up to ``disconnection_upsize_max_steps`` sizes larger, else the RCD advice;
5. parallel cables (523.7) for the circuits no single cable serves, pairs for a
   star-delta motor's two cables.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
from cablewright.core.errors import CableRouteError

from ..checks import _k_value, _protective_conductor
from ..conductor_resistance import ALPHA_20_PER_K, dc_resistance_20c_ohm_per_km
from ..config import SizingConfig
from ..select import INSULATIONS, _layout, _stretch_total
from ..voltage_drop import REACTANCE_MOHM_PER_M
from .arrays import BoolArray, FloatArray, IndexArray, IntArray
from .columns import MAX_STRETCHES, CircuitColumns
from .formulas import CircuitArrays, circuit_arrays, per_distinct

__all__ = ["GOVERNED", "CHECK_NAMES", "RESULT_CODES", "BatchResult", "size_columns"]

#: ``governed_by`` by code.
GOVERNED = ("capacity", "minimum", "voltage_drop", "short_circuit", "motor_start", "disconnection")
#: The checks of a result, in the engine's order (absent where not applicable).
CHECK_NAMES = ("design_current", "capacity", "overload", "neutral_current", "voltage_drop",
               "short_circuit", "motor_start", "motor_start_trip", "disconnection",
               "protective_conductor")
#: Check result by code: 0 absent (not applicable), 1 pass, 2 fail, 3 not checked.
RESULT_CODES = ("", "pass", "fail", "not_checked")
STATUS = ("ok", "warning", "fail")
_NAN = math.nan


@dataclass
class BatchResult:
    """The compact result: one row per circuit, arrays only.

    ``declined`` > 0 (:data:`.columns.DECLINE_REASONS`) where the engine sizes the
    circuit; elsewhere ``index`` (into the layout's allowed sizes), ``csa_mm2``,
    ``parallel``, ``governed`` (:data:`GOVERNED`), ``upsize_limited``, ``iz_a``,
    ``stretch`` (governing stretch), ``vd_temp_c``, ``status`` (:data:`STATUS`) and
    per check name ``checks[name] = (code, value, limit)`` (:data:`RESULT_CODES`).
    """

    declined: IntArray
    arrays: CircuitArrays
    index: IntArray
    csa_mm2: FloatArray
    parallel: IntArray
    governed: IntArray
    upsize_limited: BoolArray
    iz_a: FloatArray
    stretch: IntArray
    vd_temp_c: FloatArray
    status: IntArray = field(default_factory=lambda: np.zeros(0, dtype=np.int64))
    checks: dict[str, tuple[IntArray, FloatArray, FloatArray]] = field(default_factory=dict)
    # set by size_columns (not arguments, not shown, not compared): the axis index of
    # each circuit's first allowed size, and where a layout exists the tables, the
    # circuits' rows and the correction factors of the chosen count per stretch
    first: IntArray = field(init=False, repr=False, compare=False)
    rows: _Rows | None = field(init=False, repr=False, compare=False)
    tables: _Tables = field(init=False, repr=False, compare=False)
    totals: FloatArray = field(init=False, repr=False, compare=False)

    def choice(self, i: int) -> tuple[int, int, str, bool]:
        """(size index, parallel, governed_by, upsize limited) of circuit ``i``."""
        return (int(self.index[i] - self.first[i]), int(self.parallel[i]), GOVERNED[int(self.governed[i])],
                bool(self.upsize_limited[i]))


@dataclass
class _Tables:
    """Every layout's sizes on one axis of cross-sections (all circuits at once).

    ``amps[row]`` is It of one (layout, method) column over the axis, 0 outside the
    layout's allowed sizes (IEC 60364-5-52:2009 Annex B); ``lo``/``hi`` the first and
    last allowed axis index of each layout; per conductor (``Cu``, ``Al``) the
    resistance at 20 °C (IEC 60228:2004 Table 2) and per conductor x insulation
    k (IEC 60364-4-43:2008 Table 43A) and the PE (IEC 60364-5-54:2011 Table 54.2).
    """

    csa: FloatArray
    amps: FloatArray
    smallest: FloatArray
    row_of: dict[tuple[int, int], int]
    lo: IntArray
    hi: IntArray
    below_min: BoolArray
    usable: BoolArray
    r20: FloatArray
    alpha: FloatArray
    k: FloatArray
    pe_csa: FloatArray
    pe_required: FloatArray
    r20_pe: FloatArray


def _r20_or_nan(a: float, conductor: str) -> float:
    try:
        return dc_resistance_20c_ohm_per_km(a, conductor)
    except CableRouteError:
        return _NAN


def _tables(c: CircuitColumns, config: SizingConfig) -> _Tables:
    found: list[tuple[tuple[float, ...], tuple[float, ...], tuple[tuple[float, ...], ...],
                      tuple[float, ...]]] = []
    for methods, conductor, insulation, loaded in c.layouts:
        try:
            sizes, allowed, amps, smallest, _ = _layout(
                methods, conductor, insulation, loaded, config.max_single_csa_mm2 or math.inf,
                config.min_csa_mm2.get(conductor, 0.0))
        except CableRouteError:
            sizes, allowed, amps, smallest = (), (), (), ()
        found.append((sizes, allowed, amps, smallest))
    axis = np.array(sorted({a for f in found for a in f[1]}) or [1.5], dtype=float)
    where = {float(a): i for i, a in enumerate(axis)}
    n_layouts = len(c.layouts)
    lo, hi = np.zeros(n_layouts, np.int64), np.zeros(n_layouts, np.int64)
    below, usable = np.zeros(n_layouts, bool), np.zeros(n_layouts, bool)
    rows: list[FloatArray] = []
    smallest_rows: list[float] = []
    row_of: dict[tuple[int, int], int] = {}
    for number, (sizes, allowed, amps, smallest) in enumerate(found):
        if not allowed:
            continue
        at = [where[float(a)] for a in allowed]
        lo[number], hi[number] = at[0], at[-1]
        conductor = c.layouts[number][1]
        # the upsizing steps count sizes of the layout: its sizes must be a run of the axis
        usable[number] = (at == list(range(at[0], at[-1] + 1))
                          and all(not math.isnan(_r20_or_nan(a, conductor)) for a in allowed))
        below[number] = allowed[0] > sizes[0]
        for j, column in enumerate(amps):
            row = np.zeros(len(axis))
            row[at] = column
            row_of[(number, j)] = len(rows)
            rows.append(row)
            smallest_rows.append(smallest[j])
    conductors, insulations = ("Cu", "Al"), ("XLPE", "PVC")
    pes = [[_protective_conductor(float(a), cd, ins, "table") for a in axis]
           for cd in conductors for ins in insulations]
    return _Tables(
        axis, np.array(rows).reshape(len(rows), len(axis)), np.array(smallest_rows, dtype=float),
        row_of, lo, hi, below, usable,
        np.array([[_r20_or_nan(float(a), cd) for a in axis] for cd in conductors]),
        np.array([ALPHA_20_PER_K[cd] for cd in conductors]),
        np.array([[_k_value(cd, ins, float(a)) for a in axis] for cd in conductors
                  for ins in insulations]),
        np.array([[p.csa_mm2 for p in row] for row in pes]),
        np.array([[p.required_mm2 for p in row] for row in pes]),
        np.array([[_r20_or_nan(p.csa_mm2, cd) for p in row]
                  for cd, row in zip([cd for cd in conductors for _ in insulations], pes,
                                     strict=True)]))


class _Rows:
    """Every circuit's columns with the tables gathered to it (rows of the axis)."""

    # gathered from CircuitArrays by name in __init__
    ib: FloatArray
    need: FloatArray
    hf: FloatArray
    vd_a: FloatArray
    vd_x_sin: FloatArray
    temp: FloatArray
    ms_a_v: FloatArray
    ms_x_sin: FloatArray
    ms_source_v: FloatArray
    disc_mode: IntArray
    zs_max: FloatArray
    disc_temp: FloatArray

    def __init__(self, rows: IndexArray, c: CircuitColumns, a: CircuitArrays, t: _Tables,
                 config: SizingConfig) -> None:
        self.rows = rows
        self.ms_limit = float(config.motor_start_dip_pct)
        width = int(max(1, (c.slot[rows] >= 0).sum(axis=1).max())) if len(rows) else 1
        take = slice(0, width)
        self.slot = c.slot[rows, take]
        self.valid = self.slot >= 0
        layout = c.layout[rows]
        lookup = np.full((len(c.layouts), MAX_STRETCHES), -1, np.int64)
        for (number, j), row in t.row_of.items():
            lookup[number, j] = row
        self.table_row = np.where(self.valid, lookup[layout[:, None], np.maximum(self.slot, 0)], -1)
        self.lo, self.hi, self.below_min = t.lo[layout], t.hi[layout], t.below_min[layout]
        self.cond = c.conductor[rows]
        self.ci = c.conductor[rows] * 2 + c.insulation[rows]
        self.method = c.method[rows, take]
        self.ambient = c.ambient_c[rows, take]
        self.soil = c.soil_k_m_w[rows, take]
        self.depth = c.depth_m[rows, take]
        self.other = c.other_cables[rows, take]
        self.trays = c.trays[rows, take]
        self.containment = c.containment[rows, take]
        self.insulation = c.insulation[rows]
        for name in ("ib", "need", "hf", "vd_a", "vd_x_sin", "temp", "ms_a_v", "ms_x_sin",
                     "ms_source_v", "disc_mode", "zs_max", "disc_temp"):
            setattr(self, name, getattr(a, name)[rows])
        self.pf = c.power_factor[rows]
        self.voltage = c.voltage_v[rows]
        self.length = c.length_m[rows]
        self.star = c.star[rows]
        self.motor = c.motor[rows]
        self.spf = c.starter_pf[rows]
        self.ze = c.ze_ohm[rows]
        self.vd_limit = c.vd_limit_pct[rows]
        fault, tc, lt = c.fault_ka[rows], c.clearing_time_s[rows], c.let_through_ka2s[rows]
        # 434.5.2: S >= √(I²t)/k with the device's let-through, else S >= I √t / k
        self.sc_num = np.where(~np.isnan(lt), np.sqrt(lt * 1e6), fault * 1000.0 * np.sqrt(tc))
        self.sc_made = ~np.isnan(fault) & ~np.isnan(self.sc_num)


def _totals(r: _Rows, sel: IndexArray, parallel: int, c: CircuitColumns) -> FloatArray:
    """Product of the correction factors of every stretch of the rows ``sel`` [1]
    (:func:`.select._stretch_total`: Tables B.52.14 to B.52.21 of IEC 60364-5-52:2009
    and the depth factor), times the harmonic factor of Table E.52.1; ``inf`` on
    empty stretch slots, ``nan`` where the engine's tables raise."""
    valid = r.valid[sel]
    out = np.full(valid.shape, np.inf)

    def total(m: float, ins: float, amb: float, soil: float, depth: float, cables: float,
              trays: float, cont: float) -> float:
        try:
            return _stretch_total(c.method_names[int(m)], INSULATIONS[int(ins)], amb, soil,
                                  depth, int(cables), int(trays), c.containments[int(cont)])[0]
        except CableRouteError:
            return _NAN

    ins = np.broadcast_to(r.insulation[sel][:, None], valid.shape)
    out[valid] = per_distinct(total, r.method[sel][valid], ins[valid], r.ambient[sel][valid],
                              r.soil[sel][valid], r.depth[sel][valid],
                              r.other[sel][valid] + parallel, r.trays[sel][valid],
                              r.containment[sel][valid])
    hf = r.hf[sel][:, None]
    return np.where(hf != 1.0, out * hf, out)


def _capacity(t: _Tables, r: _Rows, sel: IndexArray, parallel: int, totals: FloatArray,
              operating: bool) -> tuple[FloatArray, FloatArray]:
    """Iz of the governing stretch per size (n, sizes) and the conductor temperature for
    the voltage drop: the hottest stretch (IEC 60287-1-1:2006 1.4)."""
    rows = r.table_row[sel]
    ib = r.ib[sel][:, None]
    temp = r.temp[sel][:, None]
    best: FloatArray | None = None
    theta: FloatArray | None = None
    for k in range(rows.shape[1]):
        valid = rows[:, k] >= 0
        amps = t.amps[np.maximum(rows[:, k], 0)]
        with np.errstate(invalid="ignore"):  # 0 x inf off an empty slot: never the least
            iz = parallel * amps * totals[:, k:k + 1]
        best = iz if best is None else np.fmin(best, iz)
        if operating:
            amb = r.ambient[sel][:, k:k + 1]
            # Iz 0 (a size outside the layout) gives ratio 1, as the engine's "capacity > 0"
            with np.errstate(divide="ignore", invalid="ignore"):
                ratio = np.minimum(1.0, ib / iz)
            th = amb + (temp - amb) * ratio * ratio
            if not valid.all():
                th = np.where(valid[:, None], th, -np.inf)
            theta = th if theta is None else np.maximum(theta, th)
    assert best is not None  # one stretch slot at least (_Rows: width >= 1)
    if not operating:
        theta = np.broadcast_to(temp, best.shape)
    assert theta is not None  # operating: set on the first slot
    return best, theta


def _capacity_at(t: _Tables, r: _Rows, sel: IndexArray, parallel: IntArray,
                 totals: FloatArray, index: IntArray, operating: bool
                 ) -> tuple[FloatArray, IntArray, FloatArray]:
    """:func:`_capacity` at one size per row, with the governing stretch (the first of
    the least, as the engine's loop keeps it)."""
    rows = r.table_row[sel]
    ib, temp = r.ib[sel], r.temp[sel]
    best: FloatArray | None = None
    best_k: IntArray | None = None
    theta: FloatArray | None = None
    for k in range(rows.shape[1]):
        valid = rows[:, k] >= 0
        with np.errstate(invalid="ignore"):
            iz = np.where(valid, parallel * t.amps[np.maximum(rows[:, k], 0), index]
                          * totals[:, k], np.inf)
        if best is None or best_k is None:  # the first slot (both set together)
            best, best_k = iz, np.zeros(len(sel), np.int64)
        else:
            lower = iz < best
            best, best_k = np.where(lower, iz, best), np.where(lower, k, best_k)
        amb = r.ambient[sel][:, k]
        with np.errstate(divide="ignore", invalid="ignore"):
            ratio = np.where(iz > 0, np.minimum(1.0, ib / iz), 1.0)
        th = np.where(valid, amb + (temp - amb) * ratio * ratio, -np.inf)
        theta = th if theta is None else np.maximum(theta, th)
    # one stretch slot at least (_Rows: width >= 1)
    assert best is not None and best_k is not None and theta is not None
    return best, best_k, (theta if operating else temp)


def _resistance(t: _Tables, r: _Rows, sel: IndexArray, temp_c: FloatArray) -> FloatArray:
    """R = R20 (1 + α20 (θ - 20)) [Ω/km], IEC 60228:2004 Annex B, per row and size."""
    cond = r.cond[sel]
    return t.r20[cond] * (1.0 + t.alpha[cond][:, None] * (temp_c - 20.0))


def _failing(t: _Tables, r: _Rows, sel: IndexArray, parallel: int, theta: FloatArray
             ) -> IntArray:
    """The first failing upsize check per size: 0 none, 2 voltage drop, 3 short circuit,
    4 motor start (codes of :data:`GOVERNED`)."""
    res = _resistance(t, r, sel, theta) / 1000.0
    vd = 100.0 * (r.vd_a[sel][:, None] * (res * r.pf[sel][:, None] + r.vd_x_sin[sel][:, None])
                  / parallel) / r.voltage[sel][:, None]
    vd_fail = ~(vd <= r.vd_limit[sel][:, None] + 1e-9)
    sc_fail = np.zeros(vd.shape, bool)
    made = r.sc_made[sel]
    if made.any():
        need_sc = r.sc_num[sel[made]][:, None] / t.k[r.ci[sel[made]]]
        sc_fail[made] = ~(need_sc <= t.csa + 1e-9)
    ms_fail = np.zeros(vd.shape, bool)
    motor = r.motor[sel]
    if motor.any():
        ms_fail[motor] = ~(_dip(t, r, sel[motor], parallel) <= r.ms_limit + 1e-9)
    return np.where(vd_fail, 2, np.where(sc_fail, 3, np.where(ms_fail, 4, 0)))


def _dip(t: _Tables, r: _Rows, sel: IndexArray, parallel: int | IntArray) -> FloatArray:
    """Starting dip [%]: 100 (b I_st L (R cos φst + X sin φst) / n + ΔU source) / U
    (IEC 60364-5-52:2009 Annex G at the starting current; IEC 60909-0:2016 6.2)."""
    rmax = _resistance(t, r, sel, r.temp[sel][:, None]) / 1000.0
    dip_v = r.ms_a_v[sel][:, None] * (rmax * r.spf[sel][:, None] + r.ms_x_sin[sel][:, None]) \
        / parallel + r.ms_source_v[sel][:, None]
    return 100.0 * dip_v / r.voltage[sel][:, None]


def _zs(t: _Tables, r: _Rows, sel: IndexArray, index: IntArray, parallel: int | IntArray
        ) -> FloatArray:
    """Zs = Ze + L |R_loop + j X_loop| at the fault-loop temperature (IEC 60364-4-41:2005
    411.4.4; :func:`.disconnection.loop_impedance_ohm`), per row at ``index``."""
    n: IntArray = np.where(r.star[sel], 1, parallel)
    cond, ci = r.cond[sel], r.ci[sel]
    corr = 1.0 + t.alpha[cond] * (r.disc_temp[sel] - 20.0)
    # numpy's stubs give Any for an index by several arrays: the tables' dtype is float
    r20: FloatArray = t.r20[cond, index]
    r20_pe: FloatArray = t.r20_pe[ci, index]
    res = (r20 * corr + r20_pe * corr) / 1000.0 / n
    x = 2 * REACTANCE_MOHM_PER_M / 1000.0 / n
    return r.ze[sel] + r.length[sel] * np.hypot(res, x)


def _disc_made(t: _Tables, r: _Rows, sel: IndexArray, index: IntArray) -> BoolArray:
    # numpy's stubs give Any for == and for an index by several arrays
    r20_pe: FloatArray = t.r20_pe[r.ci[sel], index]
    mode_made: BoolArray = r.disc_mode[sel] == 2
    return mode_made & ~np.isnan(r20_pe)


def _disc_passes(t: _Tables, r: _Rows, sel: IndexArray, index: IntArray, parallel: int
                 ) -> BoolArray:
    zs = _zs(t, r, sel, index, parallel)
    return ~_disc_made(t, r, sel, index) | (zs <= r.zs_max[sel] + 1e-12)


def size_columns(c: CircuitColumns, config: SizingConfig | None = None) -> BatchResult:
    """Size every circuit the core covers; see the module docstring for the steps.

    Returns
    -------
    BatchResult
    """
    config = config or SizingConfig()
    a = circuit_arrays(c, config)
    n = c.n
    out = BatchResult(a.declined, a, np.zeros(n, np.int64), np.full(n, _NAN),
                      np.zeros(n, np.int64), np.zeros(n, np.int64), np.zeros(n, bool),
                      np.full(n, _NAN), np.zeros(n, np.int64), np.full(n, _NAN))
    from .report import fill_checks

    out.rows, out.first = None, np.zeros(n, np.int64)
    if not c.layouts:  # every circuit declined (the rule set, the config, the inputs)
        fill_checks(out, c, config)
        return out
    t = _tables(c, config)
    with_layout = c.layout >= 0
    unusable = with_layout & ~t.usable[np.maximum(c.layout, 0)] & (out.declined == 0)
    out.declined[unusable] = 4
    rows = np.flatnonzero(out.declined == 0)
    r = _Rows(rows, c, a, t, config)
    out.totals = np.full((n, r.slot.shape[1]), np.inf)
    out.tables, out.rows = t, r
    out.first = np.where(with_layout, t.lo[np.maximum(c.layout, 0)], 0)
    if len(rows):
        _select(t, r, c, config, out)
    fill_checks(out, c, config)
    return out


def _select(t: _Tables, r: _Rows, c: CircuitColumns, config: SizingConfig,
            out: BatchResult) -> None:
    """Steps 1 to 5 of the module docstring for every circuit at once."""
    n, sizes = len(r.rows), len(t.csa)
    operating = config.conductor_temp_for_vd == "operating"
    upsize = bool(getattr(config, "disconnection_upsize", True))
    max_steps = int(getattr(config, "disconnection_upsize_max_steps", 3))
    resolved, bad, fallback = np.zeros(n, bool), np.zeros(n, bool), np.zeros(n, bool)
    step = np.where(r.star, 2, 1)  # STAR_DELTA_CABLES: the two cables count as a pair
    columns = np.arange(sizes)
    for parallel in range(1, config.max_parallel + 1):
        sel = np.flatnonzero(~resolved & ~bad & (parallel % step == 0))
        if len(sel) == 0:
            if (resolved | bad).all():
                break
            continue
        totals = _totals(r, sel, parallel, c)
        broken = np.isnan(totals).any(axis=1)
        bad[sel[broken]] = True
        sel, totals = sel[~broken], totals[~broken]
        if len(sel) == 0:
            continue
        lo, hi = r.lo[sel][:, None], r.hi[sel][:, None]
        inside = (columns >= lo) & (columns <= hi)
        cap, theta = _capacity(t, r, sel, parallel, totals, operating)
        enough = (cap >= r.need[sel][:, None] - 1e-9) & inside
        has = enough.any(axis=1)
        i0 = np.argmax(enough, axis=1)
        failing = _failing(t, r, sel, parallel, theta)
        ok = (failing == 0) & (columns >= i0[:, None]) & inside
        found = has & ok.any(axis=1)
        final = np.argmax(ok, axis=1)
        last = has & ~found
        # the largest tried at this count, kept when no count passes (select._size)
        at, top = r.rows[sel[last]], r.hi[sel[last]]
        out.index[at], out.parallel[at] = top, parallel
        out.governed[at] = failing[last][np.arange(len(at)), top]
        out.totals[at, :totals.shape[1]] = totals[last]
        fallback[sel[last]] = True
        if not found.any():
            continue
        sel, totals, i0, final = sel[found], totals[found], i0[found], final[found]
        failing = failing[found]
        pick = np.arange(len(sel))
        governed = np.where(final > i0, failing[pick, np.maximum(final - 1, 0)], 0)
        first = (final == i0) & (i0 == r.lo[sel]) & r.below_min[sel]
        if first.any():
            small = t.smallest[np.maximum(r.table_row[sel], 0)]
            below = np.min(np.where(r.valid[sel], parallel * small * totals, np.inf), axis=1)
            governed = np.where(first & (below >= r.need[sel]), 1, governed)
        limited = np.zeros(len(sel), bool)
        if upsize:
            todo = ~_disc_passes(t, r, sel, final, parallel)
            moved = np.zeros(len(sel), bool)
            for extra in range(1, max_steps + 1):
                cand = final + extra
                open_ = todo & ~moved & (cand <= r.hi[sel])
                if not open_.any():
                    break
                hit = np.zeros(len(sel), bool)
                hit[open_] = _disc_passes(t, r, sel[open_], cand[open_], parallel)
                final = np.where(hit, cand, final)
                governed = np.where(hit, 5, governed)
                moved |= hit
            limited = todo & ~moved
        at = r.rows[sel]
        out.index[at], out.parallel[at], out.governed[at] = final, parallel, governed
        out.upsize_limited[at] = limited
        out.totals[at, :totals.shape[1]] = totals
        resolved[sel] = True
        fallback[sel] = False
    out.declined[r.rows[bad]] = 2
    out.declined[r.rows[~resolved & ~fallback & ~bad]] = 6
    done = (resolved | fallback) & ~bad
    out.csa_mm2[r.rows[done]] = t.csa[out.index[r.rows[done]]]
    _final_values(t, r, np.flatnonzero(done), out, operating)


def _final_values(t: _Tables, r: _Rows, sel: IndexArray, out: BatchResult, operating: bool
                  ) -> None:
    """Iz, governing stretch and conductor temperature of the chosen cable."""
    at = r.rows[sel]
    cap, best_k, theta = _capacity_at(t, r, sel, out.parallel[at], out.totals[at],
                                      out.index[at], operating)
    out.iz_a[at], out.stretch[at], out.vd_temp_c[at] = cap, best_k, theta
