"""Drawings as other CAD programs write them (issue 16): units, curves, untagged equipment, ``layers``.

Every drawing here is made by a generator in this file (ezdxf), never by hand.
Expected values come from outside the code under test: ezdxf's unit table,
shapely lengths and offsets, the arc-length formula, Ramanujan's ellipse
perimeter, and contract.md's layer table.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import ezdxf
import pytest
from cablewright.core.errors import DrawingReadError, ScheduleError
from cablewright.extract import measure, read_dxf
from cablewright.extract.model import DEFAULT_ROUTE_LAYERS, DrawingConfig
from cablewright.extract.schedule import rows_from_equipment
from cablewright.extract.survey import suggest_containment
from cablewright.extract.units import INSUNITS, UNIT_TO_M, Extents, check_scale
from shapely.geometry import LineString, Point

from cablewright.cli import main

ROOT = Path(__file__).resolve().parents[1]
SAMPLE = ROOT / "sample_drawings" / "pumping_station.dxf"
SAMPLE_CIRCUITS = ROOT / "sample_drawings" / "pumping_station_circuits.csv"

#: contract.md, "Drawing conventions": containment -> IEC 60364-5-52 method.
CONTRACT_METHOD = {"tray": "E", "ladder": "E", "conduit": "B2", "clipped": "C", "duct": "D1", "buried": "D2"}


# --------------------------------------------------------------------------- generators


def plant(path: Path, *, insunits: int, unit_per_m: float, layers: dict[str, str], tagged: bool = True,
          symbol_layer: str = "EQUIP", tag_attribute: str = "TAG") -> Path:
    """A small plant: a board MCC-1 at the west end of a spine; one branch per layer to a load.

    ``layers`` maps a role (``spine``, ``a``, ``b``, ``c``) to its layer name.  The spine
    runs (0,0)-(40,0) m; branch ``a`` goes north from x=10 for 8 m, ``b`` from x=20 for
    6 m, ``c`` from x=30 for 4 m; each load sits 0.5 m beyond its branch end.  With
    ``tagged`` the equipment are blocks with a ``tag_attribute`` attribute, else circles
    with a text 0.3 m to their right.
    """
    k = unit_per_m
    doc = ezdxf.new("R2018")
    doc.header["$INSUNITS"] = insunits
    msp = doc.modelspace()
    for name in {*layers.values(), symbol_layer}:
        doc.layers.add(name)
    blk = doc.blocks.new("EQ")
    blk.add_circle((0, 0), 0.2 * k)
    blk.add_attdef(tag_attribute, (0, 0))
    msp.add_line((0, 0), (40 * k, 0), dxfattribs={"layer": layers["spine"]})
    loads = {}
    for role, x, run in (("a", 10, 8), ("b", 20, 6), ("c", 30, 4)):
        msp.add_line((x * k, 0), (x * k, run * k), dxfattribs={"layer": layers[role]})
        loads[f"L-{role.upper()}1"] = (x * k, (run + 0.5) * k)
    board = {"MCC-1": (-0.5 * k, 0)}
    for tag, pos in {**board, **loads}.items():
        if tagged:
            msp.add_blockref("EQ", pos).add_auto_attribs({tag_attribute: tag})
        else:
            msp.add_circle(pos, 0.2 * k, dxfattribs={"layer": symbol_layer})
            msp.add_text(f"{tag} load", dxfattribs={"layer": "TEXT", "height": 0.2 * k,
                                                     "insert": (pos[0] + 0.3 * k, pos[1])})
    doc.saveas(path)
    return path


def schedule(path: Path) -> Path:
    path.write_text("circuit,from,to,load\nC-A,MCC-1,L-A1,5 kW\nC-B,MCC-1,L-B1,5 kW\nC-C,MCC-1,L-C1,5 kW\n",
                    encoding="utf-8")
    return path


def expected_length_m(role: str) -> float:
    """Board tail + spine + branch + load tail, by shapely on the generator's coordinates."""
    x, run = {"a": (10, 8), "b": (20, 6), "c": (30, 4)}[role]
    spine = LineString([(0, 0), (40, 0)])
    branch = LineString([(x, 0), (x, run)])
    return (Point(-0.5, 0).distance(spine) + LineString([(0, 0), (x, 0)]).length + branch.length
            + Point(x, run + 0.5).distance(branch))


