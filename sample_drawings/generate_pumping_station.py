"""Generate the sample drawing: a municipal water pumping station (invented demo data).

Writes, next to this script:

* ``pumping_station.dxf`` - plan in millimetres ($INSUNITS = 4): switchroom (MSB-1,
  MCC-1), pump hall (four pumps, a ventilation fan, sub-board DB-2), dosing room
  (a dosing skid block holding two nested pump blocks, a mixer), an upper-floor
  control room (z = +4.5 m) reached by a vertical ladder riser, and two outdoor valve
  chambers reached by a duct bank and a buried run.  Tray, ladder, conduit (with an
  arc), clipped-direct, duct and buried routes; tees; a 20 mm snap gap; and one tray
  crossing the main tray at the same level in plan, which must NOT join it.
* ``pumping_station_circuits.csv`` and ``.xlsx`` - the circuit schedule (contract.md columns).
* ``pumping_station_expected.json`` - routed length of every circuit computed here from
  the coordinates placed, independently of the extraction code: the sum of the straight
  (and one arc) lengths along the path this script knows each circuit takes, plus the
  two straight 3D tails.  The script checks by brute force that each equipment's
  nearest route point is the attachment point it assumes.

Every value here is invented for the demonstration.  Run:
``python sample_drawings/generate_pumping_station.py``.
"""

from __future__ import annotations

import csv
import json
import math
from pathlib import Path

import ezdxf
import openpyxl
from ezdxf.enums import TextEntityAlignment

HERE = Path(__file__).resolve().parent
MM = 0.001  # metres per drawing unit

TRAY_Z = 3000.0  # ground-floor tray level [mm]
UPPER_FLOOR_Z = 4500.0  # control room floor [mm]
UPPER_TRAY_Z = 7200.0  # control room tray level [mm]
DUCT_Z = -800.0  # duct bank / buried cable depth [mm]

# --------------------------------------------------------------------------- points [mm]
P = {
    "A": (2000.0, 6000.0, TRAY_Z),  # west end of the switchroom ladder
    "MSB_A": (3000.0, 6000.0, TRAY_Z),
    "MCC_A": (9000.0, 6000.0, TRAY_Z),
    "RIS_B": (12000.0, 6000.0, TRAY_Z),  # riser foot, a tee on the ladder
    "B1": (14980.0, 6000.0, TRAY_Z),  # ladder end: 20 mm snap gap to B
    "B": (15000.0, 6000.0, TRAY_Z),  # main tray start
    "X20": (20000.0, 6000.0, TRAY_Z),
    "X27": (27000.0, 6000.0, TRAY_Z),
    "X34": (34000.0, 6000.0, TRAY_Z),
    "X41": (41000.0, 6000.0, TRAY_Z),
    "X43": (43000.0, 6000.0, TRAY_Z),
    "C": (45000.0, 6000.0, TRAY_Z),  # main tray end, dosing room door
    "P101_A": (20000.0, 14000.0, TRAY_Z),
    "P102_A": (27000.0, 14000.0, TRAY_Z),
    "P103_A": (34000.0, 14000.0, TRAY_Z),
    "P104_A": (41000.0, 14000.0, TRAY_Z),
    "TN1": (34000.0, 18000.0, TRAY_Z),
    "TX_N": (30500.0, 18000.0, TRAY_Z),
    "TX_FAN": (30500.0, 2000.0, TRAY_Z),
    "TX_S": (30500.0, 1000.0, TRAY_Z),
    "RIS_T": (12000.0, 6000.0, UPPER_TRAY_Z),
    "CR1": (12000.0, 20000.0, UPPER_TRAY_Z),
    "AC_A": (9000.0, 20000.0, UPPER_TRAY_Z),
    "CP_A": (5000.0, 20000.0, UPPER_TRAY_Z),
    "TE_N": (43000.0, 20000.0, TRAY_Z),
    "DU1": (43000.0, 20000.0, DUCT_Z),
    "DU2": (43000.0, 32000.0, DUCT_Z),
    "SOVC1_A": (74000.0, 32000.0, DUCT_Z),
    "VC1": (75000.0, 32000.0, DUCT_Z),
    "VC2": (140000.0, 32000.0, DUCT_Z),
    "CD1": (52000.0, 6000.0, TRAY_Z),
    "CD2": (55000.0, 9000.0, TRAY_Z),  # end of the quarter arc, centre (52000, 9000)
    "DP2_A": (55000.0, 9500.0, TRAY_Z),
    "DP1_A": (55000.0, 11000.0, TRAY_Z),
    "CL1": (45000.0, 1000.0, TRAY_Z),
    "LTDR_A": (50000.0, 1000.0, TRAY_Z),
    "MX_A": (58000.0, 1000.0, TRAY_Z),
}
ARC_CENTRE = (52000.0, 9000.0)
ARC_RADIUS = 3000.0
ARC_LENGTH = math.pi / 2 * ARC_RADIUS  # quarter circle, CD1 -> CD2, counter-clockwise

