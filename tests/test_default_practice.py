"""The defaults on a plausible plant (issue 10 item 3): most circuits pass.

A 200-circuit plant from ``benchmarks/generate_plant.py`` (invented data, C-curve
breakers, long final runs) is sized with the default settings through the Python
API. With disconnection failures only reported (the old default) most circuits
fail IEC 60364-4-41:2005 411.4.4; with the default upsizing (at most three IEC 60228
sizes) at most a fifth fail, each with the advice of a residual-current
device (411.4.5), and every upsized circuit disconnects: Zs <= U0 / Ia in its check.
"""

from __future__ import annotations

import importlib.util
import sys
from pathlib import Path

import pytest
from cablewright.sizing.config import SizingConfig

import cablewright
from cablewright.config import Settings

ROOT = Path(__file__).resolve().parents[1]


@pytest.fixture(scope="module")
def plant(tmp_path_factory):
    spec = importlib.util.spec_from_file_location("generate_plant", ROOT / "benchmarks" / "generate_plant.py")
    module = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = module
    spec.loader.exec_module(module)
    files = module.generate_plant(tmp_path_factory.mktemp("plant"), circuits=200, seed=3)
    return cablewright.measure(files.dxf_path, files.csv_path)


def _checks(outcome, name):
    return next(c for c in outcome.sizing.checks if c.name == name)


def test_default_upsizing_passes_most_circuits_and_advises_an_rcd_for_the_rest(plant):
    job = cablewright.size(plant)
    statuses = [o.status for o in job.outcomes]
    assert statuses.count("error") == 0
    # the plant's longest final runs on motor-protection breakers (instantaneous about
    # 13 In, the default for direct-on-line motors) need more than three sizes or an RCD
    assert statuses.count("fail") <= 0.20 * len(statuses)
    for o in job.outcomes:
        dis = _checks(o, "disconnection")
        if o.status == "fail":
            assert not dis.passed and "residual-current device" in dis.message
        if o.sizing.cable.governed_by == "disconnection":
            assert dis.passed and dis.value <= dis.limit


def test_reporting_only_fails_most_of_the_same_plant(plant):
    off = Settings(sizing=SizingConfig(disconnection_upsize=False))
    job = cablewright.size(plant, config=off)
    fails = [o for o in job.outcomes if o.status == "fail"]
    assert len(fails) > 0.5 * len(job.outcomes)
    assert all(not _checks(o, "disconnection").passed for o in fails)
