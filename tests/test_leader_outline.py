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


# -- where a drawn leader ends (leaders.leader_end) ------------------------------------------

def _place(box, anchor):
    from cablewright.annotate.drawing.placement import Placement
    from shapely.geometry import box as rect
    x0, y0, x1, y1 = box
    return Placement((x0 + x1) / 2, (y0 + y1) / 2, 0.0, 0.0, x1 - x0, y1 - y0,
                     rect(x0, y0, x1, y1), False, anchor)


def test_leader_to_a_text_inside_its_box_ends_on_the_text_as_before() -> None:
    """A one-line text inset in its box by the margins: the leader goes to the text's
    nearest point, the line the search tested (perpendicular here, so the same line)."""
    from cablewright.annotate.drawing.leaders import leader_end
    from shapely.geometry import box as rect
    place = _place((0.0, 0.0, 10.0, 1.7), (5.0, -3.0))
    end = leader_end(place, rect(0.2, 0.25, 9.8, 1.45), 0.35, 2.0)
    assert end == pytest.approx((5.0, 0.25))


def test_leader_to_a_cut_hull_keeps_to_the_tested_line() -> None:
    """A group tag (narrow block) over its fill lines (wide block): the hull's top corner is
    cut, 4.5 text heights in from the box's.  The nearest point of the hull would take the
    leader across whatever the search found clear beside the tested line, so the leader
    follows the tested line (anchor to the box's corner) into the box instead."""
    from cablewright.annotate.drawing.leaders import leader_end
    from shapely.geometry import LineString, MultiPoint, Point
    h = 1.0
    place = _place((0.0, 0.0, 70.0, 37.0), (70.0, 54.0))  # anchor above the right corner
    hull = MultiPoint([(4.0, 36.0), (65.5, 36.0), (69.0, 12.0), (69.0, 1.0), (0.5, 1.0),
                       (0.5, 12.0)]).convex_hull
    naive = Point(70.0, 54.0), hull.exterior.interpolate(hull.exterior.project(Point(70.0, 54.0)))
    end = leader_end(place, hull, 0.35 * h, 2.0 * h)
    tested = LineString([(70.0, 54.0), (70.0, 37.0)])
    drawn = LineString([(70.0, 54.0), end])
    assert naive[1].distance(tested) > 4.0  # the cut: the hull's nearest point is far off
    assert drawn.difference(place.polygon).hausdorff_distance(tested) < 1e-9
    assert hull.exterior.distance(Point(end)) < 1e-9 or end == pytest.approx((70.0, 37.0))


def test_leader_ends_at_the_box_when_the_tested_line_meets_no_text() -> None:
    """The tested line carried on into the box misses the text within 2 h: the leader ends
    where the search tested it, on the box (never across a mark beside it)."""
    from cablewright.annotate.drawing.leaders import leader_end
    from shapely.geometry import box as rect
    place = _place((0.0, 0.0, 70.0, 37.0), (75.0, 54.0))
    end = leader_end(place, rect(0.5, 1.0, 60.0, 36.0), 0.35, 2.0)
    assert end == pytest.approx((70.0, 37.0))