# --------------------------------------------------------------------------- equipment
# tag: (block, position [mm], attach point name, circuit attributes or None)
# DP-1 and DP-2 are placed through the nested DOSING-SKID block (see below).
EQUIPMENT = {
    "MSB-1": ("SWITCHBOARD", (3000.0, 4500.0, 0.0), "MSB_A"),
    "MCC-1": ("SWITCHBOARD", (9000.0, 4500.0, 0.0), "MCC_A"),
    "DB-2": ("DISTBOARD", (30500.0, 19000.0, 1500.0), "TX_N"),
    "CP-1": ("PANEL", (5000.0, 21000.0, UPPER_FLOOR_Z), "CP_A"),
    "AC-1": ("MOTOR", (9000.0, 21500.0, 6500.0), "AC_A"),
    "P-101": ("MOTOR", (21200.0, 14000.0, 500.0), "P101_A"),
    "P-102": ("MOTOR", (28200.0, 14000.0, 500.0), "P102_A"),
    "P-103": ("MOTOR", (35200.0, 14000.0, 500.0), "P103_A"),
    "P-104": ("MOTOR", (39800.0, 14000.0, 500.0), "P104_A"),
    "FAN-1": ("MOTOR", (30500.0, 2000.0, 4000.0), "TX_FAN"),
    "LT-PH": ("LIGHT", (30500.0, 500.0, 3500.0), "TX_S"),
    "SO-PH": ("SOCKET", (36000.0, 19000.0, 1200.0), "TN1"),
    "MX-1": ("MOTOR", (58000.0, 0.0, 1200.0), "MX_A"),
    "LT-DR": ("LIGHT", (50000.0, 0.0, 2800.0), "LTDR_A"),
    "MOV-1": ("VALVE", (75000.0, 33000.0, -1500.0), "VC1"),
    "SO-VC1": ("SOCKET", (74000.0, 33000.0, -1500.0), "SOVC1_A"),
    "LT-VC2": ("LIGHT", (140000.0, 33000.0, -1500.0), "VC2"),
    "SP-1": ("MOTOR", (141000.0, 31000.0, -1500.0), "VC2"),
}
SKID_INSERT = (55500.0, 10000.0, 0.0)  # DOSING-SKID, rotated 90 degrees
SKID_CHILDREN = {  # tag: local position in the skid block [mm], attach point
    "DP-1": ((1000.0, -500.0, 1000.0), "DP1_A"),
    "DP-2": ((-500.0, -500.0, 1000.0), "DP2_A"),
}


def skid_world(local: tuple[float, float, float]) -> tuple[float, float, float]:
    """World position of a point of the skid block (rotation 90 degrees, no scale)."""
    x, y, z = local
    return (SKID_INSERT[0] - y, SKID_INSERT[1] + x, SKID_INSERT[2] + z)


