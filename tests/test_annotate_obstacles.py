"""Marks keep off the drawing's own text and symbols; group tags; DXF text escaping.

Sources of the checks: ezdxf's own text geometry (``ezdxf.disassemble`` for
TEXT and ATTRIB outlines) and bounding boxes (``ezdxf.bbox.extents`` of a block
reference), ezdxf's text decoding (``Text.plain_text``, DXF "special
characters" ``%%c`` / ``%%%``), shapely for intersections and networkx
(``connected_components``) for the runs of group tags.
"""

from __future__ import annotations

import ezdxf
import networkx as nx
from cablewright.annotate.drawing import AnnotationInput, write_annotated_dxf
from cablewright.annotate.drawing.group_tags import group_runs
from cablewright.annotate.model import CircuitOutcome
from cablewright.extract.model import CircuitRoute, RouteSegment
from cablewright.sizing.model import CableSelection, SizingResult
from ezdxf import bbox, disassemble
from ezdxf.enums import TextEntityAlignment
from shapely.geometry import Polygon, box
from test_annotate_dxf import _outline
from test_annotate_fixtures import PER_SEGMENT, equipment, make_drawing, outcomes, segments

MARK_LAYERS = {"CW-CABLE-LABEL", "CW-GROUP-TAG", "CW-DEVICE-NOTE", "CW-NOTES"}


def _drawing_with_text_on_the_tray(path):
    """The fixture drawing plus a room name and a title right on the tray, and a switchboard
    symbol sitting on the tray's second leg (where labels would otherwise go)."""
    make_drawing(path)
    doc = ezdxf.readfile(path)
    msp = doc.modelspace()
    for text, x, y, h in (("PUMP HALL", 10000, 300, 500), ("STATION TITLE", 30000, -300, 700)):
        t = msp.add_text(text, height=h, dxfattribs={"layer": "WALLS"})
        t.set_placement((x, y), align=TextEntityAlignment.MIDDLE_CENTER)
    blk = doc.blocks.new("BOARD")
    blk.add_lwpolyline([(0, 0), (3000, 0), (3000, 1500), (0, 1500)], close=True)
    msp.add_blockref("BOARD", (38500, 5000), dxfattribs={"layer": "EQUIPMENT"})
    doc.saveas(path)
    return path


def test_marks_avoid_drawing_text_and_symbols(tmp_path):
    src = _drawing_with_text_on_the_tray(tmp_path / "in.dxf")
    out = tmp_path / "out.dxf"
    summary = write_annotated_dxf(
        src, out, AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1000.0)
    )
    assert summary.labels == 2 and summary.overlapping == 0
    doc = ezdxf.readfile(out)
    msp = doc.modelspace()
    # what must stay clear, measured by ezdxf itself
    keep_clear = [
        Polygon([(v.x, v.y) for v in disassemble.make_primitive(t).vertices()])
        for t in msp.query("TEXT")
        if t.dxf.layer == "WALLS"
    ]
    for ref in msp.query("INSERT"):
        ext = bbox.extents([ref])
        keep_clear.append(box(ext.extmin.x, ext.extmin.y, ext.extmax.x, ext.extmax.y))
        for attrib in ref.attribs:
            keep_clear.append(
                Polygon([(v.x, v.y) for v in disassemble.make_primitive(attrib).vertices()])
            )
    assert len(keep_clear) == 2 + 4 + 3  # two texts, four symbols, three TAG attributes
    marks = [e for e in msp.query("TEXT MTEXT") if e.dxf.layer in MARK_LAYERS]
    assert marks
    for mark in marks:
        outline = _outline(mark)
        for obstacle in keep_clear:
            assert outline.intersection(obstacle).area < 1e-6 * outline.area, (
                mark.dxf.layer,
                mark.dxf.get("text", ""),
            )


def test_text_content_with_percent_codes_reads_back_literally(tmp_path):
    """A circuit id holding ``%%c`` (DXF's diameter code) must not turn into a control code."""
    src = make_drawing(tmp_path / "in.dxf")
    odd = [
        CircuitOutcome(
            "P-%%c1^J" if o.circuit_id == "P-101" else o.circuit_id,
            o.from_tag,
            o.to_tag,
            o.status,
            o.messages,
            o.route,
            o.group,
            o.sizing,
        )
        for o in outcomes()
    ]
    out = tmp_path / "out.dxf"
    write_annotated_dxf(src, out, AnnotationInput(odd, segments(), PER_SEGMENT, equipment(), 1000.0))
    doc = ezdxf.readfile(out)
    labels = [
        e.plain_text() for e in doc.modelspace().query("TEXT") if e.dxf.layer == "CW-CABLE-LABEL"
    ]
    assert any(text.startswith("P-%%c1^J: ") for text in labels), labels
    schedule = " ".join(
        e.plain_text() for e in doc.modelspace().query("MTEXT") if e.dxf.layer == "CW-SCHEDULE"
    )
    assert "P-%%c1^J" in schedule and "\u00d8" not in schedule


