"""The sample drawing sized under both rule sets: routes and groups identical, sizing differs.

The measuring stage (extract/) does not know the rule set (contract.md: `routes` gives the
lengths and grouping alone); so the route of every circuit and the circuits on each of its
segments must be the same under ``standard = "iec"`` and ``"nec"``, and the same as
`routes --json` gives.  Only the sizing differs: mm² under IEC 60364, AWG/kcmil under NFPA 70.
"""

from __future__ import annotations

import contextlib
import io
import json
import re
from pathlib import Path

import pytest

from cablewright.cli import main

ROOT = Path(__file__).resolve().parents[1]
DRAWING = ROOT / "sample_drawings" / "pumping_station.dxf"
CIRCUITS = ROOT / "sample_drawings" / "pumping_station_circuits.csv"
NEC_CONFIG = ROOT / "sample_drawings" / "pumping_station_nec.toml"


def _run(args: list[str]) -> tuple[int, dict]:
    stdout = io.StringIO()
    with contextlib.redirect_stdout(stdout), contextlib.redirect_stderr(io.StringIO()):
        code = main(args)
    return code, json.loads(stdout.getvalue())


@pytest.fixture(scope="module")
def both(tmp_path_factory):
    base = ["size", str(DRAWING), "--circuits", str(CIRCUITS), "--json"]
    code_iec, iec = _run(base + ["--out", str(tmp_path_factory.mktemp("iec"))])
    nec_out = tmp_path_factory.mktemp("nec")
    code_nec, nec = _run(base + ["--out", str(nec_out), "--config", str(NEC_CONFIG)])
    _, routes = _run(["routes", str(DRAWING), "--circuits", str(CIRCUITS), "--json"])
    return code_iec, iec, code_nec, nec, routes, nec_out


def test_routes_and_groups_are_identical_under_both_rule_sets(both):
    _, iec, _, nec, routes, _ = both
    by_id = {c["id"]: c for c in routes["circuits"]}
    assert [c["id"] for c in iec["circuits"]] == [c["id"] for c in nec["circuits"]]
    for a, b in zip(iec["circuits"], nec["circuits"], strict=True):
        assert a["route"] == b["route"] == by_id[a["id"]]["route"], a["id"]
        assert a["grouping"]["circuits_in_group"] == b["grouping"]["circuits_in_group"], a["id"]
        assert ([s["circuits"] for s in a["grouping"]["segments"]]
                == [s["circuits"] for s in b["grouping"]["segments"]]
                == [s["circuits"] for s in by_id[a["id"]]["grouping"]["segments"]]), a["id"]


def test_only_the_sizing_differs(both):
    code_iec, iec, code_nec, nec, _, _ = both
    assert iec["standard"] == "iec" and nec["standard"] == "nec"
    assert code_iec in (0, 1) and code_nec in (0, 1)
    for a, b in zip(iec["circuits"], nec["circuits"], strict=True):
        assert a["status"] != "error" and b["status"] != "error", (a["messages"], b["messages"])
        assert re.fullmatch(r"\d+(\.\d+)? mm²", a["cable"]["size_label"]), a["cable"]
        assert re.fullmatch(r"(\d+|\d/0) AWG|\d+ kcmil", b["cable"]["size_label"]), b["cable"]
        # csa_mm2 stays the area in mm² (contract.md Extensions): 1 cmil = 5.067e-4 mm²
        assert 2.0 < b["cable"]["csa_mm2"] < 510.0
        assert any("authority having jurisdiction" in m for m in b["messages"])
        assert not any("NFPA" in m for m in a["messages"])
        assert any(c["source"].startswith("NFPA 70:2023") for c in b["checks"])
    # the bill of quantities names each cable as its rule set writes it
    assert all("mm²" in q["cable"] for q in iec["quantities"])
    assert all(("AWG" in q["cable"] or "kcmil" in q["cable"]) and "mm²" not in q["cable"]
               for q in nec["quantities"])


def test_nec_outputs_name_awg_and_kcmil(both):
    *_, out = both
    schedule = (out / "schedule.csv").read_text(encoding="utf-8-sig")
    assert "AWG" in schedule and "mm² Cu" not in schedule
    import ezdxf

    doc = ezdxf.readfile(next(out.glob("*_annotated.dxf")))
    texts = [e.dxf.text if e.dxftype() == "TEXT" else e.text for e in doc.modelspace().query("TEXT MTEXT")]
    assert any("AWG" in t or "kcmil" in t for t in texts)
