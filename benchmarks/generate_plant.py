"""Generate a synthetic process plant of any size for benchmarks (invented data).

The plant, deterministic from ``--seed``:

* one process area per source (an MCC), areas on both sides of a main cable
  ladder (``ROUTE-LADDER``, the "spine") drawn in 2 m sections at +3.0 m;
* in each area a grid of perforated tray (``ROUTE-TRAY``, 24 m cells, 1.6 m
  sections, all joints end to end) fed from the spine by a ladder whose foot is
  a tee on the spine; the area's MCC stands beside that feeder;
* one branch per load, teed off a tray line: a tray run and a conduit drop
  (``ROUTE-CONDUIT``), a bent clipped run (``ROUTE-CLIPPED``, a bulged
  polyline), a ladder riser to a mezzanine tray at +7.5 m, or a conduit riser
  down to a duct (``ROUTE-DUCT``) or buried run (``ROUTE-BURIED``) at -0.8 m
  for an outdoor load;
* every source and load is a block reference with a ``TAG`` attribute;
* background clutter on non-route layers so the entity count is realistic
  (walls, columns, grid bubbles, room and equipment text, plinth hatches,
  dimensions, valves without a tag, process piping): about 25 model-space
  entities per circuit in total.

Most circuits feed a load of their own area; about 5 % come from the
neighbouring area's MCC, over the spine.  The routed length of every circuit is
computed here from the coordinates placed, independently of the extraction code,
and written to the schedule as the extra column ``expected_routed_m`` (extra
columns are kept and ignored, contract.md "The circuit schedule").

Writes ``plant_<circuits>.dxf`` (millimetres, ``$INSUNITS`` = 4) and
``plant_<circuits>_circuits.csv`` (contract columns).  Every value is invented.

Run: ``python benchmarks/generate_plant.py --circuits 2000 --out DIR``.
"""

from __future__ import annotations

import argparse
import csv
import math
import random
from dataclasses import dataclass
from pathlib import Path

import ezdxf

__all__ = ["PlantFiles", "generate_plant", "main"]

MM_PER_M = 1000.0

#: Grid cell [m], tray section [m], branch reach from the tray line [m].
CELL_M = 24.0
SECTION_M = 1.6
SPINE_SECTION_M = 2.0
BRANCH_M = 2.5
AREA_OFFSET_M = 20.0  # distance from the spine to an area's first tray line
AREA_GAP_M = 30.0  # between areas along the spine
ROWS = 4  # grid cells across an area (ROWS + 1 tray lines carry loads)
LOADS_PER_EDGE = 4  # at 3, 9, 15, 21 m along a 24 m edge (inside a 1.6 m section)
LOAD_OFFSETS_M = (3.0, 9.0, 15.0, 21.0)

TRAY_Z = 3.0
MEZZ_Z = 7.5
DROP_Z = 1.5
GROUND_ROUTE_Z = -0.8
TAIL_DX_M = 0.4  # equipment stands 0.4 m beside, 0.3 m below its route end

#: Model-space entities per circuit the clutter fills up to.
ENTITIES_PER_CIRCUIT = 25

#: IEC 60034-1 style motor ratings [kW] (invented mix of a plant's drives).
MOTOR_KW = (0.37, 0.55, 0.75, 1.1, 1.5, 2.2, 3.0, 4.0, 5.5, 7.5, 11.0, 15.0, 18.5,
            22.0, 30.0, 37.0, 45.0, 55.0)

ROUTE_LAYERS = ("ROUTE-TRAY", "ROUTE-LADDER", "ROUTE-CONDUIT", "ROUTE-CLIPPED",
                "ROUTE-DUCT", "ROUTE-BURIED")
CLUTTER_LAYERS = ("A-WALL", "A-COLS", "A-GRID", "A-TEXT", "A-HATCH", "A-DIMS",
                  "P-PIPE", "P-VALVE", "E-TEXT", "E-SYMB", "E-PLINTH")

SCHEDULE_COLUMNS = ("circuit", "from", "to", "load", "power_factor", "efficiency", "voltage",
                    "phases", "load_type", "conductor", "insulation", "cores", "vd_limit_pct",
                    "fault_ka", "expected_routed_m")


