"""The annotated DXF, read back with ezdxf and checked with shapely.

Sources of the checks: ezdxf's own auditor (``Drawing.audit``) and text
geometry (``ezdxf.disassemble`` for TEXT, ``ezdxf.tools.text.estimate_mtext_extents``
for MTEXT); shapely for distances and overlaps; hashlib for the input's bytes.
"""

from __future__ import annotations

import hashlib
import math
from collections import Counter
from pathlib import Path

import ezdxf
import pytest
from cablewright.annotate.drawing import AnnotateConfig, AnnotationInput, write_annotated_dxf
from cablewright.annotate.drawing.text_height import text_height_m_for_extents
from cablewright.annotate.model import CircuitOutcome
from cablewright.core.errors import DrawingReadError
from cablewright.extract.model import CircuitRoute, RouteSegment
from cablewright.sizing.model import CableSelection, SizingResult
from ezdxf import disassemble
from ezdxf.tools.text import estimate_mtext_extents
from shapely import STRtree
from shapely.geometry import LineString, Polygon
from test_annotate_fixtures import (
    PER_SEGMENT,
    GroupStandIn,
    equipment,
    make_drawing,
    outcomes,
    segments,
)

APPID = "CABLEWRIGHT"
OUR_LAYERS = {"CW-CABLE-LABEL", "CW-GROUP-TAG", "CW-DEVICE-NOTE", "CW-SCHEDULE", "CW-NOTES"}


def _annotate(tmp_path: Path, **kw):
    src = make_drawing(tmp_path / "in.dxf")
    out_dir = tmp_path / "out"
    out_dir.mkdir()
    summary = write_annotated_dxf(
        src,
        out_dir / "annotated.dxf",
        AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1000.0),
        **kw,
    )
    return src, out_dir / "annotated.dxf", summary


def _ours(doc):
    return [e for e in doc.modelspace() if e.has_xdata(APPID)]


def _labels(doc, layer="CW-CABLE-LABEL"):
    return [e for e in doc.modelspace().query("TEXT MTEXT") if e.dxf.layer == layer]


def _outline(entity) -> Polygon:
    """Text box as ezdxf measures it (independent of our own box estimate)."""
    if entity.dxftype() == "TEXT":
        return Polygon([(v.x, v.y) for v in disassemble.make_primitive(entity).vertices()])
    width, height = estimate_mtext_extents(entity)
    ins = entity.dxf.insert
    a = math.radians(entity.dxf.get("rotation", 0.0))
    ux, uy, vx, vy = math.cos(a), math.sin(a), -math.sin(a), math.cos(a)
    ap = entity.dxf.attachment_point
    # offsets of the box's left/right and bottom/top from the insert point
    x0, x1 = {1: (0, width), 4: (0, width), 7: (0, width)}.get(ap, (-width / 2, width / 2))
    y0, y1 = {1: (-height, 0), 2: (-height, 0), 3: (-height, 0)}.get(ap, (-height / 2, height / 2))
    corners = [(x0, y0), (x1, y0), (x1, y1), (x0, y1)]
    return Polygon([(ins.x + ux * x + vx * y, ins.y + uy * x + vy * y) for x, y in corners])


def _overlapping_pairs(polys, tol):
    tree = STRtree(polys)
    bad = []
    for i, j in zip(*tree.query(polys, predicate="intersects"), strict=True):
        if i < j and polys[i].intersection(polys[j]).area > tol:
            bad.append((i, j))
    return bad


def test_output_audits_clean_and_keeps_every_original_entity(tmp_path):
    src, out, _ = _annotate(tmp_path)
    before = Counter((e.dxftype(), e.dxf.layer) for e in ezdxf.readfile(src).modelspace())
    doc = ezdxf.readfile(out)
    auditor = doc.audit()
    assert not auditor.has_errors, [str(e) for e in auditor.errors]
    after = Counter((e.dxftype(), e.dxf.layer) for e in doc.modelspace() if not e.has_xdata(APPID))
    assert after == before
    # every entity we added is on one of our layers, none of which the input had
    assert {e.dxf.layer for e in _ours(doc)} <= OUR_LAYERS
    assert not OUR_LAYERS & {layer.dxf.name for layer in ezdxf.readfile(src).layers}