def run_cli(capsys, *argv: str) -> tuple[int, str, str]:
    code = main(list(argv))
    out = capsys.readouterr()
    return code, out.out, out.err


# --------------------------------------------------------------------------- units


def test_unit_table_matches_ezdxf():
    """Every $INSUNITS length ezdxf knows (ezdxf.units.METER_FACTOR) has our factor."""
    from ezdxf import units

    for code, per_m in enumerate(units.METER_FACTOR):
        if per_m is None:
            continue
        name, factor = INSUNITS[code]
        assert factor == pytest.approx(1.0 / per_m, rel=1e-8), name
        assert units.unit_name(code) is not None
    # US survey foot = 1200/3937 m (NIST Handbook 44, Appendix C); ezdxf gives none
    assert INSUNITS[21][1] == pytest.approx(0.3048006096, rel=1e-9)


def test_decimetres_are_read(tmp_path):
    """$INSUNITS 14 (decimetres): 100 dm = 10 m (ezdxf.units.conversion_factor)."""
    from ezdxf import units

    doc = ezdxf.new("R2018")
    doc.header["$INSUNITS"] = 14
    doc.modelspace().add_line((0, 0), (100, 0), dxfattribs={"layer": "ROUTE-TRAY"})
    doc.saveas(tmp_path / "dm.dxf")
    content = read_dxf(tmp_path / "dm.dxf")
    piece = content.polylines[0].points_m
    assert content.units == "dm"
    assert math.dist(piece[0], piece[1]) == pytest.approx(100 * units.conversion_factor(14, 6))


def test_config_units_override_the_header(tmp_path):
    """Drawn in cm, header says mm: the config's cm wins, with one line saying so."""
    path = plant(tmp_path / "cm.dxf", insunits=4, unit_per_m=100.0,
                 layers={"spine": "ROUTE-TRAY", "a": "ROUTE-TRAY", "b": "ROUTE-TRAY", "c": "ROUTE-TRAY"})
    content = read_dxf(path, DrawingConfig(units="cm"))
    overrides = [i for i in content.issues if i.code == "units-override"]
    assert len(overrides) == 1 and "mm" in overrides[0].message and "cm" in overrides[0].message
    spine = max(content.polylines, key=lambda p: abs(p.points_m[-1][0] - p.points_m[0][0]))
    assert abs(spine.points_m[-1][0] - spine.points_m[0][0]) == pytest.approx(40.0)
    assert content.summary.units_source == "config"


def test_wrong_header_is_reported_with_the_likely_units(tmp_path):
    """Drawn in m, header says mm: 40 m reads as 0.04 m; the warning names metres."""
    path = plant(tmp_path / "m_as_mm.dxf", insunits=4, unit_per_m=1.0,
                 layers={"spine": "ROUTE-TRAY", "a": "ROUTE-TRAY", "b": "ROUTE-TRAY", "c": "ROUTE-TRAY"})
    content = read_dxf(path)
    warn = [i for i in content.issues if i.code == "units-implausible"]
    assert len(warn) == 1 and "--units m" in warn[0].message
    assert content.summary.scale.likely_units[0] == "m"
    assert not [i for i in read_dxf(path, DrawingConfig(units="m")).issues if i.code == "units-implausible"]


def test_a_room_drawn_in_cm_under_a_mm_header():
    """A 10 m x 6 m room of 3 m pieces drawn in cm, header mm: read as 1 m x 0.6 m, likely cm."""
    read_as_mm = Extents((0, 0, 0), (1000 * 0.001, 600 * 0.001, 0), 300 * 0.001, 12)
    check = check_scale(read_as_mm, "mm")
    assert not check.plausible and check.likely_units[0] == "cm"


def test_scale_check_bands():
    """A 0.38 x 0.60 m building (issue 16) is implausible; a 138 m plant in mm is not."""
    assert not check_scale(Extents((0, 0, 0), (0.38, 0.60, 0), 0.004, 50), "mm").plausible
    assert check_scale(Extents((0, 0, 0), (138.0, 31.0, 8.0), 13.0, 20), "mm").plausible


