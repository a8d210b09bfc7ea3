"""The appending DXF writer gives the drawing the full writer gives, in the original's bytes.

Sources: ezdxf (general-purpose DXF library) re-reads and audits every result
(``Drawing.audit``) and gives the entities compared (``append_check``); the DXF
reference (AutoCAD 2012) for what must hold of the bytes: ``$HANDSEED`` is the
next free handle (above every handle in the file), a TABLE's group 70 counts
its entries, the original's entities are copied unchanged.  Every other
annotated copy the suite writes through ``size`` is compared with the full
writer's in ``conftest.py`` (``_both_dxf_writers``).
"""

from __future__ import annotations

import importlib.util
import sys
from pathlib import Path

import ezdxf
import pytest
from append_check import assert_same_drawing, read_back
from cablewright.annotate.drawing import AnnotationInput, write_annotated_dxf
from cablewright.annotate.drawing.append_writer import (
    AppendDeclined,
    AppendRequest,
    append_annotated_dxf,
)
from cablewright.annotate.drawing.style import DEFAULT_CONFIG
from cablewright.extract.dxf_stream import StreamDeclined, stream_dxf
from cablewright.extract.model import UNIT_TO_M, DrawingConfig

from cablewright.config import load_settings
from cablewright.pipeline import measure_drawing, size_measurement

ROOT = Path(__file__).resolve().parents[1]
SAMPLE = ROOT / "sample_drawings" / "pumping_station.dxf"
SAMPLE_CSV = ROOT / "sample_drawings" / "pumping_station_circuits.csv"
APPID = DEFAULT_CONFIG.appid


def _generator():
    spec = importlib.util.spec_from_file_location("generate_plant", ROOT / "benchmarks" / "generate_plant.py")
    module = importlib.util.module_from_spec(spec)
    assert spec.loader is not None
    sys.modules[spec.name] = module
    spec.loader.exec_module(module)
    return module


@pytest.fixture(scope="module")
def plant(tmp_path_factory):
    """The benchmark plant at 200 circuits (benchmarks/generate_plant.py, invented data)."""
    return _generator().generate_plant(tmp_path_factory.mktemp("plant200"), circuits=200, sources=2, seed=3)


def _marks(dxf: Path, csv: Path, streamed: bool):
    settings = load_settings(None)
    m = measure_drawing(dxf, csv, settings, keep_document=not streamed,
                        marks_appid=APPID if streamed else None)
    job = size_measurement(m, settings)
    return m, AnnotationInput(job.outcomes, m.segments, job.per_segment, m.equipment,
                              1.0 / UNIT_TO_M.get(m.units, 1.0))


def _both(dxf: Path, csv: Path, out: Path):
    """The full writer's and the appending writer's copy of one drawing, and their summaries."""
    m_full, marks_full = _marks(dxf, csv, streamed=False)
    full = write_annotated_dxf(dxf, out / "full.dxf", marks_full, document=m_full.source_document)
    m_app, marks_app = _marks(dxf, csv, streamed=True)
    app = write_annotated_dxf(dxf, out / "appended.dxf", marks_app, stream=AppendRequest(m_app.source_document))
    return full, app


@pytest.fixture(scope="module")
def pair(plant, tmp_path_factory):
    """The plant annotated once by each writer: (folder, full summary, appended summary)."""
    out = tmp_path_factory.mktemp("pair")
    full, app = _both(plant.dxf_path, plant.csv_path, out)
    return out, full, app


def _ours(path: Path) -> int:
    doc = ezdxf.readfile(path)
    return sum(1 for e in doc.modelspace() if e.has_xdata(APPID))


def test_benchmark_plant_both_writers_give_the_same_drawing(plant, pair):
    tmp_path, full, app = pair
    assert app.appended and not full.appended
    keys = assert_same_drawing(tmp_path / "appended.dxf", tmp_path / "full.dxf")
    assert (app.labels, app.group_tags, app.device_notes, app.text_height) == \
        (full.labels, full.group_tags, full.device_notes, full.text_height)
    assert app.labels == 200
    # the original's entities are all there: ezdxf's count of the input plus our marks
    original, _ = read_back(plant.dxf_path)
    assert sum(keys.values()) == sum(original.values()) + _ours(tmp_path / "appended.dxf")
    assert not (original - keys)