def test_every_sized_circuit_has_a_label_with_id_and_size(tmp_path):
    _, out, summary = _annotate(tmp_path)
    texts = [e.dxf.text for e in _labels(ezdxf.readfile(out))]
    assert summary.labels == 2
    assert any("P-101" in t and "150 mm²" in t and t.startswith("P-101") for t in texts)
    assert any("P-102" in t and "50 mm²" in t for t in texts)
    # the circuit in error gets no cable label, but a note on the notes layer
    assert not any("P-103" in t for t in texts)
    notes = [
        e.dxf.text
        for e in ezdxf.readfile(out).modelspace().query("TEXT MTEXT")
        if e.dxf.layer == "CW-NOTES"
    ]
    assert any("P-103" in n for n in notes)


def test_labels_lie_near_their_route_and_read_upright(tmp_path):
    _, out, summary = _annotate(tmp_path)
    h = summary.text_height
    assert h == pytest.approx(250.0)  # 55 m x 36 m on A1 -> 1:100, 2.5 mm text: 250 mm
    routes = {o.circuit_id: o.route.points_m for o in outcomes() if o.route is not None}
    for label in _labels(ezdxf.readfile(out)):
        cid = label.dxf.text.split(":")[0]
        line = LineString([(x * 1000.0, y * 1000.0) for x, y, _ in routes[cid]])
        # shapely distance from the text box to the route: within two text heights
        assert _outline(label).distance(line) <= 2.0 * h
        rot = label.dxf.rotation % 360.0
        assert math.cos(math.radians(rot)) > -1e-9  # never upside down
        assert not math.isclose(rot, 270.0)


def test_no_two_marks_overlap(tmp_path):
    _, out, summary = _annotate(tmp_path)
    doc = ezdxf.readfile(out)
    marks = [
        e
        for e in doc.modelspace().query("TEXT MTEXT")
        if e.dxf.layer in {"CW-CABLE-LABEL", "CW-GROUP-TAG", "CW-DEVICE-NOTE"}
    ]
    # labels, one shared segment (S1), two loads, and each segment's id (issue 12)
    assert summary.segment_ids == len(segments())
    assert len(marks) == 2 + 1 + 2 + len(segments())
    polys = [_outline(e) for e in marks]
    assert _overlapping_pairs(polys, 1e-6) == []


def test_second_run_replaces_earlier_marks(tmp_path):
    _, out, first = _annotate(tmp_path)
    again = tmp_path / "out" / "again.dxf"
    second = write_annotated_dxf(
        out, again, AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1000.0)
    )
    d1, d2 = ezdxf.readfile(out), ezdxf.readfile(again)
    assert len(_labels(d2)) == len(_labels(d1)) == 2
    assert len(_ours(d2)) == len(_ours(d1))
    assert second.removed == len(_ours(d1))
    assert len(d2.modelspace()) == len(d1.modelspace())
    assert second.layers == first.layers
    assert not d2.audit().has_errors


def test_input_bytes_unchanged_and_input_never_overwritten(tmp_path):
    src = make_drawing(tmp_path / "in.dxf")
    digest = hashlib.sha256(src.read_bytes()).hexdigest()
    write_annotated_dxf(
        src, tmp_path / "o.dxf", AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1000.0)
    )
    assert hashlib.sha256(src.read_bytes()).hexdigest() == digest
    with pytest.raises(DrawingReadError, match="overwrite the input"):
        write_annotated_dxf(src, src, AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1000.0))
    assert hashlib.sha256(src.read_bytes()).hexdigest() == digest