def test_units_option_and_schedule_json(tmp_path, capsys):
    """``size --units cm`` on a cm drawing whose header says mm: one override line, units in schedule.json."""
    path = plant(tmp_path / "cm.dxf", insunits=4, unit_per_m=100.0,
                 layers={"spine": "ROUTE-TRAY", "a": "ROUTE-TRAY", "b": "ROUTE-TRAY", "c": "ROUTE-TRAY"})
    out = tmp_path / "out"
    code, _, err = run_cli(capsys, "size", str(path), "--circuits", str(schedule(tmp_path / "c.csv")),
                           "--units", "cm", "--out", str(out))
    assert code in (0, 1)
    assert len([line for line in err.splitlines() if "read in cm" in line]) == 1
    doc = json.loads((out / "schedule.json").read_text(encoding="utf-8"))
    drawing = doc["drawing"]
    assert drawing["units"] == "cm" and drawing["units_source"] == "config" and drawing["insunits"] == 4
    # spine 40 m plus the board half a metre west; branches up to 8 m + 0.5 m (generator's numbers)
    assert drawing["extents_m"]["size"][:2] == pytest.approx([40.0, 8.0])
    routed = {c["id"]: c["route"]["routed_length_m"] for c in doc["circuits"]}
    assert routed["C-A"] == pytest.approx(expected_length_m("a"), abs=0.01)
    assert "Drawing as read" in (out / "report.html").read_text(encoding="utf-8")
    # the annotated copy says the units it was read in; the input keeps its own header
    assert ezdxf.readfile(out / "cm_annotated.dxf").header["$INSUNITS"] == 5
    assert ezdxf.readfile(path).header["$INSUNITS"] == 4


def test_units_option_reaches_every_drawing_of_a_batch(tmp_path, capsys):
    layers = {"spine": "ROUTE-TRAY", "a": "ROUTE-TRAY", "b": "ROUTE-TRAY", "c": "ROUTE-TRAY"}
    for name in ("one", "two"):
        plant(tmp_path / f"{name}.dxf", insunits=4, unit_per_m=100.0, layers=layers)
        schedule(tmp_path / f"{name}_circuits.csv")
    out = tmp_path / "out"
    code, _, _ = run_cli(capsys, "size", str(tmp_path / "one.dxf"), str(tmp_path / "two.dxf"),
                         "--units", "cm", "--out", str(out))
    assert code in (0, 1)
    for name in ("one", "two"):
        doc = json.loads((out / name / "schedule.json").read_text(encoding="utf-8"))
        assert doc["drawing"]["units"] == "cm"
        routed = {c["id"]: c["route"]["routed_length_m"] for c in doc["circuits"]}
        assert routed["C-B"] == pytest.approx(expected_length_m("b"), abs=0.01)


def test_unknown_units_option_is_exit_2(tmp_path, capsys):
    path = plant(tmp_path / "x.dxf", insunits=6, unit_per_m=1.0,
                 layers={"spine": "ROUTE-TRAY", "a": "ROUTE-TRAY", "b": "ROUTE-TRAY", "c": "ROUTE-TRAY"})
    code, _, err = run_cli(capsys, "routes", str(path), "--circuits", str(schedule(tmp_path / "c.csv")),
                           "--units", "furlong")
    assert code == 2 and "furlong" in err and "Traceback" not in err


# --------------------------------------------------------------------------- curves


