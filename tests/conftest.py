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


# --------------------------------------------------------------------------- both DXF readers
# Every drawing any test reads with the full reader is read again by the streaming
# reader (cablewright.extract.dxf_stream), which must give the same measurement
# or decline the drawing (issue 13, item 1); the terminal summary counts both.
STREAM_CHECK: dict[str, list[str]] = {"same": [], "declined": []}


def compare_readers(full, streamed, summary=None) -> None:
    """Assert that the streaming reader's content equals the full reader's."""
    assert streamed.polylines == full.polylines, f"{full.path}: route pieces differ"
    assert streamed.equipment == full.equipment, f"{full.path}: equipment differs"
    assert streamed.units == full.units, f"{full.path}: units differ"
    assert streamed.summary == (full.summary if summary is None else summary), f"{full.path}: summary differs"
    assert [(i.code, i.message) for i in streamed.issues] == [(i.code, i.message) for i in full.issues]


@pytest.fixture(autouse=True)
def _both_dxf_readers(monkeypatch):
    """Hooked where every successful full read ends (``summarise``), so no read escapes it."""
    from cablewright.extract import dxf_reader, dxf_stream

    real = dxf_reader.summarise

    def checked(doc, path, config, content):
        summary = real(doc, path, config, content)
        try:
            streamed = dxf_stream.stream_dxf(path, config)
        except dxf_stream.StreamDeclined as exc:
            STREAM_CHECK["declined"].append(f"{Path(path).name}: {exc.reason}")
        else:
            compare_readers(content, streamed, summary)
            STREAM_CHECK["same"].append(Path(path).name)
        return summary

    monkeypatch.setattr(dxf_reader, "summarise", checked)
    yield


@pytest.fixture(autouse=True)
def _both_dxf_writers(monkeypatch):
    """Every appended annotated copy is compared with the full writer's (``append_check``)."""
    from append_check import compare_with_full_writer
    from cablewright.annotate.drawing import writer

    real = writer.write_annotated_dxf

    def checked(input_path, output_path, marks, config=writer.DEFAULT_CONFIG, **kwargs):
        summary = real(input_path, output_path, marks, config, **kwargs)
        if kwargs.get("stream") is not None:
            compare_with_full_writer(real, input_path, output_path, marks, config, summary)
        return summary

    monkeypatch.setattr(writer, "write_annotated_dxf", checked)
    yield


def pytest_terminal_summary(terminalreporter):
    from append_check import APPEND_CHECK

    if APPEND_CHECK["same"] or APPEND_CHECK["declined"]:
        terminalreporter.write_line(
            f"appending DXF writer: same drawing as the full writer on {len(APPEND_CHECK['same'])} "
            f"annotated copies, declined {len(APPEND_CHECK['declined'])} (written by the full writer)")
    same, declined = STREAM_CHECK["same"], STREAM_CHECK["declined"]
    if same or declined:
        terminalreporter.write_line(
            f"streaming DXF reader: same measurement as the full reader on {len(same)} drawing reads, "
            f"declined {len(declined)} (read by the full reader)")
        if os.environ.get("STREAM_CHECK_VERBOSE"):
            for line in sorted(set(declined)):
                terminalreporter.write_line(f"  declined {line}")