@dataclass(frozen=True)
class PlantFiles:
    """What :func:`generate_plant` wrote.

    Attributes
    ----------
    dxf_path, csv_path : Path
        The drawing and the circuit schedule.
    circuits, sources : int
        Circuits in the schedule, source equipment (MCCs).
    route_pieces : int
        Route entities (LINE / LWPOLYLINE) on route layers.
    entities : int
        Model-space entities (ATTRIBs not counted: they belong to their INSERT).
    """

    dxf_path: Path
    csv_path: Path
    circuits: int
    sources: int
    route_pieces: int
    entities: int


@dataclass(frozen=True)
class _Area:
    index: int
    x0_m: float  # x of the feeder and of the first vertical tray line
    side: int  # +1 above the spine, -1 below
    columns: int
    mezzanine: bool  # loads on the last tray line reach a mezzanine by a riser

    def line_y(self, j: int) -> float:
        return self.side * (AREA_OFFSET_M + j * CELL_M)

    @property
    def source_tag(self) -> str:
        return f"MCC-{self.index + 1:02d}"

    @property
    def source_pos(self) -> tuple[float, float, float]:
        # beside the feeder, half way to the area, on the floor (1.5 m up)
        return (self.x0_m - 1.0, self.side * AREA_OFFSET_M / 2.0, 1.5)

    @property
    def source_to_corner_m(self) -> float:
        # source tail to the feeder, then along the feeder to the area corner
        tail = math.hypot(1.0, TRAY_Z - 1.5)
        return tail + AREA_OFFSET_M / 2.0

    @property
    def source_to_spine_m(self) -> float:
        return math.hypot(1.0, TRAY_Z - 1.5) + AREA_OFFSET_M / 2.0


class _Writer:
    """Adds entities to model space and counts them."""

    def __init__(self, doc) -> None:
        self.doc = doc
        self.msp = doc.modelspace()
        self.route_pieces = 0

    @staticmethod
    def mm(p):
        return tuple(v * MM_PER_M for v in p)

    def line(self, a, b, layer: str) -> None:
        self.msp.add_line(self.mm(a), self.mm(b), dxfattribs={"layer": layer})
        if layer in ROUTE_LAYERS:
            self.route_pieces += 1

    def sections(self, a, b, step_m: float, layer: str) -> None:
        """A straight run drawn as sections of ``step_m`` (the last may be shorter)."""
        length = math.dist(a, b)
        n = max(1, math.ceil(length / step_m - 1e-9))
        pts = [tuple(a[k] + (b[k] - a[k]) * min(i * step_m, length) / length for k in range(3))
               for i in range(n + 1)]
        for p, q in zip(pts[:-1], pts[1:], strict=False):
            self.line(p, q, layer)


def _arc_length_m(chord_m: float, bulge: float) -> float:
    """Arc length of a bulged polyline segment: theta = 4 atan(b), r = c / (2 sin(theta/2)).

    DXF reference, LWPOLYLINE group code 42 (bulge = tan(theta / 4)).
    """
    theta = 4.0 * math.atan(abs(bulge))
    r = chord_m / (2.0 * math.sin(theta / 2.0))
    return r * theta


def _blocks(doc) -> None:
    for name, half in (("CW_MCC", 1.2), ("CW_MOTOR", 0.4), ("CW_LOAD", 0.3), ("CW_DB", 0.5)):
        blk = doc.blocks.new(name)
        s = half * MM_PER_M
        blk.add_lwpolyline([(-s, -s), (s, -s), (s, s), (-s, s)], close=True)
        blk.add_circle((0, 0), s * 0.6)
        blk.add_attdef("TAG", (0, -s * 1.3), dxfattribs={"height": 200})
        blk.add_attdef("DESC", (0, -s * 1.8), dxfattribs={"height": 150})
    valve = doc.blocks.new("CW_VALVE")
    valve.add_lwpolyline([(-150, -100), (150, 100), (150, -100), (-150, 100)], close=True)


def _equipment(w: _Writer, block: str, pos, tag: str, desc: str) -> None:
    ref = w.msp.add_blockref(block, w.mm(pos), dxfattribs={"layer": "E-EQPT"})
    ref.add_auto_attribs({"TAG": tag, "DESC": desc})


