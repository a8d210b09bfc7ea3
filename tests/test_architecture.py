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


def _package_imports(path: Path, package: str) -> set[str]:
    """Every import of ``path`` (lazy ones inside functions too), relative ones resolved."""
    names: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            names.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom):
            module = node.module or ""
            if node.level:
                base = package.split(".")[: len(package.split(".")) - node.level + 1]
                module = ".".join(base + ([module] if module else []))
            names.add(module)
            names.update(f"{module}.{alias.name}" for alias in node.names)
    return names


def test_no_import_cycle_in_the_command_layer():
    # issue 11: cli -> commands_drawing -> batch -> cli was a cycle; lazy imports
    # count too (a cycle there is one call away).  Cycles found by networkx.
    import networkx as nx

    modules = {f"cablewright.{p.stem}": p for p in (ROOT / "cablewright").glob("*.py")
               if p.stem != "__init__"}
    graph = nx.DiGraph()
    for name, path in modules.items():
        for target in _package_imports(path, "cablewright") & modules.keys():
            if target != name:
                graph.add_edge(name, target)
    assert list(nx.simple_cycles(graph)) == []


def test_each_command_parser_is_registered_beside_its_handler():
    # cli.py only assembles: it adds no argument but --version; each commands_*.py
    # module has its register function(s) and every sub-command gets a handler.
    from cablewright.cli import build_parser

    cli_calls = [n for n in ast.walk(ast.parse((ROOT / "cablewright" / "cli.py").read_text()))
                 if isinstance(n, ast.Call) and getattr(n.func, "attr", "") == "add_argument"]
    assert len(cli_calls) == 1, "cli.py adds arguments; move them to the command's register()"
    for path in (ROOT / "cablewright").glob("commands_*.py"):
        assert "def register" in path.read_text(encoding="utf-8"), f"{path.name} has no register()"
    parser = build_parser()
    sub = next(a for a in parser._actions if a.dest == "command")
    assert list(sub.choices) == ["size", "compare", "routes", "calc", "layers", "demo"]  # contract.md
    for name, command in sub.choices.items():
        assert callable(command.get_default("handler")), f"{name} has no handler"