# --------------------------------------------------------------------------- circuits
V3, V1 = "400", "230"
COMMON = {"conductor": "Cu", "insulation": "XLPE", "fault_ka": ""}
# circuit, from, to, load, pf, eff, voltage, phases, load_type, cores, vd%, fault kA, path
CIRCUITS = [
    ("F-MCC1", "MSB-1", "MCC-1", "450 kVA", "0.85", "", V3, "3", "feeder", "4", "", "36",
     ["MSB_A", "MCC_A"]),
    ("F-DB2", "MSB-1", "DB-2", "45 kW", "0.9", "", V3, "3", "feeder", "4", "", "36",
     ["MSB_A", "B1", "B", "X34", "P103_A", "TN1", "TX_N"]),
    ("F-CP1", "MSB-1", "CP-1", "10 kW", "0.9", "", V3, "3", "general", "", "", "36",
     ["MSB_A", "RIS_B", "RIS_T", "CR1", "AC_A", "CP_A"]),
    ("F-AC1", "MSB-1", "AC-1", "7.5 kW", "0.85", "0.9", V3, "3", "motor", "", "", "36",
     ["MSB_A", "RIS_B", "RIS_T", "CR1", "AC_A"]),
    ("P-101", "MCC-1", "P-101", "75 kW", "0.86", "0.95", V3, "3", "motor", "", "", "25",
     ["MCC_A", "B1", "B", "X20", "P101_A"]),
    ("P-102", "MCC-1", "P-102", "75 kW", "0.86", "0.95", V3, "3", "motor", "", "", "25",
     ["MCC_A", "B1", "B", "X27", "P102_A"]),
    ("P-103", "MCC-1", "P-103", "100 hp", "0.87", "0.95", V3, "3", "motor", "", "", "25",
     ["MCC_A", "B1", "B", "X34", "P103_A"]),
    ("P-104", "MCC-1", "P-104", "40 hp", "0.85", "0.93", V3, "3", "motor", "", "", "25",
     ["MCC_A", "B1", "B", "X41", "P104_A"]),
    ("FAN-1", "MCC-1", "FAN-1", "7.5 kW", "0.84", "0.9", V3, "3", "motor", "", "", "25",
     ["MCC_A", "B1", "B", "X34", "P103_A", "TN1", "TX_N", "TX_FAN"]),
    ("DP-1", "MCC-1", "DP-1", "1.5 hp", "0.8", "0.82", V3, "3", "motor", "", "", "25",
     ["MCC_A", "B1", "B", "C", "CD1", "ARC", "CD2", "DP2_A", "DP1_A"]),
    ("DP-2", "MCC-1", "DP-2", "2 kW", "0.8", "0.84", V3, "3", "motor", "", "", "25",
     ["MCC_A", "B1", "B", "C", "CD1", "ARC", "CD2", "DP2_A"]),
    ("MX-1", "MCC-1", "MX-1", "4 kW", "0.82", "0.88", V3, "3", "motor", "", "", "25",
     ["MCC_A", "B1", "B", "C", "CL1", "LTDR_A", "MX_A"]),
    ("MOV-1", "MCC-1", "MOV-1", "0.75 kW", "0.8", "", V3, "3", "motor", "", "", "25",
     ["MCC_A", "B1", "B", "X43", "TE_N", "DU1", "DU2", "SOVC1_A", "VC1"]),
    ("SP-1", "MCC-1", "SP-1", "30 kW", "0.85", "0.92", V3, "3", "motor", "", "", "25",
     ["MCC_A", "B1", "B", "X43", "TE_N", "DU1", "DU2", "SOVC1_A", "VC1", "VC2"]),
    ("L-01", "DB-2", "LT-PH", "2.4 kW", "0.95", "", V1, "1", "lighting", "", "3", "6",
     ["TX_N", "TX_FAN", "TX_S"]),
    ("S-01", "DB-2", "SO-PH", "16 A", "0.9", "", V1, "1", "general", "", "", "6",
     ["TX_N", "TN1"]),
    ("L-02", "DB-2", "LT-VC2", "10 A", "0.95", "", V1, "1", "lighting", "", "3", "6",
     ["TX_N", "TN1", "P103_A", "X34", "X43", "TE_N", "DU1", "DU2", "SOVC1_A", "VC1", "VC2"]),
    ("S-02", "DB-2", "SO-VC1", "16 A", "0.9", "", V1, "1", "general", "", "", "6",
     ["TX_N", "TN1", "P103_A", "X34", "X43", "TE_N", "DU1", "DU2", "SOVC1_A"]),
    ("L-03", "DB-2", "LT-DR", "0.8 kW", "0.95", "", V1, "1", "lighting", "", "3", "6",
     ["TX_N", "TN1", "P103_A", "X34", "C", "CL1", "LTDR_A"]),
]
COLUMNS = ["circuit", "from", "to", "load", "power_factor", "efficiency", "voltage", "phases",
           "load_type", "conductor", "insulation", "cores", "vd_limit_pct", "fault_ka",
           "starter", "curve", "clearing_time_s"]