def test_rerun_on_an_appended_drawing_replaces_the_marks(plant, pair, tmp_path):
    first = pair[0] / "appended.dxf"
    m, marks = _marks(first, plant.csv_path, streamed=True)
    again = write_annotated_dxf(first, tmp_path / "again.dxf", marks, stream=AppendRequest(m.source_document))
    assert again.appended and again.removed == _ours(first) > 0
    a, findings = read_back(tmp_path / "again.dxf")
    b, _ = read_back(first)
    assert not findings and a == b  # replaced, never doubled
    assert_same_drawing(tmp_path / "again.dxf", pair[0] / "full.dxf")


def test_full_writer_rerun_on_an_appended_drawing_and_the_reverse(plant, pair, tmp_path):
    # the full writer's copy re-run by both writers, and so the appended one
    for name in ("full.dxf", "appended.dxf"):
        src = pair[0] / name
        m, marks = _marks(src, plant.csv_path, streamed=True)
        out = write_annotated_dxf(src, tmp_path / f"app-{name}", marks, stream=AppendRequest(m.source_document))
        m2, marks2 = _marks(src, plant.csv_path, streamed=False)
        write_annotated_dxf(src, tmp_path / f"full-{name}", marks2, document=m2.source_document)
        assert out.appended
        assert_same_drawing(tmp_path / f"app-{name}", tmp_path / f"full-{name}")


def _pairs(data: bytes) -> list[tuple[str, str]]:
    """(group code, value) pairs of a DXF text, codes stripped (DXF reference, "DXF Format")."""
    lines = data.decode("utf-8").splitlines()
    return [(lines[i].strip(), lines[i + 1]) for i in range(0, len(lines) - 1, 2)]


def _handles(data: bytes) -> list[int]:
    # group 5 (and 105 of DIMSTYLE) handle lines after the HEADER, code/value pairs read in order
    lines = data[data.index(b"\nENDSEC\n"):].decode("utf-8").splitlines()[1:]
    return [int(lines[i + 1], 16) for i in range(0, len(lines) - 1, 2) if lines[i].strip() in ("5", "105")]


def test_bytes_handseed_table_counts_and_the_original_copied(plant, pair):
    tmp_path = pair[0]
    original = plant.dxf_path.read_bytes()
    data = (tmp_path / "appended.dxf").read_bytes()
    doc = ezdxf.readfile(tmp_path / "appended.dxf")
    assert int(doc.header["$HANDSEED"], 16) > max(_handles(data))  # DXF reference: next free handle
    assert int(doc.header["$HANDSEED"], 16) > int(ezdxf.readfile(plant.dxf_path).header["$HANDSEED"], 16)
    pairs = _pairs(data)
    for table, name in ((doc.layers, "LAYER"), (doc.appids, "APPID"), (doc.styles, "STYLE"),
                        (doc.linetypes, "LTYPE")):
        at = next(i for i in range(len(pairs) - 1)
                  if pairs[i] == ("0", "TABLE") and pairs[i + 1] == ("2", name))
        head = pairs[at + 1:next(j for j in range(at + 1, len(pairs)) if pairs[j][0] == "0")]
        count = int(next(v for c, v in head if c == "70"))
        entries = sum(1 for c, v in pairs[at:next(j for j in range(at, len(pairs)) if pairs[j] == ("0", "ENDTAB"))]
                      if (c, v) == ("0", name))
        assert count == entries == len(table), name
    assert doc.appids.has_entry(APPID) and doc.styles.has_entry(DEFAULT_CONFIG.text_style)
    layer = doc.layers.get(DEFAULT_CONFIG.label_layer)
    assert layer.has_xdata(APPID)
    # the ENTITIES section of the input is copied byte for byte ahead of our marks
    start = original.index(b"ENTITIES")
    end = original.index(b"\n  0\nENDSEC", start)
    assert original[start:end] in data
    ours = [e for e in doc.modelspace() if e.has_xdata(APPID)]
    msp_handle = doc.modelspace().block_record_handle
    assert ours and all(e.dxf.owner == msp_handle for e in ours)


