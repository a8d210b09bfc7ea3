"""The marks on the 2,000-circuit benchmark plant audited (issue 12, "What it must show").

The plant is generated (benchmarks/generate_plant.py, invented data) and sized with the
defaults; the annotated DXF is read back with ezdxf and every added text's box checked
with shapely (tests/drawing_audit.py, independent of the writer).  The counts are
printed; the test holds the strict rule of the issue: no added text crosses the drawing's
linework or our leaders, none overlaps another text, every cable label on its route or
tied to it by a leader of at most 5 text heights, every segment id on its segment, and
no mark left to a last resort (schedule.json ``drawing_marks``).
"""

from __future__ import annotations

import importlib.util
import sys
from pathlib import Path

from test_annotate_marks import _audit, _reported, _segments, check_accounted

from cablewright.cli import main

ROOT = Path(__file__).resolve().parents[1]


def _generate(base: Path, circuits: int):
    spec = importlib.util.spec_from_file_location("gen_plant_2000", ROOT / "benchmarks" / "generate_plant.py")
    gen = importlib.util.module_from_spec(spec)
    sys.modules[spec.name] = gen  # its dataclasses look their module up
    spec.loader.exec_module(gen)
    return gen.generate_plant(base / "in", circuits=circuits)


def test_plant_2000_marks_keep_the_rules_and_every_last_resort_is_counted(tmp_path):
    files = _generate(tmp_path, 2000)
    out = tmp_path / "out"
    code = main(["size", str(files.dxf_path), "--circuits", str(files.csv_path), "--out", str(out),
                 "--json"])
    assert code in (0, 1)
    result = _audit(out, Path(files.dxf_path).stem + "_annotated.dxf")
    reported = _reported(out)
    print("plant 2000:", result.summary(), reported)
    assert result.labels == 2000
    assert result.labels_off_route == [] and result.segment_ids_off == []
    assert result.segment_ids >= sum(1 for g in _segments(out).values() if g.length > 0)
    check_accounted(result, reported)
    assert result.crossing_linework == [] and result.overlapping_text == [], result.summary()
    assert reported["last_resort_marks"] == [], reported