# Device data of some circuits (invented for the demo): the switchboard's feeders
# have time-delayed (selective) breakers, so their cables must withstand the fault
# for the delay; the large pumps start star-delta; the fan, mixer and sump pump run
# on drives behind type B breakers; the valve actuator has a D-curve breaker, which
# the long run to the valve chamber cannot trip in time on 1.5 mm² (the default
# disconnection upsizing raises it two sizes; with disconnection_upsize = false it fails).
DEVICE_DATA = {
    "F-MCC1": ("", "", "0.3"),
    "F-DB2": ("", "", "0.2"),
    "P-101": ("star_delta", "", ""),
    "P-102": ("star_delta", "", ""),
    "P-103": ("star_delta", "", ""),
    "FAN-1": ("drive", "B", ""),
    "MX-1": ("drive", "B", ""),
    "SP-1": ("drive", "B", ""),
    "MOV-1": ("dol", "D", ""),
}


def schedule_rows() -> list[list[str]]:
    rows = []
    for c in CIRCUITS:
        cid, src, dst, load, pf, eff, volt, ph, lt, cores, vd, fka, _ = c
        rows.append([cid, src, dst, load, pf, eff, volt, ph, lt, "Cu", "XLPE", cores, vd, fka,
                     *DEVICE_DATA.get(cid, ("", "", ""))])
    return rows


# --------------------------------------------------------------------------- routes
def route_entities():
    """(kind, layer, data) of every route entity drawn; kind in line/lw/poly3d/poly2d/block."""
    p = P
    bulge = math.tan(math.radians(90.0) / 4.0)  # quarter arc, counter-clockwise
    return [
        ("line", "ROUTE-LADDER", (p["A"], p["B1"])),  # switchroom ladder
        ("line", "ROUTE-LADDER", (p["RIS_B"], p["RIS_T"])),  # vertical riser
        ("line", "ROUTE-TRAY", (p["B"], p["C"])),  # main pump hall tray
        ("line", "ROUTE-TRAY", (p["X20"], p["P101_A"])),  # pump branches (tees)
        ("line", "ROUTE-TRAY", (p["X27"], p["P102_A"])),
        ("line", "ROUTE-TRAY", (p["X34"], p["P103_A"])),
        ("line", "ROUTE-TRAY", (p["X41"], p["P104_A"])),
        ("lw", "ROUTE-TRAY", ([p["P103_A"], p["TN1"], p["TX_N"]], [0, 0, 0], TRAY_Z)),
        # crossing tray: crosses the main tray at (30500, 6000) at the same level, no joint
        ("line", "ROUTE-TRAY", (p["TX_N"], p["TX_S"])),
        ("lw", "ROUTE-TRAY", ([p["RIS_T"], p["CR1"], p["CP_A"]], [0, 0, 0], UPPER_TRAY_Z)),
        ("block", "ROUTE-TRAY", (p["X43"], 14000.0)),  # east branch, drawn as a block
        ("poly3d", "ROUTE-DUCT", [p["TE_N"], p["DU1"], p["DU2"], p["VC1"]]),
        ("poly2d", "ROUTE-BURIED", ([p["VC1"], p["VC2"]], DUCT_Z)),
        ("lw", "ROUTE-CONDUIT", ([p["C"], p["CD1"], p["CD2"], p["DP1_A"]], [0, bulge, 0, 0], TRAY_Z)),
        ("lw", "ROUTE-CLIPPED", ([p["C"], p["CL1"], p["MX_A"]], [0, 0, 0], TRAY_Z)),
    ]