def test_failure_while_saving_leaves_no_file(tmp_path, monkeypatch):
    src = make_drawing(tmp_path / "in.dxf")
    out_dir = tmp_path / "out"
    out_dir.mkdir()

    def broken_saveas(self, filename, *args, **kwargs):
        Path(filename).write_text("0\nSECTION\n2\nHEADER\n")  # half a file ...
        raise OSError("disk full")  # ... then the failure

    monkeypatch.setattr(ezdxf.document.Drawing, "saveas", broken_saveas)
    with pytest.raises(OSError, match="disk full"):
        write_annotated_dxf(
            src, out_dir / "annotated.dxf", AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1000.0)
        )
    assert list(out_dir.iterdir()) == []


def test_progress_called_once_per_label(tmp_path):
    calls = []
    _annotate(tmp_path, progress=calls.append)
    assert calls == [1, 1]


def test_user_layer_with_our_name_is_left_alone(tmp_path):
    src = tmp_path / "in.dxf"
    make_drawing(src)
    doc = ezdxf.readfile(src)
    doc.layers.add("CW-CABLE-LABEL")
    doc.modelspace().add_text("user note", dxfattribs={"layer": "CW-CABLE-LABEL"})
    doc.saveas(src)
    out = tmp_path / "o.dxf"
    summary = write_annotated_dxf(
        src, out, AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1000.0)
    )
    assert summary.layers["label"] == "CW-CABLE-LABEL-2"
    again = tmp_path / "o2.dxf"
    write_annotated_dxf(out, again, AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1000.0))
    texts = [
        e.dxf.text
        for e in ezdxf.readfile(again).modelspace().query("TEXT")
        if e.dxf.layer == "CW-CABLE-LABEL"
    ]
    assert texts == ["user note"]
    assert len(_labels(ezdxf.readfile(again), "CW-CABLE-LABEL-2")) == 2


def test_r12_drawing_in_metres(tmp_path):
    """A DXF R12 file (no MTEXT) in metres: marks become TEXT, the file audits clean."""
    doc = ezdxf.new("R12")
    doc.header["$INSUNITS"] = 6
    doc.layers.add("ROUTE-TRAY")
    msp = doc.modelspace()
    msp.add_line((0, 0), (20, 0), dxfattribs={"layer": "ROUTE-TRAY"})
    msp.add_line((20, 0), (40, 0), dxfattribs={"layer": "ROUTE-TRAY"})
    msp.add_line((40, 0), (40, 20), dxfattribs={"layer": "ROUTE-TRAY"})
    src = tmp_path / "r12.dxf"
    doc.saveas(src)
    out = tmp_path / "r12-out.dxf"
    summary = write_annotated_dxf(src, out, AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1.0))
    back = ezdxf.readfile(out)
    assert back.dxfversion == "AC1009"
    assert not back.audit().has_errors
    assert summary.labels == 2 and summary.group_tags == 1
    assert not back.modelspace().query("MTEXT")
    assert summary.text_height == pytest.approx(0.25)  # metres: 1:100, 2.5 mm


def _crowded_case(n_trays: int = 6, per_tray: int = 40):
    """Parallel trays 3 m apart, each carrying ``per_tray`` circuits on one segment."""
    segs, per_seg, outs = {}, {}, []
    for t in range(n_trays):
        sid = f"S{t + 1}"
        y = 3.0 * t
        pts = ((0.0, y, 0.0), (30.0, y, 0.0), (30.0, y + 2.0, 0.0))
        segs[sid] = RouteSegment(sid, (sid,), "ROUTE-TRAY", "tray", "E", 32.0, pts)
        ids = tuple(f"C{t:02d}-{i:02d}" for i in range(per_tray))
        per_seg[sid] = ids
        for cid in ids:
            route = CircuitRoute(cid, "MCC", "L", 32.0, 35.0, 0.0, 0.0, (sid,), pts)
            cable = CableSelection("Cu", "XLPE", 4, 16, 1, 80.0, "capacity")
            sizing = SizingResult(cid, "ok", device_rating_a=63, cable=cable, method="E")
            outs.append(
                CircuitOutcome(
                    cid,
                    "MCC",
                    "L",
                    "ok",
                    (),
                    route,
                    GroupStandIn(per_tray, per_tray, ((sid, per_tray, per_tray),)),
                    sizing,
                )
            )
    return segs, per_seg, outs