def test_spline_ellipse_mline_and_wide_polyline_are_routes(tmp_path):
    doc = ezdxf.new("R2018")
    doc.header["$INSUNITS"] = 6
    msp = doc.modelspace()
    tray = {"layer": "ROUTE-TRAY"}
    # quarter ellipse of ratio 1 (a circle arc), r = 2 m: length pi r / 2 (arc length)
    msp.add_ellipse((100, 0), major_axis=(2, 0, 0), ratio=1.0, start_param=0, end_param=math.pi / 2,
                    dxfattribs=tray)
    # full ellipse a = 4, b = 2: Ramanujan's first approximation of the perimeter
    msp.add_ellipse((200, 0), major_axis=(4, 0, 0), ratio=0.5, dxfattribs=tray)
    # spline with colinear control points: a straight 10 m piece
    msp.add_spline(fit_points=None, dxfattribs=tray).set_open_uniform([(300, 0), (303, 0), (306, 0), (310, 0)])
    # multiline: the standard style's elements at +0.5 / -0.5 of the reference line's side
    mline = msp.add_mline([(400, 0), (405, 0), (405, 5)], dxfattribs=tray)
    # polyline with a constant width: read as its centre line
    msp.add_lwpolyline([(500, 0), (506, 0), (506, 8)], dxfattribs={**tray, "const_width": 0.4})
    doc.saveas(tmp_path / "curves.dxf")
    content = read_dxf(tmp_path / "curves.dxf", DrawingConfig(flatten_tolerance_m=0.001))
    by_x = {round(p.points_m[0][0] / 100): LineString(p.points_m).length for p in content.polylines}
    assert by_x[1] == pytest.approx(math.pi * 2 / 2, rel=1e-3)
    a, b = 4.0, 2.0
    ramanujan = math.pi * (3 * (a + b) - math.sqrt((3 * a + b) * (a + 3 * b)))
    assert by_x[2] == pytest.approx(ramanujan, rel=1e-3)
    assert by_x[3] == pytest.approx(10.0, rel=1e-9)
    offsets = [el.offset for el in mline.style.elements]
    params = [v.line_params for v in mline.vertices]
    # element lines lie at 0 and -1 along the miter: the centre is -0.5, to the right
    assert sorted(p[0] for p in params[0]) == pytest.approx([-1.0, 0.0]) and sorted(offsets) == [-0.5, 0.5]
    centre = LineString([(400, 0), (405, 0), (405, 5)]).offset_curve(-0.5, join_style="mitre")
    assert by_x[4] == pytest.approx(centre.length, rel=1e-9)
    assert by_x[5] == pytest.approx(LineString([(500, 0), (506, 0), (506, 8)]).length)
    assert not [i for i in content.issues if i.code == "unsupported-entity"]


# --------------------------------------------------------------------------- tags from text


def test_circles_with_text_become_equipment(tmp_path):
    path = plant(tmp_path / "circles.dxf", insunits=6, unit_per_m=1.0, tagged=False,
                 layers={"spine": "ROUTE-TRAY", "a": "ROUTE-TRAY", "b": "ROUTE-TRAY", "c": "ROUTE-TRAY"})
    csv = schedule(tmp_path / "c.csv")
    config = DrawingConfig(tags_from_text=True, tag_symbol_layers=("EQUIP",))
    m = measure(path, csv, config)
    assert set(m.equipment) == {"MCC-1", "L-A1", "L-B1", "L-C1"}
    for role in "abc":
        assert m.routes[f"C-{role.upper()}"].routed_length_m == pytest.approx(expected_length_m(role), abs=1e-6)
    # by default (contract: tags_from_text = false) the circles are not equipment
    assert set(measure(path, csv, DrawingConfig()).routes) == set()
    off = measure(path, csv, DrawingConfig(tag_symbol_layers=("EQUIP",)))
    assert not off.routes and any(i.code == "tags-from-text-off" for i in off.issues)


def test_blocks_without_attributes_take_the_nearest_text(tmp_path):
    doc = ezdxf.new("R2018")
    doc.header["$INSUNITS"] = 4
    msp = doc.modelspace()
    pump = doc.blocks.new("PUMP")
    pump.add_circle((0, 0), 200)
    msp.add_line((0, 0), (20000, 0), dxfattribs={"layer": "ROUTE-TRAY"})
    msp.add_blockref("PUMP", (5000, 1000))
    msp.add_blockref("PUMP", (5600, 1000))  # two side by side: each its own label
    msp.add_blockref("PUMP", (15000, 1000))  # no text near: block name and index
    msp.add_text("P-1", dxfattribs={"insert": (4900, 1300), "height": 150})
    msp.add_text("P-2 spare", dxfattribs={"insert": (5700, 1300), "height": 150})
    msp.add_text("MDB-1", dxfattribs={"insert": (-800, 0), "height": 150})
    board = doc.blocks.new("BOARD")
    board.add_lwpolyline([(0, 0), (400, 0), (400, 200), (0, 200)], close=True)
    msp.add_blockref("BOARD", (-500, -100))
    doc.saveas(tmp_path / "blocks.dxf")
    content = read_dxf(tmp_path / "blocks.dxf", DrawingConfig(tags_from_text=True))
    tags = {eq.tag: eq for eq in content.equipment}
    assert set(tags) == {"P-1", "P-2", "PUMP-1", "MDB-1"}
    assert tags["P-1"].position_m[0] == pytest.approx(5.0) and tags["P-2"].position_m[0] == pytest.approx(5.6)
    assert tags["PUMP-1"].position_m[0] == pytest.approx(15.0)
    assert any(i.code == "tags-from-text" and "PUMP-1" in i.message for i in content.issues)


