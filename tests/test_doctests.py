"""Run the docstring examples of every module (pyproject.toml points pytest here)."""

from __future__ import annotations

import doctest
import importlib
import pkgutil

import pytest

import cablewright

PACKAGES = [
    "cablewright.extract",
    "cablewright.core",
    "cablewright.sizing",
    "cablewright.sizing.nec",
    "cablewright.annotate",
    "cablewright.annotate.drawing",
    "cablewright",
]


def _modules():
    names = []
    for package_name in PACKAGES:
        package = importlib.import_module(package_name)
        for info in pkgutil.iter_modules(package.__path__, package_name + "."):
            if info.name.endswith("__main__"):
                continue
            names.append(info.name)
    return sorted(set(names))


@pytest.mark.parametrize("name", _modules())
def test_doctests(name):
    module = importlib.import_module(name)
    result = doctest.testmod(module, optionflags=doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE)
    assert result.failed == 0, f"{result.failed} doctest(s) failed in {name}"


def test_some_modules_have_examples():
    assert any(doctest.DocTestFinder().find(importlib.import_module(n)) for n in _modules())
    assert cablewright is not None