def test_crowded_trays_labels_never_overlap(tmp_path):
    doc = ezdxf.new("R2010")
    doc.units = 6
    doc.modelspace().add_line((0, 0), (30, 0))
    src = tmp_path / "c.dxf"
    doc.saveas(src)
    segs, per_seg, outs = _crowded_case()
    out = tmp_path / "c-out.dxf"
    summary = write_annotated_dxf(src, out, AnnotationInput(outs, segs, per_seg, {}, 1.0))
    assert summary.labels == len(outs) == 240
    assert summary.overlapping == 0
    back = ezdxf.readfile(out)
    marks = [
        e
        for e in back.modelspace().query("TEXT MTEXT")
        if e.dxf.layer in {"CW-CABLE-LABEL", "CW-GROUP-TAG"}
    ]
    assert summary.segment_ids == len(segs)  # each tray's id once (issue 12)
    assert len(marks) == 240 + 6 + len(segs)
    polys = [_outline(e) for e in marks]
    assert _overlapping_pairs(polys, 1e-9 * summary.text_height**2) == []


def test_text_height_follows_usual_scales():
    # 8 m x 5 m room: 8 / 0.8 = 10 -> 1:10, 2.5 mm letters are 25 mm in the model
    assert text_height_m_for_extents(8.0, 5.0) == pytest.approx(0.025)
    # 300 m x 100 m site: 300 / 0.8 = 375 -> 1:500 -> 1.25 m
    assert text_height_m_for_extents(300.0, 100.0) == pytest.approx(1.25)
    # a fixed height wins
    assert AnnotateConfig(text_height_m=0.3).text_height_m == 0.3


def test_routes_drawn_backwards_still_give_upright_labels(tmp_path):
    """Segments stored end to start (right to left, top to bottom): text still reads upright."""
    src = make_drawing(tmp_path / "in.dxf")
    segs = {
        sid: RouteSegment(
            s.segment_id,
            s.source_ids,
            s.layer,
            s.containment,
            s.method,
            s.length_m,
            tuple(reversed(s.points_m)),
        )
        for sid, s in segments().items()
    }
    out = tmp_path / "o.dxf"
    write_annotated_dxf(src, out, AnnotationInput(outcomes(), segs, PER_SEGMENT, equipment(), 1000.0))
    for label in _labels(ezdxf.readfile(out)):
        rot = label.dxf.rotation
        # every stretch here is horizontal or vertical: upright text is 0 or 90 degrees
        assert min(abs(rot - 0.0), abs(rot - 90.0)) == pytest.approx(0.0, abs=1e-9)


def test_device_note_says_when_ze_was_assumed(tmp_path):
    # issue 15 item 3: a result whose Ze is the config's assumption says so on the drawing
    from dataclasses import replace

    outs = outcomes()
    outs[1] = replace(outs[1], sizing=replace(outs[1].sizing, ze_assumed=True))
    src = make_drawing(tmp_path / "in.dxf")
    out = tmp_path / "annotated.dxf"
    write_annotated_dxf(src, out, AnnotationInput(outs, segments(), PER_SEGMENT, equipment(), 1000.0))
    texts = [e.dxf.text if e.dxftype() == "TEXT" else e.text
             for e in ezdxf.readfile(out).modelspace().query("TEXT MTEXT")
             if e.dxf.layer == "CW-DEVICE-NOTE"]
    # the device note carries the device kind and rating (issue 12), and "Ze assumed"
    assert any("P-102: " in t and "125 A, Ze assumed" in t for t in texts), texts
    assert not any("P-101" in t and "Ze assumed" in t for t in texts)


@pytest.mark.parametrize("units_per_m", [0.0, -1000.0, float("nan")])
def test_input_needs_positive_drawing_units(units_per_m):
    """Drawing units per metre must be > 0 (a NaN fails the comparison too)."""
    with pytest.raises(ValueError, match="units_per_m"):
        AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), units_per_m)
