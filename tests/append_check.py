"""Both DXF writers compared: the appending writer's copy against ezdxf's full save.

Source of truth: ezdxf (a general-purpose DXF library) re-reads both files and
audits them (``Drawing.audit``); the entities are compared one by one as ezdxf
gives them (type, layer, text, insertion point / vertices rounded to 1e-6
drawing units), so the only difference allowed is the byte layout.
"""

from __future__ import annotations

import tempfile
from collections import Counter
from pathlib import Path

import ezdxf

#: Drawings compared by the hook in ``conftest.py`` (names), and those the appending writer declined.
APPEND_CHECK: dict[str, list[str]] = {"same": [], "declined": []}
_PLACES = ("insert", "start", "center", "location", "defpoint", "base_point")


def entity_key(entity) -> tuple:
    """(type, layer, text, place) of one model-space entity, rounded."""
    d = entity.dxf
    kind = entity.dxftype()
    text = ""
    if kind in ("TEXT", "ATTRIB"):
        text = d.text
    elif kind == "MTEXT":
        text = entity.text
    place = next((d.get(n) for n in _PLACES if d.is_supported(n) and d.hasattr(n)), None)
    place = tuple(round(v, 6) for v in place) if place is not None else None
    if kind == "LWPOLYLINE":
        place = tuple((round(x, 6), round(y, 6)) for x, y in entity.get_points("xy"))
    if kind == "INSERT":
        text = tuple(sorted((a.dxf.tag, a.dxf.text) for a in entity.attribs))
    return kind, d.get("layer", "0").upper(), repr(text), place


def read_back(path: Path) -> tuple[Counter, list[str]]:
    """The model-space entity keys of a drawing and ezdxf's audit findings (errors and fixes)."""
    doc = ezdxf.readfile(path)
    auditor = doc.audit()
    findings = [str(e.message) for e in auditor.errors] + [str(f.message) for f in auditor.fixes]
    return Counter(entity_key(e) for e in doc.modelspace()), findings


def assert_same_drawing(appended: Path, full: Path) -> Counter:
    """Both audit clean and hold the same entities; returns the entity keys."""
    a, a_findings = read_back(appended)
    f, f_findings = read_back(full)
    assert not a_findings, f"{appended}: ezdxf audit: {a_findings[:5]}"
    assert not f_findings, f"{full}: ezdxf audit: {f_findings[:5]}"
    assert a == f, (f"{appended}: entities differ from the full writer's: only appended "
                    f"{list((a - f).items())[:3]}, only full {list((f - a).items())[:3]}")
    return a


def compare_with_full_writer(real_writer, input_path, output_path, marks, config, summary) -> None:
    """After an appended write: the full writer on the parsed drawing, both compared."""
    if not summary.appended:
        APPEND_CHECK["declined"].append(Path(input_path).name)
        return
    with tempfile.TemporaryDirectory(prefix="cw-append-check-") as tmp:
        full = Path(tmp) / "full.dxf"
        real_writer(input_path, full, marks, config, document=ezdxf.readfile(input_path))
        assert_same_drawing(Path(output_path), full)
    APPEND_CHECK["same"].append(Path(input_path).name)
