"""The streaming DXF reader measures what the full reader measures, or declines.

Sources: the full reader (``read_dxf``, built on ezdxf's entity objects) is the
reference; lengths are also checked with shapely (``LineString.length``) and the
bulge arc against the circle's own length r * theta (DXF reference, LWPOLYLINE
group 42: bulge = tan(theta / 4)).  Every other drawing the suite reads is
compared in ``conftest.py`` (``_both_dxf_readers``).
"""

from __future__ import annotations

import gc
import importlib.util
import json
import logging
import math
import subprocess
import sys
from pathlib import Path

import ezdxf
import pytest
from cablewright.extract import measure
from cablewright.extract.dxf_reader import read_dxf
from cablewright.extract.dxf_stream import StreamContent, StreamDeclined, read_dxf_fast, stream_dxf
from cablewright.extract.model import DrawingConfig
from conftest import compare_readers
from shapely.geometry import LineString

from cablewright.collector import RUN_THRESHOLDS, collect_between, settle, tuned_collector

ROOT = Path(__file__).resolve().parents[1]
SAMPLE = ROOT / "sample_drawings" / "pumping_station.dxf"
SAMPLE_CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"


def _generator():
    spec = importlib.util.spec_from_file_location("generate_plant", ROOT / "benchmarks" / "generate_plant.py")
    module = importlib.util.module_from_spec(spec)
    assert spec.loader is not None
    sys.modules[spec.name] = module
    spec.loader.exec_module(module)
    return module


@pytest.fixture(scope="module")
def plant(tmp_path_factory):
    return _generator().generate_plant(tmp_path_factory.mktemp("plant"), circuits=60, sources=3, seed=7)


def _length_m(content) -> float:
    return sum(LineString(p.points_m).length for p in content.polylines)


def test_benchmark_plant_is_streamed_with_the_same_pieces_equipment_and_units(plant):
    full, streamed = read_dxf(plant.dxf_path), stream_dxf(plant.dxf_path)
    compare_readers(full, streamed)
    assert isinstance(streamed, StreamContent) and streamed.document is None
    assert len(streamed.polylines) > 500 and len(streamed.equipment) >= 63
    assert _length_m(streamed) == pytest.approx(_length_m(full), rel=1e-12)  # shapely
    doc = ezdxf.readfile(plant.dxf_path)
    assert streamed.handseed == doc.header["$HANDSEED"]
    assert streamed.dxfversion == doc.dxfversion
    extmin, extmax = doc.header.get("$EXTMIN"), doc.header.get("$EXTMAX")
    if extmin and extmax and extmax[0] > extmin[0]:  # when ezdxf wrote the header extents
        x0, y0, x1, y1 = streamed.extents
        assert x0 >= extmin[0] - 1e-6 and x1 <= extmax[0] + 1e-6


def test_benchmark_plant_measures_the_same_with_either_reader(plant):
    a = measure(plant.dxf_path, plant.csv_path, keep_document=True)
    b = measure(plant.dxf_path, plant.csv_path, keep_document=False)
    assert b.source_document is None and a.source_document is not None
    assert a.segments == b.segments and a.equipment == b.equipment and a.units == b.units
    assert {c: r.routed_length_m for c, r in a.routes.items()} == {c: r.routed_length_m for c, r in b.routes.items()}
    assert a.failures == b.failures and len(a.routes) == 60


