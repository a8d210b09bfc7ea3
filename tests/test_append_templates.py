"""The splice's entity templates write what ezdxf's own export writes, tag by tag.

Source of truth: ezdxf (a general-purpose DXF library) exporting the same entity
(``export_dxf`` into a ``TagCollector``, as the appending writer exported every
mark before the templates, and as ``Drawing.saveas`` writes it): the same group
codes in the same order, strings equal, reals within 1e-9, the owner replaced
by the model-space BLOCK_RECORD handle given.  The entities are made by our
own pen (:class:`EntityWriter`, as the marks are made) and directly with the
settings the schedule table and the optional attributes use.
"""

from __future__ import annotations

import math

import ezdxf
import pytest
from cablewright.annotate.drawing.append_templates import TEMPLATED_TYPES, entity_text
from cablewright.annotate.drawing.entities import EntityWriter, Mark
from cablewright.annotate.drawing.placement import Placement
from cablewright.annotate.drawing.style import DEFAULT_CONFIG
from ezdxf.enums import TextEntityAlignment
from ezdxf.lldxf.tagwriter import TagCollector
from shapely.geometry import box

VERSIONS = ("R2000", "R2004", "R2007", "R2010", "R2013", "R2018")
OWNER = "1F"
MARK = Mark("label", "cable-label", "C-001")
#: Reals agree within this (the brief's tolerance: 1e-9 drawing units).
TOL = 1e-9


def _ezdxf_tags(entity, version: str) -> list[tuple[int, object]]:
    collector = TagCollector(dxfversion=version, optional=False)
    entity.export_dxf(collector)
    out = [(t.code, t.value) for t in collector.tags]
    i = next(i for i, (code, _) in enumerate(out) if code == 330)
    out[i] = (330, OWNER)
    return out


def _template_tags(text: str) -> list[tuple[int, str]]:
    lines = text.split("\n")
    assert lines[-1] == "", "the template ends with a line end"
    lines = lines[:-1]
    assert len(lines) % 2 == 0
    for code in lines[0::2]:
        assert code == f"{int(code):3d}", f"group code line {code!r} not as ezdxf writes it"
    return [(int(c), v) for c, v in zip(lines[0::2], lines[1::2], strict=True)]


def assert_same_tags(entity, version: str) -> None:
    text = entity_text(entity, OWNER, version)
    assert text is not None, f"{entity.dxftype()} not templated"
    ours, theirs = _template_tags(text), _ezdxf_tags(entity, version)
    assert [c for c, _ in ours] == [c for c, _ in theirs], (ours, theirs)
    for (code, mine), (_, value) in zip(ours, theirs, strict=True):
        if isinstance(value, float):
            assert math.isclose(float(mine), value, rel_tol=0.0, abs_tol=TOL), (code, mine, value)
        else:
            assert mine == str(value), (code, mine, value)


def _pen(version: str) -> tuple[object, EntityWriter]:
    doc = ezdxf.new(version)
    return doc, EntityWriter(doc, DEFAULT_CONFIG, 0.25)


def _place(rotation: float = 0.0) -> Placement:
    return Placement(3.5, -1.25, 0.5, rotation, 2.0, 0.75, box(2.5, -1.625, 4.5, -0.875),
                     anchor=(1.0, 1.0))


@pytest.mark.parametrize("version", VERSIONS)
def test_text_from_our_pen(version):
    _, pen = _pen(version)
    cases = [
        pen.text("2x 4C 240 mm² Cu/XLPE", (1.0, 2.0, 0.0), MARK),
        pen.text("C-002", (1.0 / 3.0, -7.25, 1.5), MARK, rotation=37.5, color=3),
        pen.text("left", (0.0, 0.0, 0.0), MARK, align=TextEntityAlignment.MIDDLE_LEFT, rotation=90),
        pen.text("Ω \\U+00B0 %%d", (1e6, 2e-7, 0.0), MARK, align=TextEntityAlignment.BOTTOM_LEFT,
                 height=0.125),
        pen.text("top right", (5.0, 5.0, 0.0), MARK, align=TextEntityAlignment.TOP_RIGHT),
    ]
    for entity in cases:
        assert_same_tags(entity, version)


@pytest.mark.parametrize("version", VERSIONS)
def test_mtext_from_our_pen_and_the_schedule(version):
    doc, pen = _pen(version)
    cases = pen.block(["DB-1", "P-101 pump"], _place(), MARK)
    cases += pen.block(["left", "aligned"], _place(-45.0), MARK, color=5, left=True)
    # longer than one 250-character chunk, a caret at a chunk end (ezdxf keeps it with the next)
    cases += pen.block(["x" * 249 + "^I" + "y" * 300, "tail"], _place(12.0), MARK)
    schedule = doc.modelspace().add_mtext("A\\PB", dxfattribs={
        "layer": pen.layers["schedule"], "style": DEFAULT_CONFIG.text_style, "char_height": 0.25,
        "attachment_point": 1, "insert": (1.0, 2.0, 0.0), "line_spacing_style": 2,
        "line_spacing_factor": 1.6 / 1.25, "width": 0.0})
    cases.append(pen.tag(schedule, "schedule", "column Circuit"))
    for entity in cases:
        assert_same_tags(entity, version)


@pytest.mark.parametrize("version", VERSIONS)
def test_line_and_leader_from_our_pen(version):
    _, pen = _pen(version)
    cases = [
        pen.line((0.0, 0.0, 0.0), (10.0, -3.5, 0.0), MARK),
        pen.line((0.1, 0.2, 0.3), (1.0 / 7.0, 2.0, 0.3), MARK, color=1, linetype=pen.leader_linetype),
    ]
    pen.leader(_place(), 0.5, MARK, color=2)
    cases.append(pen.msp[-1])
    for entity in cases:
        assert_same_tags(entity, version)


