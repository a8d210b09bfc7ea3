"""A crowded drawing gets smaller lettering so that its labels fit.

Checks with tools outside the writer: ezdxf's bounding boxes (``ezdxf.bbox``) for the
drawing's extents, ezdxf's text geometry (``ezdxf.disassemble``) for each label's box,
shapely for areas.  (400 circuits on two segments: more than the spots the
placement tries along them, so some labels overlap at any height; see
``test_annotate_layout`` for placement without overlaps.)
"""

from __future__ import annotations

import dataclasses

import ezdxf
from cablewright.annotate.drawing import AnnotateConfig, AnnotationInput, write_annotated_dxf
from ezdxf import bbox, disassemble
from shapely.geometry import Polygon
from test_annotate_fixtures import equipment, make_drawing, outcomes, segments

N = 400


def _crowd():
    first = outcomes()[0]
    outs = []
    for i in range(N):
        cid = f"P-{i:03d}"
        route = dataclasses.replace(first.route, circuit_id=cid)
        sizing = dataclasses.replace(first.sizing, circuit_id=cid)
        outs.append(dataclasses.replace(first, circuit_id=cid, route=route, sizing=sizing))
    per_segment = {"S1": tuple(o.circuit_id for o in outs), "S2": tuple(o.circuit_id for o in outs)}
    return outs, per_segment


def _label_boxes(path):
    doc = ezdxf.readfile(path)
    return [
        Polygon([(v.x, v.y) for v in disassemble.make_primitive(e).vertices()])
        for e in doc.modelspace().query("TEXT")
        if e.dxf.layer == "CW-CABLE-LABEL"
    ]


def test_crowded_labels_get_smaller_lettering_and_fit(tmp_path):
    src = make_drawing(tmp_path / "in.dxf")
    outs, per_segment = _crowd()
    marks = AnnotationInput(outs, segments(), per_segment, equipment(), 1000.0)
    sheet = write_annotated_dxf(src, tmp_path / "sheet.dxf", marks,
                                config=AnnotateConfig(crowd_fraction=None))
    fitted = write_annotated_dxf(src, tmp_path / "fitted.dxf", marks)
    assert fitted.text_height < sheet.text_height
    assert fitted.overlapping <= sheet.overlapping
    # the labels cover at most the configured share (25 %) of the drawing's extents
    ext = bbox.extents(ezdxf.readfile(src).modelspace())
    area = (ext.extmax.x - ext.extmin.x) * (ext.extmax.y - ext.extmin.y)
    boxes = _label_boxes(tmp_path / "fitted.dxf")
    assert len(boxes) == N
    assert sum(b.area for b in boxes) <= 0.25 * area
    # with the sheet-fitted lettering they would not have
    assert sum(b.area for b in _label_boxes(tmp_path / "sheet.dxf")) > 0.25 * area