def _curvy(path: Path) -> Path:
    """Every route entity kind the stream reads, in mm, with clutter and paper space."""
    doc = ezdxf.new("R2018")
    doc.header["$INSUNITS"] = 4
    msp = doc.modelspace()
    blk = doc.blocks.new("EQ")
    blk.add_circle((0, 0), 100)
    blk.add_attdef("TAG", (0, 0))
    msp.add_line((0, 0, 3000), (10000, 0, 3000), dxfattribs={"layer": "ROUTE-TRAY"})
    msp.add_lwpolyline([(10000, 0, 0.0), (14000, 0, 0.5), (18000, 0, 0.0), (18000, 5000, -1.0), (20000, 5000, 0)],
                       format="xyb", dxfattribs={"layer": "route-ladder", "elevation": 3000})
    msp.add_lwpolyline([(0, 10000), (2000, 10000), (2000, 12000)], close=True, dxfattribs={"layer": "ROUTE-DUCT"})
    p2 = msp.add_polyline2d([(20000, 5000), (24000, 5000), (24000, 9000)], dxfattribs={"layer": "ROUTE-CONDUIT"})
    p2.vertices[0].dxf.bulge = 0.3
    p2.dxf.elevation = (0, 0, 2500)
    msp.add_polyline3d([(24000, 9000, 0), (24000, 9000, 4000), (30000, 9000, 4000)], close=True,
                       dxfattribs={"layer": "ROUTE-CLIPPED"})
    msp.add_arc((30000, 4000), 5000, 90, 0, dxfattribs={"layer": "ROUTE-BURIED"})
    msp.add_arc((0, 0), 50, 0, 180, dxfattribs={"layer": "A-WALL"})
    msp.add_text("ROOM 1", dxfattribs={"layer": "A-TEXT", "height": 250}).set_placement((500, 500))
    msp.add_mtext("NOTE\\PTWO", dxfattribs={"layer": "A-TEXT", "char_height": 200, "insert": (900, 900)})
    msp.add_circle((5000, 5000), 300, dxfattribs={"layer": "A-COLS"})
    msp.add_line((0, 0), (0, 40000), dxfattribs={"layer": "A-WALL"})
    for tag, pos in (("MCC-1", (-400, -300)), ("P-101", (20400, 5000))):
        msp.add_blockref("EQ", pos, dxfattribs={"layer": "E-EQPT"}).add_auto_attribs({"TAG": tag, "KW": "7.5"})
    msp.add_blockref("EQ", (100, 100), dxfattribs={"layer": "E-EQPT"})  # a symbol without a tag
    psp = doc.paperspace()
    psp.add_line((0, 0), (100, 0), dxfattribs={"layer": "ROUTE-TRAY"})  # paper space: not a route
    psp.add_blockref("EQ", (5, 5)).add_auto_attribs({"TAG": "SHEET-1"})
    doc.saveas(path)
    return path


def test_every_route_entity_kind_is_read_the_same(tmp_path):
    path = _curvy(tmp_path / "curvy.dxf")
    full, streamed = read_dxf(path), stream_dxf(path)
    compare_readers(full, streamed)
    assert {p.layer for p in streamed.polylines} == {"ROUTE-TRAY", "ROUTE-LADDER", "ROUTE-DUCT",
                                                      "ROUTE-CONDUIT", "ROUTE-CLIPPED", "ROUTE-BURIED"}
    assert sorted(e.tag for e in streamed.equipment) == ["MCC-1", "P-101"]  # not the paper-space one
    assert [t.text for t in streamed.texts if t.kind != "ATTRIB"] == ["ROOM 1", "NOTE\\PTWO"]
    assert len(streamed.inserts) == 3
    # the bulge 0.5 from (14, 0) to (18, 0) m: theta = 4 atan(0.5), r = c / (2 sin(theta / 2))
    theta = 4.0 * math.atan(0.5)
    r = 4.0 / (2.0 * math.sin(theta / 2.0))
    ladder = next(p for p in streamed.polylines if p.layer == "ROUTE-LADDER")
    first_arc = [q for q in ladder.points_m if 14.0 - 1e-9 <= q[0] <= 18.0 + 1e-9 and q[1] <= 0.0]
    assert LineString(first_arc).length == pytest.approx(r * theta, rel=5e-5)
    assert all(q[2] == pytest.approx(3.0) for q in ladder.points_m)