def route_pieces_for_check():
    """Straight pieces and the arc, for the brute-force nearest-point check [mm]."""
    p = P
    lines = [
        (p["A"], p["B1"]), (p["RIS_B"], p["RIS_T"]), (p["B"], p["C"]),
        (p["X20"], p["P101_A"]), (p["X27"], p["P102_A"]), (p["X34"], p["P103_A"]),
        (p["X41"], p["P104_A"]), (p["P103_A"], p["TN1"]), (p["TN1"], p["TX_N"]),
        (p["TX_N"], p["TX_S"]), (p["RIS_T"], p["CR1"]), (p["CR1"], p["CP_A"]),
        (p["X43"], p["TE_N"]), (p["TE_N"], p["DU1"]), (p["DU1"], p["DU2"]), (p["DU2"], p["VC1"]),
        (p["VC1"], p["VC2"]), (p["C"], p["CD1"]), (p["CD2"], p["DP1_A"]),
        (p["C"], p["CL1"]), (p["CL1"], p["MX_A"]),
    ]
    arc = [
        (ARC_CENTRE[0] + ARC_RADIUS * math.cos(a), ARC_CENTRE[1] + ARC_RADIUS * math.sin(a), TRAY_Z)
        for a in (-math.pi / 2 + (math.pi / 2) * k / 2000 for k in range(2001))
    ]
    return lines, arc


def _nearest_on_segment(q, a, b):
    ab = [b[i] - a[i] for i in range(3)]
    l2 = sum(v * v for v in ab)
    t = 0.0 if l2 == 0 else max(0.0, min(1.0, sum((q[i] - a[i]) * ab[i] for i in range(3)) / l2))
    pt = tuple(a[i] + t * ab[i] for i in range(3))
    return math.dist(q, pt), pt


def check_attachment(tag: str, pos, attach_name: str) -> float:
    """Brute force: the nearest route point to ``pos`` is P[attach_name]; return the tail [mm]."""
    lines, arc = route_pieces_for_check()
    best = min([_nearest_on_segment(pos, a, b) for a, b in lines] + [(math.dist(pos, q), q) for q in arc])
    want = P[attach_name]
    if math.dist(best[1], want) > 1.0:
        raise AssertionError(f"{tag}: nearest route point {best[1]} is not {attach_name} {want}")
    return math.dist(pos, want)


def path_length_mm(path: list[str]) -> float:
    total = 0.0
    for a, b in zip(path[:-1], path[1:], strict=True):
        if "ARC" in (a, b):
            continue
        total += math.dist(P[a], P[b])
    if "ARC" in path:
        total += ARC_LENGTH
    return total