def _tray_chain():
    """Five segments in a line, then a branch; membership changes at S3 and on the branch."""
    pts = [(0.0, 0.0), (10.0, 0.0), (20.0, 0.0), (30.0, 0.0), (40.0, 0.0), (50.0, 0.0)]
    segs = {}
    for i in range(5):
        sid = f"S{i + 1}"
        p = ((*pts[i], 0.0), (*pts[i + 1], 0.0))
        segs[sid] = RouteSegment(sid, (sid,), "ROUTE-TRAY", "tray", "E", 10.0, p)
    segs["S6"] = RouteSegment(
        "S6", ("S6",), "ROUTE-TRAY", "tray", "E", 10.0, ((20.0, 0.0, 0.0), (20.0, 10.0, 0.0))
    )
    per_seg = {
        "S1": ("A", "B", "C"),
        "S2": ("C", "B", "A"),
        "S3": ("A", "B"),
        "S4": ("A", "B"),
        "S5": ("A",),
        "S6": ("C",),
    }
    return segs, per_seg


def test_group_runs_match_connected_components():
    """Runs = connected components (networkx) of shared segments that meet end to end at a
    point where exactly two shared segments end (a run goes on while circuits peel off;
    it stops where shared routes branch)."""
    segs, per_seg = _tray_chain()
    g = nx.Graph()
    shared = [s for s, c in per_seg.items() if len(c) >= 2]
    g.add_nodes_from(shared)
    ends = {s: {segs[s].points_m[0][:2], segs[s].points_m[-1][:2]} for s in shared}
    for a in shared:
        for b in shared:
            for point in ends[a] & ends[b]:
                if a < b and sum(point in ends[c] for c in shared) == 2:
                    g.add_edge(a, b)
    expected = {frozenset(c) for c in nx.connected_components(g)}
    runs = group_runs(segs, per_seg)
    assert {frozenset(r) for r in runs} == expected == {frozenset({"S1", "S2", "S3", "S4"})}
    # a third shared segment ending at (20, 0) is a branch: the run splits there
    segs["S7"] = RouteSegment(
        "S7", ("S7",), "ROUTE-TRAY", "tray", "E", 10.0, ((20.0, 0.0, 0.0), (20.0, -10.0, 0.0))
    )
    per_seg["S7"] = ("A", "D")
    assert {frozenset(r) for r in group_runs(segs, per_seg)} == {
        frozenset({"S1", "S2"}), frozenset({"S3", "S4"}), frozenset({"S7"})
    }


def test_every_shared_segment_is_named_on_a_group_tag(tmp_path):
    segs, per_seg = _tray_chain()
    doc = ezdxf.new("R2010")
    doc.units = 6
    doc.modelspace().add_line((0, 0), (50, 0))
    src = tmp_path / "chain.dxf"
    doc.saveas(src)
    outs = []
    for cid in "ABC":
        used = tuple(s for s, c in per_seg.items() if cid in c)
        pts = tuple(p for s in used for p in segs[s].points_m)
        route = CircuitRoute(cid, "MCC", f"L-{cid}", 30.0, 33.0, 0.0, 0.0, used, pts)
        cable = CableSelection("Cu", "XLPE", 4, 16, 1, 80.0, "capacity")
        outs.append(
            CircuitOutcome(
                cid,
                "MCC",
                f"L-{cid}",
                "ok",
                (),
                route,
                None,
                SizingResult(cid, "ok", device_rating_a=63, cable=cable, method="E"),
            )
        )
    summary = write_annotated_dxf(src, tmp_path / "o.dxf", AnnotationInput(outs, segs, per_seg, {}, 1.0))
    assert summary.group_tags == 1  # S1-S4 are one run (see the test above)
    tags = [
        e.plain_text()
        for e in ezdxf.readfile(tmp_path / "o.dxf").modelspace().query("MTEXT")
        if e.dxf.layer == "CW-GROUP-TAG"
    ]
    text = "\n".join(tags)
    for sid in ("S1", "S2", "S3", "S4"):
        assert sid in text
    assert "3 circuits, 3 cables" in text and "2 circuits, 2 cables" in text
