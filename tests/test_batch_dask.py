"""Batch mode on a Dask cluster (``size --scheduler ADDRESS``) gives what ``--jobs 1`` gives.

The cluster is Dask's own ``LocalCluster`` started here (in this process, one
worker thread, no dashboard), the reference the batch run of this machine: two
small drawings (the sample and a generated 12-circuit plant) sized both ways must
give the same JSON on standard output, the same stderr lines and byte for byte the
same output files (``hashlib`` digests).  An address where no scheduler listens
gives exit code 2 and one line, no traceback, nothing written.
"""

from __future__ import annotations

import hashlib
import importlib.util
import json
import shutil
import sys
from pathlib import Path

import pytest

from cablewright import batch
from cablewright.cli import main

distributed = pytest.importorskip("distributed")

ROOT = Path(__file__).resolve().parents[1]
SAMPLES = ROOT / "sample_drawings"


@pytest.fixture(scope="module")
def drawings(tmp_path_factory):
    folder = tmp_path_factory.mktemp("drawings")
    shutil.copy(SAMPLES / "pumping_station.dxf", folder / "station.dxf")
    shutil.copy(SAMPLES / "pumping_station_circuits.csv", folder / "station_circuits.csv")
    name = "generate_plant_for_dask_test"
    spec = importlib.util.spec_from_file_location(name, ROOT / "benchmarks" / "generate_plant.py")
    generator = sys.modules[name] = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(generator)
    generator.generate_plant(folder, circuits=12, sources=2, seed=3)
    return folder


def _digests(folder: Path) -> dict[str, str]:
    return {str(p.relative_to(folder)): hashlib.sha256(p.read_bytes()).hexdigest()
            for p in sorted(folder.rglob("*")) if p.is_file()}


def _ours(err: str) -> list[str]:
    return [line for line in err.splitlines() if line.startswith("cablewright:")]


def test_scheduler_gives_what_jobs_1_gives(drawings, tmp_path, capsys):
    local = tmp_path / "local"
    code_local = main(["size", str(drawings), "--out", str(local), "--jobs", "1", "--json"])
    out_local, err_local = capsys.readouterr()
    with distributed.LocalCluster(n_workers=1, threads_per_worker=1, processes=False,
                                  dashboard_address=None) as cluster:
        remote = tmp_path / "cluster"
        code = main(["size", str(drawings), "--out", str(remote), "--scheduler",
                     cluster.scheduler_address, "--json"])
    out, err = capsys.readouterr()
    assert code == code_local
    doc, doc_local = json.loads(out), json.loads(out_local)
    assert len(doc["drawings"]) == 2 and all(d["circuits"] for d in doc["drawings"])
    assert doc == doc_local
    assert _ours(err) == _ours(err_local)
    assert sum("plant_12.dxf: 12 circuits" in line for line in _ours(err)) == 1
    assert _digests(remote) == _digests(local)
    assert len(_digests(remote)) >= 2 * 7  # every output of both drawings


def test_unreachable_scheduler_is_one_line_and_exit_2(drawings, tmp_path, capsys, monkeypatch):
    monkeypatch.setattr(batch, "SCHEDULER_TIMEOUT_S", 1.0)
    out = tmp_path / "out"
    code = main(["size", str(drawings), "--out", str(out), "--scheduler", "tcp://127.0.0.1:9"])
    err = capsys.readouterr().err
    assert code == 2
    assert "Traceback" not in err
    lines = _ours(err)
    assert len(lines) == 1 and "--scheduler tcp://127.0.0.1:9" in lines[0], err
    assert not out.exists()
