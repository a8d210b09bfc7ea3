"""Benchmark: size 10,000 varied circuits in one process, on one core.

Run::

    .venv/bin/python benchmarks/bench_sizing.py [--n 10000] [--seed 7] [--profile]
    .venv/bin/python benchmarks/bench_sizing.py --batch [--n 100000] [--repeats 5] [--branches]

``--batch`` measures both cores on the same circuits, paired in each repeat (CPU
time, ``time.process_time``, one process, one core): the per-circuit engine
(records built, as the pipeline keeps them), the batch core on columns
(:func:`cablewright.sizing.batch.size_columns`, compact result), the reading of
specs into columns (:func:`~cablewright.sizing.batch.columns_from_specs`), and the
batch with every record built on demand (:func:`~cablewright.sizing.batch.record_for`).
``--branches`` uses the circuits of ``tests/batch_core_cases.py`` (every branch:
fault levels, Ze, motors, star-delta, harmonics, parallel) instead of the varied set.

Prints circuits per second and the status counts.  Target: >= 20,000 circuits/s.
The circuits are random but seeded: loads, lengths, methods, ambient, group,
Cu/Al, PVC/XLPE, 1/3 phases.  ``--profile`` runs the same loop under cProfile
and prints the top functions by cumulative and by own time.
"""

from __future__ import annotations

import argparse
import cProfile
import os
import pstats
import random
import statistics
import sys
import time
from collections import Counter
from pathlib import Path

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


def _spread(values: list[float]) -> str:
    values = sorted(values)
    return f"{values[0]:,.0f} / {statistics.median(values):,.0f} / {values[-1]:,.0f}"


def bench_batch(specs: list[CircuitSpec], config: SizingConfig, repeats: int,
                engine_n: int) -> None:
    """Both cores paired in each repeat; circuits/s as min / median / max of the repeats."""
    from cablewright.sizing.batch import columns_from_specs, record_for, size_columns

    engine_specs = specs[:engine_n]
    columns = columns_from_specs(specs, config)
    result = size_columns(columns, config)  # warm the table caches, as a long job would
    run(engine_specs[:2000], config)
    share = float((result.declined > 0).mean())
    rates: dict[str, list[float]] = {k: [] for k in ("engine", "core", "columns", "records")}
    for _ in range(repeats):
        start = time.process_time()
        run(engine_specs, config)
        rates["engine"].append(len(engine_specs) / (time.process_time() - start))
        start = time.process_time()
        result = size_columns(columns, config)
        rates["core"].append(len(specs) / (time.process_time() - start))
        start = time.process_time()
        columns = columns_from_specs(specs, config)
        rates["columns"].append(len(specs) / (time.process_time() - start))
        start = time.process_time()
        for i, spec in enumerate(engine_specs):
            record_for(spec, result, i, config)
        rates["records"].append(len(engine_specs) / (time.process_time() - start))
    load = os.getloadavg()[0]
    print(f"{len(specs):,} circuits ({len(engine_specs):,} for the engine and the records), "
          f"{repeats} paired repeats, CPU time, load average {load:.1f}; circuits/s min / median / max")
    print(f"  per-circuit engine (records built)      {_spread(rates['engine'])}")
    print(f"  batch core on columns (compact result)  {_spread(rates['core'])}")
    print(f"  specs read into columns                 {_spread(rates['columns'])}")
    print(f"  engine's record built on demand         {_spread(rates['records'])}")
    print(f"  declined to the engine: {share:.2%} "
          f"({', '.join(f'{k} {v}' for k, v in sorted(Counter(result.declined.tolist()).items()))})")


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--n", type=int, default=10_000)
    parser.add_argument("--seed", type=int, default=7)
    parser.add_argument("--profile", action="store_true")
    parser.add_argument("--batch", action="store_true", help="both cores, paired (see above)")
    parser.add_argument("--repeats", type=int, default=5)
    parser.add_argument("--engine-n", type=int, default=20_000,
                        help="circuits the engine and the record builder size per repeat")
    parser.add_argument("--branches", action="store_true",
                        help="the circuits of tests/batch_core_cases.py")
    args = parser.parse_args()
    if args.batch:
        if args.branches:
            sys.path.insert(0, str(Path(__file__).resolve().parents[1] / "tests"))
            from batch_core_cases import random_specs

            specs = random_specs(args.n, args.seed)
        else:
            specs = make_circuits(args.n, args.seed)
        bench_batch(specs, SizingConfig(), args.repeats, min(args.engine_n, args.n))
        return

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
