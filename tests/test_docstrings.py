"""Docstring parameters match the signatures (STYLE.md: units in brackets, names that exist).

For every public function of the sizing stage with a numpydoc ``Parameters``
section, each documented name must be a parameter of the function and each
parameter must be documented.
"""

from __future__ import annotations

import importlib
import inspect
import pkgutil
import re

import cablewright.sizing as sizing_package
import pytest

_SECTION = re.compile(r"^\s*Parameters\s*\n\s*-{3,}\s*\n(.*?)(?:\n\s*\n\s*[A-Z][A-Za-z ]+\n\s*-{3,}|\Z)", re.S | re.M)
_NAME = re.compile(r"^ {4}(\w+(?:\s*,\s*\w+)*)\s*:", re.M)


def _public_functions():
    for info in pkgutil.iter_modules(sizing_package.__path__, "cablewright.sizing."):
        module = importlib.import_module(info.name)
        for name in getattr(module, "__all__", []):
            obj = getattr(module, name, None)
            if (inspect.isfunction(obj) and obj.__module__ == module.__name__ and obj.__doc__
                    and _SECTION.search(inspect.cleandoc(obj.__doc__))):
                yield pytest.param(obj, id=f"{info.name.rsplit('.', 1)[1]}.{name}")


@pytest.mark.parametrize("func", list(_public_functions()))
def test_documented_parameters_match_the_signature(func):
    doc = inspect.cleandoc(func.__doc__)
    match = _SECTION.search(doc)
    assert match is not None, "no Parameters section"
    documented = set()
    for group in _NAME.findall("\n" + "\n".join("    " + line for line in match.group(1).splitlines())):
        documented.update(n.strip() for n in group.split(","))
    params = {p for p in inspect.signature(func).parameters if p not in ("self", "cls")}
    assert documented <= params, f"documented but not parameters: {sorted(documented - params)}"
    assert params <= documented, f"parameters not documented: {sorted(params - documented)}"


def test_the_check_itself_catches_a_wrong_name():
    def sample(length_m, csa_mm2):
        """Example.

        Parameters
        ----------
        length_m : float
            Length [m].
        area : float
            Not a parameter.
        """

    with pytest.raises(AssertionError, match="area"):
        test_documented_parameters_match_the_signature(sample)