# --------------------------------------------------------------------------- drawing
def make_blocks(doc) -> None:
    def attdefs(blk, y0: float) -> None:
        blk.add_attdef("TAG", (0, y0), dxfattribs={"height": 300, "layer": "EQUIPMENT"})
        for k, name in enumerate(("CIRCUIT", "FROM", "LOAD", "VOLTAGE", "PHASES", "LOAD_TYPE")):
            a = blk.add_attdef(name, (0, y0 - 400 * (k + 1)), dxfattribs={"height": 200})
            a.is_invisible = True

    sb = doc.blocks.new("SWITCHBOARD")
    sb.add_lwpolyline([(-2000, -400), (2000, -400), (2000, 400), (-2000, 400)], close=True,
                      dxfattribs={"layer": "EQUIPMENT"})
    attdefs(sb, -900)
    db = doc.blocks.new("DISTBOARD")
    db.add_lwpolyline([(-600, -200), (600, -200), (600, 200), (-600, 200)], close=True,
                      dxfattribs={"layer": "EQUIPMENT"})
    attdefs(db, 400)
    pn = doc.blocks.new("PANEL")
    pn.add_lwpolyline([(-800, -300), (800, -300), (800, 300), (-800, 300)], close=True,
                      dxfattribs={"layer": "EQUIPMENT"})
    attdefs(pn, 500)
    mo = doc.blocks.new("MOTOR")
    mo.add_circle((0, 0), 400, dxfattribs={"layer": "EQUIPMENT"})
    mo.add_text("M", height=400, dxfattribs={"layer": "EQUIPMENT"}).set_placement(
        (0, 0), align=TextEntityAlignment.MIDDLE_CENTER)
    attdefs(mo, 600)
    lt = doc.blocks.new("LIGHT")
    lt.add_circle((0, 0), 250, dxfattribs={"layer": "EQUIPMENT"})
    lt.add_line((-180, -180), (180, 180), dxfattribs={"layer": "EQUIPMENT"})
    lt.add_line((-180, 180), (180, -180), dxfattribs={"layer": "EQUIPMENT"})
    attdefs(lt, 400)
    so = doc.blocks.new("SOCKET")
    so.add_arc((0, 0), 250, 0, 180, dxfattribs={"layer": "EQUIPMENT"})
    so.add_line((-250, 0), (250, 0), dxfattribs={"layer": "EQUIPMENT"})
    attdefs(so, 400)
    va = doc.blocks.new("VALVE")
    va.add_lwpolyline([(-300, -200), (300, 200), (300, -200), (-300, 200)], close=True,
                      dxfattribs={"layer": "EQUIPMENT"})
    attdefs(va, 400)
    # dosing skid: a frame holding two small pumps as nested tagged blocks
    skid = doc.blocks.new("DOSING-SKID")
    skid.add_lwpolyline([(-1200, -1000), (1600, -1000), (1600, 0), (-1200, 0)], close=True,
                        dxfattribs={"layer": "EQUIPMENT"})
    for tag, (local, _) in SKID_CHILDREN.items():
        ref = skid.add_blockref("MOTOR", local, dxfattribs={"xscale": 0.6, "yscale": 0.6, "zscale": 0.6})
        ref.add_auto_attribs(_attribs_for(tag))
    # a straight tray run drawn as a block on layer 0 (takes the reference's layer)
    run = doc.blocks.new("TRAY-RUN-14M")
    run.add_line((0, 0, 0), (0, 14000, 0), dxfattribs={"layer": "0"})


def _attribs_for(tag: str) -> dict[str, str]:
    out = {"TAG": tag}
    for c in CIRCUITS:
        if c[2] == tag:
            out.update({"CIRCUIT": c[0], "FROM": c[1], "LOAD": c[3], "VOLTAGE": c[6],
                        "PHASES": c[7], "LOAD_TYPE": c[8]})
    return out


def draw(path: Path) -> None:
    doc = ezdxf.new("R2018", setup=True)
    doc.header["$INSUNITS"] = 4  # millimetres
    layers = {
        "WALLS": 8, "TEXT": 7, "EQUIPMENT": 5, "ROUTE-TRAY": 1, "ROUTE-LADDER": 6,
        "ROUTE-CONDUIT": 3, "ROUTE-CLIPPED": 4, "ROUTE-DUCT": 30, "ROUTE-BURIED": 34,
    }
    for name, color in layers.items():
        doc.layers.add(name, color=color)
    msp = doc.modelspace()
    make_blocks(doc)

    rooms = [
        ("SWITCHROOM", (0, 0), (15000, 12000)),
        ("PUMP HALL", (15000, 0), (45000, 21000)),
        ("DOSING ROOM", (45000, -1000), (60000, 12000)),
        ("CONTROL ROOM (LEVEL +4.5 m)", (0, 14000), (15000, 26000)),
        ("VALVE CHAMBER VC-1", (72000, 30000), (78000, 35000)),
        ("VALVE CHAMBER VC-2", (137000, 30000), (143000, 35000)),
    ]
    for name, (x0, y0), (x1, y1) in rooms:
        msp.add_lwpolyline([(x0, y0), (x1, y0), (x1, y1), (x0, y1)], close=True,
                           dxfattribs={"layer": "WALLS", "const_width": 200})
        msp.add_text(name, height=600, dxfattribs={"layer": "TEXT"}).set_placement(
            ((x0 + x1) / 2, y1 - 1200), align=TextEntityAlignment.MIDDLE_CENTER)
    msp.add_text("DUCT BANK", height=500, dxfattribs={"layer": "TEXT"}).set_placement(
        (58000, 32600), align=TextEntityAlignment.MIDDLE_CENTER)
    msp.add_text("BURIED CABLE", height=500, dxfattribs={"layer": "TEXT"}).set_placement(
        (108000, 32600), align=TextEntityAlignment.MIDDLE_CENTER)
    msp.add_text("MUNICIPAL WATER PUMPING STATION - CABLE ROUTES (DEMO, INVENTED DATA)",
                 height=900, dxfattribs={"layer": "TEXT"}).set_placement((0, -4000))

    for kind, layer, data in route_entities():
        attrs = {"layer": layer}
        if kind == "line":
            msp.add_line(data[0], data[1], dxfattribs=attrs)
        elif kind == "lw":
            pts, bulges, z = data
            msp.add_lwpolyline([(x, y, b) for (x, y, _), b in zip(pts, bulges, strict=True)],
                               format="xyb", dxfattribs={**attrs, "elevation": z})
        elif kind == "poly3d":
            msp.add_polyline3d(data, dxfattribs=attrs)
        elif kind == "poly2d":
            pts, z = data
            msp.add_polyline2d([(x, y) for x, y, _ in pts], dxfattribs={**attrs, "elevation": (0, 0, z)})
        elif kind == "block":
            start, _ = data
            msp.add_blockref("TRAY-RUN-14M", start, dxfattribs=attrs)

    for tag, (block, pos, _) in EQUIPMENT.items():
        ref = msp.add_blockref(block, pos, dxfattribs={"layer": "EQUIPMENT"})
        ref.add_auto_attribs(_attribs_for(tag))
    msp.add_blockref("DOSING-SKID", SKID_INSERT, dxfattribs={"layer": "EQUIPMENT", "rotation": 90})
    doc.saveas(path)


