"""The HTML report: self-contained, escaped, naming the source of every factor and check.

Parsed with the standard library ``html.parser``; the preview with PNG's signature
(PNG specification, ISO/IEC 15948:2004, 5.2: bytes 89 50 4E 47 0D 0A 1A 0A).
"""

from __future__ import annotations

import base64
import re
from dataclasses import replace
from html.parser import HTMLParser

from cablewright.annotate.drawing import CAUTIONS
from cablewright.annotate.report import write_report_html
from test_annotate_fixtures import outcomes

PNG_SIGNATURE = b"\x89PNG\r\n\x1a\n"


class _Collect(HTMLParser):
    def __init__(self):
        super().__init__()
        self.tags = []
        self.text = []

    def handle_starttag(self, tag, attrs):
        self.tags.append((tag, dict(attrs)))

    def handle_data(self, data):
        self.text.append(data)


def _parse(path):
    p = _Collect()
    p.feed(path.read_text(encoding="utf-8"))
    return p, " ".join(" ".join(p.text).split())


def test_report_names_sources_and_steps(tmp_path):
    path = write_report_html(
        tmp_path / "r.html",
        outcomes(),
        title="Pump room",
        drawing_name="in.dxf",
        preview_png=None,
        cautions=CAUTIONS,
    )
    p, text = _parse(path)
    # every factor's source and every check's source, as given by the sizing
    for o in outcomes():
        if o.sizing is None:
            continue
        for f in o.sizing.factors:
            assert f.source in text and f.detail in text
        for c in o.sizing.checks:
            assert c.source in text
    assert "Table B.52.14" in text and "Table B.52.20" in text
    assert "2x 4C 150 mm² Cu/XLPE" in text
    # summary counts: 3 circuits, 1 ok, 1 warning, 0 fail, 1 error
    assert re.search(r"circuits ok warning fail error 3 1 1 0 1", text)
    assert text.count(CAUTIONS) == 2
    assert "unknown tag PUMP-9" in text


def test_report_escapes_text_and_is_self_contained(tmp_path):
    evil = [replace(outcomes()[2], circuit_id="<script>x</script>", messages=("a & b < c",))]
    png = PNG_SIGNATURE + b"rest"
    path = write_report_html(
        tmp_path / "r.html",
        evil,
        title="T <b>",
        drawing_name="d&d.dxf",
        preview_png=png,
        cautions=CAUTIONS,
    )
    raw = path.read_text(encoding="utf-8")
    assert "<script>" not in raw and "&lt;script&gt;" in raw
    assert "a &amp; b &lt; c" in raw
    p, _ = _parse(path)
    imgs = [a for t, a in p.tags if t == "img"]
    assert len(imgs) == 1 and imgs[0]["src"].startswith("data:image/png;base64,")
    assert base64.b64decode(imgs[0]["src"].split(",", 1)[1]) == png
    # nothing fetched from elsewhere: no external links, scripts or stylesheets
    assert not [a for t, a in p.tags if t in ("script", "link")]
    assert not re.search(r"(src|href)=['\"](https?:|//)", raw)
