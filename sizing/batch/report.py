"""The checks of the chosen cables as arrays: what :func:`.select._prepared_result` reports.

Per check (:data:`.core.CHECK_NAMES`) a result code, a value and a limit, with the
engine's conditions (the 1e-9 allowances of its comparisons included) and status:
``fail`` when a check fails, ``warning`` when Ze was assumed or no length was given.
"""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

import numpy as np
import numpy.typing as npt

from ..config import SizingConfig
from ..voltage_drop import REACTANCE_MOHM_PER_M
from .arrays import BoolArray, FloatArray, IndexArray, IntArray
from .columns import CircuitColumns
from .core import CHECK_NAMES, BatchResult, _dip, _disc_made, _Rows, _Tables, _zs

__all__ = ["fill_checks"]

#: A check's result codes (ints, or spread to floats), values and limits into ``out.checks``
#: on the rows given (None: every circuit sized by the core).
_Put = Callable[[str, IntArray | FloatArray, FloatArray, FloatArray, BoolArray | None], None]


def _code(made: BoolArray, passed: BoolArray) -> IntArray:
    return np.where(made, np.where(passed, 1, 2), 0)


def fill_checks(out: BatchResult, c: CircuitColumns, config: SizingConfig) -> None:
    """Fill ``out.checks`` and ``out.status`` for every circuit sized by the core."""
    n = c.n
    a = out.arrays
    checks = {name: (np.zeros(n, np.int64), np.full(n, np.nan), np.full(n, np.nan))
              for name in CHECK_NAMES}
    out.checks = checks
    iz = out.iz_a
    sized = out.declined == 0
    yes = np.ones(n, bool)

    def put(name: str, code: IntArray | FloatArray, value: FloatArray, limit: FloatArray,
            rows: BoolArray | None = None) -> None:
        rows = sized if rows is None else rows
        checks[name][0][rows] = code[rows]
        checks[name][1][rows] = value[rows]
        checks[name][2][rows] = limit[rows]

    # IEC 60364-4-43:2008 433.1: Ib <= In <= Iz and I2 <= 1.45 Iz
    put("design_current", _code(yes, a.ib <= a.rating), a.ib, a.rating)
    put("capacity", _code(yes, a.ol_rating <= iz + 1e-9), a.ol_rating, iz)
    put("overload", _code(yes, a.ol_i2 <= 1.45 * iz + 1e-9), a.ol_i2, 1.45 * iz)
    # IEC 60364-5-52:2009 Annex E: the neutral current where it governs
    put("neutral_current", _code(a.neutral, a.neutral_current <= iz + 1e-9), a.neutral_current, iz)
    r = out.rows
    if r is not None:  # out.tables is set with out.rows
        sel = np.flatnonzero(sized[r.rows])
        if len(sel):
            _group_checks(out.tables, r, sel, out, c, put)
    failed = np.zeros(n, bool)
    for code, _, _ in checks.values():
        failed |= code == 2
    warn = c.ze_assumed & c.tn | (c.length_m <= 0)
    out.status = np.where(failed, 2, np.where(warn, 1, 0))


def _group_checks(g: _Tables, r: _Rows, sel: IndexArray, out: BatchResult, c: CircuitColumns,
                  put: _Put) -> None:
    at = r.rows[sel]
    n = c.n
    index, parallel = out.index[at], out.parallel[at]
    csa = g.csa[index]
    full = np.zeros(n, bool)
    full[at] = True

    def spread(values: npt.NDArray[Any], fill: float = np.nan) -> FloatArray:
        arr = np.full(n, fill, dtype=float)
        arr[at] = values
        return arr

    # IEC 60364-5-52:2009 525 and Annex G at the operating temperature
    cond = r.cond[sel]
    res = g.r20[cond, index] * (1.0 + g.alpha[cond] * (out.vd_temp_c[at] - 20.0)) / 1000.0
    pf = r.pf[sel]
    sin_phi = np.sqrt(np.maximum(0.0, 1.0 - pf * pf))
    b = np.where(c.phases[at] == 3, np.sqrt(3.0), 2.0)
    volts = b * r.ib[sel] * r.length[sel] * (res * pf + REACTANCE_MOHM_PER_M / 1000.0 * sin_phi) \
        / parallel * out.arrays.vd_factor[at]
    pct = 100.0 * volts / r.voltage[sel]
    limit = r.vd_limit[sel]
    put("voltage_drop", spread(np.where(pct <= limit + 1e-9, 1, 2)), spread(pct), spread(limit),
        full)
    # IEC 60364-4-43:2008 434.5.2: k²S² >= I²t
    need = r.sc_num[sel] / g.k[r.ci[sel], index]
    made = r.sc_made[sel]
    put("short_circuit", spread(np.where(made, np.where(need <= csa + 1e-9, 1, 2), 3)),
        spread(np.where(made, need, 0.0)), spread(csa), full)
    # motor start: the dip at the starting current
    motor = r.motor[sel]
    dip = _dip(g, r, sel, parallel[:, None])[np.arange(len(sel)), index]
    put("motor_start", spread(np.where(motor, np.where(dip <= r.ms_limit + 1e-9, 1, 2), 0)),
        spread(dip), spread(np.full(len(sel), r.ms_limit)), full)
    a = out.arrays
    trip = a.trip_applicable[at]
    put("motor_start_trip",
        spread(np.where(trip, np.where(a.trip_peak[at] <= a.trip_limit[at] + 1e-9, 1, 2), 0)),
        spread(a.trip_peak[at]), spread(a.trip_limit[at]), full)
    # IEC 60364-4-41:2005 411.4.4: Zs <= U0 / Ia
    zs = _zs(g, r, sel, index, parallel)
    made = _disc_made(g, r, sel, index)
    put("disconnection",
        spread(np.where(made, np.where(zs <= r.zs_max[sel] + 1e-12, 1, 2), 3)),
        spread(np.where(made, zs, 0.0)), spread(np.where(made, r.zs_max[sel], 0.0)), full)
    # IEC 60364-5-54:2011 543.1, Table 54.2
    put("protective_conductor", spread(np.ones(len(sel))), spread(g.pe_required[r.ci[sel], index]),
        spread(g.pe_csa[r.ci[sel], index]), full)