# --------------------------------------------------------------------------- outputs
def expected() -> dict:
    positions = {tag: pos for tag, (_, pos, _) in EQUIPMENT.items()}
    attach = {tag: a for tag, (_, _, a) in EQUIPMENT.items()}
    for tag, (local, a) in SKID_CHILDREN.items():
        positions[tag] = skid_world(local)
        attach[tag] = a
    tails = {tag: check_attachment(tag, positions[tag], attach[tag]) for tag in positions}
    out = {}
    for c in CIRCUITS:
        cid, src, dst, path = c[0], c[1], c[2], c[-1]
        if path[0] != attach[src] or path[-1] != attach[dst]:
            raise AssertionError(f"{cid}: path must run from {attach[src]} to {attach[dst]}")
        along = path_length_mm(path)
        out[cid] = {
            "from": src,
            "to": dst,
            "source_tail_m": round(tails[src] * MM, 6),
            "load_tail_m": round(tails[dst] * MM, 6),
            "path_m": round(along * MM, 6),
            "routed_length_m": round((tails[src] + along + tails[dst]) * MM, 6),
            "waypoints": path,
        }
    return {
        "drawing": "pumping_station.dxf",
        "note": "invented demo data; lengths computed by the generator from the coordinates it placed",
        "equipment_m": {t: [round(v * MM, 6) for v in p] for t, p in sorted(positions.items())},
        "circuits": out,
    }


def write_schedules(csv_path: Path, xlsx_path: Path) -> None:
    rows = schedule_rows()
    with csv_path.open("w", newline="", encoding="utf-8") as f:
        w = csv.writer(f)
        w.writerow(COLUMNS)
        w.writerows(rows)
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "circuits"
    ws.append([c.upper() if k % 3 == 0 else c for k, c in enumerate(COLUMNS)])  # mixed case headers
    for r in rows:
        ws.append([_num(v) for v in r])
    wb.save(xlsx_path)


def _num(v: str):
    try:
        f = float(v)
    except ValueError:
        return v
    return int(f) if f.is_integer() else f


def main(out_dir: Path = HERE) -> None:
    out_dir.mkdir(parents=True, exist_ok=True)
    exp = expected()  # checks attachments before anything is written
    draw(out_dir / "pumping_station.dxf")
    write_schedules(out_dir / "pumping_station_circuits.csv", out_dir / "pumping_station_circuits.xlsx")
    (out_dir / "pumping_station_expected.json").write_text(json.dumps(exp, indent=2) + "\n")


if __name__ == "__main__":
    main()
