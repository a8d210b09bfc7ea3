"""The preview PNG is drawn from the measurement's routes and the marks the writer placed.

Checks against things outside the project: the PNG signature and size (PNG
specification, ISO/IEC 15948:2004, 5.2 and the IHDR chunk, read back with Pillow);
the colours of the ACI numbers (ezdxf's ``aci2rgb`` table); where the routes lie
in the picture (plane geometry: an L of known legs drawn at one scale must give
route-coloured pixels along both legs, in the legs' ratio, and white pixels inside
the L).  No parsed drawing is handed to the preview.
"""

from __future__ import annotations

import io
from types import SimpleNamespace

import ezdxf
import pytest
from cablewright.annotate.drawing import AnnotationInput, write_annotated_dxf
from cablewright.annotate.preview import PreviewStyle, render_preview_png, route_lines
from cablewright.annotate.sketch import aci_hex, background_sketch
from ezdxf.colors import aci2rgb
from PIL import Image
from test_annotate_fixtures import PER_SEGMENT, equipment, make_drawing, outcomes, segments

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"


def _seg(layer, *points_m):
    return SimpleNamespace(layer=layer, points_m=tuple((x, y, 0.0) for x, y in points_m))


def _image(png: bytes) -> Image.Image:
    assert png[:8] == PNG_SIGNATURE
    return Image.open(io.BytesIO(png)).convert("RGB")


def _close(pixel, rgb, tol=60):
    return all(abs(a - b) <= tol for a, b in zip(pixel, rgb, strict=True))


def test_aci_colours_are_ezdxfs():
    """ACI 1 red, 5 blue, 30 orange as ezdxf's table gives them; 7 black on white."""
    for aci in (1, 5, 30, 140):
        r, g, b = aci2rgb(aci)
        assert aci_hex(aci) == f"#{r:02x}{g:02x}{b:02x}"
    assert aci_hex(7) == "#000000"


def test_route_pixels_lie_along_the_routes():
    """An L of a 100 m tray leg and a 50 m conduit leg (metres, 1000 units per m).

    The tray layer is ACI 1 (red), the conduit ACI 5 (blue).  With equal scales the
    red pixels span twice the blue ones; points along each leg are of its colour;
    the inside of the L stays white.
    """
    routes = route_lines([_seg("ROUTE-TRAY", (0, 0), (100, 0)),
                          _seg("route-conduit", (100, 0), (100, 50))],
                         1000.0, {"ROUTE-TRAY": 1, "ROUTE-CONDUIT": 5})
    style = PreviewStyle(dpi=50, width_px=400, route_lw=3.0)
    img = _image(render_preview_png(routes, style=style))
    w, h = img.size
    assert w == 400 and h == pytest.approx(200, rel=0.03)  # aspect 50 / 100 (a thin margin aside)
    red, blue = aci2rgb(1), aci2rgb(5)
    px = img.load()
    reds = [(x, y) for x in range(w) for y in range(h) if _close(px[x, y], red)]
    blues = [(x, y) for x in range(w) for y in range(h) if _close(px[x, y], blue)]
    assert reds and blues
    rx0, rx1 = min(x for x, _ in reds), max(x for x, _ in reds)
    by0, by1 = min(y for _, y in blues), max(y for _, y in blues)
    assert (rx1 - rx0) / (by1 - by0) == pytest.approx(2.0, rel=0.05)
    row = round(sum(y for _, y in reds) / len(reds))  # the tray leg's row
    col = round(sum(x for x, _ in blues) / len(blues))  # the conduit leg's column
    for f in (0.1, 0.3, 0.5, 0.7, 0.9):
        assert _close(px[round(rx0 + f * (rx1 - rx0)), row], red), f
        assert _close(px[col, round(by0 + f * (by1 - by0))], blue), f
    assert col > rx1 - 5  # the conduit stands at the tray's far end
    assert row > by1 - 5  # ... and rises from it (picture y grows downwards)
    inside = px[round(rx0 + 0.25 * (rx1 - rx0)), round(by0 + 0.25 * (by1 - by0))]
    assert _close(inside, (255, 255, 255), tol=5)