def test_schedule_gives_the_load_position(tmp_path):
    """to_x/to_y in drawing units (mm) place a load that the drawing does not show."""
    path = plant(tmp_path / "p.dxf", insunits=4, unit_per_m=1000.0,
                 layers={"spine": "ROUTE-TRAY", "a": "ROUTE-TRAY", "b": "ROUTE-TRAY", "c": "ROUTE-TRAY"})
    csv = tmp_path / "c.csv"
    csv.write_text("circuit,from,to,load,to_x,to_y,to_z\nC-X,MCC-1,FAN-9,2 kW,25000,3000,\n"
                   "C-Y,MCC-1,FAN-8,2 kW,oops,3000,\n", encoding="utf-8")
    m = measure(path, csv)
    spine = LineString([(0, 0), (40, 0)])
    want = Point(-0.5, 0).distance(spine) + 25.0 + Point(25, 3).distance(spine)
    assert m.routes["C-X"].routed_length_m == pytest.approx(want, abs=1e-6)
    assert "C-Y" not in m.routes and "to_x" in m.failures["C-Y"]


def test_schedule_from_blocks_names_the_file(tmp_path):
    with pytest.raises(ScheduleError, match=r"^/.*plant\.dxf: no --circuits"):
        rows_from_equipment([], str(tmp_path / "plant.dxf"))


# --------------------------------------------------------------------------- layers


def test_containment_words_in_other_languages():
    """Each suggestion's method is contract.md's for its containment."""
    cases = {
        "E-KABELTRASSE": "tray", "Kabelrinne_NSHV": "tray", "Kabelleiter": "ladder", "Leerrohr": "conduit",
        "Kabelkanal": "conduit", "Kabelschutzrohr": "duct", "Kabelgraben": "buried",
        "Chemin de câbles": "tray", "Échelle à câbles": "ladder", "Gaine": "conduit", "Tranchée": "buried",
        "Bandeja": "tray", "Escalera": "ladder", "Tubo": "conduit", "Zanja": "buried",
        "Passerella": "tray", "Canalina": "conduit", "CableTray": "tray", "E-TRUNKING": "conduit",
    }
    for name, kind in cases.items():
        s = suggest_containment(name)
        assert s is not None and s.containment == kind, name
        assert s.method == CONTRACT_METHOD[kind]
    for name in ("WALLS", "E-CONDUCTORS", "Schutzleiter", "TEXT"):
        assert suggest_containment(name) is None, name


def test_layers_on_the_sample_drawing(tmp_path, capsys):
    code, out, _ = run_cli(capsys, "layers", str(SAMPLE), "--json")
    assert code == 0
    doc = json.loads(out)
    layers = {entry["name"]: entry for entry in doc["layers"]}
    for name, (kind, method) in DEFAULT_ROUTE_LAYERS.items():
        if name in layers:
            assert layers[name]["suggested"]["containment"] == kind and layers[name]["suggested"]["method"] == method
    assert layers["WALLS"]["suggested"] is None
    assert doc["units"]["insunits"] == 4 and doc["scale"]["plausible"] is True
    assert doc["tagged_inserts"] >= 1 and any("TAG" in b["attributes"] for b in doc["blocks"])
    code, text, _ = run_cli(capsys, "layers", str(SAMPLE))
    assert code == 0
    assert any(line.startswith("ROUTE-LADDER") and "ladder (E)" in line for line in text.splitlines())
    cfg = tmp_path / "start.toml"
    assert run_cli(capsys, "layers", str(SAMPLE), "--write-config", str(cfg))[0] == 0
    code, _, _ = run_cli(capsys, "size", str(SAMPLE), "--circuits", str(SAMPLE_CIRCUITS), "--config", str(cfg),
                         "--out", str(tmp_path / "out"))
    assert code in (0, 1) and (tmp_path / "out" / "schedule.json").exists()


