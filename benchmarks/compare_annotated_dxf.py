"""Annotate fixed drawings and compare the marks entity by entity (a refactoring guard).

``dump`` annotates

* the sample drawing (``sample_drawings/pumping_station.dxf``) with ``cablewright size``,
* that annotated copy a second time (the marks of the first run are removed first),
* a benchmark plant (``benchmarks/generate_plant.py``, 200 circuits by default),
* a small DXF R12 drawing in metres (TEXT and LINE marks instead of MTEXT and LWPOLYLINE),

and writes one record per model-space entity of each output (type, layer, text content,
points, heights, rotation, colour, MTEXT settings, XDATA; handles are left out) in
model-space order.  ``compare`` reads two such dumps and reports the first difference
of each drawing; numbers agree within ``--tol`` (1e-9 drawing units by default).

Run before and after a change to the drawing writer::

    python benchmarks/compare_annotated_dxf.py dump /tmp/before.json
    (change the code)
    python benchmarks/compare_annotated_dxf.py dump /tmp/after.json
    python benchmarks/compare_annotated_dxf.py compare /tmp/before.json /tmp/after.json
"""

from __future__ import annotations

import argparse
import json
import math
import subprocess
import sys
import tempfile
from pathlib import Path

import ezdxf

ROOT = Path(__file__).resolve().parents[1]
SAMPLE = ROOT / "sample_drawings" / "pumping_station.dxf"
SAMPLE_CIRCUITS = ROOT / "sample_drawings" / "pumping_station_circuits.csv"

#: DXF attributes kept per entity when present (insertion points, sizes, text settings).
ATTRIBS = (
    "layer", "color", "style", "height", "char_height", "rotation", "insert", "align_point",
    "halign", "valign", "width", "attachment_point", "line_spacing_style",
    "line_spacing_factor", "start", "end", "elevation", "text",
)


def _plain(value):
    """A DXF attribute value as JSON: vectors as lists of floats."""
    if hasattr(value, "x") and hasattr(value, "y"):
        return [float(v) for v in value]
    if isinstance(value, tuple):
        return [_plain(v) for v in value]
    return value


def entity_records(path: Path) -> list[dict]:
    """One record per model-space entity of the drawing at ``path``, in order."""
    doc = ezdxf.readfile(path)
    out = []
    for e in doc.modelspace():
        rec: dict = {"type": e.dxftype()}
        for name in ATTRIBS:
            if e.dxf.hasattr(name):
                rec[name] = _plain(e.dxf.get(name))
        if rec["type"] == "MTEXT":
            rec["text"] = e.text
        if rec["type"] == "LWPOLYLINE":
            rec["points"] = [list(p) for p in e.get_points("xyseb")]
        if e.has_xdata("CABLEWRIGHT"):
            rec["xdata"] = [list(t) for t in e.get_xdata("CABLEWRIGHT")]
        out.append(rec)
    return out


def _size(drawing: Path, circuits: Path, out: Path) -> Path:
    subprocess.run(
        [sys.executable, "-m", "cablewright.cli", "size", str(drawing), "--circuits",
         str(circuits), "--out", str(out), "--json"],
        check=False, stdout=subprocess.DEVNULL, cwd=ROOT,
    )
    found = sorted(out.glob("*_annotated.dxf"))
    if not found:
        raise SystemExit(f"{drawing}: no annotated drawing written in {out}")
    return found[0]


