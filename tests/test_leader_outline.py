"""The plain-note measure of ``leaders.text_outline`` against ezdxf's full MTEXT layout."""

from __future__ import annotations

import random

import ezdxf
import pytest
from cablewright.annotate.drawing.leaders import _mtext_size, text_outline
from cablewright.annotate.drawing.note_spots import note_variants
from cablewright.annotate.drawing.text import mtext_escape
from ezdxf.tools import text_size

WORDS = ("P-101:", "breaker", "fuse", "160", "A", "C-00017:", "NOT", "SIZED,", "see", "report",
         "S6:", "TRAY", "FILL", "106", "%", "(FAIL)", "Ze", "assumed", "MCB", "WWW", "iii")


def _notes(seed: int, n: int) -> list[list[str]]:
    rng = random.Random(seed)
    out = []
    for _ in range(n):
        lines = [" ".join(rng.choice(WORDS) for _ in range(rng.randint(1, 7)))
                 for _ in range(rng.randint(1, 4))]
        out += note_variants(lines)
    return out


@pytest.mark.parametrize("height", [0.25, 2.5, 350.0])
def test_plain_notes_measure_as_ezdxf_layout(height: float) -> None:
    doc = ezdxf.new("R2010")
    doc.styles.new("CW", dxfattribs={"font": "DejaVuSans.ttf"})
    msp = doc.modelspace()
    heights: dict[tuple, float] = {}
    fast = 0
    for lines in _notes(7, 150):
        content = "\\P".join(mtext_escape(line) for line in lines)
        e = msp.add_mtext(content, dxfattribs={"style": "CW", "char_height": height,
                                               "attachment_point": 5, "width": 0.0,
                                               "insert": (3.0, 4.0), "rotation": 30.0})
        known = len(heights)
        w, h = _mtext_size(e, heights)
        fast += len(heights) == known
        size = text_size.mtext_size(e)
        assert (w, h) == (size.total_width, size.total_height)
        assert w > 0.0 and h >= height
    assert fast > 100  # most were measured without the layout
    assert len(heights) == 4 + 4  # line counts 1-4, and up to 8 lines when wrapped


def test_outline_same_with_and_without_heights() -> None:
    doc = ezdxf.new("R2010")
    msp = doc.modelspace()
    heights: dict[tuple, float] = {}
    for lines in _notes(11, 40):
        e = msp.add_mtext("\\P".join(mtext_escape(x) for x in lines),
                          dxfattribs={"char_height": 1.5, "attachment_point": 5})
        a, b = text_outline([e], heights), text_outline([e])
        assert a is not None and b is not None
        assert list(a.exterior.coords) == list(b.exterior.coords)


def test_codes_measured_by_ezdxf() -> None:
    doc = ezdxf.new("R2010")
    msp = doc.modelspace()
    heights: dict[tuple, float] = {}
    for content in ("a {\\H2x;big} b", "x\\P\\Py", "tab\tstop", "two  spaces", "C\\\\P"):
        e = msp.add_mtext(content, dxfattribs={"char_height": 1.0})
        assert _mtext_size(e, heights) == (text_size.mtext_size(e).total_width,
                                           text_size.mtext_size(e).total_height)
    assert heights == {}
