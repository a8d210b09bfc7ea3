"""The type checker sees every module under the name it is imported by (issue 11, item 7).

``tools/typecheck.py`` lays ``build/typecheck/cablewright/`` as links to the
package's files and to the folders ``package-dir`` maps under ``cablewright.``;
mypy runs on that tree in ``make test``.  These checks hold the tree to what
Python's own import system finds through the installed package, so a new
module or a new mapped folder is type checked without anyone remembering to.
"""

from __future__ import annotations

import importlib
import importlib.util
import os
import re
from pathlib import Path

import pytest

try:
    import tomllib
except ModuleNotFoundError:  # Python 3.10
    import tomli as tomllib

ROOT = Path(__file__).resolve().parents[1]


def _tool():
    spec = importlib.util.spec_from_file_location("typecheck_tool", ROOT / "tools" / "typecheck.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


@pytest.fixture(scope="module")
def tree(tmp_path_factory):
    tree = tmp_path_factory.mktemp("typecheck")
    _tool().lay_tree(tree)
    return tree


def _packages() -> list[str]:
    config = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    return config["tool"]["setuptools"]["packages"]


@pytest.mark.parametrize("package", _packages())
def test_each_installed_package_is_in_the_tree_where_python_imports_it_from(tree, package):
    # the source of truth: the folder Python's import system loads the package from
    imported = Path(importlib.import_module(package).__file__).resolve().parent
    in_tree = tree.joinpath(*package.split("."))
    assert (in_tree / "__init__.py").exists(), f"{package} is not in the type-checked tree"
    assert (in_tree / "__init__.py").resolve().parent == imported


def test_every_module_of_the_mapped_folders_is_in_the_tree(tree):
    seen = set()
    for folder, _dirs, files in os.walk(tree, followlinks=True):
        seen.update((Path(folder) / f).resolve() for f in files if f.endswith(".py"))
    for name, folder in _tool().mapped_folders().items():
        for path in folder.rglob("*.py"):
            assert path.resolve() in seen, f"{path.relative_to(ROOT)} ({name}) is not type checked"


def test_make_test_runs_the_type_checker_before_pytest():
    makefile = (ROOT / "Makefile").read_text(encoding="utf-8")
    recipe = re.search(r"^test:.*\n((?:\t.*\n)+)", makefile, re.M).group(1)
    assert "tools/typecheck.py" in recipe and recipe.index("tools/typecheck.py") < recipe.index("pytest")
