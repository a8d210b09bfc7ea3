"""The marks on the annotated drawing, read back with ezdxf and checked with shapely
(general-purpose geometry library; see tests/drawing_audit.py): where the labels are,
what they cross, the colours and linetype of our leaders against the drawing's own
layer table, and the revision marks of ``size --previous`` against the change report.

The revisions come from sample_drawings/generate_pumping_station.py (revision 2: the
P-102 branch tray moved, S-01 deleted, UV-1 and L-04 added).
"""

from __future__ import annotations

import importlib.util
import json
from pathlib import Path

import ezdxf
import pytest
from drawing_audit import audit
from shapely.geometry import LineString

from cablewright.cli import main

ROOT = Path(__file__).resolve().parents[1]
APPID = "CABLEWRIGHT"


def _generator():
    spec = importlib.util.spec_from_file_location(
        "gen_ps_marks", ROOT / "sample_drawings" / "generate_pumping_station.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


@pytest.fixture(scope="module")
def runs(tmp_path_factory):
    gen = _generator()
    base = tmp_path_factory.mktemp("marks")
    # the drawing's linework kept clear of labels (an option: slow on large drawings)
    config = base / "linework.toml"
    config.write_text("[annotate]\navoid_linework = true\n", encoding="utf-8")
    out = {}
    for rev in (1, 2):
        src = base / f"rev{rev}"
        gen.main(src, rev)
        code = main(["size", str(src / "pumping_station.dxf"), "--circuits",
                     str(src / "pumping_station_circuits.csv"), "--out", str(base / f"out{rev}"), "--json",
                     "--config", str(config)]
                    + (["--previous", str(base / "out1")] if rev == 2 else []))
        assert code in (0, 1)
        out[rev] = (src, base / f"out{rev}")
    return out


def _marks(dxf, kind):
    doc = ezdxf.readfile(dxf)
    out = []
    for e in doc.modelspace():
        if e.has_xdata(APPID):
            tags = [v for _, v in e.get_xdata(APPID)]
            if tags and tags[0] == kind:
                out.append((tags[1], e))
    return doc, out


def _routes(out_dir, k=1000.0):
    """Each circuit's route line from schedule.json (segments' points, in drawing mm)."""
    data = json.loads((out_dir / "schedule.json").read_text())
    seg = {s["id"]: s["points_m"] for s in data.get("segments", [])}
    routes = {}
    for c in data["circuits"]:
        ids = (c.get("route") or {}).get("segments") or []
        pts = [(p[0] * k, p[1] * k) for sid in ids for p in seg.get(sid, [])]
        if len(pts) >= 2:
            routes[c["id"]] = LineString(pts)
    return routes


def test_revision_marks_exactly_the_changed_circuits(runs):
    """Issue 14: the annotated revision marks the circuits changes.json lists as new or
    changed, and no other; the added loads and the re-routed P-102 among them."""
    out2 = runs[2][1]
    changes = json.loads((out2 / "changes.json").read_text())
    changed = {c.get("circuit", c.get("id")) for c in changes["circuits"]
               if c["change"] in ("new", "changed")}
    assert {"UV-1", "L-04", "P-102"} <= changed
    assert "S-01" not in changed  # removed: no label left to mark
    _, diamonds = _marks(out2 / "pumping_station_annotated.dxf", "revision-mark")
    assert {ref for ref, _ in diamonds} == changed
    assert len(diamonds) == len(changed)
    # the first run compared with nothing has no revision mark
    _, none = _marks(runs[1][1] / "pumping_station_annotated.dxf", "revision-mark")
    assert none == []


def _route_colours(doc, names):
    return {abs(doc.layers.get(n).dxf.color) for n in names if doc.layers.has_entry(n)}


ROUTE_LAYERS = ("ROUTE-TRAY", "ROUTE-LADDER", "ROUTE-CONDUIT", "ROUTE-CLIPPED", "ROUTE-DUCT",
                "ROUTE-BURIED")


def _check_colours(dxf):
    doc = ezdxf.readfile(dxf)
    taken = _route_colours(doc, ROUTE_LAYERS)
    ours = [layer for layer in doc.layers if layer.has_xdata(APPID)]
    assert ours
    for layer in ours:
        assert abs(layer.dxf.color) not in taken, (layer.dxf.name, layer.dxf.color, taken)
    leaders = [e for e in doc.modelspace().query("LINE") if e.has_xdata(APPID)
               and str(e.get_xdata(APPID)[0].value).endswith("leader")]
    assert leaders
    for e in leaders:
        assert e.dxf.linetype == "CW-LEADER"
        assert e.dxf.get("color", 256) in (256, *[abs(la.dxf.color) for la in ours])
    linetypes = {doc.layers.get(n).dxf.linetype for n in ROUTE_LAYERS if doc.layers.has_entry(n)}
    assert "CW-LEADER" not in linetypes


def test_leader_colours_and_linetype_are_none_of_a_route_layer(runs):
    """Issue 12: on the sample the ladder layer is ACI 6, the group tags' default; no layer
    of ours may take a route layer's colour, and leaders use a linetype of our own."""
    _check_colours(runs[1][1] / "pumping_station_annotated.dxf")


def test_colours_chosen_from_a_drawing_with_other_layer_colours(runs, tmp_path):
    """The same on a drawing whose route layers use our default colours (5, 94, 30, 1...):
    the colours are chosen from the drawing's own layer table at run time."""
    src = runs[1][0]
    doc = ezdxf.readfile(src / "pumping_station.dxf")
    for name, colour in zip(ROUTE_LAYERS, (5, 94, 30, 1, 2, 7), strict=True):
        doc.layers.get(name).dxf.color = colour
    recoloured = tmp_path / "recoloured.dxf"
    doc.saveas(recoloured)
    out = tmp_path / "out"
    code = main(["size", str(recoloured), "--circuits", str(src / "pumping_station_circuits.csv"),
                 "--out", str(out), "--json"])
    assert code in (0, 1)
    _check_colours(out / "recoloured_annotated.dxf")
    result = audit(out / "recoloured_annotated.dxf", _routes(out))
    print("recoloured:", result.summary())
    assert result.labels >= 19


def test_demo_labels_carry_what_the_installer_needs(runs):
    """Issue 12: circuit id, cores x size, conductor/insulation, a reduced PE and the
    parallel count; checked against schedule.json (the same run's machine output)."""
    out1 = runs[1][1]
    data = {c["id"]: c for c in json.loads((out1 / "schedule.json").read_text())["circuits"]}
    _, labels = _marks(out1 / "pumping_station_annotated.dxf", "cable-label")
    assert labels
    for ref, e in labels:
        text = e.dxf.text
        cable = data[ref]["cable"]
        assert text.startswith(f"{ref}: ")
        assert f"{cable['cores']}x{cable['size_label']} {cable['conductor']}/{cable['insulation']}" in text
        if int(cable["parallel"]) > 1:
            assert f": {cable['parallel']}x " in text
        pe = data[ref]["protective_conductor_mm2"]
        # a reduced PE is written (IEC 60364-5-54:2011 Table 54.2 allows PE < phase above 16 mm²)
        assert (f"PE{pe:g}" in text) == (pe is not None and pe < cable["csa_mm2"])


def test_demo_audit_counts(runs):
    """Counts of the audit printed (before this work: 27 of 56 added texts crossing
    linework, 7 of 19 labels off their route with nothing tying them, leaders to 32.7 h)."""
    out1 = runs[1][1]
    result = audit(out1 / "pumping_station_annotated.dxf", _routes(out1))
    print("demo:", result.summary())
    assert result.labels == 19
    assert len(result.labels_off_route) < 7
    assert len(result.crossing_linework) < 27


@pytest.mark.xfail(strict=True, reason="issue 12 not yet met on the demo: group tags and "
                   "device notes still cross walls/routes and overlap text at the demo's 1:200 lettering")
def test_demo_no_text_crosses_linework_or_text(runs):
    out1 = runs[1][1]
    result = audit(out1 / "pumping_station_annotated.dxf", _routes(out1))
    assert result.crossing_linework == [] and result.overlapping_text == []
    assert result.labels_off_route == []
    assert max(d for _, d in result.leaders) <= 5.0 * result.text_height


def test_schedule_on_the_drawing_gives_the_length_to_order(runs):
    """Issue 12: the table gives design length x parallel (F-MCC1: two cables of 16.34 m
    design length in schedule.json -> 32.7 m to order), PE, device kind and the title block."""
    out1 = runs[1][1]
    data = {c["id"]: c for c in json.loads((out1 / "schedule.json").read_text())["circuits"]}
    doc = ezdxf.readfile(out1 / "pumping_station_annotated.dxf")
    texts = [e.plain_text() if e.dxftype() == "MTEXT" else e.dxf.text
             for e in doc.modelspace().query("TEXT MTEXT") if e.has_xdata(APPID)]
    columns = [t.splitlines() for t in texts]
    order = next(c for c in columns if c and c[0] == "order m")
    ids = next(c for c in columns if c and c[0] == "circuit")
    assert len(order) == len(ids)
    for cid, value in zip(ids[1:], order[1:], strict=True):
        row = data[cid]
        if row.get("cable"):
            expected = row["route"]["design_length_m"] * row["cable"]["parallel"]
            assert float(value) == pytest.approx(expected, abs=0.06), cid
    assert float(order[ids.index("F-MCC1")]) == pytest.approx(2 * 16.34, abs=0.06)
    joined = "\n".join(texts)
    assert "DRAWING REVISION" in joined and "cablewright" in joined and "CAUTION" in joined
