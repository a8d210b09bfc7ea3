"""The drawing's own texts measured by their style's font where it is here (issue 12).

External reference: ezdxf's own text geometry (``ezdxf.disassemble.make_primitive``,
which lays a TEXT out in the font its style names) and the font files' advance widths
(``ezdxf.fonts.fonts.make_font``); both readers (the full ezdxf parse and the streaming
reader's scratch drawing) must give the same boxes.
"""

from __future__ import annotations

from pathlib import Path

import ezdxf
import pytest
from cablewright.annotate.drawing.append_scan import scratch_drawing
from cablewright.annotate.drawing.obstacles import FOREIGN_TEXT_WIDTH, scan_modelspace
from cablewright.annotate.drawing.style import DEFAULT_CONFIG
from cablewright.annotate.drawing.style_fonts import StyleMeasures
from cablewright.extract.dxf_stream import stream_dxf
from cablewright.extract.model import DEFAULT_ROUTE_LAYERS
from ezdxf import disassemble
from ezdxf.fonts import fonts

MONO = "DejaVuSansMono.ttf"  # a system font here (Debian fonts-dejavu); skipped where ezdxf finds none
TEXT = "iiiiiiiiii 1111"  # narrow letters: a monospaced font sets them far wider
H = 2.5
ROUTE_LAYER = next(iter(DEFAULT_ROUTE_LAYERS))


def _ours():
    return fonts.make_font(DEFAULT_CONFIG.font, 1.0).text_width


def _drawing(path: Path, font: str = MONO) -> Path:
    doc = ezdxf.new("R2010")
    doc.styles.add("PLANMONO", font=font)
    msp = doc.modelspace()
    msp.add_text(TEXT, height=H, dxfattribs={"style": "PLANMONO", "insert": (0.0, 0.0)})
    msp.add_text(TEXT, height=H, dxfattribs={"style": "Standard", "insert": (0.0, 20.0)})
    doc.layers.add(ROUTE_LAYER)
    msp.add_lwpolyline([(-50.0, -50.0), (50.0, -50.0)], dxfattribs={"layer": ROUTE_LAYER})
    doc.saveas(path)
    return path


def _width(box) -> float:
    return 2.0 * box.hw


@pytest.fixture(autouse=True)
def _mono_here():
    if not fonts.font_manager.has_font(MONO):  # pragma: no cover - a machine without DejaVu
        pytest.skip(f"{MONO} not on this machine")


def test_a_text_in_a_wider_font_gets_that_fonts_box(tmp_path):
    path = _drawing(tmp_path / "mono.dxf")
    doc = ezdxf.readfile(path)
    scan = scan_modelspace(doc, _ours())
    mono_box, standard_box = sorted(scan.texts, key=lambda b: b.cy)
    mono = fonts.make_font(MONO, 1.0).text_width(TEXT)
    assert mono > _ours()(TEXT) * 1.2  # the premise: much wider than our font on this text
    assert _width(mono_box) == pytest.approx(mono * H * FOREIGN_TEXT_WIDTH)
    assert _width(standard_box) == pytest.approx(_ours()(TEXT) * H * FOREIGN_TEXT_WIDTH)
    # ezdxf lays the same TEXT out in its style's font: our box holds it
    text = next(e for e in doc.modelspace().query("TEXT") if e.dxf.style == "PLANMONO")
    xs = [v.x for v in disassemble.make_primitive(text).vertices()]
    assert max(xs) - min(xs) <= _width(mono_box) and max(xs) - min(xs) > _ours()(TEXT) * H


def test_a_style_whose_font_is_not_here_keeps_our_font(tmp_path):
    path = _drawing(tmp_path / "shx.dxf", font="plan_lettering.shx")  # not on this machine
    scan = scan_modelspace(ezdxf.readfile(path), _ours())
    assert [round(_width(b), 9) for b in scan.texts] == [round(_ours()(TEXT) * H * FOREIGN_TEXT_WIDTH, 9)] * 2


def test_a_narrower_font_never_shrinks_a_box(tmp_path):
    doc = ezdxf.new("R2010")
    doc.styles.add("NARROW", font=MONO)
    text = doc.modelspace().add_text("WWWW MMMM", height=H, dxfattribs={"style": "NARROW"})
    measure = StyleMeasures(doc, _ours()).of(text)
    assert measure("WWWW MMMM") >= _ours()("WWWW MMMM")
    assert measure("WWWW MMMM") == pytest.approx(max(_ours()("WWWW MMMM"),
                                                     fonts.make_font(MONO, 1.0).text_width("WWWW MMMM")))


def test_both_readers_give_the_same_text_boxes(tmp_path):
    path = _drawing(tmp_path / "mono.dxf")
    parsed = scan_modelspace(ezdxf.readfile(path), _ours())
    content = stream_dxf(path, marks_appid=DEFAULT_CONFIG.appid)
    streamed = scratch_drawing(content.obstacles, DEFAULT_CONFIG, _ours(), []).scan
    assert content.obstacles.style_fonts["PLANMONO"] == MONO
    assert [tuple(round(v, 9) for v in b) for b in streamed.texts] == \
        [tuple(round(v, 9) for v in b) for b in parsed.texts]
