"""The CLASSES section of a DXF we write does not depend on Python's string hash.

ezdxf adds the classes of the entity types in use from a set while saving; a set of
strings iterates in an order set by ``PYTHONHASHSEED`` (Python docs, "object.__hash__"),
so without `annotate.reproducible.keep_classes_stable` the IFC sample's annotated plan
view came out in two byte orders between runs.  Checked here in child processes
with different hash seeds (the only way to vary the seed).
"""

from __future__ import annotations

import hashlib
import os
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]

_SCRIPT = """
import sys, ezdxf
from cablewright.annotate.reproducible import pin_dxf_metadata
doc = ezdxf.new("R2018", setup=True)
doc.modelspace().add_line((0, 0), (1, 0))
pin_dxf_metadata(doc, "seed", own_drawing=True)
doc.saveas(sys.argv[1])
"""


def _classes(path: Path) -> list[str]:
    lines = path.read_text(encoding="utf-8").splitlines()
    start = lines.index("CLASSES")
    end = lines.index("ENDSEC", start)
    return [lines[i + 1].strip() for i in range(start, end) if lines[i].strip() == "1"]


def test_same_bytes_under_different_hash_seeds(tmp_path):
    digests, orders = set(), set()
    for seed in ("1", "4", "7", "11"):
        out = tmp_path / f"seed{seed}.dxf"
        env = {**os.environ, "PYTHONHASHSEED": seed}
        subprocess.run([sys.executable, "-c", _SCRIPT, str(out)], check=True, env=env, cwd=ROOT)
        digests.add(hashlib.sha256(out.read_bytes()).hexdigest())
        orders.add(tuple(_classes(out)))
    assert len(orders) == 1 and len(digests) == 1
    (order,) = orders
    # a new document has no classes read from a file: all of them sorted by name
    assert list(order) == sorted(order) and "LAYOUT" in order and "ACDBPLACEHOLDER" in order