def _r12_case(work: Path) -> Path:
    """The R12 drawing of tests/test_annotate_dxf.py, annotated through the library."""
    sys.path.insert(0, str(ROOT / "tests"))
    from test_annotate_fixtures import PER_SEGMENT, equipment, outcomes, segments

    try:
        from cablewright.annotate import drawing as dxf_writer
    except ImportError:  # before the writer became a package
        from cablewright.annotate import dxf_writer

    doc = ezdxf.new("R12")
    doc.header["$INSUNITS"] = 6
    doc.layers.add("ROUTE-TRAY")
    msp = doc.modelspace()
    msp.add_line((0, 0), (20, 0), dxfattribs={"layer": "ROUTE-TRAY"})
    msp.add_line((20, 0), (40, 0), dxfattribs={"layer": "ROUTE-TRAY"})
    msp.add_line((40, 0), (40, 20), dxfattribs={"layer": "ROUTE-TRAY"})
    src = work / "r12.dxf"
    doc.saveas(src)
    out = work / "r12-out.dxf"
    marks = getattr(dxf_writer, "AnnotationInput", None)
    if marks is None:  # the writer before it took its inputs as one dataclass
        dxf_writer.write_annotated_dxf(src, out, outcomes(), segments(), PER_SEGMENT,
                                       equipment(), 1.0)
    else:
        dxf_writer.write_annotated_dxf(
            src, out, marks(outcomes(), segments(), PER_SEGMENT, equipment(), 1.0)
        )
    return out


def dump(target: Path, circuits: int) -> None:
    sys.path.insert(0, str(ROOT / "benchmarks"))
    from generate_plant import generate_plant

    with tempfile.TemporaryDirectory(prefix="cw-compare-") as tmp:
        work = Path(tmp)
        sample = _size(SAMPLE, SAMPLE_CIRCUITS, work / "sample")
        again = _size(sample, SAMPLE_CIRCUITS, work / "again")
        plant = generate_plant(work / "plant", circuits=circuits, seed=1)
        plant_dxf = _size(Path(plant.dxf_path), Path(plant.csv_path), work / "plant-out")
        r12 = _r12_case(work)
        result = {
            "sample": entity_records(sample),
            "sample re-annotated": entity_records(again),
            f"plant {circuits}": entity_records(plant_dxf),
            "r12": entity_records(r12),
        }
    target.write_text(json.dumps(result))
    for name, recs in result.items():
        print(f"{name}: {len(recs)} entities")


def _differ(a, b, tol: float) -> bool:
    if isinstance(a, float) or isinstance(b, float):
        return not (isinstance(a, (int, float)) and isinstance(b, (int, float))
                    and math.isclose(a, b, rel_tol=0.0, abs_tol=tol))
    if isinstance(a, list) and isinstance(b, list):
        return len(a) != len(b) or any(_differ(x, y, tol) for x, y in zip(a, b, strict=False))
    if isinstance(a, dict) and isinstance(b, dict):
        return a.keys() != b.keys() or any(_differ(a[k], b[k], tol) for k in a)
    return a != b


def compare(before: Path, after: Path, tol: float) -> int:
    a, b = json.loads(before.read_text()), json.loads(after.read_text())
    bad = 0
    for name in a:
        ra, rb = a[name], b.get(name, [])
        first = next((i for i, (x, y) in enumerate(zip(ra, rb, strict=False)) if _differ(x, y, tol)), None)
        if first is None and len(ra) == len(rb):
            print(f"{name}: {len(ra)} entities, identical")
            continue
        bad += 1
        print(f"{name}: {len(ra)} vs {len(rb)} entities; first difference at {first}")
        if first is not None:
            print(f"  before: {ra[first]}\n  after:  {rb[first]}")
    return 1 if bad else 0


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    sub = parser.add_subparsers(dest="cmd", required=True)
    d = sub.add_parser("dump")
    d.add_argument("target", type=Path)
    d.add_argument("--circuits", type=int, default=200)
    c = sub.add_parser("compare")
    c.add_argument("before", type=Path)
    c.add_argument("after", type=Path)
    c.add_argument("--tol", type=float, default=1e-9)
    args = parser.parse_args(argv)
    if args.cmd == "dump":
        dump(args.target, args.circuits)
        return 0
    return compare(args.before, args.after, args.tol)


if __name__ == "__main__":
    raise SystemExit(main())