def _load_kind(rng: random.Random) -> tuple[str, str, dict[str, str]]:
    """(tag prefix, block, schedule fields) of one invented load."""
    r = rng.random()
    if r < 0.55:
        kw = rng.choice(MOTOR_KW)
        return "M", "CW_MOTOR", {"load": f"{kw:g} kW", "power_factor": f"{rng.choice((0.8, 0.82, 0.85, 0.87)):g}",
                                  "efficiency": f"{rng.choice((0.86, 0.9, 0.92)):g}", "voltage": "400",
                                  "phases": "3", "load_type": "motor"}
    if r < 0.70:
        kw = rng.choice((0.5, 1.0, 1.5, 2.0, 3.0))
        return "L", "CW_LOAD", {"load": f"{kw:g} kW", "power_factor": "0.95", "voltage": "230",
                                "phases": "1", "load_type": "lighting"}
    if r < 0.95:
        kw = rng.choice((2.0, 4.0, 7.5, 10.0, 15.0, 22.0))
        return "G", "CW_LOAD", {"load": f"{kw:g} kW", "power_factor": "0.9", "voltage": "400",
                                "phases": "3", "load_type": "general"}
    kva = rng.choice((25, 40, 63))
    return "DB", "CW_DB", {"load": f"{kva} kVA", "power_factor": "0.85", "voltage": "400",
                           "phases": "3", "load_type": "feeder"}


def _branch(w: _Writer, area: _Area, xt: float, j: int, s: int, style: str) -> tuple[tuple, float]:
    """Draw one load branch teed off tray line j at x = xt, toward side s.

    Returns the equipment position [m] and the route length from the tee to the
    branch end [m] (the tail is added by the caller).
    """
    y = area.line_y(j)
    yb = y + s * BRANCH_M
    if style == "riser":  # ladder up to a mezzanine tray, conduit drop to the load
        w.line((xt, y, TRAY_Z), (xt, y, MEZZ_Z), "ROUTE-LADDER")
        w.line((xt, y, MEZZ_Z), (xt, yb, MEZZ_Z), "ROUTE-TRAY")
        w.line((xt, yb, MEZZ_Z), (xt, yb, MEZZ_Z - DROP_Z), "ROUTE-CONDUIT")
        end = (xt, yb, MEZZ_Z - DROP_Z)
        length = (MEZZ_Z - TRAY_Z) + BRANCH_M + DROP_Z
    elif style in ("duct", "buried"):  # conduit down to a run in the ground, outdoor load
        w.line((xt, y, TRAY_Z), (xt, y, GROUND_ROUTE_Z), "ROUTE-CONDUIT")
        w.line((xt, y, GROUND_ROUTE_Z), (xt, yb, GROUND_ROUTE_Z),
               "ROUTE-DUCT" if style == "duct" else "ROUTE-BURIED")
        end = (xt, yb, GROUND_ROUTE_Z)
        length = (TRAY_Z - GROUND_ROUTE_Z) + BRANCH_M
    elif style == "clipped":  # a bent clipped run: straight 1.2 m then a bulged 1.3 m
        y1 = y + s * 1.2
        bulge = 0.15
        w.msp.add_lwpolyline([(xt * MM_PER_M, y * MM_PER_M, 0.0), (xt * MM_PER_M, y1 * MM_PER_M, bulge),
                              (xt * MM_PER_M, yb * MM_PER_M, 0.0)], format="xyb",
                             dxfattribs={"layer": "ROUTE-CLIPPED", "elevation": TRAY_Z * MM_PER_M})
        w.route_pieces += 1
        w.line((xt, yb, TRAY_Z), (xt, yb, DROP_Z), "ROUTE-CLIPPED")
        end = (xt, yb, DROP_Z)
        length = 1.2 + _arc_length_m(BRANCH_M - 1.2, bulge) + (TRAY_Z - DROP_Z)
    else:  # tray run in two sections, conduit drop
        y1 = y + s * 1.2
        w.line((xt, y, TRAY_Z), (xt, y1, TRAY_Z), "ROUTE-TRAY")
        w.line((xt, y1, TRAY_Z), (xt, yb, TRAY_Z), "ROUTE-TRAY")
        w.line((xt, yb, TRAY_Z), (xt, yb, DROP_Z), "ROUTE-CONDUIT")
        end = (xt, yb, DROP_Z)
        length = BRANCH_M + (TRAY_Z - DROP_Z)
    pos = (end[0] + TAIL_DX_M, end[1], end[2] - 0.3)
    return pos, length + math.dist(pos, end)


