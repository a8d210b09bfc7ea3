"""Repair rounds and the spot rules they rest on (issue 12).

* the rounds keep the round with the fewest last resorts and delete the other round's
  entities from the document (nothing of a dropped round is left on the drawing);
* a label longer than its stretch keeps most of the stretch beside it, and a leader
  always leaves the route from a point of the stretch itself;
* the box of a drawing's text spans descender to cap height whatever its vertical
  alignment, as ezdxf's own text layout (``ezdxf.bbox``, the outside reference) lays it.
"""

from __future__ import annotations

import ezdxf
import numpy as np
import pytest
from cablewright.annotate.drawing.mark_index import LabelIndex
from cablewright.annotate.drawing.mark_rounds import MarkRound, place_in_rounds
from cablewright.annotate.drawing.obstacles import _text_box
from cablewright.annotate.drawing.spot_arrays import OVERHANG, stretch_spots
from cablewright.annotate.drawing.stretches import Stretch
from ezdxf import bbox
from ezdxf.fonts import fonts
from shapely.geometry import LineString, Point


class _Pen:
    """The part of the recording pen the rounds use: the document and what a round added."""

    def __init__(self) -> None:
        self.doc = ezdxf.new()
        self.msp = self.doc.modelspace()
        self.added: list = []


def _place_all(pen: _Pen, blocked_by: dict[str, str], calls: list):
    """Marks "a", "b": ``b`` fails (a last resort) when ``blocked_by[b]`` was placed before it."""

    def place_all(index: LabelIndex, select: MarkRound, first_round: bool):
        calls.append((sorted(select.first), select.early))
        placed = 0
        for ref in ("a", "b"):
            if not select.wants("note", ref):
                continue
            before = select.begin(index)
            texts = {e.dxf.text for e in pen.added}
            if blocked_by.get(ref) in texts:
                index.stats.overlapping += 1
            else:
                index.stats.beside += 1
            pen.added.append(pen.msp.add_text(ref))
            select.done(index, "note", ref, before)
            placed += 1
        return (placed,)

    return place_all


def test_a_mark_that_failed_goes_first_and_the_better_round_is_kept():
    pen, calls = _Pen(), []
    result, index = place_in_rounds(pen, lambda: LabelIndex(cell=1.0),
                                    _place_all(pen, {"b": "a"}, calls))
    # round 0 places a, then b fails; round 1 places b first, then a: no last resort left
    assert calls[0] == ([], False)
    assert calls[1:3] == [([("note", "b")], True), ([("note", "b")], False)]
    assert index.stats.fallbacks == 0 and result == (2,)
    # the first round's two texts were deleted: two texts on the drawing, b before a
    assert [e.dxf.text for e in pen.msp] == ["b", "a"]
    assert [e.dxf.text for e in pen.added] == ["b", "a"]


def test_a_round_that_is_no_better_is_dropped():
    pen, calls = _Pen(), []
    # b fails after a, and a fails after b: every order leaves one last resort
    result, index = place_in_rounds(pen, lambda: LabelIndex(cell=1.0),
                                    _place_all(pen, {"b": "a", "a": "b"}, calls))
    assert index.stats.fallbacks == 1 and result == (2,)
    # the first round is kept (a tie keeps the earlier round); the others left nothing
    assert [e.dxf.text for e in pen.msp] == ["a", "b"]


def test_no_rounds_when_nothing_failed():
    pen, calls = _Pen(), []
    place_in_rounds(pen, lambda: LabelIndex(cell=1.0), _place_all(pen, {}, calls))
    assert calls == [([], False)]


def test_a_long_label_keeps_most_of_a_short_stretch_beside_it():
    s = Stretch((0.0, 0.0), (3.0, 0.0), crowd=1)
    width, height = 7.5, 1.0
    rows = stretch_spots(s, width, height, [0.25, 2.0])
    line = LineString([s.start, s.end])
    for cx, _, _, _, hw, *_ in rows:
        covered = min(3.0, cx + hw) - max(0.0, cx - hw)
        assert covered >= (1.0 - OVERHANG) * 3.0 - 1e-9
    # every anchor (where a leader leaves the route) is a point of the stretch
    anchors = rows[:, 6:8]
    assert max(line.distance(Point(a)) for a in anchors) < 1e-9
    assert np.all((anchors[:, 0] >= 0.0) & (anchors[:, 0] <= 3.0))


@pytest.mark.parametrize("valign", [0, 1, 2, 3])
def test_a_drawing_text_box_spans_descender_to_cap_height_in_every_alignment(valign):
    doc = ezdxf.new()
    text = doc.modelspace().add_text("DOSING gp", height=600.0)
    text.dxf.halign, text.dxf.valign = 1, valign
    text.dxf.insert = text.dxf.align_point = (0.0, 0.0)
    ours = _text_box(text, fonts.make_font("arial.ttf", 1.0).text_width)
    theirs = bbox.extents([text])
    # ezdxf lays the same text out; our box keeps 0.2 h of descender (0.29 h in ezdxf's
    # stand-in font), so both edges agree to a tenth of the height
    assert ours.ymin == pytest.approx(theirs.extmin.y, abs=0.1 * 600.0)
    assert ours.ymax == pytest.approx(theirs.extmax.y, abs=0.1 * 600.0)


def test_fill_lines_go_under_their_tag_until_a_round_writes_the_tag_apart():
    """A shared run's over-full segment is written under the run's group tag; once that tag
    needed a last resort (listed for the next round) its fill gets a note of its own."""
    from types import SimpleNamespace as NS

    from cablewright.annotate.drawing.group_tags import fills_under_tags

    segments = {"S1": NS(points_m=((0.0, 0.0, 0.0), (5.0, 0.0, 0.0))),
                "S2": NS(points_m=((5.0, 0.0, 0.0), (9.0, 0.0, 0.0))),
                "S3": NS(points_m=((9.0, 5.0, 0.0), (9.0, 9.0, 0.0)))}
    marks = NS(segments=segments, per_segment={"S1": ("A", "B"), "S2": ("A", "B"), "S3": ("A",)},
               units_per_m=1000.0,
               fill_marks=(NS(segment_id="S2", text="TRAY FILL 106 %", result="fail"),
                           NS(segment_id="S3", text="TRAY FILL 90 %", result="warning")))
    assert fills_under_tags(marks, True, MarkRound()) == {"S2"}  # S3 carries one circuit: no tag
    assert fills_under_tags(marks, False, MarkRound()) == frozenset()
    listed = MarkRound(first=frozenset({("group-tag", "S1,S2")}), early=False)
    assert fills_under_tags(marks, True, listed) == frozenset()