def test_crlf_drawing_keeps_its_line_ends(plant, tmp_path):
    crlf = tmp_path / "crlf.dxf"
    crlf.write_bytes(plant.dxf_path.read_bytes().replace(b"\n", b"\r\n"))
    full, app = _both(crlf, plant.csv_path, tmp_path)
    assert app.appended
    data = (tmp_path / "appended.dxf").read_bytes()
    assert data.count(b"\n") == data.count(b"\r\n")
    assert_same_drawing(tmp_path / "appended.dxf", tmp_path / "full.dxf")


def _small_drawing(path: Path, version: str, extra=None) -> Path:
    doc = ezdxf.new(version, setup=True)
    doc.header["$INSUNITS"] = 6
    msp = doc.modelspace()
    msp.add_lwpolyline([(0, 0), (20, 0), (20, 10)], dxfattribs={"layer": "ROUTE-TRAY"})
    msp.add_text("ROOM 1", height=0.5, dxfattribs={"layer": "A-TEXT", "insert": (5, 2)})
    block = doc.blocks.new("LOAD")
    block.add_circle((0, 0), 0.3)
    block.add_attdef("TAG", (0.4, 0), dxfattribs={"height": 0.25})
    for tag, at in (("DB-1", (0, 0)), ("M-1", (20, 10))):
        msp.add_blockref("LOAD", at).add_auto_attribs({"TAG": tag})
    if extra is not None:
        extra(doc)
    doc.saveas(path)
    return path


def _schedule(path: Path) -> Path:
    path.write_text("circuit,from,to,load,power_factor,voltage,phases\n"
                    "C-1,DB-1,M-1,5.5 kW,0.85,400,3\n", encoding="utf-8")
    return path


@pytest.mark.parametrize("version", ["AC1015", "AC1018", "AC1024", "AC1032"])
def test_versions_r2000_to_r2018(tmp_path, version):
    dxf = _small_drawing(tmp_path / f"small-{version}.dxf", version)
    full, app = _both(dxf, _schedule(tmp_path / "c.csv"), tmp_path)
    assert app.appended and app.labels == full.labels == 1
    assert_same_drawing(tmp_path / "appended.dxf", tmp_path / "full.dxf")


def test_an_old_mark_with_attributes_is_cut_with_its_sub_entities(tmp_path):
    def stray_mark(doc):
        doc.appids.new(APPID)
        ref = doc.modelspace().add_blockref("LOAD", (10, 5))
        ref.add_auto_attribs({"TAG": "X-9"})
        ref.set_xdata(APPID, [(1000, "cable-label"), (1000, "X-9")])

    dxf = _small_drawing(tmp_path / "stray.dxf", "AC1032", stray_mark)
    full, app = _both(dxf, _schedule(tmp_path / "c.csv"), tmp_path)
    assert app.appended and app.removed == full.removed == 1
    keys = assert_same_drawing(tmp_path / "appended.dxf", tmp_path / "full.dxf")
    assert not [k for k in keys if k[0] == "INSERT" and "X-9" in k[2]]
    assert b"X-9" not in (tmp_path / "appended.dxf").read_bytes()


def test_r12_and_the_sample_go_to_the_full_writer(tmp_path):
    doc = ezdxf.new("R12")
    doc.layers.add("ROUTE-TRAY")
    doc.modelspace().add_polyline2d([(0, 0), (20, 0)], dxfattribs={"layer": "ROUTE-TRAY"})
    doc.saveas(tmp_path / "r12.dxf")
    try:
        content = stream_dxf(tmp_path / "r12.dxf", DrawingConfig(units="m"), marks_appid=APPID)
    except StreamDeclined:
        content = None  # the stream itself declines: the full reader and writer take it
    if content is not None:
        assert content.obstacles.dxfversion == "AC1009"
        with pytest.raises(AppendDeclined, match="DXF version AC1009"):
            append_annotated_dxf(tmp_path / "r12.dxf", tmp_path / "out.dxf", None, DEFAULT_CONFIG,
                                 content.obstacles)
        assert not (tmp_path / "out.dxf").exists()
    # the sample holds route geometry in blocks: the stream declines it, the full path writes it
    with pytest.raises(StreamDeclined, match="route geometry"):
        stream_dxf(SAMPLE, marks_appid=APPID)