def _area_clutter(w: _Writer, area: _Area, rng: random.Random) -> None:
    """Walls, columns, grid bubbles, dimensions and room names of one area."""
    msp = w.msp
    x0, x1 = area.x0_m - 4.0, area.x0_m + area.columns * CELL_M + 4.0
    ya, yb = area.line_y(0) - area.side * 6.0, area.line_y(ROWS) + area.side * 6.0
    y_lo, y_hi = min(ya, yb), max(ya, yb)
    corners = [(x0, y_lo), (x1, y_lo), (x1, y_hi), (x0, y_hi)]
    for a, b in zip(corners, corners[1:] + corners[:1], strict=False):
        # walls drawn as two faces, broken every 12 m by doors and pilasters
        for off in (0.0, 0.3):
            n = max(1, int(math.dist(a, b) // 12.0))
            for i in range(n):
                p = (a[0] + (b[0] - a[0]) * i / n + off, a[1] + (b[1] - a[1]) * i / n + off, 0.0)
                q = (a[0] + (b[0] - a[0]) * (i + 0.9) / n + off, a[1] + (b[1] - a[1]) * (i + 0.9) / n + off, 0.0)
                w.line(p, q, "A-WALL")
    for i in range(area.columns + 1):
        for j in range(ROWS + 1):
            cx, cy = area.x0_m + i * CELL_M + 0.8, area.line_y(j) + 0.8
            sq = [((cx - 0.2) * MM_PER_M, (cy - 0.2) * MM_PER_M), ((cx + 0.2) * MM_PER_M, (cy - 0.2) * MM_PER_M),
                  ((cx + 0.2) * MM_PER_M, (cy + 0.2) * MM_PER_M), ((cx - 0.2) * MM_PER_M, (cy + 0.2) * MM_PER_M)]
            msp.add_lwpolyline(sq, close=True, dxfattribs={"layer": "A-COLS"})
            hatch = msp.add_hatch(color=8, dxfattribs={"layer": "A-HATCH"})
            hatch.paths.add_polyline_path(sq, is_closed=True)
    for i in range(area.columns + 1):
        gx = area.x0_m + i * CELL_M
        msp.add_circle(w.mm((gx, y_hi + 3.0, 0.0)), 600, dxfattribs={"layer": "A-GRID"})
        msp.add_text(str(i + 1), height=500, dxfattribs={"layer": "A-GRID", "insert": w.mm((gx, y_hi + 3.0, 0.0))})
    for j in range(ROWS + 1):
        gy = area.line_y(j)
        msp.add_circle(w.mm((x0 - 3.0, gy, 0.0)), 600, dxfattribs={"layer": "A-GRID"})
        msp.add_text(chr(65 + j), height=500, dxfattribs={"layer": "A-GRID", "insert": w.mm((x0 - 3.0, gy, 0.0))})
    for i in range(min(area.columns, 4)):
        gx = area.x0_m + i * CELL_M
        dim = msp.add_linear_dim(base=w.mm((gx, y_hi + 1.5, 0.0)), p1=w.mm((gx, y_hi, 0.0)),
                                 p2=w.mm((gx + CELL_M, y_hi, 0.0)), dxfattribs={"layer": "A-DIMS"})
        dim.render()
    msp.add_mtext(f"PROCESS AREA {area.index + 1:02d}\\PInvented benchmark plant",
                  dxfattribs={"layer": "A-TEXT", "char_height": 1000,
                              "insert": w.mm((x0 + 2.0, y_hi - 2.0, 0.0))})
    room = msp.add_hatch(color=254, dxfattribs={"layer": "A-HATCH"})
    room.paths.add_polyline_path([w.mm(c + (0.0,))[:2] for c in corners], is_closed=True)
    rng.random()  # keep the stream position independent of the layout above


def _load_clutter(w: _Writer, pos, tag: str, desc: str, rng: random.Random) -> None:
    """Tag text, description, plinth outline and hatch, motor symbol, leader, valve."""
    msp = w.msp
    x, y = pos[0], pos[1]
    msp.add_text(tag, height=250, dxfattribs={"layer": "E-TEXT", "insert": w.mm((x + 0.8, y + 0.6, 0.0))})
    msp.add_mtext(desc, dxfattribs={"layer": "E-TEXT", "char_height": 150,
                                    "insert": w.mm((x + 0.8, y + 0.2, 0.0))})
    pl = [((x - 0.6) * MM_PER_M, (y - 0.6) * MM_PER_M), ((x + 0.6) * MM_PER_M, (y - 0.6) * MM_PER_M),
          ((x + 0.6) * MM_PER_M, (y + 0.6) * MM_PER_M), ((x - 0.6) * MM_PER_M, (y + 0.6) * MM_PER_M)]
    msp.add_lwpolyline(pl, close=True, dxfattribs={"layer": "E-PLINTH"})
    hatch = msp.add_hatch(color=9, dxfattribs={"layer": "E-PLINTH"})
    hatch.set_pattern_fill("ANSI31", scale=20.0)
    hatch.paths.add_polyline_path(pl, is_closed=True)
    msp.add_circle(w.mm((x, y, 0.0)), 350, dxfattribs={"layer": "E-SYMB"})
    w.line((x + 0.35, y, 0.0), (x + 0.8, y + 0.6, 0.0), "E-SYMB")
    if rng.random() < 0.5:
        msp.add_blockref("CW_VALVE", w.mm((x - 1.5, y + 1.0, 0.0)), dxfattribs={"layer": "P-VALVE"})


def generate_plant(out_dir: str | Path, circuits: int = 2000, sources: int | None = None,
                   seed: int = 1, entities_per_circuit: int = ENTITIES_PER_CIRCUIT) -> PlantFiles:
    """Write a synthetic plant drawing and its circuit schedule.

    Parameters
    ----------
    out_dir : str or path
        Folder to write into (created if missing).
    circuits : int
        Circuits in the schedule (one load each), >= 1.
    sources : int, optional
        Source MCCs, one process area each; default ``max(1, round(circuits / 200))``.
    seed : int
        Seed of the loads, styles and clutter; the same seed gives the same drawing.
    entities_per_circuit : int
        Model-space entities per circuit the piping clutter fills up to.

    Returns
    -------
    PlantFiles
        Paths and counts.
    """
    if circuits < 1:
        raise ValueError(f"circuits must be >= 1, not {circuits}")
    n_src = sources or max(1, round(circuits / 200))
    rng = random.Random(seed)
    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    doc = ezdxf.new("R2018", setup=True, units=4)  # $INSUNITS 4 = millimetres
    doc.header["$MEASUREMENT"] = 1
    for name in ROUTE_LAYERS + CLUTTER_LAYERS + ("E-EQPT",):
        doc.layers.add(name)
    _blocks(doc)
    w = _Writer(doc)

    per_area = [circuits // n_src + (1 if a < circuits % n_src else 0) for a in range(n_src)]
    columns = max(1, math.ceil(max(per_area) / (LOADS_PER_EDGE * (ROWS + 1))))
    pitch = columns * CELL_M + AREA_GAP_M
    areas = [_Area(a, (a // 2) * pitch + 3.0, 1 if a % 2 == 0 else -1, columns, a % 3 == 2)
             for a in range(n_src)]

    # spine: 2 m ladder sections along y = 0 past the last feeder
    spine_end = ((n_src - 1) // 2) * pitch + 3.0 + 2.0 * SPINE_SECTION_M
    w.sections((0.0, 0.0, TRAY_Z), (spine_end, 0.0, TRAY_Z), SPINE_SECTION_M, "ROUTE-LADDER")

    for area in areas:
        x0 = area.x0_m
        # feeder: its foot is a tee on the spine (x0 is odd, the spine joints are even)
        w.sections((x0, 0.0, TRAY_Z), (x0, area.line_y(0), TRAY_Z), SECTION_M, "ROUTE-LADDER")
        for j in range(ROWS + 1):
            y = area.line_y(j)
            w.sections((x0, y, TRAY_Z), (x0 + columns * CELL_M, y, TRAY_Z), SECTION_M, "ROUTE-TRAY")
        for i in range(columns + 1):
            x = x0 + i * CELL_M
            w.sections((x, area.line_y(0), TRAY_Z), (x, area.line_y(ROWS), TRAY_Z), SECTION_M, "ROUTE-TRAY")
        _equipment(w, "CW_MCC", area.source_pos, area.source_tag, "motor control centre")
        _area_clutter(w, area, rng)

    rows: list[dict[str, str]] = []
    n = 0
    for area in areas:
        slots = [(j, i, k) for j in range(ROWS + 1) for i in range(columns) for k in range(LOADS_PER_EDGE)]
        for j, i, k in slots[: per_area[area.index]]:
            n += 1
            xt = area.x0_m + i * CELL_M + LOAD_OFFSETS_M[k]
            s = 1 if k % 2 == 0 else -1
            if area.mezzanine and j == ROWS:
                style = "riser"
            else:
                style = {3: "clipped", 7: "duct", 9: "buried"}.get(n % 10, "drop")
            pos, branch_m = _branch(w, area, xt, j, s, style)
            prefix, block, fields = _load_kind(rng)
            tag = f"{prefix}-{n:05d}"
            desc = f"{fields['load_type']} {fields['load']}"
            _equipment(w, block, pos, tag, desc)
            _load_clutter(w, pos, tag, desc, rng)
            # about 5 % fed from the neighbouring area's MCC, over the spine
            src = area
            if n_src > 1 and rng.random() < 0.05:
                src = areas[area.index + 1] if area.index + 1 < n_src else areas[area.index - 1]
            grid_m = (xt - area.x0_m) + abs(area.line_y(j) - area.line_y(0))
            if src is area:
                to_corner = area.source_to_corner_m
            else:
                to_corner = (src.source_to_spine_m + abs(src.x0_m - area.x0_m) + AREA_OFFSET_M)
            row = {c: "" for c in SCHEDULE_COLUMNS}
            row.update(fields)
            row.update({"circuit": f"C-{n:05d}", "from": src.source_tag, "to": tag,
                        "conductor": "Cu", "insulation": "XLPE", "fault_ka": "25",
                        "expected_routed_m": f"{to_corner + grid_m + branch_m:.4f}"})
            rows.append(row)

    # process piping fills the entity budget (never on a route layer)
    target = entities_per_circuit * circuits
    missing = target - len(w.msp)
    span_x = max(spine_end, pitch)
    span_y = AREA_OFFSET_M + ROWS * CELL_M + 10.0
    for _ in range(max(0, missing)):
        x, y = rng.uniform(0.0, span_x), rng.uniform(-span_y, span_y)
        if rng.random() < 0.5:
            w.line((x, y, 0.5), (x + rng.uniform(1.0, 8.0), y, 0.5), "P-PIPE")
        else:
            w.line((x, y, 0.5), (x, y + rng.uniform(1.0, 8.0), 0.5), "P-PIPE")

    dxf_path = out / f"plant_{circuits}.dxf"
    csv_path = out / f"plant_{circuits}_circuits.csv"
    doc.saveas(dxf_path)
    with csv_path.open("w", newline="", encoding="utf-8") as f:
        writer = csv.DictWriter(f, fieldnames=list(SCHEDULE_COLUMNS))
        writer.writeheader()
        writer.writerows(rows)
    return PlantFiles(dxf_path, csv_path, circuits, n_src, w.route_pieces, len(w.msp))


def main(argv: list[str] | None = None) -> int:
    """Command line: ``--circuits N --out DIR [--sources S] [--seed K]``."""
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--circuits", type=int, default=2000)
    parser.add_argument("--sources", type=int, default=None)
    parser.add_argument("--seed", type=int, default=1)
    parser.add_argument("--out", default="plant_out")
    args = parser.parse_args(argv)
    files = generate_plant(args.out, args.circuits, args.sources, args.seed)
    print(f"{files.dxf_path}: {files.entities} model-space entities, {files.route_pieces} route "
          f"pieces, {files.sources} sources")
    print(f"{files.csv_path}: {files.circuits} circuits")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
