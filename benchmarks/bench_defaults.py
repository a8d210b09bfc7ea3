"""Share of circuits that pass, fail and why on the benchmark plants (issue 10).

Runs ``cablewright size --json`` on ``plant_<n>.dxf`` from ``generate_plant.py``
(generated into ``--work`` when missing) with the default config, or with
``--config FILE``, and prints per plant the statuses, the checks that fail,
what governs the chosen sizes, and the conductor volume (sum of cross-section x
cores x parallel x design length, m³ of metal) as a measure of the cost of a
default.

Run: ``python benchmarks/bench_defaults.py --work /tmp/bench [--sizes 1000 2000] [--config F]``.
"""

from __future__ import annotations

import argparse
import json
import subprocess
import sys
from collections import Counter
from pathlib import Path

HERE = Path(__file__).resolve().parent


def _failing(circuit: dict) -> list[str]:
    out = []
    for check in circuit.get("checks", []):
        result = check.get("result")
        failed = result == "fail" if result is not None else check.get("passed") is False
        if failed:
            out.append(check["name"])
    return out


def run(work: Path, size: int, config: str | None) -> dict:
    """Statuses, failing checks, governing checks and conductor volume of one plant."""
    dxf = work / f"plant_{size}.dxf"
    if not dxf.exists():
        subprocess.run([sys.executable, str(HERE / "generate_plant.py"), "--circuits", str(size),
                        "--out", str(work)], check=True)
    cmd = [sys.executable, "-m", "cablewright", "size", str(dxf), "--circuits",
           str(work / f"plant_{size}_circuits.csv"), "--out", str(work / f"out_{size}"), "--json"]
    if config:
        cmd += ["--config", config]
    done = subprocess.run(cmd, capture_output=True, text=True)
    circuits = json.loads(done.stdout)["circuits"]
    why: Counter = Counter()
    for c in circuits:
        if c["status"] in ("fail", "error"):
            why[", ".join(_failing(c)) or (c["messages"] or ["?"])[0][:60]] += 1
    volume_m3 = sum(c["cable"]["csa_mm2"] * 1e-6 * c["cable"]["cores"] * c["cable"]["parallel"]
                    * c["route"]["design_length_m"] for c in circuits if c.get("cable"))
    return {"circuits": len(circuits), "exit_code": done.returncode,
            "status": dict(Counter(c["status"] for c in circuits)), "failing": dict(why),
            "governed_by": dict(Counter(c["cable"]["governed_by"] for c in circuits if c.get("cable"))),
            "conductor_m3": round(volume_m3, 3)}


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--work", required=True, type=Path)
    parser.add_argument("--sizes", nargs="+", type=int, default=[1000, 2000])
    parser.add_argument("--config")
    args = parser.parse_args()
    args.work.mkdir(parents=True, exist_ok=True)
    for size in args.sizes:
        print(size, json.dumps(run(args.work, size, args.config)))


if __name__ == "__main__":
    main()
