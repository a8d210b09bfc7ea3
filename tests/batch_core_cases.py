"""Seeded random circuits for the batch-core tests and benchmark (numpy random, fixed seed).

Drawn to reach every branch of the per-circuit engine: every load unit, 1 and 3
phases, Cu/Al, XLPE/PVC, methods in air and in the ground (soil, depth), grouping
with tiers and ladders, fault levels with clearing times or let-through I²t
(short circuit), Ze given, from the fault level or assumed (disconnection, with
upsizing), TT earthing, fuses and breakers of curves B/C/D, motors direct on line,
star-delta (two cables), soft-start and drives, third harmonics of every row of
Table E.52.1, loads large enough for parallel cables, and inputs the engine refuses.
"""

from __future__ import annotations

import numpy as np
from cablewright.sizing.model import CircuitSpec, Load, Stretch

AIR = ("E", "C", "B1", "B2", "A1", "A2", "F", "G")
AIR_P = (0.45, 0.15, 0.1, 0.05, 0.05, 0.05, 0.1, 0.05)
GROUND = ("D1", "D2")
STARTERS = ("dol", "star_delta", "soft_starter", "drive")


class _Draw:
    """Arrays drawn up front (one numpy call per field), read one value at a time."""

    def __init__(self, rng: np.random.Generator, n: int) -> None:
        self.rng, self.n = rng, n

    def uniform(self, shape=None):
        return self.rng.random(self.n if shape is None else (self.n, shape))

    def choice(self, options, p=None, shape=None):
        size = self.n if shape is None else (self.n, shape)
        return np.array(options, dtype=object)[self.rng.choice(len(options), size=size, p=p)]


def _stretch(d: dict, i: int, j: int) -> Stretch:
    if d["ground"][i, j] < 0.2:
        return Stretch(f"S{j}", d["gmethod"][i, j], int(d["gothers"][i, j]),
                       ambient_c=None if d["u1"][i, j] < 0.6 else float(d["gamb"][i, j]),
                       soil_resistivity_k_m_w=None if d["u2"][i, j] < 0.6 else float(d["soil"][i, j]),
                       depth_m=None if d["u3"][i, j] < 0.6 else float(d["depth"][i, j]))
    method = d["amethod"][i, j]
    # within the grouping tables (B.52.17 to B.52.21); a few beyond, which the engine refuses
    tiers = 1 if method == "G" else int(d["tiers"][i, j])
    most = 1 if method == "G" else (14 if tiers == 1 else 3)
    if d["u4"][i, j] < 0.01:
        most = 20
    return Stretch(f"S{j}", method, int(d["u5"][i, j] * most),
                   ambient_c=None if d["u1"][i, j] < 0.6 else float(d["aamb"][i, j]),
                   trays=tiers, containment=d["containment"][i, j])


def _extra(d: dict, i: int, motor: bool) -> tuple[tuple[str, str], ...]:
    out = []
    if motor:
        out.append(("starter", d["starter"][i]))
    if d["e1"][i] < 0.15:
        out.append(("device_kind", d["kind"][i]))
    if d["e2"][i] < 0.15:
        out.append(("curve", d["curve"][i]))
    if d["e3"][i] < 0.45:
        out.append(("clearing_time_s", d["clearing"][i]))
    elif d["e3"][i] < 0.5:
        out.append(("let_through_ka2s", d["let_through"][i]))
    if d["e4"][i] < 0.3:
        out.append(("ze_ohm", d["ze"][i]))
    if d["e5"][i] < 0.05:
        out.append(("earthing", "TT"))
    if d["e6"][i] < 0.15:
        out.append(("third_harmonic_pct", d["harmonic"][i]))
    if d["e7"][i] < 0.003:
        out.append(("ze_ohm", "abc"))  # refused: the engine's error record
    return tuple(out)


