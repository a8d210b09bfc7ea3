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
import sys
from pathlib import Path

import ezdxf
import pytest
from drawing_audit import audit
from shapely.geometry import LineString, MultiLineString

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
    out = {}
    for rev in (1, 2):
        src = base / f"rev{rev}"
        gen.main(src, rev)
        code = main(["size", str(src / "pumping_station.dxf"), "--circuits",
                     str(src / "pumping_station_circuits.csv"), "--out", str(base / f"out{rev}"), "--json"]
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


def _segments(out_dir, k=1000.0):
    """Each segment's line from schedule.json (points in m -> drawing mm)."""
    data = json.loads((out_dir / "schedule.json").read_text())
    return {s["id"]: LineString([(p[0] * k, p[1] * k) for p in s["points_m"]])
            for s in data.get("segments", []) if len(s["points_m"]) >= 2}


def _routes(out_dir, k=1000.0):
    """Each circuit's route from schedule.json: its segments' lines (drawing mm), as one
    geometry (no line is made up between segments that do not meet end to end)."""
    data = json.loads((out_dir / "schedule.json").read_text())
    seg = _segments(out_dir, k)
    routes = {}
    for c in data["circuits"]:
        lines = [seg[sid] for sid in ((c.get("route") or {}).get("segments") or []) if sid in seg]
        if lines:
            routes[c["id"]] = MultiLineString(lines)
    return routes


def _audit(out_dir, dxf_name):
    return audit(out_dir / dxf_name, _routes(out_dir), segments=_segments(out_dir))


def _reported(out_dir):
    """How the writer says it placed the marks (schedule.json ``drawing_marks``)."""
    return json.loads((out_dir / "schedule.json").read_text())["drawing_marks"]


def check_accounted(result, reported) -> None:
    """Every crossing and overlap the audit (ezdxf + shapely) finds is one the writer
    counted as a last resort: a mark placed over a line is one crossing mark (a group tag
    and the fill lines under it are one mark in two texts); every
    overlap has a mark in it that the writer placed by a last resort and named in
    schedule.json; nothing is silent.  Cable labels keep the rule:
    leaders of at most 5 text heights (issue 12)."""
    crossing = reported["fallback_crossing_linework"]
    overlapping = reported["fallback_overlapping"]
    assert len(set(result.crossing_linework)) <= crossing + overlapping, (result.summary(), reported)
    # the writer names its last resorts; every overlap has one of them in it
    last = set(reported["last_resort_marks"])
    assert len(last) == crossing + overlapping + reported["fallback_beyond_reach"]
    assert [p for p in result.overlap_pairs if not last & set(p)] == [], result.summary()
    assert len(result.labels_off_route) <= crossing + overlapping, (result.summary(), reported)
    assert result.longest("label-leader") <= 5.0 * result.text_height + 1e-6, result.summary()
    assert result.longest("segment-leader") <= 5.0 * result.text_height + 1e-6, result.summary()


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
    result = _audit(out, "recoloured_annotated.dxf")
    print("recoloured:", result.summary(), _reported(out))
    assert result.labels >= 19
    check_accounted(result, _reported(out))
    # the same geometry as the sample, which keeps the strict rule: so must this copy
    assert result.crossing_linework == [] and result.overlapping_text == [], result.summary()
    assert _reported(out)["last_resort_marks"] == []


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
    """Counts of the audit printed (before issue 12's placement: 27 of 56 added texts
    crossing linework, 25 overlapping, 7 of 19 labels off their route); every crossing and
    overlap left is one the writer counted and reported in schedule.json."""
    out1 = runs[1][1]
    result = _audit(out1, "pumping_station_annotated.dxf")
    reported = _reported(out1)
    print("demo:", result.summary(), reported)
    assert result.labels == 19
    # every segment with a plan length named once (a vertical riser has none to write along)
    assert result.segment_ids >= sum(1 for g in _segments(out1).values() if g.length > 0)
    assert len(result.crossing_linework) < 27 and len(result.overlapping_text) < 25
    # a regression guard at this code's counts (5 crossing and 12 overlapping before the note
    # variants and the segment ids from their ends; 2 and 6 after; 3 and 0 after the
    # repair rounds, with labels no longer hanging far over a short stretch's end)
    assert len(result.crossing_linework) <= 3 and len(result.overlapping_text) == 0
    check_accounted(result, reported)


def test_demo_cable_labels_keep_the_rule(runs):
    """Issue 12: every cable label along its own route within 1 text height, or tied to it
    by a leader of at most 5 text heights, and crossing none of the drawing's lines."""
    out1 = runs[1][1]
    result = _audit(out1, "pumping_station_annotated.dxf")
    assert result.labels_off_route == []
    assert not [n for n in result.crossing_linework if n.startswith("cable-label ")]
    assert result.longest("label-leader") <= 5.0 * result.text_height


def test_demo_no_text_crosses_linework_or_text(runs):
    """Issue 12, the strict rule on the demo at its 1:200 lettering: no added text crosses the
    drawing's linework or another text, every label and segment id on its own route and
    every leader within 10 h (the P-102 and SO-PH device notes and the S15-S20 group tag
    needed a last resort until a note that cannot fit became a key, note_keys.py)."""
    out1 = runs[1][1]
    result = _audit(out1, "pumping_station_annotated.dxf")
    assert result.crossing_linework == [] and result.overlapping_text == []
    assert result.labels_off_route == [] and result.segment_ids_off == []
    assert max(d for _, d in result.leaders) <= 10.0 * result.text_height


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


@pytest.fixture(scope="module")
def plant(tmp_path_factory):
    """A 200-circuit benchmark plant (benchmarks/generate_plant.py, invented data), sized
    with the defaults; the 2,000-circuit plant is run by benchmarks/bench_marks.py (its
    counts in benchmarks/RESULTS.md), too slow for the suite."""
    spec = importlib.util.spec_from_file_location("gen_plant_marks",
                                                  ROOT / "benchmarks" / "generate_plant.py")
    gen = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = gen  # its dataclasses look their module up
    spec.loader.exec_module(gen)
    base = tmp_path_factory.mktemp("plant")
    files = gen.generate_plant(base / "in", circuits=200)
    out = base / "out"
    code = main(["size", str(files.dxf_path), "--circuits", str(files.csv_path), "--out", str(out),
                 "--json"])
    assert code in (0, 1)
    return out, Path(files.dxf_path).stem + "_annotated.dxf"


def test_plant_marks_are_accounted_for(plant):
    """On the 200-circuit plant every cable label and segment id is written, and every
    crossing or overlap the audit finds is a last resort the writer counted (printed)."""
    out, name = plant
    result = _audit(out, name)
    reported = _reported(out)
    print("plant 200:", result.summary(), reported)
    assert result.labels == 200
    # every segment with a plan length named once (a vertical riser has none to write along)
    assert result.segment_ids >= sum(1 for g in _segments(out).values() if g.length > 0)
    # every label beside its own route or tied to it by a leader (73 were not while labels
    # could hang far over a short stretch's end and leaders start off the stretch)
    assert result.labels_off_route == []
    check_accounted(result, reported)
    _check_keyed_notes(out / name, reported)


def _check_keyed_notes(dxf, reported) -> None:
    """Every note the writer reports as keyed (note_keys.py) is on the drawing as its key
    ``[n]`` (kind ``<note kind>-key``, the note's reference) and in full in the keyed notes
    list, with the note's own kind and reference; the keys are 1..N, each once."""
    keyed = reported["keyed_marks"]
    assert reported["keyed_notes"] == len(keyed)
    doc = ezdxf.readfile(dxf)
    keys, full = {}, {}
    for e in doc.modelspace().query("TEXT MTEXT"):
        if not e.has_xdata(APPID):
            continue
        kind, ref = (v for _, v in e.get_xdata(APPID))
        text = e.plain_text() if e.dxftype() == "MTEXT" else e.dxf.text
        if kind.endswith("-key"):
            keys[f"{kind[:-4]} {ref}"] = text
        elif kind == "schedule" and ref.startswith("key "):
            full[int(ref[4:])] = text
    assert sorted(keys) == sorted(keyed)
    numbers = sorted(int(t.strip("[]")) for t in keys.values())
    assert numbers == list(range(1, len(keyed) + 1)) == sorted(full)
    assert all(full[n] == f"[{n}]" for n in numbers)
    notes = {(v[0].value, v[1].value) for e in doc.modelspace().query("MTEXT TEXT")
             if e.has_xdata(APPID) for v in [e.get_xdata(APPID)]}
    for name in keyed:  # the full note, under its own kind and reference, in the list
        kind, ref = name.split(" ", 1)
        assert (kind, ref) in notes, name


def test_demo_device_notes_give_the_kind_in_words_and_the_rating(runs):
    """Issue 12: the device note carries the device kind and rating, checked against
    schedule.json (the same run's machine output): the config token in words
    ("motor_breaker" -> "motor breaker"), never the token itself."""
    from cablewright.sizing.device import DEVICE_WORDS

    out1 = runs[1][1]
    data = json.loads((out1 / "schedule.json").read_text())["circuits"]
    doc = ezdxf.readfile(out1 / "pumping_station_annotated.dxf")
    notes = " ".join(" ".join((e.plain_text() if e.dxftype() == "MTEXT" else e.dxf.text).split())
                     for e in doc.modelspace().query("TEXT MTEXT")
                     if e.has_xdata(APPID) and e.get_xdata(APPID)[0].value == "device-note")
    kinds = {c["device_kind"] for c in data if c.get("device_rating_a") is not None}
    assert "motor_breaker" in kinds and "motor_breaker" not in notes
    for c in data:
        if c.get("device_rating_a") is not None:
            words = DEVICE_WORDS[c["device_kind"]]
            assert f"{c['id']}: {words} {c['device_rating_a']:g} A" in notes, c["id"]


def _fill_texts(dxf):
    """(kind, ref, plain text) of every fill line we wrote: notes and lines under group tags."""
    doc = ezdxf.readfile(dxf)
    out = []
    for e in doc.modelspace().query("TEXT MTEXT"):
        if e.has_xdata(APPID):
            tags = [v for _, v in e.get_xdata(APPID)]
            if tags[0] in ("fill-mark", "group-fill"):
                text = e.plain_text() if e.dxftype() == "MTEXT" else e.dxf.text
                out.append((tags[0], tags[1], text, e.dxf.layer))
    return out


def test_every_over_full_segment_named_once_with_its_fill_from_the_schedule(runs):
    """Issue 12 item 4: each segment over its fill limit in schedule.json (the segment
    schedule) is named once on the drawing, with its percent and result, either under its
    run's group tag or in a note of its own, always on the fill layer."""
    out1 = runs[1][1]
    doc = json.loads((out1 / "schedule.json").read_text())
    over = {s["id"]: s["fill"] for s in doc["segments"]
            if s.get("fill") and s["fill"]["result"] in ("warning", "fail")}
    assert over, "the demo has over-full trays"
    fills = _fill_texts(out1 / "pumping_station_annotated.dxf")
    assert {layer for *_, layer in fills} == {"CW-FILL"}
    named = {}
    for kind, _ref, text, _ in fills:
        # a note of its own names one segment and may be wrapped; under a tag, one line each
        lines = [" ".join(text.split())] if kind == "fill-mark" else text.splitlines()
        for line in lines:
            ids, _, rest = line.partition(": ")
            for sid in ids.split(", "):
                named.setdefault(sid, []).append(rest)
    assert sorted(named) == sorted(over)
    for sid, fill in over.items():
        (rest,) = named[sid]
        assert f"{fill['percent']:.0f} %" in rest and f"({fill['result'].upper()})" in rest
