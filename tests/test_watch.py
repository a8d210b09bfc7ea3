"""``size --watch``: a real file change in a temporary folder, bounded in time."""

from __future__ import annotations

import importlib.util
import json
import os
import subprocess
import sys
import threading
import time
from pathlib import Path

from cablewright.watch import snapshot, wait_for_change

ROOT = Path(__file__).resolve().parents[1]


def test_a_saved_file_is_seen(tmp_path):
    path = tmp_path / "drawing.dxf"
    path.write_text("one", encoding="utf-8")
    last = snapshot([path])

    def save():
        time.sleep(0.3)
        path.write_text("two, longer", encoding="utf-8")

    writer = threading.Thread(target=save)
    writer.start()
    started = time.monotonic()
    seen = wait_for_change([path], last, poll_s=0.05, timeout_s=10.0)
    writer.join()
    assert seen is not None and seen != last
    assert time.monotonic() - started < 10.0


def test_no_change_times_out(tmp_path):
    path = tmp_path / "drawing.dxf"
    path.write_text("one", encoding="utf-8")
    assert wait_for_change([path], snapshot([path]), poll_s=0.05, timeout_s=0.3) is None


def _wait_for(predicate, timeout_s: float) -> bool:
    deadline = time.monotonic() + timeout_s
    while time.monotonic() < deadline:
        if predicate():
            return True
        time.sleep(0.1)
    return False


def test_watch_reruns_keeps_the_last_good_outputs_and_reports_changes(tmp_path):
    spec = importlib.util.spec_from_file_location("gen_ps", ROOT / "sample_drawings" / "generate_pumping_station.py")
    gen = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(gen)
    gen.main(tmp_path / "rev1", 1)
    gen.main(tmp_path / "rev2", 2)
    work = tmp_path / "work"
    work.mkdir()
    drawing = work / "pumping_station.dxf"
    circuits = work / "circuits.csv"
    drawing.write_bytes((tmp_path / "rev1" / "pumping_station.dxf").read_bytes())
    circuits.write_bytes((tmp_path / "rev1" / "pumping_station_circuits.csv").read_bytes())
    out = work / "out"
    schedule = out / "schedule.json"
    env = {**os.environ, "PYTHONUNBUFFERED": "1"}
    proc = subprocess.Popen(
        [sys.executable, "-m", "cablewright", "size", str(drawing), "--circuits", str(circuits),
         "--out", str(out), "--watch", "--watch-poll", "0.2", "--watch-runs", "3"],
        stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, env=env)
    try:
        assert _wait_for(schedule.exists, 120), "first run wrote no schedule.json"
        first = schedule.read_bytes()
        time.sleep(0.5)
        drawing.write_text("0\nSECTION\n2\nNONSENSE\n", encoding="utf-8")  # saved broken
        # the broken drawing is read and refused: the outputs stay those of the first run
        time.sleep(3.0)  # several polls: the broken save is seen, read and refused
        assert schedule.read_bytes() == first
        drawing.write_bytes((tmp_path / "rev2" / "pumping_station.dxf").read_bytes())
        circuits.write_bytes((tmp_path / "rev2" / "pumping_station_circuits.csv").read_bytes())
        stdout, stderr = proc.communicate(timeout=120)
    finally:
        if proc.poll() is None:
            proc.kill()
            proc.communicate()
    assert proc.returncode in (0, 1), stderr
    assert "last good outputs are kept" in stderr and "Traceback" not in stderr
    changes = json.loads((out / "changes.json").read_text(encoding="utf-8"))
    kinds = {c["id"]: c["change"] for c in changes["circuits"]}
    assert kinds["UV-1"] == "new" and kinds["S-01"] == "removed" and kinds["P-102"] == "changed"
    assert "changes since" in stdout
