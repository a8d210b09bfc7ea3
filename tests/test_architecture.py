"""The one-way flow extract -> sizing -> annotate -> cablewright (DEVELOPERS.md)."""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
ORDER = ["extract", "sizing", "annotate", "cablewright"]
BASE = "core"  # cablewright.core: errors and issue codes, importable by every stage


def _imports(path: Path) -> set[str]:
    tree = ast.parse(path.read_text(encoding="utf-8"))
    names: set[str] = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            names.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module and node.level == 0:
            names.add(node.module)
    return names


def _stage_of(module: str) -> str | None:
    parts = module.split(".")
    if parts[0] != "cablewright":
        return None
    if len(parts) > 1 and parts[1] in ORDER[:3] + [BASE]:
        return parts[1]
    return "cablewright"


@pytest.mark.parametrize("stage", ORDER[:3])
def test_stage_imports_only_earlier_stages(stage):
    allowed = set(ORDER[: ORDER.index(stage) + 1]) | {BASE}
    files = sorted((ROOT / stage).rglob("*.py"))
    assert files, f"no modules in {stage}/"
    for path in files:
        for module in _imports(path):
            target = _stage_of(module)
            assert target is None or target in allowed, f"{path.relative_to(ROOT)} imports {module}"


def test_sizing_touches_no_cad_library_or_files():
    for path in sorted((ROOT / "sizing").rglob("*.py")):
        modules = _imports(path)
        for banned in ("ezdxf", "ifcopenshell", "openpyxl", "shapely"):
            assert not any(m == banned or m.startswith(banned + ".") for m in modules), (
                f"{path.name} imports {banned}"
            )
        source = path.read_text(encoding="utf-8")
        assert "open(" not in source.replace("_open(", ""), f"{path.name} opens a file"


def test_base_layer_imports_no_stage():
    files = sorted((ROOT / BASE).rglob("*.py"))
    assert files, f"no modules in {BASE}/"
    for path in files:
        for module in _imports(path):
            target = _stage_of(module)
            assert target in (None, BASE), f"{path.relative_to(ROOT)} imports {module}"
        tree = ast.parse(path.read_text(encoding="utf-8"))
        relative = [n for n in ast.walk(tree) if isinstance(n, ast.ImportFrom) and n.level > 1]
        assert not relative, f"{path.relative_to(ROOT)} reaches outside the base layer"


def test_no_stage_imports_another_for_its_errors():
    # The error hierarchy is the base layer's (issue 11): no module imports
    # errors from a stage.
    for stage in ORDER[:3] + ["cablewright"]:
        for path in sorted((ROOT / stage).rglob("*.py")):
            for module in _imports(path):
                assert not (module.endswith(".errors") and module != f"cablewright.{BASE}.errors"), (
                    f"{path.relative_to(ROOT)} imports {module}")