def test_binary_dxf_is_declined(tmp_path):
    dxf = _small_drawing(tmp_path / "text.dxf", "AC1032")
    doc = ezdxf.readfile(dxf)
    doc.saveas(tmp_path / "binary.dxf", fmt="bin")
    with pytest.raises(StreamDeclined, match="binary"):
        stream_dxf(tmp_path / "binary.dxf", marks_appid=APPID)


def test_size_appends_with_the_units_and_version_guid_of_the_full_writer(tmp_path):
    from cablewright.annotate.reproducible import dxf_version_guid, file_digest

    from cablewright.size_run import settings_from, size_drawing

    def unitless(doc):
        doc.header["$INSUNITS"] = 0

    dxf = _small_drawing(tmp_path / "unitless.dxf", "AC1032", unitless)
    run = size_drawing(dxf, str(_schedule(tmp_path / "c.csv")), None, settings_from(None, "m"),
                       tmp_path / "out", quiet=True)
    out = next(p for p in run.written if p.suffix == ".dxf")
    doc = ezdxf.readfile(out)
    assert doc.header["$INSUNITS"] == 6  # DXF reference: $INSUNITS 6 = metres
    assert doc.header["$VERSIONGUID"] == dxf_version_guid(file_digest(dxf))
    assert not read_back(out)[1]


def test_streamed_linework_is_the_parsed_drawings(plant):
    # avoid_linework (the default): the lines the marks keep off, from the stream, are the
    # ones linework.py reads from the drawing as ezdxf parses it (LINEs, polylines, circles,
    # block and dimension lines; the closed rectangles keep their last vertex)
    import collections

    import shapely
    from cablewright.annotate.drawing.append_scan import scratch_drawing
    from cablewright.annotate.drawing.linework import linework_geometries
    from ezdxf.fonts import fonts

    content = stream_dxf(plant.dxf_path, marks_appid=APPID)
    scratch = scratch_drawing(content.obstacles, DEFAULT_CONFIG,
                              fonts.make_font(DEFAULT_CONFIG.font, 1.0).text_width, [])
    h = 250.0  # a text height of the plant [mm]; curves flattened to h / 10

    def keys(geoms):
        return collections.Counter(shapely.to_wkt(g, rounding_precision=6) for g in geoms)

    doc = ezdxf.readfile(plant.dxf_path)
    parsed = keys(linework_geometries(doc, APPID, h))
    streamed = keys([*linework_geometries(scratch.doc, APPID, h), *scratch.lines])
    assert len(scratch.lines) == len(doc.modelspace().query("LINE")) > 0
    assert streamed == parsed


def test_a_drawing_saved_during_the_annotation_is_refused_in_one_line(tmp_path, monkeypatch, capsys):
    """The appending writer reads the drawing's bytes after placing the marks (memory); when
    the drawing was saved in between, our handles and marks belong to the old one: one clear
    line, exit 2 (contract), and no annotated copy half-written."""
    import os

    from cablewright.annotate.drawing import append_writer

    from cablewright.cli import main

    dxf = _small_drawing(tmp_path / "saved.dxf", "AC1032")
    placed = append_writer.add_marks

    def save_meanwhile(*args, **kwargs):
        counts = placed(*args, **kwargs)
        with open(dxf, "ab") as f:  # the engineer saves the drawing while we work
            f.write(b"")
        stat = dxf.stat()
        os.utime(dxf, ns=(stat.st_atime_ns, stat.st_mtime_ns + 1_000_000_000))
        return counts

    monkeypatch.setattr(append_writer, "add_marks", save_meanwhile)
    out = tmp_path / "out"
    code = main(["size", str(dxf), "--circuits", str(_schedule(tmp_path / "c.csv")), "--out", str(out)])
    err = capsys.readouterr().err.strip().splitlines()
    assert code == 2
    assert [line for line in err if "saved while it was being annotated" in line] == \
        [line for line in err if "saved.dxf" in line and "annotated" in line]
    assert len([line for line in err if "saved while" in line]) == 1
    assert "Traceback" not in "\n".join(err)
    assert not (out / "saved_annotated.dxf").exists()