@pytest.mark.parametrize("version", VERSIONS)
def test_lwpolyline_from_our_pen_and_the_schedule(version):
    doc, pen = _pen(version)
    cases = [
        pen.polygon([(0, 0), (4, 0), (4, 2), (0, 2)], 0.0, MARK),
        pen.polygon([(0.5, 0.25), (1.0 / 3.0, 4.0), (-2.0, 1.0)], 2.5, MARK),
    ]
    rules = doc.modelspace().add_lwpolyline([(0, 0), (3, 0), (3, 1), (0, 1)],
                                             dxfattribs={"layer": "CW", "elevation": 1.25})
    cases.append(pen.tag(rules, "schedule", "grid rows"))
    # widths and bulges: not drawn by us today, written as ezdxf writes them all the same
    cases.append(pen.tag(doc.modelspace().add_lwpolyline(
        [(0, 0, 0.1, 0.2, 0.0), (1, 0, 0.0, 0.0, 0.5), (1, 1, 0.0, 0.3, -1.0)], format="xyseb"),
        "fill", "seg 1"))
    for entity in cases:
        assert_same_tags(entity, version)


def test_entity_without_xdata_layer_or_colour_set():
    """Defaults: layer 0 written (not optional), nothing optional, no XDATA."""
    doc = ezdxf.new("R2010")
    msp = doc.modelspace()
    for entity in (msp.add_text("plain"), msp.add_mtext(""), msp.add_line((0, 0), (1, 1)),
                   msp.add_lwpolyline([(0, 0), (1, 0)])):
        assert_same_tags(entity, doc.dxfversion)


def test_what_the_templates_do_not_cover_is_left_to_ezdxf():
    """``None`` (the splice then exports the entity) for anything beyond the templates."""
    doc = ezdxf.new("R2010")
    msp = doc.modelspace()
    true_color = msp.add_text("x", dxfattribs={"true_color": 0x123456})
    with_dict = msp.add_line((0, 0), (1, 1))
    with_dict.new_extension_dict()
    handle_xdata = msp.add_line((0, 0), (1, 1))
    handle_xdata.set_xdata("CW", [(1000, "a"), (1005, "1A")])
    point_xdata = msp.add_line((0, 0), (1, 1))
    point_xdata.set_xdata("CW", [(1010, (1.0, 2.0, 0.0))])
    thick = msp.add_line((0, 0), (1, 1), dxfattribs={"thickness": 2.0})
    empty = msp.add_lwpolyline([])
    for entity in (true_color, with_dict, handle_xdata, point_xdata, thick, empty,
                   msp.add_circle((0, 0), 1.0), msp.add_point((0, 0))):
        assert entity_text(entity, OWNER, doc.dxfversion) is None, entity.dxftype()
    r12 = ezdxf.new("R12").modelspace().add_line((0, 0), (1, 1))
    assert entity_text(r12, OWNER, "AC1009") is None
    assert {"TEXT", "MTEXT", "LINE", "LWPOLYLINE"} == TEMPLATED_TYPES


def _plant(tmp_path):
    import importlib.util
    import sys
    from pathlib import Path

    path = Path(__file__).resolve().parents[1] / "benchmarks" / "generate_plant.py"
    spec = importlib.util.spec_from_file_location("generate_plant", path)
    module = importlib.util.module_from_spec(spec)
    assert spec.loader is not None
    sys.modules[spec.name] = module
    spec.loader.exec_module(module)
    return module.generate_plant(tmp_path, circuits=60, sources=2, seed=5)


@pytest.mark.parametrize("crlf", [False, True])
def test_spliced_drawing_equals_the_one_exported_by_ezdxf(tmp_path, monkeypatch, crlf):
    """A benchmark plant (invented data) appended with the templates and with ezdxf's export
    of every mark (the writer before the templates): the same bytes, and ezdxf's audit clean."""
    from cablewright.annotate.drawing import AnnotationInput, append_splice, write_annotated_dxf
    from cablewright.annotate.drawing.append_writer import AppendRequest
    from cablewright.extract.model import UNIT_TO_M

    from cablewright.config import load_settings
    from cablewright.pipeline import measure_drawing, size_measurement

    plant = _plant(tmp_path / "plant")
    dxf = plant.dxf_path
    if crlf:
        dxf = tmp_path / "crlf.dxf"
        dxf.write_bytes(plant.dxf_path.read_bytes().replace(b"\n", b"\r\n"))
    settings = load_settings(None)

    def appended(name: str) -> bytes:
        m = measure_drawing(dxf, plant.csv_path, settings, keep_document=False,
                            marks_appid=settings.annotate.appid)
        job = size_measurement(m, settings)
        marks = AnnotationInput(job.outcomes, m.segments, job.per_segment, m.equipment,
                                1.0 / UNIT_TO_M.get(m.units, 1.0))
        summary = write_annotated_dxf(dxf, tmp_path / name, marks, settings.annotate,
                                      stream=AppendRequest(m.source_document))
        assert summary.appended
        return (tmp_path / name).read_bytes()

    written = []

    def counted(*args):
        text = entity_text(*args)
        written.append(text is not None)
        return text

    monkeypatch.setattr(append_splice, "entity_text", counted)
    templated = appended("templated.dxf")
    assert written and all(written), "every mark of the plant is written from a template"
    monkeypatch.setattr(append_splice, "entity_text", lambda *args: None)
    exported = appended("exported.dxf")
    assert templated == exported
    doc = ezdxf.readfile(tmp_path / "templated.dxf")
    auditor = doc.audit()
    assert not auditor.errors and not auditor.fixes
    assert sum(1 for e in doc.modelspace() if e.has_xdata(settings.annotate.appid)) > 100
