"""The annotate package stays in small rooms: modules under ~400 lines, functions under ~80.

Counted with the standard library's ``ast`` (``end_lineno - lineno``), the limits of
DEVELOPERS.md ("Keep modules small") and issue 11 ("no module over ~400 lines, no
function over ~80").  A function's docstring is not counted: numpydoc sections are
long on purpose.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

ANNOTATE = Path(__file__).resolve().parents[1] / "annotate"
MAX_MODULE_LINES = 400
MAX_FUNCTION_LINES = 80
MODULES = sorted(ANNOTATE.rglob("*.py"))

#: Functions still over the limit, outside the drawing package, to be done: the
#: report is rewritten from typed rows (issue 11, item 4).  An entry that has come
#: under the limit fails :func:`test_known_long_functions_are_still_listed_for_a_reason`.
KNOWN_LONG = {("report_trace.py", "circuit_trace")}  # to be cut


def _function_lines(tree: ast.AST) -> dict[str, int]:
    """Lines of every function and method, docstring left out, by qualified name."""
    out: dict[str, int] = {}

    def visit(node: ast.AST, prefix: str) -> None:
        for child in ast.iter_child_nodes(node):
            if isinstance(child, (ast.FunctionDef, ast.AsyncFunctionDef)):
                body = child.body
                if ast.get_docstring(child) is not None:
                    body = body[1:]
                lines = body[-1].end_lineno - body[0].lineno + 1 if body else 0
                name = f"{prefix}{child.name}"
                out[name] = lines + 1  # the def line
                visit(child, name + ".")
            elif isinstance(child, ast.ClassDef):
                visit(child, f"{prefix}{child.name}.")

    visit(tree, "")
    return out


def test_the_counter_counts():
    """The counter on a known snippet: a 3-line body and a def line is 4 lines."""
    tree = ast.parse('def f():\n    """Doc."""\n    a = 1\n    b = 2\n    return a + b\n')
    assert _function_lines(tree) == {"f": 4}


def test_the_package_has_rooms():
    assert len(MODULES) >= 10, [p.name for p in MODULES]


@pytest.mark.parametrize("path", MODULES, ids=lambda p: str(p.relative_to(ANNOTATE)))
def test_module_is_small(path):
    n = len(path.read_text(encoding="utf-8").splitlines())
    assert n <= MAX_MODULE_LINES, f"{path.name}: {n} lines (limit {MAX_MODULE_LINES})"


@pytest.mark.parametrize("path", MODULES, ids=lambda p: str(p.relative_to(ANNOTATE)))
def test_functions_are_short(path):
    long = {
        name: n
        for name, n in _function_lines(ast.parse(path.read_text(encoding="utf-8"))).items()
        if n > MAX_FUNCTION_LINES and (path.name, name) not in KNOWN_LONG
    }
    assert not long, f"{path.name}: functions over {MAX_FUNCTION_LINES} lines: {long}"


def test_known_long_functions_are_still_listed_for_a_reason():
    """Each exemption names a function that exists and is still over the limit."""
    for module, name in KNOWN_LONG:
        lines = _function_lines(ast.parse((ANNOTATE / module).read_text(encoding="utf-8")))
        assert lines.get(name, 0) > MAX_FUNCTION_LINES, f"{module}:{name} is short now; unlist it"
