"""The drawing is parsed once: the extract stage keeps the ezdxf document, the
annotate stage adds its marks to it and the preview is drawn from it.

Checks: the file written from the kept document equals, entity for entity, the one
written by parsing the input again (ezdxf reads both back); the input's bytes
(hashlib) are unchanged; the preview is a PNG (signature from the PNG
specification, ISO/IEC 15948:2004 section 5.2) and leaves the document as it was.
"""

from __future__ import annotations

import hashlib
from collections import Counter

import ezdxf
from cablewright.annotate.drawing import AnnotationInput, write_annotated_dxf
from cablewright.annotate.preview import render_preview_png
from cablewright.extract.dxf_reader import read_dxf
from cablewright.extract.model import DrawingConfig
from test_annotate_fixtures import PER_SEGMENT, equipment, make_drawing, outcomes, segments

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"


def _kinds(path):
    return Counter((e.dxftype(), e.dxf.layer) for e in ezdxf.readfile(path).modelspace())


def test_read_dxf_keeps_the_parsed_document(tmp_path):
    src = make_drawing(tmp_path / "in.dxf")
    content = read_dxf(src, DrawingConfig(units="mm"))
    doc = content.document
    assert doc is not None
    fresh = ezdxf.readfile(src)
    assert sorted(e.dxf.handle for e in doc.modelspace()) == sorted(
        e.dxf.handle for e in fresh.modelspace()
    )


def test_annotating_the_kept_document_equals_parsing_again(tmp_path):
    src = make_drawing(tmp_path / "in.dxf")
    digest = hashlib.sha256(src.read_bytes()).hexdigest()
    marks = AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1000.0)
    again = write_annotated_dxf(src, tmp_path / "again.dxf", marks)
    doc = ezdxf.readfile(src)
    kept = write_annotated_dxf(src, tmp_path / "kept.dxf", marks, document=doc)
    assert _kinds(tmp_path / "kept.dxf") == _kinds(tmp_path / "again.dxf")
    assert (kept.labels, kept.group_tags, kept.device_notes) == (
        again.labels, again.group_tags, again.device_notes,
    )
    assert hashlib.sha256(src.read_bytes()).hexdigest() == digest
    # the document now holds the annotated drawing; its file name is not the input
    assert len(doc.modelspace()) == len(ezdxf.readfile(tmp_path / "kept.dxf").modelspace())
    assert str(doc.filename) != str(src)


def test_preview_from_the_document_in_memory(tmp_path):
    src = make_drawing(tmp_path / "in.dxf")
    doc = ezdxf.readfile(src)
    before = Counter((e.dxftype(), e.dxf.layer) for e in doc.modelspace())
    flags = [a.dxf.get("flags", 0) for ins in doc.modelspace().query("INSERT") for a in ins.attribs]
    assert flags and not any(f & 1 for f in flags)  # visible tags (DXF ATTRIB group 70, bit 1)
    png = render_preview_png(doc, dpi=40)
    assert png[:8] == PNG_SIGNATURE
    lean = render_preview_png(doc, dpi=40, detail_limit=1, max_texts=0)  # the large-drawing path
    assert lean[:8] == PNG_SIGNATURE
    assert Counter((e.dxftype(), e.dxf.layer) for e in doc.modelspace()) == before
    # the drawing's attributes are hidden in the picture only, not in the document
    assert [a.dxf.get("flags", 0) for ins in doc.modelspace().query("INSERT") for a in ins.attribs] == flags


def test_large_drawing_preview_keeps_renamed_mark_layers(tmp_path):
    """On a large drawing a layer outside the kept set is left out, one in ``keep_layers``
    drawn: the two pictures differ (compared pixel by pixel with Pillow)."""
    import io

    from PIL import Image, ImageChops

    doc = ezdxf.readfile(make_drawing(tmp_path / "in.dxf"))
    doc.modelspace().add_line((0, 0), (40_000, 20_000), dxfattribs={"layer": "E-LABELS", "color": 1})
    kw = {"dpi": 40, "detail_limit": 1, "max_texts": 0}
    without = Image.open(io.BytesIO(render_preview_png(doc, **kw))).convert("RGB")
    kept = Image.open(io.BytesIO(render_preview_png(doc, keep_layers=("E-LABELS",), **kw)))
    assert without.size == kept.size
    assert ImageChops.difference(without, kept.convert("RGB")).getbbox() is not None
