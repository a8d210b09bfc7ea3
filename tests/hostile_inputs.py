"""Generate hostile and broken drawings and models for the robustness tests (issue 18).

Every file is made here from code (no checked-in binaries): a small valid plant, then
one defect per case.  A defect that ezdxf would not write (NaN, infinity) is put in by
replacing a marker number in the DXF text.
"""

from __future__ import annotations

from pathlib import Path

#: A marker coordinate, replaced in the DXF text by the hostile value [mm].
MARK = "987654.25"

SCHEDULE = (
    "circuit,from,to,load,voltage,phases\n"
    "C-1,MSB,M1,5 kW,400,3\n"
)


def _base(doc_hook=None):
    import ezdxf

    doc = ezdxf.new("R2018", setup=False)
    doc.header["$INSUNITS"] = 4  # millimetres
    for name in ("MSB", "MOTOR"):
        blk = doc.blocks.new(name)
        blk.add_attdef("TAG", (0, 0))
        blk.add_circle((0, 0), 200)
    msp = doc.modelspace()
    msp.add_line((0, 0, 3000), (10000, 0, 3000), dxfattribs={"layer": "ROUTE-TRAY"})
    msp.add_line((10000, 0, 3000), (21000, 0, 3000), dxfattribs={"layer": "ROUTE-TRAY"})
    msp.add_blockref("MSB", (0, 500, 3000)).add_auto_attribs({"TAG": "MSB"})
    msp.add_blockref("MOTOR", (21000, 500, 3000)).add_auto_attribs({"TAG": "M1"})
    if doc_hook is not None:
        doc_hook(doc)
    return doc


def _save(doc, path: Path, replace: dict[str, str] | None = None) -> Path:
    doc.saveas(path)
    if replace:
        text = path.read_text(encoding="utf-8")
        for old, new in replace.items():
            assert old in text, old
            text = text.replace(old, new)
        path.write_text(text, encoding="utf-8")
    return path


def write_schedule(folder: Path) -> Path:
    p = folder / "circuits.csv"
    p.write_text(SCHEDULE, encoding="utf-8")
    return p


def good_dxf(folder: Path) -> Path:
    return _save(_base(), folder / "good.dxf")


def equipment_at(folder: Path, value: str) -> Path:
    """The motor inserted at x = ``value`` (``nan``, ``inf``, ``1e300``)."""

    def hook(doc):
        doc.modelspace().add_blockref("MOTOR", (float(MARK), 0, 3000)).add_auto_attribs({"TAG": "M2"})

    return _save(_base(hook), folder / f"equipment_{value}.dxf", {MARK: value})


def route_end_at(folder: Path, value: str) -> Path:
    """A route line whose end lies at x = ``value``."""

    def hook(doc):
        doc.modelspace().add_line((21000, 0, 3000), (float(MARK), 0, 3000), dxfattribs={"layer": "ROUTE-TRAY"})

    return _save(_base(hook), folder / f"route_{value}.dxf", {MARK: value})


def self_inserting_block(folder: Path) -> Path:
    def hook(doc):
        blk = doc.blocks.new("LOOP")
        blk.add_line((0, 0), (1000, 0), dxfattribs={"layer": "ROUTE-TRAY"})
        blk.add_blockref("LOOP", (10, 10))
        doc.modelspace().add_blockref("LOOP", (0, 5000, 3000))

    return _save(_base(hook), folder / "self_insert.dxf")


def deep_blocks(folder: Path, depth: int = 1000) -> Path:
    def hook(doc):
        blk = doc.blocks.new("D0")
        blk.add_line((0, 0), (100, 0), dxfattribs={"layer": "ROUTE-TRAY"})
        for k in range(1, depth):
            blk = doc.blocks.new(f"D{k}")
            blk.add_blockref(f"D{k - 1}", (1, 0))
        doc.modelspace().add_blockref(f"D{depth - 1}", (0, 8000, 3000))

    return _save(_base(hook), folder / f"deep_{depth}.dxf")


def undefined_block(folder: Path) -> Path:
    """An INSERT of a block that is not in the BLOCKS section."""

    def hook(doc):
        blk = doc.blocks.new("GONE")
        blk.add_line((0, 0), (100, 0), dxfattribs={"layer": "ROUTE-TRAY"})
        doc.modelspace().add_blockref("GONE", (0, 9000, 3000))

    path = _save(_base(hook), folder / "undefined_block.dxf")
    text = path.read_text(encoding="utf-8")
    # rename the block definition only (BLOCK record and BLOCK_RECORD table entry)
    head, sep, rest = text.partition("ENTITIES")
    head = head.replace("\n  2\nGONE\n", "\n  2\nGONE2\n").replace("\nGONE\n", "\nGONE2\n")
    path.write_text(head + sep + rest, encoding="utf-8")
    return path