def test_preview_of_an_annotated_drawing_needs_no_document(tmp_path):
    """The fixture drawing annotated; the preview from the routes and the writer's sketch.

    The sketch holds every label the writer counted (texts of our label layer), in
    our label colour; the picture is ``width_px`` wide with the clamped aspect, and
    holds pixels of the route layer's colour (fixture: ACI 8) and of our label colour.
    """
    src = make_drawing(tmp_path / "in.dxf")
    marks = AnnotationInput(outcomes(), segments(), PER_SEGMENT, equipment(), 1000.0)
    summary = write_annotated_dxf(src, tmp_path / "out.dxf", marks)
    label_layer = summary.layers["label"].upper()
    labels = [t for t in summary.sketch.texts if t.layer == label_layer]
    assert len(labels) >= summary.labels > 0
    written = ezdxf.readfile(tmp_path / "out.dxf")
    aci = written.layers.get(summary.layers["label"]).dxf.color
    assert {t.color for t in labels} == {aci_hex(aci)}
    assert summary.sketch.layer_aci["ROUTE-TRAY"] == 8
    routes = route_lines(segments().values(), 1000.0, summary.sketch.layer_aci)
    style = PreviewStyle(dpi=100, width_px=1500, route_lw=2.0)
    img = _image(render_preview_png(routes, summary.sketch, text_height=summary.text_height,
                                    style=style))
    assert img.width == 1500 and 0.25 * 1500 <= img.height <= 1500
    colours = set(img.get_flattened_data() if hasattr(img, "get_flattened_data") else img.getdata())
    assert any(_close(c, aci2rgb(8), tol=20) for c in colours)
    assert any(_close(c, aci2rgb(aci), tol=90) for c in colours)  # text is anti-aliased


def test_background_from_a_document_and_layers_left_out(tmp_path):
    """The drawing's walls (layer WALLS) are a background; a skipped layer is not drawn."""
    doc = ezdxf.readfile(make_drawing(tmp_path / "in.dxf"))
    back = background_sketch(doc, {"ROUTE-TRAY"})
    assert back is not None and {k[0] for k in back.lines} >= {"WALLS"}
    assert not any(k[0] == "ROUTE-TRAY" for k in back.lines)
    assert background_sketch(doc, (), max_entities=1) is None  # a large drawing: none
    style = PreviewStyle(dpi=40, width_px=300)
    routes = route_lines(segments().values(), 1000.0, {"ROUTE-TRAY": 1})
    drawn = _image(render_preview_png(routes, background=back, style=style))
    without = _image(render_preview_png(routes, background=back, skip_layers=("WALLS",),
                                        style=style))
    assert (drawn.size, drawn.tobytes()) != (without.size, without.tobytes())


def test_too_many_texts_are_left_out():
    """Above ``max_texts`` the texts are not drawn: the picture equals one without them."""
    from cablewright.annotate.sketch import PreviewText, Sketch

    routes = route_lines([_seg("ROUTE-TRAY", (0, 0), (100, 0))], 1.0, {"ROUTE-TRAY": 1})
    many = Sketch()
    for i in range(5):
        many.add_text(PreviewText("CW-LABELS", f"P-{i}", 10.0 * i, 5.0, 3.0, 0.0, "left", "baseline",
                                  "#0000ff"))
    style = PreviewStyle(dpi=40, width_px=300, max_texts=4)
    left_out = _image(render_preview_png(routes, many, style=style))
    drawn = _image(render_preview_png(routes, many, style=PreviewStyle(dpi=40, width_px=300)))
    assert left_out.tobytes() != drawn.tobytes()
    pixels = left_out.get_flattened_data() if hasattr(left_out, "get_flattened_data") else left_out.getdata()
    assert not any(_close(c, (0, 0, 255), tol=30) for c in pixels)