def _draws(rng: np.random.Generator, n: int) -> dict:
    d = _Draw(rng, n)
    k = 3
    return {
        "three": d.uniform(), "load_type": d.choice(("motor", "lighting", "general", "feeder"),
                                                    p=[0.3, 0.15, 0.4, 0.15]),
        "unit": d.choice(("kW", "hp", "kVA", "A")), "big": d.uniform(), "size": d.uniform(),
        "pf": np.round(0.7 + 0.3 * d.uniform(), 2), "eff": np.round(0.85 + 0.15 * d.uniform(), 2),
        "cu": d.uniform(), "xlpe": d.uniform(), "c1": d.uniform(),
        "cores": d.choice((1, 3, 4, 5)), "v1": d.uniform(), "vd": d.choice((2.0, 4.0, 6.0)),
        "f1": d.uniform(), "fault": d.choice((3, 6, 10, 16, 25, 36, 50)), "l1": d.uniform(),
        "length": np.round(1 + 399 * d.uniform(), 1), "count": rng.integers(1, k + 1, n),
        "ground": d.uniform(k), "gmethod": d.choice(GROUND, shape=k),
        "gothers": rng.integers(0, 8, (n, k)), "gamb": d.choice((10, 15, 25, 30), shape=k),
        "soil": d.choice((1.0, 1.5, 2.0, 3.0), shape=k), "depth": d.choice((0.5, 0.8, 1.0), shape=k),
        "amethod": d.choice(AIR, p=AIR_P, shape=k), "tiers": d.choice((1, 1, 1, 2, 3), shape=k),
        "aamb": d.choice((20, 35, 40, 45, 50), shape=k),
        "containment": d.choice(("", "tray", "ladder"), shape=k),
        **{f"u{j}": d.uniform(k) for j in range(1, 6)},
        **{f"e{j}": d.uniform() for j in range(1, 8)},
        "starter": d.choice(STARTERS, p=[0.5, 0.25, 0.15, 0.1]),
        "kind": d.choice(("breaker", "fuse", "motor_breaker")), "curve": d.choice(("B", "C", "D")),
        "clearing": d.choice(("0.1", "0.2", "0.4", "1", "5")),
        "let_through": d.choice(("50", "400", "2000", "20000")),
        "ze": d.choice(("0.05", "0.2", "0.35", "0.8", "1.5")),
        "harmonic": d.choice(("0", "10", "20", "35", "40", "50", "70")),
    }


def random_specs(n: int, seed: int = 13) -> list[CircuitSpec]:
    """``n`` circuits drawn with ``numpy.random.default_rng(seed)``."""
    d = _draws(np.random.default_rng(seed), n)
    low = np.log(0.5)
    high = np.where(d["big"] < 0.08, np.log(900), np.log(120))
    values = np.round(np.exp(low + (high - low) * d["size"]), 2)
    specs = []
    for i in range(n):
        three = d["three"][i] < 0.8
        load_type = d["load_type"][i]
        specs.append(CircuitSpec(
            f"C-{i}", Load(float(values[i]), d["unit"][i]), 400.0 if three else 230.0,
            3 if three else 1, power_factor=float(d["pf"][i]),
            efficiency=float(d["eff"][i]) if load_type == "motor" else 1.0,
            load_type=load_type,
            conductor="Cu" if d["cu"][i] < 0.8 else "Al",
            insulation="XLPE" if d["xlpe"][i] < 0.6 else "PVC",
            cores=None if d["c1"][i] < 0.8 else int(d["cores"][i]),
            vd_limit_pct=None if d["v1"][i] < 0.9 else float(d["vd"][i]),
            fault_ka=None if d["f1"][i] < 0.3 else float(d["fault"][i]),
            design_length_m=0.0 if d["l1"][i] < 0.02 else float(d["length"][i]),
            stretches=tuple(_stretch(d, i, j) for j in range(int(d["count"][i]))),
            extra=_extra(d, i, load_type == "motor"),
        ))
    return specs
