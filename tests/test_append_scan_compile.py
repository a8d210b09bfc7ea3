"""The scratch document's one-pass tag compiler against ezdxf's ``tag_compiler`` path.

``append_scan._compiled`` is the fast form of ``_clean`` + ``tag_compiler``; it must give
the same tags (codes, values, 2D/3D points) or decline (None) so the plain path runs.
"""

from __future__ import annotations

import importlib.util
import random
import sys
from pathlib import Path

import pytest
from cablewright.annotate.drawing import append_scan
from cablewright.extract.dxf_stream import stream_dxf
from ezdxf.lldxf.tagger import tag_compiler
from ezdxf.lldxf.types import DXFVertex

ROOT = Path(__file__).resolve().parents[1]


def _plain(kind, tags):
    compiled = list(tag_compiler(iter([*append_scan._clean(kind, tags), append_scan._END])))
    return compiled[:-1]


def _shape(tags):
    return [(type(t) is DXFVertex, t.code, tuple(t.value) if type(t) is DXFVertex else t.value)
            for t in tags]


@pytest.fixture(scope="module")
def records(tmp_path_factory):
    """Every record the stream keeps of a small benchmark plant (generate_plant.py, invented data)."""
    spec = importlib.util.spec_from_file_location("generate_plant", ROOT / "benchmarks" / "generate_plant.py")
    assert spec is not None and spec.loader is not None
    gen = importlib.util.module_from_spec(spec)
    sys.modules["generate_plant"] = gen
    spec.loader.exec_module(gen)
    plant = gen.generate_plant(tmp_path_factory.mktemp("plant60"), circuits=60, sources=2, seed=5)
    o = stream_dxf(plant.dxf_path, marks_appid="CABLEWRIGHT").obstacles
    out = []
    for kind, tags, children in [*o.entities, *o.linework, *(r for b in o.blocks.values() for r in b[2])]:
        out += [(kind, tags), *children]
    return out


def test_every_record_of_a_plant_compiles_as_tag_compiler_does(records):
    kinds = {k for k, _ in records}
    assert {"TEXT", "MTEXT", "INSERT", "ATTRIB", "LWPOLYLINE", "CIRCLE"} <= kinds
    for kind, tags in records:
        fast = append_scan._compiled(kind, tags)
        assert fast is not None, kind
        assert _shape(fast) == _shape(_plain(kind, tags)), kind


CASES = [
    # a 2D point last (tag_compiler reads one tag past it), a 3D point, an owner before the subclass
    ("LWPOLYLINE", [(5, "2A"), (330, "1F"), (100, "AcDbEntity"), (8, "W"), (100, "AcDbPolyline"),
                    (90, "2"), (70, "1"), (10, "0.5"), (20, "1.5"), (10, "2"), (20, "-3")]),
    ("TEXT", [(5, "3"), (102, "{ACAD_REACTORS"), (330, "9"), (102, "}"), (100, "AcDbEntity"),
              (8, "T"), (10, "1"), (20, "2"), (30, "3"), (40, "2.5"), (1, " a b "), (50, "90"),
              (1001, "X"), (1000, "x")]),
    ("CIRCLE", [(8, "C"), (10, "1e3"), (20, "-0"), (30, "0"), (40, "7"), (62, "3")]),
    ("INSERT", [(8, "0"), (66, "1"), (2, "B"), (10, "1"), (20, "2"), (41, "2"), (210, "0"),
                (220, "0"), (230, "1")]),
]


@pytest.mark.parametrize("kind, tags", CASES)
def test_hand_made_records_compile_alike(kind, tags):
    assert _shape(append_scan._compiled(kind, tags)) == _shape(_plain(kind, tags))


@pytest.mark.parametrize("tags", [
    [(10, "1"), (30, "2")],          # a point without its y
    [(10, "x"), (20, "2")],          # a coordinate that is no number
    [(70, "1.0")],                   # an integer written as a float (tag_compiler's own repair)
    [(310, "ABCD")],                 # binary data
])
def test_what_it_would_compile_otherwise_is_left_to_tag_compiler(tags):
    assert append_scan._compiled("LINE", tags) is None


def test_seeded_point_layouts_compile_alike():
    rng = random.Random(13)
    for _ in range(300):
        tags = [(8, "L")]
        for _ in range(rng.randint(1, 6)):
            code = rng.choice([10, 11, 12, 210])
            tags += [(code, repr(rng.uniform(-1e6, 1e6))), (code + 10, repr(rng.uniform(-1e6, 1e6)))]
            if rng.random() < 0.5:
                tags.append((code + 20, repr(rng.uniform(-10, 10))))
            if rng.random() < 0.5:
                tags.append((rng.choice([40, 62, 1, 70]), str(rng.randint(0, 9))))
        assert _shape(append_scan._compiled("LWPOLYLINE", tags)) == _shape(_plain("LWPOLYLINE", tags))
