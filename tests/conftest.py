"""Shared fixtures: small DXF drawings built in the test with ezdxf."""

from __future__ import annotations

import os
from pathlib import Path

import ezdxf
import pytest
from hypothesis import settings

# Property tests draw the same examples on every run, so CI never fails by chance;
# run with HYPOTHESIS_PROFILE=explore to search new examples locally.
settings.register_profile("repeatable", derandomize=True, deadline=None)
settings.register_profile("explore", max_examples=500, deadline=None)
settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "repeatable"))

ROOT = Path(__file__).resolve().parents[1]
SAMPLES = ROOT / "sample_drawings"


class DxfBuilder:
    """A fresh drawing with an ``EQ`` block carrying a TAG attribute definition."""

    def __init__(self, path: Path, units: int = 6) -> None:
        self.path = path
        self.doc = ezdxf.new("R2018")
        self.doc.header["$INSUNITS"] = units
        for name in ("ROUTE-TRAY", "ROUTE-LADDER", "ROUTE-CONDUIT", "ROUTE-BURIED"):
            self.doc.layers.add(name)
        blk = self.doc.blocks.new("EQ")
        blk.add_circle((0, 0), 0.1)
        blk.add_attdef("TAG", (0, 0))
        self.msp = self.doc.modelspace()

    def line(self, a, b, layer: str = "ROUTE-TRAY"):
        return self.msp.add_line(a, b, dxfattribs={"layer": layer})

    def equipment(self, tag: str, pos, layout=None, **attribs):
        ref = (self.msp if layout is None else layout).add_blockref("EQ", pos)
        ref.add_auto_attribs({"TAG": tag, **attribs})
        return ref

    def save(self) -> Path:
        self.doc.saveas(self.path)
        return self.path


@pytest.fixture
def dxf(tmp_path):
    """Factory: ``dxf(units=6, name="t.dxf")`` -> :class:`DxfBuilder`."""

    def make(units: int = 6, name: str = "t.dxf") -> DxfBuilder:
        return DxfBuilder(tmp_path / name, units)

    return make