GERMAN = {"spine": "E-Kabeltrasse", "a": "Kabelleiter", "b": "Leerrohr", "c": "Kabelgraben"}
LATIN = {"spine": "Chemin de câbles", "a": "Escalera", "b": "Canalina", "c": "Zanja"}


@pytest.mark.parametrize(("names", "tagged", "insunits"), [(GERMAN, True, 0), (LATIN, False, 4)])
def test_layers_config_sizes_a_foreign_drawing(tmp_path, capsys, names, tagged, insunits):
    """Foreign layer names: ``layers`` suggests each containment, and its config sizes the circuits.

    The German plan is unitless and tags its blocks in a ``BMK`` attribute; the
    French/Spanish/Italian one draws its equipment as circles with a text beside.
    """
    path = plant(tmp_path / "plan.dxf", insunits=insunits, unit_per_m=1000.0, layers=names, tagged=tagged,
                 tag_attribute="BMK")
    csv = schedule(tmp_path / "c.csv")
    # as drawn, nothing is a route layer
    code, _, err = run_cli(capsys, "routes", str(path), "--circuits", str(csv), "--units", "mm")
    assert code == 2 and "no route entities" in err
    code, out, _ = run_cli(capsys, "layers", str(path), "--json")
    assert code == 0
    doc = json.loads(out)
    layers = {entry["name"]: entry for entry in doc["layers"]}
    want = {"spine": "tray", "a": "ladder", "b": "conduit", "c": "buried"}
    for role, name in names.items():
        assert layers[name]["suggested"]["containment"] == want[role]
    lengths = {name: layers[name]["line_length"] / 1000.0 for name in names.values()}  # mm -> m
    assert lengths == pytest.approx({names["spine"]: 40.0, names["a"]: 8.0, names["b"]: 6.0, names["c"]: 4.0})
    if insunits == 0:
        assert doc["units"]["likely"][0] == "mm"  # 40 000 units across, pieces of thousands: mm
    cfg = tmp_path / "start.toml"
    assert run_cli(capsys, "layers", str(path), "--write-config", str(cfg))[0] == 0
    text = cfg.read_text(encoding="utf-8")
    assert ("tags_from_text = true" in text) == (not tagged)
    assert ('tag_attribute = "BMK"' in text) == tagged
    assert ('tag_symbol_layers = ["EQUIP"]' in text) == (not tagged)
    out_dir = tmp_path / "out"
    code, _, err = run_cli(capsys, "size", str(path), "--circuits", str(csv), "--config", str(cfg),
                           "--out", str(out_dir))
    assert code in (0, 1), err
    circuits = {c["id"]: c for c in json.loads((out_dir / "schedule.json").read_text(encoding="utf-8"))["circuits"]}
    for role in "abc":
        c = circuits[f"C-{role.upper()}"]
        assert c["route"]["routed_length_m"] == pytest.approx(expected_length_m(role), abs=0.01)
        assert c["cable"] is not None
    # every layer's segments carry contract.md's method for the suggested containment
    from cablewright.config import load_settings
    from cablewright.pipeline import drawing_config

    m = measure(path, csv, drawing_config(load_settings(cfg)))
    methods = {seg.layer: seg.method for seg in m.segments.values()}
    for role, name in names.items():
        assert methods[name.upper()] == CONTRACT_METHOD[want[role]], name


def test_write_config_never_over_an_input(tmp_path, capsys):
    path = plant(tmp_path / "plan.dxf", insunits=4, unit_per_m=1000.0, layers=GERMAN)
    before = path.read_bytes()
    code, _, err = run_cli(capsys, "layers", str(path), "--write-config", str(path))
    assert code == 2 and "input" in err and path.read_bytes() == before


