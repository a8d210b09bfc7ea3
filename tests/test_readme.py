"""Every command in README.md runs as written (issue 10, "What it must show").

Each line of a ``sh`` block is run by the shell in a fresh temporary folder
that holds ``.venv`` (the environment running these tests) and the sample
drawings, as the repository does; a trailing ``# exit N`` gives the expected
exit code (default 0).  ``python`` blocks run with this interpreter there.
``make test`` is checked with ``make -n`` (running it would run this test
again); ``make demo`` runs when the environment is the one ``make`` made.
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
README = ROOT / "README.md"
VENV = Path(sys.prefix)


def _blocks(kind: str) -> list[str]:
    text = README.read_text(encoding="utf-8")
    return re.findall(rf"```{kind}\n(.*?)```", text, flags=re.S)


def _commands() -> list[tuple[str, int]]:
    out = []
    for block in _blocks("sh"):
        for line in block.splitlines():
            line = line.strip()
            if not line or line.startswith("#"):
                continue
            code = 0
            m = re.search(r"\s+#\s*(.*)$", line)
            if m:
                found = re.search(r"exit (\d+)", m.group(1))
                code = int(found.group(1)) if found else 0
                line = line[: m.start()]
            out.append((line, code))
    return out


@pytest.fixture
def workdir(tmp_path):
    if not (VENV / "bin" / "cablewright").exists():
        pytest.skip("not run from the project's virtual environment")
    (tmp_path / ".venv").symlink_to(VENV)
    shutil.copytree(ROOT / "sample_drawings", tmp_path / "sample_drawings",
                    ignore=shutil.ignore_patterns("*.py", "__pycache__"))
    # "Your own drawing": the sample stands in for the reader's plan.dxf and circuits.csv
    shutil.copy(ROOT / "sample_drawings" / "pumping_station.dxf", tmp_path / "plan.dxf")
    shutil.copy(ROOT / "sample_drawings" / "pumping_station_circuits.csv", tmp_path / "circuits.csv")
    return tmp_path


def test_readme_has_commands():
    commands = [c for c, _ in _commands()]
    assert any(c.startswith(".venv/bin/cablewright calc") for c in commands)
    assert "make demo" in commands and _blocks("python")


@pytest.mark.parametrize(("command", "code"), _commands(), ids=lambda v: str(v)[:60])
def test_readme_command_runs_as_written(workdir, command, code):
    env = {**os.environ, "PYTHONDONTWRITEBYTECODE": "1"}
    if command.startswith("make "):
        target = command.split()[1]
        if target == "test":  # this very suite: check the target exists, do not recurse
            run = subprocess.run(["make", "-n", "test"], cwd=ROOT, capture_output=True, text=True)
            assert run.returncode == 0, run.stderr
            return
        stamp = ROOT / ".venv" / ".installed-stamp"
        if VENV != ROOT / ".venv" or not stamp.exists() or (
                stamp.stat().st_mtime < (ROOT / "pyproject.toml").stat().st_mtime):
            pytest.skip("make would build a new environment; run under 'make test'")
        run = subprocess.run(["make", target, f"OUT={workdir / 'demo_out'}"], cwd=ROOT,
                             capture_output=True, text=True, env=env, timeout=300)
    else:
        if "--config plan.toml" in command:  # written by the README's line before it
            subprocess.run(".venv/bin/cablewright layers plan.dxf --write-config plan.toml", shell=True,
                           cwd=workdir, capture_output=True, env=env, timeout=300, check=True)
        run = subprocess.run(command, shell=True, cwd=workdir, capture_output=True, text=True,
                             env=env, timeout=300)
    assert run.returncode == code, f"{command}\n{run.stdout[-2000:]}\n{run.stderr[-2000:]}"
    assert "Traceback" not in run.stderr


@pytest.mark.parametrize("block", _blocks("python"), ids=lambda b: b.splitlines()[0][:40])
def test_readme_python_runs_as_written(workdir, block):
    run = subprocess.run([sys.executable, "-c", block], cwd=workdir, capture_output=True, text=True,
                         timeout=300)
    assert run.returncode == 0, run.stderr[-3000:]
    assert "files written" in run.stdout
