"""The drawing is parsed once: the extract stage keeps the ezdxf document and the
annotate stage adds its marks to it (the preview needs no document: tests/test_preview.py).

Checks: the file written from the kept document equals, entity for entity, the one
written by parsing the input again (ezdxf reads both back); the input's bytes
(hashlib) are unchanged.
"""

from __future__ import annotations

import hashlib
from collections import Counter

import ezdxf
from cablewright.annotate.drawing import AnnotationInput, write_annotated_dxf
from cablewright.extract.dxf_reader import read_dxf
from cablewright.extract.model import DrawingConfig
from test_annotate_fixtures import PER_SEGMENT, equipment, make_drawing, outcomes, segments


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