def test_layers_on_an_unreadable_file_is_exit_2(tmp_path, capsys):
    bad = tmp_path / "bad.dxf"
    bad.write_text("not a drawing", encoding="utf-8")
    code, _, err = run_cli(capsys, "layers", str(bad))
    assert code == 2 and "bad.dxf" in err and "Traceback" not in err
    with pytest.raises(DrawingReadError):
        read_dxf(bad)
    assert UNIT_TO_M["dm"] == 0.1


def test_positions_in_the_schedule_of_an_ifc_model_are_reported(tmp_path):
    pytest.importorskip("ifcopenshell")
    lines = SAMPLE_CIRCUITS.read_text(encoding="utf-8").splitlines()
    csv = tmp_path / "c.csv"
    csv.write_text("\n".join([lines[0] + ",to_x,to_y"] + [lines[1] + ",1000,2000"] + lines[2:]) + "\n",
                   encoding="utf-8")
    m = measure(SAMPLE.with_suffix(".ifc"), csv)
    assert any(i.code == "schedule-position" and "IFC" in i.message for i in m.issues)


def test_new_drawing_keys_default_as_the_contract_says(tmp_path):
    """contract.md, Extensions: tags_from_text false, tag_text_max_m 1.0; the default file agrees."""
    from cablewright.core.errors import ConfigError

    from cablewright.config import DEFAULT_CONFIG, load_settings
    from cablewright.pipeline import drawing_config

    cfg = drawing_config(load_settings(DEFAULT_CONFIG))
    assert (cfg.tags_from_text, cfg.tag_text_max_m, cfg.tag_symbol_layers) == (False, 1.0, ())
    assert cfg == DrawingConfig()
    bad = tmp_path / "bad.toml"
    for text in ('tags_from_text = "yes"', "tag_text_max_m = -1", 'tag_symbol_layers = "EQUIP"'):
        bad.write_text(f"[drawing]\n{text}\n", encoding="utf-8")
        with pytest.raises(ConfigError, match="bad.toml"):
            drawing_config(load_settings(bad))


def test_a_spline_inside_a_block_on_a_route_layer(tmp_path, capsys):
    """Layer-0 curves of a block take the reference's layer, as lines do (contract: blocks exploded)."""
    doc = ezdxf.new("R2018")
    doc.header["$INSUNITS"] = 6
    blk = doc.blocks.new("RUN")
    blk.add_spline(dxfattribs={"layer": "0"}).set_open_uniform([(0, 0), (2, 0), (4, 0), (7, 0)])
    doc.modelspace().add_blockref("RUN", (10, 5), dxfattribs={"layer": "ROUTE-TRAY", "rotation": 90})
    doc.saveas(tmp_path / "nested.dxf")
    (piece,) = read_dxf(tmp_path / "nested.dxf").polylines
    assert LineString(piece.points_m).length == pytest.approx(7.0)
    assert piece.points_m[-1][:2] == pytest.approx((10.0, 12.0))  # rotated 90 degrees about (10, 5)
    code, out, _ = run_cli(capsys, "layers", str(tmp_path / "nested.dxf"), "--json")
    assert code == 0
    layers = {entry["name"]: entry for entry in json.loads(out)["layers"]}
    assert layers["ROUTE-TRAY"]["line_length_m"] == pytest.approx(7.0)


def test_routes_json_records_the_units(tmp_path, capsys):
    path = plant(tmp_path / "dm.dxf", insunits=14, unit_per_m=10.0,
                 layers={"spine": "ROUTE-TRAY", "a": "ROUTE-TRAY", "b": "ROUTE-TRAY", "c": "ROUTE-TRAY"})
    code, out, _ = run_cli(capsys, "routes", str(path), "--circuits", str(schedule(tmp_path / "c.csv")), "--json")
    assert code == 0
    doc = json.loads(out)
    assert doc["drawing"]["units"] == "dm" and doc["drawing"]["units_source"] == "header"
    routed = {c["id"]: c["route"]["routed_length_m"] for c in doc["circuits"]}
    assert routed["C-C"] == pytest.approx(expected_length_m("c"), abs=0.01)
