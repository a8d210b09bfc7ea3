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
GROUND = ("D1", "D2")


def _pick(rng, options, p=None):
    return options[int(rng.choice(len(options), p=p))]


def _stretch(rng, j: int) -> Stretch:
    if rng.random() < 0.2:
        method = _pick(rng, GROUND)
        return Stretch(f"S{j}", method, int(rng.integers(0, 8)),
                       ambient_c=None if rng.random() < 0.6 else float(rng.choice([10, 15, 25, 30])),
                       soil_resistivity_k_m_w=None if rng.random() < 0.6 else float(
                           rng.choice([1.0, 1.5, 2.0, 3.0])),
                       depth_m=None if rng.random() < 0.6 else float(rng.choice([0.5, 0.8, 1.0])))
    method = _pick(rng, AIR, p=[0.45, 0.15, 0.1, 0.05, 0.05, 0.05, 0.1, 0.05])
    # within the grouping tables (B.52.17 to B.52.21); a few beyond, which the engine refuses
    tiers = int(rng.choice([1, 1, 1, 2, 3]))
    most = 1 if method == "G" else (14 if tiers == 1 else 3)
    if rng.random() < 0.01:
        most = 20
    return Stretch(f"S{j}", method, int(rng.integers(0, most)),
                   ambient_c=None if rng.random() < 0.6 else float(rng.choice([20, 35, 40, 45, 50])),
                   trays=tiers,
                   containment=_pick(rng, ("", "tray", "ladder")))


def _extra(rng, motor: bool) -> tuple[tuple[str, str], ...]:
    out = []
    if motor:
        out.append(("starter", _pick(rng, ("dol", "star_delta", "soft_starter", "drive"),
                                     p=[0.5, 0.25, 0.15, 0.1])))
    if rng.random() < 0.15:
        out.append(("device_kind", _pick(rng, ("breaker", "fuse", "motor_breaker"))))
    if rng.random() < 0.15:
        out.append(("curve", _pick(rng, ("B", "C", "D"))))
    if rng.random() < 0.45:
        out.append(("clearing_time_s", _pick(rng, ("0.1", "0.2", "0.4", "1", "5"))))
    elif rng.random() < 0.1:
        out.append(("let_through_ka2s", _pick(rng, ("50", "400", "2000", "20000"))))
    if rng.random() < 0.3:
        out.append(("ze_ohm", _pick(rng, ("0.05", "0.2", "0.35", "0.8", "1.5"))))
    if rng.random() < 0.05:
        out.append(("earthing", "TT"))
    if rng.random() < 0.15:
        out.append(("third_harmonic_pct", _pick(rng, ("0", "10", "20", "35", "40", "50", "70"))))
    if rng.random() < 0.003:
        out.append(("ze_ohm", "abc"))  # refused: the engine's error record
    return tuple(out)


def random_specs(n: int, seed: int = 13) -> list[CircuitSpec]:
    """``n`` circuits drawn with ``numpy.random.default_rng(seed)``."""
    rng = np.random.default_rng(seed)
    specs = []
    for i in range(n):
        three = rng.random() < 0.8
        load_type = _pick(rng, ("motor", "lighting", "general", "feeder"), p=[0.3, 0.15, 0.4, 0.15])
        unit = _pick(rng, ("kW", "hp", "kVA", "A"))
        big = rng.random() < 0.08
        value = float(np.round(np.exp(rng.uniform(np.log(0.5), np.log(900 if big else 120))), 2))
        spec = CircuitSpec(
            f"C-{i}", Load(value, unit), 400.0 if three else 230.0, 3 if three else 1,
            power_factor=float(np.round(rng.uniform(0.7, 1.0), 2)),
            efficiency=float(np.round(rng.uniform(0.85, 1.0), 2)) if load_type == "motor" else 1.0,
            load_type=load_type,
            conductor="Cu" if rng.random() < 0.8 else "Al",
            insulation="XLPE" if rng.random() < 0.6 else "PVC",
            cores=None if rng.random() < 0.8 else int(rng.choice([1, 3, 4, 5])),
            vd_limit_pct=None if rng.random() < 0.9 else float(rng.choice([2.0, 4.0, 6.0])),
            fault_ka=None if rng.random() < 0.3 else float(rng.choice([3, 6, 10, 16, 25, 36, 50])),
            design_length_m=0.0 if rng.random() < 0.02 else float(np.round(rng.uniform(1, 400), 1)),
            stretches=tuple(_stretch(rng, j) for j in range(int(rng.integers(1, 4)))),
            extra=_extra(rng, load_type == "motor"),
        )
        specs.append(spec)
    return specs