@pytest.mark.parametrize("case", ["binary", "minsert", "extrusion", "spline", "truncated", "cp1252", "block"])
def test_what_the_stream_does_not_handle_goes_to_the_full_reader(tmp_path, case, caplog):
    doc = ezdxf.new("R2000" if case == "cp1252" else "R2018")
    doc.header["$INSUNITS"] = 6
    msp = doc.modelspace()
    msp.add_line((0, 0), (10, 0), dxfattribs={"layer": "ROUTE-TRAY"})
    blk = doc.blocks.new("EQ")
    blk.add_attdef("TAG", (0, 0))
    msp.add_blockref("EQ", (0, 1)).add_auto_attribs({"TAG": "A"})
    fmt = "asc"
    if case == "binary":
        fmt = "bin"
    elif case == "minsert":
        msp.add_blockref("EQ", (5, 1), dxfattribs={"column_count": 2, "column_spacing": 1.0})
    elif case == "extrusion":
        msp.add_arc((10, 5), 5, 270, 360, dxfattribs={"layer": "ROUTE-TRAY", "extrusion": (0, 0, -1)})
    elif case == "spline":
        msp.add_spline([(10, 0), (12, 1), (14, 0)], dxfattribs={"layer": "ROUTE-TRAY"})
    elif case == "cp1252":
        msp.add_text("Pumpenhaus Süd", dxfattribs={"layer": "A-TEXT"})
    elif case == "block":
        run = doc.blocks.new("RUN")
        run.add_line((0, 0), (5, 0), dxfattribs={"layer": "ROUTE-TRAY"})
        msp.add_blockref("RUN", (10, 0))
    path = tmp_path / f"{case}.dxf"
    doc.saveas(path, fmt=fmt)
    if case == "truncated":
        data = path.read_bytes()
        path.write_bytes(data[: len(data) * 3 // 4])
    with pytest.raises(StreamDeclined) as declined:
        stream_dxf(path)
    assert declined.value.reason
    if case == "truncated":
        with pytest.raises(Exception):  # noqa: B017 - the full reader's own error
            read_dxf(path)
        return
    with caplog.at_level(logging.INFO, logger="cablewright.extract.dxf_stream"):
        content = read_dxf_fast(path)
    assert content.document is not None  # read by the full reader
    assert "streaming reader declined it" in caplog.text
    compare_readers(read_dxf(path), content)


def test_tags_from_text_goes_to_the_full_reader(plant):
    with pytest.raises(StreamDeclined, match="tags_from_text"):
        stream_dxf(plant.dxf_path, DrawingConfig(tags_from_text=True))


def test_routes_uses_the_stream_and_says_under_debug_when_it_falls_back(plant, capsys):
    from cablewright import commands_drawing
    from cablewright.cli import main

    assert main(["routes", str(plant.dxf_path), "--circuits", str(plant.csv_path), "--json"]) in (0, 1)
    streamed = json.loads(capsys.readouterr().out)
    commands_drawing.ROUTES_KEEPS_DOCUMENT = True
    try:
        main(["routes", str(plant.dxf_path), "--circuits", str(plant.csv_path), "--json"])
    finally:
        commands_drawing.ROUTES_KEEPS_DOCUMENT = False
    assert json.loads(capsys.readouterr().out) == streamed
    run = subprocess.run([sys.executable, "-m", "cablewright", "routes", str(SAMPLE), "--circuits",
                          str(SAMPLE_CSV), "--json", "--debug"], capture_output=True, text=True, check=False)
    err = run.stderr
    assert "read with the full DXF reader: the streaming reader declined it (block" in err


def test_collector_thresholds_are_raised_during_a_run_and_restored_after():
    before = gc.get_threshold()
    with tuned_collector():
        assert gc.get_threshold() == RUN_THRESHOLDS
        assert gc.get_freeze_count() > 0  # the imports' objects frozen (Python docs, gc.freeze)
        with tuned_collector((1, 1, 1)):  # nested: only the outermost block changes it
            assert gc.get_threshold() == RUN_THRESHOLDS
    assert gc.get_threshold() == before and gc.get_freeze_count() == 0
    with tuned_collector(None):
        assert gc.get_threshold() == before
    assert collect_between() >= 0


def test_settle_freezes_what_lives_only_inside_a_run():
    """``settle`` (after the measurement and the sizing) freezes the live objects inside a
    tuned run, so the collector never walks them again; outside one it does nothing; the
    run's end unfreezes them (Python docs, gc.freeze / get_freeze_count)."""
    assert settle() is False and gc.get_freeze_count() == 0
    with tuned_collector():
        frozen = gc.get_freeze_count()
        kept = [[i] for i in range(10_000)]  # long-lived results of a stage
        assert settle() is True
        assert gc.get_freeze_count() >= frozen + len(kept)
    assert gc.get_freeze_count() == 0


def _modules_after(code: str) -> set[str]:
    probe = (f"import sys, io, contextlib\n{code}\n"
             "print(' '.join(m for m in ('matplotlib', 'openpyxl', 'networkx', 'shapely', 'ezdxf')"
             " if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, check=True)
    return set(out.stdout.split())


def test_calc_imports_no_plotting_spreadsheet_graph_or_cad_library():
    loaded = _modules_after("from cablewright.cli import main\n"
                            "with contextlib.redirect_stdout(io.StringIO()): main(['calc', '--load', '10 kW'])")
    assert loaded == set()


def test_routes_on_a_streamed_drawing_imports_neither_matplotlib_openpyxl_nor_ezdxf(plant):
    loaded = _modules_after("from cablewright.cli import main\n"
                            f"with contextlib.redirect_stdout(io.StringIO()): main(['routes', {str(plant.dxf_path)!r}, "
                            f"'--circuits', {str(plant.csv_path)!r}])")
    assert loaded == {"networkx", "shapely"}


def test_text_and_insert_records_and_extents_match_ezdxf(plant):
    """Records against ezdxf's own entity attributes; extents inside ``ezdxf.bbox.extents``."""
    from ezdxf import bbox

    streamed = stream_dxf(plant.dxf_path)
    msp = ezdxf.readfile(plant.dxf_path).modelspace()
    texts = {t.handle: t for t in streamed.texts}
    expected = 0
    for e in msp:
        if e.dxftype() == "TEXT":
            t = texts[e.dxf.handle]
            assert (t.text, t.insert, t.height, t.rotation_deg) == (
                e.dxf.text, tuple(e.dxf.insert), e.dxf.height, e.dxf.rotation)
            assert (t.halign, t.valign) == (e.dxf.halign, e.dxf.valign)
            expected += 1
        elif e.dxftype() == "MTEXT":
            t = texts[e.dxf.handle]
            assert (t.text, t.insert, t.height, t.attachment) == (
                e.text, tuple(e.dxf.insert), e.dxf.char_height, e.dxf.attachment_point)
            expected += 1
        elif e.dxftype() == "INSERT":
            expected += sum(1 for a in e.attribs if not a.is_invisible)
    assert expected > 100 and len(streamed.texts) == expected
    inserts = {i.handle: i for i in streamed.inserts}
    refs = [e for e in msp if e.dxftype() == "INSERT"]
    assert len(inserts) == len(refs)
    for e in refs:
        assert (inserts[e.dxf.handle].block_name, inserts[e.dxf.handle].insert) == (e.dxf.name, tuple(e.dxf.insert))
    box = bbox.extents(msp, fast=True)
    x0, y0, x1, y1 = streamed.extents
    assert box.extmin.x - 1e-6 <= x0 < x1 <= box.extmax.x + 1e-6
    assert box.extmin.y - 1e-6 <= y0 < y1 <= box.extmax.y + 1e-6


def test_batch_collects_between_drawings(plant, tmp_path, monkeypatch):
    import shutil

    from cablewright import collector
    from cablewright.cli import main

    calls = []
    monkeypatch.setattr(collector, "collect_between", lambda: calls.append(gc.collect()) or 0)
    folder = tmp_path / "drawings"
    folder.mkdir()
    for name in ("a", "b"):
        shutil.copy(plant.dxf_path, folder / f"{name}.dxf")
        shutil.copy(plant.csv_path, folder / f"{name}_circuits.csv")
    assert main(["size", str(folder), "--out", str(tmp_path / "out"), "--json"]) in (0, 1)
    assert len(calls) == 2  # once after each drawing (gc.collect, Python docs)
