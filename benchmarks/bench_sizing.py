"""Benchmark: size 10,000 varied circuits in one process, on one core.

Run::

    .venv/bin/python benchmarks/bench_sizing.py [--n 10000] [--seed 7] [--profile]

Prints circuits per second and the status counts.  Target: >= 20,000 circuits/s.
The circuits are random but seeded: loads, lengths, methods, ambient, group,
Cu/Al, PVC/XLPE, 1/3 phases.  ``--profile`` runs the same loop under cProfile
and prints the top functions by cumulative and by own time.
"""

from __future__ import annotations

import argparse
import cProfile
import pstats
import random
import time
from collections import Counter

from cablewright.sizing.config import SizingConfig
from cablewright.sizing.model import CircuitSpec, Load, Stretch
from cablewright.sizing.select import size_circuit

METHODS = ("A1", "A2", "B1", "B2", "C", "D1", "D2", "E", "E", "E")


def make_circuits(n: int, seed: int) -> list[CircuitSpec]:
    """``n`` varied circuit specs from a seeded generator (invented data)."""
    rng = random.Random(seed)
    specs = []
    for i in range(n):
        phases = 3 if rng.random() < 0.8 else 1
        method = rng.choice(METHODS)
        ground = method in ("D1", "D2")
        unit = rng.choice(("kW", "kW", "A", "kVA", "hp"))
        value = round(rng.lognormvariate(3.0, 1.1), 1) + 0.5
        if phases == 1:
            value = min(value, 40.0)
        specs.append(CircuitSpec(
            circuit_id=f"B-{i}",
            load=Load(value, unit),
            voltage_v=400.0 if phases == 3 else 230.0,
            phases=phases,
            power_factor=round(rng.uniform(0.7, 1.0), 2),
            load_type=rng.choice(("general", "motor", "lighting", "feeder")),
            conductor="Al" if rng.random() < 0.25 else "Cu",
            insulation="PVC" if rng.random() < 0.3 else "XLPE",
            design_length_m=round(rng.uniform(2.0, 250.0), 1),
            stretches=(Stretch(
                method=method,
                other_cables=rng.randint(0, 8),
                ambient_c=float(rng.choice((15, 20, 25)) if ground else rng.choice((25, 30, 35, 40, 45))),
            ),),
        ))
    return specs


def run(specs: list[CircuitSpec], config: SizingConfig) -> Counter:
    return Counter(size_circuit(spec, config).status for spec in specs)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--n", type=int, default=10_000)
    parser.add_argument("--seed", type=int, default=7)
    parser.add_argument("--profile", action="store_true")
    args = parser.parse_args()

    config = SizingConfig()
    specs = make_circuits(args.n, args.seed)
    run(specs[:200], config)  # warm the table caches, as a long job would

    start = time.perf_counter()
    counts = run(specs, config)
    elapsed = time.perf_counter() - start
    rate = len(specs) / elapsed
    print(f"sized {len(specs)} circuits in {elapsed:.2f} s: {rate:,.0f} circuits/s on one core "
          f"(target 20,000/s: {'met' if rate >= 20_000 else 'NOT met'})")
    print("status counts: " + ", ".join(f"{k} {v}" for k, v in sorted(counts.items())))

    if args.profile:
        profiler = cProfile.Profile()
        profiler.enable()
        run(specs, config)
        profiler.disable()
        stats = pstats.Stats(profiler)
        stats.sort_stats("cumulative").print_stats(25)
        stats.sort_stats("tottime").print_stats(20)


if __name__ == "__main__":
    main()
