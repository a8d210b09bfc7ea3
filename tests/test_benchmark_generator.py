"""The benchmark plant generator makes a valid drawing whose circuits all route.

The expected routed lengths are computed by the generator from the coordinates it
places (tail + feeder + Manhattan distance along the full tray grid + branch + tail),
independently of the extraction code; the drawing is checked with ezdxf's auditor.
"""

from __future__ import annotations

import csv
import importlib.util
import sys
from pathlib import Path

import ezdxf
import pytest
from cablewright.extract import build_network, read_dxf, read_schedule, route_circuits

ROOT = Path(__file__).resolve().parents[1]


def _generator():
    spec = importlib.util.spec_from_file_location("generate_plant", ROOT / "benchmarks" / "generate_plant.py")
    module = importlib.util.module_from_spec(spec)
    assert spec.loader is not None
    sys.modules[spec.name] = module  # dataclasses look their module up there
    spec.loader.exec_module(module)
    return module


def test_small_plant_is_valid_and_every_circuit_routes(tmp_path: Path) -> None:
    gen = _generator()
    files = gen.generate_plant(tmp_path, circuits=60, sources=3, seed=7)

    # a valid DXF: ezdxf reads it back and its auditor finds no error
    doc = ezdxf.readfile(files.dxf_path)
    assert doc.audit().has_errors is False
    assert doc.header["$INSUNITS"] == 4  # millimetres (DXF reference, $INSUNITS)
    assert len(doc.modelspace()) == files.entities
    layers = {e.dxf.layer for e in doc.modelspace()}
    assert {"ROUTE-TRAY", "ROUTE-LADDER", "ROUTE-DUCT", "ROUTE-CONDUIT"} <= layers

    content = read_dxf(files.dxf_path)
    assert len(content.polylines) == files.route_pieces
    assert len(content.equipment) == 60 + 3  # one per load, one per source
    network = build_network(content.polylines, content.equipment)
    rows = read_schedule(files.csv_path)
    routes, failures = route_circuits(network, rows)
    assert failures == {}
    assert len(routes) == 60

    with files.csv_path.open(encoding="utf-8") as f:
        expected = {r["circuit"]: float(r["expected_routed_m"]) for r in csv.DictReader(f)}
    for cid, route in routes.items():
        # the generator prints 4 decimals; arcs are flattened to 2-degree chords (< 5e-5 relative)
        assert route.routed_length_m == pytest.approx(expected[cid], abs=1e-3), cid
    # some circuits come from the neighbouring area's source, over the spine
    assert any(r.from_tag != "MCC-01" for r in rows)


def test_same_seed_same_schedule(tmp_path: Path) -> None:
    gen = _generator()
    a = gen.generate_plant(tmp_path / "a", circuits=30, sources=2, seed=3)
    b = gen.generate_plant(tmp_path / "b", circuits=30, sources=2, seed=3)
    assert a.csv_path.read_text() == b.csv_path.read_text()
    assert (a.entities, a.route_pieces) == (b.entities, b.route_pieces)
